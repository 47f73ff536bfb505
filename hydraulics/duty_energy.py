"""Energy over a year of real duty: the duty profile's bands met by the run sequence of the pumps.

The station's duty is a table of flow bands, each with its time per year
(:class:`hydraulics.model.DutyProfile`).  For each band the station runs the fewest pumps of
its run sequence (:func:`hydraulics.pump_set.run_stages`) whose flow reaches the band flow, and
this module adds up the energy they draw.

The year is computed at the **mean static head**, (minimum + maximum) / 2: in service the
levels move between the two extremes, so the mean stands for the year (the energy at either
extreme alone over- or understates it).  The pipe state is the profile's (aged by default, the
condition over most of a main's life).

Time and volume (SI; t in hours, Q in m³/s):

* Band time: ``hours`` as given, or ``share`` × 8760 h (a common year).
* With an annual volume V the band flows are an inflow pattern scaled by one factor,
  k = V / Σ_b (Q_b t_b · 3600 s/h), so that Σ_b k Q_b t_b · 3600 = V.

Meeting a band (``strategy``):

* ``fixed_staging``: the fewest stage whose flow at its own speeds Q_stage reaches the band
  flow Q_b runs stop–start, t_run = V_b / (3600 Q_stage) ≤ t_b with V_b = 3600 Q_b t_b (the
  wet well or tank stores the difference; level-controlled pumping).
* ``variable_speed``: the fewest stage whose flow at its highest speed reaches Q_b; its
  variable-speed pumps slow to the common speed that delivers Q_b exactly, re-intersected
  with the system (:func:`hydraulics.pump_set.pump_set_speed_for_flow`), and run the band's
  whole hours; where that would take a running pump beyond its preferred region (the criteria's
  upper bound of best-efficiency flow, after ANSI/HI 9.6.3) and a further stage exists, the next
  pump is switched in instead (common practice for parallel pumps on drives: the next pump starts
  before the running ones run out).  Where even the lowest speed delivers more than Q_b the stage runs at the
  lowest speed and stops and starts as above.  A stage without variable-speed pumps runs as
  under fixed staging.
* A band above the station's capacity (the last stage cannot reach it): every pump of the
  last stage runs the band's whole hours at its highest speed; the volume it cannot deliver is
  the band's shortfall (finding ``duty_band_not_met``).  A band without flow pumps nothing.

Power and energy, per band while running (the pump set's operating point,
:func:`hydraulics.pump_set.solve_pump_set`):

* Hydraulic power of each pump P_h,i = ρ g qᵢ Hᵢ (W), the power the pump gives the liquid
  (definition of pump output power, ISO 9906:2012, clause 3), Hᵢ the pump's own head.
* Input power P_in = Σᵢ P_shaft,i / (η_motor,i η_drive,i) (W), the shaft power from the
  fitted curves (affinity laws at the running speed) over the motor and drive efficiencies.
* Wire-to-water efficiency η_ww = Σᵢ P_h,i / P_in (the overall efficiency of pumps, motors and
  drives; e.g. Karassik et al., *Pump Handbook*, 4th ed., ch. on pump economics).
* Specific energy E_s = P_in / (3.6 × 10⁶ Q) (kWh/m³), 1 kWh = 3.6 × 10⁶ J.
* Energy per year E = Σ_b P_in,b t_run,b / 1000 (kWh, t in h); cost = E × tariff; the station's
  mean specific energy E / V_pumped (kWh/m³).

Vectorised over bands: the stages are taken in turn while bands are left to meet, and each stage
used costs one :func:`~hydraulics.pump_set.solve_pump_set` call (its own speeds, and with variable
speed its lowest speed and the speed of every band it slows to, as scenarios of one call) and,
with variable speed, one :func:`~hydraulics.pump_set.pump_set_speed_for_flow` call for every band
left.

Finding codes (stable): ``duty_band_not_met`` (warning: a band above the station's capacity),
``duty_band_outside_region`` (warning, critical outside the allowable region: a running pump
leaves its preferred operating region in a band; the region checks at the band points),
``duty_energy_unknown`` (info: a running pump has no efficiency or power data),
``duty_profile_not_computed`` (info: pumps in series, which the pump set does not solve).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import Criteria, Project, PumpModel
from hydraulics.number_format import fixed_decimals, percent_number
from hydraulics.pump_fit import FittedPump
from hydraulics.pump_set import PumpSetSolve, SetPump, pump_set_speed_for_flow, run_stages, solve_pump_set, stage_label
from hydraulics.results import (
    DutyBandResult,
    DutyProfileResult,
    DutyStageCapacity,
    Finding,
    FloatArray,
    finding,
)
from hydraulics.system_curve import SystemHydraulics

__all__ = ["HOURS_PER_COMMON_YEAR", "band_hours", "scaled_flows", "duty_profile_energy", "duty_findings"]

HOURS_PER_COMMON_YEAR = 8760.0
"""Hours in a common year (365 × 24): a band's share of the year is a share of these."""
SECONDS_PER_HOUR = 3600.0
WATT_HOURS_PER_KWH = 1000.0
JOULES_PER_KWH = 3.6e6
_REACH_TOLERANCE = 1e-9
"""A stage reaches a band when its flow is at least the band flow less this relative margin."""

FitPump = Callable[[PumpModel, float], FittedPump]
"""Fits a pump model for a fluid density (the solve's cached fit)."""


def band_hours(project: Project) -> FloatArray:
    """Each band's time per year in hours: as given, or share × 8760 h (a common year)."""
    profile = project.duty_profile
    times = np.array([b.time for b in profile.bands], dtype=float)
    return times if profile.time_basis == "hours" else times * HOURS_PER_COMMON_YEAR


def scaled_flows(project: Project, hours: FloatArray) -> tuple[FloatArray, float | None]:
    """The band flows the station must meet, and the scale factor applied (``None``: none).

    With an annual volume V the band flows are a pattern multiplied by k = V / Σ (Q_b t_b 3600)
    so that the year's volume Σ k Q_b t_b 3600 is V (t_b in hours).
    """
    profile = project.duty_profile
    flows = np.array([b.flow_m3_s for b in profile.bands], dtype=float)
    if profile.annual_volume_m3 is None:
        return flows, None
    pattern_volume = float(np.sum(flows * hours)) * SECONDS_PER_HOUR
    if pattern_volume <= 0.0:  # refused by the rules; kept for the type
        return flows, None
    factor = float(profile.annual_volume_m3) / pattern_volume
    return flows * factor, factor


@dataclass(frozen=True)
class _Running:
    """The operating point of one stage per band it serves (arrays over those bands)."""

    flow: FloatArray
    head: FloatArray
    power: FloatArray
    efficiency: FloatArray
    bep_min: FloatArray
    bep_max: FloatArray


def _running(point: PumpSetSolve, density: float) -> _Running:
    """Station flow, manifold head, input power and wire-to-water efficiency per scenario."""
    delivering = np.nan_to_num(point.pump_flow_m3_s) > 0.0
    hydraulic = np.where(delivering, density * STANDARD_GRAVITY_M_S2 * np.nan_to_num(point.pump_flow_m3_s)
                         * np.nan_to_num(point.pump_head_m), 0.0)
    powers = np.where(delivering, point.pump_input_power_w, 0.0)
    power = np.sum(powers, axis=-1)  # NaN where a delivering pump's power is unknown
    flow = np.where(point.found, point.flow_m3_s, 0.0)
    with np.errstate(invalid="ignore", divide="ignore"):
        efficiency = np.where(power > 0.0, np.sum(hydraulic, axis=-1) / power, np.nan)
    power = np.where(flow > 0.0, power, 0.0)
    ratio = np.where(delivering, point.pump_bep_flow_ratio, np.nan)
    known = np.any(np.isfinite(ratio), axis=-1)
    safe = np.where(known[:, None], ratio, 0.0)
    bep_min = np.where(known, np.nanmin(np.where(np.isfinite(safe), safe, np.inf), axis=-1), np.nan)
    bep_max = np.where(known, np.nanmax(np.where(np.isfinite(safe), safe, -np.inf), axis=-1), np.nan)
    return _Running(flow=flow, head=point.manifold_head_m, power=power, efficiency=efficiency,
                    bep_min=bep_min, bep_max=bep_max)


def _optional(value: float) -> float | None:
    return float(value) if np.isfinite(value) else None


def duty_profile_energy(project: Project, system: SystemHydraulics, density_kg_m3: float,
                        fit: FitPump) -> tuple[DutyProfileResult | None, tuple[Finding, ...]]:
    """The year of the project's duty profile (see the module description) and its findings.

    ``None`` (and no finding) without bands or without an arrangement.
    """
    profile, arrangement = project.duty_profile, project.arrangement
    if not profile.bands or arrangement is None or project.duty_pump is None:
        return None, ()
    if arrangement.series_stages > 1:
        return None, (finding(
            "info", "duty_profile_not_computed",
            f"The energy over the duty profile is not computed: the arrangement has {arrangement.series_stages} "
            "pumps in series, and the year is computed for pumps in parallel only.",
            {}, "duty profile", "Use the simple estimate of the energy, or model one series stage.",
            ("duty", 0)),)
    stages = run_stages(project)
    fitted: dict[str, FittedPump] = {}
    for pump in {p.pump_id for stage in stages for p in stage}:
        model = project.pump(pump)
        if model is not None:  # the rules refuse an unknown pump id
            fitted[pump] = fit(model, density_kg_m3)
    static_min, static_max = float(system.static_head_m["min"]), float(system.static_head_m["max"])
    static = 0.5 * (static_min + static_max)
    aged = profile.pipe == "aged"
    hours = band_hours(project)
    flows, factor = scaled_flows(project, hours)
    n_bands = flows.size

    idle = flows <= 0.0
    table = _BandTable(n_bands)
    capacities: list[DutyStageCapacity] = []
    remaining = ~idle
    for k, stage in enumerate(stages):
        if not remaining.any():
            break
        capacity = _meet_with_stage(system, fitted, (k, stage), static, aged, flows, np.flatnonzero(remaining),
                                    profile.strategy == "variable_speed", density_kg_m3, table,
                                    last=k == len(stages) - 1,
                                    run_out_limit=project.criteria.preferred_region_high)
        capacities.append(DutyStageCapacity(stage_label(stage), len(stage), capacity))
        remaining &= table.stage < 0
    q_run, head, power, eta, speed, control = (table.q_run, table.head, table.power, table.eta, table.speed,
                                               table.control)
    above = table.above
    stage_of = table.stage
    notes_by_band = table.notes
    control[idle] = "idle"

    volume_needed = flows * hours * SECONDS_PER_HOUR
    with np.errstate(invalid="ignore", divide="ignore"):
        run_hours = np.where(q_run > 0.0, np.minimum(hours, volume_needed / (q_run * SECONDS_PER_HOUR)), 0.0)
    slowed_to_flow = control == "variable speed"  # runs the band's whole hours, delivering its volume
    run_hours = np.where(idle, 0.0, np.where(slowed_to_flow, hours, run_hours))
    pumped = np.where(slowed_to_flow, volume_needed, q_run * run_hours * SECONDS_PER_HOUR)
    shortfall = np.where(above, np.maximum(volume_needed - pumped, 0.0), 0.0)
    energy = power * run_hours / WATT_HOURS_PER_KWH
    with np.errstate(invalid="ignore", divide="ignore"):
        specific = np.where(q_run > 0.0, power / (JOULES_PER_KWH * q_run), np.nan)
    tariff = float(project.energy.tariff_per_kwh)

    bands = []
    for b in range(n_bands):
        running = not idle[b] and q_run[b] > 0.0
        pumps: Sequence[SetPump] = () if idle[b] else stages[int(stage_of[b])]
        note = notes_by_band[b]
        if above[b]:
            note = ("above the station's capacity: every pump of the last stage runs the band's whole hours"
                    if q_run[b] > 0.0 else "the pumps cannot lift against the mean static head: nothing pumped")
        bands.append(DutyBandResult(
            index=b, flow_m3_s=float(flows[b]), hours=float(hours[b]), pumps=stage_label(pumps),
            pumps_running=len(pumps), control=str(control[b]), speed_ratio=_optional(speed[b]),
            station_flow_m3_s=float(q_run[b]) if running else None,
            manifold_head_m=_optional(head[b]) if running else None,
            efficiency=_optional(eta[b]) if running else None,
            input_power_w=_optional(power[b]) if running else None,
            specific_energy_kwh_m3=_optional(specific[b]) if running else None,
            run_hours=float(run_hours[b]), pumped_volume_m3=float(pumped[b]),
            shortfall_volume_m3=float(shortfall[b]),
            energy_kwh=_optional(energy[b]) if running else (0.0 if idle[b] or run_hours[b] == 0.0 else None),
            cost=_optional(energy[b] * tariff) if running else (0.0 if idle[b] or run_hours[b] == 0.0 else None),
            note=note, bep_flow_ratio_min=_optional(table.bep_min[b]) if running else None,
            bep_flow_ratio_max=_optional(table.bep_max[b]) if running else None))

    notes: list[str] = []
    if factor is not None:
        notes.append(f"band flows scaled by {fixed_decimals(factor, 4)} so that the year's volume is the annual "
                     "volume given")
    unknown = [r for r in bands if r.energy_kwh is None]
    total_volume = float(np.sum(pumped))
    total_energy = None if unknown else float(sum(r.energy_kwh or 0.0 for r in bands))
    if unknown:
        notes.append("energy not known: a running pump has no efficiency or power data")
    result = DutyProfileResult(
        strategy=profile.strategy, pipe=profile.pipe, time_basis=profile.time_basis, static_head_m=static,
        static_head_min_m=static_min, static_head_max_m=static_max, flow_scale=factor,
        annual_volume_target_m3=profile.annual_volume_m3,
        stages=tuple(capacities),
        bands=tuple(bands), hours=float(np.sum(hours)), run_hours=float(np.sum(run_hours)),
        volume_m3=total_volume, shortfall_volume_m3=float(np.sum(shortfall)), energy_kwh=total_energy,
        cost=None if total_energy is None else total_energy * tariff,
        specific_energy_kwh_m3=(total_energy / total_volume if total_energy is not None and total_volume > 0.0
                                else None),
        tariff_per_kwh=tariff, currency=project.energy.currency, notes=tuple(notes))
    return result, duty_findings(result, project.criteria)


class _BandTable:
    """What each band gets, filled in stage by stage (arrays over the bands)."""

    def __init__(self, n_bands: int):
        self.stage = np.full(n_bands, -1)
        self.q_run = np.zeros(n_bands)
        self.head = np.full(n_bands, np.nan)
        self.power = np.zeros(n_bands)
        self.eta = np.full(n_bands, np.nan)
        self.speed = np.full(n_bands, np.nan)
        self.bep_min = np.full(n_bands, np.nan)
        self.bep_max = np.full(n_bands, np.nan)
        self.control: NDArray[np.object_] = np.array(["stop–start"] * n_bands, dtype=object)
        self.above = np.zeros(n_bands, dtype=bool)
        self.notes = [""] * n_bands

    def assign(self, bands: NDArray[np.intp], stage: int, point: _Running, rows: NDArray[np.intp] | int,
               control: str, speed: FloatArray | float | None = None, note: str = "") -> None:
        """Bands ``bands`` run by stage ``stage`` at the scenarios ``rows`` of ``point``."""
        if bands.size == 0:
            return
        self.stage[bands] = stage
        self.q_run[bands], self.head[bands] = point.flow[rows], point.head[rows]
        self.power[bands], self.eta[bands] = point.power[rows], point.efficiency[rows]
        self.bep_min[bands], self.bep_max[bands] = point.bep_min[rows], point.bep_max[rows]
        self.speed[bands] = np.nan if speed is None else speed
        self.control[bands] = control
        for b in bands:
            self.notes[int(b)] = note


def _meet_with_stage(system: SystemHydraulics, fitted: dict[str, FittedPump],
                     numbered_stage: tuple[int, Sequence[SetPump]], static: float, aged: bool, flows: FloatArray,
                     todo: NDArray[np.intp], variable_speed: bool,
                     density: float, table: _BandTable, last: bool, run_out_limit: float | None = None) -> float:
    """The bands of ``todo`` this stage meets (all that are left when it is the ``last``); its flow at own speeds.

    One pump-set solve: at the stage's own speeds (scenario 0) and, with variable speed, at its
    lowest speed (scenario 1) and at the speed found for each band it can slow to (one speed
    search for every band left).
    """
    index, stage = numbered_stage
    variable = variable_speed and any(p.variable_speed for p in stage)
    found = np.zeros(todo.size, dtype=bool)
    speeds: FloatArray | None = None
    lowest = 1.0
    if variable:
        found_speed, found = pump_set_speed_for_flow(system, fitted, stage, static, aged, flows[todo])
        highest = max(p.speed_ratio for p in stage if p.variable_speed)
        lowest = min(p.min_speed_ratio for p in stage if p.variable_speed)
        speeds = np.concatenate(([highest, lowest], found_speed[found]))
    n = 1 if speeds is None else speeds.size
    point = _running(solve_pump_set(system, fitted, stage, np.full(n, static), aged, speed_ratio=speeds), density)
    capacity = float(point.flow[0])
    target = flows[todo]
    reaches = (capacity >= target * (1.0 - _REACH_TOLERANCE)) & (capacity > 0.0) & ~found
    if variable:
        rows = np.arange(2, n)
        slowed = todo[found]
        if not last and run_out_limit is not None:  # switch the next pump in before these run out (see the module)
            keep = ~(point.bep_max[rows] > run_out_limit)
            rows, slowed = rows[keep], slowed[keep]
            speeds = np.concatenate((speeds[:2], speeds[2:][keep])) if speeds is not None else None
        table.assign(slowed, index, point, rows, "variable speed", None if speeds is None else speeds[2:])
        at_lowest = reaches & (point.flow[1] >= target * (1.0 - _REACH_TOLERANCE)) & (point.flow[1] > 0.0)
        table.assign(todo[at_lowest], index, point, 1, "stop–start at the lowest speed", lowest,
                     f"even the lowest speed ({percent_number(lowest)} %) delivers more than the band flow: the "
                     "pumps run at it and stop and start")
        rest = reaches & ~at_lowest  # the speed search did not converge: own speeds, stop–start
        table.assign(todo[rest], index, point, 0, "stop–start", None,
                     "no speed found for the band flow: the pumps run at their own speeds, stop and start")
    else:
        table.assign(todo[reaches], index, point, 0, "stop–start")
    if last:
        short = todo[table.stage[todo] < 0]
        table.assign(short, index, point, 0, "above capacity")
        table.above[short] = True
    return capacity


def duty_findings(result: DutyProfileResult, criteria: Criteria | None = None) -> tuple[Finding, ...]:
    """The findings of a year of duty (codes in the module description)."""
    out: list[Finding] = list(_region_findings(result, criteria)) if criteria is not None else []
    for band in result.bands:
        if band.met:
            continue
        capacity = band.station_flow_m3_s or 0.0
        out.append(finding(
            "warning", "duty_band_not_met",
            f"Duty band {band.index + 1} ({{q}}) is above the station's capacity at the mean static head with "
            f"{result.pipe} pipe: with {band.pumps} running the station delivers {{cap}}, and {{short}} of the "
            "band's volume a year is not pumped.",
            {"q": (band.flow_m3_s, "flow"), "cap": (capacity, "flow"), "short": (band.shortfall_volume_m3, "volume")},
            f"duty profile, band {band.index + 1}",
            "Lower the band's flow, install another pump, a higher speed or a larger main.",
            ("duty", band.index)))
    if result.energy_kwh is None:
        out.append(finding(
            "info", "duty_energy_unknown",
            "The energy over the duty profile is not known: a pump that runs has no efficiency or power data.",
            {}, "duty profile", "Give the pump's efficiency or shaft power points.", ("duty", 0)))
    return tuple(out)


def _region_findings(result: DutyProfileResult, criteria: Criteria) -> list[Finding]:
    """``duty_band_outside_region``: the bands in which a running pump leaves its preferred region.

    One finding for the year, naming each band and the range of best-efficiency flow shares its
    pumps run at; critical where a band leaves the allowable region (the criteria's bounds,
    after ANSI/HI 9.6.3 as in :mod:`hydraulics.checks`).
    """
    outside: list[str] = []
    severe = False
    for band in result.bands:
        low, high = band.bep_flow_ratio_min, band.bep_flow_ratio_max
        if low is None or high is None:
            continue
        if criteria.preferred_region_low <= low and high <= criteria.preferred_region_high:
            continue
        severe |= low < criteria.allowable_region_low or high > criteria.allowable_region_high
        share = percent_number(low) if abs(high - low) < 0.005 else f"{percent_number(low)}–{percent_number(high)}"
        outside.append(f"band {band.index + 1} ({band.pumps}, {share} %)")
    if not outside:
        return []
    bounds = (f"{percent_number(criteria.preferred_region_low)}–{percent_number(criteria.preferred_region_high)} %"
              if not severe else f"{percent_number(criteria.allowable_region_low)}–"
              f"{percent_number(criteria.allowable_region_high)} % (allowable)")
    return [Finding(
        "critical" if severe else "warning", "duty_band_outside_region",
        "Over the year the pumps run outside their " + ("allowable" if severe else "preferred")
        + f" region ({bounds} of best-efficiency flow) in " + "; ".join(outside) + ".",
        "duty profile", "Change the staging, the speed range or the pumps for these bands; the energy is "
        "computed as they run.", ("duty", 0))]
