"""The checks panel and the operating-points table show the solution faithfully."""

from __future__ import annotations

import pytest
from PySide6.QtCore import QModelIndex, Qt
from PySide6.QtGui import QImage

from app.results.checks_panel import ChecksPanel
from app.results.operating_points_table import (
    COLUMNS,
    FIRST_VALUE_COLUMN,
    SI_VALUE_ROLE,
    OperatingPointsModel,
    OperatingPointsTable,
)
from hydraulics.number_format import readout_number

try:
    from .display_fakes import make_solution, sample_findings
except ImportError:  # tests/gui is not a package
    from display_fakes import make_solution, sample_findings

# The offscreen platform warns whenever a top-level widget with a layout is shown; the
# message says nothing about our widgets, so only that one message is let through.
pytestmark = pytest.mark.qt_log_ignore(r"This plugin does not support propagateSizeHints\(\)")

# Exact definitions (NIST SP 811, Appendix B): 1 US gal = 3.785411784 L; 1 ft = 0.3048 m;
# 1 hp = 550 ft·lbf/s = 550 × 0.3048 × 0.45359237 × 9.80665 W.
US_GALLON_M3 = 3.785411784e-3
HORSEPOWER_W = 550 * 0.3048 * 0.45359237 * 9.80665


def _column(title_start: str) -> int:
    return next(i for i, c in enumerate(COLUMNS) if c.title.startswith(title_start))


# --------------------------------------------------------------------------- checks panel
@pytest.fixture
def checks(qtbot) -> ChecksPanel:
    panel = ChecksPanel()
    qtbot.addWidget(panel)
    panel.resize(900, 320)
    return panel


def test_findings_grouped_by_severity_with_counts(checks):
    checks.show_findings(sample_findings(), "SI")
    assert checks.group_titles() == ["Critical (1)", "Warning (2)", "Information (1)"]
    warning_group = checks.model.item(1, 0)
    assert warning_group.rowCount() == 2
    messages = [warning_group.child(r, 0).text() for r in range(2)]
    assert messages == ["Velocity 2.9 m/s is above the maximum 2.5 m/s.", "Runs at 135 % of best-efficiency flow."]
    assert warning_group.child(0, 1).text() == "segment 'Rising main' (delivery)"
    assert warning_group.child(0, 2).text() == "Try a larger diameter."
    assert "Remedy: Try a larger diameter." in warning_group.child(0, 0).toolTip()


def test_clicking_a_finding_emits_its_target(checks, qtbot):
    findings = sample_findings()
    checks.show_findings(findings, "SI")
    checks.show()
    qtbot.waitExposed(checks)
    for position, finding in enumerate(findings):
        index = checks.index_of_finding(position)
        assert index.isValid()
        rect = checks.view.visualRect(index)
        with qtbot.waitSignal(checks.findingActivated, timeout=1000) as blocker:
            qtbot.mouseClick(checks.view.viewport(), Qt.MouseButton.LeftButton, pos=rect.center())
        assert blocker.args == [finding.target]


def test_keyboard_activation_emits_the_target(checks, qtbot):
    findings = sample_findings()
    checks.show_findings(findings, "SI")
    checks.show()
    qtbot.waitExposed(checks)
    checks.view.setFocus()
    checks.view.setCurrentIndex(checks.index_of_finding(3))
    with qtbot.waitSignal(checks.findingActivated, timeout=1000) as blocker:
        qtbot.keyClick(checks.view, Qt.Key.Key_Return)
    assert blocker.args == [("site", "suction")]


def test_group_header_emits_nothing(checks, qtbot):
    checks.show_findings(sample_findings(), "SI")
    checks.show()
    qtbot.waitExposed(checks)
    header = checks.model.index(0, 0)
    with qtbot.assertNotEmitted(checks.findingActivated, wait=50):
        qtbot.mouseClick(checks.view.viewport(), Qt.MouseButton.LeftButton,
                         pos=checks.view.visualRect(header).center())


def test_empty_findings_say_so(checks):
    assert checks.model.item(0, 0).text() == "No results yet."
    checks.show_findings((), "SI")
    assert checks.group_titles() == []
    assert checks.model.item(0, 0).text() == "Every check passed: no findings."
    checks.show_findings(sample_findings()[1:2], "US")
    assert checks.group_titles() == ["Warning (1)"]


# --------------------------------------------------------------------------- operating points
def test_model_passes_qtmodeltester(qtmodeltester):
    model = OperatingPointsModel()
    qtmodeltester.check(model)
    model.show_solution(make_solution(duty_count=2, unfound=(("max", "aged", 1),)), "SI")
    qtmodeltester.check(model)
    model.show_solution(None, "US")
    qtmodeltester.check(model)


def test_one_row_per_scenario_and_pumps_running_in_order():
    model = OperatingPointsModel()
    model.show_solution(make_solution(duty_count=2), "SI")
    assert model.rowCount() == 8  # 2 static × 2 pipe × 2 pump counts
    scenarios = [(model.data(model.index(r, 0)), model.data(model.index(r, 1))) for r in range(8)]
    assert scenarios[:2] == [("max static · aged pipe", "1"), ("max static · aged pipe", "2")]
    assert scenarios[-1] == ("min static · new pipe", "2")


@pytest.mark.parametrize("unit_system", ["SI", "US"])
def test_values_shown_in_display_units(unit_system):
    solution = make_solution(duty_count=2)
    model = OperatingPointsModel()
    model.show_solution(solution, unit_system)
    row = 1  # max static, aged pipe, 2 pumps
    point = model.point(row)
    assert (point.static, point.pipe, point.pumps_running) == ("max", "aged", 2)
    flow_factor = 1000.0 if unit_system == "SI" else 60.0 / US_GALLON_M3
    head_factor = 1.0 if unit_system == "SI" else 1.0 / 0.3048
    power_factor = 1e-3 if unit_system == "SI" else 1.0 / HORSEPOWER_W
    # 1 kWh/m³ = 3.785411784 kWh per 1000 US gal (1 kgal = 3.785411784 m³)
    energy_factor = 1.0 if unit_system == "SI" else 3.785411784

    def shown(title: str) -> str:
        return model.data(model.index(row, _column(title)))

    assert shown("Flow") == readout_number(point.flow_m3_s * flow_factor)
    assert shown("Flow per") == readout_number(point.flow_per_pump_m3_s * flow_factor)
    assert shown("Head") == readout_number(point.head_m * head_factor)
    assert shown("Efficiency") == readout_number(point.efficiency * 100.0, 3, 1)
    assert shown("Shaft power") == readout_number(point.shaft_power_total_w * power_factor)
    assert shown("Input power") == readout_number(point.input_power_w * power_factor)
    assert shown("Specific") == readout_number(point.specific_energy_kwh_m3 * energy_factor, 3, 4)
    assert shown("NPSH\navailable") == readout_number(point.npsh_available_m * head_factor)
    assert shown("NPSH\nmargin") == readout_number(point.npsh_margin_m * head_factor)
    assert shown("NPSH\nratio") == readout_number(point.npsh_margin_ratio, 3, 2)
    assert shown("Share of") == readout_number(point.bep_flow_ratio * 100.0, 3, 0)
    assert shown("Speed") == "100"
    assert shown("Extrapolated") == "no"
    # the stored value stays SI behind the display
    assert model.data(model.index(row, _column("Flow")), SI_VALUE_ROLE) == point.flow_m3_s


def test_headers_carry_units_on_a_second_line():
    model = OperatingPointsModel()
    model.show_solution(make_solution(), "SI")
    header = [model.headerData(c, Qt.Orientation.Horizontal) for c in range(model.columnCount())]
    assert header[_column("Flow")] == "Flow\nL/s"
    assert header[_column("Head")] == "Head\nm"
    assert header[_column("Shaft power")] == "Shaft power\ntotal\nkW"
    assert header[_column("Specific")] == "Specific\nenergy\nkWh/m³"
    assert header[_column("Efficiency")] == "Efficiency\n%"
    model.show_solution(make_solution(), "US")
    assert model.headerData(_column("Flow"), Qt.Orientation.Horizontal) == "Flow\ngpm"
    assert model.headerData(_column("Head"), Qt.Orientation.Horizontal) == "Head\nft"
    assert model.headerData(_column("Input power"), Qt.Orientation.Horizontal) == "Input power\nhp"


def test_rows_without_a_point_show_the_reason(qtbot):
    table = OperatingPointsTable()
    qtbot.addWidget(table)
    table.show_solution(make_solution(duty_count=2, unfound=(("max", "aged", 1),)), "SI")
    model = table.points_model
    assert not model.is_found(0)
    assert model.data(model.index(0, FIRST_VALUE_COLUMN)) == "No operating point: pump curve below system curve"
    assert model.data(model.index(0, FIRST_VALUE_COLUMN + 1)) == ""
    assert table.columnSpan(0, FIRST_VALUE_COLUMN) == len(COLUMNS) - FIRST_VALUE_COLUMN
    assert table.columnSpan(1, FIRST_VALUE_COLUMN) == 1
    assert model.data(model.index(0, 0)) == "max static · aged pipe"


def test_table_is_read_only():
    model = OperatingPointsModel()
    model.show_solution(make_solution(), "SI")
    index = model.index(0, _column("Flow"))
    assert not model.flags(index) & Qt.ItemFlag.ItemIsEditable
    assert model.setData(index, "99") is False
    assert model.flags(QModelIndex()) == Qt.ItemFlag.NoItemFlags


def test_panels_render_to_png(qtbot, tmp_path):
    checks = ChecksPanel()
    table = OperatingPointsTable()
    for widget in (checks, table):
        qtbot.addWidget(widget)
    checks.show_findings(sample_findings(), "SI")
    table.show_solution(make_solution(duty_count=2), "SI")
    checks.resize(900, 260)
    table.resize(1300, 320)
    for name, widget in (("checks", checks), ("points", table)):
        widget.show()
        qtbot.waitExposed(widget)
        path = tmp_path / f"{name}.png"
        assert widget.grab().save(str(path))
        image = QImage(str(path))
        assert not image.isNull() and image.width() >= 800


def test_checks_panel_states_quoted_values_in_the_unit_system(qtbot):
    from app.results.checks_panel import ChecksPanel
    from hydraulics.results import finding

    panel = ChecksPanel()
    qtbot.addWidget(panel)
    item = finding("warning", "velocity_high", "Velocity {v} is above the maximum {limit}.",
                   {"v": (3.048, "velocity"), "limit": (2.5, "velocity")}, "segment 'main'")
    panel.show_findings([item], "US")
    model = panel.model
    shown = [model.index(child, 0, model.index(row, 0)).data()
             for row in range(model.rowCount()) for child in range(model.rowCount(model.index(row, 0)))]
    # 3.048 m/s = 10 ft/s exactly (1 ft = 0.3048 m, NIST SP 811)
    assert shown == ["Velocity 10.00 ft/s is above the maximum 8.20 ft/s."]


def test_checks_panel_rewrites_texts_and_targets_when_the_groups_stay_the_same(qtbot):
    from hydraulics.results import finding

    panel = ChecksPanel()
    qtbot.addWidget(panel)

    def velocity(v, where, target):
        return finding("warning", "velocity_high", "Velocity {v} is above the maximum {limit}.",
                       {"v": (v, "velocity"), "limit": (2.5, "velocity")}, where, target=target)

    panel.show_findings([velocity(3.0, "segment 'a'", ("segment", 0))], "SI")
    panel.show_findings([velocity(2.8, "segment 'b'", ("segment", 1))], "SI")  # same group, same count
    assert panel.group_titles() == ["Warning (1)"]
    cell = panel.model.item(0, 0).child(0, 0)
    # 2.8 and 2.5 are the invented values of this test, shown to two decimals
    assert cell.text() == "Velocity 2.80 m/s is above the maximum 2.50 m/s."
    assert panel.model.item(0, 0).child(0, 1).text() == "segment 'b'"
    assert "Check: velocity_high" in cell.toolTip()
    with qtbot.waitSignal(panel.findingActivated, timeout=1000) as blocker:
        panel.view.activated.emit(panel.index_of_finding(0))
    assert blocker.args == [("segment", 1)]
    panel.show_findings([velocity(3.0, "segment 'a'", ("segment", 0))] * 2, "SI")  # the count changes
    assert panel.group_titles() == ["Warning (2)"]
    panel.show_findings((), "SI")
    assert panel.model.item(0, 0).text() == "Every check passed: no findings."


def test_checks_panel_follows_groups_that_come_and_go_without_a_rebuild(qtbot):
    from hydraulics.results import finding

    panel = ChecksPanel()
    qtbot.addWidget(panel)

    def item(severity, code, n):  # invented messages of this test
        return finding(severity, code, f"{code} number {n}.", {}, f"place {n}", target=("segment", n))

    panel.show_findings([item("warning", "w", 1)], "SI")
    warning_group = panel.model.item(0, 0)
    panel.show_findings([item("critical", "c", 2), item("warning", "w", 3), item("warning", "w", 4),
                         item("info", "i", 5)], "SI")
    assert panel.group_titles() == ["Critical (1)", "Warning (2)", "Information (1)"]
    assert panel.model.item(1, 0) is warning_group  # the warning group stayed; the others came in around it
    for row in range(3):
        index = panel.model.index(row, 0)
        assert panel.view.isExpanded(index) and panel.view.isFirstColumnSpanned(row, QModelIndex())
    assert [warning_group.child(r, 0).text() for r in range(2)] == ["w number 3.", "w number 4."]
    assert panel.model.item(2, 0).child(0, 1).text() == "place 5"

    panel.show_findings([item("info", "i", 6)], "SI")  # critical and warning go, information stays
    assert panel.group_titles() == ["Information (1)"]
    assert panel.model.rowCount() == 1 and panel.model.item(0, 0).child(0, 0).text() == "i number 6."
    with qtbot.waitSignal(panel.findingActivated, timeout=1000) as blocker:
        panel.view.activated.emit(panel.index_of_finding(0))
    assert blocker.args == [("segment", 6)]

    panel.show_findings((), "SI")
    panel.show_findings([item("warning", "w", 7)], "SI")  # from the placeholder back to a group
    assert panel.group_titles() == ["Warning (1)"] and panel.model.rowCount() == 1
