"""Quarter-wave matching sections and in-phase phasing harnesses from catalog cables.

Pure: SI floats and numpy arrays in, frozen dataclasses out. Every figure is
computed from the terminated-line input impedance (:func:`calc.tline.input_impedance`)
with each cable's propagation constant (:func:`calc.cable.cable_propagation_constant`,
which includes the catalog's loss model where it has one), at the design
frequency and across a band:

.. math::

    Z_T = \\sqrt{Z_1 Z_2}, \\qquad
    Z_{in} = Z_0 \\frac{Z_L + Z_0\\tanh\\gamma l}{Z_0 + Z_L\\tanh\\gamma l}

(any microwave engineering text's transmission-line chapter, e.g. Pozar,
*Microwave Engineering*, ch. 2). Two equal cables in parallel act as one
line of Z0/2 with the same propagation constant. The cable's Z0 is taken as
its nominal real value; VSWR is relative to the (real) source impedance.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass
from itertools import product

import numpy as np

from calc.cable import Cable, cable_propagation_constant
from calc.constants import C0_M_PER_S
from calc.cut import CutLength, cut_length, physical_length_m, reach
from calc.errors import InputError
from calc.locate import check_positive, check_tolerance
from calc.tline import input_impedance, reflection_coefficient, vswr

#: Harness topologies: every arm a quarter-wave transformer to N Z_feed, or
#: half-wave repeater arms and one quarter-wave transformer after the junction.
TOPOLOGIES = ("quarter", "half")

#: Frequencies evaluated across a band (edges included).
BAND_POINTS = 201

#: Impedance ratios closer than this count as equally near (log scale).
_TIE = 1e-9

#: Highest impedance a line section is asked to match (ohm).
MAX_IMPEDANCE_OHM = 1e6

#: Most antennas one harness junction joins.
MAX_ANTENNAS = 64


def _impedance(value: float, name: str) -> float:
    check_positive(value, name, "50 ohm")
    if value > MAX_IMPEDANCE_OHM:
        raise InputError(name, f"{value:g} ohm is beyond what a line section matches "
                         f"(at most {MAX_IMPEDANCE_OHM:g} ohm)", "50 ohm")
    return float(value)


def transformer_impedance(z1_ohm: float, z2_ohm: float) -> float:
    """Ideal quarter-wave transformer impedance :math:`Z_T = \\sqrt{Z_1 Z_2}` (ohm)."""
    return math.sqrt(_impedance(z1_ohm, "impedance") * _impedance(z2_ohm, "impedance"))


def band_frequencies(frequency_hz: float, band_hz: tuple[float, float] | None,
                     points: int = BAND_POINTS) -> np.ndarray:
    """Frequencies to evaluate: ``points`` across ``band_hz`` (edges included),
    or just ``frequency_hz`` when no band is given.

    Refuses a band that does not contain the design frequency.
    """
    if not (math.isfinite(frequency_hz) and frequency_hz > 0.0):
        raise InputError("frequency", f"{frequency_hz:g} Hz must be above zero", "146 MHz")
    if band_hz is None:
        return np.array([frequency_hz])
    lo, hi = band_hz
    if not (math.isfinite(lo) and math.isfinite(hi) and 0.0 < lo < hi):
        raise InputError("band", f"{lo:g}-{hi:g} Hz is not a band", "144-148 MHz")
    if not lo <= frequency_hz <= hi:
        raise InputError("band", f"{lo / 1e6:g}-{hi / 1e6:g} MHz does not contain the design "
                         f"frequency {frequency_hz / 1e6:g} MHz", "144-148 MHz")
    return np.linspace(lo, hi, max(int(points), 2))


@dataclass(frozen=True)
class Section:
    """A length of one catalog cable, or of two equal ones in parallel (``parallel`` = 2)."""

    cable: Cable
    parallel: int
    electrical_deg: float  # at the design frequency
    physical_length_m: float

    @property
    def z0_ohm(self) -> float:
        return self.cable.z0_ohm / self.parallel

    def loss_db(self, frequency_hz: float) -> float:
        """Matched-line loss of the section at ``frequency_hz``, dB (0 with no loss model)."""
        return float(self.cable.loss_db_per_m(frequency_hz)) * self.physical_length_m


def make_section(cable: Cable, parallel: int, electrical_deg: float,
                 frequency_hz: float) -> Section:
    """The section of ``cable`` that is ``electrical_deg`` long at ``frequency_hz``."""
    if parallel not in (1, 2):
        raise ValueError("parallel must be 1 or 2")
    return Section(cable, parallel, electrical_deg,
                   physical_length_m(electrical_deg, frequency_hz, cable.vf))


def section_input_impedance(section: Section, z_load_ohm: np.ndarray | complex,
                            frequency_hz: np.ndarray | float) -> np.ndarray:
    """Impedance seen into ``section`` terminated in ``z_load_ohm`` (vectorised over
    frequency; ``z_load_ohm`` may be an array over the same frequencies)."""
    gamma = cable_propagation_constant(section.cable, frequency_hz)
    return input_impedance(z_load_ohm, section.z0_ohm, gamma, section.physical_length_m)


@dataclass(frozen=True, eq=False)
class Response:
    """What a source of ``z_source_ohm`` sees, at the design frequency and across a band."""

    frequency_hz: float
    impedance_center_ohm: complex
    vswr_center: float
    band_hz: np.ndarray
    impedance_band_ohm: np.ndarray
    vswr_band: np.ndarray
    vswr_worst: float
    worst_frequency_hz: float


def response(z_source_ohm: float, frequency_hz: float, band_hz: np.ndarray,
             impedance: Callable[[np.ndarray], np.ndarray]) -> Response:
    """Evaluate ``impedance(f)`` (seen from the source) at the design frequency and
    over ``band_hz``; VSWR is relative to ``z_source_ohm``."""
    f = np.concatenate(([frequency_hz], np.asarray(band_hz, dtype=float)))
    z = np.asarray(impedance(f), dtype=complex)
    s = vswr(reflection_coefficient(z, z_source_ohm))
    worst = int(np.argmax(s))
    return Response(frequency_hz, complex(z[0]), float(s[0]), f[1:], z[1:], s[1:],
                    float(s[worst]), float(f[worst]))


@dataclass(frozen=True, eq=False)
class Candidate:
    """One catalog section tried as a quarter-wave transformer."""

    section: Section
    response: Response
    loss_db: float  # matched-line loss at the design frequency (0 with no loss model)

    @property
    def has_loss_model(self) -> bool:
        return self.section.cable.has_loss_model


@dataclass(frozen=True, eq=False)
class Match:
    """Quarter-wave transformers from ``z_source_ohm`` to ``z_load_ohm``, nearest first."""

    z_source_ohm: float
    z_load_ohm: float
    frequency_hz: float
    band_hz: tuple[float, float] | None
    ideal_impedance_ohm: float
    candidates: tuple[Candidate, ...]


def section_options(cables: Iterable[Cable], allow_parallel: bool = True
                    ) -> list[tuple[Cable, int]]:
    """Every (cable, 1) and, if allowed, (cable, 2): the line impedances on offer."""
    counts = (1, 2) if allow_parallel else (1,)
    return [(c, n) for c in cables for n in counts]


def _nearness(z0_ohm: float, target_ohm: float) -> float:
    """Distance between two impedances on a ratio scale, |ln(Z0/target)|."""
    return abs(math.log(z0_ohm / target_ohm))


def quarter_wave_match(z_source_ohm: float, z_load_ohm: float, frequency_hz: float,
                       cables: Sequence[Cable], band_hz: tuple[float, float] | None = None,
                       *, allow_parallel: bool = True, limit: int | None = None,
                       points: int = BAND_POINTS) -> Match:
    """Catalog quarter-wave sections from ``z_source_ohm`` to a ``z_load_ohm`` load.

    Each cable of ``cables`` (and, with ``allow_parallel``, two of it in
    parallel) is cut a quarter wave at ``frequency_hz``, terminated in the
    load and evaluated with its own loss. Candidates come nearest to the
    ideal :math:`\\sqrt{Z_1 Z_2}` first (ratio scale); among equally near
    ones, cables with a loss model before those without, then lowest loss,
    then lowest worst-band VSWR. ``limit`` keeps only the first ones.
    """
    ideal = transformer_impedance(z_source_ohm, z_load_ohm)
    band = band_frequencies(frequency_hz, band_hz, points)
    found = []
    for cable, n in section_options(cables, allow_parallel):
        section = make_section(cable, n, 90.0, frequency_hz)
        resp = response(z_source_ohm, frequency_hz, band,
                        lambda f, s=section: section_input_impedance(s, z_load_ohm, f))
        found.append(Candidate(section, resp, section.loss_db(frequency_hz)))
    found.sort(key=lambda c: (round(_nearness(c.section.z0_ohm, ideal) / _TIE) * _TIE,
                              not c.has_loss_model, c.loss_db, c.response.vswr_worst,
                              c.section.cable.id, c.section.parallel))
    if limit is not None:
        found = found[: max(int(limit), 0)]
    return Match(z_source_ohm, z_load_ohm, frequency_hz, band_hz, ideal, tuple(found))


# --- harnesses ---------------------------------------------------------------------


@dataclass(frozen=True)
class HarnessPiece:
    """One piece on a harness cut list.

    ``role`` is "arm" (``index`` 1..N) or "transformer" (``index`` 0, between
    the junction and the feed line). ``multiple`` counts ``unit_deg`` (90:
    quarter waves, 180: half waves). A piece of two cables in parallel is
    two equal pieces of ``cut`` each.
    """

    role: str
    index: int
    section: Section
    unit_deg: float
    multiple: int
    cut: CutLength


@dataclass(frozen=True)
class PhaseSpread:
    """Arm-to-arm phase spread at the junction, from the stated tolerances.

    Equal arms are in phase by design, so any spread comes from the arms not
    being equal. Two assumptions, each reported separately (worst case: one
    arm at the top of the tolerance, another at the bottom):

    * ``cut_tolerance_m``: every arm cut within +/- this of its length, all
      arms from one roll (one VF): spread :math:`2\\cdot 360^\\circ f\\,\\delta/(VF c_0)`;
    * ``vf_tolerance``: the arms cut exactly but from rolls whose VF differs
      by up to +/- this (relative): spread
      :math:`\\theta(f)\\,2t/(1-t^2)`, with :math:`\\theta(f)` the arm's
      electrical length at f.

    Each tuple holds the band's low edge, the design frequency and the high edge.
    """

    cut_tolerance_m: float
    vf_tolerance: float
    frequencies_hz: tuple[float, float, float]
    cut_spread_deg: tuple[float, float, float]
    vf_spread_deg: tuple[float, float, float]


def phase_spread(arm: Section, frequency_hz: float, band_hz: np.ndarray,
                 cut_tolerance_m: float, vf_tolerance: float | None = None) -> PhaseSpread:
    """:class:`PhaseSpread` of equal arms like ``arm`` (``vf_tolerance`` defaults to the
    arm cable's catalog tolerance)."""
    if not (math.isfinite(cut_tolerance_m) and cut_tolerance_m >= 0.0):
        raise InputError("cut tolerance", f"{cut_tolerance_m:g} m must be zero or more", "2 mm")
    if cut_tolerance_m > arm.physical_length_m:
        raise InputError("cut tolerance", f"{cut_tolerance_m:g} m is more than a whole arm "
                         f"({arm.physical_length_m:.3g} m)", "2 mm")
    t = check_tolerance(arm.cable.vf_tolerance if vf_tolerance is None else vf_tolerance,
                        "VF tolerance")
    f = np.array([float(np.min(band_hz)), frequency_hz, float(np.max(band_hz))])
    cut = 2.0 * 360.0 * f * cut_tolerance_m / (arm.cable.vf * C0_M_PER_S)
    theta = arm.electrical_deg * f / frequency_hz
    vf_spread = theta * 2.0 * t / (1.0 - t * t)
    return PhaseSpread(cut_tolerance_m, t, tuple(f.tolist()), tuple(cut.tolist()),
                       tuple(vf_spread.tolist()))


@dataclass(frozen=True, eq=False)
class Harness:
    """An in-phase harness: N equal arms to a junction fed by a line of ``feed_z_ohm``.

    ``arms`` are the N equal arm pieces; ``transformer`` the quarter-wave
    section from the junction to the feed line (topology "half"; None for
    "quarter"). ``ideal_arm_z0_ohm``/``ideal_transformer_z0_ohm`` are the
    line impedances the topology asks for; the pieces say what the catalog
    gave. ``response`` is what the feed line sees; ``junction_center_ohm`` and
    ``junction_band_ohm`` the arms in parallel at the design frequency and
    across the band.
    """

    antennas: int
    antenna_z_ohm: float
    feed_z_ohm: float
    frequency_hz: float
    band_hz: tuple[float, float] | None
    topology: str
    arm_reach_m: float
    slack_m: float
    ideal_arm_z0_ohm: float
    ideal_transformer_z0_ohm: float | None
    arms: tuple[HarnessPiece, ...]
    transformer: HarnessPiece | None
    junction_center_ohm: complex
    junction_band_ohm: np.ndarray
    response: Response
    phase: PhaseSpread


def _piece(role: str, index: int, cable: Cable, parallel: int, unit_deg: float,
           multiple: int, frequency_hz: float, allowance_per_end_m: float,
           denominator: int) -> HarnessPiece:
    section = make_section(cable, parallel, unit_deg * multiple, frequency_hz)
    return HarnessPiece(role, index, section, unit_deg, multiple,
                        cut_length(section.physical_length_m, allowance_per_end_m, 2,
                                   denominator))


def _arm_multiple(kind: str, cable: Cable, frequency_hz: float, arm_reach_m: float,
                  slack_m: float) -> int:
    """Smallest count of the kind's unit that reaches the arm span plus slack (1 with none)."""
    need = arm_reach_m + slack_m
    return reach(need, frequency_hz, cable.vf, kind).multiple if need > 0.0 else 1


def _nearest(target_ohm: float, options: list[tuple[Cable, int]]) -> list[tuple[Cable, int]]:
    """The options whose line impedance is nearest ``target_ohm`` (all ties)."""
    if not options:
        raise InputError("cables", "no catalog cable to choose from", "rg59")
    best = min(_nearness(c.z0_ohm / n, target_ohm) for c, n in options)
    return [(c, n) for c, n in options if _nearness(c.z0_ohm / n, target_ohm) <= best + _TIE]


def harness(antennas: int, antenna_z_ohm: float, feed_z_ohm: float, frequency_hz: float,
            cables: Sequence[Cable], *, topology: str = "quarter",
            band_hz: tuple[float, float] | None = None, arm_reach_m: float = 0.0,
            slack_m: float = 0.0, allowance_per_end_m: float = 0.0,
            cut_tolerance_m: float = 0.002, arm_cable: Cable | None = None,
            transformer_cable: Cable | None = None, allow_parallel: bool = True,
            denominator: int = 16, points: int = BAND_POINTS) -> Harness:
    """Design an in-phase harness for ``antennas`` equal antennas of ``antenna_z_ohm``.

    * ``"quarter"``: each arm is an odd number of quarter waves of the
      catalog line nearest :math:`\\sqrt{Z_a N Z_{feed}}`, presenting
      :math:`N Z_{feed}` at the junction, where the N arms in parallel give
      :math:`Z_{feed}`.
    * ``"half"``: each arm is a whole number of half waves of the line
      nearest :math:`Z_a` (repeating :math:`Z_a` at the junction, :math:`Z_a/N`
      in parallel), then one quarter wave of the line nearest
      :math:`\\sqrt{(Z_a/N) Z_{feed}}` to the feed line.

    Arms are the shortest allowed length that reaches ``arm_reach_m`` (the
    distance from the junction to the farthest antenna) plus ``slack_m``.
    Lines come from ``cables`` (single, or two in parallel with
    ``allow_parallel``) unless ``arm_cable``/``transformer_cable`` fix them;
    among equally near lines, those with a loss model first, then the lowest
    loss (one arm plus the transformer), then the lowest worst-band VSWR.
    Connector allowances come off both ends of every piece.
    """
    if not isinstance(antennas, int) or not 2 <= antennas <= MAX_ANTENNAS:
        raise InputError("antennas", f"{antennas!r}: a harness joins at least 2 and at most "
                         f"{MAX_ANTENNAS} antennas", "4")
    za = _impedance(antenna_z_ohm, "antenna impedance")
    zf = _impedance(feed_z_ohm, "feed impedance")
    if topology not in TOPOLOGIES:
        raise InputError("topology", f"{topology!r} is not one of {', '.join(TOPOLOGIES)}",
                         "quarter")
    if not (math.isfinite(arm_reach_m) and arm_reach_m >= 0.0):
        raise InputError("span", f"{arm_reach_m:g} m must be zero or more", "1.5 m")
    if not (math.isfinite(slack_m) and slack_m >= 0.0):
        raise InputError("slack", f"{slack_m:g} m must be zero or more", "100 mm")
    band = band_frequencies(frequency_hz, band_hz, points)
    options = section_options(cables, allow_parallel)
    n = antennas
    if topology == "quarter":
        ideal_arm, ideal_tr = math.sqrt(za * n * zf), None
        arm_kind, arm_unit = "transformer", 90.0
    else:
        ideal_arm, ideal_tr = za, math.sqrt(za / n * zf)
        arm_kind, arm_unit = "repeater", 180.0
    arm_options = section_options([arm_cable], allow_parallel) if arm_cable else options
    arm_choices = _nearest(ideal_arm, arm_options)
    tr_choices: list = [None]
    if topology == "half":
        tr_options = (section_options([transformer_cable], allow_parallel)
                      if transformer_cable else options)
        tr_choices = _nearest(ideal_tr, tr_options)

    best = None
    for (ac, an), tr in product(arm_choices, tr_choices):
        k = _arm_multiple(arm_kind, ac, frequency_hz, arm_reach_m, slack_m)
        arm = _piece("arm", 1, ac, an, arm_unit, k, frequency_hz, allowance_per_end_m,
                     denominator)
        trans = None if tr is None else _piece("transformer", 0, tr[0], tr[1], 90.0, 1,
                                               frequency_hz, allowance_per_end_m, denominator)

        def seen(f, arm=arm, trans=trans):
            z_junction = section_input_impedance(arm.section, za, f) / n
            if trans is None:
                return z_junction
            return section_input_impedance(trans.section, z_junction, f)

        resp = response(zf, frequency_hz, band, seen)
        pieces = [arm] if trans is None else [arm, trans]
        key = (not all(p.section.cable.has_loss_model for p in pieces),
               sum(p.section.loss_db(frequency_hz) for p in pieces), resp.vswr_worst,
               [(p.section.cable.id, p.section.parallel) for p in pieces])
        if best is None or key < best[0]:
            best = (key, arm, trans, resp)
    _, arm, trans, resp = best
    arms = tuple(HarnessPiece("arm", i, arm.section, arm.unit_deg, arm.multiple, arm.cut)
                 for i in range(1, n + 1))
    junction = section_input_impedance(arm.section, za, np.concatenate(([frequency_hz], band))) / n
    return Harness(n, za, zf, frequency_hz, band_hz, topology, arm_reach_m, slack_m, ideal_arm,
                   ideal_tr, arms, trans, complex(junction[0]), junction[1:], resp,
                   phase_spread(arm.section, frequency_hz, band, cut_tolerance_m))
