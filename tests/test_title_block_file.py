"""Format 5: the report's title block and each pump's provenance, in the file."""

from __future__ import annotations

import copy
from dataclasses import replace
from pathlib import Path

from hydraulics.format_migrations import migrate
from hydraulics.model import TitleBlock
from hydraulics.project_io import FORMAT_VERSION, load_project, project_from_dict, project_to_dict

SAMPLES = Path(__file__).resolve().parents[1] / "sample_projects"


def test_the_title_block_and_the_pump_source_round_trip():
    project = load_project(SAMPLES / "sewage_wet_well.pumpsketch.json")
    assert project.pumps[0].source_file.endswith(".csv")  # read through source_csv: the file's name is kept
    project = replace(project, title_block=TitleBlock("Eastmere (invented)", "B", "2026-12-04", "A. Designer",
                                                      "C. Checker"))
    data = project_to_dict(project)
    assert data["title_block"]["checked_by"] == "C. Checker"
    assert data["pumps"][0]["source"]["file"] == project.pumps[0].source_file
    assert project_from_dict(data) == project


def test_a_version_4_file_has_an_empty_title_block_and_no_pump_source():
    data = project_to_dict(load_project(SAMPLES / "hilltop_booster.pumpsketch.json"))
    data["version"] = 4
    del data["title_block"]
    for pump in data["pumps"]:
        pump.pop("source", None)
    before = copy.deepcopy(data)
    project = project_from_dict(migrate(data, FORMAT_VERSION))
    assert data == before
    assert project.title_block == TitleBlock()
    assert all(p.source_file == "" and p.source_comments == () for p in project.pumps)
