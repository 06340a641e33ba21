"""``halftrip``: the command line. With no command it opens the terminal interface.

Data goes to stdout (one JSON object with ``--json``), diagnostics to stderr.
Exit codes are :class:`Exit`.
"""

from __future__ import annotations

import os
import sys
from enum import IntEnum


class Exit(IntEnum):
    OK = 0
    INTERNAL = 1  # a fault in halftrip itself
    BAD_INPUT = 2  # the user's input was refused; one line on stderr says why


def _command_modules():
    import importlib
    import pkgutil  # here, not at the top: plain ``halftrip`` (the TUI) does not need it

    import tui.commands as pkg

    for info in sorted(pkgutil.iter_modules(pkg.__path__), key=lambda i: i.name):
        if info.name.startswith("_") or info.name == "common":
            continue
        yield importlib.import_module(f"tui.commands.{info.name}")


def _parser_class():
    """argparse that reports a usage error as one line and exit status 2.

    argparse is imported here, not at the top: it costs ~10-25 ms, and plain
    ``halftrip`` (the terminal interface) never needs it.
    """
    import argparse

    class _Parser(argparse.ArgumentParser):
        def error(self, message: str):  # noqa: D401 - argparse API
            self.exit(Exit.BAD_INPUT, f"{self.prog}: {message} (see '{self.prog} --help')\n")

    return _Parser


def build_parser():
    _Parser = _parser_class()
    parser = _Parser(
        prog="halftrip",
        description="Field tool for cable work. With no command, opens the terminal interface.",
    )
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    for module in _command_modules():
        names = module.NAME if isinstance(module.NAME, tuple) else (module.NAME,)
        cmd = sub.add_parser(names[0], aliases=list(names[1:]), help=module.HELP,
                             description=module.HELP)
        module.add_arguments(cmd)
        if getattr(module, "LOGGABLE", False):
            _add_save_options(cmd)
        cmd.set_defaults(func=module.run, loggable=getattr(module, "LOGGABLE", False))
    return parser


def _add_save_options(cmd) -> None:
    """``--save`` with ``--job``/``--label``/``--note``: store the result in the job log."""
    log = cmd.add_argument_group("job log")
    log.add_argument("--save", action="store_true", help="save the result as a job-log entry")
    log.add_argument("--job", metavar="ID", help="job to save into (default: the newest job)")
    log.add_argument("--label", metavar="TEXT", help="run or circuit id for the entry")
    log.add_argument("--note", metavar="TEXT", help="free note for the entry")
    log.add_argument("--db", metavar="PATH", help="job database (default: user data directory)")


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    if not argv:
        from tui.app import run_app

        return run_app(demo=False)
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "func", None):
        parser.print_help()
        return Exit.OK
    from calc.errors import InputError

    try:
        code = int(args.func(args) or Exit.OK)
        if code == Exit.OK and getattr(args, "save", False):
            from tui.commands.common import last_emitted
            from tui.joblog.cli_save import save_from_cli  # the job log (issue 8)

            save_from_cli(args, last_emitted())
        return code
    except InputError as exc:
        print(f"halftrip {args.command}: {exc}", file=sys.stderr)
        return Exit.BAD_INPUT
    except KeyboardInterrupt:
        return Exit.BAD_INPUT
    except BrokenPipeError:
        return Exit.OK
    except Exception as exc:  # a fault of ours: one line, traceback only on request
        if os.environ.get("HALFTRIP_DEBUG"):
            raise
        print(f"halftrip {args.command}: internal error: {exc.__class__.__name__}: {exc} "
              "(set HALFTRIP_DEBUG=1 for details)", file=sys.stderr)
        return Exit.INTERNAL


if __name__ == "__main__":
    sys.exit(main())
