"""Property tests over random pumps and systems (hypothesis).

Properties: the pump engine never raises for any combination of a valid pump, system and
arrangement; wherever a duty point is reported it lies on both the pump-set curve and the
system curve to 1e-6 m; a point not flagged as extrapolated lies within the tested flows;
every result is JSON-safe.  The random pumps and systems are generated test data.
"""

from __future__ import annotations

import json
from dataclasses import replace
from functools import cache
from pathlib import Path

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from hydraulics.duty_point import STATUS_BEYOND_CURVE, STATUS_CANNOT_LIFT, solve_duty_points
from hydraulics.model import Arrangement, PumpModel
from hydraulics.operating_points import operating_points
from hydraulics.pump_arrangement import arrangement_head
from hydraulics.pump_fit import fit_pump
from tests.pump_fakes import QuadraticSystem

SAMPLES = Path(__file__).resolve().parent.parent / "sample_projects"


@st.composite
def pumps(draw):
    shutoff = draw(st.floats(5.0, 200.0))
    q_max = draw(st.floats(0.005, 2.0))
    end_fraction = draw(st.floats(0.15, 0.85))  # head at the last point as a fraction of shut-off
    rise = draw(st.floats(-0.3, 0.6))           # linear term: > 0 makes a rising-then-falling curve
    n = draw(st.integers(4, 9))
    q_min = draw(st.sampled_from([0.0, 0.0, 0.1, 0.3])) * q_max
    q = np.linspace(q_min, q_max, n)
    x = q / q_max
    c2 = shutoff * (1.0 - end_fraction) + rise * shutoff
    head = shutoff + rise * shutoff * x - c2 * x * x
    noise = np.array(draw(st.lists(st.floats(-0.01, 0.01), min_size=n, max_size=n)))
    head = np.maximum(head * (1.0 + noise), 0.1)
    bep = draw(st.floats(0.4, 1.0))
    eta = np.clip(0.8 * (1.0 - ((x - bep) / bep) ** 2 * 0.6), 0.0, 0.95)
    npsh = 1.0 + 4.0 * x * x
    with_eff = draw(st.booleans())
    return PumpModel(
        "R", "random", 1450.0, tuple(q.tolist()), tuple(head.tolist()),
        efficiency=tuple(eta.tolist()) if with_eff else (),
        npsh_required_m=tuple(npsh.tolist()) if draw(st.booleans()) else (),
        head_fit_order=draw(st.sampled_from([2, 2, 3])),
    )


@st.composite
def scenarios(draw):
    pump = draw(pumps())
    fitted = fit_pump(pump, 1000.0)
    shutoff, q_max = fitted.shutoff_head_m, fitted.flow_max_m3_s
    system = QuadraticSystem(
        static_min_m=draw(st.floats(-0.2, 1.3)) * shutoff,
        static_max_m=draw(st.floats(-0.2, 1.3)) * shutoff,
        k_new=draw(st.floats(0.0, 10.0)) * shutoff / q_max**2,
        k_aged=draw(st.floats(0.0, 10.0)) * shutoff / q_max**2,
        k_suction=draw(st.floats(0.0, 0.5)) * shutoff / q_max**2,
    )
    arrangement = Arrangement(
        "R", duty_count=draw(st.integers(1, 4)), series_stages=draw(st.integers(1, 2)),
        speed_ratio=draw(st.floats(0.5, 1.2)), trim_ratio=draw(st.floats(0.8, 1.0)),
    )
    return fitted, system, arrangement


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(scenarios())
def test_duty_points_lie_on_both_curves(case):
    fitted, system, arr = case
    n = np.arange(1, arr.duty_count + 1)
    for static in ("min", "max"):
        for aged in (False, True):
            hs = system.static_head_m[static]
            duty = solve_duty_points(system, fitted, n, arr.series_stages, arr.speed_ratio, arr.trim_ratio, hs, aged)
            q = duty.flow_m3_s
            ok = duty.found
            pump = arrangement_head(fitted, q[ok], n[ok], arr.series_stages, arr.speed_ratio, arr.trim_ratio)
            sys_head = system.head(q[ok], hs, aged)
            assert np.all(np.abs(pump - sys_head) <= 1e-6)
            assert np.all(np.abs(duty.head_m[ok] - sys_head) <= 1e-6)
            scale = n * arr.speed_ratio * arr.trim_ratio
            inside = ok & ~duty.extrapolated
            assert np.all(q[inside] <= scale[inside] * fitted.flow_max_m3_s * (1 + 1e-9))
            assert np.all(q[inside] >= scale[inside] * fitted.flow_min_m3_s * (1 - 1e-9))
            assert np.all(np.isnan(q[~ok]))
            # A point that cannot lift really has the pump head below the system head at the search start
            q_left = scale * fitted.head_peak_flow_m3_s
            cannot = duty.status == STATUS_CANNOT_LIFT
            left = arrangement_head(fitted, q_left, n, arr.series_stages, arr.speed_ratio, arr.trim_ratio)
            assert np.all(left[cannot] <= system.head(q_left, hs, aged)[cannot])
            beyond = duty.status == STATUS_BEYOND_CURVE
            q_ext = 1.2 * scale * fitted.flow_max_m3_s
            right = arrangement_head(fitted, q_ext, n, arr.series_stages, arr.speed_ratio, arr.trim_ratio)
            assert np.all(right[beyond] > system.head(q_ext, hs, aged)[beyond])
            assert all((r is None) == (s == 0) for r, s in zip(duty.reasons, duty.status.tolist(), strict=True))


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(scenarios(), st.lists(st.floats(0.5, 1.2), min_size=1, max_size=3))
def test_operating_points_never_raise_and_are_json_safe(case, speeds):
    fitted, system, arr = case
    points = operating_points(system, fitted, arr, 8.0, 1000.0, speed_ratios=speeds)
    assert len(points) == 4 * arr.duty_count * len(speeds)
    text = json.dumps([p.to_json_dict() for p in points], allow_nan=False)
    assert text
    for p in points:
        if p.found:
            assert p.flow_m3_s > 0 and p.head_m is not None and p.npsh_available_m is not None
        else:
            assert p.flow_m3_s is None and p.reason


@cache
def _sample_system():
    from hydraulics.fluid import fluid_properties
    from hydraulics.project_io import load_project
    from hydraulics.system_curve import prepare_system

    project = load_project(SAMPLES / "sewage_wet_well.pumpsketch.json")
    return prepare_system(project, fluid_properties(project.fluid))


@settings(max_examples=30, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(pumps(), st.integers(1, 4), st.floats(0.5, 1.2))
def test_random_pumps_on_a_real_pipe_system(pump, duty, speed):
    system = _sample_system()
    # Scale the random pump to the station: flows to 0.02–0.3 m³/s, shut-off well above the static head
    q_scale = 0.15 / max(pump.flow_m3_s)
    pump = replace(pump, flow_m3_s=tuple(q * q_scale for q in pump.flow_m3_s),
                   head_m=tuple(h * 60.0 / max(pump.head_m) for h in pump.head_m))
    fitted = fit_pump(pump, 998.0)
    arr = Arrangement("R", duty_count=duty, speed_ratio=speed)
    points = operating_points(system, fitted, arr, 9.0, 998.0)
    for p in points:
        if p.found:
            # the head seen by the pumps running: common pipework at Q, each pump's branch at Q/N
            h_sys = float(system.head(p.flow_m3_s, p.static_head_m, p.pipe == "aged", p.pumps_running))
            assert abs(p.head_m - h_sys) <= 1e-6
            assert len(p.segment_velocities_m_s) == system.n_segments
