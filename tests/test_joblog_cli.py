"""``--save`` on a calculation command, and the ``halftrip log`` actions."""

from __future__ import annotations

import json
import os

import pytest

from tui.cli import main
from tui.joblog import open_log


@pytest.fixture
def loggable_velocity(monkeypatch):
    """The velocity command with the job-log options, as every calculation command has."""
    import tui.commands.velocity as velocity

    monkeypatch.setattr(velocity, "LOGGABLE", True, raising=False)


def _run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_save_stores_the_inputs_as_typed_and_the_result(capsys, loggable_velocity):
    assert _run(capsys, "log", "new", "Quarry Lane repeater hut")[0] == 0
    code, out, err = _run(capsys, "velocity", "--nvp", "66 %", "--json", "--save",
                          "--label", "reel 7", "--note", "unmarked grey coax")
    assert code == 0
    printed = json.loads(out)  # stdout stays exactly one JSON object
    assert "saved velocity 'reel 7' as entry 1 in job 1" in err
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        (entry,) = log.entries(1)
    assert entry.kind == "velocity"
    assert entry.inputs == {"nvp": "66 %"}  # output and job-log options are not inputs
    assert entry.result == printed
    assert entry.result["vf"] == pytest.approx(0.66)  # 66 % NVP is VF 0.66 by definition
    assert (entry.label, entry.note) == ("reel 7", "unmarked grey coax")


def test_save_goes_to_the_newest_job_unless_told(capsys, loggable_velocity):
    _run(capsys, "log", "new", "Old mill data room")
    _run(capsys, "log", "new", "Harbour Road substation")
    _run(capsys, "velocity", "--vf", "0.78", "--save")
    _run(capsys, "velocity", "--vf", "0.66", "--save", "--job", "1")
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        assert [e.inputs for e in log.entries(2)] == [{"vf": "0.78"}]
        assert [e.inputs for e in log.entries(1)] == [{"vf": "0.66"}]


@pytest.mark.parametrize("extra, says", [
    ((), "there is no job log"),
    (("--job", "abc"), "--job: 'abc' is not a job id"),
])
def test_save_without_a_job_is_refused_in_one_line(capsys, loggable_velocity, extra, says):
    code, out, err = _run(capsys, "velocity", "--vf", "0.66", "--save", *extra)
    assert code == 2
    assert "velocity factor" in out  # the result is still shown
    assert err.count("\n") == 1 and "not saved" in err
    assert says in err or "no file at" in err
    assert not os.path.exists(os.environ["HALFTRIP_DB"])  # nothing created


def test_save_into_an_empty_log_says_how_to_start_a_job(capsys, loggable_velocity, tmp_path):
    db = str(tmp_path / "empty.db")
    with open_log(db):
        pass
    code, _, err = _run(capsys, "velocity", "--vf", "0.66", "--save", "--db", db)
    assert code == 2 and "halftrip log new SITE" in err and "not saved" in err


def test_list_of_a_missing_log_creates_nothing(capsys):
    code, out, _ = _run(capsys, "log", "list", "--json")
    assert code == 0 and json.loads(out)["jobs"] == []
    assert not os.path.exists(os.environ["HALFTRIP_DB"])


def test_delete_and_undo_from_the_command_line(capsys):
    _run(capsys, "log", "new", "Harbour Road substation")
    _run(capsys, "log", "add", "--kind", "note", "--label", "vault 3", "--note", "water in vault")
    code, _, _ = _run(capsys, "log", "delete", "1")
    assert code == 0
    assert json.loads(_run(capsys, "log", "list", "--job", "1", "--json")[1])["entries"] == []
    code, out, _ = _run(capsys, "log", "undo")
    assert code == 0 and "restored entry 1" in out
    (entry,) = json.loads(_run(capsys, "log", "list", "--job", "1", "--json")[1])["entries"]
    assert entry["note"] == "water in vault"
    assert "nothing to undo" in _run(capsys, "log", "undo")[1]


def test_tag_edit_and_filters(capsys):
    _run(capsys, "log", "new", "Harbour Road substation")
    for label in ("feeder 2", "feeder 3", "jumper"):
        _run(capsys, "log", "add", "--kind", "note", "--label", label)
    assert _run(capsys, "log", "tag", "1", "fail")[0] == 0
    assert _run(capsys, "log", "tag", "2", "pass", "roof")[0] == 0
    assert _run(capsys, "log", "edit", "3", "--note", "replace connector")[0] == 0

    def labels(*filters):
        out = _run(capsys, "log", "list", "--job", "1", "--json", *filters)[1]
        return [e["label"] for e in json.loads(out)["entries"]]

    assert labels("--tag", "fail") == ["feeder 2"]
    assert labels("--label", "FEED") == ["feeder 2", "feeder 3"]
    assert labels("--tag", "roof") == ["feeder 3"]
    shown = _run(capsys, "log", "show", "3")[1]
    assert "Note: replace connector" in shown


@pytest.mark.parametrize("argv, field", [
    (("log", "add", "--kind", "locaet"), "did you mean 'locate'"),
    (("log", "add", "--kind", "locate", "--input", "{delay: 245}"), "--input: is not valid JSON"),
    (("log", "add", "--kind", "locate", "--result", "[1, 2]"), "--result: must be a JSON object"),
    (("log", "show", "x"), "ENTRY: 'x' is not an entry id"),
    (("log", "show", "42"), "no entry 42"),
    (("log", "tag", "1", "two words"), "is not a tag"),
    (("log", "new", "  "), "SITE: must not be empty"),
    (("log", "export", "--format", "pdf"), "invalid choice"),
    (("log", "edit", "1"), "give at least one of"),
])
def test_bad_input_is_one_line_and_exit_2(capsys, argv, field):
    _run(capsys, "log", "new", "Harbour Road substation")
    _run(capsys, "log", "add", "--kind", "note", "--label", "vault 3")
    code, out, err = _run(capsys, *argv) if argv[1] != "export" else _catch(capsys, argv)
    assert code == 2, err
    assert err.count("\n") == 1 and field in err
    assert "Traceback" not in err


def _catch(capsys, argv):
    with pytest.raises(SystemExit) as caught:  # argparse refuses the choice itself
        main(list(argv))
    out, err = capsys.readouterr()
    return caught.value.code, out, err


def test_check_reports_the_file(capsys):
    _run(capsys, "log", "new", "Harbour Road substation")
    code, out, _ = _run(capsys, "log", "check", "--json")
    info = json.loads(out)
    assert code == 0 and info["integrity"] == "ok" and info["journal_mode"] == "wal"
    assert info["path"] == os.environ["HALFTRIP_DB"] and info["jobs"] == 1


def test_locate_save_keeps_what_was_typed_and_printed(capsys):
    _run(capsys, "log", "new", "Harbour Road substation")
    code, out, err = _run(capsys, "locate", "245 ns", "--cable", "rg58", "--json", "--save",
                          "--label", "feeder 2")
    assert code == 0, err
    printed = json.loads(out)
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        (entry,) = log.entries(1)
    assert entry.kind == "locate" and entry.cable == "rg58"
    assert entry.inputs == {"delay": "245 ns", "cable": "rg58"}
    assert entry.result == printed
    # d = VF c0 t / 2 with c0 = 299 792 458 m/s (SI definition), VF 0.66 for the RG-58 family
    assert entry.result["distance_m"] == pytest.approx(0.66 * 299_792_458 * 245e-9 / 2, rel=1e-9)


def test_command_hooks_choose_the_kind_and_add_to_the_stored_result(capsys, loggable_velocity,
                                                                     monkeypatch):
    """``log_kind(args)`` and ``log_result(args, data)`` on a command module: what a trace
    command uses to keep its samples for the report's picture without printing them."""
    import tui.commands.velocity as velocity

    samples = {"distance_m": [0.0, 10.0, 20.0, 30.0], "level": [0.0, 0.0, 1.0, 1.0]}
    monkeypatch.setattr(velocity, "log_kind", lambda args: "trace", raising=False)
    monkeypatch.setattr(velocity, "log_result", lambda args, data: {**data, "trace": samples},
                        raising=False)
    _run(capsys, "log", "new", "Harbour Road substation")
    code, out, _ = _run(capsys, "velocity", "--vf", "0.66", "--json", "--save")
    assert code == 0 and "trace" not in json.loads(out)  # printed output unchanged
    with open_log(os.environ["HALFTRIP_DB"]) as log:
        (entry,) = log.entries(1)
    assert entry.kind == "trace" and entry.result["trace"] == samples
    report = _run(capsys, "log", "export", "--format", "md")[1]
    assert "Trace picture:" in report and "```text" in report
