"""The Pipework panel's roles, bore-change columns and the main's profile table.

Every value checked is typed by the test itself or read from the hilltop sample (an
invented scenario); unit factors are exact definitions (NIST SP 811, Appendix B).
"""

from __future__ import annotations

from dataclasses import replace

import pytest
from PySide6.QtCore import QItemSelectionModel, Qt

from app import clipboard
from hydraulics.model import Fitting, ProfilePoint
from hydraulics.project_edits import with_profile, with_segment

DISPLAY = Qt.ItemDataRole.DisplayRole
EDIT = Qt.ItemDataRole.EditRole
M_PER_FT = 0.3048  # exact (NIST SP 811, Appendix B)
MM_PER_INCH = 25.4  # exact (NIST SP 811, Appendix B)

MANIFOLD = 4  # the hilltop sample's 6 m DN 200 "Discharge manifold" (delivery, station flow)
RISING_MAIN = 5  # the hilltop sample's 2400 m DN 200 rising main
SAMPLE_CARRIES = ["station", "pump", "pump", "pump", "station", "station"]  # its six segments, from the file
MAIN_LENGTH_M = 6.0 + 2400.0  # its station delivery segments, manifold + rising main (file): 2406 m


@pytest.fixture
def refusals(document) -> list[str]:
    messages: list[str] = []
    document.editRefused.connect(messages.append)
    return messages


def _cell(model, row: int, key: str):
    return model.index(row, model.column_index(key))


# ---------------------------------------------------------------------- what a segment carries
def test_a_carries_edit_is_one_undo_step(window, document):
    model = window.pipework.segments_model
    before = document.project
    assert [s.carries for s in before.segments] == SAMPLE_CARRIES
    assert model.data(_cell(model, MANIFOLD, "carries"), DISPLAY) == "Station flow"
    assert model.setData(_cell(model, MANIFOLD, "carries"), "Each pump", EDIT)
    assert document.project.segments[MANIFOLD].carries == "pump"
    assert model.data(_cell(model, MANIFOLD, "carries"), DISPLAY) == "Each pump"
    assert [s.carries for i, s in enumerate(document.project.segments) if i != MANIFOLD] == \
        [c for i, c in enumerate(SAMPLE_CARRIES) if i != MANIFOLD]
    document.undo_stack.undo()
    assert document.project is before


def test_carries_pastes_like_the_side_column_and_refuses_other_words(window, document, refusals):
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    # the paste starts at the selected cell: select exactly the Carries cell of the first row
    view.selectionModel().setCurrentIndex(_cell(model, 0, "carries"),
                                          QItemSelectionModel.SelectionFlag.ClearAndSelect)
    assert [i.column() for i in view.selectionModel().selectedIndexes()] == [model.column_index("carries")]
    assert clipboard.paste_text(view, "each pump\nStation flow\n")
    assert [s.carries for s in document.project.segments[:2]] == ["pump", "station"]
    before = document.project
    assert not model.setData(_cell(model, 0, "carries"), "half", EDIT)
    assert document.project is before
    assert "Carries" in refusals[-1] and "Each pump" in refusals[-1] and "Station flow" in refusals[-1]


def test_a_new_segment_carries_the_station_flow(window, document):
    model = window.pipework.segments_model
    assert model.setData(_cell(model, 0, "carries"), "Each pump", EDIT)
    assert model.insert_row(1)  # its template is the pump-branch segment above
    assert document.project.segments[1].carries == "station"


def test_the_carries_header_explains_both_choices(window):
    model = window.pipework.segments_model
    tip = model.headerData(model.column_index("carries"), Qt.Orientation.Horizontal, Qt.ItemDataRole.ToolTipRole)
    assert "one running pump's flow" in tip and "station flow" in tip


# ---------------------------------------------------------------------- reducers and expanders
def _with_reducer(document, fitting: Fitting) -> None:
    project = document.project
    segment = project.segments[RISING_MAIN]
    changed = replace(segment, fittings=(fitting,) + segment.fittings)
    assert document.apply(with_segment(project, RISING_MAIN, changed), "add a reducer")


def test_cone_angle_and_upstream_bore_are_typed_cleared_and_checked(window, document, refusals):
    _with_reducer(document, Fitting("reducer_conical", angle_deg=30.0))
    window.pipework.select_segment(RISING_MAIN)
    model = window.pipework.fittings_model
    assert model.data(_cell(model, 0, "angle_deg"), DISPLAY) == "30"
    assert model.headerData(model.column_index("angle_deg"), Qt.Orientation.Horizontal, DISPLAY) == "Cone angle\n[°]"
    # blank upstream bore: the previous segment's bore in flow order (the manifold), shown in grey
    previous = document.project.segments[MANIFOLD].internal_diameter_m
    assert float(model.data(_cell(model, 0, "other_diameter_m"), DISPLAY)) == pytest.approx(previous * 1000.0)
    assert model.setData(_cell(model, 0, "other_diameter_m"), "250 mm", EDIT)
    assert document.project.segments[RISING_MAIN].fittings[0].other_diameter_m == pytest.approx(0.25)
    assert model.setData(_cell(model, 0, "other_diameter_m"), "", EDIT)
    assert document.project.segments[RISING_MAIN].fittings[0].other_diameter_m is None
    # a conical reducer needs its cone angle: clearing it is refused, naming the field
    before = document.project
    assert not model.setData(_cell(model, 0, "angle_deg"), "", EDIT)
    assert document.project is before and "angle_deg" in refusals[-1]
    assert not model.setData(_cell(model, 0, "angle_deg"), "200", EDIT)
    assert document.project is before
    assert "Cone angle" in refusals[-1] and "between 1 and 180" in refusals[-1]  # LIMITS["fitting.angle_deg"]


def test_the_upstream_bore_is_typed_in_inches_in_us_units(window, document):
    _with_reducer(document, Fitting("expander_sudden"))
    document.set_unit_system("US")
    window.pipework.select_segment(RISING_MAIN)
    model = window.pipework.fittings_model
    assert model.setData(_cell(model, 0, "other_diameter_m"), "6", EDIT)
    assert document.project.segments[RISING_MAIN].fittings[0].other_diameter_m == pytest.approx(6 * MM_PER_INCH / 1000)
    assert model.data(_cell(model, 0, "angle_deg"), DISPLAY) == "180 (sudden)"  # the catalogue entry's angle


# ---------------------------------------------------------------------- the main's profile
@pytest.fixture
def profile_view(window):
    window.pipework.show_profile()
    return window.pipework.profile_view


def test_a_pasted_profile_block_is_one_undo_step(window, document, profile_view):
    model = window.pipework.profile_model
    assert len(document.project.profile) == 10  # the sample's own profile (file), cleared to paste over
    assert document.apply(with_profile(document.project, ()), "clear the profile")
    before = document.project
    assert model.rowCount() == 0
    steps = document.undo_stack.count()
    assert clipboard.paste_text(profile_view, "0\t110\r\n1200\t150.5\r\n2406\t176\r\n")
    assert document.project.profile == (ProfilePoint(0.0, 110.0), ProfilePoint(1200.0, 150.5),
                                        ProfilePoint(2406.0, 176.0))
    assert document.undo_stack.count() == steps + 1
    assert model.rowCount() == 3
    assert window.pipework.profile_box.title() == (
        "Main profile — 3 points from 0 to 2406 m; main 2406 m long; 0 air valves")
    assert model.data(_cell(model, 1, "air_valve"), DISPLAY) == "No"
    assert model.setData(_cell(model, 1, "air_valve"), "Yes", EDIT)
    assert document.project.profile[1].air_valve is True
    document.undo_stack.undo()
    document.undo_stack.undo()
    assert document.project is before
    assert model.rowCount() == 0


def test_a_non_increasing_chainage_is_refused_and_named(window, document, refusals):
    assert document.apply(with_profile(document.project, (ProfilePoint(0.0, 110.0), ProfilePoint(1200.0, 150.0),
                                                          ProfilePoint(2412.0, 176.0))), "profile")
    model = window.pipework.profile_model
    before = document.project
    assert not model.setData(_cell(model, 2, "chainage"), "1200", EDIT)
    assert document.project is before
    assert "chainage must increase" in refusals[-1] and "profile[2].chainage" in refusals[-1]
    assert not model.setData(_cell(model, 1, "elevation"), "-2000", EDIT)
    assert document.project is before
    assert "Pipe elevation" in refusals[-1] and "between -1000 and 9000 m" in refusals[-1]  # LIMITS


def test_chainage_and_elevation_follow_the_us_display_units(window, document):
    document.set_unit_system("US")
    assert document.apply(with_profile(document.project, (ProfilePoint(0.0, 110.0), ProfilePoint(304.8, 30.48))),
                          "profile")
    model = window.pipework.profile_model
    assert model.data(_cell(model, 1, "chainage"), DISPLAY) == "1000"  # 304.8 m / 0.3048 m/ft
    assert model.data(_cell(model, 1, "elevation"), DISPLAY) == "100"
    assert model.setData(_cell(model, 1, "chainage"), "2000", EDIT)
    assert document.project.profile[1].chainage_m == pytest.approx(2000 * M_PER_FT)


def test_adding_to_an_empty_profile_starts_it_with_both_ends_of_the_main(window, document):
    assert document.apply(with_profile(document.project, ()), "clear the profile")  # the sample has one
    window.pipework.show_profile()
    window.pipework._add_profile_point()
    profile = document.project.profile
    # the hilltop sample: the manifold starts at 111 m and the rising main ends at 176 m (file)
    assert profile == (ProfilePoint(0.0, 111.0), ProfilePoint(MAIN_LENGTH_M, 176.0))
    window.pipework.profile_view.select_row(0)
    window.pipework._add_profile_point()
    # midway: 2406 / 2 = 1203 m, (111 + 176) / 2 = 143.5 m
    assert document.project.profile[1] == ProfilePoint(1203.0, 143.5)


def test_the_profile_model_passes_the_model_tester(qtmodeltester, window, document):
    document.apply(with_profile(document.project, (ProfilePoint(0.0, 110.0), ProfilePoint(100.0, 120.0, True))), "p")
    qtmodeltester.check(window.pipework.profile_model)
