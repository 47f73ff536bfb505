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
