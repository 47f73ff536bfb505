"""Fluid properties for the calculation: water from its temperature, or a user's fluid as given."""

from __future__ import annotations

import math
from functools import lru_cache
from typing import Final

from hydraulics.constants import STANDARD_ATMOSPHERE_PA, ZERO_CELSIUS_K
from hydraulics.model import ModelError, UserFluid, WaterFluid
from hydraulics.number_format import fixed_decimals
from hydraulics.results import FluidProperties
from hydraulics.water_properties import density_liquid, dynamic_viscosity, saturation_pressure

__all__ = ["WATER_TEMPERATURE_RANGE_C", "USER_FLUID_RANGES", "fluid_properties", "water_properties_at"]

WATER_TEMPERATURE_RANGE_C: Final = (0.0, 100.0)
"""Water temperatures accepted for the water fluid (°C)."""

USER_FLUID_RANGES: Final[dict[str, tuple[float, float, str]]] = {
    # attribute: (low, high, field path) in SI units
    "density_kg_m3": (500.0, 2500.0, "fluid.density"),
    "kinematic_viscosity_m2_s": (1.0e-7, 1.0e-2, "fluid.kinematic_viscosity"),
    "vapour_pressure_pa": (0.0, 200_000.0, "fluid.vapour_pressure"),
}
"""Allowed ranges of a user fluid's properties (SI) and the field each error names."""

_RANGE_WORDS: Final[dict[str, tuple[str, str, float, str]]] = {
    # attribute: (name, allowed range in words, factor SI -> shown unit, shown unit)
    "density_kg_m3": ("density", "allowed 500 to 2500 kg/m³", 1.0, "kg/m³"),
    "kinematic_viscosity_m2_s": (
        "kinematic viscosity", "allowed 1e-7 to 1e-2 m²/s (0.1 to 10 000 mm²/s)", 1.0e6, "mm²/s"
    ),
    "vapour_pressure_pa": ("vapour pressure", "allowed 0 to 200 kPa", 1.0e-3, "kPa"),
}


def _finite_number(value: object, field_path: str, what: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ModelError(field_path, f"{what} must be a number; got {value!r}", value)
    number = float(value)
    if not math.isfinite(number):
        raise ModelError(field_path, f"{what} must be a finite number; got {value!r}", value)
    return number


def water_properties_at(temperature_c: float) -> FluidProperties:
    """Properties of liquid water at ``temperature_c`` [°C] and atmospheric pressure.

    * Density ρ: IAPWS-IF97 region 1 at p = max(101 325 Pa, p_s(T)), so that the
      water stays liquid up to 100 °C (at 100 °C the saturation pressure,
      101 418 Pa, exceeds one standard atmosphere).  Compressibility makes the choice
      of pressure matter by less than 0.005 % per bar.
    * Kinematic viscosity ν = μ/ρ with μ from the IAPWS 2008 formulation (μ2 = 1).
    * Vapour pressure: IAPWS-IF97 region 4 saturation pressure p_s(T).

    See :mod:`hydraulics.water_properties` for the equations and references.

    Parameters
    ----------
    temperature_c : float
        Water temperature [°C]; allowed 0 to 100 °C.

    Raises
    ------
    ModelError
        ``fluid.temperature`` outside 0 to 100 °C or not a finite number.

    Examples
    --------
    >>> water = water_properties_at(20.0)
    >>> round(water.density_kg_m3, 2), round(water.kinematic_viscosity_m2_s * 1e6, 4)
    (998.21, 1.0034)
    >>> round(water.vapour_pressure_pa, 1)
    2339.2
    """
    low, high = WATER_TEMPERATURE_RANGE_C
    t_c = _finite_number(temperature_c, "fluid.temperature", "water temperature")
    if not low <= t_c <= high:
        raise ModelError(
            "fluid.temperature", f"water temperature: allowed {low:g} to {high:g} °C; got {t_c:g} °C", t_c
        )
    return _water_properties_checked(t_c)


@lru_cache(maxsize=64)
def _water_properties_checked(t_c: float) -> FluidProperties:
    """:func:`water_properties_at` for a temperature already checked (a float in range).

    Cached: it is a pure function of one number and its result is frozen, and the window
    asks for the same temperature at every live solve.
    """
    t_k = t_c + ZERO_CELSIUS_K
    vapour_pressure_pa = float(saturation_pressure(t_k))
    pressure_pa = max(STANDARD_ATMOSPHERE_PA, vapour_pressure_pa)
    density = float(density_liquid(t_k, pressure_pa))
    viscosity = float(dynamic_viscosity(t_k, density))
    return FluidProperties(
        temperature_c=t_c,
        density_kg_m3=density,
        kinematic_viscosity_m2_s=viscosity / density,
        vapour_pressure_pa=vapour_pressure_pa,
        description=f"water at {fixed_decimals(t_c, 1)} °C (IAPWS-IF97, IAPWS 2008)",
    )


def _user_fluid_properties(fluid: UserFluid) -> FluidProperties:
    values: dict[str, float] = {}
    for attribute, (low, high, field_path) in USER_FLUID_RANGES.items():
        what, allowed, factor, unit = _RANGE_WORDS[attribute]
        number = _finite_number(getattr(fluid, attribute), field_path, what)
        if not low <= number <= high:
            raise ModelError(field_path, f"{what}: {allowed}; got {number * factor:g} {unit}", number)
        values[attribute] = number
    temperature_c = _finite_number(fluid.temperature_c, "fluid.temperature", "temperature")
    name = fluid.name.strip() or "user fluid"
    return FluidProperties(
        temperature_c=temperature_c,
        density_kg_m3=values["density_kg_m3"],
        kinematic_viscosity_m2_s=values["kinematic_viscosity_m2_s"],
        vapour_pressure_pa=values["vapour_pressure_pa"],
        description=f"{name} at {fixed_decimals(temperature_c, 1)} °C (properties as given)",
    )


def fluid_properties(fluid: WaterFluid | UserFluid) -> FluidProperties:
    """The properties the calculation uses for ``fluid``.

    Water gets its properties from its temperature (:func:`water_properties_at`);
    a user fluid's given values are checked against :data:`USER_FLUID_RANGES` and
    passed through.

    Raises
    ------
    ModelError
        A value outside its allowed range, naming the field (``fluid.temperature``,
        ``fluid.density``, ``fluid.kinematic_viscosity``, ``fluid.vapour_pressure``).

    Examples
    --------
    >>> fluid_properties(WaterFluid(temperature_c=15.0)).description
    'water at 15.0 °C (IAPWS-IF97, IAPWS 2008)'
    >>> fluid_properties(UserFluid(name="raw sewage", density_kg_m3=1010.0)).density_kg_m3
    1010.0
    """
    if isinstance(fluid, WaterFluid):
        return water_properties_at(fluid.temperature_c)
    if isinstance(fluid, UserFluid):
        return _user_fluid_properties(fluid)
    raise ModelError("fluid", f"must be water or a user fluid; got {type(fluid).__name__}", fluid)
