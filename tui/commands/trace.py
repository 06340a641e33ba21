"""``halftrip trace FILE``: read a recorded trace, find and name its events,
place them on a cable or a run, and compare them with the expected run.

FILE is a delimited text trace (time or distance, level) or a Touchstone
one-port sweep (``.s1p``), which is turned into a reflection trace first.
Nothing is written anywhere unless ``--save`` asks for a job-log entry.
"""

from __future__ import annotations

import textwrap
from pathlib import Path

from tui.commands.common import (
    add_output_options,
    add_velocity_options,
    emit,
    option,
    resolve_velocity,
    units_of,
)

NAME = "trace"
HELP = "read a recorded trace or .s1p sweep: find, place and name its reflection events"
LOGGABLE = True

#: Largest file read (bytes): a million-sample text trace is about 20 MB.
MAX_FILE_BYTES = 256 * 1024 * 1024
_WIDTH = 80
#: Re-reflections listed one by one; the rest are counted.
SHOWN_BOUNCES = 3


def add_arguments(parser) -> None:
    parser.add_argument("file", metavar="FILE",
                        help="trace file: delimited text (time or distance, level) or .s1p")
    add_velocity_options(parser, required=False)
    parser.add_argument("--run", metavar="RUN",
                        help="the run the trace was taken on, from the instrument out, "
                             "e.g. '2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58'")
    parser.add_argument("--tolerance", metavar="PCT",
                        help="relative VF tolerance, e.g. '3 %%' (default: the cable's)")
    parser.add_argument("--z0", metavar="Z",
                        help="reference impedance of the trace (default: the first cable's, "
                             "or 50 ohm)")
    read = parser.add_argument_group("reading the file")
    read.add_argument("--time-unit", metavar="UNIT",
                      help="unit of a time column when the file does not say, e.g. ns")
    read.add_argument("--distance-unit", metavar="UNIT",
                      help="unit of a distance column when the file does not say, e.g. m")
    read.add_argument("--level-unit", metavar="UNIT",
                      help="unit of the level column: V, mV, rho, mrho or %%")
    read.add_argument("--axis-vf", metavar="X",
                      help="velocity factor the instrument used to draw a distance axis "
                           "(default: the cable's)")
    read.add_argument("--rise-time", metavar="T",
                      help="the trace's 10-90 %% rise time, e.g. '0.5 ns' (default: measured "
                           "from the incident edge, or estimated)")
    read.add_argument("--incident", choices=("auto", "in-trace", "at-zero"), default="auto",
                      help="the incident edge is in the trace (volt traces), or the trace holds "
                           "reflections only with the reference plane at 0 (rho traces, "
                           "sweeps); default: from the level's unit")
    sweep = parser.add_argument_group("Touchstone sweeps")
    sweep.add_argument("--window", choices=("kaiser", "hann", "none"), default="kaiser",
                       help="window for the time view (default kaiser)")
    sweep.add_argument("--kaiser-beta", metavar="B", type=float, default=6.0,
                       help="Kaiser window beta (default 6)")
    sweep.add_argument("--band", metavar="LOW..HIGH",
                       help="frequencies used, e.g. '1 MHz..2 GHz' (default: the whole sweep)")
    sweep.add_argument("--dc", metavar="LOAD",
                       help="the far end's state at DC when the sweep lacks 0 Hz: open, short "
                            "or a resistance (default: extrapolated)")
    expect = parser.add_argument_group("comparing with the expected run")
    expect.add_argument("--expect-run", metavar="RUN", help="the run as it should be")
    expect.add_argument("--expect-load", metavar="SPEC",
                        help="the load it should end in: open, short, match, '75 ohm', ...")
    add_output_options(parser)


# ------------------------------------------------------------------ inputs


def _read_bytes(path_text: str) -> bytes:
    import stat

    from calc.errors import InputError

    path = Path(path_text).expanduser()
    limit = f"at most {MAX_FILE_BYTES // (1024 * 1024)} MB are read"
    try:
        info = path.stat()
        if stat.S_ISDIR(info.st_mode):
            raise IsADirectoryError
        if not stat.S_ISREG(info.st_mode):  # a pipe would block, /dev/zero never end
            raise InputError(path_text, "is not a regular file (a device or a pipe)")
        if info.st_size > MAX_FILE_BYTES:
            raise InputError(path_text, f"{info.st_size / 1e6:.0f} MB; {limit}")
        with path.open("rb") as fh:  # never more than the limit, even if it grows meanwhile
            data = fh.read(MAX_FILE_BYTES + 1)
        if len(data) > MAX_FILE_BYTES:
            raise InputError(path_text, f"grew past the limit while being read; {limit}")
        return data
    except ValueError as exc:  # a NUL in the name (pasted); InputError is one too
        if isinstance(exc, InputError):
            raise
        raise InputError(path_text, "is not a file name (it holds a NUL character)") from None
    except IsADirectoryError:
        raise InputError(path_text, "is a directory, not a trace file") from None
    except FileNotFoundError:
        raise InputError(path_text, "no such file") from None
    except OSError as exc:
        raise InputError(path_text, f"cannot read it ({exc.strerror or exc})") from None


def _run(text: str, field: str, tolerance: float | None = None, warned=()):
    """A run from the catalog; ``tolerance`` overrides each VF's. The hazard
    caution goes to stderr for cables not already in ``warned``."""
    from calc.run import parse_run
    from tui.commands.common import catalog, warn_hazards
    from tui.commands.locate import parse_run_segments

    segments = parse_run_segments(text, tolerance) if field == "--run" else \
        parse_run(text, catalog().get, field)
    known = {c.id for c in warned if c is not None}
    warn_hazards([s.cable for s in segments if s.cable.id not in known])
    return segments


def _band(text: str | None) -> tuple[float | None, float | None]:
    """``--band`` as (low, high) Hz: any form :func:`calc.parse.parse_band` reads
    (``"1 MHz..2 GHz"``, ``"1-500 MHz"``, as ``match`` and ``harness`` take it), or
    one open end (``"..2 GHz"``, ``"1 MHz.."``)."""
    from calc.parse import parse, parse_band

    if not text:
        return None, None
    t = text.strip()
    if t.startswith(".."):
        return None, parse(t[2:], "--band high", "frequency")
    if t.endswith(".."):
        return parse(t[:-2], "--band low", "frequency"), None
    return parse_band(t, "--band")


def _dc(text: str | None, z0: float) -> float | None:
    from calc.parse import parse

    if not text:
        return None
    word = text.strip().lower()
    if word == "open":
        return 1.0
    if word == "short":
        return -1.0
    r = parse(text, "--dc", "resistance")
    return (r - z0) / (r + z0)


class _Setup:
    """What the options say: placement, Z0, tolerance, and how to read the file."""

    def __init__(self, args):
        from calc.errors import InputError

        tolerance = option(args, "--tolerance", "tolerance")
        resolved = resolve_velocity(args, args.tolerance)
        if (resolved is None) == (args.run is None):
            raise InputError("--cable/--vf/--run", "give the cable (a velocity option) or "
                             "the run, one of them", "--cable rg58")
        self.segments = None
        self.vf = None
        self.vf_tolerance = 0.0
        self.cable = None
        if resolved is not None:
            self.vf = resolved.velocity.vf
            self.vf_tolerance = resolved.tolerance
            self.source = resolved.source
            self.cable = resolved.cable
            cable_z0 = resolved.cable.z0_ohm if resolved.cable is not None else None
        else:
            self.segments = _run(args.run, "--run", tolerance)
            self.source = f"run of {len(self.segments)} segment(s)"
            cable_z0 = self.segments[0].cable.z0_ohm
        self.z0 = option(args, "--z0", "impedance", cable_z0 or 50.0)
        self.z0_note = None if (args.z0 or cable_z0) else "reference impedance taken as 50 ohm"
        self.axis_vf = option(args, "--axis-vf", "vf", self.vf)
        self.tolerance = tolerance


# ----------------------------------------------------------------- the work


def analyse_file(args):
    """Read, transform (sweeps), analyse and place: (setup, info, notes, analysis).

    A problem the analysis finds with the trace itself is reported against the file.
    """
    from calc.errors import InputError

    try:
        return _analyse_file(args)
    except InputError as exc:
        if exc.field != "trace":
            raise
        raise InputError(args.file, exc.problem, exc.example) from None


def _analyse_file(args):
    import numpy as np

    from calc import events as ev
    from calc.constants import C0_M_PER_S
    from calc.errors import InputError
    from calc.tdr import time_domain
    from calc.trace_read import Sweep, read_file

    setup = _Setup(args)
    raw = _read_bytes(args.file)
    got = read_file(raw, args.file, z0_ohm=setup.z0, time_unit=args.time_unit,
                    distance_unit=args.distance_unit, level_unit=args.level_unit)
    info: dict = {"file": args.file, "z0_ohm": setup.z0, "velocity_source": setup.source}
    notes: list[str] = [setup.z0_note] if setup.z0_note else []
    ringing = 0.0
    rise = option(args, "--rise-time", "time")
    if isinstance(got, Sweep):
        td = time_domain(got.frequency_hz, got.s11, window=args.window,
                         kaiser_beta=args.kaiser_beta, band_hz=_band(args.band),
                         dc_value=_dc(args.dc, setup.z0))
        time_s, level = td.time_s, td.step
        incident = False
        rise, ringing = rise or td.rise_time_s, td.ringing
        notes += list(td.notes)
        info.update(format="touchstone", points=int(got.frequency_hz.size),
                    file_z0_ohm=got.file_z0_ohm, time_domain={
                        "window": td.window, "kaiser_beta": td.kaiser_beta,
                        "band_low_hz": td.band_low_hz, "band_high_hz": td.band_high_hz,
                        "frequency_step_hz": td.frequency_step_hz,
                        "alias_free_s": td.alias_free_s, "dc_value": td.dc_value,
                        "dc_source": td.dc_source, "resampled": td.resampled})
    else:
        if got.axis == "distance":
            if setup.axis_vf is None:
                raise InputError("--axis-vf", "the trace's axis is distance: give the velocity "
                                 "factor the instrument used to draw it", "0.66")
            time_s = 2.0 * got.x / (setup.axis_vf * C0_M_PER_S)
        else:
            time_s = got.x
        level = got.level
        if args.incident == "auto":
            incident = got.level_unit != "rho"
            if not got.level_unit and not args.level_unit:
                notes.append("the level's unit is not stated: it is taken as the instrument's "
                             "own, with its incident edge in the trace; if the trace holds "
                             "reflections only, give --level-unit rho")
        else:
            incident = args.incident == "in-trace"
        if not incident and got.level_unit == "V":
            raise InputError("--incident", "a trace of reflections only must be in rho "
                             "(the level in volts needs the incident edge to scale it)")
        info.update(format="delimited", samples=int(got.x.size), axis=got.axis,
                    level_unit=got.level_unit or None)
    setup.time_s, setup.level = np.asarray(time_s), np.asarray(level)  # the TUI plots them
    analysis = ev.analyse(setup.time_s, setup.level, z0_ohm=setup.z0,
                          incident_edge=incident, rise_time_s=rise, ringing=ringing)
    if setup.segments is None:
        analysis = ev.place(analysis, vf=setup.vf, vf_tolerance=setup.vf_tolerance,
                            cable=setup.cable)
    else:
        analysis = ev.place(analysis, segments=setup.segments)
    if setup.cable is None and setup.segments is None:
        notes.append("no loss model with a bare velocity: far events read smaller than they "
                     "are; give --cable or --run for the cable's loss")
    return setup, info, notes, analysis


def compare_with_expected(args, setup, analysis):
    """The comparison with ``--expect-run``/``--expect-load``, or None without them."""
    from calc import events as ev
    from calc.errors import InputError
    from calc.loads import parse_load
    from calc.simulate import simulate
    from tui.commands.common import catalog

    if not (args.expect_run or args.expect_load):
        return None
    if not (args.expect_run and args.expect_load):
        raise InputError("--expect-run/--expect-load", "give both the expected run and the "
                         "load it should end in", "--expect-load open")
    used = [s.cable for s in setup.segments] if setup.segments else [setup.cable]
    segments = _run(args.expect_run, "--expect-run", warned=used)
    load = parse_load(args.expect_load, "--expect-load", lookup=catalog().get)
    pieces = ev.run_segments(segments)
    round_trip = 2.0 * sum(p.delay_s for p in pieces)
    span = analysis.end_delay_s if analysis.end_delay_s >= 1.05 * round_trip else None
    prediction = simulate(pieces, load, rise_time_s=analysis.rise_time_s, span_s=span)
    setup.prediction = prediction  # the TUI draws it under the recorded trace
    tolerance = setup.tolerance if setup.tolerance is not None else \
        max(s.cable.vf_tolerance for s in segments)
    return ev.compare(analysis, prediction, segments, vf_tolerance=tolerance)


def expected_record(x) -> dict:
    return {"round_trip_delay_s": x.round_trip_delay_s, "distance_m": x.distance_m,
            "size": x.size, "kind": x.kind, "path": x.path, "tolerance_s": x.tolerance_s,
            "tolerance_m": x.tolerance_m}


def pairing_record(p, events, z0_ohm: float) -> dict:
    return {"expected": expected_record(p.expected),
            "found": event_record(p.found, z0_ohm, events),
            "event_number": events.index(p.found) + 1, "offset_s": p.offset_s,
            "offset_m": p.offset_m, "size_differs": p.size_differs,
            "kind_differs": p.kind_differs}


def comparison_data(cmp, analysis) -> dict:
    events = list(analysis.events)
    return {
        "matched": [pairing_record(p, events, analysis.z0_ohm) for p in cmp.matched],
        "misplaced": [pairing_record(p, events, analysis.z0_ohm) for p in cmp.misplaced],
        "missing": [expected_record(x) for x in cmp.missing],
        "unexpected": [{**event_record(e, analysis.z0_ohm, events),
                        "event_number": events.index(e) + 1} for e in cmp.unexpected],
        "outside_window": [expected_record(x) for x in cmp.outside],
        "vf_tolerance": cmp.vf_tolerance,
    }


def describe_comparison(cmp, analysis, units: str, fraction: int) -> list[str]:
    """Human lines for a :class:`calc.events.Comparison`."""
    from calc.events import TOLERANCE_RISE_TIMES
    from tui import fmt

    events = list(analysis.events)

    def at(d):
        return fmt.length(d, units, fraction)

    def num(e):
        return f"#{events.index(e) + 1}"

    lines = ["", "against the expected run:"]
    if cmp.matched:
        lines.append("  as expected: " + ", ".join(
            num(p.found) + (" (size differs)" if p.size_differs else "") for p in cmp.matched))
    bounces = [e for e in cmp.unexpected if e.kind == "re_reflection"]
    for e in cmp.unexpected:
        if e.kind == "re_reflection" and len(bounces) > SHOWN_BOUNCES:
            continue
        lines.append(f"  unexpected: {num(e)} {_kind_text(e.kind)} at "
                     f"{at(e.distance_m) if e.distance_m is not None else '-'}")
    if len(bounces) > SHOWN_BOUNCES:
        lines.append(f"  unexpected: {len(bounces)} re-reflections ({num(bounces[0])} to "
                     f"{num(bounces[-1])}), second trips between the mismatches above")
    for x in cmp.missing:
        lines.append(f"  missing: {_kind_text(x.kind)} expected at {at(x.distance_m)} "
                     f"({fmt.time(x.round_trip_delay_s)}; {x.path or 'predicted'})")
    for p in cmp.misplaced:
        way = "farther" if p.offset_m > 0 else "nearer"
        lines.append(f"  misplaced: {num(p.found)} {_kind_text(p.found.kind)} is "
                     f"{at(abs(p.offset_m))} {way} than expected ({at(p.expected.distance_m)}, "
                     f"tolerance {at(p.expected.tolerance_m)})")
    if cmp.outside:
        lines.append(f"  {len(cmp.outside)} expected event(s) lie outside the recorded window")
    if not (cmp.unexpected or cmp.missing or cmp.misplaced):
        lines.append("  every event is where the expected run puts it")
    lines.append(f"  (matched within {TOLERANCE_RISE_TIMES:g} rise times plus the cables' VF "
                 f"tolerance, {fmt.percent(cmp.vf_tolerance)} of the delay)")
    return _fit(lines)


def event_record(e, z0_ohm: float, events=()) -> dict:
    """One event as a JSON record (shared with the TUI's export)."""
    return {
        "round_trip_delay_s": e.round_trip_delay_s,
        "distance_m": e.distance_m,
        "distance_low_m": e.distance_low_m,
        "distance_high_m": e.distance_high_m,
        "segment_index": e.segment_index,
        "cable_id": e.cable_id,
        "offset_in_segment_m": e.offset_in_segment_m,
        "beyond_end": e.beyond_end,
        "at_far_end": e.at_far_end,
        "joint_index": e.joint_index,
        "loss_delay_s": e.loss_delay_s,
        "loss_scale": e.loss_scale,
        "size": e.size,
        "level_before": e.level_before,
        "level_after": e.level_after,
        "level_settled": e.level_settled,
        "impedance_ohm": e.impedance_ohm,
        "shape": e.shape,
        "kind": e.kind,
        "confidence": e.confidence,
        "description": describe_event(e, z0_ohm, events),
        "snr": e.snr,
        "time_constant_s": e.time_constant_s,
        "capacitance_f": e.capacitance_f,
        "inductance_h": e.inductance_h,
        "alternatives": list(e.alternatives),
        "bounce_of_events": None if e.bounce_of is None else [k + 1 for k in e.bounce_of],
    }


def _kind_text(kind: str) -> str:
    """An event kind in words: ``"lower impedance"``, ``"re-reflection"``."""
    return "re-reflection" if kind == "re_reflection" else kind.replace("_", " ")


def describe_event(e, z0_ohm: float, events=()) -> str:
    """One plain sentence on what the event probably is (shared with the TUI).

    The wording says what else it could be; it never says a line is safe.
    """
    from calc.events import implied_impedance
    from tui import fmt

    def z_text(level: float) -> str:
        z = implied_impedance(level, z0_ohm)
        return "an open" if z == float("inf") else fmt.impedance(z, 3)

    loss = " (allowing for the cable's loss)" if e.loss_scale < 0.98 else ""
    at_end = " at the end of the run" if e.at_far_end else ""
    kind = e.kind
    if kind == "re_reflection":
        if e.bounce_of is not None and events:
            a, b = (events[k] for k in e.bounce_of)
            return (f"{e.size:+.3f}, timed as a second trip between the reflections at "
                    f"{fmt.time(a.round_trip_delay_s)} and {fmt.time(b.round_trip_delay_s)}: "
                    "a re-reflection, not a fault of its own")
        return (f"{e.size:+.3f} after the far end (an open, a short or the end of the described "
                "run): most likely a re-reflection, the wave's second trip between two "
                "mismatches; or the run is longer than described")
    creep = (f" and creeps on to {e.level_settled:+.3f}"
             if abs(e.level_settled - e.level_after) > 0.05 else "")
    if kind == "open":
        return (f"rises to {e.level_after:+.3f}{creep}{loss}: an open{at_end}, or a very "
                "high impedance (a broken centre conductor, an unterminated end)")
    if kind == "short":
        return (f"falls to {e.level_after:+.3f}{creep}{loss}: a short{at_end}, or a very "
                "low impedance (a crushed or shorted cable, water in a connector)")
    if kind == "end_of_run":
        return f"step of {e.size:+.3f} at the far end of the run: a load of about " \
               f"{z_text(e.level_after)}"
    settles = f"it settles to {e.level_settled:+.3f}, {z_text(e.level_settled)}"
    tau = f", time constant about {fmt.time(e.time_constant_s, 3)}" if e.time_constant_s else ""
    if kind == "inductive_load" and e.shape == "bump":
        return (f"brief bump of {e.size:+.3f} at the far end: a load with about "
                f"{fmt.component(e.inductance_h or 0.0, 'H')} in series ({settles})")
    if kind == "capacitive_load" and e.shape == "dip":
        return (f"brief dip of {e.size:+.3f} at the far end: a load with about "
                f"{fmt.component(e.capacitance_f or 0.0, 'F')} across it ({settles})")
    if kind == "capacitive_load":
        return (f"falls like a short, then relaxes upward ({settles}{tau}): a capacitive load "
                "or a capacitor across the line")
    if kind == "inductive_load":
        return (f"rises like an open, then relaxes downward ({settles}{tau}): an inductive "
                "load or an inductance in series")
    if kind == "inductive_bump":
        return (f"brief bump of {e.size:+.3f}: a series inductance of about "
                f"{fmt.component(e.inductance_h or 0.0, 'H')} (a connector, a splice, a "
                "pigtail) or a short piece of higher impedance")
    if kind == "capacitive_dip":
        return (f"brief dip of {e.size:+.3f}: a shunt capacitance of about "
                f"{fmt.component(e.capacitance_f or 0.0, 'F')} (a connector, a kink or crushed "
                "spot, a tap) or a short piece of lower impedance")
    tail = (f" or, if the run ends here, a load of about {z_text(e.level_after)}"
            if "end_of_run" in e.alternatives else "")
    if _back_to_line(e):
        # a step that undoes the one before it: the far end of a section, not a new one
        section = "lower" if kind == "higher_impedance" else "higher"
        other = "higher" if kind == "higher_impedance" else "lower"
        way = "up" if kind == "higher_impedance" else "down"
        return (f"step {way} of {e.size:+.3f} back to about {z_text(e.level_after)}: the far end "
                f"of the {section}-impedance section before it (or a {other}-impedance "
                f"section){tail}")
    if kind == "higher_impedance":
        return (f"step up of {e.size:+.3f} to about {z_text(e.level_after)}: a higher-impedance "
                f"section (a different cable, a stretched or damaged spot){tail}")
    return (f"step down of {e.size:+.3f} to about {z_text(e.level_after)}: a lower-impedance "
            f"section (water in the cable, a crushed spot, a different cable){tail}")


def _back_to_line(e) -> bool:
    """A section step that brings the level most of the way back to the line's own
    (rho near 0) from the other side: the end of a section, read as such."""
    if e.kind not in ("higher_impedance", "lower_impedance"):
        return False
    return e.level_before * e.size < 0 and abs(e.level_after) < 0.5 * abs(e.level_before)


def describe(info: dict, notes: list[str], analysis, units: str, fraction: int) -> list[str]:
    """Human lines for an analysis (shared with the TUI)."""
    from tui import fmt

    a = analysis
    lines = [f"trace {info['file']} ({info['format']}"
             + (f", {info['samples']} samples)" if "samples" in info
                else f", {info['points']} frequency points)")]
    if a.incident is not None:
        lines.append(f"incident edge at {fmt.time(a.incident.time_s)}, rise time "
                     f"{fmt.time(a.rise_time_s)}; levels as fractions of its height (rho)")
    else:
        lines.append(f"reflections only, reference plane at 0; rise time {fmt.time(a.rise_time_s)}")
    lines.append(f"noise {a.noise_rms:.2g} rho rms; smallest event reported {a.threshold:.2g} rho;"
                 f" Z0 {fmt.impedance(a.z0_ohm)}")
    lines.append(f"placed with {info['velocity_source']}")
    if not a.events:
        lines.append("no reflection stands out of the noise between "
                     f"{fmt.time(max(a.start_delay_s, 0.0))} and {fmt.time(a.end_delay_s)}")
    else:
        lines.append("")
        lines.append(f"{'#':>2}  {'delay':>10}  {'distance':>15}  {'size':>7}  {'Z ohm':>7}  "
                     f"{'kind':<17} {'conf':>4}")
        bounces = 0
        for i, e in enumerate(a.events, start=1):
            if e.kind == "re_reflection":
                bounces += 1
                if bounces > SHOWN_BOUNCES:
                    continue
            z = ("-" if e.kind == "re_reflection" else "open" if e.impedance_ohm == float("inf")
                 else f"{e.impedance_ohm:.4g}")  # a bounce's level is no impedance of the line
            dist = "-" if e.distance_m is None else fmt.event_distance(e, units, fraction).value
            lines.append(f"{i:>2}  {fmt.time(e.round_trip_delay_s):>10}  {dist:>15}  "
                         f"{e.size:+7.3f}  {z:>7}  {_kind_text(e.kind):<17} {e.confidence:4.2f}")
            where = fmt.event_place(e, units, fraction)
            for text in ([where] if where else []) + [describe_event(e, a.z0_ohm, a.events)]:
                lines += textwrap.wrap(text, _WIDTH, initial_indent="    ",
                                       subsequent_indent="    ")
        if bounces > SHOWN_BOUNCES:
            lines.append(f"    ... and {bounces - SHOWN_BOUNCES} more re-reflections "
                         "(all of them with --json)")
    for note in list(a.notes) + notes:
        lines += textwrap.wrap("note: " + note, _WIDTH, subsequent_indent="      ")
    return _fit(lines)


def _fit(lines: list[str]) -> list[str]:
    """Lines folded to the 80 columns of a field laptop's terminal."""
    from tui.fmt import wrapped

    out = []
    for line in lines:
        out += wrapped(line, indent=4, width=_WIDTH) if len(line) > _WIDTH else [line]
    return out


def rho_trace(setup, analysis):
    """The recorded samples as the analysis reads them: time from the reference
    (the incident edge's midpoint, or 0) and level in rho (calc.events, step 1),
    from the earliest delay the analysis sees (the instrument's own edge and
    the dead zone are left out). The TUI plots these; the job log keeps them."""
    t = setup.time_s - analysis.time_zero_s
    edge = analysis.incident
    level = setup.level if edge is None else (setup.level - edge.top) / edge.height
    keep = t >= analysis.start_delay_s
    return t[keep], level[keep]


def distance_axis(time_s, setup):
    """Distance of every sample on the placement the analysis used."""
    from calc.locate import distance_from_delay_m

    if setup.segments is None:
        return distance_from_delay_m(time_s, setup.vf)
    from calc.events import run_segments
    from calc.simulate import distance_from_round_trip

    return distance_from_round_trip(time_s, run_segments(setup.segments))


def result_data(setup, info: dict, notes: list[str], analysis, cmp=None,
                expected_run: str | None = None, expected_load: str | None = None) -> dict:
    """What ``halftrip trace --json`` prints (the Trace panel saves the same)."""
    a = analysis
    data = {
        **info,
        "incident_edge_s": a.incident.time_s if a.incident else None,
        "rise_time_s": a.rise_time_s,
        "sample_interval_s": a.sample_interval_s,
        "noise_rms": a.noise_rms,
        "threshold": a.threshold,
        "events": [event_record(e, a.z0_ohm, a.events) for e in a.events],
        "notes": list(a.notes) + list(notes),
    }
    if cmp is not None:
        data.update(expected_run=expected_run, expected_load=expected_load,
                    **comparison_data(cmp, analysis))
    return data


def logged_data(setup, info: dict, notes: list[str], analysis, cmp=None,
                expected_run: str | None = None, expected_load: str | None = None) -> dict:
    """What a job-log entry of a trace holds, from the CLI's ``--save`` and the Trace
    panel alike: the ``--json`` result plus ``"trace"``, the samples the analysis read
    (time, distance on the placement, level in rho) in at most
    :data:`tui.joblog.picture.MAX_STORED_SAMPLES` each, decimated so every spike keeps
    its extreme, for the report's picture with the events marked."""
    from tui.fmt import json_ready
    from tui.joblog.picture import stored_samples

    t, rho = rho_trace(setup, analysis)
    data = result_data(setup, info, notes, analysis, cmp, expected_run, expected_load)
    return json_ready({**data, "trace": stored_samples(rho, time_s=t,
                                                       distance_m=distance_axis(t, setup))})


#: The last analysis ``run`` printed, for ``--save`` (:func:`log_result`): (args, its parts).
_printed: tuple | None = None


def log_result(args, data: dict) -> dict:
    """``--save``: the printed result and the trace's samples (:func:`logged_data`)."""
    if _printed is None or _printed[0] is not args:
        return data
    return logged_data(*_printed[1], expected_run=args.expect_run,
                       expected_load=args.expect_load)


def run(args) -> int:
    global _printed
    units, fraction = units_of(args)
    setup, info, notes, analysis = analyse_file(args)
    lines = describe(info, notes, analysis, units, fraction)
    cmp = compare_with_expected(args, setup, analysis)
    if cmp is not None:
        lines += describe_comparison(cmp, analysis, units, fraction)
    data = result_data(setup, info, notes, analysis, cmp, args.expect_run, args.expect_load)
    _printed = (args, (setup, info, notes, analysis, cmp))
    return emit(args, data, lines)
