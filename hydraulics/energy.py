"""Annual pumping energy and its cost.

Power and energy (SI):

* Hydraulic power P_h = ρ g Q H (W) — the power the pump gives the liquid (definition of
  pump output power, ISO 9906:2012, clause 3).
* Input power P_in = ρ g Q H / (η_pump η_motor η_drive) (W), as computed per operating
  point by :mod:`hydraulics.operating_points`.
* Specific energy E_s = P_in / (3.6 × 10⁶ Q) = ρ g H / (3.6 × 10⁶ η_total) (kWh/m³):
  the energy drawn per cubic metre pumped (1 kWh = 3.6 × 10⁶ J).
* Annual energy from operating hours: E = P_in t_hours / 1000 (kWh); or from the annual
  volume: E = V E_s (kWh).  Cost = E × tariff.

Which scenario is normal operation: the station's water levels move between the two
static extremes in service, so energy is reported at the minimum and at the maximum static
head and the **mean of the two** is taken as the normal annual figure.  The pipe is taken
aged (the condition over most of a main's life; pass ``pipe="new"`` for the first years).
The number of pumps is the smallest count whose flow at maximum static head with aged pipe
reaches the design flow (the pumps a station runs to meet its duty), or the largest count
solved when none does; the speed is that of the first operating point unless given.
When the annual volume is given it takes precedence over operating hours (the station must
pump that volume; the hours follow from the flow).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import overload

import numpy as np
from numpy.typing import ArrayLike

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import EnergyInputs, ModelError
from hydraulics.number_format import fixed_decimals
from hydraulics.results import EnergyResult, FloatArray, OperatingPoint, ScenarioEnergy

__all__ = ["hydraulic_power_w", "specific_energy_kwh_m3", "ScenarioEnergy", "EnergyResult", "annual_energy",
           "HOURS_PER_YEAR_MAX"]

G = STANDARD_GRAVITY_M_S2
JOULES_PER_KWH = 3.6e6
HOURS_PER_YEAR_MAX = 8784.0
"""Hours in a leap year (366 × 24)."""


@overload
def hydraulic_power_w(density_kg_m3: float, flow_m3_s: float, head_m: float, gravity_m_s2: float = G) -> float: ...
@overload
def hydraulic_power_w(density_kg_m3: ArrayLike, flow_m3_s: ArrayLike, head_m: ArrayLike,
                      gravity_m_s2: float = G) -> float | FloatArray: ...
def hydraulic_power_w(density_kg_m3: ArrayLike, flow_m3_s: ArrayLike, head_m: ArrayLike,
                      gravity_m_s2: float = G) -> float | FloatArray:
    """Hydraulic (output) power P_h = ρ g Q H (W).

    >>> round(hydraulic_power_w(1000.0, 0.035, 75.0), 6)  # 1000 × 9.80665 × 0.035 × 75
    25742.45625
    """
    value = (np.asarray(density_kg_m3, dtype=np.float64) * gravity_m_s2 * np.asarray(flow_m3_s, dtype=np.float64)
             * np.asarray(head_m, dtype=np.float64))
    return float(value) if value.ndim == 0 else value


@overload
def specific_energy_kwh_m3(density_kg_m3: float, head_m: float, efficiency: float,
                           gravity_m_s2: float = G) -> float: ...
@overload
def specific_energy_kwh_m3(density_kg_m3: ArrayLike, head_m: ArrayLike, efficiency: ArrayLike,
                           gravity_m_s2: float = G) -> float | FloatArray: ...
def specific_energy_kwh_m3(density_kg_m3: ArrayLike, head_m: ArrayLike, efficiency: ArrayLike,
                           gravity_m_s2: float = G) -> float | FloatArray:
    """Energy per volume pumped E_s = ρ g H / (3.6 × 10⁶ η) (kWh/m³), η the overall efficiency.

    >>> round(specific_energy_kwh_m3(1000.0, 36.0, 0.5), 9)  # 1000 × 9.80665 × 36 / (3.6e6 × 0.5)
    0.196133
    """
    value = np.asarray(density_kg_m3, dtype=np.float64) * gravity_m_s2 * np.asarray(head_m, dtype=np.float64) / (
        JOULES_PER_KWH * np.asarray(efficiency, dtype=np.float64))
    return float(value) if value.ndim == 0 else value


def _choose_pumps(points: Sequence[OperatingPoint], pipe: str, speed: float,
                  design_flow_m3_s: float | None) -> int | None:
    counts = sorted({p.pumps_running for p in points})
    if not counts:
        return None
    if design_flow_m3_s is not None:
        for n in counts:
            for p in points:
                if (p.pumps_running == n and p.static == "max" and p.pipe == pipe and p.found
                        and abs(p.speed_ratio - speed) <= 1e-9 and p.flow_m3_s is not None
                        and p.flow_m3_s >= design_flow_m3_s * (1 - 1e-9)):
                    return n
    return counts[-1]


def annual_energy(points: Sequence[OperatingPoint], energy_inputs: EnergyInputs,
                  design_flow_m3_s: float | None = None, *,
                  pipe: str = "aged", pumps_running: int | None = None,
                  speed_ratio: float | None = None) -> EnergyResult:
    """Annual energy and cost at both static extremes and their mean (see the module description).

    Parameters
    ----------
    points : sequence of OperatingPoint
        From :func:`hydraulics.operating_points.operating_points`.
    energy_inputs : EnergyInputs
        Operating hours per year or annual volume, tariff and currency.
    design_flow_m3_s : float, optional
        Chooses the number of pumps running (see the module description).
    pipe, pumps_running, speed_ratio
        Override the choice of the normal-operation scenario.
    """
    hours_in = energy_inputs.operating_hours_per_year
    volume_in = energy_inputs.annual_volume_m3
    tariff = float(energy_inputs.tariff_per_kwh)
    for name, value in (("operating_hours_per_year", hours_in), ("annual_volume_m3", volume_in)):
        if value is not None and not (math.isfinite(value) and value >= 0.0):
            raise ModelError(f"energy.{name}", "must be zero or a positive number", value)
    notes: list[str] = []
    basis = "annual_volume" if volume_in is not None else ("operating_hours" if hours_in is not None else None)
    if basis is None:
        notes.append("no operating hours or annual volume given; annual energy not computed")

    speed = float(speed_ratio) if speed_ratio is not None else (float(points[0].speed_ratio) if points else None)
    n = pumps_running if pumps_running is not None else (
        _choose_pumps(points, pipe, speed, design_flow_m3_s) if speed is not None else None)

    def scenario(static: str, n: int) -> ScenarioEnergy | None:
        # speed is None only when there are no points, so the match below is then empty
        match = [p for p in points if p.static == static and p.pipe == pipe and p.pumps_running == n
                 and speed is not None and abs(p.speed_ratio - speed) <= 1e-9]
        if not match:
            notes.append(f"no operating point solved for {static} static, {pipe} pipe, {n} pump(s)")
            return None
        point = match[0]
        if not point.found:
            # the gist of the reason only: its bracketed detail quotes heads in SI, and the
            # operating points show it in the display units
            gist = (point.reason or "not found").split(" (")[0]
            notes.append(f"no operating point at {static} static, {pipe} pipe with {n} pump(s): {gist}")
            return None
        q, head, p_in, e_s = point.flow_m3_s, point.head_m, point.input_power_w, point.specific_energy_kwh_m3
        if q is None or head is None:  # a found point always has both; kept for the type
            notes.append(f"no flow or head at {static} static, {pipe} pipe with {n} pump(s)")
            return None
        if p_in is None or e_s is None:
            notes.append(f"power unknown at {static} static (the pump has no efficiency or power data)")
            return None
        if volume_in is not None:  # basis "annual_volume"
            volume = float(volume_in)
            hours = volume / (q * 3600.0)
            energy = volume * e_s
            if hours > HOURS_PER_YEAR_MAX:
                notes.append(f"at {static} static the annual volume needs {fixed_decimals(hours, 0)} h, "
                             "more than a year has")
        elif hours_in is not None:  # basis "operating_hours"
            hours = float(hours_in)
            volume = q * 3600.0 * hours
            energy = p_in * hours / 1000.0
        else:  # no basis: noted above
            return None
        return ScenarioEnergy(
            static=static, pipe=pipe, pumps_running=int(n), speed_ratio=float(point.speed_ratio),
            flow_m3_s=q, head_m=head, input_power_w=p_in, specific_energy_kwh_m3=e_s,
            operating_hours_per_year=hours, annual_volume_m3=volume, annual_energy_kwh=energy,
            annual_cost=energy * tariff,
        )

    low = scenario("min", n) if n is not None else None
    high = scenario("max", n) if n is not None else None
    means: tuple[float | None, float | None, float | None, float | None] = (None, None, None, None)
    if low is not None and high is not None:
        means = ((low.input_power_w + high.input_power_w) / 2.0,
                 (low.specific_energy_kwh_m3 + high.specific_energy_kwh_m3) / 2.0,
                 (low.annual_energy_kwh + high.annual_energy_kwh) / 2.0,
                 (low.annual_cost + high.annual_cost) / 2.0)
    return EnergyResult(
        basis=basis, pipe=pipe, pumps_running=n, speed_ratio=speed, tariff_per_kwh=tariff,
        currency=energy_inputs.currency, at_min_static=low, at_max_static=high,
        input_power_mean_w=means[0], specific_energy_mean_kwh_m3=means[1],
        annual_energy_mean_kwh=means[2], annual_cost_mean=means[3],
        notes=tuple(notes),
    )
