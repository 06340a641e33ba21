"""Limits (issue 10): the largest inputs halftrip accepts are handled within a
stated memory bound, and anything larger is refused with one clear line,
never an out-of-memory kill. The limits and bounds are listed in
DEVELOPERS.md ("Limits"); this file checks each one both ways.

Memory is the peak traced by tracemalloc; the CPU ceilings are generous
guards against a runaway (a hundred times what the case takes), not speed
targets, which the benchmarks measure.
"""

from __future__ import annotations

import io
import json
from contextlib import redirect_stderr, redirect_stdout

import pytest
from limits import MB, measured

from cable_catalog.loader import load_catalog
from calc import locate
from calc.constants import C0_M_PER_S
from calc.errors import InputError
from calc.parse import MAX_INPUT_CHARS, parse, warm_up
from calc.run import MAX_SEGMENTS, parse_run
from tui.cli import main

#: CPU ceiling for any single accepted case here (a runaway guard, see the docstring).
CPU_CEILING_S = 20.0


@pytest.fixture(scope="module")
def catalog():
    warm_up()
    return load_catalog()


def _cli(*argv: str) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with redirect_stdout(out), redirect_stderr(err):
        code = main(list(argv))
    return code, out.getvalue(), err.getvalue()


def _refused_in_one_line(argv, *words) -> str:
    code, out, err = _cli(*argv)
    assert code == 2 and out == "", err
    lines = [ln for ln in err.splitlines() if not ln.startswith("halftrip: caution")]
    assert len(lines) == 1, err
    for w in words:
        assert w in lines[0], lines[0]
    return lines[0]


def _run_text(n: int) -> str:
    return ", ".join(["2 m:rg58"] * n)


# --------------------------------------------------------------- runs of cables
def test_the_longest_run_is_located_within_bounds(catalog):
    text = _run_text(MAX_SEGMENTS)
    parsed = measured(parse_run, text, catalog.get)
    segments = parsed.value
    assert len(segments) == MAX_SEGMENTS
    found = measured(locate.locate_in_run, 5e-6, segments)
    junctions = measured(locate.run_junctions, segments)
    # one uniform RG-58 run (nominal VF 0.66), so d = 0.66 c0 t / 2 with the SI c0
    assert found.value.distance_m == pytest.approx(0.66 * C0_M_PER_S * 5e-6 / 2)
    assert found.value.segment_index == 247  # 2 m segments: 494.66 m is in the 248th
    assert junctions.value[-1].round_trip_delay_s == pytest.approx(
        2 * 1000.0 / (0.66 * C0_M_PER_S))
    for m in (parsed, found, junctions):
        assert m.peak_bytes < 5 * MB and m.cpu_s < CPU_CEILING_S


def test_the_longest_run_through_the_cli():
    code, out, err = _cli("locate", "5 us", "--run", _run_text(MAX_SEGMENTS), "--json")
    assert code == 0, err
    data = json.loads(out)
    assert len(data["segments"]) == MAX_SEGMENTS and len(data["junctions"]) == MAX_SEGMENTS
    assert data["total_length_m"] == pytest.approx(1000.0)


def test_one_segment_more_is_refused():
    _refused_in_one_line(["locate", "5 us", "--run", _run_text(MAX_SEGMENTS + 1)],
                         f"{MAX_SEGMENTS + 1} segments", f"at most {MAX_SEGMENTS}")


def test_a_pasted_megabyte_run_is_refused_without_splitting_it(catalog):
    text = "1 m:rg58, " * 1_000_000  # 10 MB: a million segments
    refused = measured(parse_run, text, catalog.get)
    assert isinstance(refused.value, InputError)
    assert "1000001 segments" in str(refused.value)
    assert refused.peak_bytes < 2 * len(text)  # no million strings (that took 130 MB)


# ------------------------------------------------------------------ typed values
def test_an_overlong_value_is_refused_before_it_is_parsed():
    text = "1" * 10_000_000 + " m"
    refused = measured(parse, text, "length", "length")
    assert isinstance(refused.value, InputError)
    assert f"longer than {MAX_INPUT_CHARS} characters" in str(refused.value)
    assert refused.peak_bytes < 1 * MB
    longest = "1." + "0" * (MAX_INPUT_CHARS - 4) + " m"  # exactly the limit: still read
    assert len(longest) == MAX_INPUT_CHARS
    assert measured(parse, longest, "length", "length").value == 1.0


# ----------------------------------------------------------- sizes of the jobs
def test_the_largest_harness_is_designed_within_bounds(catalog):
    from calc.match import MAX_ANTENNAS, harness

    coax = catalog.by_category("coax")
    big = measured(harness, MAX_ANTENNAS, 50.0, 50.0, 146e6, coax, band_hz=(144e6, 148e6),
                   arm_reach_m=30.0)
    assert not isinstance(big.value, Exception), big.value
    # each arm must present N Z_feed at the junction (N in parallel give Z_feed back), so
    # as a quarter-wave transformer from Z_a its line is sqrt(Z_a N Z_feed) (Pozar,
    # Microwave Engineering, ch. 2: Z_T = sqrt(Z_in Z_L))
    assert big.value.ideal_arm_z0_ohm == pytest.approx((50.0 * MAX_ANTENNAS * 50.0) ** 0.5)
    assert len(big.value.arms) == MAX_ANTENNAS
    assert big.peak_bytes < 20 * MB and big.cpu_s < CPU_CEILING_S
    _refused_in_one_line(["harness", "--antennas", str(MAX_ANTENNAS + 1), "--antenna-z", "50 ohm",
                          "--feed-z", "50 ohm", "--frequency", "146 MHz"],
                         f"at most {MAX_ANTENNAS}")


def test_the_longest_electrical_length_is_cut_within_bounds():
    from calc.cut import MAX_ELECTRICAL_DEG

    wl = MAX_ELECTRICAL_DEG / 360.0
    code, out, err = _cli("cut", "--frequency", "146 MHz", "--wavelengths", f"{wl:g}", "--vf",
                          "0.66", "--json")
    assert code == 0, err
    # l = n VF c0 / f with the SI c0
    assert json.loads(out)["physical_length_m"] == pytest.approx(wl * 0.66 * C0_M_PER_S / 146e6)
    _refused_in_one_line(["cut", "--frequency", "146 MHz", "--wavelengths", f"{wl * 1.01:g}",
                          "--vf", "0.66"], "wavelengths")


def test_the_highest_stub_order_is_accepted_and_one_more_refused():
    from calc.calibrate import MAX_ORDER

    # order 50 of an open stub is 2*50-1 = 99 quarter waves: VF = 4 L f / (99 c0)
    f = 99 * 0.66 * C0_M_PER_S / 4.0
    code, out, err = _cli("calibrate", "--length", "1 m", "--resonance", f"{f:.6g} Hz",
                          "--order", str(MAX_ORDER), "--json")
    assert code == 0, err
    assert json.loads(out)["vf"] == pytest.approx(0.66, rel=1e-5)
    _refused_in_one_line(["calibrate", "--length", "1 m", "--resonance", "49.5 MHz", "--order",
                          str(MAX_ORDER + 1)], "--order", str(MAX_ORDER))


def test_the_highest_impedance_is_matched_and_more_refused():
    from calc.match import MAX_IMPEDANCE_OHM

    code, out, err = _cli("match", "--from", "50 ohm", "--to", f"{MAX_IMPEDANCE_OHM:g} ohm",
                          "--frequency", "146 MHz", "--json")
    assert code == 0, err
    # quarter-wave transformer Z_T = sqrt(Z1 Z2) (Pozar, Microwave Engineering, ch. 2)
    assert json.loads(out)["ideal_impedance_ohm"] == pytest.approx((50.0 * MAX_IMPEDANCE_OHM) ** 0.5)
    _refused_in_one_line(["match", "--from", "50 ohm", "--to", f"{2 * MAX_IMPEDANCE_OHM:g} ohm",
                          "--frequency", "146 MHz"], "at most")


def test_a_measured_vf_below_the_floor_is_refused(catalog):
    # VF = 2 L / (c0 t): 0.1 m and 101 ns give 0.0066, slower than any cable (the VF floor
    # of calc.velocity). The Locate panel's fuzz found this: the result could not be shown.
    from calc.calibrate import vf_from_delay, vf_from_stub
    from calc.velocity import VF_MIN

    with pytest.raises(InputError, match=f"below {VF_MIN:g}"):
        vf_from_delay(0.1, 101e-9)
    with pytest.raises(InputError, match=f"below {VF_MIN:g}"):
        vf_from_stub(0.001, 1e6)
    _refused_in_one_line(["calibrate", "--length", "0.1 m", "--delay", "101 ns"], "below")


# ----------------------------------------------------------- whole-run prediction
def _mixed_run(catalog, n: int):
    from calc.simulate import Segment

    ids = ["rg58", "rg59", "rg213", "rg62"]  # 50, 75, 50, 93 ohm: every joint reflects
    text = ", ".join(f"{1 + i % 4} m:{ids[i % 4]}" for i in range(n))
    return [Segment.from_run_segment(s) for s in parse_run(text, catalog.get)]


def test_a_long_run_is_predicted_in_bounded_memory(catalog, monkeypatch):
    # 500 reflecting segments at 65,536 points. The cascade once built every segment's
    # factor at once (segments x points complex numbers: 10 GB at the largest accepted
    # size); it now works through blocks of calc.simulate.CASCADE_BLOCK numbers.
    import numpy as np

    from calc import simulate as sim
    from calc.loads import parse_load

    segments, load = _mixed_run(catalog, MAX_SEGMENTS), parse_load("open")
    blocked = measured(sim.simulate, segments, load, n_points=65536, arrivals=False)
    assert not isinstance(blocked.value, Exception), blocked.value
    assert blocked.peak_bytes < 200 * MB and blocked.cpu_s < CPU_CEILING_S
    # (the arrays of 2**15 complex points themselves, a few MB each, and two blocks of
    # CASCADE_BLOCK numbers: 2 x 32 MB)
    monkeypatch.setattr(sim, "CASCADE_BLOCK", 1 << 40)  # everything in one block, as before
    whole = measured(sim.simulate, segments, load, n_points=65536, arrivals=False)
    assert (blocked.value.level == whole.value.level).all()  # the same numbers exactly
    assert whole.peak_bytes > 3 * blocked.peak_bytes  # what the blocks save
    # the first joint, 1 m of RG-58 (50 ohm) into RG-59 (75 ohm): Gamma = (75 - 50) /
    # (75 + 50) = 0.2 (Pozar, Microwave Engineering, ch. 2), seen from the round trip of
    # 1 m at VF 0.66 (10.1 ns, SI c0) until the next joint's (30 ns later)
    p = blocked.value
    i = int(np.searchsorted(p.time_s, 2 * 1.0 / (0.66 * C0_M_PER_S) + 6 * p.rise_time_s))
    assert p.level[i] == pytest.approx(0.2, abs=0.01)


def test_too_many_points_are_refused(catalog):
    from calc.simulate import MAX_POINTS

    _refused_in_one_line(["simulate", "--run", "10 m:rg58", "--load", "open", "--points",
                          str(MAX_POINTS + 1)], "--points", str(MAX_POINTS))


# ------------------------------------------------------------------ trace files
def _trace_csv(path, n: int) -> None:
    import numpy as np

    t = np.arange(n) * 10e-12 - 1e-9  # 10 ps steps from 1 ns before the edge
    # the incident step to 0.5 at t = 0, the open's return to 1.0 half way, a little noise
    level = 0.5 * (t > 0) + 0.5 * (t > n * 5e-12) + 0.002 * np.sin(t * 3.1e11)
    np.savetxt(path, np.column_stack([t * 1e9, level]), delimiter=",", fmt="%.6f",
               header="time_ns,level", comments="")


def test_a_trace_is_read_within_its_memory_bound(tmp_path):
    # peak memory of reading and analysing a trace is a few times the file's size
    # (a stated bound in DEVELOPERS.md: 5x); the largest file read is 256 MB
    from calc.events import analyse
    from calc.trace_read import read_trace

    path = tmp_path / "feeder.csv"
    _trace_csv(path, 250_000)
    data = path.read_bytes()

    def job():
        trace = read_trace(data, path.name, time_unit="ns")
        return analyse(trace.x, trace.level)

    m = measured(job)
    assert not isinstance(m.value, Exception), m.value
    assert m.value.events
    assert m.peak_bytes < 5 * len(data) and m.cpu_s < CPU_CEILING_S


def test_a_trace_file_over_the_limit_is_refused_unread(tmp_path):
    from tui.commands.trace import MAX_FILE_BYTES

    path = tmp_path / "huge.csv"
    with open(path, "wb") as fh:  # sparse: takes no disk and no time
        fh.truncate(MAX_FILE_BYTES + 1)
    m = measured(_cli, "trace", str(path), "--vf", "0.66")
    code, out, err = m.value
    assert code == 2 and "at most 256 MB" in err and len(err.strip().splitlines()) == 1, err
    assert m.peak_bytes < 5 * MB


def test_devices_and_pipes_are_refused_not_read_forever(tmp_path):
    import os

    # /dev/zero reports size 0 and never ends (reading it filled memory until the
    # process was killed); a pipe would block the read until something wrote to it
    fifo = tmp_path / "pipe.csv"
    os.mkfifo(fifo)
    for name in ("/dev/zero", str(fifo)):
        _refused_in_one_line(["trace", name, "--vf", "0.66"], "not a regular file")
    _refused_in_one_line(["trace", str(tmp_path), "--vf", "0.66"], "is a directory")
