"""Benchmark: whole-run prediction against scikit-rf building and transforming the same network.

    PYTHONPATH=. .venv/bin/python tests/benchmarks/bench_simulate.py

Targets (issue 5): a 16-segment lossy run at 16,384 points in under 5 ms, and
at least 30 times faster than scikit-rf doing the same job in the same run.

Both sides get the same network: 16 lengths of catalog cable with their loss,
two lumps, a load, the instrument's edge. halftrip runs ``calc.simulate.simulate``
(the trace, its distance axis, and the list of arrivals). scikit-rf builds a
DefinedGammaZ0 media per segment with the same propagation constant on the
same frequency grid (0 Hz up, the grid halftrip's fine band uses), makes each
line and lump, cascades them with ``**`` into the load, applies the edge and
takes ``step_response``. Medians of repeated runs; the machine's other load
varies, so the ratio is the figure to read.
"""

from __future__ import annotations

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


def median_time(fn, repeat: int) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


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


def main() -> None:
    catalog = load_catalog()
    load = parse_load(LOAD)
    print(f"{'run':<8} {'points':>7} {'FFT':>7} {'echoes':>7} {'halftrip':>10} "
          f"{'scikit-rf':>10} {'ratio':>7}")
    for name, text in (("feeder", FEEDER), ("mixed", MIXED)):
        segments = [Segment.from_run_segment(s) for s in parse_run(text, catalog.get)]
        assert len(segments) == 16
        prediction = simulate(segments, load, lumps=LUMPS, n_points=POINTS)
        ours = median_time(lambda s=segments: simulate(s, load, lumps=LUMPS, n_points=POINTS),
                           repeat=41)
        theirs = median_time(scikit_rf_job(segments, prediction), repeat=5)
        print(f"{name:<8} {POINTS:>7} {prediction.n_fft:>7} {len(prediction.arrivals):>7} "
              f"{ours * 1e3:>7.2f} ms {theirs * 1e3:>7.0f} ms {theirs / ours:>6.0f}x")
    print("targets: under 5 ms at 16,384 points; at least 30 x scikit-rf")


if __name__ == "__main__":
    main()
