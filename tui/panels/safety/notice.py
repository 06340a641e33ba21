"""The first-start notice: shown until the current caution text is acknowledged."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Button, Static


class SafetyNotice(ModalScreen[bool]):
    """The notice; dismissed (True) only by acknowledging it. Ctrl+Q still quits."""

    BINDINGS = [
        Binding("escape", "insist", "Acknowledge to go on", id="notice.insist", show=False),
    ]

    def __init__(self, changed: bool = False) -> None:
        super().__init__()
        self.changed = changed  # an earlier version of the text was acknowledged

    def compose(self) -> ComposeResult:
        from tui.safety import load_text

        text = load_text()
        with VerticalScroll(id="notice-body"):
            yield Static(text.notice_title, id="notice-title", markup=False)
            if self.changed:
                yield Static("The cautions have changed since you last acknowledged them.",
                             id="notice-changed", markup=False)
            yield Static(text.notice_text, id="notice-text", markup=False)
            with Horizontal(id="notice-buttons"):
                yield Static(self._where_to_read(), id="notice-where", markup=False)
                yield Button("I have read this", id="notice-ack", variant="warning",
                             compact=True)

    def _where_to_read(self) -> str:
        spec = next((s for s in getattr(self.app, "PANELS", []) if s.name == "safety"), None)
        keys = f" ({spec.function_key.upper()})" if spec else ""
        return f"Full cautions: Safety panel{keys}, 'halftrip safety'"

    def on_mount(self) -> None:
        self.query_one("#notice-ack", Button).focus()

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        self.dismiss(True)

    def action_insist(self) -> None:
        self.notify("Read the notice and press Enter on 'I have read this' (Ctrl+Q quits)",
                    timeout=4)


def show_notice_if_needed(app) -> bool:
    """Push the notice when the current caution text has not been acknowledged.

    The acknowledgement goes into the ``[safety]`` table of the preferences
    through ``app.update_section``, which keeps every other preference and
    reports a file it cannot write (the notice then shows again next start).
    """
    from tui.safety import PREFS_TABLE, acknowledged_version, acknowledgement, notice_needed

    if not notice_needed(app.prefs):
        return False

    def acknowledged(ok: bool | None) -> None:
        if ok:
            app.update_section(PREFS_TABLE, **acknowledgement())

    app.push_screen(SafetyNotice(changed=acknowledged_version(app.prefs) is not None),
                    acknowledged)
    return True
