"""The open job's entries as a table, narrowed by the filter words."""

from __future__ import annotations

from textual.widgets import DataTable

COLUMNS = ("#", "time", "kind", "label", "tags", "result")


def matches(entry, words: list[str], known_tags: set[str]) -> bool:
    """A word that is a tag in use must be one of the entry's tags; every other word
    must appear in its label (case ignored)."""
    label = entry.label.lower()
    for w in words:
        if w in known_tags:
            if w not in entry.tags:
                return False
        elif w not in label:
            return False
    return True


class EntryTable(DataTable):
    """One row per entry, oldest first; the row key is the entry id."""

    def __init__(self, id: str | None = None) -> None:
        super().__init__(id=id, cursor_type="row", zebra_stripes=False)

    def on_mount(self) -> None:
        self.add_columns(*COLUMNS)

    def fill(self, entries, filter_text: str, units: str, fraction: int) -> None:
        from tui.joblog.export import summary

        keep = self.selected_id()
        self.clear()
        words = filter_text.lower().split()
        known = {t for e in entries for t in e.tags}
        shown = [e for e in entries if matches(e, words, known)]
        for e in shown:
            self.add_row(str(e.id), e.created_at[11:16], e.kind, e.label, " ".join(e.tags),
                         summary(e, units, fraction), key=str(e.id))
        if keep is not None:
            self.select(keep)
        self.border_title = f"{len(shown)} of {len(entries)} entries"

    def selected_id(self) -> int | None:
        if not self.row_count:
            return None
        return int(self.coordinate_to_cell_key(self.cursor_coordinate).row_key.value)

    def select(self, entry_id: int) -> None:
        from textual.widgets.data_table import RowDoesNotExist

        try:
            self.move_cursor(row=self.get_row_index(str(entry_id)))
        except RowDoesNotExist:  # filtered out or gone
            return
