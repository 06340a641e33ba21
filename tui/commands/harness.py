"""``halftrip harness``: a phasing harness feeding N equal antennas in phase, as a cut list."""

from __future__ import annotations

from tui.commands.common import add_output_options, cable, emit_computed, option, units_of
from tui.commands.match import (
    add_band_options,
    band_of,
    line_cables,
    line_label,
    response_record,
    section_record,
)

NAME = "harness"
HELP = ("phasing harness for N equal antennas fed in phase: arm and transformer cut list, "
        "VSWR across the band and arm-to-arm phase spread")
LOGGABLE = True

DEFAULT_CUT_TOLERANCE = "2 mm"  # common practice for a careful hand cut


def add_arguments(parser) -> None:
    parser.add_argument("--antennas", required=True, type=int, metavar="N",
                        help="number of equal antennas (2 or more)")
    parser.add_argument("--antenna-z", required=True, metavar="ZA",
                        help="each antenna's feed impedance, e.g. '50 ohm'")
    parser.add_argument("--feed-z", required=True, metavar="ZF",
                        help="impedance of the feed line to the junction, e.g. '50 ohm'")
    parser.add_argument("--frequency", required=True, metavar="F",
                        help="design frequency, e.g. '146 MHz'")
    where = parser.add_mutually_exclusive_group()
    where.add_argument("--span", metavar="S", default=None,
                       help="distance between neighbouring antennas, in a line with the "
                            "junction at the centre: each arm reaches (N-1) S / 2")
    where.add_argument("--arm-reach", metavar="R", default=None,
                       help="distance from the junction to the farthest antenna (any layout)")
    parser.add_argument("--slack", metavar="L", default=None,
                        help="at least this much arm beyond the reach (default 0)")
    parser.add_argument("--topology", choices=("quarter", "half"), default="quarter",
                        help="quarter: every arm a quarter-wave transformer to N x ZF; half: "
                             "half-wave arms, then one quarter-wave transformer (default quarter)")
    parser.add_argument("--allowance", metavar="L", default=None,
                        help="connector allowance per end of every piece (default 0)")
    parser.add_argument("--cut-tolerance", metavar="L", default=DEFAULT_CUT_TOLERANCE,
                        help=f"how closely each arm is cut, plus or minus (default "
                             f"{DEFAULT_CUT_TOLERANCE})")
    parser.add_argument("--cable", metavar="ID", default=None,
                        help="cut the arms from this catalog cable (default: the nearest)")
    parser.add_argument("--transformer-cable", metavar="ID", default=None,
                        help="with --topology half: the transformer's cable (default: nearest)")
    add_band_options(parser)
    add_output_options(parser)


def compute(args):
    """(data, lines, cables used): what ``run`` prints, also shown by the TUI's panel."""
    from calc.errors import InputError
    from calc.match import MAX_ANTENNAS, harness
    from calc.parse import parse
    from tui import fmt

    units, fraction = units_of(args)
    za = parse(args.antenna_z, "--antenna-z", "impedance")
    zf = parse(args.feed_z, "--feed-z", "impedance")
    frequency = parse(args.frequency, "--frequency", "frequency")
    band = band_of(args)
    span = option(args, "--span", "length")
    if span is not None:  # the count is clamped only to keep this finite; harness() refuses it
        reach_m = (min(args.antennas, MAX_ANTENNAS + 1) - 1) * span / 2.0
    else:
        reach_m = option(args, "--arm-reach", "length", 0.0)
    slack = option(args, "--slack", "length_or_zero", 0.0)
    allowance = option(args, "--allowance", "length_or_zero", 0.0)
    tolerance = option(args, "--cut-tolerance", "length_or_zero")
    if args.transformer_cable and args.topology != "half":
        raise InputError("--transformer-cable", "only --topology half has a transformer after "
                         "the junction", "rg58")
    arm_cable = _line_cable(args.cable, "--cable")
    tr_cable = _line_cable(args.transformer_cable, "--transformer-cable")
    h = harness(args.antennas, za, zf, frequency, line_cables(args), topology=args.topology,
                band_hz=band, arm_reach_m=reach_m, slack_m=slack, allowance_per_end_m=allowance,
                cut_tolerance_m=tolerance, arm_cable=arm_cable, transformer_cable=tr_cable,
                allow_parallel=not args.single_only, denominator=fraction)
    return (_record(h, span, allowance, fraction, fmt),
            _lines(h, span, allowance, units, fraction, fmt),
            [p.section.cable for p in _pieces(h)])


def run(args) -> int:
    return emit_computed(args, compute(args))


def _line_cable(cable_id, field):
    """A catalog cable to cut harness pieces from (never power cable), or None."""
    from calc.errors import InputError

    if cable_id is None:
        return None
    c = cable(cable_id, field, warn=False)
    if c.category == "power":
        raise InputError(field, f"{c.id} is power cable, not a line to cut harness pieces "
                         "from", "rg59")
    return c


def _pieces(h) -> list:
    return list(h.arms) + ([h.transformer] if h.transformer else [])


def _piece_record(p, fraction, fmt) -> dict:
    return ({"arm": p.index} if p.role == "arm" else {"role": "transformer"}) | \
        section_record(p.section) | {
            "multiple": p.multiple,
            "unit_deg": p.unit_deg,
            "cut_length_m": p.cut.cut_length_m,
            "cut_length_tape": fmt.length(p.cut.cut_length_m, "imperial", fraction),
        }


def _record(h, span, allowance, fraction, fmt) -> dict:
    ph = h.phase
    return {
        "antennas": h.antennas,
        "antenna_z_ohm": h.antenna_z_ohm,
        "feed_z_ohm": h.feed_z_ohm,
        "frequency_hz": h.frequency_hz,
        "band_low_hz": h.band_hz[0] if h.band_hz else None,
        "band_high_hz": h.band_hz[1] if h.band_hz else None,
        "topology": h.topology,
        "span_m": span,
        "arm_reach_m": h.arm_reach_m,
        "slack_m": h.slack_m,
        "allowance_per_end_m": allowance,
        "ideal_arm_z0_ohm": h.ideal_arm_z0_ohm,
        "ideal_transformer_z0_ohm": h.ideal_transformer_z0_ohm,
        "arms": [_piece_record(p, fraction, fmt) for p in h.arms],
        "transformer": _piece_record(h.transformer, fraction, fmt) if h.transformer else None,
        "junction_impedance_ohm": h.junction_center_ohm,
        **response_record(h.response),
        "phase_spread": {
            "assumption": "worst case between two arms: each arm cut within +/- the cut "
                          "tolerance from one roll (cut_spread_deg); or cut exactly from rolls "
                          "whose VF differs by +/- vf_tolerance (vf_spread_deg)",
            "cut_tolerance_m": ph.cut_tolerance_m,
            "vf_tolerance": ph.vf_tolerance,
            "frequencies_hz": list(ph.frequencies_hz),
            "cut_spread_deg": list(ph.cut_spread_deg),
            "vf_spread_deg": list(ph.vf_spread_deg),
        },
    }


def _lines(h, span, allowance, units, fraction, fmt) -> list[str]:
    n = h.antennas
    lines = [f"{n} antennas of {fmt.impedance(h.antenna_z_ohm)} in phase, fed by "
             f"{fmt.impedance(h.feed_z_ohm)}, at {fmt.frequency(h.frequency_hz)}"]
    if h.band_hz:
        lines.append(f"band {fmt.frequency(h.band_hz[0])} to {fmt.frequency(h.band_hz[1])}")
    arm = h.arms[0].section
    if h.topology == "quarter":
        lines.append(f"each arm an odd number of quarter waves, {fmt.impedance(h.antenna_z_ohm)} "
                     f"to {fmt.impedance(n * h.feed_z_ohm)} at the junction")
        lines.append(f"arm line: ideal {fmt.impedance(h.ideal_arm_z0_ohm)}, using "
                     f"{line_label(arm)} ({fmt.impedance(arm.z0_ohm)})")
    else:
        tr = h.transformer.section
        lines.append(f"half-wave arms repeat {fmt.impedance(h.antenna_z_ohm)} to the junction "
                     f"({fmt.impedance(h.antenna_z_ohm / n)} in parallel),")
        lines.append(f"then a quarter wave to {fmt.impedance(h.feed_z_ohm)}")
        lines.append(f"arm line: ideal {fmt.impedance(h.ideal_arm_z0_ohm)}, using "
                     f"{line_label(arm)} ({fmt.impedance(arm.z0_ohm)})")
        lines.append(f"transformer line: ideal {fmt.impedance(h.ideal_transformer_z0_ohm)}, "
                     f"using {line_label(tr)} ({fmt.impedance(tr.z0_ohm)})")
    if h.arm_reach_m or h.slack_m:
        slack = f" plus {fmt.length(h.slack_m, units, fraction)} slack" if h.slack_m else ""
        lines.append(f"arms reach {fmt.length(h.arm_reach_m, units, fraction)}{slack}")
    if span is not None:
        lines.append(f"(antennas in a line {fmt.length(span, units, fraction)} apart, junction "
                     "at the centre)")
    elif h.arm_reach_m:
        lines.append("(from the junction to the farthest antenna)")
    other = fmt.other_units(units)
    title = "cut list, electrical length in degrees" + (
        f", connector allowance {fmt.length(allowance, units, fraction)} per end"
        if allowance else "")
    lines += ["", title]
    rows = [("piece", "line", "deg", "physical", "cut", "")]
    for p in _pieces(h):
        name = f"arm {p.index}" if p.role == "arm" else "to feed"
        rows.append((name, line_label(p.section), f"{p.section.electrical_deg:g}",
                     fmt.length(p.section.physical_length_m, units, fraction),
                     fmt.length(p.cut.cut_length_m, units, fraction),
                     fmt.length(p.cut.cut_length_m, other, fraction)))
    lines += fmt.table(rows, right=(2,))
    if any(p.section.parallel == 2 for p in _pieces(h)):
        lines.append("x2: two equal pieces of that cable in parallel, both cut to the length")
    r = h.response
    lines += [
        "",
        f"VSWR on the {fmt.impedance(h.feed_z_ohm)} feed: {fmt.vswr(r.vswr_center)} at "
        f"{fmt.frequency(h.frequency_hz)}, worst {fmt.vswr(r.vswr_worst)} at "
        f"{fmt.frequency(r.worst_frequency_hz)}",
    ]
    ph = h.phase
    cols = slice(None) if h.band_hz else slice(1, 2)  # band edges and centre, or the centre
    rows = [("", *(fmt.frequency(x) for x in ph.frequencies_hz[cols]), "")]
    rows.append((f"cut within +/- {fmt.length(ph.cut_tolerance_m, units, fraction)}",
                 *(f"{x:.2f}" for x in ph.cut_spread_deg[cols]), "deg, arms from one roll"))
    rows.append((f"rolls with VF +/- {fmt.percent(ph.vf_tolerance)}",
                 *(f"{x:.2f}" for x in ph.vf_spread_deg[cols]), "deg"))
    lines.append("arm-to-arm phase spread, worst case (two arms at opposite ends of a "
                 "tolerance):")
    lines += ["  " + row for row in fmt.table(rows, right=tuple(range(1, len(rows[0]) - 1)))]
    lines.append("Cut every arm from one roll, side by side.")
    return lines
