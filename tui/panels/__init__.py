"""The terminal interface's panels, one module per part of the job.

Contract (shared by everyone who adds a panel; the app finds panels by
listing this package, so adding a panel is adding a module):

* ``tui/panels/<name>.py`` defines

  - ``KEY``: one lower-case letter that opens the panel when the cursor is
    not in a text field (``"l"``);
  - ``ORDER``: its place in the panel bar, 1 to 9. The panel's function key,
    which opens it from anywhere (also while typing), is ``F<ORDER + 1>``
    (F1 is help);
  - ``TITLE``: its name on screen, one plain word of the trade (``"Locate"``);
  - ``DESCRIPTION``: one line for the help screen and the command palette;
  - ``Panel``: a Textual widget class, built with no arguments, that
    composes the panel.

  Optional:

  - ``on_app_start(app)``: called once after the first frame (for a notice
    to show on first start, for example); keep it quick.

* The module is imported at start-up, before the first frame: keep its top
  level light (Textual only). Import the core, numpy and the catalog inside
  methods, or in a worker.
* A panel computes nothing itself: it parses its fields with ``calc.parse``,
  calls the core, and formats with ``tui.fmt``, exactly as the CLI command
  for the same job does. :class:`tui.widgets.form.LiveForm` does the field
  parsing, the inline errors and the stale marking for you.
* Lengths are shown in the user's unit system: read ``self.app.prefs.units``
  and ``.fraction`` when formatting, and redraw in
  ``on_halftrip_app_units_changed`` (the app posts
  :class:`tui.app.HalftripApp.UnitsChanged` to every mounted panel).
  ``LiveForm`` does this for you too.
* A calculation panel composes a :class:`tui.widgets.warning_line.WarningLine`
  (id ``warning-line``) near its top and calls ``set_hazards(tags)`` with the
  hazard tags of the cables in use, so the cautions appear where they apply.
* Module tables in the preferences file belong to their module:
  ``self.app.prefs.section(name)`` reads one, ``self.app.update_section(name,
  key=value)`` writes it.

Modules whose name starts with ``_`` are skipped (private helpers).
"""

from __future__ import annotations

import importlib
import pkgutil
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


class PanelContractError(TypeError):
    """A panel module does not follow the contract above."""


def discover(names: tuple[str, ...] | None = None) -> list[PanelSpec]:
    """Every panel module in this package (or only ``names``), in bar order."""
    found = []
    for info in pkgutil.iter_modules(__path__):
        if info.name.startswith("_") or (names is not None and info.name not in names):
            continue
        module = importlib.import_module(f"{__name__}.{info.name}")
        found.append(_spec(info.name, module))
    found.sort(key=lambda s: (s.order, s.name))
    _check_unique(found)
    return found


def _spec(name: str, module: ModuleType) -> PanelSpec:
    missing = [a for a in ("KEY", "ORDER", "TITLE", "DESCRIPTION", "Panel")
               if not hasattr(module, a)]
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
