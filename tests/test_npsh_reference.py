"""NPSH available against values fixed by published definitions and tables."""

import pytest

from hydraulics.atmosphere import standard_atmosphere_pressure
from hydraulics.operating_points import npsh_available


def test_atmospheric_head_is_one_standard_atmosphere_of_conventional_water_column():
    # 1 atm = 101 325 Pa (ISO 2533); 1 m of conventional water column = 9 806.65 Pa (NIST SP 811,
    # Appendix B.8), so an open sump at the pump datum with no vapour pressure and no suction loss
    # has NPSHa = 101 325 / 9 806.65 = 10.3323 m.
    assert npsh_available(101_325.0, 0.0, 1000.0, 0.0, 0.0, 0.0) == pytest.approx(101_325.0 / 9_806.65, rel=1e-12)


def test_suction_lift_at_altitude_with_warm_water():
    # Site at 2 000 m: U.S. Standard Atmosphere 1976 table, 79 501 Pa; water at 30 °C: vapour pressure
    # 4.2470 kPa and density 995.65 kg/m³ (IAPWS-IF97 as tabulated in steam tables, e.g. Wagner & Kretzschmar,
    # International Steam Tables, 2nd ed.; from memory to the digits given); surface 3 m below the pump,
    # 0.8 m suction loss.
    p_atm = float(standard_atmosphere_pressure(2000.0))
    assert p_atm == pytest.approx(79_501.0, abs=1.0)
    expected = (79_501.0 - 4_247.0) / (995.65 * 9.80665) - 3.0 - 0.8  # = 7.7074 − 3.8 = 3.907 m (hand)
    assert npsh_available(p_atm, 4_247.0, 995.65, 97.0, 100.0, 0.8) == pytest.approx(expected, abs=1e-3)
    assert expected == pytest.approx(3.907, abs=1e-3)
