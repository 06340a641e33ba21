"""``halftrip match``: a quarter-wave transformer between two impedances from catalog cables."""

from __future__ import annotations

from tui.commands.common import add_output_options, catalog, emit_computed

NAME = "match"
HELP = ("quarter-wave transformer between two impedances: the ideal line impedance and the "
        "catalog cables (single or two in parallel) nearest it, with the VSWR they leave")
LOGGABLE = True

#: Line categories a matching section may be cut from. Coax by default;
#: balanced lines need a balun where they meet coax.
COAX = ("coax",)
BALANCED = ("twin-lead", "twisted-pair")


def add_arguments(parser) -> None:
    parser.add_argument("--from", dest="z_from", required=True, metavar="Z1",
                        help="impedance the section is seen from (the source side), e.g. '50 ohm'")
    parser.add_argument("--to", dest="z_to", required=True, metavar="Z2",
                        help="impedance at the far end (the load), e.g. '100 ohm'")
    parser.add_argument("--frequency", required=True, metavar="F",
                        help="design frequency, e.g. '146 MHz'")
    add_band_options(parser)
    parser.add_argument("--limit", type=int, default=6, metavar="N",
                        help="how many candidates to show (default 6)")
    add_output_options(parser)


def add_band_options(parser) -> None:
    """``--band``, ``--single-only`` and ``--include-balanced`` (shared with ``harness``)."""
    parser.add_argument("--band", metavar="B", default=None,
                        help="band to evaluate across, e.g. '144-148 MHz' (must contain F)")
    parser.add_argument("--single-only", action="store_true",
                        help="no pairs of the same cable in parallel")
    parser.add_argument("--include-balanced", action="store_true",
                        help="also consider twin-lead and twisted pair (needs a balun at coax)")


def band_of(args):
    """The parsed ``--band`` as (low, high) Hz, or None."""
    from calc.parse import parse_band

    return None if args.band is None else parse_band(args.band, "--band")


def line_cables(args) -> list:
    """Catalog cables a section may be cut from (never power cable)."""
    categories = COAX + (BALANCED if args.include_balanced else ())
    return [c for c in catalog().by_category() if c.category in categories]


def line_label(section) -> str:
    """``"rg59"`` or ``"rg58 x2"`` for two in parallel."""
    return section.cable.id + (" x2" if section.parallel == 2 else "")


def section_record(section) -> dict:
    """A line section as JSON fields (shared with ``harness``)."""
    return {
        "cable_id": section.cable.id,
        "parallel": section.parallel == 2,
        "pieces": section.parallel,
        "line_z0_ohm": section.z0_ohm,
        "vf": section.cable.vf,
        "balanced": section.cable.category != "coax",
        "loss_model": section.cable.has_loss_model,
        "electrical_length_deg": section.electrical_deg,
        "physical_length_m": section.physical_length_m,
    }


def response_record(resp) -> dict:
    """What the source sees, as JSON fields (shared with ``harness``)."""
    return {
        "impedance_ohm": resp.impedance_center_ohm,
        "vswr_center": resp.vswr_center,
        "vswr_worst": resp.vswr_worst,
        "worst_frequency_hz": resp.worst_frequency_hz,
    }


def compute(args):
    """(data, lines, cables used): what ``run`` prints, also shown by the TUI's panel."""
    from calc.match import quarter_wave_match
    from calc.parse import parse
    from tui import fmt
    from tui.commands.common import units_of

    units, fraction = units_of(args)
    z1 = parse(args.z_from, "--from", "impedance")
    z2 = parse(args.z_to, "--to", "impedance")
    frequency = parse(args.frequency, "--frequency", "frequency")
    band = band_of(args)
    result = quarter_wave_match(z1, z2, frequency, line_cables(args), band,
                                allow_parallel=not args.single_only, limit=max(args.limit, 1))
    data = {
        "z_from_ohm": z1,
        "z_to_ohm": z2,
        "frequency_hz": frequency,
        "band_low_hz": band[0] if band else None,
        "band_high_hz": band[1] if band else None,
        "ideal_impedance_ohm": result.ideal_impedance_ohm,
        "candidates": [section_record(c.section) | response_record(c.response)
                       | {"loss_db": c.loss_db} for c in result.candidates],
    }
    return (data, _lines(result, units, fraction, fmt), [c.section.cable for c in result.candidates])


def run(args) -> int:
    return emit_computed(args, compute(args))


def _lines(result, units, fraction, fmt) -> list[str]:
    f = fmt.frequency(result.frequency_hz)
    lines = [
        f"quarter-wave transformer from {fmt.impedance(result.z_source_ohm)} to "
        f"{fmt.impedance(result.z_load_ohm)} at {f}",
        f"ideal line impedance {fmt.impedance(result.ideal_impedance_ohm)}",
    ]
    if result.band_hz:
        lines.append(f"worst VSWR across {fmt.frequency(result.band_hz[0])} to "
                     f"{fmt.frequency(result.band_hz[1])}")
    lines.append("")
    rows = [("line", "Z0", "quarter wave", "", "Z seen", "loss", "VSWR", "worst")]
    for c in result.candidates:
        s, r = c.section, c.response
        z = r.impedance_center_ohm
        rows.append((line_label(s) + ("" if c.has_loss_model else " *"), f"{s.z0_ohm:.4g}",
                     fmt.length(s.physical_length_m, units, fraction),
                     fmt.length(s.physical_length_m, fmt.other_units(units), fraction),
                     f"{z.real:.1f}{'+' if z.imag >= 0 else '-'}j{abs(z.imag):.1f}",
                     f"{c.loss_db:.2f}", fmt.vswr(r.vswr_center), fmt.vswr(r.vswr_worst)))
    lines += fmt.table(rows, right=(1, 5, 6, 7))
    lines += [
        "",
        f"Z seen at {f}; VSWR relative to {fmt.impedance(result.z_source_ohm)}; loss in dB "
        "(matched line)",
        "Lines at nominal Z0 with the catalog's loss (* no loss model: lossless).",
        "x2: two equal pieces in parallel. For the cut list: halftrip cut.",
    ]
    return lines
