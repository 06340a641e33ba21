"""Run every benchmark and print one table (plain script, not collected by pytest).

    .venv/bin/python tests/benchmarks/run_all.py            # full runs (a few minutes)
    .venv/bin/python tests/benchmarks/run_all.py --quick    # fewer repeats, rougher figures
    .venv/bin/python tests/benchmarks/run_all.py --markdown # the table for README.md

Every ``bench_*.py`` beside this file is a plain script that also exposes
``figures(quick: bool = False) -> list[dict]``; each dict is one row:

* ``measure``: what was measured (one line);
* ``halftrip``: halftrip's figure, formatted with its unit;
* ``reference``: the reference measured in the same run, or ``""``;
* ``ratio``: halftrip / reference (a float), or None where nothing compares
  (shown as ``1/N`` when far below 1);
* ``target``: the target this figure is held to, or ``""``.

Each benchmark module is imported in a fresh interpreter of its own (so one
benchmark's imports, caches and memory never colour another's), with the
user's directories pointed at a temporary place where the first-start safety
notice is already acknowledged. A script without ``figures()`` is listed as
such; one that fails shows its last error line. The machine (CPU model,
cores, Python) is printed with the table, since the absolute figures belong
to it; the ratios are the figures to compare between machines.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import subprocess
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]
MARK = "@@figures@@"

CHILD = """
import json, sys
sys.path[:0] = [{root!r}, {here!r}, {tests!r}]
import {name} as bench
rows = bench.figures(quick={quick}) if hasattr(bench, "figures") else None
print({mark!r} + json.dumps(rows))
"""


def machine() -> str:
    """CPU model, cores and Python version, for the table's heading."""
    model = "unknown CPU"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                model = line.split(":", 1)[1].strip()
                break
    except OSError:
        model = platform.processor() or model
    return (f"{model}, {os.cpu_count()} cores (nproc), Python {platform.python_version()}, "
            f"{platform.system()} {platform.release()}")


def user_dirs() -> dict[str, str]:
    """Temporary user directories with the safety notice acknowledged (as a user who
    has started halftrip before: the benchmarks time the program, not the notice)."""
    base = Path(tempfile.mkdtemp(prefix="halftrip-bench-"))
    env = {"HALFTRIP_DATA_DIR": str(base / "data"), "HALFTRIP_CONFIG_DIR": str(base / "config"),
           "HALFTRIP_DB": str(base / "data" / "jobs.sqlite3")}
    code = ("from tui import safety; from tui.prefs import Preferences, save_preferences, "
            "with_section; save_preferences(with_section(Preferences(), safety.PREFS_TABLE, "
            "**safety.acknowledgement()))")
    subprocess.run([sys.executable, "-c", code], cwd=ROOT, check=True,
                   env=dict(os.environ, PYTHONPATH=str(ROOT), **env))
    return env


def run_one(path: Path, quick: bool, env: dict[str, str]) -> tuple[list[dict] | None, str]:
    """(rows, problem) of one benchmark module, run in a fresh interpreter."""
    code = CHILD.format(root=str(ROOT), here=str(HERE), tests=str(ROOT / "tests"),
                        name=path.stem, quick=quick, mark=MARK)
    proc = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True,
                          text=True, env=dict(os.environ, PYTHONPATH=str(ROOT), **env))
    for line in proc.stdout.splitlines():
        if line.startswith(MARK):
            rows = json.loads(line[len(MARK):])
            return rows, "" if rows is not None else "no figures() function"
    last = (proc.stderr.strip().splitlines() or ["no output"])[-1]
    return None, f"failed: {last[:100]}"


def _ratio(value) -> str:
    """``1.41``, or ``1/130`` for a figure far below its reference (easier to read)."""
    if value is None:
        return ""
    return f"1/{1.0 / value:.0f}" if 0 < value < 0.1 else f"{value:.2f}"


def table(results: list[tuple[str, list[dict] | None, str]], markdown: bool) -> str:
    head = ("benchmark", "measure", "halftrip", "reference", "ratio", "target")
    rows = []
    for name, figures, problem in results:
        if figures is None:
            rows.append((name, problem, "", "", "", ""))
            continue
        for f in figures:
            rows.append((name, f["measure"], f["halftrip"], f.get("reference", ""),
                         _ratio(f.get("ratio")), f.get("target", "")))
    if markdown:
        lines = ["| " + " | ".join(head) + " |", "|" + "---|" * len(head)]
        lines += ["| " + " | ".join(r) + " |" for r in rows]
        return "\n".join(lines)
    widths = [max(len(r[i]) for r in [head, *rows]) for i in range(len(head))]
    fmt = "  ".join(f"{{:<{w}}}" for w in widths)
    return "\n".join([fmt.format(*head), fmt.format(*("-" * w for w in widths))]
                     + [fmt.format(*r) for r in rows])


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="fewer repeats (rougher figures)")
    parser.add_argument("--markdown", action="store_true", help="print a Markdown table")
    parser.add_argument("names", nargs="*", help="only these benchmarks (e.g. bench_cli)")
    args = parser.parse_args()
    scripts = sorted(HERE.glob("bench_*.py"))
    if args.names:
        scripts = [p for p in scripts if p.stem in args.names or p.name in args.names]
    env = user_dirs()
    results = []
    for path in scripts:
        print(f"running {path.name} ...", file=sys.stderr, flush=True)
        rows, problem = run_one(path, args.quick, env)
        results.append((path.stem, rows, problem))
    print(f"machine: {machine()}")
    print(table(results, args.markdown))
    return 0 if all(rows is not None for _n, rows, _p in results) else 1


if __name__ == "__main__":
    sys.exit(main())
