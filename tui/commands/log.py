"""``halftrip log``: the job log. Jobs, their saved entries, tags, undoable deletes, reports.

Every subcommand takes ``--db PATH`` (default ``$HALFTRIP_DB`` or ``jobs.sqlite3``
in the user data directory). Listings go to stdout (one JSON object with
``--json``); confirmations and notices go to stderr.
"""

from __future__ import annotations

import json
import shutil
import sys

from calc.errors import InputError
from tui.commands.common import add_output_options, emit, units_of

NAME = "log"
HELP = "the job log: create jobs, save, list, tag, delete and undo entries, export a report"


def _db(parser) -> None:
    parser.add_argument("--db", metavar="PATH",
                        help="job database (default: $HALFTRIP_DB or the user data directory)")


def add_arguments(parser) -> None:
    sub = parser.add_subparsers(dest="log_command", metavar="ACTION", parser_class=type(parser))
    sub.required = True

    p = sub.add_parser("new", help="start a job for a site")
    p.add_argument("site", metavar="SITE", help="site name, e.g. 'Harbour Road substation'")
    p.add_argument("--note", metavar="TEXT", help="free notes for the job")
    p.add_argument("--date", metavar="YYYY-MM-DD", help="the job's date (default today)")
    p.set_defaults(action=_new)

    p = sub.add_parser("add", help="add an entry by hand (inputs and result as JSON)")
    p.add_argument("--job", metavar="ID", help="job to add to (default: the newest job)")
    p.add_argument("--kind", metavar="KIND", required=True,
                   help="what was calculated: " + ", ".join(_kinds()))
    p.add_argument("--label", metavar="TEXT", help="run or circuit id")
    p.add_argument("--input", metavar="JSON", default="{}",
                   help="the inputs as typed, e.g. '{\"delay\": \"245 ns\", \"cable\": \"rg58\"}'")
    p.add_argument("--result", metavar="JSON", default="{}", help="the result as a JSON object")
    p.add_argument("--note", metavar="TEXT", help="free note")
    p.add_argument("--cable", metavar="ID", help="the cable the entry concerns")
    p.add_argument("--tag", metavar="TAG", action="append", default=[],
                   help="pass, fail, recheck or a word of your own (repeatable)")
    p.set_defaults(action=_add)

    p = sub.add_parser("list", help="list jobs, or the entries of one job")
    p.add_argument("--job", metavar="ID", help="list this job's entries")
    p.add_argument("--tag", metavar="TAG", help="only entries with this tag")
    p.add_argument("--label", metavar="TEXT", help="only entries whose label contains this")
    p.add_argument("--kind", metavar="KIND", help="only entries of this kind")
    p.add_argument("--deleted", action="store_true", help="list deleted entries instead")
    p.set_defaults(action=_list)

    p = sub.add_parser("show", help="one entry in full")
    p.add_argument("entry", metavar="ENTRY", help="entry id")
    p.set_defaults(action=_show)

    p = sub.add_parser("edit", help="change an entry's label, note or cable")
    p.add_argument("entry", metavar="ENTRY", help="entry id")
    p.add_argument("--label", metavar="TEXT")
    p.add_argument("--note", metavar="TEXT")
    p.add_argument("--cable", metavar="ID")
    p.set_defaults(action=_edit)

    p = sub.add_parser("edit-job", help="change a job's site, notes or date")
    p.add_argument("job", metavar="JOB", help="job id")
    p.add_argument("--site", metavar="TEXT")
    p.add_argument("--note", metavar="TEXT", help="replace the job's notes")
    p.add_argument("--date", metavar="YYYY-MM-DD")
    p.set_defaults(action=_edit_job)

    p = sub.add_parser("tag", help="tag an entry: pass, fail, recheck or a word of your own")
    p.add_argument("entry", metavar="ENTRY", help="entry id")
    p.add_argument("tags", metavar="TAG", nargs="+")
    p.add_argument("--remove", action="store_true", help="remove these tags instead")
    p.set_defaults(action=_tag)

    p = sub.add_parser("delete", help="delete an entry ('halftrip log undo' brings it back)")
    p.add_argument("entry", metavar="ENTRY", help="entry id")
    p.set_defaults(action=_delete)

    p = sub.add_parser("undo", help="bring back the most recently deleted entry")
    p.set_defaults(action=_undo)

    p = sub.add_parser("export", help="a report of one job as CSV, JSON or Markdown")
    p.add_argument("--job", metavar="ID", help="job to export (default: the newest job)")
    p.add_argument("--format", dest="report_format", choices=("csv", "json", "md"),
                   required=True, help="csv (spreadsheet), json (programs) or md (to hand in)")
    p.add_argument("--out", metavar="FILE", help="write to FILE (atomically) instead of stdout")
    p.set_defaults(action=_export)

    p = sub.add_parser("check", help="where the job log is, its schema version and integrity")
    p.set_defaults(action=_check)

    for name, choice in sub.choices.items():
        _db(choice)
        if name == "export":
            units = choice.add_argument_group("output")
            units.add_argument("--units", choices=("metric", "imperial"), default=None,
                               help="lengths in metres or feet and inches")
            units.add_argument("--fraction", type=int, choices=(8, 16, 32), default=None,
                               help="feet-and-inches to this fraction of an inch")
        else:
            add_output_options(choice)


def _kinds() -> tuple[str, ...]:
    from tui.joblog.db import KINDS

    return KINDS


def _id(text: str | None, field: str) -> int | None:
    from tui.joblog.cli_save import parse_id

    return parse_id(text, field, "a job" if "job" in field.lower() else "an entry")


def _job_or_newest(log, job_id: int | None):
    if job_id is not None:
        return log.job(job_id)
    job = log.newest_job()
    if job is None:
        from tui.joblog.db import JobLogError

        raise JobLogError("there are no jobs yet; create one with 'halftrip log new SITE'")
    return job


def _say(text: str) -> None:
    print(f"halftrip: {text}", file=sys.stderr)


def _no_constant(name: str):
    raise ValueError(f"{name} is not a number JSON allows")


def _json_object(text: str, field: str) -> dict:
    try:
        value = json.loads(text, parse_constant=_no_constant)
    except json.JSONDecodeError as exc:
        raise InputError(field, f"is not valid JSON ({exc.msg} at character {exc.pos})",
                         '{"delay": "245 ns"}') from None
    except RecursionError:
        raise InputError(field, "is nested too deeply", '{"delay": "245 ns"}') from None
    except ValueError as exc:  # NaN or Infinity, or an integer of thousands of digits
        raise InputError(field, f"is not usable JSON ({str(exc).split(';')[0]})",
                         '{"delay": "245 ns"}') from None
    if not isinstance(value, dict):
        raise InputError(field, "must be a JSON object ({...})", '{"delay": "245 ns"}')
    return value


def _entry_word(entry) -> str:
    return entry.kind + (f" '{entry.label}'" if entry.label else "")


# -- actions ------------------------------------------------------------------------------


def _new(args, log) -> int:
    job = log.new_job(args.site, args.note or "", args.date)
    return emit(args, {"job": job.as_dict()},
                f"job {job.id} started: {job.site} ({job.date}); entries saved with --save "
                f"now go to it")


def _add(args, log) -> int:
    kinds = _kinds()
    kind = args.kind.strip().lower()
    if kind not in kinds:
        import difflib

        near = difflib.get_close_matches(kind, kinds, n=1)
        hint = f"; did you mean {near[0]!r}?" if near else f"; use one of {', '.join(kinds)}"
        raise InputError("--kind", f"{args.kind!r} is not a kind of entry{hint}", "locate")
    inputs = _json_object(args.input, "--input")
    result = _json_object(args.result, "--result")
    from tui.joblog.save import save_result

    job = _job_or_newest(log, _id(args.job, "--job"))
    entry = save_result(log, kind, inputs, result, job_id=job.id, label=args.label,
                        note=args.note, cable=args.cable, tags=args.tag, allow_empty=True)
    return emit(args, {"entry": entry.as_dict()},
                f"saved {_entry_word(entry)} as entry {entry.id} in job {job.id} ({job.site})")


def _width() -> int:
    return max(60, shutil.get_terminal_size((80, 24)).columns)


def _fit(text: str, width: int) -> str:
    return text if len(text) <= width else text[:max(width - 3, 1)] + "..."


def _list(args, log) -> int:
    from tui.joblog.export import summary

    job_id = _id(args.job, "--job")
    if job_id is None and not (args.tag or args.label or args.kind or args.deleted):
        jobs = log.jobs()
        lines = [f"job log {log.path}"]
        if not jobs:
            lines.append("no jobs yet; start one with: halftrip log new SITE")
        else:
            lines.append(f"{'job':>5}  {'date':<10}  {'entries':>7}  site")
            for j in jobs:
                notes = f"  ({j.notes})" if j.notes else ""
                lines.append(_fit(f"{j.id:>5}  {j.date:<10}  {j.entry_count:>7}  {j.site}{notes}",
                                  _width()))
        return emit(args, {"path": str(log.path), "jobs": [j.as_dict() for j in jobs]}, lines)
    job = log.job(job_id) if job_id is not None else None
    entries = log.entries(job_id, tag=args.tag, label=args.label, kind=args.kind,
                          deleted=args.deleted)
    units, fraction = units_of(args)
    which = "deleted entries" if args.deleted else "entries"
    head = (f"job {job.id}: {job.site} ({job.date}), {len(entries)} {which}" if job
            else f"{len(entries)} {which} in all jobs")
    lines = [head]
    if entries:
        lines.append(f"{'entry':>5}  {'time':<5}  {'kind':<9} {'label':<14} {'tags':<10} result")
        for e in entries:
            when = e.created_at[11:16]
            text = (f"{e.id:>5}  {when:<5}  {e.kind:<9} {_fit(e.label, 14):<14} "
                    f"{_fit(' '.join(e.tags), 10):<10} {summary(e, units, fraction)}")
            lines.append(_fit(text, _width()))
    data = {"path": str(log.path), "job": job.as_dict() if job else None,
            "entries": [e.as_dict() for e in entries]}
    return emit(args, data, lines)


def _show(args, log) -> int:
    from tui.joblog.export import entry_markdown

    entry = log.entry(_id(args.entry, "ENTRY"))
    job = log.job(entry.job_id)
    units, fraction = units_of(args)
    text = f"job {job.id}: {job.site} ({job.date})\n\n" + entry_markdown(
        entry, units, fraction, job.date, level=1)
    return emit(args, {"job": job.as_dict(), "entry": entry.as_dict()}, text)


def _edit(args, log) -> int:
    if args.label is None and args.note is None and args.cable is None:
        raise InputError("edit", "give at least one of --label, --note, --cable", "--note 'wet'")
    entry = log.edit_entry(_id(args.entry, "ENTRY"), label=args.label, note=args.note,
                           cable=args.cable)
    return emit(args, {"entry": entry.as_dict()}, f"entry {entry.id} changed")


def _edit_job(args, log) -> int:
    if args.site is None and args.note is None and args.date is None:
        raise InputError("edit-job", "give at least one of --site, --note, --date",
                         "--note 'gate code at the office'")
    job = log.edit_job(_id(args.job, "JOB"), site=args.site, notes=args.note,
                       date_text=args.date)
    return emit(args, {"job": job.as_dict()}, f"job {job.id} changed: {job.site} ({job.date})")


def _tag(args, log) -> int:
    entry = log.tag(_id(args.entry, "ENTRY"), args.tags, remove=args.remove)
    tags = ", ".join(entry.tags) or "none"
    return emit(args, {"entry": entry.as_dict()}, f"entry {entry.id} tags: {tags}")


def _delete(args, log) -> int:
    entry = log.delete(_id(args.entry, "ENTRY"))
    return emit(args, {"deleted": entry.as_dict()},
                f"deleted entry {entry.id} ({_entry_word(entry)}); "
                "'halftrip log undo' brings it back")


def _undo(args, log) -> int:
    entry = log.undo_delete()
    if entry is None:
        return emit(args, {"restored": None}, "nothing to undo: no entry is deleted")
    return emit(args, {"restored": entry.as_dict()},
                f"restored entry {entry.id} ({_entry_word(entry)}) to job {entry.job_id}")


def _export(args, log) -> int:
    from tui.joblog.export import export_job

    job = _job_or_newest(log, _id(args.job, "--job"))
    entries = log.entries(job.id)
    units, fraction = units_of(args)
    text = export_job(job, entries, args.report_format, units, fraction)
    if not args.out:
        sys.stdout.write(text)
        return 0
    from pathlib import Path

    from cable_catalog.loader import atomic_write_text

    out = Path(args.out).expanduser()
    if args.report_format == "csv":
        text = "\ufeff" + text  # byte-order mark: spreadsheets then read accents as UTF-8
    try:
        atomic_write_text(out, text)
    except OSError as exc:
        raise InputError("--out", f"cannot write {out} ({exc.strerror or exc}); nothing was "
                         "written", "report.md") from None
    _say(f"wrote the {args.report_format} report of job {job.id} ({job.site}, "
         f"{len(entries)} entries) to {out}")
    return 0


def _check(args, log) -> int:
    info = log.check()
    lines = [f"job log        {info['path']}",
             f"schema         version {info['schema_version']}, journal {info['journal_mode']}",
             f"integrity      {info['integrity']}",
             f"jobs           {info['jobs']}",
             f"entries        {info['entries']} (+{info['deleted_entries']} deleted)"]
    return emit(args, info, lines)


def run(args) -> int:
    from tui.joblog.cli_save import stderr_notice
    from tui.joblog.db import NoJobLog, open_log

    try:
        log = open_log(args.db, create=args.action is _new, notice=stderr_notice)
    except NoJobLog as exc:
        if args.action is _list and args.job is None:
            return emit(args, {"path": exc.path, "jobs": []}, f"{exc.problem}")
        raise
    with log:
        return args.action(args, log)
