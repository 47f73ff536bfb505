"""The one set of pump rules: the file reader, the CSV reader, the fit and the window agree.

Every expected message below is the wording of the engine's own rule or range
(``hydraulics.validation``: ``LIMITS`` and ``validate_pump``), so a check value here is
the rule the project states, not a measured figure.
"""

from __future__ import annotations

import math
from dataclasses import replace

import pytest

from hydraulics.model import ModelError, PumpModel
from hydraulics.project_io import ProjectFileError, load_project, project_from_dict, project_to_dict
from hydraulics.pump_csv import PumpCsvError, read_pump_csv
from hydraulics.pump_fit import fit_pump
from hydraulics.validation import MIN_PUMP_POINTS, validate_project
from tests.bad_pump_files import BAD_FIELD, BAD_PROBLEM, SAMPLE, write_bad_pump_project


@pytest.fixture(scope="module")
def sample():
    return load_project(SAMPLE)


def _with_pump(project, **changes):
    pump = replace(project.pumps[0], **changes)
    return replace(project, pumps=(pump,) + project.pumps[1:])


def _column(project, attribute, index, value):
    values = list(getattr(project.pumps[0], attribute))
    values[index] = value
    return tuple(values)


# (changes to the sample's pump, field path, problem); ranges from LIMITS in hydraulics/validation.py
CASES = [
    (lambda p: {"flow_m3_s": p.pumps[0].flow_m3_s[:2], "head_m": p.pumps[0].head_m[:2],
                "efficiency": (), "npsh_required_m": ()},
     "pumps[0].points", "a pump curve needs at least 3 points; it has 2"),
    (lambda p: {"flow_m3_s": (0.0, 0.01, 0.02, 0.03), "head_m": (50.0, 48.0, 45.0),
                "efficiency": (), "npsh_required_m": ()},
     "pumps[0].points.head_m", "has 3 values; the curve has 4 points"),
    (lambda p: {"head_m": _column(p, "head_m", 2, -5.0)},
     "pumps[0].points[2].head_m", "pump head must be between 0 and 3000 m; got -5"),
    (lambda p: {"efficiency": _column(p, "efficiency", 2, 1.5)},
     "pumps[0].points[2].efficiency", "pump efficiency must be between 0 and 1; got 1.5"),
    (lambda p: {"npsh_required_m": _column(p, "npsh_required_m", 0, -1.0)},
     "pumps[0].points[0].npsh_required_m", "NPSH required must be between 0 and 200 m; got -1"),
    (lambda p: {"flow_m3_s": _column(p, "flow_m3_s", 2, p.pumps[0].flow_m3_s[1])},
     "pumps[0].points[2].flow_m3_s", "flows must increase from point to point (point 3 is not above point 2)"),
    (lambda p: {"rated_speed_rpm": 50.0},
     "pumps[0].rated_speed", "rated speed must be between 100 and 10000 rpm; got 50"),
    (lambda p: {"head_fit_order": 5},
     "pumps[0].head_fit_order", "fit order must be between 1 and 4; got 5"),
    (lambda p: {"impeller_diameter_m": 0.001},
     "pumps[0].impeller_diameter", "impeller diameter must be between 0.005 and 5 m; got 0.001"),
    (lambda p: {"name": "  "}, "pumps[0].name", "a pump needs a name"),
]


@pytest.mark.parametrize("changes, field, problem", CASES, ids=[c[1] for c in CASES])
def test_validate_project_names_the_pump_field(sample, changes, field, problem):
    bad = _with_pump(sample, **changes(sample))
    with pytest.raises(ModelError) as info:
        validate_project(bad)
    assert (info.value.field_path, info.value.problem) == (field, problem)


@pytest.mark.parametrize("changes, field, problem", CASES, ids=[c[1] for c in CASES])
def test_the_file_reader_refuses_with_the_same_words(sample, changes, field, problem):
    data = project_to_dict(_with_pump(sample, **changes(sample)))
    with pytest.raises(ProjectFileError) as info:
        project_from_dict(data)
    assert (info.value.field_path, info.value.problem) == (field, problem)


def test_a_missing_optional_value_is_named(sample):
    bad = _with_pump(sample, efficiency=_column(sample, "efficiency", 1, math.nan))
    with pytest.raises(ModelError) as info:
        validate_project(bad)
    assert info.value.field_path == "pumps[0].points[1].efficiency"
    assert info.value.problem == "efficiency is missing at point 2; give it at every point or clear the whole column"


def test_the_sample_pump_passes(sample):
    validate_project(sample)  # the bundled sample is valid: the rules do not refuse good data


def test_a_bad_pump_file_is_refused_at_load_time(tmp_path):
    path = write_bad_pump_project(tmp_path)
    with pytest.raises(ProjectFileError) as info:
        load_project(path)
    assert (info.value.field_path, info.value.problem) == (BAD_FIELD, BAD_PROBLEM)
    assert str(info.value) == f"{path}: {BAD_FIELD}: {BAD_PROBLEM}"


def test_csv_reader_and_fit_use_the_same_point_count():
    two_rows = "# rated_speed [rpm] = 1450\nflow [L/s], head [m]\n0, 50\n10, 46\n"
    with pytest.raises(PumpCsvError) as csv_info:
        read_pump_csv(two_rows, "P", "p")
    two_points = PumpModel("P", "p", 1450.0, (0.0, 0.01), (50.0, 46.0))
    with pytest.raises(ModelError) as fit_info:
        fit_pump(two_points, 1000.0)
    rule = f"a pump curve needs at least {MIN_PUMP_POINTS} points; it has 2"
    assert rule in csv_info.value.problem and fit_info.value.problem == rule


def test_csv_values_outside_the_limits_are_placed_at_their_line():
    text = ("# rated_speed [rpm] = 1450\nflow [L/s], head [m]\n0, 50\n10, 3500\n20, 40\n")
    with pytest.raises(PumpCsvError) as info:
        read_pump_csv(text, "P", "p")
    err = info.value
    assert (err.line, err.column, err.column_name) == (4, 2, "head")
    assert err.problem == "pump head must be between 0 and 3000 m; got 3500"  # LIMITS["pump.head_m"]


def test_csv_rated_speed_outside_the_limits_is_refused():
    text = "# rated_speed [rpm] = 20\nflow [L/s], head [m]\n0, 50\n10, 45\n20, 40\n"
    with pytest.raises(PumpCsvError, match="rated speed must be between 100 and 10000 rpm; got 20"):
        read_pump_csv(text, "P", "p")
