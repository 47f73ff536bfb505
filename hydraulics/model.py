"""The project model: frozen dataclasses holding plain SI floats.

Every quantity is a float in SI base units; the unit is part of each field's name
(``_m`` metres, ``_pa`` pascals, ``_m3_s`` cubic metres per second, ``_m2_s`` square
metres per second, ``_kg_m3`` kilograms per cubic metre, ``_w`` watts).  Ratios
(efficiency, speed ratio) are plain fractions, never percentages.

The model is immutable: an edit builds a new object with :func:`dataclasses.replace`.
Units are parsed at the edges (file reader, table cells); every rule a project must
satisfy is stated once, in :func:`hydraulics.validation.validate_project`, which the
file reader, the command line and the window all call.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

Side = Literal["suction", "delivery"]
Carries = Literal["pump", "station"]
"""What a segment carries: ``"pump"``, the flow of one running pump (a pump's own suction or
discharge branch); ``"station"``, the station flow (common suction header, manifold, main)."""
FrictionMethod = Literal["darcy_weisbach", "hazen_williams"]
PipeState = Literal["new", "aged"]
StaticCase = Literal["min", "max"]
PumpRole = Literal["duty", "assist", "standby"]
"""What an installed pump is for: ``"duty"`` runs in normal operation, ``"assist"`` is switched
in when the duty pumps cannot meet the flow, ``"standby"`` runs only in place of a pump out of
service."""
ControlStrategy = Literal["fixed_staging", "variable_speed"]
"""How the station meets a flow below its capacity: ``"fixed_staging"`` runs the fewest pumps
whose flow reaches it, at their own speeds, and stops and starts them (the pumped volume is the
band's); ``"variable_speed"`` slows the variable-speed pumps of that stage until the flow matches."""
TimeBasis = Literal["hours", "share"]


class ModelError(ValueError):
    """A value outside its allowed range.

    Carries the dotted field path (``segments[2].length``), the offending value and
    a plain description of the allowed range, so that the file reader, the command
    line and the window can all point at the field.
    """

    def __init__(self, field_path: str, problem: str, value: object = None):
        self.field_path = field_path
        self.problem = problem
        self.value = value
        super().__init__(f"{field_path}: {problem}")


# --------------------------------------------------------------------------- fluid
@dataclass(frozen=True)
class WaterFluid:
    """Water with properties from temperature by the IAPWS formulations (0–100 °C)."""

    temperature_c: float = 15.0
    kind: Literal["water"] = "water"


@dataclass(frozen=True)
class UserFluid:
    """A fluid whose properties the user gives directly."""

    name: str = "user fluid"
    density_kg_m3: float = 1000.0
    kinematic_viscosity_m2_s: float = 1.0e-6
    vapour_pressure_pa: float = 2339.0
    temperature_c: float = 20.0
    kind: Literal["user"] = "user"


Fluid = WaterFluid | UserFluid


# --------------------------------------------------------------------------- site
@dataclass(frozen=True)
class TankDelivery:
    """Delivery into an open tank whose water level varies between two values."""

    level_low_m: float
    level_high_m: float
    kind: Literal["tank"] = "tank"


@dataclass(frozen=True)
class PressurisedDelivery:
    """Delivery into a point at an elevation that must receive a gauge pressure."""

    elevation_m: float
    pressure_pa: float
    kind: Literal["pressurised"] = "pressurised"


Delivery = TankDelivery | PressurisedDelivery


@dataclass(frozen=True)
class Site:
    """Levels of the site, all elevations above one common datum (m).

    ``atmospheric_pressure_pa`` when given overrides the standard-atmosphere value
    computed from ``altitude_m``.
    """

    suction_level_low_m: float
    suction_level_high_m: float
    delivery: Delivery
    pump_datum_m: float
    design_flow_m3_s: float
    altitude_m: float = 0.0
    atmospheric_pressure_pa: float | None = None


# --------------------------------------------------------------------------- pipework
@dataclass(frozen=True)
class Fitting:
    """A row of identical fittings in one segment.

    ``fitting_id`` names an entry of the fittings catalogue; ``k_override`` when
    given replaces the catalogue K of one fitting (K refers to the segment velocity).
    A reducer or expander sits at the inlet of its segment: ``other_diameter_m`` is the
    bore upstream of it (``None``: the bore of the previous segment in flow order) and
    ``angle_deg`` its included cone angle (``None``: a sudden change of bore).
    """

    fitting_id: str
    count: int = 1
    k_override: float | None = None
    angle_deg: float | None = None
    other_diameter_m: float | None = None


@dataclass(frozen=True)
class Segment:
    """One pipe run of constant internal diameter.

    The internal diameter is always held resolved.  When ``pipe_series`` and
    ``nominal_size`` are set the diameter came from the pipe-series catalogue and the
    window steps through that series; otherwise it was typed.
    ``roughness_new_m``/``roughness_aged_m``/``hw_c_new``/``hw_c_aged`` override the
    material catalogue when not ``None``.  ``carries`` says whether the segment is part
    of each pump's own branch (``"pump"``: it carries one running pump's flow, and idle
    pumps' branches carry nothing) or common pipework (``"station"``: the station flow).
    Flow order: station suction, pump suction branch, pump, pump discharge branch,
    station delivery (manifold and main), each in table order.
    """

    name: str
    side: Side
    material_id: str
    length_m: float
    internal_diameter_m: float
    pipe_series: str | None = None
    nominal_size: str | None = None
    start_elevation_m: float | None = None
    end_elevation_m: float | None = None
    parallel_pipes: int = 1
    fittings: tuple[Fitting, ...] = ()
    roughness_new_m: float | None = None
    roughness_aged_m: float | None = None
    hw_c_new: float | None = None
    hw_c_aged: float | None = None
    carries: Carries = "station"


@dataclass(frozen=True)
class ProfilePoint:
    """One point of the main's longitudinal profile: pipe elevation at a chainage.

    Chainage runs along the common delivery pipework (the ``"station"`` delivery
    segments in table order, laid end to end from chainage 0); the pipe elevation is
    linear between points.  ``air_valve`` marks a vented summit.
    """

    chainage_m: float
    elevation_m: float
    air_valve: bool = False


# --------------------------------------------------------------------------- pumps
@dataclass(frozen=True)
class PumpModel:
    """A pump as the manufacturer tested it, at ``rated_speed_rpm``.

    Point arrays are tuples of floats of equal length, sorted by flow.  Optional
    columns are empty tuples when absent.  Efficiency is a fraction (0–1).
    """

    pump_id: str
    name: str
    rated_speed_rpm: float
    flow_m3_s: tuple[float, ...]
    head_m: tuple[float, ...]
    efficiency: tuple[float, ...] = ()
    shaft_power_w: tuple[float, ...] = ()
    npsh_required_m: tuple[float, ...] = ()
    impeller_diameter_m: float | None = None
    head_fit_order: int = 2
    efficiency_fit_order: int = 2
    power_fit_order: int = 2
    notes: str = ""
    source_file: str = ""
    """The name of the pump data file the points were read from ("" when typed or unknown)."""
    source_comments: tuple[str, ...] = ()
    """The comment lines of that file, as written there (without the leading '#')."""


@dataclass(frozen=True)
class Arrangement:
    """How the station uses its pumps.

    ``duty_count`` identical pumps run in parallel (1..N); ``standby_count`` are
    installed but not counted as duty.  ``series_stages`` pumps of the set in series
    per duty line.  ``speed_ratio`` is n/n_rated; ``trim_ratio`` D/D_rated.

    ``variable_speed`` False (the default) is a fixed-speed pump: it runs only at
    ``speed_ratio`` (``min_speed_ratio`` = ``max_speed_ratio`` = ``speed_ratio``) and no
    speed is searched.  A variable-speed pump runs in [min, max] behind a drive of
    ``drive_efficiency`` (default for a new drive :data:`DEFAULT_DRIVE_EFFICIENCY`).
    ``motor_rating_w`` is the motor's rated output power (None: not given);
    ``service_factor`` its service factor (NEMA MG 1 motors 1.0 or 1.15, IEC motors 1.0;
    common practice).  A fixed-speed motor on line has no drive: drive efficiency 1.0.
    """

    pump_id: str
    duty_count: int = 1
    standby_count: int = 0
    series_stages: int = 1
    speed_ratio: float = 1.0
    trim_ratio: float = 1.0
    min_speed_ratio: float = 1.0
    max_speed_ratio: float = 1.0
    motor_efficiency: float = 0.95
    drive_efficiency: float = 1.0
    variable_speed: bool = False
    motor_rating_w: float | None = None
    service_factor: float = 1.0

    def __post_init__(self) -> None:
        if not self.variable_speed:  # a fixed-speed pump's range is its own speed, whatever was passed
            object.__setattr__(self, "min_speed_ratio", self.speed_ratio)
            object.__setattr__(self, "max_speed_ratio", self.speed_ratio)


@dataclass(frozen=True)
class InstalledPump:
    """A pump installed beside the arrangement's identical duty and standby pumps.

    A pump of another model (a smaller jockey pump, a larger assist) or one more of the same,
    with its own branch built like the others (the ``"pump"`` segments).  ``role`` says when it
    runs (:data:`PumpRole`).  ``speed_ratio`` is the speed it runs at in the station's
    operating points (a fixed-speed pump always); a ``variable_speed`` pump may be slowed down
    to ``min_speed_ratio``, together with the arrangement's variable-speed pumps (one common
    speed ratio for every variable-speed pump running; common practice for parallel pumps on
    drives).  Motor and drive efficiencies, motor rating and service factor as for
    :class:`Arrangement`.
    """

    pump_id: str
    role: PumpRole = "assist"
    variable_speed: bool = False
    speed_ratio: float = 1.0
    min_speed_ratio: float = 1.0
    trim_ratio: float = 1.0
    motor_efficiency: float = 0.95
    drive_efficiency: float = 1.0
    motor_rating_w: float | None = None
    service_factor: float = 1.0


DEFAULT_DRIVE_EFFICIENCY = 0.97
"""Efficiency of a variable-speed drive at full load when none is given (common practice for a
VFD at full load (from memory; verify))."""

DEFAULT_SPEED_RANGE = (0.6, 1.0)
"""Speed range a pump is given when it is switched to variable speed (common practice)."""


# --------------------------------------------------------------------------- criteria
@dataclass(frozen=True)
class Criteria:
    """Limits the checks apply (defaults: common practice; see hydraulics.checks)."""

    suction_velocity_min_m_s: float = 0.6
    suction_velocity_max_m_s: float = 1.5
    delivery_velocity_min_m_s: float = 0.6
    delivery_velocity_max_m_s: float = 2.5
    sewage: bool = False
    sewage_velocity_min_m_s: float = 0.75
    npsh_margin_ratio: float = 1.1
    npsh_margin_min_m: float = 0.6
    preferred_region_low: float = 0.70
    preferred_region_high: float = 1.20
    allowable_region_low: float = 0.40
    allowable_region_high: float = 1.30
    trim_warning_limit: float = 0.15


@dataclass(frozen=True)
class EnergyInputs:
    """Annual duty and tariff.  Give ``operating_hours_per_year`` or ``annual_volume_m3``."""

    operating_hours_per_year: float | None = 4000.0
    annual_volume_m3: float | None = None
    tariff_per_kwh: float = 0.15
    currency: str = "EUR"


@dataclass(frozen=True)
class DutyBand:
    """One band of the station's duty: a flow and the time it is needed.

    ``time`` is hours per year, or the share of the year (a fraction, 0–1), as the profile's
    :data:`TimeBasis` says.
    """

    flow_m3_s: float
    time: float


@dataclass(frozen=True)
class DutyProfile:
    """The station's duty over a year: flow bands, and how the station meets them.

    Without bands there is no profile (the energy is then only the simple estimate of
    :class:`EnergyInputs`).  With ``annual_volume_m3`` the band flows are an inflow pattern:
    they are scaled by one common factor so that the year's volume Σ Q t is that volume.
    ``pipe`` is the pipe state the year is computed for (aged: the condition over most of a
    main's life).
    """

    bands: tuple[DutyBand, ...] = ()
    time_basis: TimeBasis = "hours"
    annual_volume_m3: float | None = None
    strategy: ControlStrategy = "fixed_staging"
    pipe: PipeState = "aged"


@dataclass(frozen=True)
class TitleBlock:
    """Who made the calculation, for what, and when: the title block of a report (free text)."""

    site: str = ""
    revision: str = ""
    date: str = ""
    prepared_by: str = ""
    checked_by: str = ""


@dataclass(frozen=True)
class Project:
    """A whole pumping-station scheme."""

    name: str
    site: Site
    fluid: Fluid = field(default_factory=WaterFluid)
    segments: tuple[Segment, ...] = ()
    friction_method: FrictionMethod = "darcy_weisbach"
    pumps: tuple[PumpModel, ...] = ()
    arrangement: Arrangement | None = None
    criteria: Criteria = field(default_factory=Criteria)
    energy: EnergyInputs = field(default_factory=EnergyInputs)
    flow_grid_max_factor: float = 1.6
    notes: str = ""
    profile: tuple[ProfilePoint, ...] = ()
    other_pumps: tuple[InstalledPump, ...] = ()
    """Installed pumps beyond the arrangement's identical duty and standby pumps (see
    :func:`hydraulics.pump_set.installed_pumps` for the whole list)."""
    duty_profile: DutyProfile = field(default_factory=DutyProfile)
    title_block: TitleBlock = field(default_factory=TitleBlock)

    def pump(self, pump_id: str) -> PumpModel | None:
        """The pump model with ``pump_id``, or ``None``."""
        for pump in self.pumps:
            if pump.pump_id == pump_id:
                return pump
        return None

    @property
    def duty_pump(self) -> PumpModel | None:
        """The pump model the arrangement uses, or ``None``."""
        if self.arrangement is None:
            return None
        return self.pump(self.arrangement.pump_id)
