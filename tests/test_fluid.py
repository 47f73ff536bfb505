"""Fluid properties for the calculation (hydraulics.fluid)."""

from __future__ import annotations

import dataclasses

import pytest
from iapws._iapws import _Viscosity
from iapws.iapws97 import _PSat_T, _Region1

from hydraulics.fluid import fluid_properties, water_properties_at
from hydraulics.model import ModelError, UserFluid, WaterFluid
from hydraulics.results import FluidProperties


def test_water_at_20c_against_iapws_package():
    # iapws (reference library, tests only): IF97 region 1 at 1 atm, region 4, IAPWS 2008 viscosity
    props = fluid_properties(WaterFluid(temperature_c=20.0))
    density = 1.0 / _Region1(293.15, 0.101325)["v"]
    assert isinstance(props, FluidProperties)
    assert props.temperature_c == 20.0
    assert props.density_kg_m3 == pytest.approx(density, rel=1e-9)
    assert props.kinematic_viscosity_m2_s == pytest.approx(_Viscosity(density, 293.15) / density, rel=1e-9)
    assert props.vapour_pressure_pa == pytest.approx(_PSat_T(293.15) * 1e6, rel=1e-9)


def test_water_at_20c_against_handbook():
    # CRC Handbook of Chemistry and Physics, water at 20 °C and 1 atm (values quoted from
    # memory): ρ = 998.21 kg/m³, ν = 1.0034 mm²/s, p_v = 2.3393 kPa
    props = fluid_properties(WaterFluid(temperature_c=20.0))
    assert props.density_kg_m3 == pytest.approx(998.21, abs=0.01)
    assert props.kinematic_viscosity_m2_s == pytest.approx(1.0034e-6, rel=2e-4)
    assert props.vapour_pressure_pa == pytest.approx(2339.3, rel=1e-4)


@pytest.mark.parametrize("temperature_c", [0.0, 4.0, 15.0, 37.5, 60.0, 99.0, 100.0])
def test_water_across_range_against_iapws_package(temperature_c):
    t_k = temperature_c + 273.15
    p_sat_mpa = _PSat_T(t_k)
    pressure_mpa = max(0.101325, p_sat_mpa)  # liquid held at max(1 atm, p_s), as the engine does
    density = 1.0 / _Region1(t_k, pressure_mpa)["v"]
    props = water_properties_at(temperature_c)
    assert props.density_kg_m3 == pytest.approx(density, rel=1e-7)
    assert props.kinematic_viscosity_m2_s == pytest.approx(_Viscosity(density, t_k) / density, rel=1e-7)
    assert props.vapour_pressure_pa == pytest.approx(p_sat_mpa * 1e6, rel=1e-9)


def test_water_at_100c_stays_liquid():
    # saturated liquid at 100 °C: about 958.4 kg/m³ and p_s = 101.418 kPa (IAPWS-IF97; from memory)
    props = fluid_properties(WaterFluid(temperature_c=100.0))
    assert props.density_kg_m3 == pytest.approx(958.35, abs=0.05)
    assert props.vapour_pressure_pa == pytest.approx(101418.0, abs=1.0)


def test_water_description():
    assert fluid_properties(WaterFluid(temperature_c=15.0)).description == "water at 15.0 °C (IAPWS-IF97, IAPWS 2008)"


@pytest.mark.parametrize("temperature_c", [-0.1, 100.1, 150.0, float("nan"), float("inf")])
def test_water_temperature_outside_range(temperature_c):
    with pytest.raises(ModelError) as caught:
        fluid_properties(WaterFluid(temperature_c=temperature_c))
    assert caught.value.field_path == "fluid.temperature"
    if temperature_c == temperature_c and abs(temperature_c) != float("inf"):
        assert "allowed 0 to 100 °C" in caught.value.problem


@pytest.mark.parametrize("temperature_c", ["20", None, True])
def test_water_temperature_not_a_number(temperature_c):
    with pytest.raises(ModelError) as caught:
        fluid_properties(WaterFluid(temperature_c=temperature_c))
    assert caught.value.field_path == "fluid.temperature"


def test_user_fluid_passes_values_through():
    fluid = UserFluid(
        name="primary sludge", density_kg_m3=1020.0, kinematic_viscosity_m2_s=5e-6, vapour_pressure_pa=2500.0,
        temperature_c=12.0,
    )  # invented demo values
    props = fluid_properties(fluid)
    assert props == FluidProperties(
        temperature_c=12.0,
        density_kg_m3=1020.0,
        kinematic_viscosity_m2_s=5e-6,
        vapour_pressure_pa=2500.0,
        description="primary sludge at 12.0 °C (properties as given)",
    )


def test_user_fluid_range_edges_accepted():
    for changes in (
        {"density_kg_m3": 500.0}, {"density_kg_m3": 2500.0},
        {"kinematic_viscosity_m2_s": 1e-7}, {"kinematic_viscosity_m2_s": 1e-2},
        {"vapour_pressure_pa": 0.0}, {"vapour_pressure_pa": 200e3},
    ):
        fluid_properties(dataclasses.replace(UserFluid(), **changes))


@pytest.mark.parametrize(
    ("changes", "field_path", "words"),
    [
        ({"density_kg_m3": 499.0}, "fluid.density", "500 to 2500 kg/m³"),
        ({"density_kg_m3": 3000.0}, "fluid.density", "500 to 2500 kg/m³"),
        ({"kinematic_viscosity_m2_s": 5e-8}, "fluid.kinematic_viscosity", "1e-7 to 1e-2 m²/s"),
        ({"kinematic_viscosity_m2_s": 0.02}, "fluid.kinematic_viscosity", "1e-7 to 1e-2 m²/s"),
        ({"vapour_pressure_pa": -1.0}, "fluid.vapour_pressure", "0 to 200 kPa"),
        ({"vapour_pressure_pa": 250e3}, "fluid.vapour_pressure", "0 to 200 kPa"),
        ({"density_kg_m3": float("nan")}, "fluid.density", "finite"),
        ({"kinematic_viscosity_m2_s": "thick"}, "fluid.kinematic_viscosity", "number"),
        ({"temperature_c": float("inf")}, "fluid.temperature", "finite"),
    ],
)
def test_user_fluid_out_of_range(changes, field_path, words):
    fluid = dataclasses.replace(UserFluid(), **changes)
    with pytest.raises(ModelError) as caught:
        fluid_properties(fluid)
    assert caught.value.field_path == field_path
    assert words in caught.value.problem


def test_not_a_fluid():
    with pytest.raises(ModelError) as caught:
        fluid_properties("water")
    assert caught.value.field_path == "fluid"


def test_blank_user_fluid_name():
    assert fluid_properties(UserFluid(name="  ")).description.startswith("user fluid at 20.0 °C")


def test_water_properties_are_reused_for_the_same_temperature_and_bad_values_still_refused():
    assert water_properties_at(12.5) is water_properties_at(12.5)  # one IAPWS evaluation per temperature
    assert water_properties_at(12.5) == water_properties_at(12.5 + 0.0)
    for _ in range(2):  # a refusal is never remembered as a result
        with pytest.raises(ModelError):
            water_properties_at(120.0)
