"""Phasing harness for N equal antennas fed in phase (``halftrip harness``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.panels.cut.fields import frequency_field
from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import choice, text, whole_number
from tui.widgets.result_view import ResultView


class HarnessForm(CommandForm):
    """Antennas, impedances, frequency, where they are; the cut list."""

    COMMAND = "harness"
    PREFIX = "cut-harness"
    LOG_KIND = "harness"
    FLAGS = ("single-only", "include-balanced")

    def compose(self) -> ComposeResult:
        yield Field("cut-harness-antennas", "antennas", reader=whole_number(2, 32, "4"))
        yield Field("cut-harness-antenna-z", "each antenna's Z", kind="impedance")
        yield Field("cut-harness-feed-z", "feed line Z", kind="impedance")
        yield frequency_field("cut-harness-frequency")
        yield Field("cut-harness-span", "antenna spacing", kind="length", optional=True,
                    placeholder="in a line, junction at the centre")
        yield Field("cut-harness-arm-reach", "or: arm reach", kind="length", optional=True,
                    placeholder="junction to the farthest antenna")
        yield Field("cut-harness-topology", "arms", reader=choice("quarter", "half"),
                    value="quarter", tooltip="quarter: every arm a transformer; half: "
                                             "half-wave arms, then one transformer")
        yield Field("cut-harness-allowance", "connector allowance", kind="length_or_zero",
                    optional=True, placeholder="per end, e.g. 15 mm")
        yield Field("cut-harness-slack", "slack", kind="length_or_zero", optional=True,
                    placeholder="optional, e.g. 0.2 m")
        yield Field("cut-harness-cut-tolerance", "cut within +/-", kind="length_or_zero",
                    optional=True, placeholder="2 mm")
        yield Field("cut-harness-cable", "arm cable", reader=text, optional=True,
                    placeholder="default: the nearest in the catalog")
        yield Field("cut-harness-transformer-cable", "transformer cable", reader=text,
                    optional=True, placeholder="half-wave arms only")
        yield Field("cut-harness-band", "band", reader=text, optional=True,
                    placeholder="optional, e.g. 144-148 MHz")
        yield ResultView()
