"""The command line: both forms of `solve` on every sample, import-pump, bad input."""

import json
import subprocess
import sys
from pathlib import Path

import pytest

from hydraulics.cautions import CAUTIONS_TEXT
from tests.bad_pump_files import BAD_FIELD, BAD_PROBLEM, write_bad_pump_project

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = sorted((ROOT / "sample_projects").glob("*.pumpsketch.json"))
PUMP_FILES = sorted((ROOT / "sample_projects" / "pumps").glob("*.csv"))

ENGINE_KEYS = {"format", "version", "project", "cautions", "fluid", "static_head_m", "design_flow_m3_s",
               "system_curves", "segments", "findings", "branches", "profile", "control_point"}
PUMP_KEYS = {"pumps", "operating_points", "variable_speed", "energy", "capacity", "speed_points"}
SEGMENT_KEYS = {"name", "side", "length_m", "internal_diameter_m", "roughness_m", "parallel_pipes",
                "velocity_m_s", "reynolds", "friction_factor", "friction_loss_m", "minor_k_total", "minor_loss_m",
                "carries", "flow_m3_s"}
POINT_KEYS = {"static", "pipe", "pumps_running", "speed_ratio", "flow_m3_s", "flow_per_pump_m3_s", "head_m",
              "efficiency", "shaft_power_w", "input_power_w", "specific_energy_kwh_m3", "bep_flow_ratio",
              "npsh_available_m", "npsh_required_m", "extrapolated"}


def run(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "app", *args], capture_output=True, text=True, cwd=ROOT,
                          timeout=120)


@pytest.fixture(scope="module", params=SAMPLES, ids=lambda p: p.name)
def solved(request):
    result = run("solve", str(request.param), "--json")
    assert result.returncode == 0, result.stderr
    return json.loads(result.stdout)


def test_json_has_the_contract_keys(solved):
    assert ENGINE_KEYS | PUMP_KEYS <= set(solved)
    assert solved["format"] == "pumpsketch-results"
    assert solved["cautions"] == CAUTIONS_TEXT
    assert set(solved["fluid"]) >= {"temperature_c", "density_kg_m3", "kinematic_viscosity_m2_s", "vapour_pressure_pa"}
    assert solved["static_head_m"]["min"] <= solved["static_head_m"]["max"]
    combos = {(c["static"], c["pipe"]) for c in solved["system_curves"]}
    assert combos == {("min", "new"), ("min", "aged"), ("max", "new"), ("max", "aged")}
    for curve in solved["system_curves"]:
        assert set(curve) >= {"flow_m3_s", "head_m", "static_m", "friction_m", "minor_m"}
        assert curve["flow_m3_s"][0] == 0.0 and max(curve["flow_m3_s"]) > solved["design_flow_m3_s"]
    for segment in solved["segments"]:
        assert SEGMENT_KEYS <= set(segment)
    branch_names = [s["name"] for s in solved["segments"] if s["carries"] == "pump"]
    assert [b["name"] for b in solved["branches"]] == branch_names
    for branch in solved["branches"]:
        assert SEGMENT_KEYS | {"pumps_running"} <= set(branch) and branch["carries"] == "pump"
    for finding in solved["findings"]:
        assert set(finding) >= {"severity", "code", "message", "where"}
    controls = solved["control_point"]
    assert len(controls["operating_points"]) == len(solved["operating_points"])
    for point, control in zip(solved["operating_points"], controls["operating_points"], strict=True):
        assert (control["static"], control["pipe"], control["pumps_running"]) == (
            point["static"], point["pipe"], point["pumps_running"])
        assert control["control"] == "delivery" if control["chainage_m"] is None else control["control"].startswith(
            "crest at ")
    assert [len(c["chainage_m"]) for c in controls["system_curves"]] == [
        len(c["flow_m3_s"]) for c in solved["system_curves"]]
    if solved["profile"] is not None:
        assert set(solved["profile"]) >= {"chainage_m", "elevation_m", "air_valve_chainage_m", "scenarios", "at_rest"}


def test_operating_points_at_both_extremes_for_every_pump_count(solved):
    points = solved["operating_points"]
    assert points and all(POINT_KEYS <= set(p) for p in points)
    counts = {p["pumps_running"] for p in points}
    assert counts == set(range(1, max(counts) + 1))
    for n in counts:
        assert {(p["static"], p["pipe"]) for p in points if p["pumps_running"] == n} == {
            ("min", "new"), ("min", "aged"), ("max", "new"), ("max", "aged")}
    found = [p for p in points if p["flow_m3_s"] is not None]
    assert found, "the sample pumps should deliver"
    for p in found:
        assert p["npsh_available_m"] is not None and p["npsh_required_m"] is not None


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_human_summary(sample):
    result = run("solve", str(sample))
    assert result.returncode == 0, result.stderr
    out = " ".join(result.stdout.split())  # the cautions paragraph is wrapped
    for text in ("Static head", "Segments at design flow", "System curves", "Operating points", "Checks",
                 "Preliminary design aid", "licensed engineer"):
        assert text in out


def test_us_units_summary():
    result = run("solve", str(SAMPLES[0]), "--units", "US")
    assert result.returncode == 0 and "gpm" in result.stdout and "ft" in result.stdout


@pytest.mark.parametrize("content, needle", [
    ('{"format": "pumpsketch-project", "version": 99}', "version"),
    ('{"format": "pumpsketch-project", "version": 1, "segm', "not valid JSON"),
    ('[1, 2]', "expected an object"),
    ('{"format": "pumpsketch-project", "version": 1, "fluid": {"kind": "water", "temperature": '
     '{"value": 20, "unit": "degC"}}, "site": 3, "segments": []}', "site"),
])
def test_bad_files_exit_2_with_one_line(tmp_path, content, needle):
    path = tmp_path / "bad.pumpsketch.json"
    path.write_text(content)
    result = run("solve", str(path), "--json")
    assert result.returncode == 2
    assert result.stdout == ""
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and needle in lines[0] and "Traceback" not in result.stderr


def test_a_bad_pump_is_refused_in_the_words_of_the_file_reader(tmp_path):
    path = write_bad_pump_project(tmp_path)
    result = run("solve", str(path))
    assert result.returncode == 2 and result.stdout == ""
    lines = result.stderr.strip().splitlines()
    assert lines == [f"pumpsketch: {path}: {BAD_FIELD}: {BAD_PROBLEM}"]


def test_missing_file_exit_2():
    result = run("solve", "no/such/file.pumpsketch.json")
    assert result.returncode == 2 and len(result.stderr.strip().splitlines()) == 1


@pytest.mark.parametrize("csv", PUMP_FILES, ids=lambda p: p.name)
def test_import_pump_shows_the_fit(csv):
    result = run("import-pump", str(csv))
    assert result.returncode == 0, result.stderr
    assert "RMS residual" in result.stdout and "Best-efficiency point" in result.stdout


def test_import_pump_bad_file(tmp_path):
    path = tmp_path / "bad.csv"
    path.write_text("flow [L/s],head [m]\n0,50\n10,abc\n20,40\n30,30\n")
    result = run("import-pump", str(path))
    assert result.returncode == 2
    assert "line 3" in result.stderr and len(result.stderr.strip().splitlines()) == 1


@pytest.mark.parametrize("args, needle", [(("--sample", "no_such_sample"), "no sample called 'no_such_sample'"),
                                          (("--sample",), "give one sample name"),
                                          (("--sample", "../README"), "no sample called")])
def test_an_unknown_sample_exits_2_naming_the_samples(args, needle):
    result = run(*args)
    assert result.returncode == 2 and len(result.stderr.strip().splitlines()) == 1
    assert needle in result.stderr
    assert all(path.name.removesuffix(".pumpsketch.json") in result.stderr for path in SAMPLES)


def test_solve_names_a_bundled_sample_as_the_same_file(tmp_path):
    by_name = subprocess.run([sys.executable, "-m", "app", "solve", "--sample", "river_intake"],
                             capture_output=True, text=True, cwd=tmp_path, timeout=120)
    by_file = run("solve", str(ROOT / "sample_projects" / "river_intake.pumpsketch.json"))
    assert by_name.returncode == 0, by_name.stderr
    assert by_name.stdout == by_file.stdout


@pytest.mark.parametrize("args, needle", [
    (("solve", "--sample", "no_such_sample"), "no sample called 'no_such_sample'"),
    (("solve", "--sample", "../README"), "no sample called"),
    (("shot", "--sample", "no_such_sample", "-o", "x.png"), "no sample called"),
])
def test_solve_and_shot_refuse_an_unknown_sample_naming_the_samples(args, needle):
    result = run(*args)
    assert result.returncode == 2 and len(result.stderr.strip().splitlines()) == 1
    assert needle in result.stderr
    assert all(path.name.removesuffix(".pumpsketch.json") in result.stderr for path in SAMPLES)


@pytest.mark.parametrize("args", [("solve",), ("solve", str(SAMPLES[0]), "--sample", "river_intake")])
def test_solve_wants_a_file_or_a_sample_but_not_both(args):
    result = run(*args)
    assert result.returncode == 2 and "give a project file or --sample NAME" in result.stderr


def test_the_us_summary_quotes_every_check_and_missing_point_in_us_units():
    from dataclasses import replace

    from app.text_report import summary_text
    from hydraulics.project_io import load_project
    from hydraulics.solve import solve

    project = load_project(ROOT / "sample_projects" / "hilltop_booster.pumpsketch.json")
    tank = project.site.delivery  # 40 m higher (invented): above the pump's shut-off head at the top level
    site = replace(project.site, delivery=replace(tank, level_low_m=tank.level_low_m + 40.0,
                                                  level_high_m=tank.level_high_m + 40.0))
    solution = solve(replace(project, site=site))
    assert {"no_operating_point", "speed_target_unreachable"} <= {f.code for f in solution.findings}
    text = summary_text(solution, "US")
    checks = text[text.index("Checks ("):]
    points = text[text.index("Operating points:"):text.index("Checks (")]
    assert "gpm" in checks and " ft" in checks and "cannot lift" in points
    for part in (checks, points):
        assert not any(unit in part for unit in ("L/s", " m,", " m)", " m.", "m/s", "kPa")), part


def test_the_us_summary_gives_specific_energy_per_thousand_gallons():
    from app.text_report import summary_text
    from hydraulics.project_io import load_project
    from hydraulics.solve import solve

    solution = solve(load_project(ROOT / "sample_projects" / "river_intake.pumpsketch.json"))
    us, si = summary_text(solution, "US"), summary_text(solution, "SI")
    assert "kWh/kgal" in us and "kWh/m³" not in us and "kWh/m³" in si
    # 1 kgal = 1000 × 3.785411784 L = 3.785411784 m³ exactly (NIST SP 811, App. B)
    mean = solution.energy.specific_energy_mean_kwh_m3
    assert f"specific energy {mean * 3.785411784:.3f} kWh/kgal" in us
    assert f"specific energy {mean:.3f} kWh/m³" in si


def test_the_us_summary_gives_the_water_temperature_in_fahrenheit():
    from app.text_report import summary_text
    from hydraulics.project_io import load_project
    from hydraulics.solve import solve

    solution = solve(load_project(ROOT / "sample_projects" / "river_intake.pumpsketch.json"))
    assert solution.fluid.temperature_c == 20.0  # the sample's water
    # °F = °C × 9/5 + 32 (NIST SP 811, App. B): 20 °C = 68 °F
    assert "Fluid: water at 68.0 °F (IAPWS-IF97" in summary_text(solution, "US")
    assert "Fluid: water at 20.0 °C (IAPWS-IF97" in summary_text(solution, "SI")
