"""A megabyte pasted into a field (issue 10): the app keeps running, the field
says what is wrong, and the memory it takes stays a small multiple of the text.
The limits themselves are checked in tests/test_limits.py."""

from __future__ import annotations

import tracemalloc

import pytest
from limits import MB
from textual.widgets import Input
from uihelp import started

from tui.app import create_app
from tui.widgets.field import Field

PASTE = "1 m:rg58, " * 100_000  # 1 MB: a run of 100,000 segments


@pytest.mark.parametrize("panel, field_id, says", [
    ("locate", "locate-one-delay", "longer than 200 characters"),
    ("echo", "echo-run-run", "segments; at most 500"),
    ("cables", "cables-filter", None),  # a filter has no error: it matches nothing
])
async def test_a_pasted_megabyte_is_refused_in_the_field(panel, field_id, says):
    app = create_app(demo=True, start_panel=panel)
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        field = app.query_one(f"#{field_id}", Input)
        field.focus()
        tracemalloc.start()
        try:
            field.value = PASTE
            await pilot.pause()
            await pilot.press("end", "x")  # and the cursor still moves and types
            await pilot.pause()
            peak = tracemalloc.get_traced_memory()[1]
        finally:
            tracemalloc.stop()
        assert app.return_code is None
        assert field.value == PASTE + "x"
        assert peak < 50 * MB
        owner = next(a for a in field.ancestors if isinstance(a, Field))
        error = str(owner.query_one(".field-error").render())
        if says:
            assert says in error, error
