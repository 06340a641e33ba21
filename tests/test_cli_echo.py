"""The ``echo`` and ``simulate`` commands: JSON keys and values, human output, refusals.

Hand-worked values come from the relations in Pozar, *Microwave Engineering*,
ch. 2 (reflection coefficient, return loss, VSWR, quarter-wave transformer);
the step signature from Hall, Hall and McCall, *High-Speed Digital System
Design*, TDR section; polarities are common practice. Distances use the exact
SI value of c0 (BIPM, SI Brochure).
"""

from __future__ import annotations

import pytest

from tui.commands import echo, simulate

C0 = 299_792_458.0


def test_commands_are_loggable():
    assert echo.LOGGABLE is True and simulate.LOGGABLE is True


# -- echo forward ----------------------------------------------------------------------
def test_echo_resistive_json(cli_json):
    # Pozar ch. 2, by hand: 75 ohm on 50 ohm: Gamma = 25/125 = 0.2, RL = 20 log10 5 = 13.979 dB,
    # VSWR = 1.2/0.8 = 1.5, ML = -10 log10(0.96) = 0.1773 dB
    d = cli_json("echo", "--z0", "50 ohm", "--load", "75 ohm")
    assert d["gamma_real"] == pytest.approx(0.2) and d["gamma_imag"] == pytest.approx(0.0)
    assert d["return_loss_db"] == pytest.approx(13.9794, abs=1e-4)
    assert d["vswr"] == pytest.approx(1.5)
    assert d["mismatch_loss_db"] == pytest.approx(0.1773, abs=1e-4)
    assert d["step_start"] == pytest.approx(0.2) and d["step_final"] == pytest.approx(0.2)
    assert d["time_constant_s"] is None


def test_echo_open_and_short_signs(cli_json):
    # common practice: an open keeps the voltage's sign and reverses the current; a short
    # inverts the voltage and keeps the current
    o = cli_json("echo", "--z0", "50", "--load", "open")
    s = cli_json("echo", "--z0", "50", "--load", "short")
    assert (o["voltage_sign"], o["current_sign"]) == ("same", "reversed")
    assert (s["voltage_sign"], s["current_sign"]) == ("inverted", "same")
    assert o["vswr"] is None and o["return_loss_db"] == pytest.approx(0.0)  # infinite VSWR


def test_echo_capacitor_time_constant(cli_json):
    # Hall, Hall and McCall, TDR section: C across the end, tau = Z0 C = 50 x 20 pF = 1 ns
    d = cli_json("echo", "--z0", "50 ohm", "--load", "20 pF")
    assert (d["step_start"], d["step_final"]) == (-1.0, 1.0)
    assert d["time_constant_s"] == pytest.approx(1e-9)
    assert d["gamma_real"] is None  # no frequency given for a reactive load


def test_echo_reactive_at_frequency(cli_json):
    # 100 nH at 100 MHz: X = 2 pi 1e8 1e-7 = 62.832 ohm; Gamma = (jX - 50)/(jX + 50), |Gamma| = 1
    d = cli_json("echo", "--z0", "50", "--load", "100 nH", "--frequency", "100 MHz")
    assert d["impedance_imag_ohm"] == pytest.approx(62.8319, abs=1e-4)
    assert d["gamma_magnitude"] == pytest.approx(1.0)
    x = 62.83185307
    g = complex(-50, x) / complex(50, x)
    assert (d["gamma_real"], d["gamma_imag"]) == (pytest.approx(g.real), pytest.approx(g.imag))


def test_echo_complex_load_needs_frequency(cli):
    code, out, err = cli("echo", "--z0", "50", "--load", "60+40j ohm")
    assert code == 2 and out == "" and "--frequency" in err


def test_echo_through_quarter_wave(cli_json):
    # Pozar ch. 2 quarter-wave transformer: Z_in = Z0^2 / Z_L = 2500 / 100 = 25 ohm.
    # Quarter wave at 100 MHz, VF 0.66: 0.25 x 0.66 x c0 / 1e8 = 0.494657 m
    length = 0.25 * 0.66 * C0 / 100e6
    d = cli_json("echo", "--z0", "50 ohm", "--load", "100 ohm", "--through", f"{length!r} m",
              "--vf", "0.66", "--frequency", "100 MHz")
    assert d["input_impedance_real_ohm"] == pytest.approx(25.0, abs=1e-6)
    assert d["input_impedance_imag_ohm"] == pytest.approx(0.0, abs=1e-6)
    assert d["gamma_real"] == pytest.approx(-1 / 3, abs=1e-9)  # at the near end
    assert d["at_load"]["gamma_real"] == pytest.approx(1 / 3)  # at the far end


def test_echo_through_run_json(cli_json):
    d = cli_json("echo", "--z0", "50", "--load", "75 ohm", "--through", "10 m:rg58",
              "--frequency", "100 MHz")
    for key in ("input_impedance_real_ohm", "input_impedance_imag_ohm", "gamma_real",
                "gamma_imag", "return_loss_db", "vswr", "mismatch_loss_db"):
        assert d[key] is not None
    # the cable's loss lowers the reflection seen at the near end (return loss rises)
    assert d["return_loss_db"] > d["at_load"]["return_loss_db"]


def test_echo_through_needs_frequency_and_vf(cli):
    for argv in (("--through", "3 m", "--vf", "0.66"),
                 ("--through", "3 m", "--frequency", "100 MHz"),
                 ("--vf", "0.66", "--frequency", "100 MHz")):
        code, out, err = cli("echo", "--z0", "50", "--load", "open", *argv)
        assert code == 2 and out == "" and len(err.strip().splitlines()) == 1


# -- echo backwards ----------------------------------------------------------------------
def test_echo_observed_fraction(cli_json):
    # Pozar ch. 2 inverse relation: Z = Z0 (1 + rho)/(1 - rho); -1/3 on 50 ohm -> 25 ohm
    d = cli_json("echo", "--z0", "50 ohm", "--observed-step", "-0.333333333333")
    assert d["impedance_ohm"] == pytest.approx(25.0, rel=1e-9)
    assert d["kind"] == "lower-impedance"


def test_echo_observed_volts(cli_json):
    # the trace steps from 1 V to 1.5 V: rho = 1.5/1 - 1 = 0.5 -> Z = 50 x 1.5/0.5 = 150 ohm
    d = cli_json("echo", "--z0", "50", "--observed-step", "1.5 V", "--incident", "1 V")
    assert d["level"] == pytest.approx(0.5) and d["impedance_ohm"] == pytest.approx(150.0)


def test_echo_observed_open_and_capacitive(cli_json):
    assert cli_json("echo", "--z0", "50", "--observed-step", "1")["kind"] == "open"
    assert cli_json("echo", "--z0", "50", "--observed-step", "1")["impedance_ohm"] is None
    d = cli_json("echo", "--z0", "50", "--observed-step", "-0.4", "--settles-to", "0")
    assert d["kind"] == "capacitive"


def test_echo_observed_text_admits_ambiguity(cli):
    code, out, _ = cli("echo", "--z0", "50", "--observed-step", "0.2")
    assert code == 0 and "could also be" in out and "safe" not in out.lower()


# -- simulate ----------------------------------------------------------------------------
RUN = "10 m:rg58, 20 m:rg213"


def test_simulate_json_keys_and_arrays(cli_json):
    d = cli_json("simulate", "--run", RUN, "--load", "short", "--points", "1024")
    n = len(d["time_s"])
    assert n == 1024 == len(d["distance_m"]) == len(d["level"])
    assert abs(d["level"][0]) < 1e-6  # nothing before any echo
    assert d["level"][-1] < -0.5  # a short's echo is negative (common practice)
    load = max(d["arrivals"], key=lambda a: abs(a["size"]))
    assert set(load) >= {"time_s", "distance_m", "size", "path"}
    assert load["distance_m"] == pytest.approx(30.0)  # the end of the run
    # the round trip: 2 x (10 m + 20 m) / (0.66 c0), both cables VF 0.66 in the catalog
    assert load["time_s"] == pytest.approx(2 * 30.0 / (0.66 * C0))
    assert "reflect at the load" in load["path"]


def test_simulate_lumps_and_pulse(cli_json):
    d = cli_json("simulate", "--run", RUN, "--load", "match", "--lump", "1: 5 pF",
              "--pulse-width", "5 ns")
    dip = d["arrivals"][0]
    assert dip["distance_m"] == pytest.approx(10.0) and dip["start"] < 0  # a capacitive dip
    assert d["pulse_width_s"] == pytest.approx(5e-9)


def test_simulate_text_fits_80_columns(cli):
    code, out, err = cli("simulate", "--run", "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
                         "--load", "75 ohm || 10 pF", "--lump", "1: 3 nH", "--units", "imperial")
    assert code == 0, err
    assert max(len(line) for line in out.splitlines()) <= 80
    assert "reflect at the load" in " ".join(out.split()) and " ft " in out
    assert "caution" in err  # the catalog's hazard tag for an antenna feeder


@pytest.mark.parametrize("argv", [
    ("--run", RUN, "--load", "banana"),
    ("--run", RUN, "--load", "-10 pF"),
    ("--run", RUN, "--load", "60+40j ohm"),
    ("--run", "0 m:rg58", "--load", "open"),
    ("--run", RUN, "--load", "open", "--span", "10 ns"),
    ("--run", RUN, "--load", "open", "--points", "99999999"),
    ("--run", RUN, "--load", "open", "--points", "12.5"),
    ("--run", RUN, "--load", "open", "--lump", "3: 1 nH"),
    ("--run", RUN, "--load", "open", "--lump", "1: -1 nH"),
    ("--run", RUN, "--load", "open", "--rise-time", "1 ns", "--pulse-width", "2 ns"),
    ("--run", "10 m:nosuchcable", "--load", "open"),
])
def test_simulate_refusals(cli, argv):
    code, out, err = cli("simulate", *argv)
    assert code == 2 and out == ""
    lines = [ln for ln in err.splitlines() if not ln.startswith("halftrip: caution")]
    assert len(lines) == 1


@pytest.mark.parametrize("argv", [
    ("--z0", "50", "--load", "75 ohm || 3 pF + 1 nH"),
    ("--z0", "50", "--load", "-75 ohm"),
    ("--z0", "-50", "--load", "open"),
    ("--z0", "50", "--observed-step", "1.7"),
    ("--z0", "50", "--observed-step", "0.5 V"),
    ("--z0", "50", "--observed-step", "0.5", "--incident", "1 V"),
    ("--z0", "50", "--load", "open", "--observed-step", "0.2"),
])
def test_echo_refusals(cli, argv):
    code, out, err = cli("echo", *argv)
    assert code == 2 and out == "" and len(err.strip().splitlines()) == 1
