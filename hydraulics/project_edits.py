"""Edits of a project: each builds a new :class:`~hydraulics.model.Project` from an old one.

The window calls these and hands the result to its document as one undo step; the
command line and tests call them directly.  None of them checks the whole project: the
result is checked by :func:`hydraulics.validation.validate_project` before it is
accepted.  A request that cannot be carried out at all (stepping a pipe whose material
has no pipe series, changing an arrangement that does not exist) raises
:class:`~hydraulics.model.ModelError` naming the field.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import replace
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from hydraulics import catalogue
from hydraulics.atmosphere import standard_atmosphere_pressure
from hydraulics.catalogue import PipeSeries
from hydraulics.fluid import fluid_properties
from hydraulics.model import (
    DEFAULT_DRIVE_EFFICIENCY,
    DEFAULT_SPEED_RANGE,
    Arrangement,
    DutyBand,
    InstalledPump,
    ModelError,
    PressurisedDelivery,
    ProfilePoint,
    Project,
    PumpModel,
    Segment,
    TankDelivery,
    UserFluid,
    WaterFluid,
)

if TYPE_CHECKING:  # for the annotation only
    from hydraulics.results import Solution

EXAMPLE_RATED_SPEED_RPM = 1450.0
"""Rated speed given to a new pump's example curve (a common four-pole speed at 50 Hz)."""

_EXAMPLE_FLOW_FRACTIONS = (0.0, 0.5, 1.0, 1.25, 1.5)


# ---------------------------------------------------------------------- site and fluid
def with_site_changes(project: Project, **changes: Any) -> Project:
    """The project with fields of its site changed."""
    return replace(project, site=replace(project.site, **changes))


def with_delivery_changes(project: Project, **changes: Any) -> Project:
    """The project with fields of its delivery (tank or pressurised point) changed."""
    return with_site_changes(project, delivery=replace(project.site.delivery, **changes))


def with_fluid_changes(project: Project, **changes: Any) -> Project:
    """The project with fields of its fluid changed."""
    return replace(project, fluid=replace(project.fluid, **changes))


def with_delivery_kind(project: Project, kind: str) -> Project:
    """Switch between an open tank (``"tank"``) and a pressurised point (``"pressurised"``).

    The elevation is kept: a tank's highest level becomes the point's elevation (at zero
    gauge pressure), a point's elevation becomes both levels of the tank.  Any other
    ``kind``, or the kind the project already has, leaves the project as it is.
    """
    delivery = project.site.delivery
    if kind == "tank" and isinstance(delivery, PressurisedDelivery):
        return with_site_changes(project, delivery=TankDelivery(delivery.elevation_m, delivery.elevation_m))
    if kind == "pressurised" and isinstance(delivery, TankDelivery):
        return with_site_changes(project, delivery=PressurisedDelivery(elevation_m=delivery.level_high_m,
                                                                       pressure_pa=0.0))
    return project


def with_atmosphere_mode(project: Project, mode: str) -> Project:
    """Atmospheric pressure from the altitude (``"altitude"``) or given (any other mode).

    A given value starts from the standard atmosphere at the site altitude
    (:func:`hydraulics.atmosphere.standard_atmosphere_pressure`); one already given is kept.
    """
    if mode == "altitude":
        return with_site_changes(project, atmospheric_pressure_pa=None)
    if project.site.atmospheric_pressure_pa is None:
        return with_site_changes(
            project, atmospheric_pressure_pa=float(standard_atmosphere_pressure(project.site.altitude_m)))
    return project


def with_fluid_kind(project: Project, kind: str) -> Project:
    """Water from its temperature (``"water"``), or a user fluid (``"user"``).

    A user fluid starts from water's properties at the water's temperature
    (:func:`hydraulics.fluid.fluid_properties`); water made from a user fluid takes its
    temperature, clamped to water's 0–100 °C.
    """
    fluid = project.fluid
    if kind == "user" and isinstance(fluid, WaterFluid):
        water = fluid_properties(fluid)
        return replace(project, fluid=UserFluid(
            name="user fluid", density_kg_m3=water.density_kg_m3,
            kinematic_viscosity_m2_s=water.kinematic_viscosity_m2_s,
            vapour_pressure_pa=water.vapour_pressure_pa, temperature_c=fluid.temperature_c))
    if kind == "water" and isinstance(fluid, UserFluid):
        temperature = min(max(fluid.temperature_c, 0.0), 100.0)
        return replace(project, fluid=WaterFluid(temperature_c=temperature))
    return project


# ---------------------------------------------------------------------- pipe sizes
def series_of_material(material_id: str) -> list[PipeSeries]:
    """The catalogue's pipe series made of ``material_id``, in catalogue order."""
    return [s for s in catalogue.pipe_series().values() if s.material_id == material_id]


def stepped_segment(segment: Segment, steps: int) -> Segment:
    """``segment`` moved ``steps`` nominal sizes through its pipe series (clamped at the ends).

    A segment whose diameter was typed joins the first series of its material at the
    catalogue size next above (``steps`` > 0) or below (``steps`` < 0) its bore.
    Raises :class:`ModelError` (field ``material``) when its material has no pipe series.
    """
    if segment.pipe_series is not None:
        if segment.nominal_size is None:
            raise ModelError("nominal_size",
                             f"a segment of pipe series '{segment.pipe_series}' needs its nominal size")
        size = catalogue.series(segment.pipe_series).step(segment.nominal_size, steps)
        return replace(segment, nominal_size=size.nominal, internal_diameter_m=size.internal_diameter_m)
    candidates = series_of_material(segment.material_id)
    if not candidates:
        raise ModelError("material", f"no pipe series of material '{segment.material_id}' to step through; "
                                     "type the diameter", segment.material_id)
    found = candidates[0]
    bores = [s.internal_diameter_m for s in found.sizes]
    d = segment.internal_diameter_m
    if steps > 0:
        above = [i for i, b in enumerate(bores) if b > d * (1 + 1e-9)]
        index = min((above[0] if above else len(bores) - 1) + steps - 1, len(bores) - 1)
    else:
        below = [i for i, b in enumerate(bores) if b < d * (1 - 1e-9)]
        index = max((below[-1] if below else 0) + steps + 1, 0)
    size = found.sizes[index]
    return replace(segment, pipe_series=found.series_id, nominal_size=size.nominal,
                   internal_diameter_m=size.internal_diameter_m)


def with_segment(project: Project, index: int, segment: Segment) -> Project:
    """The project with segment ``index`` replaced by ``segment``."""
    if not 0 <= index < len(project.segments):
        raise ModelError(f"segments[{index}]", f"no such segment; the project has {len(project.segments)}", index)
    return replace(project, segments=project.segments[:index] + (segment,) + project.segments[index + 1:])


# ---------------------------------------------------------------------- profile of the main
DEFAULT_PROFILE_STEP_M = 100.0
"""Chainage step of a point added past the last one, or of a second point past a lone first (m)."""


def main_length_m(project: Project) -> float:
    """Length of the common delivery pipework: the ``"station"`` delivery segments laid end to end (m)."""
    return float(sum(s.length_m for s in project.segments if s.side == "delivery" and s.carries == "station"))


def with_profile(project: Project, points: Sequence[ProfilePoint]) -> Project:
    """The project with the main's profile replaced by ``points`` (in the order given)."""
    return replace(project, profile=tuple(points))


def with_profile_point_changes(project: Project, index: int, **changes: Any) -> Project:
    """The project with fields of profile point ``index`` changed (``chainage_m``, ``elevation_m``, ``air_valve``)."""
    if not 0 <= index < len(project.profile):
        raise ModelError(f"profile[{index}]", f"no such point; the profile has {len(project.profile)}", index)
    point = replace(project.profile[index], **changes)
    return with_profile(project, project.profile[:index] + (point,) + project.profile[index + 1:])


def starting_profile(project: Project) -> tuple[ProfilePoint, ProfilePoint]:
    """Two points to start a profile from: chainage 0 and the end of the main.

    Elevations from the first station delivery segment's start elevation and the last
    one's end elevation where given, otherwise the pump datum and the delivery elevation
    (the highest delivery level of a tank).
    """
    main = [s for s in project.segments if s.side == "delivery" and s.carries == "station"]
    delivery = project.site.delivery
    end_level = delivery.level_high_m if isinstance(delivery, TankDelivery) else delivery.elevation_m
    start = main[0].start_elevation_m if main and main[0].start_elevation_m is not None else project.site.pump_datum_m
    end = main[-1].end_elevation_m if main and main[-1].end_elevation_m is not None else end_level
    length = main_length_m(project)
    return ProfilePoint(0.0, float(start)), ProfilePoint(length if length > 0 else DEFAULT_PROFILE_STEP_M, float(end))


def new_profile_point(project: Project, index: int) -> ProfilePoint:
    """A point to insert before point ``index`` of the profile (at the end when ``index`` is its length).

    Between two points: midway in chainage and elevation, no air valve.  Past the last
    point: :data:`DEFAULT_PROFILE_STEP_M` further at the same elevation.  Before the first:
    midway between chainage 0 and the first point.  An empty profile starts with the
    first point of :func:`starting_profile`.
    """
    points = project.profile
    if not points:
        return starting_profile(project)[0]
    if 0 < index < len(points):
        before, after = points[index - 1], points[index]
        return ProfilePoint((before.chainage_m + after.chainage_m) / 2.0,
                            (before.elevation_m + after.elevation_m) / 2.0)
    if index >= len(points):
        last = points[-1]
        return ProfilePoint(last.chainage_m + DEFAULT_PROFILE_STEP_M, last.elevation_m)
    first = points[0]
    return ProfilePoint(first.chainage_m / 2.0, first.elevation_m)


# ---------------------------------------------------------------------- duty profile
HOURS_PER_COMMON_YEAR = 8760.0
"""Hours of a common year: a band's share of the year is a share of these."""


def with_duty_profile_changes(project: Project, **changes: Any) -> Project:
    """The project with fields of its duty profile changed (``strategy``, ``pipe``, ``annual_volume_m3``)."""
    return replace(project, duty_profile=replace(project.duty_profile, **changes))


def with_duty_bands(project: Project, bands: Sequence[DutyBand]) -> Project:
    """The project with the duty profile's bands replaced by ``bands`` (in the order given)."""
    return with_duty_profile_changes(project, bands=tuple(bands))


def with_duty_band_changes(project: Project, index: int, **changes: Any) -> Project:
    """The project with fields of duty band ``index`` changed (``flow_m3_s``, ``time``)."""
    bands = project.duty_profile.bands
    if not 0 <= index < len(bands):
        raise ModelError(f"duty_profile.bands[{index}]", f"no such band; the profile has {len(bands)}", index)
    return with_duty_bands(project, bands[:index] + (replace(bands[index], **changes),) + bands[index + 1:])


def with_duty_time_basis(project: Project, basis: str) -> Project:
    """Give the bands' times in hours (``"hours"``) or as shares of the year (``"share"``).

    The times are converted, share = hours / 8760 (a common year), so the profile means the
    same; the basis it already has, or any other word, leaves the project as it is.
    """
    profile = project.duty_profile
    if basis == profile.time_basis or basis not in ("hours", "share"):
        return project
    factor = 1.0 / HOURS_PER_COMMON_YEAR if basis == "share" else HOURS_PER_COMMON_YEAR
    bands = tuple(replace(b, time=b.time * factor) for b in profile.bands)
    return with_duty_profile_changes(project, bands=bands, time_basis=basis)


def new_duty_band(project: Project, index: int) -> DutyBand:
    """A band to insert before band ``index`` (at the end when ``index`` is the number of bands).

    Its flow: midway between its neighbours, half the first band's before the first, the last
    band's past the last, the design flow in an empty profile.  Its time: what is left of a
    common year (8760 h, or the whole year as a share) after the other bands, so the profile
    stays valid.
    """
    profile = project.duty_profile
    bands = profile.bands
    if not bands:
        flow = project.site.design_flow_m3_s
    elif 0 < index < len(bands):
        flow = (bands[index - 1].flow_m3_s + bands[index].flow_m3_s) / 2.0
    elif index >= len(bands):
        flow = bands[-1].flow_m3_s
    else:
        flow = bands[0].flow_m3_s / 2.0
    whole = HOURS_PER_COMMON_YEAR if profile.time_basis == "hours" else 1.0
    left = max(0.0, whole - sum(b.time for b in bands))
    return DutyBand(flow_m3_s=float(flow), time=float(left))


# ---------------------------------------------------------------------- pumps
def unique_pump_id(project: Project, wanted: str) -> str:
    """``wanted`` made into an id (letters, digits, ``_``) not used by another pump."""
    base = re.sub(r"[^A-Za-z0-9_]+", "_", wanted).strip("_") or "pump"
    taken = {p.pump_id for p in project.pumps}
    candidate, number = base, 2
    while candidate in taken:
        candidate = f"{base}_{number}"
        number += 1
    return candidate


def imported_pump_id(project: Project, path: str | Path) -> str:
    """An id for a pump read from ``path``: its file name without the suffix, made unique."""
    return unique_pump_id(project, Path(path).stem)


def with_duty_pump(project: Project, pump_id: str) -> Project:
    """The station uses pump ``pump_id`` (an arrangement of one duty pump is made if none)."""
    if project.arrangement is None:
        return replace(project, arrangement=Arrangement(pump_id=pump_id))
    if project.arrangement.pump_id == pump_id:
        return project
    return replace(project, arrangement=replace(project.arrangement, pump_id=pump_id))


def with_added_pump(project: Project, pump: PumpModel) -> Project:
    """``pump`` added to the project and made the station's pump."""
    return with_duty_pump(replace(project, pumps=project.pumps + (pump,)), pump.pump_id)


def with_removed_pump(project: Project, pump_id: str) -> Project:
    """The pump ``pump_id`` removed; the station then uses the first remaining pump, or none.

    Installed pumps of that model beside the arrangement's go with it (and all of them when
    no pump model remains, since they need an arrangement).
    """
    pumps = tuple(p for p in project.pumps if p.pump_id != pump_id)
    arrangement = project.arrangement
    if arrangement is not None and arrangement.pump_id == pump_id:
        arrangement = replace(arrangement, pump_id=pumps[0].pump_id) if pumps else None
    others = tuple(o for o in project.other_pumps if o.pump_id != pump_id) if arrangement is not None else ()
    return replace(project, pumps=pumps, arrangement=arrangement, other_pumps=others)


def with_pump_changes(project: Project, pump_id: str, **changes: Any) -> Project:
    """The pump ``pump_id`` with fields changed (no pump of that id: the project unchanged)."""
    pumps = tuple(replace(p, **changes) if p.pump_id == pump_id else p for p in project.pumps)
    return replace(project, pumps=pumps)


def with_arrangement_changes(project: Project, **changes: Any) -> Project:
    """The arrangement with fields changed; a project without one raises :class:`ModelError`."""
    if project.arrangement is None:
        raise ModelError("arrangement", "the project has no pump arrangement yet; choose or add a pump first")
    return replace(project, arrangement=replace(project.arrangement, **changes))


def with_speed_control(project: Project, variable_speed: bool) -> Project:
    """The arrangement at fixed speed (min = max = its speed ratio) or on variable speed.

    Switching to variable speed gives the range :data:`~hydraulics.model.DEFAULT_SPEED_RANGE`
    widened to hold the speed ratio, and a drive efficiency of
    :data:`~hydraulics.model.DEFAULT_DRIVE_EFFICIENCY` where none was given (100 %); switching
    to fixed speed keeps the efficiencies as given.
    """
    if project.arrangement is None:
        raise ModelError("arrangement", "the project has no pump arrangement yet; choose or add a pump first")
    a = project.arrangement
    if a.variable_speed == variable_speed:
        return project
    if not variable_speed:
        return replace(project, arrangement=replace(a, variable_speed=False))  # range: its speed
    low, high = DEFAULT_SPEED_RANGE
    drive = DEFAULT_DRIVE_EFFICIENCY if a.drive_efficiency >= 1.0 else a.drive_efficiency
    return replace(project, arrangement=replace(
        a, variable_speed=True, min_speed_ratio=min(low, a.speed_ratio), max_speed_ratio=max(high, a.speed_ratio),
        drive_efficiency=drive))


# ---------------------------------------------------------------------- installed pumps beside the arrangement's
def with_other_pumps(project: Project, pumps: Sequence[InstalledPump]) -> Project:
    """The project with the installed pumps beside the arrangement's replaced by ``pumps``."""
    return replace(project, other_pumps=tuple(pumps))


def with_other_pump_changes(project: Project, index: int, **changes: Any) -> Project:
    """The project with fields of installed pump ``index`` (of ``other_pumps``) changed.

    Switching ``variable_speed`` on gives a lowest speed from
    :data:`~hydraulics.model.DEFAULT_SPEED_RANGE` (never above the pump's speed) and a drive
    efficiency of :data:`~hydraulics.model.DEFAULT_DRIVE_EFFICIENCY` where none was given
    (100 %), as for the arrangement (:func:`with_speed_control`); switching it off sets the
    lowest speed to the pump's speed.  At fixed speed a changed speed moves the lowest with it.
    """
    if not 0 <= index < len(project.other_pumps):
        raise ModelError(f"other_pumps[{index}]",
                         f"no such installed pump; the project has {len(project.other_pumps)} beside the arrangement's",
                         index)
    old = project.other_pumps[index]
    pump = replace(old, **changes)
    if pump.variable_speed and not old.variable_speed:
        drive = DEFAULT_DRIVE_EFFICIENCY if pump.drive_efficiency >= 1.0 else pump.drive_efficiency
        pump = replace(pump, min_speed_ratio=min(DEFAULT_SPEED_RANGE[0], pump.speed_ratio), drive_efficiency=drive)
    elif not pump.variable_speed:
        pump = replace(pump, min_speed_ratio=pump.speed_ratio)
    pumps = list(project.other_pumps)
    pumps[index] = pump
    return with_other_pumps(project, pumps)


def new_other_pump(project: Project, before: InstalledPump | None = None) -> InstalledPump:
    """An installed pump to add beside the arrangement's: an assist pump at fixed speed, full speed and trim.

    Its model is that of ``before`` (the pump it follows in the list) if given, else the first
    pump model other than the arrangement's, else the arrangement's; its motor efficiency
    the arrangement's.  Raises :class:`ModelError` without an arrangement.
    """
    arrangement = project.arrangement
    if arrangement is None:
        raise ModelError("other_pumps", "the project has no pump arrangement yet; choose or add a pump first")
    if before is not None:
        return replace(before, role="assist")
    others = [p.pump_id for p in project.pumps if p.pump_id != arrangement.pump_id]
    model = others[0] if others else arrangement.pump_id
    return InstalledPump(pump_id=model, role="assist", motor_efficiency=arrangement.motor_efficiency)


def example_pump(project: Project, solution: Solution | None) -> PumpModel:
    """A starting curve to edit: an invented pump that meets the design flow.

    Its head at the design flow is the highest system head there (maximum static, aged
    pipe) from ``solution``, else the maximum static head plus 20 %; the curve is the
    parabola H = H₀ − kQ² with a shut-off head 25 % higher.  Clearly named as an example:
    replace its points with a manufacturer's test data.
    """
    q_design = project.site.design_flow_m3_s
    head_design = None
    if solution is not None:
        try:
            curve = solution.curve("max", "aged")
            head_design = float(np.interp(q_design, curve.flow_m3_s, curve.head_m))
        except KeyError:
            head_design = None
    if head_design is None or not np.isfinite(head_design) or head_design <= 0:
        delivery = project.site.delivery
        top = delivery.level_high_m if isinstance(delivery, TankDelivery) else delivery.elevation_m
        head_design = max(1.2 * (top - project.site.suction_level_low_m), 5.0)
    shutoff = 1.25 * head_design
    k = (shutoff - head_design) / q_design**2
    flows = tuple(f * q_design for f in _EXAMPLE_FLOW_FRACTIONS)
    heads = tuple(max(shutoff - k * q * q, 0.0) for q in flows)
    return PumpModel(
        pump_id=unique_pump_id(project, "example_pump"),
        name="Example pump (replace with test data)",
        rated_speed_rpm=EXAMPLE_RATED_SPEED_RPM,
        flow_m3_s=flows, head_m=heads,
        notes="Invented example curve made by PumpSketch; replace with the manufacturer's test points.",
    )
