"""The machine-readable results (``pumpsketch solve FILE --json``), all in SI.

Top-level keys (a contract: later versions add keys, never rename these):
``format`` ("pumpsketch-results"), ``version``, ``project``, ``cautions``, ``fluid``,
``atmospheric_pressure_pa``, ``static_head_m`` (``min``, ``max``), ``design_flow_m3_s``,
``system_curves``, ``segments``, ``findings``, ``pumps``, ``operating_points``,
``variable_speed``, ``energy``; since the station pipework roles: ``branches``; since the
main's profile: ``profile`` and ``control_point``; since the specific speeds: each entry of
``pumps`` has ``specific_speed`` (:class:`hydraulics.results.PumpSpecificSpeeds`, ``None``
without a best-efficiency point), and ``npsh_worst_case`` is the conservative NPSH case
(the highest per-pump flow with the lowest suction level and aged suction pipe;
:class:`hydraulics.results.NpshWorstCase`, ``None`` without NPSH data).  Each operating
point's ``npsh_available_m`` is at its own scenario's suction level (the highest suction
level at minimum static head, the lowest at maximum static head).
Since the checks at every speed: ``capacity`` and ``speed_points``.  Since the duty profile:
``duty_profile``.

``capacity`` (``None`` without a pump) is the station's flow at the worst case (maximum
static, aged pipe, the drive's maximum speed) against the design flow, with every duty pump
and with the largest pump out of service, and the shortfalls as flows and shares of the
design flow (:class:`hydraulics.results.CapacityResult`).  ``speed_points`` lists every
operating point the checks saw — at the arrangement's speed, the drive's minimum and
maximum speeds and the speeds found for the design flow — each an operating point's keys
plus ``basis`` (why it was solved) and ``findings`` (the codes of its point checks).
Since the motor check: ``motor``.  Since dissimilar pumps: ``pump_set`` (``None`` without a
pump; :class:`hydraulics.results.PumpSetResult`): ``pumps`` lists every installed pump (tag
P1…, model, role, speed control), ``stages`` the tags running at each stage of the run
sequence (stage k of the arrangement's identical pumps is the operating points' ``pumps_running``
= k), and ``points`` the operating points of sets with pumps of other models and of the set
with the largest pump out of service, each with the manifold head and, per running pump
(``pumps``), its flow, head, efficiency, powers and NPSH.

``energy`` is the simple estimate: all operating hours at the duty point
(:class:`hydraulics.results.EnergyResult`).  ``duty_profile`` (``None`` without duty bands or
without a pump) is the energy over a year of real duty: per band (``bands``) the flow, hours,
the pumps running (``pumps``, e.g. ``"P1+P2"``), ``control``, ``speed_ratio``, the station flow,
manifold head, wire-to-water efficiency, input power and specific energy while running, the
run hours, pumped and short volumes, energy and cost; the stages' flows at their own speeds;
and the totals per year (``energy_kwh``, ``cost``, ``volume_m3``, ``specific_energy_kwh_m3``,
``run_hours``, ``shortfall_volume_m3``), at the mean static head with the profile's pipe state
(:class:`hydraulics.results.DutyProfileResult`).

``segments`` lists every segment at the design flow with the duty pumps running (each entry
also says what it ``carries`` and its ``flow_m3_s``); ``branches`` lists the segments of
each pump's own branch again, per pump: ``flow_m3_s`` is the flow of one of
``pumps_running`` pumps sharing the design flow (empty without pump branches).  Each pump
curve gives ``head_at_manifold_m``/``head_at_manifold_aged_m`` (``None`` without branches).

``profile`` is ``None`` without a profile, else the chainages, pipe elevations, vented
chainages and, per scenario (each operating point at the arrangement's speed, then at rest),
the grade line and the gauge pressure head along the main, with its governing control
(:meth:`hydraulics.main_profile.ProfileResult.to_json_dict`).  ``control_point`` says what
governs the system head: ``operating_points`` (one entry per operating point, in their
order: ``"delivery"`` or ``"crest at 1900 m"``, with ``chainage_m`` ``None`` for the
delivery) and ``system_curves`` (per curve, ``chainage_m`` at each flow of the curve,
``None`` where the delivery governs).
"""

from __future__ import annotations

import math
from typing import Protocol

import numpy as np

from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.results import SegmentResult, Solution


class SupportsJsonDict(Protocol):
    """A result that writes itself as a JSON-ready dictionary."""

    def to_json_dict(self) -> dict[str, object]: ...


RESULTS_FORMAT = "pumpsketch-results"
RESULTS_VERSION = 1


def _clean(value: object) -> object:
    """JSON-safe: numpy to Python, NaN/inf to None, tuples to lists."""
    if isinstance(value, dict):
        return {k: _clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(v) for v in value]
    if isinstance(value, np.ndarray):
        return [_clean(v) for v in value.tolist()]
    if isinstance(value, (np.floating, float)):
        f = float(value)
        return f if math.isfinite(f) else None
    if isinstance(value, np.integer):
        return int(value)
    if isinstance(value, np.bool_):
        return bool(value)
    return value


def _to_dict(obj: SupportsJsonDict | None) -> object:
    return None if obj is None else obj.to_json_dict()


def _segment_dict(s: SegmentResult) -> dict[str, object]:
    """One row of the segment table (a branch row at the flow of one pump)."""
    return {"name": s.name, "side": s.side, "length_m": s.length_m,
            "internal_diameter_m": s.internal_diameter_m, "roughness_m": s.roughness_m,
            "parallel_pipes": s.parallel_pipes, "velocity_m_s": s.velocity_m_s,
            "reynolds": s.reynolds, "friction_factor": s.friction_factor, "regime": s.regime,
            "friction_loss_m": s.friction_loss_m, "minor_k_total": s.minor_k_total,
            "minor_loss_m": s.minor_loss_m, "carries": s.carries, "flow_m3_s": s.flow_m3_s}


def _control_points(solution: Solution) -> dict[str, object]:
    """What governs the system head at each operating point and along each system curve."""
    return {
        "operating_points": [
            {"static": p.static, "pipe": p.pipe, "pumps_running": p.pumps_running, "speed_ratio": p.speed_ratio,
             "control": p.control, "chainage_m": p.control_chainage_m} for p in solution.operating_points],
        "system_curves": [
            {"static": c.static, "pipe": c.pipe,
             "chainage_m": [None] * len(c.flow_m3_s) if c.control_chainage_m is None else c.control_chainage_m}
            for c in solution.curves],
    }


def _pump_dict(solution: Solution, index: int) -> dict[str, object]:
    """One fitted pump with its specific speeds (``specific_speed``: ``None`` when unknown)."""
    speeds = solution.specific_speeds[index] if index < len(solution.specific_speeds) else None
    return {**solution.pump_fits[index].to_json_dict(), "specific_speed": _to_dict(speeds)}


def solution_to_json_dict(solution: Solution) -> dict[str, object]:
    """The results dictionary of one solved project."""
    fluid = solution.fluid
    data: dict[str, object] = {
        "format": RESULTS_FORMAT,
        "version": RESULTS_VERSION,
        "project": solution.project.name,
        "cautions": CAUTIONS_TEXT,
        "fluid": {
            "description": fluid.description,
            "temperature_c": fluid.temperature_c,
            "density_kg_m3": fluid.density_kg_m3,
            "kinematic_viscosity_m2_s": fluid.kinematic_viscosity_m2_s,
            "vapour_pressure_pa": fluid.vapour_pressure_pa,
        },
        "atmospheric_pressure_pa": solution.atmospheric_pressure_pa,
        "static_head_m": {"min": solution.static_head_min_m, "max": solution.static_head_max_m},
        "design_flow_m3_s": solution.design_flow_m3_s,
        "friction_method": solution.project.friction_method,
        "system_curves": [
            {"static": c.static, "pipe": c.pipe, "flow_m3_s": c.flow_m3_s, "head_m": c.head_m,
             "static_m": c.static_m, "friction_m": c.friction_m, "minor_m": c.minor_m}
            for c in solution.curves
        ],
        "segments": [_segment_dict(s) for s in solution.segments],
        "findings": [
            {"severity": f.severity, "code": f.code, "message": f.message, "where": f.where,
             "remedy": f.remedy}
            for f in solution.findings
        ],
        "pumps": [_pump_dict(solution, i) for i in range(len(solution.pump_fits))],
        "operating_points": [_to_dict(p) for p in solution.operating_points],
        "variable_speed": _to_dict(solution.variable_speed),
        "energy": _to_dict(solution.energy),
        "branches": [{**_segment_dict(s), "pumps_running": s.pumps_running}
                     for s in solution.segments if s.carries == "pump"],
        "profile": _to_dict(solution.profile),
        "control_point": _control_points(solution),
        "npsh_worst_case": _to_dict(solution.npsh_worst_case),
        "capacity": _to_dict(solution.capacity),
        "speed_points": [p.to_json_dict() for p in solution.speed_points],
        "motor": _to_dict(solution.motor),
        "pump_set": _to_dict(solution.pump_set),
        "duty_profile": _to_dict(solution.duty_profile),
    }
    return {key: _clean(value) for key, value in data.items()}
