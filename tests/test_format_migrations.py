"""The migration seam of the project file format, and the frozen version-1 files.

Most steps used here are synthetic: small made-up changes whose only purpose is to show the
chaining, the purity and the errors of :func:`hydraulics.format_migrations.migrate`.  The real
step 1 → 2 (the station as built) is tested at the end, on the frozen version-1 files.
"""

import copy
import hashlib
import json
from pathlib import Path

import pytest

from hydraulics import format_migrations, project_io
from hydraulics.format_migrations import MIGRATIONS, MigrationError, migrate, migration
from hydraulics.project_io import FORMAT_VERSION, ProjectFileError, load_project, project_to_dict
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve

FIXTURES = Path(__file__).resolve().parent / "fixtures" / "format_v1"
V1_FILES = sorted(FIXTURES.glob("*.pumpsketch.json"))

# SHA-256 of each frozen file (line ends as "\n"), taken when the copies were made from the
# version-1 samples. A change here means a frozen file was edited: restore it instead.
FROZEN_SHA256 = {
    "hilltop_booster.pumpsketch.json": "b9874608c8082239a0ba3cbeecc811cfae84a89f25bbc055d394cbce276b0b3e",
    "river_intake.pumpsketch.json": "3422797b31f96b61ed0e307f2bad4cb1db60bcb7bedf90e4b399ff3fe84f2a66",
    "sewage_wet_well.pumpsketch.json": "86a290f8fb27ec53cad242dda3ec7d2e952050c6ef2c22932e263ba3fd46e6ac",
    "pumps/booster_bp80.csv": "daafaf8d80f304e095016f4ead88e80e4249ef7643bf465f5ea4684e101bb567",
    "pumps/intake_rw250.csv": "8b740c165fce446184c4b3c87480759bb0854732f6858615857ae06ba138c228",
    "pumps/sewage_sw150.csv": "98413ff92d6a8ad708ee0d8e8cfe086029b95e559c5713a34c3dfbd1aba03ede",
}


# --------------------------------------------------------------------------- synthetic steps
def _one_to_two(data):
    """Synthetic: version 2 calls ``notes`` ``remarks``."""
    moved = {k: v for k, v in data.items() if k != "notes"}
    moved["remarks"] = data.get("notes", "")
    return moved


def _two_to_three(data):
    """Synthetic: version 3 keeps the remarks as a list of lines (needs version 2's ``remarks``)."""
    return {**data, "remarks": data["remarks"].splitlines()}


@pytest.fixture
def registry(monkeypatch):
    """An empty registry in place of the real one, restored afterwards."""
    steps: dict = {}
    monkeypatch.setattr(format_migrations, "MIGRATIONS", steps)
    return steps


def _v1(**extra):
    return {"format": "pumpsketch-project", "version": 1, "notes": "line one\nline two",
            "segments": [{"name": "main", "fittings": [{"type": "exit"}]}], **extra}


def test_steps_run_in_order_and_each_sets_the_next_version(registry):
    registry.update({1: _one_to_two, 2: _two_to_three})
    assert migrate(_v1(), 3) == {"format": "pumpsketch-project", "version": 3,
                                 "remarks": ["line one", "line two"],
                                 "segments": [{"name": "main", "fittings": [{"type": "exit"}]}]}


def test_a_file_part_way_along_runs_only_the_steps_it_needs(registry):
    registry.update({1: _one_to_two, 2: _two_to_three})
    two = migrate(_v1(), 2)
    assert two["version"] == 2 and two["remarks"] == "line one\nline two"
    assert migrate(two, 3)["remarks"] == ["line one", "line two"]


def test_the_callers_dictionary_is_left_as_parsed(registry):
    def careless(data):  # a step that mutates what it is given
        data["segments"][0]["name"] = "changed"
        data.pop("notes")
        return data

    registry.update({1: careless, 2: lambda data: {**data, "remarks": []}})
    given = _v1()
    before = copy.deepcopy(given)
    migrated = migrate(given, 3)
    assert given == before
    assert migrated["segments"][0]["name"] == "changed" and migrated["version"] == 3


def test_a_missing_step_is_an_error_naming_the_versions(registry):
    registry[1] = _one_to_two
    with pytest.raises(MigrationError, match="no migration from version 2 to 3"):
        migrate(_v1(), 3)


def test_a_step_that_returns_no_dictionary_is_an_error(registry):
    registry[1] = lambda data: None
    with pytest.raises(MigrationError, match="from format version 1 to 2 returned NoneType"):
        migrate(_v1(), 2)


@pytest.mark.parametrize("data", [[1, 2], "text", {"version": True}, {"version": "1"}, {"version": 0},
                                  {"version": 2}, {"version": 5}, {}])
def test_what_no_step_can_handle_passes_through_for_the_reader_to_refuse(registry, data):
    registry.update({1: _one_to_two})
    assert migrate(data, 2) is data


def test_registering_a_second_step_from_the_same_version_is_refused(registry):
    migration(1)(_one_to_two)
    assert registry == {1: _one_to_two}
    with pytest.raises(ValueError, match="already registered"):
        migration(1)(_two_to_three)


def test_the_real_registry_reaches_the_current_version():
    assert sorted(MIGRATIONS) == list(range(1, FORMAT_VERSION))


# --------------------------------------------------------------------------- through the reader
def test_loading_migrates_an_older_file_and_saving_writes_the_new_version(registry, monkeypatch, tmp_path):
    monkeypatch.setattr(project_io, "FORMAT_VERSION", 2)
    registry[1] = lambda data: {**format_migrations.v1_to_v2(data), "name": data["name"] + " [v2]"}
    path = V1_FILES[0]
    before = path.read_bytes()
    project = load_project(path)
    assert project.name == json.loads(before)["name"] + " [v2]"
    assert path.read_bytes() == before
    assert project_to_dict(project)["version"] == 2


def test_loading_with_a_missing_step_refuses_the_file_naming_it(registry, monkeypatch):
    monkeypatch.setattr(project_io, "FORMAT_VERSION", 2)
    with pytest.raises(ProjectFileError) as caught:
        load_project(V1_FILES[0])
    assert caught.value.field_path == "version"
    assert str(V1_FILES[0]) in str(caught.value) and "no migration from version 1 to 2" in str(caught.value)


def test_a_step_failing_on_a_damaged_file_is_a_clear_refusal(registry, monkeypatch):
    monkeypatch.setattr(project_io, "FORMAT_VERSION", 2)
    registry[1] = lambda data: {**data, "name": data["no_such_key"]}
    with pytest.raises(ProjectFileError, match="could not be upgraded from version 1 to 2"):
        project_io.project_from_dict(json.loads(V1_FILES[0].read_text(encoding="utf-8")))


def test_a_newer_file_is_still_refused_before_any_step(registry):
    registry[1] = _one_to_two
    data = json.loads(V1_FILES[0].read_text(encoding="utf-8"))
    data["version"] = FORMAT_VERSION + 1
    with pytest.raises(ProjectFileError, match="newer than this program reads"):
        project_io.project_from_dict(data)


def test_another_format_is_never_migrated(registry, monkeypatch):
    monkeypatch.setattr(project_io, "FORMAT_VERSION", 2)
    registry[1] = lambda data: pytest.fail("a step ran on a file of another format")
    with pytest.raises(ProjectFileError) as caught:
        project_io.project_from_dict({"format": "something-else", "version": 1})
    assert caught.value.field_path == "format"


# --------------------------------------------------------------------------- frozen version-1 files
def test_the_version_1_files_are_unchanged_copies():
    found = {p.relative_to(FIXTURES).as_posix() for p in FIXTURES.rglob("*") if p.suffix in (".json", ".csv")}
    assert found == set(FROZEN_SHA256)
    for name, digest in FROZEN_SHA256.items():
        data = (FIXTURES / name).read_bytes().replace(b"\r\n", b"\n")
        assert hashlib.sha256(data).hexdigest() == digest, f"{name} was edited; the version-1 files are frozen"


@pytest.mark.parametrize("path", V1_FILES, ids=lambda p: p.name)
def test_every_version_1_file_loads_and_solves(path):
    assert json.loads(path.read_text(encoding="utf-8"))["version"] == 1
    project = load_project(path)
    results = solution_to_json_dict(solve(project))
    assert results["project"] == project.name
    assert len(results["system_curves"]) == 4
    assert any(point["flow_m3_s"] is not None for point in results["operating_points"])


# --------------------------------------------------------------------------- the real step 1 -> 2
def test_step_1_to_2_makes_every_segment_common_pipework_and_adds_an_empty_profile():
    data = json.loads(V1_FILES[0].read_text(encoding="utf-8"))
    before = copy.deepcopy(data)
    upgraded = migrate(data, 2)
    assert data == before
    assert upgraded["version"] == 2 and upgraded["profile"] == []
    assert {s["carries"] for s in upgraded["segments"]} == {"station"}
    assert [{k: v for k, v in s.items() if k != "carries"} for s in upgraded["segments"]] == before["segments"]


# Duty points of the frozen files as solved by the version-1 program (a regression record taken
# before format 2 existed, at the arrangement's own speed): the migrated files must solve the same.
V1_DUTY_RECORD = Path(__file__).resolve().parent / "fixtures" / "format_v1_duty_points.json"


@pytest.mark.parametrize("path", V1_FILES, ids=lambda p: p.name)
def test_every_version_1_file_solves_as_the_version_1_program_did(path):
    record = json.loads(V1_DUTY_RECORD.read_text(encoding="utf-8"))[path.name]
    points = solution_to_json_dict(solve(load_project(path)))["operating_points"]
    got = [(p["flow_m3_s"], p["head_m"]) for p in points]
    assert len(got) == len(record)
    for (flow, head), (flow_was, head_was) in zip(got, record, strict=True):
        assert (flow is None) == (flow_was is None)
        if flow is not None:
            assert flow == pytest.approx(flow_was, rel=1e-9) and head == pytest.approx(head_was, rel=1e-9)
