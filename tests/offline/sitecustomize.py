"""The test suite's network block: no AF_INET/AF_INET6 connection and no name look-up.

halftrip never opens a network connection. The suite proves it by running
with this block in place: ``tests/conftest.py`` installs it in the pytest
process (an autouse session fixture) and puts this directory on PYTHONPATH,
so every Python subprocess a test starts imports this file as
``sitecustomize`` at start-up and is blocked the same way.

Refused: ``connect``/``connect_ex``/``sendto``/``sendmsg`` on Internet
sockets, and every host-name look-up (``getaddrinfo``, ``gethostbyname``...).
Allowed: AF_UNIX sockets, ``socketpair`` above all, which asyncio's event
loop (and so Textual) needs. A refusal raises :class:`NetworkBlocked`, a
RuntimeError rather than an OSError, so code that treats OSError as "no
network today" cannot hide an attempt.
"""

from __future__ import annotations

import socket

INTERNET = (socket.AF_INET, socket.AF_INET6)
MESSAGE = "halftrip's tests run offline: {} refused by tests/offline/sitecustomize.py"


class NetworkBlocked(RuntimeError):
    """A test (or the program under test) tried to use the network."""


_saved: dict[tuple[object, str], object] = {}


def _refuse(what: str):
    raise NetworkBlocked(MESSAGE.format(what))


def _guard_method(name: str):
    original = getattr(socket.socket, name)

    def guarded(self, *args, **kwargs):
        if self.family in INTERNET:
            _refuse(f"socket.{name} to {args[-1] if args else '?'!r}")
        return original(self, *args, **kwargs)

    guarded.__name__ = name
    return original, guarded


def _lookup(name: str):
    def refused(*args, **kwargs):
        _refuse(f"socket.{name}{args!r}")

    refused.__name__ = name
    return refused


def install() -> None:
    """Block the network in this interpreter (idempotent)."""
    if _saved:
        return
    for name in ("connect", "connect_ex", "sendto", "sendmsg"):
        original, guarded = _guard_method(name)
        _saved[(socket.socket, name)] = original
        setattr(socket.socket, name, guarded)
    for name in ("getaddrinfo", "gethostbyname", "gethostbyname_ex", "gethostbyaddr",
                 "getnameinfo", "create_connection"):
        _saved[(socket, name)] = getattr(socket, name)
        setattr(socket, name, _lookup(name))


def uninstall() -> None:
    """Put the original functions back."""
    for (owner, name), original in _saved.items():
        setattr(owner, name, original)
    _saved.clear()


def installed() -> bool:
    return bool(_saved)


if __name__ == "sitecustomize":  # imported by a subprocess's site module
    install()
