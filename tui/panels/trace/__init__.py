"""Trace panel: open a recorded trace (delimited text or a Touchstone .s1p
sweep), see its events found, placed and named on the plot and in a table,
and compare them with the run and load the line should have.

The numbers come from the same core calls as ``halftrip trace``
(:func:`tui.commands.trace.analyse_file`).
"""

from __future__ import annotations

from pathlib import Path

KEY = "t"
ORDER = 4
TITLE = "Trace"
DESCRIPTION = "open a recorded trace or .s1p sweep: its events placed, named and compared"

#: The demo traces (invented sites, made by halftrip's own predictor plus noise;
#: see tui/demo/traces.py) ship in this folder.
DEMO_DIR = Path(__file__).resolve().parent.parent.parent / "demo"

DEMO = {
    "trace-file": str(DEMO_DIR / "kestrel-ridge-feeder.csv"),
    "trace-on": "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58",
    "trace-expect-load": "50 ohm",
}


#: The widget, imported when the panel is first mounted (after the first frame).
PANEL = "tui.panels.trace.panel:Panel"
