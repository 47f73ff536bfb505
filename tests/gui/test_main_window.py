"""The main window: what it shows, its actions and menus, the unit switch, findings that
point at their cause, and the edit-to-redraw timing hook."""

from __future__ import annotations

from pathlib import Path

import pytest
from PySide6.QtCore import QEvent, Qt
from PySide6.QtGui import QHelpEvent, QKeySequence
from PySide6.QtWidgets import QApplication, QToolTip

from app import settings
from app.panels.table_view import MAX_COLUMN_WIDTH
from app.results.checks_panel import ChecksPanel
from app.results.operating_points_table import OperatingPointsTable
from benchmarks.redraw_timing import measure_edit_to_redraw
from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.results import Finding
from hydraulics.units import to_display

EDIT = Qt.ItemDataRole.EditRole
MANIFOLD = 4  # the hilltop sample's DN 200 discharge manifold (no reducer or expander on it)


def _menu_texts(window) -> dict[str, list[str]]:
    out = {}
    for action in window.menuBar().actions():
        menu = action.menu()
        out[action.text().replace("&", "")] = [a.text().replace("&", "") for a in menu.actions() if a.text()]
    return out


def test_the_window_shows_inputs_plots_results_and_the_cautions(window):
    tabs = [window.input_tabs.tabText(i).replace("&&", "&") for i in range(window.input_tabs.count())]
    assert tabs == ["Site & fluid", "Pipework", "Pumps", "Criteria", "Duty"]
    assert window.plot_tabs.head_flow is not None
    assert isinstance(window.checks_panel, ChecksPanel)
    assert isinstance(window.points_table, OperatingPointsTable)
    assert window.points_table.model().rowCount() > 0
    assert window.cautions.text() == CAUTIONS_TEXT
    window.show()
    assert window.cautions.isVisible()
    for tab in range(window.input_tabs.count()):
        window.input_tabs.setCurrentIndex(tab)
        assert window.cautions.isVisible()  # whatever panel is open


def test_menus_offer_the_commands_with_standard_shortcuts(window):
    menus = _menu_texts(window)
    assert menus["File"] == ["New", "Open…", "Open sample", "Open recent", "Save", "Save As…", "Export", "Quit"]
    assert menus["Edit"][:2] == ["Undo", "Redo"] and "Paste" in menus["Edit"]
    assert "Larger pipe size" in menus["Edit"] and "Pin curves" in menus["View"]
    assert menus["Help"] == ["Methods and references", "Keyboard shortcuts", "About PumpSketch"]
    for key, standard in (("new", QKeySequence.StandardKey.New), ("open", QKeySequence.StandardKey.Open),
                          ("save", QKeySequence.StandardKey.Save), ("save_as", QKeySequence.StandardKey.SaveAs),
                          ("undo", QKeySequence.StandardKey.Undo), ("redo", QKeySequence.StandardKey.Redo),
                          ("copy", QKeySequence.StandardKey.Copy), ("paste", QKeySequence.StandardKey.Paste),
                          ("quit", QKeySequence.StandardKey.Quit)):
        assert window.named_actions[key].shortcut() == QKeySequence(standard), key


def test_no_two_actions_share_a_shortcut(window):
    seen = {}
    for key, action in window.named_actions.items():
        shortcut = action.shortcut().toString()
        if shortcut:
            assert shortcut not in seen, (key, seen.get(shortcut))
            seen[shortcut] = key


def test_undo_and_redo_actions_follow_the_stack(window):
    model = window.pipework.segments_model
    assert not window.named_actions["undo"].isEnabled()
    assert model.setData(model.index(0, model.column_index("length")), "10", EDIT)
    assert window.named_actions["undo"].isEnabled()
    assert window.named_actions["undo"].text().replace("&", "") == \
        "Undo Edit length of segment 1 'Tank outlet and suction header'"
    window.named_actions["undo"].trigger()
    assert window.document.project.segments[0].length_m == 6.0  # the sample's 6 m suction header
    window.named_actions["redo"].trigger()
    assert window.document.project.segments[0].length_m == 10.0


@pytest.mark.qt_log_ignore(r"This plugin does not support raise\(\)")  # the offscreen tooltip window
def test_tool_bar_undo_button_names_the_step_in_its_tooltip(window):
    model = window.pipework.segments_model
    button = window.toolbar.widgetForAction(window.named_actions["undo_button"])
    assert model.setData(model.index(0, model.column_index("length")), "10", EDIT)
    window.show()
    center = button.rect().center()
    event = QHelpEvent(QEvent.Type.ToolTip, center, button.mapToGlobal(center))
    QApplication.sendEvent(button, event)
    assert QToolTip.text() == "Undo Edit length of segment 1 'Tank outlet and suction header'"
    assert window.named_actions["undo_button"].text() == "Undo"  # the button's label never changes per edit


def test_help_lists_the_shortcuts_and_about_carries_the_cautions(window, dialogs):
    window.show_shortcuts()
    title, text = dialogs.information[-1]
    assert title == "Keyboard shortcuts"
    assert "Larger pipe size" in text and "Ctrl+Up" in text and "Ctrl+Down" in text
    window.show_about()
    assert CAUTIONS_TEXT in dialogs.information[-1][1]
    window.show_methods()
    assert window._help_dialog.isVisible()
    assert "Methods and references" in window._help_dialog.page.toPlainText()
    window._help_dialog.close()


def test_pin_and_clear_pinned_curves(window):
    window.named_actions["pin"].trigger()
    assert window.plot_tabs.has_snapshot
    window.named_actions["clear_pin"].trigger()
    assert not window.plot_tabs.has_snapshot


# ---------------------------------------------------------------------- units
def test_the_unit_switch_applies_everywhere_and_is_remembered(window, make_window):
    stored = window.document.project
    window.units_combo.activated.emit(window.units_combo.findData("US"))
    assert window.document.unit_system == "US"
    assert window.plot_tabs.head_flow.unit_system == "US"
    assert [a.isChecked() for a in window.units_group.actions()] == [False, True]
    model = window.pipework.segments_model
    header = model.headerData(model.column_index("length"), Qt.Orientation.Horizontal)
    assert header == "Length\n[ft]"
    # 35 L/s = 0.035 m³/s ÷ 3.785411784 L/gal × 60 s/min = 554.76 gpm (NIST SP 811 gallon), shown to
    # whole gpm (common practice, hydraulics.number_format.US_CUSTOMARY_PRECISION).
    assert window.site_panel.editor("design_flow").text() == "555"
    flows, _heads = window.plot_tabs.head_flow.curve_data("max", "new")
    expected = to_display(window.document.solution.curve("max", "new").flow_m3_s, "flow", "US")
    assert flows[-1] == pytest.approx(expected[-1])
    assert window.document.project is stored
    assert settings.unit_system() == "US"
    assert make_window(None).document.unit_system == "SI"  # the fixture fixes SI; a default window:
    from app.main_window import MainWindow

    remembered = MainWindow(remember_layout=False)
    try:
        assert remembered.document.unit_system == "US"
    finally:
        remembered.deleteLater()


def test_us_units_leave_no_si_unit_in_the_checks_or_the_operating_points(window):
    """Every quoted value of the checks and of the rows without a point is shown in US units."""
    from dataclasses import replace

    document = window.document
    project = document.project
    # The delivery tank 40 m higher (invented): a static head of 108 m at most, above the pump's
    # shut-off head of about 103 m, so there is no point at the maximum static head, and variable
    # speed cannot reach the design flow.
    tank = project.site.delivery
    site = replace(project.site, delivery=replace(tank, level_low_m=tank.level_low_m + 40.0,
                                                  level_high_m=tank.level_high_m + 40.0))
    assert document.apply(replace(project, site=site), "raise the delivery tank")
    window.set_unit_system("US")
    solution = document.recompute_now()
    codes = {f.code for f in solution.findings}
    assert {"no_operating_point", "speed_target_unreachable"} <= codes
    texts = [window.checks_panel.model.item(g).child(r, 0).text()
             for g in range(window.checks_panel.model.rowCount())
             for r in range(window.checks_panel.model.item(g).rowCount())]
    table = window.points_table.model()
    texts += [str(table.index(r, c).data() or "") for r in range(table.rowCount()) for c in range(table.columnCount())]
    assert any("gpm" in t for t in texts) and any(" ft" in t for t in texts)
    for text in texts:
        assert not any(unit in text for unit in ("L/s", " m ", " m,", " m)", " m.", "m/s", "kPa")), text


def test_the_unit_switch_widens_table_columns_to_the_converted_values(window):
    view = window.pumps_panel.points_view
    model = view.model()
    window.units_combo.activated.emit(window.units_combo.findData("US"))
    metrics = view.fontMetrics()
    for column in range(model.columnCount()):
        texts = [str(model.index(row, column).data() or "") for row in range(model.rowCount())]
        widest = max(metrics.horizontalAdvance(text) for text in texts)
        assert view.columnWidth(column) >= min(widest, MAX_COLUMN_WIDTH), model.headerData(
            column, Qt.Orientation.Horizontal)


def test_the_view_menu_radio_actions_switch_units(window):
    us = next(a for a in window.units_group.actions() if a.data() == "US")
    us.trigger()
    assert window.document.unit_system == "US"
    assert window.units_combo.currentData() == "US"


# ---------------------------------------------------------------------- findings point at their cause
def _click_finding(qtbot, window, wanted) -> None:
    panel = window.checks_panel
    position = next(i for i, f in enumerate(panel.findings) if wanted(f))
    index = panel.index_of_finding(position)
    panel.view.scrollTo(index)
    rect = panel.view.visualRect(index)
    qtbot.mouseClick(panel.view.viewport(), Qt.MouseButton.LeftButton, pos=rect.center())


def test_clicking_a_segment_finding_selects_its_row(window, qtbot):
    model = window.pipework.segments_model
    assert model.setData(model.index(MANIFOLD, model.column_index("internal_diameter")), "80 mm", EDIT)
    window.document.recompute_now()
    window.input_tabs.setCurrentIndex(0)
    window.pipework.select_segment(0)
    window.show()
    _click_finding(qtbot, window, lambda f: f.target == ("segment", MANIFOLD))
    assert window.input_tabs.tabText(window.input_tabs.currentIndex()) == "Pipework"
    assert window.pipework.current_segment() == MANIFOLD


def test_a_pump_finding_opens_the_pumps_panel(make_window, sample_copies, qtbot):
    # the river intake sample's pump finding: its suction specific speed is high for the default NPSH margin
    window = make_window(sample_copies / "river_intake.pumpsketch.json")
    window.show()
    _click_finding(qtbot, window, lambda f: f.target == ("pump", "RW250"))
    assert window.input_tabs.tabText(window.input_tabs.currentIndex()) == "Pumps"


def test_a_scenario_finding_selects_its_operating_point_row(make_window, sample_copies, qtbot):
    # the river intake sample as built: one pump alone at the least static head (tank low 68 m - river high
    # 53 m = 15 m, levels from the file) runs at about 146 % of its best-efficiency flow in its solve, outside
    # the allowable 40-130 %; the sewage sample's duties as built all lie in the preferred region
    window = make_window(sample_copies / "river_intake.pumpsketch.json")
    window.show()
    window.document.recompute_now()
    finding = next(f for f in window.document.solution.findings if f.target and f.target[0] == "scenario")
    assert finding.code == "outside_allowable" and finding.target[1] == ("min", "new", 1, 1.0)
    _click_finding(qtbot, window, lambda f: f is finding)
    rows = window.points_table.selectionModel().selectedRows()
    assert len(rows) == 1
    point = window.points_table.points_model.point(rows[0].row())
    assert (point.static, point.pipe, point.pumps_running, point.speed_ratio) == finding.target[1]


def test_a_site_finding_opens_the_site_panel_at_its_field(window):
    finding = Finding("warning", "test_only", "made up for the test", "site", target=("site", "pump_datum"))
    window.checks_panel.findingActivated.emit(finding.target)
    assert window.input_tabs.tabText(window.input_tabs.currentIndex()) == "Site && fluid"


# ---------------------------------------------------------------------- timing hook
def test_measure_edit_to_redraw_times_real_edits_and_leaves_the_project(window):
    before = window.document.project
    window.show()
    timings = measure_edit_to_redraw(window, n=4)
    assert len(timings.plot_ms) == len(timings.window_ms) == 4
    assert all(0 < plot <= whole for plot, whole in zip(timings.plot_ms, timings.window_ms, strict=True))
    assert all(0 < solve < plot for solve, plot in zip(timings.solve_ms, timings.plot_ms, strict=True))
    assert window.document.project == before


def test_the_main_window_module_stays_an_assembler():
    source = Path(__import__("app.main_window").main_window.__file__).read_text(encoding="utf-8")
    assert len(source.splitlines()) < 420  # an assembler: no panel, plot or hydraulics code of its own
