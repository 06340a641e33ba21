"""``halftrip calibrate``: measure a cable's velocity factor, and keep it.

* ``calibrate --length L --delay T``: a piece of known length, round-trip
  delay of its far end (``--reel`` when the length is the one printed on a
  reel);
* ``calibrate --length L --resonance F [--end open|short] [--order N]``: the
  low-impedance resonance of a cut stub;
* ``--save-as ID`` adds the result to the user's own catalog.
"""

from __future__ import annotations

from tui.commands.common import add_output_options, emit, option, units_of

NAME = "calibrate"
HELP = "measure a cable's velocity factor from a known length, a reel or a stub resonance"
LOGGABLE = True

_LABEL = 20
_METHOD_WORDS = {
    "known-length": "known length, round-trip delay of its far end",
    "reel": "reel of printed length, round-trip delay of its far end",
    "stub-open": "stub with an open end, low-impedance resonance",
    "stub-short": "stub with a shorted end, low-impedance resonance",
}


def add_arguments(parser) -> None:
    from cable_catalog.loader import CATEGORIES

    parser.add_argument("--length", metavar="L", required=True,
                        help="length of the piece, reel or stub, e.g. '10 m' or '32 ft 9 in'")
    how = parser.add_mutually_exclusive_group(required=True)
    how.add_argument("--delay", metavar="T", help="round-trip delay of the far end, e.g. '101 ns'")
    how.add_argument("--resonance", metavar="F",
                     help="frequency of the stub's low-impedance resonance, e.g. '4.95 MHz'")
    parser.add_argument("--end", choices=("open", "short"), default=None,
                        help="the stub's far end (default open)")
    parser.add_argument("--order", type=int, default=None, metavar="N",
                        help="which low-impedance resonance: 1 for the lowest (default 1)")
    parser.add_argument("--reel", action="store_true",
                        help="the length is the one printed on a reel (default tolerance 2 %%)")
    unc = parser.add_argument_group("uncertainty of the inputs")
    unc.add_argument("--length-tolerance", metavar="X",
                     help="'1 cm' or '0.5 %%' (default 0.5 %%, or 2 %% with --reel)")
    unc.add_argument("--delay-resolution", metavar="T",
                     help="how well the delay is read, e.g. '0.5 ns' (default 1 ns)")
    unc.add_argument("--frequency-resolution", metavar="F",
                     help="how well the resonance is read, e.g. '20 kHz' (default 0.5 %%)")
    save = parser.add_argument_group("keep the result as a cable of your own")
    save.add_argument("--save-as", metavar="ID", help="id for the new cable, e.g. 'roof-feeder'")
    save.add_argument("--description", metavar="TEXT", help="plain words for the new cable")
    save.add_argument("--category", choices=CATEGORIES, default="coax",
                      help="category of the new cable (default coax)")
    save.add_argument("--z0", metavar="Z", default="50 ohm",
                      help="its nominal impedance (default '50 ohm')")
    add_output_options(parser)


def _length_tolerance_m(text: str | None, length_m: float) -> float | None:
    """``'1 cm'`` (absolute) or ``'0.5 %'`` (of the length) -> metres; None for the default."""
    from calc.parse import parse

    if text is None:
        return None
    if "%" in text:
        return parse(text, "--length-tolerance", "tolerance") * length_m
    return parse(text, "--length-tolerance", "length_or_zero")


def _calibration(args):
    """Parse the inputs and run the core; raises InputError for anything refused."""
    from calc import calibrate as core
    from calc.errors import InputError
    from calc.parse import parse

    length_m = parse(args.length, "--length", "length")
    tol_m = _length_tolerance_m(args.length_tolerance, length_m)
    if args.delay is not None:
        for flag, value in (("--end", args.end), ("--order", args.order),
                            ("--frequency-resolution", args.frequency_resolution)):
            if value is not None:
                raise InputError(flag, "applies to --resonance only", "--resonance '4.95 MHz'")
        delay_s = parse(args.delay, "--delay", "time")
        res_s = option(args, "--delay-resolution", "time", core.DEFAULT_DELAY_RESOLUTION_S)
        method = core.vf_from_reel if args.reel else core.vf_from_delay
        return method(length_m, delay_s, tol_m, res_s)
    if args.delay_resolution is not None:
        raise InputError("--delay-resolution", "applies to --delay only", "--delay '101 ns'")
    if args.reel:
        raise InputError("--reel", "a reel is measured with --delay", "--delay '1.52 us'")
    frequency_hz = parse(args.resonance, "--resonance", "frequency")
    res_hz = option(args, "--frequency-resolution", "frequency")
    return core.vf_from_stub(length_m, frequency_hz, args.end or "open",
                             1 if args.order is None else args.order, tol_m, res_hz)


def describe_calibration(cal, units: str = "metric", fraction: int = 16) -> list[str]:
    """Human lines for a :class:`calc.calibrate.Calibration` (shared with the TUI)."""
    from calc.velocity import from_vf
    from tui import fmt
    from tui.commands.velocity import describe

    def row(label: str, text: str) -> str:
        return f"{label:<{_LABEL}} {text}"

    lines = [row("method", _METHOD_WORDS[cal.method]),
             row("length", f"{fmt.length(cal.length_m, units, fraction)} +/- "
                           f"{fmt.length(cal.length_tolerance_m, units, fraction)}")]
    if cal.delay_s is not None:
        lines.append(row("round-trip delay", f"{fmt.time(cal.delay_s)} +/- "
                                             f"{fmt.time(cal.delay_resolution_s)}"))
    else:
        lines.append(row("resonance", f"{fmt.frequency(cal.frequency_hz)} +/- "
                                      f"{fmt.frequency(cal.frequency_resolution_hz)}, order "
                                      f"{cal.order}: the stub is {cal.quarter_waves} quarter "
                                      "wave(s)"))
    lines.append(row("measured VF", f"{fmt.vf(cal.vf, 4)}  ({fmt.vf(cal.vf_low, 4)} to "
                                    f"{fmt.vf(cal.vf_high, 4)}, +/- {fmt.percent(cal.vf_tolerance)})"))
    return lines + describe(from_vf(cal.vf))[1:]


def _save(args, cal) -> str:
    """Append the result to the user catalog; returns the file's path. Nothing written on error."""
    import datetime
    import math

    from cable_catalog.loader import CatalogWriteError, append_user_cable
    from calc.errors import InputError
    from calc.parse import parse
    from tui.paths import user_catalog_path

    z0 = parse(args.z0, "--z0", "impedance")
    from tui import fmt

    what = (f"{cal.length_m:g} m, {fmt.time(cal.delay_s)} round trip" if cal.delay_s
            else f"{cal.length_m:g} m, order {cal.order}, {fmt.frequency(cal.frequency_hz)}")
    entry = {
        "id": args.save_as.strip(),
        "description": (args.description or f"measured cable, VF {cal.vf:.3f}").strip(),
        "category": args.category,
        "z0_ohm": z0,
        "vf": round(cal.vf, 4),
        "vf_tolerance": math.ceil(cal.vf_tolerance * 1e4) / 1e4,  # rounded up, never tighter
        "source": f"measured with halftrip calibrate on {datetime.date.today().isoformat()} "
                  f"({_METHOD_WORDS[cal.method]}: {what})",
    }
    path = user_catalog_path()
    try:
        append_user_cable(path, entry)
    except CatalogWriteError as exc:
        raise InputError("--save-as", str(exc), "roof-feeder") from None
    except OSError as exc:
        raise InputError("--save-as", f"cannot write {path} ({exc.strerror or exc}); "
                                      "nothing was written") from None
    return str(path)


def run(args) -> int:
    from calc.errors import InputError

    if args.save_as is None and args.description is not None:
        raise InputError("--description", "goes with --save-as", "--save-as roof-feeder")
    cal = _calibration(args)
    saved_to = _save(args, cal) if args.save_as is not None else None
    data = {"method": cal.method, "vf": cal.vf, "vf_low": cal.vf_low, "vf_high": cal.vf_high,
            "vf_tolerance": cal.vf_tolerance, "nvp_percent": 100.0 * cal.vf,
            "length_m": cal.length_m, "length_tolerance_m": cal.length_tolerance_m,
            "delay_s": cal.delay_s, "delay_resolution_s": cal.delay_resolution_s,
            "frequency_hz": cal.frequency_hz,
            "frequency_resolution_hz": cal.frequency_resolution_hz,
            "end": cal.end, "order": cal.order, "quarter_waves": cal.quarter_waves,
            "saved_as": args.save_as.strip() if saved_to else None, "user_catalog": saved_to}
    units, fraction = units_of(args)
    lines = describe_calibration(cal, units, fraction)
    if saved_to:
        lines.append(f"saved as cable {data['saved_as']!r} in {saved_to}")
    return emit(args, data, lines)
