"""Log panel: the day's jobs and their saved entries; tags, label and note, show in full,
reopen in its panel, export a report, delete with confirmation and undo.

Saving happens from the other panels (Ctrl+S, see :mod:`tui.panels.log.saving`);
this panel chooses the job they save into. Every change runs in a worker
thread, so a job log held busy by another halftrip never freezes the screen.
"""

from __future__ import annotations

KEY = "j"
ORDER = 6
TITLE = "Log"
DESCRIPTION = "the job log: jobs and saved entries, tags, reopen, export a report, undo a delete"


#: The widget, imported when the panel is first mounted (after the first frame).
PANEL = "tui.panels.log.panel:Panel"
