"""The checks at every solved speed, the grouping of findings and the design capacity.

The projects are the invented test projects of ``tests/test_checks.py``: the test pump's
data lie exactly on H = 50 − 12 000 Q² (Q in m³/s, one pump at rated speed), so by the
affinity laws n pumps at speed ratio s give H = 50 s² − 12 000 (Q/n)², an exact curve the
tests solve independently with ``scipy.optimize.brentq`` against the engine's system head.
"""

from __future__ import annotations

import json
import math
from dataclasses import replace
from pathlib import Path

import pytest
from scipy.optimize import brentq

from hydraulics.capacity import station_capacity
from hydraulics.checks import group_scenario_findings
from hydraulics.fluid import fluid_properties
from hydraulics.model import Arrangement
from hydraulics.project_io import load_project
from hydraulics.pump_fit import fit_pump
from hydraulics.results import Finding
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve
from hydraulics.system_curve import prepare_system
from hydraulics.variable_speed import search_speeds
from tests.pump_fakes import QuadraticSystem, parabolic_efficiency, quadratic_pump
from tests.test_checks import clean_project

SAMPLES = Path(__file__).resolve().parent.parent / "sample_projects"


def _independent_flow(project, static: str, aged: bool, pumps: int, speed: float) -> float:
    """brentq on 50 s² − 12 000 (Q/n)² = H_system(Q) (affinity laws on the exact test curve)."""
    system = prepare_system(project, fluid_properties(project.fluid))
    static_m = system.static_head_m[static]

    def excess(q: float) -> float:
        return 50.0 * speed**2 - 12_000.0 * (q / pumps) ** 2 - float(system.head(q, static_m, aged, pumps))

    return brentq(excess, 0.0, pumps * speed * math.sqrt(50.0 / 12_000.0), xtol=1e-14)


def _point(solution, basis: str, static: str, pipe: str, pumps: int):
    return next(sp for sp in solution.speed_points if basis in sp.basis and sp.point.static == static
                and sp.point.pipe == pipe and sp.point.pumps_running == pumps)


def test_the_minimum_speed_point_is_re_intersected_with_the_system_not_scaled():
    project = clean_project()  # drive range 95–100 %
    solution = solve(project)
    low = _point(solution, "minimum speed", "max", "aged", 1).point
    full = _point(solution, "fixed speed", "max", "aged", 1).point
    assert low.speed_ratio == 0.95
    expected = _independent_flow(project, "max", True, 1, 0.95)  # independent brentq solve
    assert low.flow_m3_s == pytest.approx(expected, rel=1e-8)
    # a static head makes the duty move off the affinity parabola: scaling Q by s would be far off
    assert abs(0.95 * full.flow_m3_s - low.flow_m3_s) > 0.05 * low.flow_m3_s


def test_speed_points_cover_the_fixed_minimum_maximum_and_design_speeds_with_one_pump_and_the_duty_set():
    project = clean_project()
    two = replace(project, arrangement=replace(project.arrangement, duty_count=2, min_speed_ratio=0.7),
                  site=replace(project.site, design_flow_m3_s=0.03))
    solution = solve(two)
    bases = {b for sp in solution.speed_points for b in sp.basis}
    assert bases == {"fixed speed", "maximum speed", "minimum speed", "design flow with 1 pump",
                     "design flow with 2 pumps"}
    for sp in solution.speed_points:
        if sp.basis == ("design flow with 1 pump",) or sp.basis == ("design flow with 2 pumps",):
            # the speed found delivers the design flow in its own scenario (re-intersected)
            assert sp.point.flow_m3_s == pytest.approx(0.03, rel=1e-6)
            assert sp.point.pumps_running == (1 if "1 pump" in sp.basis[0] else 2)
            expected = _independent_flow(two, sp.point.static, sp.point.pipe == "aged", sp.point.pumps_running,
                                         sp.point.speed_ratio)
            assert sp.point.flow_m3_s == pytest.approx(expected, rel=1e-8)


def test_one_pump_speed_search_closed_form():
    # H = a s² − b (Q/N)² against H_s + k Q²: s = √((H_s + (k + b/N²) Q²)/a), derived in closed form
    a, b = 60.0, 20000.0
    system = QuadraticSystem(static_min_m=20.0, static_max_m=30.0, k_new=4000.0, k_aged=6000.0)
    fitted = fit_pump(quadratic_pump(a, b, q_max=0.05, n_points=6, efficiency=parabolic_efficiency(0.03, 0.8)),
                      1000.0)
    arrangement = Arrangement("Q", duty_count=2, variable_speed=True, min_speed_ratio=0.6, max_speed_ratio=1.1)
    search = search_speeds(system, fitted, arrangement, 0.03, pumps_running=1)
    assert search.pumps_running == 1
    for item in search.scenarios:
        k = 6000.0 if item.pipe == "aged" else 4000.0
        hs = 30.0 if item.static == "max" else 20.0
        assert item.achievable and item.pumps_running == 1
        assert item.speed_ratio == pytest.approx(math.sqrt((hs + (k + b) * 0.03**2) / a), rel=1e-9)
    with pytest.raises(Exception, match="1..duty_count"):
        search_speeds(system, fitted, arrangement, 0.03, pumps_running=3)


def test_identical_scenario_findings_are_grouped_naming_both_scenarios():
    message = "Runs at 46 % of best-efficiency flow, outside the preferred region 70–120 %."
    remedy = "Consider variable speed."
    new = Finding("warning", "outside_preferred", message, "pump 'P', 1 pump at 80 % speed, max static, new pipe",
                  remedy, ("scenario", ("max", "new", 1, 0.8)))
    aged = replace(new, where="pump 'P', 1 pump at 80 % speed, max static, aged pipe",
                   target=("scenario", ("max", "aged", 1, 0.8)))
    other = replace(new, message=message.replace("46", "40"), target=("scenario", ("max", "aged", 2, 0.8)),
                    where="pump 'P', 2 pumps at 80 % speed, max static, aged pipe")
    plain = Finding("warning", "large_trim", "Trim.", "pump 'P'", "", ("pump", "P"))
    grouped = group_scenario_findings([new, plain, aged, other])
    assert [f.code for f in grouped] == ["outside_preferred", "large_trim", "outside_preferred"]
    assert grouped[0].where == ("pump 'P', 2 scenarios: 1 pump at 80 % speed, max static, new pipe; "
                                "1 pump at 80 % speed, max static, aged pipe")
    assert grouped[0].target == new.target and grouped[0].message == message
    assert grouped[1] is plain and grouped[2] is other


def test_region_findings_at_the_minimum_speed_of_a_solved_project():
    # the test pump's efficiency parabola peaking at 50 L/s: at full speed every point runs at 72–77 % of
    # best-efficiency flow (inside the preferred 70–120 %, criteria defaults), at the 95 % minimum speed
    # and max static at about 65 % of 0.95 × 50 L/s (best-efficiency flow ∝ speed, affinity laws)
    from tests.test_checks import pump

    project = replace(clean_project(), pumps=(pump(peak_flow=0.05),))
    solution = solve(project)
    low = _point(solution, "minimum speed", "max", "aged", 1)
    q = _independent_flow(project, "max", True, 1, 0.95)
    assert low.point.bep_flow_ratio == pytest.approx(q / (0.95 * 0.05), rel=1e-6)
    assert low.point.bep_flow_ratio < 0.70 and "outside_preferred" in low.finding_codes
    assert all(not sp.finding_codes for sp in solution.speed_points if "fixed speed" in sp.basis)
    grouped = [f for f in solution.findings if f.code == "outside_preferred"]
    assert grouped and all("95 % speed" in f.where for f in grouped)


def test_low_velocity_at_the_minimum_speed_names_its_scenario():
    project = clean_project()
    slow = replace(project, arrangement=replace(project.arrangement, min_speed_ratio=0.9))
    low = [f for f in solve(slow).findings if f.code == "velocity_low"]
    assert [f.where for f in low] == ["segment 'suction' (suction), 1 pump at 90 % speed, max static, aged pipe"]
    # at the 90 % point: the independent flow through the 0.25 m suction bore, v = Q / (π D²/4)
    q = _independent_flow(slow, "max", True, 1, 0.9)
    assert low[0].values[0][1] == pytest.approx(q / (math.pi * 0.25**2 / 4.0), rel=1e-6)
    assert "velocity_low" not in {f.code for f in solve(project).findings}


def test_capacity_by_hand_with_one_duty_pump_and_a_standby():
    project = replace(clean_project(), site=replace(clean_project().site, design_flow_m3_s=0.045))
    solution = solve(project)
    cap = solution.capacity
    q = _independent_flow(project, "max", True, 1, 1.0)  # worst case: max static, aged pipe, full speed
    assert cap.flow_all_duty_m3_s == pytest.approx(q, rel=1e-8)
    assert cap.shortfall_all_duty_m3_s == pytest.approx(0.045 - q, rel=1e-6)  # by hand: design − delivered
    assert cap.shortfall_all_duty_fraction == pytest.approx((0.045 - q) / 0.045, rel=1e-6)
    assert cap.pumps_one_out == 1 and cap.flow_one_out_m3_s == cap.flow_all_duty_m3_s  # the standby runs
    critical = [f for f in solution.findings if f.code == "design_flow_not_met"]
    assert len(critical) == 1 and critical[0].severity == "critical"
    assert "no_standby" not in {f.code for f in solution.findings}


def test_capacity_without_standby_two_duty_pumps():
    base = clean_project()
    project = replace(base, arrangement=replace(base.arrangement, duty_count=2, standby_count=0),
                      site=replace(base.site, design_flow_m3_s=0.045))
    solution = solve(project)
    cap = solution.capacity
    q_two = _independent_flow(project, "max", True, 2, 1.0)
    q_one = _independent_flow(project, "max", True, 1, 1.0)
    assert cap.meets_design and cap.flow_all_duty_m3_s == pytest.approx(q_two, rel=1e-8)
    assert cap.pumps_one_out == 1 and cap.flow_one_out_m3_s == pytest.approx(q_one, rel=1e-8)
    assert cap.shortfall_one_out_m3_s == pytest.approx(0.045 - q_one, rel=1e-6)  # by hand
    standby = [f for f in solution.findings if f.code == "no_standby"]
    assert [f.severity for f in standby] == ["warning"]
    assert "design_flow_not_met" not in {f.code for f in solution.findings}


def test_capacity_without_standby_when_the_other_pumps_still_meet_the_design_flow_is_info():
    base = clean_project()
    project = replace(base, arrangement=replace(base.arrangement, duty_count=2, standby_count=0),
                      site=replace(base.site, design_flow_m3_s=0.03))
    standby = [f for f in solve(project).findings if f.code == "no_standby"]
    assert [f.severity for f in standby] == ["info"]


def test_one_pump_without_standby_leaves_nothing_with_one_out():
    base = clean_project()
    cap = solve(replace(base, arrangement=replace(base.arrangement, standby_count=0))).capacity
    assert cap.pumps_one_out == 0 and cap.flow_one_out_m3_s == 0.0
    assert cap.shortfall_one_out_m3_s == 0.035 and cap.shortfall_one_out_fraction == 1.0  # the whole design flow


def test_station_capacity_needs_the_worst_case_points():
    with pytest.raises(ValueError, match="no operating point"):
        station_capacity(Arrangement("T1"), 0.03, ())


def test_hilltop_design_flow_beyond_the_fixed_speed_pump_is_a_critical_shortfall():
    # a reported case: design flow 42 L/s at fixed speed, where the pump delivers 35–40 L/s (its curve)
    project = load_project(SAMPLES / "hilltop_booster.pumpsketch.json")
    fixed = replace(project, site=replace(project.site, design_flow_m3_s=0.042),
                    arrangement=replace(project.arrangement, min_speed_ratio=1.0, max_speed_ratio=1.0))
    solution = solve(fixed)
    critical = [f for f in solution.findings if f.code == "design_flow_not_met"]
    assert len(critical) == 1
    assert 0.035 <= solution.capacity.flow_all_duty_m3_s <= 0.040  # 35–40 L/s: the reported delivery
    data = json.loads(json.dumps(solution_to_json_dict(solution)))
    assert data["capacity"]["meets_design"] is False
    assert data["capacity"]["shortfall_all_duty_m3_s"] == pytest.approx(0.042 - solution.capacity.flow_all_duty_m3_s)
    assert all({"basis", "findings", "flow_m3_s", "speed_ratio"} <= set(p) for p in data["speed_points"])


def test_a_ratio_that_rounds_to_a_region_bound_is_shown_with_one_decimal():
    from hydraulics.checks import _ratio_text
    from hydraulics.model import Criteria

    criteria = Criteria()  # allowable 40–130 %, preferred 70–120 % (defaults, ANSI/HI 9.6.3 as in the checks)
    assert _ratio_text(0.398, criteria) == "39.8"  # would read "40", the allowable bound itself
    assert _ratio_text(0.46, criteria) == "46"
    assert _ratio_text(1.204, criteria) == "120.4"
