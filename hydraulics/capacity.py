"""Design capacity: what the station delivers at the worst case, with every duty pump and with one out.

The worst case for capacity is the highest system curve: the maximum static head with
aged pipe, the pumps at the drive's maximum speed ratio.  The station must deliver the
design flow there with its duty pumps, and still deliver it with the largest pump out of
service — the purpose of a standby pump (firm capacity: "Recommended Standards for
Wastewater Facilities", Great Lakes–Upper Mississippi River Board, 2014, §42.3 — from
memory, verify; the same rule is common practice for water stations).

With identical pumps the largest pump out of service is any one of them: with at least
one standby installed, ``duty_count`` pumps still run (the standby takes the place of the
one out); without a standby ``duty_count − 1`` run.

With pumps of different models (:attr:`hydraulics.model.Project.other_pumps`) every duty and
assist pump runs for the capacity, in parallel at the manifold (:mod:`hydraulics.pump_set`); the
largest pump is the one delivering most there, and the first standby pump listed takes its
place (:func:`pump_set_capacity`).

Codes (stable, listed with the others in :mod:`hydraulics.checks`):

* ``design_flow_not_met`` (critical): the duty pumps at the maximum speed deliver less
  than the design flow at the worst case; the shortfall is quoted as a flow and a share.
* ``no_standby`` (warning, info when the remaining pumps still meet the design flow):
  no standby pump is installed; the message gives the capacity with one pump out.
* ``standby_short`` (warning): with pumps of different models, the standby in place of the
  largest pump does not restore the design flow.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import TYPE_CHECKING

from hydraulics.model import Arrangement, Project
from hydraulics.number_format import percent_number
from hydraulics.results import CapacityResult, Finding, FindingTarget, OperatingPoint, finding

if TYPE_CHECKING:
    from hydraulics.pump_fit import FittedPump
    from hydraulics.pump_set import SetPump
    from hydraulics.system_curve import SystemHydraulics

WORST_STATIC = "max"
WORST_PIPE = "aged"

SHORTFALL_TOLERANCE = 1e-6
"""A shortfall below this share of the design flow is numerical noise (the duty-point solve
converges to far better than this), not a shortfall."""


def _flow_with(points: Sequence[OperatingPoint], pumps_running: int, speed_ratio: float) -> float:
    """The station flow of ``pumps_running`` pumps at the worst case (0 without pumps or without a point)."""
    if pumps_running < 1:
        return 0.0
    for p in points:
        if (p.static == WORST_STATIC and p.pipe == WORST_PIPE and p.pumps_running == pumps_running
                and p.speed_ratio == speed_ratio):
            return float(p.flow_m3_s) if p.found and p.flow_m3_s is not None else 0.0
    raise ValueError(f"no operating point with {pumps_running} pump(s) at speed ratio {speed_ratio}")


def _shortfall(design_flow_m3_s: float, flow_m3_s: float) -> tuple[float, float]:
    short = design_flow_m3_s - flow_m3_s
    if short <= SHORTFALL_TOLERANCE * design_flow_m3_s:
        return 0.0, 0.0
    return short, short / design_flow_m3_s


def station_capacity(arrangement: Arrangement, design_flow_m3_s: float,
                     points: Sequence[OperatingPoint]) -> CapacityResult:
    """The capacity at the worst case from ``points`` solved at ``arrangement.max_speed_ratio``.

    ``points`` must hold the worst-case points (maximum static, aged pipe) at the maximum
    speed ratio with ``duty_count`` pumps and, without a standby, ``duty_count − 1`` pumps
    (as :func:`hydraulics.operating_points.operating_points` solves 1..N at once).  The flows
    are those re-intersected with the system curve at that speed, never scaled.
    """
    speed = float(arrangement.max_speed_ratio)
    duty, standby = int(arrangement.duty_count), int(arrangement.standby_count)
    design = float(design_flow_m3_s)
    flow_all = _flow_with(points, duty, speed)
    pumps_one_out = duty if standby >= 1 else duty - 1
    flow_one_out = flow_all if pumps_one_out == duty else _flow_with(points, pumps_one_out, speed)
    short_all, share_all = _shortfall(design, flow_all)
    short_out, share_out = _shortfall(design, flow_one_out)
    return CapacityResult(
        design_flow_m3_s=design, static=WORST_STATIC, pipe=WORST_PIPE, speed_ratio=speed,
        duty_count=duty, standby_count=standby,
        flow_all_duty_m3_s=flow_all, shortfall_all_duty_m3_s=short_all, shortfall_all_duty_fraction=share_all,
        pumps_one_out=pumps_one_out, flow_one_out_m3_s=flow_one_out,
        shortfall_one_out_m3_s=short_out, shortfall_one_out_fraction=share_out,
    )


def pump_set_capacity(project: Project, system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump],
                      design_flow_m3_s: float) -> CapacityResult | None:
    """The capacity at the worst case with pumps of different models (``None`` without a run sequence).

    Every duty and assist pump at its highest speed; then the largest out of service, the
    first standby in its place (:func:`hydraulics.pump_set_points.largest_out_set`).
    """
    from hydraulics.pump_set import solve_pump_set, stage_label
    from hydraulics.pump_set_points import largest_out_set

    chosen = largest_out_set(project, system, fitted_by_id)
    if chosen is None:
        return None
    full, out, instead = chosen
    static = system.static_head_m[WORST_STATIC]

    def flow(pumps: Sequence[SetPump]) -> float:
        if not pumps:
            return 0.0
        solved = solve_pump_set(system, fitted_by_id, pumps, static, True)
        return float(solved.flow_m3_s[0]) if solved.found[0] else 0.0

    design = float(design_flow_m3_s)
    flow_all, flow_out = flow(full), flow(instead)
    short_all, share_all = _shortfall(design, flow_all)
    short_out, share_out = _shortfall(design, flow_out)
    standby = sum(1 for p in instead if p.role == "standby")
    speed = max(p.speed_ratio for p in full)
    return CapacityResult(
        design_flow_m3_s=design, static=WORST_STATIC, pipe=WORST_PIPE, speed_ratio=speed,
        duty_count=len(full), standby_count=standby,
        flow_all_duty_m3_s=flow_all, shortfall_all_duty_m3_s=short_all, shortfall_all_duty_fraction=share_all,
        pumps_one_out=len(instead), flow_one_out_m3_s=flow_out,
        shortfall_one_out_m3_s=short_out, shortfall_one_out_fraction=share_out,
        running_all=stage_label(full), pump_out=out.tag, running_one_out=stage_label(instead),
    )


def _pumps(n: int) -> str:
    return "1 pump" if n == 1 else f"{n} pumps"


def capacity_findings(capacity: CapacityResult, where: str, target: FindingTarget | None) -> list[Finding]:
    """The findings of :func:`station_capacity`'s result (codes in the module docstring)."""
    case = (f"at the maximum speed ratio {percent_number(capacity.speed_ratio)} %, maximum static head and aged "
            "pipe")
    out: list[Finding] = []
    all_values = _values(capacity.flow_all_duty_m3_s, capacity.design_flow_m3_s, capacity.shortfall_all_duty_m3_s)
    out_values = _values(capacity.flow_one_out_m3_s, capacity.design_flow_m3_s, capacity.shortfall_one_out_m3_s)
    if not capacity.meets_design:
        out.append(finding(
            "critical", "design_flow_not_met",
            f"With {capacity.running_all or _pumps(capacity.duty_count)} running {case} the station delivers "
            + _short_text(capacity.shortfall_all_duty_fraction), all_values,
            where, "Choose a larger pump, more duty pumps, a higher maximum speed or a larger main.", target))
    if capacity.running_one_out:  # pumps of different models: the standby may not match the pump out
        restored = capacity.flow_one_out_m3_s >= capacity.flow_all_duty_m3_s * (1.0 - SHORTFALL_TOLERANCE)
        if not capacity.meets_design_one_out and not restored:  # else design_flow_not_met says it all
            spare = "no standby in its place" if capacity.standby_count == 0 else "the standby in its place"
            out.append(finding(
                "warning", "standby_short" if capacity.standby_count else "no_standby",
                f"With {capacity.pump_out} out of service and {spare} ({capacity.running_one_out} running {case}) "
                "the station delivers " + _short_text(capacity.shortfall_one_out_fraction), out_values,
                where, "Install a standby pump able to replace the largest pump.", target))
        return out
    if capacity.standby_count >= 1:  # identical pumps: the standby restores the full duty set
        return out
    if capacity.meets_design_one_out:
        out.append(finding(
            "info", "no_standby",
            f"No standby pump is installed; with one pump out of service and {_pumps(capacity.pumps_one_out)} "
            f"running {case} the station still delivers {{q}}, at least the design flow {{design}}.",
            out_values, where, "Keep a spare pump or rotating assembly in store.", target))
        return out
    running = ("no pump is left to run" if capacity.pumps_one_out == 0
               else f"{_pumps(capacity.pumps_one_out)} running {case}")
    out.append(finding(
        "warning", "no_standby",
        f"No standby pump is installed; with one pump out of service and {running} the station delivers "
        + _short_text(capacity.shortfall_one_out_fraction), out_values,
        where, "Install a standby pump able to replace the largest duty pump.", target))
    return out


def _values(flow_m3_s: float, design_m3_s: float, short_m3_s: float) -> dict[str, tuple[float, str]]:
    return {"q": (flow_m3_s, "flow"), "design": (design_m3_s, "flow"), "short": (short_m3_s, "flow")}


def _short_text(fraction: float) -> str:
    """The end of a shortfall message: the flow, the design flow and the shortfall as a share."""
    return f"{{q}}, short of the design flow {{design}} by {{short}} ({percent_number(fraction, 1)} %)."
