"""A live form: fields in, one result out, recomputed on every keystroke.

Subclasses compose their :class:`~tui.widgets.field.Field` widgets (and a
:class:`~tui.widgets.result_view.ResultView` with :meth:`result_view`),
and implement

* ``compute(values) -> result``: call the core with the parsed field values
  (a dict, field name -> value) and return its result object;
* ``describe(result) -> str | Content``: format it with ``tui.fmt`` in
  ``self.units`` / ``self.fraction``;
* optionally ``hazards(result) -> tags`` for the panel's warning line;
* optionally ``THREADED = True`` to run ``compute`` in a worker thread (one
  at a time; a result overtaken by a newer keystroke is dropped), and
  ``ERROR_FIELDS`` to map the core's names for a quantity to a field;
* optionally ``result_view()`` returning another widget with ResultView's
  ``show``, ``mark_stale``, ``waiting``, ``show_text`` and ``is_stale``.

The form does the rest: it parses every field on each change, shows each
error beside its field, keeps the last good result on screen marked out of
date while any field is bad, maps an error the core raises to the field it
names, waits for the start-up worker (pint, catalog) before computing, and
redraws the last result when the unit system changes.
"""

from __future__ import annotations

from typing import ClassVar

from textual import work
from textual.containers import Vertical
from textual.widgets import Input
from textual.worker import get_current_worker

from calc.errors import InputError
from tui.widgets.field import Field, error_beside
from tui.widgets.result_view import ResultView

WAITING_TEXT = "loading unit tables and the cable catalog..."


class LiveForm(Vertical):
    """Base of every live calculation form (see the module docstring)."""

    DEFAULT_CSS = """
    LiveForm { height: auto; }
    """

    #: Compute in a worker thread (for slow cores); the result is shown when it comes.
    THREADED: ClassVar[bool] = False
    #: The core's names for a quantity (``"--load"``) -> the field name that holds it.
    ERROR_FIELDS: ClassVar[dict[str, str]] = {}

    def __init__(self, *, id: str | None = None, classes: str | None = None) -> None:
        super().__init__(id=id, classes=classes)
        self.last_result = None
        self.last_error: InputError | None = None
        self._hazards: tuple[str, ...] = ()

    # -- for subclasses ---------------------------------------------------
    def compute(self, values: dict[str, object]):
        raise NotImplementedError

    def describe(self, result):
        raise NotImplementedError

    def hazards(self, result) -> tuple[str, ...]:
        return ()

    # -- state the subclasses read -----------------------------------------
    @property
    def units(self) -> str:
        return self.app.unit_system[0]

    @property
    def fraction(self) -> int:
        return self.app.unit_system[1]

    @property
    def catalog(self):
        return self.app.catalog

    def fields(self) -> list[Field]:
        return list(self.query(Field))

    def field(self, name: str) -> Field:
        return next(f for f in self.query(Field) if f.field_name == name)

    def result_view(self) -> ResultView:
        return self.query_one(ResultView)

    # -- the live loop -----------------------------------------------------
    def on_mount(self) -> None:
        self.watch(self.app, "core_ready", self._core_ready_changed)
        self.watch(self.app, "unit_system", self._units_changed, init=False)
        from textual.widgets import ContentSwitcher

        modes = next((a for a in self.ancestors if isinstance(a, ContentSwitcher)), None)
        if modes is not None:  # the panel's warning line follows the mode shown
            self.watch(modes, "current", lambda _now: self._set_hazards(), init=False)

    def _core_ready_changed(self, ready: bool) -> None:
        if ready:
            self.recompute()
        else:
            self.result_view().waiting(WAITING_TEXT)

    def _units_changed(self, _units) -> None:
        if self.last_result is not None:
            view = self.result_view()
            stale = view.is_stale
            view.show_text(self.describe(self.last_result))
            if stale:
                view.mark_stale(error_beside(self.last_error) if self.last_error else None)

    def on_input_changed(self, event: Input.Changed) -> None:
        event.stop()
        self.recompute()

    def recompute(self) -> None:
        """Parse every field, call the core, show the result or the errors."""
        if not self.app.core_ready:
            return
        values, error = self.read_fields()
        if error is not None:
            self.finish(error=error)
        elif self.THREADED:
            self._compute_in_thread(values)
        else:
            try:
                result = self.compute(values)
            except InputError as exc:
                self.finish(error=exc)
            else:
                self.finish(result)

    def read_fields(self) -> tuple[dict[str, object], InputError | None]:
        """Every field's value, each error shown beside its field; (values, first error)."""
        values: dict[str, object] = {}
        first_error: InputError | None = None
        for f in self.fields():
            try:
                values[f.field_name] = f.read()
                f.show_error(None)
            except InputError as exc:
                f.show_error(exc)
                first_error = first_error or exc
        return values, first_error

    @work(thread=True, exclusive=True, group="live-form")
    def _compute_in_thread(self, values: dict[str, object]) -> None:
        """``compute`` off the UI thread (``THREADED`` forms); a result overtaken by a
        newer keystroke is dropped."""
        worker = get_current_worker()
        try:
            result, error = self.compute(values), None
        except InputError as exc:
            result, error = None, exc
        if not worker.is_cancelled:
            self.app.call_from_thread(self.finish, result, error)

    def finish(self, result=None, error: InputError | None = None) -> None:
        """Show ``result``, or ``error`` beside the field it names (the last good
        result stays, marked out of date)."""
        fields = self.fields()
        view = self.result_view()
        if error is not None:
            owner = self._owner(fields, error)
            if owner is not None:
                owner.show_error(error)
            self.last_error = error
            if self.last_result is None:
                view.waiting("nothing yet: " + str(error))
            else:
                view.mark_stale(None if owner is not None else str(error))
            return
        self.last_error = None
        self.last_result = result
        view.show(self.describe(result))
        self._hazards = tuple(self.hazards(result))
        self._set_hazards()

    def _owner(self, fields: list[Field], exc: InputError) -> Field | None:
        """The field an error names: by label; through ``ERROR_FIELDS`` (the core's
        name for the quantity, longest prefix first); or by the CLI option the
        core named (``--rise-time`` -> the field whose name ends in ``rise-time``)."""
        name = exc.field or ""
        for alias in sorted(self.ERROR_FIELDS, key=len, reverse=True):
            if name == alias or name.startswith(alias + " "):
                name = self.ERROR_FIELDS[alias]
                break
        key = name.split()[0].lstrip("-") if name else ""
        for f in fields:
            if name in (f.label, f.field_name) or (key and (f.field_name == key
                                                            or f.field_name.endswith("-" + key))):
                return f
        return None

    def _set_hazards(self) -> None:
        """Show this form's hazards on the panel's warning line, if this form is shown."""
        from tui.widgets.warning_line import WarningLine

        for node in self.ancestors_with_self:
            lines = node.query_children(WarningLine)
            if lines:
                lines.first().set_hazards(self._hazards)
                return
            if not node.display:  # a mode not shown: its hazards wait for it
                return
