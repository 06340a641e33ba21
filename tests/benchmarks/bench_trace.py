"""Benchmark: read and analyse a one-million-sample trace (issue 6, target < 0.5 s).

Plain script, not collected by pytest:

    .venv/bin/python tests/benchmarks/bench_trace.py

It writes an invented trace (a matched 50 ohm run with a 75 ohm section, a
connector bump and an open, plus noise) of 1,000,000 samples to a temporary
CSV file, then times, best of several runs on this machine:

* halftrip: ``calc.trace_read.read_trace`` on the file's bytes (read from
  disk each time) plus ``calc.events.analyse``;
* the reference: ``numpy.loadtxt`` of the same file (numbers only, no
  analysis),

and prints both and their ratio. pint's one-time unit registry build (the
header's unit goes through ``calc.parse``) is timed apart as the cold start.
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from calc.events import analyse  # noqa: E402
from calc.trace_read import read_trace  # noqa: E402

N = 1_000_000
TARGET_S = 0.5
REPEATS = 5


def make_trace(n: int = N, seed: int = 6) -> tuple[np.ndarray, np.ndarray]:
    """Volts against time: 0.5 V incident step, then an invented run's events."""
    dt = 10e-12
    t = np.arange(n) * dt - 20e-9
    rise = 0.3e-9

    def edge(at):
        return 0.5 * (1.0 + np.tanh((t - at) / (rise / 2.2)))

    rho = 0.2 * edge(400e-9) - 0.2 * edge(900e-9) + 0.8 * edge(8e-6)
    rho += 0.05 * np.exp(-0.5 * ((t - 3e-6) / (rise / 2.56)) ** 2)
    v = 0.5 * (edge(0.0) + rho)
    v += np.random.default_rng(seed).normal(0.0, 0.002, n)
    return t, v


def best(fn, repeats: int = REPEATS) -> float:
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def measure(repeats: int = REPEATS) -> dict:
    """Seconds (best of ``repeats``) of halftrip's read + analysis, of the read alone and
    of numpy.loadtxt on the same file, with the first call's (pint's start-up) time."""
    t, v = make_trace()
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "bench-trace.csv"
        np.savetxt(path, np.column_stack([t * 1e9, v]), delimiter=",", fmt="%.6f",
                   header="time_ns,level_V", comments="")

        def ours():
            trace = read_trace(path.read_bytes(), path.name)
            return analyse(trace.x, trace.level)

        t0 = time.perf_counter()
        result = ours()
        cold = time.perf_counter() - t0
        return {"size_mb": path.stat().st_size / 1e6, "events": len(result.events),
                "cold_s": cold, "ours_s": best(ours, repeats),
                "ref_s": best(lambda: np.loadtxt(path, delimiter=",", skiprows=1), repeats),
                "read_s": best(lambda: read_trace(path.read_bytes(), path.name), repeats)}


def figures(quick: bool = False) -> list[dict]:
    """Rows for tests/benchmarks/run_all.py."""
    m = measure(2 if quick else REPEATS)
    return [{"measure": f"trace read + analysis, {N:,} samples ({m['size_mb']:.0f} MB CSV)",
             "halftrip": f"{m['ours_s'] * 1e3:.0f} ms",
             "reference": f"numpy.loadtxt {m['ref_s'] * 1e3:.0f} ms",
             "ratio": m["ours_s"] / m["ref_s"], "target": f"< {TARGET_S * 1e3:.0f} ms"}]


def main() -> int:
    m = measure()
    ours_s, ref_s = m["ours_s"], m["ref_s"]
    print(f"trace: {N:,} samples, {m['size_mb']:.1f} MB CSV; {m['events']} events found")
    print(f"halftrip read + analyse  {ours_s * 1e3:8.1f} ms   (read alone {m['read_s'] * 1e3:.1f}"
          f" ms; first call with pint's start-up {m['cold_s'] * 1e3:.1f} ms)")
    print(f"numpy.loadtxt (reference) {ref_s * 1e3:8.1f} ms")
    print(f"ratio halftrip / loadtxt   {ours_s / ref_s:8.2f}")
    ok = ours_s < TARGET_S
    print(f"target < {TARGET_S * 1e3:.0f} ms: {'met' if ok else 'NOT met'}")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
