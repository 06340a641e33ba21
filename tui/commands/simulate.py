"""``halftrip simulate``: the trace a reflectometer will show for a run and a load.

A run of catalog cables (``--run "10 m:rg58, 20 m:rg213"``), optional lumps
between segments (``--lump "1: 5 nH"``: after segment 1, a series inductance;
ohm is a series resistance, F a capacitance across the line), a load and the
instrument (``--source-z``, ``--rise-time`` or ``--pulse-width``). Prints the
predicted level (rho) against distance, and every echo with its path.
"""

from __future__ import annotations

from tui.commands.common import add_output_options, catalog, emit, units_of, warn_hazards

NAME = "simulate"
HELP = "predict a run's reflectometer trace (level against time and distance) and its echoes"
LOGGABLE = True

#: Echoes listed in the text output (all of them go to JSON).
SHOWN_ARRIVALS = 16
WARNING_TEXT = {
    "rise-time-limited": "the grid is too coarse for the rise time asked for; the edge shown "
                         "is {rise}: give more --points or a shorter --span",
    "arrivals-truncated": "there are more small echoes than are listed",
}


def add_arguments(parser) -> None:
    parser.add_argument("--run", required=True, metavar="RUN",
                        help="segments from the instrument out: '10 m:rg58, 20 m:rg213'")
    parser.add_argument("--load", required=True, metavar="SPEC",
                        help="open, short, match, '75 ohm', '50 ohm + 30 nH', '75 ohm || 10 pF', "
                             "'line 75 ohm' ...")
    parser.add_argument("--lump", action="append", default=[], metavar="AFTER:VALUE",
                        help="a lumped part after a segment (1 = after the first): '1: 5 nH' "
                             "series L, '2: 0.3 ohm' series R, '2: 4 pF' C across; repeatable")
    parser.add_argument("--source-z", metavar="Z",
                        help="the instrument's source impedance (default: the first cable's Z0)")
    edge = parser.add_mutually_exclusive_group()
    edge.add_argument("--rise-time", metavar="T",
                      help="10-90 %% rise time of the instrument's step, e.g. '200 ps'")
    edge.add_argument("--pulse-width", metavar="T",
                      help="send a pulse of this width instead of a step, e.g. '10 ns'")
    parser.add_argument("--points", metavar="N",
                        help="samples in the predicted trace (default 4096, at most 1048576)")
    parser.add_argument("--span", metavar="T",
                        help="time shown after the instrument's edge (default: the run's round "
                             "trip and a quarter more)")
    add_output_options(parser)


def _points(text: str | None) -> int | None:
    from calc.errors import InputError
    from calc.simulate import MAX_POINTS, MIN_POINTS

    if text is None:
        return None
    t = text.strip().replace("_", "").replace(",", "")
    if not t.isdigit():
        raise InputError("--points", f"{text!r} is not a whole number of points", "16384")
    n = int(t)
    if not MIN_POINTS <= n <= MAX_POINTS:
        raise InputError("--points", f"{n} points: give {MIN_POINTS} to {MAX_POINTS} (more "
                         "would exhaust memory)", "16384")
    return n


def run(args) -> int:
    data, lines, _cables = compute(args)
    return emit(args, data, lines)


def compute(args):
    """(data, lines, cables used): what ``run`` prints; the TUI's Echo panel plots the
    same data (its arrays and arrivals)."""
    from calc.loads import parse_load
    from calc.parse import parse
    from calc.run import parse_run
    from calc.simulate import Segment, parse_lump, simulate

    run_segments = parse_run(args.run, catalog().get, "--run")
    warn_hazards([s.cable for s in run_segments])
    segments = [Segment.from_run_segment(s) for s in run_segments]
    load = parse_load(args.load, "--load", lookup=lambda cid: catalog().get(cid))
    lumps = [parse_lump(text, len(segments)) for text in args.lump]
    prediction = simulate(
        segments, load, lumps=lumps,
        source_z_ohm=parse(args.source_z, "--source-z", "impedance") if args.source_z else None,
        rise_time_s=parse(args.rise_time, "--rise-time", "time") if args.rise_time else None,
        pulse_width_s=parse(args.pulse_width, "--pulse-width", "time") if args.pulse_width else None,
        n_points=_points(args.points),
        span_s=parse(args.span, "--span", "time") if args.span else None,
    )
    return _data(args, prediction), _lines(args, segments, prediction), \
        [s.cable for s in run_segments]


def logged_data(data: dict) -> dict:
    """What a job-log entry of a prediction holds, from ``--save`` and the Echo panel
    alike: the ``--json`` result with its arrays decimated to at most
    :data:`tui.joblog.picture.MAX_STORED_SAMPLES` samples (every echo keeps its extreme),
    enough for the report's picture; the inputs remake the full prediction."""
    from tui.fmt import json_ready
    from tui.joblog.picture import stored_samples

    arrays = stored_samples(data["level"], time_s=data["time_s"], distance_m=data["distance_m"])
    return json_ready({**data, **arrays})


def log_result(args, data: dict) -> dict:
    """``--save``: :func:`logged_data`."""
    return logged_data(data)


def _data(args, p) -> dict:
    return {
        "run": args.run,
        "load": args.load,
        "lumps": list(args.lump),
        "source_z_ohm": p.source_z_ohm,
        "rise_time_s": p.rise_time_s,
        "pulse_width_s": p.pulse_width_s,
        "span_s": p.span_s,
        "round_trip_s": p.round_trip_s,
        "frequency_step_hz": p.frequency_step_hz,
        "n_fft": p.n_fft,
        "warnings": list(p.warnings),
        "time_s": p.time_s,
        "distance_m": p.distance_m,
        "level": p.level,
        "arrivals": [{"time_s": a.time_s, "distance_m": a.distance_m, "size": a.size,
                      "start": a.start, "path": a.path} for a in p.arrivals],
    }


def _lines(args, segments, p) -> list[str]:
    from tui import fmt

    units, fraction = units_of(args)
    length = (lambda m: fmt.length(m, units, fraction))  # noqa: E731
    edge = (f"pulse {fmt.time(p.pulse_width_s)} wide, edges {fmt.time(p.rise_time_s)}"
            if p.pulse_width_s else f"step, rise time {fmt.time(p.rise_time_s)} (10-90 %)")
    total = sum(s.length_m for s in segments)
    lines = []
    for line in (f"run        {args.run}  ({len(segments)} segment{'s' if len(segments) > 1 else ''}, {length(total)}, round "
                 f"trip {fmt.time(p.round_trip_s)})",
                 f"load       {args.load}" + (f"   lumps: {', '.join(args.lump)}"
                                              if args.lump else ""),
                 f"instrument source {fmt.impedance(p.source_z_ohm)}, {edge}",
                 f"window     {fmt.time(p.span_s)}, {p.time_s.size} points"):
        lines += fmt.wrapped(line, indent=11)
    lines += ["", "level (reflected / incident) against distance from the instrument:"]
    lines += fmt.text_plot(p.distance_m, p.level, width=70, height=11, x_label=length)
    lines.append("")
    shown = sorted(sorted(p.arrivals, key=lambda a: -max(abs(a.size), abs(a.start or 0)))
                   [:SHOWN_ARRIVALS], key=lambda a: a.time_s)
    if shown:
        lines.append(f"{'time':>10} {'distance':>17} {'size':>7} {'first':>7}  path")
        for a in shown:
            head = (f"{fmt.time(a.time_s):>10} {length(a.distance_m):>17} {a.size:>+7.3f} "
                    f"{a.start:>+7.3f}  ")
            lines += fmt.wrapped(head + a.path, indent=len(head))
        if len(p.arrivals) > len(shown):
            lines.append(f"({len(p.arrivals) - len(shown)} smaller echoes in --json)")
        lines += fmt.wrapped("size: the level the echo adds once settled; first: the dip or "
                             "bump it shows first. A re-reflection shows beyond the place that "
                             "made it.", indent=0)
    else:
        lines.append("no echo above 0.001 of the incident step: the run looks matched.")
    for code in p.warnings:
        lines += fmt.wrapped("note: " + WARNING_TEXT[code].format(rise=fmt.time(p.rise_time_s)),
                             indent=6)
    return lines
