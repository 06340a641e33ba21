"""The locate panel's widget (its constants are in :mod:`tui.panels.locate`)."""

from __future__ import annotations

from tui.panels.locate import MODES
from tui.widgets.modes import modes_panel

Panel = modes_panel("locate", MODES, "Four ways to place an event, one mode each.")
