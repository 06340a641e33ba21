"""Tape-measure rounding and length formatting (issue 2)."""

from __future__ import annotations

import pytest

from calc.tape import to_feet_inches
from tui import fmt


def test_rounds_to_sixteenths_and_reduces():
    # 1 m = 39.3701 in = 3 ft 3.3701 in; nearest 1/16 is 3 ft 3-3/8 in (6/16 reduced).
    fi = to_feet_inches(1.0, 16)
    assert (fi.feet, fi.inches, fi.numerator, fi.denominator) == (3, 3, 3, 8)
    assert fmt.length(1.0, "imperial", 16) == "3 ft 3-3/8 in"


def test_exact_foot():
    assert fmt.length(0.3048, "imperial", 32) == "1 ft 0 in"


def test_carry_into_next_inch_and_foot():
    # 11 in + 31.9/32 rounds up to 12 in = 1 ft 0 in at 1/16.
    assert fmt.length((11 + 31.9 / 32) * 0.0254, "imperial", 16) == "1 ft 0 in"


@pytest.mark.parametrize("m,text", [(0.0125, "12.5 mm"), (0.85, "850 mm"), (12.3456, "12.346 m")])
def test_metric(m, text):
    assert fmt.length(m) == text
