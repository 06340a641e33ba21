"""The safety panel's widget (its constants are in :mod:`tui.panels.safety`)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.widgets import OptionList, Static
from textual.widgets.option_list import Option

#: How each kind of line from tui.safety.text_lines is styled (weight, not colour).
STYLES = {"heading": "bold", "label": "italic"}


class Panel(Vertical):
    """A list of caution topics on the left, the chosen topic's text on the right."""

    BINDINGS = [
        Binding("n", "show_notice", "Read the first-start notice", id="safety.notice"),
    ]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        from tui.safety import load_text

        text = load_text()
        yield Static("Treat every conductor as energized until proven otherwise by a qualified "
                     "person. Local codes and site procedures take precedence.",
                     classes="panel-intro")
        with Horizontal(id="safety-columns"):
            yield OptionList(*[Option(s.label, id=s.id) for s in text.sections.values()],
                             id="safety-topics")
            with VerticalScroll(id="safety-body"):
                yield Static(id="safety-text")

    def on_mount(self) -> None:
        self.query_one("#safety-topics", OptionList).highlighted = 0

    @property
    def section_id(self) -> str | None:
        topics = self.query_one("#safety-topics", OptionList)
        if topics.highlighted is None:
            return None
        return topics.get_option_at_index(topics.highlighted).id

    def show_section(self, section_id: str) -> None:
        """Show the cautions for ``section_id`` (a hazard tag or a topic)."""
        topics = self.query_one("#safety-topics", OptionList)
        topics.highlighted = topics.get_option_index(section_id)

    def on_option_list_option_highlighted(self, event: OptionList.OptionHighlighted) -> None:
        event.stop()
        self._render_section()
        self.query_one("#safety-body").scroll_home(animate=False)

    def on_resize(self) -> None:
        self._render_section()

    def _render_section(self) -> None:
        from rich.text import Text

        from tui.safety import load_text, text_lines

        sid = self.section_id
        if sid is None:
            return
        body = self.query_one("#safety-body")
        width = max(body.scrollable_content_region.width, 30)
        out = Text()
        for kind, line in text_lines([load_text().sections[sid]], width=width):
            out.append(line + "\n", style=STYLES.get(kind, ""))
        self.query_one("#safety-text", Static).update(out)

    def action_show_notice(self) -> None:
        from tui.panels.safety.notice import SafetyNotice

        self.app.push_screen(SafetyNotice())
