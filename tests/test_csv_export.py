"""The CSV tables (hydraulics.csv_export) and ``pumpsketch export``.

Each table is read back with the csv module and every number converted to SI with the
unit named in its header cell (through pint, :func:`hydraulics.units.convert_to_si`,
not the precomputed display factors the writer uses); the result must equal the
engine's own value to rounding.  The exact factors checked by hand are the definitions
in NIST SP 811 (2008), appendix B: 1 ft = 0.3048 m, 1 US gal = 3.785411784 L.
"""

from __future__ import annotations

import csv
import io
import math
import re
import subprocess
import sys
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from hydraulics import csv_export
from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.project_io import load_project, save_project
from hydraulics.solve import solve
from hydraulics.units import convert_to_si
from tests import installed_pump_fakes as fakes

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_projects"
HEADER = re.compile(r"^(?P<name>.*?) \[(?P<unit>[^\]]+)\]$")

INJECTIONS = ("=HYPERLINK(\"http://example.invalid\",\"x\")", "+1+2", "-3+4", "@SUM(A1:A2)", "\t=1", "\r=1")
"""Formula triggers of OWASP, "CSV Injection": a cell beginning with = + - @, tab or carriage return."""

QUANTITY_OF_UNIT = {"L/s": "flow", "gpm": "flow", "m": "length", "ft": "length", "mm": "diameter",
                    "in": "diameter", "m/s": "velocity", "ft/s": "velocity", "%": "ratio_percent", "kW": "power",
                    "hp": "power", "kWh/m³": "specific_energy", "kWh/kgal": "specific_energy"}


def read_table(text: str) -> tuple[dict[str, str], list[dict[str, str]]]:
    """The preamble (key → value) and the rows (header → cell) of one exported table."""
    assert text.startswith("\ufeff")
    rows = list(csv.reader(io.StringIO(text[1:], newline="")))
    preamble = {row[0]: row[1] for row in rows[:csv_export.PREAMBLE_ROWS - 1]}
    assert rows[csv_export.PREAMBLE_ROWS - 1] == []
    header = rows[csv_export.PREAMBLE_ROWS]
    return preamble, [dict(zip(header, row, strict=True)) for row in rows[csv_export.PREAMBLE_ROWS + 1:]]


def si_column(rows: list[dict[str, str]], name: str) -> np.ndarray:
    """Column ``name`` ("flow") in SI, converted with the unit of its header cell; empty cells NaN."""
    keys = [key for key in rows[0] if (HEADER.match(key) and HEADER.match(key)["name"] == name) or key == name]
    assert len(keys) == 1, (name, list(rows[0]))
    match = HEADER.match(keys[0])
    values = np.array([float(row[keys[0]]) if row[keys[0]] else math.nan for row in rows])
    if match is None:
        return values
    unit = match["unit"]
    return np.array([convert_to_si(v, QUANTITY_OF_UNIT[unit], unit) if math.isfinite(v) else math.nan
                     for v in values])


@pytest.fixture(scope="module")
def hilltop_solution():
    return solve(load_project(SAMPLES / "hilltop_booster.pumpsketch.json"))


@pytest.fixture(scope="module")
def sewage_solution():
    """The sewage sample: pump branches and a vented summit that governs part of the curves."""
    return solve(load_project(SAMPLES / "sewage_wet_well.pumpsketch.json"))


@pytest.fixture(scope="module")
def assisted_solution():
    """Hilltop with the invented JP40 installed as an assist pump: pump-set points with shares."""
    return solve(fakes.with_assist(fakes.hilltop(), fakes.jp40()))


@pytest.mark.parametrize("system", ["SI", "US"])
def test_system_curves_read_back_to_the_engine_numbers(sewage_solution, system):
    preamble, rows = read_table(csv_export.system_curves_csv(sewage_solution, system))
    assert preamble == {"project": sewage_solution.project.name, "table": "System curves", "units": system,
                        "caution": CAUTIONS_TEXT}
    for curve in sewage_solution.curves:
        mine = [r for r in rows if r["static"] == curve.static and r["pipe"] == curve.pipe]
        assert len(mine) == len(curve.flow_m3_s)
        for column, expected in (("flow", curve.flow_m3_s), ("total head", curve.head_m),
                                 ("static head", curve.static_m), ("friction loss", curve.friction_m),
                                 ("minor loss", curve.minor_m)):
            np.testing.assert_allclose(si_column(mine, column), expected, rtol=1e-12, atol=1e-15)
        chainage = si_column(mine, "control chainage")
        expected = (np.full(len(mine), math.nan) if curve.control_chainage_m is None else curve.control_chainage_m)
        np.testing.assert_allclose(chainage, expected, rtol=1e-12)
        assert [r["control"] for r in mine] == ["delivery" if math.isnan(c) else "crest" for c in expected]
    assert any(r["control"] == "crest" for r in rows)  # the sample's summit governs somewhere


def test_us_headers_carry_the_us_units_and_the_exact_factors(hilltop_solution):
    _preamble, rows = read_table(csv_export.system_curves_csv(hilltop_solution, "US"))
    assert {"flow [gpm]", "total head [ft]", "static head [ft]"} <= set(rows[0])
    curve = hilltop_solution.curves[-1]
    last = [r for r in rows if r["static"] == curve.static and r["pipe"] == curve.pipe][-1]
    gpm_m3_s = 3.785411784e-3 / 60.0  # NIST SP 811 (2008) B.8: US gallon 3.785411784 L (exact)
    assert float(last["flow [gpm]"]) == pytest.approx(curve.flow_m3_s[-1] / gpm_m3_s, rel=1e-12)
    assert float(last["total head [ft]"]) == pytest.approx(curve.head_m[-1] / 0.3048, rel=1e-12)  # NIST SP 811


@pytest.mark.parametrize("system", ["SI", "US"])
def test_operating_points_read_back_every_scenario(hilltop_solution, system):
    _preamble, rows = read_table(csv_export.operating_points_csv(hilltop_solution, system))
    arrangement = [r for r in rows if r["set"] == "arrangement"]
    points = hilltop_solution.operating_points
    assert len(arrangement) == len(points) > 0
    assert {(r["static"], r["pipe"]) for r in arrangement} == {(s, p) for s in ("min", "max") for p in ("new", "aged")}
    for column, attribute in (("flow", "flow_m3_s"), ("flow per pump", "flow_per_pump_m3_s"), ("head", "head_m"),
                              ("efficiency", "efficiency"), ("shaft power per pump", "shaft_power_w"),
                              ("input power", "input_power_w"), ("NPSH available", "npsh_available_m"),
                              ("NPSH required", "npsh_required_m"), ("NPSH margin", "npsh_margin_m"),
                              ("speed", "speed_ratio")):
        expected = np.array([math.nan if getattr(p, attribute) is None else getattr(p, attribute) for p in points])
        np.testing.assert_allclose(si_column(arrangement, column), expected, rtol=1e-12)
    # kWh/m³ from the engine: 1 kWh = 3.6 MJ (SI Brochure, 9th ed., table 8, the watt-hour)
    expected = np.array([p.specific_energy_kwh_m3 for p in points]) * 3.6e6
    np.testing.assert_allclose(si_column(arrangement, "specific energy"), expected, rtol=1e-12)
    assert [int(r["pumps running"]) for r in arrangement] == [p.pumps_running for p in points]
    assert all(r["found"] == "yes" for r in arrangement)


def test_pump_set_points_list_each_pumps_share(assisted_solution):
    pump_set = assisted_solution.pump_set
    assert pump_set is not None and pump_set.points
    _preamble, rows = read_table(csv_export.operating_points_csv(assisted_solution))
    set_rows = [r for r in rows if r["set"] == "pump set" and not r["pump"]]
    share_rows = [r for r in rows if r["set"] == "pump set" and r["pump"]]
    assert len(set_rows) == len(pump_set.points)
    assert len(share_rows) == sum(len(p.shares) for p in pump_set.points)
    assert [r["running"] for r in set_rows] == [p.label for p in pump_set.points]
    expected_flow = [math.nan if p.flow_m3_s is None else p.flow_m3_s for p in pump_set.points]
    np.testing.assert_allclose(si_column(set_rows, "flow"), expected_flow, rtol=1e-12)
    shares = [s for p in pump_set.points for s in p.shares]
    assert [r["pump"] for r in share_rows] == [s.tag for s in shares]
    np.testing.assert_allclose(si_column(share_rows, "flow"),
                               [math.nan if s.flow_m3_s is None else s.flow_m3_s for s in shares], rtol=1e-12)
    np.testing.assert_allclose(si_column(share_rows, "head"),
                               [math.nan if s.head_m is None else s.head_m for s in shares], rtol=1e-12)
    # a found set delivers the sum of its pumps' flows (continuity at the manifold)
    for point in pump_set.points:
        if point.found:
            assert sum(s.flow_m3_s or 0.0 for s in point.shares) == pytest.approx(point.flow_m3_s, rel=1e-9)


@pytest.mark.parametrize("system", ["SI", "US"])
def test_segments_read_back_at_the_design_flow(sewage_solution, system):
    _preamble, rows = read_table(csv_export.segments_csv(sewage_solution, system))
    segments = sewage_solution.segments
    assert [r["segment"] for r in rows] == [s.name for s in segments]
    assert [r["carries"] for r in rows] == [s.carries for s in segments]
    for column, attribute in (("flow", "flow_m3_s"), ("length", "length_m"),
                              ("internal diameter", "internal_diameter_m"), ("roughness", "roughness_m"),
                              ("velocity", "velocity_m_s"), ("Reynolds number", "reynolds"),
                              ("friction factor", "friction_factor"), ("friction loss", "friction_loss_m"),
                              ("K total", "minor_k_total"), ("minor loss", "minor_loss_m")):
        np.testing.assert_allclose(si_column(rows, column), [getattr(s, attribute) for s in segments], rtol=1e-12)
    np.testing.assert_allclose(si_column(rows, "total loss"),
                               [s.friction_loss_m + s.minor_loss_m for s in segments], rtol=1e-12)


def test_injection_strings_in_names_come_out_neutralised(hilltop_solution):
    project = hilltop_solution.project
    segments = tuple(replace(s, name=INJECTIONS[i % len(INJECTIONS)]) for i, s in enumerate(project.segments))
    solution = solve(replace(project, name=INJECTIONS[0], segments=segments))
    for text in (csv_export.system_curves_csv(solution), csv_export.operating_points_csv(solution),
                 csv_export.segments_csv(solution)):
        preamble, rows = read_table(text)
        assert preamble["project"] == "'" + INJECTIONS[0]
    _preamble, rows = read_table(csv_export.segments_csv(solution))
    assert [r["segment"] for r in rows] == ["'" + s.name for s in segments]
    for row in rows:  # no cell anywhere begins with a trigger; numbers stay plain numbers
        for value in row.values():
            assert not value.startswith(csv_export.FORMULA_TRIGGERS)
        float(row["velocity [m/s]"])


def test_a_negative_number_stays_a_number_and_a_plain_name_is_untouched():
    assert csv_export._cell(-0.25) == "-0.25"
    assert csv_export._cell(float("nan")) == "" and csv_export._cell(None) == ""
    assert csv_export.neutralise_text("Rising main") == "Rising main"
    assert all(csv_export.neutralise_text(t).startswith("'") for t in INJECTIONS)


def test_write_csv_replaces_the_file_whole(tmp_path, hilltop_solution):
    path = tmp_path / "curves.csv"
    path.write_text("old", encoding="utf-8")
    csv_export.write_csv(str(path), csv_export.system_curves_csv(hilltop_solution))
    assert path.read_text(encoding="utf-8-sig").startswith("project,")
    assert [p.name for p in tmp_path.iterdir()] == ["curves.csv"]  # no temporary file left behind


# ------------------------------------------------------------------ the command
def run(*args: str, cwd: Path | None = None) -> subprocess.CompletedProcess[str]:
    return subprocess.run([sys.executable, "-m", "app", *args], capture_output=True, text=True, cwd=cwd or ROOT,
                          timeout=120, check=False)


def test_export_writes_the_three_tables(tmp_path):
    out = {name: tmp_path / f"{name}.csv" for name in ("curves", "points", "segments")}
    result = run("export", "--sample", "hilltop_booster", "--units", "US", "--curves", str(out["curves"]),
                 "--points", str(out["points"]), "--segments", str(out["segments"]))
    assert result.returncode == 0, result.stderr
    solution = solve(load_project(SAMPLES / "hilltop_booster.pumpsketch.json"))
    assert out["curves"].read_bytes().decode("utf-8") == csv_export.system_curves_csv(solution, "US")
    assert out["points"].read_bytes().decode("utf-8") == csv_export.operating_points_csv(solution, "US")
    assert out["segments"].read_bytes().decode("utf-8") == csv_export.segments_csv(solution, "US")


@pytest.mark.parametrize(("extra", "needle"), [
    ((), "at least one of --curves"),
    (("--curves", "{dir}/missing/c.csv"), "no such folder"),
    (("--curves", "{dir}/same.csv", "--points", "{dir}/same.csv"), "given for two tables"),
    (("--units", "metric", "--curves", "{dir}/c.csv"), "invalid choice"),
])
def test_export_bad_input_exits_2_with_one_line(tmp_path, extra, needle):
    result = run("export", "--sample", "hilltop_booster", *(e.format(dir=tmp_path) for e in extra))
    assert result.returncode == 2
    assert needle in result.stderr
    assert len(result.stderr.strip().splitlines()) == 1 or "usage:" in result.stderr
    assert list(tmp_path.iterdir()) == []


def test_export_never_overwrites_the_project_file(tmp_path):
    project = tmp_path / "p.pumpsketch.json"
    save_project(load_project(SAMPLES / "hilltop_booster.pumpsketch.json"), project)
    before = project.read_bytes()
    result = run("export", str(project), "--points", str(project))
    assert result.returncode == 2 and "the project file itself" in result.stderr
    assert project.read_bytes() == before
