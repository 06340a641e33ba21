"""Open or shorted stub lengths (``halftrip stub``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.panels.cut.fields import cable_field, frequency_field, velocity_options
from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import choice, text
from tui.widgets.result_view import ResultView


class StubForm(CommandForm):
    """Frequency, line, how the far end is left, what the input must look like."""

    COMMAND = "stub"
    PREFIX = "cut-stub"
    LOG_KIND = "stub"

    def compose(self) -> ComposeResult:
        yield frequency_field("cut-stub-frequency")
        yield cable_field(self, "cut-stub-cable")
        yield Field("cut-stub-end", "far end", reader=choice("open", "short"), value="open")
        yield Field("cut-stub-present", "input must look", reader=text,
                    placeholder="short, open, or j25 ohm / -j40 ohm")
        yield Field("cut-stub-z0", "line Z0", kind="impedance", optional=True,
                    placeholder="default: the cable's")
        yield Field("cut-stub-allowance", "connector allowance", kind="length_or_zero",
                    optional=True, placeholder="input end, e.g. 15 mm")
        yield ResultView()

    def option_args(self, option: str, text: str) -> list[str]:
        if option == "cable":
            return velocity_options(self, text)
        if option == "end":
            return [f"--end={choice('open', 'short')(text, 'far end')}"]
        return super().option_args(option, text)
