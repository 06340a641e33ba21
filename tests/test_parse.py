"""The input edge: every accepted form and every refusal (issue 2)."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import calc.parse as parse_module
from calc.errors import InputError
from calc.parse import parse, parse_complex_impedance

# Unit definitions: foot = 0.3048 m and inch = 0.0254 m exactly (1959
# international yard and pound agreement); SI prefixes (BIPM SI Brochure).
ACCEPTED = [
    ("245 ns", "time", 245e-9),
    ("0.245 us", "time", 245e-9),
    ("0.245 µs", "time", 245e-9),
    ("0.245 μs", "time", 245e-9),
    ("1.2e3 ps", "time", 1.2e-9),
    ("80 ft", "length", 80 * 0.3048),
    ("12 ft 6 in", "length", 12 * 0.3048 + 6 * 0.0254),
    ("12' 6\"", "length", 12 * 0.3048 + 6 * 0.0254),
    ("6 1/2 in", "length", 6.5 * 0.0254),
    ("3 ft 2-3/8 in", "length", 3 * 0.3048 + 2.375 * 0.0254),
    ("3/8 in", "length", 0.375 * 0.0254),
    ("3.2 m", "length", 3.2),
    ("850 mm", "length", 0.85),
    ("0 mm", "length_or_zero", 0.0),
    ("146.52 MHz", "frequency", 146.52e6),
    ("1.2 GHz", "frequency", 1.2e9),
    ("50 ohm", "impedance", 50.0),
    ("50 ohms", "impedance", 50.0),
    ("50 Ω", "impedance", 50.0),
    ("50", "impedance", 50.0),
    ("1 kohm", "impedance", 1000.0),
    ("66 %", "nvp", 0.66),
    ("66", "nvp", 0.66),
    ("66%", "vf", 0.66),
    ("0.66", "vf", 0.66),
    ("2.25", "eps_r", 2.25),
    ("3%", "tolerance", 0.03),
    ("90 deg", "angle", 90.0),
    ("0.25 wl", "angle", 90.0),
    ("0.5 wavelength", "angle", 180.0),
    ("0.75 λ", "angle", 270.0),
    ("1.54 ns/ft", "delay_per_length", 1.54e-9 / 0.3048),
    ("5.05 ns/m", "delay_per_length", 5.05e-9),
    ("198 m/us", "velocity", 198e6),
    ("10 pF", "capacitance", 10e-12),
    ("100 nH", "inductance", 100e-9),
    ("2.5 V", "voltage", 2.5),
    ("-0.33", "ratio", -0.33),
]


@pytest.mark.parametrize("text,kind,expected", ACCEPTED)
def test_accepted_forms(text, kind, expected):
    assert parse(text, "field", kind) == pytest.approx(expected, rel=1e-12)


REFUSED = [
    ("", "time", "required"),
    ("   ", "length", "required"),
    ("245", "time", "needs a unit"),
    ("80", "length", "needs a unit"),
    ("-3 m", "length", "greater than 0"),
    ("0 ns", "time", "greater than 0"),
    ("0 Hz", "frequency", "at least 0.001"),
    ("nan ns", "time", "finite"),
    ("inf m", "length", "finite"),
    ("1e400 m", "length", "finite"),
    ("5 kg", "length", "not a length"),
    ("5 m", "time", "not a time"),
    ("3 MHz", "impedance", "not a impedance"),
    ("1.2", "vf", "at most 1"),
    ("120 %", "nvp", "at most 100 %"),
    ("0", "vf", "at least 0.01"),
    ("0.5", "eps_r", "at least 1"),
    ("60 %", "tolerance", "at most 50 %"),
    ("__import__('os')", "time", "cannot read"),
    ("((((", "time", "cannot read"),
    ("3 flibbets", "length", "cannot read"),
    ("x" * 500, "time", "longer than"),
]


@pytest.mark.parametrize("text,kind,needle", REFUSED)
def test_refusals_name_field_and_example(text, kind, needle):
    with pytest.raises(InputError) as info:
        parse(text, "--delay", kind)
    message = str(info.value)
    assert message.startswith("--delay: ")
    assert needle in message
    assert "for example" in message
    assert "\n" not in message


def test_complex_impedance_forms():
    assert parse_complex_impedance("60+40j ohm", "z") == complex(60, 40)
    assert parse_complex_impedance("60-j40", "z") == complex(60, -40)
    assert parse_complex_impedance("75 ohm", "z") == complex(75, 0)
    with pytest.raises(InputError):
        parse_complex_impedance("-5+2j", "z")
    with pytest.raises(InputError):
        parse_complex_impedance("abc", "z")


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=40), st.sampled_from(sorted(__import__("calc.parse").parse.KINDS)))
def test_no_string_raises_anything_but_input_error(text, kind):
    try:
        value = parse(text, "field", kind)
    except InputError as exc:
        assert str(exc).startswith("field: ")
    else:
        assert math.isfinite(value)


@settings(max_examples=200, deadline=None)
@given(st.floats(min_value=1e-3, max_value=1e5, allow_nan=False))
def test_metres_round_trip_through_text(length_m):
    assert parse(f"{length_m!r} m", "length", "length") == pytest.approx(length_m, rel=1e-12)


@settings(max_examples=200, deadline=None)
@given(st.integers(0, 500), st.integers(0, 11), st.sampled_from([0, 1, 3, 5, 7, 15]))
def test_feet_and_inches_round_trip(feet, inches, sixteenths):
    from calc.tape import to_feet_inches

    text = f"{feet} ft {inches}-{sixteenths}/16 in" if sixteenths else f"{feet} ft {inches} in"
    if feet == 0 and inches == 0 and sixteenths == 0:
        return
    metres = parse(text, "length", "length")
    fi = to_feet_inches(metres, 16)
    assert (fi.feet, fi.inches) == (feet, inches)
    assert fi.numerator * 16 // fi.denominator == sixteenths


# Unit symbols typed in the wrong case are read as the symbol people mean in
# this trade (common practice: nobody here means millihertz, petafarads or
# megaseconds). Values from the SI prefixes (BIPM SI Brochure) and the exact
# foot (0.3048 m) and inch (0.0254 m).
CASE_FOLDED = [
    ("146 mhz", "frequency", 146e6),
    ("146.52MHZ", "frequency", 146.52e6),
    ("2 ghz", "frequency", 2e9),
    ("455 khz", "frequency", 455e3),
    ("245 NS", "time", 245e-9),
    ("1.2 uS", "time", 1.2e-6),  # uS is microsiemens; in a time field it means us
    ("3 MS", "time", 3e-3),
    ("80 FT", "length", 80 * 0.3048),
    ("12 FT 6 IN", "length", 12 * 0.3048 + 6 * 0.0254),
    ("45 M", "length", 45.0),
    ("15 MM", "length_or_zero", 15e-3),
    ("10 PF", "capacitance", 10e-12),  # not 10 petafarad
    ("100 NH", "inductance", 100e-9),
    ("1.54 NS/FT", "delay_per_length", 1.54e-9 / 0.3048),
    ("198 M/US", "velocity", 198e6),
    ("90 DEG", "angle", 90.0),
    ("50 OHM", "impedance", 50.0),
]


@pytest.mark.parametrize("text,kind,expected", CASE_FOLDED)
def test_unit_symbols_in_any_case(text, kind, expected):
    assert parse(text, "field", kind) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("text", ["2,5 m", "1,250 ft", "0,66"])
def test_comma_in_a_number_is_refused(text):
    # A decimal comma (much of Europe; ISO 80000-1 allows comma or point as the
    # decimal sign, from memory) and a thousands separator give answers a
    # thousand times apart: refuse rather than guess. pint alone read "2,5 m" as 25 m.
    with pytest.raises(InputError) as info:
        parse(text, "--length", "length" if "m" in text or "ft" in text else "vf")
    assert "comma in a number" in str(info.value)
    assert "for example" in str(info.value)


def test_bare_number_for_a_percentage_says_how_it_was_read():
    # A tolerance without a unit is a fraction: "3" is 300 %, not 3 %.
    with pytest.raises(InputError) as info:
        parse("3", "--tolerance", "tolerance")
    assert "300 %" in str(info.value) and "'3 %'" in str(info.value)
    with pytest.raises(InputError) as info:
        parse("66", "--vf", "vf")
    assert "'0.66'" in str(info.value)


# -- "number symbol" read without pint: the same value pint gives -----------------------
# Source: the SI Brochure (BIPM, 9th edition, 2019), table 7 of the SI prefixes; the
# international foot (0.3048 m) and inch (0.0254 m), exact since 1959 (NIST SP 811,
# appendix B). pint, the general-purpose units library, converts the same text.
_SCALED = [(kind, symbol) for kind in sorted(parse_module._SCALED_KINDS)
           for symbol in sorted(set(parse_module.CASE_FOLDED[kind].values()))]


@pytest.mark.parametrize(("kind", "symbol"), _SCALED)
@given(number=st.floats(min_value=1e-3, max_value=1e3, allow_nan=False))
@settings(max_examples=25, deadline=None)
def test_symbol_scale_agrees_with_pint(kind, symbol, number):
    ureg = parse_module._ureg()
    text = f"{number!r} {symbol}"
    try:
        mine = parse(text, "field", kind)
    except InputError:  # outside the kind's range: pint's value must be outside it too
        k = parse_module.KINDS[kind]
        theirs = ureg.Quantity(number, symbol).to(k.si_unit).magnitude
        assert not (k.minimum or 0) < theirs <= (k.maximum or math.inf)
        return
    theirs = ureg.Quantity(number, symbol).to(parse_module.KINDS[kind].si_unit).magnitude
    assert mine == pytest.approx(theirs, rel=1e-14)


@pytest.mark.parametrize(("text", "kind", "expected"), [
    ("245 ns", "time", 245e-9),  # SI prefix nano, 1e-9 (SI Brochure, table 7)
    ("245ns", "time", 245e-9),
    ("146.52 MHz", "frequency", 146.52e6),  # mega, 1e6
    ("10 ft", "length", 3.048),  # international foot, 0.3048 m exactly (NIST SP 811)
    ("4.7 kohm", "impedance", 4700.0),  # kilo, 1e3
    ("22 pF", "capacitance", 22e-12),  # pico, 1e-12
    ("90 deg", "angle", 90.0),
])
def test_number_and_symbol_read_without_pint(text, kind, expected):
    parse.cache_clear()
    before = parse_module._registry
    parse_module._registry = None
    try:
        assert parse(text, "field", kind) == pytest.approx(expected, rel=1e-15)
        assert parse_module._registry is None  # pint was not needed
    finally:
        parse_module._registry = before
        parse.cache_clear()
