"""The cut panel's widget (its constants are in :mod:`tui.panels.cut`)."""

from __future__ import annotations

from tui.panels.cut import MODES
from tui.widgets.modes import modes_panel

Panel = modes_panel("cut", MODES, "Five ways to get a length to cut, one mode each.")
