"""A trace result: a status line, the trace plot and the table of its marks.

The Echo panel's whole-run prediction and the Trace panel's recording both
show this way. It takes the place of a :class:`~tui.widgets.result_view.ResultView`
in a :class:`~tui.widgets.form.LiveForm` (same methods: ``show``, ``show_text``,
``mark_stale``, ``waiting``, ``is_stale``), so the form's fresh, waiting and
out-of-date states reach all three parts; out of date is said in words in
the status line and on the plot, not only by colour. Moving the plot's
cursor onto a mark highlights its row; Enter on a row puts the cursor on
its mark; the highlighted row's full text (a bounce path, an event's
description) shows under the table.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widgets import DataTable, Static

from tui.widgets.mark_table import MarkTable
from tui.widgets.trace_plot import PlotData, TracePlot


@dataclass(frozen=True, eq=False)
class TraceShown:
    """What :meth:`TraceView.show` draws (built by a form's ``describe``)."""

    status: str
    plot: PlotData
    rows: list[tuple[str, ...]]
    details: dict[str, str] = field(default_factory=dict)  # row key -> the line under the table
    columns: tuple[str, ...] | None = None  # the table's columns, when they change


class TraceView(Vertical):
    """Status line, trace plot and mark table of one trace (styles in halftrip.tcss)."""

    def __init__(self, columns: tuple[str, ...], *, empty_text: str = "no trace yet",
                 id: str | None = None) -> None:
        super().__init__(id=id)
        self.columns = columns
        self.empty_text = empty_text

    def compose(self) -> ComposeResult:
        yield Static("", classes="trace-status", markup=False)
        yield TracePlot(empty_text=self.empty_text)
        yield MarkTable(self.columns)
        yield Static("", classes="trace-detail", markup=False)

    @property
    def plot(self) -> TracePlot:
        return self.query_one(TracePlot)

    @property
    def table(self) -> MarkTable:
        return self.query_one(MarkTable)

    @property
    def status(self) -> Static:
        return self.query_one(".trace-status", Static)

    def show(self, shown: TraceShown) -> None:
        self.remove_class("-stale", "-waiting")
        self.show_text(shown)

    def show_text(self, shown: TraceShown) -> None:
        """Draw ``shown`` (ResultView's name for redrawing what is shown)."""
        self.shown = shown
        self.status.update(shown.status)
        self.plot.stale = False
        self.plot.show(shown.plot)
        self.table.fill(shown.rows, shown.columns)
        self._show_detail(self.table.highlighted_key())

    def _show_detail(self, key: str | None) -> None:
        shown = getattr(self, "shown", None)
        text = shown.details.get(key, "") if shown is not None and key is not None else ""
        self.query_one(".trace-detail", Static).update(text)

    def mark_stale(self, reason: str | None = None) -> None:
        if self.has_class("-waiting"):
            return
        self.add_class("-stale")
        self.plot.stale = True
        self.status.update("out of date: last good result shown"
                           + (f" ({reason})" if reason else "; fix the field marked with an error"))

    def waiting(self, text: str) -> None:
        self.add_class("-waiting")
        self.status.update(text)

    @property
    def is_stale(self) -> bool:
        return self.has_class("-stale")

    # -- plot and table follow each other -----------------------------------
    def on_trace_plot_cursor_moved(self, event: TracePlot.CursorMoved) -> None:
        if event.mark is not None:
            self.table.highlight(event.mark.label)

    def on_data_table_row_highlighted(self, event: DataTable.RowHighlighted) -> None:
        self._show_detail(event.row_key.value)

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        key = event.row_key.value
        data = self.plot.data
        mark = next((m for m in data.marks if m.label == key), None) if data else None
        if mark is not None:
            self.plot.cursor_to_time(mark.time_s)
