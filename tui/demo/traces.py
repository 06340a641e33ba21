"""Demo traces: invented sites, made by halftrip's own echo predictor plus noise.

Nothing here was recorded anywhere. Each scenario is a run we made up, put
through :func:`calc.simulate.simulate` (or, for the sweep,
:func:`calc.simulate.reflection_spectrum`), with seeded Gaussian noise and,
for volt traces, the instrument's own incident edge added in front. Run

    python -m tui.demo.traces [DIRECTORY]

to write the files again (default: this package's directory, where they
ship). The scenarios:

* **Kestrel Ridge relay hut** (invented): the feeder from a radio to a mast
  antenna, 2 m of rg58, 45 m of hardline-50-half and 1.5 m of rg58. After a
  storm the joint at the bottom of the hardline is loose (about 6 nH in
  series), water has soaked 1.5 m of the hardline about 27 m up (about 40 ohm,
  slower), and the antenna has been unplugged at the top (open end).
  ``kestrel-ridge-feeder.csv`` is the reflectometer's volt trace (time in
  ns), ``kestrel-ridge-feeder.s1p`` the same feeder swept by an analyser
  (0.5 MHz to 1 GHz in 0.5 MHz steps, 50 ohm reference).
* **12 Millpond Lane** (invented): an 18 m rg6 drop to a wall outlet, with a
  crushed spot 11 m out (about 4 pF across the line) and water in the wall
  plate's connector (about 8 ohm). ``millpond-lane-drop.csv`` holds the level
  in rho against distance in feet, drawn by the instrument with VF 0.84.
"""

from __future__ import annotations

import math
import sys
from dataclasses import dataclass
from pathlib import Path

import numpy as np

DEMO_DIR = Path(__file__).resolve().parent

KESTREL_RUN = "2 m:rg58, 45 m:hardline-50-half, 1.5 m:rg58"
MILLPOND_RUN = "18 m:rg6"
MILLPOND_AXIS_VF = 0.84
STEP_V = 0.5  # an invented instrument: 1 V open-circuit step behind 50 ohm
RISE_S = 0.5e-9


@dataclass(frozen=True)
class TrueEvent:
    """What the scenario put there (for tests and the demo's own check)."""

    distance_m: float
    kind: str


KESTREL_EVENTS = (
    TrueEvent(2.0, "inductive_bump"),
    TrueEvent(29.0, "lower_impedance"),
    TrueEvent(30.5, "higher_impedance"),
    TrueEvent(48.5, "open"),
)
MILLPOND_EVENTS = (
    TrueEvent(11.0, "capacitive_dip"),
    TrueEvent(18.0, "short"),  # 8 ohm on 75 ohm: rho = -0.81, past the short limit of -0.8
)


def _cable(cable_id: str):
    from cable_catalog.loader import load_catalog

    return load_catalog(None).get(cable_id)


def kestrel_segments():
    """The damaged feeder as the predictor's segments (the wet stretch is its own)."""
    from calc.simulate import Segment

    jumper, hard = _cable("rg58"), _cable("hardline-50-half")

    def piece(length_m, c, z0=None, vf=None, label=None):
        return Segment(length_m, z0 or c.z0_ohm, vf or c.vf, c.atten_k1, c.atten_k2,
                       label or c.id)

    return [piece(2.0, jumper), piece(27.0, hard),
            piece(1.5, hard, z0=40.0, vf=0.80, label="wet hardline"),
            piece(16.5, hard), piece(1.5, jumper)]


def kestrel_lumps():
    from calc.simulate import Lump

    return [Lump("series_l", 6e-9, 0)]


def millpond_segments():
    from calc.simulate import Segment

    drop = _cable("rg6")

    def piece(length_m):
        return Segment(length_m, drop.z0_ohm, drop.vf, drop.atten_k1, drop.atten_k2, drop.id)

    return [piece(11.0), piece(7.0)]


def millpond_lumps():
    from calc.simulate import Lump

    return [Lump("shunt_c", 4e-12, 0)]


def instrument_trace(prediction, *, step_v: float = STEP_V, noise_v: float = 0.002,
                     pre_trigger_s: float = 10e-9, seed: int = 0
                     ) -> tuple[np.ndarray, np.ndarray]:
    """What a reflectometer records: its own step, the reflections, and noise (volts).

    The incident edge is the predictor's own Gaussian-filtered step at t = 0
    (same rise time); the quiet pre-trigger is lengthened to ``pre_trigger_s``.
    """
    from calc.simulate import RISE_PER_SIGMA

    dt = float(prediction.time_s[1] - prediction.time_s[0])
    n_pre = int(round(pre_trigger_s / dt))
    t = np.concatenate([prediction.time_s[0] - dt * np.arange(n_pre, 0, -1), prediction.time_s])
    level = np.concatenate([np.zeros(n_pre), prediction.level])
    sigma = prediction.rise_time_s / RISE_PER_SIGMA
    erf = np.vectorize(math.erf)
    incident = 0.5 * (1.0 + erf(t / (sigma * math.sqrt(2.0))))
    noise = np.random.default_rng(seed).normal(0.0, noise_v, t.size)
    return t, step_v * (incident + level) + noise


def kestrel_trace(seed: int = 1):
    from calc.loads import parse_load
    from calc.simulate import simulate

    pred = simulate(kestrel_segments(), parse_load("open"), lumps=kestrel_lumps(),
                    rise_time_s=RISE_S)
    return instrument_trace(pred, seed=seed)


def kestrel_sweep(seed: int = 2) -> tuple[np.ndarray, np.ndarray]:
    """(frequency, S11) as an analyser with a 50 ohm reference reads the feeder."""
    from calc.loads import parse_load
    from calc.simulate import reflection_spectrum

    f = np.arange(1, 2001) * 0.5e6  # 0.5 MHz steps: a 2 us window, fine for a 48.5 m run
    s11 = reflection_spectrum(kestrel_segments(), parse_load("open"), f, lumps=kestrel_lumps())
    rng = np.random.default_rng(seed)
    return f, s11 + 1e-3 * (rng.normal(size=f.size) + 1j * rng.normal(size=f.size))


def millpond_trace(seed: int = 3) -> tuple[np.ndarray, np.ndarray]:
    """(distance in m as the instrument draws it with VF 0.84, level in rho)."""
    from calc.constants import C0_M_PER_S
    from calc.loads import parse_load
    from calc.simulate import simulate

    pred = simulate(millpond_segments(), parse_load("8 ohm"), lumps=millpond_lumps(),
                    rise_time_s=RISE_S)
    noise = np.random.default_rng(seed).normal(0.0, 0.003, pred.level.size)
    distance = pred.time_s * MILLPOND_AXIS_VF * C0_M_PER_S / 2.0
    return distance, pred.level + noise


_HEADER = ("# halftrip demo data: an invented scenario made by halftrip's own predictor\n"
           "# plus noise (see tui/demo/traces.py); not a recording of any real site.\n")


def write_demo_files(directory: Path = DEMO_DIR) -> list[Path]:
    """Write the demo traces into ``directory`` (readable by all); returns the paths."""
    from cable_catalog.loader import atomic_write_text
    from calc.constants import FOOT_M

    directory = Path(directory)
    written = []
    t, v = kestrel_trace()
    lines = [_HEADER + "# Kestrel Ridge relay hut, radio feeder, run " + KESTREL_RUN + "\n"
             "time_ns,level_V\n"]
    lines += [f"{a * 1e9:.4f},{b:.5f}\n" for a, b in zip(t, v, strict=True)]
    written.append(directory / "kestrel-ridge-feeder.csv")
    atomic_write_text(written[-1], "".join(lines))
    f, s = kestrel_sweep()
    lines = ["! halftrip demo data: an invented scenario made by halftrip's own predictor\n"
             "! plus noise (see tui/demo/traces.py); not a measurement of any real site.\n"
             "! Kestrel Ridge relay hut, radio feeder, run " + KESTREL_RUN + "\n"
             "# MHz S RI R 50\n"]
    lines += [f"{a / 1e6:g} {b.real:.6f} {b.imag:.6f}\n" for a, b in zip(f, s, strict=True)]
    written.append(directory / "kestrel-ridge-feeder.s1p")
    atomic_write_text(written[-1], "".join(lines))
    d, r = millpond_trace()
    lines = [_HEADER + "; 12 Millpond Lane, drop to the living-room outlet, run "
             + MILLPOND_RUN + f"; distance drawn with VF {MILLPOND_AXIS_VF}\n"
             "Distance (ft)\tReflection (rho)\n"]
    lines += [f"{a / FOOT_M:.4f}\t{b:.5f}\n" for a, b in zip(d, r, strict=True)]
    written.append(directory / "millpond-lane-drop.csv")
    atomic_write_text(written[-1], "".join(lines))
    for path in written:
        path.chmod(0o644)
    return written


if __name__ == "__main__":
    for p in write_demo_files(Path(sys.argv[1]) if len(sys.argv) > 1 else DEMO_DIR):
        print(p)
