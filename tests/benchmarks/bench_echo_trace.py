"""Benchmark: keystroke to updated result in the Echo and Trace panels.

Plain script (not collected by pytest). Run from the worktree root::

    .venv/bin/python tests/benchmarks/bench_echo_trace.py [--keys 60]

For each panel the time from a key press in a field to the new result being
shown is measured over many keys (the median), and set against references
measured in the same run on the same machine: a key press in the Echo Load
tab (a form computed on the UI thread with a text result: what any live
field costs), and the core call behind the panel timed alone (``halftrip
simulate``'s ``compute``; the trace command's ``compare_with_expected``,
which is all the Trace panel redoes while only the expectation changes).
What is left is what the panel adds: the worker thread, the table and the
plot. The figures are printed; the panels stay usable while the core works
(it runs in a worker thread), so there is no pass or fail beyond the run
finishing.
"""

from __future__ import annotations

import argparse
import asyncio
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
RUN = "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"


def _median_ms(values: list[float]) -> float:
    return statistics.median(values) * 1000


def core_times(repeats: int) -> tuple[float, float, float]:
    """Median seconds of the core calls alone: one prediction; one trace read,
    analysis and comparison; the comparison alone (what the panel redoes when
    only the expectation changes: it keeps the analysis of an unchanged file)."""
    from tui.commands import simulate, trace
    from tui.panels.trace import DEMO_DIR

    def options(command, *argv):
        parser = argparse.ArgumentParser()
        command.add_arguments(parser)
        return parser.parse_args(list(argv))

    ns = options(simulate, "--run=10 m:rg58, 20 m:rg59", "--load=1000 ohm")
    sim = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        simulate.compute(ns)
        sim.append(time.perf_counter() - t0)
    tns = options(trace, f"--run={RUN}", f"--expect-run={RUN}", "--expect-load=1000 ohm",
                  str(DEMO_DIR / "kestrel-ridge-feeder.csv"))
    tr, cmp = [], []
    for _ in range(repeats):
        t0 = time.perf_counter()
        setup, _info, _notes, analysis = trace.analyse_file(tns)
        t1 = time.perf_counter()
        trace.compare_with_expected(tns, setup, analysis)
        t2 = time.perf_counter()
        tr.append(t2 - t0)
        cmp.append(t2 - t1)
    return statistics.median(sim), statistics.median(tr), statistics.median(cmp)


async def panel_latencies(panel: str, field_id: str, start_text: str, cursor: int,
                          keys: int, setup_fields: dict[str, str], view_class=None
                          ) -> list[float]:
    """Key press in ``field_id`` (alternately "0" at ``cursor`` and backspace) to the
    result shown by ``view_class`` (default: the trace view)."""
    from textual.widgets import Input

    from tui import safety
    from tui.app import create_app
    from tui.widgets.trace_view import TraceView

    view_class = view_class or TraceView
    safety.notice_needed = lambda prefs=None: False
    shown: list[float] = []
    original = view_class.show

    def timed_show(self, content):
        original(self, content)
        shown.append(time.perf_counter())

    view_class.show = timed_show
    app = create_app(start_panel=panel)
    latencies = []
    try:
        async with app.run_test(size=(80, 24)) as pilot:
            while not app.core_ready:
                await pilot.pause(0.02)
            for fid, text in setup_fields.items():
                app.query_one(f"#{fid}", Input).value = text
            field = app.query_one(f"#{field_id}", Input)
            field.focus()
            count = len(shown)
            field.value = start_text
            while len(shown) == count:
                await pilot.pause(0.01)
            for i in range(keys):
                if i % 2 == 0:
                    field.cursor_position = cursor
                count = len(shown)
                t0 = time.perf_counter()
                await pilot.press("0" if i % 2 == 0 else "backspace")
                while len(shown) == count:
                    await pilot.pause(0)
                latencies.append(shown[-1] - t0)
    finally:
        view_class.show = original
    return latencies


def measure(keys: int) -> dict:
    """Latencies (lists of seconds) of the reference field and both panels, and the
    median seconds of the core calls alone."""
    import os
    import tempfile

    sys.path.insert(0, str(ROOT))
    os.chdir(ROOT)
    tmp = tempfile.mkdtemp(prefix="halftrip-bench-")
    os.environ["HALFTRIP_DATA_DIR"] = f"{tmp}/data"
    os.environ["HALFTRIP_CONFIG_DIR"] = f"{tmp}/config"
    from tui.panels.trace import DEMO_DIR
    from tui.widgets.result_view import ResultView

    sim_s, trace_s, compare_s = core_times(max(keys // 2, 10))
    plain = asyncio.run(panel_latencies(
        "echo", "echo-load-load", "100 ohm", 3, keys, {}, view_class=ResultView))
    echo = asyncio.run(panel_latencies(
        "echo", "echo-run-load", "100 ohm", 3, keys, {"echo-run-run": "10 m:rg58, 20 m:rg59"}))
    tr = asyncio.run(panel_latencies(
        "trace", "trace-expect-load", "100 ohm", 3, keys,
        {"trace-file": str(DEMO_DIR / "kestrel-ridge-feeder.csv"), "trace-on": RUN}))
    return {"plain": plain, "echo": echo, "trace": tr, "sim_s": sim_s, "trace_s": trace_s,
            "compare_s": compare_s}


def figures(quick: bool = False) -> list[dict]:
    """Rows for tests/benchmarks/run_all.py."""
    m = measure(20 if quick else 60)
    ref = _median_ms(m["plain"])
    return [{"measure": f"keystroke to result, {what} (median)",
             "halftrip": f"{_median_ms(m[key]):.1f} ms",
             "reference": f"Echo Load field {ref:.1f} ms",
             "ratio": _median_ms(m[key]) / ref, "target": ""}
            for key, what in (("echo", "Echo whole-run prediction"),
                              ("trace", "Trace expected load"))]


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--keys", type=int, default=60)
    args = parser.parse_args()
    m = measure(args.keys)
    plain, echo, tr = m["plain"], m["echo"], m["trace"]
    sim_s, trace_s, compare_s = m["sim_s"], m["trace_s"], m["compare_s"]

    def spread(v):
        return f"median {_median_ms(v):.1f} ms, 90th percentile " \
               f"{statistics.quantiles(v, n=10)[-1] * 1000:.1f} ms over {len(v)} keys"

    print(f"reference, echo Load tab (computed on the UI thread, text result): keystroke "
          f"to result {spread(plain)}")
    print(f"echo, whole run: keystroke to new prediction on screen {spread(echo)}; "
          f"the prediction alone {sim_s * 1000:.1f} ms; panel minus reference minus "
          f"prediction {_median_ms(echo) - _median_ms(plain) - sim_s * 1000:.1f} ms")
    print(f"trace, 4182-sample demo file, typing the expected load: keystroke to new "
          f"comparison {spread(tr)}; the comparison alone {compare_s * 1000:.1f} ms (reading "
          f"and analysing the file as well: {trace_s * 1000:.1f} ms)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
