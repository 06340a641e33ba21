"""Distances shown to the precision their uncertainty supports (``tui.fmt.uncertain_length``):
the step is the smallest 1-2-5 step (metric) or tape step (imperial) of at least a tenth of
the +/- half width; the +/- is rounded up and the range outwards to that step; --json keeps
full precision.

Worked values: d = VF c0 t / 2 with c0 = 299 792 458 m/s (SI definition of the metre) and
the RG-58 family's VF 0.66 with a 3 % tolerance (REFERENCES.md); 1 ft = 0.3048 m exactly
(international foot).
"""

from __future__ import annotations

import json

import pytest

from tui.cli import main
from tui.fmt import uncertain_length

C0 = 299_792_458.0
D = 0.66 * C0 * 245e-9 / 2  # 24.238 m


def test_worked_value_metric():
    # +/- 3 % of 24.238 m is 0.727 m; a tenth of it is 0.073 m, so the step is 0.1 m:
    # 24.238 -> 24.2 m, 0.727 up to 0.8 m, 23.511 down to 23.5 m, 24.965 up to 25.0 m
    shown = uncertain_length(D, 0.97 * D, 1.03 * D)
    assert str(shown) == "24.2 m +/- 0.8 m"
    assert shown.span == "23.5 m to 25.0 m"


def test_worked_value_imperial():
    # 24.238 m = 79 ft 6.28 in; +/- 28.6 in, a tenth 2.86 in: the 3 in step
    shown = uncertain_length(D, 0.97 * D, 1.03 * D, "imperial", 16)
    assert str(shown) == "79 ft 6 in +/- 2 ft 6 in"


@pytest.mark.parametrize(("tolerance", "text"), [
    (0.001, "24.240 m +/- 0.025 m"),  # +/- 24.2 mm, a tenth 2.4 mm: the 5 mm step
    (0.01, "24.25 m +/- 0.25 m"),  # +/- 0.242 m, a tenth 24 mm: the 0.05 m step
    (0.10, "24.0 m +/- 2.5 m"),  # +/- 2.42 m, a tenth 0.24 m: the 0.5 m step
])
def test_the_step_follows_the_tolerance(tolerance, text):
    assert str(uncertain_length(D, (1 - tolerance) * D, (1 + tolerance) * D)) == text


def test_without_a_range_the_distance_is_shown_in_full():
    assert str(uncertain_length(D, D, D)) == "24.238 m"
    assert str(uncertain_length(D, None, None)) == "24.238 m"


def test_locate_text_rounds_and_json_keeps_full_precision(capsys):
    assert main(["locate", "245 ns", "--cable", "rg58"]) == 0
    text = capsys.readouterr().out
    assert "24.2 m +/- 0.8 m" in text and "23.5 m to 25.0 m" in text
    assert "24.238" not in text
    assert main(["locate", "245 ns", "--cable", "rg58", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["distance_m"] == pytest.approx(D, rel=1e-12)
