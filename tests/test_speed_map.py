"""Tests of hydraulics.speed_map: the pump set over its speed range.

The test pump is the quadratic one of ``tests.pump_fakes``: H = a − b q² at rated speed with
a = 60 m, b = 20000 s²/m⁵ (invented for the checks), efficiency an exact parabola
η = 0.8 (1 − ½ ((q − 0.03)/0.03)²) with its best point at 0.03 m³/s, 80 %.  Two pumps in
parallel.  Check values follow from the affinity laws by hand (Q' = N s q, H' = s² H(q),
η unchanged; Karassik et al., Pump Handbook, 4th ed., ch. 2); the arithmetic is beside each.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import pytest

from app.samples import sample_path
from hydraulics.model import Arrangement
from hydraulics.project_io import load_project
from hydraulics.pump_fit import fit_pump
from hydraulics.solve import complete_solution, solve_curves
from hydraulics.speed_map import (
    DEFAULT_MINIMUM_FLOW_FRACTION,
    MINIMUM_FLOW_SOURCE,
    efficiency_levels,
    equal_efficiency_flows,
    map_speeds,
    speed_map,
)
from hydraulics.variable_speed import variable_speed
from tests.pump_fakes import QuadraticSystem, parabolic_efficiency, quadratic_pump

A, B = 60.0, 20000.0
RHO = 1000.0
ARR = Arrangement("Q", duty_count=2, variable_speed=True, min_speed_ratio=0.6, max_speed_ratio=1.1)


@dataclass(frozen=True, eq=False)
class PlainSystem(QuadraticSystem):
    """The closed-form system of the pump tests, without pump branches."""

    @property
    def has_branches(self) -> bool:
        return False


SYSTEM = PlainSystem(static_min_m=20.0, static_max_m=30.0, k_new=4000.0, k_aged=6000.0)


@pytest.fixture(scope="module")
def fitted():
    return fit_pump(quadratic_pump(A, B, q_max=0.05, n_points=6, efficiency=parabolic_efficiency(0.03, 0.8)), RHO)


@pytest.fixture(scope="module")
def speeds(fitted):
    return variable_speed(SYSTEM, fitted, ARR, 0.06, npsh_static_head_m=9.0, density_kg_m3=RHO)


def test_speeds_drawn_are_the_drive_limits_the_steps_and_the_design_speeds():
    drawn = map_speeds(0.8, 1.0, (0.985, 0.846))
    # the steps of 0.1 between 0.8 and 1.0 leave only 0.9 (0.054 from 0.846, 0.085 from 0.985)
    assert [(round(s, 6), kind) for s, kind in drawn] == [
        (1.0, "maximum"), (0.985, "design"), (0.9, "step"), (0.846, "design"), (0.8, "minimum")]
    # a step within 0.03 of a design speed is left out: 0.9 is 0.01 from 0.91
    assert [round(s, 6) for s, _ in map_speeds(0.7, 1.0, (0.91,))] == [1.0, 0.91, 0.8, 0.7]
    assert map_speeds(1.0, 1.0) == ((1.0, "maximum"),)


def test_curve_at_80_percent_follows_the_affinity_laws(fitted):
    result = speed_map(SYSTEM, fitted, Arrangement(
        "Q", duty_count=2, variable_speed=True, min_speed_ratio=0.6, max_speed_ratio=1.0), None)
    by_speed = {round(c.speed_ratio, 6): c for c in result.curves}
    assert sorted(by_speed) == [0.6, 0.7, 0.8, 0.9, 1.0]
    curve = by_speed[0.8]
    assert curve.kind == "step"
    # the data range 0..0.05 m³/s of one pump becomes 0..2 × 0.8 × 0.05 = 0.08 m³/s for the set
    assert curve.flow_m3_s[0] == 0.0 and curve.flow_m3_s[-1] == pytest.approx(0.08, rel=1e-12)
    # the rated point q = 0.03 m³/s, H = 60 − 20000 × 0.03² = 42 m, η = 0.8 moves to
    # Q' = 2 × 0.8 × 0.03 = 0.048 m³/s (index 60 of 101 points over 0..0.08), H' = 0.64 × 42 = 26.88 m
    assert curve.flow_m3_s[60] == pytest.approx(0.048, rel=1e-12)
    assert curve.head_m[60] == pytest.approx(26.88, rel=1e-9)
    assert curve.efficiency is not None and curve.efficiency[60] == pytest.approx(0.8, rel=1e-9)
    # shut-off head 0.64 × 60 = 38.4 m
    assert curve.head_m[0] == pytest.approx(38.4, rel=1e-9)
    assert np.array_equal(curve.head_m, curve.plain_head_m)  # no branches: heads at the manifold are the plain ones
    assert not result.heads_at_manifold


def test_equal_efficiency_flows_of_the_parabolic_efficiency(fitted):
    # 0.75 = 0.8 (1 − ½ x²)  ⇒  x² = 2 (1 − 0.75/0.8) = 0.125, x = 0.353553…, q = 0.03 (1 ∓ x)
    below, above = equal_efficiency_flows(fitted, 0.75)
    x = math.sqrt(0.125)
    assert below == pytest.approx(0.03 * (1 - x), rel=1e-9)  # 0.0193934 m³/s
    assert above == pytest.approx(0.03 * (1 + x), rel=1e-9)  # 0.0406066 m³/s
    # 0.30: x² = 2 (1 − 0.3/0.8) = 1.25, q = 0.03 (1 ± 1.118) lies outside the data 0..0.05 on both sides
    assert equal_efficiency_flows(fitted, 0.30) == (None, None)
    # levels: multiples of 5 %-points below the best 80 %, five of them
    assert efficiency_levels(0.8) == (0.75, 0.7, 0.65, 0.6, 0.55)


def test_lines_of_equal_efficiency_are_parabolas_through_the_origin(fitted):
    result = speed_map(SYSTEM, fitted, ARR, None)
    levels = {(line.efficiency, line.side) for line in result.equal_efficiency}
    assert (0.75, "below") in levels and (0.75, "above") in levels
    line = next(line for line in result.equal_efficiency if line.efficiency == 0.75 and line.side == "above")
    q = line.rated_flow_m3_s
    # over the drive's speed range 0.6..1.1, 41 points: Q = 2 s q, H = s² (60 − 20000 q²)
    s = np.linspace(0.6, 1.1, 41)
    assert np.allclose(line.flow_m3_s, 2 * s * q, rtol=1e-12)
    assert np.allclose(line.head_m, s * s * (A - B * q * q), rtol=1e-9)
    # the same parabola H = (H(q) / (2q)²) Q² at every speed
    assert np.allclose(line.head_m / line.flow_m3_s**2, (A - B * q * q) / (2 * q) ** 2, rtol=1e-9)
    # each point of the line lies on the speed curve of its speed, at the efficiency of the line
    curve = next(c for c in result.curves if abs(c.speed_ratio - 0.8) < 1e-9)
    assert s[16] == pytest.approx(0.8)  # step (1.1 − 0.6) / 40 = 0.0125; 0.6 + 16 × 0.0125 = 0.8
    assert np.interp(line.flow_m3_s[16], curve.flow_m3_s, curve.head_m) == pytest.approx(line.head_m[16], rel=1e-3)
    assert float(fitted.efficiency(q)) == pytest.approx(0.75, rel=1e-9)
    best = result.best_efficiency
    assert best is not None and best.rated_flow_m3_s == pytest.approx(0.03, rel=1e-6)
    assert best.efficiency == pytest.approx(0.8, rel=1e-9)


def test_minimum_stable_flow_is_the_common_practice_fraction_of_best_efficiency_flow(fitted):
    result = speed_map(SYSTEM, fitted, ARR, None)
    # 0.35 × 0.03 = 0.0105 m³/s per pump at rated speed (common-practice default, named in the result)
    assert DEFAULT_MINIMUM_FLOW_FRACTION == 0.35
    assert result.minimum_flow_per_pump_m3_s == pytest.approx(0.0105, rel=1e-6)
    assert result.minimum_flow_source == MINIMUM_FLOW_SOURCE and "common-practice" in MINIMUM_FLOW_SOURCE
    line = result.minimum_flow_line
    assert line is not None
    # at the drive's minimum 0.6: Q = 2 × 0.6 × 0.0105 = 0.0126 m³/s, H = 0.36 × (60 − 20000 × 0.0105²) = 20.8062 m
    assert line.flow_m3_s[0] == pytest.approx(0.0126, rel=1e-6)
    assert line.head_m[0] == pytest.approx(0.36 * (60 - 20000 * 0.0105**2), rel=1e-6)


def test_design_speed_range_and_its_curves_come_from_the_speed_search(fitted, speeds):
    result = speed_map(SYSTEM, fitted, ARR, speeds)
    # s = √((H_s + (k + b/N²) Q_t²) / a) with Q_t = 0.06 (see tests/test_variable_speed.py):
    # min static, new pipe √((20 + 9000 × 0.0036) / 60) = √0.87333 = 0.93452
    # max static, aged pipe √((30 + 11000 × 0.0036) / 60) = √1.16 = 1.07703
    low, high = math.sqrt((20 + 9000 * 0.0036) / 60), math.sqrt((30 + 11000 * 0.0036) / 60)
    assert result.design_speed_range == pytest.approx((low, high), rel=1e-9)
    assert result.design_flow_met_everywhere
    design = [c for c in result.curves if c.kind == "design"]
    assert [c.pipe for c in design] == ["aged", "new"]
    assert [c.speed_ratio for c in design] == pytest.approx([high, low], rel=1e-9)
    # the curve at the highest design speed delivers 0.06 m³/s against the max-static aged system: 69.6 m
    top = design[0]
    assert np.interp(0.06, top.flow_m3_s, top.head_m) == pytest.approx(30 + 6000 * 0.0036, rel=2e-4)


def test_unreachable_design_flow_leaves_the_range_open(fitted):
    slow = Arrangement("Q", duty_count=2, variable_speed=True, min_speed_ratio=0.6, max_speed_ratio=1.0)
    result = speed_map(SYSTEM, fitted, slow, variable_speed(SYSTEM, fitted, slow, 0.06, 9.0, RHO))
    # at max static the design flow needs 1.04 and 1.077 > 1.0: only the min-static speeds are found
    assert not result.design_flow_met_everywhere
    assert result.design_speed_range is not None and result.design_speed_range[1] < 1.0


def test_without_efficiency_data_no_lines_and_the_reason_is_said():
    bare = fit_pump(quadratic_pump(A, B, q_max=0.05, n_points=6), RHO)
    result = speed_map(SYSTEM, bare, ARR, None)
    assert result.equal_efficiency == () and result.best_efficiency is None and result.minimum_flow_line is None
    assert result.minimum_flow_per_pump_m3_s is None and "no best-efficiency flow" in result.minimum_flow_source
    assert result.curves and all(c.efficiency is None for c in result.curves)


def test_the_solve_fills_the_map_in_its_second_stage_with_heads_at_the_manifold():
    project = load_project(sample_path("sewage_wet_well"))
    stage = solve_curves(project)
    assert stage.solution.speed_map is None
    solution = complete_solution(stage)
    result = solution.speed_map
    assert result is not None and result.pumps_running == project.arrangement.duty_count
    assert stage.system.has_branches and result.heads_at_manifold  # the sample has its pumps' own pipework
    for curve in result.curves:
        loss = stage.system.branch_loss(curve.flow_m3_s / result.pumps_running, curve.pipe == "aged")
        assert np.allclose(curve.head_m, curve.plain_head_m - loss, rtol=1e-12)
    # the drive's limits 85 % and 100 % of the sample are drawn
    kinds = {c.kind: c.speed_ratio for c in result.curves}
    assert kinds["minimum"] == 0.85 and kinds["maximum"] == 1.0
    # the design flow at each extreme: the system head less one pump's branch loss at Q_t / N
    speed = solution.variable_speed
    assert [(d.static, d.pipe) for d in result.design_points] == [(s.static, s.pipe) for s in speed.scenarios]
    for point, item in zip(result.design_points, speed.scenarios, strict=True):
        loss = float(stage.system.branch_loss(item.target_flow_m3_s / item.pumps_running, item.pipe == "aged"))
        assert point.head_m == pytest.approx(item.system_head_m - loss, rel=1e-12)
        assert point.flow_m3_s == item.target_flow_m3_s and point.speed_ratio == item.speed_ratio


def test_equal_efficiency_flows_of_every_level_at_once(fitted):
    # hand, as above: 0.8 (1 − ½ x²) = L ⇒ x = √(2 (1 − L/0.8)), q = 0.03 (1 ∓ x), inside the data 0..0.05 only
    from hydraulics.speed_map import equal_efficiency_flows_at

    below, above = equal_efficiency_flows_at(fitted, np.array([0.75, 0.65, 0.60, 0.99]))
    x75, x65, x60 = (math.sqrt(2 * (1 - level / 0.8)) for level in (0.75, 0.65, 0.60))
    assert below[:3] == pytest.approx([0.03 * (1 - x75), 0.03 * (1 - x65), 0.03 * (1 - x60)], rel=1e-9)
    assert above[:2] == pytest.approx([0.03 * (1 + x75), 0.03 * (1 + x65)], rel=1e-9)
    assert np.isnan(above[2])  # 0.03 (1 + 0.7071) = 0.0512 m³/s lies beyond the data
    assert np.isnan(below[3]) and np.isnan(above[3])  # 99 % is above the best 80 %: no crossing
