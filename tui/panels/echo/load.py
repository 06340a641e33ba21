"""What a load reflects (``halftrip echo --load``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import text
from tui.widgets.result_view import ResultView


class LoadForm(CommandForm):
    """Line impedance and the load; optionally seen through a line at a frequency."""

    COMMAND = "echo"
    PREFIX = "echo-load"
    LOG_KIND = "echo"

    def compose(self) -> ComposeResult:
        yield Field("echo-load-z0", "line Z0", kind="impedance")
        yield Field("echo-load-load", "load", reader=text,
                    placeholder="open, short, 75 ohm, 10 pF, 75 ohm || 10 pF, cable:rg59")
        yield Field("echo-load-frequency", "frequency", kind="frequency", optional=True,
                    placeholder="for a complex load or a line in front")
        yield Field("echo-load-through", "seen through", reader=text, optional=True,
                    placeholder="a length (3 m) or a run (10 m:rg58)")
        yield Field("echo-load-vf", "VF of that length", kind="vf", optional=True,
                    placeholder="with a bare length, e.g. 0.66")
        yield ResultView()
