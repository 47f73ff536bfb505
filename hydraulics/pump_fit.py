"""Fitted pump curves: least-squares polynomials through manufacturer test points.

:func:`fit_pump` turns a :class:`~hydraulics.model.PumpModel` (points at rated speed)
into a :class:`FittedPump` whose methods evaluate head, efficiency, shaft power and NPSH
required at any array of flows, vectorised.

Methods
-------
* Head, efficiency and shaft power: ordinary least-squares polynomials of the order the
  pump asks for (``head_fit_order``, ``efficiency_fit_order``, ``power_fit_order``),
  fitted in the scaled flow x = Q / Q_max of the data (which keeps the normal equations
  well conditioned); :func:`numpy.polynomial.polynomial.polyfit`.
* Efficiency and power are tied by the definition of pump efficiency,
  η = P_hydraulic / P_shaft = ρ g Q H / P_shaft (e.g. ISO 9906:2012, clause 3; Karassik
  et al., *Pump Handbook*, 4th ed., ch. 2).  When the data give efficiency only, shaft
  power is derived from the fitted head and efficiency with the actual fluid density;
  when they give power only, efficiency is derived the same way.  Where the fitted
  efficiency falls below :data:`EFFICIENCY_FLOOR` (near shut-off) the derived power is
  undefined and returned as NaN.
* NPSH required: a quadratic a + b x + c x² fitted by non-negative least squares
  (Lawson & Hanson, *Solving Least Squares Problems*, 1974, ch. 23), solved exactly by
  :func:`nonnegative_least_squares`.  With a, b, c ≥ 0 and x ≥ 0 the fitted NPSHr is positive
  and non-decreasing in flow, as NPSH3 test curves are over the normal operating range;
  a dip of the data at part load is smoothed over and shows in the residuals.
* The quality of each fit is reported as :class:`FitQuality` (RMS and largest absolute
  residual, fitted minus data, in the quantity's SI unit).

Valid range and extrapolation
-----------------------------
The fit is valid over the data's flow range [Q_min, Q_max].  :meth:`FittedPump.is_extrapolated`
flags flows above Q_max and also flows below Q_min: when the data do not start at zero
flow, the shut-off head :attr:`FittedPump.shutoff_head_m` is itself an extrapolation of the
fit (``shutoff_extrapolated``).  Nothing is clipped: the caller decides what to do with an
extrapolated value, and the operating-point solver flags it.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace

import numpy as np
from numpy.polynomial import polynomial as npoly
from numpy.typing import ArrayLike, NDArray

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import ModelError, PumpModel
from hydraulics.results import FloatArray
from hydraulics.validation import require_pump_points

__all__ = ["FitQuality", "FittedPump", "fit_pump", "EFFICIENCY_FLOOR", "RISING_HEAD_TOLERANCE",
           "EXTRAPOLATION_TOLERANCE"]

G = STANDARD_GRAVITY_M_S2

EFFICIENCY_FLOOR = 0.01
"""Below this fitted efficiency the shaft power derived from it is undefined (NaN)."""

RISING_HEAD_TOLERANCE = 1e-3
"""A rise of the head curve above shut-off smaller than this fraction of the shut-off head is
not flagged as rising-then-falling: it lies within the scatter of test data (our choice)."""

EXTRAPOLATION_TOLERANCE = 1e-9
"""Relative tolerance on the ends of the data range before a flow counts as extrapolated."""


@dataclass(frozen=True)
class FitQuality:
    """How closely a fit follows its data: residuals fitted − data, in SI units."""

    rms: float
    max_abs: float
    n_points: int
    order: int

    def to_json_dict(self) -> dict[str, float | int]:
        return {"rms": self.rms, "max_abs": self.max_abs, "n_points": self.n_points, "order": self.order}


def _polyval(coefficients: tuple[float, ...], x: FloatArray) -> FloatArray:
    """Horner evaluation of Σ c_i x^i (coefficients lowest order first)."""
    result = np.zeros_like(x)
    for c in reversed(coefficients):
        result = result * x + c
    return result


def _quality(fitted: FloatArray, data: FloatArray, order: int) -> FitQuality:
    residual = fitted - data
    return FitQuality(rms=float(np.sqrt(np.mean(residual**2))), max_abs=float(np.max(np.abs(residual))),
                      n_points=int(data.size), order=int(order))


@dataclass(frozen=True)
class FittedPump:
    """A pump's fitted curves at rated speed and full impeller (SI).

    Polynomial coefficients are lowest order first in the scaled flow
    x = Q / ``flow_scale_m3_s``.  ``efficiency_source`` and ``shaft_power_source`` say
    whether each curve was fitted to data (``"data"``), derived from the other through
    η = ρ g Q H / P (``"derived"``), or is unknown (``None``).
    """

    pump: PumpModel
    density_kg_m3: float
    flow_scale_m3_s: float
    flow_min_m3_s: float
    flow_max_m3_s: float
    head_coefficients: tuple[float, ...]
    head_fit: FitQuality
    efficiency_coefficients: tuple[float, ...] | None
    efficiency_fit: FitQuality | None
    power_coefficients: tuple[float, ...] | None
    power_fit: FitQuality | None
    npsh_coefficients: tuple[float, ...] | None
    npsh_fit: FitQuality | None
    efficiency_source: str | None
    shaft_power_source: str | None
    shutoff_head_m: float
    shutoff_extrapolated: bool
    head_peak_flow_m3_s: float
    head_peak_m: float
    has_rising_then_falling_head: bool
    bep_flow_m3_s: float | None
    bep_head_m: float | None
    bep_efficiency: float | None
    bep_at_end_of_data: bool

    # ------------------------------------------------------------------ evaluation
    def _x(self, flow_m3_s: ArrayLike) -> FloatArray:
        return np.asarray(flow_m3_s, dtype=np.float64) / self.flow_scale_m3_s

    def head(self, flow_m3_s: ArrayLike) -> FloatArray:
        """Head at rated speed (m) at each flow (m³/s)."""
        return _polyval(self.head_coefficients, self._x(flow_m3_s))

    @property
    def has_efficiency(self) -> bool:
        """Whether efficiency and shaft power are known (from data or derived)."""
        return self.efficiency_source is not None

    @property
    def has_npsh(self) -> bool:
        return self.npsh_coefficients is not None

    def efficiency(self, flow_m3_s: ArrayLike) -> FloatArray:
        """Pump efficiency (fraction) at each flow; NaN when unknown or undefined."""
        q = np.asarray(flow_m3_s, dtype=float)
        if self.efficiency_coefficients is not None:
            return _polyval(self.efficiency_coefficients, self._x(q))
        if self.power_coefficients is not None:
            power = _polyval(self.power_coefficients, self._x(q))
            hydraulic = self.density_kg_m3 * G * q * self.head(q)
            with np.errstate(divide="ignore", invalid="ignore"):
                return np.where(power > 0.0, hydraulic / np.where(power > 0.0, power, 1.0), np.nan)
        return np.full_like(q, np.nan)

    def shaft_power(self, flow_m3_s: ArrayLike) -> FloatArray:
        """Shaft power at rated speed (W) at each flow; NaN when unknown or undefined."""
        q = np.asarray(flow_m3_s, dtype=float)
        if self.power_coefficients is not None:
            return _polyval(self.power_coefficients, self._x(q))
        if self.efficiency_coefficients is not None:
            eta = _polyval(self.efficiency_coefficients, self._x(q))
            hydraulic = self.density_kg_m3 * G * q * self.head(q)
            ok = eta >= EFFICIENCY_FLOOR
            return np.where(ok, hydraulic / np.where(ok, eta, 1.0), np.nan)
        return np.full_like(q, np.nan)

    def npsh_required(self, flow_m3_s: ArrayLike) -> FloatArray:
        """NPSH required at rated speed (m) at each flow; NaN without NPSH data."""
        if self.npsh_coefficients is None:
            return np.full_like(np.asarray(flow_m3_s, dtype=float), np.nan)
        return _polyval(self.npsh_coefficients, self._x(flow_m3_s))

    def is_extrapolated(self, flow_m3_s: ArrayLike) -> NDArray[np.bool_]:
        """True where the flow lies outside the data range [Q_min, Q_max] (small tolerance).

        Flows between zero and Q_min count as extrapolated when the data do not start at
        zero flow.
        """
        q = np.asarray(flow_m3_s, dtype=float)
        tol = EXTRAPOLATION_TOLERANCE * self.flow_max_m3_s
        return (q > self.flow_max_m3_s * (1.0 + EXTRAPOLATION_TOLERANCE)) | (q < self.flow_min_m3_s - tol)

    # ------------------------------------------------------------------ output
    def to_json_dict(self) -> dict[str, object]:
        """Summary for the results file (SI; coefficients in x = Q / flow_scale_m3_s)."""
        p = self.pump

        def fit(coefficients: tuple[float, ...] | None, quality: FitQuality | None) -> dict[str, object] | None:
            if coefficients is None:
                return None
            return {"coefficients": list(coefficients), "quality": quality.to_json_dict() if quality else None}

        return {
            "pump_id": p.pump_id,
            "name": p.name,
            "rated_speed_rpm": p.rated_speed_rpm,
            "impeller_diameter_m": p.impeller_diameter_m,
            "density_kg_m3": self.density_kg_m3,
            "flow_min_m3_s": self.flow_min_m3_s,
            "flow_max_m3_s": self.flow_max_m3_s,
            "flow_scale_m3_s": self.flow_scale_m3_s,
            "shutoff_head_m": self.shutoff_head_m,
            "shutoff_extrapolated": self.shutoff_extrapolated,
            "head_peak_flow_m3_s": self.head_peak_flow_m3_s,
            "head_peak_m": self.head_peak_m,
            "has_rising_then_falling_head": self.has_rising_then_falling_head,
            "bep_flow_m3_s": self.bep_flow_m3_s,
            "bep_head_m": self.bep_head_m,
            "bep_efficiency": self.bep_efficiency,
            "bep_at_end_of_data": self.bep_at_end_of_data,
            "efficiency_source": self.efficiency_source,
            "shaft_power_source": self.shaft_power_source,
            "fits": {
                "head_m": fit(self.head_coefficients, self.head_fit),
                "efficiency": fit(self.efficiency_coefficients, self.efficiency_fit),
                "shaft_power_w": fit(self.power_coefficients, self.power_fit),
                "npsh_required_m": fit(self.npsh_coefficients, self.npsh_fit),
            },
            "points": {
                "flow_m3_s": list(p.flow_m3_s),
                "head_m": list(p.head_m),
                "efficiency": list(p.efficiency),
                "shaft_power_w": list(p.shaft_power_w),
                "npsh_required_m": list(p.npsh_required_m),
            },
        }


# ---------------------------------------------------------------------- fitting
def _column(pump: PumpModel, name: str, n: int, lower: float, upper: float) -> FloatArray | None:
    values = getattr(pump, name)
    if len(values) == 0:
        return None
    array = np.asarray(values, dtype=float)
    if array.shape != (n,):
        raise ModelError(f"pump.{name}", f"has {len(values)} values; flow has {n}", len(values))
    if not np.all(np.isfinite(array)):
        raise ModelError(f"pump.{name}", "every value must be a finite number")
    if np.any(array < lower) or np.any(array > upper):
        raise ModelError(f"pump.{name}", f"values must lie between {lower:g} and {upper:g}")
    return array


def _check_order(pump: PumpModel, name: str, n: int) -> int:
    order = getattr(pump, name)
    if isinstance(order, bool) or not isinstance(order, (int, np.integer)) or not 1 <= order <= 4:
        raise ModelError(f"pump.{name}", "must be a whole number from 1 to 4", order)
    if n < order + 1:
        raise ModelError(f"pump.{name}",
                         f"a fit of order {order} needs at least {order + 1} points; the pump has {n}", order)
    return int(order)


def _bep_of_polynomial(coefficients: tuple[float, ...], x_lo: float, x_hi: float) -> float:
    """x of the largest value of a polynomial on [x_lo, x_hi] (interior stationary points or ends)."""
    candidates = [x_lo, x_hi]
    derivative = npoly.polyder(np.asarray(coefficients))
    if derivative.size and np.any(derivative != 0.0):
        for root in np.atleast_1d(npoly.polyroots(derivative)):
            if abs(root.imag) < 1e-12 and x_lo < root.real < x_hi:
                candidates.append(float(root.real))
    values = _polyval(coefficients, np.asarray(candidates))
    return float(candidates[int(np.argmax(values))])


def nonnegative_least_squares(design: ArrayLike, target: ArrayLike) -> FloatArray:
    """Coefficients c >= 0 minimising ||design · c − target||, for a design of a few columns.

    Non-negative least squares (Lawson & Hanson, *Solving Least Squares Problems*, 1974,
    ch. 23).  By the Kuhn–Tucker conditions of the problem (ibid., theorem 23.4) the
    solution is the ordinary least-squares solution on its set of free coefficients, with
    the others zero.  With n columns there are 2ⁿ such sets; every candidate whose
    coefficients are all non-negative is a feasible point, and the solution is one of
    them, so the feasible candidate of least residual is the solution.  For the three
    columns of the NPSH fit that is eight small solves, exact and without iteration;
    ``tests/test_pump_fit.py`` compares it with :func:`scipy.optimize.nnls`.

    >>> design = np.array([[1.0, 0.0], [1.0, 1.0], [1.0, 2.0]])
    >>> nonnegative_least_squares(design, np.array([3.0, 2.0, 1.0]))   # a falling line: slope held at 0
    array([2., 0.])
    """
    design_matrix = np.asarray(design, dtype=np.float64)
    target_vector = np.asarray(target, dtype=np.float64)
    n_columns = design_matrix.shape[1]
    if n_columns > 8:
        raise ValueError(f"nonnegative_least_squares enumerates 2**n sets; {n_columns} columns is too many")
    best = np.zeros(n_columns)
    best_residual = float(np.dot(target_vector, target_vector))
    for free_set in range(1, 2**n_columns):
        free = np.array([(free_set >> j) & 1 == 1 for j in range(n_columns)])
        coefficients, *_ = np.linalg.lstsq(design_matrix[:, free], target_vector, rcond=None)
        if np.any(coefficients < 0.0):
            continue
        residual_vector = design_matrix[:, free] @ coefficients - target_vector
        residual = float(np.dot(residual_vector, residual_vector))
        if residual < best_residual:
            best_residual = residual
            best = np.zeros(n_columns)
            best[free] = coefficients
    return best


def _argmax_on_interval(func: Callable[[FloatArray], FloatArray], x_lo: float, x_hi: float) -> float:
    """x of the largest value of a smooth scalar function on [x_lo, x_hi]: grid then bounded refinement."""
    grid = np.linspace(x_lo, x_hi, 401)
    values = func(grid)
    values = np.where(np.isfinite(values), values, -np.inf)
    i = int(np.argmax(values))
    if i in (0, grid.size - 1):
        return float(grid[i])
    lo, hi = grid[i - 1], grid[i + 1]
    # Imported here: scipy.optimize costs about 0.1 s to import, and only pumps whose data
    # give power without efficiency reach this refinement.
    from scipy.optimize import minimize_scalar  # type: ignore[import-untyped]  # scipy ships no type information

    result = minimize_scalar(lambda x: -float(func(np.asarray(x))), bounds=(lo, hi), method="bounded",
                             options={"xatol": 1e-12 * max(x_hi, 1e-300)})
    return float(result.x) if -result.fun >= values[i] else float(grid[i])


def fit_pump(pump: PumpModel, density_kg_m3: float) -> FittedPump:
    """Fit the curves of ``pump`` (see the module description for the methods).

    Parameters
    ----------
    pump : PumpModel
        Test points at rated speed, sorted by flow or not (they are sorted here).
    density_kg_m3 : float
        Density of the pumped fluid (kg/m³), used to derive power from efficiency or
        efficiency from power.

    Raises
    ------
    ModelError
        Too few points for a fit order, mismatched or non-finite columns, repeated flows.

    Examples
    --------
    An exact quadratic head curve H = 50 − 2000 Q² is recovered exactly:

    >>> from hydraulics.model import PumpModel
    >>> q = (0.0, 0.02, 0.04, 0.06, 0.08)
    >>> pump = PumpModel("P", "demo", 1450.0, q, tuple(50 - 2000 * x * x for x in q),
    ...                  efficiency=tuple(0.8 - 200 * (x - 0.05) ** 2 for x in q))
    >>> fitted = fit_pump(pump, 1000.0)
    >>> round(fitted.shutoff_head_m, 9), round(float(fitted.head(0.05)), 9), fitted.head_fit.max_abs < 1e-9
    (50.0, 45.0, True)
    >>> round(fitted.bep_flow_m3_s, 9), round(fitted.bep_efficiency, 9), round(fitted.bep_head_m, 9)
    (0.05, 0.8, 45.0)
    """
    if not (isinstance(density_kg_m3, (int, float)) and math.isfinite(density_kg_m3) and density_kg_m3 > 0):
        raise ModelError("fluid.density_kg_m3", "must be a positive number", density_kg_m3)
    n = len(pump.flow_m3_s)
    require_pump_points(n, "pump.flow_m3_s")
    flow = _column(pump, "flow_m3_s", n, 0.0, math.inf)
    if flow is None:
        raise ModelError("pump.flow_m3_s", "has 0 values", 0)
    head = _column(pump, "head_m", n, 0.0, math.inf)
    if head is None:
        raise ModelError("pump.head_m", f"has 0 values; flow has {n}", 0)
    order = np.argsort(flow, kind="stable")
    flow = flow[order]
    if np.any(np.diff(flow) <= 0.0):
        raise ModelError("pump.flow_m3_s", "each flow may appear only once")
    head = head[order]
    efficiency = _column(pump, "efficiency", n, 0.0, 1.0)
    power = _column(pump, "shaft_power_w", n, 0.0, math.inf)
    npsh = _column(pump, "npsh_required_m", n, 0.0, math.inf)
    efficiency = None if efficiency is None else efficiency[order]
    power = None if power is None else power[order]
    npsh = None if npsh is None else npsh[order]

    head_order = _check_order(pump, "head_fit_order", n)
    q_scale = float(flow[-1])
    x = flow / q_scale

    head_c = tuple(float(c) for c in npoly.polyfit(x, head, head_order))
    head_q = _quality(_polyval(head_c, x), head, head_order)

    eff_c = eff_q = power_c = power_q = None
    if efficiency is not None:
        eff_order = _check_order(pump, "efficiency_fit_order", n)
        eff_c = tuple(float(c) for c in npoly.polyfit(x, efficiency, eff_order))
        eff_q = _quality(_polyval(eff_c, x), efficiency, eff_order)
    if power is not None:
        power_order = _check_order(pump, "power_fit_order", n)
        power_c = tuple(float(c) for c in npoly.polyfit(x, power, power_order))
        power_q = _quality(_polyval(power_c, x), power, power_order)

    npsh_c = npsh_q = None
    if npsh is not None:
        design = np.stack([np.ones_like(x), x, x * x], axis=1)
        solution = nonnegative_least_squares(design, npsh)
        npsh_c = tuple(float(c) for c in solution)
        npsh_q = _quality(_polyval(npsh_c, x), npsh, 2)

    efficiency_source = "data" if eff_c is not None else ("derived" if power_c is not None else None)
    power_source = "data" if power_c is not None else ("derived" if eff_c is not None else None)

    shutoff = float(_polyval(head_c, np.asarray(0.0)))
    x_peak = _bep_of_polynomial(head_c, 0.0, 1.0)
    head_peak = float(_polyval(head_c, np.asarray(x_peak)))
    rising = bool(0.0 < x_peak < 1.0 and head_peak - shutoff > RISING_HEAD_TOLERANCE * abs(shutoff))

    fitted = FittedPump(
        pump=pump, density_kg_m3=float(density_kg_m3), flow_scale_m3_s=q_scale,
        flow_min_m3_s=float(flow[0]), flow_max_m3_s=float(flow[-1]),
        head_coefficients=head_c, head_fit=head_q,
        efficiency_coefficients=eff_c, efficiency_fit=eff_q,
        power_coefficients=power_c, power_fit=power_q,
        npsh_coefficients=npsh_c, npsh_fit=npsh_q,
        efficiency_source=efficiency_source, shaft_power_source=power_source,
        shutoff_head_m=shutoff, shutoff_extrapolated=bool(flow[0] > 0.0),
        head_peak_flow_m3_s=x_peak * q_scale, head_peak_m=head_peak,
        has_rising_then_falling_head=rising,
        bep_flow_m3_s=None, bep_head_m=None, bep_efficiency=None, bep_at_end_of_data=False,
    )
    if efficiency_source is None:
        return fitted

    x_lo = float(x[0])
    if eff_c is not None:
        x_bep = _bep_of_polynomial(eff_c, x_lo, 1.0)
    else:
        x_bep = _argmax_on_interval(lambda xx: fitted.efficiency(xx * q_scale), x_lo, 1.0)
    q_bep = x_bep * q_scale
    eta_bep = float(fitted.efficiency(q_bep))
    if not (math.isfinite(eta_bep) and eta_bep > 0.0):
        return fitted

    return replace(
        fitted, bep_flow_m3_s=float(q_bep), bep_head_m=float(fitted.head(q_bep)), bep_efficiency=eta_bep,
        bep_at_end_of_data=bool(x_bep <= x_lo or x_bep >= 1.0),
    )
