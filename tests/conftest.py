"""Shared test fixtures.

Every test runs with the user's real directories replaced by temporary ones,
so no test reads or writes a person's own catalog, preferences or job log.
"""

from __future__ import annotations

import pytest


@pytest.fixture(autouse=True)
def _isolated_user_dirs(tmp_path_factory, monkeypatch):
    base = tmp_path_factory.mktemp("halftrip-user")
    monkeypatch.setenv("HALFTRIP_DATA_DIR", str(base / "data"))
    monkeypatch.setenv("HALFTRIP_CONFIG_DIR", str(base / "config"))
    monkeypatch.setenv("HALFTRIP_DB", str(base / "data" / "jobs.sqlite3"))
    monkeypatch.delenv("HALFTRIP_DEBUG", raising=False)
    from tui.commands import common

    common.catalog.cache_clear()
    yield base
    common.catalog.cache_clear()


@pytest.fixture
def cli(capsys):
    """Run ``halftrip ARGS`` in-process: returns (exit code, stdout, stderr)."""
    from tui.cli import main

    def call(*argv: str):
        try:
            code = main(list(argv))
        except SystemExit as exc:  # argparse usage errors
            code = exc.code
        out, err = capsys.readouterr()
        return code, out, err

    return call


@pytest.fixture
def cli_json(cli):
    """Run ``halftrip ARGS --json``, assert exit 0, return the parsed object."""
    import json

    def call(*argv: str) -> dict:
        code, out, err = cli(*argv, "--json")
        assert code == 0, err
        return json.loads(out)

    return call
