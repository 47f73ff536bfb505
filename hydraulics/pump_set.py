"""The installed pumps as one set: dissimilar pumps in parallel at the manifold.

The arrangement's identical pumps are solved by :mod:`hydraulics.operating_points` (N pumps
sharing the flow equally).  When other pumps are installed beside them
(:attr:`hydraulics.model.Project.other_pumps`) the pumps no longer share the flow equally:
pumps in parallel share the **head at the manifold**, and each delivers the flow at which
its own curve, less the loss of its own branch, gives that head (the head balance of
parallel pumps; e.g. Karassik et al., *Pump Handbook*, 4th ed., ch. on pump and system
curves; Gülich, *Centrifugal Pumps*, 3rd ed., ch. 11).  For pump i at speed and trim scale
cᵢ = sᵢ tᵢ (affinity laws, as in :mod:`hydraulics.pump_arrangement`)

    hᵢ(q) = cᵢ² Hᵢ,rated(q / cᵢ) − L_branch(q),

and at the manifold head H the pump delivers qᵢ(H), the root of hᵢ(q) = H on its stable
branch (right of the head curve's peak).  Where H is at or above hᵢ's highest value the
pump cannot open its check valve: it delivers nothing and runs at shut-off, held there only
by the check valve.  The station flow Q(H) = Σ qᵢ(H) falls as H rises, and the operating
point is the root of

    R(H) = H − H_manifold,system(Q(H)),

with H_manifold,system = static head + common-pipework losses (+ crest control,
:meth:`hydraulics.system_curve.SystemHydraulics.manifold_head`).  R is non-decreasing in H,
bracketed by the system head at zero flow (R ≤ 0) and the highest shut-off head of the
running pumps (R ≥ 0).  Both roots — the manifold head per scenario and each pump's flow at
a trial head — are found with the vectorised Chandrupatla method of
:func:`hydraulics.duty_point.bracketed_roots`, every scenario at once (the loop over the
running pumps is over a handful of pumps, never over flows).

Speed: every variable-speed pump that runs takes one common speed ratio s (clipped to its
own range; common practice for parallel pumps on drives), fixed-speed pumps their own.  At a
given station flow Q the manifold head is H_manifold,system(Q), so the speed that delivers Q
is the root in s of Σ qᵢ(H, s) = Q (:func:`pump_set_speed_for_flow`).

Roles and the run sequence: duty pumps run in normal operation (the arrangement's duty pumps
first, then the other duty pumps in their order), assist pumps are switched in after them
when the flow needs them, standby pumps only in place of a pump out of service.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics.duty_point import DEFAULT_EXTENSION, bracketed_roots
from hydraulics.model import Project, PumpRole
from hydraulics.pump_fit import FittedPump
from hydraulics.results import FloatArray
from hydraulics.system_curve import SystemHydraulics

__all__ = ["SetPump", "installed_pumps", "run_stages", "PumpSetSolve", "PumpHeads", "pump_speeds", "solve_pump_set",
           "pump_set_speed_for_flow", "stage_label"]

_INNER_TOLERANCE_M = 1e-11
"""Each pump's flow at a trial manifold head is converged to this head residual (m)."""
_TABLE_POINTS = 48
"""Flows at which each pump's head is tabulated to narrow its root brackets (a speed-up only)."""
_OUTER_TOLERANCE_M = 1e-9
"""The manifold head balance is converged to this (m), as the identical-pump duty points."""


@dataclass(frozen=True)
class SetPump:
    """One installed pump as the station runs it: tag, model, role and speed control.

    ``tag`` numbers the installed pumps P1, P2, … in the order of :func:`installed_pumps`.
    ``speed_ratio`` is the speed it runs at in the operating points (a variable-speed pump's
    highest); ``min_speed_ratio`` its lowest (= ``speed_ratio`` at fixed speed).
    ``from_arrangement`` marks the arrangement's identical pumps.
    """

    tag: str
    pump_id: str
    role: PumpRole
    variable_speed: bool
    speed_ratio: float
    min_speed_ratio: float
    trim_ratio: float
    motor_efficiency: float
    drive_efficiency: float
    from_arrangement: bool
    motor_rating_w: float | None = None
    service_factor: float = 1.0

    @property
    def control_text(self) -> str:
        """``"fixed speed 100 %"`` or ``"variable speed 70–100 %"``."""
        high = f"{100.0 * self.speed_ratio:.0f} %"
        if not self.variable_speed:
            return f"fixed speed {high}"
        return f"variable speed {100.0 * self.min_speed_ratio:.0f}–{high}"


def installed_pumps(project: Project) -> tuple[SetPump, ...]:
    """Every installed pump: the arrangement's duty pumps, its standby pumps, then the others.

    Empty without an arrangement.  The arrangement's variable-speed pumps run up to its
    ``max_speed_ratio`` and down to its ``min_speed_ratio``; at fixed speed at its
    ``speed_ratio``.
    """
    a = project.arrangement
    if a is None:
        return ()
    out: list[SetPump] = []
    own_high = float(a.max_speed_ratio if a.variable_speed else a.speed_ratio)
    own_low = float(a.min_speed_ratio if a.variable_speed else a.speed_ratio)
    duty: list[PumpRole] = ["duty"] * int(a.duty_count)
    standby: list[PumpRole] = ["standby"] * int(a.standby_count)
    roles = duty + standby
    for role in roles:
        out.append(SetPump(f"P{len(out) + 1}", a.pump_id, role, bool(a.variable_speed), own_high, own_low,
                           float(a.trim_ratio), float(a.motor_efficiency), float(a.drive_efficiency), True,
                           a.motor_rating_w, float(a.service_factor)))
    for other in project.other_pumps:
        low = other.min_speed_ratio if other.variable_speed else other.speed_ratio
        out.append(SetPump(f"P{len(out) + 1}", other.pump_id, other.role, other.variable_speed,
                           float(other.speed_ratio), float(low), float(other.trim_ratio),
                           float(other.motor_efficiency), float(other.drive_efficiency), False,
                           other.motor_rating_w, float(other.service_factor)))
    return tuple(out)


def run_stages(project: Project) -> tuple[tuple[SetPump, ...], ...]:
    """The run sequence: stage k runs the first k pumps of duty (arrangement's first) then assist pumps.

    Standby pumps are in no stage: they run only in place of a pump out of service.
    """
    pumps = installed_pumps(project)
    order = ([p for p in pumps if p.role == "duty" and p.from_arrangement]
             + [p for p in pumps if p.role == "duty" and not p.from_arrangement]
             + [p for p in pumps if p.role == "assist"])
    return tuple(tuple(order[:k]) for k in range(1, len(order) + 1))


def stage_label(pumps: Sequence[SetPump]) -> str:
    """``"P1+P2+P3"``: the tags of the pumps running."""
    return "+".join(p.tag for p in pumps)


@dataclass(frozen=True, eq=False)
class PumpSetSolve:
    """Operating points of a set of pumps in parallel, one row per scenario (SI).

    Arrays of shape (S,) per scenario and (S, P) per scenario and running pump (in the order
    given).  ``found`` is False where the pumps cannot lift the system head at zero flow, or
    where a pump would run beyond the reach of its curve; ``cannot_lift`` and ``beyond_curve``
    say which.  ``shut_off`` marks a running pump held at zero flow by its check valve (its
    head is below the manifold head); ``extrapolated`` a pump beyond its tested flows.
    Efficiency, powers and NPSH required are NaN where the pump has no such data or no flow.
    """

    static_m: FloatArray
    aged: NDArray[np.bool_]
    found: NDArray[np.bool_]
    cannot_lift: NDArray[np.bool_]
    beyond_curve: NDArray[np.bool_]
    flow_m3_s: FloatArray
    manifold_head_m: FloatArray
    speed_ratio: FloatArray
    pump_flow_m3_s: FloatArray
    pump_head_m: FloatArray
    pump_efficiency: FloatArray
    pump_shaft_power_w: FloatArray
    pump_input_power_w: FloatArray
    pump_bep_flow_ratio: FloatArray
    pump_npsh_required_m: FloatArray
    shut_off: NDArray[np.bool_]
    extrapolated: NDArray[np.bool_]

    @property
    def input_power_w(self) -> FloatArray:
        """Power drawn by all running pumps (W): the sum over the pumps that deliver flow."""
        powers = np.where(self.pump_flow_m3_s > 0.0, self.pump_input_power_w, 0.0)
        total: FloatArray = np.sum(np.nan_to_num(powers), axis=-1)
        return total


class PumpHeads:
    """Each running pump's head at the manifold, with its speed per scenario (shape (S, P)).

    The head of each pump is also tabulated once at :data:`_TABLE_POINTS` flows over its
    stable branch: a trial manifold head then finds the table interval around its root, and
    the exact root is found inside that narrow bracket (a speed-up only: where the tabulated
    interval does not bracket the root, the whole branch is searched).
    """

    def __init__(self, system: SystemHydraulics, fitted: Sequence[FittedPump], scale: FloatArray,
                 aged: NDArray[np.bool_], extension: float):
        self.system, self.fitted, self.scale, self.aged = system, fitted, scale, aged
        peaks = np.array([f.head_peak_flow_m3_s if f.has_rising_then_falling_head else 0.0 for f in fitted])
        ends = np.array([f.flow_max_m3_s for f in fitted])
        self.q_left = scale * peaks
        self.q_end = scale * ends * extension
        fractions = np.linspace(0.0, 1.0, _TABLE_POINTS)
        self.q_table = self.q_left[..., None] + (self.q_end - self.q_left)[..., None] * fractions
        self.h_table = self.at(self.q_table)
        self.top = self.h_table[..., 0]
        self.bottom = self.h_table[..., -1]

    def at(self, q: FloatArray) -> FloatArray:
        """hᵢ(q) = cᵢ² Hᵢ(q / cᵢ) − L_branch(q) for every scenario and pump (m; q of shape (S, P) or (S, P, G))."""
        out = np.empty_like(q)
        extra = (1,) * (q.ndim - 2)
        for i, fitted in enumerate(self.fitted):
            c = self.scale[:, i].reshape(-1, *extra)
            out[:, i] = c * c * fitted.head(q[:, i] / c)
        if self.system.has_branches:
            aged = self.aged.reshape(-1, 1, *extra)
            out -= self.system.branch_loss(q, np.broadcast_to(aged, q.shape))
        return out

    def flows_at(self, head_m: FloatArray) -> tuple[FloatArray, NDArray[np.bool_]]:
        """Each pump's flow at manifold head ``head_m`` (shape (S,)), and where it is beyond reach."""
        h = np.broadcast_to(head_m[:, None], self.q_left.shape)
        closed = h >= self.top
        beyond = (h <= self.bottom) & ~closed
        solve = ~closed & ~beyond
        q = np.where(beyond, self.q_end, np.where(closed, 0.0, self.q_left))
        if solve.any():
            above = np.count_nonzero(self.h_table > h[..., None], axis=-1)
            k = np.clip(above, 1, _TABLE_POINTS - 1)[..., None]
            a = np.take_along_axis(self.q_table, k - 1, axis=-1)[..., 0]
            b = np.take_along_axis(self.q_table, k, axis=-1)[..., 0]
            fa = np.take_along_axis(self.h_table, k - 1, axis=-1)[..., 0] - h
            fb = np.take_along_axis(self.h_table, k, axis=-1)[..., 0] - h
            narrow = (fa >= 0.0) & (fb <= 0.0)  # a true bracket; else the whole branch
            a = np.where(narrow, a, self.q_left)
            b = np.where(narrow, b, self.q_end)
            fa = np.where(narrow, fa, self.top - h)
            fb = np.where(narrow, fb, self.bottom - h)
            roots = bracketed_roots(lambda x: self.at(x) - h, a, b, fa=fa, fb=fb, active=solve,
                                    ftol=_INNER_TOLERANCE_M)
            q = np.where(solve, roots.x, q)
        return q, beyond


def pump_speeds(pumps: Sequence[SetPump], n_scenarios: int, speed_ratio: ArrayLike | None) -> FloatArray:
    """Speed ratio of each pump per scenario: the common speed (clipped) for variable-speed pumps."""
    own = np.array([p.speed_ratio for p in pumps], dtype=float)
    speeds = np.broadcast_to(own, (n_scenarios, len(pumps))).copy()
    if speed_ratio is not None:
        common = np.broadcast_to(np.asarray(speed_ratio, dtype=float), (n_scenarios,))
        low = np.array([p.min_speed_ratio for p in pumps], dtype=float)
        variable = np.array([p.variable_speed for p in pumps], dtype=bool)
        clipped = np.clip(common[:, None], low, own)
        speeds = np.where(variable, clipped, speeds)
    return speeds


def solve_pump_set(system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump], pumps: Sequence[SetPump],
                   static_m: ArrayLike, aged: ArrayLike, speed_ratio: ArrayLike | None = None,
                   extension: float = DEFAULT_EXTENSION) -> PumpSetSolve:
    """The operating points of ``pumps`` running in parallel, per scenario (see the module description).

    ``static_m`` and ``aged`` give the scenarios (broadcast to one shape (S,)); ``speed_ratio``
    the common speed of the variable-speed pumps per scenario (``None``: every pump at its own
    ``speed_ratio``).  ``fitted_by_id`` maps each pump model's id to its fitted curves.
    """
    static, aged_arr = np.broadcast_arrays(np.atleast_1d(np.asarray(static_m, dtype=float)),
                                           np.atleast_1d(np.asarray(aged, dtype=bool)))
    static, aged_arr = static.copy(), aged_arr.copy()
    n_s, n_p = static.size, len(pumps)
    if n_p == 0:
        raise ValueError("a pump set needs at least one running pump")
    fitted = [fitted_by_id[p.pump_id] for p in pumps]
    speeds = pump_speeds(pumps, n_s, speed_ratio)
    trims = np.array([p.trim_ratio for p in pumps], dtype=float)
    scale = speeds * trims
    heads = PumpHeads(system, fitted, scale, aged_arr, extension)

    zero = np.zeros(n_s)
    lo = system.manifold_head(zero, static, aged_arr)
    hi = np.max(heads.top, axis=1)
    cannot_lift = hi <= lo

    def residual(h: FloatArray) -> FloatArray:
        q, _ = heads.flows_at(h)
        r: FloatArray = h - system.manifold_head(np.sum(q, axis=1), static, aged_arr)
        return r

    r_lo = residual(lo)
    outer = bracketed_roots(residual, lo, hi, fa=r_lo, fb=np.where(cannot_lift, -1.0, hi - lo),
                            active=~cannot_lift, ftol=_OUTER_TOLERANCE_M)
    head = np.where(cannot_lift, np.nan, outer.x)
    q, beyond = heads.flows_at(np.where(cannot_lift, lo, head))
    beyond_any = np.any(beyond, axis=1) & ~cannot_lift
    found = ~cannot_lift & ~beyond_any & outer.converged
    q = np.where(found[:, None], q, np.nan)
    rated = q / scale
    cols = [np.full((n_s, n_p), np.nan) for _ in range(4)]
    efficiency, shaft, npshr, bep = cols
    extrapolated = np.zeros((n_s, n_p), dtype=bool)
    for i, f in enumerate(fitted):
        c = scale[:, i]
        x = np.nan_to_num(rated[:, i])
        extrapolated[:, i] = f.is_extrapolated(x) & (x > 0.0) & found
        if f.has_efficiency:
            efficiency[:, i] = f.efficiency(x)
            shaft[:, i] = c**3 * f.shaft_power(x)
        if f.has_npsh:
            s = speeds[:, i]
            npshr[:, i] = s * s * f.npsh_required(np.nan_to_num(q[:, i]) / s)
        if f.bep_flow_m3_s is not None:
            bep[:, i] = q[:, i] / (f.bep_flow_m3_s * c)
    running = found[:, None] & (q > 0.0)
    with np.errstate(invalid="ignore", divide="ignore"):
        efficiency = np.where(running & (efficiency > 0.0), efficiency, np.nan)
        shaft = np.where(np.isfinite(efficiency), shaft, np.nan)
        motor = np.array([p.motor_efficiency * p.drive_efficiency for p in pumps], dtype=float)
        input_power = shaft / motor
    pump_head = np.full((n_s, n_p), np.nan)
    for i, f in enumerate(fitted):
        c = scale[:, i]
        pump_head[:, i] = np.where(found, c * c * f.head(np.nan_to_num(rated[:, i])), np.nan)
    return PumpSetSolve(
        static_m=static, aged=aged_arr, found=found, cannot_lift=cannot_lift, beyond_curve=beyond_any,
        flow_m3_s=np.where(found, np.sum(np.nan_to_num(q), axis=1), np.nan), manifold_head_m=head,
        speed_ratio=speeds, pump_flow_m3_s=q, pump_head_m=pump_head, pump_efficiency=efficiency,
        pump_shaft_power_w=shaft, pump_input_power_w=input_power, pump_bep_flow_ratio=bep,
        pump_npsh_required_m=np.where(running, npshr, np.nan),
        shut_off=found[:, None] & (q <= 0.0), extrapolated=extrapolated,
    )


def pump_set_speed_for_flow(system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump],
                            pumps: Sequence[SetPump], static_m: ArrayLike, aged: ArrayLike,
                            flow_m3_s: ArrayLike, extension: float = DEFAULT_EXTENSION,
                            ) -> tuple[FloatArray, NDArray[np.bool_]]:
    """The common speed ratio of the variable-speed pumps at which ``pumps`` deliver ``flow_m3_s``.

    Per scenario (static, pipe state, target flow broadcast to (S,)).  The manifold head at
    the target flow is the system's, H_manifold,system(Q); the speed is the root in s of
    Σ qᵢ(H, s) = Q over the variable-speed pumps' range (lowest minimum to highest speed).
    Returns the speeds and where they were found; NaN where the pumps fall short even at the
    highest speed, or deliver more than the target already at the lowest (they must then run
    at the lowest and stop and start), or where no pump of the set has variable speed.
    """
    static, aged_arr, target = np.broadcast_arrays(np.atleast_1d(np.asarray(static_m, dtype=float)),
                                                   np.atleast_1d(np.asarray(aged, dtype=bool)),
                                                   np.atleast_1d(np.asarray(flow_m3_s, dtype=float)))
    n_s = static.size
    variable = [p for p in pumps if p.variable_speed]
    if not variable:
        return np.full(n_s, np.nan), np.zeros(n_s, dtype=bool)
    fitted = [fitted_by_id[p.pump_id] for p in pumps]
    head = system.manifold_head(target, static, aged_arr)
    trims = np.array([p.trim_ratio for p in pumps], dtype=float)

    def delivered(s: FloatArray) -> FloatArray:
        scale = pump_speeds(pumps, n_s, s) * trims
        heads = PumpHeads(system, fitted, scale, aged_arr, extension)
        q, _ = heads.flows_at(head)
        total: FloatArray = np.sum(q, axis=1)
        return total

    s_lo = np.full(n_s, min(p.min_speed_ratio for p in variable))
    s_hi = np.full(n_s, max(p.speed_ratio for p in variable))
    f_lo, f_hi = delivered(s_lo) - target, delivered(s_hi) - target
    ok = (f_lo <= 0.0) & (f_hi >= 0.0) & (target > 0.0)
    roots = bracketed_roots(lambda s: delivered(s) - target, s_lo, s_hi, fa=f_lo, fb=f_hi, active=ok,
                            ftol=1e-12 * max(float(np.max(target)), 1e-12), xtol=1e-12)
    found = ok & roots.converged
    return np.where(found, roots.x, np.nan), found
