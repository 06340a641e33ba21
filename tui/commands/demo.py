"""``halftrip demo``: the terminal interface on an invented demo job."""

from __future__ import annotations

NAME = "demo"
HELP = "open the terminal interface on an invented demo job"


def add_arguments(parser) -> None:
    parser.add_argument("--panel", metavar="NAME", default=None,
                        help="panel to open first (locate, cut, echo, trace, cables, ...)")


def run(args) -> int:
    from tui.app import create_app
    from tui.panels import discover

    names = [s.name for s in discover()]
    if args.panel is not None and args.panel not in names:
        from calc.errors import InputError

        raise InputError("--panel", f"no panel {args.panel!r}; panels are {', '.join(names)}",
                         names[0] if names else None)
    create_app(demo=True, start_panel=args.panel).run()
    return 0
