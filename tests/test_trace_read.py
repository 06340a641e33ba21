"""calc.trace_read: delimited text traces and Touchstone v1 one-port files (issue 6).

References: Python's own ``csv`` module and ``float`` read the delimited
files independently; the international foot is exactly 0.3048 m (1959
international yard and pound agreement); scikit-rf (``skrf.Network``)
reads the same Touchstone files and renormalises them.
"""

from __future__ import annotations

import csv
import io

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from calc.errors import InputError
from calc.trace_read import Sweep, Trace, read_file, read_touchstone, read_trace

skrf = pytest.importorskip("skrf")


def _csv_reference(text: str, delimiter: str) -> np.ndarray:
    """Reference reader: the csv module and float(), skipping comments and the header."""
    rows = []
    for row in csv.reader(io.StringIO(text), delimiter=delimiter):
        if not row or row[0].lstrip().startswith(("#", "!", ";")):
            continue
        try:
            rows.append([float(x) for x in row[:2]])
        except ValueError:
            continue  # the header
    return np.array(rows)


def _table(n=50, seed=1):
    rng = np.random.default_rng(seed)
    t = np.cumsum(rng.uniform(0.5, 1.5, n)) - 5.0
    v = rng.normal(0, 0.3, n)
    return t, v


@pytest.mark.parametrize("delimiter", [",", ";", "\t"])
def test_delimited_values_match_csv_module(delimiter):
    t, v = _table()
    body = "".join(f"{a:.6f}{delimiter}{b:.6f}\n" for a, b in zip(t, v, strict=True))
    text = f"# exported by an invented scope\nTime (ns){delimiter}Level (V)\n" + body
    trace = read_trace(text, "scope.csv")
    ref = _csv_reference(text, delimiter)
    np.testing.assert_allclose(trace.x, ref[:, 0] * 1e-9, rtol=1e-15)
    np.testing.assert_allclose(trace.level, ref[:, 1], rtol=1e-15)
    assert trace.axis == "time" and trace.level_unit == "V"
    assert trace.first_data_line == 3


@pytest.mark.parametrize("header, axis, scale", [
    ("time_ns,level", "time", 1e-9),
    ("Time (us),rho", "time", 1e-6),
    ("t/ps,level", "time", 1e-12),
    ("time [s],level", "time", 1.0),
    ("distance (m),level", "distance", 1.0),
    ("Distance_ft,level", "distance", 0.3048),  # international foot, exact (1959)
    ("Range (km),level", "distance", 1000.0),
])
def test_axis_unit_from_header(header, axis, scale):
    body = "".join(f"{i},{0.01 * i}\n" for i in range(10))
    trace = read_trace(header + "\n" + body, "t.csv")
    assert trace.axis == axis
    np.testing.assert_allclose(trace.x, np.arange(10) * scale)


@pytest.mark.parametrize("header, unit, scale", [
    ("time_ns,level_mV", "V", 1e-3),
    ("time_ns,Level (V)", "V", 1.0),
    ("time_ns,rho", "rho", 1.0),
    ("time_ns,level (mrho)", "rho", 1e-3),
    ("time_ns,reflection (%)", "rho", 0.01),
    ("time_ns,level", "", 1.0),
])
def test_level_unit_from_header(header, unit, scale):
    body = "".join(f"{i},{i}\n" for i in range(10))
    trace = read_trace(header + "\n" + body, "t.csv")
    assert trace.level_unit == unit
    np.testing.assert_allclose(trace.level, np.arange(10) * scale)


def test_decimal_comma_with_semicolons_and_space_header():
    text = "Time (ns);Level (V)\n" + "".join(f"{i},5;0,{i}\n" for i in range(10))
    trace = read_trace(text, "eu.csv")
    np.testing.assert_allclose(trace.x, (np.arange(10) + 0.5) * 1e-9)
    np.testing.assert_allclose(trace.level, np.arange(10) / 10)
    spaced = "Time (ns)   Level (V)\n" + "".join(f"{i}   {i}\n" for i in range(10))
    assert read_trace(spaced, "s.txt").columns == ("Time (ns)", "Level (V)")


def test_no_header_needs_the_callers_unit():
    body = "".join(f"{i},{i}\n" for i in range(10))
    with pytest.raises(InputError) as err:
        read_trace(body, "bare.csv")
    assert err.value.field == "bare.csv line 1"
    trace = read_trace(body, "bare.csv", time_unit="ns", level_unit="mV")
    np.testing.assert_allclose(trace.x, np.arange(10) * 1e-9)
    np.testing.assert_allclose(trace.level, np.arange(10) * 1e-3)


def test_comments_blank_lines_crlf_bom_and_utf16():
    lines = ["! note", "; another", "", "time_ns,level", "# mid-header comment"]
    lines += [f"{i},{i}" for i in range(10)]
    lines.insert(9, "# a comment between samples")
    lines.insert(11, "")
    text = "\r\n".join(lines) + "\r\n"
    for data in (text, b"\xef\xbb\xbf" + text.encode(), text.encode("utf-16")):
        trace = read_trace(data, "c.csv")
        np.testing.assert_allclose(trace.level, np.arange(10))


def _err(data, name="f.csv", **kw) -> InputError:
    with pytest.raises(InputError) as err:
        read_file(data, name, **kw)
    return err.value


@pytest.mark.parametrize("text, line, words", [
    ("", 1, "empty"),
    ("\n\n# only a comment\n", 1, "empty"),
    ("time_ns,level\n", 1, "no data"),
    ("time_ns,level\n1,0.1\n2,0.2\n3,abc\n4,0.4\n", 4, "text 'abc'"),
    ("time_ns\n1\n2\n3\n", 2, "one column"),
    ("time_ns,level\n" + "".join(f"{i},0\n" for i in range(10)) + "5,0\n", 12, "increase"),
    ("time_ns,level\n1,0\n1,0\n" + "".join(f"{i},0\n" for i in range(2, 10)), 3, "increase"),
    ("time_ns,level\n1,2\n3,4,5\n", 3, "3 columns"),
    ("time_ns,level\n1,2\n2,\n", 3, "text ''"),
    ("time_ns,level\n0,0\n1,nan\n", 3, "not a finite"),
    ("time_ns,level\n1,2\n2,3\n", 2, "only 2 samples"),
    ('{"time": [1, 2]}', 1, "JSON"),
    ("<html><body>trace</body></html>", 1, "XML or HTML"),
    ("sample,level\n1,2\n", 1, "counts samples"),
    ("time_furlongs,level\n" + "1,2\n" * 10, 1, "unknown"),
])
def test_bad_delimited_files_name_the_line(text, line, words):
    e = _err(text)
    assert e.field == f"f.csv line {line}"
    assert words.lower() in str(e).lower()
    assert "\n" not in str(e)


def test_error_line_counts_comments_and_blanks_in_the_data():
    text = "time_ns,level\n1,0\n\n# c\n2,0\n" + "".join(f"{i},0\n" for i in range(3, 10)) + "3,x\n"
    assert _err(text).field == "f.csv line 13"
    text = "time_ns,level\n1,0\n\n# c\n2,0\n" + "".join(f"{i},0\n" for i in range(3, 10)) + "3,0\n"
    assert _err(text).field == "f.csv line 13"


def test_binary_file_is_refused():
    e = _err(b"time_ns,level\n\x00\x01\x02\xff")
    assert e.field == "f.csv line 2" and "binary" in str(e)


# ------------------------------------------------------------------ Touchstone


def _skrf_network(z0=75.0, n=201, f_unit="MHz"):
    """An independent network: a 3 m lossless line in 120 ohm, built by scikit-rf."""
    from skrf.media import DefinedGammaZ0

    freq = skrf.Frequency(1, 400, n, unit=f_unit)
    gamma = 1j * 2 * np.pi * freq.f / (0.66 * 299_792_458)
    media = DefinedGammaZ0(frequency=freq, z0=z0, gamma=gamma)
    return media.line(3, "m") ** media.resistor(120) ** media.short()


@pytest.mark.parametrize("form", ["ri", "ma", "db"])
@pytest.mark.parametrize("f_unit", ["Hz", "kHz", "MHz", "GHz"])
def test_touchstone_matches_scikit_rf(tmp_path, form, f_unit):
    # Reference: scikit-rf writes the file and reads it back with its own parser.
    net = _skrf_network(f_unit=f_unit)
    path = tmp_path / "sweep"
    net.write_touchstone(str(path), form=form)
    file = tmp_path / "sweep.s1p"
    text = file.read_text(encoding="latin-1")
    assert f"# {f_unit} S {form.upper()} R 75" in text.replace("R 75.0", "R 75")
    ref = skrf.Network(str(file))
    ours = read_touchstone(file.read_bytes(), "sweep.s1p")
    assert ours.file_z0_ohm == 75.0 and ours.z0_ohm == 75.0
    np.testing.assert_allclose(ours.frequency_hz, ref.f, rtol=1e-12)
    np.testing.assert_allclose(ours.s11, ref.s[:, 0, 0], rtol=1e-9, atol=1e-12)


def test_touchstone_renormalised_like_scikit_rf(tmp_path):
    net = _skrf_network(z0=75.0)
    net.write_touchstone(str(tmp_path / "s"), form="ri")
    data = (tmp_path / "s.s1p").read_bytes()
    ours = read_touchstone(data, "s.s1p", z0_ohm=50.0)
    ref = skrf.Network(str(tmp_path / "s.s1p"))
    ref.renormalize(50.0)  # reference: scikit-rf's own renormalisation
    assert ours.z0_ohm == 50.0 and ours.file_z0_ohm == 75.0
    np.testing.assert_allclose(ours.s11, ref.s[:, 0, 0], rtol=1e-9, atol=1e-12)


def test_touchstone_option_line_any_order_case_and_defaults():
    a = read_touchstone("! c\n#  r 50 ri s khz\n1 0.1 0.2\n2 0.3 0.4 ! trailing\n", "a.s1p")
    np.testing.assert_allclose(a.frequency_hz, [1e3, 2e3])
    np.testing.assert_allclose(a.s11, [0.1 + 0.2j, 0.3 + 0.4j])
    # The format's defaults: GHz, S, MA, R 50.
    b = read_touchstone("#\n1 0.5 90\n2 0.5 180\n", "b.s1p")
    np.testing.assert_allclose(b.frequency_hz, [1e9, 2e9])
    np.testing.assert_allclose(b.s11, [0.5j, -0.5], atol=1e-15)
    assert b.z0_ohm == 50.0


@pytest.mark.parametrize("text, name, line, words", [
    ("# MHz Z RI R 50\n1 2 3\n", "z.s1p", 1, "Z-parameters"),
    ("[Version] 2.0\n# MHz S RI R 50\n", "v2.s1p", 1, "version 2"),
    ("# MHz S RI R 50\n1 0.1 0.2 0.3 0.4 0.5 0.6 0.7 0.8\n", "m.s1p", 2, "multi-port"),
    ("1 0.1 0.2\n", "n.s1p", 1, "option line"),
    ("# MHz S RI R 50\n", "e.s1p", 1, "no frequency"),
    ("# MHz S XY R 50\n1 2 3\n", "x.s1p", 1, "unknown word"),
    ("# MHz S RI R -5\n1 2 3\n", "r.s1p", 1, "reference impedance"),
    ("# MHz S RI R 50\n1 0.1 0.2\n3 0.1 0.2\n2 0.1 0.2\n", "o.s1p", 4, "increase"),
    ("# MHz S RI R 50\n1 0.1 0.2\n2 x 0.2\n", "t.s1p", 3, "text 'x'"),
    ("anything", "two.s2p", 1, "2-port"),
])
def test_bad_touchstone_files_name_the_line(text, name, line, words):
    e = _err(text, name)
    assert e.field == f"{name} line {line}"
    assert words.lower() in str(e).lower()


def test_touchstone_content_is_recognised_whatever_the_name():
    got = read_file("! from an invented analyser\n# MHz S RI R 50\n1 0.1 0\n2 0.2 0\n", "x.txt")
    assert isinstance(got, Sweep)


# --------------------------------------------------------------------- fuzzing

_FRAGMENTS = st.sampled_from([
    "time_ns,level\n", "Time (ns);Level (V)\n", "# MHz S RI R 50\n", "[Version] 2.0\n",
    "1,2\n", "3,4\n", "1;0,5\n", "5\t6\n", "x,y\n", "nan,1\n", "1e999,2\n", "\n", "# c\n",
    "! c\n", "; c\n", ",,\n", '"1","2"\n', "1 2 3\n", "\x00", "\xff", "{", "<", "-1,-1\n",
    "0.5,1\n", "time_ns\n", "distance (ft),rho\n", "1,2,3\n", "\r\n",
])


@settings(max_examples=300, suppress_health_check=[HealthCheck.too_slow], deadline=None)
@given(parts=st.lists(_FRAGMENTS, max_size=30), name=st.sampled_from(["f.csv", "f.s1p", "f.s2p"]))
def test_fuzzed_structured_files_only_raise_input_error(parts, name):
    text = "".join(parts)
    for data in (text, text.encode("utf-8", "replace")):
        try:
            got = read_file(data, name)
        except InputError as e:
            assert str(e).startswith(name)
            assert "\n" not in str(e)
        else:
            assert isinstance(got, Trace | Sweep)


@settings(max_examples=300, deadline=None)
@given(data=st.binary(max_size=400) | st.text(max_size=400).map(str.encode))
def test_fuzzed_bytes_only_raise_input_error(data):
    for name in ("f.csv", "f.s1p"):
        try:
            read_file(data, name)
        except InputError:
            pass


@settings(max_examples=100, deadline=None)
@given(values=st.lists(st.floats(-1e6, 1e6, allow_nan=False), min_size=8, max_size=60),
       delimiter=st.sampled_from([",", ";", "\t", " "]))
def test_fuzzed_valid_tables_read_back_exactly(values, delimiter):
    x = [float(i) for i in range(len(values))]
    text = "time_ns" + delimiter + "level_V\n" + "".join(
        f"{a!r}{delimiter}{b!r}\n" for a, b in zip(x, values, strict=True))
    trace = read_trace(text, "v.csv")
    np.testing.assert_array_equal(trace.level, np.array(values))
