"""The Load tab: what one load sends back on a line of Z0, optionally read
through a run of cables (the reference moved to its near end)."""

from __future__ import annotations

from textual.app import ComposeResult

from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.readers import as_text, load_reader, run_reader
from tui.widgets.result_view import ResultView

LOAD_PLACEHOLDER = "open, 75 ohm, 10 pF, 75 ohm || 10 pF"


class LoadForm(LiveForm):
    """Z0, the load, an optional frequency and run in; ``halftrip echo --load`` out."""

    ERROR_FIELDS = {"--z0": "echo-load-z0", "--load": "echo-load-spec",
                    "--frequency": "echo-load-frequency", "--through": "echo-load-through"}

    def compose(self) -> ComposeResult:
        catalog = (lambda: self.app.catalog)  # noqa: E731
        yield Field("echo-load-z0", "line Z0", kind="impedance", value="50 ohm")
        yield Field("echo-load-spec", "load", reader=as_text(load_reader(catalog)),
                    value="open", placeholder=LOAD_PLACEHOLDER)
        yield Field("echo-load-frequency", "frequency", kind="frequency", optional=True,
                    placeholder="optional, e.g. 100 MHz")
        yield Field("echo-load-through", "through run", reader=as_text(run_reader(catalog)),
                    optional=True, placeholder="optional: read it at the near end of a run")
        yield ResultView(id="echo-load-result")

    def compute(self, values):
        from tui.commands import echo
        from tui.panels._cli import cli_options

        f = self.field("echo-load-frequency").text.strip() or None
        through = values["echo-load-through"]
        ns = cli_options(echo, z0=self.field("echo-load-z0").text, load=values["echo-load-spec"],
                         frequency=f, through=through)
        _data, lines = echo.report(ns)
        return through, lines

    def hazards(self, result) -> tuple[str, ...]:
        from calc.run import parse_run

        through, _lines = result
        run = parse_run(through, self.catalog.get, "through") if through else ()
        return tuple(tag for s in run for tag in s.cable.hazards)

    def describe(self, result) -> str:
        return "\n".join(result[1])
