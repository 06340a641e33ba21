"""The demo's job log: an invented job made by the real commands, never the user's file."""

from __future__ import annotations

import pkgutil

import tui.commands
from tui.joblog import open_log
from tui.joblog.demo import DEMO_ENTRIES, DEMO_SITE, build_demo_log
from tui.joblog.export import export_job


def _commands() -> set[str]:
    return {m.name for m in pkgutil.iter_modules(tui.commands.__path__)}


def test_demo_log_holds_one_entry_per_available_command(tmp_path):
    path = tmp_path / "demo.sqlite3"
    build_demo_log(path)
    expected = [argv[0] for argv, *_ in DEMO_ENTRIES if argv[0] in _commands()]
    assert len(expected) >= 5  # locate, calibrate, cut, harness, trim at least
    with open_log(path) as log:
        (job,) = log.jobs()
        entries = log.entries(job.id)
        assert job.site == DEMO_SITE
        assert [e.kind for e in entries] == expected
        assert all(e.result and e.inputs and e.label for e in entries)
        report = export_job(job, entries, "md")
    assert "invented" in report
    if "simulate" in expected:
        assert "```text" in report  # the predicted trace drawn in the report
