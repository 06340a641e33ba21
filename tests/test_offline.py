"""halftrip never opens a network connection (issue 10).

Two halves: the whole suite runs with Internet sockets and name look-ups
blocked (tests/offline/sitecustomize.py, installed by tests/conftest.py in
this process and in every subprocess), and a scan of the source finds no
network module or connection call outside that block. The tests here check
that the block is really in place, that it leaves what asyncio (and so the
terminal interface) needs, and that the scan would catch an offender.
"""

from __future__ import annotations

import ast
import asyncio
import json
import socket
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]

#: RFC 5737 TEST-NET-1: documentation addresses, never routed.
UNROUTED = ("192.0.2.1", 9)


def test_internet_connect_is_refused(_offline):
    with pytest.raises(_offline.NetworkBlocked):
        socket.create_connection(UNROUTED, timeout=0.5)
    s = socket.socket(socket.AF_INET, socket.SOCK_STREAM)
    try:
        with pytest.raises(_offline.NetworkBlocked):
            s.connect(UNROUTED)
        with pytest.raises(_offline.NetworkBlocked):
            s.connect_ex(UNROUTED)
    finally:
        s.close()
    u = socket.socket(socket.AF_INET6, socket.SOCK_DGRAM)
    try:
        with pytest.raises(_offline.NetworkBlocked):
            u.sendto(b"x", ("2001:db8::1", 53))  # RFC 3849 documentation prefix
    finally:
        u.close()


def test_name_lookup_is_refused(_offline):
    for lookup in (lambda: socket.getaddrinfo("example.invalid", 80),
                   lambda: socket.gethostbyname("example.invalid")):
        with pytest.raises(_offline.NetworkBlocked):
            lookup()


def test_unix_sockets_and_asyncio_still_work():
    a, b = socket.socketpair()  # AF_UNIX: asyncio's self-pipe
    with a, b:
        a.sendall(b"ping")
        assert b.recv(4) == b"ping"

    async def roundtrip():
        await asyncio.sleep(0)
        return "event loop ran"

    assert asyncio.run(roundtrip()) == "event loop ran"


def test_subprocesses_are_blocked_too():
    code = ("import socket\n"
            "try:\n"
            "    socket.create_connection(('192.0.2.1', 9), timeout=0.5)\n"
            "except RuntimeError as exc:\n"
            "    print('blocked:', exc)\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         timeout=60)
    assert out.returncode == 0, out.stderr
    assert out.stdout.startswith("blocked:") and "offline" in out.stdout


def test_the_program_works_in_a_blocked_subprocess():
    # a calculation through the console entry point, in a fresh interpreter under the block
    out = subprocess.run([sys.executable, "-m", "tui.cli", "velocity", "--vf", "0.66", "--json"],
                         capture_output=True, text=True, cwd=ROOT, timeout=120)
    assert out.returncode == 0, out.stderr
    # SI c0 = 299 792 458 m/s exactly: 0.66 c0 = 197 863 022.28 m/s
    assert json.loads(out.stdout)["velocity_m_per_s"] == pytest.approx(197_863_022.28)


# ----------------------------------------------------------------- source scan
#: Modules that talk to the network (standard library and common packages).
NETWORK_MODULES = {
    "socket", "_socket", "ssl", "socketserver", "http.client",
    "http.server", "http.cookiejar", "urllib.request", "urllib.error", "urllib.robotparser",
    "urllib3", "requests", "httpx", "aiohttp", "websocket", "websockets", "ftplib", "smtplib",
    "poplib", "imaplib", "nntplib", "telnetlib", "xmlrpc", "webbrowser", "paramiko",
    "multiprocessing.connection", "asyncio.streams",
}
#: Calls that open a connection whatever object they hang off.
NETWORK_CALLS = {"open_connection", "create_connection", "create_datagram_endpoint",
                 "start_server", "sock_connect", "urlopen", "open_unix_connection"}
#: The block itself and its own tests, which must name what they block.
EXEMPT = {"tests/offline/sitecustomize.py", "tests/test_offline.py"}


def _is_network_module(name: str) -> bool:
    return any(name == m or name.startswith(m + ".") for m in NETWORK_MODULES)


def network_uses(source: str) -> list[str]:
    """What in ``source`` imports a network module or opens a connection."""
    found = []
    for node in ast.walk(ast.parse(source)):
        if isinstance(node, ast.Import):
            found += [a.name for a in node.names if _is_network_module(a.name)]
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names = [node.module] + [f"{node.module}.{a.name}" for a in node.names]
            found += [n for n in names if _is_network_module(n)][:1]
        elif isinstance(node, ast.Attribute) and node.attr in NETWORK_CALLS:
            found.append(node.attr)
        elif isinstance(node, ast.Call) and node.args and isinstance(node.args[0], ast.Constant):
            func = node.func
            name = func.attr if isinstance(func, ast.Attribute) else getattr(func, "id", "")
            arg = node.args[0].value
            if name in ("import_module", "__import__") and isinstance(arg, str) \
                    and _is_network_module(arg):
                found.append(arg)
    return found


def _python_files() -> list[Path]:
    tracked = subprocess.run(["git", "ls-files", "*.py"], capture_output=True, text=True,
                             cwd=ROOT)
    if tracked.returncode == 0 and tracked.stdout.strip():
        names = tracked.stdout.split()
    else:  # not a git checkout (an unpacked source tree)
        names = [str(p.relative_to(ROOT)) for p in ROOT.rglob("*.py") if ".venv" not in p.parts]
    return [ROOT / n for n in names if n not in EXEMPT]


def test_no_network_code_in_the_source():
    offenders = {}
    files = _python_files()
    assert any(f.parts[-2:] == ("tui", "cli.py") for f in files)
    for path in files:
        uses = network_uses(path.read_text(encoding="utf-8"))
        if uses:
            offenders[str(path.relative_to(ROOT))] = uses
    assert offenders == {}


@pytest.mark.parametrize("source, flagged", [
    ("import socket", True),
    ("import urllib.request as r", True),
    ("from http.client import HTTPConnection", True),
    ("from http import client", True),
    ("import requests", True),
    ("await asyncio.open_connection('h', 1)", True),
    ("loop.create_connection(f, 'h', 1)", True),
    ("importlib.import_module('ssl')", True),
    ("from urllib.parse import quote", False),
    ("from http import HTTPStatus", False),
    ("import asyncio, sqlite3, json", False),
    ("from . import socket_names", False),
])
def test_scan_flags_network_code(source, flagged):
    assert bool(network_uses(source)) is flagged
