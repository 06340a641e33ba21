"""``halftrip safety`` and the one-line caution other commands print."""

from __future__ import annotations

import json

import pytest

from tui.cli import main


def _run(capsys, *argv):
    try:
        code = main(list(argv))
    except SystemExit as exc:  # argparse usage errors exit from inside main
        code = exc.code
    out = capsys.readouterr()
    return code, out.out, out.err


@pytest.mark.parametrize("argv", [
    ("velocity", "--cable", "mv-xlpe"),
    ("cables", "show", "mv-xlpe"),
    ("cables", "show", "mv-xlpe", "--json"),
])
def test_hazard_tagged_cable_prints_its_caution_on_stderr(capsys, argv):
    code, out, err = _run(capsys, *argv)
    assert code == 0
    caution = [line for line in err.splitlines() if "caution" in line]
    assert len(caution) == 1
    assert "power cable" in caution[0] and "stored charge" in caution[0]
    assert "halftrip safety --tag power --tag stored-charge" in caution[0]
    assert "caution" not in out  # stdout stays data (one JSON object with --json)
    if "--json" in argv:
        assert json.loads(out)["hazards"] == ["power", "stored-charge"]


def test_cable_without_hazard_tags_prints_no_caution(capsys):
    code, out, err = _run(capsys, "velocity", "--cable", "rg174")
    assert code == 0 and err == ""


def test_safety_json_is_one_object_with_every_section(capsys):
    from tui.safety import load_text

    code, out, err = _run(capsys, "safety", "--json")
    assert code == 0 and err == ""
    data = json.loads(out)
    assert [s["id"] for s in data["sections"]] == list(load_text().sections)
    assert data["text_version"] == load_text().version
    assert "take precedence" in data["precedence"]


def test_safety_for_one_tag(capsys):
    code, out, _err = _run(capsys, "safety", "--tag", "poe")
    assert code == 0
    assert out.startswith("Before you connect anything\n")
    assert "Power over Ethernet" in out and "IEEE Std 802.3" in out
    assert "Protecting the instrument" in out  # the instrument note goes with every tag
    assert "take precedence" in out
    assert max(len(line) for line in out.splitlines()) <= 78


def test_safety_json_for_two_tags(capsys):
    code, out, _err = _run(capsys, "safety", "--tag", "power", "--tag", "stored-charge", "--json")
    ids = [s["id"] for s in json.loads(out)["sections"]]
    assert code == 0 and ids == ["general", "power", "stored-charge", "instrument"]


def test_unknown_tag_is_one_line_and_exit_2(capsys):
    code, out, err = _run(capsys, "safety", "--tag", "powr")
    assert code == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and "--tag" in err
