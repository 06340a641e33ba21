"""Where a live result is shown: fresh, waiting, or out of date (stale)."""

from __future__ import annotations

from textual.widgets import Static

FRESH_TITLE = "Result"
STALE_TITLE = "Out of date: last good result (fix the field marked with an error)"
WAITING_TITLE = "Result: waiting"


class ResultView(Static):
    """A bordered block of result text. When the input goes bad the last good
    text stays, dimmed, under a title that says it is out of date; this never
    relies on colour alone (the border and the title change too)."""

    def __init__(self, *args, **kwargs) -> None:
        # Waiting from construction, not from mount: a result shown before the
        # widget is mounted (a demo or a reopened entry) must not be retitled.
        super().__init__(*args, **kwargs)
        self.add_class("-waiting")
        self.border_title = WAITING_TITLE

    def show(self, content) -> None:
        """A fresh result."""
        if self.has_class("-stale") or self.has_class("-waiting"):
            self.remove_class("-stale", "-waiting")
            self.border_title = FRESH_TITLE
            self.border_subtitle = ""
        self.show_text(content)

    def show_text(self, content) -> None:
        """Update, with a layout pass only when the text's shape changed (it runs
        on every keystroke, and a layout pass is most of its cost)."""
        text = str(content)
        longest = max(map(len, text.splitlines()), default=0)
        shape = (text.count("\n"), longest > max(self.content_size.width, 1) - 1)
        same = shape == getattr(self, "_shape", None)
        self._shape = shape
        self.update(content, layout=not same)

    def mark_stale(self, reason: str | None = None) -> None:
        """Keep what is shown, marked out of date; ``reason`` for a form-level error."""
        if not self.has_class("-waiting") and not self.has_class("-stale"):
            self.add_class("-stale")
            self.border_title = STALE_TITLE
        if self.border_subtitle != (reason or ""):
            self.border_subtitle = reason or ""

    def waiting(self, text: str) -> None:
        """Nothing to show yet (``text`` says what is missing)."""
        self.remove_class("-stale")
        self.add_class("-waiting")
        self.border_title = WAITING_TITLE
        self.border_subtitle = ""
        self.show_text(text)

    @property
    def is_stale(self) -> bool:
        return self.has_class("-stale")

    def clear_reason(self) -> None:
        self.border_subtitle = ""
