"""Cables panel: browse and filter the catalog, read each entry's source and
hazard tags, add a cable of your own or save a measured velocity factor."""

from __future__ import annotations

KEY = "c"
ORDER = 5
TITLE = "Cables"
DESCRIPTION = "the cable catalog: filter, sources, hazards; add your own cable or a measured VF"

DEMO = {"cables-filter": "50 ohm"}


#: The widget, imported when the panel is first mounted (after the first frame).
PANEL = "tui.panels.cables.panel:Panel"
