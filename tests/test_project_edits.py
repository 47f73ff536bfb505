"""Project edits without the window: each builds a new project from an old one.

Catalogue sizes come from the bundled pipe-series files (``resources/pipe_series``), which
name their published standards; the example pump's figures follow the construction
stated in :func:`hydraulics.project_edits.example_pump`'s docstring.
"""

from __future__ import annotations

import subprocess
import sys
from dataclasses import replace
from pathlib import Path
from types import SimpleNamespace

import numpy as np
import pytest

from hydraulics.model import (
    Arrangement,
    ModelError,
    PressurisedDelivery,
    ProfilePoint,
    PumpModel,
    Segment,
    TankDelivery,
    UserFluid,
    WaterFluid,
)
from hydraulics.project_edits import (
    EXAMPLE_RATED_SPEED_RPM,
    example_pump,
    imported_pump_id,
    main_length_m,
    new_profile_point,
    series_of_material,
    starting_profile,
    stepped_segment,
    unique_pump_id,
    with_added_pump,
    with_arrangement_changes,
    with_atmosphere_mode,
    with_delivery_kind,
    with_duty_pump,
    with_fluid_kind,
    with_profile,
    with_profile_point_changes,
    with_pump_changes,
    with_removed_pump,
    with_segment,
)
from hydraulics.project_io import load_project
from hydraulics.solve import solve
from hydraulics.validation import validate_project, validate_pump

SAMPLE = Path(__file__).resolve().parent.parent / "sample_projects" / "hilltop_booster.pumpsketch.json"


@pytest.fixture(scope="module")
def project():
    return load_project(SAMPLE)


def _pe_segment(**changes) -> Segment:
    segment = Segment(name="main", side="delivery", material_id="pe100", length_m=100.0,
                      internal_diameter_m=0.09, pipe_series="pe100_sdr11", nominal_size="110")
    return replace(segment, **changes)


def _other_pump(pump_id: str) -> PumpModel:
    return PumpModel(pump_id, pump_id, 1450.0, (0.0, 0.02, 0.04), (40.0, 36.0, 28.0))


def test_the_edits_import_without_qt():
    code = ("import sys, hydraulics.project_edits; "
            "print(sorted(m for m in sys.modules if m.split('.')[0] in ('PySide6', 'pyqtgraph', 'app')))")
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60,
                            cwd=Path(__file__).resolve().parent.parent)
    assert result.returncode == 0, result.stderr
    assert result.stdout.strip() == "[]"


# ---------------------------------------------------------------------- pipe sizes
def test_a_step_moves_through_the_series():
    # PE100 SDR 11 sizes 90, 110, 125 mm OD (resources/pipe_series/pe100_sdr11.json)
    up = stepped_segment(_pe_segment(), 1)
    assert (up.nominal_size, up.internal_diameter_m) == ("125", pytest.approx(0.1022))
    down = stepped_segment(_pe_segment(), -1)
    assert (down.nominal_size, down.internal_diameter_m) == ("90", pytest.approx(0.0736))


def test_a_step_is_clamped_at_the_ends_of_the_series():
    smallest = stepped_segment(_pe_segment(), -100)
    assert smallest.nominal_size == "63"  # the first size of the series file
    assert stepped_segment(smallest, -1) == smallest


def test_a_typed_bore_joins_the_first_series_of_its_material():
    typed = _pe_segment(pipe_series=None, nominal_size=None, internal_diameter_m=0.095)
    first = series_of_material("pe100")[0]
    up = stepped_segment(typed, 1)
    assert (up.pipe_series, up.nominal_size) == (first.series_id, "125")  # next bore above 95 mm: 102.2 mm
    down = stepped_segment(typed, -1)
    assert (down.pipe_series, down.nominal_size) == (first.series_id, "110")  # next bore below: 90 mm


def test_a_material_without_a_series_cannot_be_stepped():
    typed = _pe_segment(material_id="concrete", pipe_series=None, nominal_size=None)
    assert series_of_material("concrete") == []
    with pytest.raises(ModelError) as info:
        stepped_segment(typed, 1)
    assert info.value.field_path == "material" and "no pipe series of material 'concrete'" in info.value.problem


def test_with_segment_replaces_one_row(project):
    changed = replace(project.segments[1], length_m=12.0)
    edited = with_segment(project, 1, changed)
    assert edited.segments == project.segments[:1] + (changed,) + project.segments[2:]
    with pytest.raises(ModelError, match="no such segment"):
        with_segment(project, len(project.segments), changed)


# ---------------------------------------------------------------------- pumps
def test_pump_ids_are_made_unique(project):
    assert unique_pump_id(project, "New pump!") == "New_pump"
    assert unique_pump_id(project, project.pumps[0].pump_id) == f"{project.pumps[0].pump_id}_2"
    assert unique_pump_id(project, "***") == "pump"
    assert imported_pump_id(project, Path("somewhere") / "maker curve.csv") == "maker_curve"


def test_adding_and_choosing_pumps(project):
    added = with_added_pump(project, _other_pump("B"))
    assert [p.pump_id for p in added.pumps] == [project.pumps[0].pump_id, "B"]
    assert added.arrangement == replace(project.arrangement, pump_id="B")
    back = with_duty_pump(added, project.pumps[0].pump_id)
    assert back.arrangement == project.arrangement
    assert with_duty_pump(back, project.pumps[0].pump_id) is back
    bare = replace(project, arrangement=None)
    assert with_duty_pump(bare, "X").arrangement == Arrangement(pump_id="X")


def test_removing_the_duty_pump_falls_back_to_the_first_left(project):
    two = with_added_pump(project, _other_pump("B"))
    removed = with_removed_pump(two, "B")
    assert removed.pumps == project.pumps and removed.arrangement.pump_id == project.pumps[0].pump_id
    none_left = with_removed_pump(project, project.pumps[0].pump_id)
    assert none_left.pumps == () and none_left.arrangement is None


def test_pump_and_arrangement_changes(project):
    pump_id = project.pumps[0].pump_id
    renamed = with_pump_changes(project, pump_id, name="Renamed")
    assert renamed.pumps[0] == replace(project.pumps[0], name="Renamed")
    assert with_pump_changes(project, "no such pump", name="x").pumps == project.pumps
    assert with_arrangement_changes(project, duty_count=2).arrangement.duty_count == 2
    with pytest.raises(ModelError) as info:
        with_arrangement_changes(replace(project, arrangement=None), duty_count=2)
    assert info.value.field_path == "arrangement"


def test_the_example_pump_without_a_solution_uses_the_static_head(project):
    pump = example_pump(project, None)
    # no solution: design head = max(1.2 × (highest delivery − lowest suction), 5 m) = 1.2 × (180.0 − 112.0) m
    head_design = 1.2 * (180.0 - 112.0)
    q = project.site.design_flow_m3_s
    assert pump.rated_speed_rpm == EXAMPLE_RATED_SPEED_RPM
    assert pump.flow_m3_s == pytest.approx((0.0, 0.5 * q, q, 1.25 * q, 1.5 * q))
    assert pump.head_m[0] == pytest.approx(1.25 * head_design)  # shut-off 25 % above the design head
    assert pump.head_m[2] == pytest.approx(head_design)
    assert pump.pump_id not in {p.pump_id for p in project.pumps}
    validate_pump(pump, "pumps[1]")
    validate_project(with_added_pump(project, pump))


def test_the_example_pump_meets_the_highest_system_curve(project):
    solution = solve(project)
    curve = solution.curve("max", "aged")
    q = project.site.design_flow_m3_s
    pump = example_pump(project, solution)
    assert pump.head_m[2] == pytest.approx(float(np.interp(q, curve.flow_m3_s, curve.head_m)))


def test_the_example_pump_falls_back_when_the_solution_has_no_such_curve(project):
    def no_curve(static, pipe):
        raise KeyError((static, pipe))

    pump = example_pump(project, SimpleNamespace(curve=no_curve))
    assert pump.head_m[2] == pytest.approx(1.2 * (180.0 - 112.0))


# ---------------------------------------------------------------------- site and fluid
def test_switching_the_delivery_keeps_the_elevation(project):
    pressurised = with_delivery_kind(project, "pressurised")
    assert pressurised.site.delivery == PressurisedDelivery(elevation_m=180.0, pressure_pa=0.0)
    tank = with_delivery_kind(pressurised, "tank")
    assert tank.site.delivery == TankDelivery(180.0, 180.0)
    assert with_delivery_kind(project, "tank") is project
    assert with_delivery_kind(project, "unknown") is project


def test_the_atmosphere_given_starts_from_the_standard_atmosphere(project):
    at_sea = replace(project, site=replace(project.site, altitude_m=0.0))
    assert with_atmosphere_mode(at_sea, "given").site.atmospheric_pressure_pa == pytest.approx(101_325.0)  # ISO 2533
    high = replace(project, site=replace(project.site, altitude_m=1000.0))
    given = with_atmosphere_mode(high, "given")
    # U.S. Standard Atmosphere 1976, table I: 8.9876e4 Pa at 1000 m geometric altitude
    assert given.site.atmospheric_pressure_pa == pytest.approx(89_876.0, rel=1e-4)
    assert with_atmosphere_mode(given, "given") is given
    assert with_atmosphere_mode(given, "altitude").site.atmospheric_pressure_pa is None


def test_a_user_fluid_starts_from_water_at_its_temperature(project):
    water = replace(project, fluid=WaterFluid(temperature_c=20.0))
    user = with_fluid_kind(water, "user").fluid
    assert isinstance(user, UserFluid) and user.temperature_c == 20.0
    assert user.density_kg_m3 == pytest.approx(998.21, abs=0.02)  # IAPWS-IF97 region 1 at 20 °C, 0.1 MPa
    assert user.kinematic_viscosity_m2_s == pytest.approx(1.0034e-6, rel=1e-3)  # IAPWS 2008: 1.0016 mPa·s / 998.21
    assert user.vapour_pressure_pa == pytest.approx(2339.3, rel=1e-3)  # IAPWS-IF97 saturation at 20 °C
    assert with_fluid_kind(water, "water") is water


def test_water_from_a_user_fluid_keeps_the_temperature_within_range(project):
    hot = replace(project, fluid=UserFluid(temperature_c=130.0))
    assert with_fluid_kind(hot, "water").fluid == WaterFluid(temperature_c=100.0)
    cool = replace(project, fluid=UserFluid(temperature_c=35.0))
    assert with_fluid_kind(cool, "water").fluid == WaterFluid(temperature_c=35.0)


# ---------------------------------------------------------------------- profile of the main
RIDGE = (ProfilePoint(0.0, 110.0), ProfilePoint(1200.0, 150.0, air_valve=True), ProfilePoint(2406.0, 176.0))
"""An invented profile over the hilltop sample's 2406 m main (demo data)."""


def test_with_profile_replaces_the_points_and_validates(project):
    sample_profile = project.profile
    assert len(sample_profile) == 10 and sample_profile[5] == ProfilePoint(1150.0, 142.5, True)  # the sample file
    edited = with_profile(project, list(RIDGE))
    assert edited.profile == RIDGE
    assert project.profile is sample_profile  # the original is untouched
    validate_project(edited)


def test_with_profile_point_changes_edits_one_point(project):
    edited = with_profile_point_changes(with_profile(project, RIDGE), 1, elevation_m=151.5, air_valve=False)
    assert edited.profile[1] == ProfilePoint(1200.0, 151.5, False)
    assert edited.profile[0] == RIDGE[0] and edited.profile[2] == RIDGE[2]
    with pytest.raises(ModelError) as excinfo:
        with_profile_point_changes(edited, 3, elevation_m=1.0)
    assert excinfo.value.field_path == "profile[3]"


def test_a_non_increasing_chainage_is_refused_by_validation(project):
    edited = with_profile_point_changes(with_profile(project, RIDGE), 2, chainage_m=1200.0)
    with pytest.raises(ModelError) as excinfo:
        validate_project(edited)
    assert excinfo.value.field_path == "profile[2].chainage"


def test_main_length_and_starting_profile_follow_the_station_delivery_segments(project):
    # the hilltop sample file: discharge manifold 6 m + rising main 2400 m are the station delivery segments;
    # each pump's own 5 m discharge branch (carries "pump") is not part of the main
    assert main_length_m(project) == pytest.approx(6.0 + 2400.0, abs=1e-9)
    first, last = starting_profile(project)
    assert first == ProfilePoint(0.0, 111.0)  # the manifold's start elevation (file)
    assert last == ProfilePoint(2406.0, 176.0)  # the rising main's end elevation (file)
    no_levels = replace(project, segments=tuple(replace(s, start_elevation_m=None, end_elevation_m=None)
                                                for s in project.segments))
    first, last = starting_profile(no_levels)
    assert first == ProfilePoint(0.0, 110.6)  # without segment elevations: the pump datum (file)
    assert last == ProfilePoint(2406.0, 180.0)  # and the delivery tank's high level (file)
    branch = replace(project, segments=tuple(replace(s, carries="pump") if s.name == "Discharge manifold"
                                             else s for s in project.segments))
    assert main_length_m(branch) == pytest.approx(2400.0, abs=1e-9)  # a pump branch is not part of the main


def test_new_profile_points_lie_between_their_neighbours(project):
    ridged = with_profile(project, RIDGE)
    assert new_profile_point(ridged, 1) == ProfilePoint(600.0, 130.0)  # midway, no air valve
    assert new_profile_point(ridged, 3) == ProfilePoint(2506.0, 176.0)  # 100 m past the last point: 2406 + 100
    assert new_profile_point(ridged, 0) == ProfilePoint(0.0, 110.0)  # half of chainage 0
    empty = with_profile(project, ())  # the sample has a profile; an empty one starts from the main's start
    assert new_profile_point(empty, 0) == starting_profile(empty)[0] == ProfilePoint(0.0, 111.0)
