"""Solve a project: from the model to every result the window and the reports show.

:func:`solve` is a pure function of the :class:`~hydraulics.model.Project`.  It
validates the project, computes the fluid properties and the site's atmospheric
pressure, prepares the pipework arrays once, evaluates the four system curves over one
flow grid, the segment table at design flow, and — where the project has a pump — the
fitted curves, operating points at both static extremes for new and aged pipe and 1..N
pumps, variable speed, NPSH, energy and the checks.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from hydraulics import checks
from hydraulics.atmosphere import standard_atmosphere_pressure
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.fluid import fluid_properties
from hydraulics.model import Project
from hydraulics.results import Solution
from hydraulics.system_curve import flow_grid, prepare_system, segment_results, system_curves
from hydraulics.validation import validate_project

DEFAULT_FLOW_POINTS = 256


def atmospheric_pressure(project: Project) -> float:
    """The given atmospheric pressure, else the standard atmosphere at the site altitude (Pa)."""
    site = project.site
    if site.atmospheric_pressure_pa is not None:
        return float(site.atmospheric_pressure_pa)
    return float(standard_atmosphere_pressure(site.altitude_m))


def npsh_static_head(project: Project, atmospheric_pa: float, fluid) -> float:
    """The flow-independent part of NPSH available at the lowest suction level (m).

    (p_atm − p_v)/(ρ g) + (lowest suction level − pump datum); the suction losses at each
    flow are subtracted by the operating-point solver (see
    :func:`hydraulics.operating_points.npsh_available`).
    """
    rho_g = fluid.density_kg_m3 * STANDARD_GRAVITY_M_S2
    return (atmospheric_pa - fluid.vapour_pressure_pa) / rho_g + (
        project.site.suction_level_low_m - project.site.pump_datum_m)


def solve(project: Project, n_flow_points: int = DEFAULT_FLOW_POINTS) -> Solution:
    """Everything PumpSketch computes for ``project`` (raises ModelError on bad input)."""
    validate_project(project)
    fluid = fluid_properties(project.fluid)
    p_atm = atmospheric_pressure(project)
    system = prepare_system(project, fluid)
    design_flow = project.site.design_flow_m3_s
    at_design = segment_results(system, design_flow)

    pump_part = _solve_pumps(project, system, fluid, p_atm) if project.duty_pump is not None else None
    max_flow = project.flow_grid_max_factor * design_flow
    if pump_part is not None:
        max_flow = max(max_flow, pump_part["curve_max_flow"])
    flows = flow_grid(max_flow, n_flow_points)
    curves = system_curves(system, flows)

    findings = checks.regime_findings(at_design)
    findings += checks.profile_findings(project, system.static_head_m["min"])
    if pump_part is None:
        findings += checks.velocity_findings(project, at_design)
        return Solution(
            project=project, fluid=fluid, atmospheric_pressure_pa=p_atm,
            static_head_min_m=system.static_head_m["min"], static_head_max_m=system.static_head_m["max"],
            design_flow_m3_s=design_flow, curves=curves, segments=at_design,
            findings=checks.sort_findings(findings),
        )

    found = [p for p in pump_part["points"] if p.found]
    lowest = segment_results(system, min(p.flow_m3_s for p in found)) if found else None
    highest = segment_results(system, max(p.flow_m3_s for p in found)) if found else None
    findings += checks.velocity_findings(project, at_design, at_highest_flow=highest, at_lowest_flow=lowest)
    findings += checks.pump_findings(project, pump_part["fitted"], pump_part["points"], system.static_head_m["max"])
    findings += pump_part["variable_speed_findings"]
    npsh_curve = _npsh_curve(system, pump_part, flows)
    return Solution(
        project=project, fluid=fluid, atmospheric_pressure_pa=p_atm,
        static_head_min_m=system.static_head_m["min"], static_head_max_m=system.static_head_m["max"],
        design_flow_m3_s=design_flow, curves=curves, segments=at_design,
        findings=checks.sort_findings(findings),
        pump_fits=(pump_part["fitted"],),
        operating_points=tuple(pump_part["points"]),
        variable_speed=pump_part["variable_speed"],
        energy=pump_part["energy"],
        pump_curves=pump_part["pump_curves"],
        npsh_available_curve=npsh_curve,
    )


def _solve_pumps(project: Project, system, fluid, p_atm: float) -> dict:
    """Fitted pump, operating points, variable speed and energy."""
    from hydraulics.energy import annual_energy
    from hydraulics.operating_points import operating_points
    from hydraulics.pump_arrangement import arrangement_curve
    from hydraulics.variable_speed import search_speeds, variable_speed_findings, variable_speed_points

    arrangement = project.arrangement
    fitted = _cached_fit(project.duty_pump, fluid.density_kg_m3)
    npsh_static = npsh_static_head(project, p_atm, fluid)
    search = search_speeds(system, fitted, arrangement, project.site.design_flow_m3_s)
    # One batched solve: the arrangement's own speed first, then the variable-speed ones.
    own_speed = float(arrangement.speed_ratio)
    batch = operating_points(system, fitted, arrangement, npsh_static, fluid.density_kg_m3,
                             speed_ratios=tuple(dict.fromkeys((own_speed,) + search.speeds_to_intersect)))
    points = tuple(p for p in batch if p.speed_ratio == own_speed)
    speed = variable_speed_points(search, batch)
    curves = tuple(
        arrangement_curve(fitted, n, arrangement.series_stages, arrangement.speed_ratio, arrangement.trim_ratio,
                          preferred_region=(project.criteria.preferred_region_low,
                                            project.criteria.preferred_region_high))
        for n in range(1, arrangement.duty_count + 1)
    )
    energy = annual_energy(points, project.energy, project.site.design_flow_m3_s)
    curve_max = max(float(np.max(c.flow_m3_s)) for c in curves)
    return {
        "fitted": fitted, "points": points, "variable_speed": speed,
        "variable_speed_findings": variable_speed_findings(speed, fitted),
        "pump_curves": curves, "energy": energy, "curve_max_flow": 1.05 * curve_max,
        "npsh_static": npsh_static,
    }


@lru_cache(maxsize=16)
def _cached_fit(pump, density_kg_m3: float):
    """The fitted pump, reused while the pump data and fluid are unchanged.

    The model is immutable and hashable, so an edit of the pipework (the common case in
    the window) does not refit the same pump curve.
    """
    from hydraulics.pump_fit import fit_pump

    return fit_pump(pump, density_kg_m3)


@dataclass(frozen=True, eq=False)
class NpshCurve:
    """NPSH available against station flow (new and aged pipe), and NPSH required.

    ``required_flow_m3_s``/``required_m`` are those of one pump at the current speed
    (the first pump curve), for comparison per pump.
    """

    flow_m3_s: np.ndarray
    available_new_m: np.ndarray
    available_aged_m: np.ndarray
    required_flow_m3_s: np.ndarray
    required_m: np.ndarray | None


def _npsh_curve(system, pump_part, flows) -> NpshCurve:
    static = pump_part["npsh_static"]
    first = pump_part["pump_curves"][0]
    return NpshCurve(
        flow_m3_s=flows,
        available_new_m=static - system.suction_loss(flows, False),
        available_aged_m=static - system.suction_loss(flows, True),
        required_flow_m3_s=first.flow_m3_s,
        required_m=first.npsh_required_m,
    )
