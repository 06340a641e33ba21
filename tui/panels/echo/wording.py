"""The one line above a predicted trace: what it is and its limits."""

from __future__ import annotations

from tui import fmt

WARNINGS = {
    "rise-time-limited": "edge limited by the number of points",
    "tail-folds": "the run rings longer than the window holds",
    "arrivals-truncated": "more small arrivals than listed",
}


def prediction_line(data: dict) -> str:
    """Round trip, arrivals, edge, points and any warning of ``halftrip simulate``'s
    data (its notes, shortened to one line)."""
    edge = (f"pulse {fmt.time(data['pulse_width_s'])}" if data["pulse_width_s"]
            else f"step, rise {fmt.time(data['rise_time_s'])}")
    n = len(data["arrivals"])
    parts = [f"round trip {fmt.time(data['round_trip_s'])}",
             f"{n} arrival{'s' if n != 1 else ''}", edge, f"{len(data['time_s'])} points"]
    parts += [WARNINGS.get(w, w) for w in data["warnings"]]
    return "; ".join(parts)
