"""A command form whose seldom-needed options wait on a second page.

Some commands take more options than an 80x24 screen can show above a plot
(``halftrip simulate``'s lumps, points and span; ``halftrip trace``'s reading
options). The form keeps its everyday fields on the first page ("the job")
and the rest on a second page that Ctrl+R opens and closes in the same place,
so the plot below keeps its size. An option set on the closed page still
counts, and the first page says so in one line (``more options (^r): ...``),
so nothing hidden changes a result unseen. The pages are a ContentSwitcher:
its children ``<prefix>-job`` and ``<prefix>-more``.

Subclasses compose with :meth:`pages` (two lists of fields), set
``MORE_HEADING`` (the second page's first line) and ``BACK_TITLE`` (the key
bar's words for going back), and build their ``BINDINGS`` with
:func:`page_bindings`.
"""

from __future__ import annotations

from typing import ClassVar

from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import ContentSwitcher, Input, Static

from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field

MORE_KEY = "ctrl+r"


def page_bindings(prefix: str, back_title: str) -> list[Binding]:
    """Ctrl+R to the options page and back; the key bar shows the way that is open."""
    return [Binding(MORE_KEY, "options_page(True)", "Options", id=f"{prefix}.more"),
            Binding(MORE_KEY, "options_page(False)", back_title, id=f"{prefix}.back")]


class OptionPages(ContentSwitcher):
    """The job's fields, or the more options page, in the same rows."""

    DEFAULT_CSS = """
    OptionPages { height: auto; }
    OptionPages > Vertical { height: auto; }
    """


class PagedCommandForm(CommandForm):
    """A CommandForm with a second page of options (see the module docstring)."""

    MORE_HEADING: ClassVar[str] = "more options"

    def pages(self, job: list[Field], more: list[Field]):
        """Compose the two pages (call as ``yield from self.pages(...)``)."""
        with OptionPages(initial=f"{self.PREFIX}-job", id=f"{self.PREFIX}-pages"):
            with Vertical(id=f"{self.PREFIX}-job"):
                yield from job
                summary = Static("", classes="options-summary", markup=False)
                summary.display = False
                yield summary
            with Vertical(id=f"{self.PREFIX}-more"):
                yield Static(self.MORE_HEADING, classes="options-heading", markup=False)
                yield from more

    @property
    def showing_more(self) -> bool:
        return self.query_one(OptionPages).current == f"{self.PREFIX}-more"

    def more_fields(self) -> list[Field]:
        return list(self.query_one(f"#{self.PREFIX}-more").query(Field))

    def check_action(self, action: str, parameters: tuple) -> bool | None:
        if action == "options_page":
            return bool(parameters[0]) != self.showing_more
        return True

    def action_options_page(self, more: bool) -> None:
        """Show the options page (``more``) or the job's fields, the cursor in its first field."""
        page = f"{self.PREFIX}-{'more' if more else 'job'}"
        self.query_one(OptionPages).current = page
        first = next((i for i in self.query_one(f"#{page}").query(Input)
                      if i.parent.display), None)
        if first is not None:
            first.focus()
        self.refresh_bindings()

    def read_fields(self):
        values, error = super().read_fields()
        self.show_summary()
        return values, error

    def show_summary(self) -> None:
        """The options set on the closed page, in one line on the first page."""
        shown = [f"{f.label} {f.text.strip()}" for f in self.more_fields()
                 if f.display and f.text.strip()]
        line = self.query_one(".options-summary", Static)
        line.display = bool(shown)
        if shown:
            line.update("more options (^r): " + "; ".join(shown))
