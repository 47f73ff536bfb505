"""Tests of hydraulics.duty_point: the vectorised bracketing solver and the duty-point cases.

A quadratic pump H = a − b Q² against a quadratic system H = H_s + k Q² has exact duty
points, derived in closed form:
  one pump                 Q = √((a − H_s) / (b + k))
  N identical in parallel  Q = √((a − H_s) / (b/N² + k))   (two: b/4)
  two in series            Q = √((2a − H_s) / (2b + k))
  speed ratio s            Q = √((a s² − H_s) / (b/N² + k))
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from hydraulics.duty_point import (
    STATUS_BEYOND_CURVE,
    STATUS_CANNOT_LIFT,
    STATUS_EXTRAPOLATED,
    STATUS_FOUND,
    bracketed_roots,
    solve_duty_points,
)
from hydraulics.pump_arrangement import arrangement_head
from hydraulics.pump_fit import fit_pump
from hydraulics.results import render_template
from tests.pump_fakes import QuadraticSystem, quadratic_pump

A, B, K = 60.0, 20000.0, 4000.0  # invented coefficients


@pytest.fixture(scope="module")
def fitted():
    return fit_pump(quadratic_pump(A, B, q_max=0.05, n_points=6), 1000.0)


def _system(**kw) -> QuadraticSystem:
    return QuadraticSystem(k_new=K, k_aged=K * 1.5, **kw)


def test_single_pump_closed_form(fitted):
    duty = solve_duty_points(_system(), fitted, 1, static_m=20.0)
    exact = math.sqrt((A - 20.0) / (B + K))  # derived in closed form
    assert float(duty.flow_m3_s) == pytest.approx(exact, rel=1e-10)
    assert float(duty.head_m) == pytest.approx(20.0 + K * exact**2, abs=1e-8)
    assert bool(duty.found) and not bool(duty.extrapolated) and duty.reasons == (None,)
    assert abs(float(duty.residual_m)) < 1e-9


def test_two_in_parallel_closed_form(fitted):
    duty = solve_duty_points(_system(), fitted, 2, static_m=20.0)
    assert float(duty.flow_m3_s) == pytest.approx(math.sqrt((A - 20.0) / (B / 4 + K)), rel=1e-10)  # closed form


def test_two_in_series_closed_form(fitted):
    duty = solve_duty_points(_system(), fitted, 1, series_stages=2, static_m=70.0)
    assert float(duty.flow_m3_s) == pytest.approx(math.sqrt((2 * A - 70.0) / (2 * B + K)), rel=1e-10)  # closed form


def test_many_scenarios_in_one_call_closed_form(fitted):
    n = np.array([1, 2, 3, 4, 1, 2, 3, 4])
    s = np.array([1.0, 1.0, 0.9, 0.9, 0.8, 0.8, 1.1, 0.7])
    hs = np.array([20.0, 25.0, 10.0, 0.0, 5.0, 30.0, 40.0, 15.0])
    aged = np.array([False, True] * 4)
    k = np.where(aged, 1.5 * K, K)
    duty = solve_duty_points(_system(), fitted, n, 1, s, 1.0, hs, aged, extension=5.0)
    exact = np.sqrt((A * s * s - hs) / (B / n**2 + k))  # derived in closed form
    np.testing.assert_allclose(duty.flow_m3_s, exact, rtol=1e-10)
    assert duty.found.all()


def test_trim_acts_like_speed_for_duty(fitted):
    by_trim = solve_duty_points(_system(), fitted, 2, trim_ratio=0.92, static_m=15.0)
    exact = math.sqrt((A * 0.92**2 - 15.0) / (B / 4 + K))  # closed form with t in place of s
    assert float(by_trim.flow_m3_s) == pytest.approx(exact, rel=1e-10)


def test_cannot_lift_the_static_head(fitted):
    duty = solve_duty_points(_system(), fitted, np.array([1, 2]), static_m=np.array([61.0, 75.0]))
    assert not duty.found.any()
    assert (duty.status == STATUS_CANNOT_LIFT).all()
    assert np.isnan(duty.flow_m3_s).all() and np.isnan(duty.head_m).all()
    assert duty.reasons[0] == "cannot lift the static head (shut-off head 60.0 m, static head 61.0 m)"
    # The same reason in US units: 1 ft = 0.3048 m exactly (NIST SP 811, App. B), so
    # 60 m = 196.85 ft and 61 m = 200.13 ft, shown to three significant digits.
    template, values = duty.reason_templates[0]
    assert render_template(template, values, "US") == \
        "cannot lift the static head (shut-off head 197 ft, static head 200 ft)"
    assert render_template(template, values, "SI") == duty.reasons[0]


def test_static_head_equal_to_shutoff_is_no_point(fitted):
    duty = solve_duty_points(_system(), fitted, 1, static_m=float(fitted.shutoff_head_m))
    assert int(duty.status) == STATUS_CANNOT_LIFT


def test_runs_beyond_end_of_curve_within_extension():
    fitted = fit_pump(quadratic_pump(A, B, q_max=0.04, n_points=5), 1000.0)  # data end at 40 L/s
    system = QuadraticSystem(k_new=7000.0, k_aged=7000.0)
    duty = solve_duty_points(system, fitted, 1, static_m=0.0)
    exact = math.sqrt(A / (B + 7000.0))  # closed form: 0.0471 m³/s, beyond 0.04 but within 1.2 × 0.04
    assert 0.04 < exact < 0.048
    assert float(duty.flow_m3_s) == pytest.approx(exact, rel=1e-10)
    assert bool(duty.found) and bool(duty.extrapolated) and int(duty.status) == STATUS_EXTRAPOLATED
    assert duty.reasons[0].startswith("runs beyond the end of its curve")


def test_runs_beyond_end_of_curve_out_of_reach():
    fitted = fit_pump(quadratic_pump(A, B, q_max=0.04, n_points=5), 1000.0)
    system = QuadraticSystem(k_new=1000.0, k_aged=1000.0)
    exact = math.sqrt(A / (B + 1000.0))  # closed form: 0.0535 m³/s > 1.2 × 0.04
    duty = solve_duty_points(system, fitted, 1, static_m=0.0)
    assert not bool(duty.found) and int(duty.status) == STATUS_BEYOND_CURVE
    assert duty.reasons[0].startswith("runs beyond the end of its curve")
    wider = solve_duty_points(system, fitted, 1, static_m=0.0, extension=2.0)
    assert float(wider.flow_m3_s) == pytest.approx(exact, rel=1e-10) and bool(wider.extrapolated)
    assert not bool(solve_duty_points(system, fitted, 1, static_m=0.0, extension=1.0).found)


def test_point_below_the_first_tested_flow_is_flagged():
    fitted = fit_pump(quadratic_pump(A, B, q_min=0.02, q_max=0.05, n_points=4), 1000.0)
    duty = solve_duty_points(_system(), fitted, 1, static_m=57.0)
    exact = math.sqrt(3.0 / (B + K))  # 0.0112 < 0.02: on the extrapolated shut-off side
    assert float(duty.flow_m3_s) == pytest.approx(exact, rel=1e-10)
    assert bool(duty.found) and bool(duty.extrapolated)
    assert "below the lowest tested flow" in duty.reasons[0]


def test_rising_curve_uses_the_stable_branch():
    q = np.linspace(0.0, 0.05, 6)
    head = 50.0 + 400.0 * q - 20000.0 * q**2  # peak 52 m at Q = 0.01 (closed form)
    from hydraulics.model import PumpModel

    fitted = fit_pump(PumpModel("R", "rising", 1450.0, tuple(q), tuple(head)), 1000.0)
    assert fitted.has_rising_then_falling_head
    # Static 51 m lies between shut-off 50 m and peak 52 m: two intersections; the stable
    # one is the larger root of 50 + 400Q − 20000Q² = 51 + 4000Q² (closed form).
    duty = solve_duty_points(_system(), fitted, 1, static_m=51.0)
    a, b, c = -(20000.0 + K), 400.0, -1.0
    larger = (-b - math.sqrt(b * b - 4 * a * c)) / (2 * a)
    assert float(duty.flow_m3_s) == pytest.approx(larger, rel=1e-10)
    high = solve_duty_points(_system(), fitted, 1, static_m=53.0)
    assert int(high.status) == STATUS_CANNOT_LIFT and "highest pump head" in high.reasons[0]


def test_duty_points_lie_on_both_curves_with_aged_pipe(fitted):
    system = _system()
    hs = np.array([0.0, 10.0, 30.0, 45.0])  # all below the shut-off head 0.81 × 60 = 48.6 m
    aged = np.array([True, False, True, False])
    duty = solve_duty_points(system, fitted, 2, 1, 0.9, 1.0, hs, aged)
    assert (duty.status == STATUS_FOUND).all()
    pump = arrangement_head(fitted, duty.flow_m3_s, 2, 1, 0.9)
    np.testing.assert_allclose(pump, system.head(duty.flow_m3_s, hs, aged), rtol=0, atol=1e-9)


def test_bracketed_roots_generic():
    result = bracketed_roots(lambda x: np.cos(x) - x, np.zeros(3), np.ones(3), ftol=1e-15)
    assert np.allclose(result.x, 0.7390851332151607, atol=1e-15)  # Dottie number (fixed point of cos)
    assert result.iterations < 15


def test_bracketed_roots_masks_and_missing_sign_change():
    result = bracketed_roots(lambda x: x - np.array([0.5, 2.0, 0.25]), np.zeros(3), np.ones(3),
                             active=np.array([True, True, False]))
    assert result.converged.tolist() == [True, False, False]
    assert result.x[0] == pytest.approx(0.5, abs=1e-9)


def test_bracketed_roots_exact_endpoint_root():
    result = bracketed_roots(lambda x: x - 1.0, np.zeros(1), np.ones(1))
    assert result.converged.all() and result.x[0] == 1.0 and result.iterations == 0
