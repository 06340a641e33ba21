"""One saved entry in full: inputs, result, its tables and its trace picture."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Footer, Markdown


class EntryScreen(ModalScreen[str | None]):
    """The entry as the Markdown report shows it. Dismisses with ``"reopen"`` (o) or None."""

    BINDINGS = [
        Binding("escape,q", "close", "Back", id="entry.close"),
        Binding("o", "reopen", "Reopen in its panel", id="entry.reopen"),
    ]

    def __init__(self, markdown: str) -> None:
        super().__init__(classes="log-entry-screen")
        self.markdown = markdown

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="log-entry-scroll"):
            yield Markdown(self.markdown, id="log-entry-text")
        yield Footer()

    def on_mount(self) -> None:
        self.query_one("#log-entry-scroll").focus()

    def action_close(self) -> None:
        self.dismiss(None)

    def action_reopen(self) -> None:
        self.dismiss("reopen")
