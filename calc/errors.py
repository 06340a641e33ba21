"""Errors the core raises for input a person can correct.

Every error names the field it concerns and, where it helps, an accepted
example, so a front end can print it as one line without a traceback.
"""

from __future__ import annotations


class InputError(ValueError):
    """A value a person gave is not acceptable.

    ``field`` names the input (as the user knows it: "delay", "--length");
    ``example`` shows a value that would have been accepted.
    """

    def __init__(self, field: str, problem: str, example: str | None = None) -> None:
        self.field = field
        self.problem = problem
        self.example = example
        text = f"{field}: {problem}"
        if example:
            text += f" (for example {example!r})"
        super().__init__(text)

    def __reduce__(self):  # keep pickling (worker threads, multiprocessing) working
        return (type(self), (self.field, self.problem, self.example))


class OutOfRunError(InputError):
    """An event time or distance falls beyond the end of a described run."""
