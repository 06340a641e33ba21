"""``halftrip cables``: list and show the cable catalog."""

from __future__ import annotations

from tui.commands.common import add_output_options, catalog, emit

NAME = "cables"
HELP = "list the cable catalog or show one cable"


def add_arguments(parser) -> None:
    sub = parser.add_subparsers(dest="cables_action", metavar="ACTION", required=True)
    lst = sub.add_parser("list", help="list catalog cables")
    lst.add_argument("--category", choices=("coax", "twisted-pair", "twin-lead", "power"))
    add_output_options(lst)
    show = sub.add_parser("show", help="show one cable in full")
    show.add_argument("id", metavar="ID")
    add_output_options(show)


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


def run(args) -> int:
    from tui.commands.common import cable

    if args.cables_action == "show":
        c = cable(args.id, "ID")
        rec = cable_record(c)
        lines = [f"{k:<32} {v}" for k, v in rec.items() if v not in (None, [], "")]
        return emit(args, rec, lines)
    cables = catalog().by_category(args.category)
    lines = [f"{'id':<18} {'category':<13} {'Z0':>6} {'VF':>6} {'tol':>5}  description"]
    for c in cables:
        mark = " !" if c.hazards else "  "
        lines.append(f"{c.id:<18} {c.category:<13} {c.z0_ohm:>6.0f} {c.vf:>6.3f} "
                     f"{c.vf_tolerance * 100:>4.0f}%{mark}{c.description}")
    lines.append("(! = may be energized: see 'halftrip safety')")
    return emit(args, {"cables": [cable_record(c) for c in cables]}, lines)
