"""Field readers shared by the Echo and Trace panels (a private helper module:
panel discovery skips names starting with ``_``).

A reader is ``reader(text, field_label) -> value`` and raises
:class:`calc.errors.InputError`; these take the app so they read the app's
catalog (the built-in one merged with the user's own cables).
"""

from __future__ import annotations

LOAD_PLACEHOLDER = "open, short, 75 ohm, 10 pF, 75 ohm || 10 pF"
RUN_PLACEHOLDER = "10 m:rg58, 20 m:rg213"


def load_reader(app):
    """A load as typed (``open``, ``75 ohm``, ``75 ohm || 10 pF``, ``cable:rg59``)."""

    def read(text: str, label: str):
        from calc.loads import parse_load

        return parse_load(text, label, lookup=app.catalog.get)

    return read


def run_reader(app):
    """A run of catalog cables: ``"10 m:rg58, 20 m:rg213"`` (calc.run.parse_run)."""

    def read(text: str, label: str):
        from calc.run import parse_run

        return parse_run(text, app.catalog.get, label)

    return read
