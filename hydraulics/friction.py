"""Pipe friction: Darcy–Weisbach with the Colebrook–White friction factor, and Hazen–Williams.

All functions take plain float64 SI values or numpy arrays and broadcast them against
each other (for example diameters of shape ``(segments, 1)`` against flows of shape
``(flows,)`` give results of shape ``(segments, flows)``).  Nothing here loops in Python
over flow points.

Friction factor by regime (:func:`darcy_friction_factor`):

========================  ===================================================
Reynolds number           friction factor
========================  ===================================================
Re = 0                    0 (no flow, no loss)
0 < Re <= 2000            laminar, Hagen–Poiseuille f = 64/Re
2000 < Re < 4000          transition: linear interpolation in Re (see below)
Re >= 4000                Colebrook–White, solved to machine precision
========================  ===================================================

The sign of a Reynolds number (the direction of flow) does not change the friction
factor; losses carry the sign of the flow (see :func:`darcy_weisbach`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import ModelError
from hydraulics.results import FloatArray

LAMINAR_LIMIT_RE = 2000.0
"""Highest Reynolds number treated as laminar (f = 64/Re)."""

TURBULENT_LIMIT_RE = 4000.0
"""Lowest Reynolds number treated as fully turbulent (Colebrook–White)."""

HAZEN_WILLIAMS_SI_CONSTANT = 10.67
"""Constant of the SI Hazen–Williams head-loss form h_f = 10.67 L Q^1.852 / (C^1.852 D^4.8704).

It follows from the original velocity form of Williams & Hazen (1920),
V = 1.318 C R^0.63 S^0.54 (US customary units: ft, s), converted to SI
(V = 0.849 C R^0.63 S^0.54 with R = D/4) and solved for S = h_f / L; the rounded
value 10.67 is the one tabulated in hydraulic handbooks for SI use (e.g. the
water-supply chapters of Mays, *Water Distribution Systems Handbook*, 2000; from
memory).  The exact conversion (1.318 = 0.001^-0.04, 1 ft = 0.3048 m) gives 10.666
(see the tests); the rounding is worth 0.04 % of the loss, far inside the uncertainty
of the C factor.
"""

HAZEN_WILLIAMS_FLOW_EXPONENT = 1.852
"""Flow exponent of the SI Hazen–Williams head-loss form (1/0.54 rounded)."""

HAZEN_WILLIAMS_DIAMETER_EXPONENT = 4.8704
"""Diameter exponent of the SI Hazen–Williams head-loss form ((2 + 0.63)/0.54)."""

_LN10 = math.log(10.0)
# Colebrook–White 1/sqrt(f) = -2 log10(eps/(3.7 D) + 2.51/(Re sqrt(f))), written with
#   x1 = (eps/D) Re ln(10) / (3.7 * 5.02)   and   x2 = ln(Re ln(10) / 5.02)
# (the variables of Clamond 2009); 5.02 = 2 * 2.51.
_X1_FACTOR = _LN10 / (3.7 * 5.02)
_X2_OFFSET = math.log(_LN10 / 5.02)
_HALF_LN10 = 0.5 * _LN10

LAMBERT_W_LOG_ARGUMENT_LIMIT = 700.0
"""Largest ln(z) for which :func:`colebrook_lambert_w` evaluates z = exp(x1 + x2).

exp overflows float64 above ln(z) ≈ 709.78; 700 keeps a margin.  In terms of the
flow this is roughly Re·ε/D above 5,600 (fully rough flow), where
:func:`colebrook_friction_factor` uses :func:`colebrook_clamond` instead.
"""


# --------------------------------------------------------------------------- input checks
def _as_float_array(value: ArrayLike, name: str) -> np.ndarray:
    """``value`` as a float64 array, refusing non-numbers and non-finite entries."""
    try:
        array = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise ModelError(name, f"must be a number or an array of numbers; got {value!r}", value) from None
    if not np.all(np.isfinite(array)):
        raise ModelError(name, "must be finite (no NaN or infinity)", value)
    return array


def _require(condition: np.ndarray, name: str, allowed: str, array: np.ndarray) -> None:
    """Raise :class:`ModelError` naming ``name`` when any entry fails ``condition``."""
    if not np.all(condition):
        bad = array[~np.broadcast_to(condition, array.shape)].ravel()[0] if array.ndim else array.item()
        raise ModelError(name, f"must be {allowed}; got {float(bad):g}", float(bad))


def _colebrook_inputs(reynolds: ArrayLike, relative_roughness: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    re = _as_float_array(reynolds, "reynolds")
    rr = _as_float_array(relative_roughness, "relative_roughness")
    _require(re > 0.0, "reynolds", "greater than 0 for the Colebrook–White equation", re)
    _require(rr >= 0.0, "relative_roughness", "0 or more", rr)
    re_b, rr_b = np.broadcast_arrays(re, rr)
    return re_b, rr_b


def _clamond_variables(re: np.ndarray, rr: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    return rr * re * _X1_FACTOR, np.log(re) + _X2_OFFSET


_KERNEL_CHUNK = 6144
"""Elements per block of the in-place Clamond kernels: small enough for their ten scratch
blocks to stay in cache (the fastest of 4096–12288 in ``make bench`` on a 2-core machine)."""

_F_FROM_VARIABLE = _HALF_LN10**2
"""f = (ln 10 / 2)² / F², from 1/√f = (2/ln 10) F."""


def _clamond_steps(x1: FloatArray, x2: FloatArray, f_var: FloatArray, t: FloatArray, r: FloatArray, u: FloatArray,
                   u2: FloatArray, num: FloatArray, den: FloatArray) -> None:
    r"""Clamond's start and two third-order steps, in place: ``f_var`` ends as F = 1/√f·(ln 10/2).

    ``x1`` and ``x2`` hold Clamond's variables; the other arguments are scratch arrays of
    their shape.  With :math:`t = x_1 + F`, :math:`u = 1 + t` and the residual
    :math:`r = \ln t + F - x_2` (so that Clamond's :math:`e = r/u`), each step

    .. math:: F \leftarrow F - \frac{(u^2 + r/2)\, r\, t}{u (u^2 + r) + r^2/3}

    is Clamond's correction with the divisions by :math:`u` multiplied out (one division
    per step instead of three).
    """
    np.subtract(x2, 0.2, out=f_var)
    np.add(x1, f_var, out=t)
    np.log(t, out=r)
    r -= 0.2
    for step in range(2):
        if step:
            np.add(x1, f_var, out=t)
            np.log(t, out=r)
            r += f_var
            r -= x2
        np.add(t, 1.0, out=u)
        np.multiply(u, u, out=u2)
        np.multiply(r, 0.5, out=num)
        num += u2
        num *= r
        num *= t
        np.add(u2, r, out=den)
        den *= u
        np.multiply(r, r, out=t)  # t is not read again in this step
        t *= 1.0 / 3.0
        den += t
        num /= den
        f_var -= num


def _clamond_kernel(re: np.ndarray, rr: np.ndarray, floor_re: float = 0.0) -> np.ndarray:
    """Clamond's iteration (:func:`_clamond_steps`) for flat arrays of Re and ε/D; returns f.

    Same iteration as :func:`colebrook_clamond`, rearranged for speed.  Works in place
    on contiguous blocks of :data:`_KERNEL_CHUNK` elements so the temporaries stay in
    cache; the block loop is over memory, not over flow points.  Re is raised to
    ``floor_re`` first.
    """
    out = np.empty_like(re)
    n = re.size
    size = min(_KERNEL_CHUNK, n)
    buffers = [np.empty(size) for _ in range(9)]
    for start in range(0, n, _KERNEL_CHUNK):
        stop = min(start + _KERNEL_CHUNK, n)
        x1, x2, f_var, t, r, u, u2, num, den = (v[:stop - start] for v in buffers)
        np.maximum(re[start:stop], floor_re, out=x2)
        np.multiply(x2, rr[start:stop], out=x1)
        x1 *= _X1_FACTOR
        np.log(x2, out=x2)
        x2 += _X2_OFFSET
        _clamond_steps(x1, x2, f_var, t, r, u, u2, num, den)
        np.multiply(f_var, f_var, out=f_var)
        np.divide(_F_FROM_VARIABLE, f_var, out=out[start:stop])
    return out


def colebrook_fast(reynolds: np.ndarray, relative_roughness: np.ndarray, floor_re: float = 0.0) -> np.ndarray:
    """Colebrook–White f by Clamond's method, without input checks (hot paths only).

    ``reynolds`` (raised to ``floor_re``) > 0 and ``relative_roughness`` >= 0 must already
    hold; they are broadcast together.  The same iteration as :func:`colebrook_clamond`
    (a test checks agreement to 1e-15), and so equal to the Lambert W closed form to 1e-12.
    """
    re = np.asarray(reynolds, dtype=float)
    rr = np.asarray(relative_roughness, dtype=float)
    if re.shape != rr.shape:
        # Broadcast by filling a contiguous array directly: the kernel needs flat,
        # contiguous inputs anyway, and this avoids a copy of a broadcast view.
        shape = np.broadcast_shapes(re.shape, rr.shape)
        if re.shape != shape:
            full = np.empty(shape)
            full[...] = re
            re = full
        if rr.shape != shape:
            full = np.empty(shape)
            full[...] = rr
            rr = full
    shape = re.shape
    flat_re = np.ascontiguousarray(re).ravel()
    flat_rr = np.ascontiguousarray(rr).ravel()
    return _clamond_kernel(flat_re, flat_rr, floor_re).reshape(shape)


def colebrook_lambert_w(reynolds: ArrayLike, relative_roughness: ArrayLike) -> np.ndarray:
    r"""Colebrook–White friction factor by its exact closed form through the Lambert W function.

    Colebrook–White (Colebrook 1939):

    .. math:: \frac{1}{\sqrt f} = -2\log_{10}\left(\frac{\varepsilon/D}{3.7}
              + \frac{2.51}{Re\sqrt f}\right)

    With :math:`x_1 = (\varepsilon/D)\,Re\,\ln 10/18.574` and
    :math:`x_2 = \ln(Re\,\ln 10/5.02)` the equation becomes :math:`w e^w = z` with
    :math:`z = e^{x_1 + x_2}`, so that, with W the real principal branch of the
    Lambert function,

    .. math:: \frac{1}{\sqrt f} = \frac{2}{\ln 10}\bigl(W(z) - x_1\bigr)
              = \frac{2}{\ln 10}\bigl(x_2 - \ln W(z)\bigr)

    The second form (from :math:`W = \ln z - \ln W`) is the one evaluated: it has no
    cancellation between the two large terms of the first.

    Parameters
    ----------
    reynolds : array_like
        Reynolds number Re = v D / ν [-], greater than 0.
    relative_roughness : array_like
        ε/D [-], 0 or more (0 is a hydraulically smooth pipe).

    Returns
    -------
    numpy.ndarray
        Darcy friction factor f [-], of the broadcast shape of the inputs.

    Raises
    ------
    ModelError
        For Re <= 0, ε/D < 0, non-finite input, or where z = exp(x1 + x2) would overflow
        (ln z > :data:`LAMBERT_W_LOG_ARGUMENT_LIMIT`, i.e. roughly Re·ε/D > 5,600): use
        :func:`colebrook_friction_factor`, which switches to :func:`colebrook_clamond` there.

    Notes
    -----
    The Colebrook–White equation is the basis of the Moody (1944) chart and is meant for
    turbulent flow (Re above about 4000); mathematically it has a solution for any Re > 0.
    The Lambert W form is given by Keady (1998, "Colebrook–White formula for pipe flows",
    J. Hydraul. Eng. 124(1), 96) and More (2006, Chem. Eng. Sci. 61, 5515–5519).

    Examples
    --------
    >>> round(float(colebrook_lambert_w(1e5, 1e-4)), 12)
    0.018513866077
    """
    re, rr = _colebrook_inputs(reynolds, relative_roughness)
    x1, x2 = _clamond_variables(re, rr)
    log_z = x1 + x2
    if np.any(log_z > LAMBERT_W_LOG_ARGUMENT_LIMIT):
        raise ModelError(
            "reynolds",
            "Re·ε/D is too large for the Lambert W form (exp overflows); "
            "use colebrook_friction_factor, which switches to Clamond's method",
        )
    # Imported here: scipy.special costs about 0.1 s to import and only this reference form
    # (not the engine's own darcy_friction_factor) needs it.
    from scipy.special import lambertw  # type: ignore[import-untyped]  # scipy ships no type information

    w = lambertw(np.exp(log_z), k=0).real
    inv_sqrt_f = (x2 - np.log(w)) / _HALF_LN10
    return np.asarray(1.0 / (inv_sqrt_f * inv_sqrt_f))


def colebrook_clamond(reynolds: ArrayLike, relative_roughness: ArrayLike) -> np.ndarray:
    r"""Colebrook–White friction factor by Clamond's two-step method, to machine precision.

    Clamond, D. (2009), "Efficient resolution of the Colebrook equation",
    Ind. Eng. Chem. Res. 48(7), 3665–3671, doi:10.1021/ie801626g.

    Writing :math:`1/\sqrt f = (2/\ln 10)\,F`, :math:`x_1 = (\varepsilon/D)\,Re\,\ln 10/18.574`
    and :math:`x_2 = \ln(Re\,\ln 10/5.02)`, the Colebrook–White equation is
    :math:`F + \ln(x_1 + F) - x_2 = 0`.  Starting from :math:`F_0 = x_2 - 0.2`, two
    steps of a third-order (Halley-type) correction

    .. math:: e = \frac{\ln(x_1+F) + F - x_2}{1 + x_1 + F},\qquad
              F \leftarrow F - \frac{(1 + x_1 + F + e/2)\,e\,(x_1+F)}
                                    {1 + x_1 + F + e\,(1 + e/3)}

    reach machine precision everywhere (Clamond 2009); the first step uses
    :math:`\ln(x_1+F_0) - 0.2` as the residual of the starting value.  No overflow is
    possible, so this method serves where the Lambert W form cannot.

    Parameters
    ----------
    reynolds : array_like
        Reynolds number [-], greater than 0 (the method is accurate above about Re = 10).
    relative_roughness : array_like
        ε/D [-], 0 or more.

    Returns
    -------
    numpy.ndarray
        Darcy friction factor f [-].

    Examples
    --------
    >>> round(float(colebrook_clamond(1e5, 1e-4)), 12)
    0.018513866077
    >>> round(float(colebrook_clamond(1e7, 0.01)), 12)   # fully rough: beyond the Lambert W range
    0.037909825752
    """
    re, rr = _colebrook_inputs(reynolds, relative_roughness)
    x1, x2 = _clamond_variables(re, rr)
    f_var = x2 - 0.2
    e = (np.log(x1 + f_var) - 0.2) / (1.0 + x1 + f_var)
    f_var = f_var - (1.0 + x1 + f_var + 0.5 * e) * e * (x1 + f_var) / (1.0 + x1 + f_var + e * (1.0 + e / 3.0))
    e = (np.log(x1 + f_var) + f_var - x2) / (1.0 + x1 + f_var)
    f_var = f_var - (1.0 + x1 + f_var + 0.5 * e) * e * (x1 + f_var) / (1.0 + x1 + f_var + e * (1.0 + e / 3.0))
    inv_sqrt_f = f_var / _HALF_LN10
    return np.asarray(1.0 / (inv_sqrt_f * inv_sqrt_f))


def colebrook_friction_factor(reynolds: ArrayLike, relative_roughness: ArrayLike) -> np.ndarray:
    r"""Colebrook–White Darcy friction factor, solved to machine precision.

    .. math:: \frac{1}{\sqrt f} = -2\log_{10}\left(\frac{\varepsilon/D}{3.7}
              + \frac{2.51}{Re\sqrt f}\right)

    Colebrook, C. F. (1939), "Turbulent flow in pipes, with particular reference to the
    transition region between the smooth and rough pipe laws", J. ICE 11(4), 133–156.

    Evaluated by the exact Lambert W closed form (:func:`colebrook_lambert_w`) wherever
    its argument does not overflow, and by Clamond's (2009) method
    (:func:`colebrook_clamond`) in the remaining fully rough region.  The two agree to
    about 1e-15 relative where both apply (see the tests).

    Parameters
    ----------
    reynolds : array_like
        Reynolds number [-], greater than 0.  The equation is meant for turbulent flow
        (Re >= 4000); :func:`darcy_friction_factor` covers all regimes.
    relative_roughness : array_like
        ε/D [-], 0 or more.  The Moody chart spans 0 to 0.05.

    Returns
    -------
    numpy.ndarray
        Darcy friction factor f [-], of the broadcast shape of the inputs.

    Examples
    --------
    >>> colebrook_friction_factor([1e5, 1e7], [1e-4, 0.01]).round(6)
    array([0.018514, 0.03791 ])
    """
    re, rr = _colebrook_inputs(reynolds, relative_roughness)
    x1, x2 = _clamond_variables(re, rr)
    use_lambert = (x1 + x2) <= LAMBERT_W_LOG_ARGUMENT_LIMIT
    f = np.empty(re.shape)
    if np.any(use_lambert):
        f[use_lambert] = colebrook_lambert_w(re[use_lambert], rr[use_lambert])
    if not np.all(use_lambert):
        f[~use_lambert] = colebrook_clamond(re[~use_lambert], rr[~use_lambert])
    return f


def fully_turbulent_friction_factor(relative_roughness: ArrayLike) -> np.ndarray:
    r"""Rough-pipe limit of the friction factor (von Kármán; Nikuradse's rough-pipe law).

    .. math:: \frac{1}{\sqrt f} = -2\log_{10}\frac{\varepsilon/D}{3.7}

    the limit of Colebrook–White as Re → ∞ (von Kármán 1930; constant 3.7 as in
    Colebrook 1939).  It is the "fully turbulent" friction factor f_T of Crane
    Technical Paper 410 when ε is that of clean commercial steel.

    Parameters
    ----------
    relative_roughness : array_like
        ε/D [-], greater than 0 (a smooth pipe has no rough-pipe limit).

    Returns
    -------
    numpy.ndarray
        Darcy friction factor f [-].

    Examples
    --------
    >>> round(float(fully_turbulent_friction_factor(0.001)), 6)
    0.019635
    """
    rr = _as_float_array(relative_roughness, "relative_roughness")
    _require(rr > 0.0, "relative_roughness", "greater than 0 for the rough-pipe limit", rr)
    inv_sqrt_f = -2.0 * np.log10(rr / 3.7)
    return np.asarray(1.0 / (inv_sqrt_f * inv_sqrt_f))


# --------------------------------------------------------------------------- all regimes
def darcy_friction_factor(reynolds: ArrayLike, relative_roughness: ArrayLike) -> np.ndarray:
    r"""Darcy friction factor in every flow regime.

    * Re = 0: 0.0.  There is no flow and no loss; returning 0 (not NaN or ∞) keeps
      f·v² = 0 at the start of a flow grid.
    * 0 < Re <= :data:`LAMINAR_LIMIT_RE` (2000): Hagen–Poiseuille, f = 64/Re.
    * Re >= :data:`TURBULENT_LIMIT_RE` (4000): Colebrook–White, solved by Clamond's
      (2009) method (:func:`colebrook_fast`), which reaches machine precision everywhere
      and is several times cheaper than the Lambert W form; the tests hold it equal to
      the exact Lambert W closed form (:func:`colebrook_friction_factor`) to 1e-12.
    * 2000 < Re < 4000 (transition): **no published law is exact here** — the flow
      switches intermittently between laminar and turbulent.  PumpSketch interpolates
      linearly in Re between the laminar value 64/2000 = 0.032 at Re = 2000 and the
      Colebrook–White value at Re = 4000 for the same ε/D:

      .. math:: f = 0.032 + \bigl(f_{CW}(4000, \varepsilon/D) - 0.032\bigr)
                \frac{Re - 2000}{2000}

      This is continuous at both ends and, since f_CW(4000) > 0.032 for every ε/D,
      gives a head loss f·v² that keeps rising with flow.  The checks raise a finding
      for any segment in this range.

    The sign of Re (direction of flow) is ignored.

    Parameters
    ----------
    reynolds : array_like
        Reynolds number [-], finite.
    relative_roughness : array_like
        ε/D [-], 0 or more.

    Returns
    -------
    numpy.ndarray
        Darcy friction factor f [-], of the broadcast shape of the inputs.

    Examples
    --------
    >>> darcy_friction_factor([0.0, 1000.0, 3000.0, 1e5], 1e-4).round(6)
    array([0.      , 0.064   , 0.036004, 0.018514])
    """
    re = np.abs(_as_float_array(reynolds, "reynolds"))
    rr = _as_float_array(relative_roughness, "relative_roughness")
    _require(rr >= 0.0, "relative_roughness", "0 or more", rr)
    return darcy_friction_factor_checked(re, rr)


def darcy_friction_factor_checked(re: np.ndarray, rr: np.ndarray) -> np.ndarray:
    """:func:`darcy_friction_factor` for inputs already known valid (Re >= 0, ε/D >= 0).

    The engine's hot paths call this after validating the project once.

    Colebrook–White is evaluated at max(Re, 4000) everywhere in one vectorised pass;
    below 4000 that value is exactly the f_CW(4000, ε/D) the transition interpolation
    needs, and the laminar and zero-flow entries are then overwritten.
    """
    f = colebrook_fast(re, rr, floor_re=TURBULENT_LIMIT_RE)
    _blend_low_reynolds(np.broadcast_to(re, f.shape), f)
    return f


def _blend_low_reynolds(re: np.ndarray, f: np.ndarray) -> None:
    """Overwrite, in place, the entries of ``f`` (f_CW at max(Re, 4000)) where Re < 4000.

    Laminar 64/Re up to Re = 2000 (Hagen–Poiseuille), 0 at Re = 0, and between 2000 and
    4000 the linear interpolation in Re from 64/2000 to f_CW(4000, ε/D) described in
    :func:`darcy_friction_factor`.  ``re`` has the shape of ``f``.
    """
    low = re < TURBULENT_LIMIT_RE
    if not low.any():
        return
    re_low = re[low]
    f_low = f[low]
    weight = (re_low - LAMINAR_LIMIT_RE) / (TURBULENT_LIMIT_RE - LAMINAR_LIMIT_RE)
    f_laminar_limit = 64.0 / LAMINAR_LIMIT_RE
    with np.errstate(divide="ignore"):
        laminar = np.where(re_low > 0.0, 64.0 / np.where(re_low > 0.0, re_low, 1.0), 0.0)
    f[low] = np.where(re_low <= LAMINAR_LIMIT_RE, laminar, f_laminar_limit + (f_low - f_laminar_limit) * weight)


def darcy_weighted_sums(abs_flow_m3_s: np.ndarray, reynolds_per_flow: np.ndarray,
                        relative_roughness: np.ndarray, weight: np.ndarray) -> np.ndarray:
    """Σ_i f_i w_i for each flow: Darcy friction factors summed over segments with weights.

    For each flow Q of ``abs_flow_m3_s`` (N values, Q ≥ 0) and segment i (S values),
    Re_i = Q × ``reynolds_per_flow[i]`` and f_i is :func:`darcy_friction_factor` of Re_i
    and ``relative_roughness`` (shape S, or N × S for one row per flow): Colebrook–White
    by Clamond's (2009) iteration, laminar 64/Re and the transition interpolation.  The
    result equals ``darcy_friction_factor(Re, ε/D) @ weight`` to rounding, but the
    (flows × segments) arrays are formed only a block of rows at a time, in cache-sized
    scratch arrays, so nothing of that size is allocated.  Inputs must be valid
    (checked once per project): Q ≥ 0, Re per flow > 0, ε/D ≥ 0.
    """
    q = np.ascontiguousarray(abs_flow_m3_s, dtype=float).ravel()
    per_flow = np.asarray(reynolds_per_flow, dtype=float)
    rr = np.asarray(relative_roughness, dtype=float)
    n, n_segments = q.size, per_flow.size
    out = np.empty(n)
    if n == 0 or n_segments == 0:
        out[:] = 0.0
        return out
    rows = max(1, _KERNEL_CHUNK // n_segments)
    shape = (min(rows, n), n_segments)
    buffers = [np.empty(shape) for _ in range(10)]
    rr_x1 = rr * _X1_FACTOR  # Clamond's x1 = Re · ε/D · ln 10/18.574: the same products for 1 or N rows
    smallest_per_flow = float(per_flow.min())
    for start in range(0, n, rows):
        stop = min(start + rows, n)
        re, x1, x2, f_var, t, r, u, u2, num, den = (v[:stop - start] for v in buffers)
        block = q[start:stop]
        np.multiply.outer(block, per_flow, out=re)
        np.maximum(re, TURBULENT_LIMIT_RE, out=x2)
        np.multiply(x2, rr_x1 if rr_x1.ndim == 1 else rr_x1[start:stop], out=x1)
        np.log(x2, out=x2)
        x2 += _X2_OFFSET
        _clamond_steps(x1, x2, f_var, t, r, u, u2, num, den)
        np.multiply(f_var, f_var, out=f_var)
        np.divide(_F_FROM_VARIABLE, f_var, out=f_var)
        if float(block.min()) * smallest_per_flow < TURBULENT_LIMIT_RE:  # else every Re of the block is turbulent
            _blend_low_reynolds(re, f_var)
        np.matmul(f_var, weight, out=out[start:stop])
    return out


def flow_regime(reynolds: ArrayLike) -> np.ndarray:
    """Name of the flow regime for each Reynolds number (sign ignored).

    ``"none"`` for Re = 0, ``"laminar"`` for Re <= 2000, ``"transition"`` for
    2000 < Re < 4000 and ``"turbulent"`` for Re >= 4000 — the same limits as
    :func:`darcy_friction_factor`.

    Examples
    --------
    >>> flow_regime([0.0, 1500.0, 2500.0, 4000.0]).tolist()
    ['none', 'laminar', 'transition', 'turbulent']
    """
    re = np.abs(_as_float_array(reynolds, "reynolds"))
    return np.select(
        [re == 0.0, re <= LAMINAR_LIMIT_RE, re < TURBULENT_LIMIT_RE],
        ["none", "laminar", "transition"],
        default="turbulent",
    )


# --------------------------------------------------------------------------- pipe losses
@dataclass(frozen=True, eq=False)
class PipeFriction:
    """Friction hydraulics of one pipe of a segment, per pipe where pipes run in parallel.

    All arrays share one shape (the broadcast shape of the inputs).  ``velocity_m_s`` and
    ``head_loss_m`` carry the sign of the flow; ``reynolds`` is never negative.
    """

    velocity_m_s: np.ndarray
    """Mean velocity in one pipe, v = Q / (n π D²/4) [m/s]."""
    reynolds: np.ndarray
    """Reynolds number |v| D / ν [-] (NaN only from Hazen–Williams without a viscosity)."""
    friction_factor: np.ndarray
    """Darcy friction factor f [-] (for Hazen–Williams the equivalent Darcy factor)."""
    head_loss_m: np.ndarray
    """Friction head loss along the segment [m] (equal to the loss of one parallel pipe)."""

    @property
    def regime(self) -> np.ndarray:
        """Flow regime of each entry (see :func:`flow_regime`)."""
        return flow_regime(self.reynolds)


def _pipe_inputs(
    flow_m3_s: ArrayLike, internal_diameter_m: ArrayLike, length_m: ArrayLike, parallel_pipes: ArrayLike
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    q = _as_float_array(flow_m3_s, "flow_m3_s")
    d = _as_float_array(internal_diameter_m, "internal_diameter_m")
    length = _as_float_array(length_m, "length_m")
    n = _as_float_array(parallel_pipes, "parallel_pipes")
    _require(d > 0.0, "internal_diameter_m", "greater than 0 m", d)
    _require(length >= 0.0, "length_m", "0 m or more", length)
    _require((n >= 1.0) & (n == np.round(n)), "parallel_pipes", "a whole number, 1 or more", n)
    return q, d, length, n


def _pipe_friction(velocity: ArrayLike, reynolds: ArrayLike, f: ArrayLike, head: ArrayLike) -> PipeFriction:
    return PipeFriction(
        velocity_m_s=np.asarray(velocity, dtype=np.float64),
        reynolds=np.asarray(reynolds, dtype=np.float64),
        friction_factor=np.asarray(f, dtype=np.float64),
        head_loss_m=np.asarray(head, dtype=np.float64),
    )


def _velocity(q: FloatArray, d: FloatArray, n: FloatArray) -> FloatArray:
    return (q / n) / (0.25 * np.pi * d * d)


def darcy_weisbach(
    flow_m3_s: ArrayLike,
    internal_diameter_m: ArrayLike,
    length_m: ArrayLike,
    roughness_m: ArrayLike,
    kinematic_viscosity_m2_s: ArrayLike,
    parallel_pipes: ArrayLike = 1,
) -> PipeFriction:
    r"""Friction loss of a segment by Darcy–Weisbach (Weisbach 1845, Darcy 1857).

    .. math:: h_f = f\,\frac{L}{D}\,\frac{v\,|v|}{2g},\qquad
              v = \frac{Q/n}{\pi D^2/4},\qquad Re = \frac{|v|\,D}{\nu}

    with f from :func:`darcy_friction_factor` (Colebrook–White when turbulent) and
    g = :data:`hydraulics.constants.STANDARD_GRAVITY_M_S2`.

    ``flow_m3_s`` is the **total** flow of the segment; it divides equally between
    ``parallel_pipes`` identical pipes, so velocity, Reynolds number and loss are those
    of one pipe, and the loss across the segment equals the loss of one pipe.

    Negative flow (reverse direction) is accepted: velocity and head loss take the sign
    of the flow (h_f is an odd function of Q), the Reynolds number and friction factor
    use |Q|.

    Parameters
    ----------
    flow_m3_s : array_like
        Total flow of the segment Q [m³/s], finite.
    internal_diameter_m : array_like
        Internal diameter D of each pipe [m], greater than 0.
    length_m : array_like
        Length L [m], 0 or more.
    roughness_m : array_like
        Absolute (Colebrook–White equivalent sand) roughness ε [m], 0 or more.
    kinematic_viscosity_m2_s : array_like
        Kinematic viscosity ν [m²/s], greater than 0.
    parallel_pipes : array_like, optional
        Number n of identical pipes in parallel, a whole number >= 1.

    Returns
    -------
    PipeFriction
        Arrays of the broadcast shape of all inputs.

    Raises
    ------
    ModelError
        Naming the parameter when a value is out of range or not finite.

    Examples
    --------
    Water at about 20 °C, 100 L/s through 300 mm steel pipe, 1 km:

    >>> r = darcy_weisbach(0.1, 0.3, 1000.0, 0.045e-3, 1.0e-6)
    >>> round(float(r.velocity_m_s), 4), round(float(r.head_loss_m), 3)
    (1.4147, 5.176)
    """
    q, d, length, n = _pipe_inputs(flow_m3_s, internal_diameter_m, length_m, parallel_pipes)
    eps = _as_float_array(roughness_m, "roughness_m")
    nu = _as_float_array(kinematic_viscosity_m2_s, "kinematic_viscosity_m2_s")
    _require(eps >= 0.0, "roughness_m", "0 m or more", eps)
    _require(nu > 0.0, "kinematic_viscosity_m2_s", "greater than 0 m²/s", nu)
    q, d, length, n, eps, nu = np.broadcast_arrays(q, d, length, n, eps, nu)

    velocity = _velocity(q, d, n)
    reynolds = np.abs(velocity) * d / nu
    f = darcy_friction_factor(reynolds, eps / d)
    head = f * (length / d) * velocity * np.abs(velocity) / (2.0 * STANDARD_GRAVITY_M_S2)
    return _pipe_friction(velocity, reynolds, f, head)


def hazen_williams(
    flow_m3_s: ArrayLike,
    internal_diameter_m: ArrayLike,
    length_m: ArrayLike,
    c_factor: ArrayLike,
    parallel_pipes: ArrayLike = 1,
    kinematic_viscosity_m2_s: ArrayLike | None = None,
) -> PipeFriction:
    r"""Friction loss of a segment by Hazen–Williams, SI form.

    .. math:: h_f = \frac{10.67\,L\,|q|^{1.852}}{C^{1.852}\,D^{4.8704}}\operatorname{sign}(q),
              \qquad q = Q/n

    Williams, G. S. and Hazen, A. (1920), *Hydraulic Tables*, 3rd ed., Wiley: the
    velocity form V = 1.318 C R^0.63 S^0.54 (ft, s).  The SI constant 10.67 is the
    handbook value derived from it (see :data:`HAZEN_WILLIAMS_SI_CONSTANT`).

    ``flow_m3_s`` is the total flow of the segment, split equally between the
    ``parallel_pipes``; velocity and loss are those of one pipe.  Negative flow gives a
    negative loss, as for :func:`darcy_weisbach`.

    ``friction_factor`` holds the equivalent Darcy factor f = 2 g D h_f / (L v²) — the
    factor that gives the same loss by Darcy–Weisbach.  It grows without bound as the
    flow tends to zero (f ∝ Q^-0.148); at exactly zero flow it is reported as 0.0, like
    :func:`darcy_friction_factor` at Re = 0.  ``reynolds`` is |v| D / ν when
    ``kinematic_viscosity_m2_s`` is given (for reporting the regime), else NaN.

    Validity: water at ordinary temperatures (about 5–25 °C) in turbulent flow, pipes of
    about 50 mm and larger and velocities up to about 3 m/s (from memory).  Outside this
    range prefer Darcy–Weisbach.

    Parameters
    ----------
    flow_m3_s : array_like
        Total flow of the segment Q [m³/s], finite.
    internal_diameter_m : array_like
        Internal diameter D [m], greater than 0.
    length_m : array_like
        Length L [m], 0 or more.
    c_factor : array_like
        Hazen–Williams coefficient C [-], greater than 0 (about 60–150 in practice).
    parallel_pipes : array_like, optional
        Number n of identical pipes in parallel, a whole number >= 1.
    kinematic_viscosity_m2_s : array_like, optional
        Kinematic viscosity ν [m²/s], greater than 0; only for the Reynolds number.

    Returns
    -------
    PipeFriction

    Examples
    --------
    >>> r = hazen_williams(0.1, 0.3, 1000.0, 130.0)
    >>> round(float(r.head_loss_m), 3)
    6.423
    """
    q, d, length, n = _pipe_inputs(flow_m3_s, internal_diameter_m, length_m, parallel_pipes)
    c = _as_float_array(c_factor, "c_factor")
    _require(c > 0.0, "c_factor", "greater than 0", c)
    if kinematic_viscosity_m2_s is None:
        nu = np.full((), np.nan)
    else:
        nu = _as_float_array(kinematic_viscosity_m2_s, "kinematic_viscosity_m2_s")
        _require(nu > 0.0, "kinematic_viscosity_m2_s", "greater than 0 m²/s", nu)
    q, d, length, n, c, nu = np.broadcast_arrays(q, d, length, n, c, nu)

    q_pipe = q / n
    velocity = _velocity(q, d, n)
    gradient = (
        HAZEN_WILLIAMS_SI_CONSTANT
        * np.abs(q_pipe) ** HAZEN_WILLIAMS_FLOW_EXPONENT
        / (c**HAZEN_WILLIAMS_FLOW_EXPONENT * d**HAZEN_WILLIAMS_DIAMETER_EXPONENT)
    )
    head = np.sign(q_pipe) * gradient * length

    moving = velocity != 0.0
    f = np.zeros(q.shape)
    f[moving] = 2.0 * STANDARD_GRAVITY_M_S2 * d[moving] * gradient[moving] / velocity[moving] ** 2
    reynolds = np.abs(velocity) * d / nu
    return _pipe_friction(velocity, reynolds, f, head)
