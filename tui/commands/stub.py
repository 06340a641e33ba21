"""``halftrip stub``: open or shorted stub lengths that present a short, an open or a reactance."""

from __future__ import annotations

from tui.commands.common import (
    add_output_options,
    add_velocity_options,
    emit_computed,
    option,
    resolve_velocity,
    units_of,
)

NAME = "stub"
HELP = ("length of an open or shorted stub that presents a short, an open or a reactance "
        "jX at a frequency (lossless line)")
LOGGABLE = True


def add_arguments(parser) -> None:
    parser.add_argument("--frequency", required=True, metavar="F",
                        help="frequency, e.g. '146 MHz'")
    add_velocity_options(parser, required=True)
    parser.add_argument("--end", required=True, choices=("open", "short"),
                        help="how the far end of the stub is left: open or shorted")
    parser.add_argument("--present", required=True, metavar="WHAT",
                        help="what the stub's input must look like: short, open, or a "
                             "reactance such as 'j25 ohm' or '-j40 ohm'")
    parser.add_argument("--z0", metavar="Z", default=None,
                        help="the stub line's Z0 (default: the --cable's); needed for a "
                             "reactance with --vf")
    parser.add_argument("--allowance", metavar="L", default=None,
                        help="connector allowance at the stub's input end (default 0)")
    add_output_options(parser)


def present_reactance(text: str) -> float:
    """``short`` -> 0, ``open`` -> inf, ``"j25 ohm"`` -> 25.0 (ohm); else InputError."""
    import math

    from calc.errors import InputError
    from calc.parse import parse_complex_impedance

    word = text.strip().lower()
    if word == "short":
        return 0.0
    if word == "open":
        return math.inf
    try:
        z = parse_complex_impedance(text, "--present")
    except InputError as exc:
        raise InputError("--present", f"{exc.problem}; give short, open or a reactance",
                         "j25 ohm") from None
    if z.real != 0.0:
        raise InputError("--present", f"{text.strip()!r}: a lossless stub presents only a "
                         "reactance (no real part), or short or open", "j25 ohm")
    return z.imag


def compute(args):
    """(data, lines, cables used): what ``run`` prints, also shown by the TUI's panel."""
    import math

    from calc import cut
    from calc.errors import InputError
    from calc.parse import parse
    from tui import fmt

    units, fraction = units_of(args)
    frequency = parse(args.frequency, "--frequency", "frequency")
    x = present_reactance(args.present)
    allowance = option(args, "--allowance", "length_or_zero", 0.0)
    resolved = resolve_velocity(args, warn=False)
    z0 = option(args, "--z0", "impedance")
    if z0 is None and resolved.cable is not None:
        z0 = resolved.cable.z0_ohm
    if z0 is None and x != 0.0 and not math.isinf(x):
        raise InputError("--z0", "a reactance needs the stub line's Z0 (or give --cable)",
                         "50 ohm")
    s = cut.stub_length(frequency, resolved.velocity.vf, args.end, x, z0)
    c = cut.cut_length(s.physical_length_m, allowance, 1, fraction)
    presents = "short" if x == 0.0 else "open" if math.isinf(x) else "reactance"
    omega = 2.0 * math.pi * frequency
    data = {
        "frequency_hz": frequency,
        "end": args.end,
        "present": presents,
        "reactance_ohm": x if presents == "reactance" else (0.0 if x == 0.0 else None),
        "z0_ohm": z0,
        "vf": s.vf,
        "velocity_source": resolved.source,
        "cable_id": resolved.cable.id if resolved.cable else None,
        "electrical_length_deg": s.electrical_deg,
        "physical_length_m": s.physical_length_m,
        "allowance_m": allowance,
        "cut_length_m": c.cut_length_m,
        "cut_length_tape": fmt.length(c.cut_length_m, "imperial", fraction),
        "period_deg": s.period_deg,
        "period_m": s.period_m,
    }
    if presents == "reactance":
        if x > 0:
            data["equivalent_inductance_h"] = x / omega
        else:
            data["equivalent_capacitance_f"] = -1.0 / (omega * x)

    def both(v):
        return fmt.length_both(v, units, fraction)

    end_word = "open" if args.end == "open" else "shorted"
    what = {"short": "a short", "open": "an open"}.get(presents)
    if presents == "reactance":
        what = f"{'+' if x > 0 else '-'}j{abs(x):.4g} ohm"
    line_z0 = f"Z0 {fmt.impedance(z0)}, " if z0 else ""
    lines = [f"{end_word} stub presenting {what} at {fmt.frequency(frequency)}"]
    if presents == "reactance":
        like = (fmt.component(x / omega, "H") if x > 0 else fmt.component(-1.0 / (omega * x), "F"))
        lines.append(f"(at this frequency only, like {like})")
    lines += [
        f"line: {line_z0}VF {fmt.vf(s.vf)} from {resolved.source}",
        f"electrical length  {fmt.degrees(s.electrical_deg)}",
        f"physical length    {both(s.physical_length_m)} to the far end",
    ]
    if allowance:
        lines.append(f"cut length         {both(c.cut_length_m)} after "
                     f"{fmt.length(allowance, units, fraction)} for the input connector")
    if (presents == "short" and args.end == "short") or (presents == "open" and args.end == "open"):
        lines += [f"(a stub of no length presents {what} too:",
                  " this is the shortest piece of line that does)"]
    lines += [
        f"every further half wave, {both(s.period_m)}, presents the same",
        "Lossless line assumed: a real stub's loss leaves its short or open imperfect.",
    ]
    return data, lines, [resolved.cable]


def run(args) -> int:
    return emit_computed(args, compute(args))
