"""The terminal interface's panels, one module (or package) per part of the job.

Contract (shared by everyone who adds a panel; the app finds panels by
listing this package, so adding a panel is adding a module):

* ``tui/panels/<name>.py`` (or ``<name>/__init__.py``) defines

  - ``KEY``: one lower-case letter that opens the panel when the cursor is
    not in a text field (``"l"``). Taken by the app: ``u`` (units), ``d``
    (theme); by panels: l x e t c j s;
  - ``ORDER``: its place in the panel bar, 1 to 9. The panel's function key,
    which opens it from anywhere (also while typing), is ``F<ORDER + 1>``
    (F1 is help, F9 the unit switch);
  - ``TITLE``: its name on screen, one plain word of the trade (``"Locate"``);
  - ``DESCRIPTION``: one line for the help screen and the command palette;
  - ``PANEL``: where the panel's widget class is, ``"module:Class"``
    (``"tui.panels.locate.panel:Panel"``), built with ``Panel(id=name)``; it
    is imported when the panel is first mounted, after the first frame (a
    module may define the class itself as ``Panel`` instead).

  Optional:

  - ``DEMO``: ``{field name: text}`` that ``halftrip demo`` starts the
    panel's fields with (an invented scenario of our own);
  - ``LOG_KINDS``: job-log entry kinds the panel reopens (see
    :mod:`tui.panels.log.saving`);
  - ``on_app_start(app)``: called once after the first frame (for a notice
    to show on first start, for example); keep it quick;
  - ``Panel.action_mode(index)``: the panel has modes (digits pick them,
    from the panel bar too); :class:`tui.widgets.modes.Modes` provides them.

* The module is imported at start-up, before the first frame: keep its top
  level to those constants (no imports beyond the standard library). The
  widget module named by ``PANEL`` may import Textual; import the core, numpy
  and the catalog inside methods, or in a worker; name a mode's form as
  ``"module:Class"`` so it is imported when the mode is built. Panels are
  mounted when first opened (the first one right after the first frame).
* A panel computes nothing itself: it parses its fields with ``calc.parse``,
  calls the core, and formats with ``tui.fmt``, exactly as the CLI command
  for the same job does. :class:`tui.widgets.form.LiveForm` does the field
  parsing, the inline errors, the stale marking and the unit switch;
  :class:`tui.widgets.command_form.CommandForm` makes a form whose fields are
  a CLI command's options and whose result is what the command prints.
* Lengths are shown in the user's unit system, ``self.app.unit_system``
  (``("metric" | "imperial", fraction)``), a reactive the forms watch.
* A calculation panel composes a :class:`tui.widgets.warning_line.WarningLine`
  (id ``warning-line``) at its top; forms set it from ``hazards(result)``
  (the hazard tags of the cables in use), so the cautions appear where they
  apply, and ``!`` marks the line possibly live.
* Module tables in the preferences file belong to their module:
  ``self.app.prefs.section(name)`` reads one, ``self.app.update_section(name,
  key=value)`` writes it.

Modules whose name starts with ``_`` are skipped (private helpers).
"""

from __future__ import annotations

import importlib
import os
from dataclasses import dataclass
from types import ModuleType


@dataclass(frozen=True)
class PanelSpec:
    """What the app knows about one panel module."""

    name: str  # module name, also the panel's widget id
    key: str
    order: int
    title: str
    description: str
    module: ModuleType

    @property
    def function_key(self) -> str:
        return f"f{self.order + 1}"

    def panel_class(self) -> type:
        """The panel's widget class (imported now, if the module names it in ``PANEL``)."""
        cls = getattr(self.module, "Panel", None)
        if cls is None:
            where, _, attr = self.module.PANEL.partition(":")
            cls = getattr(importlib.import_module(where), attr)
        return cls


class PanelContractError(TypeError):
    """A panel module does not follow the contract above."""


def discover(names: tuple[str, ...] | None = None) -> list[PanelSpec]:
    """Every panel module in this package (or only ``names``), in bar order."""
    found = []
    for name in _module_names():
        if name.startswith("_") or (names is not None and name not in names):
            continue
        module = importlib.import_module(f"{__name__}.{name}")
        found.append(_spec(name, module))
    found.sort(key=lambda s: (s.order, s.name))
    _check_unique(found)
    return found


def _module_names() -> list[str]:
    """Modules and packages in this folder (a listing: pkgutil costs ~10 ms to import)."""
    names = []
    for entry in os.scandir(__path__[0]):
        if entry.is_file() and entry.name.endswith(".py") and entry.name != "__init__.py":
            names.append(entry.name[:-3])
        elif entry.is_dir() and os.path.exists(os.path.join(entry.path, "__init__.py")):
            names.append(entry.name)
    return sorted(names)


def _spec(name: str, module: ModuleType) -> PanelSpec:
    missing = [a for a in ("KEY", "ORDER", "TITLE", "DESCRIPTION") if not hasattr(module, a)]
    if not (hasattr(module, "PANEL") or hasattr(module, "Panel")):
        missing.append("PANEL")
    if missing:
        raise PanelContractError(f"tui/panels/{name}.py lacks {', '.join(missing)}")
    key, order = module.KEY, module.ORDER
    if not (isinstance(key, str) and len(key) == 1 and key.isalpha() and key.islower()):
        raise PanelContractError(f"tui/panels/{name}.py: KEY must be one lower-case letter")
    if not (isinstance(order, int) and 1 <= order <= 9):
        raise PanelContractError(f"tui/panels/{name}.py: ORDER must be 1 to 9")
    return PanelSpec(name, key, order, module.TITLE, module.DESCRIPTION, module)


def _check_unique(specs: list[PanelSpec]) -> None:
    for attr in ("key", "order"):
        seen: dict[object, str] = {}
        for s in specs:
            other = seen.setdefault(getattr(s, attr), s.name)
            if other != s.name:
                raise PanelContractError(
                    f"panels {other} and {s.name} share the same {attr} {getattr(s, attr)!r}")
