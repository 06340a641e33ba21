"""``halftrip echo``: what a load sends back, or the load an observed step implies.

Forward: ``--z0 Z --load SPEC [--frequency F]`` gives the reflection, return
loss, VSWR, mismatch loss, the signs of the reflected voltage and current,
and the step a reflectometer shows (start, final level, time constant).
``--through LENGTH --vf X`` (a lossless line of Z0) or ``--through RUN`` (catalog
cables with their loss) with ``--frequency`` moves the reference to the near
end, where an analyser reads it.

Backwards: ``--z0 Z --observed-step LEVEL`` (rho, or volts with ``--incident``)
gives the impedance it implies and the likely kind of fault.
"""

from __future__ import annotations

from tui.commands.common import add_output_options, catalog, emit, warn_hazards

NAME = "echo"
HELP = ("what a load reflects (Gamma, return loss, VSWR, step signature), or the load an "
        "observed step implies")
LOGGABLE = True

def add_arguments(parser) -> None:
    parser.add_argument("--z0", required=True, metavar="Z",
                        help="impedance of the line the load is on, e.g. '50 ohm'")
    what = parser.add_mutually_exclusive_group(required=True)
    what.add_argument("--load", metavar="SPEC",
                      help="open, short, match, '75 ohm', '10 pF', '100 nH', '75 ohm + 100 nH' "
                           "(series), '75 ohm || 10 pF' (parallel), '60+40j ohm' (at "
                           "--frequency), 'line 75 ohm' or 'cable:rg59' (the run continues "
                           "into another impedance)")
    what.add_argument("--observed-step", metavar="LEVEL",
                      help="a reflection seen on a trace: the step as a fraction of the incident "
                           "step (rho, e.g. -0.33), or with --incident the level in volts the "
                           "trace steps to (e.g. '0.67 V')")
    parser.add_argument("--incident", metavar="V",
                        help="the incident step in volts (with --observed-step in volts)")
    parser.add_argument("--settles-to", metavar="LEVEL",
                        help="where the trace settles later, if it moves after the step "
                             "(same units as --observed-step); tells capacitive from inductive")
    parser.add_argument("--frequency", metavar="F",
                        help="frequency for the reflection coefficient, e.g. '146 MHz'")
    parser.add_argument("--through", metavar="LENGTH|RUN",
                        help="read the load through a line: a length (lossless, Z0 = --z0, "
                             "needs --vf) or a run '10 m:rg58, 2 m:rg213' with its loss; "
                             "needs --frequency")
    parser.add_argument("--vf", metavar="X", help="velocity factor of the --through length")
    add_output_options(parser)


def run(args) -> int:
    data, lines, _cables = compute(args)
    return emit(args, data, lines)


def compute(args):
    """(data, lines, cables used): what ``run`` prints, also shown by the TUI's Echo panel."""
    from calc.parse import parse
    from calc.run import parse_run

    z0 = parse(args.z0, "--z0", "impedance")
    if args.observed_step is not None:
        return (*_backwards(args, z0), [])
    data, lines = _forward(args, z0)
    through = args.through if args.through and ":" in args.through else None
    cables = [s.cable for s in parse_run(through, catalog().get, "--through")] if through else []
    return data, lines, cables


# -- forward ------------------------------------------------------------------
def _forward(args, z0: float) -> tuple[dict, list[str]]:
    from calc.errors import InputError
    from calc.loads import parse_load, seen_through, summarize
    from calc.parse import parse

    for flag in ("incident", "settles_to"):
        if getattr(args, flag) is not None:
            raise InputError(f"--{flag.replace('_', '-')}", "goes with --observed-step", "-0.33")
    load = parse_load(args.load, "--load", lookup=lambda cid: catalog().get(cid))
    f = parse(args.frequency, "--frequency", "frequency") if args.frequency else None
    if load.kind == "complex" and f is None:
        raise InputError("--frequency", "a complex impedance holds at one frequency; say which",
                         "146 MHz")
    through = None
    if args.through:
        if f is None:
            raise InputError("--frequency", "reading a load through a line needs a frequency",
                             "146 MHz")
        segments = _through_segments(args, z0)
        through = seen_through(load, f, segments, reference_z_ohm=z0)
        summary = summarize(load, segments[-1].z0_ohm, f)
    else:
        if args.vf:
            raise InputError("--vf", "goes with --through LENGTH", "--through '3 m' --vf 0.66")
        summary = summarize(load, z0, f)
    return _forward_report(args, summary, through)


def _through_segments(args, z0: float):
    from calc.errors import InputError
    from calc.parse import parse
    from calc.run import parse_run
    from calc.simulate import Segment

    if ":" in args.through:
        if args.vf:
            raise InputError("--vf", "a run's cables carry their own velocity factor",
                             "--through '10 m:rg58'")
        run_segments = parse_run(args.through, catalog().get, "--through")
        warn_hazards([s.cable for s in run_segments])
        return [Segment.from_run_segment(s) for s in run_segments]
    length = parse(args.through, "--through", "length")
    if not args.vf:
        raise InputError("--vf", "a --through length needs the line's velocity factor", "0.66")
    vf = parse(args.vf, "--vf", "vf")
    return [Segment(length, z0, vf)]


def _gamma_fields(gamma) -> dict:
    if gamma is None:
        return {"gamma_real": None, "gamma_imag": None, "gamma_magnitude": None,
                "gamma_angle_deg": None}
    import cmath
    import math

    return {"gamma_real": gamma.real, "gamma_imag": gamma.imag, "gamma_magnitude": abs(gamma),
            "gamma_angle_deg": math.degrees(cmath.phase(gamma))}


def _forward_report(args, s, through) -> tuple[dict, list[str]]:
    from tui import fmt

    z = s.impedance_ohm
    data = {
        "z0_ohm": s.z0_ohm,
        "load": args.load,
        "load_kind": s.load.kind,
        "frequency_hz": s.frequency_hz,
        "impedance_real_ohm": None if z is None else z.real,
        "impedance_imag_ohm": None if z is None else z.imag,
        **_gamma_fields(s.gamma),
        "return_loss_db": s.return_loss_db,
        "vswr": s.vswr,
        "mismatch_loss_db": s.mismatch_loss_db,
        "reflected_voltage": s.reflected_voltage.real,
        "reflected_current": s.reflected_current.real,
        "voltage_sign": s.voltage_sign,
        "current_sign": s.current_sign,
        "step_start": s.step_start,
        "step_final": s.step_final,
        "time_constant_s": s.time_constant_s,
        "time_constants_s": list(s.time_constants_s),
        "sentence": s.sentence,
    }
    at = f" at {fmt.frequency(s.frequency_hz)}" if s.frequency_hz is not None else ""
    lines = [f"load               {args.load}  on a {fmt.impedance(s.z0_ohm)} line"]
    if z is not None:
        lines.append(f"impedance          {fmt.impedance(z)}{at}")
    lines += _figure_lines(s.gamma, s.return_loss_db, s.vswr, s.mismatch_loss_db,
                           "give --frequency for a reactive load's reflection")
    basis = at.strip() if s.frequency_hz is not None else "once settled"
    lines.append(f"reflected voltage  {_sign_text(s.voltage_sign)} "
                 f"({s.reflected_voltage.real:+.3f} of the incident, {basis})")
    lines.append(f"reflected current  {_sign_text(s.current_sign)} "
                 f"({s.reflected_current.real:+.3f} of the incident, {basis})")
    if s.step_start is not None:
        tau = (f", time constant {fmt.time(s.time_constant_s)}" if s.time_constant_s else "")
        lines.append(f"step on a trace    starts at {s.step_start:+.3f}, settles at "
                     f"{s.step_final:+.3f}{tau}")
    lines += fmt.wrapped(f"what it shows      {s.sentence}")
    if through is not None:
        zin = complex(through.input_impedance_ohm)
        data.update({
            "at_load": {k: data[k] for k in ("gamma_real", "gamma_imag", "gamma_magnitude",
                                             "gamma_angle_deg", "return_loss_db", "vswr",
                                             "mismatch_loss_db")},
            "through": args.through,
            "reference_z_ohm": through.reference_z_ohm,
            "input_impedance_real_ohm": zin.real,
            "input_impedance_imag_ohm": zin.imag,
            **_gamma_fields(complex(through.gamma)),
            "return_loss_db": through.return_loss_db,
            "vswr": through.vswr,
            "mismatch_loss_db": through.mismatch_loss_db,
        })
        lines += ["", f"seen through {args.through}, by an analyser referenced to "
                      f"{fmt.impedance(through.reference_z_ohm)}:",
                  f"input impedance    {fmt.impedance(zin)}"]
        lines += _figure_lines(complex(through.gamma), through.return_loss_db, through.vswr,
                               through.mismatch_loss_db, "")
    return data, lines


def _figure_lines(gamma, rl, vswr, ml, missing: str) -> list[str]:
    import cmath
    import math

    from tui import fmt

    if gamma is None:
        return [f"reflection         {missing}"]
    return [
        f"reflection         Gamma {gamma.real:+.4f} {'+' if gamma.imag >= 0 else '-'} "
        f"j{abs(gamma.imag):.4f}  (|Gamma| {abs(gamma):.4f}, "
        f"{math.degrees(cmath.phase(gamma)):+.1f} deg)",
        f"return loss        {fmt.decibels(rl)}",
        f"VSWR               {fmt.ratio(vswr)}",
        f"mismatch loss      {fmt.decibels(ml) if math.isfinite(ml) else 'total (all reflected)'}",
    ]


def _sign_text(sign: str) -> str:
    return {"same": "same sign", "inverted": "inverted",
            "reversed": "reversed", "none": "none"}[sign]


# -- backwards ----------------------------------------------------------------
def _level(text: str, field: str, incident: float | None) -> float:
    """rho from a fraction, or from the level in volts the trace steps to."""
    from calc.errors import InputError
    from calc.parse import parse_level

    level, in_volts = parse_level(text, field)
    if in_volts:
        if incident is None:
            raise InputError("--incident", f"{field} in volts needs the incident step in volts",
                             "1 V")
        return level / incident - 1.0
    if incident is not None:
        raise InputError(field, "with --incident give the level in volts the trace steps to",
                         "0.67 V")
    return level


def _backwards(args, z0: float) -> tuple[dict, list[str]]:
    from calc.errors import InputError
    from calc.loads import from_observed_step
    from calc.parse import parse
    from tui import fmt

    for flag in ("frequency", "through", "vf"):
        if getattr(args, flag):
            raise InputError(f"--{flag}", "goes with --load, not --observed-step", "--load open")
    incident = None
    if args.incident is not None:
        incident = parse(args.incident, "--incident", "voltage")
        if incident == 0:
            raise InputError("--incident", "the incident step cannot be 0 V", "1 V")
    level = _level(args.observed_step, "--observed-step", incident)
    settles = (_level(args.settles_to, "--settles-to", incident)
               if args.settles_to is not None else None)
    r = from_observed_step(level, z0, settles_to=settles)
    data = {
        "z0_ohm": z0,
        "level": r.level,
        "settles_to": r.settles_to,
        "impedance_ohm": r.impedance_ohm,
        "kind": r.kind,
        "sentence": r.sentence,
        "alternatives": list(r.alternatives),
        "series_resistance_ohm": r.series_resistance_ohm,
        "shunt_resistance_ohm": r.shunt_resistance_ohm,
    }
    lines = [f"observed step      {r.level:+.3f} of the incident step (rho)"]
    if r.settles_to is not None:
        lines.append(f"settles to         {r.settles_to:+.3f}")
    lines += [f"implies            {fmt.impedance(r.impedance_ohm)} as a resistive load at the "
              f"end of a {fmt.impedance(z0)} line",
              f"likely kind        {r.kind}"]
    lines += fmt.wrapped(f"what it shows      {r.sentence}")
    lines.append("it could also be:")
    for alt in r.alternatives:
        lines += fmt.wrapped(f"  - {alt}", indent=4)
    if r.series_resistance_ohm is not None:
        lines.append(f"    (as a resistance in series in a joint: "
                     f"{fmt.impedance(r.series_resistance_ohm)})")
    if r.shunt_resistance_ohm is not None:
        lines.append(f"    (as a resistance across the line: "
                     f"{fmt.impedance(r.shunt_resistance_ohm)})")
    lines += fmt.wrapped("A level alone cannot tell these apart: look at what the trace does "
                         "after the step, and compare with 'halftrip simulate'.", indent=0)
    return data, lines
