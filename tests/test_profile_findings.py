"""Findings of the main's profile and of bore changes, and the K of reducers and expanders in flow order.

Projects are invented test data built on the clean project of tests/test_checks.py (suction
10–11 m, delivery 41–42 m, a 300 m main of 0.2 m bore, one pump H = 50 − 12 000 Q²).  Check
values are hand calculations from the engine's own grade line (tested by hand in
tests/test_crest_control.py and tests/test_main_profile.py) or from Crane TP-410 (2009),
Appendix A, sudden contraction K₁ = 0.5 (1 − β²) and sudden enlargement K₁ = (1 − β²)², both
referred to the small-bore velocity.
"""

from dataclasses import replace

import numpy as np
import pytest

from hydraulics.catalogue import series
from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.model import Fitting, ModelError, ProfilePoint, Segment
from hydraulics.solve import solve, solve_curves
from hydraulics.system_curve import flow_paths, upstream_diameters
from tests.test_checks import clean_project, with_segment

NEW_CODES = ("bore_change_without_transition", "main_below_atmospheric", "main_column_separation",
             "operating_pressure_above_rating", "rest_pressure_above_rating", "profile_length_mismatch")


def findings(project, code):
    return [f for f in solve(project).findings if f.code == code]


def profiled(points):
    return replace(clean_project(), profile=tuple(ProfilePoint(*p) for p in points))


# ----------------------------------------------------------------------------------- clean profile
def test_a_clean_profile_raises_none_of_the_new_findings():
    # a main rising steadily from 8 m to 40 m under the delivery levels: positive pressure throughout
    solution = solve(profiled([(0.0, 8.0), (150.0, 25.0), (300.0, 40.0)]))
    assert not {f.code for f in solution.findings} & {*NEW_CODES, "high_point_above_delivery"}
    assert solution.profile is not None
    assert solution.profile.segment_rating_pa is not None and np.isnan(solution.profile.segment_rating_pa).all()


# ----------------------------------------------------------------------------------- pressures
def test_sub_atmospheric_pressure_names_the_chainage_and_groups_the_scenarios():
    solution = solve(profiled([(0.0, 8.0), (150.0, 45.0), (300.0, 40.0)]))
    found = [f for f in solution.findings if f.code == "main_below_atmospheric"]
    assert len(found) == 1  # every scenario has its lowest pressure at the hump: one finding
    x = solution.profile.chainage_m
    assert found[0].severity == "warning"
    assert found[0].message.startswith("At chainage 150 m the gauge pressure falls to -4.00 m")
    # hand: the lowest of the group is at rest with the delivery low, 41 − 45 = −4 m under the hump
    assert dict((n, v) for n, v, _ in found[0].values)["p"] == pytest.approx(-4.0, abs=1e-12)
    assert x[np.argmin(solution.profile.scenarios[0].pressure_head_m)] == 150.0
    for line in solution.profile.scenarios + solution.profile.at_rest:
        assert line.label in found[0].message
        assert min(line.pressure_head_m) >= -4.0 - 1e-12
    assert found[0].target == ("segment", 1)
    assert "ft" in found[0].text("US")


def test_column_separation_is_critical_where_the_absolute_pressure_reaches_vapour_pressure():
    solution = solve(profiled([(0.0, 8.0), (150.0, 53.0), (300.0, 40.0)]))
    rho_g = solution.fluid.density_kg_m3 * G
    absolute = solution.atmospheric_pressure_pa / rho_g
    vapour = solution.fluid.vapour_pressure_pa / rho_g
    separated = [f for f in solution.findings if f.code == "main_column_separation"]
    assert separated and all(f.severity == "critical" for f in separated)
    quoted = dict((n, v) for n, v, _ in separated[0].values)["p"]
    assert quoted + absolute <= vapour  # definition: absolute pressure head at or below the vapour head


def rated_valley():
    project = with_segment(clean_project(), 1, material_id="pvc_u", pipe_series="pvc_u_pn10", nominal_size="225",
                           internal_diameter_m=0.2078)
    return replace(project, profile=(ProfilePoint(0.0, 8.0), ProfilePoint(150.0, -80.0), ProfilePoint(300.0, 40.0)))


def test_pressures_above_the_pipe_rating_at_operation_and_at_rest():
    solution = solve(rated_valley())
    assert solution.profile.segment_rating_pa.tolist() == [10.0e5]  # pvc_u_pn10 catalogue: PN 10 = 10 bar
    operating = next(f for f in solution.findings if f.code == "operating_pressure_above_rating")
    rest = next(f for f in solution.findings if f.code == "rest_pressure_above_rating")
    rho_g = solution.fluid.density_kg_m3 * G
    # hand: at rest with the delivery high the column stands at 42 m over the valley at −80 m: 122 m
    assert dict((n, v) for n, v, _ in rest.values)["p"] == pytest.approx(rho_g * 122.0)
    assert "chainage 150 m" in rest.message and "1000 kPa" in rest.message
    peak = max(float(np.max(line.pressure_pa)) for line in solution.profile.scenarios)
    assert dict((n, v) for n, v, _ in operating.values)["p"] == pytest.approx(peak)
    assert peak > rho_g * 122.0  # the operating grade lies above the delivery level
    assert operating.severity == rest.severity == "critical" and operating.target == ("segment", 1)


def test_a_rating_above_the_pressures_raises_nothing():
    size = series("pvc_u_pn16").size("225")
    project = with_segment(rated_valley(), 1, pipe_series="pvc_u_pn16", nominal_size="225",
                           internal_diameter_m=size.internal_diameter_m)
    assert size.pressure_rating_bar == 16.0  # pvc_u_pn16 catalogue
    codes = {f.code for f in solve(project).findings}  # PN 16 ≈ 163 m of water, above 122–135 m
    assert "operating_pressure_above_rating" not in codes and "rest_pressure_above_rating" not in codes


def test_a_profile_short_of_the_main_is_a_finding():
    found = findings(profiled([(0.0, 8.0), (250.0, 40.0)]), "profile_length_mismatch")
    assert len(found) == 1
    assert "from chainage 0 m to 250 m" in found[0].message and "300 m long" in found[0].message
    # hand: 1 % of 300 m = 3 m tolerance; 298 m is within it
    assert not findings(profiled([(0.0, 8.0), (298.0, 40.0)]), "profile_length_mismatch")


def test_the_profile_is_in_the_first_stage():
    stage = solve_curves(profiled([(0.0, 8.0), (150.0, 25.0), (300.0, 40.0)]))
    assert stage.solution.profile is not None
    assert len(stage.solution.profile.scenarios) == len(stage.solution.operating_points)
    assert [line.label for line in stage.solution.profile.at_rest] == ["at rest, delivery high",
                                                                         "at rest, delivery low"]


def test_without_a_pump_the_profile_is_drawn_at_the_design_flow():
    project = replace(profiled([(0.0, 8.0), (150.0, 25.0), (300.0, 40.0)]), pumps=(), arrangement=None)
    profile = solve(project).profile
    assert [line.label for line in profile.scenarios] == [
        "design flow, min static, new pipe", "design flow, min static, aged pipe",
        "design flow, max static, new pipe", "design flow, max static, aged pipe"]
    assert all(line.flow_m3_s == 0.035 for line in profile.scenarios)  # the clean project's design flow


# ----------------------------------------------------------------------------------- bore changes
def station_with_bores(reducer_on_branch=True, expander_on_main=True):
    """Suction header 0.35 m → pump suction branch 0.25 m | pump | discharge branch 0.2 m → main 0.3 m.

    The branch row stands before the header in the table: flow order, not table order, decides.
    """
    base = clean_project()
    branch_fittings = (Fitting("reducer_sudden"),) if reducer_on_branch else ()
    main_fittings = (Fitting("expander_sudden"), Fitting("exit")) if expander_on_main else (Fitting("exit"),)
    segments = (
        Segment("pump suction", "suction", "ductile_iron_cml", 3.0, 0.25, fittings=branch_fittings, carries="pump"),
        Segment("suction header", "suction", "ductile_iron_cml", 8.0, 0.35, fittings=(Fitting("entrance_bellmouth"),)),
        Segment("pump discharge", "delivery", "ductile_iron_cml", 5.0, 0.2, fittings=(Fitting("swing_check_valve"),),
                carries="pump"),
        Segment("main", "delivery", "ductile_iron_cml", 300.0, 0.3, fittings=main_fittings),
    )
    return replace(base, segments=segments)


def test_flow_order_and_upstream_bores():
    project = station_with_bores()
    assert flow_paths(project.segments) == ((1, 0), (2, 3))
    # nothing upstream of the header (the wet well) or of the discharge branch (the pump)
    assert upstream_diameters(project.segments) == (0.35, None, None, 0.2)


def test_the_k_of_a_reducer_and_an_expander_takes_the_previous_bore_in_flow_order():
    system = solve_curves(station_with_bores()).system
    without = solve_curves(station_with_bores(False, False)).system
    added = system.k_total - without.k_total
    # Crane TP-410 sudden contraction, β = 0.25/0.35: K₁ = 0.5 (1 − β²), small bore = the branch's own
    beta = 0.25 / 0.35
    assert added[0] == pytest.approx(0.5 * (1.0 - beta**2), rel=1e-12)
    # Crane TP-410 sudden enlargement, β = 0.2/0.3: K₁ = (1 − β²)² on the small bore, × (0.3/0.2)⁴ on the main's
    beta = 0.2 / 0.3
    assert added[3] == pytest.approx((1.0 - beta**2) ** 2 * (0.3 / 0.2) ** 4, rel=1e-12)
    assert added[1] == added[2] == 0.0


def test_nothing_crosses_the_pump():
    project = station_with_bores()
    segments = list(project.segments)
    segments[2] = replace(segments[2], fittings=(Fitting("expander_sudden"),))
    with pytest.raises(ModelError) as caught:
        solve(replace(project, segments=tuple(segments)))
    assert caught.value.field_path == "segments[2].fittings[0].other_diameter"


def test_bore_changes_without_a_transition_are_findings_on_the_downstream_segment():
    assert not findings(station_with_bores(), "bore_change_without_transition")
    found = findings(station_with_bores(False, False), "bore_change_without_transition")
    assert [f.target for f in found] == [("segment", 0), ("segment", 3)]
    suction, main = found
    assert suction.message.startswith("The bore changes from 350 mm (segment 'suction header') to 250 mm with no "
                                      "reducer")
    assert main.message.startswith("The bore changes from 200 mm (segment 'pump discharge') to 300 mm with no "
                                   "expander")
    assert "13.8 in" in suction.text("US") and "9.84 in" in suction.text("US")  # hand: 350/25.4, 250/25.4
    assert main.remedy.startswith("Add an expander")


def test_a_transition_sized_for_another_bore_does_not_count():
    project = station_with_bores()
    segments = list(project.segments)
    segments[3] = replace(segments[3], fittings=(Fitting("expander_sudden", other_diameter_m=0.15), Fitting("exit")))
    found = findings(replace(project, segments=tuple(segments)), "bore_change_without_transition")
    assert [f.target for f in found] == [("segment", 3)]
