"""The demo's job log: an invented job, filled by running the real commands.

``halftrip demo`` must never write into the user's own job log, so its
session uses a job log in a temporary directory, built here on first use.
Each entry is made the way ``--save`` makes one: the command is parsed and
run (its output discarded) and what it emitted is saved with its inputs.
Commands this build does not have are skipped.
"""

from __future__ import annotations

import io
from contextlib import redirect_stderr, redirect_stdout
from pathlib import Path

from calc.errors import InputError

DEMO_SITE = "Kestrel Ridge relay hut (demo)"
DEMO_NOTES = "An invented site for the demo: nothing here was measured."

# (command line, label, note, tags)
DEMO_ENTRIES: tuple[tuple[list[str], str, str, tuple[str, ...]], ...] = (
    (["locate", "245 ns", "--cable", "rg58", "--tolerance", "3 %", "--rise-time", "2 ns"],
     "feeder 2", "reflection near the wall gland; look for water", ("recheck",)),
    (["calibrate", "--length", "30 m", "--delay", "303.2 ns"], "unmarked grey reel",
     "VF taken from the whole reel", ("pass",)),
    (["cut", "--frequency", "146 MHz", "--degrees", "90", "--cable", "rg58", "--allowance",
      "15 mm"], "phasing line", "", ()),
    (["harness", "--antennas", "4", "--antenna-z", "50 ohm", "--feed-z", "50 ohm",
      "--frequency", "146 MHz", "--band", "144-148 MHz"], "4-bay harness", "", ()),
    (["trim", "--frequency", "146 MHz", "--degrees", "90", "--length", "400 mm",
      "--measured-delay", "4.2 ns"], "phasing line, first cut", "trimmed on the bench", ()),
    (["echo", "--z0", "50 ohm", "--load", "75 ohm"], "patch 14", "wrong jumper found", ("fail",)),
    (["simulate", "--run", "10 m:rg58, 20 m:rg213", "--load", "open", "--rise-time", "1 ns",
      "--points", "2048"], "mast run, expected", "", ()),
)


def build_demo_log(path: Path) -> None:
    """Create the demo job log at ``path`` (which must not exist yet)."""
    from tui.cli import build_parser
    from tui.commands.common import last_emitted
    from tui.joblog.cli_save import command_kind, inputs_from_args, logged_result
    from tui.joblog.db import open_log
    from tui.joblog.save import save_result

    parser = build_parser()
    with open_log(path) as log:
        job = log.new_job(DEMO_SITE, DEMO_NOTES)
        for argv, label, note, tags in DEMO_ENTRIES:
            with redirect_stdout(io.StringIO()), redirect_stderr(io.StringIO()):
                try:
                    args = parser.parse_args([*argv, "--json"])
                except SystemExit:  # a command this build does not have
                    continue
                try:
                    if args.func(args):
                        continue
                except InputError:
                    continue
            entry = save_result(log, command_kind(args), inputs_from_args(args),
                                logged_result(args, dict(last_emitted())), job_id=job.id,
                                label=label, note=note)
            if tags:
                log.tag(entry.id, tags)
