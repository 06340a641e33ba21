"""Benchmark: whole-run prediction against scikit-rf building and transforming the same network.

    PYTHONPATH=. .venv/bin/python tests/benchmarks/bench_simulate.py

Targets (issue 5): a 16-segment lossy run at 16,384 points in under 5 ms, and
at least 30 times faster than scikit-rf doing the same job in the same run.

Both sides get the same network: 16 lengths of catalog cable with their loss,
two lumps, a load, the instrument's edge. halftrip runs ``calc.simulate.simulate``
(the trace, its distance axis, and the list of arrivals). scikit-rf builds a
DefinedGammaZ0 media per segment with the same propagation constant on a grid
of as many frequencies as halftrip's transform uses (0 Hz up), makes each
line and lump, cascades them with ``**`` into the load, applies the edge and
takes ``step_response``. halftrip is timed for the trace alone (the same job)
and with its list of echoes as well. Medians of repeated runs (and the best);
the machine's other load varies, so the ratio is the figure to read.
"""

from __future__ import annotations

import os
import statistics
import sys
import time
import warnings
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # tests/, for echo_reference

import echo_reference  # noqa: E402

from cable_catalog.loader import load_catalog  # noqa: E402
from calc.loads import parse_load  # noqa: E402
from calc.run import parse_run  # noqa: E402
from calc.simulate import RISE_PER_SIGMA, Lump, Segment, simulate  # noqa: E402

POINTS = 16384

#: An invented feeder: jumpers, 1/2" and 7/8" hardline, a 75 ohm patch left in by mistake,
#: a connector's series inductance, a crushed spot, an antenna-like load.
FEEDER = ("1.5 m:rg58, 0.5 m:rg142, 12 m:hardline-50-half, 0.6 m:rg213, 2 m:rg6, "
          "35 m:hardline-50-7-8, 0.8 m:rg213, 4 m:rg8-foam, 0.3 m:rg142, 18 m:hardline-50-half, "
          "1.2 m:rg58, 3 m:rg6, 6 m:rg213, 0.5 m:rg142, 22 m:hardline-50-half, 1 m:rg58")
#: Every joint reflects: 50, 75 and 93 ohm cables in turn (a worst case for re-reflections).
MIXED = ", ".join(f"{3 + 2 * i} m:{c}" for i, c in enumerate(
    ["rg58", "rg59", "rg213", "rg62", "rg8-foam", "rg6", "rg58", "rg11"] * 2))
LUMPS = [Lump("series_l", 4e-9, 2), Lump("shunt_c", 6e-12, 7)]
LOAD = "50 ohm + 30 nH"


def timings(fn, repeat: int) -> tuple[float, float]:
    """(median, best) of ``repeat`` runs, in seconds."""
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times), min(times)


def scikit_rf_job(segments, prediction):
    """scikit-rf builds the network on the prediction's fine grid and transforms it."""
    dt = prediction.time_s[1] - prediction.time_s[0]
    f = np.fft.rfftfreq(prediction.n_fft, dt)
    sigma = prediction.rise_time_s / RISE_PER_SIGMA
    t_pre = -prediction.time_s[0]

    def job():
        one = echo_reference.network(segments, LUMPS, LOAD, f, prediction.source_z_ohm)
        one.s = one.s * np.exp(-2 * (np.pi * sigma * f) ** 2 - 2j * np.pi * f * t_pre)[:, None, None]
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            return one.step_response(window=None)

    return job


def measure(ours_repeat: int = 51, theirs_repeat: int = 5) -> dict:
    """{run name: (prediction, halftrip with echoes, halftrip trace alone, scikit-rf)},
    each timing a (median, best) pair in seconds."""
    catalog = load_catalog()
    load = parse_load(LOAD)
    runs = {}
    for name, text in (("feeder", FEEDER), ("mixed", MIXED)):
        segments = [Segment.from_run_segment(s) for s in parse_run(text, catalog.get)]
        assert len(segments) == 16
        runs[name] = (segments, simulate(segments, load, lumps=LUMPS, n_points=POINTS))
    # halftrip first: scikit-rf's complex matrix products (BLAS zgemm) can leave the CPU
    # slow at every complex exp that follows in the same process, which would slow ours
    ours = {name: timings(lambda s=seg: simulate(s, load, lumps=LUMPS, n_points=POINTS),
                          ours_repeat) for name, (seg, _) in runs.items()}
    trace = {name: timings(lambda s=seg: simulate(s, load, lumps=LUMPS, n_points=POINTS,
                                                  arrivals=False), ours_repeat)
             for name, (seg, _) in runs.items()}
    theirs = {name: timings(scikit_rf_job(seg, p), theirs_repeat)
              for name, (seg, p) in runs.items()}
    return {name: (p, ours[name], trace[name], theirs[name]) for name, (_, p) in runs.items()}


def figures(quick: bool = False) -> list[dict]:
    """Rows for tests/benchmarks/run_all.py: the trace alone, the job scikit-rf does."""
    rows = []
    for name, (_p, _ours, (trace_median, _), (sk_median, _)) in measure(
            *((11, 2) if quick else (51, 5))).items():
        rows.append({"measure": f"whole-run prediction, 16-segment {name} run, {POINTS:,} "
                                "points (trace)",
                     "halftrip": f"{trace_median * 1e3:.2f} ms",
                     "reference": f"scikit-rf {sk_median * 1e3:.0f} ms",
                     "ratio": trace_median / sk_median,
                     "target": "< 5 ms; ratio <= 1/30"})
    return rows


def main() -> None:
    results = measure()
    print(f"load average {os.getloadavg()[0]:.2f} on {os.cpu_count()} CPUs")
    print("halftrip: the trace alone (what scikit-rf computes), and with its list of echoes")
    print(f"{'run':<7} {'points':>6} {'FFT':>6} {'echoes':>6}  {'trace: median (best)':>21}  "
          f"{'with echoes':>20}  {'scikit-rf':>9}  {'ratio':>5} {'(with echoes)':>13}")
    for name, (p, (om, ob), (cm, cb), (tm, _)) in results.items():
        print(f"{name:<7} {POINTS:>6} {p.n_fft:>6} {len(p.arrivals):>6}  "
              f"{cm * 1e3:>7.2f} ms ({cb * 1e3:5.2f} ms)  {om * 1e3:>6.2f} ms ({ob * 1e3:5.2f} ms)"
              f"  {tm * 1e3:>6.0f} ms  {tm / cm:>4.0f}x {tm / om:>12.0f}x")
    print("targets: under 5 ms at 16,384 points; at least 30 x scikit-rf")


if __name__ == "__main__":
    main()
