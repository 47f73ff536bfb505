"""The installed pump set in the results: the list, the run sequence and the points of dissimilar pumps.

The arrangement's identical stages (1..N duty pumps of one model) are the ordinary operating
points.  Where other pumps are installed (:attr:`hydraulics.model.Project.other_pumps`), the
stages that include them, and the set with the largest pump out of service and a standby
in its place, are solved here with :func:`hydraulics.pump_set.solve_pump_set` (pumps in
parallel at a common manifold head), at both static extremes and pipe states, at the pumps'
highest speeds and — where variable-speed pumps run — at their lowest.

NPSH available per pump (as for identical pumps, :func:`hydraulics.operating_points.npsh_available`):
the static part at the scenario's own suction level less the common suction loss at the
station flow and that pump's own suction-branch loss at its own flow.

Codes (stable, listed with the others in :mod:`hydraulics.checks`):

* ``pump_held_shut`` (critical): a running pump's head cannot open its check valve against
  the manifold head: it delivers nothing and churns at shut-off, held only by its check valve.
* ``pump_below_minimum_flow`` (warning): a weaker pump is pushed back below the allowable
  region (its share of best-efficiency flow below the criteria's lower bound).
* Per pump beside the arrangement's, the motor codes of :func:`hydraulics.motor.motor_findings`
  (its shaft power at these points and to run-out against its own motor).
* Per pump at these points, ``npsh_insufficient`` / ``npsh_margin_low`` and
  ``outside_allowable`` (run-out beyond the allowable region) and ``outside_preferred``, as for
  identical pumps.

The same finding for one pump at several points is given once, naming every point.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

from hydraulics.checks import npsh_margin_findings
from hydraulics.model import Criteria, Project
from hydraulics.motor import motor_findings, pump_motor_check
from hydraulics.number_format import percent_number
from hydraulics.pump_fit import FittedPump
from hydraulics.pump_set import (
    SetPump,
    installed_pumps,
    pump_set_speed_for_flow,
    run_stages,
    solve_pump_set,
    stage_label,
)
from hydraulics.results import (
    Finding,
    FindingTarget,
    InstalledPumpRow,
    PumpMotor,
    PumpSetPoint,
    PumpSetResult,
    PumpShare,
)
from hydraulics.system_curve import SystemHydraulics

__all__ = ["pump_set_result", "pump_set_findings", "largest_out_set", "design_speed_findings", "STATIC_CASES",
           "PIPE_STATES"]

STATIC_CASES = ("min", "max")
PIPE_STATES = ("new", "aged")
_JOULES_PER_KWH = 3.6e6
HIGHEST, LOWEST = "highest speed", "lowest speed"


@dataclass(frozen=True)
class _SetToSolve:
    pumps: tuple[SetPump, ...]
    basis: str
    worst_only: bool = False


def largest_out_set(project: Project, system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump],
                    ) -> tuple[tuple[SetPump, ...], SetPump, tuple[SetPump, ...]] | None:
    """The pumps that run with the largest pump out of service, at the worst case.

    The largest pump is the one of the full run sequence (every duty and assist pump) that
    delivers most at the worst case (maximum static, aged pipe, highest speeds).  The first
    standby pump in the list takes its place (none: the others run alone).  Returns the full
    set, the pump out and the set that runs instead; ``None`` without stages.
    """
    stages = run_stages(project)
    if not stages:
        return None
    full = stages[-1]
    worst = solve_pump_set(system, fitted_by_id, full, system.static_head_m["max"], True)
    flows = np.nan_to_num(worst.pump_flow_m3_s[0])
    out = full[int(np.argmax(flows))] if worst.found[0] else max(
        full, key=lambda p: fitted_by_id[p.pump_id].bep_flow_m3_s or fitted_by_id[p.pump_id].flow_max_m3_s)
    standby = [p for p in installed_pumps(project) if p.role == "standby"]
    order = {p.tag: i for i, p in enumerate(installed_pumps(project))}
    kept = [p for p in full if p.tag != out.tag] + standby[:1]
    instead = tuple(sorted(kept, key=lambda p: order[p.tag]))  # in the installed order: P1, P2, …
    return full, out, instead


def _sets(project: Project, system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump]) -> list[_SetToSolve]:
    """The pump sets solved here: stages with other pumps, and the set with the largest pump out."""
    if not project.other_pumps:
        return []
    duty_count = project.arrangement.duty_count if project.arrangement is not None else 0
    sets = [_SetToSolve(stage, "run sequence") for stage in run_stages(project)
            if len(stage) > duty_count or any(not p.from_arrangement for p in stage)]
    chosen = largest_out_set(project, system, fitted_by_id)
    if chosen is not None:
        _, out, instead = chosen
        if instead:
            spare = [p.tag for p in instead if p.role == "standby"]
            basis = f"{out.tag} out of service, " + (f"standby {spare[0]} running" if spare else "no standby")
            sets.append(_SetToSolve(instead, basis, worst_only=True))
    return sets


def pump_set_result(project: Project, system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump],
                    npsh_static_by_case_m: Mapping[str, float] | None) -> PumpSetResult:
    """The installed pumps, the run sequence and the points of the sets with other pumps (module description)."""
    pumps = installed_pumps(project)
    names = {p.pump_id: p.name for p in project.pumps}
    rows = tuple(InstalledPumpRow(p.tag, p.pump_id, names.get(p.pump_id, p.pump_id), p.role, p.control_text,
                                  p.from_arrangement) for p in pumps)
    stages = tuple(tuple(p.tag for p in stage) for stage in run_stages(project))
    points: list[PumpSetPoint] = []
    for item in _sets(project, system, fitted_by_id):
        points += _solve_set(system, fitted_by_id, item, names, npsh_static_by_case_m)
    motors = []
    for pump in (p for p in pumps if not p.from_arrangement):
        powers = [s.shaft_power_w for point in points for s in point.shares
                  if s.tag == pump.tag and s.shaft_power_w is not None]
        motor = pump_motor_check(
            fitted_by_id[pump.pump_id], project.criteria, powers, trim_ratio=pump.trim_ratio,
            speed_ratio=pump.speed_ratio, max_speed_ratio=pump.speed_ratio, rating_w=pump.motor_rating_w,
            service_factor=pump.service_factor, motor_efficiency=pump.motor_efficiency,
            drive_efficiency=pump.drive_efficiency, variable_speed=pump.variable_speed)
        motors.append(PumpMotor(pump.tag, pump.pump_id, names.get(pump.pump_id, pump.pump_id), motor))
    return PumpSetResult(pumps=rows, stages=stages, points=tuple(points), motors=tuple(motors))


def arrangement_shaft_powers(result: PumpSetResult) -> list[float]:
    """The shaft power of the arrangement's pumps wherever they run beside pumps of other models (W)."""
    own = {p.tag for p in result.pumps if p.from_arrangement}
    return [s.shaft_power_w for point in result.points for s in point.shares
            if s.tag in own and s.shaft_power_w is not None]


def _solve_set(system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump], item: _SetToSolve,
               names: Mapping[str, str], npsh_static_by_case_m: Mapping[str, float] | None) -> list[PumpSetPoint]:
    """Every scenario of one pump set in one batch: static × pipe × (highest, lowest speed)."""
    variable = any(p.variable_speed and p.min_speed_ratio < p.speed_ratio for p in item.pumps)
    speeds = (HIGHEST, LOWEST) if variable else (HIGHEST,)
    cases = [("max", "aged")] if item.worst_only else [(s, pipe) for s in STATIC_CASES for pipe in PIPE_STATES]
    scenarios = [(static, pipe, speed) for speed in speeds for static, pipe in cases]
    static = np.array([system.static_head_m[s] for s, _, _ in scenarios])
    aged = np.array([pipe == "aged" for _, pipe, _ in scenarios])
    common = np.array([np.inf if speed == HIGHEST else 0.0 for _, _, speed in scenarios])
    solved = solve_pump_set(system, fitted_by_id, item.pumps, static, aged, common)
    q_station = np.nan_to_num(solved.flow_m3_s)
    npsha = np.full(solved.pump_flow_m3_s.shape, np.nan)
    if npsh_static_by_case_m is not None:
        static_part = np.array([float(npsh_static_by_case_m[s]) for s, _, _ in scenarios])
        common_loss = system.common_suction_loss(q_station, aged)
        q_pumps = np.nan_to_num(solved.pump_flow_m3_s)
        branch = system.branch_suction_loss(q_pumps, np.broadcast_to(aged[:, None], q_pumps.shape))
        npsha = static_part[:, None] - common_loss[:, None] - branch
    out = []
    for k, (static_case, pipe, speed) in enumerate(scenarios):
        found = bool(solved.found[k])
        shares = []
        for i, pump in enumerate(item.pumps):
            q = _value(solved.pump_flow_m3_s[k, i], found)
            shares.append(PumpShare(
                tag=pump.tag, pump_id=pump.pump_id, pump_name=names.get(pump.pump_id, pump.pump_id), role=pump.role,
                speed_ratio=float(solved.speed_ratio[k, i]), flow_m3_s=q,
                head_m=_value(solved.pump_head_m[k, i], found), efficiency=_value(solved.pump_efficiency[k, i], found),
                shaft_power_w=_value(solved.pump_shaft_power_w[k, i], found),
                input_power_w=_value(solved.pump_input_power_w[k, i], found),
                bep_flow_ratio=_value(solved.pump_bep_flow_ratio[k, i], found),
                npsh_available_m=_value(npsha[k, i], found and q is not None and q > 0.0),
                npsh_required_m=_value(solved.pump_npsh_required_m[k, i], found),
                shut_off=bool(solved.shut_off[k, i]), extrapolated=bool(solved.extrapolated[k, i])))
        power = float(solved.input_power_w[k]) if found else None
        flow = _value(solved.flow_m3_s[k], found)
        has_power = power is not None and power > 0.0 and flow is not None and flow > 0.0
        out.append(PumpSetPoint(
            static=static_case, pipe=pipe, running=tuple(p.tag for p in item.pumps), basis=item.basis, speed=speed,
            found=found, reason=None if found else _reason(bool(solved.cannot_lift[k])), flow_m3_s=flow,
            manifold_head_m=_value(solved.manifold_head_m[k], found), input_power_w=power if has_power else None,
            specific_energy_kwh_m3=(power / (flow * _JOULES_PER_KWH))
            if has_power and power is not None and flow is not None else None,
            shares=tuple(shares)))
    return out


def _value(x: float, ok: bool) -> float | None:
    value = float(x)
    return value if ok and np.isfinite(value) else None


def _reason(cannot_lift: bool) -> str:
    if cannot_lift:
        return "the pumps cannot lift the system head at zero flow"
    return "a pump would run beyond the end of its curve"


def point_label(point: PumpSetPoint) -> str:
    """``"P1+P2+P3, max static, aged pipe, highest speed"`` (with the basis when a pump is out)."""
    text = f"{point.label}, {point.static} static, {point.pipe} pipe, {point.speed}"
    return text if point.basis == "run sequence" else f"{text} ({point.basis})"


def installed_row_target(tag: str) -> FindingTarget:
    """The finding target that selects pump ``tag`` ("P3") in the list of installed pumps (its row, from 0)."""
    return ("installed_pump", int(tag[1:]) - 1)


def pump_set_findings(result: PumpSetResult, criteria: Criteria) -> list[Finding]:
    """Findings about each pump at the points of :func:`pump_set_result` (codes in the module description)."""
    grouped: dict[tuple[str, str, str], list[tuple[Finding, str, float]]] = {}
    for point in result.points:
        if not point.found:
            continue
        where_point = point_label(point)
        for share in point.shares:
            where = f"pump {share.tag} ('{share.pump_name}')"
            target = installed_row_target(share.tag)
            items: list[tuple[Finding, float]] = []
            if share.shut_off:
                items.append((Finding(
                    "critical", "pump_held_shut",
                    f"{share.tag} cannot open its check valve against the manifold head: it delivers nothing and "
                    "runs at shut-off, held only by its check valve (the stronger pumps set the head).",
                    where, "Do not run it with these pumps: choose pumps whose shut-off heads match, "
                    "slow the stronger pumps, or run it alone.", target), 0.0))
            elif share.bep_flow_ratio is not None and share.bep_flow_ratio < criteria.allowable_region_low:
                items.append((Finding(
                    "warning", "pump_below_minimum_flow",
                    f"{share.tag} is pushed back towards shut-off by the stronger pumps, below its allowable region "
                    f"(from {percent_number(criteria.allowable_region_low)} % of best-efficiency flow).",
                    where, "Match the pumps' heads, slow the stronger pumps, or do not run these pumps together.",
                    target), share.bep_flow_ratio))
            elif share.bep_flow_ratio is not None and share.bep_flow_ratio > criteria.allowable_region_high:
                items.append((Finding(
                    "critical", "outside_allowable",
                    f"{share.tag} runs out beyond its allowable region (to "
                    f"{percent_number(criteria.allowable_region_high)} % of best-efficiency flow).",
                    where, "Change the pumps that run together, the speed or the pump selection.", target),
                    share.bep_flow_ratio))
            elif share.bep_flow_ratio is not None and not (
                    criteria.preferred_region_low <= share.bep_flow_ratio <= criteria.preferred_region_high):
                items.append((Finding(
                    "warning", "outside_preferred",
                    f"{share.tag} runs outside its preferred region "
                    f"({percent_number(criteria.preferred_region_low)}–{percent_number(criteria.preferred_region_high)}"
                    " % of best-efficiency flow).",
                    where, "Consider variable speed, another combination of pumps or a pump whose best-efficiency "
                    "point is nearer the duty.", target), share.bep_flow_ratio))
            if share.flow_m3_s is not None and share.flow_m3_s > 0.0:
                items += [(f, share.npsh_available_m or 0.0) for f in npsh_margin_findings(
                    share.npsh_available_m, share.npsh_required_m, criteria, where, target)]
            for item, value in items:
                key = (item.code, share.tag, item.severity)
                grouped.setdefault(key, []).append((item, where_point, value))
    out = []
    for members in grouped.values():
        first, _, _ = members[0]
        if first.code in ("npsh_insufficient", "npsh_margin_low"):
            first = min(members, key=lambda m: m[2])[0]  # the smallest NPSH available
        elif first.code == "pump_below_minimum_flow":
            lowest = min(m[2] for m in members)
            first = Finding(first.severity, first.code, first.message.rstrip(".")
                            + f"; as little as {percent_number(lowest)} % there.", first.where, first.remedy,
                            first.target)
        elif first.code == "outside_preferred":
            ratios = [m[2] for m in members]
            first = Finding(first.severity, first.code, first.message.rstrip(".")
                            + f"; {percent_number(min(ratios))}–{percent_number(max(ratios))} % there.", first.where,
                            first.remedy, first.target)
        elif first.code == "outside_allowable":
            highest = max(m[2] for m in members)
            first = Finding(first.severity, first.code, first.message.rstrip(".")
                            + f"; up to {percent_number(highest)} % there.", first.where, first.remedy, first.target)
        points = "; ".join(dict.fromkeys(m[1] for m in members))
        out.append(Finding(first.severity, first.code, first.message, f"{first.where}, at {points}", first.remedy,
                           first.target, template=first.template, values=first.values))
    for each in result.motors:
        out += motor_findings(each.motor, f"pump {each.tag} ('{each.pump_name}')", installed_row_target(each.tag))
    return out


def pump_sets_solved(points: Sequence[PumpSetPoint]) -> tuple[str, ...]:
    """The distinct sets of pumps in ``points`` (labels, in order)."""
    return tuple(dict.fromkeys(p.label for p in points))


def design_speed_findings(project: Project, system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump],
                          design_flow_m3_s: float) -> list[Finding] | None:
    """The speeds at which every duty and assist pump together deliver the design flow, with pumps of other models.

    ``None`` when the run sequence is the arrangement's identical pumps alone (their own speed
    search then speaks), or when no pump of the set has variable speed.  Otherwise one info
    finding ``design_speed_with_pump_set`` giving the common speed of the variable-speed pumps
    at each static extreme and pipe state (:func:`hydraulics.pump_set.pump_set_speed_for_flow`:
    re-intersected with the system, never scaled), or nothing where the set cannot reach the
    design flow (``design_flow_not_met`` says so).
    """
    stages = run_stages(project)
    if not stages or all(p.from_arrangement for p in stages[-1]):
        return None
    full = stages[-1]
    if not any(p.variable_speed for p in full):
        return None
    cases = [(static, pipe) for static in STATIC_CASES for pipe in PIPE_STATES]
    static = np.array([system.static_head_m[c] for c, _ in cases])
    aged = np.array([pipe == "aged" for _, pipe in cases])
    speeds, found = pump_set_speed_for_flow(system, fitted_by_id, full, static, aged, design_flow_m3_s)
    if not found.any():
        return []
    parts = [f"{percent_number(float(v))} % at {c} static, {pipe} pipe"
             for (c, pipe), v, ok in zip(cases, speeds, found, strict=True) if ok]
    return [Finding(
        "info", "design_speed_with_pump_set",
        f"With {stage_label(full)} running, the variable-speed pumps deliver the design flow at "
        + "; ".join(parts) + ".", f"pumps {stage_label(full)}",
        "The arrangement's own pumps alone are not the whole duty: read their speed findings with this.", None)]
