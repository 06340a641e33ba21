"""``halftrip locate``: where is the reflection seen at this round-trip delay?

Four forms, one per field question:

* ``locate DELAY --cable ID`` (or any velocity option): one cable;
* ``locate --distance L --cable ID``: the reverse, when will a reflection at
  this distance show;
* ``locate DELAY --run "2 m:rg58, 45 m:hardline-50-half"``: a run of cables
  (``--distance`` works here too);
* ``locate --from-a T --from-b T --length L``: one cable read from both ends.
"""

from __future__ import annotations

from tui.commands.common import (
    add_output_options,
    add_velocity_options,
    emit,
    option,
    resolve_velocity,
    units_of,
)

NAME = "locate"
HELP = "turn a round-trip reflection delay into a distance (one cable, a run, or both ends)"
LOGGABLE = True

_LABEL = 20  # width of the label column in the human output


def add_arguments(parser) -> None:
    parser.add_argument("delay", nargs="?", metavar="DELAY",
                        help="round-trip delay of the reflection, e.g. '245 ns'")
    add_velocity_options(parser, required=False)
    parser.add_argument("--tolerance", metavar="PCT",
                        help="relative VF tolerance, e.g. '3 %%' (default: the cable's)")
    parser.add_argument("--rise-time", metavar="T",
                        help="instrument rise time, e.g. '2 ns': gives the resolution")
    parser.add_argument("--pulse-width", metavar="T",
                        help="instrument pulse width, e.g. '10 ns': gives the dead zone")
    parser.add_argument("--distance", metavar="L",
                        help="the reverse: when will a reflection at this distance show")
    parser.add_argument("--run", metavar="SEGMENTS",
                        help="a run of cables from the instrument out, "
                             "e.g. '2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58'")
    both = parser.add_argument_group("from both ends (one cable of known length)")
    both.add_argument("--from-a", metavar="T", help="round-trip delay seen from end A")
    both.add_argument("--from-b", metavar="T", help="round-trip delay seen from end B")
    both.add_argument("--length", metavar="L", help="length of the cable between A and B")
    add_output_options(parser)


# ---------------------------------------------------------------- shared text


def _row(label: str, text: str) -> str:
    return f"{label:<{_LABEL}} {text}"


def _instrument_lines(limits, units: str, fraction: int) -> list[str]:
    """Lines for a :class:`calc.locate.InstrumentLimits` (one cable and run forms)."""
    from tui import fmt

    lines = []
    if limits.resolution_m is not None:
        lines.append(_row("resolution", f"{fmt.length(limits.resolution_m, units, fraction)}"
                                        f"  (rise time {fmt.time(limits.rise_time_s)}: closer "
                                        "events merge)"))
    if limits.dead_zone_m is not None:
        lines.append(_row("dead zone", f"{fmt.length(limits.dead_zone_m, units, fraction)}"
                                       f"  (pulse width {fmt.time(limits.pulse_width_s)} hides "
                                       "nearer events)"))
        if limits.in_dead_zone:
            lines.append("note: this event is inside the dead zone; the reading is doubtful")
    return lines


def _instrument(args) -> tuple[float | None, float | None]:
    """``--rise-time`` and ``--pulse-width`` in seconds (None when not given)."""
    return option(args, "--rise-time", "time"), option(args, "--pulse-width", "time")


def _instrument_data(limits) -> dict:
    data = {}
    if limits.resolution_m is not None:
        data.update(rise_time_s=limits.rise_time_s, resolution_m=limits.resolution_m)
    if limits.dead_zone_m is not None:
        data.update(pulse_width_s=limits.pulse_width_s, dead_zone_m=limits.dead_zone_m,
                    in_dead_zone=limits.in_dead_zone)
    return data


# ---------------------------------------------------------------- one cable


def describe_location(loc, source: str, units: str = "metric", fraction: int = 16) -> list[str]:
    """Human lines for a :class:`calc.locate.Location` (shared with the TUI); the distance
    to the precision its range allows (:func:`tui.fmt.uncertain_length`)."""
    from tui import fmt

    shown = fmt.uncertain_length(loc.distance_m, loc.distance_low_m, loc.distance_high_m,
                                 units, fraction)
    lines = [
        f"velocity from {source}",
        _row("round-trip delay", fmt.time(loc.round_trip_delay_s)),
        _row("velocity factor", f"{fmt.vf(loc.vf)} +/- {fmt.percent(loc.vf_tolerance)}"),
        _row("distance", str(shown)),
        _row("range", shown.span),
    ]
    if loc.vf_tolerance == 0.0:
        lines.append("note: no VF tolerance, so no range; give one with --tolerance '3 %'")
    return lines + _instrument_lines(loc.instrument, units, fraction)


def describe_expected(pred, source: str, units: str = "metric", fraction: int = 16) -> list[str]:
    """Human lines for a :class:`calc.locate.DelayPrediction` (shared with the TUI)."""
    from tui import fmt

    return [
        f"velocity from {source}",
        _row("distance", fmt.length(pred.distance_m, units, fraction)),
        _row("round-trip delay", fmt.time(pred.round_trip_delay_s)),
        _row("range", f"{fmt.time(pred.round_trip_delay_low_s)} to "
                      f"{fmt.time(pred.round_trip_delay_high_s)}"),
    ]


def _one_cable(args, delay_s, distance_m, units, fraction) -> int:
    from calc import locate as core
    from calc.errors import InputError

    rise, width = _instrument(args)
    resolved = resolve_velocity(args, args.tolerance)
    if resolved is None:
        raise InputError("--cable", "give the cable (or a velocity option, or --run)", "rg58")
    vf = resolved.velocity.vf
    common = {"vf": vf, "vf_tolerance": resolved.tolerance, "velocity_source": resolved.source,
              "cable_id": resolved.cable.id if resolved.cable else None}
    if distance_m is not None:
        pred = core.expected_delay(distance_m, vf, resolved.tolerance)
        data = {"mode": "expected-delay", **common, "distance_m": pred.distance_m,
                "round_trip_delay_s": pred.round_trip_delay_s,
                "round_trip_delay_low_s": pred.round_trip_delay_low_s,
                "round_trip_delay_high_s": pred.round_trip_delay_high_s}
        return emit(args, data, describe_expected(pred, resolved.source, units, fraction))
    loc = core.locate(delay_s, vf, resolved.tolerance, rise, width)
    data = {"mode": "one-cable", **common, "round_trip_delay_s": loc.round_trip_delay_s,
            "distance_m": loc.distance_m, "distance_low_m": loc.distance_low_m,
            "distance_high_m": loc.distance_high_m, **_instrument_data(loc.instrument)}
    return emit(args, data, describe_location(loc, resolved.source, units, fraction))


# ---------------------------------------------------------------- a run


def parse_run_segments(text: str, tolerance: float | None = None):
    """The ``--run`` text as RunSegments from the catalog; ``tolerance`` overrides each VF's."""
    import dataclasses

    from calc.run import RunSegment, parse_run
    from tui.commands.common import catalog

    segments = parse_run(text, catalog().get)
    if tolerance is not None:
        segments = tuple(RunSegment(s.length_m, dataclasses.replace(s.cable,
                                                                    vf_tolerance=tolerance))
                         for s in segments)
    return segments


def describe_run(segments, units: str = "metric", fraction: int = 16) -> list[str]:
    """Human lines listing a run's segments and the expected delay of every junction."""
    from calc.locate import run_junctions
    from tui import fmt

    junctions = run_junctions(segments)
    lines = [f"run of {len(segments)} segment(s), "
             f"{fmt.length(junctions[-1].distance_m, units, fraction)} to the far end"]
    for i, s in enumerate(segments, start=1):
        lines.append(f"  {i:>3}  {fmt.length(s.length_m, units, fraction):>17}  "
                     f"{s.cable.id:<20} VF {fmt.vf(s.cable.vf)} +/- "
                     f"{fmt.percent(s.cable.vf_tolerance)}")
    lines.append("expected reflections (round trip from the instrument):")
    lines.append(f"  {'joint of':<9} {'distance':>17}  {'round trip':>10}  range")
    for j in junctions:
        # "1 and 2", not "1/2", which a cable person reads as one half
        label = ("far end" if j.is_far_end
                 else f"{j.after_segment_index + 1} and {j.after_segment_index + 2}")
        lines.append(f"  {label:<9} {fmt.length(j.distance_m, units, fraction):>17}  "
                     f"{fmt.time(j.round_trip_delay_s):>10}  {fmt.time(j.round_trip_delay_low_s)}"
                     f" to {fmt.time(j.round_trip_delay_high_s)}")
    return lines


def describe_run_location(loc, segments, units: str = "metric", fraction: int = 16) -> list[str]:
    """Human lines for a :class:`calc.locate.RunLocation` (shared with the TUI); distances
    to the precision the range allows (:func:`tui.fmt.uncertain_length`)."""
    from tui import fmt

    n = len(segments)
    shown = fmt.uncertain_length(loc.distance_m, loc.distance_low_m, loc.distance_high_m,
                                 units, fraction)
    offset = fmt.uncertain_length(loc.offset_in_segment_m, loc.offset_in_segment_m - (
        loc.distance_m - loc.distance_low_m), loc.offset_in_segment_m + (
        loc.distance_high_m - loc.distance_m), units, fraction).value  # the same step
    where = f"{loc.segment_index + 1} of {n} ({loc.cable_id}), {offset} into it"
    possible = ", ".join(str(i + 1) for i in loc.possible_segment_indices)
    lines = [
        _row("round-trip delay", fmt.time(loc.round_trip_delay_s)),
        _row("segment", where),
        _row("distance", f"{shown} from the instrument"),
        _row("range", shown.span
             + ("" if len(loc.possible_segment_indices) == 1 else f" (segments {possible})")),
    ]
    if loc.beyond_nominal_end:
        lines.append("note: later than the far end should show, but within the cables' VF "
                     "tolerance:")
        lines.append("      most likely the far end itself (or the run is longer than listed)")
    return lines + _instrument_lines(loc.instrument, units, fraction) + describe_run(segments, units,
                                                                         fraction)


def _in_run(args, delay_s, distance_m, units, fraction) -> int:
    from calc import locate as core
    from calc.errors import InputError
    from tui.commands.common import VELOCITY_OPTIONS, warn_hazards

    for flag, dest, *_ in VELOCITY_OPTIONS:
        if getattr(args, dest, None) is not None:
            raise InputError(flag, "--run takes each segment's cable from the catalog; "
                                   f"leave out {flag}", "--run '2 m:rg58, 45 m:rg213'")
    tolerance = option(args, "--tolerance", "tolerance")
    rise, width = _instrument(args)
    segments = parse_run_segments(args.run, tolerance)
    seg_data = [{"length_m": s.length_m, "cable_id": s.cable.id, "vf": s.cable.vf,
                 "vf_tolerance": s.cable.vf_tolerance} for s in segments]
    junctions = list(core.run_junctions(segments))  # emit() turns dataclasses into JSON
    if distance_m is not None:
        pred = core.run_delay_for_distance(distance_m, segments)
        warn_hazards([s.cable for s in segments])
        data = {"mode": "run-expected-delay", "distance_m": pred.distance_m,
                "round_trip_delay_s": pred.round_trip_delay_s,
                "round_trip_delay_low_s": pred.round_trip_delay_low_s,
                "round_trip_delay_high_s": pred.round_trip_delay_high_s,
                "segments": seg_data, "junctions": junctions}
        lines = describe_expected(pred, "the run's cables", units, fraction)
        return emit(args, data, lines + describe_run(segments, units, fraction))
    loc = core.locate_in_run(delay_s, segments, rise, width)
    warn_hazards([s.cable for s in segments])
    data = {"mode": "run", "round_trip_delay_s": loc.round_trip_delay_s,
            "segment_index": loc.segment_index, "cable_id": loc.cable_id,
            "offset_in_segment_m": loc.offset_in_segment_m, "distance_m": loc.distance_m,
            "distance_low_m": loc.distance_low_m, "distance_high_m": loc.distance_high_m,
            "possible_segment_indices": list(loc.possible_segment_indices),
            "beyond_nominal_end": loc.beyond_nominal_end, "total_length_m": loc.total_length_m,
            **_instrument_data(loc.instrument), "segments": seg_data, "junctions": junctions}
    return emit(args, data, describe_run_location(loc, segments, units, fraction))


# ---------------------------------------------------------------- both ends


def describe_two_ended(loc, cable_id: str | None, units: str = "metric",
                       fraction: int = 16) -> list[str]:
    """Human lines for a :class:`calc.locate.TwoEndedLocation` (shared with the TUI)."""
    from tui import fmt

    lines = [
        _row("cable length", fmt.length(loc.length_m, units, fraction)),
        _row("delay from end A", fmt.time(loc.delay_from_a_s)),
        _row("delay from end B", fmt.time(loc.delay_from_b_s)),
        _row("distance from A", fmt.length(loc.distance_from_a_m, units, fraction)),
        _row("distance from B", fmt.length(loc.distance_from_b_m, units, fraction)),
        # x_A = L t_A / (t_A + t_B) scales with L: the length's error is the position's
        _row("if L is 1 % off", "each distance is 1 % off ("
                                f"{fmt.length(loc.distance_from_a_m / 100.0, units, fraction)} "
                                "from A)"),
        _row("implied VF", f"{fmt.vf(loc.implied_vf, 4)}  (from the two readings and the length)"),
    ]
    if loc.catalog_vf is None:
        return lines
    name = f" ({cable_id})" if cable_id else ""
    lines.append(_row("catalog VF", f"{fmt.vf(loc.catalog_vf)} +/- {fmt.percent(loc.vf_tolerance)}"
                                    f"{name}; the implied VF is {loc.vf_disagreement * 100:+.1f} %"
                                    " off it"))
    if loc.disagrees:
        lines.append("warning: the implied VF is outside the catalog tolerance: the two readings")
        lines.append("         may not be the same event, or the length is wrong (or the catalog")
        lines.append("         value does not fit this cable)")
    return lines


def _two_ended(args, units, fraction) -> int:
    import dataclasses

    from calc import locate as core
    from calc.errors import InputError
    from calc.parse import parse

    for flag, value in (("--from-a", args.from_a), ("--from-b", args.from_b),
                        ("--length", args.length)):
        if value is None:
            raise InputError(flag, "locating from both ends needs --from-a, --from-b and "
                                   "--length", "--from-a '1.2 us' --from-b '0.8 us' --length 250m")
    t_a = parse(args.from_a, "--from-a", "time")
    t_b = parse(args.from_b, "--from-b", "time")
    length_m = parse(args.length, "--length", "length")
    core.locate_two_ended(t_a, t_b, length_m)  # refuse impossible readings before any caution
    resolved = resolve_velocity(args, args.tolerance)
    cable_id = resolved.cable.id if resolved and resolved.cable else None
    loc = core.locate_two_ended(t_a, t_b, length_m,
                                resolved.velocity.vf if resolved else None,
                                resolved.tolerance if resolved else 0.0)
    data = {"mode": "two-ended", **dataclasses.asdict(loc), "cable_id": cable_id}
    return emit(args, data, describe_two_ended(loc, cable_id, units, fraction))


# ---------------------------------------------------------------- entry


def log_kind(args) -> str:
    """The job-log kind of a ``--save``: the kinds the Locate panel saves its modes under
    (``locate`` one cable, ``locate-run``, ``locate-two-ended``), so an entry reads the
    same from either front end."""
    if any(v is not None for v in (args.from_a, args.from_b, args.length)):
        return "locate-two-ended"
    return "locate-run" if args.run is not None else "locate"


def run(args) -> int:
    from calc.errors import InputError
    from calc.parse import parse

    units, fraction = units_of(args)
    if any(v is not None for v in (args.from_a, args.from_b, args.length)):
        for flag, value in (("DELAY", args.delay), ("--distance", args.distance),
                            ("--run", args.run)):
            if value is not None:
                raise InputError(flag, "leave it out when locating from both ends",
                                 "--from-a '1.2 us' --from-b '0.8 us' --length 250m")
        return _two_ended(args, units, fraction)
    if (args.delay is None) == (args.distance is None):
        raise InputError("DELAY", "give the round-trip delay, or --distance for the reverse "
                                  "(one of the two)", "245 ns")
    delay_s = parse(args.delay, "DELAY", "time") if args.delay is not None else None
    distance_m = option(args, "--distance", "length")
    if args.run is not None:
        return _in_run(args, delay_s, distance_m, units, fraction)
    return _one_cable(args, delay_s, distance_m, units, fraction)
