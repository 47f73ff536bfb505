"""The combined curve of pumps of different models in parallel at the manifold (hydraulics.pump_set_curves)."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest
from scipy.optimize import brentq

from hydraulics.fluid import fluid_properties
from hydraulics.model import InstalledPump
from hydraulics.pump_fit import fit_pump
from hydraulics.pump_set import run_stages
from hydraulics.pump_set_curves import combined_curve, pump_set_curves
from hydraulics.solve import solve
from hydraulics.system_curve import prepare_system
from tests.installed_pump_fakes import hilltop, jp40, with_assist


@pytest.fixture(scope="module")
def project():
    return with_assist(hilltop(), jp40())


def test_the_tags_of_the_identical_stages_and_one_curve_per_stage_with_other_pumps(project):
    curves = solve(project).pump_set_curves
    assert curves.arrangement_stages == ("P1",)  # one duty pump; P2 is its standby
    assert [c.label for c in curves.curves] == ["P1+P3"]  # the assist pump P3 joins the duty pump
    plain = solve(hilltop()).pump_set_curves
    assert plain.arrangement_stages == ("P1",) and plain.curves == ()


def test_no_pump_no_curves():
    project = replace(hilltop(), pumps=(), arrangement=None)
    assert solve(project).pump_set_curves is None


def test_flows_add_at_equal_head_against_an_independent_root_search(project):
    # Parallel pumps add their flows at equal head (Karassik et al., Pump Handbook, 4th ed.): each pump's
    # flow at a manifold head is found here afresh with scipy's brentq on its own fitted curve less its branch.
    solution = solve(project)
    system = prepare_system(project, solution.fluid)
    fits = {f.pump.pump_id: f for f in solution.pump_fits}
    curve = solution.pump_set_curves.curves[0]
    assert np.all(np.diff(curve.flow_m3_s) >= 0.0) and np.all(np.diff(curve.head_m) <= 0.0)
    np.testing.assert_allclose(curve.flow_m3_s, curve.pump_flow_m3_s.sum(axis=1), rtol=1e-12)
    for head in curve.head_m[:: 11]:
        total = 0.0
        for model_id in ("BP80", "JP40"):
            fitted = fits[model_id]

            def net(q, fitted=fitted, head=head):
                return float(fitted.head(np.array([q]))[0] - system.branch_loss(np.array([q]), False)[0] - head)

            low = fitted.head_peak_flow_m3_s if fitted.has_rising_then_falling_head else 0.0
            if net(low) <= 0.0:
                continue  # this pump cannot open its check valve at this head: no flow
            total += brentq(net, low, fitted.flow_max_m3_s, xtol=1e-12)
        np.testing.assert_allclose(np.interp(-head, -curve.head_m, curve.flow_m3_s), total, rtol=1e-6, atol=1e-9)


def test_the_weaker_pump_adds_nothing_above_its_own_highest_head(project):
    solution = solve(project)
    system = prepare_system(project, solution.fluid)
    jockey = next(f for f in solution.pump_fits if f.pump.pump_id == "JP40")
    curve = solution.pump_set_curves.curves[0]
    weak = curve.pump_flow_m3_s[:, 1]
    # JP40's highest head at the manifold: its shut-off head less its branch loss at no flow (= none)
    top = float(jockey.head(np.array([0.0]))[0] - system.branch_loss(np.array([0.0]), False)[0])
    assert 83.0 < top < 85.0  # near the invented 84 m shut-off (its fitted curve)
    assert np.all(weak[curve.head_m >= top] == 0.0) and np.all(weak[curve.head_m < top] > 0.0)
    assert np.min(np.abs(curve.head_m - top)) < 1e-9  # the kink where it opens is on the grid


def test_two_of_the_same_model_match_the_curve_of_two_identical_pumps():
    # One more BP80 installed beside a single duty BP80 against the arrangement of two identical duty BP80s:
    # for identical pumps the parallel curve is Q = 2 q(H) at equal head (Karassik et al., Pump Handbook).
    base = hilltop()
    fixed = replace(base.arrangement, variable_speed=False)
    beside = replace(base, arrangement=fixed, other_pumps=(InstalledPump("BP80", "duty", motor_efficiency=0.94),))
    two = replace(base, arrangement=replace(fixed, duty_count=2))
    curve = solve(beside).pump_set_curves.curves[0]
    assert curve.label == "P1+P3"  # P2 is the arrangement's standby
    identical = next(c for c in solve(two).pump_curves if c.pumps_running == 2)
    heads = curve.head_m[5:-5]
    expected = np.interp(-heads, -identical.head_at_manifold_m, identical.flow_m3_s)
    np.testing.assert_allclose(np.interp(-heads, -curve.head_m, curve.flow_m3_s), expected, rtol=2e-3)


def test_without_an_arrangement_there_is_nothing_to_draw(project):
    fluid = fluid_properties(project.fluid)
    system = prepare_system(project, fluid)
    fitted = {"BP80": fit_pump(project.pump("BP80"), fluid.density_kg_m3)}
    assert pump_set_curves(replace(project, arrangement=None, other_pumps=()), system, fitted) is None
    stage = run_stages(hilltop())[-1]
    assert combined_curve(system, fitted, stage).label == "P1"
