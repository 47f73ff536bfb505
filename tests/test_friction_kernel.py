"""The fast Colebrook–White kernel used by the system curves equals the documented methods."""

import numpy as np

from hydraulics import friction


def test_fast_kernel_equals_clamond_and_lambert_w_over_a_grid():
    re = np.logspace(np.log10(4000.0), 8, 300)[:, None]
    rr = np.concatenate([[0.0], np.logspace(-7, np.log10(0.05), 40)])
    fast = friction.colebrook_fast(re, rr)
    # Clamond (2009) iteration, same algebra rearranged: identical to rounding
    np.testing.assert_allclose(fast, friction.colebrook_clamond(re, rr), rtol=1e-14, atol=0)
    # the exact Lambert W closed form (with its documented overflow fallback)
    np.testing.assert_allclose(fast, friction.colebrook_friction_factor(re, rr), rtol=1e-12, atol=0)


def test_fast_kernel_handles_chunk_boundaries_and_shapes(monkeypatch):
    monkeypatch.setattr(friction, "_KERNEL_CHUNK", 7)
    re = np.linspace(5e3, 5e6, 53).reshape(53, 1) * np.ones((1, 3))
    rr = np.array([0.0, 1e-4, 1e-2])
    np.testing.assert_allclose(friction.colebrook_fast(re, rr), friction.colebrook_clamond(re, rr), rtol=1e-14)


def test_all_regime_factor_uses_floor_only_for_transition():
    re = np.array([0.0, 1000.0, 2000.0, 3000.0, 4000.0, 1e5])
    f = friction.darcy_friction_factor(re, 1e-4)
    assert f[0] == 0.0
    assert f[1] == 64.0 / 1000.0  # Hagen–Poiseuille
    assert f[2] == 64.0 / 2000.0
    f4000 = friction.colebrook_clamond(4000.0, 1e-4)
    assert np.isclose(f[3], 0.032 + (f4000 - 0.032) * 0.5, rtol=1e-14)  # documented linear interpolation
    assert np.isclose(f[4], f4000, rtol=1e-14)


def test_weighted_sums_equal_the_friction_factors_times_the_weights(monkeypatch):
    """The blocked sums used by the system curves against darcy_friction_factor(...) @ weight."""
    rng = np.random.default_rng(3)  # random test inputs, not data
    flows = np.concatenate([[0.0, 1e-7, 1e-5, 2e-4, 3e-4], np.linspace(1e-3, 0.5, 95)])  # laminar to turbulent
    per_flow = rng.uniform(1e5, 2e7, 13)
    rr_new = np.concatenate([[0.0], rng.uniform(1e-6, 5e-3, 12)])
    rr_aged = rr_new * 4.0
    weight = rng.uniform(0.1, 50.0, 13)
    re = np.multiply.outer(flows, per_flow)
    assert (re < 2000).any() and ((re > 2000) & (re < 4000)).any() and (re > 4000).any()
    for chunk in (7, 64, 8192):  # rows per block: 1, 4 and all 100
        monkeypatch.setattr(friction, "_KERNEL_CHUNK", chunk)
        expected = friction.darcy_friction_factor(re, rr_new) @ weight
        np.testing.assert_allclose(friction.darcy_weighted_sums(flows, per_flow, rr_new, weight), expected,
                                   rtol=1e-14, atol=0)
        mixed = np.where((np.arange(flows.size) % 2 == 0)[:, None], rr_aged, rr_new)  # one row per flow
        np.testing.assert_allclose(friction.darcy_weighted_sums(flows, per_flow, mixed, weight),
                                   friction.darcy_friction_factor(re, mixed) @ weight, rtol=1e-14, atol=0)
    assert friction.darcy_weighted_sums(flows, per_flow[:0], rr_new[:0], weight[:0]).tolist() == [0.0] * flows.size
