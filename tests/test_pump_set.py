"""Pumps of different models in parallel at the manifold, against an independent solve.

The reference is written here: each pump's flow at a trial manifold head H is the root of
its own curve less its own branch loss, H_i(q) − L_branch(q) = H (``scipy.optimize.brentq``),
the station flow is their sum, and the manifold head is the root of
H − (static + L_common(Q)) = 0 (brentq again): the head balance of parallel pumps (pumps in
parallel share the head at their common junction; e.g. Karassik et al., *Pump Handbook*,
4th ed., ch. on pump and system curves).  The losses are the independent Darcy–Weisbach /
Colebrook (``fluids``) and Crane-K model of tests/test_station_network.py; the pump curves
are the engine's own fitted polynomials (the fit is tested in tests/test_pump_fit.py).  The
pumps and the station are invented for these checks.
"""

import math
from dataclasses import replace

import numpy as np
import pytest
from scipy.optimize import brentq

from hydraulics.model import InstalledPump, PumpModel
from hydraulics.operating_points import operating_points
from hydraulics.pump_set import installed_pumps, pump_set_speed_for_flow, run_stages, solve_pump_set
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve, solve_curves
from tests.test_station_network import STATIC, losses, station

# invented test pumps: per pump H = a − b Q² over 0..q_max
SMALL = (44.0, 16000.0, 0.035)  # a smaller pump with a lower shut-off head than B1 (52 m)
WEAK = (37.0, 9000.0, 0.04)  # a pump whose shut-off head barely clears the manifold head at maximum static
FEEBLE = (30.0, 9000.0, 0.04)  # shut-off head below the maximum static head: cannot open its check valve


def extra_pump(pump_id: str, curve: tuple[float, float, float]) -> PumpModel:
    a, b, q_max = curve
    q = np.linspace(0.0, q_max, 6)
    eta = 0.78 * (1.0 - ((q - 0.6 * q_max) / (0.6 * q_max)) ** 2)
    return PumpModel(pump_id=pump_id, name=f"{pump_id} test pump", rated_speed_rpm=2900.0, flow_m3_s=tuple(q),
                     head_m=tuple(a - b * q * q), efficiency=tuple(np.clip(eta, 0.05, None)),
                     npsh_required_m=tuple(2.0 + 900.0 * q * q))


def with_other(curve: tuple[float, float, float], role: str = "assist", duty_count: int = 1,
               standby_count: int = 1):
    base = station(duty_count=duty_count)
    assert base.arrangement is not None
    return replace(base, pumps=base.pumps + (extra_pump("X1", curve),),
                   arrangement=replace(base.arrangement, standby_count=standby_count),
                   other_pumps=(InstalledPump("X1", role=role),))  # type: ignore[arg-type]


def reference_set(solution, tags_heads, static: str, aged: bool) -> tuple[float, list[float]]:
    """Manifold head balance of dissimilar pumps, by nested brentq (module description)."""
    nu = solution.fluid.kinematic_viscosity_m2_s

    def branch(q: float) -> float:
        return losses(q, 1, aged, nu)[1]  # one pump's own branch at its own flow

    def pump_flow(head_fn, h: float) -> float:
        if float(head_fn(0.0)) <= h:
            return 0.0  # cannot open its check valve
        return brentq(lambda q: float(head_fn(q)) - branch(q) - h, 0.0, 0.2, xtol=1e-15, rtol=1e-15)

    def residual(h: float) -> float:
        q = sum(pump_flow(fn, h) for fn in tags_heads)
        return h - (STATIC[static] + losses(q, 1, aged, nu)[0])

    h = brentq(residual, STATIC[static], 60.0, xtol=1e-13, rtol=1e-15)
    flows = [pump_flow(fn, h) for fn in tags_heads]
    return h, flows


def test_installed_pumps_are_numbered_and_staged_by_role():
    project = with_other(SMALL, duty_count=2)
    pumps = installed_pumps(project)
    assert [(p.tag, p.pump_id, p.role) for p in pumps] == [
        ("P1", "B1", "duty"), ("P2", "B1", "duty"), ("P3", "B1", "standby"), ("P4", "X1", "assist")]
    assert [[p.tag for p in stage] for stage in run_stages(project)] == [["P1"], ["P1", "P2"], ["P1", "P2", "P4"]]


def test_a_dissimilar_pair_matches_the_independent_solve():
    project = with_other(SMALL)
    stage = solve_curves(project)
    fits = stage.fitted_by_id
    assert fits is not None
    pair = run_stages(project)[-1]
    for static in ("min", "max"):
        for aged in (False, True):
            got = solve_pump_set(stage.system, fits, pair, STATIC[static], aged)
            head, flows = reference_set(stage.solution, [fits["B1"].head, fits["X1"].head], static, aged)
            assert bool(got.found[0])
            assert got.manifold_head_m[0] == pytest.approx(head, rel=1e-9)  # independent solve (brentq)
            assert got.pump_flow_m3_s[0] == pytest.approx(flows, rel=1e-8)  # independent solve (brentq)
            assert got.flow_m3_s[0] == pytest.approx(sum(flows), rel=1e-9)  # continuity at the manifold
            assert flows[0] > flows[1] > 0.0  # the stronger pump takes the larger share


def test_identical_pumps_through_the_set_solver_equal_the_equal_share_solver():
    project = station(duty_count=2)
    stage = solve_curves(project)
    assert stage.fitted_by_id is not None and project.arrangement is not None
    equal = operating_points(stage.system, stage.fitted, project.arrangement, None, 1000.0)
    two = run_stages(project)[1]
    for p in (x for x in equal if x.pumps_running == 2):
        got = solve_pump_set(stage.system, stage.fitted_by_id, two, STATIC[p.static], p.pipe == "aged")
        assert got.flow_m3_s[0] == pytest.approx(p.flow_m3_s, rel=1e-9)  # same physics, two solvers


def test_a_speed_found_for_a_flow_is_re_intersected_never_scaled():
    project = with_other(SMALL)
    project = replace(project, arrangement=replace(project.arrangement, variable_speed=True, min_speed_ratio=0.6,
                                                   max_speed_ratio=1.0))
    stage = solve_curves(project)
    pair = run_stages(project)[-1]
    target = 0.05
    speed, ok = pump_set_speed_for_flow(stage.system, stage.fitted_by_id, pair, STATIC["max"], True, target)
    assert bool(ok[0]) and 0.6 < speed[0] < 1.0
    again = solve_pump_set(stage.system, stage.fitted_by_id, pair, STATIC["max"], True, speed)
    assert again.flow_m3_s[0] == pytest.approx(target, rel=1e-9)  # the pump set at that speed meets the system
    assert again.speed_ratio[0].tolist() == pytest.approx([speed[0], 1.0])  # the fixed-speed assist stays at 100 %


def test_a_pump_that_cannot_open_its_check_valve_is_critical():
    solution = solve(with_other(FEEBLE))
    codes = {f.code for f in solution.findings}
    assert "pump_held_shut" in codes
    held = next(f for f in solution.findings if f.code == "pump_held_shut")
    assert held.severity == "critical" and "P3" in held.where
    point = next(p for p in solution.pump_set.points if p.static == "max")
    share = next(s for s in point.shares if s.tag == "P3")
    assert share.shut_off and share.flow_m3_s == 0.0


def test_a_weaker_pump_pushed_back_below_its_minimum_flow_is_flagged():
    solution = solve(with_other(WEAK))
    pushed = [f for f in solution.findings if f.code == "pump_below_minimum_flow"]
    assert pushed and "P3" in pushed[0].where
    assert "pump_held_shut" not in {f.code for f in solution.findings}


def test_a_clean_sample_has_no_weak_pump_findings():
    clean = solve(station())
    assert not {"pump_held_shut", "pump_below_minimum_flow", "standby_short"} & {f.code for f in clean.findings}
    assert clean.pump_set is not None and clean.pump_set.points == ()


def test_a_standby_smaller_than_the_largest_pump_does_not_cover_it():
    # duty B1 and a smaller duty pump; the standby is the small one too: with B1 out the flow drops
    base = station(duty_count=1)
    small = extra_pump("X1", SMALL)
    project = replace(base, pumps=base.pumps + (small,),
                      arrangement=replace(base.arrangement, standby_count=0),
                      other_pumps=(InstalledPump("X1", role="duty"), InstalledPump("X1", role="standby")),
                      site=replace(base.site, design_flow_m3_s=0.045))
    solution = solve(project)
    capacity = solution.capacity
    assert capacity is not None and capacity.pump_out == "P1" and capacity.running_one_out == "P2+P3"
    assert capacity.flow_one_out_m3_s < capacity.flow_all_duty_m3_s
    codes = {f.code for f in solution.findings}
    assert "standby_short" in codes and "design_flow_not_met" not in codes  # all duty pumps meet it
    # the same station with an identical standby (one more B1) is covered
    covered = replace(project, arrangement=replace(project.arrangement, standby_count=1),
                      other_pumps=(InstalledPump("X1", role="duty"),))
    assert "standby_short" not in {f.code for f in solve(covered).findings}


def test_the_json_lists_the_pump_set():
    data = solution_to_json_dict(solve(with_other(SMALL)))
    pump_set = data["pump_set"]
    assert [p["tag"] for p in pump_set["pumps"]] == ["P1", "P2", "P3"]
    assert pump_set["stages"] == [["P1"], ["P1", "P3"]]
    first = pump_set["points"][0]
    assert first["running"] == ["P1", "P3"] and len(first["pumps"]) == 2
    assert first["flow_m3_s"] == pytest.approx(sum(p["flow_m3_s"] for p in first["pumps"]), rel=1e-12)



def test_velocities_are_checked_at_the_flows_of_pumps_of_other_models_running_together():
    project = with_other(SMALL)
    plain = solve(project)
    main = next(s for s in plain.segments if s.name == "manifold and main")
    area = math.pi * main.internal_diameter_m ** 2 / 4.0  # v = Q / A (continuity)
    alone = max(p.flow_m3_s for p in plain.operating_points if p.found)
    together = max(p.flow_m3_s for p in plain.pump_set.points if p.found)
    assert together > alone
    limit = (alone + together) / 2.0 / area  # only the pumps together exceed it
    criteria = replace(project.criteria, delivery_velocity_max_m_s=limit)
    solution = solve(replace(project, criteria=criteria))
    high = [f for f in solution.findings if f.code == "velocity_high" and "manifold and main" in f.where]
    assert high and "P1+P3" in high[0].where
    assert high[0].values[0][1] == pytest.approx(together / area, rel=1e-9)  # v = Q / A at the pumps' flow


def test_a_pump_beside_the_arrangement_is_checked_against_its_own_motor():
    project = with_other(SMALL)
    clean = solve(project)
    assert clean.pump_set is not None and [m.tag for m in clean.pump_set.motors] == ["P3"]
    motor = clean.pump_set.motors[0].motor
    at_points = max(s.shaft_power_w for p in clean.pump_set.points for s in p.shares if s.tag == "P3")
    assert motor.max_shaft_power_at_points_w == pytest.approx(at_points, rel=1e-12)  # its own shares
    assert not {"motor_overload"} & {f.code for f in clean.findings}
    small = replace(project.other_pumps[0], motor_rating_w=0.5 * at_points)
    flagged = solve(replace(project, other_pumps=(small,)))
    overload = [f for f in flagged.findings if f.code == "motor_overload"]
    assert overload and overload[0].where.startswith("pump P3")
