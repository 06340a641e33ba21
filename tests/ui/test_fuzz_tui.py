"""Every input field of every panel fed arbitrary text, extreme numbers, wrong
units and odd Unicode (issue 10), at 80x24 through Pilot.

After each example the app must still be running, and every field changed
must have come to rest showing either a result or the tool's own message: an
inline error beside a field (one line), or a form-level error on the result.
Anything else (an exception in a handler, which ends a Textual app, a field
that shows neither) fails the test with the typed values.

Panels are found with :func:`tui.panels.discover` and their fields by
querying the mounted panel for every ``Input`` (all modes of a panel,
hidden ones included), so a new panel or field is covered without touching
this file. Each example changes one to three fields from the demo values;
most set ``Input.value`` directly, one in 50 types the text key by key
(printable text only: a control character would be a key binding, not text).

Examples per panel: 1,000 with CI set, 100 on a developer's run, 10,000
with HALFTRIP_FUZZ_PROFILE=long (tests/fuzzing.py). Hypothesis runs in a
worker thread and hands each example to the event loop that runs the app; if
an example kills the app, a fresh app is started for the next one, so
shrinking still works.
"""

from __future__ import annotations

import asyncio
import concurrent.futures
from dataclasses import dataclass, field

import pytest
from fuzzing import VALUES, profile
from hypothesis import given, settings
from hypothesis import strategies as st
from textual.widgets import ContentSwitcher, Input
from uihelp import started

from tui.app import create_app
from tui.panels import discover
from tui.widgets.field import Field
from tui.widgets.form import LiveForm

PANELS = [spec.name for spec in discover()]
SETTLE_S = 10.0  # a field that shows neither result nor error after this long fails
#: One example in this many types its text key by key (Pilot waits for the app to be
#: idle after every key, 45 ms or more); the rest set Input.value directly.
TYPED_ONE_IN = 50
#: One example in this many also draws the whole screen at 80x24 (about 50 ms); the
#: others wait only for the changed fields' messages (a few ms).
RENDER_ONE_IN = 5


# ------------------------------------------------------------------ checking
def _text(widget) -> str:
    return str(widget.render())


def form_of(widget) -> LiveForm | None:
    return next((a for a in widget.ancestors if isinstance(a, LiveForm)), None)


def outcome(widget: Input) -> str | None:
    """What the field's form shows now: "result", "field error", "form error",
    "no form" (an input outside a live form), or None (nothing yet).

    Read through what every live form has (its fields' error lines, its
    ``last_error`` and its result view's waiting and out-of-date states), so a
    form with another kind of result view (a trace plot) is read the same way."""
    form = form_of(widget)
    if form is None:
        return "no form"
    errors = {f.field_name: _text(f.query_one(".field-error")).strip() for f in form.query(Field)}
    errors = {name: text for name, text in errors.items() if text}
    for name, text in errors.items():
        assert "\n" not in text, f"field {name!r}: error not one line: {text!r}"
    if errors:
        return "field error"
    view = form.result_view()
    waiting, stale = view.has_class("-waiting"), view.is_stale
    if form.last_error is not None:
        return "form error" if waiting or stale else None
    return "result" if not (waiting or stale) else None


async def computed(form: LiveForm) -> None:
    """Wait for the form's worker threads (a THREADED form computes off the UI thread;
    a worker's result is handed to the UI before the worker ends)."""
    mine = [w for w in form.app.workers if w.node is form]
    await asyncio.gather(*(w.wait() for w in mine), return_exceptions=True)


def reveal(widget) -> None:
    """Show the panel and mode that hold ``widget`` (as a person would pick them)."""
    for node in widget.ancestors:
        parent = node.parent
        if isinstance(parent, ContentSwitcher) and node.id and parent.current != node.id:
            parent.current = node.id


async def handled(widget) -> None:
    """Wait until what ``widget`` was sent has been handled by it and by each
    ancestor in turn (the way a bubbling message such as ``Input.Changed``
    travels). Cheaper than ``pilot.pause``, which waits on every widget of the
    screen and draws it."""
    for node in (widget, *widget.ancestors):
        done = asyncio.Event()
        if node.call_later(done.set):
            try:
                await asyncio.wait_for(done.wait(), SETTLE_S)
            except TimeoutError:
                raise AssertionError(f"{node!r} handled nothing for {SETTLE_S} s") from None


def typeable(text: str) -> bool:
    return 0 < len(text) <= 12 and text.isprintable()


# ------------------------------------------------------------------- hosting
Edit = tuple[int, str, bool]  # (input index in the panel, text, type it key by key)


@dataclass
class Job:
    edits: list[Edit]
    future: concurrent.futures.Future = field(default_factory=concurrent.futures.Future)


class Host:
    """Runs the app on the test's event loop; the hypothesis thread sends it jobs."""

    def __init__(self, panel: str) -> None:
        self.panel = panel
        self.loop = asyncio.get_running_loop()
        self.jobs: asyncio.Queue[Job | None] = asyncio.Queue()
        self.ready: concurrent.futures.Future = concurrent.futures.Future()
        self.apps_started = 0
        self.examples = 0

    # -- from the hypothesis thread
    def submit(self, edits: list[Edit]) -> list[str]:
        job = Job(edits)
        self.loop.call_soon_threadsafe(self.jobs.put_nowait, job)
        return job.future.result(timeout=300)

    def stop(self) -> None:
        self.loop.call_soon_threadsafe(self.jobs.put_nowait, None)

    # -- on the event loop
    async def serve(self) -> None:
        while True:
            crashed: Job | None = None
            app = create_app(demo=True, start_panel=self.panel)
            self.apps_started += 1
            try:
                async with app.run_test(size=(80, 24)) as pilot:
                    inputs = await self._prepare(pilot)
                    baseline = [w.value for w in inputs]
                    if not self.ready.done():
                        self.ready.set_result([w.id or f"#{i}" for i, w in enumerate(inputs)])
                    last: list[Edit] = []
                    while True:
                        job = await self.jobs.get()
                        if job is None:
                            return
                        try:
                            result = await self._apply(pilot, inputs, baseline, last, job.edits)
                        except Exception as exc:
                            if app.return_code is not None:
                                crashed = job
                                break
                            job.future.set_exception(exc)
                            continue
                        last = job.edits
                        if app.return_code is not None:
                            crashed = job
                            break
                        job.future.set_result(result)
            except Exception as exc:  # the app's own exception, re-raised by run_test
                if crashed is None:
                    if not self.ready.done():
                        self.ready.set_exception(exc)
                        return
                    raise
                crashed.future.set_exception(AssertionError(
                    f"the app stopped with {exc.__class__.__name__}: {exc}"))
                continue
            if crashed is not None:
                crashed.future.set_exception(AssertionError("the app stopped"))

    async def _prepare(self, pilot) -> list[Input]:
        await started(pilot)
        panel = await pilot.app.panel(self.panel)
        count = -1
        while count != len(panel.query(Input)):  # modes mount just after the first frame
            count = len(panel.query(Input))
            await pilot.pause()
        return list(panel.query(Input))

    async def _apply(self, pilot, inputs, baseline, last, edits) -> list[str]:
        for index, _value, _typed in last:
            inputs[index].value = baseline[index]
        self.examples += 1
        drawn = self.examples % RENDER_ONE_IN == 0
        for index, text, typed in edits:
            widget = inputs[index]
            if drawn or typed:  # bring its mode on screen (switching modes costs a layout)
                reveal(widget)
            if typed and typeable(text):
                widget.value = ""
                widget.focus()
                await pilot.pause()
                await pilot.press(*text)
            else:
                widget.value = text
        for index, _value, _typed in edits:
            await handled(inputs[index])
            form = form_of(inputs[index])
            if form is not None:
                await asyncio.wait_for(computed(form), SETTLE_S)
        if drawn:
            await pilot.pause(0)  # every widget's queue drained and the screen drawn
        deadline = self.loop.time() + SETTLE_S
        while True:
            shown = [outcome(inputs[i]) for i, _t, _k in edits]
            if all(shown) or pilot.app.return_code is not None:
                break
            if self.loop.time() > deadline:
                names = [inputs[i].id for i, _t, _k in edits]
                raise AssertionError(f"fields {names} show neither a result nor an error")
            await pilot.pause(0.02)
        assert pilot.app.return_code is None
        return shown


def edits_for(count: int):
    index = st.integers(0, count - 1)
    one = st.tuples(index, VALUES, st.integers(0, TYPED_ONE_IN - 1).map(lambda n: n == 0))
    return st.lists(one, min_size=1, max_size=min(3, count), unique_by=lambda e: e[0])


@pytest.mark.parametrize("panel", PANELS)
async def test_typing_anything_into_every_field(panel):
    host = Host(panel)
    serving = asyncio.ensure_future(host.serve())
    try:
        names = await asyncio.wrap_future(host.ready)
    except BaseException:
        await serving
        raise
    if not names:
        host.stop()
        await serving
        pytest.skip(f"panel {panel!r} has no input field")
    seen: dict[str, int] = {}

    @settings(profile())
    @given(edits_for(len(names)))
    def fuzz(edits):
        for shown in host.submit(edits):
            seen[shown] = seen.get(shown, 0) + 1

    def run() -> None:
        try:
            fuzz()
        finally:
            host.stop()

    try:
        await asyncio.get_running_loop().run_in_executor(None, run)
    finally:
        await serving
    # the fuzz reached both kinds of outcome (it is not only typing where nothing happens)
    if any(k != "no form" for k in seen):
        assert seen.get("field error", 0) + seen.get("form error", 0) > 0, seen
