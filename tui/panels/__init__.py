"""The terminal interface's panels, one module per part of the job.

Contract (shared by everyone who adds a panel; the app finds panels by
listing this package, so adding a panel is adding a module):

* ``tui/panels/<name>.py`` defines ``KEY`` (the single key that opens it from
  anywhere), ``TITLE`` (its name on screen), ``ORDER`` (its place in the panel
  bar) and ``Panel``, a Textual widget class that composes the panel.
* A panel computes nothing itself: it parses its fields with ``calc.parse``,
  calls the core, and formats with ``tui.fmt``, exactly as the CLI command
  for the same job does.
"""
