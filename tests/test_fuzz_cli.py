"""Every CLI command's options fed arbitrary text, extreme numbers, wrong units
and odd Unicode (issue 10). The only outcomes allowed are a result (exit 0,
and with --json exactly one JSON object on stdout) or the tool's own one-line
error (exit 2, nothing on stdout). Exit 1 (an internal fault) or an escaping
exception fails the test.

Examples per command: 1,000 in CI, 100 on a developer's run, 10,000 with
HALFTRIP_FUZZ_PROFILE=long (profiles and values in tests/fuzzing.py, shared
with the terminal interface's fuzz in tests/ui/test_fuzz_tui.py).
"""

from __future__ import annotations

import argparse
import io
import json
import warnings
from contextlib import redirect_stderr, redirect_stdout
from functools import lru_cache
from pathlib import Path

import pytest
from fuzzing import VALUES as FUZZ_VALUES
from fuzzing import profile
from hypothesis import given, settings
from hypothesis import strategies as st

from tui.cli import build_parser, main

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
    "locate distance": ["locate", "--distance", "24 m", "--cable", "rg58", "--tolerance", "3 %"],
    "locate run distance": ["locate", "--distance", "20 m", "--run",
                            "1.5 m:rg58, 28 m:hardline-50-half, 2 m:rg58"],
    "calibrate save": ["calibrate", "--length", "10 m", "--delay", "101 ns", "--save-as",
                       "roof-feeder", "--description", "roof feeder", "--z0", "50 ohm"],
    "locate save": ["locate", "245 ns", "--cable", "rg58", "--save", "--label", "feeder 2",
                    "--note", "roof"],
    "log new": ["log", "new", "Marsh Lane relay", "--note", "roof feeders", "--date",
                "2026-05-04"],
    "log add": ["log", "add", "--kind", "locate", "--label", "feeder 2", "--input",
                '{"delay": "245 ns"}', "--result", '{"distance_m": 24.2}', "--note", "wet",
                "--cable", "rg58", "--tag", "pass"],
    "log list": ["log", "list", "--job", "1", "--tag", "pass", "--label", "feeder", "--kind",
                 "locate"],
    "log show": ["log", "show", "1"],
    "log edit": ["log", "edit", "1", "--label", "feeder 3", "--note", "dry", "--cable", "rg213"],
    "log edit-job": ["log", "edit-job", "1", "--site", "Marsh Lane", "--note", "n", "--date",
                     "2026-05-05"],
    "log tag": ["log", "tag", "1", "recheck"],
    "log delete": ["log", "delete", "1"],
    "log export": ["log", "export", "--job", "1", "--format", "md"],
    "log check": ["log", "check"],
    "trace": ["trace", str(Path(__file__).resolve().parents[1] / "tui" / "demo"
                           / "kestrel-ridge-feeder.csv"), "--vf", "0.66", "--z0", "50 ohm",
              "--time-unit", "ns"],
}

# Positional values fuzzed too (their places in the baseline), beside every value option.
POSITIONALS: dict[str, tuple[int, ...]] = {
    "locate": (1,), "locate run": (1,), "cables show": (2,), "log new": (2,), "log show": (2,),
    "log edit": (2,), "log edit-job": (2,), "log tag": (2, 3), "log delete": (2,),
}
# Commands run once before a baseline's fuzz (a job and an entry for the log commands).
WITH_ENTRY = [["log", "new", "Marsh Lane relay"],
              ["locate", "245 ns", "--cable", "rg58", "--save", "--label", "feeder 1"]]
SETUP = {name: WITH_ENTRY for name in BASELINES if name.startswith("log ") or name == "locate save"}
SETUP["log new"] = []
# Options never fuzzed: they name files to write or read, or a job database.
NOT_FUZZED = {"--out", "--db", "--help", "-h"}


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


@pytest.fixture(autouse=True)
def _one_parser(monkeypatch):
    """main() builds the whole parser on every call (once per real command line); here
    it would be three quarters of each example's time. The parser is not changed by
    parsing, so the fuzz builds it once."""
    import tui.cli

    monkeypatch.setattr(tui.cli, "build_parser", lru_cache(maxsize=1)(tui.cli.build_parser))


def _has_json(name: str) -> bool:
    words = [w for w in BASELINES[name][:2] if not w.startswith("-")]
    parser = _subparser(build_parser(), words)
    return any("--json" in a.option_strings for a in parser._actions)


def _run(argv: list[str]) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    # a numeric warning (overflow, invalid value) would be a second line on stderr: a fault
    with redirect_stdout(out), redirect_stderr(err), warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        try:
            code = main(argv)
        except SystemExit as exc:  # argparse usage errors
            code = exc.code if isinstance(exc.code, int) else 2
    return code, out.getvalue(), err.getvalue()


def _check(argv: list[str]) -> None:
    code, out, err = _run(argv)
    assert code in (0, 2), f"exit {code} for {argv!r}: {err}"
    if code == 2:
        refusals = [ln for ln in err.splitlines() if not ln.startswith("halftrip: caution")
                    and not ln.startswith(("halftrip: catalog", "halftrip: preferences"))]
        assert len(refusals) == 1, f"not one line for {argv!r}: {err!r}"
        # --save shows the result before it is refused by the job log
        if not ("--save" in argv and "not saved" in refusals[0]):
            assert out == "", f"stdout on refusal for {argv!r}"
    elif "--json" in argv:
        assert isinstance(json.loads(out), dict)
    if "--save-as" in argv:  # whatever was saved, the user's file still reads cleanly
        from cable_catalog.loader import load_catalog
        from tui.paths import user_catalog_path

        assert load_catalog(user_catalog_path()).problems == (), argv
        user_catalog_path().unlink(missing_ok=True)  # each example starts without it


@pytest.mark.parametrize("name", sorted(BASELINES))
def test_baseline_is_valid(name):
    if not _present(name):
        pytest.skip(f"command {name!r} not in this build")
    for argv in SETUP.get(name, []):
        assert _run(argv)[0] == 0, argv
    json_flag = ["--json"] if _has_json(name) else []  # log export writes a report instead
    code, out, err = _run(BASELINES[name] + json_flag)
    assert code == 0, err
    if json_flag:
        json.loads(out)


@pytest.mark.parametrize("name", sorted(BASELINES))
def test_fuzzed_options(name):
    if not _present(name):
        pytest.skip(f"command {name!r} not in this build")
    base = BASELINES[name]
    words = [w for w in base[:2] if not w.startswith("-")]
    targets = _value_options(_subparser(build_parser(), words)) + list(POSITIONALS.get(name, ()))
    for argv in SETUP.get(name, []):
        assert _run(argv)[0] == 0, argv
    has_json = _has_json(name)

    @settings(profile())
    @given(st.sampled_from(targets), FUZZ_VALUES, st.booleans())
    def fuzz(target, value, as_json):
        argv = list(base)
        if isinstance(target, int):  # a positional value
            argv[target] = value
        elif target in argv:
            i = argv.index(target)
            argv[i + 1] = value
        else:
            argv += [target, value]
        if as_json and has_json:
            argv.append("--json")
        _check(argv)

    fuzz()


# Defects the fuzz found, kept as plain regression cases (each was exit 1 before its fix).
FOUND = [
    # int * float overflow computing the arm reach from --span before the count was checked
    ["harness", "--antennas", "1" * 400, "--antenna-z", "50 ohm", "--feed-z", "50 ohm",
     "--frequency", "146 MHz", "--span", "2 m"],
    # a cut tolerance longer than any arm overflowed to an infinite phase spread
    ["harness", "--antennas", "4", "--antenna-z", "50 ohm", "--feed-z", "50 ohm",
     "--frequency", "146 MHz", "--cut-tolerance", "1e300 m"],
    # an id beyond SQLite's 64-bit integers raised OverflowError in the look-up
    ["log", "export", "--job", "1" * 40, "--format", "md"],
    # absurd lengths and times overflowed the line arithmetic (now bounded in calc.parse)
    ["echo", "--z0", "50 ohm", "--load", "75 ohm", "--through", "1E308M", "--vf", "0.66",
     "--frequency", "100 MHz"],
    ["simulate", "--run", "10 m:rg58", "--load", "open", "--span", "1E300S"],
]
# Found by the terminal interface's fuzz, through the same core: each was exit 1.
FOUND_OK = [
    # a subnormal distance's delay underflowed to 0: the run's average VF was 0/0
    ["locate", "--distance", "1e-320 m", "--run", "1.5 m:rg58, 28 m:hardline-50-half, 2 m:rg58"],
]


@pytest.mark.parametrize("argv", FOUND, ids=lambda a: " ".join(a)[:40])
def test_found_by_fuzzing_is_refused_in_one_line(argv):
    code, out, err = _run(argv)
    refusals = [ln for ln in err.splitlines() if not ln.startswith("halftrip: caution")]
    assert code == 2 and out == "" and len(refusals) == 1, err
    _check(argv + ["--json"])


@pytest.mark.parametrize("argv", FOUND_OK, ids=lambda a: " ".join(a)[:40])
def test_found_by_fuzzing_now_gives_a_result(argv):
    code, out, err = _run(argv + ["--json"])
    assert code == 0, err
    assert json.loads(out)["distance_m"] == 1e-320


def test_an_open_behind_a_line_too_short_to_matter_stays_open():
    # found by the fuzz (then at 1e-301 Hz, now below the frequency range): tanh(gamma l)
    # underflowed and Z0 / tanh overflowed (a numeric warning, exit 1). An open reflects
    # with Gamma = +1 (Pozar, Microwave Engineering, ch. 2), and a line of no electrical
    # length changes nothing.
    code, out, err = _run(["echo", "--z0", "50 ohm", "--load", "open", "--through", "1e-320 m",
                           "--vf", "0.66", "--frequency", "0.001 Hz", "--json"])
    assert code == 0, err
    assert json.loads(out)["gamma_real"] == pytest.approx(1.0)
