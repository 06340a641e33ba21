"""The dialog that picks a trace file: the demo traces, or any file in the folders."""

from __future__ import annotations

from pathlib import Path

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import DirectoryTree, OptionList, Static
from textual.widgets.option_list import Option

#: File endings offered in the folder tree (anything can still be typed in the field).
TRACE_SUFFIXES = (".csv", ".txt", ".tsv", ".dat", ".s1p")


class TraceTree(DirectoryTree):
    """A folder tree that lists folders and trace-like files only."""

    def filter_paths(self, paths):
        return [p for p in paths if not p.name.startswith(".")
                and (p.is_dir() or p.suffix.lower() in TRACE_SUFFIXES)]


class FilePicker(ModalScreen[str | None]):
    """Dismisses with the chosen file's path, or None (Escape)."""

    BINDINGS = [Binding("escape", "cancel", "Cancel", id="picker.cancel")]

    def __init__(self, demo_dir: Path, current: str = "") -> None:
        super().__init__()
        self.demo_dir = Path(demo_dir)
        here = Path(current).expanduser().parent if current.strip() else Path.cwd()
        self.start = here if here.is_dir() else Path.cwd()

    def demo_files(self) -> list[Path]:
        if not self.demo_dir.is_dir():
            return []
        return sorted(p for p in self.demo_dir.iterdir() if p.suffix.lower() in TRACE_SUFFIXES)

    def compose(self) -> ComposeResult:
        with Vertical(id="picker-body") as body:
            body.border_title = "Open a trace"
            yield Static("Demo traces (invented sites, made by halftrip's predictor):",
                         classes="panel-intro")
            demos = self.demo_files()
            yield OptionList(*[Option(p.name, id=str(p)) for p in demos] or
                             [Option("(no demo traces found)", disabled=True)],
                             id="picker-demos")
            yield Static(f"Or a file under {self.start}  (Tab moves here; Enter opens):",
                         classes="panel-intro", markup=False)
            yield TraceTree(self.start, id="picker-tree")
            yield Static("Enter picks, Escape cancels.", classes="panel-intro")

    def on_mount(self) -> None:
        # The app does not auto-focus (its panel bar would take the keys), so the
        # dialog puts the keyboard on the demo list itself.
        self.query_one("#picker-demos", OptionList).focus()

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        if event.option.id:
            self.dismiss(event.option.id)

    def on_directory_tree_file_selected(self, event: DirectoryTree.FileSelected) -> None:
        self.dismiss(str(event.path))

    def action_cancel(self) -> None:
        self.dismiss(None)
