"""Format 4: installed pumps beside the arrangement's and the duty profile, in the file and the rules."""

from __future__ import annotations

import copy
from dataclasses import replace
from pathlib import Path

import pytest

from hydraulics.format_migrations import migrate
from hydraulics.model import DutyBand, DutyProfile, InstalledPump, ModelError
from hydraulics.project_io import FORMAT_VERSION, ProjectFileError, load_project, project_from_dict, project_to_dict
from hydraulics.validation import validate_project

SAMPLES = Path(__file__).resolve().parents[1] / "sample_projects"


def _river():
    return load_project(SAMPLES / "river_intake.pumpsketch.json")


def test_other_pumps_and_a_duty_profile_round_trip_through_the_file():
    project = _river()
    pump_id = project.pumps[0].pump_id
    project = replace(
        project,
        other_pumps=(InstalledPump(pump_id, role="assist", variable_speed=True, speed_ratio=0.95, min_speed_ratio=0.7,
                                   motor_efficiency=0.93, drive_efficiency=0.96, motor_rating_w=90e3,
                                   service_factor=1.15),
                     InstalledPump(pump_id, role="standby")),
        duty_profile=DutyProfile(bands=(DutyBand(0.05, 0.25), DutyBand(0.1, 0.75)), time_basis="share",
                                 annual_volume_m3=2.0e6, strategy="variable_speed", pipe="new"),
    )
    data = project_to_dict(project)
    assert data["version"] == FORMAT_VERSION
    assert data["duty_profile"]["bands"][0] == {"flow": {"value": 0.05, "unit": "m3/s"}, "share": 0.25}
    assert project_from_dict(data) == project


def test_a_version_3_file_has_no_other_pumps_and_no_duty_bands():
    data = project_to_dict(_river())
    data["version"] = 3
    del data["other_pumps"], data["duty_profile"]
    before = copy.deepcopy(data)
    migrated = migrate(data, FORMAT_VERSION)
    assert data == before
    project = project_from_dict(migrated)
    assert project.other_pumps == () and project.duty_profile == DutyProfile()


@pytest.mark.parametrize(("change", "path"), [
    ({"pump": "NO-SUCH"}, "other_pumps[0].pump"),
    ({"role": "spare"}, "other_pumps[0].role"),
    ({"speed_ratio": 1.5}, "other_pumps[0].speed_ratio"),
    ({"variable_speed": True, "speed_ratio": 0.9, "min_speed_ratio": 0.95}, "other_pumps[0].min_speed_ratio"),
    ({"motor_efficiency": 1.2}, "other_pumps[0].motor_efficiency"),
])
def test_a_bad_other_pump_is_refused_naming_its_field(change, path):
    data = project_to_dict(_river())
    data["other_pumps"] = [{"pump": data["pumps"][0]["id"], **change}]
    with pytest.raises((ProjectFileError, ModelError)) as caught:
        project_from_dict(data)
    assert caught.value.field_path == path


@pytest.mark.parametrize(("profile", "path"), [
    ({"bands": [{"flow": {"value": -1, "unit": "L/s"}, "hours": 10}]}, "duty_profile.bands[0].flow"),
    ({"bands": [{"flow": {"value": 10, "unit": "L/s"}, "hours": 9000}]}, "duty_profile.bands[0].time"),
    ({"bands": [{"flow": {"value": 10, "unit": "L/s"}, "hours": 5000},
                {"flow": {"value": 20, "unit": "L/s"}, "hours": 5000}]}, "duty_profile.bands"),
    ({"time_basis": "share", "bands": [{"flow": {"value": 10, "unit": "L/s"}, "share": 0.7},
                                       {"flow": {"value": 20, "unit": "L/s"}, "share": 0.4}]}, "duty_profile.bands"),
    ({"bands": [{"flow": {"value": 10, "unit": "L/s"}, "share": 0.5}]}, "duty_profile.bands[0].share"),
    ({"strategy": "sometimes"}, "duty_profile.strategy"),
])
def test_a_bad_duty_profile_is_refused_naming_its_field(profile, path):
    data = project_to_dict(_river())
    data["duty_profile"] = profile
    with pytest.raises((ProjectFileError, ModelError)) as caught:
        project_from_dict(data)
    assert caught.value.field_path == path


def test_other_pumps_need_a_parallel_arrangement():
    project = _river()
    assert project.arrangement is not None
    other = (InstalledPump(project.pumps[0].pump_id),)
    with pytest.raises(ModelError) as caught:
        validate_project(replace(project, other_pumps=other, arrangement=None))
    assert caught.value.field_path == "other_pumps"
    with pytest.raises(ModelError):
        validate_project(replace(project, other_pumps=other,
                                 arrangement=replace(project.arrangement, series_stages=2)))
