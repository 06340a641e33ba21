"""One module per CLI command (``halftrip <command>``).

Each module defines ``NAME`` (the command word, or a tuple of words),
``HELP`` (one line), ``add_arguments(parser)`` and ``run(args) -> int``.
:mod:`tui.cli` finds them by listing this package, so adding a command is
adding a module. Modules import the core lazily inside ``run`` so that
``halftrip --help`` and the TUI start fast.
"""
