"""Widgets shared by the panels: the panel bar, live fields and results, the
warning line, the help screen. One widget per module."""
