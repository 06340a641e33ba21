"""CLI of the foundation: velocity and cables (issue 2)."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

from tui.cli import main


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_velocity_json_keys(capsys):
    code, out, err = run(capsys, "velocity", "--nvp", "66 %", "--json")
    data = json.loads(out)
    assert code == 0
    # Hand-derived from SI c0: v = 0.66 * 299792458 m/s.
    assert data["velocity_m_per_s"] == pytest.approx(0.66 * 299_792_458)
    assert data["eps_r"] == pytest.approx(1 / 0.66**2)
    for key in ("vf", "nvp_percent", "eps_r", "delay_per_length_s_per_m", "velocity_m_per_s",
                "half_velocity_m_per_s"):
        assert key in data


@pytest.mark.parametrize("argv", [
    ["velocity", "--vf", "1.5"],
    ["velocity", "--velocity", "80 ft"],
    ["velocity", "--delay-per-length", "nan ns/ft"],
    ["velocity"],
    ["velocity", "--vf", "0.6", "--nvp", "60"],
    ["cables", "show", "rg-5"],
])
def test_bad_input_exit_2_one_line(capsys, argv):
    with pytest.raises(SystemExit) as info:
        raise SystemExit(main(argv))
    out, err = capsys.readouterr()
    assert info.value.code == 2
    assert out == ""
    assert len(err.strip().splitlines()) == 1


def test_cables_list_json_and_category(capsys):
    code, out, _ = run(capsys, "cables", "list", "--category", "power", "--json")
    data = json.loads(out)
    assert code == 0 and data["cables"]
    assert all(c["category"] == "power" for c in data["cables"])
    assert {"id", "description", "category", "z0_ohm", "vf", "vf_tolerance"} <= set(data["cables"][0])


def test_console_entry_point_runs_as_module():
    out = subprocess.run([sys.executable, "-m", "tui.cli", "cables", "show", "rg58", "--json"],
                         capture_output=True, text=True)
    assert out.returncode == 0
    assert json.loads(out.stdout)["z0_ohm"] == 50.0


def test_cables_list_and_show_fit_80_columns(capsys):
    for argv in (["cables", "list"], ["cables", "show", "mv-xlpe"], ["cables", "show", "rg58"]):
        code, out, _ = run(capsys, *argv)
        assert code == 0
        assert max(len(line) for line in out.splitlines()) <= 80, argv


def test_cables_show_in_words(capsys):
    code, out, _ = run(capsys, "cables", "show", "rg58")
    assert code == 0
    assert "velocity factor   0.660 +/- 3 % (NVP 66 %)" in out
    # The catalog's model at 100 MHz: 1.39 x sqrt(100) + 0.021 x 100 = 16.0 dB per 100 m
    # (coefficients from the catalog, recalled from memory there).
    assert "per 100 m: 4.61 dB at 10 MHz, 16 dB at 100 MHz" in out
    assert "[" not in out  # no Python list shown to people
    code, out, _ = run(capsys, "cables", "show", "rg58", "--units", "imperial")
    # 16.0 dB per 100 m x 0.3048 = 4.88 dB per 100 ft (foot exact, 0.3048 m)
    assert "per 100 ft:" in out and "4.88 dB at 100 MHz" in out
