"""One vocabulary of job-log kinds: the same measurement saved from a panel (Ctrl+S) and
from the command line (``--save``) lands under the same kind, with the same result; an
old log holding the kinds the command line used to save still lists, exports and reopens.

The inputs are invented scenarios; the values they give are checked in the commands' own
tests against their sources. These tests check that both front ends agree.
"""

from __future__ import annotations

import importlib
import json
import os

import pytest
from textual.widgets import Input
from uihelp import paste_into, settled, started, type_into, wait_for

from tui.cli import main
from tui.demo import traces as demo
from tui.joblog import open_log
from tui.panels.trace import DEMO_DIR

KESTREL = str(DEMO_DIR / "kestrel-ridge-feeder.csv")
RUN = "1.5 m:rg58, 28 m:hardline-50-half, 2 m:rg58"

# panel form (module:class) -> the command line that makes the same measurement
PAIRS = [
    ("locate.one_cable:OneCableForm", ["locate", "245 ns", "--cable", "rg58"]),
    ("locate.run:RunForm", ["locate", "131 ns", "--run", RUN]),
    ("locate.run:RunForm", ["locate", "--distance", "20 m", "--run", RUN]),
    ("locate.both_ends:BothEndsForm", ["locate", "--from-a", "1.2 us", "--from-b", "0.8 us",
                                       "--length", "250 m", "--cable", "rg58"]),
    ("locate.measure:MeasureForm", ["calibrate", "--length", "30 m", "--delay", "303.2 ns"]),
    ("cut.length:CutLengthForm", ["cut", "--frequency", "146 MHz", "--degrees", "90",
                                  "--vf", "0.66"]),
    ("cut.transformer:TransformerForm", ["match", "--from", "50 ohm", "--to", "200 ohm",
                                         "--frequency", "146 MHz"]),
    ("cut.harness:HarnessForm", ["harness", "--antennas", "4", "--antenna-z", "50 ohm",
                                 "--feed-z", "50 ohm", "--frequency", "146 MHz"]),
    ("cut.trim:TrimForm", ["trim", "--frequency", "146 MHz", "--degrees", "90", "--length",
                           "40 cm", "--measured-delay", "4 ns"]),
    ("cut.stub:StubForm", ["stub", "--frequency", "146 MHz", "--vf", "0.66", "--end", "open",
                           "--present", "short"]),
    ("echo.load_form:LoadForm", ["echo", "--z0", "50 ohm", "--load", "75 ohm"]),
    ("echo.step_form:StepForm", ["echo", "--z0", "50 ohm", "--observed-step", "0.2"]),
    ("echo.run_form:RunForm", ["simulate", "--run", "40 m:rg58", "--load", "open"]),
    ("trace.trace_form:TraceForm", ["trace", KESTREL, "--run", demo.KESTREL_RUN]),
]


def _form_class(spec: str):
    module, name = spec.split(":")
    return getattr(importlib.import_module(f"tui.panels.{module}"), name)


def _entries():
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        return log.entries()


@pytest.mark.parametrize(("form", "argv"), PAIRS, ids=[" ".join(a[:2]) + f" ({f})"
                                                        for f, a in PAIRS])
def test_the_cli_saves_under_the_kind_the_panel_saves(capsys, form, argv):
    assert main(["log", "new", "Harbour Road substation"]) == 0
    code = main([*argv, "--json", "--save"])
    _out, err = capsys.readouterr()
    assert code == 0, err
    (entry,) = _entries()
    cls = _form_class(form)
    assert entry.kind == cls.LOG_KIND
    # the panel that saves it also reopens it
    panel = importlib.import_module("tui.panels." + form.split(".")[0])
    assert entry.kind in getattr(panel, "LOG_KINDS", (form.split(".")[0],))


async def test_trace_panel_saves_what_trace_save_stores(capsys):
    """Ctrl+S on the Trace panel and 'halftrip trace ... --save': the same kind, the same
    events and comparison, and the same decimated samples for the report's picture."""
    from tui.app import create_app
    from tui.joblog.picture import MAX_STORED_SAMPLES
    from tui.panels.log.saving import record_of

    assert main(["log", "new", "Kestrel Ridge"]) == 0
    assert main(["trace", KESTREL, "--run", demo.KESTREL_RUN, "--expect-run", demo.KESTREL_RUN,
                 "--expect-load", "open", "--json", "--save"]) == 0
    capsys.readouterr()
    (cli,) = _entries()
    app = create_app(panels=("trace",), start_panel="trace")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await paste_into(pilot, "trace-file", KESTREL)
        await type_into(pilot, "trace-on", demo.KESTREL_RUN)
        await type_into(pilot, "trace-expect-load", "open")
        await settled(pilot)
        record = record_of(app.query_one("#trace"))
    assert record.kind == cli.kind == "trace"
    assert len(record.result["trace"]["level"]) <= MAX_STORED_SAMPLES
    assert json.loads(json.dumps(record.result)) == cli.result


async def test_an_old_log_with_the_old_locate_kind_still_shows_exports_and_reopens(capsys):
    """Before the command line used the panel's kinds it saved every locate as
    'locate'; such an entry (a run) still lists, exports and reopens in the Run tab."""
    from tui.app import create_app
    from tui.panels.log.entry_table import EntryTable
    from tui.widgets.modes import Modes

    assert main(["log", "new", "Harbour Road substation"]) == 0
    # d = VF c0 t / 2, c0 = 299 792 458 m/s (SI): 131 ns on RG-58 (VF 0.66) is 12.960 m
    old = {"mode": "run", "round_trip_delay_s": 131e-9,
           "distance_m": 0.66 * 299_792_458 * 131e-9 / 2}
    assert main(["log", "add", "--kind", "locate", "--label", "mast run", "--input",
                 json.dumps({"delay": "131 ns", "run": RUN}), "--result", json.dumps(old)]) == 0
    assert main(["locate", "131 ns", "--run", RUN, "--save", "--label", "mast run"]) == 0
    capsys.readouterr()
    assert [e.kind for e in _entries()] == ["locate", "locate-run"]
    assert main(["log", "list", "--kind", "locate"]) == 0
    assert "mast run" in capsys.readouterr().out
    assert main(["log", "export", "--format", "md"]) == 0
    report = capsys.readouterr().out
    assert "### Entry 1: locate - mast run" in report
    assert "### Entry 2: locate-run - mast run" in report
    assert "12.960 m" in report

    app = create_app(panels=("locate", "log"), start_panel="log")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        table = app.query_one(EntryTable)
        await wait_for(pilot, lambda: table.row_count == 2)
        table.focus()
        table.select(1)
        await pilot.press("o")
        await wait_for(pilot, lambda: app.current_panel == "locate")
        modes = app.query_one("#locate-modes", Modes)
        await wait_for(pilot, lambda: modes.current == "run")
        assert app.query_one("#locate-run-delay", Input).value == "131 ns"
