"""Tests of hydraulics.variable_speed.

For the quadratic test pump H = a − b q² (rated) with N pumps in parallel at speed ratio s,
the affinity laws give H(Q; s) = a s² − b Q²/N²; against the system H_s + k Q² the speed
that delivers Q_t is, derived in closed form,
    s = √((H_s + (k + b/N²) Q_t²) / a),
and the lowest speed whose shut-off head reaches the maximum static head is
    s_lift = √(H_s,max / (S t² a)).
"""

from __future__ import annotations

import json
import math
from dataclasses import replace

import pytest

from hydraulics.model import Arrangement, ModelError
from hydraulics.operating_points import operating_points
from hydraulics.pump_fit import fit_pump
from hydraulics.variable_speed import (
    minimum_lift_speed_ratio,
    search_speeds,
    variable_speed,
    variable_speed_findings,
    variable_speed_points,
)
from tests.pump_fakes import QuadraticSystem, parabolic_efficiency, quadratic_pump

A, B = 60.0, 20000.0
RHO = 1000.0
SYSTEM = QuadraticSystem(static_min_m=20.0, static_max_m=30.0, k_new=4000.0, k_aged=6000.0)
ARR = Arrangement("Q", duty_count=2, variable_speed=True, min_speed_ratio=0.6, max_speed_ratio=1.1)


@pytest.fixture(scope="module")
def fitted():
    return fit_pump(quadratic_pump(A, B, q_max=0.05, n_points=6, efficiency=parabolic_efficiency(0.03, 0.8)), RHO)


def _exact_speed(hs, k, n, q):
    return math.sqrt((hs + (k + B / n**2) * q * q) / A)  # derived in closed form


def test_speeds_for_the_target_flow_closed_form(fitted):
    result = variable_speed(SYSTEM, fitted, ARR, 0.06, npsh_static_head_m=9.0, density_kg_m3=RHO)
    assert [(s.static, s.pipe) for s in result.scenarios] == [
        ("min", "new"), ("min", "aged"), ("max", "new"), ("max", "aged")]
    for item in result.scenarios:
        k = SYSTEM.k_aged if item.pipe == "aged" else SYSTEM.k_new
        hs = SYSTEM.static_head_m[item.static]
        assert item.achievable and item.limit is None and item.reason is None and not item.extrapolated
        assert item.speed_ratio == pytest.approx(_exact_speed(hs, k, 2, 0.06), rel=1e-10)
        assert item.system_head_m == pytest.approx(hs + k * 0.0036, rel=1e-12)
        assert item.pumps_running == 2


def test_re_intersection_at_each_speed_delivers_the_target(fitted):
    result = variable_speed(SYSTEM, fitted, ARR, 0.06, npsh_static_head_m=9.0, density_kg_m3=RHO)
    assert len(result.speeds_solved) == 4
    assert len(result.points) == 4 * 2 * 2 * 2  # speeds × static × pipe × pumps 1..2
    for item in result.scenarios:
        match = [p for p in result.points if p.static == item.static and p.pipe == item.pipe
                 and p.pumps_running == 2 and p.speed_ratio == item.speed_ratio]
        assert len(match) == 1
        assert match[0].found and match[0].flow_m3_s == pytest.approx(0.06, rel=1e-9)


def test_speed_change_is_re_intersected_not_scaled(fitted):
    result = variable_speed(SYSTEM, fitted, ARR, 0.06, npsh_static_head_m=9.0, density_kg_m3=RHO)
    item = result.scenario("max", "aged")
    full = operating_points(SYSTEM, fitted, ARR, 9.0, RHO, speed_ratios=(1.0,))
    full_point = next(p for p in full if p.static == "max" and p.pipe == "aged" and p.pumps_running == 2)
    scaled = full_point.flow_m3_s * item.speed_ratio  # what the affinity laws alone would predict (wrong here)
    assert abs(scaled - 0.06) / 0.06 > 0.01  # the static head makes plain scaling miss the target


def test_target_beyond_the_maximum_speed(fitted):
    result = variable_speed(SYSTEM, fitted, replace(ARR, max_speed_ratio=1.0), 0.06)
    item = result.scenario("max", "aged")
    assert _exact_speed(30.0, 6000.0, 2, 0.06) > 1.0  # 1.077 (closed form)
    assert not item.achievable and item.speed_ratio is None and item.limit == "max_speed"
    assert "maximum speed ratio 100 %" in item.reason
    findings = variable_speed_findings(result, fitted)
    assert "speed_target_unreachable" in [f.code for f in findings]
    # The target flow follows the display units: 60 L/s = 0.06 m³/s / 3.785411784e-3 m³ per US gal
    # × 60 s/min = 951.0 gpm (1 US gal = 3.785411784 L exactly, NIST SP 811, App. B).
    unreachable = next(f for f in findings if f.code == "speed_target_unreachable")
    assert "60.0 L/s" in unreachable.text("SI")
    assert "951 gpm" in unreachable.text("US") and "L/s" not in unreachable.text("US")


def test_target_below_the_minimum_speed(fitted):
    result = variable_speed(SYSTEM, fitted, ARR, 0.005)
    low = result.scenario("min", "new")
    assert _exact_speed(20.0, 4000.0, 2, 0.005) < 0.6  # 0.58 (closed form)
    assert not low.achievable and low.limit == "min_speed"
    high = result.scenario("max", "new")
    assert high.achievable and high.speed_ratio == pytest.approx(_exact_speed(30.0, 4000.0, 2, 0.005), rel=1e-10)
    assert "speed_below_minimum" in [f.code for f in variable_speed_findings(result, fitted)]


def test_extrapolated_speed_is_flagged(fitted):
    flat = QuadraticSystem(static_min_m=0.0, static_max_m=0.0, k_new=0.0, k_aged=0.0)
    result = variable_speed(flat, fitted, ARR, 0.09)
    item = result.scenario("min", "new")
    s = math.sqrt(B / 4 * 0.0081 / A)  # 0.822 (closed form); rated flow 0.045 / s = 0.0548 > 0.05
    assert item.speed_ratio == pytest.approx(s, rel=1e-10) and item.extrapolated
    assert "speed_extrapolated" in [f.code for f in variable_speed_findings(result, fitted)]


def test_minimum_lift_speed_closed_form(fitted):
    result = variable_speed(SYSTEM, fitted, ARR, 0.06)
    assert result.minimum_lift_speed_ratio == pytest.approx(math.sqrt(30.0 / 60.0), rel=1e-9)
    assert minimum_lift_speed_ratio(60.0, 30.0, series_stages=2, trim_ratio=0.9) == pytest.approx(
        math.sqrt(30.0 / (2 * 0.81 * 60.0)), rel=1e-15)
    assert minimum_lift_speed_ratio(60.0, -2.0) == 0.0
    assert minimum_lift_speed_ratio(0.0, 10.0) is None


def test_points_at_the_minimum_speed(fitted):
    result = variable_speed(SYSTEM, fitted, ARR, 0.06, npsh_static_head_m=9.0, density_kg_m3=RHO)
    at_min = result.points_at_minimum_speed
    assert {p.speed_ratio for p in at_min} == {0.6}
    # Shut-off head 0.36 × 60 = 21.6 m: below the 30 m maximum static, above the 20 m minimum
    assert all(not p.found and p.reason.startswith("cannot lift") for p in at_min if p.static == "max")
    assert all(p.found for p in at_min if p.static == "min")
    codes = [f.code for f in variable_speed_findings(result, fitted)]
    assert "minimum_speed_cannot_lift" in codes


def test_no_lift_finding_when_minimum_speed_is_high_enough(fitted):
    result = variable_speed(SYSTEM, fitted, replace(ARR, min_speed_ratio=0.75), 0.06)
    assert "minimum_speed_cannot_lift" not in [f.code for f in variable_speed_findings(result, fitted)]


def test_json_friendly(fitted):
    result = variable_speed(SYSTEM, fitted, replace(ARR, max_speed_ratio=1.0), 0.06, npsh_static_head_m=9.0)
    data = json.loads(json.dumps(result.to_json_dict(), allow_nan=False))
    assert data["scenarios"][3]["speed_ratio"] is None and data["scenarios"][3]["limit"] == "max_speed"
    assert data["minimum_lift_speed_ratio"] == pytest.approx(math.sqrt(0.5))
    assert isinstance(data["points"], list) and isinstance(data["points_at_minimum_speed"], list)


def test_bad_inputs(fitted):
    with pytest.raises(ModelError):
        variable_speed(SYSTEM, fitted, ARR, 0.0)
    with pytest.raises(ModelError):
        variable_speed(SYSTEM, fitted, replace(ARR, min_speed_ratio=1.2, max_speed_ratio=1.0), 0.06)


def test_sample_projects_speeds_re_intersect_to_the_design_flow():
    from pathlib import Path

    from hydraulics.fluid import fluid_properties
    from hydraulics.project_io import load_project
    from hydraulics.system_curve import prepare_system

    for path in sorted((Path(__file__).resolve().parent.parent / "sample_projects").glob("*.pumpsketch.json")):
        project = load_project(path)
        fluid = fluid_properties(project.fluid)
        system = prepare_system(project, fluid)
        fitted = fit_pump(project.duty_pump, fluid.density_kg_m3)
        design = project.site.design_flow_m3_s
        result = variable_speed(system, fitted, project.arrangement, design, 9.0, fluid.density_kg_m3)
        for item in result.scenarios:
            if not item.achievable:
                continue
            point = next(p for p in result.points if (p.static, p.pipe, p.pumps_running, p.speed_ratio)
                         == (item.static, item.pipe, item.pumps_running, item.speed_ratio))
            assert point.flow_m3_s == pytest.approx(design, rel=1e-8), path.name


def test_points_from_a_shared_batch_equal_the_own_solve(fitted):
    # The whole-project solve intersects the arrangement's own speed and the variable
    # speeds in one batch; the result must be that of the separate solve.
    search = search_speeds(SYSTEM, fitted, ARR, 0.06)
    batch = operating_points(SYSTEM, fitted, ARR, 9.0, RHO,
                             speed_ratios=(1.0,) + tuple(s for s in search.speeds_to_intersect if s != 1.0))
    shared = variable_speed_points(search, batch)
    alone = variable_speed(SYSTEM, fitted, ARR, 0.06, npsh_static_head_m=9.0, density_kg_m3=RHO)
    assert shared.speeds_solved == alone.speeds_solved and len(shared.points) == len(alone.points) > 0
    shared_points = shared.points + shared.points_at_minimum_speed
    alone_points = alone.points + alone.points_at_minimum_speed
    for a, b in zip(shared_points, alone_points, strict=True):
        assert (a.static, a.pipe, a.pumps_running, a.speed_ratio) == (b.static, b.pipe, b.pumps_running, b.speed_ratio)
        assert a.found == b.found
        if a.found:
            # both converged to |H_pump − H_system| <= 1e-9 m (HEAD_TOLERANCE_M)
            assert a.flow_m3_s == pytest.approx(b.flow_m3_s, rel=1e-8)


def test_points_missing_a_speed_are_refused(fitted):
    search = search_speeds(SYSTEM, fitted, ARR, 0.06)
    only_full_speed = operating_points(SYSTEM, fitted, ARR, 9.0, RHO)
    with pytest.raises(ValueError, match="missing at speed ratios"):
        variable_speed_points(search, only_full_speed)
