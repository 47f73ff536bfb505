"""IAPWS water properties (hydraulics.water_properties) against published check values.

Published check values come first; comparisons with the independent ``iapws`` package
(used only in tests) follow.
"""

from __future__ import annotations

import numpy as np
import pytest
from iapws._iapws import _Viscosity
from iapws.iapws97 import _PSat_T, _Region1

from hydraulics.model import ModelError
from hydraulics.water_properties import (
    density_liquid,
    dynamic_viscosity,
    saturation_pressure,
    specific_volume_liquid,
)


# --------------------------------------------------------------------------- published check values
@pytest.mark.parametrize(
    ("temperature_k", "pressure_pa", "specific_volume_m3_kg"),
    [
        # IAPWS R7-97(2012), Table 5: region 1 check values
        (300.0, 3.0e6, 0.100215168e-2),
        (300.0, 80.0e6, 0.971180894e-3),
        (500.0, 3.0e6, 0.120241800e-2),
    ],
)
def test_region1_specific_volume_table5(temperature_k, pressure_pa, specific_volume_m3_kg):
    # the table gives 9 significant digits: half a unit in the last place is 5e-9 relative
    assert specific_volume_liquid(temperature_k, pressure_pa) == pytest.approx(specific_volume_m3_kg, rel=5e-9)


@pytest.mark.parametrize(
    ("temperature_k", "pressure_mpa"),
    [
        # IAPWS R7-97(2012), Table 35: region 4 saturation-pressure check values
        (300.0, 0.353658941e-2),
        (500.0, 0.263889776e1),
        (600.0, 0.123443146e2),
    ],
)
def test_saturation_pressure_table35(temperature_k, pressure_mpa):
    assert saturation_pressure(temperature_k) == pytest.approx(pressure_mpa * 1e6, rel=5e-9)


@pytest.mark.parametrize(
    ("temperature_k", "density_kg_m3", "viscosity_upa_s"),
    [
        # IAPWS R12-08, Table 4: check values of Eq. (2) with mu2 = 1
        (298.15, 998.0, 889.735100),
        (298.15, 1200.0, 1437.649467),
        (373.15, 1000.0, 307.883622),
        (433.15, 1.0, 14.538324),
        (873.15, 1.0, 32.619287),
    ],
)
def test_viscosity_table4(temperature_k, density_kg_m3, viscosity_upa_s):
    # the table gives six decimals (µPa·s): agree to half a unit in the last place,
    # which is better than 1e-8 relative except at 14.538324 (3.4e-8)
    assert dynamic_viscosity(temperature_k, density_kg_m3) * 1e6 == pytest.approx(viscosity_upa_s, abs=5e-7)


def test_viscosity_table4_relative_1e8_where_digits_allow():
    # IAPWS R12-08 Table 4 (values with at least 9 significant digits)
    assert dynamic_viscosity(298.15, 998.0) * 1e6 == pytest.approx(889.735100, rel=1e-9)
    assert dynamic_viscosity(298.15, 1200.0) * 1e6 == pytest.approx(1437.649467, rel=1e-9)
    assert dynamic_viscosity(373.15, 1000.0) * 1e6 == pytest.approx(307.883622, rel=2e-9)


# --------------------------------------------------------------------------- against the iapws package
CELSIUS = np.linspace(0.0, 100.0, 41)
KELVIN = CELSIUS + 273.15


def _liquid_pressure_pa(temperature_k: np.ndarray) -> np.ndarray:
    return np.maximum(101325.0, saturation_pressure(temperature_k))


def test_saturation_pressure_matches_iapws_0_to_100c():
    expected = np.array([_PSat_T(t) * 1e6 for t in KELVIN])
    np.testing.assert_allclose(saturation_pressure(KELVIN), expected, rtol=1e-12)


def test_density_matches_iapws_region1_0_to_100c_at_1_atm():
    pressure = _liquid_pressure_pa(KELVIN)
    expected = np.array([1.0 / _Region1(t, p / 1e6)["v"] for t, p in zip(KELVIN, pressure, strict=True)])
    np.testing.assert_allclose(density_liquid(KELVIN, pressure), expected, rtol=1e-7)


def test_viscosity_matches_iapws_0_to_100c_at_1_atm():
    density = density_liquid(KELVIN, _liquid_pressure_pa(KELVIN))
    # mu2 = 1 without phase data
    expected = np.array([_Viscosity(rho, t) for rho, t in zip(density, KELVIN, strict=True)])
    np.testing.assert_allclose(dynamic_viscosity(KELVIN, density), expected, rtol=1e-7)


# --------------------------------------------------------------------------- handbook values
def test_water_at_20c_against_handbook():
    # CRC Handbook of Chemistry and Physics, properties of water at 20 °C and 1 atm
    # (values quoted from memory): ρ = 998.21 kg/m³, μ = 1.0016 mPa·s, p_v = 2.3393 kPa
    t = 293.15
    rho = density_liquid(t, 101325.0)
    assert rho == pytest.approx(998.21, abs=0.01)
    assert dynamic_viscosity(t, rho) == pytest.approx(1.0016e-3, rel=1e-4)
    assert saturation_pressure(t) == pytest.approx(2339.3, rel=1e-4)


def test_boiling_point_at_one_atmosphere():
    # IAPWS-IF97 region 4 gives T_s(0.101325 MPa) = 373.124 K (the ITS-90 boiling point,
    # 99.974 °C; from memory): p_s there equals one standard atmosphere
    assert saturation_pressure(373.124) == pytest.approx(101325.0, rel=2e-5)


# --------------------------------------------------------------------------- shapes and validity
def test_scalar_in_float_out_array_in_array_out():
    assert isinstance(saturation_pressure(300.0), float)
    assert isinstance(density_liquid(300.0, 1e6), float)
    assert isinstance(dynamic_viscosity(300.0, 996.0), float)
    grid = np.array([[280.0, 300.0], [320.0, 340.0]])
    assert saturation_pressure(grid).shape == (2, 2)
    assert density_liquid(grid, 1e6).shape == (2, 2)
    assert dynamic_viscosity(grid, 990.0).shape == (2, 2)


def test_array_results_equal_scalar_results():
    temperatures = np.array([275.0, 310.0, 360.0])
    densities = density_liquid(temperatures, 2e5)
    for t, rho in zip(temperatures, densities, strict=True):
        assert rho == density_liquid(float(t), 2e5)
        assert dynamic_viscosity(temperatures, densities)[list(temperatures).index(t)] == pytest.approx(
            dynamic_viscosity(float(t), float(rho)), rel=1e-15
        )


def test_density_decreases_above_4c_and_viscosity_falls_with_temperature():
    # water's density maximum near 3.98 °C (from memory); viscosity falls with temperature
    t = np.linspace(278.15, 373.0, 30)
    rho = density_liquid(t, 101325.0)
    assert np.all(np.diff(rho) < 0)
    assert np.all(np.diff(dynamic_viscosity(t, rho)) < 0)


@pytest.mark.parametrize("temperature_k", [273.0, 650.0, float("nan")])
def test_saturation_pressure_outside_range(temperature_k):
    with pytest.raises(ModelError) as caught:
        saturation_pressure(temperature_k)
    assert caught.value.field_path == "temperature_k"


def test_region1_refuses_vapour_and_out_of_range():
    with pytest.raises(ModelError, match="saturation pressure"):
        density_liquid(373.15, 101325.0)  # p_s(100 °C) = 101 418 Pa > 1 atm: vapour
    with pytest.raises(ModelError):
        density_liquid(700.0, 30e6)
    with pytest.raises(ModelError):
        density_liquid(300.0, 120e6)
    with pytest.raises(ModelError):
        density_liquid(np.array([300.0, 272.0]), 1e6)


def test_region1_accepts_saturation_pressure_itself():
    t = 373.15
    assert density_liquid(t, saturation_pressure(t)) == pytest.approx(958.35, abs=0.05)  # from memory


def test_viscosity_refuses_bad_density_and_near_critical_state():
    with pytest.raises(ModelError):
        dynamic_viscosity(300.0, 0.0)
    with pytest.raises(ModelError):
        dynamic_viscosity(300.0, -5.0)
    with pytest.raises(ModelError, match="critical"):
        dynamic_viscosity(647.0, 322.0)
