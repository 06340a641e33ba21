"""Echo panel: the whole run's predicted trace with its arrivals, what one load
sends back, and the load an observed step implies.

One mode each, every one a live form over the CLI command that does the same
job (``halftrip simulate``, ``halftrip echo --load``, ``halftrip echo
--observed-step``): the fields are the command's options and the numbers
are the command's own.
"""

from __future__ import annotations

KEY = "e"
ORDER = 3
TITLE = "Echo"
DESCRIPTION = "a whole run's predicted trace, what a load returns, the load a step implies"
LOG_KINDS = ("simulate", "echo")
#: An invented job (see tui/demo/traces.py): the Kestrel Ridge relay hut feeder.
DEMO = {
    "echo-run-run": "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
    "echo-run-load": "open",
    "echo-run-edge": "rise 0.5 ns",
    "echo-load-load": "75 ohm || 10 pF",
    "echo-load-frequency": "100 MHz",
    "echo-step-observed-step": "-0.33",
}

MODES = [
    ("run", "Whole run", "tui.panels.echo.run_form:RunForm"),
    ("load", "Load", "tui.panels.echo.load_form:LoadForm"),
    ("step", "From a step", "tui.panels.echo.step_form:StepForm"),
]


#: The widget, imported when the panel is first mounted (after the first frame).
PANEL = "tui.panels.echo.panel:Panel"
