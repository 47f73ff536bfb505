"""Every rule a project must satisfy: the allowed ranges and the checks that enforce them.

One table (:data:`LIMITS`) states each range once, and :func:`validate_project` is the
one check of a whole project (pumps and their curve points included).  The project-file
reader, the command line and the window's edits all call it, so they refuse the same
values with the same words and the same field path.
Ranges are deliberately wide: they refuse what is physically meaningless or certainly a
typing slip (a negative length, a 30 m pipe bore), not unusual designs.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from hydraulics.input_excerpt import quote_input
from hydraulics.model import (
    Arrangement,
    Criteria,
    DutyProfile,
    EnergyInputs,
    InstalledPump,
    ModelError,
    PressurisedDelivery,
    ProfilePoint,
    Project,
    PumpModel,
    Segment,
    Site,
    TankDelivery,
    UserFluid,
    WaterFluid,
)


@dataclass(frozen=True)
class Limit:
    """An allowed closed range ``[low, high]`` of one field, in SI units.

    ``quantity`` names the kind of value (see :mod:`hydraulics.units`) so the window can
    state the range in the unit system on display; ``label`` is the plain field name.
    """

    label: str
    quantity: str
    low: float
    high: float
    integer: bool = False

    def check(self, value: object, field_path: str) -> float:
        """Return ``value`` as a float, or raise :class:`ModelError` naming the range.

        >>> LIMITS["segment.length_m"].check(120.0, "segments[0].length")
        120.0
        >>> LIMITS["segment.length_m"].check(-1.0, "segments[0].length")
        Traceback (most recent call last):
        ...
        hydraulics.model.ModelError: segments[0].length: length must be between 0 and 100000 m; got -1
        """
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise ModelError(field_path, f"{self.label} must be a number; got {value!r}", value)
        number = float(value)
        if not math.isfinite(number):
            raise ModelError(field_path, f"{self.label} must be a finite number; got {value!r}", value)
        if self.integer and number != int(number):
            raise ModelError(field_path, f"{self.label} must be a whole number; got {value!r}", value)
        if not self.low <= number <= self.high:
            raise ModelError(
                field_path,
                f"{self.label} must be between {_plain(self.low)} and {_plain(self.high)}"
                f"{_si_unit(self.quantity)}; got {_plain(number)}",
                value,
            )
        return number


def _plain(x: float) -> str:
    return f"{x:g}"


_SI_LABELS = {
    "length": " m", "elevation": " m", "diameter": " m", "roughness": " m", "head": " m",
    "flow": " m³/s", "pressure": " Pa", "velocity": " m/s", "temperature": " °C",
    "density": " kg/m³", "kinematic_viscosity": " m²/s", "speed": " rpm", "volume": " m³",
    "power": " W",
}


def _si_unit(quantity: str) -> str:
    return _SI_LABELS.get(quantity, "")


LIMITS: dict[str, Limit] = {
    # site
    "site.level_m": Limit("level", "elevation", -1000.0, 9000.0),
    "site.design_flow_m3_s": Limit("design flow", "flow", 1e-5, 50.0),
    "site.altitude_m": Limit("site altitude", "elevation", -500.0, 11000.0),
    "site.atmospheric_pressure_pa": Limit("atmospheric pressure", "pressure", 20_000.0, 120_000.0),
    "site.delivery_pressure_pa": Limit("delivery pressure", "pressure", -90_000.0, 10_000_000.0),
    # fluid
    "fluid.temperature_c": Limit("water temperature", "temperature", 0.0, 100.0),
    "fluid.density_kg_m3": Limit("density", "density", 500.0, 2500.0),
    "fluid.kinematic_viscosity_m2_s": Limit("kinematic viscosity", "kinematic_viscosity", 1e-7, 1e-2),
    "fluid.vapour_pressure_pa": Limit("vapour pressure", "pressure", 0.0, 200_000.0),
    # segments
    "segment.length_m": Limit("length", "length", 0.0, 100_000.0),
    "segment.internal_diameter_m": Limit("internal diameter", "diameter", 0.005, 5.0),
    "segment.elevation_m": Limit("elevation", "elevation", -1000.0, 9000.0),
    "segment.parallel_pipes": Limit("number of parallel pipes", "dimensionless", 1, 20, integer=True),
    "segment.roughness_m": Limit("roughness", "roughness", 0.0, 0.05),
    "segment.hw_c": Limit("Hazen–Williams C", "dimensionless", 40.0, 160.0),
    "fitting.count": Limit("fitting count", "dimensionless", 0, 1000, integer=True),
    "fitting.k_override": Limit("K override", "dimensionless", 0.0, 1000.0),
    "fitting.angle_deg": Limit("cone angle", "dimensionless", 1.0, 180.0),
    "fitting.other_diameter_m": Limit("bore upstream of the fitting", "diameter", 0.005, 5.0),
    # profile of the main
    "profile.chainage_m": Limit("chainage", "length", 0.0, 1_000_000.0),
    "profile.elevation_m": Limit("pipe elevation", "elevation", -1000.0, 9000.0),
    # arrangement
    "arrangement.duty_count": Limit("duty pumps", "dimensionless", 1, 8, integer=True),
    "arrangement.standby_count": Limit("standby pumps", "dimensionless", 0, 8, integer=True),
    "arrangement.series_stages": Limit("series stages", "dimensionless", 1, 4, integer=True),
    "arrangement.speed_ratio": Limit("speed ratio", "dimensionless", 0.2, 1.2),
    "arrangement.trim_ratio": Limit("impeller trim ratio", "dimensionless", 0.5, 1.0),
    "arrangement.efficiency": Limit("efficiency", "dimensionless", 0.1, 1.0),
    "arrangement.motor_rating_w": Limit("motor rating", "power", 10.0, 50_000_000.0),
    "arrangement.service_factor": Limit("service factor", "dimensionless", 1.0, 1.5),
    # pumps
    "pump.rated_speed_rpm": Limit("rated speed", "speed", 100.0, 10_000.0),
    "pump.flow_m3_s": Limit("pump flow", "flow", 0.0, 50.0),
    "pump.head_m": Limit("pump head", "head", 0.0, 3000.0),
    "pump.efficiency": Limit("pump efficiency", "dimensionless", 0.0, 1.0),
    "pump.shaft_power_w": Limit("shaft power", "power", 0.0, 1e8),
    "pump.npsh_required_m": Limit("NPSH required", "head", 0.0, 200.0),
    "pump.fit_order": Limit("fit order", "dimensionless", 1, 4, integer=True),
    "pump.impeller_diameter_m": Limit("impeller diameter", "diameter", 0.005, 5.0),
    # criteria
    "criteria.velocity_m_s": Limit("velocity limit", "velocity", 0.0, 20.0),
    "criteria.npsh_margin_ratio": Limit("NPSH margin ratio", "dimensionless", 1.0, 3.0),
    "criteria.npsh_margin_min_m": Limit("NPSH margin", "head", 0.0, 20.0),
    "criteria.region": Limit("operating-region bound (fraction of BEP flow)", "dimensionless", 0.0, 2.0),
    "criteria.trim_warning_limit": Limit("trim warning limit", "dimensionless", 0.0, 0.5),
    # energy
    "energy.operating_hours_per_year": Limit("operating hours per year", "dimensionless", 0.0, 8784.0),
    "energy.annual_volume_m3": Limit("annual volume", "volume", 0.0, 1e10),
    "energy.tariff_per_kwh": Limit("energy tariff", "dimensionless", 0.0, 100.0),
    "other_pumps.count": Limit("installed pumps beside the arrangement's", "dimensionless", 0, 8, integer=True),
    "duty_profile.bands": Limit("duty bands", "dimensionless", 0, 48, integer=True),
    "duty_band.flow_m3_s": Limit("band flow", "flow", 0.0, 50.0),
    "duty_band.hours": Limit("band hours per year", "dimensionless", 0.0, 8784.0),
    "duty_band.share": Limit("band share of the year", "dimensionless", 0.0, 1.0),
    "duty_profile.annual_volume_m3": Limit("annual volume", "volume", 0.0, 1e10),
    "project.flow_grid_max_factor": Limit("flow range factor", "dimensionless", 1.1, 5.0),
}


MIN_SEGMENTS = 1
"""Fewest pipe segments a project may have."""

MIN_PUMP_POINTS = 3
"""Fewest test points a pump curve may have: a second-order fit needs three."""

# --------------------------------------------------------------------------- sizes of input
# Checked before any work is done on an input, so no file, table or typed text can make the
# program run for minutes or fill the memory.  Each limit is far above what a pumping-station
# design needs (its reason beside it) and is named in the refusal.
MAX_PROJECT_FILE_BYTES = 20_000_000
"""Largest project file read (20 MB).  A file at every count limit below is about 8 MB."""
MAX_PUMP_CSV_BYTES = 1_000_000
"""Largest pump data file read (1 MB): MAX_PUMP_POINTS rows and a long comment preamble fit in 50 kB."""
MAX_JSON_NESTING = 20
"""Deepest nesting of objects and lists in a project file: the format itself nests 5 levels."""
MAX_INTEGER_DIGITS = 18
"""Digits of a whole number in a file: more cannot be held exactly as a float and never fit a range."""
MAX_SEGMENTS = 500
"""Pipe segments in a project: a station with every branch modelled has tens."""
MAX_FITTINGS_PER_SEGMENT = 200
"""Fitting rows in one segment (each row has a count up to LIMITS["fitting.count"])."""
MAX_PUMPS = 50
"""Pump models in a project: a station installs a few; a shortlist of candidates, some tens."""
MAX_PUMP_POINTS = 200
"""Test points of one pump curve: a data sheet gives 5 to 30."""
MAX_PROFILE_POINTS = 20_000
"""Points of the main's profile: a 100 km main surveyed every 5 m."""
MAX_TEXT_CHARACTERS = 200
"""Characters of a name, an id or a title-block field."""
MAX_NOTES_CHARACTERS = 20_000
"""Characters of the project's or a pump's notes (several pages of text)."""
MAX_SOURCE_COMMENT_LINES = 40
"""Comment lines of a pump data file kept with the pump as its provenance (each up to MAX_TEXT_CHARACTERS)."""
MAX_TYPED_CHARACTERS = 100
"""Characters of a typed value with its unit ("1450 rpm", "0.0355 m³/s") in a cell or a file's unit text."""
MAX_UNIT_CHARACTERS = 40
"""Characters of a unit ("kWh/m³", "ft³/s", "mm²/s"): the longest the trade writes are about 12."""
MAX_UNIT_EXPONENT = 4
"""Largest power in a unit (m⁴ is the most a hydraulic unit uses; m³ is common)."""

_POINT_COLUMNS = (
    ("flow_m3_s", "pump.flow_m3_s", "flow"),
    ("head_m", "pump.head_m", "head"),
    ("efficiency", "pump.efficiency", "efficiency"),
    ("npsh_required_m", "pump.npsh_required_m", "NPSH required"),
    ("shaft_power_w", "pump.shaft_power_w", "shaft power"),
)
_OPTIONAL_POINT_COLUMNS = ("efficiency", "npsh_required_m", "shaft_power_w")
_FIT_ORDERS = ("head_fit_order", "efficiency_fit_order", "power_fit_order")


def require_at_most(count: int, limit: int, what: str, field_path: str) -> None:
    """Refuse ``count`` items of ``what`` above ``limit`` (one of the size limits above), naming the limit.

    >>> require_at_most(482_103, MAX_SEGMENTS, "pipe segments", "segments")
    Traceback (most recent call last):
    ...
    hydraulics.model.ModelError: segments: at most 500 pipe segments are allowed; there are 482103
    """
    if count > limit:
        raise ModelError(field_path, f"at most {limit} {what} are allowed; there are {count}", count)


def check_text(value: object, field_path: str, limit: int = MAX_TEXT_CHARACTERS) -> None:
    """Refuse a text field that is not text or is longer than ``limit`` characters."""
    if not isinstance(value, str):
        raise ModelError(field_path, f"expected text; got {type(value).__name__}", value)
    if len(value) > limit:
        raise ModelError(field_path, f"at most {limit} characters are allowed; it has {len(value)}", len(value))


def _validate_texts(project: Project) -> None:
    """Every name, id and note of the project is text within its length limit."""
    check_text(project.name, "name")
    check_text(project.notes, "notes", MAX_NOTES_CHARACTERS)
    for i, segment in enumerate(project.segments):
        check_text(segment.name, f"segments[{i}].name")
        check_text(segment.material_id, f"segments[{i}].material")
        for j, fitting in enumerate(segment.fittings):
            check_text(fitting.fitting_id, f"segments[{i}].fittings[{j}].type")
    for i, pump in enumerate(project.pumps):
        check_text(pump.pump_id, f"pumps[{i}].id")
        check_text(pump.name, f"pumps[{i}].name")
        check_text(pump.notes, f"pumps[{i}].notes", MAX_NOTES_CHARACTERS)
        check_text(pump.source_file, f"pumps[{i}].source.file")
        require_at_most(len(pump.source_comments), MAX_SOURCE_COMMENT_LINES, "comment lines of a pump's source",
                        f"pumps[{i}].source.comments")
        for j, line in enumerate(pump.source_comments):
            check_text(line, f"pumps[{i}].source.comments[{j}]")
    check_text(project.energy.currency, "energy.currency")
    for key in ("site", "revision", "date", "prepared_by", "checked_by"):
        check_text(getattr(project.title_block, key), f"title_block.{key}")


def validate_sizes(project: Project) -> None:
    """The counts of a project within the size limits (segments, fittings, pumps, points, profile)."""
    require_at_most(len(project.segments), MAX_SEGMENTS, "pipe segments", "segments")
    for i, segment in enumerate(project.segments):
        require_at_most(len(segment.fittings), MAX_FITTINGS_PER_SEGMENT, "fitting rows in a segment",
                        f"segments[{i}].fittings")
    require_at_most(len(project.pumps), MAX_PUMPS, "pumps", "pumps")
    for i, pump in enumerate(project.pumps):
        require_at_most(len(pump.flow_m3_s), MAX_PUMP_POINTS, "points in a pump curve", f"pumps[{i}].points")
    require_at_most(len(project.profile), MAX_PROFILE_POINTS, "profile points", "profile")


def check(key: str, value: object, field_path: str | None = None) -> float:
    """Check ``value`` against ``LIMITS[key]``; return it as float or raise ModelError."""
    return LIMITS[key].check(value, field_path or key)


def _optional(key: str, value: object, path: str) -> None:
    if value is not None:
        check(key, value, path)


def validate_site(site: Site, path: str = "site") -> None:
    """Check every number of the site, and that each low level is not above its high level."""
    check("site.level_m", site.suction_level_low_m, f"{path}.suction.level_low")
    check("site.level_m", site.suction_level_high_m, f"{path}.suction.level_high")
    if site.suction_level_low_m > site.suction_level_high_m:
        raise ModelError(f"{path}.suction.level_low", "lowest suction level is above the highest")
    delivery = site.delivery
    if isinstance(delivery, TankDelivery):
        check("site.level_m", delivery.level_low_m, f"{path}.delivery.level_low")
        check("site.level_m", delivery.level_high_m, f"{path}.delivery.level_high")
        if delivery.level_low_m > delivery.level_high_m:
            raise ModelError(f"{path}.delivery.level_low", "lowest delivery level is above the highest")
    elif isinstance(delivery, PressurisedDelivery):
        check("site.level_m", delivery.elevation_m, f"{path}.delivery.elevation")
        check("site.delivery_pressure_pa", delivery.pressure_pa, f"{path}.delivery.pressure")
    else:
        raise ModelError(f"{path}.delivery", "must be a tank or a pressurised point")
    check("site.level_m", site.pump_datum_m, f"{path}.pump_datum")
    check("site.design_flow_m3_s", site.design_flow_m3_s, f"{path}.design_flow")
    check("site.altitude_m", site.altitude_m, f"{path}.altitude")
    _optional("site.atmospheric_pressure_pa", site.atmospheric_pressure_pa, f"{path}.atmospheric_pressure")


def validate_fluid(fluid: WaterFluid | UserFluid, path: str = "fluid") -> None:
    """Check the fluid's numbers against their ranges."""
    if isinstance(fluid, WaterFluid):
        check("fluid.temperature_c", fluid.temperature_c, f"{path}.temperature")
    elif isinstance(fluid, UserFluid):
        check("fluid.density_kg_m3", fluid.density_kg_m3, f"{path}.density")
        check("fluid.kinematic_viscosity_m2_s", fluid.kinematic_viscosity_m2_s, f"{path}.kinematic_viscosity")
        check("fluid.vapour_pressure_pa", fluid.vapour_pressure_pa, f"{path}.vapour_pressure")
    else:
        raise ModelError(path, "must be water or a user fluid")


def validate_segment(segment: Segment, path: str) -> None:
    """Check one segment's numbers and its fittings' counts and overrides."""
    if not segment.name.strip():
        raise ModelError(f"{path}.name", "a segment needs a name")
    if segment.side not in ("suction", "delivery"):
        raise ModelError(f"{path}.side", f"side must be 'suction' or 'delivery'; got {quote_input(segment.side)}")
    if segment.carries not in ("pump", "station"):
        raise ModelError(f"{path}.carries", f"carries must be 'pump' or 'station'; got {quote_input(segment.carries)}")
    check("segment.length_m", segment.length_m, f"{path}.length")
    check("segment.internal_diameter_m", segment.internal_diameter_m, f"{path}.internal_diameter")
    _optional("segment.elevation_m", segment.start_elevation_m, f"{path}.start_elevation")
    _optional("segment.elevation_m", segment.end_elevation_m, f"{path}.end_elevation")
    check("segment.parallel_pipes", segment.parallel_pipes, f"{path}.parallel_pipes")
    _optional("segment.roughness_m", segment.roughness_new_m, f"{path}.roughness_new")
    _optional("segment.roughness_m", segment.roughness_aged_m, f"{path}.roughness_aged")
    _optional("segment.hw_c", segment.hw_c_new, f"{path}.hw_c_new")
    _optional("segment.hw_c", segment.hw_c_aged, f"{path}.hw_c_aged")
    for j, fitting in enumerate(segment.fittings):
        fpath = f"{path}.fittings[{j}]"
        check("fitting.count", fitting.count, f"{fpath}.count")
        _optional("fitting.k_override", fitting.k_override, f"{fpath}.k_override")
        _optional("fitting.angle_deg", fitting.angle_deg, f"{fpath}.angle_deg")
        _optional("fitting.other_diameter_m", fitting.other_diameter_m, f"{fpath}.other_diameter")


def validate_profile(profile: Sequence[ProfilePoint], path: str = "profile") -> None:
    """Check the main's profile: chainage and elevation in range, chainage strictly increasing.

    An empty profile is allowed (the main then has no profile); one with points needs at
    least two.
    """
    if len(profile) == 1:
        raise ModelError(path, "a profile needs at least two points (or none)")
    previous: float | None = None
    for i, point in enumerate(profile):
        chainage = check("profile.chainage_m", point.chainage_m, f"{path}[{i}].chainage")
        check("profile.elevation_m", point.elevation_m, f"{path}[{i}].elevation")
        if not isinstance(point.air_valve, bool):
            raise ModelError(f"{path}[{i}].air_valve", f"air valve must be true or false; got {point.air_valve!r}")
        if previous is not None and chainage <= previous:
            raise ModelError(f"{path}[{i}].chainage",
                             f"chainage must increase from point to point (point {i + 1} is not beyond point {i})")
        previous = chainage


def require_pump_points(count: int, field_path: str) -> None:
    """Raise :class:`ModelError` when a pump curve has fewer than :data:`MIN_PUMP_POINTS` points.

    >>> require_pump_points(2, "pumps[0].points")
    Traceback (most recent call last):
    ...
    hydraulics.model.ModelError: pumps[0].points: a pump curve needs at least 3 points; it has 2
    """
    if count < MIN_PUMP_POINTS:
        raise ModelError(field_path, f"a pump curve needs at least {MIN_PUMP_POINTS} points; it has {count}", count)


def validate_pump(pump: PumpModel, path: str) -> None:
    """Check one pump: its id, name, rated speed, curve points, fit orders and impeller.

    At least :data:`MIN_PUMP_POINTS` points, every column as long as the flows, flows
    strictly increasing, every value inside its :data:`LIMITS` range.  An optional column
    (efficiency, NPSH required, shaft power) is given at every point or at none; a
    missing value (NaN, as a table holds it while being edited) is refused by name.
    """
    if not isinstance(pump.pump_id, str) or not pump.pump_id.strip():
        raise ModelError(f"{path}.id", "a pump needs an id")
    if not isinstance(pump.name, str) or not pump.name.strip():
        raise ModelError(f"{path}.name", "a pump needs a name")
    check("pump.rated_speed_rpm", pump.rated_speed_rpm, f"{path}.rated_speed")
    n = len(pump.flow_m3_s)
    require_pump_points(n, f"{path}.points")
    for attribute, key, words in _POINT_COLUMNS:
        values = getattr(pump, attribute)
        if attribute in _OPTIONAL_POINT_COLUMNS and not values:
            continue
        if len(values) != n:
            raise ModelError(f"{path}.points.{attribute}", f"has {len(values)} values; the curve has {n} points")
        for j, value in enumerate(values):
            if isinstance(value, float) and math.isnan(value):
                raise ModelError(
                    f"{path}.points[{j}].{attribute}",
                    f"{words} is missing at point {j + 1}; give it at every point or clear the whole column")
            check(key, value, f"{path}.points[{j}].{attribute}")
    flows = pump.flow_m3_s
    for j in range(1, n):
        if flows[j] <= flows[j - 1]:
            raise ModelError(f"{path}.points[{j}].flow_m3_s",
                             f"flows must increase from point to point (point {j + 1} is not above point {j})")
    for name in _FIT_ORDERS:
        check("pump.fit_order", getattr(pump, name), f"{path}.{name}")
    _optional("pump.impeller_diameter_m", pump.impeller_diameter_m, f"{path}.impeller_diameter")


def validate_arrangement(arrangement: Arrangement, project: Project, path: str = "arrangement") -> None:
    """Check the pump arrangement and that it names a pump of the project."""
    if project.pump(arrangement.pump_id) is None:
        ids = ", ".join(p.pump_id for p in project.pumps) or "none defined"
        raise ModelError(f"{path}.pump_id", f"no pump {quote_input(arrangement.pump_id)} in the project (pumps: {ids})")
    check("arrangement.duty_count", arrangement.duty_count, f"{path}.duty_count")
    check("arrangement.standby_count", arrangement.standby_count, f"{path}.standby_count")
    check("arrangement.series_stages", arrangement.series_stages, f"{path}.series_stages")
    for name in ("speed_ratio", "min_speed_ratio", "max_speed_ratio"):
        check("arrangement.speed_ratio", getattr(arrangement, name), f"{path}.{name}")
    if arrangement.min_speed_ratio > arrangement.max_speed_ratio:
        raise ModelError(f"{path}.min_speed_ratio", "minimum speed ratio is above the maximum")
    if arrangement.motor_rating_w is not None:
        check("arrangement.motor_rating_w", arrangement.motor_rating_w, f"{path}.motor_rating_w")
    check("arrangement.service_factor", arrangement.service_factor, f"{path}.service_factor")
    check("arrangement.trim_ratio", arrangement.trim_ratio, f"{path}.trim_ratio")
    check("arrangement.efficiency", arrangement.motor_efficiency, f"{path}.motor_efficiency")
    check("arrangement.efficiency", arrangement.drive_efficiency, f"{path}.drive_efficiency")


def validate_other_pump(pump: InstalledPump, project: Project, path: str) -> None:
    """Check one installed pump beside the arrangement's: its model, role, speeds and efficiencies."""
    if project.pump(pump.pump_id) is None:
        ids = ", ".join(p.pump_id for p in project.pumps) or "none defined"
        raise ModelError(f"{path}.pump", f"no pump {quote_input(pump.pump_id)} in the project (pumps: {ids})")
    if pump.role not in ("duty", "assist", "standby"):
        raise ModelError(f"{path}.role", f"must be 'duty', 'assist' or 'standby', got {quote_input(pump.role)}")
    check("arrangement.speed_ratio", pump.speed_ratio, f"{path}.speed_ratio")
    if pump.variable_speed:
        check("arrangement.speed_ratio", pump.min_speed_ratio, f"{path}.min_speed_ratio")
        if pump.min_speed_ratio > pump.speed_ratio:
            raise ModelError(f"{path}.min_speed_ratio", "minimum speed ratio is above the pump's speed ratio")
    check("arrangement.trim_ratio", pump.trim_ratio, f"{path}.trim_ratio")
    check("arrangement.efficiency", pump.motor_efficiency, f"{path}.motor_efficiency")
    check("arrangement.efficiency", pump.drive_efficiency, f"{path}.drive_efficiency")
    _optional("arrangement.motor_rating_w", pump.motor_rating_w, f"{path}.motor_rating")
    check("arrangement.service_factor", pump.service_factor, f"{path}.service_factor")


def validate_duty_profile(profile: DutyProfile, path: str = "duty_profile") -> None:
    """Check the duty bands, their time basis (hours ≤ a leap year's, shares summing to at most 1)."""
    check("duty_profile.bands", len(profile.bands), f"{path}.bands")
    if profile.time_basis not in ("hours", "share"):
        raise ModelError(f"{path}.time_basis", f"must be 'hours' or 'share', got {quote_input(profile.time_basis)}")
    if profile.strategy not in ("fixed_staging", "variable_speed"):
        raise ModelError(f"{path}.strategy",
                         f"must be 'fixed_staging' or 'variable_speed', got {quote_input(profile.strategy)}")
    if profile.pipe not in ("new", "aged"):
        raise ModelError(f"{path}.pipe", f"must be 'new' or 'aged', got {quote_input(profile.pipe)}")
    time_key = "duty_band.hours" if profile.time_basis == "hours" else "duty_band.share"
    total = 0.0
    for i, band in enumerate(profile.bands):
        check("duty_band.flow_m3_s", band.flow_m3_s, f"{path}.bands[{i}].flow")
        total += check(time_key, band.time, f"{path}.bands[{i}].time")
    limit = LIMITS[time_key]
    if profile.bands and total > float(limit.high) * (1.0 + 1e-9):
        whole = "hours in a leap year (8784)" if profile.time_basis == "hours" else "the whole year (100 %)"
        raise ModelError(f"{path}.bands", f"the bands' times add up to more than {whole}", total)
    _optional("duty_profile.annual_volume_m3", profile.annual_volume_m3, f"{path}.annual_volume")
    if profile.annual_volume_m3 is not None and profile.bands and not any(
            b.flow_m3_s > 0.0 and b.time > 0.0 for b in profile.bands):
        raise ModelError(f"{path}.bands", "an annual volume needs at least one band with flow and time to scale")


def validate_criteria(criteria: Criteria, path: str = "criteria") -> None:
    """Check the limits used by the checks, and that each lower bound is below its upper."""
    for side in ("suction", "delivery"):
        low = check("criteria.velocity_m_s", getattr(criteria, f"{side}_velocity_min_m_s"),
                    f"{path}.{side}_velocity_min")
        high = check("criteria.velocity_m_s", getattr(criteria, f"{side}_velocity_max_m_s"),
                     f"{path}.{side}_velocity_max")
        if low > high:
            raise ModelError(f"{path}.{side}_velocity_min", f"minimum {side} velocity is above the maximum")
    check("criteria.velocity_m_s", criteria.sewage_velocity_min_m_s, f"{path}.sewage_velocity_min")
    check("criteria.npsh_margin_ratio", criteria.npsh_margin_ratio, f"{path}.npsh_margin_ratio")
    check("criteria.npsh_margin_min_m", criteria.npsh_margin_min_m, f"{path}.npsh_margin_min")
    for low_name, high_name in (("preferred_region_low", "preferred_region_high"),
                                ("allowable_region_low", "allowable_region_high")):
        low = check("criteria.region", getattr(criteria, low_name), f"{path}.{low_name}")
        high = check("criteria.region", getattr(criteria, high_name), f"{path}.{high_name}")
        if low >= high:
            raise ModelError(f"{path}.{low_name}", "the lower bound must be below the upper bound")
    if not (criteria.allowable_region_low <= criteria.preferred_region_low
            and criteria.preferred_region_high <= criteria.allowable_region_high):
        raise ModelError(f"{path}.preferred_region_low", "the preferred region must lie inside the allowable region")
    check("criteria.trim_warning_limit", criteria.trim_warning_limit, f"{path}.trim_warning_limit")


def validate_energy(energy: EnergyInputs, path: str = "energy") -> None:
    """Check the annual-duty inputs."""
    _optional("energy.operating_hours_per_year", energy.operating_hours_per_year, f"{path}.operating_hours_per_year")
    _optional("energy.annual_volume_m3", energy.annual_volume_m3, f"{path}.annual_volume")
    check("energy.tariff_per_kwh", energy.tariff_per_kwh, f"{path}.tariff_per_kwh")


def validate_project(project: Project) -> None:
    """Check everything a project must satisfy; raise :class:`ModelError` at the first bad field.

    The one set of project rules: the file reader, the command line and the window's
    edits all call this function, so they refuse the same project with the same words
    and the same field path.

    Last, the segments are resolved against the catalogues as the solve resolves them
    (:func:`hydraulics.system_curve.resolve_segments`): an unknown material or fitting type,
    a reducer or expander whose bores contradict it or that has no upstream bore is refused
    here too, naming the fitting's field, so no such project is ever accepted.
    """
    validate_sizes(project)
    _validate_texts(project)
    validate_fluid(project.fluid)
    validate_site(project.site)
    if len(project.segments) < MIN_SEGMENTS:
        raise ModelError("segments", "the project needs at least one pipe segment")
    for i, segment in enumerate(project.segments):
        validate_segment(segment, f"segments[{i}]")
    if project.friction_method not in ("darcy_weisbach", "hazen_williams"):
        raise ModelError("friction_method", "must be 'darcy_weisbach' or 'hazen_williams'")
    pump_ids = [p.pump_id for p in project.pumps]
    if len(set(pump_ids)) != len(pump_ids):
        raise ModelError("pumps", "two pumps share one id")
    for i, pump in enumerate(project.pumps):
        validate_pump(pump, f"pumps[{i}]")
    if project.arrangement is not None:
        validate_arrangement(project.arrangement, project)
    validate_criteria(project.criteria)
    check("other_pumps.count", len(project.other_pumps), "other_pumps")
    if project.other_pumps and project.arrangement is None:
        raise ModelError("other_pumps", "installed pumps beside the arrangement's need an arrangement")
    if project.other_pumps and project.arrangement is not None and project.arrangement.series_stages > 1:
        raise ModelError("other_pumps", "installed pumps beside the arrangement's run in parallel only: "
                         "the arrangement must have 1 series stage")
    for i, other in enumerate(project.other_pumps):
        validate_other_pump(other, project, f"other_pumps[{i}]")
    validate_energy(project.energy)
    validate_duty_profile(project.duty_profile)
    check("project.flow_grid_max_factor", project.flow_grid_max_factor, "flow_grid_max_factor")
    validate_profile(project.profile)
    # Imported here: the catalogue modules below system_curve use this module's limits themselves.
    from hydraulics.system_curve import resolve_segments

    resolve_segments(project)
