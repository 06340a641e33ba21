"""The ``locate`` and ``calibrate`` commands: JSON keys, units, refusals, the user catalog.

Values are hand-derived from the exact SI value of c0 (299 792 458 m/s, BIPM
SI Brochure) and the exact international foot (0.3048 m, 1959 agreement).
The conftest fixture points HALFTRIP_DATA_DIR at a fresh temporary directory.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from tui.paths import user_catalog_path

RUN = "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"




# ---------------------------------------------------------------- locate


def test_one_cable_json(cli, cli_json):
    # SI c0: 0.66 x 299 792 458 m/s x 100 ns / 2 = 9.893151 m; +/- 3 %: 9.596357 .. 10.189946 m;
    # rise time 2 ns -> 0.197863 m; pulse width 10 ns -> 0.989315 m
    data = cli_json("locate", "100 ns", "--vf", "0.66", "--tolerance", "3 %",
                 "--rise-time", "2 ns", "--pulse-width", "10 ns")
    assert data["distance_m"] == pytest.approx(9.893151, rel=1e-6)
    assert data["distance_low_m"] == pytest.approx(9.596357, rel=1e-6)
    assert data["distance_high_m"] == pytest.approx(10.189946, rel=1e-6)
    assert data["vf"] == 0.66
    assert data["round_trip_delay_s"] == pytest.approx(100e-9)
    assert data["resolution_m"] == pytest.approx(0.197863, rel=1e-5)
    assert data["dead_zone_m"] == pytest.approx(0.989315, rel=1e-6)


def test_one_cable_json_leaves_out_what_was_not_given(cli, cli_json):
    data = cli_json("locate", "100 ns", "--vf", "0.66")
    assert "resolution_m" not in data and "dead_zone_m" not in data


def test_every_velocity_convention_gives_the_same_distance(cli, cli_json):
    # VF 0.66 stated five ways (SI c0): NVP 66 %, eps_r 1/0.66^2 = 2.295684,
    # velocity 197.863022 m/us, V/2 98.931511 m/us
    ways = [("--vf", "0.66"), ("--nvp", "66 %"), ("--eps-r", "2.2956841"),
            ("--velocity", "197.863022 m/us"), ("--half-velocity", "98.931511 m/us")]
    for flag, value in ways:
        data = cli_json("locate", "100 ns", flag, value)
        assert data["distance_m"] == pytest.approx(9.893151, rel=1e-6), flag


def test_catalog_cable_carries_its_tolerance(cli, cli_json):
    data = cli_json("locate", "100 ns", "--cable", "rg58")
    assert data["cable_id"] == "rg58"
    assert data["distance_low_m"] < data["distance_m"] < data["distance_high_m"]
    assert data["vf_tolerance"] > 0


def test_imperial_output_and_input(cli, cli_json):
    # 9.893151 m / 0.3048 m = 32.457845 ft = 32 ft 5.494 in -> 32 ft 5-1/2 in at 1/16
    code, out, _ = cli("locate", "100 ns", "--vf", "0.66", "--units", "imperial")
    assert code == 0
    assert "32 ft 5-1/2 in" in out
    # 32 ft 5-1/2 in = 32 x 0.3048 + 5.5 x 0.0254 = 9.8933 m; t = 2 d / (0.66 c0) = 100.0018 ns
    data = cli_json("locate", "--distance", "32 ft 5-1/2 in", "--vf", "0.66")
    assert data["distance_m"] == pytest.approx(9.8933, rel=1e-12)
    assert data["round_trip_delay_s"] == pytest.approx(100.0018e-9, rel=1e-6)


def test_run_json(cli, cli_json):
    # SI c0 with the catalog's VF for each segment: the event offset into segment 1 is
    # VF_1 c0 (t - T_0) / 2 with T_0 = 2 x 2 m / (VF_0 c0)
    from tui.commands.common import catalog

    vf0, vf1 = catalog().get("rg58").vf, catalog().get("hardline-50-half").vf
    c0 = 299_792_458.0
    t0 = 4.0 / (vf0 * c0)
    data = cli_json("locate", "300 ns", "--run", RUN)
    assert data["segment_index"] == 1
    assert data["offset_in_segment_m"] == pytest.approx(vf1 * c0 * (300e-9 - t0) / 2, rel=1e-9)
    assert data["distance_m"] == pytest.approx(2.0 + vf1 * c0 * (300e-9 - t0) / 2, rel=1e-9)
    junctions = data["junctions"]
    assert [j["distance_m"] for j in junctions] == [2.0, 47.0, 48.5]
    assert junctions[0]["round_trip_delay_s"] == pytest.approx(t0, rel=1e-12)
    assert junctions[-1]["round_trip_delay_s"] == pytest.approx(
        t0 + 90.0 / (vf1 * c0) + 3.0 / (vf0 * c0), rel=1e-12)


def test_run_text_names_joints_in_words(cli):
    # "1/2" beside a list of cables reads as half an inch (1/2 in hardline is a
    # trade size, common practice): joints are "1 and 2"
    code, out, _ = cli("locate", "300 ns", "--run", RUN)
    assert code == 0
    assert "  1 and 2 " in out and "  2 and 3 " in out and "1/2 " not in out
    assert max(len(line) for line in out.splitlines()) <= 80


def test_two_ended_json(cli, cli_json):
    # power-cable fault-location practice (common practice): 250 m x 1.2 / 2.0 = 150 m from A;
    # implied VF = 2 x 250 m / (c0 x 2 us) = 0.833910 (SI c0)
    data = cli_json("locate", "--from-a", "1.2 us", "--from-b", "0.8 us", "--length", "250 m")
    assert data["distance_from_a_m"] == pytest.approx(150.0)
    assert data["distance_from_b_m"] == pytest.approx(100.0)
    assert data["implied_vf"] == pytest.approx(0.833910, rel=1e-6)


def test_two_ended_says_what_the_length_error_does(cli):
    # x_A = L t_A / (t_A + t_B) (power-cable fault-location practice, common practice)
    # scales with L: 850 m x 6.2 / 10.05 = 524.378 m from A, so 1 % of L is 5.244 m there
    code, out, _ = cli("locate", "--from-a", "6.2 us", "--from-b", "3.85 us", "--length", "850 m")
    assert code == 0
    assert "524.378 m" in out and "each distance is 1 % off (5.244 m from A)" in out


def test_two_ended_warns_when_the_catalog_disagrees(cli):
    code, out, _ = cli("locate", "--from-a", "1.2 us", "--from-b", "0.8 us", "--length",
                       "250 m", "--cable", "mv-xlpe")
    assert code == 0
    assert "may not be the same event" in out


@pytest.mark.parametrize("argv", [
    ["locate", "0 ns", "--vf", "0.66"],
    ["locate", "-5 ns", "--vf", "0.66"],
    ["locate", "inf ns", "--vf", "0.66"],
    ["locate", "nan ns", "--vf", "0.66"],
    ["locate", "100 m", "--vf", "0.66"],
    ["locate", "100 ns", "--vf", "1.2"],
    ["locate", "100 ns", "--vf", "0"],
    ["locate", "100 ns", "--vf", "-0.5"],
    ["locate", "100 ns", "--nvp", "120 %"],
    ["locate", "100 ns", "--cable", "no-such-cable"],
    ["locate", "100 ns"],
    ["locate", "100 ns", "--vf", "0.66", "--tolerance", "90 %"],
    ["locate", "100 ns", "--vf", "0.66", "--rise-time", "0 ns"],
    ["locate", "--distance", "0 m", "--vf", "0.66"],
    ["locate", "--distance", "-3 m", "--vf", "0.66"],
    ["locate", "100 ns", "--run", "2 m:no-such-cable, 45 m:rg58"],
    ["locate", "100 ns", "--run", "2 m rg58"],
    ["locate", "100 ns", "--run", "2 m:rg58,, 3 m:rg58"],
    ["locate", "100 ns", "--run", "0 m:rg58"],
    ["locate", "100 ns", "--run", "two metres:rg58"],
    ["locate", "100 ns", "--run", ""],
    ["locate", "900 ns", "--run", RUN],
    ["locate", "--distance", "60 m", "--run", RUN],
    ["locate", "100 ns", "--run", RUN, "--vf", "0.7"],
    ["locate", "--from-a", "0.2 us", "--from-b", "0.8 us", "--length", "250 m"],
    ["locate", "--from-a", "0.2 us", "--from-b", "0.8 us", "--length", "250 m",
     "--cable", "mv-xlpe"],
    ["locate", "--from-a", "0 us", "--from-b", "0.8 us", "--length", "250 m"],
    ["locate", "--from-a", "1 us", "--from-b", "0.8 us", "--length", "0 m"],
    ["locate", "--from-a", "1 us", "--length", "250 m"],
    ["locate", "100 ns", "--from-a", "1 us", "--from-b", "0.8 us", "--length", "250 m"],
    ["locate", "100 ns", "--distance", "3 m", "--vf", "0.66"],
    ["locate", "100 ns", "--vf", "0.66", "--cable", "rg58"],
])
def test_locate_refusals(cli, argv):
    code, out, err = cli(*argv)
    assert code == 2
    assert out == ""
    assert len(err.strip().splitlines()) == 1, err
    assert not user_catalog_path().exists()


def test_beyond_the_run_says_so(cli):
    _, _, err = cli("locate", "900 ns", "--run", RUN)
    assert "beyond the far end" in err


# ---------------------------------------------------------------- calibrate


def test_calibrate_known_length_json(cli, cli_json):
    # SI c0: VF = 2 x 10 m / (c0 x 101 ns) = 0.660523; with +/-2 cm and +/-0.5 ns:
    # 2 x 9.98 / (c0 x 101.5 ns) = 0.655955 .. 2 x 10.02 / (c0 x 100.5 ns) = 0.665137
    data = cli_json("calibrate", "--length", "10 m", "--delay", "101 ns",
                 "--length-tolerance", "2 cm", "--delay-resolution", "0.5 ns")
    assert data["vf"] == pytest.approx(0.660523, rel=1e-6)
    assert data["vf_low"] == pytest.approx(0.655955, rel=1e-6)
    assert data["vf_high"] == pytest.approx(0.665137, rel=1e-6)


def test_calibrate_length_tolerance_in_percent(cli, cli_json):
    data = cli_json("calibrate", "--length", "10 m", "--delay", "101 ns",
                 "--length-tolerance", "1 %")
    assert data["length_tolerance_m"] == pytest.approx(0.1)


def test_calibrate_stub_json(cli, cli_json):
    # SI c0: shorted stub, first low impedance at a half wave: VF = 4 L f / (2 c0)
    # = 4 x 10 m x 9.9 MHz / (2 x 299 792 458 m/s) = 0.660457
    data = cli_json("calibrate", "--length", "10 m", "--resonance", "9.9 MHz",
                 "--end", "short")
    assert data["vf"] == pytest.approx(0.660457, rel=1e-6)
    assert data["quarter_waves"] == 2
    assert data["vf_low"] < data["vf"] < data["vf_high"]


def test_calibrate_save_as_adds_a_user_cable(cli, cli_json):
    code, out, err = cli("calibrate", "--length", "305 m", "--delay", "3.1 us", "--reel",
                         "--save-as", "roof-feeder", "--z0", "75 ohm", "--description",
                         "grey feeder on the test mast")
    assert code == 0, err
    text = user_catalog_path().read_text(encoding="utf-8")
    assert 'id = "roof-feeder"' in text
    data = cli_json("cables", "show", "roof-feeder")
    assert data["origin"] == "user"
    assert data["z0_ohm"] == 75.0
    # VF = 610 m / (c0 x 3.1 us) = 0.656368 (SI c0), stored to 4 decimals
    assert data["vf"] == pytest.approx(0.6564)
    # the saved cable locates like any other
    assert cli_json("locate", "100 ns", "--cable", "roof-feeder")["vf"] == pytest.approx(0.6564)


def test_calibrate_refuses_a_taken_id_and_writes_nothing(cli):
    assert cli("calibrate", "--length", "10 m", "--delay", "101 ns", "--save-as", "mine")[0] == 0
    before = user_catalog_path().read_bytes()
    for cable_id in ("mine", "rg58"):
        code, out, err = cli("calibrate", "--length", "10 m", "--delay", "101 ns",
                             "--save-as", cable_id)
        assert code == 2 and out == "" and len(err.strip().splitlines()) == 1
    assert user_catalog_path().read_bytes() == before


@pytest.mark.parametrize("argv", [
    ["--length", "0 m", "--delay", "101 ns"],
    ["--length", "-10 m", "--delay", "101 ns"],
    ["--length", "inf m", "--delay", "101 ns"],
    ["--length", "10 m", "--delay", "0 ns"],
    ["--length", "10 m", "--delay", "-101 ns"],
    ["--length", "10 m", "--delay", "nan ns"],
    ["--length", "10 m", "--delay", "10 ns"],
    ["--length", "10 m", "--delay", "101 MHz"],
    ["--length", "10 m", "--resonance", "0 MHz"],
    ["--length", "10 m", "--resonance", "15 MHz"],
    ["--length", "10 m", "--resonance", "5 MHz", "--order", "0"],
    ["--length", "10 m", "--resonance", "5 MHz", "--order", "two"],
    ["--length", "10 m", "--resonance", "5 MHz", "--end", "loaded"],
    ["--length", "10 m", "--delay", "101 ns", "--end", "open"],
    ["--length", "10 m", "--resonance", "5 MHz", "--reel"],
    ["--length", "10 m", "--delay", "101 ns", "--length-tolerance", "11 m"],
    ["--length", "10 m", "--delay", "101 ns", "--delay-resolution", "200 ns"],
    ["--length", "10 m", "--delay", "101 ns", "--resonance", "5 MHz"],
    ["--length", "10 m"],
    ["--delay", "101 ns"],
    ["--length", "10 m", "--delay", "101 ns", "--description", "no id given"],
    ["--length", "10 m", "--delay", "101 ns", "--z0", "-50 ohm"],
    ["--length", "10 m", "--delay", "101 ns", "--z0", "fifty"],
    ["--length", "10 m", "--delay", "101 ns", "--category", "rope"],
    ["--length", "10 m", "--delay", "101 ns", "--save-as", "Not An Id!"],
    ["--length", "10 m", "--delay", "10 ns", "--save-as", "fast"],
])
def test_calibrate_refusals_write_nothing(cli, argv):
    argv = list(argv)
    if "--save-as" not in argv and "--description" not in argv:
        argv += ["--save-as", "would-be-saved"]  # would write, were the input good
    code, out, err = cli("calibrate", *argv)
    assert code == 2
    assert out == ""
    assert len(err.strip().splitlines()) == 1, err
    assert not user_catalog_path().exists()


def test_console_script_form(tmp_path):
    # the same command through a fresh interpreter, as a user's shell runs it
    root = Path(__file__).resolve().parents[1]
    env = dict(os.environ, HALFTRIP_DATA_DIR=str(tmp_path))
    proc = subprocess.run([sys.executable, "-m", "tui.cli", "locate", "100 ns", "--vf", "0.66",
                           "--json"], capture_output=True, text=True, cwd=root, env=env)
    assert proc.returncode == 0, proc.stderr
    # SI c0: 9.893151 m (as above)
    assert json.loads(proc.stdout)["distance_m"] == pytest.approx(9.893151, rel=1e-6)
    bad = subprocess.run([sys.executable, "-m", "tui.cli", "locate", "0 ns", "--vf", "0.66"],
                         capture_output=True, text=True, cwd=root, env=env)
    assert bad.returncode == 2 and bad.stdout == "" and len(bad.stderr.splitlines()) == 1
