"""Motor against shaft power, the non-overloading size, speed control and the format step 2 -> 3."""

from __future__ import annotations

import copy
from dataclasses import replace

import pytest

from hydraulics.format_migrations import v2_to_v3
from hydraulics.model import Arrangement, ModelError
from hydraulics.motor import next_standard_motor_w
from hydraulics.project_edits import with_arrangement_changes, with_speed_control
from hydraulics.solve import solve
from hydraulics.validation import validate_project
from tests.test_checks import clean_project


def codes(project):
    return [f.code for f in solve(project).findings]


def test_next_standard_size_by_hand():
    # IEC 60072-1 output series (from memory; verify): ... 30, 37, 45 kW ...
    assert next_standard_motor_w(30_000.0) == 30_000.0
    assert next_standard_motor_w(30_001.0) == 37_000.0
    assert next_standard_motor_w(5_000.0) == 5_500.0
    assert next_standard_motor_w(2_000_000.0) is None  # above the series' largest, 1000 kW


def test_clean_project_has_no_motor_finding_and_reports_the_motor():
    solution = solve(clean_project())
    motor = solution.motor
    assert motor is not None and motor.rating_w is None
    assert not {"motor_overload", "motor_not_non_overloading", "drive_efficiency_not_given"} & set(
        f.code for f in solution.findings)
    # the non-overloading size is the next IEC size above the run-out power (by hand from the series)
    run_out = max(motor.max_shaft_power_run_out_w, motor.max_shaft_power_run_out_at_max_speed_w)
    assert motor.non_overloading_size_w == next_standard_motor_w(run_out)
    assert motor.max_shaft_power_at_points_w <= run_out * (1 + 1e-9)


def test_a_motor_at_the_run_out_size_raises_nothing():
    project = clean_project()
    size = solve(project).motor.non_overloading_size_w
    assert not {"motor_overload", "motor_not_non_overloading"} & set(
        codes(with_arrangement_changes(project, motor_rating_w=size)))


def test_a_small_motor_is_overloaded_and_not_non_overloading():
    project = clean_project()
    peak = solve(project).motor.max_shaft_power_at_points_w
    found = codes(with_arrangement_changes(project, motor_rating_w=0.8 * peak))
    assert "motor_overload" in found and "motor_not_non_overloading" in found


def test_service_factor_covers_the_points_but_not_run_out():
    project = clean_project()
    motor = solve(project).motor
    peak = motor.max_shaft_power_at_points_w
    # rating below the operating peak, rating x 1.15 above it (NEMA MG 1 service factor 1.15, common practice)
    found = codes(with_arrangement_changes(project, motor_rating_w=peak / 1.1, service_factor=1.15))
    assert "motor_overload" not in found and "motor_not_non_overloading" in found


def test_variable_speed_with_a_lossless_drive_is_flagged():
    project = with_arrangement_changes(clean_project(), drive_efficiency=1.0)
    assert "drive_efficiency_not_given" in codes(project)


def test_a_new_arrangement_is_fixed_speed_and_raises_no_speed_finding():
    arrangement = Arrangement("T1", speed_ratio=0.9, min_speed_ratio=0.6)
    assert not arrangement.variable_speed
    assert arrangement.min_speed_ratio == arrangement.max_speed_ratio == 0.9
    base = clean_project()
    out_of_reach = replace(base, site=replace(base.site, design_flow_m3_s=0.06))  # beyond the pump at full speed
    assert "speed_target_unreachable" in codes(out_of_reach)  # on variable speed the search reports it
    fixed = replace(out_of_reach, arrangement=replace(out_of_reach.arrangement, variable_speed=False))
    found = codes(fixed)
    assert not [c for c in found if c.startswith("speed_")] and "design_flow_not_met" in found


def test_switching_speed_control():
    project = with_speed_control(replace(clean_project(), arrangement=Arrangement("T1")), True)
    a = project.arrangement
    assert a.variable_speed and (a.min_speed_ratio, a.max_speed_ratio) == (0.6, 1.0)
    assert a.drive_efficiency == 0.97  # the default drive efficiency, common practice (from memory; verify)
    fixed = with_speed_control(project, False).arrangement
    assert not fixed.variable_speed and fixed.min_speed_ratio == fixed.max_speed_ratio == fixed.speed_ratio


@pytest.mark.parametrize(("field", "value"), [("motor_rating_w", 1.0), ("service_factor", 2.0)])
def test_out_of_range_motor_fields_are_refused_naming_the_field(field, value):
    with pytest.raises(ModelError, match=field):
        validate_project(with_arrangement_changes(clean_project(), **{field: value}))


def test_step_2_to_3_is_pure_and_keeps_the_speed_range():
    v2 = {"version": 2, "arrangement": {"pump": "P", "speed_ratio": 1.0, "min_speed_ratio": 0.8,
                                        "max_speed_ratio": 1.0, "drive_efficiency": 0.97}}
    before = copy.deepcopy(v2)
    out = v2_to_v3(v2)
    assert v2 == before
    assert out["arrangement"] == {**v2["arrangement"], "variable_speed": True, "service_factor": 1.0}
    fixed = v2_to_v3({"version": 2, "arrangement": {"pump": "P", "min_speed_ratio": 1.0}})["arrangement"]
    assert fixed["variable_speed"] is False and fixed["drive_efficiency"] == 1.0  # the version-2 default


def test_json_and_report_carry_the_motor():
    from app.text_report import summary_text
    from hydraulics.results_json import solution_to_json_dict

    solution = solve(with_arrangement_changes(clean_project(), motor_rating_w=30_000.0))
    data = solution_to_json_dict(solution)["motor"]
    assert data["rating_w"] == 30_000.0 and data["service_factor"] == 1.0
    assert data["non_overloading_size_w"] == solution.motor.non_overloading_size_w
    assert "\nMotor (" in summary_text(solution)
