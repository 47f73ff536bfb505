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


FT = 0.3048  # m, exact (NIST SP 811)
PSI = 6894.757293168  # Pa per lbf/in², NIST SP 811
WATER_60F_DENSITY = 999.0  # kg/m³ at 60 °F (15.6 °C); specific gravity 1.0 as the example takes it


@pytest.mark.parametrize("height_ft, expected_ft", [
    (15.0, 46.0),   # "NPSHA: Atmospheric Tank": NPSHA = 34 + 15 − 0.6 − 0.4 − 2 = 46 ft
    (-20.0, 11.0),  # Example 10.11 "Suction Lift from Open Reservoir": 34 + (−20) − 0.6 − 0.4 − 2 = 11 ft
])
def test_npsh_available_against_published_worked_examples(height_ft, expected_ft):
    # Worked examples "Calculating NPSHA" (section 10.2.12.1) of a water and wastewater treatment
    # operations handbook, as reprinted at climate-policy-watcher.org/wastewater-treatment-3/calculating-npsha:
    # water at 60 °F, Pa = 14.7 psia (34 ft), Pv = 0.256 psia (0.6 ft), entrance loss 0.4 ft, friction
    # loss 2 ft. The example rounds each head to 0.1 ft (34 ft for 33.9 ft), so agreement is to 0.2 ft.
    result_m = npsh_available(14.7 * PSI, 0.256 * PSI, WATER_60F_DENSITY, height_ft * FT, 0.0, (0.4 + 2.0) * FT)
    assert result_m / FT == pytest.approx(expected_ft, abs=0.2)
