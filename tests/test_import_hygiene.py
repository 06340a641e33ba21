"""calc/ is pure: no UI library is imported by any core module, and pint only
by the parsing edge, lazily (issue 2; the practice follows STYLE.md)."""

from __future__ import annotations

import pkgutil
import subprocess
import sys

import pytest

import calc

MODULES = sorted(f"calc.{m.name}" for m in pkgutil.iter_modules(calc.__path__))


@pytest.mark.parametrize("module", MODULES)
def test_core_module_imports_no_ui_and_no_pint(module):
    code = (
        f"import sys, {module}\n"
        "bad = [m for m in ('textual', 'rich', 'pint', 'sqlite3', 'tui') if m in sys.modules]\n"
        "print(','.join(bad))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "", f"{module} imports {out.stdout.strip()}"
