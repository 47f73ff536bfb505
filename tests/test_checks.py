"""Every finding is raised by a crafted project and absent from a clean one.

The projects here are invented test data.  Pump curves are exact quadratics
(H = 50 − 12 000 Q², Q in m³/s) so the duty points are easy to reason about:
against a static head of 30–32 m and a short main the single pump runs near 37 L/s.
"""

from dataclasses import replace

import numpy as np
import pytest

from hydraulics.model import (
    Arrangement,
    Criteria,
    Fitting,
    InstalledPump,
    ProfilePoint,
    Project,
    PumpModel,
    Segment,
    Site,
    TankDelivery,
    UserFluid,
    WaterFluid,
)
from hydraulics.solve import solve

FLOWS = tuple(np.linspace(0.0, 0.05, 11))


def pump(peak_flow: float = 0.037, flows=FLOWS, rising: bool = False) -> PumpModel:
    q = np.asarray(flows)
    head = 50.0 - 12_000.0 * q**2
    if rising:  # a head curve that rises from shut-off to a peak, then falls
        head = 46.0 + 400.0 * q - 16_000.0 * q**2
    efficiency = np.clip(0.80 * (1.0 - ((q - peak_flow) / peak_flow) ** 2), 0.0, None)
    return PumpModel(pump_id="T1", name="test pump", rated_speed_rpm=1450.0, flow_m3_s=tuple(q),
                     head_m=tuple(head), efficiency=tuple(efficiency),
                     npsh_required_m=tuple(2.0 + 600.0 * q**2), efficiency_fit_order=2)


def clean_project() -> Project:
    return Project(
        name="clean test project",
        site=Site(suction_level_low_m=10.0, suction_level_high_m=11.0,
                  delivery=TankDelivery(level_low_m=41.0, level_high_m=42.0),
                  pump_datum_m=8.0, design_flow_m3_s=0.035),
        fluid=WaterFluid(15.0),
        segments=(
            Segment("suction", "suction", "ductile_iron_cml", 5.0, 0.25,
                    fittings=(Fitting("entrance_bellmouth"), Fitting("gate_valve_open"))),
            # No check valve: a swing check in this 200 mm main at about 1.2 m/s would be below its
            # velocity for full disc lift (Crane TP-410: 1.35 m/s in water), a finding of its own.
            Segment("main", "delivery", "ductile_iron_cml", 300.0, 0.2,
                    fittings=(Fitting("gate_valve_open"), Fitting("elbow_90_long_radius", 2), Fitting("exit"))),
        ),
        pumps=(pump(),),
        # the drive's minimum 95 %: the checks also see the points at the minimum speed, where 90 % would
        # bring the suction velocity below its 0.6 m/s minimum (common practice) at max static, aged pipe
        arrangement=Arrangement("T1", duty_count=1, standby_count=1,
                                variable_speed=True, drive_efficiency=0.97, min_speed_ratio=0.95, max_speed_ratio=1.0),
        criteria=Criteria(),
    )


def codes(project: Project) -> set[str]:
    return {f.code for f in solve(project).findings}


def with_segment(project: Project, index: int, **changes) -> Project:
    segments = list(project.segments)
    segments[index] = replace(segments[index], **changes)
    return replace(project, segments=tuple(segments))


def test_clean_project_has_no_findings():
    solution = solve(clean_project())
    assert [f.code for f in solution.findings] == []
    assert all(p.found for p in solution.operating_points)


def other_pump(shutoff_m: float, pump_id: str = "W1", steepness: float = 12_000.0, q_max: float = 0.045,
               peak_flow: float = 0.027) -> PumpModel:
    """An invented second pump model for the crafted projects: H = shut-off − steepness Q²."""
    q = np.linspace(0.0, q_max, 6)
    efficiency = np.clip(0.78 * (1.0 - ((q - peak_flow) / peak_flow) ** 2), 0.0, None)
    return PumpModel(pump_id=pump_id, name="second test pump", rated_speed_rpm=1450.0, flow_m3_s=tuple(q),
                     head_m=tuple(shutoff_m - steepness * q**2), efficiency=tuple(efficiency),
                     npsh_required_m=tuple(2.0 + 600.0 * q**2))


def with_assist(project: Project, shutoff_m: float) -> Project:
    return replace(project, pumps=project.pumps + (other_pump(shutoff_m),),
                   other_pumps=(InstalledPump("W1", role="assist"),))


def with_small_duty_and_standby(project: Project, design_flow_m3_s: float) -> Project:
    """T1 with a smaller duty pump beside it, and a smaller standby: the standby cannot replace T1."""
    assert project.arrangement is not None
    small = other_pump(50.0, "S1", steepness=30_000.0, q_max=0.03, peak_flow=0.02)
    return replace(project, pumps=project.pumps + (small,),
                   arrangement=replace(project.arrangement, standby_count=0),
                   site=replace(project.site, design_flow_m3_s=design_flow_m3_s),
                   other_pumps=(InstalledPump("S1", role="duty"), InstalledPump("S1", role="standby")))


CRAFTED = {
    "velocity_low": lambda p: with_segment(p, 1, internal_diameter_m=0.45),
    "velocity_high": lambda p: with_segment(p, 0, internal_diameter_m=0.15),
    "laminar_flow": lambda p: replace(p, fluid=UserFluid("oil", 900.0, 5e-3, 100.0)),
    "transition_flow": lambda p: replace(p, fluid=UserFluid("syrup", 1000.0, 6.5e-5, 1000.0)),
    "no_operating_point": lambda p: replace(p, site=replace(p.site, delivery=TankDelivery(55.0, 62.0))),
    "shutoff_below_static": lambda p: replace(p, site=replace(p.site, delivery=TankDelivery(55.0, 62.0))),
    "extrapolated_duty": lambda p: replace(p, pumps=(pump(flows=FLOWS[:8]),)),
    "speed_extrapolated": lambda p: replace(p, pumps=(pump(flows=FLOWS[:7]),)),
    "npsh_margin_low": lambda p: replace(p, site=replace(p.site, pump_datum_m=17.0)),
    "npsh_insufficient": lambda p: replace(p, site=replace(p.site, pump_datum_m=19.5)),
    "outside_preferred": lambda p: replace(p, pumps=(pump(peak_flow=0.030),)),
    "outside_allowable": lambda p: replace(p, pumps=(pump(peak_flow=0.024),)),
    "unstable_parallel": lambda p: replace(
        p, pumps=(pump(rising=True),), arrangement=replace(p.arrangement, duty_count=2)),
    "large_trim": lambda p: replace(p, arrangement=replace(p.arrangement, trim_ratio=0.8)),
    "high_point_above_delivery": lambda p: with_segment(p, 1, start_elevation_m=8.0, end_elevation_m=47.0),
    "speed_target_unreachable": lambda p: replace(p, site=replace(p.site, design_flow_m3_s=0.045)),
    "speed_below_minimum": lambda p: replace(p, site=replace(p.site, design_flow_m3_s=0.02)),
    "minimum_speed_cannot_lift": lambda p: replace(p, arrangement=replace(p.arrangement, min_speed_ratio=0.6)),
    # the one pump delivers about 37 L/s at max static, aged pipe (module docstring): 45 L/s is out of reach
    "design_flow_not_met": lambda p: replace(p, site=replace(p.site, design_flow_m3_s=0.045)),
    "no_standby": lambda p: replace(p, arrangement=replace(p.arrangement, standby_count=0)),
    # an assist pump of 30 m shut-off beside T1 (50 m) against 29–32 m static heads: it cannot open its check valve
    "pump_held_shut": lambda p: with_assist(p, 30.0),
    # 36 m shut-off: it opens, but the manifold head pushes it below 40 % of its best-efficiency flow
    "pump_below_minimum_flow": lambda p: with_assist(p, 36.0),
    # T1 with a smaller duty pump delivers about 54 L/s at the worst case, the smaller pumps alone about 44 L/s
    "standby_short": lambda p: with_small_duty_and_standby(p, 0.045),
    # 50 L/s needs both duty pumps; their drives meet it below full speed at the lower static head
    "design_speed_with_pump_set": lambda p: with_small_duty_and_standby(p, 0.05),
    # a second main segment of a larger bore with no expander before it
    "bore_change_without_transition": lambda p: replace(
        p, segments=p.segments + (Segment("main 2", "delivery", "ductile_iron_cml", 50.0, 0.25),)),
    # an unvented hump at 45 m: the grade line there is about 42.5 m (2.5 m below the pipe)
    "main_below_atmospheric": lambda p: replace(p, profile=(
        ProfilePoint(0.0, 8.0), ProfilePoint(150.0, 45.0), ProfilePoint(300.0, 40.0))),
    # an unvented hump at 53 m: about −10.5 m gauge, below the vapour pressure head
    # (atmosphere 10.3 m, vapour 0.17 m of water at 15 °C)
    "main_column_separation": lambda p: replace(p, profile=(
        ProfilePoint(0.0, 8.0), ProfilePoint(150.0, 53.0), ProfilePoint(300.0, 40.0))),
    # a PN 10 pipe (10 bar ≈ 102 m of water) through a valley at −80 m: about 122 m at rest
    "operating_pressure_above_rating": lambda p: replace(with_segment(
        p, 1, material_id="pvc_u", pipe_series="pvc_u_pn10", nominal_size="225", internal_diameter_m=0.2078),
        profile=(ProfilePoint(0.0, 8.0), ProfilePoint(150.0, -80.0), ProfilePoint(300.0, 40.0))),
    "rest_pressure_above_rating": lambda p: replace(with_segment(
        p, 1, material_id="pvc_u", pipe_series="pvc_u_pn10", nominal_size="225", internal_diameter_m=0.2078),
        profile=(ProfilePoint(0.0, 8.0), ProfilePoint(150.0, -80.0), ProfilePoint(300.0, 40.0))),
    # the profile stops 50 m short of the 300 m main (tolerance 3 m)
    "profile_length_mismatch": lambda p: replace(p, profile=(ProfilePoint(0.0, 8.0), ProfilePoint(250.0, 40.0))),
}


@pytest.mark.parametrize("code", sorted(CRAFTED))
def test_each_finding_is_raised_by_its_crafted_project(code):
    assert code in codes(CRAFTED[code](clean_project()))


def test_every_documented_code_is_crafted():
    import hydraulics.checks as checks

    documented = {line.split("``")[1] for line in checks.__doc__.splitlines() if line.startswith("``")}
    assert documented <= set(CRAFTED)


def test_sewage_option_raises_the_minimum_velocity():
    # 0.2 m main at the clean duty (~37 L/s) runs near 1.1–1.2 m/s; raising the sewage minimum to
    # 1.3 m/s (an editable criterion) must flag it, while the plain minimum of 0.6 m/s does not.
    project = clean_project()
    strict = replace(project, criteria=replace(project.criteria, sewage=True, sewage_velocity_min_m_s=1.3))
    assert "velocity_low" not in codes(project)
    assert "velocity_low" in codes(strict)


def test_findings_name_where_and_remedy_and_select_a_target():
    solution = solve(CRAFTED["velocity_low"](clean_project()))
    finding = next(f for f in solution.findings if f.code == "velocity_low")
    assert finding.where.startswith("segment 'main'")
    assert finding.remedy
    assert finding.target == ("segment", 1)
    assert finding.severity in ("info", "warning", "critical")


def test_no_operating_point_is_a_finding_not_an_exception():
    solution = solve(CRAFTED["no_operating_point"](clean_project()))
    assert not any(p.found for p in solution.operating_points if p.static == "max")
    assert any(f.code == "no_operating_point" and f.severity == "critical" for f in solution.findings)


def test_the_heads_quoted_by_a_missing_point_follow_the_display_units():
    solution = solve(CRAFTED["no_operating_point"](clean_project()))
    missing = next(f for f in solution.findings if f.code == "no_operating_point")
    point = next(p for p in solution.operating_points if not p.found)
    assert missing.text("SI") == f"No operating point: {point.reason}."
    us = missing.text("US")
    assert "cannot lift the static head" in us and " ft" in us and " m," not in us and " m)" not in us
    # the shut-off head in feet is the SI value / 0.3048 (1 ft = 0.3048 m exactly, NIST SP 811)
    shutoff_m = dict((name, value) for name, value, _ in point.reason_values)["pump"]
    assert f"{shutoff_m / 0.3048:.0f} ft" in us and point.reason_text("US") in us
    assert "reason_template" not in point.to_json_dict() and point.to_json_dict()["reason"] == point.reason
