"""Cut length for an electrical length (``halftrip cut``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.panels.cut.fields import cable_field, electrical_options, frequency_field, velocity_options
from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import angle_or_length, choice
from tui.widgets.result_view import ResultView


class CutLengthForm(CommandForm):
    """Frequency, electrical length (or a piece's length), cable, allowances, span."""

    COMMAND = "cut"
    PREFIX = "cut-len"
    LOG_KIND = "cut"

    def compose(self) -> ComposeResult:
        yield frequency_field("cut-len-frequency")
        yield Field("cut-len-degrees", "electrical length", reader=angle_or_length,
                    placeholder="90, 0.25 wl; or a piece, 339 mm")
        yield cable_field(self, "cut-len-cable")
        yield Field("cut-len-allowance", "connector allowance", kind="length_or_zero",
                    optional=True, placeholder="per end, e.g. 15 mm")
        yield Field("cut-len-span", "span to reach", kind="length", optional=True,
                    placeholder="optional, e.g. 2.5 m")
        yield Field("cut-len-kind", "line across span", optional=True,
                    reader=choice("transformer", "repeater", "delay"),
                    placeholder="transformer, repeater or delay")
        yield Field("cut-len-slack", "slack beyond span", kind="length_or_zero", optional=True,
                    placeholder="optional, e.g. 0.3 m")
        yield ResultView()

    def option_args(self, option: str, text: str) -> list[str]:
        if option == "degrees":
            return electrical_options(text)
        if option == "cable":
            return velocity_options(self, text)
        if option == "kind":
            return [f"--kind={choice('transformer', 'repeater', 'delay')(text, 'kind')}"]
        return super().option_args(option, text)
