"""Tests of hydraulics.pump_arrangement: affinity laws, parallel and series pumps.

Check values follow from the affinity laws (Q ∝ n, H ∝ n², P ∝ n³; Karassik et al., *Pump
Handbook*, 4th ed., ch. 2) applied to exact polynomial test pumps, derived in closed form.
"""

from __future__ import annotations

import json

import numpy as np
import pytest

from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.pump_arrangement import (
    arrangement_curve,
    arrangement_flow_range,
    arrangement_head,
    arrangement_performance,
    rated_equivalent_flow,
)
from hydraulics.pump_fit import fit_pump
from tests.pump_fakes import parabolic_efficiency, quadratic_pump

RHO = 1000.0
A, B = 60.0, 20000.0  # test pump H = 60 − 20000 Q² (invented)
ETA = parabolic_efficiency(0.03, 0.8)
NPSH = lambda q: 2.0 + 40.0 * q + 1500.0 * q * q  # noqa: E731 - exact, monotone


@pytest.fixture(scope="module")
def fitted():
    return fit_pump(quadratic_pump(A, B, q_max=0.05, n_points=6, efficiency=ETA, npsh=NPSH), RHO)


def test_speed_scaling_of_head_flow_power(fitted):
    s, q_rated = 0.8, 0.025
    perf = arrangement_performance(fitted, s * q_rated, 1, 1, s)
    # Affinity laws at the corresponding point Q = s q_rated
    assert float(perf.head_m) == pytest.approx(s**2 * (A - B * q_rated**2), rel=1e-12)
    assert float(perf.efficiency) == pytest.approx(ETA(q_rated), rel=1e-12)
    p_rated = RHO * G * q_rated * (A - B * q_rated**2) / ETA(q_rated)  # P = ρ g Q H / η
    assert float(perf.shaft_power_per_pump_w) == pytest.approx(s**3 * p_rated, rel=1e-9)
    assert float(perf.rated_flow_m3_s) == pytest.approx(q_rated, rel=1e-15)


def test_reduced_speed_quadratic_pump_closed_form(fitted):
    # H(Q; s) = s² (a − b (Q/s)²) = a s² − b Q²  (closed form for H = a − b Q²)
    q = np.linspace(0.0, 0.04, 9)
    for s in (0.6, 0.85, 1.1):
        np.testing.assert_allclose(arrangement_head(fitted, q, speed_ratio=s), A * s * s - B * q * q, atol=1e-9)


def test_parallel_pumps_share_the_flow_at_equal_head(fitted):
    q = np.linspace(0.0, 0.1, 11)
    # N pumps: H = a − b (Q/N)² (closed form)
    for n in (1, 2, 3, 4):
        np.testing.assert_allclose(arrangement_head(fitted, q, pumps_in_parallel=n), A - B * (q / n) ** 2, atol=1e-9)
    perf = arrangement_performance(fitted, 0.06, 2)
    assert float(perf.flow_per_pump_m3_s) == pytest.approx(0.03)
    assert float(perf.efficiency) == pytest.approx(0.8, rel=1e-9)  # each pump at its BEP


def test_series_stages_add_heads(fitted):
    q = np.linspace(0.0, 0.04, 5)
    np.testing.assert_allclose(arrangement_head(fitted, q, series_stages=2), 2 * (A - B * q * q), atol=1e-9)
    np.testing.assert_allclose(arrangement_head(fitted, q, series_stages=3, speed_ratio=0.9),
                               3 * (A * 0.81 - B * q * q), atol=1e-9)


def test_trim_scales_like_speed_except_npsh(fitted):
    q = 0.02
    by_trim = arrangement_performance(fitted, q, trim_ratio=0.9)
    by_speed = arrangement_performance(fitted, q, speed_ratio=0.9)
    assert float(by_trim.head_m) == pytest.approx(float(by_speed.head_m), rel=1e-14)
    assert float(by_trim.shaft_power_per_pump_w) == pytest.approx(float(by_speed.shaft_power_per_pump_w), rel=1e-14)
    # NPSH required: s² NPSHr(q/s) with speed; unchanged at a given flow by trim (documented choice)
    assert float(by_trim.npsh_required_m) == pytest.approx(NPSH(q), rel=1e-9)
    assert float(by_speed.npsh_required_m) == pytest.approx(0.81 * NPSH(q / 0.9), rel=1e-9)


def test_npsh_required_is_per_pump_in_parallel(fitted):
    perf = arrangement_performance(fitted, 0.06, pumps_in_parallel=3, speed_ratio=0.8)
    assert float(perf.npsh_required_m) == pytest.approx(0.64 * NPSH(0.02 / 0.8), rel=1e-9)


def test_rated_equivalent_flow_and_range(fitted):
    assert float(rated_equivalent_flow(0.12, 3, 0.8, 0.95)) == pytest.approx(0.12 / (3 * 0.8 * 0.95))
    lo, hi = arrangement_flow_range(fitted, 2, 0.9, 0.95)
    assert float(lo) == 0.0 and float(hi) == pytest.approx(2 * 0.9 * 0.95 * 0.05)


def test_extrapolation_flag_follows_the_corresponding_flow(fitted):
    flags = arrangement_performance(fitted, np.array([0.04, 0.09, 0.11]), 2, speed_ratio=1.0).extrapolated
    assert flags.tolist() == [False, False, True]  # per pump 0.02, 0.045, 0.055 against data to 0.05
    flags = arrangement_performance(fitted, np.array([0.04, 0.045]), 1, speed_ratio=0.85).extrapolated
    assert flags.tolist() == [False, True]  # 0.045/0.85 = 0.0529 > 0.05


def test_broadcasting_matches_scenario_by_scenario(fitted):
    q = np.array([0.01, 0.05, 0.07, 0.03])
    n = np.array([1, 2, 3, 1])
    s = np.array([1.0, 0.9, 0.8, 0.7])
    together = arrangement_performance(fitted, q, n, 1, s)
    for i in range(q.size):
        alone = arrangement_performance(fitted, q[i], int(n[i]), 1, float(s[i]))
        assert float(together.head_m[i]) == pytest.approx(float(alone.head_m), rel=1e-15)
        assert float(together.npsh_required_m[i]) == pytest.approx(float(alone.npsh_required_m), rel=1e-15)


def test_arrangement_curve_for_plotting(fitted):
    curve = arrangement_curve(fitted, 2, 1, 0.9, 1.0, n_points=21, preferred_region=(0.7, 1.2))
    assert curve.flow_m3_s[0] == 0.0 and curve.flow_m3_s[-1] == pytest.approx(2 * 0.9 * 0.05)
    np.testing.assert_allclose(curve.head_m, A * 0.81 - B * (curve.flow_m3_s / 2) ** 2, atol=1e-9)
    np.testing.assert_allclose(curve.flow_per_pump_m3_s, curve.flow_m3_s / 2)
    assert curve.bep_flow_m3_s == pytest.approx(2 * 0.9 * 0.03, rel=1e-9)  # BEP moves with speed, × pumps
    assert curve.preferred_flow_min_m3_s == pytest.approx(0.7 * 2 * 0.9 * 0.03, rel=1e-9)
    assert curve.preferred_flow_max_m3_s == pytest.approx(1.2 * 2 * 0.9 * 0.03, rel=1e-9)
    assert curve.efficiency is not None and curve.npsh_required_m is not None
    assert (curve.pumps_running, curve.speed_ratio) == (2, 0.9)
    assert json.loads(json.dumps(curve.to_json_dict(), allow_nan=False))["pumps_running"] == 2


def test_arrangement_curve_without_efficiency():
    curve = arrangement_curve(fit_pump(quadratic_pump(), RHO), 1)
    assert curve.efficiency is None and curve.shaft_power_w is None and curve.npsh_required_m is None
    assert curve.bep_flow_m3_s is None and curve.preferred_flow_min_m3_s is None
    data = curve.to_json_dict()
    assert data["efficiency"] is None and len(data["head_m"]) == 101


def test_curve_json_has_none_where_power_is_undefined():
    eta = lambda q: 40.0 * q - 400.0 * q * q  # noqa: E731 - zero efficiency at shut-off: power undefined there
    curve = arrangement_curve(fit_pump(quadratic_pump(A, B, q_max=0.05, n_points=6, efficiency=eta), RHO), 1)
    data = json.loads(json.dumps(curve.to_json_dict(), allow_nan=False))
    assert data["shaft_power_w"][0] is None and data["shaft_power_w"][50] is not None
