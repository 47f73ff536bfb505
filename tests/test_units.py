"""Typed-input parsing and display units (hydraulics.units)."""

from __future__ import annotations

import numpy as np
import pint
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics import units
from hydraulics.units import (
    QUANTITIES,
    UNIT_SYSTEMS,
    UnitInputError,
    convert_from_si,
    convert_to_si,
    display_unit,
    format_quantity,
    from_display,
    parse_quantity,
    to_display,
    unit_label,
    ureg,
)

# Exact definitions, NIST SP 811 (2008) Appendix B:
INCH_M = 0.0254  # 1 in = 25.4 mm exactly
FOOT_M = 0.3048  # 1 ft = 0.3048 m exactly
US_GALLON_M3 = 3.785411784e-3  # 1 US gal = 3.785411784 L exactly
BAR_PA = 1.0e5  # 1 bar = 100 kPa exactly
POUND_KG = 0.45359237  # 1 lb = 0.45359237 kg exactly
STANDARD_GRAVITY = 9.80665  # g_n, exact; 1 lbf = 1 lb × g_n (NIST SP 811 B.8)
PSI_PA = POUND_KG * STANDARD_GRAVITY / INCH_M**2  # 1 lbf/in² = 6.894 757 kPa (NIST SP 811 B.8)
HP_W = 550 * FOOT_M * POUND_KG * STANDARD_GRAVITY  # 1 hp = 550 ft·lbf/s = 745.6999 W (NIST SP 811 B.8)
KWH_J = 3.6e6  # 1 kWh = 3.6 MJ exactly


# --------------------------------------------------------------------------- registry
def test_one_application_registry():
    assert pint.get_application_registry().get() is ureg
    assert units.Q_(1, "m").units == ureg.meter


def test_quantities_table_has_the_agreed_names_and_consistent_units():
    expected = {
        "flow", "head", "length", "elevation", "diameter", "roughness", "velocity", "pressure", "power",
        "energy", "specific_energy", "temperature", "density", "kinematic_viscosity", "volume", "speed",
        "dimensionless", "ratio_percent",
    }
    assert set(QUANTITIES) == expected
    for name, (dimensionality, stored_unit) in QUANTITIES.items():
        assert ureg.Quantity(1.0, stored_unit).check(dimensionality or "[]"), name


# --------------------------------------------------------------------------- parsing: the examples
@pytest.mark.parametrize(
    ("text", "quantity", "expected"),
    [
        ("300 mm", "diameter", 0.3),
        ("12 in", "diameter", 12 * INCH_M),
        ("12in", "diameter", 12 * INCH_M),
        ("35 L/s", "flow", 0.035),
        ("35 l/s", "flow", 0.035),
        ("550 gpm", "flow", 550 * US_GALLON_M3 / 60.0),
        ("550 gal/min", "flow", 550 * US_GALLON_M3 / 60.0),
        ("1 MGD", "flow", 1e6 * US_GALLON_M3 / 86400.0),
        ("2.5 bar", "pressure", 2.5 * BAR_PA),
        ("36 psi", "pressure", 36 * PSI_PA),
        ("10 mwc", "pressure", 10 * 9806.65),  # conventional metre of water: 1000 kg/m³ × g_n (ISO 80000-4 note)
        ("120 m3/h", "flow", 120 / 3600.0),
        ("120 m³/h", "flow", 120 / 3600.0),
        ("120 m^3/h", "flow", 120 / 3600.0),
        ("40 ft", "head", 40 * FOOT_M),
        ("1.5 m/s", "velocity", 1.5),
        ("5 ft/s", "velocity", 5 * FOOT_M),
        ("45 kW", "power", 45e3),
        ("60 hp", "power", 60 * HP_W),
        ("1200 kWh", "energy", 1200 * KWH_J),
        ("0.25 kWh/m3", "specific_energy", 0.25 * KWH_J),
        ("1 kWh/kgal", "specific_energy", KWH_J / (1000 * US_GALLON_M3)),
        ("62.4 lb/ft3", "density", 62.4 * POUND_KG / FOOT_M**3),
        ("998 kg/m³", "density", 998.0),
        ("1 cSt", "kinematic_viscosity", 1e-6),
        ("1.0 mm2/s", "kinematic_viscosity", 1e-6),
        ("250 m3", "volume", 250.0),
        ("0.05 mm", "roughness", 5e-5),
        ("5 µm", "roughness", 5e-6),
        ("−5 m", "elevation", -5.0),  # typographic minus sign
        ("1e3 m", "length", 1000.0),
        ("85 %", "ratio_percent", 0.85),
        ("0.85", "ratio_percent", 0.85),
    ],
)
def test_parse_examples(text, quantity, expected):
    assert parse_quantity(text, quantity) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    ("text", "expected_rpm"),
    [
        ("1450 rpm", 1450.0),
        ("1450 1/min", 1450.0),  # the trade writes rpm as 1/min or min⁻¹: revolutions, not radians
        ("1450 min-1", 1450.0),
        ("1450 min⁻¹", 1450.0),
        ("24 rps", 1440.0),
        ("25 Hz", 1500.0),
    ],
)
def test_parse_speed_counts_revolutions(text, expected_rpm):
    assert parse_quantity(text, "speed") == pytest.approx(expected_rpm, rel=1e-12)


# --------------------------------------------------------------------------- temperature
@pytest.mark.parametrize(
    ("text", "expected_c"),
    [
        # t/°C = T/K − 273.15 and t/°C = (t/°F − 32)/1.8, exact (SI Brochure 9th ed.; NIST SP 811 B.8)
        ("20 degC", 20.0),
        ("20 °C", 20.0),
        ("20°C", 20.0),
        ("20 ℃", 20.0),
        ("20 C", 20.0),
        ("68 degF", 20.0),
        ("68 °F", 20.0),
        ("32 F", 0.0),
        ("212 °F", 100.0),
        ("293.15 K", 20.0),
        ("-40 °F", -40.0),
    ],
)
def test_parse_temperature_as_offset_unit(text, expected_c):
    assert parse_quantity(text, "temperature") == pytest.approx(expected_c, abs=1e-12)


def test_bare_temperature_uses_default_unit():
    assert parse_quantity("68", "temperature", default_unit="degF") == pytest.approx(20.0, abs=1e-12)
    assert parse_quantity("15", "temperature") == 15.0


def test_temperature_difference_is_not_a_temperature():
    with pytest.raises(UnitInputError):
        parse_quantity("5 delta_degC", "temperature")


# --------------------------------------------------------------------------- bare numbers
def test_bare_number_uses_default_unit_else_stored_unit():
    assert parse_quantity("300", "diameter", default_unit="mm") == pytest.approx(0.3)
    assert parse_quantity("12", "diameter", default_unit="in") == pytest.approx(12 * INCH_M)
    assert parse_quantity("35", "flow", default_unit="L/s") == pytest.approx(0.035)
    assert parse_quantity("2.5", "length") == 2.5
    assert parse_quantity("85", "ratio_percent", default_unit="percent") == pytest.approx(0.85)


def test_typed_unit_wins_over_default_unit():
    assert parse_quantity("2 m", "length", default_unit="ft") == 2.0


# --------------------------------------------------------------------------- refusals
def test_wrong_dimension_names_field_and_expectation():
    with pytest.raises(UnitInputError) as caught:
        parse_quantity("12 kg", "length", field="Length")
    error = caught.value
    assert isinstance(error, ValueError)
    assert error.field == "Length"
    assert error.text == "12 kg"
    assert str(error) == "Length: '12 kg' is not a length; type a number with a unit such as 300 mm or 12 in"


@pytest.mark.parametrize(
    ("text", "quantity"),
    [("5 bar", "head"), ("3 m", "flow"), ("20 kPa", "temperature"), ("1450 m/s", "speed"), ("3 m", "dimensionless")],
)
def test_wrong_dimension_refused(text, quantity):
    with pytest.raises(UnitInputError, match="is not"):
        parse_quantity(text, quantity)


@pytest.mark.parametrize("text", ["1,5 m", "1,500 m", "1.500,25 m", "12,"])
def test_decimal_comma_refused_with_advice(text):
    with pytest.raises(UnitInputError, match="decimal point"):
        parse_quantity(text, "length", field="Length")


@pytest.mark.parametrize("text", ["nan", "NaN m", "inf m", "-inf", "Infinity", "1e999 m"])
def test_not_finite_refused(text):
    with pytest.raises(UnitInputError) as caught:
        parse_quantity(text, "length")
    assert "finite" in caught.value.problem or "too large" in caught.value.problem


@pytest.mark.parametrize("text", ["", "   "])
def test_empty_refused(text):
    with pytest.raises(UnitInputError, match="nothing typed"):
        parse_quantity(text, "flow", field="Design flow")


@pytest.mark.parametrize(
    "text", ["abc", "m", "12 foo", "1 500 m", "12 m)", "12 m/", "12 **", "12 (", "3 m**-", "5 \"m\"", "1 m/0"]
)
def test_garbage_refused_not_crashing(text):
    with pytest.raises(UnitInputError) as caught:
        parse_quantity(text, "length", field="Length")
    assert str(caught.value).startswith("Length: ")


def test_default_field_label_is_quantity_name():
    with pytest.raises(UnitInputError, match="^Kinematic viscosity: "):
        parse_quantity("3 m", "kinematic_viscosity")


def test_unknown_quantity_is_a_programming_error():
    with pytest.raises(KeyError):
        parse_quantity("3 m", "lenght")


@settings(max_examples=150, deadline=None)
@given(st.text(max_size=20))
def test_any_text_returns_float_or_unit_input_error(text):
    try:
        value = parse_quantity(text, "length")
    except UnitInputError:
        return
    assert isinstance(value, float)
    assert np.isfinite(value)


# --------------------------------------------------------------------------- display units
EXPECTED_LABELS = {
    "SI": {
        "flow": "L/s", "head": "m", "length": "m", "elevation": "m", "diameter": "mm", "roughness": "mm",
        "velocity": "m/s", "pressure": "kPa", "power": "kW", "energy": "kWh", "specific_energy": "kWh/m³",
        "temperature": "°C", "density": "kg/m³", "kinematic_viscosity": "mm²/s", "volume": "m³",
        "speed": "rpm", "dimensionless": "", "ratio_percent": "%",
    },
    "US": {
        "flow": "gpm", "head": "ft", "length": "ft", "elevation": "ft", "diameter": "in", "roughness": "in",
        "velocity": "ft/s", "pressure": "psi", "power": "hp", "energy": "kWh", "specific_energy": "kWh/kgal",
        "temperature": "°F", "density": "lb/ft³", "kinematic_viscosity": "ft²/s", "volume": "kgal",
        "speed": "rpm", "dimensionless": "", "ratio_percent": "%",
    },
}


@pytest.mark.parametrize("system", UNIT_SYSTEMS)
def test_labels_for_every_quantity(system):
    assert {q: unit_label(q, system) for q in QUANTITIES} == EXPECTED_LABELS[system]


@pytest.mark.parametrize(
    ("quantity", "system", "one_display_unit_in_stored_unit"),
    [
        ("flow", "SI", 1e-3),
        ("flow", "US", US_GALLON_M3 / 60.0),
        ("head", "US", FOOT_M),
        ("diameter", "SI", 1e-3),
        ("diameter", "US", INCH_M),
        ("velocity", "US", FOOT_M),
        ("pressure", "SI", 1e3),
        ("pressure", "US", PSI_PA),
        ("power", "US", HP_W),
        ("energy", "SI", KWH_J),
        ("specific_energy", "US", KWH_J / (1000 * US_GALLON_M3)),
        ("density", "US", POUND_KG / FOOT_M**3),
        ("kinematic_viscosity", "SI", 1e-6),
        ("kinematic_viscosity", "US", FOOT_M**2),
        ("volume", "US", 1000 * US_GALLON_M3),
        ("ratio_percent", "SI", 0.01),
    ],
)
def test_display_factors_match_definitions(quantity, system, one_display_unit_in_stored_unit):
    assert from_display(1.0, quantity, system) == pytest.approx(one_display_unit_in_stored_unit, rel=1e-13)


def test_derived_us_factors_match_nist_rounded_values():
    # NIST SP 811 Appendix B.8 gives these to 7 significant digits
    assert PSI_PA == pytest.approx(6894.757, rel=1e-7)
    assert HP_W == pytest.approx(745.6999, rel=1e-7)


def test_exact_factors_are_free_of_float_noise():
    assert to_display(0.035, "flow", "SI") == 35.0
    assert from_display(12.0, "diameter", "US") == pytest.approx(0.3048, rel=1e-15)


@pytest.mark.parametrize("system", UNIT_SYSTEMS)
@pytest.mark.parametrize("quantity", list(QUANTITIES))
def test_round_trip_every_quantity_and_system(quantity, system):
    values = np.array([-3.7, 0.0, 1.0e-3, 0.035, 12.5, 4.2e5])
    shown = to_display(values, quantity, system)
    assert isinstance(shown, np.ndarray) and shown.dtype == np.float64
    np.testing.assert_allclose(from_display(shown, quantity, system), values, rtol=1e-13, atol=1e-12)
    for value in values:
        back = from_display(to_display(float(value), quantity, system), quantity, system)
        assert isinstance(back, float)
        assert back == pytest.approx(value, rel=1e-13, abs=1e-12)


@pytest.mark.parametrize("system", UNIT_SYSTEMS)
@pytest.mark.parametrize("quantity", list(QUANTITIES))
def test_display_agrees_with_pint(quantity, system):
    stored_unit = QUANTITIES[quantity][1]
    value = 12.5
    if quantity == "speed":
        expected = value  # rpm in both systems
    else:
        expected = ureg.Quantity(value, stored_unit).to(display_unit(quantity, system)).magnitude
    assert to_display(value, quantity, system) == pytest.approx(expected, rel=1e-12)


def test_temperature_display_uses_offsets():
    # t/°F = 1.8 t/°C + 32 (NIST SP 811 B.8)
    np.testing.assert_allclose(to_display(np.array([0.0, 20.0, 100.0]), "temperature", "US"), [32.0, 68.0, 212.0])
    assert from_display(68.0, "temperature", "US") == pytest.approx(20.0, abs=1e-12)
    assert to_display(20.0, "temperature", "SI") == 20.0


def test_display_accepts_lists_and_integer_arrays():
    np.testing.assert_allclose(to_display([0.01, 0.02], "flow", "SI"), [10.0, 20.0])
    np.testing.assert_allclose(from_display(np.array([10, 20]), "flow", "SI"), [0.01, 0.02])


def test_display_does_not_modify_input_array():
    values = np.array([0.01, 0.02])
    to_display(values, "flow", "US")
    np.testing.assert_array_equal(values, [0.01, 0.02])


def test_unknown_system_refused():
    with pytest.raises(KeyError):
        to_display(1.0, "flow", "imperial")


def test_convert_any_unit():
    assert convert_from_si(0.1, "flow", "m³/h") == pytest.approx(360.0)
    assert convert_to_si(360.0, "flow", "m3/h") == pytest.approx(0.1)
    assert convert_from_si(20.0, "temperature", "K") == pytest.approx(293.15)
    np.testing.assert_allclose(convert_to_si(np.array([1.0, 2.0]), "length", "ft"), [FOOT_M, 2 * FOOT_M])


# --------------------------------------------------------------------------- formatting
@pytest.mark.parametrize(
    ("value_si", "quantity", "system", "expected"),
    [
        (0.035, "flow", "SI", "35.0 L/s"),
        (0.3, "diameter", "SI", "300 mm"),
        (0.3048, "diameter", "US", "12.0 in"),
        (12.0, "head", "SI", "12.0 m"),
        (20.0, "temperature", "US", "68.0 °F"),
        (250e3, "pressure", "SI", "250 kPa"),
        (0.82, "ratio_percent", "SI", "82.0 %"),
        (1.0e-6, "kinematic_viscosity", "SI", "1.00 mm²/s"),
        (1.5, "dimensionless", "SI", "1.50"),
        (0.0, "head", "SI", "0 m"),
        (-0.0001, "head", "SI", "-1.00e-04 m"),
        (float("nan"), "head", "SI", "— m"),
    ],
)
def test_format_quantity(value_si, quantity, system, expected):
    assert format_quantity(value_si, quantity, system) == expected


def test_format_digits():
    assert format_quantity(0.0351234, "flow", "SI", digits=4) == "35.12 L/s"
    assert format_quantity(1234.5, "length", "SI", digits=2) == "1234 m"
