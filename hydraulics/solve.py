"""Solve a project: from the model to every result the window and the reports show.

:func:`solve` is a pure function of the :class:`~hydraulics.model.Project`.  It
validates the project, computes the fluid properties and the site's atmospheric
pressure, prepares the pipework arrays once, evaluates the four system curves over one
flow grid, the segment table at design flow, and — where the project has a pump — the
fitted curves, operating points at both static extremes for new and aged pipe and 1..N
pumps, NPSH and energy, and — where the project has a profile — the grade lines along the
main (:func:`solve_curves`), then variable speed and the checks (:func:`complete_solution`).
The window draws the plot from the first stage before the second has run.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, replace
from functools import lru_cache
from typing import TYPE_CHECKING

import numpy as np

from hydraulics import checks, range_guards
from hydraulics.atmosphere import standard_atmosphere_pressure
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.fluid import fluid_properties
from hydraulics.model import Arrangement, Project, PumpModel
from hydraulics.profile_solution import solved_profile
from hydraulics.results import (
    FloatArray,
    FluidProperties,
    NpshCurve,
    OperatingPoint,
    PumpCurve,
    PumpSetResult,
    SegmentResult,
    Solution,
    SpeedPoint,
)
from hydraulics.system_curve import SystemHydraulics, flow_grid, prepare_system, segment_results, system_curves
from hydraulics.validation import validate_project

if TYPE_CHECKING:
    from hydraulics.pump_fit import FittedPump
    from hydraulics.variable_speed import SpeedSearch

DEFAULT_FLOW_POINTS = 256


def atmospheric_pressure(project: Project) -> float:
    """The given atmospheric pressure, else the standard atmosphere at the site altitude (Pa)."""
    site = project.site
    if site.atmospheric_pressure_pa is not None:
        return float(site.atmospheric_pressure_pa)
    return float(standard_atmosphere_pressure(site.altitude_m))


def npsh_static_head(project: Project, atmospheric_pa: float, fluid: FluidProperties,
                     suction_level_m: float | None = None) -> float:
    """The flow-independent part of NPSH available at a suction level (m; default the lowest).

    (p_atm − p_v)/(ρ g) + (suction level − pump datum); the suction losses at each flow are
    subtracted by the operating-point solver (see
    :func:`hydraulics.operating_points.npsh_available`).
    """
    rho_g = fluid.density_kg_m3 * STANDARD_GRAVITY_M_S2
    level = project.site.suction_level_low_m if suction_level_m is None else suction_level_m
    return (atmospheric_pa - fluid.vapour_pressure_pa) / rho_g + (level - project.site.pump_datum_m)


def npsh_static_heads(project: Project, atmospheric_pa: float, fluid: FluidProperties) -> dict[str, float]:
    """:func:`npsh_static_head` per static extreme, each at its own suction level (m).

    The minimum static head is taken with the highest suction level and the maximum with
    the lowest (:func:`hydraulics.system_curve.static_heads`).
    """
    site = project.site
    return {"min": npsh_static_head(project, atmospheric_pa, fluid, site.suction_level_high_m),
            "max": npsh_static_head(project, atmospheric_pa, fluid, site.suction_level_low_m)}


def solve(project: Project, n_flow_points: int = DEFAULT_FLOW_POINTS) -> Solution:
    """Everything PumpSketch computes for ``project`` (raises ModelError on bad input).

    The two stages of :func:`solve_curves` and :func:`complete_solution` in turn.
    """
    return complete_solution(solve_curves(project, n_flow_points))


@dataclass(frozen=True, eq=False)
class CurvesStage:
    """The first stage of a solve: a :class:`Solution` without checks or variable speed.

    ``solution`` has ``complete=False``; the other fields are what
    :func:`complete_solution` needs to finish it without repeating any of the work.
    """

    solution: Solution
    system: SystemHydraulics
    fitted: FittedPump | None
    npsh_static_m: float | None
    """At the lowest suction level (the NPSH-available curve)."""
    npsh_static_by_case_m: dict[str, float] | None = None
    """Per static extreme at its own suction level (the operating points)."""
    fitted_by_id: dict[str, FittedPump] | None = None
    """Every pump model the installed pumps use, fitted (the arrangement's first)."""


def solve_curves(project: Project, n_flow_points: int = DEFAULT_FLOW_POINTS) -> CurvesStage:
    """What the head–flow plot shows: system curves, pump curves and operating points.

    Validates the project, computes the fluid properties and the site's atmospheric
    pressure, prepares the pipework arrays once, evaluates the four system curves over
    one flow grid and the segment table at design flow and — with a pump — the fitted
    curves, the operating points at the arrangement's speed (both static extremes, new
    and aged pipe, 1..N pumps), NPSH and energy.  Raises ModelError on bad input.
    """
    validate_project(project)
    fluid = fluid_properties(project.fluid)
    p_atm = atmospheric_pressure(project)
    system = prepare_system(project, fluid)
    design_flow = project.site.design_flow_m3_s
    design_pumps = design_pumps_running(project)
    at_design = segment_results(system, design_flow, pumps_running=design_pumps)
    max_flow = project.flow_grid_max_factor * design_flow
    base = Solution(
        project=project, fluid=fluid, atmospheric_pressure_pa=p_atm,
        static_head_min_m=system.static_head_m["min"], static_head_max_m=system.static_head_m["max"],
        design_flow_m3_s=design_flow, curves=(), segments=at_design, complete=False,
    )
    pump, arrangement = project.duty_pump, project.arrangement
    if pump is None or arrangement is None:
        curves = system_curves(system, flow_grid(max_flow, n_flow_points))
        profile = solved_profile(project, system, (), fluid.density_kg_m3)
        return CurvesStage(replace(base, curves=curves, profile=profile), system, None, None)

    from hydraulics.energy import annual_energy
    from hydraulics.npsh_worst_case import npsh_worst_case
    from hydraulics.operating_points import operating_points
    from hydraulics.pump_set_curves import pump_set_curves
    from hydraulics.specific_speed import pump_specific_speeds

    fitted = _cached_fit(pump, fluid.density_kg_m3)
    fitted_by_id = {pump.pump_id: fitted}
    for other in project.other_pumps:
        model = project.pump(other.pump_id)
        if model is not None and other.pump_id not in fitted_by_id:
            fitted_by_id[other.pump_id] = _cached_fit(model, fluid.density_kg_m3)
    fits = tuple(fitted_by_id.values())
    npsh_static = npsh_static_head(project, p_atm, fluid)
    npsh_by_case = npsh_static_heads(project, p_atm, fluid)
    points = operating_points(system, fitted, arrangement, npsh_by_case, fluid.density_kg_m3)
    plain_curves = _cached_pump_curves(pump, fluid.density_kg_m3, arrangement.duty_count,
                                       arrangement.series_stages, arrangement.speed_ratio, arrangement.trim_ratio,
                                       (project.criteria.preferred_region_low, project.criteria.preferred_region_high),
                                       _curve_reach(fitted, arrangement, points))
    pump_curves = _curves_at_manifold(system, plain_curves)
    set_curves = pump_set_curves(project, system, fitted_by_id)
    curve_max = max([float(np.max(c.flow_m3_s)) for c in pump_curves]
                    + ([float(c.flow_m3_s[-1]) for c in set_curves.curves if c.flow_m3_s.size] if set_curves else []))
    flows = flow_grid(max(max_flow, 1.05 * curve_max), n_flow_points)
    solution = replace(
        base, curves=system_curves(system, flows), pump_fits=fits, operating_points=points,
        energy=annual_energy(points, project.energy, design_flow), pump_curves=pump_curves,
        npsh_available_curve=_npsh_curve(system, npsh_static, pump_curves[0], flows, design_pumps,
                                         npsh_by_case["min"]),
        profile=solved_profile(project, system, points, fluid.density_kg_m3),
        specific_speeds=tuple(pump_specific_speeds(f) for f in fits),
        npsh_worst_case=npsh_worst_case(system, points, npsh_static, project.site.suction_level_low_m,
                                        project.criteria),
        pump_set_curves=set_curves,
    )
    return CurvesStage(solution, system, fitted, npsh_static, npsh_by_case, fitted_by_id)


def complete_solution(stage: CurvesStage) -> Solution:
    """The finished :class:`Solution`: ``stage``'s results with the checks, variable speed and the speed map.

    Variable speed: the speeds that deliver the design flow are searched, with the duty
    pumps and with one pump, and the operating points intersected afresh, in one batch, at
    those speeds and at the drive's minimum and maximum speeds (those at the arrangement's
    own speed are reused).  The point checks (region, NPSH, extrapolation) and the
    velocities run over all of them (:func:`_checked_points`), identical scenario findings
    grouped; the design capacity comes from the worst-case points at the maximum speed
    (:mod:`hydraulics.capacity`).  Everything of ``stage`` is passed on unchanged (the same
    objects).
    """
    first = stage.solution
    project, system = first.project, stage.system
    at_design = first.segments
    arrangement, fitted, points = project.arrangement, stage.fitted, first.operating_points
    findings = checks.regime_findings(at_design, project.friction_method)
    findings += checks.profile_findings(project, system.static_head_m["min"], system, points)
    findings += checks.bore_change_findings(project)
    findings += checks.profile_coverage_findings(project)
    if first.profile is not None:
        findings += checks.main_pressure_findings(project, first.profile, first.atmospheric_pressure_pa,
                                                  first.fluid.vapour_pressure_pa, first.fluid.density_kg_m3)
    if fitted is None or arrangement is None:
        findings += checks.velocity_findings(project, at_design)
        findings += range_guards.range_guard_findings(project, first.fluid, at_design, None, ())
        return replace(first, findings=checks.sort_findings(findings), complete=True)

    from hydraulics.capacity import capacity_findings, pump_set_capacity, station_capacity
    from hydraulics.duty_energy import duty_profile_energy
    from hydraulics.motor import motor_check, motor_findings
    from hydraulics.npsh_worst_case import npsh_worst_case_findings
    from hydraulics.operating_points import operating_points
    from hydraulics.pump_set_points import (
        arrangement_shaft_powers,
        design_speed_findings,
        pump_set_findings,
        pump_set_result,
    )
    from hydraulics.specific_speed import criteria_findings
    from hydraulics.speed_map import speed_map
    from hydraulics.variable_speed import search_speeds, variable_speed_findings, variable_speed_points

    design_flow = project.site.design_flow_m3_s
    search = search_speeds(system, fitted, arrangement, design_flow)
    searches = [search]
    if arrangement.duty_count > 1:  # one pump on variable speed as well as the full duty set
        searches.append(search_speeds(system, fitted, arrangement, design_flow, pumps_running=1))
    own = float(arrangement.speed_ratio)
    wanted = (float(arrangement.min_speed_ratio), float(arrangement.max_speed_ratio)) + tuple(
        s for item in searches for s in item.speeds_to_intersect)
    other_speeds = tuple(s for s in dict.fromkeys(wanted) if s != own)
    at_speeds = points
    if other_speeds:  # one batch: every speed re-intersected with the system curves, never scaled
        at_speeds += operating_points(system, fitted, arrangement, stage.npsh_static_by_case_m,
                                      first.fluid.density_kg_m3, speed_ratios=other_speeds)
    speed = variable_speed_points(search, at_speeds)
    checked = _checked_points(arrangement, at_speeds, searches)

    pump_where, pump_target = f"pump '{fitted.pump.name}'", ("pump", fitted.pump.pump_id)
    at_points = checks.pump_findings(project, fitted, points, system.lift_head(system.static_head_m["max"]))
    extra = [point for point, _ in checked if point.speed_ratio != own]
    at_points += checks.point_findings(project, fitted, extra, missing=False)
    codes: dict[tuple[str, str, int, float], list[str]] = {}
    for item in at_points:
        if item.target is not None and item.target[0] == "scenario" and isinstance(item.target[1], tuple):
            codes.setdefault(item.target[1], []).append(item.code)
    speed_points = tuple(SpeedPoint(p, basis, tuple(dict.fromkeys(codes.get(_key(p), ()))))
                         for p, basis in checked)

    fitted_by_id = stage.fitted_by_id or {fitted.pump.pump_id: fitted}
    pump_set = pump_set_result(project, system, fitted_by_id, stage.npsh_static_by_case_m)
    flows = _flows_seen([p for p, _ in checked if p.found and p.flow_m3_s is not None], pump_set)
    lowest, low_where = _segments_at_extreme(system, flows, highest=False) if flows else (None, None)
    highest, high_where = _segments_at_extreme(system, flows, highest=True) if flows else (None, None)
    findings += checks.velocity_findings(project, at_design, at_highest_flow=highest, at_lowest_flow=lowest,
                                         lowest_where=low_where, highest_where=high_where)
    findings += checks.group_scenario_findings(at_points)
    with_set = design_speed_findings(project, system, fitted_by_id, design_flow)
    if arrangement.variable_speed:  # a fixed-speed pump has no speed to find
        own_speed = variable_speed_findings(speed, fitted)
        if with_set is not None:  # the duty includes pumps of other models: the set's speeds speak for it
            own_speed = [f for f in own_speed if f.code != "speed_target_unreachable"]
        findings += own_speed
    findings += with_set or []
    findings += range_guards.range_guard_findings(project, first.fluid, at_design, lowest, first.pump_fits)
    for each in first.pump_fits:
        findings += criteria_findings(project.criteria, each)
    findings += npsh_worst_case_findings(project, first.npsh_worst_case)
    findings += pump_set_findings(pump_set, project.criteria)
    capacity = (pump_set_capacity(project, system, fitted_by_id, design_flow) if project.other_pumps else None) \
        or station_capacity(arrangement, design_flow, at_speeds)
    findings += capacity_findings(capacity, pump_where, pump_target)
    motor = motor_check(fitted, arrangement, project.criteria, at_speeds, arrangement_shaft_powers(pump_set))
    findings += motor_findings(motor, pump_where, pump_target)
    duty, duty_findings = duty_profile_energy(project, system, first.fluid.density_kg_m3, _cached_fit)
    return replace(first, findings=checks.sort_findings(findings + list(duty_findings)), variable_speed=speed,
                   complete=True, capacity=capacity, motor=motor, speed_points=speed_points, pump_set=pump_set,
                   speed_map=speed_map(system, fitted, arrangement, speed), duty_profile=duty)


def _key(point: OperatingPoint) -> tuple[str, str, int, float]:
    return (point.static, point.pipe, point.pumps_running, point.speed_ratio)


def _checked_points(arrangement: Arrangement, points: tuple[OperatingPoint, ...],
                    searches: list[SpeedSearch]) -> list[tuple[OperatingPoint, tuple[str, ...]]]:
    """The points the checks see, each with why it was solved (see :class:`~hydraulics.results.SpeedPoint`).

    Every point at the arrangement's speed and at the drive's minimum and maximum speeds
    (all pumps running 1..N); at a speed found for the design flow only the scenario that
    found it (that static extreme, pipe state and number of pumps).
    """
    own, s_min, s_max = (float(arrangement.speed_ratio), float(arrangement.min_speed_ratio),
                         float(arrangement.max_speed_ratio))
    design: dict[tuple[str, str, int, float], list[str]] = {}
    for search in searches:
        n = search.pumps_running
        label = "design flow with 1 pump" if n == 1 else f"design flow with {n} pumps"
        for item in search.scenarios:
            if item.achievable and item.speed_ratio is not None:
                design.setdefault((item.static, item.pipe, n, item.speed_ratio), []).append(label)
    out = []
    for p in points:
        basis = []
        if p.speed_ratio == own:
            basis.append("fixed speed")
        if p.speed_ratio == s_min:
            basis.append("minimum speed")
        if p.speed_ratio == s_max:
            basis.append("maximum speed")
        basis += design.get(_key(p), [])
        if basis:
            out.append((p, tuple(dict.fromkeys(basis))))
    return out


@lru_cache(maxsize=16)
def _cached_fit(pump: PumpModel, density_kg_m3: float) -> FittedPump:
    """The fitted pump, reused while the pump data and fluid are unchanged.

    The model is immutable and hashable, so an edit of the pipework (the common case in
    the window) does not refit the same pump curve.
    """
    from hydraulics.pump_fit import fit_pump

    return fit_pump(pump, density_kg_m3)


CURVE_REACH_STEP = 0.02
"""A curve carried beyond its data to a duty point ends at the next whole 2 % of its data range,
so small edits near that point reuse the cached curves."""


def _curve_reach(fitted: FittedPump, arrangement: Arrangement,
                 points: Sequence[OperatingPoint]) -> tuple[float | None, ...]:
    """For 1..duty_count pumps running, the station flow the curve must reach (``None``: its data range).

    The furthest found point of that many pumps at the arrangement's speed, where it lies
    beyond the data range (an extrapolated duty point), rounded up to :data:`CURVE_REACH_STEP`
    of the range's end.
    """
    from hydraulics.pump_arrangement import arrangement_flow_range

    reach: list[float | None] = []
    for n in range(1, arrangement.duty_count + 1):
        _low, high = arrangement_flow_range(fitted, n, arrangement.speed_ratio, arrangement.trim_ratio)
        end = float(high)
        flows = [float(p.flow_m3_s) for p in points if p.found and p.flow_m3_s is not None
                 and p.pumps_running == n and abs(p.speed_ratio - arrangement.speed_ratio) < 1e-9]
        furthest = max(flows, default=0.0)
        if end <= 0.0 or furthest <= end:
            reach.append(None)
            continue
        reach.append(end * (1.0 + CURVE_REACH_STEP * math.ceil((furthest / end - 1.0) / CURVE_REACH_STEP)))
    return tuple(reach)


@lru_cache(maxsize=16)
def _cached_pump_curves(pump: PumpModel, density_kg_m3: float, duty_count: int, series_stages: int,
                        speed_ratio: float, trim_ratio: float,
                        preferred_region: tuple[float, float],
                        reach: tuple[float | None, ...] = ()) -> tuple[PumpCurve, ...]:
    """The curves of 1..``duty_count`` pumps running, reused while the pump set is unchanged.

    They depend on the pump, the fluid density and the arrangement only, not on the
    pipework, so a pipe edit does not rebuild them (unless a duty point moves beyond the
    data range: ``reach`` carries a curve on to it).  Their arrays are made read-only,
    as they are shared by every solution that reuses them.
    """
    from hydraulics.pump_arrangement import arrangement_curve

    fitted = _cached_fit(pump, density_kg_m3)
    curves = tuple(
        arrangement_curve(fitted, n, series_stages, speed_ratio, trim_ratio, preferred_region=preferred_region,
                          reach_flow_m3_s=reach[n - 1] if n - 1 < len(reach) else None)
        for n in range(1, duty_count + 1)
    )
    for curve in curves:
        for value in vars(curve).values():
            if isinstance(value, np.ndarray):
                value.flags.writeable = False
    return curves


def _npsh_curve(system: SystemHydraulics, npsh_static_m: float, first_curve: PumpCurve,
                flows: FloatArray, pumps_running: int, npsh_static_highest_m: float) -> NpshCurve:
    """NPSH available over the station flows ``flows`` beside NPSH required.

    At the lowest suction level (``npsh_static_m``) and, in the ``available_highest_level_*``
    arrays, at the highest (``npsh_static_highest_m``).  The static part less the suction
    losses with ``pumps_running`` pumps running: the common suction at the station flow Q
    and one pump's own suction branch at Q/N.
    """
    loss_new = system.suction_loss(flows, False, pumps_running)
    loss_aged = system.suction_loss(flows, True, pumps_running)
    return NpshCurve(
        flow_m3_s=flows,
        available_new_m=npsh_static_m - loss_new,
        available_aged_m=npsh_static_m - loss_aged,
        available_highest_level_new_m=npsh_static_highest_m - loss_new,
        available_highest_level_aged_m=npsh_static_highest_m - loss_aged,
        required_flow_m3_s=first_curve.flow_m3_s,
        required_m=first_curve.npsh_required_m,
        pumps_running=pumps_running,
    )


def design_pumps_running(project: Project) -> int:
    """The pumps that share the design flow: the arrangement's duty pumps (1 without one).

    The segment table at design flow puts each pump's own branch at design flow / this.
    """
    arrangement = project.arrangement
    return 1 if arrangement is None else max(1, int(arrangement.duty_count))


def _curves_at_manifold(system: SystemHydraulics, curves: tuple[PumpCurve, ...]) -> tuple[PumpCurve, ...]:
    """The pump-set curves with their heads at the manifold, H_set(Q) − L_branch(Q/N).

    Kept outside the per-pump-set cache: the branch loss depends on the pipework.  Without
    pump-branch segments the cached curves are returned as they are.
    """
    if not system.has_branches:
        return curves
    out = []
    for curve in curves:
        at_manifold = []
        for aged in (False, True):
            head = curve.head_m - system.branch_loss(curve.flow_per_pump_m3_s, aged)
            head.flags.writeable = False
            at_manifold.append(head)
        out.append(replace(curve, head_at_manifold_m=at_manifold[0], head_at_manifold_aged_m=at_manifold[1]))
    return tuple(out)


@dataclass(frozen=True)
class _FlowSeen:
    """A station flow and one running pump's flow at a solved point, with the point's label."""

    station_m3_s: float
    pump_m3_s: float
    label: str


def _flows_seen(points: list[OperatingPoint], pump_set: PumpSetResult | None) -> list[_FlowSeen]:
    """Every station and per-pump flow the velocity checks must see.

    The identical pumps' points (each pump Q/N) and, with pumps of other models, each
    running pump's own flow at the pump-set points (its branch carries that flow).
    """
    out = [_FlowSeen(float(p.flow_m3_s or 0.0), float(p.flow_m3_s or 0.0) / p.pumps_running,
                     checks.scenario_label(p)) for p in points]
    if pump_set is not None:
        from hydraulics.pump_set_points import point_label

        for point in pump_set.points:
            if not point.found or point.flow_m3_s is None:
                continue
            label = point_label(point)
            shares = [s.flow_m3_s for s in point.shares if s.flow_m3_s is not None and s.flow_m3_s > 0.0]
            out += [_FlowSeen(point.flow_m3_s, q, label) for q in shares]
    return out


def _segments_at_extreme(system: SystemHydraulics, flows: list[_FlowSeen],
                         highest: bool) -> tuple[tuple[SegmentResult, ...], dict[int, str]]:
    """The segment table at the highest (or lowest) flow each segment sees over ``flows``.

    A common segment sees its extreme at the extreme station flow; a pump-branch segment
    at the extreme flow of one running pump, which need not be the same operating point (one
    pump alone runs further out on its curve than each of two).  With it, per segment
    index, the scenario of that flow.
    """
    pick = max if highest else min
    by_station = pick(flows, key=lambda f: f.station_m3_s)
    station_rows = segment_results(system, by_station.station_m3_s)
    if not system.has_branches:
        return station_rows, {row.index: by_station.label for row in station_rows}
    by_pump = pick(flows, key=lambda f: f.pump_m3_s)
    branch_rows = segment_results(system, by_pump.pump_m3_s, pumps_running=1)  # only its branch rows are read
    rows = tuple(b if b.carries == "pump" else s for s, b in zip(station_rows, branch_rows, strict=True))
    return rows, {row.index: by_pump.label if row.carries == "pump" else by_station.label for row in rows}
