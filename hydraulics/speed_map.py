"""The pump set over its speed range: curves at several speeds, lines of equal efficiency,
the minimum continuous stable flow and the speeds that deliver the design flow.

Affinity laws (similarity of a pump with itself at another speed; Karassik et al., *Pump
Handbook*, 4th ed., ch. 2; Gülich, *Centrifugal Pumps*, 3rd ed., ch. 3): a point of the
rated curve at flow q and head H(q) moves with the speed ratio s to

    Q = s q,   H = s² H(q),   η unchanged,

so every corresponding point — and with it every point of equal efficiency — lies on a
parabola through the origin, H = (H(q) / q²) Q².  That efficiency is unchanged under a
speed change is the usual assumption for moderate speed reductions (Karassik, same
chapter); at low speeds the real efficiency falls below it (friction and leakage do not
scale), so the lines are drawn over the drive's speed range only.

For the pump set of N pumps in parallel and S stages in series with trim t (the head
balance of :mod:`hydraulics.pump_arrangement`), a rated point q becomes the station
point Q = N s t q, H = S (s t)² H(q).  Where the project has pump branches the heads are
given as they act at the manifold, H − L_branch(Q / N) (new pipe, or the pipe state of
the scenario a design speed was found for), like the pump curves of the head–flow plot,
so they meet the system curves of the common pipework.

The minimum continuous stable flow of one pump at rated speed is a fraction of its
best-efficiency flow; at another speed it is taken at the same corresponding point (it
moves along its own parabola, Q_min ∝ s).  The pump data model holds no value for it,
so :data:`DEFAULT_MINIMUM_FLOW_FRACTION` is used and named as such in the result.
"""

from __future__ import annotations

import math

import numpy as np

from hydraulics.model import Arrangement
from hydraulics.pump_arrangement import arrangement_performance
from hydraulics.pump_fit import FittedPump
from hydraulics.results import (
    DesignFlowPoint,
    FloatArray,
    IsoEfficiencyLine,
    SpeedCurve,
    SpeedMap,
    VariableSpeedResult,
)
from hydraulics.system_curve import SystemHydraulics

__all__ = ["SpeedCurve", "IsoEfficiencyLine", "DesignFlowPoint", "SpeedMap", "speed_map", "map_speeds",
           "efficiency_levels", "equal_efficiency_flows", "equal_efficiency_flows_at",
           "DEFAULT_MINIMUM_FLOW_FRACTION", "MINIMUM_FLOW_SOURCE",
           "SPEED_STEP", "CURVE_POINTS", "LINE_POINTS"]

DEFAULT_MINIMUM_FLOW_FRACTION = 0.35
"""Minimum continuous stable flow of one pump as a fraction of its best-efficiency flow.

Common practice for small end-suction pumps is 30–40 % of best-efficiency flow (from
memory; verify against the manufacturer's stated value)."""

MINIMUM_FLOW_SOURCE = ("common-practice default, 35 % of best-efficiency flow (30–40 % is usual for small "
                       "end-suction pumps; from memory, verify with the manufacturer)")
"""How the minimum continuous stable flow was chosen, for the window and the reports."""

SPEED_STEP = 0.1
"""Curves are drawn at every multiple of this speed ratio between the drive's minimum and maximum."""

SPEED_CLEARANCE = 0.03
"""An intermediate speed closer than this to a speed already drawn is left out (the curves would touch)."""

EFFICIENCY_STEP = 0.05
"""Lines of equal efficiency at multiples of this fraction below the best efficiency."""

EFFICIENCY_LEVELS_MAX = 5
CURVE_POINTS = 101
LINE_POINTS = 41
_SEARCH_POINTS = 801
_BISECTIONS = 60


def map_speeds(min_speed_ratio: float, max_speed_ratio: float,
               design_speeds: tuple[float, ...] = ()) -> tuple[tuple[float, str], ...]:
    """The speed ratios to draw, fastest first, each with its kind.

    Kinds: ``"maximum"`` and ``"minimum"`` of the drive, ``"design"`` (a speed found for the
    design flow), ``"step"`` (multiples of :data:`SPEED_STEP` between, unless within
    :data:`SPEED_CLEARANCE` of another speed).

    >>> [(round(s, 3), k) for s, k in map_speeds(0.7, 1.0, (0.86,))]
    [(1.0, 'maximum'), (0.9, 'step'), (0.86, 'design'), (0.8, 'step'), (0.7, 'minimum')]
    """
    lo, hi = float(min_speed_ratio), float(max_speed_ratio)
    chosen: dict[float, str] = {hi: "maximum"}
    if lo < hi:
        chosen[lo] = "minimum"
    for s in design_speeds:
        if lo <= s <= hi and all(abs(s - other) > 1e-9 for other in chosen):
            chosen[float(s)] = "design"
    k = math.ceil(lo / SPEED_STEP - 1e-9)
    while k * SPEED_STEP < hi - 1e-9:
        s = round(k * SPEED_STEP, 10)
        if s > lo + 1e-9 and all(abs(s - other) >= SPEED_CLEARANCE for other in chosen):
            chosen[s] = "step"
        k += 1
    return tuple(sorted(chosen.items(), reverse=True))


def efficiency_levels(best_efficiency: float) -> tuple[float, ...]:
    """Efficiencies of the lines drawn: multiples of 5 %-points below the best, highest first.

    >>> [round(v, 2) for v in efficiency_levels(0.783)]
    [0.75, 0.7, 0.65, 0.6, 0.55]
    """
    top = math.floor(best_efficiency / EFFICIENCY_STEP - 1e-9)
    return tuple(round((top - i) * EFFICIENCY_STEP, 10) for i in range(EFFICIENCY_LEVELS_MAX)
                 if top - i > 0)


def equal_efficiency_flows(fitted: FittedPump, level: float) -> tuple[float | None, float | None]:
    """Rated flows (m³/s, one pump, rated speed) where the fitted efficiency equals ``level``.

    One below and one above the best-efficiency flow, inside the data range; ``None`` on a
    side where the curve does not fall to ``level`` (:func:`equal_efficiency_flows_at`).
    """
    below, above = equal_efficiency_flows_at(fitted, np.array([level], dtype=np.float64))
    return (None if math.isnan(below[0]) else float(below[0]), None if math.isnan(above[0]) else float(above[0]))


def equal_efficiency_flows_at(fitted: FittedPump, levels: FloatArray) -> tuple[FloatArray, FloatArray]:
    """For every efficiency in ``levels`` the rated flows below and above the best-efficiency flow
    where the fitted efficiency equals it (NaN where the curve does not fall to it).

    All levels at once: a sign change on a fine grid brackets each crossing (the one nearest
    the best-efficiency flow), then bisection refines every bracket together.
    """
    levels = np.asarray(levels, dtype=np.float64)
    q_bep = fitted.bep_flow_m3_s
    nan = np.full(levels.shape, np.nan)
    if q_bep is None:
        return nan, nan.copy()
    out: list[FloatArray] = []
    for below, lo, hi in ((True, fitted.flow_min_m3_s, q_bep), (False, q_bep, fitted.flow_max_m3_s)):
        if hi <= lo:
            out.append(nan.copy())
            continue
        grid = np.linspace(lo, hi, _SEARCH_POINTS)
        excess = np.asarray(fitted.efficiency(grid), dtype=np.float64)[None, :] - levels[:, None]
        change = (np.isfinite(excess[:, :-1]) & np.isfinite(excess[:, 1:])
                  & (np.sign(excess[:, :-1]) != np.sign(excess[:, 1:])))
        found = change.any(axis=1)
        columns = np.arange(change.shape[1])
        # the crossing nearest the best-efficiency flow: the last one below it, the first above it
        i = np.where(change, columns, -1).max(axis=1) if below else np.where(change, columns, columns.size).min(axis=1)
        i = np.clip(i, 0, columns.size - 1)
        a, b = grid[i], grid[i + 1]
        fa = excess[np.arange(levels.size), i]
        for _ in range(_BISECTIONS):
            m = 0.5 * (a + b)
            fm = np.asarray(fitted.efficiency(m), dtype=np.float64) - levels
            same = (fm > 0.0) == (fa > 0.0)
            a, fa, b = np.where(same, m, a), np.where(same, fm, fa), np.where(same, b, m)
        out.append(np.where(found, 0.5 * (a + b), np.nan))
    return out[0], out[1]


def _station_heads(system: SystemHydraulics, flows: FloatArray, plain_heads: FloatArray, pumps: int,
                   aged: bool) -> FloatArray:
    """Heads at the manifold, H − L_branch(Q / N); the plain heads without branches."""
    if not system.has_branches:
        return plain_heads
    return np.asarray(plain_heads - system.branch_loss(flows / pumps, aged), dtype=np.float64)


def _corresponding_line(system: SystemHydraulics, fitted: FittedPump, arrangement: Arrangement,
                        rated_flow_m3_s: float, speeds: FloatArray) -> tuple[FloatArray, FloatArray]:
    """The station points corresponding to one rated point over ``speeds`` (a parabola H ∝ Q²)."""
    n, stages, t = int(arrangement.duty_count), int(arrangement.series_stages), float(arrangement.trim_ratio)
    c = speeds * t
    flows = np.asarray(n * c * rated_flow_m3_s, dtype=np.float64)
    heads = np.asarray(stages * c * c * float(fitted.head(rated_flow_m3_s)), dtype=np.float64)
    return flows, _station_heads(system, flows, heads, n, False)


def speed_map(system: SystemHydraulics, fitted: FittedPump, arrangement: Arrangement,
              variable_speed: VariableSpeedResult | None) -> SpeedMap:
    """The pump set of ``arrangement.duty_count`` pumps over the drive's speed range.

    Curves at :func:`map_speeds` with the lowest and highest speed found for the design
    flow (each over the data range, affinity laws through
    :func:`~hydraulics.pump_arrangement.arrangement_performance`), lines of equal
    efficiency at :func:`efficiency_levels` and the best-efficiency line (parabolas
    through the origin, see the module docstring), the minimum continuous stable flow
    line, and the range of the speeds found for the design flow in ``variable_speed`` with
    the head the common pipework needs at the design flow per static extreme and pipe state.
    """
    n, stages, t = int(arrangement.duty_count), int(arrangement.series_stages), float(arrangement.trim_ratio)
    s_lo, s_hi = float(arrangement.min_speed_ratio), float(arrangement.max_speed_ratio)
    design: dict[float, str] = {}
    found: list[float] = []
    all_met = False
    if variable_speed is not None:
        for item in variable_speed.scenarios:
            if item.achievable and item.speed_ratio is not None:
                found.append(float(item.speed_ratio))
                design.setdefault(float(item.speed_ratio), item.pipe)
        all_met = bool(variable_speed.scenarios) and all(item.achievable for item in variable_speed.scenarios)

    curves = []
    ends = {s: design[s] for s in (min(found), max(found))} if found else {}  # the ends of the design range
    for s, kind in map_speeds(s_lo, s_hi, tuple(sorted(ends, reverse=True))):
        pipe = ends.get(s, "new") if kind == "design" else "new"
        flows = np.linspace(n * s * t * fitted.flow_min_m3_s, n * s * t * fitted.flow_max_m3_s, CURVE_POINTS)
        perf = arrangement_performance(fitted, flows, n, stages, s, t)
        curves.append(SpeedCurve(
            speed_ratio=s, kind=kind, pipe=pipe, flow_m3_s=flows,
            head_m=_station_heads(system, flows, perf.head_m, n, pipe == "aged"), plain_head_m=perf.head_m,
            efficiency=perf.efficiency if fitted.has_efficiency else None,
        ))

    speeds = np.linspace(s_lo, s_hi, LINE_POINTS) if s_hi > s_lo else np.array([s_hi])
    lines: list[IsoEfficiencyLine] = []
    best_line = None
    minimum_flow = None
    minimum_line = None
    fraction = DEFAULT_MINIMUM_FLOW_FRACTION
    if fitted.has_efficiency and fitted.bep_flow_m3_s is not None and fitted.bep_efficiency is not None:
        levels = efficiency_levels(fitted.bep_efficiency)
        below, above = equal_efficiency_flows_at(fitted, np.array(levels, dtype=np.float64))
        for j, level in enumerate(levels):
            for side, q in (("below", float(below[j])), ("above", float(above[j]))):
                if not math.isnan(q):
                    flows, heads = _corresponding_line(system, fitted, arrangement, q, speeds)
                    lines.append(IsoEfficiencyLine(efficiency=level, side=side, rated_flow_m3_s=q,
                                                   flow_m3_s=flows, head_m=heads))
        flows, heads = _corresponding_line(system, fitted, arrangement, fitted.bep_flow_m3_s, speeds)
        best_line = IsoEfficiencyLine(efficiency=fitted.bep_efficiency, side="best",
                                      rated_flow_m3_s=fitted.bep_flow_m3_s, flow_m3_s=flows, head_m=heads)
        minimum_flow = fraction * fitted.bep_flow_m3_s
        flows, heads = _corresponding_line(system, fitted, arrangement, minimum_flow, speeds)
        minimum_line = IsoEfficiencyLine(efficiency=float(fitted.efficiency(minimum_flow)), side="minimum flow",
                                         rated_flow_m3_s=minimum_flow, flow_m3_s=flows, head_m=heads)

    design_points = () if variable_speed is None else tuple(
        DesignFlowPoint(static=item.static, pipe=item.pipe, flow_m3_s=item.target_flow_m3_s,
                        head_m=float(_station_heads(system, np.array([item.target_flow_m3_s]),
                                                    np.array([item.system_head_m]), item.pumps_running,
                                                    item.pipe == "aged")[0]),
                        speed_ratio=item.speed_ratio)
        for item in variable_speed.scenarios)
    return SpeedMap(
        pumps_running=n, min_speed_ratio=s_lo, max_speed_ratio=s_hi, curves=tuple(curves),
        equal_efficiency=tuple(lines), best_efficiency=best_line,
        minimum_flow_per_pump_m3_s=minimum_flow, minimum_flow_fraction=fraction if minimum_flow else None,
        minimum_flow_source=MINIMUM_FLOW_SOURCE if minimum_flow else
        "no best-efficiency flow (the pump data have no efficiency or power)",
        minimum_flow_line=minimum_line,
        design_speed_range=(min(found), max(found)) if found else None, design_flow_met_everywhere=all_met,
        heads_at_manifold=bool(system.has_branches), design_points=design_points,
    )
