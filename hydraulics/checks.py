"""The checks: findings about velocities, NPSH margin, operating region and curve validity.

Each finding has a severity (info / warning / critical), a stable code of our own, a plain
message, where it applies and a remedy hint.  The limits come from
:class:`hydraulics.model.Criteria`; their defaults are common practice for water and
wastewater stations (velocities), the NPSH-margin guideline ANSI/HI 9.6.1 (a ratio of
about 1.1 and at least about 0.6 m for water and wastewater pumps of ordinary suction
energy — from a secondary summary, verify against the standard) and the allowable
operating region guideline ANSI/HI 9.6.3 (preferred region about 70–120 % of
best-efficiency flow — from memory).

Stable codes (never renamed; scripts and tests rely on them):

========================  =========================================================
``velocity_low``          segment velocity below the minimum for its side
``velocity_high``         segment velocity above the maximum for its side
``laminar_flow``          laminar flow in a segment at design flow
``transition_flow``       transitional flow (2000 < Re < 4000) at design flow
``no_operating_point``    a scenario has no intersection of pump and system curves
``shutoff_below_static``  the pump's shut-off head is below the maximum static head
``extrapolated_duty``     a duty point lies beyond the pump's tested data
``npsh_margin_low``       NPSH available below the required margin
``npsh_insufficient``     NPSH available below NPSH required (cavitation certain)
``outside_preferred``     per-pump flow outside the preferred operating region
``outside_allowable``     per-pump flow outside the allowable operating region
``unstable_parallel``     head curve rises then falls: unstable in parallel
``large_trim``            impeller trim beyond the affinity-law range
``high_point_above_delivery``  the main rises above the lowest delivery level
========================  =========================================================

Speed-control codes are raised by :func:`hydraulics.variable_speed.variable_speed_findings`:

========================  =========================================================
``speed_target_unreachable``  the design flow needs more than the maximum speed
``speed_below_minimum``   even the minimum speed delivers more than the design flow
``speed_extrapolated``    the speed found puts the pumps outside their tested data
``minimum_speed_cannot_lift``  at the minimum speed the pumps cannot lift the static head
========================  =========================================================
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from typing import TYPE_CHECKING

from hydraulics.model import Criteria, ModelError, Project
from hydraulics.number_format import fixed_decimals, percent_number
from hydraulics.results import SEVERITY_ORDER, Finding, FindingTarget, OperatingPoint, SegmentResult, finding

if TYPE_CHECKING:  # imported by the solve only where a pump is fitted
    from hydraulics.pump_fit import FittedPump


def _scenario_label(point: OperatingPoint) -> str:
    n = point.pumps_running
    pumps = "1 pump" if n == 1 else f"{n} pumps"
    speed = "" if abs(point.speed_ratio - 1.0) < 1e-9 else f" at {percent_number(point.speed_ratio)} % speed"
    return f"{pumps}{speed}, {point.static} static, {point.pipe} pipe"


def velocity_findings(project: Project, at_design: Sequence[SegmentResult],
                      at_highest_flow: Sequence[SegmentResult] | None = None,
                      at_lowest_flow: Sequence[SegmentResult] | None = None) -> list[Finding]:
    """Velocity limits per side (common practice; every limit editable in the criteria).

    The minimum is checked at the lowest expected flow (design flow when no pump) and the
    maximum at the highest expected flow, because a main is sized for both.  For a sewage
    project the delivery-side minimum is raised to the self-cleansing velocity.  A segment
    of each pump's own branch is checked at the flow of one running pump, and the message
    says that the flow quoted is per pump.
    """
    c = project.criteria
    out: list[Finding] = []
    low_set = at_lowest_flow or at_design
    high_set = at_highest_flow or at_design
    for seg_low, seg_high in zip(low_set, high_set, strict=True):
        if seg_low.side == "suction":
            v_min, v_max = c.suction_velocity_min_m_s, c.suction_velocity_max_m_s
        else:
            v_min, v_max = c.delivery_velocity_min_m_s, c.delivery_velocity_max_m_s
            if c.sewage:
                v_min = max(v_min, c.sewage_velocity_min_m_s)
        where = f"segment '{seg_low.name}' ({seg_low.side})"
        target = ("segment", seg_low.index)
        per_pump = " per pump" if seg_low.carries == "pump" else ""
        if seg_low.velocity_m_s < v_min:
            why = " (self-cleansing minimum for sewage)" if c.sewage and seg_low.side == "delivery" else ""
            out.append(finding(
                "warning", "velocity_low",
                "Velocity {v} at {q}" + per_pump + " is below the minimum {limit}" + why + ".",
                {"v": (seg_low.velocity_m_s, "velocity"), "q": (seg_low.flow_m3_s, "flow"),
                 "limit": (v_min, "velocity")},
                where, "Try a smaller diameter, or plan flushing flows.", target))
        if seg_high.velocity_m_s > v_max:
            out.append(finding(
                "warning", "velocity_high", "Velocity {v} at {q}" + per_pump + " is above the maximum {limit}.",
                {"v": (seg_high.velocity_m_s, "velocity"), "q": (seg_high.flow_m3_s, "flow"),
                 "limit": (v_max, "velocity")},
                where, "Try a larger diameter; high velocity costs energy and raises surge.", target))
    return out


def profile_findings(project: Project, static_head_min_m: float) -> list[Finding]:
    """A delivery main whose profile rises above the lowest delivery level.

    Hydrostatics: beyond such a crest the main can run partly full or under sub-atmospheric
    pressure (air release, possible column separation), and at low flow the static head to
    the crest, not to the delivery level, governs.  Elevations come from the segments'
    optional start and end elevations.
    """
    lowest_delivery = static_head_min_m + project.site.suction_level_high_m
    crest: float | None = None
    crest_index = 0
    for i, seg in enumerate(project.segments):
        if seg.side != "delivery":
            continue
        for elevation in (seg.start_elevation_m, seg.end_elevation_m):
            if elevation is not None and (crest is None or elevation > crest):
                crest, crest_index = elevation, i
    if crest is None or crest <= lowest_delivery:
        return []
    seg = project.segments[crest_index]
    return [finding(
        "warning", "high_point_above_delivery",
        "The main reaches {crest}, {above} above the lowest delivery level {delivery}: beyond the "
        "crest it may run partly full or below atmospheric pressure, and at low flow the static "
        "head to the crest governs.",
        {"crest": (crest, "elevation"), "above": (crest - lowest_delivery, "head"),
         "delivery": (lowest_delivery, "elevation")},
        f"segment '{seg.name}' (delivery)",
        "Check the hydraulic grade line over the crest; plan air valves; a surge specialist should "
        "check column separation.", ("segment", crest_index))]


def regime_findings(at_design: Iterable[SegmentResult]) -> list[Finding]:
    """Laminar or transitional flow at design flow (friction factor less certain)."""
    out = []
    for seg in at_design:
        where = f"segment '{seg.name}' ({seg.side})"
        if seg.regime == "laminar":
            out.append(Finding("info", "laminar_flow",
                               f"Laminar flow (Re = {fixed_decimals(seg.reynolds, 0)}) at design flow; "
                               "f = 64/Re is used.",
                               where, "Check the fluid viscosity and the diameter.", ("segment", seg.index)))
        elif seg.regime == "transition":
            out.append(Finding("warning", "transition_flow",
                               f"Transitional flow (Re = {fixed_decimals(seg.reynolds, 0)}) at design flow; "
                               "the friction factor is interpolated between the laminar and turbulent laws "
                               "and is uncertain.",
                               where, "Avoid designing in the 2000–4000 Reynolds range.", ("segment", seg.index)))
    return out


def pump_findings(project: Project, fitted: FittedPump, points: Sequence[OperatingPoint],
                  static_head_max_m: float) -> list[Finding]:
    """Findings about the pump, its arrangement and every operating point."""
    arrangement = project.arrangement
    if arrangement is None:
        raise ModelError("arrangement", "the pump checks need a pump arrangement")
    criteria = project.criteria
    pump_where = f"pump '{fitted.pump.name}'"
    pump_target = ("pump", fitted.pump.pump_id)
    out: list[Finding] = []
    scale = arrangement.speed_ratio * arrangement.trim_ratio
    shutoff = fitted.shutoff_head_m * scale**2 * arrangement.series_stages
    if shutoff < static_head_max_m:
        out.append(finding(
            "critical", "shutoff_below_static",
            "Shut-off head {shutoff} is below the maximum static head {static}: the pumps cannot deliver "
            "when suction is lowest and delivery highest.",
            {"shutoff": (shutoff, "head"), "static": (static_head_max_m, "head")},
            pump_where, "Choose a pump with a higher head, a higher speed or more series stages.", pump_target))
    if arrangement.duty_count > 1 and fitted.has_rising_then_falling_head:
        out.append(Finding(
            "warning", "unstable_parallel",
            "The head curve rises from shut-off to a peak and then falls; identical pumps in parallel "
            "can hunt between operating points.",
            pump_where, "Prefer a pump with a steadily falling head curve for parallel duty.", pump_target))
    trim = 1.0 - arrangement.trim_ratio
    if trim > criteria.trim_warning_limit:
        out.append(Finding(
            "warning", "large_trim",
            f"Impeller trim of {percent_number(trim)} % is beyond {percent_number(criteria.trim_warning_limit)} %; "
            "the affinity laws for trim are only approximate for small trims.",
            pump_where, "Ask the manufacturer for the tested curve of the trimmed impeller.", pump_target))
    for point in points:
        label = _scenario_label(point)
        where = f"{pump_where}, {label}"
        target = ("scenario", (point.static, point.pipe, point.pumps_running, point.speed_ratio))
        if not point.found:
            remedy = "Check the static head, the pump curve and the number of pumps running."
            if point.reason_template is not None:  # quoted heads follow the display units
                out.append(finding("critical", "no_operating_point", f"No operating point: {point.reason_template}.",
                                   {name: (value, quantity) for name, value, quantity in point.reason_values},
                                   where, remedy, target))
            else:
                out.append(Finding("critical", "no_operating_point", f"No operating point: {point.reason}.", where,
                                   remedy, target))
            continue
        if point.extrapolated and point.flow_per_pump_m3_s is not None:
            out.append(finding(
                "warning", "extrapolated_duty",
                "The duty point at {q} per pump lies beyond the pump's tested data; the fitted curve is "
                "extrapolated there.", {"q": (point.flow_per_pump_m3_s, "flow")},
                where, "Obtain pump data covering this flow, or change the system.", target))
        out.extend(_npsh_findings(point, criteria, where, target))
        out.extend(_region_findings(point, criteria, where, target))
    return out


def _npsh_findings(point: OperatingPoint, criteria: Criteria, where: str, target: FindingTarget) -> list[Finding]:
    npsha, npshr = point.npsh_available_m, point.npsh_required_m
    if npsha is None or npshr is None:
        return []
    required = max(criteria.npsh_margin_ratio * npshr, npshr + criteria.npsh_margin_min_m)
    if npsha < npshr:
        return [finding(
            "critical", "npsh_insufficient",
            "NPSH available {a} is below NPSH required {r}: the pump will cavitate.",
            {"a": (npsha, "head"), "r": (npshr, "head")},
            where, "Lower the pump, raise the minimum suction level, or shorten/enlarge the suction pipe.",
            target)]
    if npsha < required:
        return [finding(
            "warning", "npsh_margin_low",
            "NPSH available {a} gives a margin of {m} (ratio " + fixed_decimals(npsha / npshr, 2) + ") over NPSH "
            "required {r}; the criteria ask for at least {need} available.",
            {"a": (npsha, "head"), "m": (npsha - npshr, "head"), "r": (npshr, "head"), "need": (required, "head")},
            where, "Lower the pump, raise the minimum suction level, or reduce suction losses.", target)]
    return []


def _region_findings(point: OperatingPoint, criteria: Criteria, where: str, target: FindingTarget) -> list[Finding]:
    ratio = point.bep_flow_ratio
    if ratio is None:
        return []
    if not criteria.allowable_region_low <= ratio <= criteria.allowable_region_high:
        return [Finding(
            "critical", "outside_allowable",
            f"Runs at {percent_number(ratio)} % of best-efficiency flow, outside the allowable region "
            f"{percent_number(criteria.allowable_region_low)}–{percent_number(criteria.allowable_region_high)} %.",
            where, "Change the number of pumps, the speed or the pump selection.", target)]
    if not criteria.preferred_region_low <= ratio <= criteria.preferred_region_high:
        return [Finding(
            "warning", "outside_preferred",
            f"Runs at {percent_number(ratio)} % of best-efficiency flow, outside the preferred region "
            f"{percent_number(criteria.preferred_region_low)}–{percent_number(criteria.preferred_region_high)} %.",
            where, "Consider variable speed or a pump whose best-efficiency point is nearer the duty.", target)]
    return []


def sort_findings(findings: Iterable[Finding]) -> tuple[Finding, ...]:
    """Most serious first, then by code, keeping the original order within a code."""
    return tuple(sorted(findings, key=lambda f: (SEVERITY_ORDER[f.severity], f.code)))
