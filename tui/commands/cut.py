"""``halftrip cut``: an electrical length to a cut length, and back."""

from __future__ import annotations

from tui.commands.common import (
    add_electrical_length_options,
    add_output_options,
    add_velocity_options,
    electrical_length_deg,
    emit_computed,
    option,
    resolve_velocity,
    units_of,
)

NAME = "cut"
HELP = ("cut length for an electrical length at a frequency (after connector allowances, "
        "reaching a span), or the electrical length of a piece")
LOGGABLE = True


def add_arguments(parser) -> None:
    parser.add_argument("--frequency", required=True, metavar="F",
                        help="design frequency, e.g. '146 MHz'")
    group = add_electrical_length_options(parser)
    group.add_argument("--length", metavar="L",
                       help="instead: the electrical length of a piece this long "
                            "(between connector reference planes), e.g. '339 mm'")
    add_velocity_options(parser, required=True)
    parser.add_argument("--allowance", metavar="L", default=None,
                        help="connector allowance per end: what each fitted connector adds "
                             "between the cable's cut end and its reference plane (default 0)")
    parser.add_argument("--span", metavar="S", default=None,
                        help="distance the line must span: the shortest allowed length that "
                             "reaches it is used (needs --kind)")
    parser.add_argument("--kind", choices=("transformer", "repeater", "delay"), default=None,
                        help="transformer: odd quarter waves; repeater: whole half waves; "
                             "delay: any length")
    parser.add_argument("--slack", metavar="L", default=None,
                        help="with --span: at least this much line beyond the span (default 0)")
    add_output_options(parser)


def compute(args):
    """(data, lines, cables used): what ``run`` prints, also shown by the TUI's panel."""
    from calc import cut
    from calc.errors import InputError
    from calc.parse import parse
    from tui import fmt

    units, fraction = units_of(args)
    frequency = parse(args.frequency, "--frequency", "frequency")
    deg = electrical_length_deg(args)
    piece = option(args, "--length", "length")
    allowance = option(args, "--allowance", "length_or_zero", 0.0)
    span = option(args, "--span", "length")
    slack = option(args, "--slack", "length_or_zero", 0.0)
    if span is not None and args.kind is None:
        raise InputError("--kind", "say what the line across --span is: transformer, repeater "
                         "or delay", "transformer")
    if span is None and args.slack is not None:
        raise InputError("--slack", "slack is the line beyond a --span; give --span too", "2.5 m")
    if piece is not None and span is not None:
        raise InputError("--span", "--length measures a piece; --span plans one, give one of "
                         "them", "2.5 m")
    resolved = resolve_velocity(args, warn=False)
    vf = resolved.velocity.vf
    if piece is not None:
        deg = cut.electrical_length_deg(piece, frequency, vf)
    plan = cut.plan_cut(frequency, deg, vf, allowance_per_end_m=allowance,
                        vf_tolerance=resolved.tolerance, span_m=span, kind=args.kind,
                        slack_m=slack, denominator=fraction)
    return (_record(plan, resolved, piece, fraction),
            _lines(plan, resolved, piece, units, fraction, fmt), [resolved.cable])


def run(args) -> int:
    return emit_computed(args, compute(args))


def _record(plan, resolved, piece, fraction) -> dict:
    from tui import fmt

    c = plan.cut
    data = {
        "frequency_hz": plan.frequency_hz,
        "vf": plan.vf,
        "vf_tolerance": resolved.tolerance,
        "velocity_source": resolved.source,
        "cable_id": resolved.cable.id if resolved.cable else None,
        "requested_electrical_length_deg": plan.requested_deg,
        "electrical_length_deg": plan.electrical_deg,
        "electrical_length_wavelengths": plan.electrical_deg / 360.0,
        "wavelength_in_line_m": plan.wavelength_in_line_m,
        "physical_length_m": plan.physical_length_m,
        "physical_length_tolerance_m": plan.tolerance_m,
        "allowance_per_end_m": c.allowance_per_end_m,
        "cut_length_m": c.cut_length_m,
        "cut_length_rounded_m": c.cut_rounded_mm_m,
        "cut_length_tape": fmt.length(c.cut_length_m, "imperial", fraction),
    }
    if piece is not None:
        data["measured_length_m"] = piece
    if plan.reach is not None:
        r = plan.reach
        data.update({"span_m": r.span_m, "kind": r.kind, "slack_m": r.slack_m,
                     "multiple": r.multiple, "unit_deg": r.unit_deg, "spare_m": r.spare_m})
    return data


def _lines(plan, resolved, piece, units, fraction, fmt) -> list[str]:
    def both(x):
        return fmt.length_both(x, units, fraction)

    c = plan.cut
    lines = []
    if piece is not None:
        lines.append(f"a piece of {both(piece)} at {fmt.frequency(plan.frequency_hz)} "
                     f"is {fmt.degrees(plan.electrical_deg)}")
    else:
        lines.append(f"{fmt.degrees(plan.electrical_deg)} at {fmt.frequency(plan.frequency_hz)}")
    tol = f" +/- {fmt.percent(resolved.tolerance)}" if resolved.tolerance else ""
    lines += [
        f"velocity factor       {fmt.vf(plan.vf)}{tol} from {resolved.source}",
        f"wavelength in line    {both(plan.wavelength_in_line_m)}",
        f"physical length       {both(plan.physical_length_m)} between reference planes",
    ]
    if plan.tolerance_m:
        lines.append(f"                      +/- {fmt.length(plan.tolerance_m, units, fraction)} "
                     "from the VF tolerance:")
        lines.append("                      cut long, measure, then trim (halftrip trim)")
    if c.allowance_per_end_m:
        lines.append(f"connector allowance   {both(c.allowance_per_end_m)} per end")
    lines.append(f"cut length            {both(c.cut_length_m)}")
    if plan.reach is not None:
        r = plan.reach
        if r.unit_deg is None:
            how = f"a delay of {fmt.degrees(r.electrical_deg)}"
        else:
            unit = "quarter wave" if r.unit_deg == 90.0 else "half wave"
            how = f"{r.multiple} {unit}{'s' if r.multiple != 1 else ''} ({r.electrical_deg:g} deg)"
        lines.append(f"span                  {fmt.length(r.span_m, units, fraction)} as a "
                     f"{r.kind}:")
        lines.append(f"                      {how}")
        lines.append(f"                      {fmt.length(r.spare_m, units, fraction)} of line "
                     "beyond the span")
    return lines
