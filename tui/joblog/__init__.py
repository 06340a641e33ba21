"""The job log: every saved calculation of the day, kept in one SQLite file, and its reports.

* :mod:`tui.joblog.db` - the store (:func:`open_log`, :class:`JobLog`, :class:`Job`,
  :class:`Entry`), its guarantees and its errors;
* :mod:`tui.joblog.schema` - the file format, its version and migrations;
* :mod:`tui.joblog.export` - CSV, JSON and Markdown reports of a job;
* :mod:`tui.joblog.picture` - the plain-text picture of a saved trace;
* :mod:`tui.joblog.cli_save` - ``--save`` on the calculation commands;
* :func:`save_result` - one call for any front end (the CLI's ``--save``, the
  terminal interface's save key) to store a result in a job.

It lives in ``tui`` because it does I/O; ``calc`` never imports it.
"""

from tui.joblog.db import (
    KINDS,
    STATUS_TAGS,
    Entry,
    Job,
    JobLog,
    JobLogBusy,
    JobLogError,
    NoJobLog,
    open_log,
)
from tui.joblog.save import save_result

__all__ = ["KINDS", "STATUS_TAGS", "Entry", "Job", "JobLog", "JobLogBusy", "JobLogError", "NoJobLog",
           "open_log", "save_result"]
