"""Tests of hydraulics.energy: power, specific energy and annual energy arithmetic.

Check values are hand calculations from the definitions: hydraulic power P = ρ g Q H,
specific energy E_s = ρ g H / (3.6e6 η) kWh/m³ (1 kWh = 3.6e6 J), annual energy
E = P_in × hours / 1000 kWh or E = V × E_s, cost = E × tariff.
"""

from __future__ import annotations

import json
import math

import pytest

from hydraulics.energy import annual_energy, hydraulic_power_w, specific_energy_kwh_m3
from hydraulics.model import Arrangement, EnergyInputs, ModelError
from hydraulics.operating_points import operating_points
from hydraulics.pump_fit import fit_pump
from tests.pump_fakes import QuadraticSystem, parabolic_efficiency, quadratic_pump

RHO = 1000.0
SYSTEM = QuadraticSystem(static_min_m=20.0, static_max_m=30.0, k_new=4000.0, k_aged=6000.0)
ARR = Arrangement("Q", duty_count=3, motor_efficiency=0.95, drive_efficiency=0.97)


@pytest.fixture(scope="module")
def points():
    fitted = fit_pump(quadratic_pump(60.0, 20000.0, q_max=0.05, n_points=6,
                                     efficiency=parabolic_efficiency(0.03, 0.8)), RHO)
    return operating_points(SYSTEM, fitted, ARR, 9.0, RHO)


def _point(points, static, n, pipe="aged"):
    return next(p for p in points if p.static == static and p.pipe == pipe and p.pumps_running == n)


def test_hydraulic_power_hand_calculation():
    assert hydraulic_power_w(1000.0, 0.1, 20.0) == pytest.approx(19613.3, rel=1e-12)  # 1000 × 9.80665 × 0.1 × 20
    assert hydraulic_power_w(998.2, 0.035, 75.0, gravity_m_s2=9.81) == pytest.approx(998.2 * 9.81 * 0.035 * 75.0)


def test_specific_energy_hand_calculation():
    # 1000 × 9.80665 × 50 / (3.6e6 × 0.7) = 490332.5 / 2.52e6 = 0.194576 kWh/m³
    assert specific_energy_kwh_m3(1000.0, 50.0, 0.7) == pytest.approx(0.19457639, rel=1e-7)


def test_operating_hours_basis(points):
    inputs = EnergyInputs(operating_hours_per_year=4000.0, tariff_per_kwh=0.2, currency="EUR")
    result = annual_energy(points, inputs, pumps_running=2)
    assert result.basis == "operating_hours" and result.pipe == "aged" and result.pumps_running == 2
    for item, static in ((result.at_min_static, "min"), (result.at_max_static, "max")):
        p = _point(points, static, 2)
        assert item.input_power_w == p.input_power_w
        assert item.annual_energy_kwh == pytest.approx(p.input_power_w * 4000.0 / 1000.0, rel=1e-15)  # W·h → kWh
        assert item.annual_cost == pytest.approx(item.annual_energy_kwh * 0.2, rel=1e-15)
        assert item.annual_volume_m3 == pytest.approx(p.flow_m3_s * 3600.0 * 4000.0, rel=1e-15)
        # Energy / volume equals the point's specific energy (consistency of the two bases)
        assert item.annual_energy_kwh / item.annual_volume_m3 == pytest.approx(p.specific_energy_kwh_m3, rel=1e-12)
    low, high = result.at_min_static, result.at_max_static
    assert result.annual_energy_mean_kwh == pytest.approx((low.annual_energy_kwh + high.annual_energy_kwh) / 2)
    assert result.annual_cost_mean == pytest.approx(result.annual_energy_mean_kwh * 0.2)
    assert result.input_power_mean_w == pytest.approx((low.input_power_w + high.input_power_w) / 2)
    assert result.specific_energy_mean_kwh_m3 == pytest.approx(
        (low.specific_energy_kwh_m3 + high.specific_energy_kwh_m3) / 2)
    assert result.notes == ()


def test_annual_volume_basis(points):
    inputs = EnergyInputs(operating_hours_per_year=None, annual_volume_m3=500000.0, tariff_per_kwh=0.1)
    result = annual_energy(points, inputs, pumps_running=1)
    p = _point(points, "max", 1)
    item = result.at_max_static
    assert result.basis == "annual_volume"
    assert item.annual_energy_kwh == pytest.approx(500000.0 * p.specific_energy_kwh_m3, rel=1e-15)  # V × E_s
    assert item.operating_hours_per_year == pytest.approx(500000.0 / (p.flow_m3_s * 3600.0), rel=1e-15)
    assert item.annual_cost == pytest.approx(item.annual_energy_kwh * 0.1)


def test_volume_takes_precedence_over_hours(points):
    inputs = EnergyInputs(operating_hours_per_year=4000.0, annual_volume_m3=100000.0)
    assert annual_energy(points, inputs, pumps_running=1).basis == "annual_volume"


def test_volume_needing_more_hours_than_a_year_is_noted(points):
    inputs = EnergyInputs(operating_hours_per_year=None, annual_volume_m3=5.0e6)
    result = annual_energy(points, inputs, pumps_running=1)
    assert any("more than a year has" in note for note in result.notes)


def test_pump_count_chosen_from_design_flow(points):
    inputs = EnergyInputs()
    q1 = _point(points, "max", 1).flow_m3_s
    q2 = _point(points, "max", 2).flow_m3_s
    assert annual_energy(points, inputs, design_flow_m3_s=0.9 * q1).pumps_running == 1
    assert annual_energy(points, inputs, design_flow_m3_s=0.5 * (q1 + q2)).pumps_running == 2
    assert annual_energy(points, inputs, design_flow_m3_s=10.0).pumps_running == 3  # none reaches: the most
    assert annual_energy(points, inputs).pumps_running == 3


def test_new_pipe_can_be_chosen(points):
    result = annual_energy(points, EnergyInputs(), pumps_running=1, pipe="new")
    assert result.at_min_static.flow_m3_s == _point(points, "min", 1, "new").flow_m3_s


def test_missing_point_gives_none_with_a_note():
    fitted = fit_pump(quadratic_pump(60.0, 20000.0, q_max=0.05, efficiency=parabolic_efficiency(0.03, 0.8)), RHO)
    system = QuadraticSystem(static_min_m=20.0, static_max_m=70.0)  # max static above the shut-off head
    pts = operating_points(system, fitted, ARR, 9.0, RHO)
    result = annual_energy(pts, EnergyInputs(), pumps_running=1)
    assert result.at_max_static is None and result.at_min_static is not None
    assert result.annual_energy_mean_kwh is None
    assert any("cannot lift" in note for note in result.notes)


def test_no_efficiency_data_gives_none_with_a_note():
    fitted = fit_pump(quadratic_pump(60.0, 20000.0, q_max=0.05), RHO)
    pts = operating_points(SYSTEM, fitted, ARR, 9.0, RHO)
    result = annual_energy(pts, EnergyInputs())
    assert result.at_min_static is None and result.annual_energy_mean_kwh is None
    assert any("power unknown" in note for note in result.notes)


def test_no_duty_given(points):
    result = annual_energy(points, EnergyInputs(operating_hours_per_year=None, annual_volume_m3=None))
    assert result.basis is None and result.annual_energy_mean_kwh is None
    assert any("no operating hours" in note for note in result.notes)


def test_negative_hours_refused(points):
    with pytest.raises(ModelError):
        annual_energy(points, EnergyInputs(operating_hours_per_year=-1.0))


def test_no_points():
    result = annual_energy((), EnergyInputs())
    assert result.pumps_running is None and result.annual_energy_mean_kwh is None


def test_json_friendly(points):
    data = annual_energy(points, EnergyInputs(), design_flow_m3_s=0.05).to_json_dict()
    text = json.dumps(data, allow_nan=False)
    back = json.loads(text)
    assert math.isclose(back["annual_energy_mean_kwh"], (back["annual_energy_min_static_kwh"]
                                                         + back["annual_energy_max_static_kwh"]) / 2)
    assert len(back["scenarios"]) == 2 and back["currency"] == "EUR"
