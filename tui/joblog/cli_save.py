"""``--save`` on the calculation commands: store what the command printed as a job-log entry.

:mod:`tui.cli` calls :func:`save_from_cli` after a command succeeded, with the
dict the command emitted. The inputs are the command's options as typed
(output and job-log options left out); the confirmation goes to stderr so that
``--json`` output stays exactly one object.
"""

from __future__ import annotations

import importlib
import sys

from calc.errors import InputError

# Options that say how to show or where to save, not what was calculated.
NOT_INPUTS = frozenset({"func", "json", "units", "fraction", "save", "job", "label", "note",
                        "db", "command", "loggable"})


def inputs_from_args(args) -> dict:
    """The command's inputs as typed, from the parsed options: options not given (None, or
    False for a flag) are left out."""
    from tui.fmt import json_ready

    return {k: json_ready(v) for k, v in vars(args).items()
            if k not in NOT_INPUTS and v is not None and v is not False}


def _command_module(args):
    func = getattr(args, "func", None)
    return importlib.import_module(func.__module__) if func else None


def logged_result(args, data: dict) -> dict:
    """What is stored: ``data`` as emitted, or the command module's ``log_result(args, data)``
    (for example a trace command adding its samples, for the report's picture)."""
    hook = getattr(_command_module(args), "log_result", None)
    return hook(args, data) if hook is not None else data


def command_kind(args) -> str:
    """The entry kind: the command module's ``log_kind(args)`` if it has one (a command
    with modes the terminal interface saves as kinds of their own), else the command's own
    name (not an alias the user typed)."""
    module = _command_module(args)
    hook = getattr(module, "log_kind", None)
    if hook is not None:
        return hook(args)
    name = getattr(module, "NAME", None) or args.command
    return name[0] if isinstance(name, tuple) else name


#: The largest integer SQLite stores (a signed 64-bit integer).
SQLITE_MAX_INT = 2**63 - 1


def parse_id(text: str | None, field: str = "--job", what: str = "a job") -> int | None:
    """A job or entry id typed on the command line (None when not given)."""
    if text is None:
        return None
    try:
        value = int(str(text).strip())
    except ValueError:
        value = 0
    if not 1 <= value <= SQLITE_MAX_INT:  # SQLite cannot even look a larger one up
        raise InputError(field, f"{text!r} is not {what} id (a whole number from 1)", "3")
    return value


def stderr_notice(text: str) -> None:
    print(f"halftrip: {text}", file=sys.stderr)


def save_from_cli(args, data: dict) -> None:
    from tui.joblog.db import open_log
    from tui.joblog.save import save_result

    try:
        job_id = parse_id(getattr(args, "job", None))
        with open_log(getattr(args, "db", None), create=False, notice=stderr_notice) as log:
            entry = save_result(log, command_kind(args), inputs_from_args(args),
                                logged_result(args, data),
                                job_id=job_id, label=getattr(args, "label", None),
                                note=getattr(args, "note", None))
            job = log.job(entry.job_id)
    except InputError as exc:  # the result is on screen; say plainly that it is not in the log
        raise InputError(exc.field, f"{exc.problem} (the result was not saved)",
                         exc.example) from None
    label = f" '{entry.label}'" if entry.label else ""
    stderr_notice(f"saved {entry.kind}{label} as entry {entry.id} in job {job.id} "
                  f"({job.site}) in {log.path}")
