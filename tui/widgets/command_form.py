"""A live form over a CLI command: the panel shows exactly what the command prints.

For jobs whose CLI command already parses many options and lays out a long
result (cut lists, transformer candidates, harnesses), the panel's fields
*are* the command's options: each field is named ``<prefix>-<option>``
(``cut-frequency`` is ``--frequency``), its text goes to the command's own
argument parser, and the command's ``compute(args) -> (data, lines, cables)``
(the part of ``run`` before printing) gives the lines shown. So the panel
and ``halftrip <command>`` cannot disagree, by construction: the same parse,
the same core call, the same formatting.

Subclasses set ``COMMAND`` (a module of :mod:`tui.commands`), ``PREFIX``
and ``FLAGS`` (options that take no value: a field reading ``yes`` adds
them), and compose their fields and a ResultView.
"""

from __future__ import annotations

from typing import ClassVar

from calc.errors import InputError
from tui.widgets.form import LiveForm

#: The key under which :meth:`CommandForm.read_fields` keeps the command line.
ARGV = "command line"


class _Refused(Exception):
    """argparse refused the options (raised instead of exiting)."""


def _parser(module):
    """The command's own argument parser, raising instead of exiting."""
    import argparse

    class Parser(argparse.ArgumentParser):
        def error(self, message: str):  # noqa: D401 - argparse API
            raise _Refused(message)

    parser = Parser(prog=f"halftrip {module.NAME}", add_help=False)
    module.add_arguments(parser)
    return parser


def _as_input_error(message: str) -> InputError:
    """``argument --kind: invalid choice: 'x' (choose from ...)`` -> InputError('--kind', ...)."""
    if message.startswith("argument "):
        flag, _, problem = message[len("argument "):].partition(": ")
        return InputError(flag.split("/")[0], problem)
    return InputError("options", message)


class CommandForm(LiveForm):
    """Fields are a command's options; the result is what the command prints."""

    COMMAND: ClassVar[str] = ""
    PREFIX: ClassVar[str] = ""
    FLAGS: ClassVar[tuple[str, ...]] = ()

    def argv(self) -> list[str]:
        """The command line the fields stand for (``--option=text`` each), without
        the unit options."""
        argv = []
        for f in self.fields():
            text = f.text.strip()
            if text:
                argv += self.option_args(f.field_name.removeprefix(self.PREFIX + "-"), text)
        return argv

    def option_args(self, option: str, text: str) -> list[str]:
        """The CLI options for field ``option`` holding ``text``; override for a
        field that stands for one of several options."""
        if option in self.FLAGS:
            return [f"--{option}"] if text.lower().startswith("y") else []
        return [f"--{option}={text}"]

    def read_fields(self):
        values, error = super().read_fields()
        if error is None:  # read here, on the UI thread, for a THREADED form
            values[ARGV] = self.argv()
        return values, error

    def compute(self, values):
        return self._run(values[ARGV])

    @property
    def command(self):
        """The module of :mod:`tui.commands` this form stands for."""
        import importlib

        return importlib.import_module(f"tui.commands.{self.COMMAND}")

    def options(self, argv: list[str]):
        """The command's parsed options for ``argv`` (in the shown unit system); a
        refusal by its parser is an InputError naming the option."""
        parser = getattr(type(self), "_parser_cache", None)
        if parser is None:
            parser = type(self)._parser_cache = _parser(self.command)
        units = [f"--units={self.units}", f"--fraction={self.fraction}"]
        try:
            return parser.parse_args(units + argv)
        except _Refused as exc:
            raise _as_input_error(str(exc)) from None

    def _run(self, argv: list[str]):
        data, lines, cables = self.command.compute(self.options(argv))
        return data, lines, tuple(c for c in cables if c is not None), argv

    def describe(self, result):
        return "\n".join(result[1])

    def hazards(self, result):
        return tuple(t for c in result[2] for t in c.hazards)

    def log_result(self, result) -> dict:
        return result[0]

    def _units_changed(self, _units) -> None:
        """The command formats lengths itself: run the last good options again in
        the new units (an out-of-date result stays marked so)."""
        if self.last_result is None:
            return
        view = self.result_view()
        stale = view.is_stale
        self.last_result = self._run(self.last_result[3])
        view.show_text(self.describe(self.last_result))
        if stale:
            view.mark_stale()
