"""Every kind of entry through save, list and export; CSV formula neutralising; the
Markdown report and its trace pictures."""

from __future__ import annotations

import csv
import io
import json
import math
import re

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from joblog_samples import C0, SAMPLES

from tui.cli import main
from tui.fmt import key_label
from tui.joblog import open_log
from tui.joblog.export import FORMULA_STARTS, job_csv, job_markdown, md_cell, neutralise
from tui.joblog.picture import WIDTH, trace_picture


def _run(capsys, *argv) -> tuple[int, str, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


@pytest.fixture
def db(tmp_path):
    return str(tmp_path / "jobs.sqlite3")


@pytest.fixture
def job(db, capsys):
    code, out, _ = _run(capsys, "log", "new", "Harbour Road substation", "--note",
                        "gate code at the office", "--date", "2026-12-01", "--db", db, "--json")
    assert code == 0
    return json.loads(out)["job"]["id"]


def _add(capsys, db, job, kind, label="run A3", note="", tags=()):
    inputs, result = SAMPLES[kind]
    argv = ["log", "add", "--db", db, "--job", str(job), "--kind", kind, "--label", label,
            "--input", json.dumps(inputs), "--result", json.dumps(result), "--json"]
    if note:
        argv += ["--note", note]
    for t in tags:
        argv += ["--tag", t]
    code, out, err = _run(capsys, *argv)
    assert code == 0, err
    return json.loads(out)["entry"]


def _csv_rows(text: str) -> list[dict]:
    return list(csv.DictReader(io.StringIO(text)))  # Python's RFC 4180 reader


@pytest.mark.parametrize("kind", sorted(SAMPLES))
def test_every_kind_survives_save_list_and_export(capsys, db, job, kind):
    inputs, result = SAMPLES[kind]
    saved = _add(capsys, db, job, kind, note="checked after rain", tags=("recheck",))
    assert (saved["inputs"], saved["result"]) == (inputs, result)

    code, out, _ = _run(capsys, "log", "list", "--db", db, "--job", str(job), "--json")
    listed = json.loads(out)["entries"]
    assert code == 0 and len(listed) == 1
    assert listed[0]["kind"] == kind and listed[0]["tags"] == ["recheck"]
    assert (listed[0]["inputs"], listed[0]["result"]) == (inputs, result)

    code, out, _ = _run(capsys, "log", "export", "--db", db, "--job", str(job), "--format", "json")
    report = json.loads(out)
    assert report["job"]["site"] == "Harbour Road substation"
    assert report["entries"][0]["result"] == result  # arrays in full, floats exact

    code, out, _ = _run(capsys, "log", "export", "--db", db, "--job", str(job), "--format", "csv")
    rows = _csv_rows(out)
    tables = {k: v for k, v in result.items() if isinstance(v, list) and v
              and isinstance(v[0], dict)}
    assert [r["part"] for r in rows] == ["entry"] + [f"{name} {i}" for name, t in tables.items()
                                                    for i in range(1, len(t) + 1)]
    assert all(r["kind"] == kind and r["label"] == "run A3" for r in rows)
    assert rows[0]["note"] == "checked after rain"
    for key, value in inputs.items():
        assert f"{key}={value}" in rows[0]["inputs"]

    code, out, _ = _run(capsys, "log", "export", "--db", db, "--job", str(job), "--format", "md")
    assert f"### Entry {saved['id']}: {kind} - run A3" in out
    assert "Note: checked after rain" in out
    for name, table in tables.items():  # each table in full: a heading and every row
        assert f"{key_label(name).capitalize()} ({len(table)}):" in out
        section = out.split(f"{key_label(name).capitalize()} ({len(table)}):")[1]
        assert [line.split(" | ")[0] for line in section.strip().splitlines()[2:2 + len(table)]] \
            == [f"| {i}" for i in range(1, len(table) + 1)]
    has_trace = "level" in result
    assert ("```text" in out) == has_trace


def test_markdown_shows_values_in_the_users_units(capsys, db, job):
    _add(capsys, db, job, "locate")
    _add(capsys, db, job, "echo", label="patch 14")
    _, metric, _ = _run(capsys, "log", "export", "--db", db, "--format", "md")
    # 245 ns in a VF 0.66 cable: 0.66 c0 245 ns / 2 = 24.238 m (c0: SI definition)
    assert f"| distance | {0.66 * C0 * 245e-9 / 2:.3f} m |" in metric
    # 75 ohm on 50 ohm: |Gamma| = 0.2, return loss 13.98 dB, VSWR 1.5 (Pozar, ch. 2 relations)
    assert "| return loss | 13.98 dB |" in metric and "| VSWR | 1.50 |" in metric
    _, imperial, _ = _run(capsys, "log", "export", "--db", db, "--format", "md",
                          "--units", "imperial")
    # 24.2375 m / 0.3048 m per foot (exact, 1959 agreement) = 79.519 ft = 79 ft 6.23 in,
    # to the nearest 1/16 in: 79 ft 6-1/4 in
    assert "| distance | 79 ft 6-1/4 in |" in imperial


def test_export_to_file_is_atomic_and_refuses_a_bad_path(capsys, db, job, tmp_path):
    _add(capsys, db, job, "cut", label="phasing line")
    out = tmp_path / "report.csv"
    code, stdout, err = _run(capsys, "log", "export", "--db", db, "--format", "csv",
                             "--out", str(out))
    assert code == 0 and stdout == "" and str(out) in err
    text = out.read_text(encoding="utf-8-sig")  # with a byte-order mark for spreadsheets
    assert out.read_bytes().startswith(b"\xef\xbb\xbf")
    assert _csv_rows(text)[0]["label"] == "phasing line"
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(".report")]
    code, _, err = _run(capsys, "log", "export", "--db", db, "--format", "md", "--out",
                        str(tmp_path / "no-such-dir" / "r.md"))
    assert code == 2 and err.count("\n") == 1 and "--out" in err


# -- CSV formula neutralising -----------------------------------------------------------------

# OWASP "CSV Injection" guidance: cells must not begin with = + - @ tab or carriage return;
# a leading single quote makes a spreadsheet take the cell as text. OWASP ASVS 1.2.10 adds NUL.
HOSTILE = ["=HYPERLINK(\"http://example.invalid\",\"click\")", "+1+1", "-2+3", "@SUM(A1:A9)",
           "\tindented", "\rreturn", "\x00nul"]


@pytest.mark.parametrize("text", HOSTILE)
def test_formula_starts_are_neutralised_in_every_column(capsys, db, job, text):
    inputs = {"delay": text}
    result = {"distance_m": 1.0, "kind": text, "events": [{"kind": text, "distance_m": 1.0}]}
    clean = text.replace("\x00", "")
    code, _, err = _run(capsys, "log", "add", "--db", db, "--job", str(job), "--kind", "trace",
                        f"--label={clean}", f"--note={clean}", "--tag", "recheck",
                        "--input", json.dumps(inputs), "--result", json.dumps(result))
    assert code == 0, err
    _, out, _ = _run(capsys, "log", "export", "--db", db, "--job", str(job), "--format", "csv")
    for row in csv.reader(io.StringIO(out)):
        for cell in row:
            assert not cell.startswith(FORMULA_STARTS), cell
    rows = _csv_rows(out)
    stored = clean.strip()  # labels and notes are stored trimmed
    shown = "'" + stored if stored.startswith(FORMULA_STARTS) else stored
    assert rows[0]["label"] == shown and rows[0]["note"] == shown
    assert rows[0]["inputs"] == "delay=" + text  # inside a cell, not at its start: kept as is


def test_neutralise_leaves_ordinary_text_alone():
    for text in ("run A3", "24.2 m", "'quoted", "", "a=b", "1-2"):
        assert neutralise(text) == text
    for start in FORMULA_STARTS:
        assert neutralise(start + "x") == "'" + start + "x"


def test_csv_quotes_every_field_and_doubles_quotes(tmp_path):
    """RFC 4180, sections 2.6 and 2.7: fields with quotes, commas or line breaks are quoted,
    a quote inside is doubled."""
    with open_log(tmp_path / "j.db") as log:
        job = log.new_job('Mill "B", east wing')
        log.add_entry(job.id, "note", {}, {}, note="two\nlines, and a comma")
        text = job_csv(log.job(job.id), log.entries(job.id))
    assert '"Mill ""B"", east wing"' in text
    assert _csv_rows(text)[0]["note"] == "two\nlines, and a comma"


def test_markdown_cells_cannot_break_the_table():
    assert md_cell("a | b") == "a \\| b"
    assert md_cell("<script>x</script>") == "&lt;script&gt;x&lt;/script&gt;"
    assert md_cell("one\ntwo") == "one<br>two"


# -- the trace picture --------------------------------------------------------------------------


def test_picture_puts_the_step_and_the_marks_where_they_are():
    _, result = SAMPLES["simulate"]  # an open at 40 m on a 0-60 m axis
    lines = trace_picture(result).splitlines()
    plot = [line[8:] for line in lines[1:-4] if "|" in line[:8]]
    top_row = plot[0]
    first_high = top_row.index("*")
    # column of 40 m on 0..60 m over WIDTH columns (a step spans its column and the next)
    assert abs(first_high - math.floor(40 / 60 * WIDTH)) <= 1
    assert set(top_row[first_high:]) == {"*"}
    pointer = next(line for line in lines if line.strip() == "^")
    assert abs(pointer.index("^") - 8 - math.floor(40 / 60 * WIDTH)) <= 1
    assert all(len(line) <= 80 for line in lines)
    assert all(ord(ch) < 128 for ch in "\n".join(lines))
    axis = next(i for i, line in enumerate(lines) if line.startswith(" " * 7 + "+"))
    assert lines[-2].split() == ["0", "30.000", "m", "60.000", "m"]
    assert lines[axis + 1].strip() == "^"


def test_picture_keeps_a_spike_narrower_than_a_column():
    n = 100_000
    distance = [i * 1e-3 for i in range(n)]  # 0-100 m in 1 mm steps
    level = [0.0] * n
    level[31_000] = -0.5  # a one-sample dip at 31 m
    lines = trace_picture({"distance_m": distance, "level": level}).splitlines()
    bottom = next(line for line in lines if line.startswith(" -0.50"))
    assert abs(bottom.index("*") - 8 - math.floor(31 / 100 * WIDTH)) <= 1


def test_no_picture_without_a_trace():
    assert trace_picture(SAMPLES["locate"][1]) is None
    assert trace_picture({"level": [0.0, 1.0], "distance_m": [0.0]}) is None


# -- any text a person types --------------------------------------------------------------------

TEXT = st.text(st.characters(blacklist_categories=("Cs",), blacklist_characters="\x00"),
               max_size=40)


@settings(max_examples=200, deadline=None)
@given(label=TEXT, note=TEXT, typed=TEXT)
def test_any_text_round_trips_and_never_starts_a_formula(tmp_path_factory, label, note, typed):
    path = tmp_path_factory.mktemp("prop") / "j.db"
    with open_log(path) as log:
        job = log.new_job("Harbour Road substation")
        entry = log.add_entry(job.id, "locate", {"delay": typed}, {"kind": typed,
                              "events": [{"kind": typed}]}, label=label, note=note)
        assert (entry.label, entry.note) == (label.strip(), note.strip())
        assert entry.inputs == {"delay": typed}
        text = job_csv(log.job(job.id), log.entries(job.id))
        md = job_markdown(log.job(job.id), log.entries(job.id))
    rows = list(csv.reader(io.StringIO(text)))
    assert all(len(r) == len(rows[0]) for r in rows)
    for row in rows:
        for cell in row:
            assert not cell.startswith(FORMULA_STARTS)
    first = _csv_rows(text)[0]
    assert first["label"] == neutralise(label.strip()) and first["note"] == neutralise(note.strip())
    # every Markdown table keeps its shape: no unescaped | or line break gets into a cell
    tables, current = [], []
    for line in md.splitlines() + [""]:
        if line.startswith("|"):
            current.append(len(re.split(r"(?<!\\)\|", line)))
        elif current:
            tables.append(current)
            current = []
    assert tables and all(len(set(t)) == 1 for t in tables), tables
