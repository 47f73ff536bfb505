"""Crest control: a main over a vented ridge, checked by hand and against an independent solve.

The project is invented test data: a sewage-like station lifting from a wet well at 21.0–22.5 m
over a ridge at 44.5 m (chainage 1900 m, air valve) to a delivery chamber at 37.5–38.0 m
(chainage 3200 m).  The main is three segments of one bore (1200 m, 1400 m, 600 m; the ridge
lies 700 m into the second), each pump has its own suction and discharge branch.  Every K is a
"user K" row, so the reference minor loss is plain K v²/2g.

The reference is written in the test: Darcy–Weisbach with the Colebrook–White friction factor
from ``fluids.friction.friction_factor`` (test-only reference library), the energy equation to
each control (the delivery, and the vented summit held at atmospheric pressure by its air
valve), and ``scipy.optimize.brentq`` as the bracketing root finder.  The pump curve of the
reference is the engine's fitted polynomial (``solution.pump_fits[0].head``, tested in
tests/test_pump_fit.py), for N pumps in parallel by continuity (each pump Q/N, same head).
"""

import math
from dataclasses import replace

import fluids.friction
import numpy as np
import pytest
from scipy.optimize import brentq

from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.main_profile import DELIVERY_CONTROL
from hydraulics.model import Arrangement, Fitting, ProfilePoint, Project, Segment, Site, TankDelivery, WaterFluid
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve, solve_curves
from tests.pump_fakes import quadratic_pump

SUCTION_LOW, SUCTION_HIGH, DELIVERY_LOW, DELIVERY_HIGH = 21.0, 22.5, 37.5, 38.0
RIDGE_X, RIDGE_Z = 1900.0, 44.5
PROFILE = ((0.0, 20.0), (1200.0, 30.0), (RIDGE_X, RIDGE_Z), (3200.0, 36.5))
BORE, EPS_NEW, EPS_AGED = 0.30, 0.1e-3, 0.5e-3
# (name, side, carries, length m, K of the row)
PIPEWORK = (
    ("suction branch", "suction", "pump", 6.0, 0.5),
    ("discharge branch", "delivery", "pump", 8.0, 3.0),
    ("main 1", "delivery", "station", 1200.0, 0.0),
    ("main 2", "delivery", "station", 1400.0, 0.6),
    ("main 3", "delivery", "station", 600.0, 1.0),
)
STATIC = {"min": DELIVERY_LOW - SUCTION_HIGH, "max": DELIVERY_HIGH - SUCTION_LOW}  # definition of static head
SUCTION = {"min": SUCTION_HIGH, "max": SUCTION_LOW}
DELIVERY = {"min": DELIVERY_LOW, "max": DELIVERY_HIGH}


def ridge_project(vented: bool = True, duty_count: int = 2) -> Project:
    segments = tuple(
        Segment(name, side, "ductile_iron_cml", length, BORE, roughness_new_m=EPS_NEW, roughness_aged_m=EPS_AGED,
                fittings=(Fitting("user_k", k_override=k),) if k else (), carries=carries)
        for name, side, carries, length, k in PIPEWORK)
    profile = tuple(ProfilePoint(x, z, air_valve=vented and x == RIDGE_X) for x, z in PROFILE)
    return Project(
        name="ridge test station",
        site=Site(SUCTION_LOW, SUCTION_HIGH, TankDelivery(DELIVERY_LOW, DELIVERY_HIGH), pump_datum_m=19.0,
                  design_flow_m3_s=0.08),
        fluid=WaterFluid(15.0), segments=segments,
        pumps=(quadratic_pump(a=45.0, b=2500.0, q_max=0.12, n_points=7, pump_id="R"),),
        arrangement=Arrangement("R", duty_count=duty_count, standby_count=1, variable_speed=True, min_speed_ratio=0.6),
        profile=profile,
    )


@pytest.fixture(scope="module")
def solution():
    return solve(ridge_project())


# ------------------------------------------------------------------------- the independent model
class Reference:
    """Darcy–Weisbach + Colebrook (fluids) per segment; the energy equation to each control."""

    def __init__(self, nu: float):
        self.nu = nu

    def velocity_head(self, q: float) -> tuple[float, float]:
        v = q / (math.pi * BORE**2 / 4.0)
        return v, v * v / (2.0 * G)

    def f(self, q: float, aged: bool) -> float:
        v, _ = self.velocity_head(q)
        return fluids.friction.friction_factor(Re=v * BORE / self.nu, eD=(EPS_AGED if aged else EPS_NEW) / BORE)

    def friction(self, q: float, aged: bool, length: float) -> float:
        return self.f(q, aged) * length / BORE * self.velocity_head(q)[1] if q > 0 else 0.0

    def minor(self, q: float, k: float) -> float:
        return k * self.velocity_head(q)[1]

    def branches(self, q_pump: float, aged: bool) -> float:
        return sum(self.friction(q_pump, aged, length) + self.minor(q_pump, k)
                   for _, _, carries, length, k in PIPEWORK if carries == "pump")

    def main_between(self, q: float, aged: bool, x_from: float, x_to: float) -> float:
        """Main loss from x_from to x_to: friction pro rata, each K lumped at its segment's start."""
        total, start = 0.0, 0.0
        for _, _, carries, length, k in PIPEWORK:
            if carries != "station":
                continue
            end = start + length
            overlap = max(0.0, min(end, x_to) - max(start, x_from))
            total += self.friction(q, aged, overlap)
            if x_from <= start < x_to:
                total += self.minor(q, k)
            start = end
        return total

    def heads(self, q: float, static: str, aged: bool, n: int = 1) -> tuple[float, float]:
        """(head to the delivery, head to the vented ridge) for station flow q with n pumps."""
        branch = self.branches(q / n, aged)
        to_delivery = STATIC[static] + branch + self.main_between(q, aged, 0.0, 3200.0)
        to_ridge = RIDGE_Z - SUCTION[static] + branch + self.main_between(q, aged, 0.0, RIDGE_X)
        return to_delivery, to_ridge


@pytest.fixture(scope="module")
def reference(solution):
    return Reference(solution.fluid.kinematic_viscosity_m2_s)


# ----------------------------------------------------------------------------------- the curves
def test_the_system_curve_starts_at_the_static_head_to_the_ridge(solution):
    for curve in solution.curves:
        expected = RIDGE_Z - SUCTION[curve.static]  # hand: 44.5 − 21.0 = 23.5 m (max), 44.5 − 22.5 = 22.0 m (min)
        assert curve.head_m[0] == pytest.approx(expected, abs=1e-12)
        assert curve.static_m[0] == pytest.approx(expected, abs=1e-12)
        assert curve.control_at(0) == "crest at 1900 m"
    assert solution.curve("max", "new").head_m[0] == pytest.approx(23.5, abs=1e-12)  # hand: 44.5 − 21
    assert solution.static_head_max_m == pytest.approx(17.0)  # hand: 38 − 21, the head to the delivery


def switch_flow(reference: Reference, static: str, aged: bool) -> float:
    """Where the ridge's height above the delivery equals the main's loss beyond the ridge."""
    height = RIDGE_Z - DELIVERY[static]  # hand: 44.5 − 38.0 = 6.5 m (max static), 7.0 m (min)
    return brentq(lambda q: height - reference.main_between(q, aged, RIDGE_X, 3200.0), 1e-4, 1.0, xtol=1e-14)


@pytest.mark.parametrize(("static", "pipe"), [("min", "new"), ("min", "aged"), ("max", "new"), ("max", "aged")])
def test_the_delivery_governs_above_the_switch_flow_found_by_hand(solution, reference, static, pipe):
    aged = pipe == "aged"
    q_switch = switch_flow(reference, static, aged)
    curve = solution.curve(static, pipe)
    q = curve.flow_m3_s
    governs = ~np.isnan(curve.control_chainage_m)
    assert governs[q < q_switch * (1 - 1e-6)].all() and not governs[q > q_switch * (1 + 1e-6)].any()
    for flow in (0.5 * q_switch, 1.5 * q_switch):
        i = int(np.argmin(abs(q - flow)))
        to_delivery, to_ridge = reference.heads(float(q[i]), static, aged)
        # the common pipework's curve: the branches are taken off the pump curves instead
        branch = reference.branches(float(q[i]), aged)
        assert curve.head_m[i] == pytest.approx(max(to_delivery, to_ridge) - branch, rel=1e-6)
        if to_ridge > to_delivery:  # the loss is counted up to the ridge, the static head is to the ridge
            assert curve.static_m[i] == pytest.approx(RIDGE_Z - SUCTION[static], abs=1e-12)
            assert curve.friction_m[i] + curve.minor_m[i] == pytest.approx(
                reference.main_between(float(q[i]), aged, 0.0, RIDGE_X), rel=1e-6)
        else:
            assert curve.static_m[i] == pytest.approx(STATIC[static], abs=1e-12)


def test_the_switch_flow_by_hand_matches_the_engines_control(solution, reference):
    stage = solve_curves(ridge_project())
    system = stage.system
    q_switch = switch_flow(reference, "max", False)
    below, above = system.control_index(np.array([q_switch * 0.999, q_switch * 1.001]), STATIC["max"], False)
    assert below == 2 and above == DELIVERY_CONTROL  # profile point 2 is the ridge
    # hand: at the switch the heads to both controls are equal
    to_delivery, to_ridge = reference.heads(q_switch, "max", False)
    assert to_delivery == pytest.approx(to_ridge, abs=1e-9)
    assert float(system.head(q_switch, STATIC["max"], False)) == pytest.approx(to_delivery, rel=1e-7)


# ----------------------------------------------------------------------------------- duty points
@pytest.mark.parametrize("n", [1, 2])
@pytest.mark.parametrize(("static", "pipe"), [("min", "new"), ("max", "aged")])
def test_duty_points_against_an_independent_solve_with_the_larger_head(solution, reference, n, static, pipe):
    aged = pipe == "aged"
    pump = solution.pump_fits[0]

    def residual(q: float) -> float:
        return float(pump.head(q / n)) - max(reference.heads(q, static, aged, n))

    q_ref = brentq(residual, 1e-6, 0.3, xtol=1e-13)
    point = next(p for p in solution.operating_points
                 if (p.static, p.pipe, p.pumps_running) == (static, pipe, n))
    assert point.flow_m3_s == pytest.approx(q_ref, rel=1e-7)
    to_delivery, to_ridge = reference.heads(q_ref, static, aged, n)
    expected = "crest at 1900 m" if to_ridge > to_delivery else "delivery"
    assert point.control == expected
    assert point.control_chainage_m == (RIDGE_X if to_ridge > to_delivery else None)


def test_one_pump_is_held_by_the_ridge_and_two_by_the_delivery(solution):
    # with this test pump the two regimes are both present (checked against the reference above)
    controls = {(p.pumps_running, p.static, p.pipe): p.control for p in solution.operating_points}
    assert {c for (n, _, _), c in controls.items() if n == 1} == {"crest at 1900 m"}
    assert {c for (n, _, _), c in controls.items() if n == 2} == {"delivery"}


def test_the_lowest_lifting_speed_lifts_to_the_ridge(solution):
    pump = solution.pump_fits[0]
    # hand: s = √(H_lift / H_shut-off), H_lift = 44.5 − 21 = 23.5 m (affinity laws, H ∝ s²)
    assert solution.variable_speed.minimum_lift_speed_ratio == pytest.approx(math.sqrt(23.5 / pump.shutoff_head_m))


def test_without_the_air_valve_the_delivery_governs_everywhere():
    solution = solve(ridge_project(vented=False))
    assert solution.curve("max", "new").head_m[0] == pytest.approx(17.0, abs=1e-12)  # hand: 38 − 21
    assert solution.curves[0].control_chainage_m is None
    assert {p.control for p in solution.operating_points} == {"delivery"}


def test_a_project_without_a_profile_is_unchanged():
    plain = replace(ridge_project(), profile=())
    with_flat = solve(plain)
    assert with_flat.profile is None
    assert with_flat.curve("max", "new").head_m[0] == 17.0  # hand: 38 − 21
    assert all(p.control == "delivery" and p.control_chainage_m is None for p in with_flat.operating_points)


# ----------------------------------------------------------------------------------- grade line
def line_of(solution, label):
    return next(line for line in solution.profile.scenarios + solution.profile.at_rest if line.label == label)


def pressure_at(solution, line, x):
    i = int(np.flatnonzero(solution.profile.chainage_m == x)[0])
    return float(line.pressure_head_m[i])


def test_grade_line_pressures_with_the_ridge_governing(solution, reference):
    point = next(p for p in solution.operating_points if (p.static, p.pipe, p.pumps_running) == ("max", "new", 1))
    q = point.flow_m3_s
    line = line_of(solution, "1 pump, max static, new pipe")
    assert line.control == "crest at 1900 m"
    # hand: upstream of the ridge H(x) = 44.5 + loss from x to the ridge; p = H − z
    assert pressure_at(solution, line, 0.0) == pytest.approx(
        RIDGE_Z + reference.main_between(q, False, 0.0, RIDGE_X) - 20.0, rel=1e-7)
    assert pressure_at(solution, line, 1200.0) == pytest.approx(
        RIDGE_Z + reference.main_between(q, False, 1200.0, RIDGE_X) - 30.0, rel=1e-7)
    assert pressure_at(solution, line, RIDGE_X) == pytest.approx(0.0, abs=1e-9)  # the air valve's atmosphere
    # hand: at 2600 m the pipe is at 44.5 − 8 × 700/1300 = 40.19 m, above the full-pipe grade from the
    # delivery, 38 + loss over main 3 (so the falling reach runs part full at atmospheric pressure)
    z_2600 = RIDGE_Z + (36.5 - RIDGE_Z) * 700.0 / 1300.0
    assert DELIVERY_HIGH + reference.main_between(q, False, 2600.0, 3200.0) < z_2600
    assert pressure_at(solution, line, 2600.0) == pytest.approx(0.0, abs=1e-9)
    assert pressure_at(solution, line, 3200.0) == pytest.approx(DELIVERY_HIGH - 36.5, abs=1e-9)  # hand: 1.5 m
    rho_g = solution.fluid.density_kg_m3 * G
    i0 = 0
    assert line.pressure_pa[i0] == pytest.approx(rho_g * line.pressure_head_m[i0])  # p = ρ g h


def test_grade_line_pressures_with_the_delivery_governing(solution, reference):
    point = next(p for p in solution.operating_points if (p.static, p.pipe, p.pumps_running) == ("min", "aged", 2))
    q = point.flow_m3_s
    line = line_of(solution, "2 pumps, min static, aged pipe")
    assert line.control == "delivery"
    for x, z in ((0.0, 20.0), (1200.0, 30.0), (RIDGE_X, RIDGE_Z), (3200.0, 36.5)):
        # hand: H(x) = 37.5 + loss from x to the end; p = H − z
        assert pressure_at(solution, line, x) == pytest.approx(
            DELIVERY_LOW + reference.main_between(q, True, x, 3200.0) - z, rel=1e-7, abs=1e-9)


def test_grade_line_at_rest(solution):
    line = line_of(solution, "at rest, delivery high")
    # hand: the column stands at the ridge, 44.5 m, upstream of it: 24.5 m at chainage 0, 14.5 m at 1200 m
    assert pressure_at(solution, line, 0.0) == pytest.approx(24.5, abs=1e-12)
    assert pressure_at(solution, line, 1200.0) == pytest.approx(14.5, abs=1e-12)
    assert pressure_at(solution, line, 2600.0) == 0.0  # drained: the pipe (40.19 m) is above the delivery level
    assert pressure_at(solution, line, 3200.0) == pytest.approx(1.5, abs=1e-12)  # hand: 38.0 − 36.5


# ----------------------------------------------------------------------------------- reporting
def test_the_crest_finding_says_vented_and_governing(solution):
    crest = next(f for f in solution.findings if f.code == "high_point_above_delivery")
    assert "has an air valve: it governs the system head at low flow and at 4 of 8 operating points" in crest.message
    assert "1900 m" in crest.message and "6234 ft" in crest.text("US")  # hand: 1900 / 0.3048 = 6233.6 ft
    assert crest.target == ("segment", 3)  # main 2 holds chainage 1900 m


def test_the_unvented_crest_finding_says_so():
    solution = solve(ridge_project(vented=False))
    crest = next(f for f in solution.findings if f.code == "high_point_above_delivery")
    assert "has no air valve" in crest.message


def test_json_names_the_control_of_each_point_and_curve(solution):
    data = solution_to_json_dict(solution)
    controls = data["control_point"]["operating_points"]
    assert [c["control"] for c in controls] == [p.control for p in solution.operating_points]
    curve = data["control_point"]["system_curves"][0]
    assert curve["chainage_m"][0] == RIDGE_X and curve["chainage_m"][-1] is None
    assert data["profile"]["air_valve_chainage_m"] == [RIDGE_X]
    assert data["profile"]["scenarios"][0]["control"] in ("delivery", "crest at 1900 m")
    assert "control" not in data["operating_points"][0]  # the point's earlier keys stay as they were


def test_text_summary_has_the_profile_section(solution):
    from app.text_report import summary_text

    text = summary_text(solution)
    section = text.split("Profile of the main")[1].split("Checks (")[0]
    assert "air valves at: 1900 m" in section
    assert "crest at 1900 m" in section and "delivery" in section
    assert "at rest, delivery high" in section
    assert "crest at 6234 ft" in summary_text(solution, "US")
