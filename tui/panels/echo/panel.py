"""The echo panel's widget (its constants are in :mod:`tui.panels.echo`)."""

from __future__ import annotations

from tui.panels.echo import MODES
from tui.widgets.modes import modes_panel

Panel = modes_panel("echo", MODES, "The three echo forms, one mode each, with the caution line above them.")
