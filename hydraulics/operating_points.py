"""Operating points of a station: every static extreme × pipe state × pumps running × speed.

:func:`operating_points` lays out the scenario grid, solves every duty point in one
vectorised pass (:func:`hydraulics.duty_point.solve_duty_points`), then evaluates power,
specific energy, NPSH and velocities for all scenarios at once.  Each result is an
:class:`OperatingPoint` of plain floats, ints, strings, booleans and ``None`` (unknown),
ready for JSON through :meth:`OperatingPoint.to_json_dict`.

Formulas (SI):

* Hydraulic power P_h = ρ g Q H (definition of pump output power; ISO 9906:2012,
  clause 3), shaft power per pump from the fitted curves through the affinity laws
  (:mod:`hydraulics.pump_arrangement`), input power P_in = P_shaft,total / (η_motor η_drive).
* Specific energy E_s = P_in / (3.6 × 10⁶ Q) in kWh/m³ (energy per volume pumped;
  with P_in = ρ g Q H / η_total this is ρ g H / (3.6 × 10⁶ η_total)).
* NPSH available, see :func:`npsh_available`.
* Best-efficiency flow ratio = per-pump flow / (s t Q_BEP), the best-efficiency flow moving
  with speed and trim by the affinity laws.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import overload

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.duty_point import DEFAULT_EXTENSION, solve_duty_points
from hydraulics.model import Arrangement, ModelError
from hydraulics.pump_arrangement import arrangement_performance
from hydraulics.pump_fit import FittedPump
from hydraulics.results import FloatArray, OperatingPoint, control_label
from hydraulics.system_curve import SystemHydraulics

__all__ = ["npsh_available", "OperatingPoint", "ScenarioGrid", "scenario_grid", "operating_points",
           "STATIC_CASES", "PIPE_STATES"]

G = STANDARD_GRAVITY_M_S2
STATIC_CASES: tuple[str, ...] = ("min", "max")
PIPE_STATES: tuple[str, ...] = ("new", "aged")
_JOULES_PER_KWH = 3.6e6


@overload
def npsh_available(atmospheric_pressure_pa: float, vapour_pressure_pa: float, density_kg_m3: float,
                   suction_level_m: float, pump_datum_m: float, suction_loss_m: float,
                   gravity_m_s2: float = G) -> float: ...
@overload
def npsh_available(atmospheric_pressure_pa: ArrayLike, vapour_pressure_pa: ArrayLike, density_kg_m3: ArrayLike,
                   suction_level_m: ArrayLike, pump_datum_m: ArrayLike, suction_loss_m: ArrayLike,
                   gravity_m_s2: float = G) -> float | FloatArray: ...
def npsh_available(atmospheric_pressure_pa: ArrayLike, vapour_pressure_pa: ArrayLike, density_kg_m3: ArrayLike,
                   suction_level_m: ArrayLike, pump_datum_m: ArrayLike, suction_loss_m: ArrayLike,
                   gravity_m_s2: float = G) -> float | FloatArray:
    """Net positive suction head available at the pump (m) from an open suction tank or sump.

    NPSH_A = (p_atm − p_v) / (ρ g) + (z_suction − z_pump) − h_loss,suction

    The energy equation from the free surface of an open suction tank (at rest, at
    atmospheric pressure) to the pump's suction reference plane, less the vapour pressure
    head (Karassik et al., *Pump Handbook*, 4th ed., ch. on NPSH; definition of NPSH in
    ISO 9906:2012 and ISO 17769-1).  Use the suction level of the case considered (the
    lowest for the conservative case) and the suction losses at the flow of interest.

    Parameters
    ----------
    atmospheric_pressure_pa : float
        Absolute pressure on the liquid surface (Pa).
    vapour_pressure_pa : float
        Vapour pressure of the liquid at the pumping temperature (Pa, absolute).
    density_kg_m3 : float
        Liquid density (kg/m³).
    suction_level_m, pump_datum_m : float
        Elevations of the liquid surface and of the pump's NPSH reference plane (impeller
        eye / suction centreline) above one datum (m).  A level below the datum (suction
        lift) reduces NPSH_A.
    suction_loss_m : float or ndarray
        Friction and minor losses of the suction pipework at the flow considered (m).

    Example (hand calculation): sea-level standard atmosphere, water at 20 °C
    (p_v = 2339 Pa, ρ = 998.2 kg/m³), surface 1.5 m above the pump, 0.4 m suction loss:
    (101325 − 2339)/(998.2 × 9.80665) + 1.5 − 0.4 = 10.112 + 1.1 = 11.212 m.

    >>> round(npsh_available(101325.0, 2339.0, 998.2, 1.5, 0.0, 0.4), 3)
    11.212
    """
    value = ((np.asarray(atmospheric_pressure_pa, dtype=np.float64) - np.asarray(vapour_pressure_pa, dtype=np.float64))
             / (np.asarray(density_kg_m3, dtype=np.float64) * gravity_m_s2)
             + (np.asarray(suction_level_m, dtype=np.float64) - np.asarray(pump_datum_m, dtype=np.float64))
             - np.asarray(suction_loss_m, dtype=np.float64))
    return float(value) if value.ndim == 0 else value


@dataclass(frozen=True, eq=False)
class ScenarioGrid:
    """Flattened scenario arrays, in the order static × pipe × pumps running × speed."""

    static: tuple[str, ...]
    pipe: tuple[str, ...]
    static_head_m: FloatArray
    aged: NDArray[np.bool_]
    pumps_running: FloatArray
    speed_ratio: FloatArray

    @property
    def size(self) -> int:
        return len(self.static)


def scenario_grid(static_head_m: Mapping[str, float], duty_count: int,
                  speed_ratios: Sequence[float]) -> ScenarioGrid:
    """All scenarios for the static extremes, pipe states, 1..``duty_count`` pumps and speeds."""
    statics: list[str] = []
    pipes: list[str] = []
    heads: list[float] = []
    aged: list[bool] = []
    pumps: list[int] = []
    speeds: list[float] = []
    for static in STATIC_CASES:
        for pipe in PIPE_STATES:
            for n in range(1, duty_count + 1):
                for s in speed_ratios:
                    statics.append(static)
                    pipes.append(pipe)
                    heads.append(float(static_head_m[static]))
                    aged.append(pipe == "aged")
                    pumps.append(n)
                    speeds.append(float(s))
    return ScenarioGrid(static=tuple(statics), pipe=tuple(pipes), static_head_m=np.array(heads),
                        aged=np.array(aged, dtype=bool), pumps_running=np.array(pumps, dtype=float),
                        speed_ratio=np.array(speeds))


def _optional(values: FloatArray, ok: NDArray[np.bool_]) -> list[float | None]:
    """Python floats, ``None`` where not ``ok`` or not finite."""
    good = ok & np.isfinite(values)
    return [v if g else None for v, g in zip(values.tolist(), good.tolist(), strict=True)]


def _controls(system: SystemHydraulics, q: FloatArray, grid: ScenarioGrid,
              found: NDArray[np.bool_]) -> list[float | None]:
    """Chainage of the vented summit that governs each found point (``None``: the delivery governs).

    Only a system with crest terms can have a summit govern (see
    :meth:`hydraulics.system_curve.SystemHydraulics.control_chainage`).
    """
    if getattr(system, "crest", None) is None:
        return [None] * grid.size
    chainage = system.control_chainage(q, grid.static_head_m, grid.aged)
    return [None if not ok or math.isnan(x) else x for x, ok in zip(chainage.tolist(), found.tolist(), strict=True)]


def operating_points(system: SystemHydraulics, fitted: FittedPump, arrangement: Arrangement,
                     npsh_static_head_m: float | Mapping[str, float] | None,
                     density_kg_m3: float, speed_ratios: Sequence[float] | None = None,
                     extension: float = DEFAULT_EXTENSION) -> tuple[OperatingPoint, ...]:
    """Operating points for every static extreme × pipe state × pumps running × speed.

    Parameters
    ----------
    system
        A :class:`hydraulics.system_curve.SystemHydraulics` (or any object with its
        ``static_head_m``, ``head``, ``suction_loss`` and ``segment_velocities``, each
        taking the pumps running as last argument).
    fitted : FittedPump
    arrangement : Arrangement
        Duty pumps (1..``duty_count`` are solved), series stages, trim, motor and drive
        efficiencies; its ``speed_ratio`` is the speed unless ``speed_ratios`` is given.
    npsh_static_head_m : float, mapping or None
        (p_atm − p_v)/(ρ g) + (suction level − pump datum) (m); the suction loss at each
        flow is subtracted here.  A mapping gives it per static extreme (``"min"``: at the
        highest suction level, ``"max"``: at the lowest; see
        :func:`hydraulics.system_curve.static_heads`), so each scenario's NPSH available is
        at its own suction level; one float applies to every scenario.  ``None`` leaves the
        NPSH fields ``None``.
    density_kg_m3 : float
        Fluid density (kg/m³) for the hydraulic power.
    speed_ratios : sequence of float, optional
        Speeds n / n_rated to solve; default ``(arrangement.speed_ratio,)``.

    Returns
    -------
    tuple of OperatingPoint
        In the order static ("min", "max") × pipe ("new", "aged") × pumps 1..N × speed.
    """
    speeds = (arrangement.speed_ratio,) if speed_ratios is None else tuple(speed_ratios)
    for speed in speeds:
        if not (isinstance(speed, (int, float, np.floating)) and math.isfinite(speed) and speed > 0):
            raise ModelError("arrangement.speed_ratio", "every speed ratio must be a positive number", speed)
    if arrangement.duty_count < 1:
        raise ModelError("arrangement.duty_count", "at least one duty pump", arrangement.duty_count)
    grid = scenario_grid(system.static_head_m, int(arrangement.duty_count), speeds)
    stages, trim = int(arrangement.series_stages), float(arrangement.trim_ratio)
    n, s = grid.pumps_running, grid.speed_ratio

    duty = solve_duty_points(system, fitted, n, stages, s, trim, grid.static_head_m, grid.aged, extension=extension)
    found = duty.found
    q = np.where(found, duty.flow_m3_s, 0.0)
    perf = arrangement_performance(fitted, q, n, stages, s, trim)
    head = np.where(found, perf.head_m, np.nan)
    with np.errstate(divide="ignore", invalid="ignore"):
        efficiency = np.where(perf.efficiency > 0.0, perf.efficiency, np.nan)
        shaft_pump = np.where(np.isfinite(efficiency), perf.shaft_power_per_pump_w, np.nan)
        shaft_total = shaft_pump * n * stages
        input_power = shaft_total / (arrangement.motor_efficiency * arrangement.drive_efficiency)
        specific = np.where(q > 0.0, input_power / (q * _JOULES_PER_KWH), np.nan)
        hydraulic = density_kg_m3 * G * q * head
        bep_ratio: FloatArray
        if fitted.bep_flow_m3_s is not None:
            bep_ratio = perf.flow_per_pump_m3_s / (fitted.bep_flow_m3_s * s * trim)
        else:
            bep_ratio = np.full(q.shape, np.nan)
        npsha: FloatArray
        if npsh_static_head_m is not None:
            static_part: float | FloatArray
            if isinstance(npsh_static_head_m, Mapping):  # each scenario at its own suction level
                static_part = np.array([float(npsh_static_head_m[c]) for c in grid.static], dtype=float)
            else:
                static_part = float(npsh_static_head_m)
            # the common suction at Q and the running pump's own suction branch at Q/N
            npsha = static_part - np.asarray(system.suction_loss(q, grid.aged, n), dtype=float)
        else:
            npsha = np.full(q.shape, np.nan)
        npshr = perf.npsh_required_m
        margin = npsha - npshr
        margin_ratio = np.where(npshr > 0.0, npsha / npshr, np.nan)
    velocities = np.asarray(system.segment_velocities(q, n), dtype=float).reshape(q.size, -1).tolist()
    controls = _controls(system, q, grid, found)

    cols = {
        "flow_m3_s": _optional(q, found),
        "flow_per_pump_m3_s": _optional(perf.flow_per_pump_m3_s, found),
        "head_m": _optional(head, found),
        "efficiency": _optional(efficiency, found),
        "hydraulic_power_w": _optional(hydraulic, found),
        "shaft_power_w": _optional(shaft_pump, found),
        "shaft_power_total_w": _optional(shaft_total, found),
        "input_power_w": _optional(input_power, found),
        "specific_energy_kwh_m3": _optional(specific, found),
        "bep_flow_ratio": _optional(bep_ratio, found),
        "npsh_available_m": _optional(npsha, found),
        "npsh_required_m": _optional(npshr, found),
        "npsh_margin_m": _optional(margin, found),
        "npsh_margin_ratio": _optional(margin_ratio, found),
    }
    found_list = found.tolist()
    extrapolated = duty.extrapolated.tolist()
    pumps = n.astype(int).tolist()
    speed_list = s.tolist()
    statics = grid.static_head_m.tolist()
    templates = duty.reason_templates or (None,) * grid.size
    points = []
    for i in range(grid.size):
        template = templates[i]
        points.append(OperatingPoint(
            static=grid.static[i], pipe=grid.pipe[i], pumps_running=pumps[i], speed_ratio=speed_list[i],
            trim_ratio=trim, series_stages=stages, static_head_m=statics[i],
            found=found_list[i], reason=duty.reasons[i], extrapolated=extrapolated[i],
            segment_velocities_m_s=tuple(velocities[i]) if found_list[i] else (),
            reason_template=None if template is None else template[0],
            reason_values=() if template is None else template[1],
            control=control_label(controls[i]), control_chainage_m=controls[i],
            **{key: values[i] for key, values in cols.items()},
        ))
    return tuple(points)
