"""Locate panel: where is the reflection? One cable, a run of cables, a cable
read from both ends, and measuring a cable's velocity factor."""

from __future__ import annotations

KEY = "l"
ORDER = 1
TITLE = "Locate"
DESCRIPTION = "round-trip delay to distance: one cable, a run, both ends; measure a VF"
LOG_KINDS = ("locate", "locate-run", "locate-two-ended", "calibrate")
#: An invented job: a roof feeder of the (invented) Marsh Lane relay site.
DEMO = {
    "locate-one-delay": "312 ns",
    "locate-one-cable": "rg213",
    "locate-one-rise-time": "2 ns",
    "locate-run-run": "1.5 m:rg58, 28 m:hardline-50-half, 2 m:rg58",
    "locate-run-delay": "131 ns",
    "locate-ends-from-a": "1.10 us",
    "locate-ends-from-b": "0.775 us",
    "locate-ends-length": "250 m",
    "locate-ends-cable": "hardline-50-7-8",
    "locate-vf-length": "10 m",
    "locate-vf-reading": "101.5 ns",
}

MODES = [
    ("one", "One cable", "tui.panels.locate.one_cable:OneCableForm"),
    ("run", "Run of cables", "tui.panels.locate.run:RunForm"),
    ("ends", "Both ends", "tui.panels.locate.both_ends:BothEndsForm"),
    ("vf", "Measure VF", "tui.panels.locate.measure:MeasureForm"),
]


#: The widget, imported when the panel is first mounted (after the first frame).
PANEL = "tui.panels.locate.panel:Panel"
