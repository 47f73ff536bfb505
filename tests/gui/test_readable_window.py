"""A window a reviewer can read: the checks' places, the head–flow plot's labels and legend,
the key result columns, US customary precision, what "trim" and a blank cell mean, and the
pump data's provenance."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest
from PySide6.QtCore import QRect, Qt
from PySide6.QtGui import QColor

from app import style
from app.panels.criteria import SECTIONS as CRITERIA_SECTIONS
from app.panels.pumps import ARRANGEMENT_SECTIONS, pump_source_texts
from app.plots.head_flow_plot import POINT_LABEL_MAX_DISTANCE_PX, HeadFlowPlot
from app.results import operating_points_table
from app.results.checks_panel import FINDING_COLUMN, MAX_ROW_LINES, WHERE_COLUMN, ChecksPanel
from app.results.operating_points_table import COLUMNS as POINT_COLUMNS
from app.table_models import installed_pumps
from app.table_models.fittings import FittingsModel
from app.table_models.installed_pumps import InstalledPumpsModel
from app.table_models.pump_points import PumpPointsModel
from app.table_models.segments import SegmentsModel
from hydraulics import project_edits
from hydraulics.number_format import MISSING, cell_number
from hydraulics.project_io import load_project
from hydraulics.results import Finding
from hydraulics.solve import solve
from hydraulics.units import to_display
from tests.gui.conftest import SAMPLE_DIR

SAMPLES = ("sewage_wet_well", "hilltop_booster", "river_intake")
DISPLAY = Qt.ItemDataRole.DisplayRole
TOOLTIP = Qt.ItemDataRole.ToolTipRole


def _shown_window(make_window, sample_copies, qapp, name: str, units: str = "SI", size=(1600, 1000)):
    window = make_window(sample_copies / f"{name}.pumpsketch.json", units)
    if size is not None:
        window.resize(*size)
    window.show()
    for _ in range(4):
        qapp.processEvents()
    return window


# ---------------------------------------------------------------------- checks panel
def _finding_cells(panel: ChecksPanel, position: int):
    index = panel.index_of_finding(position)
    return index.siblingAtColumn(FINDING_COLUMN), index.siblingAtColumn(WHERE_COLUMN)


@pytest.mark.parametrize("name", SAMPLES)
def test_the_where_of_every_finding_is_in_view_and_in_its_tooltip(make_window, sample_copies, qapp, name):
    window = _shown_window(make_window, sample_copies, qapp, name)
    panel = window.checks_panel
    view = panel.view
    assert view.header().visualIndex(WHERE_COLUMN) == 0  # shown first, before the finding
    assert panel.findings
    for position, finding in enumerate(panel.findings):
        message_cell, where_cell = _finding_cells(panel, position)
        assert where_cell.data(DISPLAY) == finding.where
        assert f"Where: {finding.where}" in message_cell.data(TOOLTIP)
        assert f"Where: {finding.where}" in where_cell.data(TOOLTIP)
        rect = panel.where_rect(position)
        # the whole column lies inside the viewport's width: no sideways scrolling needed
        assert rect.left() >= 0 and rect.right() <= view.viewport().width()
        lines = view.fontMetrics().boundingRect(QRect(0, 0, rect.width() - 18, 10000),
                                                int(Qt.TextFlag.TextWordWrap), finding.where)
        most = view.fontMetrics().lineSpacing() * MAX_ROW_LINES
        # the whole place, or as many lines of it as a row holds (then whole in the tooltip, above)
        assert min(lines.height(), most) <= rect.height(), "the place is cut off"
        message_rect = view.visualRect(message_cell)
        assert message_rect.left() >= rect.right() and message_rect.right() <= view.viewport().width() + 1


def test_two_findings_with_the_same_text_at_different_places_can_be_told_apart(qtbot):
    panel = ChecksPanel()
    qtbot.addWidget(panel)
    panel.resize(420, 300)
    panel.show()
    same = "Velocity 0.45 m/s is below the minimum 0.75 m/s."
    panel.show_findings([
        Finding("warning", "velocity_low", same, "segment 'Rising main' (delivery)", "", ("segment", 4)),
        Finding("warning", "velocity_low", same, "segment 'Outfall main' (delivery)", "", ("segment", 5)),
    ], "SI")
    cells = [_finding_cells(panel, i) for i in range(2)]
    assert cells[0][0].data(DISPLAY) == cells[1][0].data(DISPLAY) == same
    assert cells[0][1].data(DISPLAY) != cells[1][1].data(DISPLAY)
    assert cells[0][0].data(TOOLTIP) != cells[1][0].data(TOOLTIP)
    assert not panel.view.isColumnHidden(WHERE_COLUMN)
    assert all(panel.where_rect(i).right() <= panel.view.viewport().width() for i in range(2))


# ---------------------------------------------------------------------- head–flow plot
def _head_flow(window) -> HeadFlowPlot:
    return window.plot_tabs.head_flow


@pytest.mark.parametrize("units", ["SI", "US"])
@pytest.mark.parametrize("name", SAMPLES)
def test_point_labels_sit_by_their_markers_and_never_overlap(make_window, sample_copies, qapp, name, units):
    window = _shown_window(make_window, sample_copies, qapp, name, units)
    plot = _head_flow(window)
    geometry = plot.point_label_geometry()
    assert len(geometry) >= 4
    boxes = []
    for marker, box in geometry:
        # distance from the marker's centre to the nearest point of its label's box (scene px)
        dx = max(box.left() - marker.x(), 0.0, marker.x() - box.right())
        dy = max(box.top() - marker.y(), 0.0, marker.y() - box.bottom())
        assert np.hypot(dx, dy) <= POINT_LABEL_MAX_DISTANCE_PX
        boxes.append(box)
    for i, a in enumerate(boxes):
        for b in boxes[i + 1:]:
            assert not a.intersected(b).isValid() or a.intersected(b).isEmpty(), "two point labels overlap"
    # the key in the legend gives each number its scenario
    names = plot.legend_names()
    key = plot.point_key()
    assert len(key) == len(geometry) and set(key) <= set(names)
    assert key[0].startswith("1: ")


def test_the_marker_legend_is_on_the_head_flow_tab(make_window, sample_copies, qapp):
    window = _shown_window(make_window, sample_copies, qapp, "sewage_wet_well")
    names = _head_flow(window).legend_names()
    for entry in ("filled marker: new pipe", "hollow marker: aged pipe", "1 pump running", "2 pumps running"):
        assert entry in names


def test_a_pinned_curve_says_what_was_pinned(window, qapp):
    plot = _head_flow(window)
    rising_main = len(window.document.project.segments) - 1
    pinned_size = window.document.project.segments[rising_main].nominal_size
    assert pinned_size == "DN 200"  # the hilltop sample's rising main
    window.pin_curves()
    window.pipework.select_segment(rising_main)
    assert window.larger_pipe()
    window.document.recompute_now()
    qapp.processEvents()
    pinned = [n for n in plot.legend_names() if n.startswith("Pinned")]
    assert len(pinned) == 1
    assert "DN 200" in pinned[0] and "Rising main" in pinned[0]


def test_a_pump_curve_at_reduced_speed_shows_its_speed(qtbot):
    project = load_project(SAMPLE_DIR / "hilltop_booster.pumpsketch.json")
    slowed = project_edits.with_arrangement_changes(project, speed_ratio=0.85)
    plot = HeadFlowPlot()
    qtbot.addWidget(plot)
    plot.show_solution(solve(slowed), "SI")
    assert any(n.endswith("1 pump at 85 % speed") for n in plot.legend_names())
    plot.show_solution(solve(project), "SI")
    assert not any("% speed" in n for n in plot.legend_names())


@pytest.mark.parametrize("name", SAMPLES)
def test_the_pump_curve_reaches_every_duty_point_on_it(make_window, sample_copies, qapp, name):
    window = _shown_window(make_window, sample_copies, qapp, name)
    plot = _head_flow(window)
    solution = window.document.solution
    for curve in solution.pump_curves:
        flows = [p.flow_m3_s for p in solution.operating_points if p.found and p.flow_m3_s is not None
                 and p.pumps_running == curve.pumps_running and abs(p.speed_ratio - curve.speed_ratio) < 1e-9]
        x, _y = plot._pump_items[curve.pumps_running].curve.getData()
        assert float(np.max(x)) >= to_display(max(flows), "flow", "SI") * (1 - 1e-12)


def test_the_river_intake_curve_is_carried_on_to_its_extrapolated_duty_point():
    # In this invented sample one pump at minimum static head runs beyond its tested data
    # (the duty point is flagged as extrapolated); the curve drawn must reach it.
    solution = solve(load_project(SAMPLE_DIR / "river_intake.pumpsketch.json"))
    one = next(c for c in solution.pump_curves if c.pumps_running == 1)
    extrapolated = [p for p in solution.operating_points if p.found and p.pumps_running == 1 and p.extrapolated]
    assert extrapolated
    assert one.flow_m3_s[-1] >= max(p.flow_m3_s for p in extrapolated)


def test_critical_findings_do_not_share_a_system_curve_colour(make_window, sample_copies, qapp):
    window = _shown_window(make_window, sample_copies, qapp, "river_intake")
    plot = _head_flow(window)
    critical = QColor(style.SEVERITY_COLOURS["critical"]).rgb()
    system_colours = {item.opts["pen"].color().rgb() for item in plot._system_items.values()}
    assert len(system_colours) == 2
    assert critical not in system_colours
    # the icon of the critical group is painted in that colour
    icon = style.severity_icon("critical").pixmap(16, 16).toImage()
    assert icon.pixelColor(8, 8).rgb() == critical


# ---------------------------------------------------------------------- operating-points table
def test_the_key_result_columns_are_readable_at_the_default_window_size(make_window, sample_copies, qapp):
    window = _shown_window(make_window, sample_copies, qapp, "sewage_wet_well", size=None)  # 1400 × 900
    assert (window.width(), window.height()) == (1400, 900)
    table = window.points_table
    width = table.viewport().width()
    for title in ("Scenario", "Pumps\nrunning", "Flow", "Head", "Efficiency"):
        column = next(i for i, c in enumerate(POINT_COLUMNS) if c.title == title)
        assert table.columnViewportPosition(column) >= 0
        assert table.columnViewportPosition(column) + table.columnWidth(column) <= width, title
        assert table.columnWidth(column) >= table.sizeHintForColumn(column) or column == 0


def test_blank_and_missing_result_cells_say_what_they_mean():
    assert operating_points_table._blank_meaning(object(), MISSING).startswith(f"{MISSING}: no value")  # type: ignore[arg-type]
    assert operating_points_table._blank_meaning(object(), "12.3") == ""  # type: ignore[arg-type]


# ---------------------------------------------------------------------- US customary precision
def test_us_customary_values_are_rounded_as_an_engineer_writes_them(make_window, sample_copies, qapp):
    # common practice: lengths to 0.1 ft, bores to 0.01 in (hydraulics.number_format.US_CUSTOMARY_PRECISION)
    # 6 m / 0.3048 m/ft = 19.685 ft; 206.6 mm / 25.4 mm/in = 8.134 in (NIST SP 811: 1 ft = 0.3048 m,
    # 1 in = 25.4 mm exactly)
    assert cell_number(6.0 / 0.3048, "length", "US") == "19.7"
    assert cell_number(206.6 / 25.4, "diameter", "US") == "8.13"
    assert cell_number(6.0, "length", "SI") == "6"
    window = _shown_window(make_window, sample_copies, qapp, "hilltop_booster", "US")
    model = window.pipework.segments_model
    for row in range(model.rowCount()):
        for key, decimals in (("length", 1), ("internal_diameter", 2)):
            text = model.data(model.index(row, model.column_index(key)), DISPLAY)
            assert "." not in text or len(text.split(".")[1]) <= decimals, (key, text)
    window.pipework.select_segment(0)  # the tank outlet, DN 200: bore 206.5 mm
    assert window.pipework.size_label.text().startswith("Bore 8.13 in,")


# ---------------------------------------------------------------------- labels and provenance
def test_trim_means_the_reduction_of_impeller_diameter_everywhere():
    fields = [f for section in ARRANGEMENT_SECTIONS for f in section.fields]
    diameter = next(f for f in fields if f.key == "trim_ratio")
    assert "trim" not in diameter.label.lower() and "diameter" in diameter.label.lower()
    assert "5 % trim" in diameter.tooltip
    column = next(c for c in installed_pumps._COLUMNS if c.key == "trim_ratio")
    assert column.title == "Impeller diameter" and "5 % trim" in column.tooltip
    criteria = next(f for s in CRITERIA_SECTIONS for f in s.fields if f.key == "trim_warning_limit")
    assert "trim" in criteria.label.lower() and "reduction" in criteria.tooltip
    # the check states both: the trim (reduction) and the diameter left
    project = load_project(SAMPLE_DIR / "hilltop_booster.pumpsketch.json")
    trimmed = replace(project, arrangement=replace(project.arrangement, trim_ratio=0.8))
    finding = next(f for f in solve(trimmed).findings if f.code == "large_trim")
    assert "Impeller trim of 20 % (diameter 80 % of the tested)" in finding.text("SI")


@pytest.mark.parametrize("model_class", [SegmentsModel, FittingsModel, PumpPointsModel, InstalledPumpsModel])
def test_every_optional_column_says_what_a_blank_cell_means(window, model_class):
    model = model_class(window.document)
    columns = [c for c in model.columns_for(window.document.project) if c.optional]
    assert columns
    for column in columns:
        assert column.blank, column.key
        if column in model.table_columns:
            section = model.table_columns.index(column)
            assert f"Blank: {column.blank}" in model.headerData(section, Qt.Orientation.Horizontal, TOOLTIP)


def test_a_blank_elevation_cell_says_what_it_means(window):
    model = window.pipework.segments_model
    column = model.column_index("start_elevation")
    blanks = [r for r in range(model.rowCount()) if model.data(model.index(r, column), DISPLAY) == ""]
    assert blanks
    assert model.data(model.index(blanks[0], column), TOOLTIP).startswith("Blank: not given")


def test_the_pumps_panel_shows_where_the_pump_data_came_from(make_window, sample_copies, qapp):
    window = _shown_window(make_window, sample_copies, qapp, "sewage_wet_well")
    label = window.pumps_panel.source_label
    pump = window.document.project.duty_pump
    assert pump.source_file == "sewage_sw150.csv" and pump.source_comments
    assert label.text().startswith("Source: sewage_sw150.csv")
    assert pump.source_comments[0].strip() in label.text()
    for line in pump.source_comments:
        assert line.strip() in label.toolTip()
    # typed-in data say so rather than showing nothing
    typed = replace(pump, source_file="", source_comments=())
    text, tooltip = pump_source_texts(typed)
    assert text.startswith("Source: typed in") and "typed in" in tooltip
