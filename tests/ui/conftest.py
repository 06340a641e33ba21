"""Helpers for driving the app with Textual's Pilot.

The root conftest already points HALFTRIP_DATA_DIR and HALFTRIP_CONFIG_DIR at
temporary directories. Here: no cursor blink (steady screenshots), and a
wait on the explicit start-up condition instead of chains of pauses.
"""

from __future__ import annotations

import asyncio
import inspect

import pytest


@pytest.hookimpl(tryfirst=True)
def pytest_pyfunc_call(pyfuncitem):
    """Run ``async def`` tests in a fresh event loop (no plugin needed)."""
    if inspect.iscoroutinefunction(pyfuncitem.obj):
        names = pyfuncitem._fixtureinfo.argnames
        asyncio.run(pyfuncitem.obj(**{n: pyfuncitem.funcargs[n] for n in names}))
        return True
    return None


@pytest.fixture(autouse=True)
def _steady_cursor(monkeypatch):
    from textual.widgets import Input

    monkeypatch.setattr(Input, "cursor_blink", False)
    yield


@pytest.fixture(autouse=True)
def _safety_notice_acknowledged(request, monkeypatch):
    """The first-start safety notice is modal and blocks every key until it is
    acknowledged. Tests act as a user who has already acknowledged it, except
    those marked ``first_start`` (tests/ui/test_safety_ui.py), which see the
    real first start."""
    if request.node.get_closest_marker("first_start") is None:
        from tui import safety

        monkeypatch.setattr(safety, "notice_needed", lambda prefs=None: False)
    yield
