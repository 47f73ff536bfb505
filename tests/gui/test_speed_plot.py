"""The variable-speed tab draws the engine's speed map of a real solve, in the units chosen."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from app.plots.plot_tabs import PlotTabs
from app.plots.speed_plot import NO_PUMP_MESSAGE, ONE_SPEED_MESSAGE, VariableSpeedPlot
from hydraulics.project_io import load_project
from hydraulics.solve import complete_solution, solve, solve_curves

SAMPLES = Path(__file__).resolve().parents[2] / "sample_projects"

# Display factors from SI, from the exact definitions (NIST SP 811, Appendix B):
# 1 L = 0.001 m³; 1 US gal = 3.785411784 L (so 1 m³/s = 60 / 0.003785411784 gpm); 1 ft = 0.3048 m.
FLOW_FACTOR = {"SI": 1000.0, "US": 60.0 / 3.785411784e-3}
HEAD_FACTOR = {"SI": 1.0, "US": 1.0 / 0.3048}

pytestmark = pytest.mark.qt_log_ignore(r"This plugin does not support propagateSizeHints\(\)")


@pytest.fixture(params=["SI", "US"])
def unit_system(request) -> str:
    return request.param


@pytest.fixture
def plot(qtbot) -> VariableSpeedPlot:
    widget = VariableSpeedPlot()
    qtbot.addWidget(widget)
    widget.resize(900, 700)
    return widget


def _solve(name: str):
    return solve(load_project(SAMPLES / f"{name}.pumpsketch.json"))


@pytest.mark.parametrize("name", ["river_intake", "sewage_wet_well"])
def test_speed_curves_are_the_engine_arrays_in_display_units(plot, unit_system, name):
    solution = _solve(name)
    speed_map = solution.speed_map
    assert speed_map is not None
    plot.show_solution(solution, unit_system)
    drawn = plot.speed_curve_data()
    assert [(s, k) for s, k, _, _ in drawn] == [(c.speed_ratio, c.kind) for c in speed_map.curves]
    for (_, _, x, y), curve in zip(drawn, speed_map.curves, strict=True):
        np.testing.assert_allclose(x, curve.flow_m3_s * FLOW_FACTOR[unit_system], rtol=1e-12)
        np.testing.assert_allclose(y, curve.head_m * HEAD_FACTOR[unit_system], rtol=1e-12)
    kinds = [k for _, k, _, _ in drawn]
    assert kinds[0] == "maximum" and kinds[-1] == "minimum" and "design" in kinds


@pytest.mark.parametrize("name", ["river_intake", "sewage_wet_well"])
def test_equal_efficiency_lines_are_the_engine_arrays_in_display_units(plot, unit_system, name):
    solution = _solve(name)
    lines = solution.speed_map.equal_efficiency
    assert lines  # both samples have efficiency data
    plot.show_solution(solution, unit_system)
    drawn = plot.equal_efficiency_data()
    assert len(drawn) == len(lines)
    for (text, x, y), line in zip(drawn, lines, strict=True):
        assert text == f"η {round(line.efficiency * 100)} %"
        np.testing.assert_allclose(x, line.flow_m3_s * FLOW_FACTOR[unit_system], rtol=1e-12)
        np.testing.assert_allclose(y, line.head_m * HEAD_FACTOR[unit_system], rtol=1e-12)
    best = solution.speed_map.best_efficiency
    x, y = plot.best_item.getData()
    np.testing.assert_allclose(y, best.head_m * HEAD_FACTOR[unit_system], rtol=1e-12)
    x, y = plot.minimum_flow_item.getData()
    np.testing.assert_allclose(x, solution.speed_map.minimum_flow_line.flow_m3_s * FLOW_FACTOR[unit_system],
                               rtol=1e-12)


def test_system_band_design_points_and_the_note(plot):
    solution = _solve("river_intake")
    plot.show_solution(solution, "SI")
    for (static, pipe), item in plot.system_items.items():
        np.testing.assert_allclose(item.getData()[1], solution.curve(static, pipe).head_m, rtol=1e-12)
    x, low, high = plot.system_band.edges()
    heads = np.vstack([c.head_m for c in solution.curves])
    np.testing.assert_allclose(low, heads.min(axis=0), rtol=1e-12)
    np.testing.assert_allclose(high, heads.max(axis=0), rtol=1e-12)
    spots = [(p.pos().x(), p.pos().y()) for p in plot.design_points.points()]
    expected = [(d.flow_m3_s * 1000.0, d.head_m) for d in solution.speed_map.design_points]
    assert len(spots) == len(expected) == 4
    for got, want in zip(spots, expected, strict=True):
        assert got == pytest.approx(want, rel=1e-12)
    # on the system curves drawn (common pipework), at the design flow
    for point in solution.speed_map.design_points:
        curve = solution.curve(point.static, point.pipe)
        assert point.head_m == pytest.approx(np.interp(point.flow_m3_s, curve.flow_m3_s, curve.head_m), rel=1e-3)
    low_s, high_s = solution.speed_map.design_speed_range
    note = plot.note.text()
    assert f"speed {low_s * 100:.1f}–{high_s * 100:.1f} %" in note
    q_min = solution.speed_map.minimum_flow_per_pump_m3_s * 1000.0
    assert f"Minimum continuous stable flow {q_min:.2f} L/s per pump" in note
    assert "common-practice default, 35 % of best-efficiency flow" in note
    assert "100 %" in plot.speed_labels() and any("(design flow" in t for t in plot.speed_labels())


def test_without_a_pump_a_plain_message(plot):
    project = load_project(SAMPLES / "river_intake.pumpsketch.json")
    solution = solve(replace(project, pumps=(), arrangement=None))
    plot.show_solution(_solve("river_intake"), "SI")
    plot.show_solution(solution, "SI")
    assert plot.plot_item.titleLabel.text == NO_PUMP_MESSAGE
    assert plot.speed_curve_data() == [] and plot.equal_efficiency_data() == []
    assert not plot.best_item.isVisible() and not plot.system_band.isVisible()
    assert not plot.note.text()


def test_a_drive_of_one_speed_shows_a_message(plot):
    project = load_project(SAMPLES / "river_intake.pumpsketch.json")
    fixed = replace(project, arrangement=replace(project.arrangement, min_speed_ratio=1.0, max_speed_ratio=1.0))
    plot.show_solution(solve(fixed), "SI")
    assert plot.plot_item.titleLabel.text == ONE_SPEED_MESSAGE
    assert plot.speed_curve_data() == []


def test_the_first_stage_keeps_the_drawing_until_the_finished_solve(plot):
    project = load_project(SAMPLES / "sewage_wet_well.pumpsketch.json")
    finished = solve(project)
    plot.show_solution(finished, "SI")
    before = plot.speed_curve_data()
    stage = solve_curves(project)
    plot.show_solution(stage.solution, "SI")
    assert plot.drawn_solution is finished and len(plot.speed_curve_data()) == len(before)
    second = complete_solution(stage)
    plot.show_solution(second, "SI")
    assert plot.drawn_solution is second


def test_the_tab_sits_between_npsh_and_profile_and_draws_when_selected(make_window, sample_copies):
    window = make_window(sample_copies / "river_intake.pumpsketch.json")
    tabs: PlotTabs = window.plot_tabs
    names = [tabs.tabText(i) for i in range(tabs.count())]
    assert names.index("Variable speed") == names.index("NPSH") + 1 == names.index("Profile") - 1
    tabs.setCurrentWidget(tabs.variable_speed)
    solution = window.document.solution
    assert solution is not None and solution.speed_map is not None
    drawn = tabs.variable_speed.speed_curve_data()
    assert [s for s, _, _, _ in drawn] == [c.speed_ratio for c in solution.speed_map.curves]
