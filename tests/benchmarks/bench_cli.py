"""Benchmark: CLI start-up (plain script, not collected by pytest).

    .venv/bin/python tests/benchmarks/bench_cli.py [--runs 21]

A person in the field runs one command at a time, so the whole start-up of
a fresh interpreter counts. Timed from process start to exit, as a shell
runs it: ``halftrip velocity --vf 0.66`` (the lightest calculation: no pint,
no catalog) and ``halftrip locate 245 ns --cable rg58`` (units through pint
and the catalog read), each against ``python -c pass`` started the same way
in the same run. Runs alternate between the programs; medians are compared.
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
REFERENCE = [sys.executable, "-c", "pass"]
COMMANDS = {
    "velocity --vf 0.66": ["velocity", "--vf", "0.66"],
    "locate 245 ns --cable rg58": ["locate", "245 ns", "--cable", "rg58"],
}


def wall_s(argv: list[str]) -> float:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    t0 = time.perf_counter()
    subprocess.run(argv, cwd=ROOT, env=env, check=True, stdout=subprocess.DEVNULL,
                   stderr=subprocess.DEVNULL)
    return time.perf_counter() - t0


def measure(runs: int) -> dict[str, tuple[float, float]]:
    """{command: (median s, median s of python -c pass)}, alternating runs."""
    programs = {name: [sys.executable, "-m", "tui.cli", *args] for name, args in COMMANDS.items()}
    for argv in (REFERENCE, *programs.values()):  # warm the file cache and bytecode
        wall_s(argv)
    times: dict[str, list[float]] = {name: [] for name in programs}
    reference: list[float] = []
    for _ in range(runs):
        reference.append(wall_s(REFERENCE))
        for name, argv in programs.items():
            times[name].append(wall_s(argv))
    ref = statistics.median(reference)
    return {name: (statistics.median(t), ref) for name, t in times.items()}


def figures(quick: bool = False) -> list[dict]:
    rows = []
    for name, (ours, ref) in measure(5 if quick else 21).items():
        rows.append({"measure": f"CLI start-up to exit: halftrip {name}",
                     "halftrip": f"{ours * 1e3:.0f} ms", "reference":
                     f"python -c pass {ref * 1e3:.0f} ms", "ratio": ours / ref, "target": ""})
    return rows


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=21)
    args = parser.parse_args()
    for name, (ours, ref) in measure(args.runs).items():
        print(f"halftrip {name}: {ours * 1e3:.0f} ms; python -c pass {ref * 1e3:.0f} ms; "
              f"ratio {ours / ref:.2f}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
