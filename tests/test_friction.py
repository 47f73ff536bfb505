"""Tests of hydraulics.friction against published values and independent implementations.

Reference library used only here: ``fluids`` (friction factor correlations).  High-precision
Colebrook–White solutions are computed independently with :mod:`decimal`.
"""

from __future__ import annotations

import math
import warnings
from decimal import Decimal, localcontext

import fluids.friction
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.friction import (
    HAZEN_WILLIAMS_SI_CONSTANT,
    LAMBERT_W_LOG_ARGUMENT_LIMIT,
    LAMINAR_LIMIT_RE,
    TURBULENT_LIMIT_RE,
    PipeFriction,
    colebrook_clamond,
    colebrook_friction_factor,
    colebrook_lambert_w,
    darcy_friction_factor,
    darcy_weisbach,
    flow_regime,
    fully_turbulent_friction_factor,
    hazen_williams,
)
from hydraulics.model import ModelError

G = STANDARD_GRAVITY_M_S2

# Grid of the requirement: Re 1e3–1e8 log spaced × ε/D 0–0.05, with 0 exactly.
GRID_RE = np.logspace(3.0, 8.0, 41)
GRID_RR = np.concatenate(([0.0], np.logspace(-7.0, math.log10(0.05), 24)))
assert GRID_RR[-1] == pytest.approx(0.05, rel=1e-15)


def _grid() -> tuple[np.ndarray, np.ndarray]:
    return np.meshgrid(GRID_RE, GRID_RR, indexing="ij")


def _reference(function, re: np.ndarray, rr: np.ndarray) -> np.ndarray:
    """``function(Re, eD)`` of a reference library at each grid point, on plain floats."""
    values = [function(float(r), float(e)) for r, e in zip(re.ravel(), rr.ravel(), strict=True)]
    return np.array(values).reshape(re.shape)


def _colebrook_decimal(reynolds: float, relative_roughness: float, digits: int = 40) -> float:
    """Colebrook–White solved by Newton's method in 40-digit decimal arithmetic."""
    with localcontext() as ctx:
        ctx.prec = digits + 10
        re = Decimal(reynolds)
        a = Decimal(relative_roughness) / Decimal("3.7")
        b = Decimal("2.51") / re
        ln10 = Decimal(10).ln()
        x = Decimal(8)  # x = 1/sqrt(f)
        for _ in range(100):
            g = x + 2 * (a + b * x).log10()
            dg = 1 + 2 * b / ((a + b * x) * ln10)
            step = g / dg
            x -= step
            if abs(step) < Decimal(10) ** (-digits):
                break
        return float(1 / (x * x))


# --------------------------------------------------------------------------- Colebrook–White
def test_colebrook_matches_fluids_colebrook_on_grid():
    re, rr = _grid()
    ours = colebrook_friction_factor(re, rr)
    # fluids.friction.Colebrook: independent reference implementation (test-only).
    reference = _reference(fluids.friction.Colebrook, re, rr)
    np.testing.assert_allclose(ours, reference, rtol=1e-9, atol=0.0)


def test_colebrook_matches_fluids_clamond_on_grid():
    re, rr = _grid()
    ours = colebrook_friction_factor(re, rr)
    # fluids.friction.Clamond with fast=False: Clamond (2009) two-step method (test-only).
    reference = _reference(lambda r, e: fluids.friction.Clamond(r, e, False), re, rr)
    np.testing.assert_allclose(ours, reference, rtol=1e-9, atol=0.0)


def test_clamond_alone_matches_fluids_clamond_to_rounding():
    re, rr = _grid()
    reference = _reference(lambda r, e: fluids.friction.Clamond(r, e, False), re, rr)
    np.testing.assert_allclose(colebrook_clamond(re, rr), reference, rtol=1e-13, atol=0.0)


def test_lambert_w_and_clamond_agree_to_1e12_where_both_apply():
    re, rr = _grid()
    x1 = rr * re * math.log(10.0) / 18.574
    x2 = np.log(re * math.log(10.0) / 5.02)
    both = (x1 + x2) <= LAMBERT_W_LOG_ARGUMENT_LIMIT
    assert both.sum() > 500 and (~both).sum() > 50  # the grid exercises both branches
    lam = colebrook_lambert_w(re[both], rr[both])
    cla = colebrook_clamond(re[both], rr[both])
    np.testing.assert_allclose(lam, cla, rtol=1e-12, atol=0.0)


@pytest.mark.parametrize(
    "reynolds, relative_roughness",
    [(4e3, 0.0), (1e5, 1e-4), (1e6, 1e-5), (2e7, 0.0), (1e8, 0.05), (5e4, 0.05), (1e6, 0.01)],
)
def test_colebrook_matches_high_precision_solution(reynolds, relative_roughness):
    # Reference: Newton's method on Colebrook–White in 40-digit decimal arithmetic (above).
    reference = _colebrook_decimal(reynolds, relative_roughness)
    assert float(colebrook_friction_factor(reynolds, relative_roughness)) == pytest.approx(reference, rel=2e-15)
    assert float(colebrook_clamond(reynolds, relative_roughness)) == pytest.approx(reference, rel=2e-15)


def test_colebrook_satisfies_its_equation():
    re, rr = _grid()
    f = colebrook_friction_factor(re, rr)
    residual = 1.0 / np.sqrt(f) + 2.0 * np.log10(rr / 3.7 + 2.51 / (re * np.sqrt(f)))
    assert np.max(np.abs(residual) * np.sqrt(f)) < 1e-14


def test_colebrook_published_example_value():
    # fluids documentation of Colebrook: Colebrook(1E5, 1E-4) = 0.018513866077471
    assert float(colebrook_friction_factor(1e5, 1e-4)) == pytest.approx(0.018513866077471, rel=1e-12)


def test_lambert_w_form_refuses_where_it_would_overflow():
    with pytest.raises(ModelError) as info:
        colebrook_lambert_w(1e8, 0.05)
    assert info.value.field_path == "reynolds"


def test_no_runtime_warning_anywhere_on_the_grid():
    re, rr = _grid()
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        colebrook_friction_factor(re, rr)
        darcy_friction_factor(np.concatenate(([0.0], np.logspace(0, 8, 200))), 0.05)
        darcy_weisbach(np.linspace(0.0, 1.0, 50), 0.1, 100.0, 0.0, 1e-6)
        hazen_williams(np.linspace(-1.0, 1.0, 51), 0.1, 100.0, 120.0)


def test_colebrook_refuses_bad_input():
    with pytest.raises(ModelError, match="reynolds"):
        colebrook_friction_factor(0.0, 1e-4)
    with pytest.raises(ModelError, match="relative_roughness"):
        colebrook_friction_factor(1e5, -1e-4)
    with pytest.raises(ModelError, match="reynolds"):
        colebrook_friction_factor(float("nan"), 1e-4)


def test_fully_turbulent_factor_matches_fluids_von_karman():
    for rr in (1e-5, 1e-4, 1e-3, 0.01, 0.05):
        # fluids.friction.von_Karman: rough-pipe limit 1/sqrt(f) = -2 log10(eD/3.7) (test-only)
        assert float(fully_turbulent_friction_factor(rr)) == pytest.approx(fluids.friction.von_Karman(rr), rel=1e-14)


def test_fully_turbulent_factor_is_the_high_reynolds_limit_of_colebrook():
    rr = np.array([1e-5, 1e-3, 0.05])
    # Limit of Colebrook–White as Re → ∞ (definition).
    np.testing.assert_allclose(colebrook_friction_factor(1e15, rr), fully_turbulent_friction_factor(rr), rtol=1e-6)
    with pytest.raises(ModelError, match="relative_roughness"):
        fully_turbulent_friction_factor(0.0)


# --------------------------------------------------------------------------- all regimes
def test_laminar_is_hagen_poiseuille():
    re = np.array([1.0, 10.0, 640.0, 1999.0, LAMINAR_LIMIT_RE])
    # Hagen–Poiseuille: f = 64/Re, independent of roughness.
    np.testing.assert_allclose(darcy_friction_factor(re, 0.01), 64.0 / re, rtol=1e-15)


def test_zero_reynolds_gives_zero_factor():
    f = darcy_friction_factor(np.zeros(4), [0.0, 1e-4, 0.01, 0.05])
    assert np.all(f == 0.0)


def test_transition_interpolates_between_the_limits_and_is_continuous():
    for rr in (0.0, 1e-4, 0.01, 0.05):
        f_cw_4000 = float(colebrook_friction_factor(TURBULENT_LIMIT_RE, rr))
        f_mid = float(darcy_friction_factor(3000.0, rr))
        assert f_mid == pytest.approx(0.5 * (0.032 + f_cw_4000), rel=1e-14)
        eps = 1e-9
        below, above = darcy_friction_factor([2000.0, 2000.0 * (1 + eps)], rr)
        assert above == pytest.approx(below, rel=1e-7)
        below, above = darcy_friction_factor([4000.0 * (1 - eps), 4000.0], rr)
        assert above == pytest.approx(below, rel=1e-7)


def test_negative_reynolds_number_uses_its_magnitude():
    np.testing.assert_array_equal(
        darcy_friction_factor([-1000.0, -3000.0, -1e5], 1e-4), darcy_friction_factor([1000.0, 3000.0, 1e5], 1e-4)
    )


def test_flow_regime_names_and_limits():
    re = [0.0, 1.0, 2000.0, 2000.0001, 3999.9, 4000.0, 1e7, -2500.0]
    assert flow_regime(re).tolist() == [
        "none", "laminar", "laminar", "transition", "transition", "turbulent", "turbulent", "transition",
    ]


# --------------------------------------------------------------------------- Darcy–Weisbach
def test_darcy_weisbach_zero_flow_gives_zero_loss_without_nan():
    r = darcy_weisbach(np.zeros(5), 0.2, 500.0, 1e-4, 1e-6)
    assert isinstance(r, PipeFriction)
    for array in (r.velocity_m_s, r.reynolds, r.friction_factor, r.head_loss_m):
        assert np.all(array == 0.0)
    assert r.regime.tolist() == ["none"] * 5


def test_darcy_weisbach_laminar_matches_hagen_poiseuille_law():
    # Hagen–Poiseuille: h_f = 32 ν L v / (g D²).
    d, length, nu = 0.05, 20.0, 1e-4
    q = np.linspace(1e-6, 2e-4, 7)
    r = darcy_weisbach(q, d, length, 0.0, nu)
    v = q / (math.pi * d * d / 4.0)
    assert np.all(r.reynolds < LAMINAR_LIMIT_RE)
    np.testing.assert_allclose(r.head_loss_m, 32.0 * nu * length * v / (G * d * d), rtol=1e-13)


def test_darcy_weisbach_textbook_example():
    # White, Fluid Mechanics (4th ed.), Example 6.6 (from memory): 200 ft of 6 in asphalted
    # cast iron (ε = 0.0004 ft), water at 6 ft/s, ρ = 1.94 slug/ft³, μ = 2.09e-5 slug/(ft·s):
    # Re ≈ 2.78e5, ε/d = 0.0008, f ≈ 0.0195 read from the Moody chart (about 2 %), h_f ≈ 4.36 ft.
    ft = 0.3048
    d = 0.5 * ft
    v = 6.0 * ft
    nu = (2.09e-5 / 1.94) * ft**2
    r = darcy_weisbach(v * math.pi * d * d / 4.0, d, 200.0 * ft, 0.0004 * ft, nu)
    assert float(r.reynolds) == pytest.approx(2.78e5, rel=2e-3)
    assert float(r.friction_factor) == pytest.approx(0.0195, rel=0.02)
    assert float(r.head_loss_m) / ft == pytest.approx(4.36, rel=0.02)


def test_darcy_weisbach_matches_fluids_head_loss():
    d, length, eps, nu = 0.15, 350.0, 0.26e-3, 1.3e-6
    q = np.linspace(0.001, 0.08, 9)
    r = darcy_weisbach(q, d, length, eps, nu)
    for qi, hi, vi in zip(q, r.head_loss_m, r.velocity_m_s, strict=True):
        v = qi / (math.pi * d * d / 4.0)
        # fluids.friction.Colebrook (test-only) with Darcy–Weisbach written out.
        f = fluids.friction.Colebrook(v * d / nu, eps / d)
        assert vi == pytest.approx(v, rel=1e-15)
        assert hi == pytest.approx(f * length / d * v * v / (2.0 * G), rel=1e-9)


def test_parallel_pipes_share_the_flow_equally():
    single = darcy_weisbach(0.05, 0.2, 800.0, 1e-4, 1e-6)
    triple = darcy_weisbach(0.15, 0.2, 800.0, 1e-4, 1e-6, parallel_pipes=3)
    # Continuity: each of n identical pipes carries Q/n; the loss across the segment is one pipe's.
    assert float(triple.velocity_m_s) == pytest.approx(float(single.velocity_m_s), rel=1e-15)
    assert float(triple.head_loss_m) == pytest.approx(float(single.head_loss_m), rel=1e-15)
    # Parallel pipes given as a float array of whole numbers are accepted.
    np.testing.assert_allclose(
        darcy_weisbach(0.15, 0.2, 800.0, 1e-4, 1e-6, parallel_pipes=np.array([3.0])).head_loss_m,
        [float(single.head_loss_m)],
        rtol=1e-15,
    )


def test_reverse_flow_gives_opposite_loss():
    forward = darcy_weisbach(0.03, 0.1, 100.0, 1e-4, 1e-6)
    reverse = darcy_weisbach(-0.03, 0.1, 100.0, 1e-4, 1e-6)
    assert float(reverse.head_loss_m) == -float(forward.head_loss_m)
    assert float(reverse.velocity_m_s) == -float(forward.velocity_m_s)
    assert float(reverse.reynolds) == float(forward.reynolds)


def test_broadcasting_segments_by_flows():
    diameters = np.array([[0.1], [0.2], [0.3]])
    roughness = np.array([[1e-5], [1e-4], [1e-3]])
    lengths = np.array([[50.0], [500.0], [5000.0]])
    flows = np.linspace(0.0, 0.2, 512)
    r = darcy_weisbach(flows, diameters, lengths, roughness, 1.1e-6, parallel_pipes=np.array([[1], [2], [1]]))
    for array in (r.velocity_m_s, r.reynolds, r.friction_factor, r.head_loss_m):
        assert array.shape == (3, 512)
    row = darcy_weisbach(flows, 0.2, 500.0, 1e-4, 1.1e-6, parallel_pipes=2)
    np.testing.assert_array_equal(r.head_loss_m[1], row.head_loss_m)
    hw = hazen_williams(flows, diameters, lengths, np.array([[140.0], [130.0], [100.0]]), kinematic_viscosity_m2_s=1e-6)
    assert hw.head_loss_m.shape == (3, 512) and hw.reynolds.shape == (3, 512)


@pytest.mark.parametrize(
    "kwargs, field",
    [
        ({"internal_diameter_m": 0.0}, "internal_diameter_m"),
        ({"internal_diameter_m": -0.1}, "internal_diameter_m"),
        ({"length_m": -1.0}, "length_m"),
        ({"roughness_m": -1e-5}, "roughness_m"),
        ({"kinematic_viscosity_m2_s": 0.0}, "kinematic_viscosity_m2_s"),
        ({"parallel_pipes": 0}, "parallel_pipes"),
        ({"parallel_pipes": 1.5}, "parallel_pipes"),
        ({"flow_m3_s": [0.1, float("nan")]}, "flow_m3_s"),
        ({"flow_m3_s": "a lot"}, "flow_m3_s"),
    ],
)
def test_darcy_weisbach_refuses_bad_input_naming_the_field(kwargs, field):
    args = {
        "flow_m3_s": 0.1, "internal_diameter_m": 0.2, "length_m": 100.0,
        "roughness_m": 1e-4, "kinematic_viscosity_m2_s": 1e-6,
    }
    args.update(kwargs)
    with pytest.raises(ModelError) as info:
        darcy_weisbach(**args)
    assert info.value.field_path == field


@settings(max_examples=60, deadline=None)
@given(
    diameter=st.floats(0.01, 2.0),
    roughness_ratio=st.floats(0.0, 0.05),
    viscosity=st.floats(1e-7, 1e-4),
    length=st.floats(1.0, 10_000.0),
)
def test_head_loss_is_continuous_and_non_decreasing_in_flow(diameter, roughness_ratio, viscosity, length):
    # Flows that span every regime, dense through laminar, transition and turbulent limits.
    reynolds = np.unique(np.concatenate((
        [0.0], np.logspace(0.0, 7.0, 300), np.linspace(1900.0, 4100.0, 400),
        [2000.0, np.nextafter(2000.0, 3000.0), np.nextafter(4000.0, 0.0), 4000.0],
    )))
    flows = reynolds * viscosity * math.pi * diameter / 4.0
    r = darcy_weisbach(flows, diameter, length, roughness_ratio * diameter, viscosity)
    h = r.head_loss_m
    assert np.all(np.isfinite(h)) and h[0] == 0.0
    assert np.all(np.diff(h) >= -1e-13 * h[1:])
    # No jumps: flows just below and just above each regime limit give the same loss.
    for limit in (LAMINAR_LIMIT_RE, TURBULENT_LIMIT_RE):
        near = np.array([1.0 - 1e-12, 1.0 + 1e-12]) * limit * viscosity * math.pi * diameter / 4.0
        below, above = darcy_weisbach(near, diameter, length, roughness_ratio * diameter, viscosity).head_loss_m
        assert above == pytest.approx(below, rel=1e-9)


# --------------------------------------------------------------------------- Hazen–Williams
def _hazen_williams_original(q_m3_s, d_m, length_m, c):
    """Williams & Hazen (1920): V = C R^0.63 S^0.54 0.001^-0.04 in ft and s, solved for S."""
    ft = 0.3048
    area_ft2 = math.pi * (d_m / ft) ** 2 / 4.0
    v_ft_s = (q_m3_s / ft**3) / area_ft2
    r_ft = (d_m / ft) / 4.0
    slope = (v_ft_s / (c * r_ft**0.63 * 0.001**-0.04)) ** (1.0 / 0.54)
    return slope * length_m


@pytest.mark.parametrize("q, d, c", [(0.01, 0.1, 140.0), (0.1, 0.3, 130.0), (0.5, 0.6, 100.0), (2.0, 1.2, 80.0)])
def test_hazen_williams_matches_the_original_velocity_formula(q, d, c):
    # Williams & Hazen (1920), Hydraulic Tables: the SI form's rounded constant (10.67) and
    # exponents (1.852, 4.8704) reproduce the original within 0.2 %.
    reference = _hazen_williams_original(q, d, 1000.0, c)
    assert float(hazen_williams(q, d, 1000.0, c).head_loss_m) == pytest.approx(reference, rel=2e-3)


def test_hazen_williams_si_constant_is_the_converted_original():
    # Exact conversion of V = 1.318 C R^0.63 S^0.54 (Williams & Hazen 1920) to SI with R = D/4:
    # S = [4 Q / (π D² · 0.001^-0.04 · 0.3048^0.37 · C · (D/4)^0.63)]^(1/0.54).
    k_si = 0.001**-0.04 * 0.3048**0.37
    constant = (4.0 / (math.pi * k_si * 4.0**-0.63)) ** (1.0 / 0.54)
    assert constant == pytest.approx(10.666, abs=5e-4)
    assert HAZEN_WILLIAMS_SI_CONSTANT == pytest.approx(constant, rel=1e-3)


@pytest.mark.parametrize("q_gpm, d_in, c", [(500.0, 6.065, 120.0), (100.0, 2.067, 120.0), (2000.0, 10.02, 100.0)])
def test_hazen_williams_matches_us_customary_psi_form(q_gpm, d_in, c):
    # NFPA 13 Hazen–Williams form (from memory): p = 4.52 Q^1.85 / (C^1.85 d^4.87) psi per foot,
    # Q in gpm, d in inches; psi to metres of water at 60 °F (999.0 kg/m³), exact unit factors.
    psi_per_ft = 4.52 * q_gpm**1.85 / (c**1.85 * d_in**4.87)
    metres_per_metre = psi_per_ft * 6894.757293168 / (999.0 * G) / 0.3048
    q = q_gpm * 3.785411784e-3 / 60.0
    assert float(hazen_williams(q, d_in * 0.0254, 1.0, c).head_loss_m) == pytest.approx(metres_per_metre, rel=0.01)


def test_hazen_williams_equivalent_darcy_factor_reproduces_the_loss():
    q = np.linspace(-0.2, 0.2, 41)
    r = hazen_williams(q, 0.3, 750.0, 120.0, parallel_pipes=2, kinematic_viscosity_m2_s=1.0e-6)
    v = r.velocity_m_s
    # Darcy–Weisbach with the reported factor gives back the Hazen–Williams loss.
    np.testing.assert_allclose(r.friction_factor * 750.0 / 0.3 * v * np.abs(v) / (2.0 * G), r.head_loss_m, rtol=1e-13)
    assert r.friction_factor[20] == 0.0 and r.head_loss_m[20] == 0.0  # zero flow
    np.testing.assert_allclose(r.head_loss_m[:20], -r.head_loss_m[:20:-1], rtol=1e-13)
    np.testing.assert_allclose(r.reynolds, np.abs(v) * 0.3 / 1.0e-6, rtol=1e-15)
    np.testing.assert_allclose(r.velocity_m_s, q / 2 / (math.pi * 0.09 / 4.0), rtol=1e-15)


def test_hazen_williams_parallel_pipes_and_missing_viscosity():
    single = hazen_williams(0.05, 0.2, 800.0, 130.0)
    double = hazen_williams(0.10, 0.2, 800.0, 130.0, parallel_pipes=2)
    assert float(double.head_loss_m) == pytest.approx(float(single.head_loss_m), rel=1e-15)
    assert np.isnan(single.reynolds)
    zero_length = hazen_williams(0.05, 0.2, 0.0, 130.0)
    assert float(zero_length.head_loss_m) == 0.0
    assert float(zero_length.friction_factor) == pytest.approx(float(single.friction_factor), rel=1e-15)
    with pytest.raises(ModelError) as info:
        hazen_williams(0.05, 0.2, 800.0, 0.0)
    assert info.value.field_path == "c_factor"
