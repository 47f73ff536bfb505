"""The station-as-built parts of the model: what each segment carries, fittings between bores,
the main's profile; their rules and their place in the project file (format version 2)."""

from dataclasses import replace

import pytest

from hydraulics.model import Fitting, ModelError, ProfilePoint, Project, Segment, Site, TankDelivery
from hydraulics.project_io import (
    FORMAT_VERSION,
    ProjectFileError,
    load_project,
    project_from_dict,
    project_to_dict,
    save_project,
)
from hydraulics.validation import validate_project


def station() -> Project:
    """An invented two-pump booster: each pump's own suction and discharge branch, a common main."""
    return Project(
        name="branch test (invented)",
        site=Site(suction_level_low_m=10.0, suction_level_high_m=12.0,
                  delivery=TankDelivery(level_low_m=40.0, level_high_m=43.0),
                  pump_datum_m=9.5, design_flow_m3_s=0.06),
        segments=(
            Segment(name="pump suction", side="suction", carries="pump", material_id="steel_new",
                    length_m=2.0, internal_diameter_m=0.2, fittings=(Fitting("entrance_sharp"),)),
            Segment(name="pump discharge", side="delivery", carries="pump", material_id="steel_new",
                    length_m=3.0, internal_diameter_m=0.15,
                    fittings=(Fitting("reducer_conical", angle_deg=20.0, other_diameter_m=0.2),)),
            Segment(name="main", side="delivery", material_id="ductile_iron_cml", length_m=1500.0,
                    internal_diameter_m=0.3),
        ),
        profile=(ProfilePoint(0.0, 9.5), ProfilePoint(600.0, 44.5, air_valve=True), ProfilePoint(1500.0, 38.0)),
    )


def test_a_station_round_trips_through_its_file(tmp_path):
    project = station()
    path = tmp_path / "station.pumpsketch.json"
    save_project(project, path)
    assert load_project(path) == project
    data = project_to_dict(project)
    assert data["version"] == FORMAT_VERSION
    assert [s["carries"] for s in data["segments"]] == ["pump", "pump", "station"]
    assert data["segments"][1]["fittings"][0] == {
        "type": "reducer_conical", "count": 1, "angle_deg": 20.0, "other_diameter": {"value": 0.2, "unit": "m"}}
    assert data["profile"][1] == {"chainage": {"value": 600.0, "unit": "m"},
                                  "elevation": {"value": 44.5, "unit": "m"}, "air_valve": True}


@pytest.mark.parametrize(("change", "field", "words"), [
    (lambda p: replace(p, profile=(ProfilePoint(0.0, 9.5),)), "profile", "at least two points"),
    (lambda p: replace(p, profile=(ProfilePoint(0.0, 9.5), ProfilePoint(0.0, 20.0))),
     "profile[1].chainage", "must increase"),
    (lambda p: replace(p, profile=(ProfilePoint(-5.0, 9.5), ProfilePoint(10.0, 20.0))),
     "profile[0].chainage", "between 0 and 1e+06 m"),
    (lambda p: replace(p, profile=(ProfilePoint(0.0, 9.5), ProfilePoint(10.0, 9999.0))),
     "profile[1].elevation", "between -1000 and 9000 m"),
    (lambda p: replace(p, segments=(replace(p.segments[0], carries="half"),) + p.segments[1:]),
     "segments[0].carries", "'pump' or 'station'"),
    (lambda p: replace(p, segments=p.segments[:1] + (replace(p.segments[1], fittings=(
        Fitting("reducer_conical", angle_deg=0.0),)),) + p.segments[2:]),
     "segments[1].fittings[0].angle_deg", "between 1 and 180"),
    (lambda p: replace(p, segments=p.segments[:1] + (replace(p.segments[1], fittings=(
        Fitting("reducer_conical", other_diameter_m=9.0),)),) + p.segments[2:]),
     "segments[1].fittings[0].other_diameter", "between 0.005 and 5 m"),
])
def test_station_rules_name_the_field_and_the_range(change, field, words):
    bad = change(station())
    with pytest.raises(ModelError) as caught:
        validate_project(bad)
    assert caught.value.field_path == field and words in caught.value.problem
    data = project_to_dict(bad) if field != "segments[0].carries" else None
    if data is not None:  # the file reader refuses the same project with the same words
        with pytest.raises(ProjectFileError) as from_file:
            project_from_dict(data)
        assert from_file.value.field_path == field and words in str(from_file.value)


def test_a_version_2_file_must_say_what_each_segment_carries():
    data = project_to_dict(station())
    del data["segments"][0]["carries"]
    with pytest.raises(ProjectFileError) as caught:
        project_from_dict(data)
    assert caught.value.field_path == "segments[0].carries"
    data = project_to_dict(station())
    data["segments"][0]["carries"] = "half"
    with pytest.raises(ProjectFileError, match="must be 'pump' or 'station'"):
        project_from_dict(data)
