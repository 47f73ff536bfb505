"""Variable speed: the speed that delivers the design flow, and the lowest speed that still lifts.

For each static extreme and pipe state, with the duty pumps running in parallel, the speed
ratio s that makes the pump set deliver the target flow Q_t solves

    S (s t)² H_rated(Q_t / (N s t)) = H_system(Q_t)

(affinity laws, :mod:`hydraulics.pump_arrangement`), by the bracketing root finder of
:mod:`hydraulics.duty_point` over [min_speed_ratio, max_speed_ratio] for all scenarios at
once.  Outside that range the flow is reported as not achievable, with the reason.

A pump set can only deliver against a static head H_s when its shut-off head exceeds it;
the shut-off head scales with s², so the lowest speed that still lifts against the maximum
static head is

    s_lift = √( H_s,max / (S t² H_shut-off) ),

H_s,max being the head at zero flow at the maximum static extreme: the static head to the
delivery, or to a vented summit of the main where one rises higher (crest control).

Because the system curve has a static part, a speed change does not move the duty point
along a parabola through the origin; the operating points at every speed found are
therefore **re-intersected** with the system curves (:func:`operating_points`), never
scaled from the full-speed duty point.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from hydraulics.duty_point import bracketed_roots
from hydraulics.model import Arrangement, ModelError
from hydraulics.number_format import percent_number
from hydraulics.operating_points import PIPE_STATES, STATIC_CASES, operating_points
from hydraulics.pump_arrangement import arrangement_head, rated_equivalent_flow
from hydraulics.pump_fit import FittedPump
from hydraulics.results import Finding, FloatArray, OperatingPoint, SpeedForFlow, VariableSpeedResult, finding
from hydraulics.system_curve import SystemHydraulics

__all__ = ["SpeedForFlow", "VariableSpeedResult", "SpeedSearch", "search_speeds", "variable_speed_points",
           "variable_speed", "variable_speed_findings",
           "minimum_lift_speed_ratio", "SPEED_HEAD_TOLERANCE_M"]

SPEED_HEAD_TOLERANCE_M = 1e-10
"""The speed is converged until the pump head at the target flow matches the system head to this (m)."""

LIMITED_BY_MAX = "max_speed"
LIMITED_BY_MIN = "min_speed"


def minimum_lift_speed_ratio(shutoff_head_m: float, static_head_max_m: float, series_stages: int = 1,
                             trim_ratio: float = 1.0) -> float | None:
    """Lowest speed ratio whose shut-off head reaches the maximum static head.

    s_lift = √( H_s,max / (S t² H_0) ) (affinity law H ∝ s², heads of series stages add).
    ``None`` when the pump has no positive shut-off head; 0 when there is no static lift.

    >>> minimum_lift_speed_ratio(40.0, 22.5)
    0.75
    """
    if not (math.isfinite(shutoff_head_m) and shutoff_head_m > 0.0):
        return None
    if static_head_max_m <= 0.0:
        return 0.0
    return math.sqrt(static_head_max_m / (series_stages * trim_ratio**2 * shutoff_head_m))


@dataclass(frozen=True)
class SpeedSearch:
    """The speeds for the target flow and the lowest lifting speed, before re-intersection.

    :func:`variable_speed_points` adds the operating points at ``speeds_to_intersect``.
    """

    target_flow_m3_s: float
    pumps_running: int
    min_speed_ratio: float
    max_speed_ratio: float
    scenarios: tuple[SpeedForFlow, ...]
    minimum_lift_speed_ratio: float | None
    minimum_lift_reason: str | None
    speeds_solved: tuple[float, ...]

    @property
    def speeds_to_intersect(self) -> tuple[float, ...]:
        """The speeds found and the minimum speed ratio, each once."""
        return tuple(dict.fromkeys(self.speeds_solved + (self.min_speed_ratio,)))


def search_speeds(system: SystemHydraulics, fitted: FittedPump, arrangement: Arrangement,
                  target_flow_m3_s: float, pumps_running: int | None = None) -> SpeedSearch:
    """Speed ratios that deliver ``target_flow_m3_s`` with N pumps, per static extreme and pipe state.

    Solves S (s t)² H_rated(Q_t / (N s t)) = H_system(Q_t) for s in
    [min_speed_ratio, max_speed_ratio] (affinity laws; see the module docstring) and the
    lowest lifting speed; the operating points at those speeds are left to
    :func:`variable_speed_points`.  N is ``pumps_running`` (1..duty_count), by default
    the arrangement's duty pumps.
    """
    if not (math.isfinite(target_flow_m3_s) and target_flow_m3_s > 0.0):
        raise ModelError("site.design_flow_m3_s", "must be a positive flow", target_flow_m3_s)
    s_lo, s_hi = float(arrangement.min_speed_ratio), float(arrangement.max_speed_ratio)
    if not (0.0 < s_lo <= s_hi):
        raise ModelError("arrangement.min_speed_ratio",
                         "must be positive and not above the maximum speed ratio", s_lo)
    n = int(arrangement.duty_count) if pumps_running is None else int(pumps_running)
    if not 1 <= n <= int(arrangement.duty_count):
        raise ModelError("arrangement.duty_count", "the pumps running must be 1..duty_count", n)
    stages, trim = int(arrangement.series_stages), float(arrangement.trim_ratio)

    labels = [(static, pipe) for static in STATIC_CASES for pipe in PIPE_STATES]
    statics = np.array([system.static_head_m[static] for static, _ in labels], dtype=float)
    aged = np.array([pipe == "aged" for _, pipe in labels], dtype=bool)
    q = np.full(len(labels), float(target_flow_m3_s))
    h_system = np.asarray(system.head(q, statics, aged, n), dtype=np.float64)  # N pumps: each branch at Q_t / N

    def excess(s: FloatArray) -> FloatArray:
        return arrangement_head(fitted, q, n, stages, s, trim) - h_system

    lo, hi = np.full(q.shape, s_lo), np.full(q.shape, s_hi)
    g_lo, g_hi = excess(lo), excess(hi)
    too_much = g_lo > 0.0   # even the slowest speed delivers more than the target
    too_little = g_hi < 0.0  # even the fastest speed delivers less
    roots = bracketed_roots(excess, lo, hi, g_lo, g_hi, active=~too_much & ~too_little,
                            ftol=SPEED_HEAD_TOLERANCE_M)
    achievable = roots.converged & ~too_much & ~too_little
    speed = np.where(achievable, roots.x, np.nan)
    extrapolated = achievable & fitted.is_extrapolated(
        rated_equivalent_flow(q, n, np.where(achievable, speed, 1.0), trim))

    scenarios = []
    for i, (static, pipe) in enumerate(labels):
        if achievable[i]:
            limit, reason = None, None
        elif too_little[i]:
            limit = LIMITED_BY_MAX
            reason = (f"{_pumps_phrase(n, arrangement)} cannot deliver the target flow even at the maximum speed "
                      f"ratio {percent_number(s_hi)} %")
        elif too_much[i]:
            limit = LIMITED_BY_MIN
            verb = "delivers" if n == 1 and n != arrangement.duty_count else "deliver"
            reason = (f"even at the minimum speed ratio {percent_number(s_lo)} % {_pumps_phrase(n, arrangement)} "
                      f"{verb} more than the target flow")
        else:
            limit, reason = None, "no speed found (the pump head does not vary steadily with speed)"
        scenarios.append(SpeedForFlow(
            static=static, pipe=pipe, pumps_running=n, target_flow_m3_s=float(target_flow_m3_s),
            system_head_m=float(h_system[i]), achievable=bool(achievable[i]),
            speed_ratio=float(speed[i]) if achievable[i] else None, limit=limit, reason=reason,
            extrapolated=bool(extrapolated[i]),
        ))

    lift = float(system.head(0.0, float(system.static_head_m["max"]), False))  # the delivery or a higher vented summit
    s_lift = minimum_lift_speed_ratio(fitted.shutoff_head_m, lift, stages, trim)
    lift_reason = None if s_lift is not None else "the fitted head curve has no positive shut-off head"
    return SpeedSearch(
        target_flow_m3_s=float(target_flow_m3_s), pumps_running=n, min_speed_ratio=s_lo, max_speed_ratio=s_hi,
        scenarios=tuple(scenarios), minimum_lift_speed_ratio=s_lift, minimum_lift_reason=lift_reason,
        speeds_solved=tuple(sorted({float(s) for s in speed[achievable].tolist()}, reverse=True)),
    )


def _pumps_phrase(n: int, arrangement: Arrangement) -> str:
    """"the duty pumps" for the full duty set, else "1 pump" / "n pumps"."""
    if n == int(arrangement.duty_count):
        return "the duty pumps"
    return "1 pump" if n == 1 else f"{n} pumps"


def variable_speed_points(search: SpeedSearch, points: tuple[OperatingPoint, ...]) -> VariableSpeedResult:
    """The result of ``search`` with the operating points re-intersected at its speeds.

    ``points`` come from :func:`~hydraulics.operating_points.operating_points` solved at
    (at least) ``search.speeds_to_intersect``; other speeds in the batch are ignored, so
    one batch can also hold the points at the arrangement's own speed.
    """
    speeds = set(search.speeds_solved)
    missing = set(search.speeds_to_intersect) - {p.speed_ratio for p in points}
    if missing:
        raise ValueError(f"operating points missing at speed ratios {sorted(missing)}")
    return VariableSpeedResult(
        target_flow_m3_s=search.target_flow_m3_s, pumps_running=search.pumps_running,
        min_speed_ratio=search.min_speed_ratio, max_speed_ratio=search.max_speed_ratio,
        scenarios=search.scenarios, minimum_lift_speed_ratio=search.minimum_lift_speed_ratio,
        minimum_lift_reason=search.minimum_lift_reason, speeds_solved=search.speeds_solved,
        points=tuple(p for p in points if p.speed_ratio in speeds),
        points_at_minimum_speed=tuple(p for p in points if p.speed_ratio == search.min_speed_ratio),
    )


def variable_speed(system: SystemHydraulics, fitted: FittedPump, arrangement: Arrangement, target_flow_m3_s: float,
                   npsh_static_head_m: float | None = None, density_kg_m3: float | None = None) -> VariableSpeedResult:
    """Speed ratios that deliver ``target_flow_m3_s`` with the duty pumps, per static extreme and pipe state.

    :func:`search_speeds`, then one batched :func:`operating_points` solve at the speeds
    found and the minimum speed (re-intersected, never scaled).

    Parameters
    ----------
    system
        A :class:`hydraulics.system_curve.SystemHydraulics` (or an object with the same methods).
    fitted : FittedPump
    arrangement : Arrangement
        ``duty_count`` pumps run; speeds are searched in [min_speed_ratio, max_speed_ratio].
    target_flow_m3_s : float
        Station flow to deliver (m³/s), normally the design flow.
    npsh_static_head_m, density_kg_m3
        Passed to :func:`~hydraulics.operating_points.operating_points` for the
        re-intersected points (density defaults to the one the pump was fitted with).
    """
    search = search_speeds(system, fitted, arrangement, target_flow_m3_s)
    density = fitted.density_kg_m3 if density_kg_m3 is None else float(density_kg_m3)
    batch = operating_points(system, fitted, arrangement, npsh_static_head_m, density,
                             speed_ratios=search.speeds_to_intersect)
    return variable_speed_points(search, batch)


def variable_speed_findings(result: VariableSpeedResult, fitted: FittedPump) -> list[Finding]:
    """Findings about speed control.

    Codes: ``speed_target_unreachable`` (warning: the target flow needs more than the
    maximum speed), ``speed_below_minimum`` (info: even the minimum speed delivers more
    than the target), ``speed_extrapolated`` (warning: the speed found puts the pumps
    outside their tested data), ``minimum_speed_cannot_lift`` (warning: at the drive's
    minimum speed the pumps cannot lift against the system head at zero flow: the maximum
    static head, or the head to a vented summit where that governs).
    """
    pump = fitted.pump
    where = f"pump '{pump.name}'"
    target = ("pump", pump.pump_id)
    target_flow = {"q": (result.target_flow_m3_s, "flow")}
    out: list[Finding] = []
    for item in result.scenarios:
        label = f"{item.static} static, {item.pipe} pipe"
        if item.limit == LIMITED_BY_MAX:
            out.append(finding(
                "warning", "speed_target_unreachable",
                f"With {item.pumps_running} duty pump(s) the target flow {{q}} needs more than the "
                f"maximum speed ratio {percent_number(result.max_speed_ratio)} % at {label}.", target_flow,
                f"{where}, {label}", "Choose a larger pump, more duty pumps or a higher maximum speed.", target))
        elif item.limit == LIMITED_BY_MIN:
            out.append(finding(
                "info", "speed_below_minimum",
                f"At {label} even the minimum speed ratio {percent_number(result.min_speed_ratio)} % "
                "delivers more than the target flow {q}.", target_flow,
                f"{where}, {label}", "Lower the minimum speed if the pump allows it, or accept the higher flow.",
                target))
        elif item.achievable and item.extrapolated:
            out.append(Finding(
                "warning", "speed_extrapolated",
                f"At {label} the speed ratio {percent_number(item.speed_ratio, 1)} % puts each pump outside its tested "
                "flow range; the fitted curve is extrapolated.",
                f"{where}, {label}", "Obtain pump data covering this flow, or change the selection.", target))
    s_lift = result.minimum_lift_speed_ratio
    if s_lift is not None and result.min_speed_ratio < s_lift:
        out.append(Finding(
            "warning", "minimum_speed_cannot_lift",
            f"At the minimum speed ratio {percent_number(result.min_speed_ratio)} % the shut-off head is below the "
            f"system head at zero flow (the maximum static head, or the head to a vented summit where that governs); "
            f"the pumps need at least {percent_number(s_lift, 1)} % to deliver at all.",
            where, f"Set the minimum speed above {percent_number(s_lift)} % with a margin for a stable flow.", target))
    return out
