"""SVG snapshots of the Echo and Trace panels at 80x24 (layout only: review an
updated snapshot by eye before accepting it with ``--snapshot-update``)."""

from __future__ import annotations

from pathlib import Path

import pytest
from uihelp import paste_into, settled, started, type_into

from tui.app import create_app
from tui.demo import traces as demo

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(autouse=True)
def _at_the_project_root(monkeypatch):
    """Relative demo paths, so the snapshot does not show where the checkout is."""
    monkeypatch.chdir(ROOT)


def test_echo_whole_run(snap_compare):
    async def fill(pilot):
        await started(pilot)
        await type_into(pilot, "echo-run-run", "10 m:rg58, 20 m:rg59, 5 m:rg58")
        await type_into(pilot, "echo-run-load", "100 ohm")
        await type_into(pilot, "echo-run-edge", "1 ns")
        await settled(pilot)

    assert snap_compare(create_app(start_panel="echo"), terminal_size=(80, 24), run_before=fill)


def test_echo_load_summary(snap_compare):
    async def fill(pilot):
        await started(pilot)
        await pilot.press("escape", "2")
        await type_into(pilot, "echo-load-load", "75 ohm || 10 pF")
        await type_into(pilot, "echo-load-frequency", "100 MHz")

    assert snap_compare(create_app(start_panel="echo"), terminal_size=(80, 24), run_before=fill)


def test_trace_with_comparison(snap_compare):
    async def fill(pilot):
        await started(pilot)
        await paste_into(pilot, "trace-file", "tui/demo/kestrel-ridge-feeder.csv")
        await paste_into(pilot, "trace-on", demo.KESTREL_RUN)
        await paste_into(pilot, "trace-expect-load", "open")
        await settled(pilot)

    assert snap_compare(create_app(start_panel="trace"), terminal_size=(80, 24), run_before=fill)
