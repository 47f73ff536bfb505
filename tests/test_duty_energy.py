"""Energy over a year of real duty: the duty bands met by the run sequence, against hand sums.

The hand sums use the pump set's own operating points (``solve_pump_set`` at the mean static
head), with the formulas written out beside them: band hours t = hours, or share × 8760 h; a
fixed-speed stage runs t_run = Q_band t / Q_stage; energy E = Σ P_in t_run / 1000 (kWh); specific
energy P_in / (3.6e6 Q) (kWh/m³); wire-to-water efficiency Σ ρ g qᵢ Hᵢ / P_in (ρ g Q H the
hydraulic power of ISO 9906:2012, clause 3); 1 kWh = 3.6e6 J.
"""

from __future__ import annotations

import json
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from app.text_report import summary_text
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import DutyBand, DutyProfile
from hydraulics.project_io import load_project
from hydraulics.pump_set import pump_set_speed_for_flow, run_stages, solve_pump_set
from hydraulics.results_json import solution_to_json_dict
from hydraulics.solve import _cached_fit, solve, solve_curves

SAMPLES = Path(__file__).resolve().parents[1] / "sample_projects"
SAMPLE_NAMES = ("hilltop_booster", "river_intake", "sewage_wet_well")
L_S = 1e-3


def _sample(name: str):
    return load_project(SAMPLES / f"{name}.pumpsketch.json")


def _with_profile(name: str, **profile):
    return replace(_sample(name), duty_profile=DutyProfile(**profile))


def _points(project, stage_index: int, speed_ratio=None, n: int = 1):
    """The pump set's own operating point of one stage at the mean static head (the hand sums' input)."""
    stage = solve_curves(project)
    system, density = stage.system, stage.solution.fluid.density_kg_m3
    pumps = run_stages(project)[stage_index]
    fitted = {p.pump_id: _cached_fit(project.pump(p.pump_id), density) for p in pumps}
    static = 0.5 * (system.static_head_m["min"] + system.static_head_m["max"])
    aged = project.duty_profile.pipe == "aged"
    statics = np.full(n, static)
    return solve_pump_set(system, fitted, pumps, statics, aged, speed_ratio=speed_ratio), (system, fitted, pumps,
                                                                                           static, aged, density)


def _codes(solution) -> set[str]:
    return {f.code for f in solution.findings}


# ---------------------------------------------------------------------- fixed-speed staging
SEWAGE_BANDS = (DutyBand(25 * L_S, 3000.0), DutyBand(45 * L_S, 3500.0), DutyBand(80 * L_S, 1500.0),
                DutyBand(0.0, 500.0))
# flows the sample's drives (85–100 %) can slow to: at 85 % one pump delivers between 45 and 55 L/s (mean static)
SEWAGE_SLOWED_BANDS = (DutyBand(55 * L_S, 3000.0), DutyBand(65 * L_S, 3500.0), DutyBand(80 * L_S, 1500.0),
                       DutyBand(0.0, 500.0))


def test_fixed_staging_energy_is_the_hand_sum_of_power_times_run_hours():
    project = _with_profile("sewage_wet_well", bands=SEWAGE_BANDS, strategy="fixed_staging")
    duty = solve(project).duty_profile
    one, _ = _points(project, 0)
    two, _ = _points(project, 1)
    q1, p1 = float(one.flow_m3_s[0]), float(one.input_power_w[0])
    q2, p2 = float(two.flow_m3_s[0]), float(two.input_power_w[0])
    assert q1 < 80 * L_S <= q2  # the third band needs the second pump
    # by hand: t_run = Q_band t / Q_stage, E = P_in t_run / 1000
    t_runs = [25 * L_S * 3000.0 / q1, 45 * L_S * 3500.0 / q1, 80 * L_S * 1500.0 / q2, 0.0]
    energies = [p1 * t_runs[0] / 1000.0, p1 * t_runs[1] / 1000.0, p2 * t_runs[2] / 1000.0, 0.0]
    assert [b.pumps for b in duty.bands] == ["P1", "P1", "P1+P2", ""]
    assert [b.control for b in duty.bands] == ["stop–start", "stop–start", "stop–start", "idle"]
    for band, t_run, energy in zip(duty.bands, t_runs, energies, strict=True):
        assert band.run_hours == pytest.approx(t_run, rel=1e-12)
        assert band.energy_kwh == pytest.approx(energy, rel=1e-12)
        assert band.speed_ratio is None
    assert duty.energy_kwh == pytest.approx(sum(energies), rel=1e-12)
    volume = (25 * 3000.0 + 45 * 3500.0 + 80 * 1500.0) * L_S * 3600.0  # V = Σ Q t 3600 s/h, every band met
    assert duty.volume_m3 == pytest.approx(volume, rel=1e-12)
    assert duty.specific_energy_kwh_m3 == pytest.approx(sum(energies) / volume, rel=1e-12)
    assert duty.cost == pytest.approx(sum(energies) * project.energy.tariff_per_kwh, rel=1e-12)
    assert duty.run_hours == pytest.approx(sum(t_runs), rel=1e-12)
    assert duty.static_head_m == pytest.approx(0.5 * (duty.static_head_min_m + duty.static_head_max_m))


def test_a_band_reports_the_wire_to_water_efficiency_and_specific_energy_of_its_point():
    project = _with_profile("sewage_wet_well", bands=SEWAGE_BANDS, strategy="fixed_staging")
    band = solve(project).duty_profile.bands[2]
    two, (*_, density) = _points(project, 1)
    p_in = float(two.input_power_w[0])
    rho_g = density * STANDARD_GRAVITY_M_S2
    hydraulic = float(np.sum(rho_g * two.pump_flow_m3_s[0] * two.pump_head_m[0]))  # Σ ρ g qᵢ Hᵢ (ISO 9906)
    assert band.efficiency == pytest.approx(hydraulic / p_in, rel=1e-12)
    assert band.specific_energy_kwh_m3 == pytest.approx(p_in / (3.6e6 * float(two.flow_m3_s[0])), rel=1e-12)
    assert band.manifold_head_m == pytest.approx(float(two.manifold_head_m[0]), rel=1e-12)
    assert band.input_power_w == pytest.approx(p_in, rel=1e-12)


def test_share_of_the_year_is_a_share_of_8760_hours():
    hours = solve(_with_profile("sewage_wet_well", bands=(DutyBand(30 * L_S, 0.5), DutyBand(60 * L_S, 0.25)),
                                time_basis="share")).duty_profile
    assert [b.hours for b in hours.bands] == [pytest.approx(4380.0), pytest.approx(2190.0)]  # 0.5 × 8760, 0.25 × 8760
    assert hours.hours == pytest.approx(6570.0)


# ---------------------------------------------------------------------- annual volume
def test_an_annual_volume_scales_the_band_flows_by_one_factor():
    project = _sample("river_intake")  # the sample's pattern: shares of the year scaled to 6 000 000 m³
    profile = project.duty_profile
    duty = solve(project).duty_profile
    pattern = sum(b.flow_m3_s * b.time * 8760.0 * 3600.0 for b in profile.bands)  # Σ Q t 3600, t = share × 8760 h
    factor = 6.0e6 / pattern
    assert duty.flow_scale == pytest.approx(factor, rel=1e-12)
    for band, given in zip(duty.bands, profile.bands, strict=True):
        assert band.flow_m3_s == pytest.approx(given.flow_m3_s * factor, rel=1e-12)
    assert duty.volume_m3 == pytest.approx(6.0e6, rel=1e-9)
    assert duty.shortfall_volume_m3 == 0.0
    assert any("scaled" in note for note in duty.notes)


# ---------------------------------------------------------------------- variable speed
def test_variable_speed_slows_the_pumps_to_the_band_flow_for_the_whole_band():
    project = _with_profile("sewage_wet_well", bands=SEWAGE_SLOWED_BANDS, strategy="variable_speed")
    duty = solve(project).duty_profile
    for band in duty.bands[:3]:
        assert band.control == "variable speed"
        assert 0.85 <= band.speed_ratio <= 1.0  # the sample's drive range
        assert band.station_flow_m3_s == pytest.approx(band.flow_m3_s, rel=1e-8)
        assert band.run_hours == band.hours
        # E = P_in t (kWh), the pumps running the band's whole hours
        assert band.energy_kwh == pytest.approx(band.input_power_w * band.hours / 1000.0, rel=1e-12)
    # the speed is the pump set's own for the band flow, and its point delivers that flow
    point, (system, fitted, pumps, static, aged, _) = _points(project, 1, speed_ratio=duty.bands[2].speed_ratio)
    speed, found = pump_set_speed_for_flow(system, fitted, pumps, static, aged, 80 * L_S)
    assert bool(found[0]) and float(speed[0]) == pytest.approx(duty.bands[2].speed_ratio, rel=1e-12)
    assert float(point.flow_m3_s[0]) == pytest.approx(80 * L_S, rel=1e-8)
    assert duty.bands[2].input_power_w == pytest.approx(float(point.input_power_w[0]), rel=1e-9)


def test_below_the_lowest_speed_the_pumps_run_at_it_and_stop_and_start():
    project = _with_profile("river_intake", bands=(DutyBand(60 * L_S, 2000.0),), strategy="variable_speed")
    band = solve(project).duty_profile.bands[0]
    lowest = project.arrangement.min_speed_ratio  # 0.8 in the sample
    point, _ = _points(project, 0, speed_ratio=lowest)
    q_low = float(point.flow_m3_s[0])
    assert q_low > 60 * L_S
    assert band.control == "stop–start at the lowest speed"
    assert band.speed_ratio == pytest.approx(lowest)
    assert "lowest speed" in band.note
    assert band.run_hours == pytest.approx(60 * L_S * 2000.0 / q_low, rel=1e-12)  # t_run = Q t / Q_lowest
    assert band.energy_kwh == pytest.approx(float(point.input_power_w[0]) * band.run_hours / 1000.0, rel=1e-12)


def test_a_stage_without_variable_speed_pumps_runs_as_fixed_staging():
    fixed_speed = replace(_sample("sewage_wet_well").arrangement, variable_speed=False)
    results = []
    for strategy in ("variable_speed", "fixed_staging"):
        project = replace(_with_profile("sewage_wet_well", bands=SEWAGE_BANDS, strategy=strategy),
                          arrangement=fixed_speed)
        results.append(solve(project).duty_profile)
    assert results[0].energy_kwh == pytest.approx(results[1].energy_kwh, rel=1e-12)
    assert all(b.control in ("stop–start", "idle") for b in results[0].bands)


def test_variable_speed_uses_less_energy_than_staging_where_friction_dominates():
    # the river intake's main is friction-dominated: slowing saves energy (the affinity laws; common practice)
    energies = [solve(replace(_sample("river_intake"), duty_profile=replace(
        _sample("river_intake").duty_profile, strategy=s))).duty_profile.energy_kwh
        for s in ("variable_speed", "fixed_staging")]
    assert energies[0] < energies[1]


# ---------------------------------------------------------------------- findings
def test_a_band_above_capacity_runs_every_pump_all_band_and_is_a_finding():
    project = _with_profile("sewage_wet_well", bands=(DutyBand(40 * L_S, 1000.0), DutyBand(150 * L_S, 200.0)),
                            strategy="variable_speed")
    solution = solve(project)
    band = solution.duty_profile.bands[1]
    two, _ = _points(project, 1)
    q_max = float(two.flow_m3_s[0])
    assert band.control == "above capacity" and band.pumps == "P1+P2" and not band.met
    assert band.run_hours == 200.0
    assert band.station_flow_m3_s == pytest.approx(q_max, rel=1e-12)
    assert band.shortfall_volume_m3 == pytest.approx((150 * L_S - q_max) * 200.0 * 3600.0, rel=1e-9)
    found = [f for f in solution.findings if f.code == "duty_band_not_met"]
    assert len(found) == 1 and found[0].severity == "warning" and "band 2" in found[0].where
    assert found[0].target == ("duty", 1)


@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_the_samples_meet_their_duty_and_raise_no_duty_finding(name):
    solution = solve(_sample(name))
    duty = solution.duty_profile
    assert duty is not None and duty.energy_kwh is not None and duty.energy_kwh > 0.0
    assert duty.shortfall_volume_m3 == 0.0
    assert not {c for c in _codes(solution) if c.startswith("duty_")}
    assert duty.hours <= 8760.0


def test_a_pump_without_efficiency_data_leaves_the_energy_unknown():
    project = _with_profile("sewage_wet_well", bands=SEWAGE_BANDS)
    pump = replace(project.pumps[0], efficiency=(), shaft_power_w=())
    solution = solve(replace(project, pumps=(pump,) + project.pumps[1:]))
    assert solution.duty_profile.energy_kwh is None
    assert solution.duty_profile.volume_m3 > 0.0
    assert "duty_energy_unknown" in _codes(solution)
    assert "duty_energy_unknown" not in _codes(solve(project))


def test_pumps_in_series_are_not_computed_and_say_so():
    project = _with_profile("hilltop_booster", bands=(DutyBand(10 * L_S, 1000.0),))
    series = replace(project, arrangement=replace(project.arrangement, series_stages=2))
    solution = solve(series)
    assert solution.duty_profile is None
    assert "duty_profile_not_computed" in _codes(solution)
    assert "duty_profile_not_computed" not in _codes(solve(project))


def test_no_bands_no_duty_profile():
    project = _with_profile("hilltop_booster")
    solution = solve(project)
    assert solution.duty_profile is None
    assert solution_to_json_dict(solution)["duty_profile"] is None


# ---------------------------------------------------------------------- outputs
def test_the_json_has_the_duty_profile_key_and_keeps_the_energy_key():
    solution = solve(_sample("sewage_wet_well"))
    data = json.loads(json.dumps(solution_to_json_dict(solution)))
    duty = data["duty_profile"]
    assert {"strategy", "pipe", "static_head_m", "bands", "stages", "energy_kwh", "cost", "volume_m3",
            "specific_energy_kwh_m3", "run_hours", "shortfall_volume_m3", "currency", "notes"} <= set(duty)
    assert {"flow_m3_s", "hours", "pumps", "control", "speed_ratio", "station_flow_m3_s", "manifold_head_m",
            "efficiency", "input_power_w", "specific_energy_kwh_m3", "run_hours", "pumped_volume_m3",
            "shortfall_volume_m3", "energy_kwh", "cost", "met"} <= set(duty["bands"][0])
    assert duty["energy_kwh"] == pytest.approx(sum(b["energy_kwh"] for b in duty["bands"]))
    assert data["energy"]["annual_energy_mean_kwh"] == solution.energy.annual_energy_mean_kwh


def test_the_text_report_has_the_year_of_duty_the_labelled_estimate_and_the_cautions():
    text = summary_text(solve(_sample("sewage_wet_well")))
    assert "Energy over the year of duty" in text
    assert "simple estimate: all operating hours at the duty point" in text
    assert "CAUTION" in text and "licensed" in text  # the cautions, wrapped over lines
    assert text.index("Energy over the year of duty") < text.index("simple estimate")


def test_an_assist_pump_joins_the_run_sequence_for_the_bands_beyond_the_duty_pumps():
    from hydraulics.model import InstalledPump

    project = _with_profile("river_intake", bands=(DutyBand(150 * L_S, 3000.0), DutyBand(380 * L_S, 500.0)),
                            strategy="fixed_staging")
    project = replace(project, other_pumps=(InstalledPump(project.arrangement.pump_id, role="assist",
                                                          motor_efficiency=0.95, drive_efficiency=0.97),))
    duty = solve(project).duty_profile
    assert [s.pumps for s in duty.stages] == ["P1", "P1+P2", "P1+P2+P4"]  # P3 is the standby: in no stage
    three, _ = _points(project, 2)
    q3, p3 = float(three.flow_m3_s[0]), float(three.input_power_w[0])
    assert duty.bands[1].pumps == "P1+P2+P4" and q3 >= 380 * L_S
    assert duty.bands[1].energy_kwh == pytest.approx(p3 * (380 * L_S * 500.0 / q3) / 1000.0, rel=1e-12)


# ---------------------------------------------------------------------- the edits of the window
def test_switching_the_time_basis_converts_hours_to_shares_of_8760_h_and_back():
    from hydraulics.project_edits import with_duty_time_basis

    project = _sample("hilltop_booster")
    shares = with_duty_time_basis(project, "share")
    assert [b.time for b in shares.duty_profile.bands] == pytest.approx(
        [b.time / 8760.0 for b in project.duty_profile.bands])
    back = with_duty_time_basis(shares, "hours")
    assert [b.time for b in back.duty_profile.bands] == pytest.approx([b.time for b in project.duty_profile.bands])
    assert with_duty_time_basis(project, "hours") is project


def test_a_new_band_takes_the_rest_of_the_year_and_a_neighbouring_flow():
    from hydraulics.project_edits import new_duty_band, with_duty_bands
    from hydraulics.validation import validate_project

    project = _sample("hilltop_booster")  # 1400 + 2600 + 1800 + 600 = 6400 h in the sample
    band = new_duty_band(project, 4)
    assert band.time == pytest.approx(8760.0 - 6400.0)
    assert band.flow_m3_s == project.duty_profile.bands[-1].flow_m3_s
    middle = new_duty_band(project, 1)
    assert middle.flow_m3_s == pytest.approx((18 + 26) / 2 * L_S)
    validate_project(with_duty_bands(project, project.duty_profile.bands + (band,)))
    empty = with_duty_bands(project, ())
    assert new_duty_band(empty, 0).flow_m3_s == project.site.design_flow_m3_s


def test_a_band_where_a_pump_leaves_its_preferred_region_is_a_finding_of_the_year():
    # one sewage pump stop–starting at its 85 % lowest speed for a 25 L/s band runs inside its preferred region
    clean = solve(_with_profile("sewage_wet_well", bands=(DutyBand(25 * L_S, 4000.0),), strategy="variable_speed"))
    assert "duty_band_outside_region" not in {f.code for f in clean.findings}
    band = clean.duty_profile.bands[0]
    assert 0.70 <= band.bep_flow_ratio_min <= band.bep_flow_ratio_max <= 1.20  # ANSI/HI 9.6.3 region, as criteria
    # the same band with every pump at full speed, stop–start: one pump runs further out on its curve
    fixed = solve(_with_profile("sewage_wet_well", bands=(DutyBand(25 * L_S, 4000.0),), strategy="fixed_staging"))
    ratio = fixed.duty_profile.bands[0].bep_flow_ratio_max
    narrow = replace(fixed.project, criteria=replace(fixed.project.criteria, preferred_region_high=ratio - 0.01))
    flagged = [f for f in solve(narrow).findings if f.code == "duty_band_outside_region"]
    assert flagged and flagged[0].severity == "warning" and "band 1 (P1" in flagged[0].message


def test_variable_speed_switches_the_next_pump_in_before_the_running_one_leaves_its_preferred_region():
    river = _sample("river_intake")
    band = solve(river).duty_profile.bands[1]  # the sample's second band: one pump would run at about 126 %
    assert band.pumps == "P1+P2" and band.bep_flow_ratio_max <= river.criteria.preferred_region_high
    looser = replace(river, criteria=replace(river.criteria, preferred_region_high=1.30))
    alone = solve(looser).duty_profile.bands[1]
    assert alone.pumps == "P1" and 1.20 < alone.bep_flow_ratio_max <= 1.30  # the fewest pumps within the region
