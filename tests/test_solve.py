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
    solution = solve(load_project(SAMPLES[0]))
    for point in (p for p in solution.operating_points if p.found):
        curve = solution.curve(point.static, point.pipe)
        # the system curve is tabulated on a grid: interpolation error only
        assert abs(np.interp(point.flow_m3_s, curve.flow_m3_s, curve.head_m) - point.head_m) < 0.05


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
