"""Standard-atmosphere pressure from altitude (hydraulics.atmosphere)."""

from __future__ import annotations

import numpy as np
import pytest
from fluids.atmosphere import ATMOSPHERE_1976

from hydraulics.atmosphere import geopotential_altitude, standard_atmosphere_pressure
from hydraulics.model import ModelError


@pytest.mark.parametrize(
    ("altitude_m", "pressure_pa"),
    [
        # U.S. Standard Atmosphere 1976, table of properties by geometric altitude (5 significant digits)
        (0.0, 101325.0),
        (1000.0, 89876.0),
        (2000.0, 79501.0),
        (5000.0, 54048.0),
    ],
)
def test_us_standard_atmosphere_1976_table(altitude_m, pressure_pa):
    # five significant digits in the table: agree within one unit of the last digit
    assert standard_atmosphere_pressure(altitude_m) == pytest.approx(pressure_pa, abs=1.0)


def test_sea_level_is_the_standard_atmosphere_exactly():
    # ISO 2533: p0 = 101 325 Pa at mean sea level, exact by definition
    assert standard_atmosphere_pressure(0.0) == 101325.0


@pytest.mark.parametrize("altitude_m", [-500.0, -100.0, 0.0, 250.0, 1500.0, 3000.0, 4500.0, 8000.0, 11000.0])
def test_matches_fluids_atmosphere_1976(altitude_m):
    # fluids.atmosphere.ATMOSPHERE_1976 (reference library, tests only); the 6-digit
    # constants of the barometric formula agree with its exact constants to about 2e-6
    assert standard_atmosphere_pressure(altitude_m) == pytest.approx(ATMOSPHERE_1976(altitude_m).P, rel=5e-6)


def test_geopotential_altitude_matches_fluids():
    for z in (-500.0, 1000.0, 11000.0):
        # fluids.atmosphere.ATMOSPHERE_1976 H attribute (reference library, tests only)
        assert geopotential_altitude(z) == pytest.approx(ATMOSPHERE_1976(z).H, rel=1e-12)


def test_vectorised_and_equal_to_scalar_calls():
    altitudes = np.array([[0.0, 500.0], [2500.0, 10000.0]])
    pressures = standard_atmosphere_pressure(altitudes)
    assert isinstance(pressures, np.ndarray) and pressures.shape == (2, 2)
    for z, p in zip(altitudes.ravel(), pressures.ravel(), strict=True):
        assert p == standard_atmosphere_pressure(float(z))
    assert isinstance(standard_atmosphere_pressure(100.0), float)


def test_pressure_falls_with_altitude():
    pressures = standard_atmosphere_pressure(np.linspace(-500.0, 11000.0, 50))
    assert np.all(np.diff(pressures) < 0)


@pytest.mark.parametrize("altitude_m", [-501.0, 11001.0, 20000.0, float("nan"), float("inf")])
def test_outside_troposphere_range_refused(altitude_m):
    with pytest.raises(ModelError) as caught:
        standard_atmosphere_pressure(altitude_m)
    assert caught.value.field_path == "site.altitude"


def test_array_with_one_bad_value_refused_naming_it():
    with pytest.raises(ModelError, match="12000"):
        standard_atmosphere_pressure(np.array([0.0, 12000.0]))
