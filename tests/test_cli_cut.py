"""The cut, match, harness, trim and stub commands: JSON, human output, bad input.

Values are checked against hand derivations from the SI c0 (299 792 458 m/s
exact) and the exact inch (0.0254 m); the calculations themselves are
checked against outside sources in test_cut.py and test_match.py.
"""

from __future__ import annotations

import json

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from test_safety_wording import verdicts  # the project's wording rule (DEVELOPERS.md)

from tui.cli import main


def run(capsys, *argv):
    try:
        code = main(list(argv))
    except SystemExit as exc:  # argparse refusing an option: tui.cli's parser exits 2
        code = exc.code
    out, err = capsys.readouterr()
    return code, out, err


def run_json(capsys, *argv) -> dict:
    code, out, err = run(capsys, *argv, "--json")
    assert code == 0, err
    return json.loads(out)  # exactly one JSON object on stdout


# --- cut ---------------------------------------------------------------------------


def test_cut_json_quarter_wave_with_allowance(capsys):
    # SI c0: lambda0 at 146 MHz is 2.053373 m; x 0.66 = 1.35522618 m; / 4 = 0.338806545 m;
    # less 2 x 15 mm of connector allowance = 0.308806545 m (12-3/16 in on a 1/16 tape).
    d = run_json(capsys, "cut", "--frequency", "146 MHz", "--degrees", "90", "--vf", "0.66",
                 "--allowance", "15 mm")
    assert d["wavelength_in_line_m"] == pytest.approx(1.35522618)
    assert d["physical_length_m"] == pytest.approx(0.338806545)
    assert d["cut_length_m"] == pytest.approx(0.308806545)
    assert d["cut_length_tape"] == "1 ft 0-3/16 in"
    assert "multiple" not in d


def test_cut_wavelengths_and_span(capsys):
    # 0.25 wl transformer across 1 m at 146 MHz, VF 0.66: 3 quarter waves (1.0164 m).
    d = run_json(capsys, "cut", "--frequency", "146 MHz", "--wavelengths", "0.25", "--vf", "0.66",
                 "--span", "1 m", "--kind", "transformer")
    assert d["multiple"] == 3
    assert d["electrical_length_deg"] == pytest.approx(270.0)
    assert d["physical_length_m"] == pytest.approx(3 * 0.338806545)


def test_cut_reverse_from_a_length(capsys):
    # 0.165 m of VF 0.66 at 299.792458 MHz (lambda0 = 1 m exactly) is 90 deg.
    d = run_json(capsys, "cut", "--frequency", "299.792458 MHz", "--length", "165 mm",
                 "--vf", "0.66")
    assert d["electrical_length_deg"] == pytest.approx(90.0)


def test_cut_with_a_catalog_cable_shows_both_systems_and_the_caution(capsys):
    code, out, err = run(capsys, "cut", "--frequency", "146 MHz", "--degrees", "90",
                         "--cable", "rg58", "--fraction", "32")
    assert code == 0
    assert "339 mm" in out and "1 ft 1-11/32 in" in out  # 13.339 in to 1/32 (exact inch)
    assert "caution" in err and not verdicts(err)


# --- match ---------------------------------------------------------------------------


def test_match_json(capsys):
    d = run_json(capsys, "match", "--from", "50 ohm", "--to", "100 ohm", "--frequency", "146 MHz",
                 "--band", "144-148 MHz")
    assert d["ideal_impedance_ohm"] == pytest.approx(70.7106781)  # sqrt(50 x 100)
    first = d["candidates"][0]
    assert set(first) >= {"cable_id", "parallel", "impedance_ohm", "vswr_center", "vswr_worst"}
    assert first["line_z0_ohm"] == 75.0 and first["parallel"] is False
    # lossless it would be 75^2/100 = 56.25 ohm, VSWR 1.125; the catalog loss moves it a little
    assert first["impedance_ohm"]["real"] == pytest.approx(56.25, rel=0.01)
    assert first["vswr_worst"] >= first["vswr_center"]


def test_match_picks_a_parallel_pair(capsys):
    d = run_json(capsys, "match", "--from", "50", "--to", "12.5", "--frequency", "146 MHz")
    assert d["ideal_impedance_ohm"] == pytest.approx(25.0)
    assert d["candidates"][0]["parallel"] is True
    assert d["candidates"][0]["line_z0_ohm"] == 25.0


# --- harness -----------------------------------------------------------------------


def test_harness_json(capsys):
    d = run_json(capsys, "harness", "--antennas", "4", "--antenna-z", "50 ohm", "--feed-z",
                 "50 ohm", "--frequency", "146 MHz", "--span", "1 m", "--band", "144-148 MHz",
                 "--allowance", "10 mm")
    assert len(d["arms"]) == 4
    arm = d["arms"][0]
    assert set(arm) >= {"cable_id", "physical_length_m", "cut_length_m"}
    assert arm["cut_length_m"] == pytest.approx(arm["physical_length_m"] - 0.02)
    assert d["arm_reach_m"] == pytest.approx(1.5)  # (4 - 1) x 1 m / 2
    assert arm["physical_length_m"] >= 1.5
    assert d["vswr_worst"] >= d["vswr_center"] >= 1.0
    assert d["transformer"] is None
    assert d["phase_spread"]["cut_tolerance_m"] == pytest.approx(0.002)


def test_harness_half_topology_has_a_transformer(capsys):
    d = run_json(capsys, "harness", "--antennas", "2", "--antenna-z", "50", "--feed-z", "50",
                 "--frequency", "146 MHz", "--topology", "half")
    assert d["transformer"]["electrical_length_deg"] == pytest.approx(90.0)
    assert d["ideal_transformer_z0_ohm"] == pytest.approx(35.3553391)  # sqrt(25 x 50)
    assert all(a["electrical_length_deg"] == pytest.approx(180.0) for a in d["arms"])


# --- trim ----------------------------------------------------------------------------


def test_trim_json(capsys):
    # 400 mm of VF 0.66: round trip 2 x 0.4 / (0.66 c0) = 4.04321 ns; the quarter wave at
    # 146 MHz is 0.338806545 m whatever the trimmer knows.
    t_rt = 2 * 0.4 / (0.66 * 299_792_458.0)
    d = run_json(capsys, "trim", "--frequency", "146 MHz", "--degrees", "90", "--length", "400 mm",
                 "--measured-delay", f"{t_rt * 1e9:.9f} ns")
    assert d["keep_length_m"] == pytest.approx(0.338806545, rel=1e-8)
    assert d["cut_off_m"] == pytest.approx(0.061193455, rel=1e-6)
    assert d["implied_vf"] == pytest.approx(0.66, rel=1e-8)


def test_trim_from_resonance(capsys):
    # first resonance of the same piece: 0.66 c0 / (4 x 0.4 m) = 123.664389 MHz
    d = run_json(capsys, "trim", "--frequency", "146 MHz", "--wavelengths", "0.25", "--length",
                 "400 mm", "--measured-resonance", "123.6643889 MHz")
    assert d["keep_length_m"] == pytest.approx(0.338806545, rel=1e-8)


# --- stub ----------------------------------------------------------------------------


def test_stub_json_reactance(capsys):
    # Pozar ch. 2: a shorted stub is jZ0 tan(bl); +j50 on 50 ohm line is 45 deg, an eighth
    # of 1.35522618 m = 0.169403273 m at 146 MHz in VF 0.66.
    d = run_json(capsys, "stub", "--frequency", "146 MHz", "--vf", "0.66", "--z0", "50",
                 "--end", "short", "--present", "j50 ohm")
    assert d["electrical_length_deg"] == pytest.approx(45.0)
    assert d["physical_length_m"] == pytest.approx(0.169403273)
    assert d["period_deg"] == 180.0


def test_stub_open_presenting_a_short_uses_the_cable_z0(capsys):
    d = run_json(capsys, "stub", "--frequency", "146 MHz", "--cable", "rg58", "--end", "open",
                 "--present", "short")
    assert d["electrical_length_deg"] == pytest.approx(90.0)
    assert d["z0_ohm"] == 50.0


# --- bad input: exit 2, one line on stderr, nothing on stdout -----------------------

CUT = ["cut", "--degrees", "90", "--vf", "0.66"]
MATCH = ["match", "--from", "50", "--to", "100"]
HARNESS = ["harness", "--antennas", "4", "--antenna-z", "50", "--feed-z", "50"]
TRIM = ["trim", "--degrees", "90", "--length", "400 mm"]
STUB = ["stub", "--vf", "0.66", "--end", "open", "--present", "short"]

BAD = {
    # frequencies of zero or below
    "cut zero frequency": CUT + ["--frequency", "0 Hz"],
    "cut negative frequency": CUT + ["--frequency", "-146 MHz"],
    "match zero frequency": MATCH + ["--frequency", "0 MHz"],
    "harness negative frequency": HARNESS + ["--frequency", "-1 MHz"],
    "trim zero frequency": TRIM + ["--frequency", "0 Hz", "--measured-delay", "4 ns"],
    "stub zero frequency": STUB + ["--frequency", "0 kHz"],
    "trim zero resonance": TRIM + ["--frequency", "146 MHz", "--measured-resonance", "0 Hz"],
    # impossible impedances
    "match negative impedance": ["match", "--from", "-50 ohm", "--to", "100",
                                 "--frequency", "146 MHz"],
    "match zero impedance": ["match", "--from", "50", "--to", "0 ohm", "--frequency", "146 MHz"],
    "match impedance not an impedance": ["match", "--from", "50", "--to", "100 m",
                                         "--frequency", "146 MHz"],
    "harness zero antenna impedance": ["harness", "--antennas", "2", "--antenna-z", "0",
                                       "--feed-z", "50", "--frequency", "146 MHz"],
    "stub presenting a resistance": ["stub", "--vf", "0.66", "--end", "open", "--present",
                                     "30+j25 ohm", "--z0", "50", "--frequency", "146 MHz"],
    "stub reactance without z0": ["stub", "--vf", "0.66", "--end", "open", "--present",
                                  "j25 ohm", "--frequency", "146 MHz"],
    # a band that does not contain the design frequency
    "match band outside": MATCH + ["--frequency", "146 MHz", "--band", "150-160 MHz"],
    "harness band outside": HARNESS + ["--frequency", "146 MHz", "--band", "420-450 MHz"],
    "match band backwards": MATCH + ["--frequency", "146 MHz", "--band", "148-144 MHz"],
    # an allowance longer than the line
    "cut allowance eats the line": CUT + ["--frequency", "146 MHz", "--allowance", "200 mm"],
    "harness allowance eats the arm": HARNESS + ["--frequency", "146 MHz", "--allowance", "1 m"],
    # a measurement implying the piece is already too short
    "trim delay too short": TRIM + ["--frequency", "146 MHz", "--measured-delay", "3 ns"],
    "trim resonance too short": TRIM + ["--frequency", "146 MHz",
                                        "--measured-resonance", "160 MHz"],
    # other refusals
    "cut transformer of 45 deg": ["cut", "--degrees", "45", "--vf", "0.66", "--frequency",
                                  "146 MHz", "--kind", "transformer"],
    "cut span without kind": CUT + ["--frequency", "146 MHz", "--span", "2 m"],
    "harness one antenna": ["harness", "--antennas", "1", "--antenna-z", "50", "--feed-z", "50",
                            "--frequency", "146 MHz"],
    "harness antennas not a number": ["harness", "--antennas", "four", "--antenna-z", "50",
                                      "--feed-z", "50", "--frequency", "146 MHz"],
    "trim faster than light": TRIM + ["--frequency", "146 MHz", "--measured-delay", "1 ns"],
    "cut unknown cable": ["cut", "--degrees", "90", "--cable", "rg999", "--frequency", "146 MHz"],
}


@pytest.mark.parametrize("argv", BAD.values(), ids=BAD.keys())
def test_bad_input_is_one_line_and_exit_2(capsys, argv):
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert out == ""
    assert len(err.strip().splitlines()) == 1, err
    assert "Traceback" not in err


def test_too_short_says_it_cannot_be_lengthened(capsys):
    _, _, err = run(capsys, *TRIM, "--frequency", "146 MHz", "--measured-delay", "3 ns")
    assert "cannot be lengthened" in err


def test_allowance_error_names_the_allowance(capsys):
    _, _, err = run(capsys, *CUT, "--frequency", "146 MHz", "--allowance", "200 mm")
    assert err.startswith("halftrip cut: allowance:")


def test_bad_input_with_a_hazard_tagged_cable_is_still_one_line(capsys):
    # rg58 carries the rf-transmitter caution; it is printed only with a result.
    code, out, err = run(capsys, "cut", "--degrees", "90", "--cable", "rg58", "--frequency",
                         "146 MHz", "--allowance", "1 m")
    assert code == 2 and len(err.strip().splitlines()) == 1


FIELDS = [
    # (command line with a placeholder "{}" for the typed text)
    ["cut", "--frequency", "{}", "--degrees", "90", "--vf", "0.66"],
    ["cut", "--frequency", "146 MHz", "--wavelengths", "{}", "--vf", "0.66"],
    ["cut", "--frequency", "146 MHz", "--degrees", "90", "--vf", "0.66", "--allowance", "{}"],
    ["cut", "--frequency", "146 MHz", "--degrees", "90", "--vf", "0.66", "--span", "{}",
     "--kind", "repeater"],
    ["match", "--from", "{}", "--to", "100", "--frequency", "146 MHz"],
    ["match", "--from", "50", "--to", "100", "--frequency", "146 MHz", "--band", "{}"],
    ["harness", "--antennas", "2", "--antenna-z", "{}", "--feed-z", "50", "--frequency",
     "146 MHz"],
    ["trim", "--frequency", "146 MHz", "--degrees", "90", "--length", "400 mm",
     "--measured-delay", "{}"],
    ["stub", "--frequency", "146 MHz", "--vf", "0.66", "--z0", "50", "--end", "open",
     "--present", "{}"],
]


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(template=st.sampled_from(FIELDS), text=st.text(max_size=30))
def test_no_typed_text_gives_anything_but_a_result_or_a_clear_refusal(capsys, template, text):
    if text.startswith("-") or "\x00" in text:  # argparse would read it as an option
        return
    code, out, err = run(capsys, *[text if a == "{}" else a for a in template])
    assert code in (0, 2), err
    if code == 2:
        assert out == "" and len(err.strip().splitlines()) == 1


# --- what a person reads fits an 80-column terminal ----------------------------------

SCREENS = [
    ["cut", "--frequency", "146 MHz", "--degrees", "90", "--cable", "rg58", "--allowance", "15 mm",
     "--span", "2 m", "--kind", "transformer", "--slack", "10 cm"],
    ["cut", "--frequency", "146 MHz", "--length", "2 ft 3 in", "--vf", "0.66", "--units",
     "imperial"],
    ["match", "--from", "50", "--to", "12.5", "--frequency", "146 MHz", "--band", "144-148 MHz",
     "--units", "imperial", "--include-balanced"],
    ["harness", "--antennas", "4", "--antenna-z", "50", "--feed-z", "50", "--frequency",
     "146 MHz", "--topology", "half", "--span", "3 m", "--band", "144-148 MHz", "--units",
     "imperial", "--allowance", "5/8 in", "--slack", "4 in"],
    ["trim", "--frequency", "146 MHz", "--degrees", "90", "--length", "400 mm",
     "--measured-delay", "3.7 ns"],
    ["stub", "--frequency", "146 MHz", "--cable", "rg58", "--end", "short", "--present",
     "-j40 ohm", "--allowance", "10 mm"],
]


@pytest.mark.parametrize("argv", SCREENS, ids=[s[0] + str(i) for i, s in enumerate(SCREENS)])
def test_human_output_fits_80_columns_and_never_says_safe(capsys, argv):
    code, out, err = run(capsys, *argv)
    assert code == 0, err
    assert max(len(line) for line in out.splitlines()) <= 80, out
    assert not verdicts(out + err)


def test_commands_are_loggable():
    import importlib

    for name in ("cut", "match", "harness", "trim", "stub"):
        assert importlib.import_module(f"tui.commands.{name}").LOGGABLE is True
