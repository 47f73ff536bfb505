"""System curves: static heads the right way round, head breakdown, monotonic curves."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.model import Fitting, PressurisedDelivery, Project, Segment, Site, TankDelivery, WaterFluid
from hydraulics.results import FluidProperties
from hydraulics.system_curve import prepare_system, segment_results, static_heads, system_curves

WATER_15C = FluidProperties(15.0, 999.1, 1.1386e-6, 1705.0, "test water")  # demo values for unit tests


def project(**site_changes) -> Project:
    site = dict(suction_level_low_m=10.0, suction_level_high_m=12.5,
                delivery=TankDelivery(level_low_m=50.0, level_high_m=54.0),
                pump_datum_m=9.0, design_flow_m3_s=0.05)
    site.update(site_changes)
    return Project(
        name="t", site=Site(**site), fluid=WaterFluid(15.0),
        segments=(
            Segment("suction", "suction", "ductile_iron_cml", 6.0, 0.25,
                    fittings=(Fitting("entrance_sharp"), Fitting("gate_valve_open"))),
            Segment("main", "delivery", "ductile_iron_cml", 1500.0, 0.2,
                    fittings=(Fitting("elbow_90_standard", 4), Fitting("exit"))),
        ),
    )


def test_static_heads_extremes_the_right_way_round():
    # max static = highest delivery − lowest suction; min = lowest delivery − highest suction (definition)
    heads = static_heads(project().site, 1000.0)
    assert heads == {"max": 54.0 - 10.0, "min": 50.0 - 12.5}


def test_pressurised_delivery_adds_pressure_head():
    site = project(delivery=PressurisedDelivery(elevation_m=30.0, pressure_pa=300_000.0)).site
    heads = static_heads(site, 1000.0)
    # p / (ρ g) hydrostatics: 300 kPa / (1000 kg/m³ × 9.80665 m/s²) = 30.5915 m (hand calculation)
    assert heads["max"] == pytest.approx(30.0 + 300_000.0 / (1000.0 * G) - 10.0, rel=1e-12)
    assert heads["min"] == pytest.approx(30.0 + 300_000.0 / (1000.0 * G) - 12.5, rel=1e-12)


@given(st.floats(-100, 100), st.floats(0, 20), st.floats(-100, 300), st.floats(0, 20))
def test_minimum_static_never_exceeds_maximum(s_low, s_swing, d_low, d_swing):
    site = Site(s_low, s_low + s_swing, TankDelivery(d_low, d_low + d_swing), 0.0, 0.01)
    heads = static_heads(site, 1000.0)
    assert heads["min"] <= heads["max"]


def test_curve_breakdown_adds_up_and_zero_flow_is_static():
    system = prepare_system(project(), WATER_15C)
    flows = np.linspace(0, 0.1, 51)
    for curve in system_curves(system, flows):
        assert np.all(np.isfinite(curve.head_m))
        np.testing.assert_allclose(curve.head_m, curve.static_m + curve.friction_m + curve.minor_m, rtol=1e-14)
        assert curve.head_m[0] == system.static_head_m[curve.static]
        assert curve.friction_m[0] == 0.0 and curve.minor_m[0] == 0.0
    curves = {(c.static, c.pipe): c for c in system_curves(system, flows)}
    assert np.all(curves[("max", "aged")].head_m[1:] > curves[("max", "new")].head_m[1:])


def test_friction_loss_matches_reference_library():
    import fluids.friction

    system = prepare_system(project(), WATER_15C)
    q = 0.05
    main = segment_results(system, q)[1]
    v = q / (np.pi * 0.2**2 / 4)
    re = v * 0.2 / WATER_15C.kinematic_viscosity_m2_s
    f = fluids.friction.Colebrook(re, system.roughness_new_m[1] / 0.2)  # fluids, test-only reference
    assert main.velocity_m_s == pytest.approx(v, rel=1e-14)
    assert main.reynolds == pytest.approx(re, rel=1e-14)
    assert main.friction_factor == pytest.approx(f, rel=1e-9)
    assert main.friction_loss_m == pytest.approx(f * 1500 / 0.2 * v**2 / (2 * G), rel=1e-9)
    # minor losses K v²/2g with K referred to the segment's own velocity
    assert main.minor_loss_m == pytest.approx(main.minor_k_total * v**2 / (2 * G), rel=1e-12)


@settings(max_examples=40, deadline=None)
@given(st.floats(0.05, 0.8), st.floats(1.0, 5000.0), st.floats(0.0, 0.002), st.floats(0.0, 30.0),
       st.sampled_from(["darcy_weisbach", "hazen_williams"]))
def test_system_curve_is_continuous_and_non_decreasing(diameter, length, roughness, k, method):
    base = project()
    seg = Segment("main", "delivery", "pe100", length, diameter, roughness_new_m=roughness,
                  fittings=(Fitting("exit", k_override=k),))
    p = Project(name="t", site=base.site, segments=(seg,), friction_method=method)
    system = prepare_system(p, WATER_15C)
    flows = np.linspace(0.0, 0.5, 2001)
    for curve in system_curves(system, flows):
        steps = np.diff(curve.head_m)
        assert np.all(steps >= -1e-12)
        # continuity: no jump larger than the local slope allows on a fine grid
        assert np.max(steps) <= max(1e-9, 50 * np.median(steps[steps > 0]) if np.any(steps > 0) else 1e-9)


def test_parallel_pipes_share_the_flow():
    base = project()
    one = Segment("main", "delivery", "pe100", 800.0, 0.15)
    two = Segment("main", "delivery", "pe100", 800.0, 0.15, parallel_pipes=2)
    sys1 = prepare_system(Project(name="a", site=base.site, segments=(one,)), WATER_15C)
    sys2 = prepare_system(Project(name="b", site=base.site, segments=(two,)), WATER_15C)
    # two identical pipes at 2Q lose the same head as one pipe at Q (continuity)
    assert sys2.losses(0.06, False)[0] == pytest.approx(sys1.losses(0.03, False)[0], rel=1e-14)


def test_unknown_material_names_the_segment():
    from hydraulics.model import ModelError

    base = project()
    bad = Project(name="t", site=base.site, segments=(Segment("x", "delivery", "unobtainium", 10.0, 0.1),))
    with pytest.raises(ModelError) as info:
        prepare_system(bad, WATER_15C)
    assert info.value.field_path == "segments[0].material"


@pytest.mark.parametrize("method", ["darcy_weisbach", "hazen_williams"])
def test_mixed_pipe_states_in_one_pass_equal_each_state_alone(method):
    # One evaluation over flows of both pipe states (as the duty-point solver asks for)
    # must give each flow exactly what its own pipe state gives alone (same formulas).
    base = project()
    system = prepare_system(Project(name="t", site=base.site, segments=base.segments, friction_method=method),
                            WATER_15C)
    flows = np.array([[0.0, 0.01, 0.03], [0.05, 0.08, 0.12]])
    aged = np.array([[True, False, True], [False, True, False]])
    fric, minor = system.losses(flows, aged)
    fric_new, minor_new = system.losses(flows, False)
    fric_aged, _ = system.losses(flows, True)
    assert fric.shape == minor.shape == flows.shape
    np.testing.assert_array_equal(fric, np.where(aged, fric_aged, fric_new))
    np.testing.assert_array_equal(minor, minor_new)
    assert np.all(fric_aged[flows > 0] > fric_new[flows > 0])  # aged pipe is rougher in every material


def test_losses_sum_the_segment_table():
    # The matrix–vector totals must equal the per-segment friction and minor losses summed.
    system = prepare_system(project(), WATER_15C)
    for aged in (False, True):
        for q in (0.004, 0.05, 0.11):
            rows = segment_results(system, q, aged=aged)
            fric, minor = system.losses(q, aged)
            assert float(fric) == pytest.approx(sum(r.friction_loss_m for r in rows), rel=1e-12)
            assert float(minor) == pytest.approx(sum(r.minor_loss_m for r in rows), rel=1e-12)


def test_suction_loss_sums_the_suction_rows_of_the_segment_table():
    system = prepare_system(project(), WATER_15C)
    flows = np.array([0.0, 0.02, 0.07])
    for aged in (False, True):
        expected = [sum(r.friction_loss_m + r.minor_loss_m for r in segment_results(system, q, aged=aged)
                        if r.side == "suction") for q in flows]
        np.testing.assert_allclose(system.suction_loss(flows, aged), expected, rtol=1e-12, atol=0.0)
    mixed = system.suction_loss(flows, np.array([True, False, True]))
    np.testing.assert_array_equal(mixed, np.where([True, False, True], system.suction_loss(flows, True),
                                                  system.suction_loss(flows, False)))


def test_no_suction_segments_means_no_suction_loss():
    base = project()
    delivery_only = Project(name="t", site=base.site, segments=base.segments[1:])
    system = prepare_system(delivery_only, WATER_15C)
    np.testing.assert_array_equal(system.suction_loss(np.array([0.01, 0.05]), False), [0.0, 0.0])
