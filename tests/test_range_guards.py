"""Range guards: each finding raised by a crafted project and absent from a clean one.

The clean base is the bundled hilltop booster sample (an invented demo scenario: water at 12 °C,
Darcy–Weisbach, turbulent everywhere, a conventional swing check at about 1.9 m/s per pump).
The crafted pumps here are invented test data.
"""

import math
from dataclasses import replace

import fluids.fittings as ff
import numpy as np
import pytest

from app.samples import sample_path
from hydraulics import fittings, range_guards
from hydraulics.model import Fitting, PumpModel, UserFluid, WaterFluid
from hydraulics.project_io import load_project
from hydraulics.pump_fit import fit_pump
from hydraulics.solve import solve

GUARD_CODES = {"hazen_williams_out_of_range", "pump_curves_not_viscosity_corrected", "check_valve_not_fully_open",
               "head_fit_poor", "efficiency_fit_poor", "efficiency_peak_above_data"}

VISCOUS_OIL = UserFluid("test oil", 900.0, 2.0e-4, 100.0)
"""200 mm²/s (200 cSt), the viscous fluid of the issue (invented test fluid)."""


def hilltop():
    return load_project(sample_path("hilltop_booster"))


def codes(project) -> list[str]:
    return [f.code for f in solve(project).findings]


def findings_of(project, code):
    return [f for f in solve(project).findings if f.code == code]


def fixed_speed(project):
    """The sample run at its rated speed only (no drive range below it)."""
    return replace(project, arrangement=replace(project.arrangement, min_speed_ratio=1.0, max_speed_ratio=1.0))


def test_clean_sample_at_fixed_speed_raises_no_guard():
    assert not GUARD_CODES & set(codes(fixed_speed(hilltop())))


def test_at_its_minimum_drive_speed_the_sample_check_valve_is_not_fully_open():
    # At 88 % speed and maximum static head one pump delivers about 20 L/s (the engine's speed points), so
    # the swing check in the discharge branch runs below Crane's full-lift velocity: a real finding.
    solution = solve(hilltop())
    found = [f for f in solution.findings if f.code == "check_valve_not_fully_open"]
    lowest = min(p.point.flow_per_pump_m3_s for p in solution.speed_points if p.point.found)
    assert len(found) == 1
    assert dict((n, v) for n, v, _ in found[0].values)["q"] == pytest.approx(lowest, rel=1e-9)


def test_clean_under_hazen_williams_with_ordinary_water_raises_no_guard():
    # water at 12 °C, turbulent (Re about 1.75e5 in the main): inside the method's validity
    assert "hazen_williams_out_of_range" not in codes(replace(hilltop(), friction_method="hazen_williams"))


def test_hazen_williams_with_a_user_fluid_is_critical():
    water_like = UserFluid("water-like", 999.5, 1.235e-6, 1403.0, 12.0)  # turbulent, like the sample's water
    found = findings_of(replace(hilltop(), friction_method="hazen_williams", fluid=water_like),
                        "hazen_williams_out_of_range")
    assert [f.severity for f in found] == ["critical"]
    assert "user fluid" in found[0].message
    assert "hazen_williams_out_of_range" not in codes(replace(hilltop(), fluid=water_like))  # Darcy–Weisbach


@pytest.mark.parametrize("temperature_c, flagged", [(2.0, True), (5.0, False), (25.0, False), (40.0, True)])
def test_hazen_williams_water_temperature_bounds(temperature_c, flagged):
    # bounds 5–25 °C (from memory; verify — hydraulics.range_guards)
    project = replace(hilltop(), friction_method="hazen_williams", fluid=WaterFluid(temperature_c))
    assert ("hazen_williams_out_of_range" in codes(project)) is flagged


def test_hazen_williams_in_laminar_flow_is_critical_and_quotes_the_darcy_ratio():
    project = replace(hilltop(), friction_method="hazen_williams", fluid=VISCOUS_OIL)
    solution = solve(project)
    regime = [f for f in solution.findings if f.code == "hazen_williams_out_of_range" and "laminar" in f.message]
    assert len(regime) == 1 and regime[0].severity == "critical"
    laminar = [s for s in solution.segments if s.regime == "laminar"]
    assert laminar
    # Hagen–Poiseuille f = 64/Re against the equivalent Darcy factor of the Hazen–Williams loss
    expected = max((64.0 / s.reynolds) / s.friction_factor for s in laminar)
    assert f"{expected:.2f} times the friction loss used" in regime[0].message
    assert expected > 1.0  # Hazen–Williams understates the laminar loss here


def test_darcy_ratio_is_one_for_a_darcy_weisbach_segment():
    # under Darcy–Weisbach the segment's own factor is the all-regime Darcy factor: ratio 1 (identity)
    for seg in solve(hilltop()).segments:
        assert range_guards.darcy_to_hazen_williams_ratio(seg) == pytest.approx(1.0, rel=1e-9)


def test_laminar_message_states_the_law_used_under_either_method():
    darcy = [f for f in solve(replace(hilltop(), fluid=VISCOUS_OIL)).findings if f.code == "laminar_flow"]
    hazen = [f for f in solve(replace(hilltop(), fluid=VISCOUS_OIL, friction_method="hazen_williams")).findings
             if f.code == "laminar_flow"]
    assert darcy and hazen
    assert all(f.message.endswith("f = 64/Re is used.") for f in darcy)
    assert all("Hazen–Williams" in f.message and "f = 64/Re is used" not in f.message for f in hazen)


def test_viscous_user_fluid_pump_curves_uncorrected_is_critical():
    found = findings_of(replace(hilltop(), fluid=VISCOUS_OIL), "pump_curves_not_viscosity_corrected")
    assert [f.severity for f in found] == ["critical"]
    assert "ANSI/HI 9.6.7" in found[0].message


@pytest.mark.parametrize("viscosity_m2_s, flagged", [(1.0e-6, False), (4.0e-6, False), (4.5e-6, True)])
def test_viscosity_threshold(viscosity_m2_s, flagged):
    # threshold 4 mm²/s (ANSI/HI 9.6.7, from memory; verify — hydraulics.range_guards)
    fluid = UserFluid("test liquid", 999.0, viscosity_m2_s, 1403.0)
    assert ("pump_curves_not_viscosity_corrected" in codes(replace(hilltop(), fluid=fluid))) is flagged


# ------------------------------------------------------------------ check valves
def test_full_lift_si_constant_against_crane_us_formula_by_hand():
    # Crane TP-410 (US units), conventional swing check: v [ft/s] = 35 sqrt(V [ft³/lb]).
    # Water at 1000 kg/m³: V = 0.001 m³/kg; 1 ft³/lb = 0.3048³ / 0.45359237 = 0.0624279606 m³/kg,
    # so V = 0.001 / 0.0624279606 = 0.0160184634 ft³/lb; sqrt = 0.12656407;
    # v = 35 × 0.12656407 = 4.4297424 ft/s = 4.4297424 × 0.3048 = 1.3501855 m/s.
    v = fittings.full_lift_velocity_m_s(fittings.fitting_catalogue()["swing_check_valve"], 1000.0)
    assert v == pytest.approx(1.3501855, rel=1e-7)
    # the SI factor sqrt(0.45359237 / 0.3048) = 1.2199033 (exact definitions of ft and lb, NIST SP 811)
    assert fittings.FULL_LIFT_SI_PER_US == pytest.approx(1.2199033, rel=1e-7)


CRANE_METRIC_STYLE = {  # fluids.fittings.v_lift_valve_Crane styles (Crane TP-410 metric constants, rounded)
    "swing_check_valve": "swing check angled",
    "swing_check_valve_clearway": "swing check straight",
    "lift_check_valve": "lift check straight",
    "lift_check_valve_angle": "lift check angled",
    "foot_valve_poppet": "foot valve poppet disc",
    "foot_valve_hinged": "foot valve hinged disc",
}


@pytest.mark.parametrize("fitting_id", sorted(CRANE_METRIC_STYLE))
def test_full_lift_velocity_against_crane_metric_constants(fitting_id):
    # Crane's metric edition rounds its SI constant to a multiple of 5: the exact conversion of the
    # US constant lies within 2.5 of it (reference: fluids.fittings.v_lift_valve_Crane, β = 1)
    rho = 998.2
    kind = fittings.fitting_catalogue()[fitting_id]
    ours = fittings.full_lift_velocity_m_s(kind, rho)
    reference = ff.v_lift_valve_Crane(rho, D1=0.1, D2=0.1, style=CRANE_METRIC_STYLE[fitting_id])
    assert abs(ours - reference) * math.sqrt(rho) <= 2.5
    assert kind.full_lift_velocity_source


def test_other_fittings_have_no_full_lift_velocity():
    catalogue = fittings.fitting_catalogue()
    assert fittings.full_lift_velocity_m_s(catalogue["gate_valve_open"], 1000.0) is None
    assert {k for k, t in catalogue.items() if t.is_check_valve} == set(CRANE_METRIC_STYLE)


def _with_discharge_valve(project, fitting_id):
    segments = list(project.segments)
    i = next(j for j, s in enumerate(segments) if s.name == "Pump discharge branch")
    rows = tuple(Fitting(fitting_id) if f.fitting_id == "swing_check_valve" else f for f in segments[i].fittings)
    segments[i] = replace(segments[i], fittings=rows)
    return replace(project, segments=tuple(segments)), i


def test_check_valve_below_full_lift_is_a_warning_per_pump():
    # clearway swing check: 60 sqrt(V) ft/s = 73.19 / sqrt(999.5) = 2.32 m/s (Crane TP-410, converted);
    # the branch runs at about 1.9 m/s per pump (sample's segment table), so the disc is not fully lifted
    project, index = _with_discharge_valve(hilltop(), "swing_check_valve_clearway")
    found = findings_of(project, "check_valve_not_fully_open")
    assert len(found) == 1 and found[0].severity == "warning"
    assert found[0].target == ("segment", index)
    assert "per pump" in found[0].message and "lowest operating flow" in found[0].message
    solution = solve(project)  # the lowest flow over every point the checks see, reduced speeds included
    lowest_branch_flow = min(p.point.flow_per_pump_m3_s for p in solution.speed_points if p.point.found)
    quoted = dict((name, value) for name, value, _ in found[0].values)
    assert quoted["q"] == pytest.approx(lowest_branch_flow, rel=1e-9)


def test_check_valve_without_pumps_is_checked_at_design_flow():
    project, _ = _with_discharge_valve(hilltop(), "swing_check_valve_clearway")
    found = findings_of(replace(project, arrangement=None), "check_valve_not_fully_open")
    assert len(found) == 1 and "design flow" in found[0].message


# ------------------------------------------------------------------ fit quality
FIT_FLOWS = tuple(np.linspace(0.01, 0.05, 9))
FIT_HEADS = tuple(50.0 - 12_000.0 * np.asarray(FIT_FLOWS) ** 2)


def crafted_pump(efficiency, heads=FIT_HEADS, order=2):
    return PumpModel("X1", "crafted pump", 1450.0, FIT_FLOWS, tuple(heads), tuple(efficiency),
                     efficiency_fit_order=order)


FLAT_TOPPED = (0.40, 0.60, 0.72, 0.78, 0.80, 0.80, 0.79, 0.78, 0.76)
"""A flat-topped efficiency curve (invented): a quadratic misses it by 4.2 points and peaks at 83 %."""


def test_poor_efficiency_fit_and_peak_above_data():
    fitted = fit_pump(crafted_pump(FLAT_TOPPED), 1000.0)
    found = {f.code: f for f in range_guards.fit_quality_findings(fitted)}
    assert fitted.efficiency_fit.max_abs > range_guards.EFFICIENCY_FIT_MAX_LIMIT  # 3 points, common practice
    assert fitted.bep_efficiency > max(FLAT_TOPPED) + range_guards.EFFICIENCY_PEAK_MARGIN  # 2 points
    assert set(found) == {"efficiency_fit_poor", "efficiency_peak_above_data"}
    assert all(f.severity == "warning" for f in found.values())


def test_good_fit_raises_nothing():
    # efficiency exactly quadratic in flow: the order-2 fit reproduces it (residuals at round-off)
    q = np.asarray(FIT_FLOWS)
    exact = tuple(0.80 * (1.0 - ((q - 0.035) / 0.035) ** 2))
    assert range_guards.fit_quality_findings(fit_pump(crafted_pump(exact), 1000.0)) == []


def test_head_fit_rms_threshold():
    # one head point 4 m off an exact quadratic: RMS residual of the order-2 fit above 2 % of shut-off
    heads = list(FIT_HEADS)
    heads[4] += 4.0
    q = np.asarray(FIT_FLOWS)
    exact_eff = tuple(0.80 * (1.0 - ((q - 0.035) / 0.035) ** 2))
    fitted = fit_pump(crafted_pump(exact_eff, heads), 1000.0)
    assert fitted.head_fit.rms > range_guards.HEAD_FIT_RMS_LIMIT * fitted.shutoff_head_m
    assert [f.code for f in range_guards.fit_quality_findings(fitted)] == ["head_fit_poor"]
    heads[4] = FIT_HEADS[4] + 0.2  # 0.2 m off: well inside 2 % of 50 m
    fitted = fit_pump(crafted_pump(exact_eff, heads), 1000.0)
    assert range_guards.fit_quality_findings(fitted) == []


def test_poor_fit_reaches_the_solution():
    project = hilltop()
    pump_id = project.arrangement.pump_id
    base_pump = project.pump(pump_id)
    n = len(base_pump.flow_m3_s)
    top = max(base_pump.efficiency) if base_pump.efficiency else 0.8
    # a flat top with steep ends (invented), which a quadratic cannot follow
    shape = np.clip(1.0 - ((np.arange(n) - (n - 1) * 0.6) / n) ** 4 * 8, 0.3, 1.0)
    pump = replace(base_pump, efficiency=tuple(float(top * s) for s in shape), shaft_power_w=(),
                   efficiency_fit_order=2)
    crafted = replace(project, pumps=tuple(pump if p.pump_id == pump_id else p for p in project.pumps))
    fitted = fit_pump(pump, 999.5)
    expected = {f.code for f in range_guards.fit_quality_findings(fitted)}
    assert expected  # the crafted curve is a poor quadratic
    assert expected <= set(codes(crafted))
