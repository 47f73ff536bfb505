"""The motor against the pump's shaft power: overload, non-overloading size, drive efficiency.

Per pump, the shaft power of the pump (affinity laws, P = c³ P_rated(Q / c) with c = s · t; see
:mod:`hydraulics.pump_arrangement`) is taken

* at every solved operating point (every speed the checks see);
* over the allowable operating region (its bounds as fractions of best-efficiency flow, from the
  criteria) at the arrangement's speed and at the maximum speed;
* to the end of the pump curve (run-out: the whole range of the pump data) at both speeds.

A motor is *non-overloading* when its rating covers the shaft power to the end of the curve
(common practice: the pump can then run out on any system without tripping the motor).  The
service factor is a margin for occasional overload, not for continuous duty at the operating
points, so the overload check uses rating × service factor, the non-overloading check the rating
(common practice, after NEMA MG 1 on service factor).

Input power uses the motor and drive efficiencies as given (:mod:`hydraulics.operating_points`);
a variable-speed pump with a drive efficiency of 100 % is flagged: a drive has losses.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from hydraulics.model import DEFAULT_DRIVE_EFFICIENCY, Arrangement, Criteria
from hydraulics.number_format import percent_number
from hydraulics.pump_fit import FittedPump
from hydraulics.results import Finding, FindingTarget, MotorResult, OperatingPoint, finding

__all__ = ["IEC_MOTOR_OUTPUTS_KW", "next_standard_motor_w", "motor_check", "pump_motor_check", "motor_findings"]

IEC_MOTOR_OUTPUTS_KW: tuple[float, ...] = (
    0.06, 0.09, 0.12, 0.18, 0.25, 0.37, 0.55, 0.75, 1.1, 1.5, 2.2, 3.0, 4.0, 5.5, 7.5, 11.0, 15.0,
    18.5, 22.0, 30.0, 37.0, 45.0, 55.0, 75.0, 90.0, 110.0, 132.0, 160.0, 200.0, 250.0, 315.0, 355.0,
    400.0, 450.0, 500.0, 560.0, 630.0, 710.0, 800.0, 900.0, 1000.0,
)
"""Standard rated outputs of motors, kW: IEC 60072-1 (the preferred output series; from memory; verify)."""

_GRID = 201
"""Flows per curve at which the shaft power is evaluated (rated-speed flow range, evenly spaced)."""


def next_standard_motor_w(power_w: float) -> float | None:
    """The smallest output of :data:`IEC_MOTOR_OUTPUTS_KW` not below ``power_w`` (W); None above the series.

    >>> next_standard_motor_w(31_000.0)
    37000.0
    >>> next_standard_motor_w(30_000.0)
    30000.0
    """
    for kw in IEC_MOTOR_OUTPUTS_KW:
        if kw * 1000.0 >= power_w * (1.0 - 1e-12):
            return kw * 1000.0
    return None


def _max_power(fitted: FittedPump, scale: float, low_m3_s: float, high_m3_s: float) -> float | None:
    """Largest c³ P_rated(q) for rated-speed flows q in [low, high] (affinity laws); None if unknown."""
    if not high_m3_s > low_m3_s:
        return None
    power = fitted.shaft_power(np.linspace(low_m3_s, high_m3_s, _GRID))
    if not np.any(np.isfinite(power)):
        return None
    return float(scale**3 * np.nanmax(power))


def motor_check(fitted: FittedPump, arrangement: Arrangement, criteria: Criteria,
                points: Sequence[OperatingPoint], more_shaft_powers_w: Sequence[float] = ()) -> MotorResult:
    """Shaft power per pump at ``points``, over the allowable region and to run-out, against the motor.

    ``more_shaft_powers_w``: the shaft power of one of these pumps at other solved points (running
    beside pumps of other models, :mod:`hydraulics.pump_set_points`).
    """
    at_points = [p.shaft_power_w for p in points if p.found and p.shaft_power_w is not None]
    return pump_motor_check(
        fitted, criteria, at_points + list(more_shaft_powers_w), trim_ratio=arrangement.trim_ratio,
        speed_ratio=arrangement.speed_ratio, max_speed_ratio=arrangement.max_speed_ratio,
        rating_w=arrangement.motor_rating_w, service_factor=arrangement.service_factor,
        motor_efficiency=arrangement.motor_efficiency, drive_efficiency=arrangement.drive_efficiency,
        variable_speed=arrangement.variable_speed)


def pump_motor_check(fitted: FittedPump, criteria: Criteria, shaft_powers_w: Sequence[float], *, trim_ratio: float,
                     speed_ratio: float, max_speed_ratio: float, rating_w: float | None, service_factor: float,
                     motor_efficiency: float, drive_efficiency: float, variable_speed: bool) -> MotorResult:
    """The motor check of one pump (module description) from its shaft powers at the solved points."""
    t = float(trim_ratio)
    own, top = float(speed_ratio), float(max_speed_ratio)
    at_points = [p for p in shaft_powers_w if math.isfinite(p)]
    allowable: list[float | None] = [None, None]
    if fitted.bep_flow_m3_s is not None:
        low = max(criteria.allowable_region_low * fitted.bep_flow_m3_s, fitted.flow_min_m3_s)
        high = min(criteria.allowable_region_high * fitted.bep_flow_m3_s, fitted.flow_max_m3_s)
        allowable = [_max_power(fitted, s * t, low, high) for s in (own, top)]
    run_out = [_max_power(fitted, s * t, fitted.flow_min_m3_s, fitted.flow_max_m3_s) for s in (own, top)]
    worst_run_out = max((p for p in run_out if p is not None), default=None)
    return MotorResult(
        rating_w=rating_w, service_factor=float(service_factor),
        rating_with_service_factor_w=None if rating_w is None else rating_w * service_factor,
        speed_ratio=own, max_speed_ratio=top,
        max_shaft_power_at_points_w=max(at_points, default=None),
        max_shaft_power_allowable_w=allowable[0], max_shaft_power_allowable_at_max_speed_w=allowable[1],
        max_shaft_power_run_out_w=run_out[0], max_shaft_power_run_out_at_max_speed_w=run_out[1],
        non_overloading_size_w=None if worst_run_out is None else next_standard_motor_w(worst_run_out),
        motor_efficiency=float(motor_efficiency), drive_efficiency=float(drive_efficiency),
        variable_speed=bool(variable_speed),
    )


def motor_findings(motor: MotorResult, where: str, target: FindingTarget) -> list[Finding]:
    """Findings ``motor_overload`` (critical), ``motor_not_non_overloading`` (warning) and
    ``drive_efficiency_not_given`` (warning)."""
    out: list[Finding] = []
    if motor.variable_speed and motor.drive_efficiency >= 1.0:
        out.append(Finding(
            "warning", "drive_efficiency_not_given",
            "Variable speed with a drive efficiency of 100 %: a drive has losses, so the input power is understated.",
            where, f"Give the drive's efficiency (about {percent_number(DEFAULT_DRIVE_EFFICIENCY)} % at full load "
            "is common practice).", target))
    rating, with_sf = motor.rating_w, motor.rating_with_service_factor_w
    if rating is None or with_sf is None:
        return out
    peak = motor.max_shaft_power_at_points_w
    if peak is not None and peak > with_sf:
        out.append(finding(
            "critical", "motor_overload",
            "Shaft power {p} per pump at an operating point exceeds the motor rating {r} × service factor "
            f"{motor.service_factor:g} = {{sf}}.",
            {"p": (peak, "power"), "r": (rating, "power"), "sf": (with_sf, "power")}, where,
            "Choose a larger motor or limit the speed or the operating range.", target))
    run_out = max((p for p in (motor.max_shaft_power_run_out_w, motor.max_shaft_power_run_out_at_max_speed_w)
                   if p is not None), default=None)
    if run_out is not None and run_out > rating:
        size = motor.non_overloading_size_w
        more = {"n": (size, "power")} if size is not None else {}
        out.append(finding(
            "warning", "motor_not_non_overloading",
            "Not non-overloading: the shaft power to the end of the pump curve, {p} per pump, exceeds the motor "
            "rating {r}" + ("; a non-overloading motor is {n} (IEC 60072-1 series)." if size is not None else "."),
            {"p": (run_out, "power"), "r": (rating, "power"), **more}, where,
            "A motor that covers the run-out power cannot be overloaded whatever the system does.", target))
    return out
