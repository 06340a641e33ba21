"""The options a CLI command gets, built for a panel that calls the command's
own code (a private helper module: panel discovery skips names starting with ``_``).

Panels that show what a command shows (``halftrip echo``, ``simulate``,
``trace``) build the command's options with :func:`cli_options` and call
the same functions its ``run`` calls, so the screen and the terminal give
the same numbers and words.
"""

from __future__ import annotations

import argparse


def cli_options(command, *positional: str, **options) -> argparse.Namespace:
    """``command``'s parsed options (its own parser and defaults) for these values.

    ``options`` are option names with ``_`` for ``-`` (``source_z="50 ohm"``);
    None leaves an option out, a list repeats it. Values are passed as
    ``--name=value``, so text starting with ``-`` (``-0.33``) stays a value.
    """
    parser = argparse.ArgumentParser(prog=f"halftrip {command.NAME}", add_help=False)
    command.add_arguments(parser)
    argv: list[str] = []
    for name, value in options.items():
        for v in value if isinstance(value, list) else [value]:
            if v is not None:
                argv.append(f"--{name.replace('_', '-')}={v}")
    if positional:
        argv += ["--", *positional]
    return parser.parse_args(argv)
