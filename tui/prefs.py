"""The user's preferences, kept in ``preferences.toml`` in the user config directory.

The file is plain TOML (read with :mod:`tomllib`) and looks like::

    units = "imperial"        # "metric" or "imperial"
    fraction = 16             # feet and inches to 1/16 in (8, 16 or 32)
    last_cable = "rg8-foam"   # the cable fields start with
    theme = "textual-light"   # any Textual theme name

    [safety]                  # one table per module that keeps its own keys
    notice_seen = true

Rules:

* A broken file (not TOML, unreadable) is reported and left exactly as it is:
  the program runs on the defaults and never writes over it that session.
* A value of the wrong type or range is reported and the default used; the
  file keeps the value until the user changes that preference.
* Keys this version does not know are kept, untouched, when the file is
  written (a newer version's keys survive an older version), and reported
  with a "did you mean" hint.
* Writes are atomic (:func:`cable_catalog.loader.atomic_write_text`), so a
  crash leaves the old file or the new one, never half of it.
"""

from __future__ import annotations

import difflib
import tomllib
from dataclasses import dataclass, field, fields, replace
from pathlib import Path

UNIT_SYSTEMS = ("metric", "imperial")
FRACTIONS = (8, 16, 32)  # as the CLI's --fraction
DEFAULT_THEME = "textual-dark"


@dataclass(frozen=True)
class Preferences:
    """What halftrip remembers between sessions."""

    units: str = "metric"
    """How lengths are shown everywhere: ``"metric"`` (m, mm) or ``"imperial"``
    (feet and inches to :attr:`fraction`). Typed input accepts either."""

    fraction: int = 16
    """Feet-and-inches lengths are rounded to 1/fraction inch, as a tape shows
    them: 8, 16 or 32 (the CLI's ``--fraction`` choices)."""

    last_cable: str = "rg58"
    """Catalog id of the cable last chosen on any panel; new fields start with it."""

    theme: str = DEFAULT_THEME
    """Name of the Textual theme (``"textual-dark"``, ``"textual-light"``, ...)."""

    modules: dict[str, dict] = field(default_factory=dict, compare=False)
    """One table per module that keeps keys of its own (``[safety]``, ``[log]``,
    ...), read and written as they are. Use :meth:`section` and
    :func:`with_section`; keys are the module's business."""

    unknown: dict[str, object] = field(default_factory=dict, compare=False)
    """Top-level keys this version does not know; written back unchanged."""

    problems: tuple[str, ...] = field(default=(), compare=False)
    """What was wrong with the file when it was read (shown to the user once)."""

    writable: bool = field(default=True, compare=False)
    """False when the file on disk is broken: it is then never written over."""

    def section(self, name: str) -> dict:
        """A copy of module ``name``'s table (empty if it has none)."""
        return dict(self.modules.get(name, {}))


_TYPED = ("units", "fraction", "last_cable", "theme")


def _checked(key: str, value: object) -> str | None:
    """None if ``value`` is acceptable for ``key``, else the reason."""
    if key == "units":
        return None if value in UNIT_SYSTEMS else f"use one of {', '.join(UNIT_SYSTEMS)}"
    if key == "fraction":
        ok = isinstance(value, int) and not isinstance(value, bool) and value in FRACTIONS
        return None if ok else f"use one of {', '.join(map(str, FRACTIONS))}"
    if isinstance(value, str) and value.strip():
        return None
    return "use non-empty text"


def load_preferences(path: Path | None = None) -> Preferences:
    """Read the preferences file; missing means defaults, broken means defaults
    plus a problem and ``writable=False``."""
    if path is None:
        from tui.paths import preferences_path

        path = preferences_path()
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
        data = tomllib.loads(text)
    except FileNotFoundError:
        return Preferences()
    except (OSError, UnicodeDecodeError, tomllib.TOMLDecodeError) as exc:
        return Preferences(problems=(f"{path}: cannot read it ({exc}); using defaults and "
                                     "leaving the file as it is",), writable=False)
    problems: list[str] = []
    if not text.strip():  # nothing in it to lose: defaults, and the file may be written
        problems.append(f"{path}: the file is empty; using defaults")
    typed: dict[str, object] = {}
    modules: dict[str, dict] = {}
    unknown: dict[str, object] = {}
    for key, value in data.items():
        if key in _TYPED:
            reason = _checked(key, value)
            if reason:
                problems.append(f"{path}: {key} = {value!r}: {reason}; using the default")
                unknown[key] = value  # keep the user's text until they change it
            else:
                typed[key] = value
        elif isinstance(value, dict):
            modules[key] = value
        else:
            near = difflib.get_close_matches(key, _TYPED, n=1)
            hint = f" (did you mean {near[0]!r}?)" if near else ""
            problems.append(f"{path}: unknown key {key!r}{hint}; kept as it is")
            unknown[key] = value
    return Preferences(**typed, modules=modules, unknown=unknown, problems=tuple(problems))


def with_section(prefs: Preferences, name: str, **values) -> Preferences:
    """``prefs`` with keys of module ``name``'s table set to ``values``."""
    modules = dict(prefs.modules)
    modules[name] = {**modules.get(name, {}), **values}
    return replace(prefs, modules=modules)


def changed(prefs: Preferences, **values) -> Preferences:
    """``prefs`` with typed preferences changed (checked like the file is)."""
    unknown = dict(prefs.unknown)
    for key, value in values.items():
        if key not in _TYPED:
            raise KeyError(f"no preference {key!r}")
        reason = _checked(key, value)
        if reason:
            raise ValueError(f"{key} = {value!r}: {reason}")
        unknown.pop(key, None)  # the user chose a new value: the old bad one goes
    return replace(prefs, unknown=unknown, **values)


def to_toml(prefs: Preferences) -> str:
    """The file text for ``prefs`` (typed keys, kept unknown keys, module tables)."""
    from cable_catalog.loader import _toml_value as value_text

    lines = ["# halftrip preferences (written by the program; edits are kept)"]
    for f in fields(Preferences):
        if f.name in _TYPED and f.name not in prefs.unknown:
            lines.append(f"{f.name} = {value_text(getattr(prefs, f.name))}")
    for key, value in prefs.unknown.items():
        lines.append(f"{key} = {_inline(value, value_text)}")
    for name, table in prefs.modules.items():
        lines.append("")
        lines.append(f"[{_key(name)}]")
        for key, value in table.items():
            lines.append(f"{_key(key)} = {_inline(value, value_text)}")
    return "\n".join(lines) + "\n"


def _key(name: str) -> str:
    from cable_catalog.loader import _toml_value

    # TOML bare keys are ASCII letters, digits, - and _ only ("café" must be quoted)
    bare = name.isascii() and name.replace("-", "").replace("_", "").isalnum()
    return name if bare else _toml_value(name)


def _inline(value: object, value_text) -> str:
    if isinstance(value, dict):
        inner = ", ".join(f"{_key(k)} = {_inline(v, value_text)}" for k, v in value.items())
        return "{" + inner + "}"
    if isinstance(value, list):
        return "[" + ", ".join(_inline(v, value_text) for v in value) + "]"
    if hasattr(value, "isoformat"):  # TOML dates and times
        return value.isoformat()
    return value_text(value)


def save_preferences(prefs: Preferences, path: Path | None = None) -> str | None:
    """Write ``prefs`` atomically; returns None, or why nothing was written."""
    if not prefs.writable:
        return "the preferences file could not be read, so it was left as it is"
    if path is None:
        from tui.paths import preferences_path

        path = preferences_path()
    from cable_catalog.loader import atomic_write_text

    path = Path(path)
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        atomic_write_text(path, to_toml(prefs))
    except (OSError, UnicodeError) as exc:  # UnicodeError: text no file can hold
        return f"cannot write {path} ({exc})"
    return None


def update_preferences(path: Path | None = None, sections: dict[str, dict] | None = None,
                       **typed) -> tuple[Preferences, str | None]:
    """Change some preferences in the file and nothing else.

    The file is read again first, so keys and tables written meanwhile by
    another module (the safety notice's ``[safety]`` table) or another
    halftrip are kept. Returns the preferences now in force and None, or
    the preferences (changed in memory only) and why the file was not written.
    """
    current = load_preferences(path)
    new = changed(current, **typed)
    for name, values in (sections or {}).items():
        new = with_section(new, name, **values)
    return new, save_preferences(new, path)
