"""Safety panel: the cautions for work on lines that may be energized, with the
published rules to consult. Also shows the first-start notice (see
:func:`on_app_start`)."""

from __future__ import annotations

KEY = "s"
ORDER = 7
TITLE = "Safety"
DESCRIPTION = "cautions for lines that may be energized, and the published rules to consult"


def on_app_start(app) -> None:
    """Show the first-start notice unless this caution text was acknowledged."""
    from tui.panels.safety.notice import show_notice_if_needed

    show_notice_if_needed(app)


#: The widget, imported when the panel is first mounted (after the first frame).
PANEL = "tui.panels.safety.panel:Panel"
