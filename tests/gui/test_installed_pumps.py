"""The installed-pumps table on the Pumps panel, and the pump sets in the operating points and on the plot."""

from __future__ import annotations

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QAbstractItemView, QComboBox

from app.results.operating_points_table import COLUMNS, SI_VALUE_ROLE
from app.table_models.installed_pumps import InstalledPumpsModel
from hydraulics.results import PumpSetPoint, PumpShare
from tests.installed_pump_fakes import hilltop, jp40, with_assist, with_model, write

EDIT = Qt.ItemDataRole.EditRole
pytestmark = pytest.mark.qt_log_ignore(r"This plugin does not support propagateSizeHints\(\)")


def _cell(model, row: int, key: str):
    return model.index(row, model.column_index(key))


def _set_rows(window) -> list[tuple[str, str]]:
    """(pumps running or pump, scenario text) of the pump-set rows and their pumps' rows."""
    model = window.points_table.points_model
    return [(model.data(model.index(r, 1)), model.data(model.index(r, 0))) for r in range(model.rowCount())
            if not model.point(r)]


@pytest.fixture
def with_jockey_model(tmp_path, make_window):
    """A window on the hilltop sample with the invented JP40 as a second pump model, not installed yet."""
    return make_window(write(with_model(hilltop(), jp40()), tmp_path / "two_models.pumpsketch.json"))


def test_the_table_lists_the_arrangement_pumps_read_only(with_jockey_model):
    model = with_jockey_model.pumps_panel.installed_model
    assert model.rowCount() == 2
    assert [model.data(_cell(model, r, "tag")) for r in range(2)] == ["P1", "P2"]
    assert [model.data(_cell(model, r, "role")) for r in range(2)] == ["Duty", "Standby"]
    assert model.data(_cell(model, 1, "control")) == "Variable speed"
    assert not model.flags(_cell(model, 0, "speed_ratio")) & Qt.ItemFlag.ItemIsEditable
    assert not model.setData(_cell(model, 0, "speed_ratio"), "90", EDIT)
    assert with_jockey_model.document.project.other_pumps == ()


def test_adding_a_pump_by_a_cell_edit_shows_its_set_and_undo_removes_it(with_jockey_model, qtbot):
    window, document = with_jockey_model, with_jockey_model.document
    panel = window.pumps_panel
    window.input_tabs.setCurrentIndex(2)
    window.show()
    qtbot.mouseClick(panel.add_installed_button, Qt.MouseButton.LeftButton)
    assert [(p.pump_id, p.role) for p in document.project.other_pumps] == [("JP40", "assist")]
    # a real edit in the cell's drop-down: the new pump P3 becomes a second duty pump
    view, model = panel.installed_view, panel.installed_model
    index = _cell(model, 2, "role")
    view.setCurrentIndex(index)
    view.edit(index)
    editor = view.indexWidget(index)
    assert isinstance(editor, QComboBox)
    editor.setCurrentIndex(editor.findData("duty"))
    editor.activated.emit(editor.currentIndex())
    qtbot.waitUntil(lambda: view.state() != QAbstractItemView.State.EditingState, timeout=2000)
    assert document.project.other_pumps[0].role == "duty"
    assert model.data(_cell(model, 2, "tag")) == "P3"
    assert model.data(_cell(model, 2, "model")) == "JP40 jockey (invented)"
    document.recompute_now()
    rows = _set_rows(window)
    assert ("P1+P3", "max static · aged pipe") in rows
    assert any(text.strip() == "P3  JP40 jockey (invented), duty" for _, text in rows)
    assert any(text.strip() == "P1  BP80 booster (invented), duty" for _, text in rows)
    # every pump's flow, head, efficiency and power is on its row, as the engine solved it
    table = window.points_table.points_model
    row = next(r for r in range(table.rowCount()) if isinstance(table.row_item(r), PumpShare)
               and table.row_item(r).tag == "P3")
    share = table.row_item(row)
    for title, value in (("Flow per", share.flow_m3_s), ("Head", share.head_m), ("Efficiency", share.efficiency),
                         ("Input power", share.input_power_w)):
        column = next(i for i, c in enumerate(COLUMNS) if c.title.startswith(title))
        assert table.data(table.index(row, column), SI_VALUE_ROLE) == value
        assert table.data(table.index(row, column)) not in ("", "—")
    # the ordinary row of one pump names its pump
    ordinary = next(r for r in range(table.rowCount()) if table.point(r) is not None)
    assert table.data(table.index(ordinary, 1)) == "P1"
    document.undo_stack.undo()
    assert document.project.other_pumps[0].role == "assist"
    document.undo_stack.undo()
    assert document.project.other_pumps == ()
    document.recompute_now()
    assert _set_rows(window) == []
    assert model.rowCount() == 2


def test_bad_input_is_refused_with_the_field_and_range_and_the_model_unchanged(make_window, tmp_path):
    window = make_window(write(with_assist(hilltop(), jp40()), tmp_path / "assisted.pumpsketch.json"))
    document, model = window.document, window.pumps_panel.installed_model
    before = document.project
    assert not model.setData(_cell(model, 2, "speed_ratio"), "150", EDIT)
    assert "Speed: must be between 20 and 120 %; got 150" in window.message_bar.text()
    assert window.message_bar.text().startswith("Pump P3 — ")
    assert not model.setData(_cell(model, 2, "motor_efficiency"), "5 %", EDIT)
    assert "Motor efficiency: must be between 10 and 100 %" in window.message_bar.text()
    assert not model.setData(_cell(model, 2, "model"), "no such pump", EDIT)
    assert "Model: 'no such pump' is not one of the choices" in window.message_bar.text()
    # the lowest speed of a variable-speed pump may not lie above its speed (the project's rules)
    assert model.setData(_cell(model, 2, "control"), "Variable speed", EDIT)
    switched = document.project
    assert not model.setData(_cell(model, 2, "min_speed_ratio"), "110", EDIT)
    assert "other_pumps[0].min_speed_ratio" in window.message_bar.text()
    assert document.project is switched
    document.undo_stack.undo()
    assert document.project is before
    assert not model.remove_rows([0])
    assert "Cannot remove P1" in window.message_bar.text() and document.project is before


def test_without_an_arrangement_the_table_says_so_and_adding_is_off(make_window):
    window = make_window(None)
    panel = window.pumps_panel
    assert window.document.project.arrangement is None
    assert panel.installed_model.rowCount() == 0
    assert not panel.add_installed_button.isEnabled()
    assert panel.no_arrangement_label.isVisibleTo(panel) and not panel.installed_view.isVisibleTo(panel)
    assert not panel.installed_model.insert_row(0)
    assert "no pump arrangement" in window.message_bar.text()


def test_the_model_passes_qtmodeltester(qtmodeltester, make_window, tmp_path):
    window = make_window(write(with_assist(hilltop(), jp40()), tmp_path / "assisted.pumpsketch.json"))
    qtmodeltester.check(window.pumps_panel.installed_model)
    assert isinstance(window.pumps_panel.installed_model, InstalledPumpsModel)


def test_a_pasted_row_adds_an_installed_pump_in_one_step(with_jockey_model):
    document, model = with_jockey_model.document, with_jockey_model.pumps_panel.installed_model
    depth = document.undo_stack.count()
    left = model.column_index("model")
    assert model.paste_block(2, left, [["JP40 jockey (invented)", "Standby", "Fixed speed", "95"]])
    (pump,) = document.project.other_pumps
    assert (pump.pump_id, pump.role, pump.variable_speed) == ("JP40", "standby", False)
    assert pump.speed_ratio == pytest.approx(0.95)  # 95 % typed
    assert document.undo_stack.count() == depth + 1


def test_the_plot_draws_each_set_and_labels_its_points_by_the_pumps_running(make_window, tmp_path):
    window = make_window(write(with_assist(hilltop(), jp40()), tmp_path / "assisted.pumpsketch.json"))
    plot = window.plot_tabs.head_flow
    solution = window.document.solution
    curve = solution.pump_set_curves.curves[0]
    x, y = plot.pump_set_curve_data("P1+P3")
    assert x.size == curve.flow_m3_s.size
    assert x == pytest.approx(curve.flow_m3_s * 1000.0) and y == pytest.approx(curve.head_m)  # SI: L/s, m
    names = plot.legend_names()
    assert "Pumps at the manifold: P1+P3 (different models)" in names
    assert "Pumps at the manifold: 1 pump (P1)" in names
    labels = [label for _, _, label in plot.marked_points()]
    assert "P1+P3 · max static · aged" in labels and "1 pump · max static · aged" in labels
    point = next(p for p in solution.pump_set.points if isinstance(p, PumpSetPoint)
                 and (p.static, p.pipe, p.speed, p.basis) == ("max", "aged", "highest speed", "run sequence"))
    marked = next((fx, fy) for fx, fy, label in plot.marked_points() if label == "P1+P3 · max static · aged")
    assert marked == pytest.approx((point.flow_m3_s * 1000.0, point.manifold_head_m))


def test_a_motor_rating_typed_for_a_pump_beside_the_arrangement_is_checked_in_the_findings(make_window, tmp_path):
    window = make_window(write(with_assist(hilltop(), jp40()), tmp_path / "assisted.pumpsketch.json"))
    document, model = window.document, window.pumps_panel.installed_model
    document.recompute_now()
    motor = document.solution.pump_set.motors[0].motor
    assert motor.rating_w is None and motor.max_shaft_power_at_points_w is not None
    typed = f"{0.5 * motor.max_shaft_power_at_points_w / 1000.0:.2f}"  # half the shaft power at its points, kW
    assert model.setData(_cell(model, 2, "motor_rating_w"), f"{typed} kW", EDIT)
    assert document.project.other_pumps[0].motor_rating_w == pytest.approx(float(typed) * 1000.0, rel=1e-12)
    document.recompute_now()
    overload = [f for f in document.solution.findings if f.code == "motor_overload"]
    assert overload and overload[0].where.startswith("pump P3")
    assert not model.setData(_cell(model, 2, "service_factor"), "2", EDIT)
    assert "Service factor: must be between 1 and 1.5" in window.message_bar.text()
    document.undo_stack.undo()
    assert document.project.other_pumps[0].motor_rating_w is None


def test_a_weak_pump_finding_selects_that_pump_in_the_installed_table(make_window, tmp_path):
    # the JP40 with its heads 30 m lower cannot open its check valve against the booster's manifold head
    window = make_window(write(with_assist(hilltop(), jp40(head_offset_m=-30.0)), tmp_path / "weak.pumpsketch.json"))
    window.document.recompute_now()
    held = next(f for f in window.document.solution.findings if f.code == "pump_held_shut")
    assert held.target == ("installed_pump", 2)  # P3, the third row
    window.focus_target(held.target)
    assert window.input_tabs.tabText(window.input_tabs.currentIndex()) == "Pumps"
    assert window.pumps_panel.installed_view.current_row() == 2
