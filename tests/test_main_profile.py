"""Profile of the main: loss weights, crest control, grade line and pressures, checked by hand.

The hand case: a main of two segments over a ridge.  Segment A, 600 m from chainage 0 to 600;
segment B, 900 m from 600 to 1500.  Pipe at 19.0 m at chainage 0, the ridge at 44.5 m at
chainage 600 (vented unless a test says otherwise), 37.5 m at the outlet at 1500.  Suction
level 21.0 m, delivery level 38.0 m.  Losses are simple k·Q² terms (Q in m³/s, k in s²/m⁵) so
the arithmetic can be shown: friction of A 1000 Q², of B 1500 Q²; minor loss of A 200 Q², of
B 300 Q²; suction and pump-branch losses 100 Q².
"""

import json
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.main_profile import (
    DELIVERY_CONTROL,
    OperatingLosses,
    PipeProfile,
    crest_heads,
    grade_line,
    loss_weights,
    low_pressures,
    profile_coverage,
    profile_elevation,
    profile_result,
    rest_grade_line,
    sample_chainages,
    segment_chainages,
    segment_pressure_peaks,
)
from hydraulics.model import ModelError

LENGTHS = np.array([600.0, 900.0])
K_FRICTION = np.array([1000.0, 1500.0])
K_MINOR = np.array([200.0, 300.0])
K_UPSTREAM = 100.0
SUCTION = 21.0
DELIVERY = 38.0
EXTRA = [300.0, 1050.0]  # mid-points of A and B, where the hand values below are worked


def ridge(vented: bool = True, crest_m: float = 44.5) -> PipeProfile:
    return PipeProfile(np.array([0.0, 600.0, 1500.0]), np.array([19.0, crest_m, 37.5]),
                       np.array([False, vented, False]))


def losses(q):
    q2 = np.asarray(q, dtype=float)[..., None] ** 2
    return q2 * K_FRICTION, q2 * K_MINOR


def line_at(vented: bool, q: float):
    friction, minor = losses([q])
    return grade_line(ridge(vented), LENGTHS, friction, minor, DELIVERY,
                      sample_chainages(ridge(vented), LENGTHS, EXTRA))


# --------------------------------------------------------------------------- layout and weights
def test_segments_laid_end_to_end_from_zero():
    start, end = segment_chainages(LENGTHS)
    assert start.tolist() == [0.0, 600.0] and end.tolist() == [600.0, 1500.0]  # hand: 0+600, 600+900


def test_profile_elevation_is_linear_between_points():
    # hand: 19 + (300/600)·(44.5 − 19) = 31.75; 44.5 − (450/900)·(44.5 − 37.5) = 41.0
    assert profile_elevation(ridge(), [300.0, 1050.0]).tolist() == pytest.approx([31.75, 41.0], abs=1e-12)


@pytest.mark.parametrize(("x", "friction", "minor"), [
    (0.0, [0.0, 0.0], [0.0, 0.0]),        # hand: nothing upstream of the start
    (300.0, [0.5, 0.0], [1.0, 0.0]),      # hand: 300/600 of A; A starts before 300
    (600.0, [1.0, 0.0], [1.0, 0.0]),      # hand: A ends at 600; B starts at 600, not before
    (1050.0, [1.0, 0.5], [1.0, 1.0]),     # hand: (1050 − 600)/900 of B
    (1500.0, [1.0, 1.0], [1.0, 1.0]),     # hand: the whole main
    (2000.0, [1.0, 1.0], [1.0, 1.0]),     # hand: past the end, still the whole main
])
def test_loss_weights_at_boundaries_and_inside(x, friction, minor):
    f, m = loss_weights(LENGTHS, x)
    assert f.tolist() == pytest.approx(friction, abs=1e-15) and m.tolist() == minor


def test_zero_length_segment_counts_once_reached():
    f, m = loss_weights([600.0, 0.0, 900.0], [599.0, 600.0, 601.0])
    # hand: the 0 m segment sits at 600; its friction counts from 600 on, its minor loss past 600
    assert f[:, 1].tolist() == [0.0, 1.0, 1.0] and m[:, 1].tolist() == [0.0, 0.0, 1.0]


def test_loss_weights_shape_follows_chainages():
    f, m = loss_weights(LENGTHS, np.zeros((3, 4)))
    assert f.shape == m.shape == (3, 4, 2)


def test_profile_coverage_tolerance():
    short = PipeProfile(np.array([0.0, 50.9]), np.array([1.0, 2.0]), np.array([False, False]))
    assert profile_coverage(short, [50.0]) is None  # hand: 0.9 m off, within the 1 m floor (1 % = 0.5 m)
    too_short = PipeProfile(np.array([0.0, 51.2]), np.array([1.0, 2.0]), np.array([False, False]))
    mismatch = profile_coverage(too_short, [50.0])
    assert mismatch is not None and mismatch.end_difference_m == pytest.approx(1.2)  # hand: 51.2 − 50
    late = PipeProfile(np.array([20.0, 1500.0]), np.array([1.0, 2.0]), np.array([False, False]))
    assert profile_coverage(late, LENGTHS) is not None  # hand: starts 20 m in, tolerance 1 % of 1500 = 15 m
    long = PipeProfile(np.array([0.0, 1514.0]), np.array([1.0, 2.0]), np.array([False, False]))
    assert profile_coverage(long, LENGTHS) is None  # hand: 14 m over, within 15 m


@pytest.mark.parametrize(("chainage", "elevation", "field"), [
    ([0.0, 600.0, 600.0], [1.0, 2.0, 3.0], "profile[2].chainage"),
    ([-1.0, 600.0], [1.0, 2.0], "profile[0].chainage"),
    ([0.0, 600.0], [1.0, math.nan], "profile[1].elevation"),
    ([0.0], [1.0], "profile"),
])
def test_bad_profile_names_the_field(chainage, elevation, field):
    with pytest.raises(ModelError) as caught:
        PipeProfile(np.array(chainage), np.array(elevation), np.zeros(len(chainage), dtype=bool))
    assert caught.value.field_path == field


# --------------------------------------------------------------------------- crest control
# hand: head to the delivery H_D = 38 − 21 + (100 + 1000 + 200 + 1500 + 300) Q² = 17 + 3100 Q²
#       head to the crest  H_c = 44.5 − 21 + (100 + 1000 + 200) Q²          = 23.5 + 1300 Q²
#       equal where 1800 Q² = 6.5: Q = √(6.5/1800) = 0.0600925 m³/s, head 17 + 3100·6.5/1800 = 28.19444 m
SWITCH_FLOW = math.sqrt(6.5 / 1800.0)


def heads(q, vented=True):
    friction, minor = losses(q)
    return crest_heads(ridge(vented), LENGTHS, friction, minor, DELIVERY, SUCTION,
                       K_UPSTREAM * np.asarray(q, dtype=float) ** 2)


def test_crest_governs_at_low_flow_and_delivery_at_high_flow():
    c = heads([0.0, 0.05, 0.08])
    # hand: Q = 0: 23.5 > 17; Q = 0.05: 23.5 + 3.25 = 26.75 > 17 + 7.75 = 24.75;
    #       Q = 0.08: 17 + 19.84 = 36.84 > 23.5 + 8.32 = 31.82
    assert c.system_head_m.tolist() == pytest.approx([23.5, 26.75, 36.84], abs=1e-12)
    assert c.delivery_head_m.tolist() == pytest.approx([17.0, 24.75, 36.84], abs=1e-12)
    assert c.crest_head_m[:, 0].tolist() == pytest.approx([23.5, 26.75, 31.82], abs=1e-12)
    assert c.control_index.tolist() == [1, 1, DELIVERY_CONTROL]  # profile point 1 is the crest


def test_switch_flow_by_hand():
    c = heads([SWITCH_FLOW * 0.999, SWITCH_FLOW, SWITCH_FLOW * 1.001])
    assert c.control_index[0] == 1 and c.control_index[2] == DELIVERY_CONTROL
    assert c.delivery_head_m[1] == pytest.approx(c.crest_head_m[1, 0], abs=1e-12)
    assert c.system_head_m[1] == pytest.approx(17.0 + 3100.0 * 6.5 / 1800.0, abs=1e-12)  # hand: 28.19444 m


def test_without_air_valve_the_delivery_always_governs():
    c = heads([0.0, 0.05, 0.08], vented=False)
    assert c.crest_head_m.shape == (3, 0)
    assert c.control_index.tolist() == [DELIVERY_CONTROL] * 3
    assert c.system_head_m.tolist() == pytest.approx([17.0, 24.75, 36.84], abs=1e-12)  # hand: 17 + 3100 Q²


def test_crest_heads_vectorise_over_any_flow_shape():
    q = np.linspace(0.0, 0.1, 28).reshape(4, 7)
    c = heads(q)
    assert c.system_head_m.shape == c.delivery_head_m.shape == c.control_index.shape == (4, 7)
    assert c.crest_head_m.shape == (4, 7, 1)
    flat = heads(q.ravel())
    np.testing.assert_array_equal(c.system_head_m.ravel(), flat.system_head_m)


# --------------------------------------------------------------------------- grade line
def test_grade_line_crest_governs_by_hand():
    line = line_at(True, 0.05)
    assert line.chainage_m.tolist() == [0.0, 300.0, 600.0, 1050.0, 1500.0]
    assert line.control_index.tolist() == [1]
    # hand, Q² = 0.0025, upstream of the crest H = 44.5 + loss from x to 600:
    #   x = 0:   44.5 + (1000 + 200)·0.0025 = 47.5;   p = 47.5 − 19 = 28.5
    #   x = 300: 44.5 + 0.5·1000·0.0025 = 45.75 (A's fittings lie upstream of 300); p = 45.75 − 31.75 = 14.0
    #   x = 600: 44.5, p = 0 (the air valve holds atmospheric pressure)
    # downstream, full-pipe grade from the delivery 38 + (1500 − x)/900 · 1500·0.0025:
    #   x = 1050: 38 + 1.875 = 39.875 < pipe 41.0 → part full, H = 41.0, p = 0
    #   x = 1500: 38.0, p = 38 − 37.5 = 0.5
    assert line.head_m[0].tolist() == pytest.approx([47.5, 45.75, 44.5, 41.0, 38.0], abs=1e-12)
    assert line.pressure_head_m[0].tolist() == pytest.approx([28.5, 14.0, 0.0, 0.0, 0.5], abs=1e-12)
    assert line.part_full[0].tolist() == [False, False, False, True, False]


def test_grade_line_matches_system_head():
    for q in (0.03, 0.05, 0.08):
        line = line_at(True, q)
        c = heads([q])
        # energy balance: the head at chainage 0 less the suction level plus the upstream losses
        assert line.head_m[0, 0] - SUCTION + K_UPSTREAM * q**2 == pytest.approx(c.system_head_m[0], abs=1e-12)


def test_grade_line_delivery_governs_by_hand():
    line = line_at(True, 0.08)
    assert line.control_index.tolist() == [DELIVERY_CONTROL]
    # hand, Q² = 0.0064, H = 38 + loss from x to the end:
    #   x = 0:    38 + (1000 + 200 + 1500 + 300)·0.0064 = 57.2;  p = 57.2 − 19 = 38.2
    #   x = 300:  38 + (0.5·1000 + 1500 + 300)·0.0064 = 52.72;  p = 52.72 − 31.75 = 20.97
    #   x = 600:  38 + (1500 + 300)·0.0064 = 49.52;             p = 49.52 − 44.5 = 5.02
    #   x = 1050: 38 + 0.5·1500·0.0064 = 42.8;                  p = 42.8 − 41.0 = 1.8
    #   x = 1500: 38;                                           p = 0.5
    assert line.head_m[0].tolist() == pytest.approx([57.2, 52.72, 49.52, 42.8, 38.0], abs=1e-12)
    assert line.pressure_head_m[0].tolist() == pytest.approx([38.2, 20.97, 5.02, 1.8, 0.5], abs=1e-12)
    assert not line.part_full.any()


def test_unvented_crest_is_sub_atmospheric():
    line = line_at(False, 0.05)
    # hand: H(600) = 38 + (1500 + 300)·0.0025 = 42.5; p = 42.5 − 44.5 = −2.0
    assert line.pressure_head_m[0, 2] == pytest.approx(-2.0, abs=1e-12)


def test_rest_lines_vented_and_not():
    vented = rest_grade_line(ridge(True), LENGTHS, DELIVERY, sample_chainages(ridge(), LENGTHS, EXTRA))
    # hand: the column stands at the crest 44.5 upstream of it: p(0) = 44.5 − 19 = 25.5,
    #       p(300) = 44.5 − 31.75 = 12.75, p(600) = 0; downstream drained above 38: p(1050) = 0;
    #       the outlet under the delivery level: p(1500) = 38 − 37.5 = 0.5
    assert vented.pressure_head_m.tolist() == pytest.approx([25.5, 12.75, 0.0, 0.0, 0.5], abs=1e-12)
    assert vented.control_index.tolist() == 1
    shut = rest_grade_line(ridge(False), LENGTHS, DELIVERY, sample_chainages(ridge(), LENGTHS, EXTRA))
    # hand: H = 38 everywhere: p(0) = 38 − 19 = 19, p(600) = 38 − 44.5 = −6.5, p(1050) = 38 − 41 = −3
    assert shut.pressure_head_m.tolist() == pytest.approx([19.0, 6.25, -6.5, -3.0, 0.5], abs=1e-12)


def test_rise_after_a_vented_crest_stays_full_and_sub_atmospheric():
    profile = PipeProfile(np.array([0.0, 600.0, 900.0, 1200.0, 1500.0]),
                          np.array([19.0, 44.5, 30.0, 40.5, 37.5]), np.array([False, True, False, False, False]))
    rest = rest_grade_line(profile, LENGTHS, DELIVERY, sample_chainages(profile, LENGTHS, [750.0]))
    # hand: at 750 the pipe is at 44.5 − 0.5·14.5 = 37.25, under the delivery level: p = 38 − 37.25 = 0.75;
    #       900: p = 38 − 30 = 8; the unvented hump at 1200 holds a siphon: p = 38 − 40.5 = −2.5
    assert rest.chainage_m.tolist() == [0.0, 600.0, 750.0, 900.0, 1200.0, 1500.0]
    assert rest.pressure_head_m.tolist() == pytest.approx([25.5, 0.0, 0.75, 8.0, -2.5, 0.5], abs=1e-12)


def test_hump_after_a_drained_dip_holds_a_siphon():
    profile = PipeProfile(np.array([0.0, 600.0, 900.0, 1200.0, 1500.0]),
                          np.array([19.0, 44.5, 40.0, 42.0, 37.5]), np.array([False, True, False, False, False]))
    rest = rest_grade_line(profile, LENGTHS, DELIVERY)
    # hand: the falling reach 600–900 above the delivery level drains (p = 0); the pipe rises again to an
    #       unvented hump at 1200, which is not drained by the air valve upstream: p = 38 − 42 = −4
    assert rest.pressure_head_m.tolist() == pytest.approx([25.5, 0.0, 0.0, -4.0, 0.5], abs=1e-12)
    assert rest.part_full.tolist() == [False, False, True, False, False]


def test_air_valve_under_pressure_starts_no_part_full_reach():
    profile = PipeProfile(np.array([0.0, 600.0, 1050.0, 1500.0]), np.array([19.0, 49.0, 43.0, 37.5]),
                          np.array([False, True, False, False]))
    friction, minor = losses([0.08])
    line = grade_line(profile, LENGTHS, friction, minor, DELIVERY)
    # hand, Q² = 0.0064: head to the vent 49 + 1200·0.0064 = 56.68 < head to the delivery 38 + 3000·0.0064 = 57.2,
    #       so the delivery governs; at 600 the grade is 38 + 1800·0.0064 = 49.52 (p = +0.52, the valve is shut);
    #       at 1050 it is 38 + 0.5·1500·0.0064 = 42.8 under the pipe at 43.0: a full pipe at p = −0.2
    assert line.control_index.tolist() == [DELIVERY_CONTROL]
    assert line.pressure_head_m[0].tolist() == pytest.approx([38.2, 0.52, -0.2, 0.5], abs=1e-12)
    assert not line.part_full.any()


def test_grade_line_shapes_follow_the_flows():
    q = np.linspace(0.0, 0.1, 6).reshape(2, 3)
    friction, minor = losses(q)
    line = grade_line(ridge(), LENGTHS, friction, minor, np.array([[38.0], [36.0]]))
    n_x = line.chainage_m.size
    assert line.head_m.shape == line.pressure_head_m.shape == line.part_full.shape == (2, 3, n_x)
    assert line.control_index.shape == (2, 3)


# --------------------------------------------------------------------------- result and findings data
RHO = 1000.0  # round density for the hand arithmetic


def result(vented=True):
    ops = []
    for label, pipe, q in (("1 pump", "new", 0.05), ("2 pumps", "aged", 0.08)):
        friction, minor = losses(q)
        ops.append(OperatingLosses(label, "max", pipe, q, DELIVERY, friction, minor))
    return profile_result(ridge(vented), LENGTHS, ops, {"max": DELIVERY, "min": 36.0}, RHO, G)


def test_profile_result_holds_lines_and_json():
    res = result()
    assert res.chainage_m.tolist() == [0.0, 600.0, 1500.0]
    assert res.air_valve_chainage_m.tolist() == [600.0]
    assert [line.control for line in res.scenarios] == ["crest at 600 m", "delivery"]
    assert [line.label for line in res.at_rest] == ["at rest, delivery high", "at rest, delivery low"]
    # hand: Pa = ρ g p: 1000 · 9.80665 · 28.5 = 279 489.525 Pa at chainage 0 with the crest governing
    assert res.scenarios[0].pressure_pa[0] == pytest.approx(279_489.525, rel=1e-12)
    doc = json.loads(json.dumps(res.to_json_dict(), allow_nan=False))
    assert doc["chainage_m"] == [0.0, 600.0, 1500.0] and doc["elevation_m"] == [19.0, 44.5, 37.5]
    first = doc["scenarios"][0]
    assert first["control_chainage_m"] == 600.0 and doc["scenarios"][1]["control_chainage_m"] is None
    assert first["pressure_m"] == pytest.approx([28.5, 0.0, 0.5], abs=1e-12)  # hand: as in the grade-line test
    assert first["grade_line_m"] == pytest.approx([47.5, 44.5, 38.0], abs=1e-12)
    assert doc["at_rest"][0]["pipe"] is None


def test_the_rating_envelope_is_the_pipe_plus_each_rating_as_a_head():
    from dataclasses import replace

    res = replace(result(), segment_rating_pa=np.array([1.0e6, np.nan]))  # PN 10 on the first segment only (demo)
    x, head = res.rating_envelope()
    # hand: 1e6 Pa / (1000 kg/m³ · 9.80665 m/s²) = 101.972 m above the pipe (hydrostatics), at the
    # chainages of the first segment (0 and 600 m); the unrated second segment is one NaN gap
    assert x[:2].tolist() == [0.0, 600.0] and np.isnan(x[-1]) and np.isnan(head[-1])
    assert head[:2] == pytest.approx([19.0 + 101.97162129779283, 44.5 + 101.97162129779283], rel=1e-12)
    assert [a.size for a in replace(res, segment_rating_pa=None).rating_envelope()] == [0, 0]


def test_low_pressures_flag_sub_atmospheric_lines():
    atmospheric = 101_325.0 / (RHO * G)  # 10.332 m of water (standard atmosphere, ISO 2533)
    vapour = 1705.0 / (RHO * G)  # 0.174 m: water at 15 °C (IAPWS-IF97 saturation pressure 1.7057 kPa)
    assert low_pressures(result(True), atmospheric, vapour) == ()  # vented: no line below 0 gauge
    lows = low_pressures(result(False), atmospheric, vapour)
    # hand: 1 pump, H(600) = 38 + 1800·0.0025 = 42.5 → −2.0 m; 2 pumps 38 + 1800·0.0064 = 49.52 → +5.02 (none);
    #       at rest high 38 − 44.5 = −6.5, low 36 − 44.5 = −8.5; all at the crest, chainage 600
    assert [(low.label, low.chainage_m) for low in lows] == [
        ("1 pump", 600.0), ("at rest, delivery high", 600.0), ("at rest, delivery low", 600.0)]
    assert [low.pressure_head_m for low in lows] == pytest.approx([-2.0, -6.5, -8.5], abs=1e-12)
    assert not any(low.column_separation for low in lows)  # hand: −8.5 + 10.33 = 1.83 m > 0.17 m


def test_column_separation_where_absolute_pressure_reaches_vapour():
    profile = ridge(False, crest_m=60.0)
    res = profile_result(profile, LENGTHS, (), {"max": DELIVERY}, RHO, G)
    (low,) = low_pressures(res, 101_325.0 / (RHO * G), 1705.0 / (RHO * G))
    # hand: 38 − 60 = −22 m; −22 + 10.33 = −11.7 m, below the 0.17 m vapour head
    assert low.pressure_head_m == pytest.approx(-22.0) and low.column_separation


def test_segment_pressure_peaks_against_rating():
    res = result()
    peaks = segment_pressure_peaks(res, [350_000.0, math.nan])
    a, b = peaks
    # hand: 2 pumps (delivery governs) at chainage 0: p = 38 + 3000·0.0064 − 19 = 38.2 m → 38.2·9806.65
    #       = 374 614.03 Pa > 350 kPa; at rest the column stands at 44.5: 25.5·9806.65 = 250 069.575 Pa
    assert a.operating_pa == pytest.approx(374_614.03, rel=1e-9) and a.operating_chainage_m == 0.0
    assert a.operating_label == "2 pumps" and a.operating_exceeds
    assert a.rest_pa == pytest.approx(250_069.575, rel=1e-9) and not a.rest_exceeds
    # hand: B from 600 to 1500, 2 pumps at 600: 38 + 1800·0.0064 − 44.5 = 5.02 m; rating unknown
    assert b.operating_pa == pytest.approx(5.02 * RHO * G, rel=1e-9) and b.operating_chainage_m == 600.0
    assert not b.operating_exceeds and not b.rest_exceeds


# --------------------------------------------------------------------------- properties
@st.composite
def mains(draw):
    n_seg = draw(st.integers(1, 4))
    lengths = np.array(draw(st.lists(st.floats(1.0, 2000.0), min_size=n_seg, max_size=n_seg)))
    n_pts = draw(st.integers(2, 7))
    steps = draw(st.lists(st.floats(1.0, 1000.0), min_size=n_pts - 1, max_size=n_pts - 1))
    chainage = np.concatenate([[0.0], np.cumsum(steps)])
    elevation = np.array(draw(st.lists(st.floats(-20.0, 80.0), min_size=n_pts, max_size=n_pts)))
    vented = np.array(draw(st.lists(st.booleans(), min_size=n_pts, max_size=n_pts)))
    friction = np.array(draw(st.lists(st.floats(0.0, 30.0), min_size=n_seg, max_size=n_seg)))
    minor = np.array(draw(st.lists(st.floats(0.0, 5.0), min_size=n_seg, max_size=n_seg)))
    return PipeProfile(chainage, elevation, vented), lengths, friction, minor


@settings(max_examples=60, deadline=None)
@given(mains(), st.floats(-10.0, 60.0), st.floats(-10.0, 40.0), st.floats(0.0, 10.0))
def test_system_head_never_below_delivery_and_vents_never_below_atmospheric(main, delivery, suction, upstream):
    profile, lengths, friction, minor = main
    c = crest_heads(profile, lengths, friction[None], minor[None], delivery, suction, upstream)
    assert c.system_head_m[0] >= c.delivery_head_m[0]
    if not profile.air_valve.any():
        assert c.system_head_m[0] == c.delivery_head_m[0] and c.control_index[0] == DELIVERY_CONTROL
    line = grade_line(profile, lengths, friction[None], minor[None], delivery)
    assert line.head_m[0, 0] - suction + upstream == pytest.approx(c.system_head_m[0], abs=1e-9)
    at_vents = np.isin(line.chainage_m, profile.chainage_m[profile.air_valve])
    assert np.all(line.pressure_head_m[0, at_vents] >= -1e-9)  # an air valve admits air below atmospheric
    assert np.all(line.pressure_head_m[0, line.part_full[0]] == 0.0)
