"""The three bundled samples as built: each pump's own branch, the common manifold and main, the profile.

Hand checks of each sample at its design duty (the design flow shared by the duty pumps,
new pipe): the per-pump and station flows and velocities, the loss through one pump's
branch and the loss of the common pipework.  The reference is Darcy–Weisbach with the
Colebrook–White friction factor of ``fluids.friction.friction_factor`` (test-only reference
library, its default solution of the Colebrook equation), Crane TP-410 fitting K = n·f_T with
f_T from the rough-pipe law 1/√f_T = −2 log10(ε/(3.7 D)), ε = 0.00015 ft = 0.04572 mm, the
n of each fitting from resources/fittings.json, and the reducer and expander K from
``fluids.fittings`` (Crane method).  The water's kinematic viscosity is the solution's
(IAPWS 2008, tested in tests/test_water_properties.py); bores from the pipe-series
catalogue, roughness from resources/materials.json.  The sample data are invented.
"""

import math
from pathlib import Path

import fluids.fittings as ff
import fluids.friction
import numpy as np
import pytest

from hydraulics.model import Project
from hydraulics.project_io import load_project
from hydraulics.solve import solve
from hydraulics.system_curve import prepare_system

G = 9.80665  # standard acceleration of gravity (CGPM 1901)
SAMPLES = Path(__file__).resolve().parent.parent / "sample_projects"
NAMES = ("hilltop_booster", "river_intake", "sewage_wet_well")

# Crane TP-410 n values (resources/fittings.json, method "crane")
N_GATE, N_SWING_CHECK, N_BEND_R_D_1, N_ELBOW_LR, N_ELBOW_45 = 8.0, 100.0, 20.0, 14.0, 16.0
N_TEE_RUN, N_TEE_BRANCH, N_BUTTERFLY_10_14, N_BUTTERFLY_16_24 = 20.0, 60.0, 35.0, 25.0
K_BELLMOUTH, K_SHARP_ENTRANCE, K_EXIT = 0.04, 0.5, 1.0  # resources/fittings.json, method "constant"

# Roughness (resources/materials.json, new pipe)
EPS_DUCTILE, EPS_STEEL, EPS_SEWAGE_MAIN = 0.03e-3, 0.045e-3, 0.15e-3


def _load(name: str) -> Project:
    return load_project(SAMPLES / f"{name}.pumpsketch.json")


def _f_t(d: float) -> float:
    """Crane TP-410 fully turbulent f_T, rough-pipe law at ε = 0.04572 mm."""
    return 0.25 / math.log10(0.04572e-3 / (3.7 * d)) ** 2


def _loss(q: float, d: float, length: float, eps: float, k: float, nu: float) -> float:
    """Darcy–Weisbach friction plus minor loss h = (f L/D + ΣK) v²/2g, f from fluids (Colebrook)."""
    v = q / (math.pi * d * d / 4.0)
    f = fluids.friction.friction_factor(Re=v * d / nu, eD=eps / d)
    return (f * length / d + k) * v * v / (2.0 * G)


def _expander_k(d_small: float, d_seg: float) -> float:
    """Conical 15° expander: fluids' Crane K at the small-bore velocity, referred to the segment's by (D/d)⁴."""
    return ff.diffuser_conical(d_small, d_seg, angle=15.0, method="Crane") * (d_seg / d_small) ** 4


def _reducer_k(d_large: float, d_seg: float) -> float:
    """Conical 15° reducer: fluids' Crane K, which refers to the small-bore (the segment's) velocity."""
    return ff.contraction_conical_Crane(d_large, d_seg, angle=15.0)


# ----------------------------------------------------------------------------------- hand checks
def test_sewage_sample_branch_and_main_at_the_two_pump_design_duty():
    project = _load("sewage_wet_well")
    solution = solve(project)
    nu = solution.fluid.kinematic_viscosity_m2_s
    system = prepare_system(project, solution.fluid)
    d_250, d_200, d_300, d_pe400 = 0.2570, 0.2066, 0.3076, 0.3526  # DN 250/200/300 EN 545 C40; PE100 SDR17 400
    q_station, n = 0.110, 2
    q_pump = q_station / n  # hand: 0.110 / 2 = 0.055 m³/s per pump

    # Velocities: v = Q / (π D² / 4)
    branch = solution.segments[2]  # each pump's DN 200 discharge branch
    main = solution.segments[4]  # the PE rising main to Gallows Ridge
    assert (branch.carries, main.carries) == ("pump", "station")
    assert branch.flow_m3_s == pytest.approx(q_pump, rel=1e-12)
    assert main.flow_m3_s == pytest.approx(q_station, rel=1e-12)
    assert branch.velocity_m_s == pytest.approx(1.6406, abs=1e-4)  # hand: 0.055 / 0.033523 m²
    assert main.velocity_m_s == pytest.approx(1.1265, abs=1e-4)  # hand: 0.110 / 0.097646 m²
    assert main.velocity_m_s >= 0.75  # sewage self-cleansing minimum (common practice), met at the design flow

    # Discharge branch ΣK: (swing check 100 + gate 8 + 2 bends r/d = 1 × 20) f_T + 15° expander 150 → 206.6 mm.
    # f_T(206.6 mm) = 0.25 / log10(0.04572 / (3.7 × 206.6))² = 0.25 / 17.836 = 0.014017; 148 × 0.014017 = 2.0745.
    # Expander: Crane K₁ = 2.6 sin 7.5° (1 − (150/206.6)²)² = 2.6 × 0.13053 × 0.22360 = 0.07588 at the 150 mm
    # velocity, × (206.6/150)⁴ = 3.5988 → 0.2731 at the branch velocity; ΣK = 2.3476.
    k_discharge = (N_SWING_CHECK + N_GATE + 2 * N_BEND_R_D_1) * _f_t(d_200) + _expander_k(0.150, d_200)
    assert k_discharge == pytest.approx(2.3476, abs=1e-4)
    # Friction: Re = 1.6406 × 0.2066 / 1.1386e-6 = 2.977e5, ε/D = 0.03 / 206.6 = 1.452e-4, f = 0.01583 (fluids);
    # h = (0.01583 × 6 / 0.2066 + 2.3476) × 1.6406² / 19.6133 = (0.4597 + 2.3476) × 0.13723 = 0.3853 m.
    h_discharge = _loss(q_pump, d_200, 6.0, EPS_DUCTILE, k_discharge, nu)
    assert h_discharge == pytest.approx(0.3853, abs=2e-4)
    assert branch.friction_loss_m + branch.minor_loss_m == pytest.approx(h_discharge, rel=1e-6)
    # One pump's whole branch: suction pipe (bellmouth 0.04 + bend 20 f_T + gate 8 f_T, DN 250, 5 m),
    # the 0.4 m flange piece with its 15° reducer 257 → 206.6 mm, and the discharge branch above:
    # 0.0418 + 0.0093 + 0.3853 = 0.4363 m at 55 L/s.
    h_branch = (_loss(q_pump, d_250, 5.0, EPS_DUCTILE, K_BELLMOUTH + (N_BEND_R_D_1 + N_GATE) * _f_t(d_250), nu)
                + _loss(q_pump, d_200, 0.4, EPS_DUCTILE, _reducer_k(d_250, d_200), nu) + h_discharge)
    assert h_branch == pytest.approx(0.4363, abs=3e-4)
    assert float(system.branch_loss(q_pump, False)) == pytest.approx(h_branch, rel=1e-6)

    # Common pipework at 110 L/s: manifold DN 300, 8 m (tee branch 60 + tee run 20 + gate 8 + bend 20 f_T:
    # 108 × 0.012936 = 1.3971) 0.0430 + 0.1561 m; main to the ridge, 1900 m PE (expander 307.6 → 352.6 mm,
    # 4 × 45° elbows 16 f_T) 6.1279 + 0.0543 m; main down to the manhole, 1300 m (3 × 45° + exit 1.0)
    # 4.1928 + 0.1038 m; total 10.678 m.
    k_manifold = (N_TEE_BRANCH + N_TEE_RUN + N_GATE + N_BEND_R_D_1) * _f_t(d_300)
    h_common = (_loss(q_station, d_300, 8.0, EPS_DUCTILE, k_manifold, nu)
                + _loss(q_station, d_pe400, 1900.0, EPS_SEWAGE_MAIN,
                        _expander_k(d_300, d_pe400) + 4 * N_ELBOW_45 * _f_t(d_pe400), nu)
                + _loss(q_station, d_pe400, 1300.0, EPS_SEWAGE_MAIN, 3 * N_ELBOW_45 * _f_t(d_pe400) + K_EXIT, nu))
    assert h_common == pytest.approx(10.678, abs=2e-3)
    friction, minor = system.losses(q_station, False)
    assert float(friction + minor) == pytest.approx(h_common, rel=1e-6)


def test_booster_sample_branch_and_main_at_the_one_pump_design_duty():
    project = _load("hilltop_booster")
    solution = solve(project)
    nu = solution.fluid.kinematic_viscosity_m2_s
    system = prepare_system(project, solution.fluid)
    d_200, d_150, d_nps6 = 0.2066, 0.1550, 0.15408  # DN 200/150 EN 545 C40; NPS 6 Sch 40 (ASME B36.10)
    q = 0.035  # one duty pump: the station flow is the pump's

    branch = solution.segments[3]  # each pump's NPS 6 steel discharge branch
    assert branch.carries == "pump" and branch.flow_m3_s == pytest.approx(q, rel=1e-12)
    assert branch.velocity_m_s == pytest.approx(1.8771, abs=1e-4)  # hand: 0.035 / (π 0.15408² / 4) = 0.035 / 0.018646
    assert solution.segments[5].velocity_m_s == pytest.approx(1.0440, abs=1e-4)  # hand: 0.035 / 0.033523 m²

    # Discharge branch ΣK: (100 + 8 + 2 × 14) f_T(154.08 mm) = 136 × 0.014902 = 2.0267, plus the 15° expander
    # from the 100 mm flange: 2.6 sin 7.5° (1 − (100/154.08)²)² = 0.11368, × (154.08/100)⁴ = 5.6363 → 0.6408;
    # ΣK = 2.6675.  Friction: Re = 1.8771 × 0.15408 / 1.2347e-6 = 2.343e5, ε/D = 0.045/154.08, f = 0.01736;
    # h = (0.01736 × 5 / 0.15408 + 2.6675) × 1.8771² / 19.6133 = (0.5634 + 2.6675) × 0.17965 = 0.5804 m.
    k_discharge = (N_SWING_CHECK + N_GATE + 2 * N_ELBOW_LR) * _f_t(d_nps6) + _expander_k(0.100, d_nps6)
    assert k_discharge == pytest.approx(2.6675, abs=1e-4)
    h_discharge = _loss(q, d_nps6, 5.0, EPS_STEEL, k_discharge, nu)
    assert h_discharge == pytest.approx(0.5804, abs=2e-4)
    # Suction branch: 2 m DN 200 with its gate (8 f_T) and the 0.35 m DN 150 flange piece with its 15° reducer.
    h_branch = (_loss(q, d_200, 2.0, EPS_DUCTILE, N_GATE * _f_t(d_200), nu)
                + _loss(q, d_150, 0.35, EPS_DUCTILE, _reducer_k(d_200, d_150), nu) + h_discharge)
    assert float(system.branch_loss(q, False)) == pytest.approx(h_branch, rel=1e-6)

    # Common pipework: suction header DN 200, 6 m (sharp entrance 0.5 + (gate 8 + long-radius elbow 14 +
    # tee run 20 + tee branch 60) f_T = 0.5 + 102 × 0.014017 = 1.9297); manifold DN 200, 6 m ((60 + 8 + 20) f_T =
    # 1.2335); main DN 200, 2400 m ((6 × 16 + 2 × 8) f_T + exit 1.0 = 2.5699).  With v²/2g = 1.0440²/19.6133 =
    # 0.05558 m and f = 0.01708 (Re = 1.747e5, ε/D = 1.452e-4): header 0.0276 + 0.1073, manifold 0.0276 + 0.0686,
    # main 0.01708 × 2400 / 0.2066 × 0.05558 = 11.025 + 0.1428; total 11.398 m.
    h_common = (_loss(q, d_200, 6.0, EPS_DUCTILE,
                      K_SHARP_ENTRANCE + (N_GATE + N_ELBOW_LR + N_TEE_RUN + N_TEE_BRANCH) * _f_t(d_200), nu)
                + _loss(q, d_200, 6.0, EPS_DUCTILE, (N_TEE_BRANCH + N_GATE + N_BEND_R_D_1) * _f_t(d_200), nu)
                + _loss(q, d_200, 2400.0, EPS_DUCTILE, (6 * N_ELBOW_45 + 2 * N_GATE) * _f_t(d_200) + K_EXIT, nu))
    assert h_common == pytest.approx(11.398, abs=2e-3)
    friction, minor = system.losses(q, False)
    assert float(friction + minor) == pytest.approx(h_common, rel=1e-6)


def test_river_sample_branch_and_main_at_the_two_pump_design_duty():
    project = _load("river_intake")
    solution = solve(project)
    nu = solution.fluid.kinematic_viscosity_m2_s
    system = prepare_system(project, solution.fluid)
    d_nps16, d_nps12, d_nps14, d_nps20, d_500 = 0.381, 0.30318, 0.33334, 0.47782, 0.5034  # Sch 40; DN 500 C40
    q_station, n = 0.280, 2
    q_pump = q_station / n  # hand: 0.280 / 2 = 0.140 m³/s per pump

    suction = solution.segments[0]  # each pump's NPS 16 suction pipe
    assert suction.carries == "pump" and suction.flow_m3_s == pytest.approx(q_pump, rel=1e-12)
    assert suction.velocity_m_s == pytest.approx(1.2280, abs=1e-4)  # hand: 0.140 / (π 0.381² / 4) = 0.140 / 0.11401
    assert solution.segments[4].velocity_m_s == pytest.approx(1.4068, abs=1e-4)  # hand: 0.280 / 0.19903 m²

    # Suction pipe: bellmouth 0.04 + (long-radius elbow 14 + butterfly 16–24 in 25) f_T(381 mm) =
    # 0.04 + 39 × 0.012406 = 0.5238; f = 0.01474 (Re = 1.2280 × 0.381 / 1.0034e-6 = 4.663e5, ε/D = 0.045/381);
    # h = (0.01474 × 14 / 0.381 + 0.5238) × 1.2280² / 19.6133 = (0.5416 + 0.5238) × 0.07688 = 0.0819 m.
    h_suction = _loss(q_pump, d_nps16, 14.0, EPS_STEEL, K_BELLMOUTH + (N_ELBOW_LR + N_BUTTERFLY_16_24) * _f_t(d_nps16),
                      nu)
    assert h_suction == pytest.approx(0.0819, abs=2e-4)
    assert suction.friction_loss_m + suction.minor_loss_m == pytest.approx(h_suction, rel=1e-6)
    h_branch = (h_suction
                + _loss(q_pump, d_nps12, 0.5, EPS_STEEL, _reducer_k(d_nps16, d_nps12), nu)
                + _loss(q_pump, d_nps14, 6.0, EPS_STEEL,
                        (N_SWING_CHECK + N_BUTTERFLY_10_14 + N_ELBOW_LR) * _f_t(d_nps14) + _expander_k(0.250, d_nps14),
                        nu))
    assert float(system.branch_loss(q_pump, False)) == pytest.approx(h_branch, rel=1e-6)

    # Common pipework at 280 L/s: manifold NPS 20, 15 m ((60 + 20 + 25 + 14) f_T = 119 × 0.011880 = 1.4137)
    # 0.0536 + 0.1757 m; main DN 500, 1500 m (expander 477.82 → 503.4 mm, 5 × 45° elbows, butterfly 25 f_T,
    # exit 1.0; ΣK = 2.2393) 4.0115 + 0.2260 m; total 4.4668 m.
    h_common = (_loss(q_station, d_nps20, 15.0, EPS_STEEL,
                      (N_TEE_BRANCH + N_TEE_RUN + N_BUTTERFLY_16_24 + N_ELBOW_LR) * _f_t(d_nps20), nu)
                + _loss(q_station, d_500, 1500.0, EPS_DUCTILE,
                        _expander_k(d_nps20, d_500) + (5 * N_ELBOW_45 + N_BUTTERFLY_16_24) * _f_t(d_500) + K_EXIT, nu))
    assert h_common == pytest.approx(4.4668, abs=2e-3)
    friction, minor = system.losses(q_station, False)
    assert float(friction + minor) == pytest.approx(h_common, rel=1e-6)


# ----------------------------------------------------------------------------------- how each sample is laid out
@pytest.mark.parametrize("name", NAMES)
def test_each_sample_is_an_invented_station_as_built(name):
    project = _load(name)
    assert project.notes.startswith("INVENTED DEMONSTRATION SCENARIO")
    sides = [(s.side, s.carries) for s in project.segments]
    # flow order in the table: common suction (if any), each pump's suction branch, its discharge branch,
    # then the common manifold and main
    assert ("suction", "pump") in sides and ("delivery", "pump") in sides
    assert sides == sorted(sides, key=[("suction", "station"), ("suction", "pump"), ("delivery", "pump"),
                                       ("delivery", "station")].index)
    delivery = [s for s in project.segments if s.side == "delivery" and s.carries == "station"]
    assert len(delivery) >= 2  # a manifold and a main
    discharge = [f.fitting_id for s in project.segments if (s.side, s.carries) == ("delivery", "pump")
                 for f in s.fittings]
    assert "swing_check_valve" in discharge and "expander_conical" in discharge
    suction = [f.fitting_id for s in project.segments if (s.side, s.carries) == ("suction", "pump") for f in s.fittings]
    assert "reducer_conical" in suction
    assert any(f.fitting_id.startswith("tee_") for f in delivery[0].fittings)  # the manifold joins the branches


@pytest.mark.parametrize("name", NAMES)
def test_each_sample_velocities_at_the_design_flow_are_in_the_usual_ranges(name):
    project = _load(name)
    solution = solve(project)
    for seg in solution.segments:
        at_flange = any(f.fitting_id == "reducer_conical" for f in project.segments[seg.index].fittings)
        if seg.side == "suction" and seg.carries == "pump" and not at_flange:
            assert 0.9 <= seg.velocity_m_s <= 1.5, seg.name  # pump suction pipes about 1–1.5 m/s (common practice)
        elif seg.side == "delivery" and seg.carries == "pump":
            assert seg.velocity_m_s <= 2.5, seg.name  # discharge branches at most 2.5 m/s (common practice)
        elif seg.side == "delivery" and seg.index == len(solution.segments) - 1:
            assert 0.75 <= seg.velocity_m_s <= 2.0, seg.name  # rising mains 0.75–2 m/s (common practice)


@pytest.mark.parametrize("name", NAMES)
def test_each_sample_profile_spans_the_main_and_matches_the_segment_elevations(name):
    project = _load(name)
    delivery = [s for s in project.segments if s.side == "delivery" and s.carries == "station"]
    chainages = [p.chainage_m for p in project.profile]
    assert chainages[0] == 0.0
    assert chainages[-1] == pytest.approx(sum(s.length_m for s in delivery), abs=1e-9)
    assert any(p.air_valve for p in project.profile)  # every summit a designer would vent has its air valve
    # the pipe elevation is linear between profile points (sample_projects/README.md)
    elevations = [p.elevation_m for p in project.profile]
    start = 0.0
    for seg in delivery:
        for x, z in ((start, seg.start_elevation_m), (start + seg.length_m, seg.end_elevation_m)):
            if z is not None:
                assert float(np.interp(x, chainages, elevations)) == pytest.approx(z, abs=1e-9), seg.name
        start += seg.length_m


def test_the_sewage_main_crosses_gallows_ridge_with_an_air_valve_at_the_summit():
    project = _load("sewage_wet_well")
    delivery = [s for s in project.segments if s.side == "delivery" and s.carries == "station"]
    summit = max(project.profile, key=lambda p: p.elevation_m)
    # the summit at 44.5 m, 1900 m along the main from the end of the 8 m manifold: chainage 8 + 1900 = 1908 m
    assert (summit.elevation_m, summit.air_valve) == (44.5, True)
    assert summit.chainage_m == pytest.approx(delivery[0].length_m + 1900.0, abs=1e-9)
    # the delivery manhole at 38 m lies 6.5 m below the summit, so a vented summit can govern
    assert project.site.delivery.level_high_m == 38.0 and summit.elevation_m - 38.0 == pytest.approx(6.5)
    assert [p for p in project.profile if p.air_valve] == [summit]


def test_sewage_sample_worst_case_duty_meets_the_design_flow_with_margin():
    # Worst case for capacity (hydraulics/capacity.py): wet well at its lowest 21.0 m, aged pipe, both duty
    # pumps at full speed.  Aged roughness (resources/materials.json): ductile iron 0.15 mm, slimed sewage
    # main 0.6 mm.  System head: the larger of the head to the manhole (38.0 − 21.0 = 17.0 m static, every
    # loss) and to the vented summit of Gallows Ridge (44.5 − 21.0 = 23.5 m, the losses up to chainage 1908 m).
    project = _load("sewage_wet_well")
    solution = solve(project)
    nu = solution.fluid.kinematic_viscosity_m2_s
    pump = solution.pump_fits[0]
    d_250, d_200, d_300, d_pe400 = 0.2570, 0.2066, 0.3076, 0.3526
    eps_iron, eps_main = 0.15e-3, 0.6e-3

    def heads(q: float) -> tuple[float, float]:
        per_pump = q / 2
        branch = (_loss(per_pump, d_250, 5.0, eps_iron, K_BELLMOUTH + (N_BEND_R_D_1 + N_GATE) * _f_t(d_250), nu)
                  + _loss(per_pump, d_200, 0.4, eps_iron, _reducer_k(d_250, d_200), nu)
                  + _loss(per_pump, d_200, 6.0, eps_iron,
                          (N_SWING_CHECK + N_GATE + 2 * N_BEND_R_D_1) * _f_t(d_200) + _expander_k(0.150, d_200), nu))
        manifold = _loss(q, d_300, 8.0, eps_iron, (N_TEE_BRANCH + N_TEE_RUN + N_GATE + N_BEND_R_D_1) * _f_t(d_300), nu)
        to_ridge = _loss(q, d_pe400, 1900.0, eps_main, _expander_k(d_300, d_pe400) + 4 * N_ELBOW_45 * _f_t(d_pe400), nu)
        beyond = _loss(q, d_pe400, 1300.0, eps_main, 3 * N_ELBOW_45 * _f_t(d_pe400) + K_EXIT, nu)
        return 17.0 + branch + manifold + to_ridge + beyond, 23.5 + branch + manifold + to_ridge

    point = next(p for p in solution.operating_points if (p.static, p.pipe, p.pumps_running) == ("max", "aged", 2))
    q = point.flow_m3_s
    # hand, at Q = 115.8 L/s (57.9 L/s = 208.5 m³/h per pump): branch 0.504 m, manifold 0.230 m, main to the
    # ridge 8.949 m, beyond it 6.197 m; to the manhole 17.0 + 15.880 = 32.88 m, to the summit
    # 23.5 + 9.683 = 33.18 m: the summit governs.  The pump data give 33.14 m at 208.5 m³/h on the straight
    # line between 180 m³/h (35.2 m) and 216 m³/h (32.6 m); the fitted curve, concave, lies just above: 33.18 m.
    to_delivery, to_summit = heads(q)
    assert q == pytest.approx(0.1158, abs=2e-4)
    assert to_delivery == pytest.approx(32.88, abs=0.02) and to_summit == pytest.approx(33.18, abs=0.02)
    assert point.control == "crest at 1908 m"
    assert float(pump.head(q / 2)) == pytest.approx(to_summit, abs=1e-6)  # the duty point: pump head = system head
    assert float(np.interp(q / 2 * 3600, [180.0, 216.0], [35.2, 32.6])) == pytest.approx(to_summit, abs=0.1)
    # the design flow 110 L/s (sample file) is met with the duty pumps and, with the standby in place of one out
    # of service, still met; the margin is a few per cent (common practice: 3–8 %)
    capacity = solution.capacity
    assert capacity.flow_all_duty_m3_s == pytest.approx(q, rel=1e-12) and capacity.meets_design
    assert capacity.meets_design_one_out and capacity.flow_one_out_m3_s == capacity.flow_all_duty_m3_s
    assert 1.03 <= q / project.site.design_flow_m3_s <= 1.08
    # one pump alone at the worst case still scours the main: v = Q / (π D² / 4) ≥ 0.75 m/s (sewage
    # self-cleansing minimum, common practice)
    alone = next(p for p in solution.operating_points if (p.static, p.pipe, p.pumps_running) == ("max", "aged", 1))
    assert alone.flow_m3_s / (math.pi * d_pe400**2 / 4) >= 0.75
    # the drive's minimum lifts over the summit with a margin: (0.85)² × 41.19 m = 29.76 m shut-off head
    # against 23.5 m (affinity laws, H ∝ n²)
    assert project.arrangement.min_speed_ratio**2 * pump.shutoff_head_m >= 23.5 + 5.0
    assert not {f.code for f in solution.findings} & {"design_flow_not_met", "minimum_speed_cannot_lift"}
