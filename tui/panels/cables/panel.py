"""The cables panel's widget (its constants are in :mod:`tui.panels.cables`)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Input

from tui.widgets import readers
from tui.widgets.field import Field
from tui.widgets.warning_line import WarningLine


class Panel(Vertical):
    """The catalog table with a filter, the chosen cable in full below it."""

    BINDINGS = [
        Binding("ctrl+n,a", "new_cable", "New cable", id="cables.new"),
        Binding("m", "measured_vf", "Save measured VF", id="cables.measured"),
        Binding("n", "copy_cable", "Copy as new", id="cables.copy"),
    ]

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, classes="panel")

    def compose(self) -> ComposeResult:
        from tui.panels.cables.detail import CableDetail
        from tui.panels.cables.table import CableTable

        yield WarningLine()
        yield Field("cables-filter", "Filter", reader=readers.text, placeholder="id, words, 75 ohm, poe...",
                    tooltip="Shows cables whose id, description, category, impedance or "
                            "hazard tags contain every word typed")
        yield CableTable(id="cables-table")
        yield CableDetail(id="cables-detail")

    def on_mount(self) -> None:
        self.watch(self.app, "core_ready", self._refill)

    def _refill(self, ready: bool = True) -> None:
        table = self.query_one("#cables-table")
        if self.app.catalog is None:
            return
        table.fill(self.app.catalog, self.query_one(Field).text)

    def on_input_changed(self, event: Input.Changed) -> None:
        event.stop()
        self._refill()

    def on_data_table_row_highlighted(self, event) -> None:
        cable = self.selected()
        self.query_one("#cables-detail").show(cable, self.app.catalog)
        self.query_one(WarningLine).set_hazards(cable.hazards if cable else ())

    def selected(self):
        return self.query_one("#cables-table").selected_cable(self.app.catalog)

    def action_new_cable(self) -> None:
        self._edit(None, measured=False)

    def action_copy_cable(self) -> None:
        self._edit(self.selected(), measured=False)

    def action_measured_vf(self) -> None:
        self._edit(self.selected(), measured=True)

    def _edit(self, base, measured: bool) -> None:
        from tui.panels.cables.editor import CableEditor

        if self.app.catalog is None:
            return

        def saved(cable_id: str | None) -> None:
            if cable_id:
                self.app.reload_catalog()
                self._refill()
                self.query_one("#cables-table").select(cable_id)
                self.app.notify(f"Saved {cable_id} to your cable file")

        self.app.push_screen(CableEditor(self.app.catalog, base, measured), saved)
