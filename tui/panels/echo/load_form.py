"""The Load mode: what one load sends back on a line of Z0, optionally read
through a run of cables (``halftrip echo --load``)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.command_form import CommandForm
from tui.widgets.field import Field
from tui.widgets.readers import as_text, load_reader, run_reader
from tui.widgets.result_view import ResultView


class LoadForm(CommandForm):
    """Z0, the load, an optional frequency and run to read it through."""

    COMMAND = "echo"
    PREFIX = "echo-load"
    LOG_KIND = "echo"

    def compose(self) -> ComposeResult:
        catalog = (lambda: self.app.catalog)  # noqa: E731
        yield Field("echo-load-z0", "line Z0", kind="impedance", value="50 ohm")
        yield Field("echo-load-load", "load", reader=as_text(load_reader(catalog)),
                    value="open", placeholder="open, 75 ohm, 10 pF, 75 ohm || 10 pF")
        yield Field("echo-load-frequency", "frequency", kind="frequency", optional=True,
                    placeholder="optional, e.g. 100 MHz")
        yield Field("echo-load-through", "through run", reader=as_text(run_reader(catalog)),
                    optional=True, placeholder="optional: read it at the near end of a run")
        yield ResultView()
