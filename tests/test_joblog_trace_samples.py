"""What the job log keeps of a trace: ``halftrip trace FILE --save`` (and ``simulate``) store
the samples, decimated to a bound that keeps every spike, so the report draws the trace
with its events marked.

The traces are invented scenarios written by the tests: a rho trace (reflections only,
reference plane at 0) on a cable of VF 0.66 with a narrow dip and an open. Positions are
worked from d = VF c0 t / 2 with c0 = 299 792 458 m/s (SI definition of the metre).
"""

from __future__ import annotations

import json
import os
import sqlite3

import numpy as np
import pytest

from tui.cli import main
from tui.joblog import open_log
from tui.joblog.picture import MAX_STORED_SAMPLES, draw, stored_samples, trace_picture

C0 = 299_792_458.0  # m/s, SI definition
VF = 0.66  # the invented cable's velocity factor


def _run(capsys, *argv) -> tuple[int, str, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def _rho_trace(n: int, dip_at_m: float = 20.0, open_at_m: float = 52.5,
               span_m: float = 80.0) -> tuple[np.ndarray, np.ndarray]:
    """Time (s) and rho: a 1 ns edge open at ``open_at_m`` and a dip of -0.15 a few
    centimetres wide at ``dip_at_m``, with seeded noise of 1e-3 rho."""
    t_end = 2 * span_m / (VF * C0)
    t = np.linspace(0.0, t_end, n)
    d = VF * C0 * t / 2
    level = 0.5 * (1 + np.tanh((d - open_at_m) / 0.05))
    level -= 0.15 * np.exp(-0.5 * ((d - dip_at_m) / 0.03) ** 2)
    level += np.random.default_rng(7).normal(0.0, 1e-3, n)
    return t, level


def _write(path, t, level) -> str:
    np.savetxt(path, np.column_stack((t * 1e9, level)), delimiter=",", fmt=("%.9g", "%.6g"),
               header="time_ns,rho", comments="")
    return str(path)


def _stored_bytes(entry_id: int) -> int:
    with sqlite3.connect(os.environ["HALFTRIP_DB"]) as con:
        return con.execute("SELECT length(CAST(result AS BLOB)) FROM entries WHERE id = ?",
                           (entry_id,)).fetchone()[0]


def test_saved_trace_has_its_samples_and_a_picture_with_the_events(capsys, tmp_path):
    t, level = _rho_trace(20_000)
    path = _write(tmp_path / "west-mast-feeder.csv", t, level)
    _run(capsys, "log", "new", "West mast")
    code, out, err = _run(capsys, "trace", path, "--vf", "0.66", "--tolerance", "3 %",
                          "--json", "--save", "--label", "mast feeder")
    assert code == 0, err
    printed = json.loads(out)
    assert "trace" not in printed  # the --json output is unchanged: no sample arrays
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        (entry,) = log.entries(1)
    assert entry.kind == "trace"
    assert {k: v for k, v in entry.result.items() if k != "trace"} == printed
    stored = entry.result["trace"]
    assert set(stored) == {"time_s", "distance_m", "level"}
    assert len(stored["level"]) <= MAX_STORED_SAMPLES < 20_000
    # the distance axis is the placement's: d = VF c0 t / 2
    assert stored["distance_m"][-1] == pytest.approx(VF * C0 * stored["time_s"][-1] / 2,
                                                     rel=1e-6)
    # the dip and the open are found, 20 m and 52.5 m out (d = VF c0 t / 2)
    kinds = [(e["kind"], e["distance_m"]) for e in printed["events"]]
    assert any(d == pytest.approx(20.0, abs=0.2) for _k, d in kinds)
    assert any(k == "open" and d == pytest.approx(52.5, abs=0.2) for k, d in kinds)

    code, report, _ = _run(capsys, "log", "export", "--format", "md")
    assert code == 0
    picture = report.split("Trace picture:")[1].split("```text")[1].split("```")[0]
    assert "against distance" in picture
    assert "^ n: row n of the events table" in picture
    pointers = next(line for line in picture.splitlines() if line.strip().startswith("^"))
    assert pointers.count("^") == len(printed["events"])
    # the dip (20 m of an axis from about 0 to 80 m: column 15 of 60) reaches the
    # picture's lowest row, which is labelled with the trace's lowest level
    rows = [line for line in picture.splitlines() if "|" in line]
    label, plot = rows[-1].split("|")
    assert float(label) == pytest.approx(min(stored["level"]), abs=0.005)
    assert min(stored["level"]) == pytest.approx(-0.15, abs=0.01)
    assert "*" in plot[14:17]


def test_a_million_samples_are_stored_in_a_bounded_size(capsys, tmp_path):
    t, level = _rho_trace(1_000_000)
    path = _write(tmp_path / "long-run.csv", t, level)
    _run(capsys, "log", "new", "Long run")
    code, _out, err = _run(capsys, "trace", path, "--vf", "0.66", "--save")
    assert code == 0, err
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        (entry,) = log.entries(1)
    stored = entry.result["trace"]
    assert len(stored["level"]) <= MAX_STORED_SAMPLES
    # three arrays of at most 1,024 numbers of 7 significant digits, plus the events:
    # well under 100 kB, where the samples as JSON would take some 60 MB
    assert _stored_bytes(entry.id) < 100_000
    # the dip of -0.15 (3 cm wide, about 100 samples at this spacing) keeps its extreme
    assert min(stored["level"]) == pytest.approx(float(level.min()), abs=1e-6)


def test_a_one_sample_spike_keeps_its_extreme_and_its_place():
    n = 1_000_000
    x = np.linspace(0.0, 100.0, n)
    level = np.where(x >= 60.0, 1.0, 0.0)  # an open at 60 m
    spike = 123_457  # one sample, about 12.3 m out
    level[spike] = -0.4
    stored = stored_samples(level, distance_m=x)
    assert len(stored["level"]) <= MAX_STORED_SAMPLES
    low = int(np.argmin(stored["level"]))
    assert stored["level"][low] == -0.4
    assert stored["distance_m"][low] == pytest.approx(x[spike], rel=1e-6)
    assert stored["distance_m"][0] == 0.0 and stored["distance_m"][-1] == 100.0
    assert stored["distance_m"] == sorted(stored["distance_m"])  # still in order
    # the picture of the stored copy is the picture of the whole trace
    assert trace_picture(stored) == draw(x, level, [], "distance_m")


def test_a_short_trace_is_stored_as_it_is():
    x = [0.0, 1.0, 2.0]
    assert stored_samples([0.0, 0.5, 1.0], distance_m=x) == {"distance_m": x,
                                                             "level": [0.0, 0.5, 1.0]}


def test_simulate_save_stores_a_bounded_prediction_with_its_picture(capsys):
    _run(capsys, "log", "new", "West mast")
    code, out, err = _run(capsys, "simulate", "--run", "40 m:rg58", "--load", "open",
                          "--points", "65536", "--json", "--save")
    assert code == 0, err
    printed = json.loads(out)
    assert len(printed["level"]) == 65536  # --json keeps the whole prediction
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        (entry,) = log.entries(1)
    assert entry.kind == "simulate"
    assert len(entry.result["level"]) <= MAX_STORED_SAMPLES
    assert entry.result["arrivals"] == printed["arrivals"]
    # the open's full reflection (rho -> +1, the reflection coefficient of an open;
    # Pozar, Microwave Engineering, ch. 2) is kept at its height
    assert max(entry.result["level"]) == pytest.approx(max(printed["level"]), abs=1e-6)
    assert trace_picture(entry.result) is not None
