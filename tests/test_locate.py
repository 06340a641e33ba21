"""calc.locate: one cable, a run of cables, and two-ended location.

Reference values are hand-derived from the exact SI value of c0
(299 792 458 m/s, BIPM SI Brochure, 9th edition) with a calculator, each
formula written beside its check; the two-ended relation is the one of
power-cable fault-location practice (common practice).
"""

from __future__ import annotations

import pytest
from hypothesis import example, given
from hypothesis import strategies as st

from calc.cable import Cable
from calc.errors import InputError, OutOfRunError
from calc.locate import (
    delay_from_distance_s,
    expected_delay,
    locate,
    locate_in_run,
    locate_two_ended,
    run_delay_for_distance,
    run_junctions,
)
from calc.run import RunSegment

REL = 1e-9


def _cable(cid: str, vf: float, tol: float) -> Cable:
    return Cable(id=cid, description=cid, category="coax", z0_ohm=50.0, vf=vf,
                 vf_tolerance=tol, source="test")


SOLID = _cable("solid", 0.66, 0.03)
FOAM = _cable("foam", 0.88, 0.02)
# An invented run on a made-up rooftop: jumper, hardline, jumper.
ROOF_RUN = (RunSegment(2.0, SOLID), RunSegment(45.0, FOAM), RunSegment(1.5, SOLID))


# ---------------------------------------------------------------- one cable


def test_distance_hand_derived_from_c0():
    # SI c0: d = 0.66 x 299 792 458 m/s x 100 ns / 2 = 9.893151114 m
    loc = locate(100e-9, 0.66)
    assert loc.distance_m == pytest.approx(9.893151114, rel=REL)


def test_range_from_vf_tolerance_hand_derived():
    # SI c0: 9.893151114 m x (1 -/+ 0.03) = 9.596356581 m .. 10.189945647 m
    loc = locate(100e-9, 0.66, 0.03)
    assert loc.distance_low_m == pytest.approx(9.596356581, rel=REL)
    assert loc.distance_high_m == pytest.approx(10.189945647, rel=REL)


def test_resolution_and_dead_zone_hand_derived():
    # SI c0: v t_r / 2 = 0.66 x 0.299792458 m/ns x 2 ns / 2 = 0.197863022 m;
    # v t_pw / 2 with 10 ns = 0.989315111 m
    loc = locate(100e-9, 0.66, rise_time_s=2e-9, pulse_width_s=10e-9)
    assert loc.instrument.resolution_m == pytest.approx(0.197863022, rel=1e-8)
    assert loc.instrument.dead_zone_m == pytest.approx(0.989315111, rel=1e-8)
    assert not loc.instrument.in_dead_zone
    assert locate(5e-9, 0.66, pulse_width_s=10e-9).instrument.in_dead_zone


def test_vacuum_rule_of_thumb():
    # light in vacuum covers 0.98357 ft per ns (from c0 and the 0.3048 m foot, NIST);
    # "about a foot per nanosecond" is common practice. 200 ns round trip = 100 ns one way.
    loc = locate(200e-9, 1.0)
    assert loc.distance_m / 0.3048 == pytest.approx(98.357, abs=1e-3)


def test_range_never_faster_than_light():
    # VF 0.99 + 3 % would exceed 1: capped at the vacuum distance c0 t / 2 (SI c0)
    loc = locate(100e-9, 0.99, 0.03)
    assert loc.distance_high_m == pytest.approx(299_792_458.0 * 100e-9 / 2, rel=REL)


def test_expected_delay_hand_derived():
    # SI c0: t = 2 x 24 m / (0.66 x 299 792 458 m/s) = 242.592069 ns
    pred = expected_delay(24.0, 0.66, 0.03)
    assert pred.round_trip_delay_s == pytest.approx(242.592069e-9, rel=1e-8)
    assert pred.round_trip_delay_low_s < pred.round_trip_delay_s < pred.round_trip_delay_high_s


@pytest.mark.parametrize("delay", [0.0, -1e-9, float("inf"), float("nan")])
def test_refuses_bad_delay(delay):
    with pytest.raises(InputError, match="delay"):
        locate(delay, 0.66)


@pytest.mark.parametrize("vf", [0.0, -0.5, 1.01, float("nan")])
def test_refuses_vf_outside_unit_interval(vf):
    with pytest.raises(InputError, match="velocity factor"):
        locate(100e-9, vf)


@given(delay=st.floats(1e-12, 1e-3), vf=st.floats(0.05, 1.0), tol=st.floats(0.0, 0.5))
def test_locate_then_reverse_gives_the_same_delay(delay, vf, tol):
    loc = locate(delay, vf, tol)
    assert expected_delay(loc.distance_m, vf, tol).round_trip_delay_s == pytest.approx(delay,
                                                                                     rel=1e-12)
    assert loc.distance_low_m <= loc.distance_m <= loc.distance_high_m


# ---------------------------------------------------------------- a run


def test_junction_delays_hand_derived():
    # SI c0: 2 x 2 m / (0.66 c0) = 20.216006 ns; + 2 x 45 m / (0.88 c0) = 361.361103 ns;
    # + 2 x 1.5 m / (0.66 c0) = 376.523107 ns
    js = run_junctions(ROOF_RUN)
    assert [j.round_trip_delay_s for j in js] == pytest.approx(
        [20.216006e-9, 361.361103e-9, 376.523107e-9], rel=1e-7)
    assert [j.distance_m for j in js] == [2.0, 47.0, 48.5]
    assert [j.is_far_end for j in js] == [False, False, True]
    assert all(j.round_trip_delay_low_s < j.round_trip_delay_s < j.round_trip_delay_high_s
               for j in js)


def test_event_in_the_hardline_hand_derived():
    # SI c0: (300 ns - 20.216006 ns) x 0.88 c0 / 2 = 36.905938 m into segment 1
    loc = locate_in_run(300e-9, ROOF_RUN)
    assert loc.segment_index == 1
    assert loc.cable_id == "foam"
    assert loc.offset_in_segment_m == pytest.approx(36.905938, rel=1e-7)
    assert loc.distance_m == pytest.approx(38.905938, rel=1e-7)
    assert loc.distance_low_m < loc.distance_m < loc.distance_high_m
    assert loc.possible_segment_indices == (1,)
    assert not loc.beyond_nominal_end


def test_event_near_a_junction_names_both_segments():
    loc = locate_in_run(20.3e-9, ROOF_RUN)
    assert loc.possible_segment_indices == (0, 1)


def test_beyond_the_end_is_refused_with_a_clear_message():
    with pytest.raises(OutOfRunError, match="beyond the far end"):
        locate_in_run(900e-9, ROOF_RUN)


def test_just_past_the_end_within_tolerance_is_the_far_end():
    # nominal far end 376.52 ns; the latest it can show with every cable slow is later
    loc = locate_in_run(380e-9, ROOF_RUN)
    assert loc.beyond_nominal_end
    assert loc.segment_index == 2
    assert loc.distance_m == pytest.approx(48.5)
    assert loc.distance_high_m == pytest.approx(48.5)
    assert loc.distance_low_m < 48.5


def test_run_dead_zone_follows_the_cables():
    # a 30 ns pulse covers the 2 m jumper (20.216 ns) and then (30 - 20.216) ns in the
    # hardline: 2 m + 0.88 c0 x 9.783994 ns / 2 = 3.290594 m (SI c0, hand-derived)
    loc = locate_in_run(300e-9, ROOF_RUN, pulse_width_s=30e-9)
    assert loc.instrument.dead_zone_m == pytest.approx(3.290594, rel=1e-6)
    assert not loc.instrument.in_dead_zone


def test_run_reverse_refuses_past_the_end():
    with pytest.raises(OutOfRunError):
        run_delay_for_distance(50.0, ROOF_RUN)


def test_empty_run_is_refused():
    with pytest.raises(InputError, match="--run"):
        locate_in_run(100e-9, ())


runs = st.lists(
    st.tuples(st.floats(0.05, 2000.0), st.floats(0.3, 1.0), st.floats(0.0, 0.1)),
    min_size=1, max_size=6,
).map(lambda segs: tuple(RunSegment(length, _cable(f"c{i}", vf, tol))
                         for i, (length, vf, tol) in enumerate(segs)))


@given(segments=runs, fraction=st.floats(0.001, 1.0))
def test_run_locate_then_reverse_round_trips(segments, fraction):
    total = sum(s.length_m for s in segments)
    distance = fraction * total
    delay = run_delay_for_distance(distance, segments).round_trip_delay_s
    loc = locate_in_run(delay, segments)
    assert loc.distance_m == pytest.approx(distance, rel=1e-9)
    assert loc.distance_low_m <= loc.distance_m * (1 + 1e-12)
    assert loc.distance_m <= loc.distance_high_m * (1 + 1e-12)


@given(length=st.floats(0.1, 5000.0), split=st.floats(0.01, 0.99), vf=st.floats(0.3, 1.0),
       tol=st.floats(0.0, 0.1), where=st.floats(0.001, 1.0))
def test_splitting_one_cable_in_two_changes_no_answer(length, split, vf, tol, where):
    cable = _cable("one", vf, tol)
    whole = (RunSegment(length, cable),)
    halves = (RunSegment(length * split, cable), RunSegment(length * (1 - split), cable))
    delay = where * run_junctions(whole)[-1].round_trip_delay_s
    a, b = locate_in_run(delay, whole), locate_in_run(delay, halves)
    for field in ("distance_m", "distance_low_m", "distance_high_m"):
        assert getattr(b, field) == pytest.approx(getattr(a, field), rel=1e-9)
    assert run_junctions(halves)[-1].round_trip_delay_s == pytest.approx(
        run_junctions(whole)[-1].round_trip_delay_s, rel=1e-12)
    # and a one-segment run is the one-cable answer
    one = locate(delay, vf, tol)
    assert a.distance_m == pytest.approx(one.distance_m, rel=1e-9)
    assert a.distance_low_m == pytest.approx(one.distance_low_m, rel=1e-9)
    assert a.distance_high_m == pytest.approx(min(one.distance_high_m, length), rel=1e-9)


# ---------------------------------------------------------------- both ends


def test_two_ended_hand_derived():
    # power-cable fault-location practice (common practice): x_A = L tA / (tA + tB)
    # 250 m x 1.2 / (1.2 + 0.8) = 150 m; implied VF = 2 x 250 m / (c0 x 2 us) = 0.833910 (SI c0)
    loc = locate_two_ended(1.2e-6, 0.8e-6, 250.0)
    assert loc.distance_from_a_m == pytest.approx(150.0, rel=REL)
    assert loc.distance_from_b_m == pytest.approx(100.0, rel=REL)
    assert loc.implied_vf == pytest.approx(0.833910238, rel=1e-8)
    assert loc.catalog_vf is None and not loc.disagrees


def test_two_ended_flags_a_disagreement_with_the_catalog():
    loc = locate_two_ended(1.2e-6, 0.8e-6, 250.0, catalog_vf=0.567, vf_tolerance=0.05)
    assert loc.disagrees
    assert loc.vf_disagreement == pytest.approx(0.833910238 / 0.567 - 1, rel=1e-8)
    assert not locate_two_ended(1.2e-6, 0.8e-6, 250.0, 0.83, 0.02).disagrees


def test_two_ended_refuses_faster_than_light():
    # 250 m and back needs 1667.8 ns at c0; readings adding up to 1000 ns cannot be one event
    with pytest.raises(InputError, match="cannot be one event"):
        locate_two_ended(0.2e-6, 0.8e-6, 250.0)


@given(length=st.floats(1.0, 20000.0), where=st.floats(0.0, 1.0), vf=st.floats(0.3, 1.0))
@example(length=91.4832593525137, where=0.37, vf=1.0)  # VF exactly 1 must not be refused
def test_two_ended_needs_no_velocity(length, where, vf):
    # simulate an event at x on a cable of any VF: both ends' delays, then place it
    x = where * length
    t_a = delay_from_distance_s(x, vf)
    t_b = delay_from_distance_s(length - x, vf)
    if t_a <= 0 or t_b <= 0:
        return
    loc = locate_two_ended(t_a, t_b, length)
    assert loc.distance_from_a_m == pytest.approx(x, rel=1e-9, abs=1e-9 * length)
    assert loc.implied_vf == pytest.approx(vf, rel=1e-9)
