"""How the echo results read on screen (lines of text, numbers through tui.fmt)."""

from __future__ import annotations

import cmath
import math

from tui import fmt

SIGN_WORDS = {"same": "same sign as the incident", "inverted": "inverted",
              "reversed": "reversed", "none": "none"}


def _gamma(g: complex) -> str:
    mag, ang = abs(g), math.degrees(cmath.phase(g))
    return f"{g.real:+.4f} {'+' if g.imag >= 0 else '-'} j{abs(g.imag):.4f}  " \
           f"(|Gamma| {mag:.4f} at {ang:+.1f} deg)"


def _level(x: float | None) -> str:
    return "-" if x is None else f"{x:+.3f}"


def summary_lines(s) -> list[str]:
    """A :class:`calc.loads.LoadSummary` as the Load tab shows it."""
    at = f" at {fmt.frequency(s.frequency_hz)}" if s.frequency_hz is not None else ""
    on = f"on a {fmt.impedance(s.z0_ohm)} line{at}"
    if s.gamma is None:
        lines = [f"{on}: Gamma, return loss and VSWR of this load depend on frequency; "
                 "give a frequency"]
    else:
        z = s.impedance_ohm
        lines = [f"Z load {fmt.impedance(z) if z is not None else '-'}  {on}",
                 f"Gamma {_gamma(s.gamma)}",
                 f"return loss {fmt.decibels(s.return_loss_db)}   VSWR {fmt.vswr(s.vswr)}   "
                 f"mismatch loss {fmt.decibels(s.mismatch_loss_db)}"]
    v, i = s.reflected_voltage, s.reflected_current
    basis = "" if s.frequency_hz is not None else " (settled step)"
    lines.append(f"reflected voltage {v.real:+.3f} of the incident, "
                 f"{SIGN_WORDS[s.voltage_sign]}{basis}")
    lines.append(f"reflected current {i.real:+.3f} of the incident, {SIGN_WORDS[s.current_sign]}")
    if s.step_start is not None:
        tau = (f"time constant {fmt.time(s.time_constant_s)}" if s.time_constant_s
               else "no time constant")
        ring = ", rings as it settles" if s.rings else ""
        lines.append(f"step: starts at {_level(s.step_start)}, settles at "
                     f"{_level(s.step_final)}; {tau}{ring}")
    lines.append(s.sentence)
    return lines


def observed_lines(o, units: str, fraction: int) -> list[str]:
    """A :class:`calc.loads.ObservedStep` as the From a step tab shows it."""
    settles = f", settling at {o.settles_to:+.3f}" if o.settles_to is not None else ""
    lines = [f"step of {o.level:+.3f} of the incident{settles} on {fmt.impedance(o.z0_ohm)}",
             f"implies a load of {fmt.impedance(o.impedance_ohm)}  "
             f"(likely: {o.kind.replace('-', ' ')})",
             o.sentence]
    if o.alternatives:
        lines.append("the same step could also be:")
        lines += [f"  - {a}" for a in o.alternatives]
    if o.series_resistance_ohm is not None:
        lines.append(f"as a resistance in series in a joint: {fmt.impedance(o.series_resistance_ohm)}")
    if o.shunt_resistance_ohm is not None:
        lines.append(f"as a resistance across the line: {fmt.impedance(o.shunt_resistance_ohm)}")
    return lines


WARNINGS = {
    "rise-time-limited": "edge limited by the number of points",
    "tail-folds": "the run rings longer than the window holds",
    "arrivals-truncated": "arrival list cut at its limit",
}


def prediction_line(p, units: str, fraction: int) -> str:
    """One line under the fields: what the prediction is and its limits."""
    edge = (f"pulse {fmt.time(p.pulse_width_s)}" if p.pulse_width_s
            else f"step, rise {fmt.time(p.rise_time_s)}")
    n = len(p.arrivals)
    parts = [f"round trip {fmt.time(p.round_trip_s)}", f"{n} arrival{'s' if n != 1 else ''}", edge,
             f"{p.time_s.size} points"]
    parts += [WARNINGS.get(w, w) for w in p.warnings]
    return "; ".join(parts)
