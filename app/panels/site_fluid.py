"""The "Site & fluid" panel: levels, delivery, pump datum, design flow, atmosphere, fluid, friction method.

All elevations are above one common datum of the user's choosing.  Static head is taken
at both extremes: maximum = highest delivery level − lowest suction level; minimum =
lowest delivery level − highest suction level.
"""

from __future__ import annotations

from dataclasses import replace

from PySide6.QtWidgets import QWidget

from app.document import ProjectDocument
from app.panels.form import ChoiceField, FormPanel, NumberField, Section, TextField
from hydraulics.model import PressurisedDelivery, Project, TankDelivery, UserFluid
from hydraulics.project_edits import (
    with_atmosphere_mode,
    with_delivery_changes,
    with_delivery_kind,
    with_fluid_changes,
    with_fluid_kind,
    with_site_changes,
)
from hydraulics.units import format_quantity


def _is_tank(project: Project) -> bool:
    return isinstance(project.site.delivery, TankDelivery)


def _is_pressurised(project: Project) -> bool:
    return isinstance(project.site.delivery, PressurisedDelivery)


def _is_user_fluid(project: Project) -> bool:
    return isinstance(project.fluid, UserFluid)


# The delivery fields are shown for their kind of delivery only; for the other kind they read as blank.
def _tank_level_low(project: Project) -> float | None:
    delivery = project.site.delivery
    return delivery.level_low_m if isinstance(delivery, TankDelivery) else None


def _tank_level_high(project: Project) -> float | None:
    delivery = project.site.delivery
    return delivery.level_high_m if isinstance(delivery, TankDelivery) else None


def _point_elevation(project: Project) -> float | None:
    delivery = project.site.delivery
    return delivery.elevation_m if isinstance(delivery, PressurisedDelivery) else None


def _point_pressure(project: Project) -> float | None:
    delivery = project.site.delivery
    return delivery.pressure_pa if isinstance(delivery, PressurisedDelivery) else None


def _pressure_given(project: Project) -> bool:
    return project.site.atmospheric_pressure_pa is not None


def _atmosphere_placeholder(document: ProjectDocument) -> str:
    solution = document.solution
    if solution is None:
        return ""
    return "standard atmosphere: " + format_quantity(solution.atmospheric_pressure_pa, "pressure", document.unit_system)


SECTIONS = (
    Section("Project", (
        TextField("name", "Project name", lambda p: p.name, lambda p, v: replace(p, name=v)),
    )),
    Section("Suction (source) water level", (
        NumberField("suction_level_low", "Lowest level", "elevation", "site.level_m",
                    lambda p: p.site.suction_level_low_m, lambda p, v: with_site_changes(p, suction_level_low_m=v),
                    tooltip="Lowest water level at the source (gives the maximum static head)."),
        NumberField("suction_level_high", "Highest level", "elevation", "site.level_m",
                    lambda p: p.site.suction_level_high_m, lambda p, v: with_site_changes(p, suction_level_high_m=v),
                    tooltip="Highest water level at the source (gives the minimum static head)."),
    ), note="Elevations above one common datum."),
    Section("Delivery", (
        ChoiceField("delivery_kind", "Delivers into",
                    lambda p: [("tank", "an open tank (level varies)"),
                               ("pressurised", "a pressurised point")],
                    lambda p: p.site.delivery.kind, with_delivery_kind),
        NumberField("delivery_level_low", "Lowest level", "elevation", "site.level_m",
                    _tank_level_low, lambda p, v: with_delivery_changes(p, level_low_m=v),
                    visible=_is_tank, tooltip="Lowest water level in the receiving tank."),
        NumberField("delivery_level_high", "Highest level", "elevation", "site.level_m",
                    _tank_level_high, lambda p, v: with_delivery_changes(p, level_high_m=v),
                    visible=_is_tank, tooltip="Highest (overflow) level in the receiving tank."),
        NumberField("delivery_elevation", "Point elevation", "elevation", "site.level_m",
                    _point_elevation, lambda p, v: with_delivery_changes(p, elevation_m=v),
                    visible=_is_pressurised),
        NumberField("delivery_pressure", "Required pressure (gauge)", "pressure", "site.delivery_pressure_pa",
                    _point_pressure, lambda p, v: with_delivery_changes(p, pressure_pa=v),
                    visible=_is_pressurised, tooltip="Gauge pressure needed at the delivery point."),
    )),
    Section("Pump and duty", (
        NumberField("pump_datum", "Pump datum elevation", "elevation", "site.level_m",
                    lambda p: p.site.pump_datum_m, lambda p, v: with_site_changes(p, pump_datum_m=v),
                    tooltip="Elevation of the pump's NPSH datum (impeller eye centre line)."),
        NumberField("design_flow", "Design flow", "flow", "site.design_flow_m3_s",
                    lambda p: p.site.design_flow_m3_s, lambda p, v: with_site_changes(p, design_flow_m3_s=v),
                    tooltip="Station flow the scheme is designed for."),
    )),
    Section("Atmosphere", (
        ChoiceField("atmosphere_mode", "Atmospheric pressure from",
                    lambda p: [("altitude", "the site altitude (standard atmosphere)"),
                               ("given", "a given value")],
                    lambda p: "given" if p.site.atmospheric_pressure_pa is not None else "altitude",
                    with_atmosphere_mode),
        NumberField("altitude", "Site altitude", "elevation", "site.altitude_m",
                    lambda p: p.site.altitude_m, lambda p, v: with_site_changes(p, altitude_m=v),
                    tooltip="Altitude above sea level, for the standard atmosphere."),
        NumberField("atmospheric_pressure", "Atmospheric pressure", "pressure", "site.atmospheric_pressure_pa",
                    lambda p: p.site.atmospheric_pressure_pa,
                    lambda p, v: with_site_changes(p, atmospheric_pressure_pa=v),
                    visible=_pressure_given, placeholder=_atmosphere_placeholder),
    )),
    Section("Fluid", (
        ChoiceField("fluid_kind", "Fluid",
                    lambda p: [("water", "water (properties from temperature)"),
                               ("user", "user fluid (properties given)")],
                    lambda p: p.fluid.kind, with_fluid_kind),
        NumberField("temperature", "Temperature", "temperature", "fluid.temperature_c",
                    lambda p: p.fluid.temperature_c, lambda p, v: with_fluid_changes(p, temperature_c=v)),
        TextField("fluid_name", "Fluid name", lambda p: getattr(p.fluid, "name", ""),
                  lambda p, v: with_fluid_changes(p, name=v), visible=_is_user_fluid),
        NumberField("density", "Density", "density", "fluid.density_kg_m3",
                    lambda p: getattr(p.fluid, "density_kg_m3", None),
                    lambda p, v: with_fluid_changes(p, density_kg_m3=v),
                    visible=_is_user_fluid),
        NumberField("kinematic_viscosity", "Kinematic viscosity", "kinematic_viscosity",
                    "fluid.kinematic_viscosity_m2_s",
                    lambda p: getattr(p.fluid, "kinematic_viscosity_m2_s", None),
                    lambda p, v: with_fluid_changes(p, kinematic_viscosity_m2_s=v), visible=_is_user_fluid),
        NumberField("vapour_pressure", "Vapour pressure", "pressure", "fluid.vapour_pressure_pa",
                    lambda p: getattr(p.fluid, "vapour_pressure_pa", None),
                    lambda p, v: with_fluid_changes(p, vapour_pressure_pa=v), visible=_is_user_fluid),
    ), note="Water properties follow the IAPWS formulations (0–100 °C); a user fluid's are "
            "taken as given."),
    Section("Pipe friction", (
        ChoiceField("friction_method", "Friction method",
                    lambda p: [("darcy_weisbach", "Darcy–Weisbach with Colebrook–White"),
                               ("hazen_williams", "Hazen–Williams (water, turbulent)")],
                    lambda p: p.friction_method, lambda p, v: replace(p, friction_method=v)),
    )),
)


class SiteFluidPanel(FormPanel):
    """The "Site & fluid" input panel."""

    def __init__(self, document: ProjectDocument, parent: QWidget | None = None) -> None:
        super().__init__(document, "site", SECTIONS, parent)


__all__ = ["SiteFluidPanel"]
