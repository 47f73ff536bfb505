"""Project files: lossless round trip, atomic save, clear refusal of bad files."""

import copy
import json
from dataclasses import replace
from pathlib import Path

import pytest

from hydraulics.model import (
    Fitting,
    ModelError,
    PressurisedDelivery,
    Project,
    Segment,
    Site,
    TankDelivery,
    UserFluid,
)
from hydraulics.project_io import (
    FORMAT_VERSION,
    ProjectFileError,
    load_project,
    new_project,
    project_from_dict,
    project_to_dict,
    project_to_json,
    save_project,
)

SAMPLES = sorted((Path(__file__).resolve().parent.parent / "sample_projects").glob("*.pumpsketch.json"))


def typed_project() -> Project:
    """A project with typed diameters only (no catalogue look-up needed to load it)."""
    return Project(
        name="round trip",
        site=Site(suction_level_low_m=10.1, suction_level_high_m=12.3,
                  delivery=TankDelivery(level_low_m=40.7, level_high_m=43.9),
                  pump_datum_m=9.4, design_flow_m3_s=0.0351, altitude_m=123.4),
        segments=(
            Segment(name="s", side="suction", material_id="pe100", length_m=3.3, internal_diameter_m=0.1977,
                    fittings=(Fitting("entrance_sharp", 1), Fitting("elbow_90_standard", 2, k_override=0.31))),
            Segment(name="d", side="delivery", material_id="pe100", length_m=1234.5, internal_diameter_m=0.1423,
                    start_elevation_m=9.0, end_elevation_m=40.1, parallel_pipes=2, roughness_aged_m=0.00021),
        ),
    )


def test_round_trip_is_lossless(tmp_path):
    project = typed_project()
    path = tmp_path / "p.pumpsketch.json"
    save_project(project, path)
    assert load_project(path) == project


def test_round_trip_user_fluid_and_pressurised_delivery(tmp_path):
    project = replace(typed_project(),
                      fluid=UserFluid(name="brine", density_kg_m3=1100.0, kinematic_viscosity_m2_s=1.3e-6,
                                      vapour_pressure_pa=2000.0),
                      site=replace(typed_project().site, delivery=PressurisedDelivery(55.0, 250_000.0)))
    path = tmp_path / "p.pumpsketch.json"
    save_project(project, path)
    assert load_project(path) == project


def test_file_is_readable_json_with_format_and_units(tmp_path):
    path = tmp_path / "p.pumpsketch.json"
    save_project(typed_project(), path)
    data = json.loads(path.read_text())
    assert data["format"] == "pumpsketch-project" and data["version"] == FORMAT_VERSION
    assert data["segments"][1]["length"] == {"value": 1234.5, "unit": "m"}
    assert data["site"]["design_flow"]["unit"] == "m3/s"


def test_quantities_in_other_units_are_converted():
    data = project_to_dict(typed_project())
    data["segments"][1]["length"] = {"value": 1.2345, "unit": "km"}
    data["site"]["design_flow"] = {"value": 126.36, "unit": "m3/h"}
    data["segments"][0]["internal_diameter"] = {"value": 8, "unit": "in"}
    project = project_from_dict(data)
    assert project.segments[1].length_m == pytest.approx(1234.5, rel=1e-12)
    assert project.site.design_flow_m3_s == pytest.approx(0.0351, rel=1e-12)
    # 1 in = 25.4 mm exactly (NIST SP 811)
    assert project.segments[0].internal_diameter_m == pytest.approx(0.2032, rel=1e-12)


@pytest.mark.parametrize("mutate, field", [
    (lambda d: d.update(version=FORMAT_VERSION + 1), "version"),
    (lambda d: d.update(format="something-else"), "format"),
    (lambda d: d["segments"][1].update(length={"value": "long", "unit": "m"}), "segments[1].length.value"),
    (lambda d: d["segments"][1].update(length={"value": -5, "unit": "m"}), "segments[1].length"),
    (lambda d: d["segments"][1].update(length={"value": 5, "unit": "kg"}), "segments[1].length.unit"),
    (lambda d: d["segments"][1].pop("length"), "segments[1].length"),
    (lambda d: d["segments"][0].update(side="sideways"), "segments[0].side"),
    (lambda d: d["site"]["suction"].update(level_low={"value": 99.0, "unit": "m"}), "site.suction.level_low"),
    (lambda d: d["segments"][0]["fittings"][0].update(count=1.5), "segments[0].fittings[0].count"),
    (lambda d: d.update(segments={}), "segments"),
    (lambda d: d["fluid"].update(temperature={"value": 130, "unit": "degC"}), "fluid.temperature"),
])
def test_bad_files_name_the_field(mutate, field):
    data = copy.deepcopy(project_to_dict(typed_project()))
    mutate(data)
    with pytest.raises(ProjectFileError) as info:
        project_from_dict(data)
    assert info.value.field_path == field


def test_newer_version_is_refused_clearly():
    data = project_to_dict(typed_project())
    data["version"] = 99
    with pytest.raises(ProjectFileError, match="newer"):
        project_from_dict(data)


def test_truncated_file_is_refused(tmp_path):
    path = tmp_path / "cut.pumpsketch.json"
    path.write_text(project_to_json(typed_project())[:200])
    with pytest.raises(ProjectFileError, match="not valid JSON"):
        load_project(path)


def test_atomic_save_keeps_old_file_when_writing_fails(tmp_path, monkeypatch):
    path = tmp_path / "p.pumpsketch.json"
    save_project(typed_project(), path)
    before = path.read_text()

    def broken_fsync(fd):
        raise OSError("disk full")

    monkeypatch.setattr("os.fsync", broken_fsync)
    with pytest.raises(OSError):
        save_project(replace(typed_project(), name="changed"), path)
    assert path.read_text() == before
    assert [p.name for p in tmp_path.iterdir()] == ["p.pumpsketch.json"]


def test_invalid_project_is_not_saved(tmp_path):
    path = tmp_path / "p.pumpsketch.json"
    bad = replace(typed_project(), segments=())
    with pytest.raises(ModelError, match="segments"):
        save_project(bad, path)
    assert not path.exists()


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_every_sample_loads_and_round_trips(sample, tmp_path):
    project = load_project(sample)
    path = tmp_path / sample.name
    save_project(project, path)
    assert load_project(path) == project


def test_new_project_is_valid(tmp_path):
    path = tmp_path / "n.pumpsketch.json"
    save_project(new_project(), path)
    assert load_project(path) == new_project()


def test_misspelt_key_is_refused_not_ignored():
    data = project_to_dict(typed_project())
    data["energy"]["annual_volume_m3"] = 6_000_000
    with pytest.raises(ProjectFileError) as info:
        project_from_dict(data)
    assert info.value.field_path == "energy.annual_volume_m3"
    assert "unknown field" in info.value.problem


def test_save_keeps_ordinary_permissions(tmp_path):
    path = tmp_path / "p.pumpsketch.json"
    save_project(typed_project(), path)
    mode = path.stat().st_mode & 0o777
    assert mode == 0o666 & ~_umask()  # as an ordinary new file, not the 0600 of a temporary file
    path.chmod(0o640)
    save_project(typed_project(), path)
    assert path.stat().st_mode & 0o777 == 0o640


def _umask() -> int:
    import os

    current = os.umask(0)
    os.umask(current)
    return current
