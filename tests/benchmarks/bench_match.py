"""Benchmark: band evaluation of matching sections and harnesses (run by hand).

    PYTHONPATH=. .venv/bin/python tests/benchmarks/bench_match.py

Reports ratios against a reference measured in the same run: the vectorised
band evaluation of every catalog candidate against the same evaluation done
one frequency at a time, and a full harness design against one match.
"""

from __future__ import annotations

import time

import numpy as np

from cable_catalog.loader import load_catalog
from calc import match


def best_of(fn, repeat: int = 5) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def measure(repeat: int = 5) -> dict:
    """Best-of-``repeat`` seconds of the vectorised match, its point-by-point
    reference and a harness, with the sizes involved."""
    coax = load_catalog().by_category("coax")
    f0, band = 146e6, (144e6, 148e6)
    grid = match.band_frequencies(f0, band)

    def vectorised():
        match.quarter_wave_match(50.0, 100.0, f0, coax, band)

    def point_by_point():  # reference: the same sections, one frequency at a time
        for cable, n in match.section_options(coax):
            s = match.make_section(cable, n, 90.0, f0)
            for f in grid:
                match.section_input_impedance(s, 100.0, np.array([f]))

    def harness():
        match.harness(4, 50.0, 50.0, f0, coax, topology="half", band_hz=band, arm_reach_m=1.5)

    return {"candidates": 2 * len(coax), "frequencies": grid.size,
            "vectorised_s": best_of(vectorised, repeat),
            "point_by_point_s": best_of(point_by_point, repeat),
            "harness_s": best_of(harness, repeat)}


def figures(quick: bool = False) -> list[dict]:
    """Rows for tests/benchmarks/run_all.py."""
    m = measure(2 if quick else 5)
    return [{"measure": f"match: {m['candidates']} candidates x {m['frequencies']} frequencies",
             "halftrip": f"{m['vectorised_s'] * 1e3:.2f} ms",
             "reference": f"point by point {m['point_by_point_s'] * 1e3:.2f} ms",
             "ratio": m["vectorised_s"] / m["point_by_point_s"], "target": ""}]


def main() -> None:
    m = measure()
    t_vec, t_ref, t_h = m["vectorised_s"], m["point_by_point_s"], m["harness_s"]
    print(f"match, {m['candidates']} candidates x {m['frequencies']} frequencies: "
          f"{t_vec * 1e3:.2f} ms")
    print(f"  point by point (reference):           {t_ref * 1e3:.2f} ms")
    print(f"  speed-up of the vectorised band:      {t_ref / t_vec:.1f} x")
    print(f"harness, 4 arms, half topology: {t_h * 1e3:.2f} ms = {t_h / t_vec:.2f} x one match")


if __name__ == "__main__":
    main()
