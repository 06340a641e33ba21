"""``halftrip cables``: list and show the cable catalog."""

from __future__ import annotations

from tui.commands.common import add_output_options, catalog, emit, units_of

NAME = "cables"
HELP = "list the cable catalog or show one cable"

#: Frequencies at which ``cables show`` states the loss of a cable with a loss model.
LOSS_AT_HZ = (10e6, 100e6, 1e9)
_WIDTH = 79


def add_arguments(parser) -> None:
    sub = parser.add_subparsers(dest="cables_action", metavar="ACTION", required=True)
    lst = sub.add_parser("list", help="list catalog cables")
    lst.add_argument("--category", choices=("coax", "twisted-pair", "twin-lead", "power"))
    add_output_options(lst, lengths=False)
    show = sub.add_parser("show", help="show one cable in full")
    show.add_argument("id", metavar="ID")
    add_output_options(show, lengths=False)
    show.add_argument("--units", choices=("metric", "imperial"), default=None,
                      help="loss per 100 m or per 100 ft (default: your preference)")


def cable_record(c) -> dict:
    """A cable as a JSON record (shared with the TUI's export)."""
    return {
        "id": c.id,
        "description": c.description,
        "category": c.category,
        "z0_ohm": c.z0_ohm,
        "vf": c.vf,
        "vf_tolerance": c.vf_tolerance,
        "dielectric": c.dielectric or None,
        "atten_k1_db_per_100m_sqrt_mhz": c.atten_k1,
        "atten_k2_db_per_100m_per_mhz": c.atten_k2,
        "hazards": list(c.hazards),
        "source": c.source,
        "notes": c.notes or None,
        "origin": c.origin,
    }


def describe_cable(c, units: str = "metric") -> list[str]:
    """Human lines for one catalog cable, folded to 80 columns."""
    from calc.constants import FOOT_M
    from tui import fmt

    def row(label: str, text: str) -> list[str]:
        return fmt.wrapped(f"{label:<17} {text}", indent=18, width=_WIDTH)

    lines = [f"{c.id}: {c.description}"]
    lines += row("category", c.category + ("" if c.origin == "built-in" else
                                          " (one of your own cables)"))
    lines += row("Z0", f"{fmt.impedance(c.z0_ohm)} nominal")
    lines += row("velocity factor", f"{fmt.vf(c.vf)} +/- {fmt.percent(c.vf_tolerance)} "
                                    f"(NVP {fmt.percent(c.vf)})")
    if c.dielectric:
        lines += row("dielectric", c.dielectric)
    if c.has_loss_model:
        per, length_m = ("100 ft", 100 * FOOT_M) if units == "imperial" else ("100 m", 100.0)
        at = ", ".join(f"{float(c.loss_db_per_m(f)) * length_m:.3g} dB at {fmt.frequency(f)}"
                       for f in LOSS_AT_HZ)
        lines += row("loss", f"per {per}: {at} (matched line; model "
                             f"{c.atten_k1 or 0:g} sqrt(f) + {c.atten_k2 or 0:g} f dB per 100 m, "
                             "f in MHz)")
    else:
        lines += row("loss", "no loss model in the catalog")
    if c.hazards:
        tags = " ".join(f"--tag {t}" for t in c.hazards)
        lines += row("hazards", f"{', '.join(c.hazards)} (halftrip safety {tags})")
    lines += row("source", c.source)
    if c.notes:
        lines += row("notes", c.notes)
    return lines


def describe_list(cables) -> list[str]:
    """The catalog as a table, one heading per category, descriptions folded to 80 columns."""
    from tui import fmt

    lines = []
    category = None
    for c in cables:
        if c.category != category:
            category = c.category
            lines += ([""] if lines else []) + [
                category, f"  {'id':<18} {'Z0':>4} {'VF':>6} {'tol':>5}    description"]
        mark = "!" if c.hazards else " "
        lines += fmt.wrapped(f"  {c.id:<18} {c.z0_ohm:>4.0f} {fmt.vf(c.vf):>6} "
                             f"{fmt.percent(c.vf_tolerance):>5}  {mark} {c.description}",
                             indent=41, width=_WIDTH)
    lines.append("(! = may be energized: see 'halftrip safety')")
    return lines


def run(args) -> int:
    from tui.commands.common import cable

    if args.cables_action == "show":
        c = cable(args.id, "ID")
        units, _fraction = units_of(args)
        return emit(args, cable_record(c), describe_cable(c, units))
    cables = catalog().by_category(args.category)
    return emit(args, {"cables": [cable_record(c) for c in cables]}, describe_list(cables))
