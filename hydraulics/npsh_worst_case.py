"""The conservative NPSH case: the highest flow put together with the lowest suction level.

Each operating point's NPSH available is taken at its own scenario's suction level (the
minimum static head belongs to the highest suction level, the maximum to the lowest;
:func:`hydraulics.system_curve.static_heads`).  A pump often runs furthest out on its
curve — where NPSH required is highest — at the minimum static head, that is with the
suction level highest.  The conservative case stated here combines the highest per-pump
flow of any scenario with the lowest suction level and the aged suction pipe, whether or
not the levels can coincide in operation (NPSH available by the energy equation of
:func:`hydraulics.operating_points.npsh_available`; margin rule as in the checks:
NPSH_A ≥ max(ratio × NPSH_R, NPSH_R + least margin), after ANSI/HI 9.6.1).

Finding code raised here (stable):

========================  =========================================================
``npsh_worst_case_low``   the conservative case (highest flow, lowest level) has less
                          NPSH available than the criteria ask for (warning)
========================  =========================================================
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from hydraulics.model import Criteria, Project
from hydraulics.number_format import fixed_decimals, percent_number
from hydraulics.results import Finding, NpshWorstCase, OperatingPoint, finding
from hydraulics.system_curve import SystemHydraulics

__all__ = ["npsh_worst_case", "npsh_worst_case_findings", "required_npsh_available"]


def required_npsh_available(npsh_required_m: float, criteria: Criteria) -> float:
    """NPSH available the criteria ask for: max(ratio × NPSH_R, NPSH_R + least margin) (m)."""
    return max(criteria.npsh_margin_ratio * npsh_required_m, npsh_required_m + criteria.npsh_margin_min_m)


def npsh_worst_case(system: SystemHydraulics, points: Sequence[OperatingPoint], npsh_static_lowest_m: float,
                    suction_level_lowest_m: float, criteria: Criteria) -> NpshWorstCase | None:
    """The conservative NPSH case over ``points`` (``None`` without a found point with NPSH required).

    ``npsh_static_lowest_m`` is (p_atm − p_v)/(ρ g) + (lowest suction level − pump datum);
    the aged suction loss at the chosen point's station flow and pumps running is taken off.
    The point is the found one with the highest per-pump flow (NPSH required rises with flow).
    """
    usable = [p for p in points if p.found and p.flow_per_pump_m3_s is not None and p.flow_m3_s is not None
              and p.npsh_required_m is not None and math.isfinite(p.npsh_required_m)]
    if not usable:
        return None
    top = max(usable, key=lambda p: float(p.flow_per_pump_m3_s or 0.0))
    q = float(top.flow_m3_s or 0.0)
    loss = float(np.asarray(system.suction_loss(np.array([q]), np.array([True]),
                                                np.array([float(top.pumps_running)])), dtype=float)[0])
    available = float(npsh_static_lowest_m) - loss
    required = float(top.npsh_required_m or 0.0)
    need = required_npsh_available(required, criteria)
    return NpshWorstCase(
        static=top.static, pipe=top.pipe, pumps_running=top.pumps_running, speed_ratio=top.speed_ratio,
        flow_m3_s=q, flow_per_pump_m3_s=float(top.flow_per_pump_m3_s or 0.0),
        suction_level_m=float(suction_level_lowest_m), npsh_available_m=available, npsh_required_m=required,
        npsh_margin_m=available - required, npsh_margin_ratio=available / required if required > 0.0 else math.nan,
        required_available_m=need, sufficient=available >= need,
    )


def npsh_worst_case_findings(project: Project, worst: NpshWorstCase | None) -> list[Finding]:
    """A warning when the conservative case has less NPSH available than the criteria ask for."""
    if worst is None or worst.sufficient:
        return []
    n = worst.pumps_running
    pumps = "1 pump" if n == 1 else f"{n} pumps"
    speed = "" if abs(worst.speed_ratio - 1.0) < 1e-9 else f" at {percent_number(worst.speed_ratio)} % speed"
    ratio = fixed_decimals(worst.npsh_margin_ratio, 2) if math.isfinite(worst.npsh_margin_ratio) else "—"
    pump = project.duty_pump
    return [finding(
        "warning", "npsh_worst_case_low",
        "Conservative case (the highest flow, {q} per pump with " + pumps + speed + ", taken with the lowest "
        "suction level {level} and aged suction pipe): NPSH available {a} against NPSH required {r} "
        "(ratio " + ratio + "); the criteria ask for {need}. The scenarios themselves are checked at their "
        "own suction levels.",
        {"q": (worst.flow_per_pump_m3_s, "flow"), "level": (worst.suction_level_m, "elevation"),
         "a": (worst.npsh_available_m, "head"), "r": (worst.npsh_required_m, "head"),
         "need": (worst.required_available_m, "head")},
        "pump '" + (pump.name if pump is not None else "") + "', highest flow at the lowest suction level",
        "Check whether the highest flow can occur with the suction level lowest; if so, lower the pump, "
        "raise the minimum suction level or limit the flow.",
        ("pump", pump.pump_id) if pump is not None else None)]
