"""Duty points: where the pump-set curve meets the system curve, for many scenarios at once.

The duty point of a scenario is the root of the head residual

    r(Q) = H_pumps(Q) − H_system(Q)

(pump head minus system head at station flow Q; e.g. Karassik et al., *Pump Handbook*,
4th ed., ch. on pump and system curves).  Roots are found with a bracketing method —
Chandrupatla's hybrid of inverse quadratic interpolation and bisection (T. R. Chandrupatla,
"A new hybrid quadratic/bisection algorithm for finding the zero of a nonlinear function
without using derivatives", *Advances in Engineering Software* 28(3), 1997, 145–149) —
written here in numpy so that every scenario (static extreme × pipe state × pumps running
× speed) is solved in one vectorised pass: each iteration evaluates the system once for
all scenarios.  It keeps the root bracketed at every step, so it cannot wander off the
curve, and converges superlinearly on smooth curves.

Bracket and cases, per scenario (N pumps running, scale c = speed × trim):

* The search starts at Q_left = N c Q_peak, where Q_peak is the flow of the highest point
  of the fitted head curve (zero for a curve that falls from shut-off; for a curve that
  rises to a peak, the branch left of the peak is the unstable one and is not searched).
* r(Q_left) < 0 — the pumps **cannot lift the static head**: no point.
* r(Q_end) ≤ 0 with Q_end = N c Q_max (end of the data) — the point lies within the
  curve.  If it lies below the lowest tested flow it is flagged as extrapolated.
* r(Q_end) > 0 but r(extension × Q_end) ≤ 0 — the point **runs beyond the end of its
  curve**: the intersection with the extrapolated fit is returned, flagged.
* r > 0 even at extension × Q_end — no point within reach ("runs beyond the end of its
  curve").

Nothing here raises for these cases; each gets a status and a plain reason.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Protocol

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics.pump_arrangement import arrangement_head
from hydraulics.pump_fit import FittedPump
from hydraulics.results import FloatArray, QuotedValue, render_template

__all__ = [
    "bracketed_roots",
    "RootResult",
    "DutyPoints",
    "solve_duty_points",
    "STATUS_FOUND",
    "STATUS_EXTRAPOLATED",
    "STATUS_CANNOT_LIFT",
    "STATUS_BEYOND_CURVE",
    "DEFAULT_EXTENSION",
    "HEAD_TOLERANCE_M",
]

STATUS_FOUND = 0
"""Intersection within the tested flow range."""
STATUS_EXTRAPOLATED = 1
"""Intersection found on the extrapolated fit (beyond the last tested flow or below the first)."""
STATUS_CANNOT_LIFT = 2
"""The pump set's head is below the system head already at the start of the search."""
STATUS_BEYOND_CURVE = 3
"""The pump head still exceeds the system head at the end of the extended search."""

DEFAULT_EXTENSION = 1.2
"""Searches extend to this multiple of the last tested flow (flagged as extrapolated)."""

HEAD_TOLERANCE_M = 1e-9
"""Duty points are converged until |H_pumps − H_system| is below this (m)."""

_EPS = np.finfo(float).eps

ReasonTemplate = tuple[str, tuple[QuotedValue, ...]]
"""A reason as ``(template, values)``: ``{name}`` placeholders and their quoted values."""


class SystemHeads(Protocol):
    """What the duty-point solver needs of a system: its head, elementwise, non-decreasing in flow."""

    def head(self, flow_m3_s: ArrayLike, static_m: ArrayLike, aged: ArrayLike,
             pumps_running: ArrayLike = 1) -> FloatArray: ...


@dataclass(frozen=True, eq=False)
class RootResult:
    """Roots from :func:`bracketed_roots` (arrays of the bracket's shape)."""

    x: FloatArray
    f: FloatArray
    converged: NDArray[np.bool_]
    iterations: int


def bracketed_roots(func: Callable[[FloatArray], ArrayLike], a: ArrayLike, b: ArrayLike,
                    fa: ArrayLike | None = None, fb: ArrayLike | None = None, active: ArrayLike | None = None,
                    ftol: float = HEAD_TOLERANCE_M, xtol: float = 0.0, maxiter: int = 100) -> RootResult:
    """Vectorised Chandrupatla (1997) root finder on brackets [a, b] with f(a) f(b) ≤ 0.

    ``func`` maps an array of x (shape of ``a``) to f elementwise.  ``active`` masks the
    elements to solve (the others are returned as given, ``converged`` False).  An
    element stops when |f| ≤ ``ftol`` or the bracket is narrower than
    4 ε |x| + ``xtol``.  Elements whose bracket has no sign change are not solved.

    Examples
    --------
    >>> import numpy as np
    >>> r = bracketed_roots(lambda x: x**2 - np.array([2.0, 9.0]), np.zeros(2), np.full(2, 4.0), ftol=1e-14)
    >>> [round(float(v), 12) for v in r.x], bool(r.converged.all())
    ([1.414213562373, 3.0], True)
    """
    return _bracketed_roots(func, *_bracket_arrays(func, a, b, fa, fb, active), ftol, xtol, maxiter)


def _bracket_arrays(func: Callable[[FloatArray], ArrayLike], a_in: ArrayLike, b_in: ArrayLike,
                    fa_in: ArrayLike | None, fb_in: ArrayLike | None, active_in: ArrayLike | None,
                    ) -> tuple[FloatArray, FloatArray, FloatArray, FloatArray, NDArray[np.bool_]]:
    """The bracket ends, their function values and the mask to solve, as owned float64 arrays."""
    a = np.array(a_in, dtype=np.float64)
    b = np.array(b_in, dtype=np.float64)
    if a.shape != b.shape:
        a, b = (v.copy() for v in np.broadcast_arrays(a, b))
    fa = np.asarray(func(a), dtype=np.float64).copy() if fa_in is None else np.array(fa_in, dtype=np.float64)
    fb = np.asarray(func(b), dtype=np.float64).copy() if fb_in is None else np.array(fb_in, dtype=np.float64)
    active = np.ones(a.shape, dtype=bool) if active_in is None else np.array(active_in, dtype=bool)
    active &= np.isfinite(fa) & np.isfinite(fb) & (np.sign(fa) * np.sign(fb) <= 0)
    return a, b, fa, fb, active


def _bracketed_roots(func: Callable[[FloatArray], ArrayLike], a: FloatArray, b: FloatArray, fa: FloatArray,
                     fb: FloatArray, active: NDArray[np.bool_], ftol: float, xtol: float, maxiter: int) -> RootResult:
    """Chandrupatla's iteration of :func:`bracketed_roots` on prepared arrays."""

    a_better = np.abs(fa) <= np.abs(fb)
    best_x = np.where(a_better, a, b)
    best_f = np.where(a_better, fa, fb)
    converged = active & (np.abs(best_f) <= ftol)
    running = active & ~converged
    c, fc = b.copy(), fb.copy()
    iterations = 0
    with np.errstate(all="ignore"):
        # First step by false position (linear interpolation between the bracket ends),
        # kept away from the ends; Chandrupatla's own rule chooses every later step.
        t = np.clip(fa / (fa - fb), 0.05, 0.95)
        t = np.where(np.isfinite(t), t, 0.5)
        while iterations < maxiter and running.any():
            iterations += 1
            xt = np.where(running, a + t * (b - a), best_x)
            ft = np.asarray(func(xt), dtype=np.float64)
            # Keep the bracket [a, b]: the new point replaces a, the old a goes to c (same
            # side) or the old b goes to c and the old a becomes b (sign change).  Elements
            # that have stopped are updated too (their state is no longer read; only
            # best_x, best_f and converged are, and those change where running only),
            # which saves masking every array.
            same = np.sign(ft) == np.sign(fa)
            c = np.where(same, a, b)
            fc = np.where(same, fa, fb)
            b = np.where(same, b, a)
            fb = np.where(same, fb, fa)
            a, fa = xt, ft

            a_better = np.abs(fa) < np.abs(fb)
            xm = np.where(a_better, a, b)
            fm = np.where(a_better, fa, fb)
            best_x = np.where(running, xm, best_x)
            best_f = np.where(running, fm, best_f)

            tlim = (4.0 * _EPS * np.abs(xm) + (xtol + 1e-300)) / np.abs(b - c)
            done = (np.abs(fm) <= ftol) | ~(tlim <= 0.5)
            converged |= running & done
            running &= ~done
            if not running.any():
                break

            xi = (a - b) / (c - b)
            phi = (fa - fb) / (fc - fb)
            use_iqi = (phi * phi < xi) & ((1.0 - phi) ** 2 < 1.0 - xi)
            t_iqi = fa / (fb - fa) * fc / (fb - fc) + (c - a) / (b - a) * fa / (fc - fa) * fb / (fc - fb)
            t = np.clip(np.where(use_iqi & np.isfinite(t_iqi), t_iqi, 0.5), tlim, 1.0 - tlim)
            t = np.where(np.isfinite(t), t, 0.5)
    return RootResult(x=best_x, f=best_f, converged=converged, iterations=iterations)


@dataclass(frozen=True, eq=False)
class DutyPoints:
    """Duty points of many scenarios (arrays of one shape, one element per scenario).

    ``flow_m3_s`` and ``head_m`` are NaN where no point was found.  ``found`` is True for
    statuses :data:`STATUS_FOUND` and :data:`STATUS_EXTRAPOLATED`; ``extrapolated`` flags
    the latter.  ``reasons`` holds, per scenario, ``None`` or a plain sentence fragment
    (heads in SI); ``reason_templates`` holds, per scenario, ``None`` or the same fragment
    as ``(template, values)``: ``{name}`` placeholders and ``(name, value_si, quantity)``
    values, to show it in another unit system (:func:`hydraulics.results.render_template`).
    """

    flow_m3_s: FloatArray
    head_m: FloatArray
    residual_m: FloatArray
    status: NDArray[np.int_]
    found: NDArray[np.bool_]
    extrapolated: NDArray[np.bool_]
    reasons: tuple[str | None, ...]
    iterations: int
    reason_templates: tuple[ReasonTemplate | None, ...] = ()


def _narrowed_brackets(fitted: FittedPump, residual: Callable[[FloatArray], FloatArray],
                       pump_args: tuple[FloatArray, FloatArray, FloatArray, FloatArray],
                       lo: FloatArray, hi: FloatArray, f_lo: FloatArray, f_hi: FloatArray,
                       active: NDArray[np.bool_],
                       width: float = 0.04) -> tuple[FloatArray, FloatArray, FloatArray, FloatArray]:
    """Shrink each bracket around an estimate of its root, keeping it an exact bracket.

    A speed-up only: the system head between the bracket ends is modelled as a quadratic
    in flow through the two exact end values (friction and minor losses grow roughly as
    Q²), the model root is found without calling the system, and the exact residual is
    evaluated once at ±``width`` (relative) around it.  The sub-interval whose exact end
    residuals change sign becomes the new bracket, so the result is always a true bracket
    whatever the quality of the estimate.
    """
    pump_lo = arrangement_head(fitted, lo, *pump_args)
    pump_hi = arrangement_head(fitted, hi, *pump_args)
    sys_lo, sys_hi = pump_lo - f_lo, pump_hi - f_hi
    with np.errstate(all="ignore"):
        span = hi * hi - lo * lo
        slope = np.where(span > 0.0, (sys_hi - sys_lo) / span, 0.0)

    def model(q: FloatArray) -> FloatArray:
        return arrangement_head(fitted, q, *pump_args) - (sys_lo + slope * (q * q - lo * lo))

    ftol = 1e-6 * float((np.abs(f_lo) + np.abs(f_hi)).max(initial=1.0))
    estimate = bracketed_roots(model, lo, hi, f_lo, f_hi, active=active, ftol=ftol).x
    half = width * np.maximum(estimate - lo, 0.0) + 1e-3 * (hi - lo)
    a = np.clip(estimate - half, lo, hi)
    b = np.clip(estimate + half, lo, hi)
    f_ab = residual(np.stack([a, b]))
    f_a, f_b = f_ab[0], f_ab[1]
    positive_lo = f_lo > 0.0
    inside = active & ((f_a > 0.0) == positive_lo) & ((f_b > 0.0) != positive_lo)   # root in [a, b]
    right = active & ((f_b > 0.0) == positive_lo)                                    # root in [b, hi]
    left = active & ~inside & ~right                                                 # root in [lo, a]
    new_lo = np.where(inside, a, np.where(right, b, lo))
    new_hi = np.where(inside, b, np.where(left, a, hi))
    new_f_lo = np.where(inside, f_a, np.where(right, f_b, f_lo))
    new_f_hi = np.where(inside, f_b, np.where(left, f_a, f_hi))
    return new_lo, new_hi, new_f_lo, new_f_hi


def solve_duty_points(system: SystemHeads, fitted: FittedPump, pumps_running: ArrayLike,
                      series_stages: ArrayLike = 1, speed_ratio: ArrayLike = 1.0, trim_ratio: ArrayLike = 1.0,
                      static_m: ArrayLike = 0.0, aged: ArrayLike = False, extension: float = DEFAULT_EXTENSION,
                      ftol: float = HEAD_TOLERANCE_M) -> DutyPoints:
    """Intersect the pump-set curve with the system curve for every scenario at once.

    Parameters
    ----------
    system
        Any object with ``head(flow_m3_s, static_m, aged, pumps_running)`` (elementwise,
        non-decreasing in flow), e.g. :class:`hydraulics.system_curve.SystemHydraulics`:
        the head the running pumps must produce at station flow Q, their own branches at
        Q/N included, so each scenario is solved with the pipework of its own N pumps.
    fitted : FittedPump
    pumps_running, series_stages, speed_ratio, trim_ratio, static_m, aged
        Per-scenario values (scalars or arrays broadcasting to one shape).
    extension : float
        The search continues past the last tested flow up to this multiple of it (≥ 1);
        a point found there is flagged as extrapolated.

    Examples
    --------
    A pump H = 60 − 20000 Q² against a system H = 20 + 30000 Q²: Q = √(40/50000) exactly.

    >>> import numpy as np
    >>> from hydraulics.model import PumpModel
    >>> from hydraulics.pump_fit import fit_pump
    >>> class Quadratic:
    ...     def head(self, q, static, aged, pumps_running):
    ...         return np.asarray(static) + 30000.0 * np.asarray(q) ** 2
    >>> q = (0.0, 0.01, 0.02, 0.03, 0.04)
    >>> fitted = fit_pump(PumpModel("P", "demo", 2900.0, q, tuple(60 - 20000 * x * x for x in q)), 1000.0)
    >>> duty = solve_duty_points(Quadratic(), fitted, pumps_running=1, static_m=np.array([20.0, 70.0]))
    >>> round(float(duty.flow_m3_s[0]), 12), round((40 / 50000) ** 0.5, 12), duty.reasons[1]
    (0.028284271247, 0.028284271247, 'cannot lift the static head (shut-off head 60.0 m, static head 70.0 m)')
    """
    n, stages, s, t, hs, aged_arr = np.broadcast_arrays(
        np.asarray(pumps_running, dtype=float), np.asarray(series_stages, dtype=float),
        np.asarray(speed_ratio, dtype=float), np.asarray(trim_ratio, dtype=float),
        np.asarray(static_m, dtype=float), np.asarray(aged, dtype=bool))
    shape = n.shape
    scale = n * s * t
    extension = max(float(extension), 1.0)
    q_left = scale * fitted.head_peak_flow_m3_s
    q_end = scale * fitted.flow_max_m3_s
    q_ext = q_end * extension
    q_data_min = scale * fitted.flow_min_m3_s

    def residual(q: FloatArray) -> FloatArray:
        system_head = np.asarray(system.head(q, hs, aged_arr, n), dtype=np.float64)
        return arrangement_head(fitted, q, n, stages, s, t) - system_head

    ends = np.stack([q_left, q_end, q_ext])
    r_ends = residual(ends)
    r_left, r_end, r_ext = r_ends[0], r_ends[1], r_ends[2]

    cannot = ~(r_left > 0.0) & ~((r_left == 0.0) & (q_left > 0.0))
    within = ~cannot & (r_end <= 0.0)
    beyond = ~cannot & ~within & (r_ext <= 0.0)
    unreached = ~cannot & ~within & ~beyond

    lo = np.where(beyond, q_end, q_left)
    hi = np.where(beyond, q_ext, q_end)
    f_lo = np.where(beyond, r_end, r_left)
    f_hi = np.where(beyond, r_ext, r_end)
    solve = within | beyond
    lo, hi, f_lo, f_hi = _narrowed_brackets(fitted, residual, (n, stages, s, t), lo, hi, f_lo, f_hi, solve)
    roots = bracketed_roots(residual, lo, hi, f_lo, f_hi, active=solve, ftol=ftol)

    found = (within | beyond) & roots.converged
    flow = np.where(found, roots.x, np.nan)
    with np.errstate(invalid="ignore"):
        below_data = found & (flow < q_data_min * (1.0 - 1e-9))
    extrapolated = found & (beyond | below_data)
    status = np.full(shape, STATUS_FOUND, dtype=int)
    status[extrapolated] = STATUS_EXTRAPOLATED
    status[cannot] = STATUS_CANNOT_LIFT
    status[unreached | ((within | beyond) & ~roots.converged)] = STATUS_BEYOND_CURVE
    head = np.where(found, arrangement_head(fitted, np.where(found, flow, 0.0), n, stages, s, t), np.nan)

    reasons: list[str | None] = []
    templates: list[ReasonTemplate | None] = []
    flat_status = status.ravel().tolist()
    pump_at_left = arrangement_head(fitted, q_left, n, stages, s, t)
    pump_left = pump_at_left.ravel().tolist()
    system_left = (pump_at_left - r_left).ravel().tolist()  # the static head when Q_left = 0
    left_list = q_left.ravel().tolist()
    beyond_list = beyond.ravel().tolist()
    for i, st in enumerate(flat_status):
        quoted: ReasonTemplate | None = None
        if st == STATUS_FOUND:
            reasons.append(None)
        elif st == STATUS_EXTRAPOLATED:
            reasons.append("runs beyond the end of its curve (intersection on the extrapolated fit)"
                           if beyond_list[i] else "intersection below the lowest tested flow (extrapolated fit)")
        elif st == STATUS_CANNOT_LIFT:
            if left_list[i] == 0.0:
                template = "cannot lift the static head (shut-off head {pump}, static head {system})"
            else:
                template = "cannot lift the static head (highest pump head {pump}, system head there {system})"
            quoted = (template, (("pump", pump_left[i], "head"), ("system", system_left[i], "head")))
            reasons.append(render_template(template, quoted[1], "SI"))
        else:
            reasons.append(f"runs beyond the end of its curve (no intersection up to {extension:g} × the "
                           "largest tested flow)")
        templates.append(quoted)
    return DutyPoints(
        flow_m3_s=flow, head_m=head, residual_m=np.where(found, roots.f, np.nan), status=status,
        found=found, extrapolated=extrapolated, reasons=tuple(reasons), iterations=roots.iterations,
        reason_templates=tuple(templates),
    )
