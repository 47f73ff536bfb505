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
``bore_change_without_transition``  consecutive segments change bore with no reducer or expander
``main_below_atmospheric``  the grade line falls below the main: sub-atmospheric pressure
``main_column_separation``  the absolute pressure in the main falls to the vapour pressure
``operating_pressure_above_rating``  the highest operating pressure on a segment exceeds its rating
``rest_pressure_above_rating``  the pressure at rest on a segment exceeds its rating
``profile_length_mismatch``  the profile's chainages do not match the length of the main
========================  =========================================================

Capacity codes are raised by :func:`hydraulics.capacity.capacity_findings`:

==========================  =======================================================
``design_flow_not_met``     the duty pumps at maximum speed fall short of the design flow at the worst case
``no_standby``              no standby pump; the capacity with one pump out
``standby_short``           pumps of different models: the standby does not replace the largest pump
==========================  =======================================================

Pump-set codes (pumps of different models in parallel) are raised by
:func:`hydraulics.pump_set_points.pump_set_findings`:

===========================  ======================================================
``pump_held_shut``           a running pump cannot open its check valve: it churns at shut-off
``pump_below_minimum_flow``  a weaker pump is pushed back below its allowable region
``design_speed_with_pump_set``  the drive speeds at which the duty with other pumps meets the design flow
===========================  ======================================================

The point checks (operating region, NPSH, extrapolation) run at every solved point: the
arrangement's speed, the drive's minimum and maximum speeds and the speeds found for the
design flow (:func:`point_findings`); the same finding at several points is given once,
naming every scenario (:func:`group_scenario_findings`).

Speed-control codes are raised by :func:`hydraulics.variable_speed.variable_speed_findings`:

========================  =========================================================
``speed_target_unreachable``  the design flow needs more than the maximum speed
``speed_below_minimum``   even the minimum speed delivers more than the design flow
``speed_extrapolated``    the speed found puts the pumps outside their tested data
``minimum_speed_cannot_lift``  at the minimum speed the pumps cannot lift the static head
========================  =========================================================
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from typing import TYPE_CHECKING

import numpy as np

from hydraulics import fittings
from hydraulics.bore_change import PathSegment, TransitionRow, unfitted_bore_changes
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.main_profile import ProfileResult, low_pressures, profile_coverage, segment_pressure_peaks
from hydraulics.model import Criteria, FrictionMethod, ModelError, Project, Segment
from hydraulics.number_format import fixed_decimals, percent_number
from hydraulics.profile_solution import pipe_profile
from hydraulics.results import (
    SEVERITY_ORDER,
    Finding,
    FindingTarget,
    OperatingPoint,
    ScenarioKey,
    SegmentResult,
    control_label,
    finding,
)
from hydraulics.system_curve import flow_paths, main_segments

if TYPE_CHECKING:  # imported by the solve only where a pump is fitted
    from hydraulics.pump_fit import FittedPump
    from hydraulics.system_curve import SystemHydraulics


def scenario_label(point: OperatingPoint) -> str:
    """``"2 pumps at 70 % speed, max static, aged pipe"`` (the speed left out at 100 %)."""
    return _key_label((point.static, point.pipe, point.pumps_running, point.speed_ratio))


def _key_label(key: ScenarioKey) -> str:
    static, pipe, n, speed_ratio = key
    pumps = "1 pump" if n == 1 else f"{n} pumps"
    speed = "" if abs(speed_ratio - 1.0) < 1e-9 else f" at {percent_number(speed_ratio)} % speed"
    return f"{pumps}{speed}, {static} static, {pipe} pipe"


FLANGE_PIECE_MAX_DIAMETERS = 5.0
"""A pump-branch segment this many bores long or shorter, next to the pump, is a flange piece."""


def pump_flange_pieces(project: Project) -> frozenset[int]:
    """Segments that are a pump's flange piece: the last of the suction path or the first of
    the delivery path (:func:`hydraulics.system_curve.flow_paths`), part of the pump's own
    branch, and no longer than :data:`FLANGE_PIECE_MAX_DIAMETERS` bores (a reducer or
    expander spool at the pump's suction or discharge flange, not a pipe run).
    """
    suction, delivery = flow_paths(project.segments)
    pieces = set()
    for path, end in ((suction, -1), (delivery, 0)):
        if path:
            seg = project.segments[path[end]]
            if seg.carries == "pump" and seg.length_m <= FLANGE_PIECE_MAX_DIAMETERS * seg.internal_diameter_m:
                pieces.add(path[end])
    return frozenset(pieces)


def velocity_findings(project: Project, at_design: Sequence[SegmentResult],
                      at_highest_flow: Sequence[SegmentResult] | None = None,
                      at_lowest_flow: Sequence[SegmentResult] | None = None,
                      lowest_where: Mapping[int, str] | None = None,
                      highest_where: Mapping[int, str] | None = None) -> list[Finding]:
    """Velocity limits per side (common practice; every limit editable in the criteria).

    The minimum is checked at the lowest expected flow (design flow when no pump) and the
    maximum at the highest expected flow, because a main is sized for both.  For a sewage
    project the delivery-side minimum is raised to the self-cleansing velocity.  A segment
    of each pump's own branch is checked at the flow of one running pump, and the message
    says that the flow quoted is per pump.  A pump's flange piece (:func:`pump_flange_pieces`)
    is not checked: its bore is the pump's flange, set by the pump, and the velocity limits
    are pipe-sizing criteria for the pipework.  ``lowest_where``/``highest_where`` name,
    per segment index, the scenario of the extreme flow; it is added to the finding's place.
    """
    c = project.criteria
    out: list[Finding] = []
    low_set = at_lowest_flow or at_design
    high_set = at_highest_flow or at_design
    flange_pieces = pump_flange_pieces(project)
    for seg_low, seg_high in zip(low_set, high_set, strict=True):
        if seg_low.index in flange_pieces:
            continue
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
            scenario = (lowest_where or {}).get(seg_low.index)
            out.append(finding(
                "warning", "velocity_low",
                "Velocity {v} at {q}" + per_pump + " is below the minimum {limit}" + why + ".",
                {"v": (seg_low.velocity_m_s, "velocity"), "q": (seg_low.flow_m3_s, "flow"),
                 "limit": (v_min, "velocity")},
                where if scenario is None else f"{where}, {scenario}",
                "Try a smaller diameter, or plan flushing flows.", target))
        if seg_high.velocity_m_s > v_max:
            scenario = (highest_where or {}).get(seg_high.index)
            out.append(finding(
                "warning", "velocity_high", "Velocity {v} at {q}" + per_pump + " is above the maximum {limit}.",
                {"v": (seg_high.velocity_m_s, "velocity"), "q": (seg_high.flow_m3_s, "flow"),
                 "limit": (v_max, "velocity")},
                where if scenario is None else f"{where}, {scenario}",
                "Try a larger diameter; high velocity costs energy and raises surge.", target))
    return out


def profile_findings(project: Project, static_head_min_m: float, system: SystemHydraulics | None = None,
                     points: Sequence[OperatingPoint] = ()) -> list[Finding]:
    """A delivery main whose profile rises above the lowest delivery level.

    Hydrostatics: beyond such a crest the main can run partly full or under sub-atmospheric
    pressure (air release, possible column separation), and at low flow the static head to
    the crest, not to the delivery level, governs where the summit is vented.  With a
    profile the crest is its highest point, and the message says whether it has an air valve
    and whether it governs the system head (at zero flow with the delivery lowest, and at
    how many of ``points``; ``system`` gives the control).  Without a profile the elevations
    come from the segments' optional start and end elevations.
    """
    lowest_delivery = static_head_min_m + project.site.suction_level_high_m
    if project.profile:
        return _profile_crest_finding(project, static_head_min_m, lowest_delivery, system, points)
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


def _main_segment_at(project: Project, chainage_m: float) -> int | None:
    """Project index of the main segment containing ``chainage_m`` (the last one beyond the end)."""
    main = main_segments(project)
    if not main:
        return None
    ends = np.cumsum([project.segments[i].length_m for i in main])
    j = int(np.searchsorted(ends, chainage_m, side="left"))
    return main[min(j, len(main) - 1)]


def _where_on_main(project: Project, chainage_m: float) -> tuple[str, FindingTarget | None]:
    index = _main_segment_at(project, chainage_m)
    if index is None:
        return "profile of the main", ("site", "profile")
    return f"segment '{project.segments[index].name}' (delivery)", ("segment", index)


def _profile_crest_finding(project: Project, static_head_min_m: float, lowest_delivery: float,
                           system: SystemHydraulics | None, points: Sequence[OperatingPoint]) -> list[Finding]:
    """The profile's highest point above the lowest delivery level: vented or not, governing or not."""
    top = max(range(len(project.profile)), key=lambda i: project.profile[i].elevation_m)
    point = project.profile[top]
    if point.elevation_m <= lowest_delivery:
        return []
    values = {"crest": (point.elevation_m, "elevation"), "x": (point.chainage_m, "length"),
              "above": (point.elevation_m - lowest_delivery, "head"), "delivery": (lowest_delivery, "elevation")}
    where, target = _where_on_main(project, point.chainage_m)
    head = ("The main's highest point, {crest} at chainage {x}, is {above} above the lowest delivery level "
            "{delivery}")
    if not point.air_valve:
        return [finding(
            "warning", "high_point_above_delivery",
            head + " and has no air valve: the grade line may fall below the pipe there (sub-atmospheric "
            "pressure, air gathering at the summit), and the system head is taken to the delivery.",
            values, where,
            "Mark the summit as vented if an air valve is fitted, or plan one; a surge specialist should check "
            "column separation.", target)]
    crest_label = control_label(point.chainage_m)
    at_low_flow = system is not None and system.control_at_zero_flow(static_head_min_m) == crest_label
    found = [p for p in points if p.found]
    governing = sum(1 for p in found if p.control == crest_label)
    if at_low_flow or governing:
        share = f" and at {governing} of {len(found)} operating points" if found else ""
        text = (head + " and has an air valve: it governs the system head at low flow" + share
                + ", where the main beyond it runs partly full.")
    else:
        text = head + " and has an air valve; the delivery governs the system head at every flow."
    return [finding(
        "warning", "high_point_above_delivery", text, values, where,
        "Size the air valve for air release and vacuum relief; a surge specialist should check column "
        "separation beyond the summit.", target)]


def bore_change_findings(project: Project) -> list[Finding]:
    """Consecutive segments in flow order whose bores differ with no reducer or expander between them.

    Along the suction path and the delivery path apart (:func:`hydraulics.system_curve.flow_paths`;
    the pump's flanges are no junction), bores more than 1 % apart need a reducer (into a
    smaller bore) or an expander (into a larger one) on the downstream segment whose other
    bore is the upstream bore (:func:`hydraulics.bore_change.unfitted_bore_changes`); without
    one the loss of the change (Crane TP-410 contraction or enlargement) is not counted.
    Where a pump's own branch meets the common pipework (a header feeding the suction
    branches, the manifold receiving the discharge branches) and the common segment lists a
    tee, the tee is the joint and its K stands for the change of bore: such a junction is not
    checked.
    """
    catalogue = fittings.fitting_catalogue()
    segments = project.segments
    out: list[Finding] = []
    runs: list[list[int]] = []
    for path in flow_paths(segments):
        previous: int | None = None
        for i in path:
            if previous is not None and not _joined_by_a_tee(segments[previous], segments[i], catalogue):
                runs[-1].append(i)
            else:
                runs.append([i])
            previous = i
    for run in runs:
        rows = [PathSegment(i, segments[i].internal_diameter_m, tuple(
            TransitionRow(catalogue[f.fitting_id].method if f.fitting_id in catalogue else "",
                          f.other_diameter_m, f.count) for f in segments[i].fittings)) for i in run]
        for junction in unfitted_bore_changes(rows):
            up, down = segments[junction.upstream_index], segments[junction.downstream_index]
            kind = junction.needed_kind
            a_kind = f"an {kind}" if kind == "expander" else f"a {kind}"
            out.append(finding(
                "warning", "bore_change_without_transition",
                "The bore changes from {up} (segment '" + up.name + "') to {down} with no " + kind
                + " at the junction: the loss of the change is not counted.",
                {"up": (junction.upstream_diameter_m, "diameter"),
                 "down": (junction.downstream_diameter_m, "diameter")},
                f"segment '{down.name}' ({down.side})",
                f"Add {a_kind} (sudden or conical) to this segment's fittings.",
                ("segment", junction.downstream_index)))
    return out


def _joined_by_a_tee(upstream: Segment, downstream: Segment, catalogue: Mapping[str, fittings.FittingType]) -> bool:
    """A pump's branch and the common pipework meeting at a tee listed on the common segment."""
    if upstream.carries == downstream.carries:
        return False
    common = upstream if upstream.carries == "station" else downstream
    return any(f.count > 0 and f.fitting_id in catalogue and catalogue[f.fitting_id].category == "tee"
               for f in common.fittings)


def main_pressure_findings(project: Project, profile: ProfileResult, atmospheric_pressure_pa: float,
                           vapour_pressure_pa: float, density_kg_m3: float) -> list[Finding]:
    """Pressures along the main against the atmosphere, the vapour pressure and the pipe rating.

    * Sub-atmospheric gauge pressure in a full pipe (air entry at joints and air valves);
      critical where the absolute pressure head p + p_atm/(ρg) falls to the vapour pressure
      head p_v/(ρg): column separation (Wylie & Streeter, *Fluid Transients in Systems*, 1993).
      Lines with their lowest pressure at the same chainage give one finding naming them all,
      quoting the lowest pressure among them (:func:`hydraulics.main_profile.low_pressures`).
    * The highest operating pressure and the pressure at rest of each segment above its
      rating (PN or allowable operating pressure of its pipe series, gauge;
      :func:`hydraulics.main_profile.segment_pressure_peaks`).  Steady pressures only: surge
      comes on top.
    * A profile whose chainages do not span the main (:func:`hydraulics.main_profile.profile_coverage`).
    """
    rho_g = density_kg_m3 * STANDARD_GRAVITY_M_S2
    out: list[Finding] = []
    groups: dict[tuple[float, bool], list[tuple[str, float, float]]] = {}
    for low in low_pressures(profile, atmospheric_pressure_pa / rho_g, vapour_pressure_pa / rho_g):
        groups.setdefault((low.chainage_m, low.column_separation), []).append(
            (low.label, low.pressure_head_m, low.pressure_pa))
    for (chainage, separation), lines in groups.items():
        lowest = min(lines, key=lambda line: line[1])
        labels = "; ".join(line[0] for line in lines)
        where, target = _where_on_main(project, chainage)
        values = {"x": (chainage, "length"), "p": (lowest[1], "head"), "pa": (lowest[2], "pressure")}
        if separation:
            out.append(finding(
                "critical", "main_column_separation",
                "At chainage {x} the gauge pressure falls to {p} ({pa}): the absolute pressure reaches the "
                "vapour pressure and the water column separates (" + labels + ").",
                values, where, "Lower the grade line's deficit: an air valve at the summit, a larger bore "
                "upstream or a different route; a surge specialist must check column separation.", target))
        else:
            out.append(finding(
                "warning", "main_below_atmospheric",
                "At chainage {x} the gauge pressure falls to {p} ({pa}), below atmospheric: air can be "
                "drawn in and released (" + labels + ").",
                values, where, "Vent the high point (air valve) or lift the grade line there; check the "
                "joints for negative pressure.", target))
    if profile.segment_rating_pa is not None:
        main = main_segments(project)
        for peak in segment_pressure_peaks(profile, profile.segment_rating_pa):
            if math.isnan(peak.rating_pa):
                continue
            index = main[peak.segment]
            where = f"segment '{project.segments[index].name}' (delivery)"
            if peak.operating_exceeds:
                out.append(finding(
                    "critical", "operating_pressure_above_rating",
                    "The highest operating pressure {p} at chainage {x} (" + peak.operating_label + ") is above "
                    "the pipe's rating {rating}, before any surge.",
                    {"p": (peak.operating_pa, "pressure"), "x": (peak.operating_chainage_m, "length"),
                     "rating": (peak.rating_pa, "pressure")},
                    where, "Choose a higher pressure class for this segment, or lower the duty head.",
                    ("segment", index)))
            if peak.rest_exceeds:
                out.append(finding(
                    "critical", "rest_pressure_above_rating",
                    "The pressure at rest {p} at chainage {x} (" + peak.rest_label + ") is above the pipe's "
                    "rating {rating}.",
                    {"p": (peak.rest_pa, "pressure"), "x": (peak.rest_chainage_m, "length"),
                     "rating": (peak.rating_pa, "pressure")},
                    where, "Choose a higher pressure class for this segment.", ("segment", index)))
    return out


def profile_coverage_findings(project: Project) -> list[Finding]:
    """A profile whose first and last chainage do not match the start and the length of the main.

    Within the larger of 1 % of the main's length and 1 m (:func:`hydraulics.main_profile.profile_coverage`);
    beyond its points the profile holds its end elevations.
    """
    profile = pipe_profile(project)
    if profile is None:
        return []
    lengths = [project.segments[i].length_m for i in main_segments(project)]
    coverage = profile_coverage(profile, lengths)
    if coverage is None:
        return []
    return [finding(
        "warning", "profile_length_mismatch",
        "The profile runs from chainage {first} to {last}, but the common delivery pipework is {length} long: "
        "beyond the profile's points the grade line uses its end elevations.",
        {"first": (coverage.first_chainage_m, "length"), "last": (coverage.last_chainage_m, "length"),
         "length": (coverage.main_length_m, "length")},
        "profile of the main", "Give the profile from chainage 0 to the end of the main, or correct the "
        "segment lengths.", ("site", "profile"))]


def regime_findings(at_design: Iterable[SegmentResult],
                    friction_method: FrictionMethod = "darcy_weisbach") -> list[Finding]:
    """Laminar or transitional flow at design flow (friction factor less certain).

    The message states the law actually used: under Darcy–Weisbach f = 64/Re (laminar) or the
    interpolation of :func:`hydraulics.friction.darcy_friction_factor` (transition); under
    Hazen–Williams neither, as that method has no regime (the range guard
    ``hazen_williams_out_of_range`` of :mod:`hydraulics.range_guards` flags it as critical).
    """
    hazen = friction_method == "hazen_williams"
    laminar_law = ("Hazen–Williams, which holds for turbulent flow only, is used instead of the laminar "
                   "law f = 64/Re" if hazen else "f = 64/Re is used")
    transition_law = ("Hazen–Williams, which holds for turbulent flow only, is used and the friction loss is "
                      "uncertain" if hazen else "the friction factor is interpolated between the laminar and "
                      "turbulent laws and is uncertain")
    out = []
    for seg in at_design:
        where = f"segment '{seg.name}' ({seg.side})"
        if seg.regime == "laminar":
            out.append(Finding("info", "laminar_flow",
                               f"Laminar flow (Re = {fixed_decimals(seg.reynolds, 0)}) at design flow; "
                               f"{laminar_law}.",
                               where, "Check the fluid viscosity and the diameter.", ("segment", seg.index)))
        elif seg.regime == "transition":
            out.append(Finding("warning", "transition_flow",
                               f"Transitional flow (Re = {fixed_decimals(seg.reynolds, 0)}) at design flow; "
                               f"{transition_law}.",
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
            f"Impeller trim of {percent_number(trim)} % (diameter {percent_number(arrangement.trim_ratio)} % of the "
            f"tested) is beyond {percent_number(criteria.trim_warning_limit)} %; "
            "the affinity laws for trim are only approximate for small trims.",
            pump_where, "Ask the manufacturer for the tested curve of the trimmed impeller.", pump_target))
    out.extend(point_findings(project, fitted, points))
    return out


def point_findings(project: Project, fitted: FittedPump, points: Sequence[OperatingPoint],
                   missing: bool = True) -> list[Finding]:
    """The checks of each operating point: found or not, extrapolation, NPSH margin, operating region.

    Each finding's target is the point's scenario.  ``missing`` False leaves out the
    ``no_operating_point`` findings (at the drive's minimum speed the lift is checked by
    ``minimum_speed_cannot_lift`` instead).
    """
    criteria = project.criteria
    pump_where = f"pump '{fitted.pump.name}'"
    out: list[Finding] = []
    for point in points:
        label = scenario_label(point)
        where = f"{pump_where}, {label}"
        target: FindingTarget = ("scenario", (point.static, point.pipe, point.pumps_running, point.speed_ratio))
        if not point.found:
            if not missing:
                continue
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
    return npsh_margin_findings(point.npsh_available_m, point.npsh_required_m, criteria, where, target)


def npsh_margin_findings(npsha: float | None, npshr: float | None, criteria: Criteria, where: str,
                         target: FindingTarget | None) -> list[Finding]:
    """``npsh_insufficient`` or ``npsh_margin_low`` for one pump at one point (none when the margin holds).

    The margin asked for is the larger of the ratio and the least margin of the criteria
    (ANSI/HI 9.6.1 logic, see the module description).
    """
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


def _ratio_text(ratio: float, criteria: Criteria) -> str:
    """The best-efficiency flow ratio as a whole percentage, with one decimal where that would
    equal a region bound (39.8 % against a 40 % bound must not read "40 %")."""
    whole = percent_number(ratio)
    bounds = (criteria.allowable_region_low, criteria.allowable_region_high,
              criteria.preferred_region_low, criteria.preferred_region_high)
    return percent_number(ratio, 1) if whole in {percent_number(b) for b in bounds} else whole


def _region_findings(point: OperatingPoint, criteria: Criteria, where: str, target: FindingTarget) -> list[Finding]:
    ratio = point.bep_flow_ratio
    if ratio is None:
        return []
    if not criteria.allowable_region_low <= ratio <= criteria.allowable_region_high:
        return [Finding(
            "critical", "outside_allowable",
            f"Runs at {_ratio_text(ratio, criteria)} % of best-efficiency flow, outside the allowable region "
            f"{percent_number(criteria.allowable_region_low)}–{percent_number(criteria.allowable_region_high)} %.",
            where, "Change the number of pumps, the speed or the pump selection.", target)]
    if not criteria.preferred_region_low <= ratio <= criteria.preferred_region_high:
        return [Finding(
            "warning", "outside_preferred",
            f"Runs at {_ratio_text(ratio, criteria)} % of best-efficiency flow, outside the preferred region "
            f"{percent_number(criteria.preferred_region_low)}–{percent_number(criteria.preferred_region_high)} %.",
            where, "Consider variable speed or a pump whose best-efficiency point is nearer the duty.", target)]
    return []


def group_scenario_findings(findings: Iterable[Finding]) -> list[Finding]:
    """The same finding at several scenarios given once, naming every scenario where it occurs.

    Findings about a scenario (target ``("scenario", key)``) with the same severity, code,
    message and remedy are one finding: its place is the pump and the scenarios in turn,
    its target the first scenario.  Other findings pass unchanged, in their order.
    """
    out: list[Finding] = []
    groups: dict[tuple[str, ...], list[Finding]] = {}
    slots: dict[tuple[str, ...], int] = {}
    for item in findings:
        if item.target is None or item.target[0] != "scenario":
            out.append(item)
            continue
        key: tuple[str, ...] = (item.severity, item.code, item.message, item.remedy)
        if key not in groups:
            groups[key] = []
            slots[key] = len(out)
            out.append(item)
        groups[key].append(item)
    for key, members in groups.items():
        if len(members) < 2:
            continue
        first = members[0]
        scenario_keys = list(dict.fromkeys(m.target[1] for m in members if m.target is not None))
        labels = "; ".join(_key_label(k) for k in scenario_keys if isinstance(k, tuple))
        suffix = ", " + _key_label(scenario_keys[0]) if isinstance(scenario_keys[0], tuple) else ""
        pump_part = first.where[:-len(suffix)] if suffix and first.where.endswith(suffix) else first.where
        where = f"{pump_part}, {len(scenario_keys)} scenarios: {labels}"
        out[slots[key]] = Finding(first.severity, first.code, first.message, where, first.remedy, first.target,
                                  template=first.template, values=first.values)
    return out


def sort_findings(findings: Iterable[Finding]) -> tuple[Finding, ...]:
    """Most serious first, then by code, keeping the original order within a code."""
    return tuple(sorted(findings, key=lambda f: (SEVERITY_ORDER[f.severity], f.code)))
