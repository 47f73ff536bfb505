"""The table models: Qt's model contract, units in headers and cells, the diameter rules,
refusals that leave the project unchanged, optional columns of pump points."""

from __future__ import annotations

import math

import pytest
from PySide6.QtCore import Qt

from app.table_models import FittingsModel, PumpPointsModel, SegmentsModel
from hydraulics import catalogue, fittings

DISPLAY = Qt.ItemDataRole.DisplayRole
EDIT = Qt.ItemDataRole.EditRole

# Exact unit definitions (NIST SP 811, Appendix B): 1 in = 25.4 mm; 1 ft = 0.3048 m.
MM_PER_INCH = 25.4
M_PER_FT = 0.3048

RISING_MAIN = 5  # the hilltop sample's 2400 m rising main (DN 200 ductile iron)


@pytest.fixture
def segments(window) -> SegmentsModel:
    return window.pipework.segments_model


@pytest.fixture
def refusals(document) -> list[str]:
    messages: list[str] = []
    document.editRefused.connect(messages.append)
    return messages


def column(model, key: str) -> int:
    return model.column_index(key)


# ---------------------------------------------------------------------- Qt's model contract
def test_segments_model_passes_the_model_tester(qtmodeltester, segments, window):
    qtmodeltester.check(segments)
    window.set_unit_system("US")
    qtmodeltester.check(segments)


def test_segments_model_passes_with_hazen_williams_columns(qtmodeltester, segments, document):
    from dataclasses import replace

    assert document.apply(replace(document.project, friction_method="hazen_williams"), "method")
    assert segments.table_columns[column(segments, "hw_c_new")].title == "H–W C, new"
    qtmodeltester.check(segments)


def test_fittings_model_passes_the_model_tester(qtmodeltester, window):
    model: FittingsModel = window.pipework.fittings_model
    window.pipework.select_segment(1)
    assert model.rowCount() == len(window.document.project.segments[1].fittings) > 0
    qtmodeltester.check(model)
    model.set_segment(None)
    assert model.rowCount() == 0
    qtmodeltester.check(model)


def test_pump_points_model_passes_the_model_tester(qtmodeltester, window):
    model: PumpPointsModel = window.pumps_panel.points_model
    assert model.rowCount() == len(window.document.project.duty_pump.flow_m3_s)
    qtmodeltester.check(model)


def test_rows_follow_insert_and_remove(qtmodeltester, segments):
    qtmodeltester.check(segments, force_py=True)
    rows = segments.rowCount()
    assert segments.insert_row(1)
    assert segments.rowCount() == rows + 1
    assert segments.remove_rows([1])
    assert segments.rowCount() == rows


# ---------------------------------------------------------------------- headers and units
def test_every_quantity_header_shows_its_unit_on_a_second_line(segments, window):
    header = segments.headerData(column(segments, "internal_diameter"), Qt.Orientation.Horizontal, DISPLAY)
    assert header == "Internal diameter\n[mm]"
    assert segments.headerData(column(segments, "length"), Qt.Orientation.Horizontal, DISPLAY) == "Length\n[m]"
    window.set_unit_system("US")
    assert segments.headerData(column(segments, "internal_diameter"), Qt.Orientation.Horizontal,
                               DISPLAY) == "Internal diameter\n[in]"
    assert segments.headerData(column(segments, "length"), Qt.Orientation.Horizontal, DISPLAY) == "Length\n[ft]"
    for model in (segments, window.pipework.fittings_model, window.pumps_panel.points_model):
        for section, col in enumerate(model.table_columns):
            text = model.headerData(section, Qt.Orientation.Horizontal, DISPLAY)
            if col.quantity is not None:
                assert "\n[" in text and text.endswith("]"), text


def test_unit_switch_shows_converted_values_over_the_same_stored_data(segments, document, window):
    index = segments.index(RISING_MAIN, column(segments, "internal_diameter"))
    assert segments.setData(index, "300 mm", EDIT)
    stored = document.project
    assert stored.segments[RISING_MAIN].internal_diameter_m == pytest.approx(0.3, rel=1e-12)
    assert segments.data(index, DISPLAY) == "300"
    window.set_unit_system("US")
    # 300 mm / 25.4 mm per inch = 11.811 in (NIST SP 811: 1 in = 25.4 mm exactly), shown to 0.01 in
    # (bores to 0.01 in: common practice, hydraulics.number_format.US_CUSTOMARY_PRECISION).
    assert segments.data(index, DISPLAY) == "11.81"
    assert float(segments.data(index, EDIT)) == pytest.approx(300 / MM_PER_INCH, rel=1e-9)
    length = segments.index(RISING_MAIN, column(segments, "length"))
    assert float(segments.data(length, EDIT)) == pytest.approx(2400 / M_PER_FT, rel=1e-9)
    assert document.project is stored  # the switch changed nothing stored


def test_a_bare_number_is_read_in_the_unit_on_display(segments, document, window):
    window.set_unit_system("US")
    index = segments.index(RISING_MAIN, column(segments, "internal_diameter"))
    assert segments.setData(index, "12", EDIT)
    # 12 in × 0.0254 m/in = 0.3048 m (NIST SP 811).
    assert document.project.segments[RISING_MAIN].internal_diameter_m == pytest.approx(0.3048, rel=1e-12)


def test_any_unit_may_be_typed(segments, document):
    index = segments.index(RISING_MAIN, column(segments, "internal_diameter"))
    assert segments.setData(index, "12 in", EDIT)
    assert document.project.segments[RISING_MAIN].internal_diameter_m == pytest.approx(12 * 0.0254, rel=1e-12)
    length = segments.index(RISING_MAIN, column(segments, "length"))
    assert segments.setData(length, "1.5 km", EDIT)
    assert document.project.segments[RISING_MAIN].length_m == pytest.approx(1500.0)


# ---------------------------------------------------------------------- refusals
@pytest.mark.parametrize("text, words", [
    ("-5 m", "between 0 and 100000 m"),
    ("12 kg", "is not a length"),
    ("1,5", "comma"),
    ("", "a value is needed"),
    ("abc", "does not start with a number"),
])
def test_a_bad_length_is_refused_and_the_project_is_unchanged(segments, document, refusals, text, words):
    before = document.project
    steps = document.undo_stack.count()
    index = segments.index(RISING_MAIN, column(segments, "length"))
    assert segments.setData(index, text, EDIT) is False
    assert document.project is before
    assert document.undo_stack.count() == steps
    assert len(refusals) == 1
    assert "Length" in refusals[0] and words in refusals[0]
    assert f"segment {RISING_MAIN + 1}" in refusals[0].lower()  # rows are numbered from 1


def test_a_refusal_states_the_range_in_the_units_on_display(segments, window, refusals):
    window.set_unit_system("US")
    index = segments.index(RISING_MAIN, column(segments, "internal_diameter"))
    assert not segments.setData(index, "-5", EDIT)
    # Range 0.005–5 m shown in inches: 5 mm / 25.4 = 0.19685 in, 5 m / 0.0254 = 196.85 in.
    assert "between 0.19685 and 196.85 in" in refusals[-1]


def test_a_whole_number_column_refuses_a_fraction(segments, document, refusals):
    index = segments.index(RISING_MAIN, column(segments, "parallel_pipes"))
    assert not segments.setData(index, "1.5", EDIT)
    assert "whole number" in refusals[-1]
    assert segments.setData(index, "2", EDIT)
    assert document.project.segments[RISING_MAIN].parallel_pipes == 2


def test_a_choice_outside_the_catalogue_is_refused(segments, document, refusals):
    before = document.project
    assert not segments.setData(segments.index(0, column(segments, "material")), "unobtainium", EDIT)
    assert document.project is before
    assert "Material" in refusals[-1] and "not one of the choices" in refusals[-1]


def test_retyping_the_shown_value_changes_nothing(segments, document, window):
    window.set_unit_system("US")
    index = segments.index(RISING_MAIN, column(segments, "internal_diameter"))
    before = document.project
    assert segments.setData(index, segments.data(index, EDIT), EDIT)
    assert document.project is before  # still on its pipe series: no detaching round-off
    assert document.project.segments[RISING_MAIN].pipe_series is not None


# ---------------------------------------------------------------------- diameter and pipe series
def test_choosing_a_nominal_size_sets_the_diameter_from_the_catalogue(segments, document):
    index = segments.index(RISING_MAIN, column(segments, "nominal_size"))
    assert segments.setData(index, "DN 250", EDIT)
    segment = document.project.segments[RISING_MAIN]
    expected = catalogue.series("ductile_iron_en545_c40").size("DN 250").internal_diameter_m
    assert (segment.nominal_size, segment.internal_diameter_m) == ("DN 250", expected)


def test_typing_a_diameter_detaches_the_segment_from_its_series(segments, document):
    index = segments.index(RISING_MAIN, column(segments, "internal_diameter"))
    assert segments.setData(index, "210 mm", EDIT)
    segment = document.project.segments[RISING_MAIN]
    assert segment.pipe_series is None and segment.nominal_size is None
    assert segment.internal_diameter_m == pytest.approx(0.21)
    assert segments.data(segments.index(RISING_MAIN, column(segments, "pipe_series")), DISPLAY) == \
        "typed (no series)"
    assert not segments.flags(segments.index(RISING_MAIN, column(segments, "nominal_size"))) & \
        Qt.ItemFlag.ItemIsEditable


def test_choosing_a_series_takes_the_size_nearest_the_diameter(segments, document):
    assert segments.setData(segments.index(RISING_MAIN, column(segments, "internal_diameter")), "260 mm", EDIT)
    assert segments.setData(segments.index(RISING_MAIN, column(segments, "pipe_series")),
                            "ductile_iron_k9", EDIT)
    segment = document.project.segments[RISING_MAIN]
    series = catalogue.series("ductile_iron_k9")
    assert segment.pipe_series == "ductile_iron_k9"
    assert segment.nominal_size == series.nearest(0.26).nominal
    assert segment.internal_diameter_m == series.nearest(0.26).internal_diameter_m


def test_a_material_of_another_kind_detaches_the_series(segments, document):
    diameter = document.project.segments[RISING_MAIN].internal_diameter_m
    assert segments.setData(segments.index(RISING_MAIN, column(segments, "material")), "pe100", EDIT)
    segment = document.project.segments[RISING_MAIN]
    assert (segment.material_id, segment.pipe_series, segment.internal_diameter_m) == ("pe100", None, diameter)


def test_series_choices_are_those_of_the_material(segments, document):
    options = segments.choices(document.project, RISING_MAIN, segments.table_columns[column(segments, "pipe_series")])
    ids = [value for value, _label in options]
    assert ids[0] is None  # "typed"
    assert set(ids[1:]) == {s.series_id for s in catalogue.pipe_series().values()
                            if s.material_id == "ductile_iron_cml"}


def test_roughness_override_and_back_to_the_catalogue(segments, document):
    index = segments.index(RISING_MAIN, column(segments, "roughness_aged"))
    material = catalogue.material("ductile_iron_cml")
    assert segments.data(index, DISPLAY) == f"{material.roughness_aged_m * 1000:g}"  # grey catalogue value
    assert segments.data(index, EDIT) == ""
    assert segments.setData(index, "1.2 mm", EDIT)
    assert document.project.segments[RISING_MAIN].roughness_aged_m == pytest.approx(0.0012)
    assert segments.setData(index, "", EDIT)
    assert document.project.segments[RISING_MAIN].roughness_aged_m is None


def test_velocity_column_shows_the_solution(segments, document):
    document.recompute_now()
    index = segments.index(RISING_MAIN, column(segments, "velocity"))
    velocity = document.solution.segments[RISING_MAIN].velocity_m_s
    # v = Q / (π D² / 4) at 35 L/s in a 206.6 mm bore.
    assert velocity == pytest.approx(0.035 / (math.pi * 0.2066**2 / 4), rel=1e-9)
    assert segments.data(index, DISPLAY) == f"{velocity:.3g}"
    assert not segments.flags(index) & Qt.ItemFlag.ItemIsEditable


def test_an_edit_announces_its_row_and_the_velocities_of_every_row(segments, document, window):
    from dataclasses import replace

    document.recompute_now()
    announced: list[tuple[int, int, int, int]] = []
    segments.dataChanged.connect(
        lambda top, bottom, *_: announced.append((top.row(), bottom.row(), top.column(), bottom.column())))
    project = document.project
    last_row, last_column = segments.rowCount() - 1, segments.columnCount() - 1
    velocity = column(segments, "velocity")
    changed = replace(project.segments[RISING_MAIN], length_m=project.segments[RISING_MAIN].length_m + 10.0)
    document.apply(replace(project, segments=project.segments[:RISING_MAIN] + (changed,)
                           + project.segments[RISING_MAIN + 1:]), "Longer rising main")
    assert (RISING_MAIN, RISING_MAIN, 0, last_column) in announced
    assert (0, last_row, velocity, velocity) in announced  # velocities are out of date in every row
    assert not any(top <= r <= bottom and left <= c <= right for top, bottom, left, right in announced
                   for r in range(segments.rowCount()) if r != RISING_MAIN for c in range(velocity))
    assert segments.data(segments.index(0, velocity), DISPLAY) in ("", "—")  # no stale velocity
    announced.clear()
    document.apply(replace(document.project, fluid=replace(document.project.fluid,
                                                           temperature_c=document.project.fluid.temperature_c + 5.0)),
                   "Warmer water")  # a change outside the rows: every cell is announced
    assert (0, last_row, 0, last_column) in announced


# ---------------------------------------------------------------------- fittings
def test_fittings_show_catalogue_k_and_take_an_override(window, document):
    window.pipework.select_segment(RISING_MAIN)
    model = window.pipework.fittings_model
    segment = document.project.segments[RISING_MAIN]
    first = segment.fittings[0]
    expected = fittings.fitting_k(fittings.fitting_catalogue()[first.fitting_id], segment.internal_diameter_m)
    assert model.data(model.index(0, column(model, "catalogue_k")), DISPLAY) == f"{expected:.3g}"
    assert model.setData(model.index(0, column(model, "k_override")), "0.35", EDIT)
    assert document.project.segments[RISING_MAIN].fittings[0].k_override == 0.35
    assert model.setData(model.index(0, column(model, "count")), "8", EDIT)
    assert document.project.segments[RISING_MAIN].fittings[0].count == 8
    assert model.setData(model.index(0, column(model, "fitting_id")), "Globe valve, fully open", EDIT)
    assert document.project.segments[RISING_MAIN].fittings[0].fitting_id == "globe_valve"


def test_a_new_bore_announces_the_catalogue_k_column_with_its_new_values(window, document):
    window.pipework.select_segment(RISING_MAIN)
    model = window.pipework.fittings_model
    announced: list[tuple[int, int, int, int]] = []
    model.dataChanged.connect(
        lambda top, bottom, *_: announced.append((top.row(), bottom.row(), top.column(), bottom.column())))
    assert window.pipework.step_size(RISING_MAIN, 1)
    segment = document.project.segments[RISING_MAIN]
    k_column = column(model, "catalogue_k")
    assert announced == [(0, model.rowCount() - 1, k_column, k_column)]
    for row, fitting in enumerate(segment.fittings):
        # the K of the catalogue at the new bore, as the hydraulics package computes it
        expected = fittings.fitting_k(fittings.fitting_catalogue()[fitting.fitting_id], segment.internal_diameter_m)
        assert model.data(model.index(row, k_column), DISPLAY) == f"{expected:.3g}"
    announced.clear()
    count = column(model, "count")
    assert model.setData(model.index(0, count), str(segment.fittings[0].count + 1), EDIT)
    assert (0, 0, 0, model.columnCount() - 1) in announced  # an edited record: its whole row


def test_a_bad_k_override_is_refused(window, document):
    window.pipework.select_segment(0)
    model = window.pipework.fittings_model
    before = document.project
    assert not model.setData(model.index(0, column(model, "k_override")), "-1", EDIT)
    assert not model.setData(model.index(0, column(model, "count")), "2.5", EDIT)
    assert document.project is before


# ---------------------------------------------------------------------- pump points
def test_pump_point_edits_and_the_increasing_flow_rule(window, document, refusals):
    model = window.pumps_panel.points_model
    pump = document.project.duty_pump
    assert model.setData(model.index(1, column(model, "head_m")), "100 ft", EDIT)
    assert document.project.duty_pump.head_m[1] == pytest.approx(100 * M_PER_FT)
    before = document.project
    first_flow = model.data(model.index(0, column(model, "flow_m3_s")), EDIT)
    assert not model.setData(model.index(2, column(model, "flow_m3_s")), first_flow, EDIT)
    assert document.project is before
    assert "flows must increase" in refusals[-1]
    assert len(document.project.duty_pump.flow_m3_s) == len(pump.flow_m3_s)


def test_efficiency_is_shown_and_typed_in_percent(window, document):
    model = window.pumps_panel.points_model
    index = model.index(1, column(model, "efficiency"))
    assert model.headerData(column(model, "efficiency"), Qt.Orientation.Horizontal, DISPLAY) == "Efficiency\n[%]"
    assert model.setData(index, "41.5", EDIT)
    assert document.project.duty_pump.efficiency[1] == pytest.approx(0.415)
    assert model.setData(index, "0.4 ", EDIT)  # a bare number is a percentage here
    assert document.project.duty_pump.efficiency[1] == pytest.approx(0.004)


def test_a_lone_value_in_an_absent_optional_column_is_refused(window, document, refusals):
    model = window.pumps_panel.points_model
    assert document.project.duty_pump.shaft_power_w == ()
    before = document.project
    assert not model.setData(model.index(0, column(model, "shaft_power_w")), "5 kW", EDIT)
    assert document.project is before
    assert "shaft power is missing at point 2" in refusals[-1]


def test_at_least_three_points_remain(window, document, refusals):
    model = window.pumps_panel.points_model
    n = model.rowCount()
    assert not model.remove_rows(range(n - 2))
    assert model.rowCount() == n
    assert "at least 3 points" in refusals[-1]


def test_an_inserted_point_lies_midway(window, document):
    model = window.pumps_panel.points_model
    pump = document.project.duty_pump
    assert model.insert_row(2)
    new = document.project.duty_pump
    assert new.flow_m3_s[2] == pytest.approx((pump.flow_m3_s[1] + pump.flow_m3_s[2]) / 2)
    assert new.head_m[2] == pytest.approx((pump.head_m[1] + pump.head_m[2]) / 2)
    assert len(new.efficiency) == len(new.flow_m3_s)
