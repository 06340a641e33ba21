"""Reports of a job: CSV for a spreadsheet, JSON for programs, Markdown to hand in.

All three carry every entry with its inputs as typed, its result and its note.

* JSON: the job and its entries exactly as stored (arrays in full).
* CSV: one table. Each entry has an ``entry`` row (inputs and the result's
  single values as ``key=value`` in SI units, plus a readable summary), then
  one row per line of each table in its result (``arms 1``, ``events 3``...),
  so a cut list or an event table arrives in full and every row can be
  filtered by entry, kind or label. Long number arrays (a trace's samples)
  are counted, not spelled out: the JSON report has them. Cells that a
  spreadsheet would run as a formula are neutralised (:func:`neutralise`).
* Markdown: a summary table of the entries, then a section per entry with
  its inputs, its result in readable units, its tables in full and, for a
  saved trace, a plain-text picture of it.
"""

from __future__ import annotations

import csv
import io
import json
from datetime import datetime

from tui import fmt
from tui.joblog.db import Entry, Job
from tui.joblog.picture import trace_picture

FORMATS = ("csv", "json", "md")
REPORT_FORMAT_VERSION = 1
ARRAY_SHOWN = 8  # number lists longer than this are summarised in CSV and Markdown

# Result values that say most about an entry, in the order a summary shows them.
HEADLINE_KEYS = (
    "distance_m", "distance_low_m", "distance_high_m", "distance_from_a_m", "distance_from_b_m",
    "offset_in_segment_m", "keep_length_m", "cut_off_m", "cut_length_m", "physical_length_m",
    "implied_vf", "vf", "vf_low", "vf_high", "ideal_impedance_ohm", "vswr_center", "vswr_worst",
    "return_loss_db", "vswr", "impedance_ohm", "kind",
)
HEADLINE_SIZE = 3

# -- shared pieces ------------------------------------------------------------------------


def _is_scalar(value) -> bool:
    return value is None or isinstance(value, str | int | float | bool) or (
        isinstance(value, dict) and set(value) == {"real", "imag"})


def _is_table(value) -> bool:
    return isinstance(value, list) and bool(value) and all(isinstance(v, dict) for v in value)


def _is_numbers(value) -> bool:
    return isinstance(value, list) and bool(value) and all(
        v is None or (isinstance(v, int | float) and not isinstance(v, bool)) for v in value)


def split_result(result: dict, prefix: str = "") -> tuple[dict, dict]:
    """A result's single values and its tables, nested dicts flattened to ``a.b`` keys."""
    values, tables = {}, {}
    for key, value in result.items():
        name = f"{prefix}{key}"
        if _is_table(value):
            tables[name] = value
        elif isinstance(value, dict) and not _is_scalar(value):
            sub_values, sub_tables = split_result(value, f"{name}.")
            values.update(sub_values)
            tables.update(sub_tables)
        else:
            values[name] = value
    return values, tables


def _leaf(key: str) -> str:
    return key.rsplit(".", 1)[-1]


def show_value(key: str, value, units: str = "metric", fraction: int = 16) -> str:
    """One value of a result for people (a long number list is summarised)."""
    if _is_numbers(value) and len(value) > ARRAY_SHOWN:
        finite = [v for v in value if v is not None]
        span = (f", {show_value(key, min(finite), units, fraction)} to "
                f"{show_value(key, max(finite), units, fraction)}") if finite else ""
        return f"{len(value)} values{span}"
    if isinstance(value, list):
        return ", ".join(show_value(key, v, units, fraction) for v in value) or "-"
    if isinstance(value, dict) and not _is_scalar(value):
        return json.dumps(value, ensure_ascii=False)
    return fmt.by_key(_leaf(key), value, units, fraction)


def summary(entry: Entry, units: str = "metric", fraction: int = 16) -> str:
    """A few words on what the entry found: its headline values and the size of its tables."""
    values, tables = split_result(entry.result)
    picked = [k for k in HEADLINE_KEYS if k in values and _is_scalar(values[k])
              and values[k] is not None][:HEADLINE_SIZE]
    if not picked:
        picked = [k for k, v in values.items() if _is_scalar(v) and v is not None][:HEADLINE_SIZE]
    parts = [f"{fmt.key_label(_leaf(k))} {show_value(k, values[k], units, fraction)}"
             for k in picked]
    parts += [f"{len(rows)} {fmt.key_label(_leaf(k))}" for k, rows in tables.items()]
    return "; ".join(parts) or "-"


def _clock(entry_time: str, job_date: str | None = None) -> str:
    """``21:47`` on the job's own day, else ``2026-12-02 08:10``."""
    try:
        when = datetime.fromisoformat(entry_time)
    except (TypeError, ValueError):
        return entry_time or "-"
    if job_date and when.date().isoformat() == job_date:
        return when.strftime("%H:%M")
    return when.strftime("%Y-%m-%d %H:%M")


def _table_columns(rows: list[dict]) -> list[str]:
    return list(dict.fromkeys(k for row in rows for k in row))


def _header() -> dict:
    return {"report": "halftrip job log", "format_version": REPORT_FORMAT_VERSION,
            "exported_at": datetime.now().astimezone().isoformat(timespec="seconds")}


def _when(stamp: str) -> str:
    """``2026-12-01 22:05 +01:00`` from an ISO time stamp."""
    when = datetime.fromisoformat(stamp)
    return when.strftime("%Y-%m-%d %H:%M ") + when.strftime("%z")[:3] + ":" + \
        when.strftime("%z")[3:]


# -- JSON ---------------------------------------------------------------------------------


def job_json(job: Job, entries: list[Entry]) -> str:
    data = {**_header(), "job": job.as_dict(), "entries": [e.as_dict() for e in entries]}
    return json.dumps(data, indent=2, ensure_ascii=False, allow_nan=False) + "\n"


# -- CSV ----------------------------------------------------------------------------------

# OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): a cell that starts
# with = + - @ tab or carriage return can be run as a formula by a spreadsheet; prefix it
# with a single quote and quote every field (RFC 4180 quoting, done by the csv module).
# OWASP ASVS 5.0 requirement 1.2.10 lists NUL beside them.
FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r", "\x00")

CSV_COLUMNS = ("job_id", "site", "job_date", "entry_id", "saved_at", "modified_at", "kind",
               "label", "cable", "tags", "note", "part", "summary", "inputs", "result")


def neutralise(cell: str) -> str:
    """``cell`` made inert for a spreadsheet: a leading quote before a formula start."""
    return "'" + cell if cell.startswith(FORMULA_STARTS) else cell


def _raw(value) -> str:
    if value is None:
        return ""
    if isinstance(value, str):
        return value
    return json.dumps(value, ensure_ascii=False)


def _pairs(values: dict) -> str:
    out = []
    for key, value in values.items():
        if value is None:
            continue
        if _is_numbers(value) and len(value) > ARRAY_SHOWN:
            out.append(f"{key}=[{len(value)} values; in the JSON report]")
        else:
            out.append(f"{key}={_raw(value)}")
    return "; ".join(out)


def job_csv(job: Job, entries: list[Entry], units: str = "metric", fraction: int = 16) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, quoting=csv.QUOTE_ALL, lineterminator="\n")
    writer.writerow(CSV_COLUMNS)
    for entry in entries:
        values, tables = split_result(entry.result)
        common = [job.id, job.site, job.date, entry.id, entry.created_at, entry.modified_at,
                  entry.kind, entry.label, entry.cable or "", " ".join(entry.tags), entry.note]
        rows = [common + ["entry", summary(entry, units, fraction), _pairs(entry.inputs),
                          _pairs(values)]]
        for name, table in tables.items():
            for i, row in enumerate(table, start=1):
                rows.append(common + [f"{name} {i}", "", "", _pairs(row)])
        for row in rows:
            writer.writerow([neutralise(_raw(cell)) for cell in row])
    return buffer.getvalue()


# -- Markdown -----------------------------------------------------------------------------


def md_cell(text: str) -> str:
    """Text made safe inside a Markdown table cell (and free of raw HTML)."""
    text = (str(text).replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
            .replace("\\", "\\\\").replace("|", "\\|"))
    return "<br>".join(line.strip() for line in text.strip().splitlines()) or " "


def md_text(text: str) -> str:
    """Free text (a note) as a Markdown paragraph, raw HTML neutralised."""
    return str(text).replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").strip()


def md_table(header: list[str], rows: list[list[str]]) -> list[str]:
    lines = ["| " + " | ".join(md_cell(h) for h in header) + " |",
             "|" + "---|" * len(header)]
    lines += ["| " + " | ".join(md_cell(c) for c in row) + " |" for row in rows]
    return lines


def entry_markdown(entry: Entry, units: str = "metric", fraction: int = 16,
                   job_date: str | None = None, level: int = 2) -> str:
    """One entry in full: facts, inputs as typed, result, its tables and its trace picture."""
    title = f"{'#' * level} Entry {entry.id}: {entry.kind}"
    if entry.label:
        title += f" - {md_text(entry.label)}"
    facts = [f"saved {_clock(entry.created_at, job_date)}"]
    if entry.modified_at and entry.modified_at != entry.created_at:
        facts.append(f"changed {_clock(entry.modified_at, job_date)}")
    if entry.cable:
        facts.append(f"cable {md_text(entry.cable)}")
    if entry.tags:
        facts.append("tags " + ", ".join(entry.tags))
    if entry.deleted_at:
        facts.append("DELETED (halftrip log undo brings back the last deleted entry)")
    lines = [title, "", " · ".join(facts), ""]
    if entry.note:
        lines += ["Note: " + md_text(entry.note).replace("\n", "  \n"), ""]
    if entry.inputs:
        lines += ["Inputs, as typed:", ""]
        lines += md_table(["input", "value"],
                          [[fmt.key_label(k), _raw(v)] for k, v in entry.inputs.items()])
        lines.append("")
    values, tables = split_result(entry.result)
    values = {k: v for k, v in values.items() if v is not None}  # "not applicable" says nothing
    if values:
        lines += ["Result:", ""]
        lines += md_table(["quantity", "value"],
                          [[_quantity(k), show_value(k, v, units, fraction)]
                           for k, v in values.items()])
        lines.append("")
    for name, rows in tables.items():
        columns = _table_columns(rows)
        lines += [f"{fmt.key_label(_leaf(name)).capitalize()} ({len(rows)}):", ""]
        lines += md_table(["#"] + [_quantity(c) for c in columns],
                          [[str(i)] + [show_value(c, row.get(c), units, fraction)
                                       for c in columns]
                           for i, row in enumerate(rows, start=1)])
        lines.append("")
    picture = trace_picture(entry.result, units, fraction)
    if picture:
        lines += ["Trace picture:", "", "```text", picture, "```", ""]
    return "\n".join(lines)


def _quantity(key: str) -> str:
    """``distance_low_m`` -> ``distance low``; nested keys keep their parent: ``best.vswr``."""
    parts = key.split(".")
    return ".".join(parts[:-1] + [fmt.key_label(parts[-1])]) if len(parts) > 1 else \
        fmt.key_label(key)


def job_markdown(job: Job, entries: list[Entry], units: str = "metric",
                 fraction: int = 16) -> str:
    header = _header()
    lines = [f"# Job {job.id}: {md_text(job.site)}", "",
             f"Date {job.date} · {len(entries)} entries · exported {_when(header['exported_at'])} "
             f"by halftrip (lengths {'in feet and inches' if units == 'imperial' else 'in metres'})",
             ""]
    if job.notes:
        lines += ["Notes: " + md_text(job.notes).replace("\n", "  \n"), ""]
    if entries:
        lines += ["## Entries", ""]
        lines += md_table(
            ["#", "time", "kind", "label", "cable", "tags", "result", "note"],
            [[str(e.id), _clock(e.created_at, job.date), e.kind, e.label, e.cable or "",
              " ".join(e.tags), summary(e, units, fraction), e.note] for e in entries])
        lines.append("")
        for entry in entries:
            lines.append(entry_markdown(entry, units, fraction, job.date, level=3))
    else:
        lines += ["No entries saved in this job.", ""]
    return "\n".join(lines).rstrip("\n") + "\n"


def export_job(job: Job, entries: list[Entry], form: str, units: str = "metric",
               fraction: int = 16) -> str:
    """The report of ``job`` in ``form`` (one of :data:`FORMATS`)."""
    if form == "json":
        return job_json(job, entries)
    if form == "csv":
        return job_csv(job, entries, units, fraction)
    if form == "md":
        return job_markdown(job, entries, units, fraction)
    raise ValueError(f"unknown report format {form!r}; use one of {FORMATS}")
