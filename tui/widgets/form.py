"""A live form: fields in, one result out, recomputed on every keystroke.

Subclasses compose their :class:`~tui.widgets.field.Field` widgets (and a
:class:`~tui.widgets.result_view.ResultView` with :meth:`result_view`),
and implement

* ``compute(values) -> result``: call the core with the parsed field values
  (a dict, field name -> value) and return its result object;
* ``describe(result) -> str | Content``: format it with ``tui.fmt`` in
  ``self.units`` / ``self.fraction``;
* optionally ``hazards(result) -> tags`` for the panel's warning line,
  ``prepare(values)`` (UI thread) to turn values into what ``compute`` takes,
  ``shown(result)`` to draw a fresh result elsewhere (a plot), and
  ``SLOW = True`` to run ``compute`` in a worker thread.

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
    #: True: ``compute`` runs in a worker thread (simulations, trace analysis).
    SLOW: ClassVar[bool] = False

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
        values: dict[str, object] = {}
        first_error: InputError | None = None
        for f in self.fields():
            try:
                values[f.field_name] = f.read()
                f.show_error(None)
            except InputError as exc:
                f.show_error(exc)
                first_error = first_error or exc
        if first_error is not None:
            self._finish(None, first_error)
            return
        try:
            prepared = self.prepare(values)
            if self.SLOW:
                self.result_view().working()
                self._compute_off_thread(prepared)
                return
            self._finish(self.compute(prepared), None)
        except InputError as exc:
            self._finish(None, exc)

    def prepare(self, values: dict[str, object]):
        """What ``compute`` gets, made on the UI thread (default: the values)."""
        return values

    @work(thread=True, exclusive=True, group="compute")
    def _compute_off_thread(self, prepared) -> None:
        """``compute`` in a worker thread (``SLOW`` forms); the newest keystroke wins."""
        worker = get_current_worker()
        try:
            result, error = self.compute(prepared), None
        except InputError as exc:
            result, error = None, exc
        if not worker.is_cancelled:
            self.app.call_from_thread(self._finish, result, error)

    def _finish(self, result, error: InputError | None) -> None:
        """Show a fresh result, or ``error`` beside its field with the last good
        result kept and marked out of date."""
        view = self.result_view()
        if error is not None:
            self.last_error = error
            owner = self._owner(self.fields(), error)
            if owner is not None:
                owner.show_error(error)
            if self.last_result is None:
                view.waiting("nothing yet: " + str(error))
            else:
                view.mark_stale(None if owner is not None else str(error))
            return
        self.last_error = None
        self.last_result = result
        view.show(self.describe(result))
        self.shown(result)
        self._hazards = tuple(self.hazards(result))
        self._set_hazards()

    def shown(self, result) -> None:
        """Called after a fresh result is shown (a plot, say, draws it here)."""

    def _owner(self, fields: list[Field], exc: InputError) -> Field | None:
        """The field an error names: by label, or by the CLI option the core named
        (``--rise-time`` -> the field whose name ends in ``rise-time``)."""
        key = exc.field.split()[0].lstrip("-") if exc.field else ""
        for f in fields:
            if exc.field == f.label or (key and (f.field_name == key
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
