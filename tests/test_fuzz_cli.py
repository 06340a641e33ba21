"""Every CLI command's options fed arbitrary text, extreme numbers, wrong units
and odd Unicode (issue 10). The only outcomes allowed are a result (exit 0,
and with --json exactly one JSON object on stdout) or the tool's own one-line
error (exit 2, nothing on stdout). Exit 1 (an internal fault) or an escaping
exception fails the test.

Examples per command: 1,000 in CI (profile "ci", chosen when CI is set, as
.ci/run's environment has it), 100 on a developer's run (profile "dev"); set
HALFTRIP_FUZZ_PROFILE=long for 10,000.
"""

from __future__ import annotations

import argparse
import io
import json
import os
from contextlib import redirect_stderr, redirect_stdout

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from tui.cli import build_parser, main

settings.register_profile("ci", max_examples=1000, deadline=None,
                          suppress_health_check=[HealthCheck.too_slow])
settings.register_profile("dev", max_examples=100, deadline=None,
                          suppress_health_check=[HealthCheck.too_slow])
settings.register_profile("long", max_examples=10_000, deadline=None,
                          suppress_health_check=[HealthCheck.too_slow])
PROFILE = os.environ.get("HALFTRIP_FUZZ_PROFILE", "ci" if os.environ.get("CI") else "dev")

# A valid invocation of every command: the fuzzer replaces one value in it.
BASELINES: dict[str, list[str]] = {
    "velocity": ["velocity", "--vf", "0.66"],
    "cables list": ["cables", "list", "--category", "coax"],
    "cables show": ["cables", "show", "rg58"],
    "locate": ["locate", "245 ns", "--cable", "rg58", "--rise-time", "2 ns", "--pulse-width",
               "10 ns", "--tolerance", "3 %"],
    "locate run": ["locate", "245 ns", "--run", "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"],
    "locate both ends": ["locate", "--from-a", "120 ns", "--from-b", "180 ns", "--length",
                         "30 m", "--cable", "rg213"],
    "calibrate": ["calibrate", "--length", "10 m", "--delay", "101 ns"],
    "calibrate stub": ["calibrate", "--length", "1 m", "--resonance", "49.5 MHz", "--end",
                       "open", "--order", "1"],
    "cut": ["cut", "--frequency", "146 MHz", "--degrees", "90", "--cable", "rg58", "--allowance",
            "15 mm", "--span", "3 m", "--kind", "transformer"],
    "match": ["match", "--from", "50 ohm", "--to", "100 ohm", "--frequency", "146 MHz", "--band",
              "144-148 MHz"],
    "harness": ["harness", "--antennas", "4", "--antenna-z", "50 ohm", "--feed-z", "50 ohm",
                "--frequency", "146 MHz", "--span", "2 m", "--band", "144-148 MHz"],
    "trim": ["trim", "--frequency", "146 MHz", "--degrees", "90", "--length", "400 mm",
             "--measured-delay", "4.2 ns"],
    "stub": ["stub", "--frequency", "146 MHz", "--vf", "0.66", "--z0", "50 ohm", "--end", "open",
             "--present", "j25 ohm"],
    "echo": ["echo", "--z0", "50 ohm", "--load", "75 ohm + 100 nH", "--frequency", "100 MHz"],
    "echo through": ["echo", "--z0", "50 ohm", "--load", "75 ohm", "--through", "10 m", "--vf",
                     "0.66", "--frequency", "100 MHz"],
    "echo observed": ["echo", "--z0", "50 ohm", "--observed-step", "0.2"],
    "simulate": ["simulate", "--run", "10 m:rg58, 20 m:rg213", "--load", "open", "--rise-time",
                 "1 ns", "--points", "2048"],
    "safety": ["safety", "--tag", "power"],
}

# Options never fuzzed: they name files to write or read, or a job database.
NOT_FUZZED = {"--out", "--db", "--help", "-h", "--save", "--job", "--label", "--note"}

NUMBERS = st.sampled_from(["0", "-1", "-0", "1e300", "-1e300", "1e-300", "nan", "NaN", "inf",
                           "-inf", "1e309", "0.0000001", "999999999999", "1/0", "0x10"])
UNITS = st.sampled_from(["", " ns", " m", " ft", " in", " MHz", " ohm", " %", " pF", " nH",
                         " kg", " degC", " wl", " deg", " s", " V", " m/us", " ns/ft", " Ω",
                         " µs", " furlong", " dB", " j", "j ohm"])
ODD = st.sampled_from(["", " ", "\u200b", "\u202e1 m", "１２ ns", "٣ m", "ⅷ", "🙂", "\x00",
                       "--vf", "-", ":", ",", "1 m:", ":rg58", "1 m:rg58,,", "'", '"', "\\",
                       "1 ft 2 ft", "3-1/0 in", "((1))", "1 m + 2 m", "2**1000 m"])
FUZZ_VALUES = st.one_of(
    st.text(max_size=30),
    st.builds(lambda n, u: n + u, NUMBERS, UNITS),
    ODD,
    st.builds(lambda a, b: a + b, st.text(max_size=8), UNITS),
)


def _subparser(parser: argparse.ArgumentParser, words: list[str]) -> argparse.ArgumentParser:
    """The (nested) subparser that handles ``words``."""
    for action in parser._actions:  # argparse offers no public walk of sub-commands
        if isinstance(action, argparse._SubParsersAction) and words and words[0] in action.choices:
            return _subparser(action.choices[words[0]], words[1:])
    return parser


def _value_options(parser: argparse.ArgumentParser) -> list[str]:
    out = []
    for action in parser._actions:
        if action.option_strings and action.nargs != 0 and not isinstance(
                action, argparse._SubParsersAction):
            flag = max(action.option_strings, key=len)
            if flag not in NOT_FUZZED:
                out.append(flag)
    return sorted(out)


def _present(name: str) -> bool:
    try:
        _subparser(build_parser(), BASELINES[name][:2])
    except SystemExit:
        return False
    commands = {a for a in build_parser()._actions if isinstance(a, argparse._SubParsersAction)}
    return any(BASELINES[name][0] in a.choices for a in commands)


def _run(argv: list[str]) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with redirect_stdout(out), redirect_stderr(err):
        try:
            code = main(argv)
        except SystemExit as exc:  # argparse usage errors
            code = exc.code if isinstance(exc.code, int) else 2
    return code, out.getvalue(), err.getvalue()


def _check(argv: list[str]) -> None:
    code, out, err = _run(argv)
    assert code in (0, 2), f"exit {code} for {argv!r}: {err}"
    if code == 2:
        assert out == "", f"stdout on refusal for {argv!r}"
        refusals = [ln for ln in err.splitlines() if not ln.startswith("halftrip: caution")
                    and not ln.startswith(("halftrip: catalog", "halftrip: preferences"))]
        assert len(refusals) == 1, f"not one line for {argv!r}: {err!r}"
    elif "--json" in argv:
        assert isinstance(json.loads(out), dict)


@pytest.mark.parametrize("name", sorted(BASELINES))
def test_baseline_is_valid(name):
    if not _present(name):
        pytest.skip(f"command {name!r} not in this build")
    code, out, err = _run(BASELINES[name] + ["--json"])
    assert code == 0, err
    json.loads(out)


@pytest.mark.parametrize("name", sorted(BASELINES))
def test_fuzzed_options(name):
    if not _present(name):
        pytest.skip(f"command {name!r} not in this build")
    base = BASELINES[name]
    words = [w for w in base[:2] if not w.startswith("-")]
    options = _value_options(_subparser(build_parser(), words))

    @settings(settings.get_profile(PROFILE))
    @given(st.sampled_from(options), FUZZ_VALUES, st.booleans())
    def fuzz(option, value, as_json):
        argv = list(base)
        if option in argv:
            i = argv.index(option)
            argv[i + 1] = value
        else:
            argv += [option, value]
        if as_json:
            argv.append("--json")
        _check(argv)

    fuzz()
