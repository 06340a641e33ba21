"""Shared test fixtures.

Every test runs with the user's real directories replaced by temporary ones,
so no test reads or writes a person's own catalog, preferences or job log.

The whole suite runs offline: :func:`_offline` blocks Internet sockets and
name look-ups in the pytest process and, through ``tests/offline`` on
PYTHONPATH (its ``sitecustomize.py``), in every Python subprocess a test
starts. See tests/test_offline.py.
"""

from __future__ import annotations

import importlib.util
import os
from pathlib import Path

import pytest

OFFLINE_DIR = Path(__file__).resolve().parent / "offline"


def offline_guard():
    """tests/offline/sitecustomize.py as a module of this process."""
    spec = importlib.util.spec_from_file_location("halftrip_offline_guard",
                                                  OFFLINE_DIR / "sitecustomize.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


@pytest.fixture(autouse=True, scope="session")
def _offline():
    guard = offline_guard()
    guard.install()
    saved = os.environ.get("PYTHONPATH")
    os.environ["PYTHONPATH"] = os.pathsep.join(p for p in (str(OFFLINE_DIR), saved) if p)
    yield guard
    guard.uninstall()
    if saved is None:
        os.environ.pop("PYTHONPATH", None)
    else:
        os.environ["PYTHONPATH"] = saved


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
