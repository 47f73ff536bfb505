"""Properties of ordinary water by the IAPWS formulations, vectorised over numpy arrays.

* :func:`saturation_pressure` — IAPWS-IF97 region 4, saturation-pressure equation.
* :func:`density_liquid` — IAPWS-IF97 region 1 (compressed liquid), from the
  pressure derivative of the dimensionless Gibbs free energy.
* :func:`dynamic_viscosity` — IAPWS 2008 formulation for the viscosity of ordinary
  water substance, without the critical enhancement (μ2 = 1).

References
----------
IAPWS R7-97(2012), *Revised Release on the IAPWS Industrial Formulation 1997 for the
Thermodynamic Properties of Water and Steam* (IAPWS-IF97).
IAPWS R12-08, *Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary
Water Substance* (Huber et al., J. Phys. Chem. Ref. Data 38, 101, 2009).

Inputs are kelvin, pascal and kg/m³ (SI base units), floats or arrays; outputs are
float64 (a Python float for scalar input).  Values outside the validity range raise
:class:`hydraulics.model.ModelError`.
"""

from __future__ import annotations

from typing import Final

import numpy as np

from hydraulics.model import ModelError

__all__ = [
    "SPECIFIC_GAS_CONSTANT_J_KG_K",
    "CRITICAL_TEMPERATURE_K",
    "CRITICAL_DENSITY_KG_M3",
    "saturation_pressure",
    "density_liquid",
    "specific_volume_liquid",
    "dynamic_viscosity",
]

SPECIFIC_GAS_CONSTANT_J_KG_K: Final = 461.526
"""Specific gas constant of water used by IAPWS-IF97, R = 0.461526 kJ/(kg·K) (R7-97 Eq. 1)."""

CRITICAL_TEMPERATURE_K: Final = 647.096
"""Critical temperature of water, T_c (IAPWS R7-97 Eq. 2; IAPWS R12-08 Eq. 1)."""

CRITICAL_DENSITY_KG_M3: Final = 322.0
"""Critical density of water, ρ_c (IAPWS R12-08 Eq. 1)."""

# --------------------------------------------------------------------------- region 4
_REGION4_N: Final = np.array(
    [
        0.11670521452767e4,
        -0.72421316703206e6,
        -0.17073846940092e2,
        0.12020824702470e5,
        -0.32325550322333e7,
        0.14915108613530e2,
        -0.48232657361591e4,
        0.40511340542057e6,
        -0.23855557567849,
        0.65017534844798e3,
    ]
)
"""Coefficients n1…n10 of the saturation equation (IAPWS R7-97, Table 34)."""

# --------------------------------------------------------------------------- region 1
_REGION1_I: Final = np.array(
    [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5, 8, 8, 21, 23, 29, 30, 31, 32],
    dtype=np.float64,
)
_REGION1_J: Final = np.array(
    [-2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1, 3, 17, -4, 0, 6, -5, -2, 10, -8, -11, -6, -29, -31,
     -38, -39, -40, -41],
    dtype=np.float64,
)
_REGION1_N: Final = np.array(
    [
        0.14632971213167,
        -0.84548187169114,
        -0.37563603672040e1,
        0.33855169168385e1,
        -0.95791963387872,
        0.15772038513228,
        -0.16616417199501e-1,
        0.81214629983568e-3,
        0.28319080123804e-3,
        -0.60706301565874e-3,
        -0.18990068218419e-1,
        -0.32529748770505e-1,
        -0.21841717175414e-1,
        -0.52838357969930e-4,
        -0.47184321073267e-3,
        -0.30001780793026e-3,
        0.47661393906987e-4,
        -0.44141845330846e-5,
        -0.72694996297594e-15,
        -0.31679644845054e-4,
        -0.28270797985312e-5,
        -0.85205128120103e-9,
        -0.22425281908000e-5,
        -0.65171222895601e-6,
        -0.14341729937924e-12,
        -0.40516996860117e-6,
        -0.12734301741641e-8,
        -0.17424871230634e-9,
        -0.68762131295531e-18,
        0.14478307828521e-19,
        0.26335781662795e-22,
        -0.11947622640071e-22,
        0.18228094581404e-23,
        -0.93537087292458e-25,
    ]
)
"""Exponents I_i, J_i and coefficients n_i of the region 1 Gibbs equation (IAPWS R7-97, Table 2)."""

_REGION1_P_STAR_PA: Final = 16.53e6
_REGION1_T_STAR_K: Final = 1386.0

# --------------------------------------------------------------------------- viscosity
_VISCOSITY_H0: Final = np.array([1.67752, 2.20462, 0.6366564, -0.241605])
"""Coefficients H_i of the dilute-gas viscosity μ0 (IAPWS R12-08, Table 1)."""

_VISCOSITY_H1: Final = np.array(
    # columns j = 0..6, rows i = 0..5 (IAPWS R12-08, Table 2)
    [
        [5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0.0, 0.0],
        [8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0.0, 0.0, 0.0],
        [-1.08374, 1.88797, -7.72479e-1, 0.0, 0.0, 0.0, 0.0],
        [-2.89555e-1, 1.26613, -4.89837e-1, 0.0, 6.98452e-2, 0.0, -4.35673e-3],
        [0.0, 0.0, -2.57040e-1, 0.0, 0.0, 8.72102e-3, 0.0],
        [0.0, 1.20573e-1, 0.0, 0.0, 0.0, 0.0, -5.93264e-4],
    ]
)
"""Coefficients H_ij of the residual viscosity μ1 (IAPWS R12-08, Table 2)."""

_VISCOSITY_REFERENCE_PA_S: Final = 1.0e-6
"""Reference viscosity μ* = 1.00 × 10⁻⁶ Pa·s (IAPWS R12-08, Eq. 1)."""


# --------------------------------------------------------------------------- helpers
def _as_array(values: object, field: str) -> np.ndarray:
    array = np.asarray(values, dtype=np.float64)
    if not np.all(np.isfinite(array)):
        raise ModelError(field, "must be a finite number", values)
    return array


def _check_range(array: np.ndarray, field: str, low: float, high: float, unit: str) -> None:
    if array.size and (np.min(array) < low or np.max(array) > high):
        bad = array[(array < low) | (array > high)].flat[0]
        raise ModelError(field, f"allowed {low:g} to {high:g} {unit}; got {bad:g} {unit}", float(bad))


def _result(array: np.ndarray, scalar_input: bool) -> float | np.ndarray:
    return float(array) if scalar_input else array


# --------------------------------------------------------------------------- public functions
def saturation_pressure(temperature_k: float | np.ndarray) -> float | np.ndarray:
    r"""Saturation (vapour) pressure of water, IAPWS-IF97 region 4 [Pa].

    The saturation equation (IAPWS R7-97(2012), Eqs. 29a and 30):

    .. math::

        \vartheta = T + \frac{n_9}{T - n_{10}}, \quad
        A = \vartheta^2 + n_1\vartheta + n_2, \quad
        B = n_3\vartheta^2 + n_4\vartheta + n_5, \quad
        C = n_6\vartheta^2 + n_7\vartheta + n_8

    .. math::

        p_s = 1\,\mathrm{MPa}\left[\frac{2C}{-B + \sqrt{B^2 - 4AC}}\right]^4

    Parameters
    ----------
    temperature_k : float or ndarray
        Temperature T [K]; valid 273.15 K to 647.096 K (triple point region to the
        critical point).

    Returns
    -------
    float or ndarray
        Saturation pressure p_s [Pa].

    Examples
    --------
    IAPWS R7-97 Table 35 check value: 300 K → 0.353658941e-2 MPa.

    >>> round(saturation_pressure(300.0), 4)
    3536.5894
    """
    scalar_input = np.ndim(temperature_k) == 0
    t = _as_array(temperature_k, "temperature_k")
    _check_range(t, "temperature_k", 273.15, CRITICAL_TEMPERATURE_K, "K")
    n = _REGION4_N
    theta = t + n[8] / (t - n[9])
    a = theta * theta + n[0] * theta + n[1]
    b = n[2] * theta * theta + n[3] * theta + n[4]
    c = n[5] * theta * theta + n[6] * theta + n[7]
    pressure_pa = 1.0e6 * (2.0 * c / (-b + np.sqrt(b * b - 4.0 * a * c))) ** 4
    return _result(pressure_pa, scalar_input)


def specific_volume_liquid(temperature_k: float | np.ndarray, pressure_pa: float | np.ndarray) -> float | np.ndarray:
    r"""Specific volume of liquid water, IAPWS-IF97 region 1 [m³/kg].

    From the dimensionless Gibbs free energy γ(π, τ) of region 1 (IAPWS R7-97(2012),
    Eq. 7 and Table 3), with π = p / 16.53 MPa and τ = 1386 K / T:

    .. math::

        \gamma_\pi = \sum_{i=1}^{34} -n_i I_i (7.1 - \pi)^{I_i - 1} (\tau - 1.222)^{J_i},
        \qquad v = \frac{R T}{p}\, \pi\, \gamma_\pi

    Parameters
    ----------
    temperature_k : float or ndarray
        Temperature T [K]; valid 273.15 K to 623.15 K.
    pressure_pa : float or ndarray
        Pressure p [Pa]; valid from the saturation pressure p_s(T) to 100 MPa (below
        p_s the water is vapour and region 1 does not apply).  Broadcast with T.

    Returns
    -------
    float or ndarray
        Specific volume v [m³/kg].

    Examples
    --------
    IAPWS R7-97 Table 5 check value: T = 300 K, p = 3 MPa → v = 0.100215168e-2 m³/kg.

    >>> round(specific_volume_liquid(300.0, 3.0e6), 11)
    0.00100215168
    """
    scalar_input = np.ndim(temperature_k) == 0 and np.ndim(pressure_pa) == 0
    t = _as_array(temperature_k, "temperature_k")
    p = _as_array(pressure_pa, "pressure_pa")
    _check_range(t, "temperature_k", 273.15, 623.15, "K")
    _check_range(p, "pressure_pa", 0.0, 100.0e6, "Pa")
    t, p = np.broadcast_arrays(t, p)
    p_sat = saturation_pressure(t)
    below = p < np.asarray(p_sat) * (1.0 - 1e-12)
    if np.any(below):
        index = np.flatnonzero(below.ravel())[0]
        raise ModelError(
            "pressure_pa",
            f"at {t.flat[index]:g} K water is liquid only at or above its saturation pressure "
            f"{np.asarray(p_sat).flat[index]:.6g} Pa; got {p.flat[index]:g} Pa",
            float(p.flat[index]),
        )
    pi = p / _REGION1_P_STAR_PA
    tau = _REGION1_T_STAR_K / t
    i, j, n = _REGION1_I, _REGION1_J, _REGION1_N
    # Sum over the 34 terms along a trailing axis; vectorised over the input shape.
    base_pi = (7.1 - pi)[..., np.newaxis]
    base_tau = (tau - 1.222)[..., np.newaxis]
    gamma_pi = np.sum(-n * i * base_pi ** (i - 1.0) * base_tau**j, axis=-1)
    volume = SPECIFIC_GAS_CONSTANT_J_KG_K * t / p * pi * gamma_pi
    return _result(volume, scalar_input)


def density_liquid(temperature_k: float | np.ndarray, pressure_pa: float | np.ndarray) -> float | np.ndarray:
    """Density of liquid water, IAPWS-IF97 region 1: ρ = 1 / v [kg/m³].

    See :func:`specific_volume_liquid` for the equation, parameters and validity
    (273.15–623.15 K, p_s(T) ≤ p ≤ 100 MPa).

    Examples
    --------
    Liquid water at 20 °C and one standard atmosphere (IAPWS-IF97 region 1):

    >>> round(density_liquid(293.15, 101325.0), 3)
    998.206
    """
    return 1.0 / specific_volume_liquid(temperature_k, pressure_pa)


def dynamic_viscosity(temperature_k: float | np.ndarray, density_kg_m3: float | np.ndarray) -> float | np.ndarray:
    r"""Dynamic viscosity of water, IAPWS 2008 formulation, without critical enhancement [Pa·s].

    IAPWS R12-08, Eq. (2) with μ2 = 1, in reduced variables T̄ = T/T_c,
    ρ̄ = ρ/ρ_c (T_c = 647.096 K, ρ_c = 322 kg/m³) and μ* = 1 µPa·s:

    .. math::

        \bar\mu = \bar\mu_0(\bar T)\,\bar\mu_1(\bar T, \bar\rho), \qquad
        \bar\mu_0 = \frac{100\sqrt{\bar T}}{\sum_{i=0}^{3} H_i / \bar T^{\,i}}

    .. math::

        \bar\mu_1 = \exp\left[\bar\rho \sum_{i=0}^{5}\sum_{j=0}^{6}
        H_{ij}\left(\frac{1}{\bar T} - 1\right)^i (\bar\rho - 1)^j\right]

    The critical enhancement μ2 differs from 1 only in a small region around the
    critical point (roughly 645.91 K < T < 650.77 K and 245.8 kg/m³ < ρ < 405.3 kg/m³,
    IAPWS R12-08 section 2.7); the release itself recommends μ2 = 1 for industrial use.
    This function sets μ2 = 1 and refuses that region.

    Parameters
    ----------
    temperature_k : float or ndarray
        Temperature T [K]; accepted 253.15 K to 1173.15 K (the formulation is
        validated from the melting line to 1173.15 K).
    density_kg_m3 : float or ndarray
        Density ρ [kg/m³] of the state (e.g. from :func:`density_liquid`); accepted
        above 0 up to 1400 kg/m³.  Broadcast with T.

    Returns
    -------
    float or ndarray
        Dynamic viscosity μ [Pa·s].

    Examples
    --------
    IAPWS R12-08 Table 4 check value: 298.15 K, 998 kg/m³ → 889.735100 µPa·s.

    >>> round(dynamic_viscosity(298.15, 998.0) * 1e6, 6)
    889.7351
    """
    scalar_input = np.ndim(temperature_k) == 0 and np.ndim(density_kg_m3) == 0
    t = _as_array(temperature_k, "temperature_k")
    rho = _as_array(density_kg_m3, "density_kg_m3")
    _check_range(t, "temperature_k", 253.15, 1173.15, "K")
    _check_range(rho, "density_kg_m3", 0.0, 1400.0, "kg/m³")
    if np.any(rho <= 0.0):
        raise ModelError("density_kg_m3", "must be above 0 kg/m³", float(rho[rho <= 0.0].flat[0]))
    t, rho = np.broadcast_arrays(t, rho)
    near_critical = (t > 645.91) & (t < 650.77) & (rho > 245.8) & (rho < 405.3)
    if np.any(near_critical):
        raise ModelError(
            "temperature_k",
            "state lies in the near-critical region where the critical enhancement matters; not supported",
        )
    t_bar = t / CRITICAL_TEMPERATURE_K
    rho_bar = rho / CRITICAL_DENSITY_KG_M3
    h0 = _VISCOSITY_H0
    mu0 = 100.0 * np.sqrt(t_bar) / (h0[0] + h0[1] / t_bar + h0[2] / t_bar**2 + h0[3] / t_bar**3)
    x = 1.0 / t_bar - 1.0
    y = rho_bar - 1.0
    powers_x = x[..., np.newaxis] ** np.arange(6.0)  # (..., 6)
    powers_y = y[..., np.newaxis] ** np.arange(7.0)  # (..., 7)
    double_sum = np.einsum("...i,ij,...j->...", powers_x, _VISCOSITY_H1, powers_y)
    mu1 = np.exp(rho_bar * double_sum)
    return _result(_VISCOSITY_REFERENCE_PA_S * mu0 * mu1, scalar_input)
