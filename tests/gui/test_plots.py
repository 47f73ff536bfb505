"""The plots draw exactly what the solution holds, in the unit system chosen."""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import pytest
from PySide6.QtCore import QPointF
from PySide6.QtGui import QImage

from app.plots.efficiency_power_plot import EfficiencyPowerPlot
from app.plots.head_flow_plot import SYSTEM_CASES, HeadFlowPlot
from app.plots.npsh_plot import NpshPlot
from app.plots.plot_tabs import PlotTabs

try:
    from .display_fakes import BEP_FLOW_M3_S, DESIGN_FLOW_M3_S, make_solution
except ImportError:  # tests/gui is not a package
    from display_fakes import BEP_FLOW_M3_S, DESIGN_FLOW_M3_S, make_solution

# Display factors from SI, from the exact definitions (NIST SP 811, Appendix B):
# 1 L = 0.001 m³; 1 US gal = 3.785411784 L; 1 ft = 0.3048 m;
# 1 hp (550 ft·lbf/s) = 550 × 0.3048 m × 0.45359237 kg × 9.80665 m/s² per s = 745.699 W.
US_GALLON_M3 = 3.785411784e-3

# The offscreen platform warns whenever a top-level widget with a layout is shown; the
# message says nothing about our widgets, so only that one message is let through.
pytestmark = pytest.mark.qt_log_ignore(r"This plugin does not support propagateSizeHints\(\)")
FLOW_FACTOR = {"SI": 1000.0, "US": 60.0 / US_GALLON_M3}
HEAD_FACTOR = {"SI": 1.0, "US": 1.0 / 0.3048}
POWER_FACTOR = {"SI": 1e-3, "US": 1.0 / (550 * 0.3048 * 0.45359237 * 9.80665)}
FLOW_LABEL = {"SI": "L/s", "US": "gpm"}
HEAD_LABEL = {"SI": "m", "US": "ft"}


@pytest.fixture(params=["SI", "US"])
def unit_system(request) -> str:
    return request.param


@pytest.fixture
def head_flow(qtbot) -> HeadFlowPlot:
    plot = HeadFlowPlot()
    qtbot.addWidget(plot)
    plot.resize(900, 600)
    return plot


def _visible_found_points(solution):
    return [p for p in solution.operating_points if p.found]


# --------------------------------------------------------------------------- head–flow
def test_system_curves_are_the_solution_arrays_in_display_units(head_flow, unit_system):
    solution = make_solution()
    head_flow.show_solution(solution, unit_system)
    for static, pipe in SYSTEM_CASES:
        curve = solution.curve(static, pipe)
        x, y = head_flow.curve_data(static, pipe)
        np.testing.assert_allclose(x, curve.flow_m3_s * FLOW_FACTOR[unit_system], rtol=1e-12)
        np.testing.assert_allclose(y, curve.head_m * HEAD_FACTOR[unit_system], rtol=1e-12)
    # the aged curve lies above the new one at the same static head (invented data: steeper)
    assert head_flow.curve_data("max", "aged")[1][-1] > head_flow.curve_data("max", "new")[1][-1]


def test_us_flow_is_in_gallons_per_minute(head_flow):
    # 10 L/s = 600 / 3.785411784 gpm = 158.503231... gpm (NIST SP 811: 1 US gal = 3.785411784 L exactly)
    head_flow.show_solution(make_solution(), "US")
    x, _ = head_flow.curve_data("min", "new")
    flow_si = make_solution().curve("min", "new").flow_m3_s
    index = int(np.argmin(np.abs(flow_si - 0.010)))
    assert flow_si[index] == pytest.approx(0.010)
    assert x[index] == pytest.approx(158.50323141489, rel=1e-12)


def test_axis_titles_follow_the_unit_system(head_flow, unit_system):
    head_flow.show_solution(make_solution(), unit_system)
    bottom = head_flow.plot_item.getAxis("bottom").labelText
    left = head_flow.plot_item.getAxis("left").labelText
    assert bottom == f"Flow ({FLOW_LABEL[unit_system]})"
    assert left == f"Head ({HEAD_LABEL[unit_system]})"


def test_pump_curves_and_preferred_region(head_flow, unit_system):
    solution = make_solution(duty_count=3)
    head_flow.show_solution(solution, unit_system)
    for curve in solution.pump_curves:
        x, y = head_flow.pump_curve_data(curve.pumps_running)
        np.testing.assert_allclose(x, curve.flow_m3_s * FLOW_FACTOR[unit_system], rtol=1e-12)
        np.testing.assert_allclose(y, curve.head_m * HEAD_FACTOR[unit_system], rtol=1e-12)
        rx, ry = head_flow.preferred_region_data(curve.pumps_running)
        low = curve.preferred_flow_min_m3_s * FLOW_FACTOR[unit_system]
        high = curve.preferred_flow_max_m3_s * FLOW_FACTOR[unit_system]
        assert rx[0] == pytest.approx(low) and rx[-1] == pytest.approx(high)
        # the stroke lies on the pump curve
        np.testing.assert_allclose(ry, np.interp(rx, x, y), rtol=1e-9)
    assert head_flow.pump_curve_data(4)[0].size == 0


def test_operating_points_marked_and_labelled(head_flow, unit_system):
    solution = make_solution(duty_count=2, unfound=(("max", "aged", 1),))
    head_flow.show_solution(solution, unit_system)
    marked = head_flow.marked_points()
    found = _visible_found_points(solution)
    assert len(marked) == len(found) == 7
    by_label = {label: (x, y) for x, y, label in marked}
    point = next(p for p in found if (p.static, p.pipe, p.pumps_running) == ("max", "aged", 2))
    x, y = by_label["2 pumps · max static · aged"]
    assert x == pytest.approx(point.flow_m3_s * FLOW_FACTOR[unit_system])
    assert y == pytest.approx(point.head_m * HEAD_FACTOR[unit_system])
    assert "1 pump · max static · aged" not in by_label  # no operating point: nothing marked
    visible_labels = [t for t in head_flow._point_labels if t.isVisible()]
    # each marker carries its number; the numbered key in the legend gives its label
    assert [t.toPlainText() for t in visible_labels] == [str(n) for n in range(1, 8)]
    assert head_flow.point_key() == [f"{n}: {label}" for n, (_x, _y, label) in enumerate(marked, start=1)]
    assert set(head_flow.point_key()) <= set(head_flow.legend_names())


def test_design_flow_line(head_flow, unit_system):
    head_flow.show_solution(make_solution(), unit_system)
    line = head_flow.design_flow_line
    assert line.isVisible()
    assert line.value() == pytest.approx(DESIGN_FLOW_M3_S * FLOW_FACTOR[unit_system])
    assert line.label.toPlainText().startswith("design flow")
    assert FLOW_LABEL[unit_system] in line.label.toPlainText()


def test_legend_lists_what_is_drawn(head_flow):
    head_flow.show_solution(make_solution(duty_count=3))
    names = head_flow.legend_names()
    assert names[:4] == ["System: max static, aged pipe", "System: max static, new pipe",
                         "System: min static, aged pipe", "System: min static, new pipe"]
    assert "Pump curve: 3 pumps" in names
    assert any(n.startswith("Preferred operating region (70–120 %") for n in names)
    head_flow.show_solution(make_solution(duty_count=2))
    assert "Pump curve: 3 pumps" not in head_flow.legend_names()
    assert "Pump curve: 2 pumps" in head_flow.legend_names()


def test_new_solution_updates_the_same_items(head_flow):
    head_flow.show_solution(make_solution(duty_count=3))
    system_items = dict(head_flow._system_items)
    pump_items = {n: head_flow._pump_items[n].curve for n in (1, 2, 3)}
    scatter, band = head_flow.points_item, head_flow.system_band
    plot_children = len(head_flow.plot_item.items)
    before = head_flow.curve_data("max", "aged")[1].copy()

    head_flow.show_solution(make_solution(duty_count=3, scale=0.7))  # a larger pipe: flatter curves
    after = head_flow.curve_data("max", "aged")[1]
    assert after[-1] < before[-1]
    assert head_flow._system_items == system_items
    assert all(head_flow._system_items[k] is system_items[k] for k in system_items)
    assert all(head_flow._pump_items[n].curve is pump_items[n] for n in pump_items)
    assert head_flow.points_item is scatter and head_flow.system_band is band
    assert len(head_flow.plot_item.items) == plot_children

    head_flow.show_solution(make_solution(duty_count=2))  # fewer pumps: the third curve hides
    assert not pump_items[3].isVisible()
    assert head_flow.pump_curve_data(3)[0].size == 0
    head_flow.show_solution(make_solution(duty_count=3))  # and comes back as the same object
    assert head_flow._pump_items[3].curve is pump_items[3] and pump_items[3].isVisible()
    assert len(head_flow.plot_item.items) == plot_children


def test_the_finished_solve_of_what_is_drawn_redraws_nothing(head_flow):
    """Two-stage solves: the completion of a drawn first stage is adopted without a redraw."""
    from dataclasses import replace

    from app.plots.plot_base import completes_drawn

    first = replace(make_solution(duty_count=2), complete=False)
    head_flow.show_solution(first)
    full = replace(first, findings=(), complete=True)  # shares every drawn part
    other = replace(make_solution(duty_count=2, scale=0.7), complete=True)
    assert completes_drawn(first, "SI", full, "SI")
    assert not completes_drawn(first, "SI", full, "US")  # other units: redraw
    assert not completes_drawn(first, "SI", other, "SI")  # other arrays: redraw
    assert not completes_drawn(full, "SI", full, "SI")  # only a first stage is completed
    redraws = []
    original = head_flow._update_points
    head_flow._update_points = lambda: (redraws.append(1), original())
    head_flow.show_solution(full)
    assert redraws == [] and head_flow.drawn_solution is full
    head_flow.show_solution(other)
    assert redraws == [1]
    np.testing.assert_allclose(head_flow.curve_data("max", "aged")[1], other.curve("max", "aged").head_m)


def test_system_band_spans_lowest_to_highest_curve(head_flow):
    solution = make_solution()
    head_flow.show_solution(solution)
    low_x, low_y, high_y = head_flow.band_edges()
    heads = np.vstack([c.head_m for c in solution.curves])
    np.testing.assert_allclose(low_x, solution.curves[0].flow_m3_s * 1000.0)
    np.testing.assert_allclose(low_y, heads.min(axis=0))
    np.testing.assert_allclose(high_y, heads.max(axis=0))
    assert head_flow.system_band.isVisible()


def test_project_without_pump_shows_system_curves_only(head_flow):
    head_flow.show_solution(make_solution(duty_count=2))
    head_flow.show_solution(make_solution(with_pump=False))
    assert head_flow.marked_points() == []
    assert head_flow.pump_curve_data(1)[0].size == 0
    assert all(not n.startswith("Pump curve") for n in head_flow.legend_names())
    assert head_flow.curve_data("min", "new")[0].size > 0
    head_flow.show_solution(None)
    assert head_flow.curve_data("min", "new")[0].size == 0
    assert not head_flow.design_flow_line.isVisible()


def test_pin_and_clear_snapshot(head_flow, unit_system):
    first = make_solution(duty_count=2)
    head_flow.show_solution(first, unit_system)
    assert not head_flow.has_snapshot
    head_flow.pin_snapshot()
    assert head_flow.has_snapshot
    assert any(n.startswith("Pinned") for n in head_flow.legend_names())

    head_flow.show_solution(make_solution(duty_count=2, scale=0.6), unit_system)
    snapshot = head_flow.snapshot_data()
    assert len(snapshot) == 4 + 2  # four system curves and two pump curves
    pinned_curve = first.curve("max", "aged")
    assert any(np.allclose(y, pinned_curve.head_m * HEAD_FACTOR[unit_system]) for _, y in snapshot)
    assert not np.allclose(head_flow.curve_data("max", "aged")[1], pinned_curve.head_m * HEAD_FACTOR[unit_system])

    other = "US" if unit_system == "SI" else "SI"
    head_flow.show_solution(make_solution(duty_count=2, scale=0.6), other)  # the snapshot follows the units
    assert any(np.allclose(y, pinned_curve.head_m * HEAD_FACTOR[other]) for _, y in head_flow.snapshot_data())

    head_flow.clear_snapshot()
    assert not head_flow.has_snapshot
    assert head_flow.snapshot_data() == []
    assert not any(n.startswith("Pinned") for n in head_flow.legend_names())


def _numbers(text: str) -> list[float]:
    return [float(v) for v in re.findall(r"-?\d+(?:\.\d+)?", text)]


def test_hover_readout_reports_flow_and_head(head_flow, qtbot, unit_system):
    head_flow.show_solution(make_solution(), unit_system)
    head_flow.show()
    qtbot.waitExposed(head_flow)
    flow, head = 40.0 * FLOW_FACTOR[unit_system] / 1000.0, 25.0 * HEAD_FACTOR[unit_system]
    scene_pos = head_flow.view_box.mapViewToScene(QPointF(flow, head))
    head_flow.plot_item.scene().sigMouseMoved.emit(scene_pos)
    qtbot.waitUntil(lambda: head_flow.readout.text().startswith("Pointer"), timeout=2000)
    text = head_flow.readout.text()
    assert FLOW_LABEL[unit_system] in text and f" {HEAD_LABEL[unit_system]}" in text
    shown_flow, shown_head = _numbers(text)[:2]
    assert shown_flow == pytest.approx(flow, rel=0.01)
    assert shown_head == pytest.approx(head, rel=0.01)
    assert head_flow.hover.verticals[0].isVisible()
    assert head_flow.hover.verticals[0].value() == pytest.approx(flow, rel=1e-6)

    outside = head_flow.view_box.sceneBoundingRect().bottomRight() + QPointF(5, 5)
    head_flow.plot_item.scene().sigMouseMoved.emit(outside)
    qtbot.waitUntil(lambda: not head_flow.readout.text().startswith("Pointer"), timeout=2000)
    assert not head_flow.hover.verticals[0].isVisible()


def test_user_zoom_is_kept_until_fit_view(head_flow):
    head_flow.show_solution(make_solution())
    view_box = head_flow.view_box
    view_box.scaleBy((0.5, 0.5))  # a zoom by the user (wheel or drag) emits sigRangeChangedManually
    view_box.sigRangeChangedManually.emit([True, True])
    zoomed = view_box.viewRange()
    head_flow.show_solution(make_solution(scale=0.8))
    assert view_box.viewRange() == zoomed
    head_flow.fit_view()
    x_range = view_box.viewRange()[0]
    assert x_range[0] <= 0.0 and x_range[1] >= 0.12 * 1000.0  # the whole flow grid (invented: 0–120 L/s)


# --------------------------------------------------------------------------- efficiency and power
def test_efficiency_and_power_of_one_pump(qtbot, unit_system):
    plot = EfficiencyPowerPlot()
    qtbot.addWidget(plot)
    solution = make_solution(duty_count=2)
    plot.show_solution(solution, unit_system)
    one = solution.pump_curves[0]
    x, eff = plot.efficiency_data()
    np.testing.assert_allclose(x, one.flow_per_pump_m3_s * FLOW_FACTOR[unit_system], rtol=1e-12)
    np.testing.assert_allclose(eff, one.efficiency * 100.0, rtol=1e-12)
    _, power = plot.power_data()
    np.testing.assert_allclose(power, one.shaft_power_w * POWER_FACTOR[unit_system], rtol=1e-9)
    assert plot.bep_flow() == pytest.approx(BEP_FLOW_M3_S * FLOW_FACTOR[unit_system])
    low, high = plot.preferred_region()
    assert low == pytest.approx(0.7 * BEP_FLOW_M3_S * FLOW_FACTOR[unit_system])
    assert high == pytest.approx(1.2 * BEP_FLOW_M3_S * FLOW_FACTOR[unit_system])

    marked = plot.marked_points()
    assert len(marked) == len(_visible_found_points(solution))
    point = next(p for p in solution.operating_points if (p.static, p.pipe, p.pumps_running) == ("min", "new", 2))
    x, e, p, _ = next(m for m in marked if m[3] == "2 pumps · min static · new")
    assert x == pytest.approx(point.flow_per_pump_m3_s * FLOW_FACTOR[unit_system])
    assert e == pytest.approx(point.efficiency * 100.0)
    assert p == pytest.approx(point.shaft_power_w * POWER_FACTOR[unit_system])
    assert plot.power_plot.getAxis("left").labelText == (
        "Shaft power (kW)" if unit_system == "SI" else "Shaft power (hp)")


def test_efficiency_plot_without_pump(qtbot):
    plot = EfficiencyPowerPlot()
    qtbot.addWidget(plot)
    plot.show_solution(make_solution())
    plot.show_solution(make_solution(with_pump=False))
    assert plot.efficiency_data()[0].size == 0 and plot.power_data()[0].size == 0
    assert plot.marked_points() == [] and plot.bep_flow() is None and plot.preferred_region() is None
    assert "No efficiency data" in plot.efficiency_plot.titleLabel.text


def test_pump_without_efficiency_or_npsh_data(qtbot):
    from dataclasses import replace

    solution = make_solution(duty_count=2)
    bare = tuple(replace(c, efficiency=None, shaft_power_w=None, npsh_required_m=None, bep_flow_m3_s=None,
                         preferred_flow_min_m3_s=None, preferred_flow_max_m3_s=None)
                 for c in solution.pump_curves)
    # as the engine builds it: the NPSH curve's required part comes from the pump curve
    npsh = replace(solution.npsh_available_curve, required_m=None)
    solution = replace(solution, pump_curves=bare, npsh_available_curve=npsh)
    tabs = PlotTabs()
    qtbot.addWidget(tabs)
    tabs.show_solution(solution)
    assert tabs.head_flow.pump_curve_data(2)[0].size > 0
    assert tabs.head_flow.preferred_region_data(2)[0].size == 0
    assert not any(n.startswith("Preferred") for n in tabs.head_flow.legend_names())
    assert tabs.efficiency_power.efficiency_data()[0].size == 0
    assert "No efficiency data" in tabs.efficiency_power.efficiency_plot.titleLabel.text
    assert tabs.npsh.required_data(1)[0].size == 0


# --------------------------------------------------------------------------- NPSH
def test_npsh_available_required_and_margin(qtbot, unit_system):
    plot = NpshPlot()
    qtbot.addWidget(plot)
    solution = make_solution(duty_count=2)
    plot.show_solution(solution, unit_system)
    npsh = solution.npsh_available_curve
    for pipe in ("new", "aged"):
        x, y = plot.available_data(pipe)
        np.testing.assert_allclose(x, npsh.flow_m3_s * FLOW_FACTOR[unit_system], rtol=1e-12)
        np.testing.assert_allclose(y, getattr(npsh, f"available_{pipe}_m") * HEAD_FACTOR[unit_system], rtol=1e-12)
    two = solution.pump_curves[1]
    x, y = plot.required_data(2)
    np.testing.assert_allclose(x, two.flow_m3_s * FLOW_FACTOR[unit_system], rtol=1e-12)
    np.testing.assert_allclose(y, two.npsh_required_m * HEAD_FACTOR[unit_system], rtol=1e-12)

    marks = plot.margin_marks()
    assert len(marks) == 2  # the least margin for 1 and for 2 pumps
    one_pump = [p for p in solution.operating_points if p.pumps_running == 1]
    least = min(one_pump, key=lambda p: p.npsh_margin_m)
    x, y, text = marks[0]
    assert text.startswith("least margin, 1 pump:")
    assert x == pytest.approx(least.flow_m3_s * FLOW_FACTOR[unit_system])
    assert f"{least.npsh_margin_m * HEAD_FACTOR[unit_system]:.2f}"[:3] in text
    bars_x, bars_y = plot.margin_bars.getData()
    assert len(bars_x) == 2 * len(_visible_found_points(solution))


def test_npsh_plot_without_pump(qtbot):
    plot = NpshPlot()
    qtbot.addWidget(plot)
    plot.show_solution(make_solution(with_pump=False))
    assert plot.available_data("new")[0].size == 0
    assert plot.margin_marks() == []
    assert "No pump" in plot.plot_item.titleLabel.text


# --------------------------------------------------------------------------- tabs and images
def test_plot_tabs_pass_everything_on(qtbot):
    tabs = PlotTabs()
    qtbot.addWidget(tabs)
    assert [tabs.tabText(i) for i in range(tabs.count())] == [
        "Head – flow", "Efficiency and power", "NPSH", "Variable speed", "Profile"]
    tabs.show_solution(make_solution(), "US")
    assert tabs.head_flow.unit_system == "US"
    assert tabs.efficiency_power.efficiency_data()[0].size > 0
    assert tabs.npsh.available_data("aged")[0].size > 0
    tabs.pin_snapshot()
    assert tabs.has_snapshot
    tabs.clear_snapshot()
    assert not tabs.has_snapshot


def _is_drawn(path) -> bool:
    image = QImage(str(path))
    if image.isNull() or image.width() < 100:
        return False
    colours = {image.pixel(x, y) for x in range(0, image.width(), 7) for y in range(0, image.height(), 7)}
    return len(colours) > 10  # more than a blank background


def test_plots_render_to_png(qtbot, tmp_path):
    tabs = PlotTabs()
    qtbot.addWidget(tabs)
    tabs.resize(900, 620)
    tabs.show_solution(make_solution(duty_count=2))
    tabs.show()
    qtbot.waitExposed(tabs)
    for index, plot in enumerate(tabs.plots()):
        tabs.setCurrentIndex(index)
        qtbot.wait(10)
        path = tmp_path / f"plot_{index}.png"
        assert plot.grab().save(str(path))
        assert _is_drawn(path)


# --------------------------------------------------------------------------- with the real engine
SAMPLES = sorted((Path(__file__).resolve().parents[2] / "sample_projects").glob("*.pumpsketch.json"))


@pytest.mark.parametrize("sample", SAMPLES, ids=[p.name.split(".")[0] for p in SAMPLES])
def test_sample_project_solutions_draw_in_every_tab(qtbot, sample):
    from hydraulics.project_io import load_project
    from hydraulics.solve import solve

    solution = solve(load_project(sample))
    tabs = PlotTabs()
    qtbot.addWidget(tabs)
    tabs.show_solution(solution, "US")
    for curve in solution.curves:
        x, y = tabs.head_flow.curve_data(curve.static, curve.pipe)
        np.testing.assert_allclose(x, curve.flow_m3_s * FLOW_FACTOR["US"], rtol=1e-12)
        np.testing.assert_allclose(y, curve.head_m * HEAD_FACTOR["US"], rtol=1e-12)
    speed = solution.project.arrangement.speed_ratio
    for pump_curve in solution.pump_curves:
        if abs(pump_curve.speed_ratio - speed) < 1e-9:
            x, _ = tabs.head_flow.pump_curve_data(pump_curve.pumps_running)
            np.testing.assert_allclose(x, pump_curve.flow_m3_s * FLOW_FACTOR["US"], rtol=1e-12)
    found = [p for p in solution.operating_points if p.found and abs(p.speed_ratio - speed) < 1e-9]
    assert len(tabs.head_flow.marked_points()) == len(found)
    assert len(tabs.efficiency_power.marked_points()) == len(
        [p for p in found if p.efficiency is not None])
    assert tabs.npsh.available_data("aged")[0].size == solution.npsh_available_curve.flow_m3_s.size


def test_an_axis_title_already_shown_is_not_set_again(qtbot):
    import pyqtgraph as pg

    from app.plots.plot_base import set_axis_title

    widget = pg.PlotWidget()
    qtbot.addWidget(widget)
    plot_item = widget.getPlotItem()
    axis = plot_item.getAxis("left")
    relabelled = []
    original = axis._updateLabel
    axis._updateLabel = lambda: (relabelled.append(axis.labelText), original())
    set_axis_title(plot_item, "left", "Head (m)")
    assert relabelled and set(relabelled) == {"Head (m)"}
    first = len(relabelled)
    set_axis_title(plot_item, "left", "Head (m)")
    assert len(relabelled) == first  # the same title again: the axis is left alone
    set_axis_title(plot_item, "left", "Head (ft)")
    assert relabelled[first:] and set(relabelled[first:]) == {"Head (ft)"}
    assert "Head (ft)" in axis.label.toHtml()


def test_npsh_plot_draws_the_available_curves_at_both_suction_levels(qtbot):
    # Each operating point takes NPSH available at its own scenario's suction level (minimum static:
    # the highest level), so both levels' curves are drawn; they are the engine's arrays as given.
    from app.plots.npsh_plot import NpshPlot
    from app.samples import sample_path
    from hydraulics.project_io import load_project
    from hydraulics.solve import solve

    solution = solve(load_project(sample_path("sewage_wet_well")))
    plot = NpshPlot()
    qtbot.addWidget(plot)
    plot.show_solution(solution, "SI")
    npsh = solution.npsh_available_curve
    assert npsh is not None and npsh.available_highest_level_new_m is not None
    for pipe, values in (("new", npsh.available_highest_level_new_m), ("aged", npsh.available_highest_level_aged_m)):
        x, y = plot.available_high_items[pipe].getData()
        assert np.allclose(y, values) and plot.available_high_items[pipe].isVisible()
    # the highest level lies above the lowest by the suction-level range (23.5 − 21 m, from the sample file)
    assert np.allclose(npsh.available_highest_level_new_m - npsh.available_new_m, 2.5)
