"""How an analysed trace reads on screen: the status line, the events table
(with the comparison), the plot's marks and each row's full line. Event and
place wording is the CLI's own (:func:`tui.commands.trace.describe_event`)."""

from __future__ import annotations

from tui import fmt
from tui.widgets.trace_view import TraceShown

COLUMNS = ("#", "delay", "distance", "size", "Z ohm", "kind")
COMPARED = COLUMNS + ("check",)


def _kind(kind: str) -> str:
    return kind.replace("_", " ")


def _z(z_ohm: float) -> str:
    return "open" if z_ohm == float("inf") else f"{z_ohm:.4g}"


def status_line(result) -> str:
    """The tally against the expectation, the events, what they were placed on,
    the edge, the noise and the samples (most important first: the line may be cut)."""
    a, info = result.analysis, result.info
    n = len(a.events)
    parts = []
    c = result.comparison
    if c is not None:
        parts.append(f"against the expected run: {len(c.matched)} as expected, "
                     f"{len(c.misplaced)} misplaced, {len(c.missing)} missing, "
                     f"{len(c.unexpected)} unexpected")
    size = (f"{info['samples']} samples" if "samples" in info
            else f"{info['points']}-point sweep")
    parts += [f"{n} event{'s' if n != 1 else ''} on {info['velocity_source']}",
              f"rise {fmt.time(a.rise_time_s)}", f"noise {a.noise_rms:.2g} rho", size]
    return "; ".join(parts)


def verdicts(comparison, units: str, fraction: int) -> dict[int, str]:
    """id(event) -> what the comparison says of it."""
    out: dict[int, str] = {}
    if comparison is None:
        return out
    for p in comparison.matched:
        out[id(p.found)] = "as expected" + (" (size differs)" if p.size_differs else "")
    for p in comparison.misplaced:
        way = "farther" if p.offset_m > 0 else "nearer"
        out[id(p.found)] = f"misplaced, {fmt.length(abs(p.offset_m), units, fraction)} {way}"
    for e in comparison.unexpected:
        out[id(e)] = "unexpected"
    return out


def trace_shown(result, units: str, fraction: int) -> TraceShown:
    """Everything the trace view draws for one analysed trace."""
    from tui.commands.trace import describe_event, distance_axis, rho_trace
    from tui.widgets.trace_plot import Mark, PlotData

    a, c = result.analysis, result.comparison
    said = verdicts(c, units, fraction)
    events = list(a.events)
    rows: list[tuple[float, tuple[str, ...]]] = []
    marks, details = [], {}
    for i, e in enumerate(events, start=1):
        key = str(i)
        dist = "-" if e.distance_m is None else fmt.event_distance(e, units, fraction).value
        row = (key, fmt.time(e.round_trip_delay_s), dist, f"{e.size:+.3f}",
               _z(e.impedance_ohm), _kind(e.kind))
        rows.append((e.round_trip_delay_s, row + ((said.get(id(e), ""),) if c else ())))
        where = fmt.event_place(e, units, fraction)
        details[key] = (f"{key}: {where + '; ' if where else ''}"
                        f"{describe_event(e, a.z0_ohm, events)}")
        if e.distance_m is not None:
            marks.append(Mark(key, e.round_trip_delay_s, e.distance_m,
                              f"{_kind(e.kind)} {e.size:+.3f}"))
    if c is not None:
        for j, x in enumerate(c.missing, start=1):
            key = f"m{j}"
            rows.append((x.round_trip_delay_s, (key, fmt.time(x.round_trip_delay_s),
                                                fmt.length(x.distance_m, units, fraction),
                                                f"{x.size:+.3f}", "", _kind(x.kind), "missing")))
            details[key] = (f"{key}: missing: {_kind(x.kind)} expected at "
                            f"{fmt.length(x.distance_m, units, fraction)} "
                            f"({fmt.time(x.round_trip_delay_s)}; {x.path or 'predicted'})")
            marks.append(Mark(key, x.round_trip_delay_s, x.distance_m,
                              f"missing {_kind(x.kind)}", other=True))
    p = result.prediction
    t, rho = rho_trace(result.setup, a)
    data = PlotData(t, distance_axis(t, result.setup), rho, tuple(marks), z0_ohm=a.z0_ohm,
                    other_distance_m=None if p is None else p.distance_m,
                    other_level=None if p is None else p.level)
    rows.sort(key=lambda r: r[0])
    return TraceShown(status_line(result), data, [r for _t, r in rows], details,
                      columns=COMPARED if c is not None else COLUMNS)
