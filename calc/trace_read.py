"""Read a recorded trace: delimited text (time or distance, level) or a
Touchstone version 1 one-port sweep.

Pure: the functions take the file's contents (``bytes`` or ``str``) and a
name to quote in errors, never a path; the front end reads the file. Every
problem is a :class:`calc.errors.InputError` whose field is ``"NAME line N"``.

Delimited text (what oscilloscopes and reflectometers export)::

    # anything after #, ! or ; at the start of a line is a comment
    Time (ns), Level (V)          <- optional header; units in (..), [..] or _suffix
    -5.000, 0.0012
    -4.975, 0.0009
    ...

* delimiter: comma, semicolon, tab, or runs of spaces; with semicolons, tabs
  or spaces a decimal comma (``1,25``) is read as ``1.25``;
* first column: time (``time_ns``, ``Time (ns)``, ``t/us``) or distance
  (``distance (m)``, ``Distance_ft``); a file without a header needs the unit
  from the caller (``time_unit="ns"``);
* second column: the level, in volts (``V``, ``mV``) or as a reflection
  coefficient (``rho``, ``mrho``, ``%``); further columns are ignored;
* the first column must increase strictly; values must be finite.

Touchstone version 1, one port (``.s1p``): ``!`` comments, the option line
``# <Hz|kHz|MHz|GHz> S <RI|MA|DB> R <ohms>`` (any order, any case, defaults
GHz, MA, 50 ohm), then one ``frequency a b`` line per point. Y, Z, H and G
parameters, more than one port and version 2 keywords are refused with a
clear message. S11 is renormalised from the file's reference impedance to the
analysis Z0 when they differ:

.. math::

    Z = R\\frac{1+S}{1-S},\\quad S' = \\frac{Z - Z_0}{Z + Z_0}
        = \\frac{(1+S)R - (1-S)Z_0}{(1+S)R + (1-S)Z_0}

Speed: numbers are converted by :func:`numpy.loadtxt` in one call; a
one-million-line file reads in a few tenths of a second. Only when that fails
does a line-by-line pass run, to name the first bad line.
"""

from __future__ import annotations

import io
import math
import re
from dataclasses import dataclass
from typing import NoReturn

import numpy as np

from calc.errors import InputError

#: Fewest samples a trace must hold to be analysed.
MIN_SAMPLES = 8
#: Fewest frequency points a sweep must hold.
MIN_POINTS = 2

HEADER_EXAMPLE = "time_ns,level_V"
TOUCHSTONE_EXAMPLE = "# MHz S RI R 50"

_COMMENT_START = (b"#", b"!", b";")
_NUMBER = re.compile(
    r"^\s*[+-]?(?:(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?|inf|infinity|nan)\s*$", re.IGNORECASE
)
_RHO_UNITS = {"rho": 1.0, "mrho": 1e-3, "millirho": 1e-3, "%": 0.01, "percent": 0.01,
              "pct": 0.01}
_TIME_WORDS = ("time", "t", "delay", "round trip", "round-trip", "roundtrip", "tau")
_DISTANCE_WORDS = ("distance", "dist", "d", "length", "range", "x", "position", "location")
_HEADER = re.compile(
    r"^(?P<name>[^(\[/_]*?)\s*"
    r"(?:[(\[]\s*(?P<u1>[^)\]]*?)\s*[)\]]|[_/]\s*(?P<u2>.+?)|\s+(?P<u3>\S+))?\s*$"
)


@dataclass(frozen=True, eq=False)
class Trace:
    """A recorded trace as read from a file.

    ``x`` is time in seconds (``axis == "time"``) or distance in metres
    (``axis == "distance"``), strictly increasing. ``level`` is in volts
    (``level_unit == "V"``), a reflection coefficient (``"rho"``) or as
    recorded when the file does not say (``""``).
    """

    name: str
    axis: str
    x: np.ndarray
    level: np.ndarray
    level_unit: str
    columns: tuple[str, ...] = ()
    first_data_line: int = 1


@dataclass(frozen=True, eq=False)
class Sweep:
    """A one-port frequency sweep: S11 at each frequency, referred to ``z0_ohm``."""

    name: str
    frequency_hz: np.ndarray
    s11: np.ndarray
    z0_ohm: float
    file_z0_ohm: float
    option_line: str


# --------------------------------------------------------------------------- bytes


def _as_bytes(data: bytes | str, name: str) -> bytes:
    """The file's contents as UTF-8-compatible bytes; refuses binary data."""
    if isinstance(data, str):
        return data.encode("utf-8", errors="replace")
    if not isinstance(data, bytes | bytearray | memoryview):
        raise InputError(name, "expected the contents of a file")
    b = bytes(data)
    if b.startswith(b"\xef\xbb\xbf"):
        b = b[3:]
    elif b.startswith((b"\xff\xfe", b"\xfe\xff")):  # UTF-16 with a byte-order mark
        try:
            b = b.decode("utf-16").encode("utf-8")
        except UnicodeDecodeError:
            raise InputError(f"{name} line 1", "cannot decode this UTF-16 text") from None
    nul = b.find(b"\x00")
    if nul >= 0:
        line = b.count(b"\n", 0, nul) + 1
        raise InputError(f"{name} line {line}",
                         "binary data: this is not a text trace or a Touchstone file")
    return b


def _decode(line: bytes) -> str:
    try:
        return line.decode("utf-8")
    except UnicodeDecodeError:
        return line.decode("latin-1")


def _lines(b: bytes, start: int = 0):
    """Yield (line number, start offset, line bytes without the newline)."""
    pos = start
    number = b.count(b"\n", 0, start) + 1
    n = len(b)
    while pos < n:
        end = b.find(b"\n", pos)
        if end < 0:
            end = n
        yield number, pos, b[pos:end].rstrip(b"\r")
        pos = end + 1
        number += 1


def _is_comment(stripped: bytes, extra: tuple[bytes, ...] = ()) -> bool:
    return stripped.startswith(_COMMENT_START + extra)


# ------------------------------------------------------------------ numeric table


def _split(line: str, delimiter: str | None) -> list[str]:
    fields = line.split(delimiter) if delimiter else line.split()
    return [f.strip().strip('"').strip() for f in fields]


def _numeric_table(b: bytes, start: int, delimiter: str | None, ncol: int, name: str,
                   decimal_comma: bool, what: str):
    """Parse the numeric block ``b[start:]`` into an (n, ncol) array.

    Returns the array and ``line_of(i)``, the file line number of row i
    (worked out only when asked, since it needs a pass over every line when
    the block holds blank or comment lines). Comment markers ``#`` and ``!``
    end a line anywhere; ``;`` starts a comment line when it is not the
    delimiter.
    """
    body = b[start:]
    if decimal_comma:
        body = body.replace(b",", b".")
    if delimiter == ";":
        if re.search(rb"(?m)^[ \t]*;", body):
            body = re.sub(rb"(?m)^[ \t]*;[^\n]*", b"", body)
        if b"!" in body:
            body = body.replace(b"!", b"#")
    elif b"!" in body or b";" in body:
        body = body.translate(_BANG_SEMI_TO_HASH)
    first_line = b.count(b"\n", 0, start) + 1
    try:
        table = np.loadtxt(io.BytesIO(body), delimiter=delimiter, comments="#",
                           quotechar='"', ndmin=2, dtype=float)
    except ValueError as exc:
        _raise_first_bad_line(body, first_line, delimiter, ncol, name, what, exc)
    if table.shape[1] != ncol:
        _raise_first_bad_line(body, first_line, delimiter, ncol, name, what, None)
    n_lines = body.count(b"\n") + (0 if body.endswith(b"\n") else 1)
    direct = n_lines == table.shape[0]

    def line_of(i: int) -> int:
        if direct:
            return first_line + i
        for k, (number, _text) in enumerate(_data_lines(body, first_line)):
            if k == i:
                return number
        return first_line

    return table, line_of


_BANG_SEMI_TO_HASH = bytes.maketrans(b"!;", b"##")


def _data_lines(body: bytes, first_line: int):
    """Yield (line number, text) for the lines of ``body`` that hold data."""
    for number, _pos, raw in _lines(body):
        text = _decode(raw).split("#", 1)[0].strip()
        if text:
            yield number + first_line - 1, text


def _raise_first_bad_line(body: bytes, first_line: int, delimiter: str | None, ncol: int,
                          name: str, what: str, exc: Exception | None) -> NoReturn:
    for number, text in _data_lines(body, first_line):
        fields = _split(text, delimiter)
        where = f"{name} line {number}"
        for column, field in enumerate(fields[:ncol], start=1):
            if not _NUMBER.match(field):
                shown = field if len(field) <= 24 else field[:21] + "..."
                raise InputError(where, f"text {shown!r} in numeric column {column}")
        if len(fields) != ncol:
            raise InputError(where, f"{len(fields)} columns where the {what} rows have {ncol}")
    reason = str(exc).splitlines()[0][:80] if exc else "inconsistent rows"
    raise InputError(f"{name} line {first_line}", f"cannot read the {what} rows ({reason})")


def _check_rows(values: np.ndarray, line_of, name: str, label: str) -> None:
    """Finite, strictly increasing first column; finite other columns."""
    bad = ~np.isfinite(values)
    if bad.any():
        i = int(np.flatnonzero(bad.any(axis=1))[0])
        raise InputError(f"{name} line {line_of(i)}", "a value is not a finite number")
    step = np.diff(values[:, 0])
    if (step <= 0).any():
        i = int(np.flatnonzero(step <= 0)[0]) + 1
        raise InputError(f"{name} line {line_of(i)}",
                         f"the {label} column does not increase (it must increase on every line)")


# --------------------------------------------------------------- delimited text


def _detect_delimiter(line: str) -> str | None:
    for d in ("\t", ";", ","):
        if d in line:
            return d
    return None


def _looks_numeric(fields: list[str], delimiter: str | None) -> bool:
    """True for a data line (a decimal comma counts when the delimiter is not a comma)."""
    if delimiter != ",":
        fields = [f.replace(",", ".", 1) for f in fields]
    return any(fields) and all(_NUMBER.match(f) for f in fields if f)


def _wrong_kind(first: bytes, name: str, number: int) -> None:
    s = first.lstrip()
    if s.startswith((b"{", b"[")):
        raise InputError(f"{name} line {number}",
                         "this looks like JSON or a keyword file, not a delimited trace")
    if s.startswith(b"<"):
        raise InputError(f"{name} line {number}",
                         "this looks like XML or HTML, not a delimited trace")


def _unit_scale(unit: str, kind: str, where: str, example: str) -> float:
    from calc.parse import parse  # the unit-aware edge (pint, loaded on first use)

    try:
        return parse(f"1 {unit}", where, kind)
    except InputError:
        raise InputError(where, f"unknown {kind} unit {unit!r}", example) from None


def _split_header_field(field: str) -> tuple[str, str]:
    m = _HEADER.match(field.strip())
    if not m:
        return field.strip().lower(), ""
    unit = (m.group("u1") or m.group("u2") or m.group("u3") or "").strip()
    return m.group("name").strip().lower(), unit


def _axis_from_header(field: str, where: str) -> tuple[str | None, str]:
    """("time" | "distance" | None, unit text) from the first header field."""
    word, unit = _split_header_field(field)
    if word in _TIME_WORDS or word.startswith("time"):
        return "time", unit
    if word in _DISTANCE_WORDS or word.startswith(("dist", "length")):
        return "distance", unit
    if word.startswith(("sample", "index", "point")):
        raise InputError(where, f"the first column {field.strip()!r} counts samples; "
                         "export time or distance instead", HEADER_EXAMPLE)
    return None, unit


def _level_scale(unit: str, where: str, example: str = "level_V") -> tuple[float, str]:
    """(scale to SI, "V" | "rho") for a level unit."""
    key = unit.strip().lower()
    if key in _RHO_UNITS:
        return _RHO_UNITS[key], "rho"
    return _unit_scale(unit, "voltage", where, example), "V"


def _level_from_header(field: str, where: str) -> tuple[float, str]:
    word, unit = _split_header_field(field)
    if unit:
        return _level_scale(unit, where)
    if word in _RHO_UNITS or word in ("reflection", "reflection coefficient", "gamma"):
        return _RHO_UNITS.get(word, 1.0), "rho"
    if word in ("voltage", "volts", "v"):
        return 1.0, "V"
    return 1.0, ""


def read_trace(data: bytes | str, name: str = "FILE", *, time_unit: str | None = None,
               distance_unit: str | None = None, level_unit: str | None = None) -> Trace:
    """Read a delimited text trace (format in the module docstring).

    ``time_unit`` / ``distance_unit`` (``"ns"``, ``"ft"``) name the unit of
    the first column and override the header; ``level_unit`` (``"V"``,
    ``"mV"``, ``"rho"``, ``"%"``) that of the second.
    """
    if time_unit and distance_unit:
        raise InputError(name, "give the unit of time or of distance, not both")
    b = _as_bytes(data, name)
    header: list[str] | None = None
    header_line = 0
    delimiter: str | None = None
    data_start = None
    first_data_line = 0
    for number, pos, raw in _lines(b):
        stripped = raw.strip()
        if not stripped:
            continue
        if header is None:
            _wrong_kind(stripped, name, number)
        if _is_comment(stripped):
            continue
        text = _decode(stripped)
        delimiter = _detect_delimiter(text)
        fields = _split(text, delimiter)
        if _looks_numeric(fields, delimiter):
            data_start, first_data_line = pos, number
            break
        if header is not None:
            raise InputError(f"{name} line {number}",
                             f"text {text[:24]!r} where numbers were expected", "-5.0,0.001")
        header, header_line = _header_fields(text, delimiter), number
    if data_start is None:
        where = f"{name} line {header_line or 1}"
        raise InputError(where, "no data rows (the file is empty or holds only text)",
                         HEADER_EXAMPLE)
    where_data = f"{name} line {first_data_line}"
    line_end = b.find(b"\n", data_start)
    first_text = _decode(b[data_start:line_end if line_end >= 0 else len(b)]).strip()
    first_fields = _split(first_text, delimiter)
    decimal_comma = delimiter != "," and any("," in f for f in first_fields)
    if decimal_comma:
        first_fields = [f.replace(",", ".") for f in first_fields]
    ncol = len(first_fields)
    if ncol < 2:
        raise InputError(where_data, "only one column: a trace needs time (or distance) "
                         "and level", "-5.0,0.001")
    if not all(_NUMBER.match(f) for f in first_fields):
        raise InputError(where_data, "an empty field where a number was expected", "-5.0,0.001")
    where_header = f"{name} line {header_line or first_data_line}"
    axis, axis_unit = (None, "")
    level_scale, level_kind = 1.0, ""
    if header is not None:
        if len(header) < 2:
            raise InputError(where_header, "the header names one column: a trace needs time "
                             "(or distance) and level", HEADER_EXAMPLE)
        axis, axis_unit = _axis_from_header(header[0], where_header)
        level_scale, level_kind = _level_from_header(header[1], where_header)
    if time_unit:
        axis, axis_unit = "time", time_unit
    elif distance_unit:
        axis, axis_unit = "distance", distance_unit
    if level_unit:
        level_scale, level_kind = _level_scale(level_unit, "--level-unit", "mV")
    if not axis_unit:
        raise InputError(where_header, "the unit of the first column is not stated; add a "
                         "header such as 'time_ns' or give the time unit (e.g. --time-unit ns)",
                         HEADER_EXAMPLE)
    if axis is None:
        axis = _axis_kind_from_unit(axis_unit, where_header)
    kind = "time" if axis == "time" else "length"
    scale = _unit_scale(axis_unit, kind, where_header, "ns" if axis == "time" else "m")
    table, line_of = _numeric_table(b, data_start, delimiter, ncol, name, decimal_comma,
                                    "data")
    _check_rows(table[:, :2], line_of, name, axis)
    if table.shape[0] < MIN_SAMPLES:
        raise InputError(where_data, f"only {table.shape[0]} samples; a trace needs at least "
                         f"{MIN_SAMPLES}")
    x = np.ascontiguousarray(table[:, 0]) * scale
    level = np.ascontiguousarray(table[:, 1]) * level_scale
    if not (np.isfinite(x).all() and np.isfinite(level).all()):
        raise InputError(where_data, "values overflow after converting units")
    if header is not None:
        columns = tuple(header)
    else:
        columns = ()
    return Trace(name, axis, x, level, level_kind, columns, first_data_line)


def _header_fields(text: str, delimiter: str | None) -> list[str]:
    """Header names; with spaces as the delimiter a unit in brackets stays with its name."""
    if delimiter:
        return _split(text, delimiter)
    return re.findall(r"[^\s(\[]+(?:\s*[(\[][^)\]]*[)\]])?|[(\[][^)\]]*[)\]]", text)


def _axis_kind_from_unit(unit: str, where: str) -> str:
    for kind, axis in (("time", "time"), ("length", "distance")):
        try:
            _unit_scale(unit, kind, where, "ns")
            return axis
        except InputError:
            continue
    raise InputError(where, f"unit {unit!r} is neither a time nor a distance", HEADER_EXAMPLE)


# -------------------------------------------------------------------- Touchstone

_FREQ_UNITS = {"hz": 1.0, "khz": 1e3, "mhz": 1e6, "ghz": 1e9}
_PARAMS = ("s", "y", "z", "h", "g")
_FORMATS = ("ri", "ma", "db")
_TOUCHSTONE_NAME = re.compile(r"\.s(\d+)p$", re.IGNORECASE)


def touchstone_ports(name: str) -> int | None:
    """The port count a file name's ``.sNp`` suffix states, or None."""
    m = _TOUCHSTONE_NAME.search(name)
    return int(m.group(1)) if m else None


def is_option_line(text: str) -> bool:
    """True when ``text`` reads as a Touchstone option line."""
    t = text.strip()
    if not t.startswith("#"):
        return False
    words = t[1:].split("!", 1)[0].lower().split()
    if not words:
        return True  # "#" alone: all defaults
    known = set(_FREQ_UNITS) | set(_PARAMS) | set(_FORMATS) | {"r"}
    return all(w in known or _NUMBER.match(w) for w in words) and any(
        w in known for w in words)


def _options(text: str, where: str) -> tuple[float, str, str, float]:
    """(frequency scale, parameter, format, R) from an option line."""
    words = text.strip()[1:].lower().split()
    scale, param, fmt, r = 1e9, "s", "ma", 50.0
    i = 0
    while i < len(words):
        w = words[i]
        if w in _FREQ_UNITS:
            scale = _FREQ_UNITS[w]
        elif w in _PARAMS:
            param = w
        elif w in _FORMATS:
            fmt = w
        elif w == "r":
            if i + 1 >= len(words) or not _NUMBER.match(words[i + 1]):
                raise InputError(where, "R must be followed by the reference impedance in ohms",
                                 TOUCHSTONE_EXAMPLE)
            r = float(words[i + 1])
            if not (math.isfinite(r) and r > 0):
                raise InputError(where, f"reference impedance {words[i + 1]} must be a positive "
                                 "number of ohms", TOUCHSTONE_EXAMPLE)
            i += 1
        else:
            raise InputError(where, f"unknown word {w!r} on the option line",
                             TOUCHSTONE_EXAMPLE)
        i += 1
    if param != "s":
        raise InputError(where, f"{param.upper()}-parameters are not read; export "
                         "S-parameters (S11)", TOUCHSTONE_EXAMPLE)
    return scale, param, fmt, r


def read_touchstone(data: bytes | str, name: str = "FILE", *,
                    z0_ohm: float | None = None) -> Sweep:
    """Read a Touchstone version 1 one-port file; S11 referred to ``z0_ohm``
    (the file's own reference impedance when None)."""
    ports = touchstone_ports(name)
    if ports is not None and ports != 1:
        raise InputError(f"{name} line 1", f"a {ports}-port Touchstone file; only one-port "
                         ".s1p files are read (export S11 alone)")
    b = _as_bytes(data, name)
    option = None
    data_start = None
    first_data_line = 0
    for number, pos, raw in _lines(b):
        text = _decode(raw).split("!", 1)[0].strip()
        if not text:
            continue
        where = f"{name} line {number}"
        if text.startswith("["):
            keyword = text.split("]", 1)[0] + "]"
            raise InputError(where, f"Touchstone version 2 keyword {keyword[:32]}: only "
                             "version 1 files are read", TOUCHSTONE_EXAMPLE)
        if text.startswith("#"):
            if option is None:
                option = (_options(text, where), text, number)
            continue  # later option lines are ignored, as the format says
        if option is None:
            raise InputError(where, "data before the option line; a Touchstone file starts "
                             "with an option line", TOUCHSTONE_EXAMPLE)
        data_start, first_data_line = pos, number
        break
    if option is None:
        raise InputError(f"{name} line 1", "no Touchstone option line (is this an .s1p file?)",
                         TOUCHSTONE_EXAMPLE)
    if data_start is None:
        raise InputError(f"{name} line {option[2]}", "no frequency points after the option line")
    (scale, _param, fmt, r_file), option_text, _ = option
    where_first = f"{name} line {first_data_line}"
    first_text = _decode(b[data_start:].split(b"\n", 1)[0]).split("!", 1)[0]
    n_first = len(first_text.split())
    if n_first != 3:
        hint = " (is this a multi-port file?)" if n_first > 3 else ""
        raise InputError(where_first, f"{n_first} values on a line; a one-port line holds "
                         f"frequency and the two parts of S11{hint}", "100 0.31 -0.12")
    table, line_of = _touchstone_table(b, data_start, name)
    _check_rows(table, line_of, name, "frequency")
    if table[0, 0] < 0:
        raise InputError(where_first, "frequencies must be zero or more")
    if table.shape[0] < MIN_POINTS:
        raise InputError(where_first, f"only {table.shape[0]} frequency point; at least "
                         f"{MIN_POINTS} are needed")
    f = table[:, 0] * scale
    a, c = table[:, 1], table[:, 2]
    if fmt == "ri":
        s = a + 1j * c
    else:
        mag = a if fmt == "ma" else 10.0 ** (a / 20.0)
        s = mag * np.exp(1j * np.deg2rad(c))
    if not np.isfinite(s).all():
        raise InputError(where_first, "a value overflows")
    z0 = r_file if z0_ohm is None else float(z0_ohm)
    if z0 != r_file:
        s = renormalise(s, r_file, z0)
    return Sweep(name, f, s, z0, r_file, option_text)


def _touchstone_table(b: bytes, start: int, name: str):
    # Option lines after the first are ignored: blank them so the numeric pass skips them.
    body = re.sub(rb"(?m)^[ \t]*#[^\n]*", b"", b[start:]) if b"#" in b[start:] else b[start:]
    body = body.replace(b"!", b"#")
    prefix = b"\n" * b.count(b"\n", 0, start)  # keep line numbers
    return _numeric_table(prefix + body, len(prefix), None, 3, name, False, "frequency")


def renormalise(s11: np.ndarray, from_ohm: float, to_ohm: float) -> np.ndarray:
    """S11 referred to ``from_ohm`` -> referred to ``to_ohm`` (formula in the module doc)."""
    s = np.asarray(s11, dtype=complex)
    num = (1.0 + s) * from_ohm - (1.0 - s) * to_ohm
    den = (1.0 + s) * from_ohm + (1.0 - s) * to_ohm
    return num / den


# ----------------------------------------------------------------------- dispatch


def read_file(data: bytes | str, name: str = "FILE", *, z0_ohm: float | None = None,
              time_unit: str | None = None, distance_unit: str | None = None,
              level_unit: str | None = None) -> Trace | Sweep:
    """A trace or a sweep, by the name's ``.sNp`` suffix or the file's own option line."""
    if touchstone_ports(name) is not None:
        return read_touchstone(data, name, z0_ohm=z0_ohm)
    b = _as_bytes(data, name)
    for _number, _pos, raw in _lines(b):
        stripped = raw.strip()
        if not stripped or stripped.startswith(b"!"):
            continue
        if is_option_line(_decode(stripped)):
            return read_touchstone(b, name, z0_ohm=z0_ohm)
        break
    return read_trace(b, name, time_unit=time_unit, distance_unit=distance_unit,
                      level_unit=level_unit)
