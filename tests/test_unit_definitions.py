"""The application's own unit definitions (hydraulics/unit_definitions.txt).

Every unit the file defines is checked against its published definition, every display
unit and a list of typed inputs against the SI value they must give, and the shared units
against pint's complete default definitions (a reference used only here).
"""

from __future__ import annotations

import math
import re
from importlib import resources

import pint
import pytest

from hydraulics import units
from hydraulics.units import QUANTITIES, UNIT_SYSTEMS, display_unit, from_display, parse_quantity, ureg

# Exact by definition (NIST SP 811 (2008) Appendix B; SI Brochure, 9th edition, 2019):
INCH_M = 0.0254
FOOT_M = 0.3048
MILE_M = 1609.344
US_GALLON_M3 = 231 * INCH_M**3  # = 3.785411784 L exactly
IMPERIAL_GALLON_M3 = 4.54609e-3
POUND_KG = 0.45359237
G_N = 9.80665  # standard acceleration of gravity (3rd CGPM, 1901)
LBF_N = POUND_KG * G_N
WATER_CONVENTIONAL_KG_M3 = 1000.0  # conventional density of a water column (NIST SP 811 B.8 notes)
MERCURY_CONVENTIONAL_KG_M3 = 13595.1  # conventional density of a mercury column (NIST SP 811 B.8 notes)

# name -> (coherent SI unit, value of 1 unit in it, relative tolerance, source); a value given
# to 7 significant digits is checked to half a unit in its last digit (5e-7)
DEFINED: dict[str, tuple[str, float, float, str]] = {
    "meter": ("meter", 1.0, 0.0, "SI base unit"),
    "second": ("second", 1.0, 0.0, "SI base unit"),
    "gram": ("kilogram", 1e-3, 1e-15, "SI Brochure: 1 g = 1e-3 kg"),
    "radian": ("dimensionless", 1.0, 0.0, "SI Brochure: rad = m/m = 1"),
    "pi": ("dimensionless", math.pi, 1e-15, "the number π"),
    "standard_gravity": ("meter / second ** 2", G_N, 1e-15, "3rd CGPM (1901), exact"),
    "conventional_water_density": ("kilogram / meter ** 3", 1000.0, 1e-15, "NIST SP 811 B.8, conventional"),
    "conventional_mercury_density": ("kilogram / meter ** 3", 13595.1, 1e-15, "NIST SP 811 B.8, conventional"),
    "percent": ("dimensionless", 0.01, 1e-15, "ISO 80000-1: % = 0.01"),
    "revolution": ("radian", 2 * math.pi, 1e-15, "one turn = 2π rad (SI Brochure, table 8 note)"),
    "minute": ("second", 60.0, 1e-15, "SI Brochure, table 8"),
    "hour": ("second", 3600.0, 1e-15, "SI Brochure, table 8"),
    "day": ("second", 86400.0, 1e-15, "SI Brochure, table 8"),
    "inch": ("meter", INCH_M, 1e-15, "NIST SP 811 B.8: 1 in = 2.54 cm exactly"),
    "foot": ("meter", FOOT_M, 1e-15, "NIST SP 811 B.8: 1 ft = 0.3048 m exactly"),
    "yard": ("meter", 0.9144, 1e-15, "NIST SP 811 B.8: 1 yd = 0.9144 m exactly"),
    "mile": ("meter", MILE_M, 1e-15, "NIST SP 811 B.8: 1 mi = 1609.344 m exactly"),
    "liter": ("meter ** 3", 1e-3, 1e-15, "12th CGPM (1964): 1 L = 1 dm³"),
    "gallon": ("meter ** 3", 3.785411784e-3, 1e-15, "NIST SP 811 B.8: US gallon = 3.785411784 L exactly"),
    "imperial_gallon": ("meter ** 3", IMPERIAL_GALLON_M3, 1e-15, "NIST SP 811 B.8: 4.54609 L exactly"),
    "gallon_per_minute": ("meter ** 3 / second", US_GALLON_M3 / 60, 1e-15, "US gallon per minute"),
    "million_gallons_per_day": ("meter ** 3 / second", 1e6 * US_GALLON_M3 / 86400, 1e-15, "1e6 US gal per day"),
    "cubic_foot_per_second": ("meter ** 3 / second", FOOT_M**3, 1e-15, "NIST SP 811 B.8: 1 ft³ = 0.028316846592 m³"),
    "pound": ("kilogram", POUND_KG, 1e-15, "NIST SP 811 B.8: 1 lb = 0.45359237 kg exactly"),
    "tonne": ("kilogram", 1000.0, 1e-15, "SI Brochure, table 8: 1 t = 1000 kg"),
    "newton": ("kilogram * meter / second ** 2", 1.0, 1e-15, "SI Brochure, table 4"),
    "force_pound": ("newton", 4.448222, 5e-7, "NIST SP 811 B.8: 1 lbf = 4.448 222 N (7 digits; from memory)"),
    "force_kilogram": ("newton", G_N, 1e-15, "NIST SP 811 B.8: 1 kgf = 9.80665 N exactly"),
    "pascal": ("newton / meter ** 2", 1.0, 1e-15, "SI Brochure, table 4"),
    "bar": ("pascal", 1e5, 1e-15, "NIST SP 811 B.8: 1 bar = 100 kPa exactly"),
    "standard_atmosphere": ("pascal", 101325.0, 1e-15, "10th CGPM (1954): 1 atm = 101 325 Pa exactly"),
    "pound_force_per_square_inch": ("pascal", 6894.757, 5e-7, "NIST SP 811 B.8: 1 psi = 6.894 757 kPa"),
    "metre_water_column": ("pascal", 9806.65, 1e-15, "NIST SP 811 B.8: meter of water, conventional"),
    "foot_H2O": ("pascal", 2989.067, 5e-7, "NIST SP 811 B.8: foot of water, conventional (from memory)"),
    "inch_Hg": ("pascal", 3386.389, 5e-7, "NIST SP 811 B.8: inch of mercury, conventional (from memory)"),
    "millimeter_Hg": ("pascal", 133.3224, 5e-7, "NIST SP 811 B.8: millimeter of mercury, conventional (from memory)"),
    "joule": ("newton * meter", 1.0, 1e-15, "SI Brochure, table 4"),
    "watt_hour": ("joule", 3600.0, 1e-15, "1 W × 3600 s"),
    "british_thermal_unit": ("joule", 1055.056, 5e-7, "NIST SP 811 B.8: Btu (IT) = 1.055 056 kJ (7 digits)"),
    "watt": ("joule / second", 1.0, 1e-15, "SI Brochure, table 4"),
    "horsepower": ("watt", 745.6999, 5e-7, "NIST SP 811 B.8: hp (550 ft·lbf/s) = 745.6999 W"),
    "metric_horsepower": ("watt", 735.4988, 5e-7, "NIST SP 811 B.8: metric horsepower = 735.4988 W (from memory)"),
    "stokes": ("meter ** 2 / second", 1e-4, 1e-15, "NIST SP 811 B.8: 1 St = 1 cm²/s exactly"),
    "hertz": ("1 / second", 1.0, 1e-15, "SI Brochure, table 4"),
    "revolutions_per_minute": ("radian / second", 2 * math.pi / 60, 1e-15, "one turn per minute"),
    "revolutions_per_second": ("radian / second", 2 * math.pi, 1e-15, "one turn per second"),
}

# Offset units: (value in the unit, value in kelvin), from t/°C = T/K − 273.15,
# T/K = (5/9) T/°R and t/°F = 1.8 t/°C + 32 (SI Brochure; NIST SP 811 B.8, exact)
TEMPERATURES: dict[str, list[tuple[float, float]]] = {
    "kelvin": [(0.0, 0.0), (300.0, 300.0)],
    "degree_Celsius": [(0.0, 273.15), (100.0, 373.15)],
    "degree_Rankine": [(0.0, 0.0), (491.67, 273.15)],
    "degree_Fahrenheit": [(32.0, 273.15), (212.0, 373.15), (-40.0, 233.15)],
}

_DEFINITION_LINE = re.compile(r"^(?P<name>[A-Za-z_]\w*)\s*=")


def defined_names() -> list[str]:
    text = resources.files("hydraulics").joinpath(units.UNIT_DEFINITIONS).read_text(encoding="utf-8")
    return [m.group("name") for line in text.splitlines() if (m := _DEFINITION_LINE.match(line.strip()))]


def test_every_defined_unit_has_a_check():
    names = defined_names()
    assert len(names) == len(set(names)), "a unit is defined twice"
    assert set(names) == set(DEFINED) | set(TEMPERATURES)


@pytest.mark.parametrize("name", sorted(DEFINED))
def test_defined_unit_matches_its_definition(name):
    si_unit, expected, rel, _source = DEFINED[name]
    assert ureg.Quantity(1.0, name).to(si_unit).magnitude == pytest.approx(expected, rel=rel, abs=0)


@pytest.mark.parametrize("name", sorted(TEMPERATURES))
def test_temperature_unit_matches_its_definition(name):
    for value, kelvin in TEMPERATURES[name]:
        assert ureg.Quantity(value, name).to("kelvin").magnitude == pytest.approx(kelvin, abs=1e-12)


@pytest.fixture(scope="module")
def pint_defaults() -> pint.UnitRegistry:
    """pint's complete default definitions: a reference for the tests only."""
    return pint.UnitRegistry()


# Units we define differently from pint's defaults, on purpose: pint's Btu is the ISO
# 31-4 value 1055.056 J, ours the International Table value 1055.05585262 J (NIST SP 811 B.8).
OURS_ONLY = {"gallon_per_minute", "million_gallons_per_day", "metre_water_column", "cubic_foot_per_second",
             "british_thermal_unit"}


@pytest.mark.parametrize("name", sorted(set(DEFINED) - OURS_ONLY))
def test_shared_units_agree_with_pint_defaults(name, pint_defaults):
    si_unit = DEFINED[name][0]
    ours = ureg.Quantity(1.0, name).to(si_unit).magnitude
    reference = pint_defaults.Quantity(1.0, name).to(si_unit).magnitude
    assert ours == pytest.approx(reference, rel=1e-14, abs=0)


@pytest.mark.parametrize("name", sorted(TEMPERATURES))
def test_temperatures_agree_with_pint_defaults(name, pint_defaults):
    for value, _ in TEMPERATURES[name]:
        ours = ureg.Quantity(value, name).to("kelvin").magnitude
        assert ours == pytest.approx(pint_defaults.Quantity(value, name).to("kelvin").magnitude, abs=1e-12)


# 1 display unit in the stored unit (SI; °C, rpm), per system and quantity
DISPLAY_IN_STORED = {
    ("SI", "flow"): 1e-3, ("US", "flow"): US_GALLON_M3 / 60,
    ("SI", "head"): 1.0, ("US", "head"): FOOT_M,
    ("SI", "length"): 1.0, ("US", "length"): FOOT_M,
    ("SI", "elevation"): 1.0, ("US", "elevation"): FOOT_M,
    ("SI", "diameter"): 1e-3, ("US", "diameter"): INCH_M,
    ("SI", "roughness"): 1e-3, ("US", "roughness"): INCH_M,
    ("SI", "velocity"): 1.0, ("US", "velocity"): FOOT_M,
    ("SI", "pressure"): 1e3, ("US", "pressure"): LBF_N / INCH_M**2,
    ("SI", "power"): 1e3, ("US", "power"): 550 * FOOT_M * LBF_N,
    ("SI", "energy"): 3.6e6, ("US", "energy"): 3.6e6,
    ("SI", "specific_energy"): 3.6e6, ("US", "specific_energy"): 3.6e6 / (1000 * US_GALLON_M3),
    ("SI", "density"): 1.0, ("US", "density"): POUND_KG / FOOT_M**3,
    ("SI", "kinematic_viscosity"): 1e-6, ("US", "kinematic_viscosity"): FOOT_M**2,
    ("SI", "volume"): 1.0, ("US", "volume"): 1000 * US_GALLON_M3,
    ("SI", "speed"): 1.0, ("US", "speed"): 1.0,
    ("SI", "dimensionless"): 1.0, ("US", "dimensionless"): 1.0,
    ("SI", "ratio_percent"): 0.01, ("US", "ratio_percent"): 0.01,
    # temperature: a scale of 1 °C per °C and 5/9 °C per °F, checked with offsets below
    ("SI", "temperature"): 1.0, ("US", "temperature"): 5 / 9,
}


@pytest.mark.parametrize("system", UNIT_SYSTEMS)
@pytest.mark.parametrize("quantity", sorted(QUANTITIES))
def test_every_display_unit_parses_to_its_definition(quantity, system):
    """A number typed in the display unit (its pint name) gives the defined stored value."""
    scale = DISPLAY_IN_STORED[(system, quantity)]
    unit = display_unit(quantity, system)
    offset = -32.0 * 5 / 9 if (system, quantity) == ("US", "temperature") else 0.0  # t/°C = (t/°F − 32)/1.8
    assert parse_quantity(f"3 {unit}", quantity) == pytest.approx(3 * scale + offset, rel=1e-13)
    assert from_display(3.0, quantity, system) == pytest.approx(3 * scale + offset, rel=1e-13)


@pytest.mark.parametrize(
    ("text", "quantity", "expected"),
    [
        ("2 km", "length", 2000.0),
        ("0.25 mi", "length", 0.25 * MILE_M),
        ("3 yd", "length", 3 * 0.9144),
        ("6 feet", "length", 6 * FOOT_M),
        ("4 inches", "diameter", 4 * INCH_M),
        ("150 cm", "length", 1.5),
        ("0.0015 in", "roughness", 0.0015 * INCH_M),
        ("20 um", "roughness", 20e-6),
        ("1.2 m³/s", "flow", 1.2),
        ("600 L/min", "flow", 0.01),
        ("8 ML/d", "flow", 8e3 / 86400),
        ("10 cfs", "flow", 10 * FOOT_M**3),
        ("2 MGD", "flow", 2e6 * US_GALLON_M3 / 86400),
        ("100 imperial_gallon/min", "flow", 100 * IMPERIAL_GALLON_M3 / 60),
        ("3 m3/min", "flow", 0.05),
        ("450 kPa", "pressure", 450e3),
        ("1.2 MPa", "pressure", 1.2e6),
        ("1013.25 hPa", "pressure", 101325.0),
        ("1013.25 mbar", "pressure", 101325.0),
        ("1 atm", "pressure", 101325.0),
        ("65 psi", "pressure", 65 * LBF_N / INCH_M**2),
        ("30 mH2O", "pressure", 30 * WATER_CONVENTIONAL_KG_M3 * G_N),
        ("100 ftH2O", "pressure", 100 * FOOT_M * WATER_CONVENTIONAL_KG_M3 * G_N),
        ("29.92 inHg", "pressure", 29.92 * INCH_M * MERCURY_CONVENTIONAL_KG_M3 * G_N),
        ("760 mmHg", "pressure", 0.76 * MERCURY_CONVENTIONAL_KG_M3 * G_N),
        ("2 kgf/cm2", "pressure", 2 * G_N / 1e-4),
        ("750 W", "power", 750.0),
        ("1.5 MW", "power", 1.5e6),
        ("40 metric_horsepower", "power", 40 * 75 * G_N),
        ("3 MWh", "energy", 1.08e10),
        ("2 GJ", "energy", 2e9),
        ("1000 Btu", "energy", 1.05505585262e6),
        ("0.4 kWh/m³", "specific_energy", 0.4 * 3.6e6),
        ("1000 kg/m3", "density", 1000.0),
        ("1.05 t/m3", "density", 1050.0),
        ("62.4 lb/ft³", "density", 62.4 * POUND_KG / FOOT_M**3),
        ("1.3 cSt", "kinematic_viscosity", 1.3e-6),
        ("1.1e-5 ft2/s", "kinematic_viscosity", 1.1e-5 * FOOT_M**2),
        ("1.0e-6 m²/s", "kinematic_viscosity", 1e-6),
        ("100 kgal", "volume", 1e5 * US_GALLON_M3),
        ("2 Mgal", "volume", 2e6 * US_GALLON_M3),
        ("500 L", "volume", 0.5),
        ("1480 rev/min", "speed", 1480.0),
        ("1480 rpm", "speed", 1480.0),
        ("24.5 Hz", "speed", 24.5 * 60),
        ("293.15 kelvin", "temperature", 20.0),
        ("527.67 degR", "temperature", (527.67 * 5 / 9) - 273.15),
        ("50 percent", "ratio_percent", 0.5),
    ],
)
def test_typed_inputs_parse_to_si(text, quantity, expected):
    # Expected values from the exact definitions above (NIST SP 811 B.8; SI Brochure).
    assert parse_quantity(text, quantity) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    ("text", "quantity"),
    [("3 furlong", "length"), ("12 kg", "length"), ("5 psi", "flow"), ("2 cP", "kinematic_viscosity"),
     ("1,5 m", "length"), ("20 delta_degC", "temperature")],
)
def test_refusals_still_refused(text, quantity):
    # Units outside our file are unknown; wrong dimensions and decimal commas are refused as before.
    with pytest.raises(units.UnitInputError):
        parse_quantity(text, quantity)
