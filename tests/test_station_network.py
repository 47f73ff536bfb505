"""The station as built: each pump's own branch carries that pump's flow, the common pipework the station flow.

The reference here is an independent solve written in the test: Darcy–Weisbach with the
Colebrook–White friction factor from ``fluids.friction.friction_factor`` (its default solution
of the Colebrook equation; test-only
reference library), fitting K values from ``fluids.fittings`` with Crane's f_T from the
rough-pipe law that Crane TP-410 states (the method the fittings catalogue names), and
``scipy.optimize.brentq`` as the bracketing root finder.  The pump curve of the reference is
the engine's own fitted polynomial (``solution.pump_fits[0].head``; the fit is tested in
tests/test_pump_fit.py), scaled for N pumps in parallel by continuity (each pump Q/N, same
head).  Fluid properties and the atmospheric pressure are taken from the solution (tested in
their own modules).  The project is an invented booster for these checks, not real data.
"""

import math
from dataclasses import replace

import fluids.fittings as ff
import fluids.friction
import numpy as np
import pytest
from scipy.optimize import brentq

from hydraulics.constants import STANDARD_GRAVITY_M_S2 as G
from hydraulics.model import Arrangement, Fitting, Project, PumpModel, Segment, Site, TankDelivery, WaterFluid
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import solve
from hydraulics.system_curve import prepare_system

# ----------------------------------------------------------------------------------- the project
SUCTION_LOW, SUCTION_HIGH, DELIVERY_LOW, DELIVERY_HIGH, PUMP_DATUM = 10.0, 11.0, 40.0, 42.0, 9.0
STATIC = {"min": DELIVERY_LOW - SUCTION_HIGH, "max": DELIVERY_HIGH - SUCTION_LOW}  # definition of static head
DESIGN_FLOW = 0.06
A_PUMP, B_PUMP, Q_PUMP_MAX = 52.0, 9000.0, 0.05  # invented test pump: H = 52 − 9000 Q² per pump

# (name, side, carries, length m, bore m, roughness new m, roughness aged m, fittings)
PIPEWORK = (
    ("suction header", "suction", "station", 10.0, 0.35, 0.1e-3, 1.0e-3, (("entrance_sharp", 1),)),
    ("pump suction branch", "suction", "pump", 3.0, 0.20, 0.1e-3, 1.0e-3,
     (("gate_valve_open", 1), ("bend_90_r_d_1", 1))),
    ("pump discharge branch", "delivery", "pump", 5.0, 0.15, 0.1e-3, 1.0e-3,
     (("swing_check_valve", 1), ("gate_valve_open", 1), ("bend_90_r_d_1", 2))),
    ("manifold and main", "delivery", "station", 2500.0, 0.30, 0.1e-3, 1.0e-3,
     (("bend_90_r_d_1", 4), ("exit", 1))),
)
BRANCHES = [row[0] for row in PIPEWORK if row[2] == "pump"]


def pump_model() -> PumpModel:
    q = np.linspace(0.0, Q_PUMP_MAX, 6)
    eta = 0.80 * (1.0 - ((q - 0.032) / 0.032) ** 2)
    return PumpModel(pump_id="B1", name="booster test pump", rated_speed_rpm=2900.0, flow_m3_s=tuple(q),
                     head_m=tuple(A_PUMP - B_PUMP * q * q), efficiency=tuple(np.clip(eta, 0.05, None)),
                     npsh_required_m=tuple(2.0 + 600.0 * q * q), efficiency_fit_order=2)


def station(carries_override: str | None = None, duty_count: int = 2) -> Project:
    """The test booster; ``carries_override="station"`` models every segment as common pipework."""
    segments = tuple(
        Segment(name, side, "ductile_iron_cml", length, bore, roughness_new_m=eps_new, roughness_aged_m=eps_aged,
                fittings=tuple(Fitting(kind, count) for kind, count in fits),
                carries=carries_override or carries)  # type: ignore[arg-type]
        for name, side, carries, length, bore, eps_new, eps_aged, fits in PIPEWORK)
    return Project(
        name="branch test booster",
        site=Site(SUCTION_LOW, SUCTION_HIGH, TankDelivery(DELIVERY_LOW, DELIVERY_HIGH), pump_datum_m=PUMP_DATUM,
                  design_flow_m3_s=DESIGN_FLOW),
        fluid=WaterFluid(15.0), segments=segments, pumps=(pump_model(),),
        arrangement=Arrangement("B1", duty_count=duty_count, standby_count=1),
    )


# ------------------------------------------------------------------------- the independent model
CRANE_STEEL_EPS_M = 0.00015 * 0.3048  # Crane TP-410: clean commercial steel, 0.00015 ft


def crane_f_t(d: float) -> float:
    """Crane TP-410's fully turbulent f_T from the rough-pipe law 1/√f = −2 log10(ε/3.7D)."""
    return 0.25 / math.log10(CRANE_STEEL_EPS_M / (3.7 * d)) ** 2


def fitting_k(kind: str, d: float) -> float:
    """K of one fitting by fluids.fittings (Crane TP-410 methods; test-only reference)."""
    fd = crane_f_t(d)
    if kind == "entrance_sharp":
        return ff.entrance_sharp(method="Crane")
    if kind == "exit":
        return ff.exit_normal()
    if kind == "gate_valve_open":
        return ff.K_gate_valve_Crane(d, d, 0.0, fd=fd)
    if kind == "swing_check_valve":
        return ff.K_swing_check_valve_Crane(d, fd=fd, angled=True)
    if kind == "bend_90_r_d_1":  # Crane's n for r/d = 1 as tabulated in fluids.fittings
        return ff.bend_rounded_Crane_fds[ff.bend_rounded_Crane_ratios.index(1.0)] * fd
    raise KeyError(kind)


def segment_loss(row, flow: float, aged: bool, nu: float) -> float:
    """Darcy–Weisbach with Colebrook (fluids) plus Σ K v²/2g for one segment at ``flow``."""
    _, _, _, length, d, eps_new, eps_aged, fits = row
    if flow == 0.0:
        return 0.0
    v = flow / (math.pi * d * d / 4.0)
    # Colebrook–White solved to machine precision by fluids' default method (Clamond 2009)
    f = fluids.friction.friction_factor(v * d / nu, eD=(eps_aged if aged else eps_new) / d)
    k = sum(count * fitting_k(kind, d) for kind, count in fits)
    return (f * length / d + k) * v * v / (2.0 * G)


def losses(flow: float, n: int, aged: bool, nu: float, *, sides=("suction", "delivery"),
           branch_at_station_flow: bool = False) -> tuple[float, float]:
    """(common pipework at Q, one pump's branch at Q/N) over ``sides``.

    ``branch_at_station_flow`` puts the branch at Q instead: the old all-common model.
    """
    station_part = sum(segment_loss(r, flow, aged, nu) for r in PIPEWORK if r[2] == "station" and r[1] in sides)
    branch_flow = flow if branch_at_station_flow else flow / n
    branch_part = sum(segment_loss(r, branch_flow, aged, nu) for r in PIPEWORK if r[2] == "pump" and r[1] in sides)
    return station_part, branch_part


def reference_duty(solution, static: str, aged: bool, n: int, branch_at_station_flow: bool = False) -> float:
    """Station flow where N parallel pumps meet the whole system, by brentq."""
    pump_head = solution.pump_fits[0].head
    nu = solution.fluid.kinematic_viscosity_m2_s

    def residual(q: float) -> float:
        common, branch = losses(q, n, aged, nu, branch_at_station_flow=branch_at_station_flow)
        return float(pump_head(q / n)) - (STATIC[static] + common + branch)

    return brentq(residual, 0.0, n * Q_PUMP_MAX * 1.2, xtol=1e-14, rtol=1e-14)


@pytest.fixture(scope="module")
def solved():
    return solve(station())


# ----------------------------------------------------------------------------------------- tests
def test_duty_points_of_one_and_two_pumps_match_the_independent_solve(solved):
    points = [p for p in solved.operating_points if p.speed_ratio == 1.0]
    assert {p.pumps_running for p in points} == {1, 2} and all(p.found for p in points)
    for p in points:
        expected = reference_duty(solved, p.static, p.pipe == "aged", p.pumps_running)  # independent solve (brentq)
        assert p.flow_m3_s == pytest.approx(expected, rel=1e-9)
        assert p.flow_per_pump_m3_s == pytest.approx(expected / p.pumps_running, rel=1e-9)  # continuity
        assert p.head_m == pytest.approx(A_PUMP - B_PUMP * (expected / p.pumps_running) ** 2, rel=1e-9)  # pump data


def test_one_pump_running_leaves_the_idle_branch_out():
    # With one pump the second branch carries nothing: the result equals a project that models
    # one pump's path (its branch included) as plain pipework carrying the station flow.
    with_branches = solve(station())
    single_path = solve(station(carries_override="station", duty_count=1))
    one = {(p.static, p.pipe): p for p in with_branches.operating_points if p.pumps_running == 1}
    plain = {(p.static, p.pipe): p for p in single_path.operating_points}
    assert one.keys() == plain.keys()
    for key, p in one.items():
        assert p.flow_m3_s == pytest.approx(plain[key].flow_m3_s, rel=1e-12)  # same physics, same numbers
        assert p.npsh_available_m == pytest.approx(plain[key].npsh_available_m, rel=1e-12)
        assert p.segment_velocities_m_s == pytest.approx(plain[key].segment_velocities_m_s, rel=1e-12)


def test_modelling_the_branches_as_common_pipework_overstates_their_loss_by_about_n_squared():
    right = solve(station())
    wrong = solve(station(carries_override="station"))
    nu = right.fluid.kinematic_viscosity_m2_s
    # the engine with everything "station" reproduces the old model: branch at Q (independent solve)
    for p in (x for x in wrong.operating_points if x.pumps_running == 2):
        assert p.flow_m3_s == pytest.approx(reference_duty(wrong, p.static, p.pipe == "aged", 2,
                                                           branch_at_station_flow=True), rel=1e-9)
    # the branch loss at the design flow: per pump (Q/2) against the whole flow (Q)
    branch_right = sum(s.friction_loss_m + s.minor_loss_m for s in right.segments if s.carries == "pump")
    branch_wrong = sum(s.friction_loss_m + s.minor_loss_m for s in wrong.segments if s.name in BRANCHES)
    assert branch_right == pytest.approx(losses(DESIGN_FLOW, 2, False, nu)[1], rel=1e-9)  # independent model
    assert branch_wrong == pytest.approx(losses(DESIGN_FLOW, 2, False, nu, branch_at_station_flow=True)[1],
                                         rel=1e-9)  # independent model
    ratio = branch_wrong / branch_right
    assert 3.5 < ratio <= 4.0  # N² = 4 for the minor losses; friction grows a little less (f falls with Re)
    # the old model's duty with two pumps is lower, by a margin far above the solver tolerance
    key = ("max", "aged")
    duty_right = next(p for p in right.operating_points if (p.static, p.pipe) == key and p.pumps_running == 2)
    duty_wrong = next(p for p in wrong.operating_points if (p.static, p.pipe) == key and p.pumps_running == 2)
    assert duty_wrong.flow_m3_s < duty_right.flow_m3_s * 0.99
    # and it sees a velocity in the discharge branch twice the real one
    i = [s.name for s in right.segments].index("pump discharge branch")
    assert duty_wrong.segment_velocities_m_s[i] / duty_wrong.flow_m3_s == pytest.approx(
        2.0 * duty_right.segment_velocities_m_s[i] / duty_right.flow_m3_s, rel=1e-12)  # v = Q/A against (Q/2)/A


def test_npsh_available_subtracts_the_common_suction_at_q_and_one_suction_branch_at_q_over_n(solved):
    fluid = solved.fluid
    # (p_atm − p_v)/(ρ g) + (suction level − pump datum): definition of NPSH available (ISO 9906), each
    # scenario at its own suction level: minimum static = lowest delivery − highest suction level, so the
    # "min" points stand at SUCTION_HIGH and the "max" points at SUCTION_LOW (definition of static head)
    head_atm = (solved.atmospheric_pressure_pa - fluid.vapour_pressure_pa) / (fluid.density_kg_m3 * G)
    level = {"min": SUCTION_HIGH, "max": SUCTION_LOW}
    for p in (x for x in solved.operating_points if x.found):
        static_part = head_atm + level[p.static] - PUMP_DATUM
        common, branch = losses(p.flow_m3_s, p.pumps_running, p.pipe == "aged", fluid.kinematic_viscosity_m2_s,
                                sides=("suction",))
        assert branch > 0.0 and common > 0.0
        assert p.npsh_available_m == pytest.approx(static_part - common - branch, rel=1e-9)  # independent model
    curve = solved.npsh_available_curve
    assert curve.pumps_running == 2  # the duty count, on the station-flow axis
    for q in (0.02, 0.05, 0.08):
        common, branch = losses(q, 2, True, fluid.kinematic_viscosity_m2_s, sides=("suction",))
        assert np.interp(q, curve.flow_m3_s, curve.available_aged_m) == pytest.approx(
            head_atm + SUCTION_LOW - PUMP_DATUM - common - branch,
            abs=2e-4)  # the curve at the lowest suction level; tabulated: linear interpolation error only


def test_branch_segments_run_at_the_per_pump_flow(solved):
    area = {row[0]: math.pi * row[4] ** 2 / 4.0 for row in PIPEWORK}
    names = [s.name for s in solved.segments]
    for s in solved.segments:  # the segment table at design flow, both duty pumps running
        q = DESIGN_FLOW / 2 if s.name in BRANCHES else DESIGN_FLOW
        assert (s.carries == "pump") == (s.name in BRANCHES) and s.pumps_running == 2
        assert s.flow_m3_s == pytest.approx(q, rel=1e-15) and s.velocity_m_s == pytest.approx(q / area[s.name],
                                                                                               rel=1e-12)  # v = Q/A
    for p in (x for x in solved.operating_points if x.found):
        for name, v in zip(names, p.segment_velocities_m_s, strict=True):
            q = p.flow_m3_s / p.pumps_running if name in BRANCHES else p.flow_m3_s
            assert v == pytest.approx(q / area[name], rel=1e-12)  # v = Q/A


def test_pump_curves_at_the_manifold_are_net_of_one_branch_at_the_per_pump_flow(solved):
    nu = solved.fluid.kinematic_viscosity_m2_s
    for curve in solved.pump_curves:
        assert curve.head_at_manifold_m is not None and curve.head_at_manifold_aged_m is not None
        size = len(curve.flow_m3_s)
        for j in (size // 4, size // 2, size - 1):  # turbulent flow in every branch (the reference is Colebrook)
            q = float(curve.flow_m3_s[j])
            for aged, head in ((False, curve.head_at_manifold_m), (True, curve.head_at_manifold_aged_m)):
                expected = curve.head_m[j] - losses(q, curve.pumps_running, aged, nu)[1]  # independent model
                assert head[j] == pytest.approx(expected, rel=1e-9)
    # the duty point lies where the manifold curve crosses the common system curve
    for p in (x for x in solved.operating_points if x.found):
        curve = next(c for c in solved.pump_curves if c.pumps_running == p.pumps_running)
        manifold = curve.head_at_manifold_aged_m if p.pipe == "aged" else curve.head_at_manifold_m
        system = solved.curve(p.static, p.pipe)
        gap = np.interp(p.flow_m3_s, curve.flow_m3_s, manifold) - np.interp(p.flow_m3_s, system.flow_m3_s,
                                                                             system.head_m)
        assert abs(gap) < 0.01  # tabulated curves: interpolation error only


def test_without_branches_there_is_no_manifold_curve_and_the_pumps_running_change_nothing():
    project = station(carries_override="station")
    solution = solve(project)
    assert all(c.head_at_manifold_m is None and c.head_at_manifold_aged_m is None for c in solution.pump_curves)
    assert solution_to_json_dict(solution)["branches"] == []
    system = prepare_system(project, solution.fluid)
    q = np.linspace(0.0, 0.1, 41)
    aged = np.arange(q.size) % 2 == 0
    fric, minor = system.losses(q, aged)
    one = system.head(q, 30.0, aged, 1)
    np.testing.assert_array_equal(one, 30.0 + fric + minor)  # the version-1 formula, bit for bit
    for n in (2, 3):
        np.testing.assert_array_equal(system.head(q, 30.0, aged, n), one)
        np.testing.assert_array_equal(system.suction_loss(q, aged, n), system.suction_loss(q, aged))
        np.testing.assert_array_equal(system.segment_velocities(q, n), system.segment_velocities(q))


def test_head_and_suction_loss_are_vectorised_over_flows_and_pumps_running(solved):
    system = prepare_system(solved.project, solved.fluid)
    nu = solved.fluid.kinematic_viscosity_m2_s
    q = np.array([0.01, 0.04, 0.07, 0.09])
    n = np.array([1.0, 2.0, 1.0, 2.0])
    aged = np.array([False, True, True, False])
    head = system.head(q, 29.0, aged, n)
    suction = system.suction_loss(q, aged, n)
    for i in range(q.size):
        common, branch = losses(q[i], int(n[i]), bool(aged[i]), nu)
        assert head[i] == pytest.approx(29.0 + common + branch, rel=1e-9)  # independent model
        assert suction[i] == pytest.approx(sum(losses(q[i], int(n[i]), bool(aged[i]), nu, sides=("suction",))),
                                           rel=1e-9)  # independent model
    assert system.branch_loss(q, aged) == pytest.approx(
        [losses(x, 1, a, nu)[1] for x, a in zip(q, aged, strict=True)], rel=1e-9)  # independent model


def test_branch_velocity_findings_quote_the_per_pump_flow():
    # a discharge branch too small for one pump: the velocity check names the per-pump flow
    project = station()
    small = replace(project.segments[2], internal_diameter_m=0.10)
    solution = solve(replace(project, segments=project.segments[:2] + (small,) + project.segments[3:]))
    high = [f for f in solution.findings if f.code == "velocity_high" and "pump discharge branch" in f.where]
    assert len(high) == 1 and " per pump is above" in high[0].message
    v, q = high[0].values[0][1], high[0].values[1][1]
    assert v == pytest.approx(q / (math.pi * 0.10**2 / 4.0), rel=1e-12)  # v = Q/A at the quoted per-pump flow
    found = [p for p in solution.operating_points if p.found]
    assert q == pytest.approx(max(p.flow_m3_s / p.pumps_running for p in found), rel=1e-12)  # the highest per pump
    assert all("per pump" not in f.message for f in solution.findings
               if f.code.startswith("velocity") and "manifold and main" in f.where)


def test_json_lists_the_branches_per_pump(solved):
    data = solution_to_json_dict(solved)
    assert [b["name"] for b in data["branches"]] == BRANCHES
    for branch in data["branches"]:
        assert branch["carries"] == "pump" and branch["pumps_running"] == 2
        assert branch["flow_m3_s"] == pytest.approx(DESIGN_FLOW / 2, rel=1e-15)  # two duty pumps share the flow
    by_name = {s["name"]: s for s in data["segments"]}
    assert by_name["manifold and main"]["carries"] == "station"
    assert by_name["manifold and main"]["flow_m3_s"] == pytest.approx(DESIGN_FLOW, rel=1e-15)
    curves = [c.to_json_dict() for c in solved.pump_curves]
    assert all(len(c["head_at_manifold_m"]) == len(c["head_m"]) for c in curves)


def test_text_summary_marks_the_branch_rows_per_pump(solved):
    from app.text_report import summary_text

    lines = summary_text(solved).splitlines()
    assert any("'per pump' rows carry one of 2 duty pumps, 30.0 L/s" in line for line in lines)  # 60 L/s / 2
    rows = {name: next(line for line in lines if line.strip().startswith(name)) for name in
            ("pump suction branch", "pump discharge branch", "manifold and main")}
    assert "suction per pump" in rows["pump suction branch"] and "delivery per pump" in rows["pump discharge branch"]
    assert "per pump" not in rows["manifold and main"]
