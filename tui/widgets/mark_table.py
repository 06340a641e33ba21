"""A table of the numbered marks of a trace plot (arrivals, events), one row each."""

from __future__ import annotations

from rich.cells import cell_len
from textual.widgets import DataTable


class MarkTable(DataTable):
    """Rows whose first cell is the mark's number on the plot (also the row key)."""

    def __init__(self, columns: tuple[str, ...], id: str | None = None) -> None:
        super().__init__(id=id, cursor_type="row", zebra_stripes=False)
        self.columns_text = columns

    def on_mount(self) -> None:
        self.add_columns(*self.columns_text)

    def fill(self, rows: list[tuple[str, ...]], columns: tuple[str, ...] | None = None) -> None:
        """Replace the rows (and the columns, if given), keeping the highlighted
        number where it still exists. The columns are made anew each time, as wide
        as their widest cell: a DataTable's columns otherwise keep the width of the
        widest cell they ever held, and measure new rows only when idle (a
        screen drawn before that shows cut-off cells)."""
        keep = self.highlighted_key()
        self.clear(columns=True)
        if columns is not None:
            self.columns_text = columns
        for i, label in enumerate(self.columns_text):  # widths known now, not when idle
            self.add_column(label, width=max([cell_len(label)]
                                             + [cell_len(str(r[i])) for r in rows if i < len(r)]))
        for row in rows:
            self.add_row(*row, key=row[0])
        if keep is not None:
            self.highlight(keep)

    def highlighted_key(self) -> str | None:
        if not self.row_count:
            return None
        return self.coordinate_to_cell_key(self.cursor_coordinate).row_key.value

    def highlight(self, key: str) -> None:
        """Put the row cursor on row ``key`` if it is there."""
        keys = [r.key.value for r in self.ordered_rows]
        if key in keys:
            self.move_cursor(row=keys.index(key))
