"""``halftrip trim``: how much to cut off a piece cut long, from a measurement of it."""

from __future__ import annotations

from tui.commands.common import (
    add_electrical_length_options,
    add_output_options,
    electrical_length_deg,
    emit_computed,
    units_of,
)

NAME = "trim"
HELP = ("length to keep of a piece cut long, from its measured round-trip delay or first "
        "resonance (no velocity factor needed), and the VF it implies")
LOGGABLE = True


def add_arguments(parser) -> None:
    parser.add_argument("--frequency", required=True, metavar="F",
                        help="design frequency of the target length, e.g. '146 MHz'")
    add_electrical_length_options(parser)
    parser.add_argument("--length", required=True, metavar="L",
                        help="the piece's length now (as measured), e.g. '400 mm'")
    measured = parser.add_mutually_exclusive_group(required=True)
    measured.add_argument("--measured-delay", metavar="T",
                          help="round-trip delay of the piece on a reflectometer, e.g. '3.7 ns'")
    measured.add_argument("--measured-resonance", metavar="F",
                          help="frequency of the piece's first resonance, where it is a quarter "
                               "wave (an open piece's first dip, a shorted piece's first peak)")
    add_output_options(parser)


def compute(args):
    """(data, lines, cables used): what ``run`` prints, also shown by the TUI's panel."""
    from calc import cut
    from calc.parse import parse
    from tui import fmt

    units, fraction = units_of(args)
    frequency = parse(args.frequency, "--frequency", "frequency")
    target = electrical_length_deg(args)
    length = parse(args.length, "--length", "length")
    if args.measured_delay is not None:
        delay = parse(args.measured_delay, "--measured-delay", "time")
        t = cut.trim_from_delay(target, frequency, delay, length)
        measured = {"measured_delay_s": delay}
        how = f"its round-trip delay of {fmt.time(delay)}"
    else:
        resonance = parse(args.measured_resonance, "--measured-resonance", "frequency")
        t = cut.trim_from_resonance(target, frequency, resonance, length)
        measured = {"measured_resonance_hz": resonance}
        how = f"its first resonance at {fmt.frequency(resonance)}"
    data = {
        "frequency_hz": t.frequency_hz,
        "target_electrical_length_deg": t.target_deg,
        "method": t.method,
        **measured,
        "measured_electrical_length_deg": t.measured_deg,
        "current_length_m": t.current_length_m,
        "keep_fraction": t.keep_fraction,
        "keep_length_m": t.keep_length_m,
        "cut_off_m": t.cut_off_m,
        "keep_length_tape": fmt.length(t.keep_length_m, "imperial", fraction),
        "implied_vf": t.implied_vf,
    }

    def both(x):
        return fmt.length_both(x, units, fraction)

    lines = [
        f"target     {fmt.degrees(t.target_deg)} at {fmt.frequency(t.frequency_hz)}",
        f"the piece  {both(t.current_length_m)} now, {fmt.degrees(t.measured_deg)}",
        f"           from {how}",
        f"keep       {both(t.keep_length_m)}  ({t.keep_fraction * 100:.2f} % of it)",
        f"cut off    {both(t.cut_off_m)}",
        f"implied VF {fmt.vf(t.implied_vf, 4)} (from the length and the measurement)",
        "Take off a little less, measure again, then finish (common practice).",
    ]
    return data, lines, []


def run(args) -> int:
    return emit_computed(args, compute(args))
