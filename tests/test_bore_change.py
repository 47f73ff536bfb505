"""Tests of hydraulics.bore_change: reducer and expander K, their reference velocity and the junction check.

Reference library used only here: ``fluids`` (``fluids.fittings`` implements the Crane TP-410
contraction and enlargement formulas and the change of velocity basis of a loss coefficient).
"""

from __future__ import annotations

import math

import fluids.fittings as ff
import numpy as np
import pytest

from hydraulics.bore_change import (
    BORE_MATCH_TOLERANCE,
    BoreJunction,
    PathSegment,
    TransitionRow,
    bore_change_k,
    bores_match,
    contraction_k,
    enlargement_k,
    k_referred_to_diameter,
    transition_angle_deg,
    unfitted_bore_changes,
)
from hydraulics.fittings import minor_loss, segment_k_total
from hydraulics.model import Fitting, ModelError

LARGE_M = 0.3032  # 12 in schedule 40 bore
BETAS = (0.2, 0.4, 0.5, 0.7, 0.9, 0.99)
# Both of Crane's regimes: θ ≤ 45° (first formula) and 45° < θ ≤ 180° (second formula).
# fluids switches formula at θ < 45°, Crane at θ ≤ 45°; exactly 45° is checked by hand below.
GRADUAL_ANGLES = (2.0, 5.0, 10.0, 15.0, 20.0, 30.0, 40.0, 44.9)
STEEP_ANGLES = (45.1, 60.0, 75.0, 90.0, 120.0, 150.0, 179.0)


def _velocity(flow_m3_s: float, diameter_m: float) -> float:
    return flow_m3_s / (math.pi * diameter_m**2 / 4.0)


# --------------------------------------------------------------------------- K against fluids
@pytest.mark.parametrize("beta", BETAS)
@pytest.mark.parametrize("angle", GRADUAL_ANGLES + STEEP_ANGLES)
def test_conical_contraction_matches_fluids(beta, angle):
    small = beta * LARGE_M
    # fluids.fittings.contraction_conical_Crane, reference library (K on the small, downstream bore).
    assert contraction_k(small, LARGE_M, angle) == pytest.approx(
        ff.contraction_conical_Crane(LARGE_M, small, angle=angle), rel=1e-12)


@pytest.mark.parametrize("beta", BETAS)
def test_sudden_contraction_matches_fluids(beta):
    small = beta * LARGE_M
    # fluids.fittings.contraction_sharp(method='Crane'), reference library.
    expected = ff.contraction_sharp(LARGE_M, small, method="Crane")
    assert contraction_k(small, LARGE_M) == pytest.approx(expected, rel=1e-12)
    assert contraction_k(small, LARGE_M, 180.0) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("beta", BETAS)
@pytest.mark.parametrize("angle", GRADUAL_ANGLES + STEEP_ANGLES)
def test_conical_enlargement_matches_fluids(beta, angle):
    small = beta * LARGE_M
    # fluids.fittings.diffuser_conical(method='Crane'), reference library (K on the small, upstream bore).
    assert enlargement_k(small, LARGE_M, angle) == pytest.approx(
        ff.diffuser_conical(small, LARGE_M, angle=angle, method="Crane"), rel=1e-12)


@pytest.mark.parametrize("beta", BETAS)
def test_sudden_enlargement_matches_fluids(beta):
    small = beta * LARGE_M
    # fluids.fittings.diffuser_sharp, reference library (its default method is (1 − β²)², on the small bore).
    expected = ff.diffuser_sharp(small, LARGE_M)
    assert enlargement_k(small, LARGE_M) == pytest.approx(expected, rel=1e-12)
    # fluids.fittings.diffuser_conical(method='Crane') at 180°, reference library.
    assert enlargement_k(small, LARGE_M, 180.0) == pytest.approx(
        ff.diffuser_conical(small, LARGE_M, angle=180.0, method="Crane"), rel=1e-12)


def test_k_is_vectorised_over_bores_and_angles():
    small = np.array([0.1, 0.15, 0.2, 0.25])
    angles = np.array([10.0, 45.0, 90.0, 180.0])
    contraction = contraction_k(small, LARGE_M, angles)
    enlargement = enlargement_k(small, LARGE_M, angles)
    assert isinstance(contraction, np.ndarray) and contraction.shape == (4,)
    assert isinstance(enlargement, np.ndarray) and enlargement.dtype == np.float64
    for i in range(4):
        assert contraction[i] == contraction_k(float(small[i]), LARGE_M, float(angles[i]))
        assert enlargement[i] == enlargement_k(float(small[i]), LARGE_M, float(angles[i]))
    assert isinstance(contraction_k(0.1, 0.2), float)


# --------------------------------------------------------------------------- hand values
def test_contraction_hand_values():
    # Hand calculation from Crane TP-410 A-26 formula, β = 0.1/0.2 = 0.5, 1 − β² = 0.75:
    assert contraction_k(0.1, 0.2, 30.0) == pytest.approx(0.8 * 0.258819 * 0.75, rel=1e-5)   # 0.155291
    assert contraction_k(0.1, 0.2, 45.0) == pytest.approx(0.8 * 0.382683 * 0.75, rel=1e-5)   # θ ≤ 45°: 0.229610
    assert contraction_k(0.1, 0.2, 90.0) == pytest.approx(0.5 * 0.840896 * 0.75, rel=1e-5)   # √sin 45°: 0.315336
    assert contraction_k(0.1, 0.2) == pytest.approx(0.375, rel=1e-12)                        # 0.5 × 0.75
    # Hand calculation from Crane TP-410 A-26 formula, equal bores: no loss.
    assert contraction_k(0.2, 0.2, 30.0) == 0.0


def test_enlargement_hand_values():
    # Hand calculation from Crane TP-410 A-26 formula, β = 0.5, (1 − β²)² = 0.5625:
    assert enlargement_k(0.1, 0.2, 20.0) == pytest.approx(2.6 * 0.173648 * 0.5625, rel=1e-5)  # 0.253960
    assert enlargement_k(0.1, 0.2, 45.0) == pytest.approx(2.6 * 0.382683 * 0.5625, rel=1e-5)  # θ ≤ 45°: 0.559674
    assert enlargement_k(0.1, 0.2, 90.0) == pytest.approx(0.5625, rel=1e-12)
    # Hand calculation from Crane TP-410 A-26 formula, β = 0.8: (1 − 0.64)² = 0.1296.
    assert enlargement_k(0.16, 0.2) == pytest.approx(0.1296, rel=1e-12)


# --------------------------------------------------------------------------- velocity basis
def test_conversion_keeps_the_head_loss_both_ways():
    flow = 0.05
    small, segment = 0.1023, 0.2027
    k_small = enlargement_k(small, segment, 30.0)
    k_segment = k_referred_to_diameter(k_small, small, segment)
    # Equal head loss h = K v²/(2g) on either velocity basis, continuity v = Q / (π D²/4).
    loss_small = float(minor_loss(k_small, _velocity(flow, small)))
    assert float(minor_loss(k_segment, _velocity(flow, segment))) == pytest.approx(loss_small, rel=1e-12)
    # ... and back again.
    assert k_referred_to_diameter(k_segment, segment, small) == pytest.approx(k_small, rel=1e-14)
    # fluids.fittings.change_K_basis, reference library.
    assert k_segment == pytest.approx(ff.change_K_basis(k_small, small, segment), rel=1e-14)
    assert k_referred_to_diameter(1.0, 0.2, 0.1) == pytest.approx(1.0 / 16.0, rel=1e-14)  # (0.1/0.2)⁴, by hand


def test_conversion_refuses_bad_diameters():
    for args, field in (((1.0, 0.0, 0.1), "reference_diameter_m"), ((1.0, 0.1, float("nan")), "target_diameter_m")):
        with pytest.raises(ModelError) as info:
            k_referred_to_diameter(*args)
        assert info.value.field_path == field


# --------------------------------------------------------------------------- fitting rows
@pytest.mark.parametrize("angle", [None, 10.0, 30.0, 60.0, 150.0])
def test_reducer_k_is_on_its_own_small_bore(angle):
    segment, upstream = 0.1541, 0.2545
    crane_angle = 180.0 if angle is None else angle
    # fluids.fittings.contraction_conical_Crane, reference library: K on the small (this segment's) bore.
    expected = ff.contraction_conical_Crane(upstream, segment, angle=crane_angle)
    assert bore_change_k("reducer", segment, upstream, angle) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("angle", [None, 10.0, 30.0, 60.0, 150.0])
def test_expander_k_is_converted_to_the_segment_velocity(angle):
    flow, segment, upstream = 0.04, 0.2545, 0.1541
    crane_angle = 180.0 if angle is None else angle
    # fluids.fittings.diffuser_conical(method='Crane'), reference library, K on the small bore,
    # moved to this segment's bore with fluids.fittings.change_K_basis.
    k_small = ff.diffuser_conical(upstream, segment, angle=crane_angle, method="Crane")
    k_segment = bore_change_k("expander", segment, upstream, angle)
    assert k_segment == pytest.approx(ff.change_K_basis(k_small, upstream, segment), rel=1e-12)
    # The same head loss as Crane's K on the small-bore velocity (h = K v²/(2g), continuity).
    assert float(minor_loss(k_segment, _velocity(flow, segment))) == pytest.approx(
        float(minor_loss(k_small, _velocity(flow, upstream))), rel=1e-12)


def test_bores_within_one_percent_give_no_loss():
    # Common practice: bores within 1 % are the same bore (mill tolerance), no transition loss.
    assert bores_match(0.2, 0.1985) and not bores_match(0.2, 0.197)
    assert BORE_MATCH_TOLERANCE == 0.01
    for kind in ("reducer", "expander"):
        assert bore_change_k(kind, 0.2, 0.2, None) == 0.0
        assert bore_change_k(kind, 0.2, 0.1985, 30.0) == 0.0
        assert bore_change_k(kind, 0.1985, 0.2, None) == 0.0


@pytest.mark.parametrize(
    "kind, segment, other, message",
    [
        ("reducer", 0.2, 0.1, "use an expander"),      # flow would go smaller → larger
        ("reducer", 0.2, 0.197, "use an expander"),    # 1.5 % smaller: beyond the tolerance
        ("expander", 0.1, 0.2, "use a reducer"),       # flow would go larger → smaller
        ("expander", 0.197, 0.2, "use a reducer"),
        ("elbow", 0.2, 0.3, "reducer or an expander"),
    ],
)
def test_bores_contradicting_the_kind_are_refused(kind, segment, other, message):
    with pytest.raises(ModelError, match=message) as info:
        bore_change_k(kind, segment, other, None, "segments[4].fittings[1]")
    assert info.value.field_path == "segments[4].fittings[1].fitting_id"


@pytest.mark.parametrize("other", [None, 0.0, -0.1, float("nan"), 6.0, "0.2"])
def test_bad_other_bore_is_refused(other):
    with pytest.raises(ModelError) as info:
        bore_change_k("reducer", 0.1, other, None, "segments[0].fittings[2]")  # deliberately the wrong type
    assert info.value.field_path == "segments[0].fittings[2].other_diameter"


@pytest.mark.parametrize("angle", [0.0, -10.0, 180.5, float("nan"), float("inf"), True, "30"])
def test_bad_cone_angle_is_refused(angle):
    with pytest.raises(ModelError, match="cone angle") as info:
        bore_change_k("expander", 0.2, 0.1, angle, "segments[0].fittings[0]")  # deliberately the wrong type
    assert info.value.field_path == "segments[0].fittings[0].angle_deg"


def test_bad_segment_bore_is_refused():
    with pytest.raises(ModelError) as info:
        bore_change_k("expander", 0.0, 0.1, None)
    assert info.value.field_path == "internal_diameter"


def test_low_level_k_refuses_bad_input():
    with pytest.raises(ModelError) as info:
        contraction_k(0.2, 0.1)
    assert info.value.field_path == "large_diameter_m"
    with pytest.raises(ModelError) as info:
        enlargement_k(0.0, 0.1)
    assert info.value.field_path == "small_diameter_m"
    for angle in (0.0, 190.0, [30.0, float("nan")]):
        with pytest.raises(ModelError) as info:
            enlargement_k(0.1, 0.2, angle)
        assert info.value.field_path == "angle_deg"


def test_transition_angle_from_entry_and_row():
    assert transition_angle_deg(180.0, None, "reducer") == 180.0          # sudden entry
    assert transition_angle_deg(180.0, 180.0, "reducer") == 180.0
    assert transition_angle_deg(None, 20.0, "expander") == 20.0           # conical entry, row's angle
    with pytest.raises(ModelError, match="needs its included cone angle") as info:
        transition_angle_deg(None, None, "expander", "segments[1].fittings[0]")
    assert info.value.field_path == "segments[1].fittings[0].angle_deg"
    with pytest.raises(ModelError, match="is sudden") as info:
        transition_angle_deg(180.0, 30.0, "reducer", "segments[1].fittings[0]")
    assert info.value.field_path == "segments[1].fittings[0].angle_deg"


# --------------------------------------------------------------------------- junction check
def test_bore_change_without_a_fitting_is_found():
    path = [PathSegment(3, 0.2027), PathSegment(5, 0.1541, (TransitionRow("gate_valve"),)), PathSegment(6, 0.1541)]
    found = unfitted_bore_changes(path)
    assert found == (BoreJunction(3, 5, 0.2027, 0.1541),)
    assert found[0].needed_kind == "reducer"
    assert unfitted_bore_changes([PathSegment(0, 0.15), PathSegment(1, 0.25)])[0].needed_kind == "expander"


def test_right_fitting_clears_the_junction():
    reducer_default = PathSegment(1, 0.1541, (TransitionRow("reducer"),))   # other bore = upstream bore
    reducer_sized = PathSegment(1, 0.1541, (TransitionRow("constant"), TransitionRow("reducer", 0.2020)))  # 0.35 %
    for downstream in (reducer_default, reducer_sized):
        assert unfitted_bore_changes([PathSegment(0, 0.2027), downstream]) == ()
    expander = PathSegment(1, 0.2545, (TransitionRow("expander", 0.1541),))
    assert unfitted_bore_changes([PathSegment(0, 0.1541), expander]) == ()


def test_bores_within_one_percent_need_no_fitting():
    assert unfitted_bore_changes([PathSegment(0, 0.2027), PathSegment(1, 0.2010), PathSegment(2, 0.2027)]) == ()


@pytest.mark.parametrize(
    "row",
    [
        TransitionRow("reducer", 0.2545),        # sized for another upstream bore
        TransitionRow("expander"),               # the wrong kind for a smaller bore
        TransitionRow("reducer", None, count=0),  # a row of no fittings
    ],
)
def test_mismatched_transition_is_still_found(row):
    path = [PathSegment(0, 0.2027), PathSegment(1, 0.1541, (row,))]
    assert unfitted_bore_changes(path) == (BoreJunction(0, 1, 0.2027, 0.1541),)


def test_every_unfitted_junction_of_a_path_is_found_in_flow_order():
    path = [
        PathSegment(0, 0.3032),
        PathSegment(1, 0.2027, (TransitionRow("reducer"),)),
        PathSegment(2, 0.2545),
        PathSegment(3, 0.2545),
        PathSegment(4, 0.1541, (TransitionRow("reducer", 0.3032),)),   # other bore is not the upstream 254.5 mm
    ]
    found = unfitted_bore_changes(iter(path))
    assert [(j.upstream_index, j.downstream_index) for j in found] == [(1, 2), (3, 4)]
    assert unfitted_bore_changes([]) == () and unfitted_bore_changes([PathSegment(0, 0.1)]) == ()


# --------------------------------------------------------------------------- in a segment's K total
def test_a_reducer_row_takes_its_k_from_the_bores_either_side():
    # Reference: fluids.fittings.contraction_conical_Crane(Di1=0.2, Di2=0.15, angle=20) (reference
    # library), K on the small (downstream) bore, which is this segment's own bore.
    expected = ff.contraction_conical_Crane(Di1=0.2, Di2=0.15, angle=20.0)
    given = segment_k_total([Fitting("reducer_conical", angle_deg=20.0, other_diameter_m=0.2)], 0.15)
    from_upstream = segment_k_total([Fitting("reducer_conical", angle_deg=20.0)], 0.15, upstream_diameter_m=0.2)
    assert given == pytest.approx(expected, rel=1e-12)
    assert from_upstream == pytest.approx(expected, rel=1e-12)
    # An override still replaces the method's K.
    assert segment_k_total([Fitting("reducer_conical", k_override=0.3)], 0.15) == 0.3


def test_a_reducer_with_no_upstream_bore_names_its_field():
    with pytest.raises(ModelError) as info:
        segment_k_total([Fitting("reducer_sudden")], 0.15, field_path="segments[0].fittings")
    assert info.value.field_path == "segments[0].fittings[0].other_diameter"
