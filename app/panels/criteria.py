"""The "Criteria" panel: velocity limits, sewage option, NPSH margin, operating region, energy.

The default limits are common practice (see :mod:`hydraulics.checks` for their
sources); every one can be changed per project.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from PySide6.QtWidgets import QWidget

from app.document import ProjectDocument
from app.panels.form import CheckField, ChoiceField, FormPanel, NumberField, Section, TextField
from hydraulics.model import Project

HOURS_PER_YEAR_DEFAULT = 4000.0
"""Operating hours offered when switching the energy basis back to hours (demo value)."""


def _criteria(project: Project, **changes: Any) -> Project:
    return replace(project, criteria=replace(project.criteria, **changes))


def _energy(project: Project, **changes: Any) -> Project:
    return replace(project, energy=replace(project.energy, **changes))


def _velocity(key: str, label: str, attribute: str, tooltip: str = "") -> NumberField:
    return NumberField(key, label, "velocity", "criteria.velocity_m_s",
                       lambda p: getattr(p.criteria, attribute),
                       lambda p, v: _criteria(p, **{attribute: v}), tooltip=tooltip)


def _region(key: str, label: str, attribute: str) -> NumberField:
    return NumberField(key, label, "ratio_percent", "criteria.region",
                       lambda p: getattr(p.criteria, attribute),
                       lambda p, v: _criteria(p, **{attribute: v}),
                       tooltip="Per-pump flow as a percentage of the best-efficiency flow.")


def energy_basis(project: Project) -> str:
    """"volume" when the annual duty is an annual volume, else "hours"."""
    return "volume" if project.energy.annual_volume_m3 is not None else "hours"


def with_energy_basis(project: Project, basis: str) -> Project:
    """Switch the annual duty between operating hours and an annual pumped volume.

    The new figure starts from the old one at the design flow (volume = Q × hours).
    """
    energy = project.energy
    q = project.site.design_flow_m3_s
    if basis == "volume" and energy.annual_volume_m3 is None:
        hours = energy.operating_hours_per_year or HOURS_PER_YEAR_DEFAULT
        return _energy(project, annual_volume_m3=q * hours * 3600.0, operating_hours_per_year=None)
    if basis == "hours" and energy.annual_volume_m3 is not None:
        hours = min(energy.annual_volume_m3 / (q * 3600.0), 8760.0) if q > 0 else HOURS_PER_YEAR_DEFAULT
        return _energy(project, annual_volume_m3=None, operating_hours_per_year=round(hours, 1))
    return project


SECTIONS = (
    Section("Velocity limits", (
        _velocity("suction_velocity_min", "Suction, minimum", "suction_velocity_min_m_s"),
        _velocity("suction_velocity_max", "Suction, maximum", "suction_velocity_max_m_s"),
        _velocity("delivery_velocity_min", "Delivery, minimum", "delivery_velocity_min_m_s"),
        _velocity("delivery_velocity_max", "Delivery, maximum", "delivery_velocity_max_m_s"),
        CheckField("sewage", "Sewage or raw water: check the self-cleansing velocity",
                   lambda p: p.criteria.sewage, lambda p, v: _criteria(p, sewage=bool(v))),
        NumberField("sewage_velocity_min", "Self-cleansing minimum", "velocity", "criteria.velocity_m_s",
                    lambda p: p.criteria.sewage_velocity_min_m_s,
                    lambda p, v: _criteria(p, sewage_velocity_min_m_s=v),
                    visible=lambda p: p.criteria.sewage,
                    tooltip="Raises the delivery-side minimum velocity for a sewage main."),
    ), note="Mean velocity in each pipe; minimum checked at the lowest duty flow, "
            "maximum at the highest."),
    Section("NPSH margin", (
        NumberField("npsh_margin_ratio", "Ratio NPSHa / NPSHr, at least", "dimensionless",
                    "criteria.npsh_margin_ratio",
                    lambda p: p.criteria.npsh_margin_ratio, lambda p, v: _criteria(p, npsh_margin_ratio=v)),
        NumberField("npsh_margin_min", "NPSHa − NPSHr, at least", "head", "criteria.npsh_margin_min_m",
                    lambda p: p.criteria.npsh_margin_min_m, lambda p, v: _criteria(p, npsh_margin_min_m=v)),
    ), note="Both must hold at every duty point."),
    Section("Operating region (% of best-efficiency flow)", (
        _region("preferred_region_low", "Preferred, from", "preferred_region_low"),
        _region("preferred_region_high", "Preferred, to", "preferred_region_high"),
        _region("allowable_region_low", "Allowable, from", "allowable_region_low"),
        _region("allowable_region_high", "Allowable, to", "allowable_region_high"),
        NumberField("trim_warning_limit", "Warn above impeller trim of", "ratio_percent",
                    "criteria.trim_warning_limit",
                    lambda p: p.criteria.trim_warning_limit, lambda p, v: _criteria(p, trim_warning_limit=v),
                    tooltip="Trim: the reduction of impeller diameter from the tested one (a diameter of 95 % is a "
                            "5 % trim). Beyond this the affinity laws for trim are doubtful."),
    )),
    Section("Energy: tariff and the simple estimate", (
        ChoiceField("energy_basis", "Annual duty given as",
                    lambda p: [("hours", "operating hours per year"), ("volume", "volume pumped per year")],
                    energy_basis, with_energy_basis),
        NumberField("operating_hours", "Operating hours per year", "dimensionless",
                    "energy.operating_hours_per_year",
                    lambda p: p.energy.operating_hours_per_year,
                    lambda p, v: _energy(p, operating_hours_per_year=v),
                    optional=True, visible=lambda p: energy_basis(p) == "hours",
                    placeholder=lambda _doc: "not given: no annual energy figures",
                    tooltip="Hours (0–8784); leave blank to skip the annual energy."),
        NumberField("annual_volume", "Volume per year", "volume", "energy.annual_volume_m3",
                    lambda p: p.energy.annual_volume_m3, lambda p, v: _energy(p, annual_volume_m3=v),
                    optional=True, visible=lambda p: energy_basis(p) == "volume"),
        NumberField("tariff", "Tariff per kWh", "dimensionless", "energy.tariff_per_kwh",
                    lambda p: p.energy.tariff_per_kwh, lambda p, v: _energy(p, tariff_per_kwh=v),
                    tooltip="Energy price in the currency below."),
        TextField("currency", "Currency", lambda p: p.energy.currency, lambda p, v: _energy(p, currency=v)),
    ), note="The hours or volume here give the simple estimate: all operating hours at the duty point. With "
            "duty bands (Duty tab) the station's energy is the year of duty; the tariff and currency serve both."),
    Section("Curves", (
        NumberField("flow_grid_max_factor", "Plot flows up to (× design flow)", "dimensionless",
                    "project.flow_grid_max_factor",
                    lambda p: p.flow_grid_max_factor, lambda p, v: replace(p, flow_grid_max_factor=v),
                    tooltip="System curves are drawn from zero to this multiple of the design flow "
                            "(further when the pump curve reaches further)."),
    )),
)


class CriteriaPanel(FormPanel):
    """The "Criteria" input panel."""

    def __init__(self, document: ProjectDocument, parent: QWidget | None = None) -> None:
        super().__init__(document, "criteria", SECTIONS, parent)
