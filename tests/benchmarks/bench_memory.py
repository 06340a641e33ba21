"""Benchmark: peak memory of the terminal interface (plain script, not collected by pytest).

    .venv/bin/python tests/benchmarks/bench_memory.py

The app runs headless at 80x24 in a subprocess on the demo job: it waits for
the start-up worker (pint, numpy, the catalog), opens every panel in turn
(each computes its demo result), then quits. The figure is that process's
peak resident set size, read by the parent with
``resource.getrusage(RUSAGE_CHILDREN).ru_maxrss`` (each measurement in a
fresh parent of its own, so the figure belongs to that one child). The
reference is a minimal Textual app (one Static) run and quit the same way,
in the same run: the ratio says what halftrip adds to Textual itself.
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]

HALFTRIP = """
from tui.app import create_app

app = create_app(demo=True)

async def tour(pilot):
    while not app.core_ready:
        await pilot.pause(0.05)
    for spec in app.PANELS:
        await app.action_open_panel(spec.name)
        await pilot.pause()
    await pilot.pause(0.2)
    app.exit()

app.run(headless=True, size=(80, 24), auto_pilot=tour)
"""

MINIMAL = """
from textual.app import App
from textual.widgets import Static

class Minimal(App):
    def compose(self):
        yield Static("minimal")

async def tour(pilot):
    await pilot.pause(0.2)
    pilot.app.exit()

Minimal().run(headless=True, size=(80, 24), auto_pilot=tour)
"""

#: The parent: runs the program once and prints its child's peak RSS (KiB on Linux).
PARENT = """
import resource, subprocess, sys
subprocess.run([sys.executable, "-c", sys.argv[1]], check=True)
print(resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss)
"""


def peak_mb(code: str) -> float:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    out = subprocess.run([sys.executable, "-c", PARENT, code], cwd=ROOT, env=env, check=True,
                         capture_output=True, text=True)
    return int(out.stdout.strip().splitlines()[-1]) / 1024.0  # ru_maxrss is in KiB on Linux


def measure(runs: int) -> tuple[float, float]:
    """(median peak MB of halftrip, of the minimal Textual app)."""
    ours, minimal = [], []
    for _ in range(runs):
        minimal.append(peak_mb(MINIMAL))
        ours.append(peak_mb(HALFTRIP))
    return statistics.median(ours), statistics.median(minimal)


def figures(quick: bool = False) -> list[dict]:
    ours, minimal = measure(1 if quick else 3)
    return [{"measure": "TUI peak memory (RSS), demo job, every panel opened",
             "halftrip": f"{ours:.0f} MB", "reference": f"minimal Textual app {minimal:.0f} MB",
             "ratio": ours / minimal, "target": ""}]


def main() -> int:
    ours, minimal = measure(3)
    print(f"TUI peak RSS: halftrip {ours:.0f} MB, minimal Textual app {minimal:.0f} MB, "
          f"ratio {ours / minimal:.2f}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
