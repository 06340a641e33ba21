"""Benchmark: the job log's costs against plain SQLite doing the same work (run by hand).

    PYTHONPATH=. .venv/bin/python tests/benchmarks/bench_joblog.py

Every figure is a ratio against a reference measured in the same run:

* one save (validation, JSON, one ``BEGIN IMMEDIATE`` transaction with its
  tag rows, read back) against a bare ``INSERT`` + ``COMMIT`` of the same JSON
  text on a connection with the same pragmas (WAL, ``synchronous=FULL``);
* opening a job log of 2,000 entries (header check, read-only
  ``integrity_check``, read-write connection) against a bare ``connect``
  and one ``SELECT``;
* a Markdown report of 200 entries against ``json.dumps`` of the same data;
* the trace picture of a one-million-sample result against turning the
  same lists into numpy arrays (the part no picture can avoid).
"""

from __future__ import annotations

import json
import sqlite3
import tempfile
import time
from pathlib import Path

import numpy as np

from tui.joblog import open_log
from tui.joblog.export import job_markdown
from tui.joblog.picture import trace_picture


def best_of(fn, repeat: int = 5) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def _result(i: int) -> dict:
    return {"distance_m": 24.238 + i, "distance_low_m": 23.5, "distance_high_m": 24.9,
            "vf": 0.66, "events": [{"distance_m": 1.0 * k, "size": 0.1} for k in range(8)]}


def measure() -> list[tuple[str, float, float]]:
    """(what, halftrip's seconds, the reference's seconds) for each figure."""
    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        path = tmp / "jobs.sqlite3"
        log = open_log(path)
        job = log.new_job("Harbour Road substation").id
        raw = sqlite3.connect(tmp / "raw.sqlite3", isolation_level=None)
        raw.execute("PRAGMA journal_mode = WAL")
        raw.execute("PRAGMA synchronous = FULL")
        raw.execute("CREATE TABLE e (id INTEGER PRIMARY KEY, inputs TEXT, result TEXT)")
        inputs, result = {"delay": "245 ns", "cable": "rg58"}, _result(0)

        def ours():
            log.add_entry(job, "locate", inputs, result, label="feeder 2", tags=["pass"])

        def bare():
            raw.execute("BEGIN")
            raw.execute("INSERT INTO e (inputs, result) VALUES (?, ?)",
                        (json.dumps(inputs), json.dumps(result)))
            raw.execute("COMMIT")

        t_ours, t_bare = best_of(ours, 50), best_of(bare, 50)
        rows.append(("one save vs bare INSERT+COMMIT", t_ours, t_bare))

        for i in range(2000):
            log.add_entry(job, "locate", inputs, _result(i), label=f"run {i}")
        log.close()
        t_open = best_of(lambda: open_log(path).close(), 10)

        def bare_open():
            con = sqlite3.connect(path)
            con.execute("SELECT 1").fetchone()
            con.close()

        rows.append(("open a 2,000-entry log vs bare connect", t_open, best_of(bare_open, 10)))

        with open_log(path) as log:
            the_job, entries = log.job(job), log.entries(job)[:200]
        t_md = best_of(lambda: job_markdown(the_job, entries), 5)
        t_json = best_of(lambda: json.dumps([e.as_dict() for e in entries]), 5)
        rows.append(("Markdown report, 200 entries vs json.dumps", t_md, t_json))

        n = 1_000_000
        distance = np.linspace(0.0, 500.0, n).tolist()
        level = np.where(np.linspace(0.0, 500.0, n) < 300.0, 0.0, 1.0).tolist()
        trace = {"distance_m": distance, "level": level}
        t_pic = best_of(lambda: trace_picture(trace), 3)
        t_arr = best_of(lambda: (np.array(distance), np.array(level)), 3)
        rows.append(("trace picture, 1e6 samples vs list->array", t_pic, t_arr))
    return rows


def figures(quick: bool = False) -> list[dict]:
    """Rows for tests/benchmarks/run_all.py."""
    return [{"measure": f"job log: {name}", "halftrip": f"{ours_s * 1e3:.2f} ms",
             "reference": f"{ref_s * 1e3:.2f} ms", "ratio": ours_s / ref_s, "target": ""}
            for name, ours_s, ref_s in measure()]


def main() -> None:
    print(f"{'measure':<46} {'ours':>10} {'reference':>10} {'ratio':>7}")
    for name, ours_s, ref_s in measure():
        print(f"{name:<46} {ours_s * 1e3:>8.2f}ms {ref_s * 1e3:>8.2f}ms {ours_s / ref_s:>7.2f}")


if __name__ == "__main__":
    main()
