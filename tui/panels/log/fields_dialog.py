"""A small dialog of labelled text fields (job, label and note, tags, export)."""

from __future__ import annotations

from dataclasses import dataclass, field

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Input, Static

from calc.errors import InputError
from tui.widgets.field import Field


def as_text(text: str, label: str) -> str:
    return text.strip()


def required_text(text: str, label: str) -> str:
    if not text.strip():
        raise InputError(label, "required", "Harbour Road substation")
    return text.strip()


@dataclass(frozen=True)
class Ask:
    """One field of the dialog: its name, label, starting text and reader."""

    name: str
    label: str
    value: str = ""
    placeholder: str = ""
    reader: object = field(default=as_text)


class FieldsDialog(ModalScreen[dict | None]):
    """Ask for a few values; dismisses with {name: value} or None (Escape).

    Enter in the last field, Ctrl+S or the OK button accepts; every field is
    read with its reader first and a refusal is shown beside the field.
    """

    BINDINGS = [
        Binding("escape", "cancel", "Cancel", id="dialog.cancel"),
        Binding("ctrl+s", "accept", "OK", id="dialog.accept"),
    ]

    def __init__(self, title: str, intro: str, asks: list[Ask], ok: str = "OK",
                 check=None) -> None:
        super().__init__(classes="log-dialog")
        self.title_text = title
        self.intro = intro
        self.asks = asks
        self.ok = ok
        self.check = check  # optional check(values) -> problem text or None

    def compose(self) -> ComposeResult:
        with Vertical(classes="log-dialog-body") as body:
            body.border_title = self.title_text
            if self.intro:
                yield Static(self.intro, classes="panel-intro", markup=False)
            for ask in self.asks:
                yield Field(ask.name, ask.label, value=ask.value, placeholder=ask.placeholder,
                            reader=ask.reader)
            yield Static("", classes="log-dialog-problem", markup=False)
            with Horizontal(classes="log-dialog-buttons"):
                yield Button(f"{self.ok} (Enter)", id="dialog-ok", variant="primary")
                yield Button("Cancel (Esc)", id="dialog-cancel")

    def on_mount(self) -> None:
        fields = list(self.query(Field))
        if fields:
            fields[0].input.focus()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        fields = list(self.query(Field))
        here = next((i for i, f in enumerate(fields) if f.input is event.input), len(fields))
        if here + 1 < len(fields):
            fields[here + 1].input.focus()
        else:
            self.action_accept()

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        if event.button.id == "dialog-ok":
            self.action_accept()
        else:
            self.action_cancel()

    def action_cancel(self) -> None:
        self.dismiss(None)

    def action_accept(self) -> None:
        values, bad = {}, False
        for f in self.query(Field):
            try:
                values[f.field_name] = f.read()
                f.show_error(None)
            except InputError as exc:
                f.show_error(exc)
                bad = True
        problem = self.query_one(".log-dialog-problem", Static)
        if bad:
            problem.update("Fix the field marked with an error.")
            return
        text = self.check(values) if self.check else None
        if text:
            problem.update(text)
            return
        self.dismiss(values)
