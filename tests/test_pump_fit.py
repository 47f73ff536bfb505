"""Tests of hydraulics.pump_fit: least-squares pump curves, BEP, NPSH fit, extrapolation flags.

Check values are derived in closed form (stated beside each) from polynomial test data
invented for the checks, or by hand calculation.
"""

from __future__ import annotations

import json
import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.model import ModelError, PumpModel
from hydraulics.pump_csv import read_pump_csv
from hydraulics.pump_fit import fit_pump, nonnegative_least_squares
from tests.pump_fakes import parabolic_efficiency, quadratic_pump

PUMPS = Path(__file__).resolve().parent.parent / "sample_projects" / "pumps"
RHO = 998.0


def test_exact_quadratic_head_is_recovered():
    fitted = fit_pump(quadratic_pump(a=60.0, b=20000.0, q_max=0.04), RHO)
    q = np.linspace(0.0, 0.05, 11)
    np.testing.assert_allclose(fitted.head(q), 60.0 - 20000.0 * q**2, rtol=0, atol=1e-10)  # exact data
    assert fitted.head_fit.max_abs < 1e-10 and fitted.head_fit.rms < 1e-10
    assert (fitted.head_fit.n_points, fitted.head_fit.order) == (5, 2)
    assert fitted.shutoff_head_m == pytest.approx(60.0, abs=1e-10)
    assert not fitted.has_rising_then_falling_head
    assert not fitted.shutoff_extrapolated


def test_cubic_fit_of_exact_cubic_data():
    q = np.linspace(0.0, 0.05, 7)
    head = 80.0 - 100.0 * q - 5000.0 * q**2 - 2.0e5 * q**3
    pump = PumpModel("C", "cubic", 1450.0, tuple(q), tuple(head), head_fit_order=3)
    fitted = fit_pump(pump, RHO)
    np.testing.assert_allclose(fitted.head(q), head, atol=1e-9)  # exact cubic data
    assert fitted.head_fit.order == 3


def test_fit_quality_by_hand():
    # Straight-line least squares through (0, 10), (1, 9), (2, 10) in x = Q/Q_max:
    # slope 0, intercept 29/3; residuals (fitted − data) −1/3, +2/3, −1/3 (hand calculation)
    pump = PumpModel("L", "line", 1450.0, (0.0, 0.01, 0.02), (10.0, 9.0, 10.0), head_fit_order=1)
    fitted = fit_pump(pump, RHO)
    assert fitted.head_fit.rms == pytest.approx(math.sqrt(2.0 / 9.0), rel=1e-12)
    assert fitted.head_fit.max_abs == pytest.approx(2.0 / 3.0, rel=1e-12)
    assert fitted.shutoff_head_m == pytest.approx(29.0 / 3.0, rel=1e-12)


def test_bep_from_an_exact_parabola():
    eta = parabolic_efficiency(bep_flow=0.03, bep_efficiency=0.8)
    fitted = fit_pump(quadratic_pump(q_max=0.05, n_points=6, efficiency=eta), RHO)
    assert fitted.bep_flow_m3_s == pytest.approx(0.03, rel=1e-9)  # vertex of the parabola (closed form)
    assert fitted.bep_efficiency == pytest.approx(0.8, rel=1e-9)
    assert fitted.bep_head_m == pytest.approx(60.0 - 20000.0 * 0.03**2, rel=1e-9)
    assert not fitted.bep_at_end_of_data
    assert fitted.efficiency_source == "data" and fitted.shaft_power_source == "derived"


def test_shaft_power_derived_from_efficiency():
    eta = parabolic_efficiency(0.03, 0.8)
    fitted = fit_pump(quadratic_pump(q_max=0.05, n_points=6, efficiency=eta), RHO)
    q = 0.025
    # Definition of pump efficiency: P = ρ g Q H / η (ISO 9906:2012, clause 3)
    expected = RHO * G * q * (60.0 - 20000.0 * q * q) / eta(q)
    assert float(fitted.shaft_power(q)) == pytest.approx(expected, rel=1e-9)


def test_efficiency_derived_from_power():
    power = lambda q: 8000.0 + 300000.0 * q - 2.0e6 * q * q  # noqa: E731 - exact quadratic power data
    fitted = fit_pump(quadratic_pump(q_max=0.05, n_points=6, power=power), RHO)
    assert fitted.efficiency_source == "derived" and fitted.shaft_power_source == "data"
    q = 0.03
    expected = RHO * G * q * (60.0 - 20000.0 * q * q) / power(q)  # η = ρ g Q H / P (definition)
    assert float(fitted.efficiency(q)) == pytest.approx(expected, rel=1e-9)
    assert float(fitted.shaft_power(q)) == pytest.approx(power(q), rel=1e-9)
    # The BEP is the largest derived efficiency within the data range
    grid = np.linspace(0.0, 0.05, 20001)
    best = grid[np.argmax(RHO * G * grid * (60.0 - 20000.0 * grid**2) / power(grid))]
    assert fitted.bep_flow_m3_s == pytest.approx(best, abs=5e-6)
    assert fitted.bep_efficiency == pytest.approx(float(fitted.efficiency(fitted.bep_flow_m3_s)))


def test_both_efficiency_and_power_kept_as_given():
    eta = parabolic_efficiency(0.03, 0.8)
    power = lambda q: 9000.0 + 200000.0 * q  # noqa: E731
    fitted = fit_pump(quadratic_pump(q_max=0.05, n_points=6, efficiency=eta, power=power), RHO)
    assert fitted.efficiency_source == fitted.shaft_power_source == "data"
    assert float(fitted.efficiency(0.02)) == pytest.approx(eta(0.02), rel=1e-9)
    assert float(fitted.shaft_power(0.02)) == pytest.approx(power(0.02), rel=1e-9)


def test_no_efficiency_data():
    fitted = fit_pump(quadratic_pump(), RHO)
    assert fitted.bep_flow_m3_s is None and fitted.bep_efficiency is None and fitted.bep_head_m is None
    assert fitted.efficiency_source is None and not fitted.has_efficiency
    assert np.all(np.isnan(fitted.efficiency([0.01, 0.02])))
    assert np.all(np.isnan(fitted.shaft_power([0.01, 0.02])))
    assert np.all(np.isnan(fitted.npsh_required([0.01])))


def test_derived_power_undefined_where_efficiency_vanishes():
    eta = lambda q: 40.0 * q - 400.0 * q * q  # noqa: E731 - exact parabola, zero at shut-off
    fitted = fit_pump(quadratic_pump(q_max=0.05, n_points=6, efficiency=eta), RHO)
    assert math.isnan(float(fitted.shaft_power(0.0)))
    assert math.isfinite(float(fitted.shaft_power(0.02)))


def test_bep_at_end_of_data_is_flagged():
    eta = lambda q: 10.0 * q  # noqa: E731 - still rising at the last point
    fitted = fit_pump(quadratic_pump(q_max=0.05, efficiency=eta), RHO)
    assert fitted.bep_at_end_of_data
    assert fitted.bep_flow_m3_s == pytest.approx(0.05)


def test_npsh_exact_monotone_quadratic_recovered():
    npsh = lambda q: 2.0 + 10.0 * q + 1500.0 * q * q  # noqa: E731 - exact, coefficients ≥ 0
    fitted = fit_pump(quadratic_pump(q_max=0.05, n_points=6, npsh=npsh), RHO)
    q = np.linspace(0.0, 0.05, 9)
    np.testing.assert_allclose(fitted.npsh_required(q), npsh(q), atol=1e-9)
    assert fitted.npsh_fit.max_abs < 1e-9


def test_npsh_fit_is_non_decreasing_even_with_a_part_load_dip():
    values = (3.0, 2.4, 2.2, 2.5, 3.2, 4.4)  # invented data that dips at part load
    q = np.linspace(0.0, 0.05, 6)
    pump = PumpModel("N", "dip", 1450.0, tuple(q), tuple(60.0 - 20000.0 * q**2), npsh_required_m=values)
    fitted = fit_pump(pump, RHO)
    dense = fitted.npsh_required(np.linspace(0.0, 0.08, 401))
    assert np.all(np.diff(dense) >= -1e-12)
    assert np.all(dense > 0.0)
    assert fitted.npsh_fit.max_abs > 0.1  # the dip shows in the residuals


def test_rising_then_falling_head_is_flagged_with_its_peak():
    q = np.linspace(0.0, 0.04, 5)
    head = 50.0 + 100.0 * q - 5000.0 * q**2  # vertex at Q = 100 / (2 × 5000) = 0.01 (closed form)
    fitted = fit_pump(PumpModel("R", "rising", 1450.0, tuple(q), tuple(head)), RHO)
    assert fitted.has_rising_then_falling_head
    assert fitted.head_peak_flow_m3_s == pytest.approx(0.01, rel=1e-9)
    assert fitted.head_peak_m == pytest.approx(50.5, rel=1e-12)  # 50 + 1 − 0.5


def test_tiny_rise_within_test_scatter_is_not_flagged():
    q = np.linspace(0.0, 0.04, 5)
    head = 50.0 + 1.0 * q - 5000.0 * q**2  # peak 5e-5 m above shut-off: below 0.1 % of 50 m
    fitted = fit_pump(PumpModel("R", "flat", 1450.0, tuple(q), tuple(head)), RHO)
    assert not fitted.has_rising_then_falling_head
    assert fitted.head_peak_flow_m3_s == pytest.approx(1e-4, rel=1e-6)  # 1 / (2 × 5000)


def test_extrapolation_flags():
    fitted = fit_pump(quadratic_pump(q_min=0.01, q_max=0.05), RHO)
    flags = fitted.is_extrapolated(np.array([0.0, 0.005, 0.01, 0.03, 0.05, 0.0500000000001, 0.06]))
    assert flags.tolist() == [True, True, False, False, False, False, True]
    assert fitted.shutoff_extrapolated  # data start at 10 L/s: shut-off head is extrapolated
    assert fitted.shutoff_head_m == pytest.approx(60.0, abs=1e-9)


def test_unsorted_points_are_sorted():
    pump = quadratic_pump()
    order = [3, 0, 4, 1, 2]
    shuffled = PumpModel("S", "s", 1450.0, tuple(pump.flow_m3_s[i] for i in order),
                         tuple(pump.head_m[i] for i in order))
    assert fit_pump(shuffled, RHO).head_coefficients == pytest.approx(fit_pump(pump, RHO).head_coefficients)


def test_highest_order_fits_with_order_plus_one_points():
    pump = replace(quadratic_pump(n_points=5), head_fit_order=4)
    assert fit_pump(pump, RHO).head_fit.order == 4


@pytest.mark.parametrize("order", [0, 5])
def test_fit_order_outside_one_to_four_is_refused(order):
    with pytest.raises(ModelError) as info:
        fit_pump(replace(quadratic_pump(n_points=6), head_fit_order=order), RHO)
    assert info.value.field_path == "pump.head_fit_order"


def test_too_few_points_for_the_order():
    pump = PumpModel("F", "few", 1450.0, (0.0, 0.01, 0.02, 0.03), (50.0, 48.0, 44.0, 38.0), head_fit_order=4)
    with pytest.raises(ModelError, match="at least 5 points"):
        fit_pump(pump, RHO)


@pytest.mark.parametrize("pump, field", [
    (PumpModel("E", "e", 1450.0, (0.0, 0.01), (5.0, 4.0)), "pump.flow_m3_s"),
    (PumpModel("E", "e", 1450.0, (0.0, 0.01, 0.02), (5.0, 4.0)), "pump.head_m"),
    (PumpModel("E", "e", 1450.0, (0.0, 0.01, 0.01), (5.0, 4.0, 3.0)), "pump.flow_m3_s"),
    (PumpModel("E", "e", 1450.0, (0.0, 0.01, 0.02), (5.0, float("nan"), 3.0)), "pump.head_m"),
    (PumpModel("E", "e", 1450.0, (0.0, 0.01, 0.02), (5.0, 4.0, 3.0), efficiency=(0.1, 1.4, 0.5)), "pump.efficiency"),
    (PumpModel("E", "e", 1450.0, (0.0, 0.01, 0.02), (5.0, 4.0, 3.0), npsh_required_m=(1.0, 2.0)),
     "pump.npsh_required_m"),
])
def test_bad_pumps_raise_model_error_naming_the_field(pump, field):
    with pytest.raises(ModelError) as info:
        fit_pump(pump, RHO)
    assert info.value.field_path == field


def test_bad_density():
    with pytest.raises(ModelError):
        fit_pump(quadratic_pump(), -1.0)


def test_json_summary_is_plain_data():
    eta = parabolic_efficiency(0.03, 0.8)
    fitted = fit_pump(quadratic_pump(q_max=0.05, n_points=6, efficiency=eta, npsh=lambda q: 2.0 + 1000 * q * q), RHO)
    data = fitted.to_json_dict()
    text = json.dumps(data, allow_nan=False)
    assert json.loads(text)["bep_flow_m3_s"] == pytest.approx(0.03)
    assert data["fits"]["shaft_power_w"] is None and data["fits"]["head_m"]["quality"]["order"] == 2


@pytest.mark.parametrize("name, bep_flow, bep_eta, shutoff", [
    # Intended shapes of the invented demo pumps (their data were made around these values)
    ("booster_bp80.csv", 0.035, 0.76, 103.0),
    ("sewage_sw150.csv", 250.0 / 3600.0, 0.70, 41.2),  # best efficiency at 250 m³/h
    ("intake_rw250.csv", 0.150, 0.82, 42.0),
])
def test_sample_pumps_fit_as_intended(name, bep_flow, bep_eta, shutoff):
    fitted = fit_pump(read_pump_csv(PUMPS / name, "X", name), 999.5)
    assert fitted.bep_flow_m3_s == pytest.approx(bep_flow, rel=0.03)
    assert fitted.bep_efficiency == pytest.approx(bep_eta, abs=0.01)
    assert fitted.shutoff_head_m == pytest.approx(shutoff, abs=0.5)
    assert not fitted.has_rising_then_falling_head and not fitted.bep_at_end_of_data
    assert fitted.head_fit.max_abs < 0.5 and fitted.efficiency_fit.max_abs < 0.02
    q = np.linspace(fitted.flow_min_m3_s, fitted.flow_max_m3_s, 50)
    assert np.all(np.diff(fitted.head(q)) < 0) and np.all(np.diff(fitted.npsh_required(q)) >= 0)


# --------------------------------------------------------------------------- non-negative least squares
def _nnls_cases():
    """Random NPSH-like data (invented for the check): some need every coefficient, some hit the bounds."""
    rng = np.random.default_rng(20240611)
    x = np.linspace(0.0, 1.0, 9)
    design = np.stack([np.ones_like(x), x, x * x], axis=1)
    cases = [(design, 2.0 + 0.5 * x + 3.0 * x * x)]  # exact, all coefficients positive
    cases.append((design, 5.0 - 2.0 * x + 4.0 * x * x))  # dips: b held at zero
    cases.append((design, 3.0 - 1.0 * x))  # falls: only the constant is free
    cases.append((design, -1.0 - x))  # negative everywhere: all coefficients zero
    for _ in range(40):
        cases.append((design, rng.normal(3.0, 1.5) + rng.normal(0.0, 2.0) * x + rng.normal(0.0, 3.0) * x * x
                      + rng.normal(0.0, 0.3, x.size)))
    for _ in range(10):
        wide = rng.uniform(0.0, 1.0, (12, 5))
        cases.append((wide, rng.normal(0.0, 1.0, 12)))
    return cases


@pytest.mark.parametrize("case", range(len(_nnls_cases())))
def test_nonnegative_least_squares_matches_scipy_nnls(case):
    from scipy.optimize import nnls  # reference implementation (Lawson & Hanson's active-set method)

    design, target = _nnls_cases()[case]
    ours = nonnegative_least_squares(design, target)
    reference, _ = nnls(design, target)
    assert np.all(ours >= 0.0)
    np.testing.assert_allclose(ours, reference, rtol=1e-9, atol=1e-9 * max(1.0, float(np.max(np.abs(target)))))


def test_nonnegative_least_squares_known_solutions():
    x = np.array([0.0, 0.5, 1.0])
    design = np.stack([np.ones_like(x), x, x * x], axis=1)
    # Exact data 2 + 3x²: recovered (the residual is zero, the unconstrained solution is feasible)
    np.testing.assert_allclose(nonnegative_least_squares(design, 2.0 + 3.0 * x * x), [2.0, 0.0, 3.0], atol=1e-12)
    # Data below zero everywhere: c = 0 (hand calculation: any c >= 0 only moves the fit away)
    np.testing.assert_array_equal(nonnegative_least_squares(design, -np.ones(3)), [0.0, 0.0, 0.0])
