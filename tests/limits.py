"""Measuring the largest accepted inputs (imported as a plain module by the limit tests).

Memory is measured, never time: :func:`measured` runs a call under
:mod:`tracemalloc` and reports the peak of what Python allocated, and the
CPU seconds it took (``resource.getrusage``), which the tests check against
generous ceilings that only a runaway (an endless loop, a quadratic blow-up)
would reach; the benchmarks report speed.
"""

from __future__ import annotations

import resource
import tracemalloc
from dataclasses import dataclass

MB = 1_000_000


@dataclass(frozen=True)
class Measured:
    value: object  # what the call returned, or the exception it raised
    peak_bytes: int
    cpu_s: float

    @property
    def peak_mb(self) -> float:
        return self.peak_bytes / MB


def _cpu() -> float:
    usage = resource.getrusage(resource.RUSAGE_SELF)
    return usage.ru_utime + usage.ru_stime


def measured(fn, *args, **kwargs) -> Measured:
    """Run ``fn``; its result (or the exception it raised), peak traced memory, CPU s."""
    tracemalloc.start()
    start = _cpu()
    try:
        value = fn(*args, **kwargs)
    except Exception as exc:  # the refusal is the result to check
        value = exc
    finally:
        cpu = _cpu() - start
        peak = tracemalloc.get_traced_memory()[1]
        tracemalloc.stop()
    return Measured(value, peak, cpu)
