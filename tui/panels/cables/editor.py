"""The dialog that adds a cable to the user's own cable file.

Three ways in: a blank cable, a copy of the chosen one under a new id, and a
measured velocity factor for the chosen cable (the copy with the VF field
first and the source saying it was measured). The file is only ever appended
to, atomically, by :func:`cable_catalog.loader.append_user_cable`; a refused
entry shows why and writes nothing.
"""

from __future__ import annotations

from datetime import date

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Static

from calc.errors import InputError
from tui.widgets.field import Field

CATEGORIES = ("coax", "twisted-pair", "twin-lead", "power")


def _text(text: str, label: str) -> str:
    return text.strip()


def _required(text: str, label: str) -> str:
    if not text.strip():
        raise InputError(label, "required", "my measured cable")
    return text.strip()


def _category(text: str, label: str) -> str:
    t = text.strip().lower()
    if t not in CATEGORIES:
        raise InputError(label, f"use one of {', '.join(CATEGORIES)}", "coax")
    return t


def _loss(text: str, label: str) -> float | None:
    from calc.parse import parse

    value = parse(text, label, "ratio")
    if value < 0:
        raise InputError(label, "a loss coefficient cannot be negative", "1.39")
    return value


def _tags(text: str, label: str) -> list[str]:
    from cable_catalog.loader import HAZARD_TAGS

    tags = [t.strip() for t in text.replace(";", ",").split(",") if t.strip()]
    bad = [t for t in tags if t not in HAZARD_TAGS]
    if bad:
        raise InputError(label, f"unknown tag {bad[0]!r}; tags are {', '.join(HAZARD_TAGS)}",
                         "power, stored-charge")
    return tags


def initial_values(base, measured: bool, taken) -> dict[str, str]:
    """The editor's starting text for each field."""
    if base is None:
        return {"new-id": "", "new-category": "coax", "new-tolerance": "3 %",
                "new-source": "my own measurement"}
    suffix = "measured" if measured else "copy"
    new_id, n = f"{base.id}-{suffix}"[:44], 2
    candidate = new_id
    while candidate in taken:
        candidate, n = f"{new_id}-{n}", n + 1
    return {
        "new-id": candidate,
        "new-description": base.description + (", measured VF" if measured else ""),
        "new-category": base.category,
        "new-z0": f"{base.z0_ohm:g} ohm",
        "new-vf": "" if measured else f"{base.vf:g}",
        "new-tolerance": "1 %" if measured else f"{base.vf_tolerance * 100:g} %",
        "new-k1": f"{base.atten_k1:g}" if base.atten_k1 is not None else "",
        "new-k2": f"{base.atten_k2:g}" if base.atten_k2 is not None else "",
        "new-hazards": ", ".join(base.hazards),
        "new-source": (f"measured on site {date.today().isoformat()} (from {base.id})"
                       if measured else base.source),
        "new-notes": base.notes,
    }


def measured_values(cal) -> dict[str, str]:
    """The editor's starting text for a :class:`calc.calibrate.Calibration`."""
    import math

    from tui import fmt

    what = (f"{fmt.length(cal.length_m)}, {fmt.time(cal.delay_s)} round trip" if cal.delay_s
            else f"{fmt.length(cal.length_m)}, order {cal.order}, "
                 f"{fmt.frequency(cal.frequency_hz)}")
    tolerance = math.ceil(cal.vf_tolerance * 1e4) / 1e2  # percent, rounded up: never tighter
    return {
        "new-id": "", "new-description": f"measured cable, VF {cal.vf:.3f}",
        "new-category": "coax", "new-z0": "50 ohm", "new-vf": f"{cal.vf:.4f}",
        "new-tolerance": f"{tolerance:g} %",
        "new-source": f"measured on {date.today().isoformat()} ({cal.method}: {what})",
    }


class CableEditor(ModalScreen[str | None]):
    """Add one cable to the user's file; dismisses with its id, or None."""

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="editor.cancel"),
        Binding("ctrl+s", "save", "Save", id="editor.save"),
    ]

    def __init__(self, catalog, base=None, measured: bool = False,
                 values: dict[str, str] | None = None) -> None:
        super().__init__()
        self.catalog = catalog
        self.base = base
        self.measured = measured or values is not None
        self.values = values

    def compose(self) -> ComposeResult:
        values = self.values or initial_values(self.base, self.measured, set(self.catalog.cables))
        title = ("Save a measured VF" if self.measured else
                 "New cable" if self.base is None else f"New cable from {self.base.id}")
        with Vertical(id="editor-body") as body:
            body.border_title = title
            yield Static("Added to your own cable file; the built-in catalog is not changed.",
                         classes="panel-intro")
            specs = [
                ("new-id", "id", dict(reader=_required)),
                ("new-description", "description", dict(reader=_required)),
                ("new-category", "category", dict(reader=_category)),
                ("new-z0", "Z0", dict(kind="impedance")),
                ("new-vf", "VF (or NVP %)", dict(kind="vf")),
                ("new-tolerance", "VF tolerance", dict(kind="tolerance")),
                ("new-k1", "loss k1 (sqrt f)", dict(reader=_loss, optional=True,
                                                     placeholder="dB/100m/sqrt(MHz)")),
                ("new-k2", "loss k2 (f)", dict(reader=_loss, optional=True,
                                                placeholder="dB/100m/MHz")),
                ("new-hazards", "hazard tags", dict(reader=_tags, placeholder="e.g. poe")),
                ("new-source", "source", dict(reader=_required)),
                ("new-notes", "notes", dict(reader=_text)),
            ]
            order = ["new-id"] if self.values else ["new-vf"] if self.measured else []
            specs.sort(key=lambda s: s[0] not in order)
            for name, label, kw in specs:
                yield Field(name, label, value=values.get(name, ""), **kw)
            yield Static("", id="editor-problem", markup=False)
            with Horizontal(id="editor-buttons"):
                yield Button("Save (Ctrl+S)", id="editor-save", variant="primary")
                yield Button("Cancel (Esc)", id="editor-cancel")

    def on_button_pressed(self, event: Button.Pressed) -> None:
        if event.button.id == "editor-save":
            self.action_save()
        else:
            self.action_cancel()

    def action_cancel(self) -> None:
        self.dismiss(None)

    def action_save(self) -> None:
        from cable_catalog.loader import CatalogWriteError, append_user_cable
        from tui.paths import user_catalog_path

        entry: dict[str, object] = {}
        bad = False
        for f in self.query(Field):
            try:
                value = f.read()
                f.show_error(None)
            except InputError as exc:
                f.show_error(exc)
                bad = True
                continue
            key = f.field_name.removeprefix("new-")
            key = {"z0": "z0_ohm", "tolerance": "vf_tolerance", "k1": "atten_k1",
                   "k2": "atten_k2"}.get(key, key)
            if value not in (None, "", []):
                entry[key] = value
        problem = self.query_one("#editor-problem", Static)
        if bad:
            problem.update("Fix the fields marked with an error; nothing was saved.")
            return
        try:
            cable = append_user_cable(user_catalog_path(), entry)
        except CatalogWriteError as exc:
            problem.update(f"Not saved: {exc}")
            return
        self.dismiss(cable.id)
