"""The help screen: every key, built from the same binding tables the footer
and the command palette use, so it cannot drift from what the keys do."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

#: Keys every text field and list understands, with no binding table of their
#: own to read them from (Textual's focus chain).
MOVING_AROUND = [
    ("Tab / Shift+Tab", "next / previous field"),
    ("Escape", "leave the field for the panel bar; close this screen or a dialog"),
    ("Ctrl+P", "command palette: every panel and command by name"),
]


def _key_label(app, key: str) -> str:
    if key[:1] == "f" and key[1:].isdigit():
        return key.upper()
    return app.get_key_display(Binding(key, ""))


def _keys_text(app, binding: Binding) -> str:
    keys = [k.strip() for k in binding.key.split(",") if k.strip()]
    return " / ".join(_key_label(app, k) for k in keys)


def _bindings_of(cls) -> list[Binding]:
    """A widget class's own bindings, base classes first (public BINDINGS)."""
    out: list[Binding] = []
    for base in reversed(cls.__mro__):
        for b in base.__dict__.get("BINDINGS", []):
            out.append(b if isinstance(b, Binding) else Binding(*b))
    return out


def key_table(app) -> list[tuple[str, list[tuple[str, str]]]]:
    """(section title, [(keys, what they do)]) for the help screen."""
    sections: list[tuple[str, list[tuple[str, str]]]] = []
    anywhere, actions = [], set()
    mro = type(app).__mro__
    ours = [c for c in reversed(mro) if c.__module__.startswith("tui.")]
    textual_own = [c for c in mro if not c.__module__.startswith("tui.")]
    for cls in ours + textual_own:  # ours in the order written, Textual's defaults after
        for b in cls.__dict__.get("BINDINGS", []):
            b = b if isinstance(b, Binding) else Binding(*b)
            if b.description and b.action not in actions:
                actions.add(b.action)
                anywhere.append((_keys_text(app, b), b.description))
    sections.append(("Anywhere (letters only when the cursor is not in a field)", anywhere))
    sections.append(("Moving around", MOVING_AROUND))
    seen: set[type] = {type(app)}
    widget_classes = []
    for spec in app.PANELS:
        widget_classes.append((spec.title, spec.panel_class()))
    for node in app.screen.walk_children():
        widget_classes.append((None, type(node)))
    for title, cls in widget_classes:
        if cls in seen:
            continue
        seen.add(cls)
        rows = [(_keys_text(app, b), b.description) for b in _bindings_of(cls)
                if b.description]
        if rows:
            name = title or getattr(cls, "HELP_TITLE", None) or cls.__name__
            sections.append((name, rows))
    return sections


class HelpScreen(ModalScreen[None]):
    """Every key of halftrip. Escape, F1 or q closes it."""

    BINDINGS = [Binding("escape,f1,q,question_mark", "dismiss", "Close help", id="help.close")]

    def __init__(self, sections: list[tuple[str, list[tuple[str, str]]]]) -> None:
        super().__init__()
        self.sections = sections

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="help-body"):
            yield Static("Keys", classes="help-title")
            for title, rows in self.sections:
                yield Static(title, classes="help-section")
                width = max(len(k) for k, _ in rows)
                text = "\n".join(f"  {k:<{width}}  {what}" for k, what in rows)
                yield Static(text, classes="help-rows", markup=False)
            yield Static("Escape, F1 or q closes this screen.", classes="help-foot")

    def action_dismiss(self, result=None) -> None:
        self.dismiss(None)
