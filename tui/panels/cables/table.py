"""The catalog as a table, filtered by the words typed."""

from __future__ import annotations

from textual.widgets import DataTable

from tui import fmt

#: (heading, width): fixed widths fit 80 columns and keep the layout steady.
COLUMNS = (("id", 18), ("kind", 12), ("Z0", 4), ("VF", 5), ("+/-", 3), ("!", 1),
           ("description", 60))


def matches(cable, words: list[str]) -> bool:
    """Every word appears in the cable's id, description, category, Z0 or hazards."""
    hay = " ".join((cable.id, cable.description, cable.category, cable.origin,
                    f"{cable.z0_ohm:g} ohm", f"{cable.z0_ohm:g}ohm", *cable.hazards)).lower()
    return all(w in hay for w in words)


class CableTable(DataTable):
    """One row per cable; ``!`` marks cables that may be energized."""

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, cursor_type="row", zebra_stripes=False)

    def on_mount(self) -> None:
        for heading, width in COLUMNS:
            self.add_column(heading, width=width)

    def fill(self, catalog, filter_text: str) -> None:
        keep = self.selected_key()
        self.clear()
        words = filter_text.lower().replace(" ohm", "ohm").split()
        for c in catalog.by_category():
            if matches(c, words):
                self.add_row(c.id, c.category, fmt.impedance(c.z0_ohm, 3).replace(" ohm", ""),
                             f"{c.vf:.3f}", f"{c.vf_tolerance * 100:.0f}%",
                             "!" if c.hazards else "", c.description, key=c.id)
        if keep is not None:
            self.select(keep)
        self.border_title = f"{self.row_count} of {len(catalog.cables)} cables"

    def selected_key(self) -> str | None:
        if not self.row_count:
            return None
        return self.coordinate_to_cell_key(self.cursor_coordinate).row_key.value

    def selected_cable(self, catalog):
        key = self.selected_key()
        return catalog.cables.get(key) if catalog is not None and key else None

    def select(self, cable_id: str) -> None:
        try:
            self.move_cursor(row=self.get_row_index(cable_id))
        except Exception:  # RowDoesNotExist: the cable is filtered out
            return
