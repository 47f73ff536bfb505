"""What the engine returns: frozen dataclasses of SI floats and float64 numpy arrays.

:func:`hydraulics.solve.solve` builds one :class:`Solution` from a
:class:`~hydraulics.model.Project`.  The window, the command line and the reports only
read these objects; none of them computes hydraulics.

Every result type the window and the reports read is defined here (this module sits at
the bottom of the engine: the computing modules import their result types from it) or,
for the fitted pump, re-exported from :mod:`hydraulics.pump_fit`, which needs no result
type of its own.  Arrays are float64 and read-only where the solve says so.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from typing import TYPE_CHECKING, Any, Literal, TypeAlias

import numpy as np
from numpy.typing import NDArray

from hydraulics.main_profile import ProfileLine, ProfileResult
from hydraulics.model import Carries, PipeState, Project, StaticCase
from hydraulics.number_format import plain_number

if TYPE_CHECKING:  # re-exported lazily (see __getattr__): fitting imports the optimiser
    from hydraulics.pump_fit import FitQuality, FittedPump

__all__ = [
    "FloatArray", "Severity", "Regime", "QuotedValue", "ScenarioKey", "FindingTarget",
    "FluidProperties", "SystemCurve", "SegmentResult", "Finding", "render_template", "finding",
    "SEVERITY_ORDER", "FitQuality", "FittedPump", "PumpCurve", "OperatingPoint", "NpshCurve",
    "SpeedForFlow", "VariableSpeedResult", "SpeedPoint", "CapacityResult", "ScenarioEnergy", "EnergyResult",
    "Solution", "ProfileLine", "ProfileResult", "control_label", "PumpSpecificSpeeds", "NpshWorstCase",
    "SpeedCurve", "IsoEfficiencyLine", "DesignFlowPoint", "SpeedMap", "MotorResult",
    "DutyStageCapacity", "DutyBandResult", "DutyProfileResult",
]

FloatArray: TypeAlias = NDArray[np.float64]
"""A float64 numpy array (SI values)."""

Severity = Literal["info", "warning", "critical"]
Regime = Literal["none", "laminar", "transition", "turbulent"]

QuotedValue: TypeAlias = tuple[str, float, str]
"""``(placeholder name, value in SI, quantity)`` of one value quoted in a message."""

ScenarioKey: TypeAlias = tuple[str, str, int, float]
"""``(static, pipe, pumps_running, speed_ratio)``: one operating scenario."""

FindingTarget: TypeAlias = tuple[str, int] | tuple[str, str] | tuple[str, ScenarioKey]
"""What a finding is about: ``("segment", index)``, ``("pump", pump_id)``, ``("site", field)``
or ``("scenario", ScenarioKey)``."""


@dataclass(frozen=True)
class FluidProperties:
    """Properties of the fluid used in the calculation (SI)."""

    temperature_c: float
    density_kg_m3: float
    kinematic_viscosity_m2_s: float
    vapour_pressure_pa: float
    description: str


@dataclass(frozen=True, eq=False)
class SystemCurve:
    """One system curve: head required against flow, with its breakdown.

    All arrays have the same length as ``flow_m3_s``.  Where a vented summit of the main
    governs (crest control), ``static_m`` is the static head to that summit and
    ``friction_m``/``minor_m`` the losses up to it; ``control_chainage_m`` then gives the
    governing summit's chainage at each flow (NaN where the delivery governs), and is
    ``None`` when no summit can govern.
    """

    static: StaticCase
    pipe: PipeState
    flow_m3_s: FloatArray
    head_m: FloatArray
    static_m: FloatArray
    friction_m: FloatArray
    minor_m: FloatArray
    control_chainage_m: FloatArray | None = None

    def control_at(self, index: int) -> str:
        """``"delivery"`` or ``"crest at 1900 m"`` for the flow ``flow_m3_s[index]``."""
        return control_label(None if self.control_chainage_m is None else float(self.control_chainage_m[index]))


def control_label(chainage_m: float | None) -> str:
    """The governing control as plain words: ``"delivery"`` or ``"crest at 1900 m"`` (NaN/None: delivery).

    >>> control_label(None), control_label(1900.0)
    ('delivery', 'crest at 1900 m')
    """
    if chainage_m is None or math.isnan(chainage_m):
        return "delivery"
    return f"crest at {plain_number(chainage_m)} m"


@dataclass(frozen=True)
class SegmentResult:
    """Hydraulics of one segment at one flow (per pipe where pipes run in parallel).

    ``carries`` is ``"pump"`` for a segment of each pump's own branch: ``flow_m3_s`` and
    everything else are then those of ONE of the ``pumps_running`` pumps (the per-pump
    flow); ``"station"`` for the common pipework, at the station flow.
    """

    index: int
    name: str
    side: str
    length_m: float
    internal_diameter_m: float
    roughness_m: float
    parallel_pipes: int
    flow_m3_s: float
    velocity_m_s: float
    reynolds: float
    friction_factor: float
    regime: Regime
    friction_loss_m: float
    minor_k_total: float
    minor_loss_m: float
    carries: Carries = "station"
    pumps_running: int = 1


@dataclass(frozen=True)
class Finding:
    """One result of the checks.

    ``code`` is stable (tests and scripts may rely on it).  ``target`` lets the window
    select what the finding is about: ``("segment", index)``, ``("pump", pump_id)``,
    ``("site", field)``, ``("scenario", (static, pipe, pumps_running, speed_ratio))`` or
    ``None``.

    ``message`` is the text in SI units.  Where a finding quotes physical values,
    ``template`` holds the same text with ``{name}`` placeholders and ``values`` the
    ``(name, value_si, quantity)`` triples, so :meth:`text` can state it in any unit
    system.  Build such findings with :func:`finding`.
    """

    severity: Severity
    code: str
    message: str
    where: str
    remedy: str = ""
    target: FindingTarget | None = None
    template: str = ""
    values: tuple[QuotedValue, ...] = ()

    def text(self, unit_system: str = "SI") -> str:
        """The message with every quoted value in ``unit_system`` ("SI" or "US")."""
        if not self.template:
            return self.message
        return render_template(self.template, self.values, unit_system)


def render_template(template: str, values: tuple[QuotedValue, ...], unit_system: str) -> str:
    """Fill ``{name}`` placeholders with values formatted in ``unit_system``."""
    from hydraulics.units import format_quantity

    return template.format(**{name: format_quantity(v, quantity, unit_system) for name, v, quantity in values})


def finding(severity: Severity, code: str, template: str, values: dict[str, tuple[float, str]], where: str,
            remedy: str = "", target: FindingTarget | None = None) -> Finding:
    """A :class:`Finding` whose quoted values follow the display unit system.

    ``values`` maps each placeholder to ``(value_si, quantity)``.

    >>> f = finding("warning", "velocity_high", "Velocity {v} exceeds {limit}.",
    ...             {"v": (2.9, "velocity"), "limit": (2.5, "velocity")}, "segment 'main'")
    >>> f.message
    'Velocity 2.90 m/s exceeds 2.50 m/s.'
    >>> f.text("US")
    'Velocity 9.51 ft/s exceeds 8.20 ft/s.'
    """
    triples = tuple((name, float(v), q) for name, (v, q) in values.items())
    return Finding(severity, code, render_template(template, triples, "SI"), where, remedy, target,
                   template=template, values=triples)


SEVERITY_ORDER: dict[str, int] = {"critical": 0, "warning": 1, "info": 2}
"""Sort order of severities, most serious first."""


@dataclass(frozen=True, eq=False)
class PumpCurve:
    """The curve of ``pumps_running`` identical pumps at one speed, for plotting.

    All arrays follow ``flow_m3_s`` (station flow, over the data range of the pumps).
    ``shaft_power_w`` is per pump; ``efficiency``, ``shaft_power_w``, ``npsh_required_m``
    are ``None`` without data.  The preferred-region bounds and the best-efficiency flow
    are station flows (per-pump value × pumps running) so they plot on the same axis;
    ``None`` without efficiency data.

    ``head_at_manifold_m`` is the curve as it acts at the manifold, on the same station-flow
    axis: ``head_m`` less the loss through one pump's own suction and discharge branch at
    the per-pump flow, new pipe; ``head_at_manifold_aged_m`` the same with aged pipe.  Both
    are ``None`` when the project has no pump-branch segments (the plain curve then acts
    at the manifold unchanged).
    """

    pumps_running: int
    series_stages: int
    speed_ratio: float
    trim_ratio: float
    flow_m3_s: FloatArray
    flow_per_pump_m3_s: FloatArray
    head_m: FloatArray
    efficiency: FloatArray | None
    shaft_power_w: FloatArray | None
    npsh_required_m: FloatArray | None
    bep_flow_m3_s: float | None
    preferred_flow_min_m3_s: float | None
    preferred_flow_max_m3_s: float | None
    head_at_manifold_m: FloatArray | None = None
    head_at_manifold_aged_m: FloatArray | None = None

    def to_json_dict(self) -> dict[str, Any]:
        def listed(a: FloatArray | None) -> list[float | None] | None:
            # NaN (undefined, e.g. derived power at shut-off) becomes None
            return None if a is None else [v if math.isfinite(v) else None for v in np.asarray(a, float).tolist()]

        return {
            "pumps_running": self.pumps_running, "series_stages": self.series_stages,
            "speed_ratio": self.speed_ratio, "trim_ratio": self.trim_ratio,
            "flow_m3_s": listed(self.flow_m3_s), "flow_per_pump_m3_s": listed(self.flow_per_pump_m3_s),
            "head_m": listed(self.head_m), "efficiency": listed(self.efficiency),
            "shaft_power_w": listed(self.shaft_power_w), "npsh_required_m": listed(self.npsh_required_m),
            "bep_flow_m3_s": self.bep_flow_m3_s,
            "preferred_flow_min_m3_s": self.preferred_flow_min_m3_s,
            "preferred_flow_max_m3_s": self.preferred_flow_max_m3_s,
            "head_at_manifold_m": listed(self.head_at_manifold_m),
            "head_at_manifold_aged_m": listed(self.head_at_manifold_aged_m),
        }


@dataclass(frozen=True)
class OperatingPoint:
    """One scenario's operating point (SI; ``None`` where unknown or not found).

    ``found`` False means no intersection; ``reason`` says why.  A found point may be
    ``extrapolated`` (on the fitted curve beyond the tested flows); ``reason`` then
    describes the extrapolation.  Powers: ``shaft_power_w`` per pump,
    ``shaft_power_total_w`` for all pumps running (and stages), ``input_power_w`` drawn
    from the supply by all of them.
    """

    static: str
    pipe: str
    pumps_running: int
    speed_ratio: float
    trim_ratio: float
    series_stages: int
    static_head_m: float
    found: bool
    reason: str | None
    extrapolated: bool
    flow_m3_s: float | None
    flow_per_pump_m3_s: float | None
    head_m: float | None
    efficiency: float | None
    hydraulic_power_w: float | None
    shaft_power_w: float | None
    shaft_power_total_w: float | None
    input_power_w: float | None
    specific_energy_kwh_m3: float | None
    bep_flow_ratio: float | None
    npsh_available_m: float | None
    npsh_required_m: float | None
    npsh_margin_m: float | None
    npsh_margin_ratio: float | None
    segment_velocities_m_s: tuple[float, ...]
    reason_template: str | None = None
    """``reason`` with ``{name}`` placeholders for its quoted heads (``None``: plain text)."""
    reason_values: tuple[QuotedValue, ...] = ()
    """``(name, value_si, quantity)`` for the placeholders of ``reason_template``."""
    control: str = "delivery"
    """The control that governs the system head there: ``"delivery"`` or ``"crest at 1900 m"``."""
    control_chainage_m: float | None = None
    """Chainage of the governing vented summit (m); ``None`` where the delivery governs."""

    def reason_text(self, unit_system: str = "SI") -> str | None:
        """``reason`` with its quoted values in ``unit_system`` ("SI" or "US")."""
        if self.reason_template is None:
            return self.reason
        return render_template(self.reason_template, self.reason_values, unit_system)

    def to_json_dict(self) -> dict[str, Any]:
        data = asdict(self)
        data["segment_velocities_m_s"] = list(self.segment_velocities_m_s)
        del data["reason_template"], data["reason_values"]  # ``reason`` carries the SI text
        del data["control"], data["control_chainage_m"]  # listed under the results' ``control_point``
        return data


@dataclass(frozen=True, eq=False)
class NpshCurve:
    """NPSH available against station flow (new and aged pipe), and NPSH required.

    ``available_new_m``/``available_aged_m`` are at the lowest suction level (the
    maximum-static scenarios' level and the conservative case); the
    ``available_highest_level_*`` arrays at the highest (``None`` when not computed).
    ``available_*`` are on the station-flow axis ``flow_m3_s`` with ``pumps_running`` pumps
    running (the duty count): the common suction losses at the station flow Q and one
    pump's own suction branch at Q/N are subtracted.  ``required_flow_m3_s``/``required_m``
    are those of one pump at the current speed (the first pump curve), for comparison per
    pump.
    """

    flow_m3_s: FloatArray
    available_new_m: FloatArray
    available_aged_m: FloatArray
    required_flow_m3_s: FloatArray
    required_m: FloatArray | None
    pumps_running: int = 1
    available_highest_level_new_m: FloatArray | None = None
    """NPSH available at the highest suction level (the minimum-static scenarios' level), new pipe."""
    available_highest_level_aged_m: FloatArray | None = None
    """The same with aged pipe."""


@dataclass(frozen=True)
class SpeedForFlow:
    """The speed that delivers the target flow in one scenario (``None`` when not achievable).

    ``limit`` is ``"max_speed"`` when the target needs more than the maximum speed ratio,
    ``"min_speed"`` when even the minimum speed delivers more, else ``None``.
    ``extrapolated`` is True when one pump's corresponding rated flow at that speed lies
    outside the tested data.
    """

    static: str
    pipe: str
    pumps_running: int
    target_flow_m3_s: float
    system_head_m: float
    achievable: bool
    speed_ratio: float | None
    limit: str | None
    reason: str | None
    extrapolated: bool

    def to_json_dict(self) -> dict[str, Any]:
        return {
            "static": self.static, "pipe": self.pipe, "pumps_running": self.pumps_running,
            "target_flow_m3_s": self.target_flow_m3_s, "system_head_m": self.system_head_m,
            "achievable": self.achievable, "speed_ratio": self.speed_ratio, "limit": self.limit,
            "reason": self.reason, "extrapolated": self.extrapolated,
        }


@dataclass(frozen=True)
class VariableSpeedResult:
    """Speeds for the target flow, the lowest lifting speed, and the points re-intersected there.

    ``points`` are the operating points (every static × pipe × 1..N pumps) at each speed of
    ``speeds_solved``; ``points_at_minimum_speed`` the same at the arrangement's minimum
    speed ratio.
    """

    target_flow_m3_s: float
    pumps_running: int
    min_speed_ratio: float
    max_speed_ratio: float
    scenarios: tuple[SpeedForFlow, ...]
    minimum_lift_speed_ratio: float | None
    minimum_lift_reason: str | None
    speeds_solved: tuple[float, ...]
    points: tuple[OperatingPoint, ...]
    points_at_minimum_speed: tuple[OperatingPoint, ...]

    def scenario(self, static: str, pipe: str) -> SpeedForFlow:
        """The result for one static extreme and pipe state."""
        for item in self.scenarios:
            if item.static == static and item.pipe == pipe:
                return item
        raise KeyError((static, pipe))

    def to_json_dict(self) -> dict[str, Any]:
        return {
            "target_flow_m3_s": self.target_flow_m3_s,
            "pumps_running": self.pumps_running,
            "min_speed_ratio": self.min_speed_ratio,
            "max_speed_ratio": self.max_speed_ratio,
            "scenarios": [s.to_json_dict() for s in self.scenarios],
            "minimum_lift_speed_ratio": self.minimum_lift_speed_ratio,
            "minimum_lift_reason": self.minimum_lift_reason,
            "speeds_solved": list(self.speeds_solved),
            "points": [p.to_json_dict() for p in self.points],
            "points_at_minimum_speed": [p.to_json_dict() for p in self.points_at_minimum_speed],
        }


@dataclass(frozen=True, eq=False)
class SpeedCurve:
    """The pump-set curve at one speed ratio, for the variable-speed view (station flow).

    ``kind``: ``"maximum"`` / ``"minimum"`` (the drive's limits), ``"design"`` (a speed
    found for the design flow), ``"step"`` (a speed between).  ``head_m`` is the head at
    the manifold (net of one pump's branch loss at Q/N with ``pipe`` pipe) where the
    project has pump branches, else ``plain_head_m``.  ``efficiency`` per pump, ``None``
    without data.
    """

    speed_ratio: float
    kind: str
    pipe: str
    flow_m3_s: FloatArray
    head_m: FloatArray
    plain_head_m: FloatArray
    efficiency: FloatArray | None


@dataclass(frozen=True, eq=False)
class IsoEfficiencyLine:
    """The station points corresponding to one rated point over the drive's speed range.

    By the affinity laws a parabola H ∝ Q² through the origin (at the manifold less the
    branch loss).  ``side``: ``"below"`` or ``"above"`` the best-efficiency flow, ``"best"``
    (the best-efficiency line) or ``"minimum flow"``.  ``rated_flow_m3_s`` is one pump's
    flow at rated speed and full impeller.
    """

    efficiency: float
    side: str
    rated_flow_m3_s: float
    flow_m3_s: FloatArray
    head_m: FloatArray


@dataclass(frozen=True)
class DesignFlowPoint:
    """The design flow at one static extreme and pipe state, on the axes of the speed map.

    ``head_m`` is the head the common pipework needs (at the manifold: the system head
    less one pump's branch loss at Q/N where the pumps have their own branches);
    ``speed_ratio`` the speed found for it, ``None`` when none in the drive's range.
    """

    static: str
    pipe: str
    flow_m3_s: float
    head_m: float
    speed_ratio: float | None


@dataclass(frozen=True, eq=False)
class SpeedMap:
    """The duty pump set over its speed range (:func:`hydraulics.speed_map.speed_map`).

    ``design_speed_range`` is the lowest and highest speed ratio found for the design flow
    over the static extremes and pipe states (``None`` when none is achievable);
    ``design_flow_met_everywhere`` is True when every one of them is achievable.
    ``minimum_flow_per_pump_m3_s`` is the minimum continuous stable flow of one pump at
    rated speed, ``minimum_flow_source`` says where its value comes from.  ``heads_at_manifold``
    is True when the heads are net of the pumps' own branches.
    """

    pumps_running: int
    min_speed_ratio: float
    max_speed_ratio: float
    curves: tuple[SpeedCurve, ...]
    equal_efficiency: tuple[IsoEfficiencyLine, ...]
    best_efficiency: IsoEfficiencyLine | None
    minimum_flow_per_pump_m3_s: float | None
    minimum_flow_fraction: float | None
    minimum_flow_source: str
    minimum_flow_line: IsoEfficiencyLine | None
    design_speed_range: tuple[float, float] | None
    design_flow_met_everywhere: bool
    heads_at_manifold: bool = False
    design_points: tuple[DesignFlowPoint, ...] = ()


@dataclass(frozen=True)
class SpeedPoint:
    """One checked operating point and why it was solved, with the codes of its findings.

    ``basis`` names each reason the point was solved: ``"fixed speed"`` (the arrangement's
    own speed), ``"minimum speed"``, ``"maximum speed"`` (the drive's range) or
    ``"design flow with 1 pump"`` / ``"design flow with 2 pumps"`` (the speed found for the
    design flow in this scenario).  ``finding_codes`` lists the codes of the point checks
    raised there (operating region, NPSH, extrapolation; each code once).
    """

    point: OperatingPoint
    basis: tuple[str, ...]
    finding_codes: tuple[str, ...]

    def to_json_dict(self) -> dict[str, Any]:
        return {**self.point.to_json_dict(), "basis": list(self.basis), "findings": list(self.finding_codes)}


@dataclass(frozen=True)
class CapacityResult:
    """What the station delivers at the worst case against the design flow.

    The worst case is the maximum static head with aged pipe at the drive's maximum speed
    ratio.  ``flow_all_duty_m3_s`` is the station flow with every duty pump running;
    ``flow_one_out_m3_s`` the flow with the largest pump out of service: the pumps being
    identical, ``pumps_one_out`` = ``duty_count`` when a standby pump can take the place of
    the one out, else ``duty_count − 1`` (0 pumps deliver nothing).  A flow is 0 where the
    pumps cannot lift against the system at all.  Shortfalls are design flow less the flow,
    never negative; the fractions are shares of the design flow.
    """

    design_flow_m3_s: float
    static: str
    pipe: str
    speed_ratio: float
    duty_count: int
    standby_count: int
    flow_all_duty_m3_s: float
    shortfall_all_duty_m3_s: float
    shortfall_all_duty_fraction: float
    pumps_one_out: int
    flow_one_out_m3_s: float
    shortfall_one_out_m3_s: float
    shortfall_one_out_fraction: float
    running_all: str = ""
    """With pumps of different models: the tags running with every duty and assist pump ("P1+P2+P3")."""
    pump_out: str = ""
    """With pumps of different models: the tag of the largest pump, taken out of service."""
    running_one_out: str = ""
    """With pumps of different models: the tags running with it out (a standby in its place)."""

    @property
    def meets_design(self) -> bool:
        """The duty pumps deliver the design flow at the worst case."""
        return self.shortfall_all_duty_m3_s <= 0.0

    @property
    def meets_design_one_out(self) -> bool:
        """The design flow is still delivered with the largest pump out of service."""
        return self.shortfall_one_out_m3_s <= 0.0

    def to_json_dict(self) -> dict[str, Any]:
        return {**asdict(self), "meets_design": self.meets_design,
                "meets_design_one_out": self.meets_design_one_out}


@dataclass(frozen=True)
class MotorResult:
    """Shaft power per pump against the motor (see :mod:`hydraulics.motor`; W, SI).

    ``rating_w`` is the motor's rated output (None: not given), ``rating_with_service_factor_w``
    the rating times the service factor.  Maximum shaft power per pump: over the solved operating
    points (every speed), over the allowable operating region and to the end of the pump curve
    (run-out) at the arrangement's speed and at the maximum speed.  ``non_overloading_size_w`` is
    the smallest standard motor output (IEC 60072-1 series) not below the run-out power.
    """

    rating_w: float | None
    service_factor: float
    rating_with_service_factor_w: float | None
    speed_ratio: float
    max_speed_ratio: float
    max_shaft_power_at_points_w: float | None
    max_shaft_power_allowable_w: float | None
    max_shaft_power_allowable_at_max_speed_w: float | None
    max_shaft_power_run_out_w: float | None
    max_shaft_power_run_out_at_max_speed_w: float | None
    non_overloading_size_w: float | None
    motor_efficiency: float
    drive_efficiency: float
    variable_speed: bool

    def to_json_dict(self) -> dict[str, Any]:
        return asdict(self)


@dataclass(frozen=True)
class ScenarioEnergy:
    """Annual energy if the station ran all year at one operating point (the simple estimate)."""

    static: str
    pipe: str
    pumps_running: int
    speed_ratio: float
    flow_m3_s: float
    head_m: float
    input_power_w: float
    specific_energy_kwh_m3: float
    operating_hours_per_year: float
    annual_volume_m3: float
    annual_energy_kwh: float
    annual_cost: float

    def to_json_dict(self) -> dict[str, Any]:
        return dict(self.__dict__)


@dataclass(frozen=True)
class EnergyResult:
    """Annual energy at both static extremes and their mean (``None`` where not computable).

    The simple estimate: all operating hours at the duty point.  With a duty profile the
    station's energy is :class:`DutyProfileResult`'s.
    """

    basis: str | None
    pipe: str
    pumps_running: int | None
    speed_ratio: float | None
    tariff_per_kwh: float
    currency: str
    at_min_static: ScenarioEnergy | None
    at_max_static: ScenarioEnergy | None
    input_power_mean_w: float | None
    specific_energy_mean_kwh_m3: float | None
    annual_energy_mean_kwh: float | None
    annual_cost_mean: float | None
    notes: tuple[str, ...]

    def to_json_dict(self) -> dict[str, Any]:
        def part(item: ScenarioEnergy | None, key: str) -> float | None:
            return None if item is None else getattr(item, key)

        return {
            "basis": self.basis,
            "pipe": self.pipe,
            "pumps_running": self.pumps_running,
            "speed_ratio": self.speed_ratio,
            "tariff_per_kwh": self.tariff_per_kwh,
            "currency": self.currency,
            "annual_energy_mean_kwh": self.annual_energy_mean_kwh,
            "annual_cost_mean": self.annual_cost_mean,
            "specific_energy_mean_kwh_m3": self.specific_energy_mean_kwh_m3,
            "input_power_mean_w": self.input_power_mean_w,
            "annual_energy_min_static_kwh": part(self.at_min_static, "annual_energy_kwh"),
            "annual_energy_max_static_kwh": part(self.at_max_static, "annual_energy_kwh"),
            "specific_energy_min_static_kwh_m3": part(self.at_min_static, "specific_energy_kwh_m3"),
            "specific_energy_max_static_kwh_m3": part(self.at_max_static, "specific_energy_kwh_m3"),
            "scenarios": [s.to_json_dict() for s in (self.at_min_static, self.at_max_static) if s is not None],
            "notes": list(self.notes),
        }


@dataclass(frozen=True)
class DutyStageCapacity:
    """One stage of the run sequence and its flow at the pumps' own (highest) speeds, at the
    profile's mean static head and pipe state (0 where the pumps cannot lift)."""

    pumps: str
    pumps_running: int
    flow_m3_s: float

    def to_json_dict(self) -> dict[str, Any]:
        return asdict(self)


@dataclass(frozen=True)
class DutyBandResult:
    """How the station meets one band of its duty over a year (:mod:`hydraulics.duty_energy`; SI).

    ``flow_m3_s`` is the band's flow as the station must meet it (after scaling to an annual
    volume), ``hours`` the band's time per year.  ``pumps`` names the running stage
    (``"P1+P2"``; empty for a band without flow).  ``control`` is ``"idle"``, ``"stop–start"``
    (fixed speed, started and stopped), ``"variable speed"`` (slowed to the band flow, running
    the band's whole hours), ``"stop–start at the lowest speed"`` or ``"above capacity"`` (every
    pump of the last stage at its highest speed, the whole band's hours, short).
    ``speed_ratio`` is the common speed of the variable-speed pumps where they are slowed
    (``None``: every pump at its own speed).  While running: ``station_flow_m3_s``,
    ``manifold_head_m``, ``efficiency`` (wire to water: Σ ρ g qᵢ Hᵢ / Σ P_in,i over the pumps
    delivering, with each pump's own head), ``input_power_w`` and ``specific_energy_kwh_m3``.
    ``run_hours`` the hours the pumps run in the band, ``pumped_volume_m3`` the volume they
    deliver, ``shortfall_volume_m3`` the band's volume they cannot; ``energy_kwh`` and ``cost``
    per year.  Powers and energies are ``None`` where the pumps have no efficiency or power data.
    """

    index: int
    flow_m3_s: float
    hours: float
    pumps: str
    pumps_running: int
    control: str
    speed_ratio: float | None
    station_flow_m3_s: float | None
    manifold_head_m: float | None
    efficiency: float | None
    input_power_w: float | None
    specific_energy_kwh_m3: float | None
    run_hours: float
    pumped_volume_m3: float
    shortfall_volume_m3: float
    energy_kwh: float | None
    cost: float | None
    note: str = ""
    bep_flow_ratio_min: float | None = None
    """The lowest share of its best-efficiency flow at which a pump delivering in this band runs."""
    bep_flow_ratio_max: float | None = None
    """The highest such share."""

    @property
    def met(self) -> bool:
        """The station pumps the band's whole volume."""
        return self.shortfall_volume_m3 <= 0.0

    def to_json_dict(self) -> dict[str, Any]:
        return {**asdict(self), "met": self.met}


@dataclass(frozen=True)
class DutyProfileResult:
    """The station's energy over a year of real duty, band by band (:mod:`hydraulics.duty_energy`).

    Computed at ``static_head_m``, the mean of the static extremes (the levels move between
    them in service), with ``pipe`` pipe.  ``flow_scale`` is the factor the band flows were
    multiplied by to pump ``annual_volume_target_m3`` (``None`` without an annual volume).
    Totals per year: ``energy_kwh``, ``cost`` (at ``tariff_per_kwh`` in ``currency``),
    ``volume_m3`` pumped, ``shortfall_volume_m3`` not pumped, ``run_hours`` with pumps running,
    ``specific_energy_kwh_m3`` = energy / volume (the station's mean).  Energies are ``None``
    where a band's power is unknown (``notes`` says why).
    """

    strategy: str
    pipe: str
    time_basis: str
    static_head_m: float
    static_head_min_m: float
    static_head_max_m: float
    flow_scale: float | None
    annual_volume_target_m3: float | None
    stages: tuple[DutyStageCapacity, ...]
    bands: tuple[DutyBandResult, ...]
    hours: float
    run_hours: float
    volume_m3: float
    shortfall_volume_m3: float
    energy_kwh: float | None
    cost: float | None
    specific_energy_kwh_m3: float | None
    tariff_per_kwh: float
    currency: str
    notes: tuple[str, ...] = ()
    basis: str = "mean static head (the levels move between the extremes)"

    def to_json_dict(self) -> dict[str, Any]:
        return {
            "strategy": self.strategy, "pipe": self.pipe, "time_basis": self.time_basis, "basis": self.basis,
            "static_head_m": self.static_head_m, "static_head_min_m": self.static_head_min_m,
            "static_head_max_m": self.static_head_max_m, "flow_scale": self.flow_scale,
            "annual_volume_target_m3": self.annual_volume_target_m3,
            "stages": [s.to_json_dict() for s in self.stages],
            "bands": [b.to_json_dict() for b in self.bands],
            "hours": self.hours, "run_hours": self.run_hours, "volume_m3": self.volume_m3,
            "shortfall_volume_m3": self.shortfall_volume_m3, "energy_kwh": self.energy_kwh, "cost": self.cost,
            "specific_energy_kwh_m3": self.specific_energy_kwh_m3, "tariff_per_kwh": self.tariff_per_kwh,
            "currency": self.currency, "notes": list(self.notes),
        }


@dataclass(frozen=True)
class PumpSpecificSpeeds:
    """A pump's specific speeds at its best-efficiency point, rated speed, full impeller.

    Flow per impeller eye (``impeller_eyes`` = 1 single suction, 2 double suction); the
    head is that of the pump as tested, taken as one stage.  SI forms with n in rpm, Q in
    m³/s and H in m; US forms with gpm and ft; ``omega_s`` dimensionless
    (:mod:`hydraulics.specific_speed`).  The suction values are ``None`` without NPSH data.
    """

    rated_speed_rpm: float
    bep_flow_m3_s: float
    bep_head_m: float
    impeller_eyes: int
    specific_speed_si: float
    specific_speed_us: float
    specific_speed_dimensionless: float
    npsh_required_at_bep_m: float | None
    suction_specific_speed_si: float | None
    suction_specific_speed_us: float | None

    def to_json_dict(self) -> dict[str, Any]:
        return dict(self.__dict__)


@dataclass(frozen=True)
class NpshWorstCase:
    """The conservative NPSH case, stated as such: the highest flow with the lowest level.

    The highest per-pump flow of any found operating point at the arrangement's speed
    (``static``, ``pipe``, ``pumps_running``, ``speed_ratio`` name that point), put together
    with the lowest suction level and the aged suction pipe, whichever static extreme and
    pipe state the point itself belongs to.  ``required_available_m`` is what the criteria
    ask for there (max(ratio × NPSH_R, NPSH_R + minimum margin)); ``sufficient`` compares
    it with ``npsh_available_m``.
    """

    static: str
    pipe: str
    pumps_running: int
    speed_ratio: float
    flow_m3_s: float
    flow_per_pump_m3_s: float
    suction_level_m: float
    npsh_available_m: float
    npsh_required_m: float
    npsh_margin_m: float
    npsh_margin_ratio: float
    required_available_m: float
    sufficient: bool
    basis: str = "highest per-pump flow, lowest suction level, aged suction pipe"

    def to_json_dict(self) -> dict[str, Any]:
        return dict(self.__dict__)


@dataclass(frozen=True)
class InstalledPumpRow:
    """One installed pump as listed in the results: tag, model, role and speed control."""

    tag: str
    pump_id: str
    pump_name: str
    role: str
    control: str
    from_arrangement: bool

    def to_json_dict(self) -> dict[str, Any]:
        return asdict(self)


@dataclass(frozen=True)
class PumpShare:
    """What one running pump does at a pump-set point (SI; ``None`` where unknown).

    ``head_m`` is the pump's own head (at its flanges); the manifold head is the point's.
    ``shut_off`` marks a pump whose head cannot open its check valve against the manifold
    head: it delivers nothing and runs at shut-off.
    """

    tag: str
    pump_id: str
    pump_name: str
    role: str
    speed_ratio: float
    flow_m3_s: float | None
    head_m: float | None
    efficiency: float | None
    shaft_power_w: float | None
    input_power_w: float | None
    bep_flow_ratio: float | None
    npsh_available_m: float | None
    npsh_required_m: float | None
    shut_off: bool
    extrapolated: bool

    @property
    def npsh_margin_m(self) -> float | None:
        """NPSH available less required (m), where both are known."""
        if self.npsh_available_m is None or self.npsh_required_m is None:
            return None
        return self.npsh_available_m - self.npsh_required_m

    def to_json_dict(self) -> dict[str, Any]:
        return {**asdict(self), "npsh_margin_m": self.npsh_margin_m}


@dataclass(frozen=True)
class PumpSetPoint:
    """An operating point of installed pumps of different models (or roles) running in parallel.

    ``running`` lists the tags of the pumps running; ``basis`` says why this set was solved
    (a stage of the run sequence, or a pump out of service with a standby in its place);
    ``speed`` is ``"highest speed"`` (every pump at its own speed ratio) or ``"lowest speed"``
    (the variable-speed pumps at their minimum).  ``found`` False: ``reason`` says why.
    """

    static: str
    pipe: str
    running: tuple[str, ...]
    basis: str
    speed: str
    found: bool
    reason: str | None
    flow_m3_s: float | None
    manifold_head_m: float | None
    input_power_w: float | None
    specific_energy_kwh_m3: float | None
    shares: tuple[PumpShare, ...]

    @property
    def label(self) -> str:
        """``"P1+P2+P3"``."""
        return "+".join(self.running)

    def to_json_dict(self) -> dict[str, Any]:
        return {"static": self.static, "pipe": self.pipe, "running": list(self.running), "basis": self.basis,
                "speed": self.speed, "found": self.found, "reason": self.reason, "flow_m3_s": self.flow_m3_s,
                "manifold_head_m": self.manifold_head_m, "input_power_w": self.input_power_w,
                "specific_energy_kwh_m3": self.specific_energy_kwh_m3,
                "pumps": [share.to_json_dict() for share in self.shares]}


@dataclass(frozen=True, eq=False)
class PumpSetCurve:
    """The combined curve of pumps of different models in parallel, at the manifold (SI).

    ``running`` lists the tags of the pumps; ``flow_m3_s`` is the station flow at each
    manifold head of ``head_m`` (the sum of the pumps' flows at that head, see
    :mod:`hydraulics.pump_set_curves`), rising; ``pump_flow_m3_s`` each pump's share,
    shape (points, pumps), zero where a pump cannot open its check valve.
    """

    running: tuple[str, ...]
    flow_m3_s: FloatArray
    head_m: FloatArray
    pump_flow_m3_s: FloatArray

    @property
    def label(self) -> str:
        """``"P1+P3"``."""
        return "+".join(self.running)


@dataclass(frozen=True, eq=False)
class PumpSetCurves:
    """What the head–flow plot draws of the installed pumps (first stage of a solve).

    ``arrangement_stages`` names the pumps running in the arrangement's identical stages
    (``"P1"``, ``"P1+P2"`` for 1, 2 … duty pumps); ``curves`` the combined curve of every
    stage of the run sequence that includes other pumps.
    """

    arrangement_stages: tuple[str, ...]
    curves: tuple[PumpSetCurve, ...] = ()


@dataclass(frozen=True)
class PumpMotor:
    """The motor check of one installed pump of another model than the arrangement's."""

    tag: str
    pump_id: str
    pump_name: str
    motor: MotorResult

    def to_json_dict(self) -> dict[str, Any]:
        return {"tag": self.tag, "pump_id": self.pump_id, "pump_name": self.pump_name,
                **self.motor.to_json_dict()}


@dataclass(frozen=True)
class PumpSetResult:
    """The installed pumps, the run sequence and the points of pumps of different models together.

    ``stages`` lists, per stage of the run sequence, the tags running (stage k: the first k
    duty pumps, then assist pumps).  The arrangement's identical stages are the ordinary
    operating points (``Solution.operating_points``, ``pumps_running`` = k); ``points`` holds
    the others: stages with other pumps and the sets with a standby in service.
    """

    pumps: tuple[InstalledPumpRow, ...]
    stages: tuple[tuple[str, ...], ...]
    points: tuple[PumpSetPoint, ...] = ()
    motors: tuple[PumpMotor, ...] = ()
    """The motor of each pump beside the arrangement's (the arrangement's is ``Solution.motor``)."""

    def running_label(self, pumps_running: int) -> str:
        """The tags of the arrangement's first ``pumps_running`` duty pumps (``"P1+P2"``)."""
        duty = [p.tag for p in self.pumps if p.from_arrangement and p.role == "duty"]
        return "+".join(duty[:pumps_running])

    def to_json_dict(self) -> dict[str, Any]:
        return {"pumps": [p.to_json_dict() for p in self.pumps], "stages": [list(s) for s in self.stages],
                "points": [p.to_json_dict() for p in self.points],
                "motors": [m.to_json_dict() for m in self.motors]}


@dataclass(frozen=True)
class Solution:
    """Everything the engine computed for a project.

    Pump-related parts are empty tuples (``pump_fits``, ``operating_points``,
    ``pump_curves``) or ``None`` (``variable_speed``, ``energy``,
    ``npsh_available_curve``) when the project has no pump.

    ``complete`` is False for the first stage of a solve
    (:func:`hydraulics.solve.solve_curves`): curves, pump curves, operating points, NPSH
    and energy are final, but the checks (``findings``), the variable-speed results, the
    design ``capacity`` and the checked ``speed_points`` (every point the checks saw: the
    arrangement's speed, the drive's minimum and maximum, the speeds for the design flow)
    are not computed yet; nor is ``speed_map`` (the pump set over its speed range).
    """

    project: Project
    fluid: FluidProperties
    atmospheric_pressure_pa: float
    static_head_min_m: float
    static_head_max_m: float
    design_flow_m3_s: float
    curves: tuple[SystemCurve, ...]
    segments: tuple[SegmentResult, ...]
    findings: tuple[Finding, ...] = ()
    pump_fits: tuple[FittedPump, ...] = ()
    operating_points: tuple[OperatingPoint, ...] = ()
    variable_speed: VariableSpeedResult | None = None
    energy: EnergyResult | None = None
    pump_curves: tuple[PumpCurve, ...] = ()
    npsh_available_curve: NpshCurve | None = None
    complete: bool = True
    profile: ProfileResult | None = None
    specific_speeds: tuple[PumpSpecificSpeeds | None, ...] = ()
    """Per entry of ``pump_fits``: its specific speeds (``None`` without a best-efficiency point)."""
    npsh_worst_case: NpshWorstCase | None = None
    """The conservative NPSH case (``None`` without a pump, NPSH data or a found point)."""
    capacity: CapacityResult | None = None
    speed_points: tuple[SpeedPoint, ...] = ()
    speed_map: SpeedMap | None = None
    motor: MotorResult | None = None
    pump_set: PumpSetResult | None = None
    """The installed pumps and the points of dissimilar pumps together (``None`` without a pump)."""
    duty_profile: DutyProfileResult | None = None
    """The energy over the year of the project's duty profile (``None`` without bands or a pump;
    the second stage)."""
    pump_set_curves: PumpSetCurves | None = None
    """Tags of the identical stages and combined curves with other pumps (first stage; ``None`` without a pump)."""

    def curve(self, static: StaticCase, pipe: PipeState) -> SystemCurve:
        """The system curve for one static extreme and pipe state."""
        for c in self.curves:
            if c.static == static and c.pipe == pipe:
                return c
        raise KeyError((static, pipe))


_FROM_PUMP_FIT = frozenset({"FitQuality", "FittedPump"})


def __getattr__(name: str) -> Any:
    """The fitted-pump types, imported on first use so that loading the results stays light."""
    if name in _FROM_PUMP_FIT:
        from hydraulics import pump_fit

        return getattr(pump_fit, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
