"""Benchmark: the terminal interface's start-up and live-update speed.

Plain script (not collected by pytest). Run from the worktree root::

    .venv/bin/python tests/benchmarks/bench_tui.py [--runs 7]

1. Time to first frame, as a ratio against a minimal Textual app measured in
   the same run on the same machine (target: at most 1.25). Each program is
   started in a pseudo-terminal of 80x24, exactly as a person would start it,
   and the clock stops when the first frame's text arrives on the terminal
   (a marker only that frame contains). The runs alternate between the two
   programs and the medians are compared. The first frame is halftrip's shell
   (panel bar); the first panel is mounted right after it, and the time until
   its form is on screen is printed too, for information.
2. Keystroke latency in a Locate field: the time from a key press to the
   result on screen being updated (median over many keys; target < 16 ms).
"""

from __future__ import annotations

import argparse
import asyncio
import fcntl
import os
import pty
import select
import signal
import statistics
import struct
import sys
import termios
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]

MINIMAL = """
from textual.app import App
from textual.widgets import Static

class Minimal(App):
    def compose(self):
        yield Static("minimal-first-frame")

Minimal().run()
"""
HALFTRIP = "import sys; from tui.cli import main; sys.exit(main([]))"
#: Text only halftrip's first frame has: the first panel's name in the panel bar.
FIRST_FRAME_MARK = b"Locate"


def first_frame_s(code: str, marker: bytes, env: dict, timeout: float = 20.0,
                  then: bytes | None = None) -> float | tuple[float, float]:
    """Seconds from starting ``python -c code`` in an 80x24 pty until ``marker`` is
    shown (and, given ``then``, also until ``then`` is shown)."""
    pid, fd = pty.fork()
    if pid == 0:  # child: become the program
        os.chdir(ROOT)
        os.execve(sys.executable, [sys.executable, "-c", code], env)
    start = time.perf_counter()
    fcntl.ioctl(fd, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
    seen = b""
    first = None
    try:
        while first is None or (then is not None and then not in seen):
            if time.perf_counter() - start > timeout:
                raise TimeoutError(f"no first frame within {timeout} s: {seen[-300:]!r}")
            ready, _, _ = select.select([fd], [], [], 0.5)
            if ready:
                try:
                    seen += os.read(fd, 65536)
                except OSError:
                    break
            if first is None and marker in seen:
                first = time.perf_counter() - start
        return first if then is None else (first, time.perf_counter() - start)
    finally:
        os.kill(pid, signal.SIGKILL)
        os.waitpid(pid, 0)
        os.close(fd)


def bench_first_frame(runs: int) -> tuple[float, float, float]:
    import tempfile

    tmp = tempfile.mkdtemp(prefix="halftrip-bench-")
    env = dict(os.environ, TERM="xterm-256color", COLUMNS="80", LINES="24",
               PYTHONPATH=str(ROOT), HALFTRIP_DATA_DIR=f"{tmp}/data",
               HALFTRIP_CONFIG_DIR=f"{tmp}/config")
    # a person who has acknowledged the safety notice before (it would cover the form)
    os.environ["HALFTRIP_CONFIG_DIR"] = env["HALFTRIP_CONFIG_DIR"]
    sys.path.insert(0, str(ROOT))
    from tui import safety
    from tui.prefs import update_preferences

    update_preferences(sections={safety.PREFS_TABLE: safety.acknowledgement()})
    # warm the OS file cache and bytecode for both before measuring
    first_frame_s(MINIMAL, b"minimal-first-frame", env)
    first_frame_s(HALFTRIP, FIRST_FRAME_MARK, env)
    minimal, ours, form = [], [], []
    for _ in range(runs):
        minimal.append(first_frame_s(MINIMAL, b"minimal-first-frame", env))
        frame, fields = first_frame_s(HALFTRIP, FIRST_FRAME_MARK, env, then=b"cable or velocity")
        ours.append(frame)
        form.append(fields)
    return statistics.median(minimal), statistics.median(ours), statistics.median(form)


async def _keystroke_latencies(keys: int) -> list[float]:
    sys.path.insert(0, str(ROOT))
    from tui.app import create_app
    from tui.widgets.result_view import ResultView

    shown: list[float] = []
    original = ResultView.show

    def timed_show(self, content):
        original(self, content)
        shown.append(time.perf_counter())

    ResultView.show = timed_show
    app = create_app(start_panel="locate")
    latencies = []
    async with app.run_test(size=(80, 24)) as pilot:
        while not (app.core_ready and app.query("#locate-one-delay")):
            await pilot.pause(0.02)
        from textual.widgets import Input

        app.query_one("#locate-one-cable", Input).value = "rg58"
        field = app.query_one("#locate-one-delay", Input)
        field.focus()
        field.value = "245 ns"
        await pilot.pause()
        for _ in range(keys):
            # "245 ns" -> "245 n" (an error: marked out of date) -> "245 ns" (a result)
            await pilot.press("end", "backspace")
            await pilot.pause()
            count = len(shown)
            key = "s"
            t0 = time.perf_counter()
            await pilot.press(key)
            while len(shown) == count:
                if time.perf_counter() - t0 > 5:
                    raise TimeoutError("no result within 5 s of a key press")
                await pilot.pause(0)
            latencies.append(shown[-1] - t0)
    ResultView.show = original
    return latencies


def figures(quick: bool = False) -> list[dict]:
    """Rows for tests/benchmarks/run_all.py."""
    runs, keys = (3, 50) if quick else (7, 200)
    minimal, ours, _form = bench_first_frame(runs)
    lat = asyncio.run(_keystroke_latencies(keys))
    med, p90 = statistics.median(lat), statistics.quantiles(lat, n=10)[-1]
    return [{"measure": "TUI time to first frame (80x24 terminal)", "halftrip":
             f"{ours * 1e3:.0f} ms", "reference": f"minimal Textual app {minimal * 1e3:.0f} ms",
             "ratio": ours / minimal, "target": "ratio <= 1.25"},
            {"measure": f"keystroke to result, Locate delay field ({len(lat)} keys)",
             "halftrip": f"median {med * 1e3:.1f} ms, 90th pct {p90 * 1e3:.1f} ms",
             "reference": "", "ratio": None, "target": "median < 16 ms"}]


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=7)
    parser.add_argument("--keys", type=int, default=200)
    args = parser.parse_args()
    minimal, ours, form = bench_first_frame(args.runs)
    ratio = ours / minimal
    print(f"first frame: minimal Textual app {minimal * 1000:.0f} ms, halftrip "
          f"{ours * 1000:.0f} ms, ratio {ratio:.2f} (target <= 1.25)")
    print(f"Locate form on screen (panel mounted after the first frame): {form * 1000:.0f} ms, "
          f"ratio {form / minimal:.2f} (for information)")
    try:
        lat = asyncio.run(_keystroke_latencies(args.keys))
    except Exception as exc:  # the Locate panel is not there yet
        print(f"keystroke latency: not measured ({exc.__class__.__name__}: {exc})")
        return 0 if ratio <= 1.25 else 1
    med = statistics.median(lat) * 1000
    p90 = statistics.quantiles(lat, n=10)[-1] * 1000
    print(f"keystroke to result (Locate delay field): median {med:.2f} ms, 90th percentile "
          f"{p90:.2f} ms over {len(lat)} keys (target median < 16 ms)")
    return 0 if ratio <= 1.25 and med < 16 else 1


if __name__ == "__main__":
    sys.exit(main())
