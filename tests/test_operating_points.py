"""Tests of hydraulics.operating_points: scenario grid, power, specific energy, NPSH, velocities.

Duty flows of the quadratic test pump against the quadratic test system are derived in
closed form, Q = √((a s² − H_s) / (b/N² + k)); the derived quantities follow from their
definitions (hydraulic power ρ g Q H, efficiency η = ρ g Q H / P, specific energy
E = P_in / (3.6e6 Q)).  NPSH available is checked by hand calculation with vapour pressure
and density from the ``iapws`` library (IAPWS-IF97), used only here as an independent source.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import iapws
import numpy as np
import pytest

from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.model import Arrangement
from hydraulics.operating_points import npsh_available, operating_points
from hydraulics.pump_fit import fit_pump
from tests.pump_fakes import QuadraticSystem, parabolic_efficiency, quadratic_pump

SAMPLES = Path(__file__).resolve().parent.parent / "sample_projects"
A, B = 60.0, 20000.0
RHO = 998.0
ETA = parabolic_efficiency(0.03, 0.8)
NPSH = lambda q: 2.0 + 40.0 * q + 1500.0 * q * q  # noqa: E731
NPSH_STATIC = 9.5  # m, invented for the checks


@pytest.fixture(scope="module")
def fitted():
    return fit_pump(quadratic_pump(A, B, q_max=0.05, n_points=6, efficiency=ETA, npsh=NPSH), RHO)


@pytest.fixture(scope="module")
def system():
    return QuadraticSystem(static_min_m=20.0, static_max_m=30.0, k_new=4000.0, k_aged=6000.0, k_suction=200.0)


ARR = Arrangement("Q", duty_count=3, speed_ratio=1.0, motor_efficiency=0.95, drive_efficiency=0.97)


def test_grid_order_and_count(system, fitted):
    points = operating_points(system, fitted, ARR, NPSH_STATIC, RHO, speed_ratios=(1.0, 0.9))
    assert len(points) == 2 * 2 * 3 * 2
    keys = [(p.static, p.pipe, p.pumps_running, p.speed_ratio) for p in points]
    expected = [(st, pi, n, s)
                for st in ("min", "max") for pi in ("new", "aged") for n in (1, 2, 3) for s in (1.0, 0.9)]
    assert keys == expected


def test_default_speed_is_the_arrangement_speed(system, fitted):
    from dataclasses import replace

    points = operating_points(system, fitted, replace(ARR, speed_ratio=0.85), NPSH_STATIC, RHO)
    assert {p.speed_ratio for p in points} == {0.85} and len(points) == 12


def test_each_point_against_closed_form(system, fitted):
    points = operating_points(system, fitted, ARR, NPSH_STATIC, RHO, speed_ratios=(1.0, 0.9))
    for p in points:
        hs = system.static_head_m[p.static]
        k = system.k_aged if p.pipe == "aged" else system.k_new
        n, s = p.pumps_running, p.speed_ratio
        q = math.sqrt((A * s * s - hs) / (B / n**2 + k))  # derived in closed form
        assert p.found and not p.extrapolated and p.reason is None
        assert p.flow_m3_s == pytest.approx(q, rel=1e-10)
        assert p.head_m == pytest.approx(hs + k * q * q, rel=1e-10)
        assert p.flow_per_pump_m3_s == pytest.approx(q / n, rel=1e-10)
        # Below, each derived quantity is checked against its definition from the point's own flow
        q, qp = p.flow_m3_s, p.flow_per_pump_m3_s
        assert qp == pytest.approx(q / n, rel=1e-15)
        eta = ETA(qp / s)  # efficiency unchanged at corresponding points (affinity laws)
        assert p.efficiency == pytest.approx(eta, rel=1e-9)
        assert p.hydraulic_power_w == pytest.approx(RHO * G * q * p.head_m, rel=1e-12)  # ρ g Q H
        assert p.shaft_power_w == pytest.approx(RHO * G * qp * p.head_m / eta, rel=1e-9)  # P = ρ g Q H / η
        assert p.shaft_power_total_w == pytest.approx(n * p.shaft_power_w, rel=1e-12)
        assert p.input_power_w == pytest.approx(p.shaft_power_total_w / (0.95 * 0.97), rel=1e-12)
        assert p.specific_energy_kwh_m3 == pytest.approx(p.input_power_w / (q * 3.6e6), rel=1e-12)
        # the same as ρ g H / (3.6e6 η_total): the definition of specific energy
        assert p.specific_energy_kwh_m3 == pytest.approx(RHO * G * p.head_m / (3.6e6 * eta * 0.95 * 0.97), rel=1e-9)
        assert p.bep_flow_ratio == pytest.approx(qp / (0.03 * s), rel=1e-9)  # BEP flow scales with speed
        factor = system.aged_suction_factor if p.pipe == "aged" else 1.0
        assert p.npsh_available_m == pytest.approx(NPSH_STATIC - system.k_suction * factor * q * q, rel=1e-12)
        assert p.npsh_required_m == pytest.approx(s * s * NPSH(qp / s), rel=1e-9)  # NPSHr ∝ s² (common approximation)
        assert p.npsh_margin_m == pytest.approx(p.npsh_available_m - p.npsh_required_m, rel=1e-12)
        assert p.npsh_margin_ratio == pytest.approx(p.npsh_available_m / p.npsh_required_m, rel=1e-12)
        assert p.segment_velocities_m_s == pytest.approx(
            tuple(q / (math.pi * d * d / 4) for d in system.diameters_m), rel=1e-12)  # v = Q / A


def test_points_that_cannot_lift_have_no_values(fitted):
    system = QuadraticSystem(static_min_m=20.0, static_max_m=65.0)
    points = operating_points(system, fitted, ARR, NPSH_STATIC, RHO)
    high = [p for p in points if p.static == "max"]
    assert high and all(not p.found for p in high)
    for p in high:
        assert p.reason.startswith("cannot lift the static head")
        assert p.flow_m3_s is p.head_m is p.efficiency is p.input_power_w is p.npsh_available_m is None
        assert p.segment_velocities_m_s == ()
        assert p.static_head_m == 65.0
    assert all(p.found for p in points if p.static == "min")
    json.dumps([p.to_json_dict() for p in points], allow_nan=False)


def test_pump_without_efficiency_or_npsh_gives_none(system):
    fitted = fit_pump(quadratic_pump(A, B, q_max=0.05), RHO)
    points = operating_points(system, fitted, ARR, NPSH_STATIC, RHO)
    for p in points:
        assert p.found and p.flow_m3_s > 0
        assert p.efficiency is p.shaft_power_w is p.input_power_w is p.specific_energy_kwh_m3 is None
        assert p.bep_flow_ratio is None and p.npsh_required_m is None and p.npsh_margin_m is None
        assert p.npsh_available_m is not None and p.hydraulic_power_w is not None
    data = points[0].to_json_dict()
    assert data["efficiency"] is None and isinstance(data["segment_velocities_m_s"], list)
    json.dumps(data, allow_nan=False)


def test_no_npsh_static_head_leaves_npsh_unknown(system, fitted):
    points = operating_points(system, fitted, ARR, None, RHO)
    assert all(p.npsh_available_m is None and p.npsh_margin_m is None for p in points)
    assert all(p.npsh_required_m is not None for p in points)


def test_extrapolated_point_is_found_and_flagged(fitted):
    system = QuadraticSystem(static_min_m=0.0, static_max_m=0.0, k_new=500.0, k_aged=500.0)
    points = operating_points(system, fitted, Arrangement("Q", duty_count=1), NPSH_STATIC, RHO)
    p = points[0]
    assert p.flow_m3_s == pytest.approx(math.sqrt(A / (B + 500.0)), rel=1e-10)  # 54.1 L/s > 50 L/s data end
    assert p.found and p.extrapolated and p.reason.startswith("runs beyond the end of its curve")


def test_json_keys(system, fitted):
    data = operating_points(system, fitted, ARR, NPSH_STATIC, RHO)[0].to_json_dict()
    for key in ("flow_m3_s", "head_m", "shaft_power_w", "input_power_w", "specific_energy_kwh_m3", "bep_flow_ratio",
                "npsh_available_m", "npsh_required_m", "extrapolated", "pumps_running", "speed_ratio", "static",
                "pipe", "flow_per_pump_m3_s", "efficiency", "npsh_margin_m", "segment_velocities_m_s", "found",
                "reason"):
        assert key in data


def test_npsh_available_hand_calculation_with_iapws_properties():
    # Water at 20 °C: p_v and ρ from IAPWS-IF97 (iapws library); sea-level standard atmosphere
    # 101325 Pa (ISO 2533); surface 2.0 m below the pump datum (suction lift); 0.35 m suction loss.
    t = 293.15
    p_v = iapws.IAPWS97(T=t, x=0.0).P * 1e6
    rho = iapws.IAPWS97(T=t, P=0.101325).rho
    # Hand calculation of NPSH_A = (p_atm − p_v)/(ρ g) + (z_s − z_pump) − h_loss:
    expected = (101325.0 - p_v) / (rho * 9.80665) + (98.0 - 100.0) - 0.35
    assert p_v == pytest.approx(2339.2, abs=0.5)  # IAPWS-IF97 saturation pressure at 20 °C ≈ 2.339 kPa
    assert expected == pytest.approx(7.7619, abs=5e-4)  # hand: 98986/(998.2 × 9.80665) − 2.35 = 10.1119 − 2.35
    assert npsh_available(101325.0, p_v, rho, 98.0, 100.0, 0.35) == pytest.approx(expected, rel=1e-14)
    losses = np.array([0.0, 0.35, 1.0])
    np.testing.assert_allclose(npsh_available(101325.0, p_v, rho, 98.0, 100.0, losses), expected + 0.35 - losses)


def test_sample_projects_points_lie_on_both_curves():
    from hydraulics.fluid import fluid_properties
    from hydraulics.project_io import load_project
    from hydraulics.pump_arrangement import arrangement_head
    from hydraulics.system_curve import prepare_system

    for path in sorted(SAMPLES.glob("*.pumpsketch.json")):
        project = load_project(path)
        fluid = fluid_properties(project.fluid)
        system = prepare_system(project, fluid)
        fitted = fit_pump(project.duty_pump, fluid.density_kg_m3)
        arr = project.arrangement
        points = operating_points(system, fitted, arr, 9.0, fluid.density_kg_m3, speed_ratios=(1.0, 0.9, 0.8))
        found = [p for p in points if p.found]
        assert found, path.name
        for p in found:
            # the head seen by the pumps running: common pipework at Q, each pump's branch at Q/N
            h_sys = float(system.head(p.flow_m3_s, p.static_head_m, p.pipe == "aged", p.pumps_running))
            h_pump = float(arrangement_head(fitted, p.flow_m3_s, p.pumps_running, arr.series_stages,
                                            p.speed_ratio, arr.trim_ratio))
            assert abs(h_sys - h_pump) < 1e-9 and abs(p.head_m - h_sys) < 1e-9


def test_eighty_points_in_one_batch():
    """2 static × 2 pipe × 4 pumps × 5 speeds for a sample system (make bench reports the timing)."""
    from dataclasses import replace

    from hydraulics.fluid import fluid_properties
    from hydraulics.project_io import load_project
    from hydraulics.system_curve import prepare_system

    project = load_project(SAMPLES / "sewage_wet_well.pumpsketch.json")
    fluid = fluid_properties(project.fluid)
    system = prepare_system(project, fluid)
    fitted = fit_pump(project.duty_pump, fluid.density_kg_m3)
    arr = replace(project.arrangement, duty_count=4)
    speeds = (0.8, 0.85, 0.9, 0.95, 1.0)
    assert len(operating_points(system, fitted, arr, 9.0, fluid.density_kg_m3, speed_ratios=speeds)) == 80
