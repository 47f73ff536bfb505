"""Editing in the window: live recompute, undo/redo, paste, spreadsheet keys, pipe-size steps,
form fields and pump import."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest
from PySide6.QtCore import QPoint, QPointF, Qt
from PySide6.QtGui import QWheelEvent
from PySide6.QtWidgets import QAbstractItemView, QApplication

from app import clipboard
from hydraulics import catalogue
from hydraulics.solve import solve
from hydraulics.units import to_display

EDIT = Qt.ItemDataRole.EditRole
SUCTION_BRANCH = 1  # the hilltop sample's 2 m DN 200 suction branch of each pump
MANIFOLD = 4  # its 6 m DN 200 discharge manifold (no reducer or expander on it)
RISING_MAIN = 5  # its 2400 m DN 200 rising main


def _cell(model, row: int, key: str):
    return model.index(row, model.column_index(key))


# ---------------------------------------------------------------------- live recompute
def test_editing_a_diameter_redraws_the_system_curves_and_the_checks(window, document):
    plot = window.plot_tabs.head_flow
    flow_before, head_before = plot.curve_data("max", "new")
    assert ("segment", MANIFOLD) not in [f.target for f in window.checks_panel.findings if f.code == "velocity_high"]
    model = window.pipework.segments_model
    assert model.setData(_cell(model, MANIFOLD, "internal_diameter"), "80 mm", EDIT)
    assert document.recompute_pending  # debounced, not solved inside the edit
    document.recompute_now()
    flow_after, head_after = plot.curve_data("max", "new")
    expected = solve(document.project).curve("max", "new")
    np.testing.assert_allclose(flow_after, to_display(expected.flow_m3_s, "flow", "SI"))
    np.testing.assert_allclose(head_after, expected.head_m)
    # Friction grows as the bore shrinks: every head above zero flow rises.
    common = np.interp(flow_before[1:], flow_after, head_after)
    assert np.all(common > head_before[1:])
    # About 30 L/s in an 80 mm bore: v = 0.030 / (π 0.08² / 4) ≈ 6 m/s, above the 2.5 m/s limit.
    targets = [f.target for f in window.checks_panel.findings if f.code == "velocity_high"]
    assert ("segment", MANIFOLD) in targets


def test_the_debounce_solves_once_after_a_burst(window, document, qtbot):
    solutions = []
    document.solutionChanged.connect(solutions.append)
    model = window.pipework.segments_model
    for length in ("2410", "2420", "2430"):
        assert model.setData(_cell(model, RISING_MAIN, "length"), length, EDIT)
    assert solutions == []
    qtbot.waitUntil(lambda: len(solutions) == 1, timeout=2000)
    assert solutions[0].project is document.project


def test_the_first_edit_after_a_pause_is_solved_at_the_next_turn_of_the_event_loop(window, document):
    solutions = []
    document.solutionChanged.connect(solutions.append)
    document._last_solve_end -= 1.0  # the last solve was a second ago
    model = window.pipework.segments_model
    assert model.setData(_cell(model, RISING_MAIN, "length"), "2410", EDIT)
    assert document.recompute_pending and solutions == []
    QApplication.sendPostedEvents(document)  # one turn of the loop, no timer waited for
    assert [s.project for s in solutions] == [document.project]
    assert not document.recompute_pending


def test_an_edit_right_after_a_solve_waits_out_the_throttle(window, document, qtbot, monkeypatch):
    monkeypatch.setattr("app.document.RECOMPUTE_DELAY_MS", 500)  # long enough for any machine
    solutions = []
    document.solutionChanged.connect(solutions.append)
    document.recompute_now()
    model = window.pipework.segments_model
    assert model.setData(_cell(model, RISING_MAIN, "length"), "2410", EDIT)
    QApplication.sendPostedEvents(document)
    assert len(solutions) == 1 and document.recompute_pending  # held back by the timer
    qtbot.waitUntil(lambda: len(solutions) == 2, timeout=3000)
    assert solutions[-1].project is document.project


def test_the_plot_is_painted_from_the_first_stage_before_the_checks_arrive(window, document, qtbot):
    """The live path: curves and points first (drawn and painted at once), then the checks."""
    window.show()
    qtbot.waitExposed(window)
    qtbot.wait(50)  # the first paint of the shown window
    plot = window.plot_tabs.head_flow
    old = document.solution
    at_paint = []
    window.plot_tabs.current_canvas().painted.connect(
        lambda: at_paint.append((plot.drawn_solution, document.solution, window.checks_panel.findings)))
    redraws = []
    original = plot._update_points
    plot._update_points = lambda: (redraws.append(1), original())
    window.pipework.step_size(RISING_MAIN, 1)
    document.recompute_now()
    assert at_paint, "the canvas was not painted within the solve"
    drawn, published, findings = at_paint[0]
    assert drawn.project is document.project and not drawn.complete and drawn.findings == ()
    assert published is old and findings == old.findings  # the checks had not arrived yet
    full = document.solution
    assert full.complete and full.operating_points is drawn.operating_points
    assert redraws == [1]  # the finished solution added checks only: the plot was not redrawn
    assert plot.drawn_solution is full and window.checks_panel.findings == full.findings


def test_a_failure_in_the_second_stage_clears_the_plot_and_says_why(window, document, monkeypatch):
    def broken(_stage):
        raise RuntimeError("checks failed")

    monkeypatch.setattr("app.document.complete_solution", broken)
    window.pipework.step_size(RISING_MAIN, 1)
    assert document.recompute_now() is None
    assert "checks failed" in document.solve_error and window.message_bar.kind == "stale"
    assert window.plot_tabs.head_flow.drawn_solution is None


def test_a_project_the_catalogues_refuse_is_refused_with_its_field_and_left_unchanged(window, document):
    # The catalogue side of the rules belongs to validate_project too: an unknown material is
    # refused before it reaches the solve, naming the field, and nothing changes.
    project = document.project
    messages: list[str] = []
    document.editRefused.connect(messages.append)
    bad = replace(project, segments=(replace(project.segments[0], material_id="no_such_material"),)
                  + project.segments[1:])
    assert not document.apply(bad, "unknown material")
    assert document.project is project
    assert len(messages) == 1 and "segments[0].material" in messages[0] and "no_such_material" in messages[0]
    assert document.recompute_now() is not None


# ---------------------------------------------------------------------- undo and redo
def test_undo_and_redo_restore_every_edit_exactly(window, document):
    original = document.project
    segments = window.pipework.segments_model
    assert segments.setData(_cell(segments, RISING_MAIN, "internal_diameter"), "250 mm", EDIT)
    assert window.pipework.step_size(0, 1)
    assert segments.insert_row(1)
    assert segments.setData(_cell(segments, 1, "name"), "Valve chamber", EDIT)
    assert segments.move_row(1, 1)
    assert segments.remove_rows([2])
    window.site_panel.set_text("design_flow", "40 L/s")
    window.criteria_panel.set_text("delivery_velocity_max", "3")
    final = document.project
    steps = document.undo_stack.count()
    assert steps == 8
    while document.undo_stack.canUndo():
        document.undo_stack.undo()
    assert document.project is original
    while document.undo_stack.canRedo():
        document.undo_stack.redo()
    assert document.project == final
    assert document.project.site.design_flow_m3_s == pytest.approx(0.040)


def test_undo_brings_the_edited_segment_into_view(window, document):
    model = window.pipework.segments_model
    assert model.setData(_cell(model, RISING_MAIN, "length"), "2000", EDIT)
    window.input_tabs.setCurrentIndex(0)
    window.pipework.select_segment(0)
    document.undo_stack.undo()
    assert window.input_tabs.tabText(window.input_tabs.currentIndex()) == "Pipework"
    assert window.pipework.current_segment() == RISING_MAIN


# ---------------------------------------------------------------------- paste and copy
def test_pasting_a_block_is_one_undo_step(window, document):
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    before = document.project
    view.setCurrentIndex(_cell(model, 1, "start_elevation"))
    QApplication.clipboard().setText("100.5\t104\r\n101\t176.5\r\n")
    steps = document.undo_stack.count()
    assert clipboard.paste_clipboard(view)
    segments = document.project.segments
    assert (segments[1].start_elevation_m, segments[1].end_elevation_m) == (100.5, 104.0)
    assert (segments[2].start_elevation_m, segments[2].end_elevation_m) == (101.0, 176.5)
    assert document.undo_stack.count() == steps + 1
    document.undo_stack.undo()
    assert document.project is before


def test_a_bad_cell_refuses_the_whole_paste(window, document):
    messages = []
    document.editRefused.connect(messages.append)
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    before = document.project
    view.setCurrentIndex(_cell(model, 1, "start_elevation"))
    assert not clipboard.paste_text(view, "100\t101\n-3000\t101\n")
    assert document.project is before
    assert "row 3, column 'Start elevation'" in messages[-1]
    assert "between -1000 and 9000 m" in messages[-1]


def test_copy_then_paste_back_changes_nothing(window, document):
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    from PySide6.QtCore import QItemSelection, QItemSelectionModel

    selection = QItemSelection(model.index(0, 0), model.index(RISING_MAIN, model.columnCount() - 1))
    view.selectionModel().select(selection, QItemSelectionModel.SelectionFlag.ClearAndSelect)
    assert clipboard.copy_selection(view)
    text = QApplication.clipboard().text()
    lines = text.splitlines()
    assert len(lines) == RISING_MAIN + 1 and lines[-1].split("\t")[0] == "Rising main to Hollin Hill reservoir"
    before = document.project
    view.setCurrentIndex(model.index(0, 0))
    view.selectionModel().select(model.index(0, 0), QItemSelectionModel.SelectionFlag.ClearAndSelect)
    assert clipboard.paste_text(view, text)
    assert document.project is before


def test_ctrl_c_and_ctrl_v_in_a_table(window, document, qtbot):
    window.show()
    window.activateWindow()
    qtbot.waitUntil(window.isActiveWindow, timeout=2000)
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    view.setFocus()
    view.setCurrentIndex(_cell(model, 0, "length"))
    qtbot.keyClick(view, Qt.Key.Key_C, Qt.KeyboardModifier.ControlModifier)
    assert QApplication.clipboard().text() == "6\n"  # the sample's 6 m suction header
    view.setCurrentIndex(_cell(model, SUCTION_BRANCH, "length"))
    assert document.project.segments[SUCTION_BRANCH].length_m == 2.0
    qtbot.keyClick(view, Qt.Key.Key_V, Qt.KeyboardModifier.ControlModifier)
    assert document.project.segments[SUCTION_BRANCH].length_m == 6.0


def test_pasting_a_pump_curve_adds_rows_and_fills_a_column(window, document):
    view = window.pumps_panel.points_view
    model = window.pumps_panel.points_model
    # An invented curve of nine points: flow [L/s], head [m], efficiency [%], NPSHr [m], power [kW].
    rows = [(0, 98, 0, 1.5, 18), (5, 97, 30, 1.6, 20), (10, 95, 50, 1.7, 22), (15, 92, 62, 1.8, 24),
            (20, 88, 70, 2.0, 26), (25, 83, 74, 2.3, 28), (30, 77, 75, 2.7, 30), (35, 69, 73, 3.2, 32),
            (40, 60, 68, 3.9, 34)]
    view.setCurrentIndex(model.index(0, 0))
    view.selectionModel().select(model.index(0, 0), view.selectionModel().SelectionFlag.ClearAndSelect)
    assert clipboard.paste_text(view, "\n".join("\t".join(str(v) for v in row) for row in rows))
    pump = document.project.duty_pump
    assert len(pump.flow_m3_s) == 9
    assert pump.flow_m3_s[-1] == pytest.approx(0.040)
    assert pump.shaft_power_w[3] == pytest.approx(24_000.0)
    assert pump.efficiency[6] == pytest.approx(0.75)
    document.undo_stack.undo()
    assert len(document.project.duty_pump.flow_m3_s) == 8


def test_a_pipe_edit_leaves_the_pump_panel_alone_and_a_point_edit_updates_it(window, document):
    panel = window.pumps_panel
    model = panel.points_model
    announced = []
    for signal in (model.dataChanged, model.modelReset, model.rowsInserted, model.rowsRemoved):
        signal.connect(lambda *args: announced.append(args))
    chooser_items = [panel.chooser.itemText(i) for i in range(panel.chooser.count())]
    assert window.pipework.step_size(RISING_MAIN, 1)
    assert announced == []  # the pump's points are the same objects: nothing to announce
    assert [panel.chooser.itemText(i) for i in range(panel.chooser.count())] == chooser_items
    head = model.index(1, model.column_index("head_m"))
    assert model.setData(head, "77", EDIT)
    assert announced and model.data(head) == "77"
    assert document.project.duty_pump.head_m[1] == pytest.approx(77.0)
    document.undo_stack.undo()  # the chooser and points follow an undo of a pump edit too
    assert model.data(head) != "77"


def test_delete_clears_optional_cells_in_one_step(window, document, qtbot):
    window.pipework.select_segment(0)
    view = window.pipework.fittings_view
    model = window.pipework.fittings_model
    assert model.setData(_cell(model, 0, "k_override"), "0.8", EDIT)
    view.setCurrentIndex(_cell(model, 0, "k_override"))
    qtbot.keyClick(view, Qt.Key.Key_Delete)
    assert document.project.segments[0].fittings[0].k_override is None


# ---------------------------------------------------------------------- spreadsheet keys
def test_enter_commits_and_moves_down_tab_moves_right(window, document, qtbot):
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    index = _cell(model, 0, "length")
    view.setCurrentIndex(index)
    view.edit(index)
    editor = view.indexWidget(index)
    editor.setText("11 m")
    qtbot.keyClick(editor, Qt.Key.Key_Return)
    qtbot.waitUntil(lambda: view.state() != QAbstractItemView.State.EditingState, timeout=2000)
    assert document.project.segments[0].length_m == 11.0
    assert (view.currentIndex().row(), view.currentIndex().column()) == (1, index.column())
    index = view.currentIndex()
    view.edit(index)
    editor = view.indexWidget(index)
    editor.setText("13")
    qtbot.keyClick(editor, Qt.Key.Key_Tab)
    qtbot.waitUntil(lambda: view.state() != QAbstractItemView.State.EditingState, timeout=2000)
    assert document.project.segments[1].length_m == 13.0
    assert (view.currentIndex().row(), view.currentIndex().column()) == (1, index.column() + 1)


def test_a_refused_entry_keeps_the_cursor_on_its_cell(window, document, qtbot):
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    index = _cell(model, 0, "length")
    view.setCurrentIndex(index)
    view.edit(index)
    view.indexWidget(index).setText("12 kg")
    qtbot.keyClick(view.indexWidget(index), Qt.Key.Key_Return)
    qtbot.waitUntil(lambda: view.state() != QAbstractItemView.State.EditingState, timeout=2000)
    assert view.currentIndex().row() == 0
    assert "is not a length" in window.message_bar.text()
    assert "is not a length" in window.statusBar().currentMessage()


def test_typing_starts_editing_and_replaces_the_cell(window, document, qtbot):
    view = window.pipework.segments_view
    model = window.pipework.segments_model
    index = _cell(model, 1, "length")
    view.setCurrentIndex(index)
    qtbot.keyClick(view, "2")
    editor = view.indexWidget(index)
    assert editor is not None and editor.text() == "2"  # the typed key replaced the old value
    qtbot.keyClick(editor, "0")
    qtbot.keyClick(editor, Qt.Key.Key_Return)
    qtbot.waitUntil(lambda: document.project.segments[1].length_m == 20.0, timeout=2000)


def test_enter_outside_an_editor_moves_down(window, qtbot):
    view = window.pipework.segments_view
    view.setCurrentIndex(view.model().index(0, 2))
    qtbot.keyClick(view, Qt.Key.Key_Return)
    assert view.currentIndex().row() == 1


# ---------------------------------------------------------------------- pipe-size steps
def test_stepping_the_size_up_and_down_through_the_series(window, document):
    series = catalogue.series("ductile_iron_en545_c40")
    window.pipework.select_segment(RISING_MAIN)
    velocity_before = window.document.solution.segments[RISING_MAIN].velocity_m_s
    assert window.larger_pipe()
    segment = document.project.segments[RISING_MAIN]
    assert (segment.nominal_size, segment.internal_diameter_m) == ("DN 250", series.size("DN 250").internal_diameter_m)
    document.recompute_now()
    assert document.solution.segments[RISING_MAIN].velocity_m_s < velocity_before
    assert window.pipework.size_stepper.text() == "DN 250"
    assert window.smaller_pipe() and window.smaller_pipe()
    assert document.project.segments[RISING_MAIN].nominal_size == "DN 150"
    assert document.undo_stack.count() == 3  # one undo step per size step
    document.undo_stack.undo()
    assert document.project.segments[RISING_MAIN].nominal_size == "DN 200"


def test_the_size_line_shows_the_new_bore_at_once_and_its_velocity_once_solved(window, document):
    window.pipework.select_segment(RISING_MAIN)
    assert window.larger_pipe()
    label = window.pipework.size_label.text()
    bore_mm = catalogue.series("ductile_iron_en545_c40").size("DN 250").internal_diameter_m * 1000.0
    assert label.startswith(f"Bore {to_display(bore_mm / 1000.0, 'diameter', 'SI'):g}")
    assert "at design flow" not in label
    document.recompute_now()
    velocity = document.solution.segments[RISING_MAIN].velocity_m_s  # the engine's own result
    label = window.pipework.size_label.text()
    assert f"{velocity:.3g} m/s at design flow" in label and "EN 545" in label


def test_the_stepper_buttons_and_the_mouse_wheel_step_the_size(window, document, qtbot):
    window.pipework.select_segment(RISING_MAIN)
    stepper = window.pipework.size_stepper
    stepper.stepUp()
    assert document.project.segments[RISING_MAIN].nominal_size == "DN 250"
    notch_down = QWheelEvent(QPointF(5, 5), QPointF(stepper.mapToGlobal(QPoint(5, 5))), QPoint(0, 0),
                             QPoint(0, -120), Qt.MouseButton.NoButton, Qt.KeyboardModifier.NoModifier,
                             Qt.ScrollPhase.NoScrollPhase, False)
    QApplication.sendEvent(stepper, notch_down)
    assert document.project.segments[RISING_MAIN].nominal_size == "DN 200"


def test_the_shortcuts_step_the_selected_segment(window, document, qtbot):
    assert window.named_actions["larger_pipe"].shortcut().toString() == "Ctrl+Up"
    assert window.named_actions["smaller_pipe"].shortcut().toString() == "Ctrl+Down"
    window.show()
    window.activateWindow()
    qtbot.waitUntil(window.isActiveWindow, timeout=2000)
    window.pipework.select_segment(RISING_MAIN)
    view = window.pipework.segments_view
    view.setFocus()
    qtbot.keyClick(view, Qt.Key.Key_Down, Qt.KeyboardModifier.ControlModifier)
    assert document.project.segments[RISING_MAIN].nominal_size == "DN 150"
    assert view.current_row() == RISING_MAIN  # the key stepped the pipe, it did not move the cursor
    qtbot.keyClick(window.pipework.size_stepper, Qt.Key.Key_Up, Qt.KeyboardModifier.ControlModifier)
    assert document.project.segments[RISING_MAIN].nominal_size == "DN 200"


def test_a_step_past_the_end_of_the_series_is_refused_with_a_reason(window, document):
    messages = []
    document.editRefused.connect(messages.append)
    window.pipework.select_segment(RISING_MAIN)
    while window.larger_pipe():
        pass
    assert document.project.segments[RISING_MAIN].nominal_size == "DN 600"
    assert "already the largest size" in messages[-1]


def test_a_typed_diameter_steps_onto_the_material_series(window, document):
    model = window.pipework.segments_model
    assert model.setData(_cell(model, RISING_MAIN, "internal_diameter"), "210 mm", EDIT)
    window.pipework.select_segment(RISING_MAIN)
    assert window.larger_pipe()
    segment = document.project.segments[RISING_MAIN]
    bores = [s.internal_diameter_m for s in catalogue.series(segment.pipe_series).sizes]
    assert segment.internal_diameter_m == min(b for b in bores if b > 0.21)


# ---------------------------------------------------------------------- forms
def test_a_level_below_its_partner_is_refused_with_the_project_rule(window, document):
    messages = []
    document.editRefused.connect(messages.append)
    before = document.project
    window.site_panel.set_text("suction_level_low", "120 m")
    assert document.project is before
    assert "lowest suction level is above the highest" in messages[-1]
    assert window.site_panel.editor("suction_level_low").text() == "112"


def test_form_fields_take_units_and_refuse_out_of_range(window, document):
    window.site_panel.set_text("design_flow", "126 m3/h")
    assert document.project.site.design_flow_m3_s == pytest.approx(0.035)
    before = document.project
    window.site_panel.set_text("temperature", "150")
    assert document.project is before
    assert "between 0 and 100 °C" in window.message_bar.text()


def test_a_long_project_name_is_shown_from_its_beginning(window, document):
    long_name = "Hollin Ridge treated-water booster, second stage, option B with the new rising main"
    document.apply(replace(document.project, name=long_name), "Rename project")
    window.site_panel.refresh()
    editor = window.site_panel.editor("name")
    assert editor.text() == long_name and editor.cursorPosition() == 0


def test_a_rounded_field_left_unedited_keeps_the_stored_value(window, document):
    window.site_panel.choose("atmosphere_mode", "given")
    stored = document.project.site.atmospheric_pressure_pa
    editor = window.site_panel.editor("atmospheric_pressure")
    assert editor.text() == f"{stored / 1000:.5g}"  # shown in kPa, rounded
    before = document.project
    editor.editingFinished.emit()  # focus passes through without typing
    assert document.project is before


def test_switching_delivery_to_a_pressurised_point_and_back(window, document):
    window.site_panel.choose("delivery_kind", "pressurised")
    delivery = document.project.site.delivery
    assert delivery.kind == "pressurised" and delivery.elevation_m == 180.0
    window.site_panel.set_text("delivery_pressure", "2 bar")
    assert document.project.site.delivery.pressure_pa == pytest.approx(200_000.0)
    document.undo_stack.undo()
    document.undo_stack.undo()
    assert document.project.site.delivery.kind == "tank"


def test_arrangement_fields_in_percent(window, document):
    window.pumps_panel.arrangement_form.set_text("speed_ratio", "92")
    assert document.project.arrangement.speed_ratio == pytest.approx(0.92)
    window.pumps_panel.arrangement_form.set_text("duty_count", "2")
    assert document.project.arrangement.duty_count == 2
    document.recompute_now()
    assert len(window.plot_tabs.head_flow.pump_curve_data(2)[0]) > 0


# ---------------------------------------------------------------------- pumps
PUMP_CSV = """# Invented test data for the window tests.
# rated_speed [rpm] = 2900
flow [L/s], head [m], efficiency [%]
0, 60, 0
10, 58, 45
20, 53, 68
30, 44, 74
40, 31, 66
"""


def test_importing_a_pump_curve_is_one_undo_step(window, document, tmp_path):
    path = tmp_path / "tp40.csv"
    path.write_text(PUMP_CSV, encoding="utf-8")
    before = document.project
    assert window.pumps_panel.import_csv(str(path))
    pump = document.project.duty_pump
    assert (pump.pump_id, pump.rated_speed_rpm, len(pump.flow_m3_s)) == ("tp40", 2900.0, 5)
    assert window.pumps_panel.chooser.currentData() == "tp40"
    assert window.pumps_panel.points_model.rowCount() == 5
    document.undo_stack.undo()
    assert document.project is before


def test_a_pump_file_without_speed_asks_for_it(window, document, tmp_path, monkeypatch):
    path = tmp_path / "nospeed.csv"
    path.write_text(PUMP_CSV.replace("# rated_speed [rpm] = 2900\n", ""), encoding="utf-8")
    monkeypatch.setattr(window.pumps_panel, "ask_rated_speed", lambda name: 1480.0)
    assert window.pumps_panel.import_csv(str(path))
    assert document.project.duty_pump.rated_speed_rpm == 1480.0


def test_a_bad_pump_file_is_refused_with_its_line(window, document, tmp_path):
    path = tmp_path / "bad.csv"
    path.write_text(PUMP_CSV.replace("20, 53, 68", "20, abc, 68"), encoding="utf-8")
    before = document.project
    assert not window.pumps_panel.import_csv(str(path))
    assert document.project is before
    assert "line 6" in window.message_bar.text()


def test_new_pump_and_remove_pump(window, document):
    assert window.pumps_panel.add_example_pump()
    pump = document.project.duty_pump
    assert pump.name.startswith("Example pump")
    assert pump.head_m[2] > 0 and pump.flow_m3_s[2] == document.project.site.design_flow_m3_s
    assert window.pumps_panel.remove_pump()
    assert document.project.duty_pump.pump_id == "BP80"


def test_the_table_context_menu_inserts_moves_and_removes_rows(window, document):
    view = window.pipework.segments_view
    window.pipework.select_segment(0)
    rows_before = len(document.project.segments)
    actions = {a.text(): a for a in view.row_actions() if a is not None}
    assert not actions["Move segment up"].isEnabled()
    actions["Insert segment below"].trigger()
    assert len(document.project.segments) == rows_before + 1 and view.current_row() == 1
    inserted = document.project.segments[1]
    actions = {a.text(): a for a in view.row_actions() if a is not None}
    actions["Move segment down"].trigger()
    assert document.project.segments[2] == inserted and view.current_row() == 2
    actions = {a.text(): a for a in view.row_actions() if a is not None}
    actions["Remove segment"].trigger()
    assert inserted not in document.project.segments
    assert document.undo_stack.count() == 3
