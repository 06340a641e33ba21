"""A job-log writer for the reliability tests (run as a separate process, not collected).

    python tests/joblog_writer.py DB JOB COUNT NAME

Saves COUNT trace entries (each with two tags, in the same transaction) into
job JOB as fast as it can and prints each
entry's id on stdout only after its save has returned. Exit status 2 with the
job log's own one-line message on stderr if a save is refused (busy).
"""

from __future__ import annotations

import sys

from tui.joblog import JobLogError, open_log


def main() -> int:
    db, job, count, name = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), sys.argv[4]
    # A result of a few pages, so a kill can land in the middle of writing one.
    samples = [i * 1e-3 for i in range(1500)]
    try:
        with open_log(db, create=False,
                      notice=lambda t: print(f"notice: {t}", file=sys.stderr, flush=True)) as log:
            for i in range(count):
                entry = log.add_entry(job, "trace", {"writer": name, "i": i},
                                      {"distance_m": samples, "level": samples, "i": i},
                                      label=f"{name}-{i}", tags=("recheck", name))
                print(entry.id, flush=True)
    except JobLogError as exc:
        print(f"halftrip: {exc}", file=sys.stderr, flush=True)
        return 2
    return 0


if __name__ == "__main__":
    sys.exit(main())
