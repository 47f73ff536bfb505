"""Specific speeds, the criteria they suggest, and NPSH available at each scenario's own level.

No published worked example of the specific speeds is quoted here from a source we could
cite to the digit, so the formula checks are hand calculations from the definitions (each
step written out), and the unit conversions are cross-checked by exact arithmetic on the
exact unit definitions (1 US gal = 3.785 411 784 L, 1 ft = 0.3048 m: NIST SP 811,
Appendix B.8; g = 9.806 65 m/s²) against the rounded factors quoted in the pump literature
(51.64 and 52.9; from memory).  The projects are invented test data.
"""

from dataclasses import replace
from decimal import Decimal, getcontext

import numpy as np
import pytest

from hydraulics.model import Criteria, Site, TankDelivery, UserFluid
from hydraulics.pump_fit import fit_pump
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve
from hydraulics.specific_speed import (
    DIMENSIONLESS_PER_SI,
    NPSH_MARGIN_BANDS,
    OPERATING_REGION_BANDS,
    US_PER_SI,
    criteria_findings,
    dimensionless_specific_speed,
    pump_specific_speeds,
    specific_speed,
    suction_specific_speed,
    suggested_criteria,
)
from tests.test_checks import clean_project, pump

GAL = 0.003785411784  # m³, exact (NIST SP 811)
FT = 0.3048  # m, exact (NIST SP 811)
G = 9.80665  # m/s², standard gravity (CGPM 1901)


# ----------------------------------------------------------------------------- conversions

def test_us_factor_by_exact_arithmetic():
    # N_s / n_s = √(Q_gpm / Q) / (H_ft / H)^0.75 = √(60 / gal) · ft^0.75, computed in 40-digit decimals
    getcontext().prec = 40
    gpm_per_m3_s = Decimal(60) / Decimal("0.003785411784")  # 15 850.323 141 488 90…
    assert gpm_per_m3_s.quantize(Decimal("0.000001")) == Decimal("15850.323141")
    ft_factor = Decimal("0.3048") ** Decimal("0.75")  # 0.3048^0.75 = exp(0.75 ln 0.3048)
    factor = gpm_per_m3_s.sqrt() * Decimal(str(float(ft_factor)))
    assert US_PER_SI == pytest.approx(float(factor), rel=1e-14)
    assert US_PER_SI == pytest.approx(51.64, abs=0.01)  # the 51.64 of the pump literature (from memory)


def test_dimensionless_factor_and_the_quoted_rounded_values():
    # ω_s / n_s = (2π/60) / g^0.75 = 0.104 719 755 / 5.541 29 = 0.018 896 8
    assert DIMENSIONLESS_PER_SI == pytest.approx(0.10471975511965977 / G**0.75, rel=1e-15)
    assert 1.0 / DIMENSIONLESS_PER_SI == pytest.approx(52.9, abs=0.05)  # n_q = 52.9 ω_s, Gülich (from memory)
    assert US_PER_SI / DIMENSIONLESS_PER_SI == pytest.approx(2733, abs=1.0)  # N_s = 2733 ω_s (from the two above)


# ----------------------------------------------------------------------------- formulas

def test_specific_speed_si_by_hand():
    # hand: 1450 rpm, 0.1 m³/s, 30 m: √0.1 = 0.316 228; 30^0.75 = exp(0.75 × 3.401 197) = 12.8190;
    # 1450 × 0.316 228 / 12.8190 = 35.770
    assert specific_speed(1450.0, 0.1, 30.0) == pytest.approx(35.770, abs=5e-3)


def test_specific_speed_us_form_by_hand_and_through_si():
    # hand, US units: 1750 rpm, 2000 gpm, 200 ft: √2000 = 44.7214; 200^0.75 = exp(0.75 × 5.298 317) = 53.1829;
    # N_s = 1750 × 44.7214 / 53.1829 = 1471.6
    n_us = 1750.0 * 2000.0**0.5 / 200.0**0.75
    assert n_us == pytest.approx(1471.6, abs=0.1)
    q_si = 2000.0 * GAL / 60.0  # 0.126 18 m³/s
    h_si = 200.0 * FT  # 60.96 m
    assert specific_speed(1750.0, q_si, h_si) * US_PER_SI == pytest.approx(n_us, rel=1e-12)


def test_double_suction_counts_half_the_flow_per_eye():
    # per eye: Q/2, so n_s falls by √2 (definition: flow per impeller eye)
    assert specific_speed(1450.0, 0.2, 30.0, impeller_eyes=2) == pytest.approx(specific_speed(1450.0, 0.1, 30.0),
                                                                                rel=1e-15)


def test_dimensionless_specific_speed_by_hand():
    # hand: ω = 2π × 1450/60 = 151.844 rad/s; gH = 294.1995 m²/s²; (gH)^0.75 = exp(0.75 × 5.684 26) = 71.0406;
    # ω_s = 151.844 × 0.316 228 / 71.0406 = 0.675 92
    assert dimensionless_specific_speed(1450.0, 0.1, 30.0) == pytest.approx(0.67592, abs=5e-5)
    assert specific_speed(1450.0, 0.1, 30.0) * DIMENSIONLESS_PER_SI == pytest.approx(
        dimensionless_specific_speed(1450.0, 0.1, 30.0), rel=1e-12)


def test_suction_specific_speed_by_hand():
    # hand, US units: 1780 rpm, 3000 gpm, NPSH_R 20 ft: √3000 = 54.7723; 20^0.75 = exp(0.75 × 2.995 732) = 9.4574;
    # N_ss = 1780 × 54.7723 / 9.4574 = 10 309
    s_si = suction_specific_speed(1780.0, 3000.0 * GAL / 60.0, 20.0 * FT)
    assert s_si * US_PER_SI == pytest.approx(10309.0, abs=1.0)


def test_vectorised_over_flow():
    q = np.array([0.1, 0.4])
    values = specific_speed(1450.0, q, 30.0)
    assert values[1] == pytest.approx(2.0 * values[0], rel=1e-15)  # √4 = 2 (definition)


# ----------------------------------------------------------------------------- the fitted pump

def fitted_pump(rated_speed_rpm: float = 1450.0, npsh_constant_m: float | None = None):
    model = pump()
    if npsh_constant_m is not None:
        model = replace(model, npsh_required_m=(npsh_constant_m,) * len(model.flow_m3_s))
    return fit_pump(replace(model, rated_speed_rpm=rated_speed_rpm), 1000.0)


def test_pump_specific_speeds_at_the_best_efficiency_point():
    fitted = fitted_pump()
    speeds = pump_specific_speeds(fitted)
    q, h = fitted.bep_flow_m3_s, fitted.bep_head_m
    # the test pump's data are exact quadratics, so the fit reproduces them (H = 50 − 12 000 Q², NPSH_R = 2 + 600 Q²)
    assert h == pytest.approx(50.0 - 12_000.0 * q**2, abs=1e-6)
    assert speeds.npsh_required_at_bep_m == pytest.approx(2.0 + 600.0 * q**2, abs=1e-6)
    assert speeds.specific_speed_si == pytest.approx(1450.0 * q**0.5 / h**0.75, rel=1e-12)  # definition
    assert speeds.suction_specific_speed_si == pytest.approx(
        1450.0 * q**0.5 / (2.0 + 600.0 * q**2) ** 0.75, rel=1e-9)  # definition
    assert speeds.specific_speed_us == pytest.approx(speeds.specific_speed_si * 51.645, rel=1e-4)  # factor above
    assert speeds.suction_specific_speed_us == pytest.approx(speeds.suction_specific_speed_si * 51.645, rel=1e-4)


def test_no_npsh_data_leaves_the_suction_values_unknown():
    fitted = fit_pump(replace(pump(), npsh_required_m=()), 1000.0)
    speeds = pump_specific_speeds(fitted)
    assert speeds.specific_speed_si > 0.0
    assert speeds.suction_specific_speed_si is None and speeds.suction_specific_speed_us is None
    suggested = suggested_criteria(fitted)
    assert suggested.npsh_band is None
    assert suggested.criteria.npsh_margin_ratio == Criteria().npsh_margin_ratio  # left as given


# ----------------------------------------------------------------------------- suggested criteria

def npsh_for_suction_specific_speed(s_us: float) -> float:
    """The constant NPSH_R (m) that gives the test pump suction specific speed ``s_us`` at its BEP."""
    q = fitted_pump().bep_flow_m3_s
    return (1450.0 * q**0.5 * US_PER_SI / s_us) ** (4.0 / 3.0)  # S = n √Q / NPSH_R^0.75 solved for NPSH_R


@pytest.mark.parametrize("s_us, ratio", [
    (7000.0, 1.1),   # ordinary suction energy, after ANSI/HI 9.6.1 (from memory; verify)
    (8400.0, 1.1),
    (8600.0, 1.3),   # high suction energy, after ANSI/HI 9.6.1 (from memory; verify)
    (10900.0, 1.3),
    (11100.0, 1.5),  # very high suction energy: common practice (from memory; verify)
])
def test_npsh_margin_ratio_by_suction_specific_speed(s_us, ratio):
    fitted = fitted_pump(npsh_constant_m=npsh_for_suction_specific_speed(s_us))
    suggested = suggested_criteria(fitted)
    assert suggested.speeds.suction_specific_speed_us == pytest.approx(s_us, rel=1e-6)
    assert suggested.criteria.npsh_margin_ratio == ratio
    assert suggested.criteria.npsh_margin_min_m == 0.6  # the project default (after ANSI/HI 9.6.1; verify)


@pytest.mark.parametrize("speed_factor, region", [
    (1.0, (0.70, 1.20, 0.40, 1.30)),  # N_s about 1030 US: radial, preferred 70–120 % after ANSI/HI 9.6.3 (memory)
    (6.0, (0.80, 1.15, 0.60, 1.20)),  # N_s about 6200 US: mixed flow, preferred 80–115 % (from memory; verify)
])
def test_operating_regions_by_pump_specific_speed(speed_factor, region):
    fitted = fitted_pump(rated_speed_rpm=1450.0 * speed_factor)
    suggested = suggested_criteria(fitted)
    c = suggested.criteria
    assert (c.preferred_region_low, c.preferred_region_high, c.allowable_region_low, c.allowable_region_high) == region
    assert c.sewage_velocity_min_m_s == Criteria().sewage_velocity_min_m_s  # other fields as given


def test_band_tables_are_ordered_and_cover_every_value():
    assert [b.s_us_max for b in NPSH_MARGIN_BANDS] == sorted(b.s_us_max for b in NPSH_MARGIN_BANDS)
    assert NPSH_MARGIN_BANDS[-1].s_us_max == float("inf") and OPERATING_REGION_BANDS[-1].ns_us_max == float("inf")
    assert all("ANSI/HI 9.6.1" in b.source for b in NPSH_MARGIN_BANDS)
    assert all("ANSI/HI 9.6.3" in b.source for b in OPERATING_REGION_BANDS)


def test_default_criteria_are_not_looser_for_an_ordinary_radial_pump():
    assert criteria_findings(Criteria(), fitted_pump()) == []


# ----------------------------------------------------------------------------- findings in a solve

def test_looser_criteria_raise_an_info_finding_quoting_the_speeds_and_keep_the_criteria():
    project = clean_project()
    wide = replace(project.criteria, allowable_region_low=0.30)
    solution = solve(replace(project, criteria=wide))
    found = [f for f in solution.findings if f.code == "criteria_looser_than_suggested"]
    assert len(found) == 1 and found[0].severity == "info"
    assert "n_s" in found[0].message and "allowable region 30–130 %" in found[0].message
    assert "suggested 40–130 %" in found[0].message  # radial band (common practice; from memory)
    assert solution.project.criteria == wide  # never changed by the solve
    assert "criteria_looser_than_suggested" not in {f.code for f in solve(project).findings}  # clean project


def test_high_suction_specific_speed_raises_the_finding_with_the_suggested_ratio():
    project = clean_project()
    npsh = npsh_for_suction_specific_speed(9500.0)  # about 1.9 m: keeps a margin well above the criteria
    model = project.pumps[0]
    crafted = replace(project, pumps=(replace(model, npsh_required_m=(npsh,) * len(model.flow_m3_s)),))
    found = [f for f in solve(crafted).findings if f.code == "criteria_looser_than_suggested"]
    assert len(found) == 1
    assert "NPSH margin ratio 1.10 (suggested 1.30" in found[0].message  # high band (after ANSI/HI 9.6.1; memory)


def test_json_and_report_show_the_specific_speeds():
    from app.text_report import summary_text

    solution = solve(clean_project())
    data = solution_to_json_dict(solution)
    speeds = data["pumps"][0]["specific_speed"]
    assert speeds["specific_speed_si"] == pytest.approx(solution.specific_speeds[0].specific_speed_si)
    assert {"specific_speed_us", "specific_speed_dimensionless", "suction_specific_speed_si",
            "suction_specific_speed_us", "impeller_eyes"} <= set(speeds)
    assert data["npsh_worst_case"]["basis"].startswith("highest per-pump flow, lowest suction level")
    text = summary_text(solution)
    assert "specific speed n_s" in text and "suction specific speed S" in text
    assert "conservative case" in text


# ----------------------------------------------------------------------------- NPSH at each scenario's level

P_ATM, P_V, RHO = 101_325.0, 2_000.0, 1000.0  # given directly (user fluid, site pressure): invented test data
HEAD_ATM = (P_ATM - P_V) / (RHO * G)  # (101 325 − 2000) / 9806.65 = 99 325 / 9806.65 = 10.128 33 m


def no_suction_project(level_low: float = 10.0, level_high: float = 11.0, npsh=None):
    """The clean project without suction pipework (no suction loss), a user fluid and a given pressure."""
    project = clean_project()
    site = Site(level_low, level_high, TankDelivery(41.0, 42.0), pump_datum_m=8.0, design_flow_m3_s=0.035,
                atmospheric_pressure_pa=P_ATM)
    pumps = project.pumps
    if npsh is not None:
        pumps = (replace(pumps[0], npsh_required_m=tuple(npsh(np.asarray(pumps[0].flow_m3_s)))),)
    return replace(project, site=site, segments=project.segments[1:], pumps=pumps,
                   fluid=UserFluid("test liquid", RHO, 1.0e-6, P_V, 20.0))


def test_npsh_available_at_each_scenarios_own_suction_level_by_hand():
    solution = solve(no_suction_project())
    assert HEAD_ATM == pytest.approx(10.12833, abs=1e-5)
    # minimum static = 41 − 11 (highest suction level): NPSH_A = 10.128 33 + 11 − 8 = 13.128 33 m
    # maximum static = 42 − 10 (lowest suction level):  NPSH_A = 10.128 33 + 10 − 8 = 12.128 33 m
    expected = {"min": 13.12833, "max": 12.12833}
    for p in solution.operating_points:
        assert p.found
        assert p.npsh_available_m == pytest.approx(expected[p.static], abs=1e-5)
    worst = solution.npsh_worst_case
    # the conservative case: the highest per-pump flow (minimum static, new pipe) with the lowest level: 12.128 33 m
    top = max(solution.operating_points, key=lambda p: p.flow_per_pump_m3_s)
    assert (worst.static, worst.pipe, worst.flow_m3_s) == (top.static, top.pipe, top.flow_m3_s)
    assert worst.static == "min" and worst.suction_level_m == 10.0
    assert worst.npsh_available_m == pytest.approx(12.12833, abs=1e-5)
    q = worst.flow_per_pump_m3_s
    assert worst.npsh_required_m == pytest.approx(2.0 + 600.0 * q**2, abs=1e-6)  # the exact quadratic data
    assert worst.required_available_m == pytest.approx(max(1.1 * worst.npsh_required_m,
                                                           worst.npsh_required_m + 0.6))  # the criteria's rule
    assert worst.sufficient
    curve = solution.npsh_available_curve  # no suction pipework: flat at each level's static part
    assert np.allclose(curve.available_new_m, 12.12833, atol=1e-5)  # lowest level, as above
    assert np.allclose(curve.available_highest_level_aged_m, 13.12833, atol=1e-5)  # highest level, as above


def test_worst_case_finding_when_only_the_conservative_case_falls_short():
    # levels 5–11 m, datum 8 m: at the scenarios' own levels NPSH_A = 10.128 + 3 = 13.128 m (minimum static) and
    # 10.128 − 3 = 7.128 m (maximum static, at a lower flow); NPSH_R = 2 + 4000 Q² (invented) is about 7.5 m at the
    # highest flow (about 0.037 m³/s), so only the conservative combination falls below max(1.1 r, r + 0.6)
    project = no_suction_project(level_low=5.0, level_high=11.0, npsh=lambda q: 2.0 + 4000.0 * q**2)
    solution = solve(project)
    codes = {f.code for f in solution.findings}
    worst = solution.npsh_worst_case
    assert worst.npsh_available_m == pytest.approx(HEAD_ATM + 5.0 - 8.0, abs=1e-9)  # 7.128 33 m, no suction loss
    assert not worst.sufficient
    assert "npsh_worst_case_low" in codes
    assert not codes & {"npsh_margin_low", "npsh_insufficient"}  # every scenario at its own level is fine
    found = next(f for f in solution.findings if f.code == "npsh_worst_case_low")
    assert found.severity == "warning" and "lowest suction level 5.00 m" in found.message
    # the same pump with the levels 10–11 m has enough even in the conservative case
    assert "npsh_worst_case_low" not in {f.code for f in solve(no_suction_project(npsh=lambda q: 2.0 + 4000.0 * q**2))
                                         .findings}
