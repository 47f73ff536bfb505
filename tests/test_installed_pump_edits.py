"""Edits of the pumps installed beside the arrangement's (hydraulics.project_edits), checked by the rules."""

from __future__ import annotations

from dataclasses import replace

import pytest

from hydraulics import project_edits
from hydraulics.model import DEFAULT_DRIVE_EFFICIENCY, DEFAULT_SPEED_RANGE, InstalledPump, ModelError
from hydraulics.validation import validate_project
from tests.installed_pump_fakes import hilltop, jp40, with_assist, with_model


def test_a_new_installed_pump_is_an_assist_pump_of_another_model_at_fixed_full_speed():
    project = with_model(hilltop(), jp40())
    pump = project_edits.new_other_pump(project)
    assert pump == InstalledPump("JP40", "assist", motor_efficiency=project.arrangement.motor_efficiency)
    validate_project(project_edits.with_other_pumps(project, [pump]))
    # with only the arrangement's model, one more of it; after a row, a copy of that row as an assist pump
    assert project_edits.new_other_pump(hilltop()).pump_id == "BP80"
    duty = replace(pump, role="duty", speed_ratio=0.9)
    assert project_edits.new_other_pump(project, duty) == replace(duty, role="assist")


def test_a_new_installed_pump_needs_an_arrangement():
    with pytest.raises(ModelError) as err:
        project_edits.new_other_pump(replace(hilltop(), arrangement=None))
    assert err.value.field_path == "other_pumps"


def test_switching_speed_control_sets_the_lowest_speed_and_the_drive():
    project = with_assist(hilltop(), jp40())
    variable = project_edits.with_other_pump_changes(project, 0, variable_speed=True).other_pumps[0]
    assert variable.min_speed_ratio == DEFAULT_SPEED_RANGE[0] and variable.drive_efficiency == DEFAULT_DRIVE_EFFICIENCY
    back = project_edits.with_other_pump_changes(
        replace(project, other_pumps=(variable,)), 0, variable_speed=False).other_pumps[0]
    assert back.min_speed_ratio == back.speed_ratio == 1.0
    assert back.drive_efficiency == DEFAULT_DRIVE_EFFICIENCY  # kept as given
    slower = project_edits.with_other_pump_changes(project, 0, speed_ratio=0.9).other_pumps[0]
    assert slower.min_speed_ratio == 0.9  # a fixed-speed pump's range is its speed


def test_an_edit_of_a_missing_row_names_the_field():
    with pytest.raises(ModelError) as err:
        project_edits.with_other_pump_changes(hilltop(), 0, role="duty")
    assert err.value.field_path == "other_pumps[0]"


def test_removing_a_pump_model_removes_the_pumps_installed_of_it():
    project = with_assist(hilltop(), jp40())
    removed = project_edits.with_removed_pump(project, "JP40")
    assert removed.other_pumps == () and [p.pump_id for p in removed.pumps] == ["BP80"]
    validate_project(removed)
    kept = project_edits.with_removed_pump(with_model(project, jp40(pump_id="JP50")), "JP50")
    assert kept.other_pumps == project.other_pumps
