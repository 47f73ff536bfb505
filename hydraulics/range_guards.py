"""Range guards: findings where a method is used outside the range it was published for.

Four guards, each a small function, joined by :func:`range_guard_findings` (the one call the
solve makes):

* :func:`hazen_williams_findings` — Hazen–Williams outside its validity (a fluid other than
  water, water outside ordinary temperatures, or laminar or transitional flow).
* :func:`viscous_fluid_findings` — a viscous user fluid with pump curves used as tested on water.
* :func:`check_valve_findings` — a check valve whose velocity at the lowest operating flow is
  below the minimum for full disc lift (Crane TP-410).
* :func:`fit_quality_findings` — a pump fit that strays from its data.

Stable codes (never renamed; scripts and tests rely on them):

=================================  ======================================================
``hazen_williams_out_of_range``    Hazen–Williams used outside its validity
``pump_curves_not_viscosity_corrected``  viscous user fluid, pump curves uncorrected
``check_valve_not_fully_open``     velocity through a check valve below full disc lift
``head_fit_poor``                  head fit residuals above the threshold
``efficiency_fit_poor``            efficiency fit residuals above the threshold
``efficiency_peak_above_data``     fitted peak efficiency above every data point
=================================  ======================================================
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING

import numpy as np

from hydraulics import fittings
from hydraulics.friction import darcy_friction_factor
from hydraulics.model import Project, UserFluid, WaterFluid
from hydraulics.number_format import fixed_decimals, percent_number
from hydraulics.results import Finding, FluidProperties, SegmentResult, finding

if TYPE_CHECKING:
    from hydraulics.pump_fit import FittedPump

HAZEN_WILLIAMS_WATER_MIN_C = 5.0
"""Lowest water temperature for Hazen–Williams (°C): the method was derived from tests on water
at ordinary temperatures (Williams & Hazen, *Hydraulic Tables*, 1920; Brater & King, *Handbook of
Hydraulics*, 7th ed., 1996, ch. 6).  The bound about 5 °C is from memory; verify."""

HAZEN_WILLIAMS_WATER_MAX_C = 25.0
"""Highest water temperature for Hazen–Williams (°C), same sources; about 25 °C, from memory;
verify (the bound stated with :func:`hydraulics.friction.hazen_williams`)."""

VISCOSITY_CORRECTION_THRESHOLD_M2_S = 4.0e-6
"""Kinematic viscosity above which a pump's water-test curves need the viscosity correction of
ANSI/HI 9.6.7 (*Effects of Liquid Viscosity on Rotodynamic Pump Performance*): about 4 mm²/s
(4 cSt), where the Hydraulic Institute's correction starts to matter (from memory; verify
against the standard)."""

HEAD_FIT_RMS_LIMIT = 0.02
"""Head fit RMS residual above this fraction of the shut-off head is a poor fit (common practice)."""

EFFICIENCY_FIT_MAX_LIMIT = 0.03
"""Efficiency fit residual above 3 percentage points at any data point is a poor fit (common practice)."""

EFFICIENCY_PEAK_MARGIN = 0.02
"""Fitted peak efficiency more than 2 percentage points above every data point (common practice)."""


def range_guard_findings(project: Project, fluid: FluidProperties, at_design: Sequence[SegmentResult],
                         at_lowest_flow: Sequence[SegmentResult] | None,
                         fitted: Sequence[FittedPump]) -> list[Finding]:
    """Every range-guard finding of a solved project.

    ``at_design`` is the segment table at design flow, ``at_lowest_flow`` the table at the
    lowest operating flow each segment sees (per pump in a pump branch; ``None`` without
    operating points: the design flow is used), ``fitted`` the pumps in use.
    """
    out = hazen_williams_findings(project, at_design)
    out += check_valve_findings(project, at_design if at_lowest_flow is None else at_lowest_flow,
                                fluid.density_kg_m3, operating=at_lowest_flow is not None)
    for pump in fitted:
        out += viscous_fluid_findings(project, pump)
        out += fit_quality_findings(pump)
    return out


# ------------------------------------------------------------------ Hazen–Williams
def darcy_to_hazen_williams_ratio(segment: SegmentResult) -> float:
    """Darcy–Weisbach friction loss over the Hazen–Williams loss of one segment at its flow.

    The Darcy factor (:func:`hydraulics.friction.darcy_friction_factor`: f = 64/Re laminar,
    Colebrook–White turbulent) at the segment's Reynolds number and relative roughness, over
    the equivalent Darcy factor of its Hazen–Williams loss (``friction_factor`` under
    Hazen–Williams, f = 2 g D h_f / (L v²)): same L, D and v, so the ratio of factors is the
    ratio of losses.  NaN where either is undefined.
    """
    if not (segment.friction_factor > 0.0 and np.isfinite(segment.reynolds)):
        return float("nan")
    f_dw = float(darcy_friction_factor(segment.reynolds, segment.roughness_m / segment.internal_diameter_m))
    return f_dw / segment.friction_factor


def hazen_williams_findings(project: Project, at_design: Sequence[SegmentResult]) -> list[Finding]:
    """Hazen–Williams used outside its validity: a critical finding for each reason.

    Hazen–Williams (Williams & Hazen, 1920) is an empirical law for water at ordinary
    temperatures in turbulent flow (Brater & King, *Handbook of Hydraulics*, ch. 6): its C
    values carry no viscosity, so a user fluid, water outside
    :data:`HAZEN_WILLIAMS_WATER_MIN_C`–:data:`HAZEN_WILLIAMS_WATER_MAX_C`, or any segment in
    laminar or transitional flow (Re < 4000) at design flow puts the friction loss in doubt.
    The regime finding quotes the ratio of the Darcy–Weisbach loss to the one used
    (:func:`darcy_to_hazen_williams_ratio`) at the segment where it is largest.
    """
    if project.friction_method != "hazen_williams":
        return []
    remedy = "Use Darcy–Weisbach (Colebrook–White), which holds for any fluid and flow regime."
    out: list[Finding] = []
    fluid = project.fluid
    if isinstance(fluid, UserFluid):
        out.append(finding(
            "critical", "hazen_williams_out_of_range",
            "Hazen–Williams is used with the user fluid '" + fluid.name + "' (kinematic viscosity {nu}); its C "
            "values hold for water only.",
            {"nu": (fluid.kinematic_viscosity_m2_s, "kinematic_viscosity")},
            "friction method", remedy, ("site", "friction_method")))
    elif isinstance(fluid, WaterFluid) and not (
            HAZEN_WILLIAMS_WATER_MIN_C <= fluid.temperature_c <= HAZEN_WILLIAMS_WATER_MAX_C):
        out.append(finding(
            "critical", "hazen_williams_out_of_range",
            "Hazen–Williams is used with water at {t}, outside the ordinary temperatures {lo}–{hi} its C values "
            "were measured at.",
            {"t": (fluid.temperature_c, "temperature"), "lo": (HAZEN_WILLIAMS_WATER_MIN_C, "temperature"),
             "hi": (HAZEN_WILLIAMS_WATER_MAX_C, "temperature")},
            "friction method", remedy, ("site", "friction_method")))
    slow = [s for s in at_design if s.regime in ("laminar", "transition")]
    if slow:
        ratios = [darcy_to_hazen_williams_ratio(s) for s in slow]
        finite = [(r, s) for r, s in zip(ratios, slow, strict=True) if np.isfinite(r)]
        names = ", ".join(f"'{s.name}'" for s in slow)
        text = (f"Hazen–Williams is used where the flow at design flow is laminar or transitional "
                f"(Re < 4000 in {names}); the method holds for turbulent flow only.")
        worst = slow[0]
        if finite:
            ratio, worst = max(finite, key=lambda pair: pair[0])
            text += (f" In '{worst.name}' (Re = {fixed_decimals(worst.reynolds, 0)}) Darcy–Weisbach gives "
                     f"{fixed_decimals(ratio, 2)} times the friction loss used.")
        out.append(Finding("critical", "hazen_williams_out_of_range", text,
                           f"segment '{worst.name}' ({worst.side})", remedy, ("segment", worst.index)))
    return out


# ------------------------------------------------------------------ viscous fluids
def viscous_fluid_findings(project: Project, fitted: FittedPump) -> list[Finding]:
    """A user fluid above :data:`VISCOSITY_CORRECTION_THRESHOLD_M2_S` with water-test pump curves.

    Pump test curves are measured on water (ISO 9906); a viscous liquid lowers head, flow
    and above all efficiency and raises power.  PumpSketch does not apply the Hydraulic
    Institute's correction (ANSI/HI 9.6.7): the finding is critical and names the method.
    """
    fluid = project.fluid
    if not isinstance(fluid, UserFluid) or fluid.kinematic_viscosity_m2_s <= VISCOSITY_CORRECTION_THRESHOLD_M2_S:
        return []
    return [finding(
        "critical", "pump_curves_not_viscosity_corrected",
        "The fluid '" + fluid.name + "' has a kinematic viscosity of {nu}, above {limit}: the pump curves are "
        "used as tested on water, without the ANSI/HI 9.6.7 viscosity correction of head, flow, efficiency "
        "and power.",
        {"nu": (fluid.kinematic_viscosity_m2_s, "kinematic_viscosity"),
         "limit": (VISCOSITY_CORRECTION_THRESHOLD_M2_S, "kinematic_viscosity")},
        f"pump '{fitted.pump.name}'",
        "Enter pump curves corrected for this liquid by ANSI/HI 9.6.7 (or the manufacturer's viscous "
        "curves).", ("pump", fitted.pump.pump_id))]


# ------------------------------------------------------------------ check valves
def check_valve_findings(project: Project, segments: Sequence[SegmentResult], density_kg_m3: float,
                         operating: bool = True) -> list[Finding]:
    """Check valves whose velocity is below the minimum for full disc lift (Crane TP-410).

    For every segment holding a check or foot valve of the catalogue (an entry with
    ``full_lift_velocity_factor_us``), the segment velocity in ``segments`` (the lowest
    operating flow, per pump in a pump branch) against v_min = C √V̄
    (:func:`hydraulics.fittings.full_lift_velocity_m_s`).  Below it the disc is not held
    fully open: it may flutter and wear, and the loss is above the catalogue K.
    """
    catalogue = fittings.fitting_catalogue()
    at = "the lowest operating flow" if operating else "design flow"
    out: list[Finding] = []
    for seg_result, segment in zip(segments, project.segments, strict=True):
        if seg_result.flow_m3_s <= 0.0:
            continue
        for row in segment.fittings:
            kind = catalogue.get(row.fitting_id)
            if row.count <= 0 or kind is None:
                continue
            v_min = fittings.full_lift_velocity_m_s(kind, density_kg_m3)
            if v_min is None or seg_result.velocity_m_s >= v_min:
                continue
            per_pump = " per pump" if seg_result.carries == "pump" else ""
            out.append(finding(
                "warning", "check_valve_not_fully_open",
                "At " + at + " ({q}" + per_pump + ") the velocity {v} through the " + kind.name.lower()
                + " is below {vmin}, the minimum for full disc lift: the disc may flutter and wear.",
                {"q": (seg_result.flow_m3_s, "flow"), "v": (seg_result.velocity_m_s, "velocity"),
                 "vmin": (v_min, "velocity")},
                f"segment '{segment.name}' ({segment.side})",
                "Choose a check valve sized for the low flow (a smaller bore, or a type that opens fully at "
                "lower velocity).", ("segment", seg_result.index)))
    return out


# ------------------------------------------------------------------ fit quality
def fit_quality_findings(fitted: FittedPump) -> list[Finding]:
    """A pump fit that strays from its data (thresholds are common practice).

    * Head: RMS residual above :data:`HEAD_FIT_RMS_LIMIT` of the shut-off head.
    * Efficiency fitted to data: largest residual above :data:`EFFICIENCY_FIT_MAX_LIMIT`, or
      the fitted best efficiency more than :data:`EFFICIENCY_PEAK_MARGIN` above the highest
      data point (the fit invents a peak the tests did not show).
    """
    pump = fitted.pump
    where, target = f"pump '{pump.name}'", ("pump", pump.pump_id)
    remedy = "Check the data points, or choose another fit order for this curve."
    out: list[Finding] = []
    head_limit = HEAD_FIT_RMS_LIMIT * fitted.shutoff_head_m
    if fitted.head_fit.rms > head_limit:
        out.append(finding(
            "warning", "head_fit_poor",
            "The head fit (order " + str(fitted.head_fit.order) + ") is off its data by {rms} RMS, more than "
            + percent_number(HEAD_FIT_RMS_LIMIT) + " % of the shut-off head ({limit}).",
            {"rms": (fitted.head_fit.rms, "head"), "limit": (head_limit, "head")}, where, remedy, target))
    quality = fitted.efficiency_fit
    if fitted.efficiency_source != "data" or quality is None or not pump.efficiency:
        return out
    if quality.max_abs > EFFICIENCY_FIT_MAX_LIMIT:
        out.append(Finding(
            "warning", "efficiency_fit_poor",
            f"The efficiency fit (order {quality.order}) is off its data by up to "
            f"{percent_number(quality.max_abs, 1)} percentage points, more than "
            f"{percent_number(EFFICIENCY_FIT_MAX_LIMIT)}.", where, remedy, target))
    highest = max(pump.efficiency)
    if fitted.bep_efficiency is not None and fitted.bep_efficiency > highest + EFFICIENCY_PEAK_MARGIN:
        out.append(Finding(
            "warning", "efficiency_peak_above_data",
            f"The fitted best efficiency {percent_number(fitted.bep_efficiency)} % lies "
            f"{percent_number(fitted.bep_efficiency - highest)} points above the highest data point "
            f"({percent_number(highest, 1)} %), more than {percent_number(EFFICIENCY_PEAK_MARGIN)}: the "
            "best-efficiency point and the operating regions rest on a peak the data do not show.",
            where, remedy, target))
    return out
