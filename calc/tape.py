"""Rounding lengths to what a tape measure shows."""

from __future__ import annotations

import math
from dataclasses import dataclass

from calc.constants import FOOT_M, INCH_M

#: Fractions of an inch a tape shows.
TAPE_DENOMINATORS = (2, 4, 8, 16, 32, 64)


@dataclass(frozen=True)
class FeetInches:
    """A length rounded to the nearest 1/denominator inch."""

    negative: bool
    feet: int
    inches: int
    numerator: int  # reduced fraction of an inch, 0 <= numerator < denominator
    denominator: int
    rounded_m: float


def to_feet_inches(length_m: float, denominator: int = 16) -> FeetInches:
    """Round ``length_m`` to feet, whole inches and a reduced fraction of an inch."""
    if denominator not in TAPE_DENOMINATORS:
        raise ValueError(f"denominator must be one of {TAPE_DENOMINATORS}")
    if not math.isfinite(length_m):
        raise ValueError("length must be finite")
    negative = length_m < 0
    ticks = round(abs(length_m) / INCH_M * denominator)
    rounded_m = math.copysign(ticks * INCH_M / denominator, length_m) if ticks else 0.0
    whole_inches, num = divmod(ticks, denominator)
    feet, inches = divmod(whole_inches, 12)
    den = denominator
    while num and num % 2 == 0:
        num //= 2
        den //= 2
    if num == 0:
        den = denominator
    return FeetInches(negative and ticks > 0, feet, inches, num, den, rounded_m)


def round_mm(length_m: float, step_mm: float = 1.0) -> float:
    """Round to the nearest ``step_mm`` millimetres; returns metres."""
    step = step_mm / 1000.0
    return round(length_m / step) * step


FEET_PER_M = 1.0 / FOOT_M
