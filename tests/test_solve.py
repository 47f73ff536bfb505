"""Whole-project solving: every sample solves; a saved and reloaded project solves identically."""

from pathlib import Path

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics.model import Arrangement, Fitting, Project, Segment, Site, TankDelivery, WaterFluid
from hydraulics.project_io import load_project, save_project
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve
from tests.test_checks import pump

SAMPLES = sorted((Path(__file__).resolve().parent.parent / "sample_projects").glob("*.pumpsketch.json"))


def test_every_sample_solves_with_operating_points_npsh_and_energy():
    assert len(SAMPLES) >= 3
    for sample in SAMPLES:
        solution = solve(load_project(sample))
        assert solution.static_head_min_m <= solution.static_head_max_m
        n = solution.project.arrangement.duty_count
        assert {p.pumps_running for p in solution.operating_points} == set(range(1, n + 1))
        assert {(p.static, p.pipe) for p in solution.operating_points} == {
            ("min", "new"), ("min", "aged"), ("max", "new"), ("max", "aged")}
        found = [p for p in solution.operating_points if p.found]
        assert found and all(p.npsh_available_m is not None and p.npsh_margin_m is not None for p in found)
        assert solution.energy is not None
        assert solution.project.arrangement.standby_count >= 1  # each sample shows a duty/standby set


def test_duty_point_lies_on_the_system_curve_of_its_scenario():
    from hydraulics.fluid import fluid_properties
    from hydraulics.system_curve import prepare_system

    for sample in SAMPLES:
        project = load_project(sample)
        solution = solve(project)
        system = prepare_system(project, fluid_properties(project.fluid))
        assert system.has_branches  # every sample has each pump's own branch
        for point in (p for p in solution.operating_points if p.found):
            curve = solution.curve(point.static, point.pipe)
            # The plotted system curve is the common pipework's; the pump head less one pump's
            # branch loss at Q/N (the head at the manifold) meets it.  The curve is tabulated
            # on a grid: interpolation error only.
            at_manifold = point.head_m - float(system.branch_loss(point.flow_per_pump_m3_s, point.pipe == "aged"))
            assert abs(np.interp(point.flow_m3_s, curve.flow_m3_s, curve.head_m) - at_manifold) < 0.05


@settings(max_examples=15, deadline=None)
@given(
    suction_low=st.floats(0, 20), swing=st.floats(0, 5), lift=st.floats(5, 35),
    diameter=st.floats(0.12, 0.4), length=st.floats(10, 3000), temperature=st.floats(1, 60),
    elbows=st.integers(0, 6), duty=st.integers(1, 3),
)
def test_saved_and_reloaded_project_solves_identically(tmp_path_factory, suction_low, swing, lift, diameter,
                                                       length, temperature, elbows, duty):
    project = Project(
        name="property test",
        site=Site(suction_low, suction_low + swing, TankDelivery(suction_low + lift, suction_low + lift + swing),
                  pump_datum_m=suction_low - 1.0, design_flow_m3_s=0.03),
        fluid=WaterFluid(temperature),
        segments=(Segment("s", "suction", "pe100", 4.0, diameter * 1.2, fittings=(Fitting("entrance_sharp"),)),
                  Segment("d", "delivery", "ductile_iron_cml", length, diameter,
                          fittings=(Fitting("elbow_90_standard", elbows), Fitting("exit")))),
        pumps=(pump(),),
        arrangement=Arrangement("T1", duty_count=duty),
    )
    path = tmp_path_factory.mktemp("rt") / "p.pumpsketch.json"
    save_project(project, path)
    reloaded = load_project(path)
    assert reloaded == project
    assert solution_to_json_dict(solve(reloaded)) == solution_to_json_dict(solve(project))


def test_pump_curves_are_reused_across_pipe_edits_and_rebuilt_for_a_new_arrangement():
    from dataclasses import replace

    from hydraulics.pump_arrangement import arrangement_curve
    from hydraulics.solve import _cached_fit

    project = load_project(SAMPLES[0])
    first = solve(project)
    longer = replace(project, segments=tuple(replace(s, length_m=s.length_m * 1.5) for s in project.segments))
    again = solve(longer).pump_curves
    # same pump set: the same (read-only) plain curves; the heads at the manifold follow the
    # longer pump branches (more branch loss, so a lower head at the manifold)
    assert all(a.head_m is b.head_m for a, b in zip(again, first.pump_curves, strict=True))
    assert first.pump_curves[0].head_at_manifold_m is not None and again[0].head_at_manifold_m is not None
    assert np.all(again[0].head_at_manifold_m[1:] < first.pump_curves[0].head_at_manifold_m[1:])
    assert not first.pump_curves[0].head_m.flags.writeable
    slower = replace(project, arrangement=replace(project.arrangement, speed_ratio=0.9))
    rebuilt = solve(slower).pump_curves
    assert rebuilt is not first.pump_curves
    # the cache returns exactly what the curve function computes afresh
    fitted = _cached_fit(slower.duty_pump, first.fluid.density_kg_m3)
    fresh = arrangement_curve(fitted, 1, slower.arrangement.series_stages, 0.9, slower.arrangement.trim_ratio,
                              preferred_region=(slower.criteria.preferred_region_low,
                                                slower.criteria.preferred_region_high))
    np.testing.assert_array_equal(rebuilt[0].head_m, fresh.head_m)
    np.testing.assert_array_equal(rebuilt[0].flow_m3_s, fresh.flow_m3_s)


def test_the_curves_stage_holds_what_the_plot_draws_and_completion_adds_checks_and_variable_speed():
    from hydraulics.solve import complete_solution, solve_curves

    with_findings = 0
    for sample in SAMPLES:
        stage = solve_curves(load_project(sample))
        first = stage.solution
        assert not first.complete and first.findings == () and first.variable_speed is None
        assert first.operating_points and first.pump_curves and first.energy is not None
        full = complete_solution(stage)
        assert full.complete and full.variable_speed is not None
        with_findings += bool(full.findings)
        # completion passes the first stage's results on as the very same objects
        for name in ("curves", "segments", "operating_points", "pump_curves", "energy", "npsh_available_curve"):
            assert getattr(full, name) is getattr(first, name), name
        # and a one-call solve gives the same numbers (here: every operating point's flow)
        again = solve(load_project(sample))
        assert [p.flow_m3_s for p in again.operating_points] == [p.flow_m3_s for p in full.operating_points]
        assert [f.code for f in again.findings] == [f.code for f in full.findings]
    assert with_findings  # the checks ran: some sample has a finding (the sewage and river ones do)


def test_a_project_without_pump_solves_in_both_stages():
    from dataclasses import replace

    from hydraulics.solve import complete_solution, solve_curves

    project = replace(load_project(SAMPLES[0]), pumps=(), arrangement=None)
    stage = solve_curves(project)
    assert stage.fitted is None and stage.solution.operating_points == ()
    full = complete_solution(stage)
    assert full.complete and full.curves is stage.solution.curves
    assert all(f.code != "speed_target_unreachable" for f in full.findings)
