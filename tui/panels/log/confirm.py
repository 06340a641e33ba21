"""A yes-or-no question (deleting an entry)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Static


class ConfirmDialog(ModalScreen[bool]):
    """Dismisses True for ``yes`` (its button, or y), False for Escape or n."""

    BINDINGS = [
        Binding("escape,n", "answer(False)", "Keep", id="confirm.no"),
        Binding("y", "answer(True)", "Yes", id="confirm.yes"),
    ]

    def __init__(self, title: str, question: str, yes: str) -> None:
        super().__init__(classes="log-dialog")
        self.title_text = title
        self.question = question
        self.yes = yes

    def compose(self) -> ComposeResult:
        with Vertical(classes="log-dialog-body") as body:
            body.border_title = self.title_text
            yield Static(self.question, markup=False)
            with Horizontal(classes="log-dialog-buttons"):
                yield Button(f"{self.yes} (y)", id="confirm-yes", variant="error")
                yield Button("Keep it (Esc)", id="confirm-no")

    def on_mount(self) -> None:
        self.query_one("#confirm-yes", Button).focus()

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        self.dismiss(event.button.id == "confirm-yes")

    def action_answer(self, yes: bool) -> None:
        self.dismiss(yes)
