"""One labelled input with its error shown on the same line, beside it."""

from __future__ import annotations

from collections.abc import Callable

from textual.app import ComposeResult
from textual.containers import Horizontal
from textual.widgets import Input, Label, Static

#: reader(text, field_label) -> value; raises calc.errors.InputError.
Reader = Callable[[str, str], object]


class Field(Horizontal):
    """``label  [input]  error``. The input's id is the field's ``name``.

    A field reads its text with ``reader`` or, given a ``kind``, with
    ``calc.parse.parse(text, label, kind)``. An optional field left empty
    reads as None.
    """

    def __init__(self, name: str, label: str, *, kind: str | None = None,
                 reader: Reader | None = None, value: str = "", placeholder: str = "",
                 optional: bool = False, tooltip: str | None = None) -> None:
        super().__init__(classes="field")
        if (kind is None) == (reader is None):
            raise TypeError("give a field exactly one of kind or reader")
        self.field_name = name
        self.label = label
        self.kind = kind
        self.reader = reader
        self.optional = optional
        self._value = value
        self._placeholder = placeholder or (self._example() if kind else "")
        self._tooltip = tooltip
        self._error_text = ""

    @property
    def has_error(self) -> bool:
        return bool(self._error_text)

    def _example(self) -> str:
        from calc.parse import KINDS  # light: pint itself loads on first parse

        return f"e.g. {KINDS[self.kind].example}"

    def compose(self) -> ComposeResult:
        self._input = Input(self.app.initial_text(self.field_name, self._value),
                            placeholder=self._placeholder, id=self.field_name,
                            compact=True, tooltip=self._tooltip, select_on_focus=False)
        yield Label(self.label, classes="field-label")
        yield self._input
        yield Static("", classes="field-error", markup=False)

    @property
    def input(self) -> Input:
        return self._input

    @property
    def text(self) -> str:
        return self.input.value

    def read(self) -> object:
        """The field's value (SI float, or what ``reader`` returns); None if an
        optional field is empty. Raises InputError."""
        text = self.input.value
        if self.optional and not text.strip():
            return None
        if self.reader is not None:
            return self.reader(text, self.label)
        from calc.parse import parse

        return parse(text, self.label, self.kind)

    def set_text(self, text: str) -> None:
        """Put ``text`` in the field (as if typed; the form recomputes)."""
        self._input.value = text

    def show_error(self, error: Exception | None) -> None:
        """Show ``error`` beside the field (its problem and an example), or clear it.

        Does nothing when that is already shown: a class change restyles the
        row, and this runs on every keystroke."""
        text = error_beside(error) if error else ""
        if text == self._error_text:
            return
        self._error_text = text
        # classes on the input and the label only: a class on the row would
        # restyle all of it
        self._input.set_class(error is not None, "-invalid")
        self.query_one(".field-label").set_class(error is not None, "-invalid")
        self.query_one(".field-error", Static).update(text)


def error_beside(error: Exception) -> str:
    """An InputError as it reads beside its own field (the field name is implied)."""
    problem = getattr(error, "problem", None) or str(error)
    example = getattr(error, "example", None)
    return f"{problem}; e.g. {example}" if example else problem
