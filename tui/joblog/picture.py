"""A plain-text picture of a saved trace, for reports and the terminal.

Drawn from the level array stored in the entry's result against its
``distance_m`` (or ``time_s``) array, in ASCII only so it survives any
terminal, e-mail or printer. Each column shows the whole range of the samples
that fall in it (so a step or a narrow spike is never lost between columns);
events or arrivals listed in the result are marked under the axis with their
row number in the entry's table.
"""

from __future__ import annotations

import math

import numpy as np

from tui import fmt

WIDTH = 60  # plot columns; with the level labels the picture is 69 characters wide
HEIGHT = 13  # plot rows
MARKED_LISTS = ("events", "arrivals")
#: Most samples kept per array when a trace is stored in the job log: 511 buckets of the
#: trace, each keeping its lowest and highest sample, plus the first and last sample. A
#: 1,000,000-sample trace is stored as at most this many (time, distance, level) triples.
MAX_STORED_SAMPLES = 1024
#: Significant digits kept of each stored sample (a picture or a plot needs far fewer).
STORED_DIGITS = 7


def stored_samples(level, limit: int = MAX_STORED_SAMPLES, **axes) -> dict:
    """A trace as the job log keeps it: ``{"<axis>": [...], ..., "level": [...]}`` with at
    most ``limit`` samples, in the keys :func:`find_trace` looks for (``time_s``,
    ``distance_m``). A longer trace is cut into equal buckets of consecutive samples and
    each keeps its lowest and its highest sample, in their order, so a reflection one
    sample wide keeps its extreme and the picture drawn from the copy is the picture of
    the whole trace. Values are rounded to :data:`STORED_DIGITS` significant digits."""
    level = np.asarray(level, dtype=float)
    axes = {k: np.asarray(v, dtype=float) for k, v in axes.items()}
    n = level.size
    if n > limit:
        width = -(-(n - 2) // ((limit - 2) // 2))  # samples per bucket, rounded up
        body = level[1:n - 1]
        whole = body.size // width * width
        starts = np.arange(0, body.size, width)
        blocks = body[:whole].reshape(-1, width)
        low = np.append(blocks.argmin(axis=1), [] if whole == body.size else
                        [body[whole:].argmin()]).astype(int) + starts
        high = np.append(blocks.argmax(axis=1), [] if whole == body.size else
                         [body[whole:].argmax()]).astype(int) + starts
        keep = np.unique(np.concatenate(([0], low + 1, high + 1, [n - 1])))
        level = level[keep]
        axes = {k: v[keep] for k, v in axes.items()}

    def rounded(values: np.ndarray) -> list:
        return [float(f"{v:.{STORED_DIGITS}g}") for v in values.tolist()]

    return {**{k: rounded(v) for k, v in axes.items()}, "level": rounded(level)}


def _numbers(values) -> np.ndarray | None:
    """A list of numbers (None read as a gap) as a float array, else None."""
    if not isinstance(values, list) or len(values) < 2:
        return None
    try:
        array = np.array(values, dtype=float)  # None -> nan; text or nested lists refused
    except (TypeError, ValueError):
        return None
    return array if array.ndim == 1 else None


def find_trace(result: dict) -> tuple[str, np.ndarray, np.ndarray, dict] | None:
    """(x key, x, level, the dict holding them) for a result that carries a trace, else None."""
    holders = [result] + [v for v in result.values() if isinstance(v, dict)]
    for holder in holders:
        level = _numbers(holder.get("level"))
        if level is None:
            continue
        for key in ("distance_m", "time_s"):
            x = _numbers(holder.get(key))
            if x is not None and len(x) == len(level):
                return key, x, level, holder
    return None


def marks_for(result: dict, x_key: str) -> tuple[str, list[tuple[int, float]]]:
    """The list marked (events or arrivals) and (row number, position on the x axis) of each."""
    keys = (x_key,) if x_key == "distance_m" else ("time_s", "round_trip_delay_s")
    for name in MARKED_LISTS:
        rows = result.get(name)
        if isinstance(rows, list) and rows and all(isinstance(r, dict) for r in rows):
            out = []
            for i, row in enumerate(rows, start=1):
                pos = next((row[k] for k in keys if isinstance(row.get(k), int | float)), None)
                if pos is not None and math.isfinite(pos):
                    out.append((i, float(pos)))
            return name, out
    return "", []


def trace_picture(result: dict, units: str = "metric", fraction: int = 16) -> str | None:
    """The picture for a result with a trace in it, or None when it has none."""
    found = find_trace(result)
    if found is None:
        return None
    x_key, x, level, _holder = found
    keep = np.isfinite(x) & np.isfinite(level)
    x, level = x[keep], level[keep]
    if len(x) < 2:
        return None
    order = np.argsort(x, kind="stable")
    x, level = x[order], level[order]
    marked, marks = marks_for(result, x_key)
    return draw(x, level, marks, x_key, units, fraction, marked=marked)


def _columns(x: np.ndarray, level: np.ndarray, width: int):
    """Per column: lowest, highest and last level of the samples in it (interpolated if none)."""
    x0, x1 = float(x[0]), float(x[-1])
    span = (x1 - x0) or 1.0
    col = np.clip(((x - x0) / span * width).astype(int), 0, width - 1)
    starts = np.searchsorted(col, np.arange(width), side="left")
    ends = np.searchsorted(col, np.arange(width), side="right")
    centres = x0 + (np.arange(width) + 0.5) * span / width
    guess = np.interp(centres, x, level)
    low, high, last = guess.copy(), guess.copy(), guess.copy()
    filled = ends > starts
    # Empty columns hold no samples, so each non-empty column's samples run from its
    # start to the next non-empty column's start: exactly reduceat's segments.
    low[filled] = np.minimum.reduceat(level, starts[filled])
    high[filled] = np.maximum.reduceat(level, starts[filled])
    last[filled] = level[ends[filled] - 1]
    return low, high, last


def draw(x: np.ndarray, level: np.ndarray, marks: list[tuple[int, float]], x_key: str,
         units: str = "metric", fraction: int = 16, width: int = WIDTH,
         height: int = HEIGHT, marked: str = "events") -> str:
    """The picture: ``height`` rows by ``width`` columns of level against ``x`` (sorted)."""
    low, high, last = _columns(x, level, width)
    top = max(float(high.max()), 0.0)
    bottom = min(float(low.min()), 0.0)
    if top - bottom < 1e-12:  # a flat zero trace
        top = 1.0

    def row(v: float) -> int:
        return int(round((top - v) / (top - bottom) * (height - 1)))

    grid = [[" "] * width for _ in range(height)]
    zero = row(0.0)
    grid[zero] = ["."] * width
    for c in range(width):
        values = [low[c], high[c]] + ([last[c - 1]] if c else [])
        r_top, r_bottom = row(max(values)), row(min(values))
        for r in range(r_top, r_bottom + 1):
            grid[r][c] = "*"
    labels = {0: f"{top:+.2f}", height - 1: f"{bottom:+.2f}", zero: " 0   "}
    lines = ["level (fraction of the incident step) against "
             + ("distance" if x_key == "distance_m" else "round-trip time")]
    for r in range(height):
        lines.append(f"{labels.get(r, ''):>6} |" + "".join(grid[r]))
    lines.append(" " * 7 + "+" + "-" * width)
    x0, x1 = float(x[0]), float(x[-1])
    if marks:
        pointer, numbers = [" "] * width, [" "] * (width + 4)
        for number, pos in marks:
            if not x0 <= pos <= x1:
                continue
            c = min(int((pos - x0) / ((x1 - x0) or 1.0) * width), width - 1)
            pointer[c] = "^"
            text = str(number)
            if all(ch == " " for ch in numbers[c:c + len(text) + 1]):
                numbers[c:c + len(text)] = list(text)
        lines.append(" " * 8 + "".join(pointer).rstrip())
        lines.append(" " * 8 + "".join(numbers).rstrip())

    def shown(v: float) -> str:
        return "0" if v == 0 else fmt.by_key(x_key, v, units, fraction)

    left, mid, right = shown(x0), shown((x0 + x1) / 2), shown(x1)
    axis = [" "] * (width + 1)
    for start, text in ((0, left), (width // 2 - len(mid) // 2, mid), (width + 1 - len(right), right)):
        axis[start:start + len(text)] = list(text)
    lines.append(" " * 8 + "".join(axis).rstrip())
    if marks:
        lines.append(" " * 8 + f"^ n: row n of the {marked} table")
    return "\n".join(line.rstrip() for line in lines)
