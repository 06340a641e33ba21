"""The one line above a predicted trace: what it is and its limits."""

from __future__ import annotations

from tui import fmt

WARNINGS = {
    "rise-time-limited": "edge limited by the number of points",
    "tail-folds": "the run rings longer than the window holds",
    "arrivals-truncated": "more small arrivals than listed",
}


def prediction_line(p) -> str:
    """Round trip, arrivals, edge, points and any warning of a
    :class:`calc.simulate.Prediction` (the CLI's notes, shortened to one line)."""
    edge = (f"pulse {fmt.time(p.pulse_width_s)}" if p.pulse_width_s
            else f"step, rise {fmt.time(p.rise_time_s)}")
    n = len(p.arrivals)
    parts = [f"round trip {fmt.time(p.round_trip_s)}", f"{n} arrival{'s' if n != 1 else ''}",
             edge, f"{p.time_s.size} points"]
    parts += [WARNINGS.get(w, w) for w in p.warnings]
    return "; ".join(parts)
