"""``halftrip trace``: the command line on the shipped demo traces and on bad files (issue 6).

The demo traces are invented scenarios made by the echo predictor plus noise
(tui/demo/traces.py), so what is in them is known: the scenario's own list of
events (``KESTREL_EVENTS``, ``MILLPOND_EVENTS``). Distances are checked
within the resolution v t_r / 2 (common practice) at the demo's 0.5 ns edge
(1 ns for the swept view), plus 2 cm.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from calc.constants import C0_M_PER_S
from tui.cli import main
from tui.demo import traces as demo

DEMO = Path(demo.__file__).resolve().parent
KESTREL_CSV = str(DEMO / "kestrel-ridge-feeder.csv")
KESTREL_S1P = str(DEMO / "kestrel-ridge-feeder.s1p")
MILLPOND_CSV = str(DEMO / "millpond-lane-drop.csv")
RUN = demo.KESTREL_RUN
EVENT_KEYS = ("round_trip_delay_s", "distance_m", "size", "impedance_ohm", "kind", "confidence")


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def _json(capsys, *argv) -> dict:
    code, out, err = run(capsys, *argv, "--json")
    assert code == 0, err
    return json.loads(out)


def _first_reflections(events):
    return [e for e in events if e["kind"] != "re_reflection"]


def _check_truth(events, truth, vf, rise_s):
    found = _first_reflections(events)
    tolerance = vf * C0_M_PER_S * rise_s / 2 + 0.02
    assert [e["kind"] for e in found] == [t.kind for t in truth]
    for e, t in zip(found, truth, strict=True):
        assert e["distance_m"] == pytest.approx(t.distance_m, abs=tolerance)
        for key in EVENT_KEYS:
            assert key in e


def test_demo_volt_trace_finds_the_scenarios_events(capsys):
    data = _json(capsys, "trace", KESTREL_CSV, "--run", RUN)
    assert data["format"] == "delimited" and data["level_unit"] == "V"
    assert data["incident_edge_s"] == pytest.approx(0.0, abs=0.05e-9)
    # the wet stretch is slower (VF 0.80) than the hardline it sits in, so its far
    # end reads 1.5 m x (0.88 / 0.80 - 1) = 0.15 m late on the nominal run
    truth = list(demo.KESTREL_EVENTS)
    truth[2] = demo.TrueEvent(30.5 + 1.5 * (0.88 / 0.80 - 1), truth[2].kind)
    _check_truth(data["events"], truth, 0.66, demo.RISE_S)


def test_demo_sweep_finds_the_scenarios_events(capsys):
    data = _json(capsys, "trace", KESTREL_S1P, "--run", RUN)
    assert data["format"] == "touchstone"
    td = data["time_domain"]
    assert td["window"] == "kaiser" and td["dc_source"] == "extrapolated"
    truth = list(demo.KESTREL_EVENTS)
    truth[2] = demo.TrueEvent(30.5 + 1.5 * (0.88 / 0.80 - 1), truth[2].kind)
    _check_truth(data["events"], truth, 0.66, data["rise_time_s"])


def test_demo_distance_trace_in_feet_and_rho(capsys):
    data = _json(capsys, "trace", MILLPOND_CSV, "--run", demo.MILLPOND_RUN,
                 "--axis-vf", str(demo.MILLPOND_AXIS_VF))
    assert data["axis"] == "distance" and data["level_unit"] == "rho"
    assert data["incident_edge_s"] is None
    _check_truth(data["events"], demo.MILLPOND_EVENTS, 0.84, 1.5 * demo.RISE_S)


def test_comparison_with_the_expected_run(capsys):
    data = _json(capsys, "trace", KESTREL_CSV, "--run", RUN, "--expect-run", RUN,
                 "--expect-load", "open")
    for key in ("unexpected", "missing", "misplaced", "matched"):
        assert isinstance(data[key], list)
    assert [p["found"]["kind"] for p in data["matched"]] == ["open"]
    assert sorted(e["kind"] for e in data["unexpected"]) == \
        ["higher_impedance", "inductive_bump", "lower_impedance"]
    assert data["missing"] == [] and data["misplaced"] == []
    # expecting a longer feeder: the open shows nearer than expected
    data = _json(capsys, "trace", KESTREL_CSV, "--run", RUN,
                 "--expect-run", "2 m:rg58, 55 m:hardline-50-half, 1.5 m:rg58",
                 "--expect-load", "open")
    (moved,) = data["misplaced"]
    assert moved["found"]["kind"] == "open"
    assert moved["offset_m"] == pytest.approx(-10.0, abs=0.2)


def test_human_output_fits_80_columns(capsys):
    code, out, err = run(capsys, "trace", KESTREL_S1P, "--run", RUN, "--expect-run", RUN,
                         "--expect-load", "50 ohm", "--units", "imperial")
    assert code == 0, err
    assert max(len(line) for line in out.splitlines()) <= 80
    assert "safe" not in out.lower()


@pytest.mark.parametrize("name, content, line, words", [
    ("empty.csv", b"", 1, "empty"),
    ("text.csv", b"time_ns,level_V\n0,0.1\n1,0.2\n2,high\n3,0.4\n", 4, "numeric column 2"),
    ("back.csv", b"time_ns,level_V\n" + b"".join(b"%d,0\n" % i for i in range(10)) + b"4,0\n",
     12, "does not increase"),
    ("one.csv", b"time_ns\n1\n2\n3\n", 2, "one column"),
    ("z.s1p", b"# MHz Z RI R 50\n1 0.1 0.2\n", 1, "Z-parameters"),
    ("two.s2p", b"# MHz S RI R 50\n1 0 0 0 0 0 0 0 0\n", 1, "2-port"),
    ("v2.s1p", b"[Version] 2.0\n# MHz S RI R 50\n", 1, "version 2"),
    ("notes.csv", b'{"trace": "not really"}\n', 1, "JSON"),
    ("photo.csv", b"\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR", 3, "binary"),
])
def test_bad_files_one_line_naming_file_and_line(capsys, tmp_path, _isolated_user_dirs,
                                                 name, content, line, words):
    path = tmp_path / name
    path.write_bytes(content)
    before = sorted(p.name for p in tmp_path.iterdir())
    code, out, err = run(capsys, "trace", str(path), "--vf", "0.66", "--json")
    assert code == 2 and out == ""
    lines = err.strip().splitlines()
    assert len(lines) == 1
    assert f"{path} line {line}" in lines[0] and words.lower() in lines[0].lower()
    assert sorted(p.name for p in tmp_path.iterdir()) == before and path.read_bytes() == content
    assert not (_isolated_user_dirs / "data").exists()  # nothing written for the user


@pytest.mark.parametrize("argv, words", [
    (["trace", KESTREL_CSV], "give the cable"),
    (["trace", KESTREL_CSV, "--vf", "0.66", "--run", RUN], "one of them"),
    (["trace", KESTREL_CSV, "--run", RUN, "--expect-run", RUN], "give both"),
    (["trace", MILLPOND_CSV, "--run", demo.MILLPOND_RUN], "--axis-vf"),
    (["trace", "/no/such/trace.csv", "--vf", "0.66"], "no such file"),
    (["trace", KESTREL_CSV, "--run", "2 m:rg58, 45 m:nosuchcable"], "--run"),
    (["trace", KESTREL_CSV, "--run", RUN, "--expect-run", RUN, "--expect-load", "purple"],
     "--expect-load"),
    (["trace", KESTREL_S1P, "--run", RUN, "--band", "2 GHz..3 GHz"], "--band"),
    (["trace", KESTREL_CSV, "--run", RUN, "--incident", "at-zero"], "rho"),
])
def test_bad_options_exit_2_with_one_line(capsys, argv, words):
    code, out, err = run(capsys, *argv)
    assert code == 2 and out == ""
    lines = [ln for ln in err.splitlines() if not ln.startswith("halftrip: caution")]
    assert len(lines) == 1 and words in lines[0]


# --------------------------------------------------------------------- fuzzing

from hypothesis import HealthCheck, given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

_LINES = st.sampled_from([
    "time_ns,level_V\n", "Time (ns);rho\n", "# MHz S RI R 50\n", "# GHz S MA R 75\n",
    "0,0\n", "1,0.5\n", "2,0.5\n", "3,1\n", "4,-1\n", "5,1e300\n", "6,-0\n", "0.5 0.1 0.2\n",
    "1 0.3 45\n", "2 0.9 -170\n", "x,y\n", "\n", "! c\n", "7,0.25\n", "8,0.25\n", "9,0.5\n",
])


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                                  HealthCheck.function_scoped_fixture])
@given(lines=st.lists(_LINES, min_size=0, max_size=40),
       ramp=st.integers(min_value=0, max_value=200), name=st.sampled_from(["f.csv", "f.s1p"]))
def test_fuzzed_files_end_in_a_result_or_one_clear_line(capsys, tmp_path, lines, ramp, name):
    # A readable start (a ramp of samples) then arbitrary lines: the whole
    # pipeline (read, transform, analyse, place) must end in exit 0 or 2.
    text = "time_ns,level_V\n" + "".join(f"{i},{(i % 7) / 10}\n" for i in range(ramp))
    path = tmp_path / name
    path.write_text(text + "".join(lines) if name.endswith(".csv") else "".join(lines))
    code, out, err = run(capsys, "trace", str(path), "--vf", "0.66", "--json")
    assert code in (0, 2), err
    if code == 0:
        assert isinstance(json.loads(out), dict)
    else:
        assert out == "" and len(err.strip().splitlines()) == 1


def test_wording_of_a_section_and_its_far_end(capsys):
    # Kestrel Ridge (invented): 1.5 m of wet hardline (about 40 ohm) in the 50 ohm
    # run. Reading a TDR trace (common practice): a step down, then a step back up
    # to the line's own impedance, is one lower-impedance section and its far end,
    # not a lower section followed by a higher one.
    code, out, _err = run(capsys, "trace", KESTREL_S1P, "--run", RUN, "--band", "0.5-1000 MHz")
    assert code == 0
    text = " ".join(out.split())
    assert "step down of -0.104 to about" in text
    assert "back to about 49.4 ohm: the far end of the lower-impedance section before it" in text
    assert "re-reflection" in text and "re reflection" not in text
    assert max(len(line) for line in out.splitlines()) <= 80


def test_band_takes_the_forms_match_takes(capsys):
    # One band syntax across the commands: "LOW-HIGH UNIT" as in match and harness,
    # LOW..HIGH, and one open end.
    a = _json(capsys, "trace", KESTREL_S1P, "--run", RUN, "--band", "0.5-800 MHz")
    b = _json(capsys, "trace", KESTREL_S1P, "--run", RUN, "--band", "0.5 MHz..800 MHz")
    c = _json(capsys, "trace", KESTREL_S1P, "--run", RUN, "--band", "..800 MHz")
    for d in (a, b, c):
        assert d["time_domain"]["band_high_hz"] == pytest.approx(800e6)
    assert a["events"] == b["events"] == c["events"]


def test_a_problem_with_the_trace_itself_names_the_file(capsys, tmp_path):
    path = tmp_path / "two-points.s1p"
    path.write_text("# kHz S DB R 75\n500 -3 10\n1000 -3.1 -20\n")
    code, out, err = run(capsys, "trace", str(path), "--vf", "0.66")
    assert code == 2 and out == ""
    assert err.startswith(f"halftrip trace: {path}: ") and len(err.strip().splitlines()) == 1
