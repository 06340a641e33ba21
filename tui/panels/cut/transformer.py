"""Quarter-wave transformer from catalog cables (``halftrip match``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.panels.cut.fields import frequency_field
from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import choice, text, whole_number
from tui.widgets.result_view import ResultView


class TransformerForm(CommandForm):
    """From and to impedances, frequency and band; the nearest catalog lines."""

    COMMAND = "match"
    PREFIX = "cut-match"
    LOG_KIND = "match"
    FLAGS = ("single-only", "include-balanced")

    def compose(self) -> ComposeResult:
        yield Field("cut-match-from", "from (source side)", kind="impedance")
        yield Field("cut-match-to", "to (load)", kind="impedance")
        yield frequency_field("cut-match-frequency")
        yield Field("cut-match-band", "band", reader=text, optional=True,
                    placeholder="optional, e.g. 144-148 MHz")
        yield Field("cut-match-limit", "candidates shown", reader=whole_number(1, 50, "6"),
                    optional=True, placeholder="6")
        yield Field("cut-match-single-only", "no pairs in parallel", reader=choice("no", "yes"),
                    value="no")
        yield Field("cut-match-include-balanced", "balanced lines too",
                    reader=choice("no", "yes"), value="no",
                    tooltip="twin-lead and twisted pair (needs a balun where it meets coax)")
        yield ResultView()
