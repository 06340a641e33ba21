"""Pilot helpers shared by the UI tests (imported as a plain module)."""

from __future__ import annotations


async def wait_for(pilot, condition, timeout: float = 10.0) -> None:
    """Pause until ``condition()`` is true (fails the test after ``timeout`` s)."""
    import time

    end = time.monotonic() + timeout
    while not condition():
        if time.monotonic() > end:
            raise AssertionError(f"timed out waiting for {condition}")
        await pilot.pause(0.02)
    await pilot.pause()


async def started(pilot) -> None:
    """Wait for the start-up worker (pint, numpy, catalog) to finish and the
    cursor to be in the first panel (it is mounted after the first frame)."""
    app = pilot.app
    try:
        await wait_for(pilot, lambda: app.core_ready and app.focused is not None, timeout=30)
    except AssertionError:
        raise AssertionError(f"not started: core_ready={app.core_ready} focused={app.focused} "
                             f"panel={app.current_panel} workers={list(app.workers)}") from None


async def type_into(pilot, input_id: str, text: str) -> None:
    """Focus the input ``input_id``, clear it and type ``text`` key by key."""
    from textual.widgets import Input

    field = pilot.app.screen.query_one(f"#{input_id}", Input)
    field.focus()
    await pilot.pause()
    field.value = ""
    await pilot.press(*[_key(ch) for ch in text])
    await pilot.pause()


_KEYS = {" ": "space", "/": "slash", ".": "full_stop", ",": "comma", ":": "colon",
         "-": "minus", "+": "plus", "%": "percent_sign", "'": "apostrophe",
         '"': "quotation_mark"}


def _key(ch: str) -> str:
    return _KEYS.get(ch, ch)


async def settled(pilot, timeout: float = 20.0) -> None:
    """Wait until no live form is computing in a worker thread and its result is shown."""
    from textual.worker import WorkerState

    def idle() -> bool:
        return not any(w.group == "live-form" and w.state in (WorkerState.PENDING,
                                                                WorkerState.RUNNING)
                       for w in pilot.app.workers)

    await pilot.pause()  # the typed text's Changed message reaches the form first
    await wait_for(pilot, idle, timeout)
    await pilot.app.workers.wait_for_complete()
    await wait_for(pilot, lambda: tables_measured(pilot.app), timeout)
    await pilot.pause()


def tables_measured(app) -> bool:
    """Every DataTable has measured its new rows: it sizes its columns when its message
    queue is idle, which on a loaded machine comes after the rest of the screen."""
    from textual.widgets import DataTable

    return not any(t._require_update_dimensions or t._updated_cells
                   for t in app.screen.query(DataTable))


def cli_output(capsys, *argv) -> tuple[int, str, str]:
    """``halftrip ARGV``: (exit status, stdout, stderr)."""
    from tui.cli import main

    capsys.readouterr()
    status = main(list(argv))
    out = capsys.readouterr()
    return status, out.out, out.err


def cli_json(capsys, *argv) -> dict:
    """``halftrip ARGV --json`` as a dict (the command must succeed)."""
    import json

    status, out, err = cli_output(capsys, *argv, "--json")
    assert status == 0, err
    return json.loads(out)


async def paste_into(pilot, input_id: str, text: str) -> None:
    """Replace the text of input ``input_id`` in one change (as a paste does), so no
    half-typed text in between is computed."""
    from textual.widgets import Input

    field = pilot.app.query_one(f"#{input_id}", Input)
    field.focus()
    field.value = text
    await pilot.pause()


def cli_text(capsys, *argv) -> str:
    """What ``halftrip ARGV`` prints (human lines), for comparing with a panel."""
    from tui.cli import main

    capsys.readouterr()
    assert main(list(argv)) == 0
    return capsys.readouterr().out.rstrip("\n")
