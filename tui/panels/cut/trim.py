"""How much to cut off a piece cut long (``halftrip trim``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.panels.cut.fields import frequency_field
from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import delay_or_resonance
from tui.widgets.result_view import ResultView


class TrimForm(CommandForm):
    """Target, the piece's length now and what was measured on it."""

    COMMAND = "trim"
    PREFIX = "cut-trim"
    LOG_KIND = "trim"

    def compose(self) -> ComposeResult:
        yield frequency_field("cut-trim-frequency")
        yield Field("cut-trim-degrees", "target length", kind="angle",
                    placeholder="e.g. 90 or 0.25 wl")
        yield Field("cut-trim-length", "piece length now", kind="length",
                    placeholder="as measured, e.g. 400 mm")
        yield Field("cut-trim-measured", "measured", reader=delay_or_resonance,
                    placeholder="round-trip delay 3.7 ns, or first resonance 131 MHz")
        yield ResultView()

    def option_args(self, option: str, text: str) -> list[str]:
        if option == "measured":
            kind, _value = delay_or_resonance(text, "measured")
            return [f"--measured-{kind}={text}"]
        return super().option_args(option, text)
