"""How an analysed trace reads on screen: the status line, the events table
(with the comparison), the plot's marks and each row's full line."""

from __future__ import annotations

from tui import fmt
from tui.widgets.trace_view import TraceShown


def _kind(kind: str) -> str:
    return kind.replace("_", " ")


def _z(z_ohm: float) -> str:
    return "open" if z_ohm == float("inf") else f"{z_ohm:.4g}"


def _offset(offset_m: float, units: str, fraction: int) -> str:
    sign = "+" if offset_m >= 0 else ""
    return f"moved {sign}{fmt.length(offset_m, units, fraction)}"


def status_line(result) -> str:
    """The tally against the expectation, the events, what they were placed on,
    the edge, the noise and the samples (most important first: the line may be cut)."""
    a, info = result.analysis, result.info
    n = len(a.events)
    parts = []
    if result.expected is not None:
        c = result.expected.comparison
        parts.append(f"against the expected run: {len(c.matched)} as expected, "
                     f"{len(c.misplaced)} moved, {len(c.missing)} missing, "
                     f"{len(c.unexpected)} not expected")
    size = (f"{info['samples']} samples" if "samples" in info
            else f"{info['points']}-point sweep")
    parts += [f"{n} event{'s' if n != 1 else ''} on {info['velocity_source']}",
              f"rise {fmt.time(a.rise_time_s)}", f"noise {a.noise_rms:.2g} rho", size]
    return "; ".join(parts)


def trace_shown(result, units: str, fraction: int) -> TraceShown:
    """Everything the trace view draws for one analysed trace."""
    from tui.commands.trace import _where
    from tui.panels.trace.trace_form import distance_axis, rho_trace
    from tui.widgets.trace_plot import Mark, PlotData

    a = result.analysis
    verdict: dict[int, str] = {}
    rows: list[tuple[float, tuple[str, ...]]] = []
    marks, details = [], {}
    expected = result.expected
    if expected is not None:
        c = expected.comparison
        for p in c.matched:
            differs = [w for w, d in (("size", p.size_differs), ("kind", p.kind_differs)) if d]
            verdict[id(p.found)] = "yes" + (f", {' and '.join(differs)} differs"
                                             if differs else "")
        for p in c.misplaced:
            verdict[id(p.found)] = _offset(p.offset_m, units, fraction)
        for e in c.unexpected:
            verdict[id(e)] = "no"
    for i, e in enumerate(a.events, start=1):
        key = str(i)
        dist = "-" if e.distance_m is None else fmt.length(e.distance_m, units, fraction)
        rows.append((e.round_trip_delay_s, (key, fmt.time(e.round_trip_delay_s), dist,
                                            f"{e.size:+.3f}", _z(e.impedance_ohm), _kind(e.kind),
                                            verdict.get(id(e), ""))))
        where = _where(e, units, fraction)
        details[key] = f"{key}: {where + '; ' if where else ''}{e.description}"
        if e.distance_m is not None:
            marks.append(Mark(key, e.round_trip_delay_s, e.distance_m,
                              f"{_kind(e.kind)} {e.size:+.3f}"))
    other_d = other_level = None
    if expected is not None:
        for j, x in enumerate(expected.comparison.missing, start=1):
            key = f"m{j}"
            rows.append((x.round_trip_delay_s, (key, fmt.time(x.round_trip_delay_s),
                                                fmt.length(x.distance_m, units, fraction),
                                                f"{x.size:+.3f}", "", _kind(x.kind), "missing")))
            details[key] = (f"{key}: predicted {_kind(x.kind)} of {x.size:+.3f} not found "
                            f"within {fmt.length(x.tolerance_m, units, fraction)}"
                            + (f" ({x.path})" if x.path else ""))
            marks.append(Mark(key, x.round_trip_delay_s, x.distance_m,
                              f"missing {_kind(x.kind)}", other=True))
        other_d, other_level = expected.prediction.distance_m, expected.prediction.level
    t, rho = rho_trace(result.setup, a)
    data = PlotData(t, distance_axis(t, result.setup), rho, tuple(marks), z0_ohm=a.z0_ohm,
                    other_distance_m=other_d, other_level=other_level)
    rows.sort(key=lambda r: r[0])
    return TraceShown(status_line(result), data, [r for _t, r in rows], details)
