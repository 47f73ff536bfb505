"""The profile plot and the pump curves at the manifold draw exactly what the engine gave.

The profile is an invented ridge (demo data) run through the engine's own
:func:`hydraulics.main_profile.profile_result`; the plots are checked against its arrays.
Unit factors are exact definitions (NIST SP 811, Appendix B): 1 ft = 0.3048 m.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from app.plots.head_flow_plot import (
    IDLE_READOUT,
    MANIFOLD_CURVE_NAME,
    MANIFOLD_READOUT,
    TESTED_CURVE_NAME,
    HeadFlowPlot,
)
from app.plots.plot_tabs import PlotTabs
from app.plots.profile_plot import GOVERNS_LOW_FLOW_LABEL, NO_PROFILE_MESSAGE, ProfilePlot
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.main_profile import OperatingLosses, PipeProfile, profile_result

try:
    from .display_fakes import make_solution
except ImportError:  # tests/gui is not a package
    from display_fakes import make_solution

pytestmark = pytest.mark.qt_log_ignore(r"This plugin does not support propagateSizeHints\(\)")

LENGTH_FACTOR = {"SI": 1.0, "US": 1.0 / 0.3048}
LENGTH_LABEL = {"SI": "m", "US": "ft"}
LENGTHS = np.array([600.0, 900.0])
"""Two delivery segments of an invented main: 600 m up to a ridge, 900 m down to the delivery."""
RATING_PA = np.array([1.0e6, math.nan])  # PN 10 (10 bar) on the first segment, unknown on the second (demo)


def _ridge_result():
    profile = PipeProfile(np.array([0.0, 600.0, 1500.0]), np.array([19.0, 44.5, 37.5]),
                          np.array([False, True, False]))
    operating = []
    for static, delivery in (("max", 38.0), ("min", 36.0)):
        for pipe, downstream_friction in (("new", 3.0), ("aged", 10.0)):
            # 3 m of friction beyond the crest is less than its 6.5 m rise over the delivery: the crest
            # governs; 10 m is more: the delivery governs (hand arithmetic on the demo numbers)
            operating.append(OperatingLosses(label=f"{static} static, {pipe} pipe", static=static, pipe=pipe,
                                             flow_m3_s=0.07, delivery_level_m=delivery,
                                             friction_m=np.array([2.0, downstream_friction]),
                                             minor_m=np.array([0.5, 0.2])))
    result = profile_result(profile, LENGTHS, operating, {"max": 38.0, "min": 36.0}, 1000.0)
    return replace(result, segment_rating_pa=RATING_PA)


@pytest.fixture(params=["SI", "US"])
def unit_system(request) -> str:
    return request.param


@pytest.fixture
def profile_plot(qtbot) -> ProfilePlot:
    plot = ProfilePlot()
    qtbot.addWidget(plot)
    plot.resize(900, 600)
    return plot


def test_profile_plot_draws_the_engine_arrays_in_display_units(profile_plot, unit_system):
    result = _ridge_result()
    solution = replace(make_solution(), profile=result)
    profile_plot.show_solution(solution, unit_system)
    f = LENGTH_FACTOR[unit_system]
    x, z = profile_plot.elevation_data()
    np.testing.assert_allclose(x, result.chainage_m * f, rtol=1e-12)
    np.testing.assert_allclose(z, result.elevation_m * f, rtol=1e-12)
    drawn = profile_plot.scenario_data()
    assert len(drawn) == len(result.scenarios) == 4
    for (name, lx, ly), line in zip(drawn, result.scenarios, strict=True):
        assert line.label in name
        np.testing.assert_allclose(lx, result.chainage_m * f, rtol=1e-12)
        np.testing.assert_allclose(ly, line.grade_line_m * f, rtol=1e-12)
    rest = profile_plot.rest_data()
    assert [name for name, _, _ in rest] == [f"HGL {line.label}" for line in result.at_rest]
    for (_, _, ly), line in zip(rest, result.at_rest, strict=True):
        np.testing.assert_allclose(ly, line.grade_line_m * f, rtol=1e-12)
    assert profile_plot.message() == ""
    unit = LENGTH_LABEL[unit_system]
    assert profile_plot.plot_item.getAxis("bottom").labelText == f"Chainage ({unit})"
    assert profile_plot.plot_item.getAxis("left").labelText == f"Elevation / head ({unit})"


def test_the_rating_envelope_steps_with_the_segments(profile_plot, unit_system):
    result = _ridge_result()
    solution = replace(make_solution(), profile=result)
    profile_plot.show_solution(solution, unit_system)
    f = LENGTH_FACTOR[unit_system]
    x, y = profile_plot.rating_data()
    first = result.chainage_m <= 600.0
    head = 1.0e6 / (1000.0 * STANDARD_GRAVITY_M_S2)  # p / (ρ g), hydrostatics, ρ of the profile (1000 kg/m³)
    np.testing.assert_allclose(x[np.isfinite(y)], result.chainage_m[first] * f, rtol=1e-12)
    np.testing.assert_allclose(y[np.isfinite(y)], (result.elevation_m[first] + head) * f, rtol=1e-12)
    assert np.isnan(y[-1])  # no rating known on the second segment: a gap, not a line at the pipe


def test_air_valve_and_governing_crest_are_marked(profile_plot):
    result = _ridge_result()
    profile_plot.show_solution(replace(make_solution(), profile=result), "SI")
    governed = [line for line in result.scenarios if line.control != "delivery"]
    assert 0 < len(governed) < len(result.scenarios)  # the crest governs the new-pipe (lower-loss) points only
    assert profile_plot.marks() == [(600.0, 44.5, f"air valve, {GOVERNS_LOW_FLOW_LABEL}")]
    names = profile_plot.legend_names()
    assert names[0] == "Pipe elevation"
    assert "Air valve" in names and "Governing vented crest" in names


def test_without_a_profile_the_plot_says_where_to_enter_one(profile_plot):
    profile_plot.show_solution(replace(make_solution(), profile=_ridge_result()), "SI")
    profile_plot.show_solution(make_solution(), "SI")
    assert profile_plot.message() == NO_PROFILE_MESSAGE
    assert profile_plot.elevation_data()[0].size == 0
    assert profile_plot.scenario_data() == [] and profile_plot.marks() == []


def test_the_finished_solve_of_the_drawn_profile_redraws_nothing(profile_plot, monkeypatch):
    result = _ridge_result()
    first = replace(make_solution(), profile=result, complete=False)
    profile_plot.show_solution(first, "SI")
    redraws: list[object] = []
    monkeypatch.setattr(profile_plot, "_update_elevation", redraws.append)
    profile_plot.show_solution(replace(first, complete=True), "SI")
    assert profile_plot.drawn_solution.complete and redraws == []
    # a second stage bringing a profile the first stage did not have is drawn
    profile_plot.show_solution(replace(first, profile=None), "SI")
    profile_plot.show_solution(replace(first, complete=True), "SI")
    assert redraws == [None, result]


def test_a_hidden_profile_tab_is_drawn_when_shown(qtbot):
    tabs = PlotTabs()
    qtbot.addWidget(tabs)
    tabs.show()
    qtbot.waitExposed(tabs)
    result = _ridge_result()
    tabs.show_solution(replace(make_solution(), profile=result), "SI")
    assert tabs.profile.drawn_solution is None  # hidden: pending
    tabs.setCurrentWidget(tabs.profile)
    np.testing.assert_allclose(tabs.profile.elevation_data()[1], result.elevation_m, rtol=1e-12)


# --------------------------------------------------------------------------- pump curves at the manifold
SAMPLE = Path(__file__).resolve().parents[2] / "sample_projects" / "hilltop_booster.pumpsketch.json"


def test_head_flow_shows_the_curve_at_the_manifold_and_the_tested_curve(qtbot, unit_system):
    from hydraulics.project_io import load_project
    from hydraulics.solve import solve

    solution = solve(load_project(SAMPLE))
    # a crafted branch loss, 2 m at each curve's last flow growing with the square of the flow (demo numbers)
    curves = tuple(replace(c, head_at_manifold_m=c.head_m - 2.0 * (c.flow_m3_s / c.flow_m3_s[-1]) ** 2)
                   for c in solution.pump_curves)
    crafted = replace(solution, pump_curves=curves)
    plot = HeadFlowPlot()
    qtbot.addWidget(plot)
    plot.show_solution(crafted, unit_system)
    f = LENGTH_FACTOR[unit_system]
    speed = solution.project.arrangement.speed_ratio
    shown = [c for c in curves if abs(c.speed_ratio - speed) < 1e-9]
    assert shown
    for curve in shown:
        _, y = plot.pump_curve_data(curve.pumps_running)
        np.testing.assert_allclose(y, curve.head_at_manifold_m * f, rtol=1e-12)
        _, tested = plot.tested_curve_data(curve.pumps_running)
        np.testing.assert_allclose(tested, curve.head_m * f, rtol=1e-12)
    names = plot.legend_names()
    assert any(n.startswith(MANIFOLD_CURVE_NAME) for n in names)
    assert any(n.startswith(TESTED_CURVE_NAME) for n in names)
    assert plot.readout.text() == MANIFOLD_READOUT  # says what "at the manifold" means
    assert len(plot.marked_points()) == len([p for p in solution.operating_points
                                             if p.found and abs(p.speed_ratio - speed) < 1e-9])
    # the engine's own solution: the hilltop sample has each pump's own suction and discharge branch
    # (segments carrying "pump" in the sample file), so the solve fills the curve at the manifold
    plot.show_solution(solution, unit_system)
    for curve in (c for c in solution.pump_curves if abs(c.speed_ratio - speed) < 1e-9):
        assert curve.head_at_manifold_m is not None
        assert np.all(curve.head_at_manifold_m[1:] < curve.head_m[1:])  # the branch losses are taken off
        np.testing.assert_allclose(plot.pump_curve_data(curve.pumps_running)[1], curve.head_at_manifold_m * f,
                                   rtol=1e-12)
        np.testing.assert_allclose(plot.tested_curve_data(curve.pumps_running)[1], curve.head_m * f, rtol=1e-12)
    assert plot.readout.text() == MANIFOLD_READOUT
    # without branch losses (no curve at the manifold) only the tested curve is drawn, with the idle readout
    plain = replace(solution, pump_curves=tuple(replace(c, head_at_manifold_m=None) for c in solution.pump_curves))
    plot.show_solution(plain, unit_system)
    np.testing.assert_allclose(plot.pump_curve_data(shown[0].pumps_running)[1], shown[0].head_m * f, rtol=1e-12)
    assert plot.tested_curve_data(shown[0].pumps_running)[0].size == 0
    assert not any(n.startswith(TESTED_CURVE_NAME) for n in plot.legend_names())
    assert plot.readout.text() == IDLE_READOUT
