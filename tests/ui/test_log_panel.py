"""The Log panel and the one-key save, driven by keystrokes at 80x24.

The calculation panels arrive from other work; a small velocity panel built
here on the shared LiveForm stands in for them, so Ctrl+S and "reopen" are
tested through exactly the path a real panel takes.
"""

from __future__ import annotations

import hashlib
import os
import types

from textual.containers import Vertical
from textual.widgets import Input
from uihelp import started, type_into, wait_for

from tui.app import HalftripApp, panel_bindings
from tui.joblog import open_log
from tui.panels import PanelSpec, discover
from tui.panels.log.confirm import ConfirmDialog
from tui.panels.log.entry_table import EntryTable
from tui.panels.log.fields_dialog import FieldsDialog
from tui.widgets.field import Field
from tui.widgets.form import LiveForm
from tui.widgets.result_view import ResultView


class VelocityForm(LiveForm):
    LOG_KIND = "velocity"

    def compose(self):
        yield Field("vel-vf", "VF", kind="vf", value="0.66")
        yield Field("vel-tolerance", "VF tolerance", kind="tolerance", optional=True)
        yield ResultView()

    def compute(self, values):
        from calc.velocity import from_vf

        return from_vf(values["vel-vf"])

    def describe(self, result):
        return f"velocity factor {result.vf:.4f}"


class VelocityPanel(Vertical):
    def compose(self):
        yield VelocityForm()


def _velocity_module() -> types.ModuleType:
    module = types.ModuleType("test_velocity_panel")
    module.KEY, module.ORDER, module.TITLE = "v", 1, "Velocity"
    module.DESCRIPTION = "a stand-in calculation panel"
    module.Panel = VelocityPanel
    module.LOG_KINDS = ("velocity",)
    return module


def _notify(self, message, *args, **kwargs):
    self.notices.append(str(message))
    return HalftripApp.notify(self, message, *args, **kwargs)


def make_app(start: str = "velocity") -> HalftripApp:
    """The real app class with the Log panel and the stand-in panel (as create_app builds
    it); ``app.notices`` keeps every notification's text."""
    module = _velocity_module()
    specs = [PanelSpec("velocity", module.KEY, module.ORDER, module.TITLE, module.DESCRIPTION,
                       module)] + discover(("log",))
    cls = type("HalftripApp", (HalftripApp,), {"__module__": "tui.app", "PANELS": specs,
                                               "BINDINGS": panel_bindings(specs),
                                               "notify": _notify})
    app = cls(start_panel=start)
    app.notices = []
    return app


def _entries():
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        return log.entries()


async def _answer(pilot, *texts: str) -> None:
    """Type each text into the dialog's next field and press Enter."""
    await wait_for(pilot, lambda: isinstance(pilot.app.screen, FieldsDialog))
    for text in texts:
        focused = pilot.app.focused
        assert isinstance(focused, Input)
        focused.value = text
        await pilot.press("enter")
        await pilot.pause()


async def _log_table(pilot) -> EntryTable:
    await pilot.press("f7")  # the Log panel: ORDER 6 -> F7
    await pilot.pause()
    table = pilot.app.query_one(EntryTable)
    table.focus()
    await pilot.pause()
    return table


async def test_ctrl_s_saves_the_panel_result_with_a_new_job():
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "vel-vf", "0.78")
        await pilot.press("ctrl+s")
        await _answer(pilot, "Harbour Road substation", "feeder 2", "foam dielectric")
        await wait_for(pilot, lambda: not isinstance(app.screen, FieldsDialog))
        await wait_for(pilot, lambda: len(_entries()) == 1)
    (entry,) = _entries()
    assert entry.kind == "velocity"
    assert entry.inputs == {"vf": "0.78"}  # as typed, keyed like the CLI's option
    assert entry.result["vf"] == 0.78
    assert entry.result["nvp_percent"] == 78.0  # NVP is 100 VF by definition
    assert (entry.label, entry.note) == ("feeder 2", "foam dielectric")
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        assert log.job(entry.job_id).site == "Harbour Road substation"


async def test_an_out_of_date_result_is_not_saved():
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        log.new_job("Old mill data room")
    app = make_app()
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "vel-vf", "1.7")  # refused: VF must be in (0, 1]
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert not isinstance(app.screen, FieldsDialog)
        assert any("out of date" in n for n in app.notices)
    assert _entries() == []


async def test_tag_delete_with_confirmation_undo_and_reopen():
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        job = log.new_job("Quarry Lane repeater hut")
        log.add_entry(job.id, "velocity", {"vf": "0.84"}, {"vf": 0.84}, label="reel 7")
        log.add_entry(job.id, "velocity", {"vf": "0.66"}, {"vf": 0.66}, label="jumper")
    app = make_app(start="log")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        table = await _log_table(pilot)
        assert table.row_count == 2 and table.selected_id() == 1

        await pilot.press("p")  # pass
        await wait_for(pilot, lambda: _entries()[0].tags == ("pass",))
        await pilot.press("f")  # fail replaces pass
        await wait_for(pilot, lambda: _entries()[0].tags == ("fail",))

        await pilot.press("delete")
        await wait_for(pilot, lambda: isinstance(app.screen, ConfirmDialog))
        await pilot.press("escape")  # keep it
        await pilot.pause()
        assert len(_entries()) == 2
        await pilot.press("delete")
        await wait_for(pilot, lambda: isinstance(app.screen, ConfirmDialog))
        await pilot.press("y")
        await wait_for(pilot, lambda: [e.label for e in _entries()] == ["jumper"])
        await wait_for(pilot, lambda: table.row_count == 1)
        await pilot.press("z")  # undo
        await wait_for(pilot, lambda: len(_entries()) == 2)
        await wait_for(pilot, lambda: table.row_count == 2)

        table.select(1)
        await pilot.press("o")  # reopen in its panel, inputs filled in
        await wait_for(pilot, lambda: app.current_panel == "velocity")
        await wait_for(pilot, lambda: app.query_one("#vel-vf", Input).value == "0.84")
        form = app.query_one(VelocityForm)
        await wait_for(pilot, lambda: form.last_result is not None
                       and abs(form.last_result.vf - 0.84) < 1e-12)


async def test_filter_by_tag_and_label_and_edit_label():
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        job = log.new_job("Harbour Road substation")
        for label, tag in (("feeder 2", "fail"), ("feeder 3", "pass"), ("jumper", "fail")):
            log.add_entry(job.id, "locate", {}, {"distance_m": 1.0}, label=label, tags=[tag])
    app = make_app(start="log")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        table = await _log_table(pilot)
        await type_into(pilot, "log-filter", "fail")
        assert table.row_count == 2
        await type_into(pilot, "log-filter", "fail feeder")
        assert table.row_count == 1 and table.selected_id() == 1
        await type_into(pilot, "log-filter", "")
        assert table.row_count == 3
        table.focus()
        table.select(3)
        await pilot.press("i")
        await _answer(pilot, "jumper J4", "crimp redone")
        await wait_for(pilot, lambda: _entries()[2].label == "jumper J4")
        assert _entries()[2].note == "crimp redone"


async def test_export_writes_the_report_file(tmp_path):
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        job = log.new_job("Old mill data room")
        log.add_entry(job.id, "echo", {"load": "75 ohm"}, {"return_loss_db": 13.979},
                      label="patch 14", note="=cmd")
    out = tmp_path / "mill.csv"
    app = make_app(start="log")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await _log_table(pilot)
        await pilot.press("x")
        await _answer(pilot, "csv", str(out))
        await wait_for(pilot, out.exists)
    text = out.read_text(encoding="utf-8-sig")
    assert "patch 14" in text and "\"'=cmd\"" in text  # neutralised (OWASP CSV injection)


async def test_a_broken_log_file_is_shown_and_left_alone():
    path = os.environ["HALFTRIP_DB"]
    os.makedirs(os.path.dirname(path), exist_ok=True)
    with open(path, "wb") as fh:
        fh.write(b"not a database at all" * 20)
    before = hashlib.sha256(open(path, "rb").read()).hexdigest()
    app = make_app(start="log")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        problem = app.query_one("#log-problem")
        assert problem.display and path in str(problem.render())
        await pilot.press("ctrl+s")  # from the Log panel itself: nothing to save
        await pilot.press("f2")
        await pilot.pause()
        await pilot.press("ctrl+s")  # the velocity panel: refused with the file's problem
        await pilot.pause()
        assert any("left untouched" in n for n in app.notices)
    assert hashlib.sha256(open(path, "rb").read()).hexdigest() == before


async def test_new_job_becomes_the_open_job_and_tags_dialog_sets_tags():
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        job = log.new_job("Harbour Road substation")
        log.add_entry(job.id, "locate", {}, {"distance_m": 1.0}, label="feeder 2", tags=["pass"])
    app = make_app(start="log")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        table = await _log_table(pilot)
        await pilot.press("a")
        await _answer(pilot, "recheck wet-connector")
        await wait_for(pilot, lambda: _entries()[0].tags == ("recheck", "wet-connector"))

        await pilot.press("n")
        await _answer(pilot, "Old mill data room", "key from the caretaker")
        await wait_for(pilot, lambda: table.border_title.startswith("0 of 0"))
        with open_log(os.environ["HALFTRIP_DB"]) as log:
            newest = log.newest_job()
        assert (newest.site, newest.notes) == ("Old mill data room", "key from the caretaker")

        await pilot.press("f2")  # a save now goes to the new job
        await pilot.pause()
        await pilot.press("ctrl+s")
        await _answer(pilot, "reel 7", "")
        await wait_for(pilot, lambda: len(_entries()) == 2)
    assert [e.job_id for e in _entries()] == [job.id, newest.id]


async def test_demo_shows_its_own_job_and_leaves_the_users_log_alone():
    from tui.app import create_app

    app = create_app(demo=True, start_panel="log")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        table = app.query_one(EntryTable)
        await wait_for(pilot, lambda: table.row_count >= 5)
    assert not os.path.exists(os.environ["HALFTRIP_DB"])


async def test_locate_panel_saves_what_the_cli_saves_and_reopens_cli_entries(capsys):
    """The real Locate panel: Ctrl+S stores the same inputs and result as
    'halftrip locate ... --save'; a run saved from the CLI reopens in the Run tab."""
    from tui.app import create_app
    from tui.cli import main
    from tui.widgets.modes import Modes

    assert main(["log", "new", "Harbour Road substation"]) == 0
    assert main(["locate", "245 ns", "--cable", "rg58", "--json", "--save",
                 "--label", "from the CLI"]) == 0
    assert main(["locate", "131 ns", "--run", "1.5 m:rg58, 28 m:hardline-50-half, 2 m:rg58",
                 "--save", "--label", "mast run"]) == 0
    capsys.readouterr()
    app = create_app(panels=("locate", "log"), start_panel="locate")
    async with app.run_test(size=(80, 24)) as pilot:
        await started(pilot)
        await type_into(pilot, "locate-one-delay", "245 ns")
        await type_into(pilot, "locate-one-cable", "rg58")
        await pilot.press("ctrl+s")
        await _answer(pilot, "from the panel", "")
        await wait_for(pilot, lambda: len(_entries()) == 3)
        cli, run, tui = _entries()
        assert tui.kind == cli.kind == "locate"
        assert run.kind == "locate-run"  # the Run tab's own kind, from either front end
        assert tui.inputs == cli.inputs == {"delay": "245 ns", "cable": "rg58"}
        # the same numbers under the same keys (the panel may add keys of its own)
        assert {k: tui.result.get(k) for k in cli.result} == cli.result

        table = await _log_table(pilot)
        table.select(2)  # the run saved from the CLI
        await pilot.press("o")
        await wait_for(pilot, lambda: app.current_panel == "locate")
        modes = app.query_one("#locate-modes", Modes)
        await wait_for(pilot, lambda: modes.current == "run")
        assert app.query_one("#locate-run-run", Input).value.startswith("1.5 m:rg58")
        assert app.query_one("#locate-run-delay", Input).value == "131 ns"
