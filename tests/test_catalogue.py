"""Tests of the materials and pipe-series catalogues (hydraulics.catalogue, resources/)."""

from __future__ import annotations

import copy
import json
import math
from fractions import Fraction
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hydraulics import catalogue
from hydraulics.catalogue import (
    CatalogueError,
    CatalogueLookupError,
    ductile_iron_k_class_wall_mm,
    ductile_iron_wall_mm,
    load_materials,
    load_pipe_series,
    load_pipe_series_file,
    material,
    materials,
    pipe_series,
    series,
    thermoplastic_min_wall_mm,
)
from hydraulics.model import ModelError

REQUIRED_MATERIALS = {
    "pe100", "pvc_u", "ductile_iron_cml", "steel_new", "steel_tuberculated", "cast_iron_unlined_old",
    "concrete", "grp", "stainless_steel", "sewage_rising_main",
}
REQUIRED_SERIES = {
    "pe100_sdr11", "pe100_sdr17", "pvc_u_pn10", "ductile_iron_en545_c40", "steel_asme_b36_10_sch40",
}
ISO_161_OD_MM = [63, 75, 90, 110, 125, 140, 160, 180, 200, 225, 250, 280, 315, 355, 400, 450, 500,
                 560, 630, 710, 800]  # ISO 161-1 nominal outside diameters, 63–800 mm


# --------------------------------------------------------------------------- loading
def test_every_bundled_file_loads_with_the_required_entries():
    assert REQUIRED_MATERIALS <= set(materials())
    assert REQUIRED_SERIES <= set(pipe_series())
    files = sorted(p.stem for p in catalogue.PIPE_SERIES_DIR.glob("*.json"))
    assert files == sorted(pipe_series())


def test_catalogues_are_cached_and_read_only():
    assert materials() is materials()
    assert pipe_series() is pipe_series()
    with pytest.raises(TypeError):
        materials()["x"] = materials()["pe100"]  # deliberately the wrong type
    with pytest.raises(AttributeError):
        series("pe100_sdr11").sizes[0].outside_diameter_m = 1.0  # deliberately the wrong type


def test_project_samples_ids_resolve():
    # ids the sample projects use
    for mid in ("ductile_iron_cml", "steel_new", "sewage_rising_main"):
        assert material(mid).material_id == mid
    assert series("ductile_iron_en545_c40").size("DN 250").nominal == "DN 250"
    assert series("steel_asme_b36_10_sch40").size("NPS 6").nominal == "NPS 6"
    assert series("pe100_sdr17").size("400").nominal == "400"


@pytest.mark.parametrize("series_id", sorted(pipe_series()))
def test_series_geometry_is_consistent(series_id):
    s = series(series_id)
    bores = [z.internal_diameter_m for z in s.sizes]
    ods = [z.outside_diameter_m for z in s.sizes]
    assert bores == sorted(bores) and len(set(bores)) == len(bores), "bores ascend with nominal"
    assert ods == sorted(ods) and len(set(ods)) == len(ods), "outside diameters ascend with nominal"
    for z in s.sizes:
        assert 0.0 < z.internal_diameter_m < z.outside_diameter_m
        assert z.internal_diameter_m == pytest.approx(
            z.outside_diameter_m - 2.0 * (z.wall_thickness_m + z.lining_thickness_m), abs=5e-5)
    assert s.material_id in materials()
    assert s.standard and s.source and s.notes
    assert len(set(s.nominals())) == len(s.sizes)


def test_materials_are_plausible_and_converted_to_si():
    raw = json.loads((catalogue.RESOURCES_DIR / "materials.json").read_text(encoding="utf-8"))
    by_id = {m["id"]: m for m in raw["materials"]}
    for mid, m in materials().items():
        r = by_id[mid]
        assert m.roughness_new_m == pytest.approx(r["roughness_new_mm"] / 1000.0, rel=1e-12)
        assert m.roughness_aged_m == pytest.approx(r["roughness_aged_mm"] / 1000.0, rel=1e-12)
        assert m.youngs_modulus_pa == pytest.approx(r["youngs_modulus_gpa"] * 1e9, rel=1e-12)
        assert m.roughness_aged_m >= m.roughness_new_m
        assert m.hw_c_aged <= m.hw_c_new
        assert m.roughness_m("new") == m.roughness_new_m and m.hw_c("aged") == m.hw_c_aged
        # every value names where it comes from, or says it is remembered / common practice
        assert ("from memory" in m.source) or ("common practice" in m.source)
    # Commercial steel k_s = 0.00015 ft = 0.046 mm (Moody 1944); catalogue uses the usual 0.045 mm
    assert material("steel_new").roughness_new_m == pytest.approx(0.045e-3)
    # Plastics are far smoother than unlined old cast iron (order of magnitude; Moody 1944 table)
    assert material("pe100").roughness_new_m * 100 < material("cast_iron_unlined_old").roughness_new_m
    with pytest.raises(ModelError, match="pipe_state"):
        material("pe100").roughness_m("old")  # deliberately the wrong type


# --------------------------------------------------------------------------- plastics
# Minimum wall thickness e_min (mm) of PE100 pipe, ISO 4427-2 / ISO 4065 table, as reproduced in
# MS 1058-2:2005 (PE pipes for water supply, ISO 4427 dimensions) wall-thickness table
# (secondary reproduction; verify against ISO 4427-2).
PE_SDR11_TABLE_MM = {63: 5.8, 75: 6.8, 90: 8.2, 110: 10.0, 125: 11.4, 140: 12.7, 160: 14.6, 180: 16.4,
                     200: 18.2, 225: 20.5, 250: 22.7, 280: 25.4, 315: 28.6, 355: 32.2, 400: 36.3,
                     450: 40.9, 500: 45.4, 560: 50.8}
PE_SDR17_TABLE_MM = {63: 3.8, 75: 4.5, 90: 5.4, 110: 6.6, 125: 7.4, 140: 8.3, 160: 9.5, 180: 10.7,
                     200: 11.9, 225: 13.4, 250: 14.8, 280: 16.6, 315: 18.7, 355: 21.1, 400: 23.7,
                     450: 26.7, 560: 33.2}
# PVC-U PN 10 (SDR 21 up to 90 mm, SDR 26 from 110 mm), ISO 1452-2 table (from memory)
PVC_PN10_TABLE_MM = {63: 3.0, 75: 3.6, 90: 4.3, 110: 4.2, 125: 4.8, 140: 5.4, 160: 6.2, 180: 6.9,
                     200: 7.7, 225: 8.6, 250: 9.6, 280: 10.7, 315: 12.1, 355: 13.6, 400: 15.3}
# PVC-U PN 16 (SDR 17 from 110 mm), ISO 1452-2 table (from memory)
PVC_PN16_TABLE_MM = {110: 6.6, 160: 9.5}


@pytest.mark.parametrize("sdr, table", [(11, PE_SDR11_TABLE_MM), (17, PE_SDR17_TABLE_MM)])
def test_iso4065_rule_reproduces_the_pe_table(sdr, table):
    for dn, e in table.items():
        assert thermoplastic_min_wall_mm(dn, sdr) == pytest.approx(e, abs=1e-9), dn


def test_iso4065_rule_reproduces_the_pvc_table():
    for dn, e in PVC_PN10_TABLE_MM.items():
        assert thermoplastic_min_wall_mm(dn, 21 if dn <= 90 else 26) == pytest.approx(e, abs=1e-9), dn
    for dn, e in PVC_PN16_TABLE_MM.items():
        assert thermoplastic_min_wall_mm(dn, 17) == pytest.approx(e, abs=1e-9), dn


def test_pe_series_values_named_in_the_standard():
    # ISO 4427-2 table: 110 SDR 11 → 10.0 mm, 160 SDR 11 → 14.6 mm, 250 SDR 17 → 14.8 mm
    assert series("pe100_sdr11").size("110").wall_thickness_m == pytest.approx(10.0e-3)
    assert series("pe100_sdr11").size("160").wall_thickness_m == pytest.approx(14.6e-3)
    assert series("pe100_sdr17").size("250").wall_thickness_m == pytest.approx(14.8e-3)
    assert series("pe100_sdr11").size("110").internal_diameter_m == pytest.approx(90.0e-3)


@pytest.mark.parametrize("series_id, sdr, pn", [("pe100_sdr11", 11, 16.0), ("pe100_sdr17", 17, 10.0)])
def test_pe_series_files_follow_the_rule(series_id, sdr, pn):
    s = series(series_id)
    assert [round(z.outside_diameter_m * 1000, 6) for z in s.sizes] == ISO_161_OD_MM
    for z in s.sizes:
        dn = z.outside_diameter_m * 1000
        assert z.wall_thickness_m * 1000 == pytest.approx(thermoplastic_min_wall_mm(dn, sdr), abs=1e-9)
        # PN = 20 σ_s / (SDR − 1), PE100 σ_s = MRS/C = 10/1.25 = 8 MPa (ISO 4427-1)
        assert z.pressure_rating_bar == pytest.approx(20 * 8.0 / (sdr - 1)) == pn


@pytest.mark.parametrize("series_id, small_sdr, large_sdr, pn", [
    ("pvc_u_pn10", 21, 26, 10.0), ("pvc_u_pn16", 13.6, 17, 16.0)])
def test_pvc_series_files_follow_the_rule(series_id, small_sdr, large_sdr, pn):
    s = series(series_id)
    assert s.nominals()[0] == "63" and s.nominals()[-1] == "400"
    for z in s.sizes:
        dn = z.outside_diameter_m * 1000
        sdr, sigma = (small_sdr, 10.0) if dn <= 90 else (large_sdr, 12.5)  # ISO 1452-2: C 2.5 / 2.0
        assert z.wall_thickness_m * 1000 == pytest.approx(thermoplastic_min_wall_mm(dn, sdr), abs=1e-9)
        assert z.pressure_rating_bar == pn
        assert 20 * sigma / (sdr - 1) == pytest.approx(pn, rel=0.03)  # PN = 20 σ_s/(SDR − 1)


@settings(max_examples=60, deadline=None)
@given(dn=st.floats(10.0, 3000.0), sdr=st.sampled_from(sorted(catalogue.ISO_4065_SDR_TO_S)))
def test_iso4065_rule_rounds_up_within_a_tenth(dn, sdr):
    s = 10 ** (round(10 * math.log10(catalogue.ISO_4065_SDR_TO_S[sdr])) / 10)
    exact = dn / (2 * s + 1)
    e = thermoplastic_min_wall_mm(dn, sdr)
    assert exact - 0.005 - 1e-9 <= e < exact + 0.1 + 1e-9
    assert round(e * 10) == pytest.approx(e * 10, abs=1e-9)


def test_iso4065_rule_refuses_a_non_standard_sdr():
    with pytest.raises(ModelError, match="sdr"):
        thermoplastic_min_wall_mm(110, 12)
    with pytest.raises(ModelError, match="outside_diameter_mm"):
        thermoplastic_min_wall_mm(-1, 11)


# --------------------------------------------------------------------------- ductile iron
# External diameter DE (mm), EN 545 dimension table (from memory)
DI_DE_MM = {80: 98, 100: 118, 125: 144, 150: 170, 200: 222, 250: 274, 300: 326, 350: 378, 400: 429,
            450: 480, 500: 532, 600: 635}
# Nominal iron wall of class C40, EN 545:2010 table, DN 80–300 (from memory)
DI_C40_WALL_MM = {80: 4.4, 100: 4.4, 125: 4.5, 150: 4.5, 200: 4.7, 250: 5.5, 300: 6.2}
# Nominal iron wall of thickness class K9, ISO 2531 / EN 545:2006 tables (from memory)
DI_K9_WALL_MM = {80: 6.0, 100: 6.0, 125: 6.0, 150: 6.0, 200: 6.3, 250: 6.8, 300: 7.2, 350: 7.7,
                 400: 8.1, 450: 8.6, 500: 9.0, 600: 9.9}


@pytest.mark.parametrize("series_id", ["ductile_iron_en545_c40", "ductile_iron_k9"])
def test_ductile_iron_dimensions(series_id):
    s = series(series_id)
    assert s.nominals() == tuple(f"DN {dn}" for dn in DI_DE_MM)
    for dn, de in DI_DE_MM.items():
        z = s.size(f"DN {dn}")
        assert z.outside_diameter_m * 1000 == pytest.approx(de)
        # cement-mortar lining nominal 3 mm DN 40–300, 5 mm DN 350–600 (ISO 4179, from memory)
        assert z.lining_thickness_m * 1000 == pytest.approx(3.0 if dn <= 300 else 5.0)
        assert z.internal_diameter_m == pytest.approx(
            (de - 2 * (z.wall_thickness_m * 1000 + z.lining_thickness_m * 1000)) / 1000, abs=1e-9)


def test_ductile_iron_wall_rules_reproduce_the_tables():
    for dn, e in DI_C40_WALL_MM.items():
        assert ductile_iron_wall_mm(dn, DI_DE_MM[dn], 40) == pytest.approx(e), dn
        assert series("ductile_iron_en545_c40").size(f"DN {dn}").wall_thickness_m * 1000 == pytest.approx(e)
    for dn, e in DI_K9_WALL_MM.items():
        assert ductile_iron_k_class_wall_mm(dn, 9) == pytest.approx(e), dn
        assert series("ductile_iron_k9").size(f"DN {dn}").wall_thickness_m * 1000 == pytest.approx(e)
    for dn, de in DI_DE_MM.items():  # every C40 size of the file follows the rule
        assert series("ductile_iron_en545_c40").size(f"DN {dn}").wall_thickness_m * 1000 == pytest.approx(
            ductile_iron_wall_mm(dn, de, 40))


# --------------------------------------------------------------------------- steel
def _nps(nominal: str) -> float:
    text = nominal.removeprefix("NPS ")
    whole, _, frac = text.partition("-")
    return float(int(whole) + (Fraction(frac) if frac else 0))


def test_steel_schedule_40_matches_fluids():
    fluids_piping = pytest.importorskip("fluids.piping")
    s = series("steel_asme_b36_10_sch40")
    for z in s.sizes:
        nps = _nps(z.nominal)
        # reference library used only in tests: fluids.piping (ASME B36.10M table)
        ref_nps, di, do, t = fluids_piping.nearest_pipe(NPS=nps, schedule="40")
        assert ref_nps == nps
        assert z.outside_diameter_m == pytest.approx(do, abs=1e-5), z.nominal
        assert z.wall_thickness_m == pytest.approx(t, abs=1e-5), z.nominal
        assert z.internal_diameter_m == pytest.approx(di, abs=1e-5), z.nominal
    expected = [n for n in fluids_piping.NPS40 if 1 <= n <= 24]
    assert [_nps(n) for n in s.nominals()] == expected


def test_steel_values_named_in_the_standard():
    s = series("steel_asme_b36_10_sch40")
    # ASME B36.10M Schedule 40: NPS 4 114.3 × 6.02, NPS 6 168.3 × 7.11, NPS 8 219.1 × 8.18 (from memory)
    for nominal, od, t in (("NPS 4", 114.3, 6.02), ("NPS 6", 168.3, 7.11), ("NPS 8", 219.1, 8.18)):
        assert s.size(nominal).outside_diameter_m * 1000 == pytest.approx(od)
        assert s.size(nominal).wall_thickness_m * 1000 == pytest.approx(t)


# --------------------------------------------------------------------------- look-ups
@pytest.mark.parametrize("series_id, text, nominal", [
    ("pe100_sdr11", "110", "110"),
    ("pe100_sdr11", "110 mm", "110"),
    ("pe100_sdr11", "dn110", "110"),
    ("pe100_sdr11", " D 110 ", "110"),
    ("ductile_iron_en545_c40", "DN100", "DN 100"),
    ("ductile_iron_en545_c40", "dn 100", "DN 100"),
    ("ductile_iron_en545_c40", "100", "DN 100"),
    ("steel_asme_b36_10_sch40", "NPS 1-1/4", "NPS 1-1/4"),
    ("steel_asme_b36_10_sch40", '1 1/4"', "NPS 1-1/4"),
    ("steel_asme_b36_10_sch40", "1.25 in", "NPS 1-1/4"),
    ("steel_asme_b36_10_sch40", "8 in", "NPS 8"),
    ("steel_asme_b36_10_sch40", "nps8", "NPS 8"),
])
def test_size_lookup_forgives_spelling(series_id, text, nominal):
    assert series(series_id).size(text).nominal == nominal


@pytest.mark.parametrize("series_id, text", [
    ("steel_asme_b36_10_sch40", "4 mm"),     # metric word against an inch size
    ("steel_asme_b36_10_sch40", "DN 4"),
    ("ductile_iron_en545_c40", "4 in"),      # inch word against a DN size
    ("pe100_sdr11", "111"),
    ("pe100_sdr11", "large"),
    ("pe100_sdr11", ""),
])
def test_size_lookup_refuses_what_is_not_there(series_id, text):
    with pytest.raises(CatalogueLookupError) as info:
        series(series_id).size(text)
    assert info.value.field_path == "nominal_size"
    assert series_id in info.value.problem


def test_unknown_size_names_the_series_and_nearby_sizes():
    with pytest.raises(ModelError) as info:
        series("pe100_sdr11").size("120")
    problem = info.value.problem
    assert "pe100_sdr11" in problem and "'120'" in problem
    assert "110" in problem and "125" in problem and "63" in problem and "800" in problem
    assert isinstance(info.value, KeyError)  # mapping-style callers may catch KeyError
    assert str(info.value).startswith("nominal_size: ")
    with pytest.raises(ModelError, match="valid sizes: DN 80, DN 100"):
        series("ductile_iron_k9").size("huge")
    with pytest.raises(ModelError, match="nominal_size"):
        series("ductile_iron_k9").size(100)  # deliberately the wrong type


def test_unknown_material_and_series_list_the_valid_ids():
    with pytest.raises(ModelError) as info:
        material("unobtainium")
    assert info.value.field_path == "material_id" and "'unobtainium'" in info.value.problem
    assert "pe100" in info.value.problem and "ductile_iron_cml" in info.value.problem
    with pytest.raises(KeyError):
        series("pe80_sdr11")
    with pytest.raises(ModelError, match="pipe_series.*pe100_sdr17"):
        series("pe80_sdr11")


def test_step_moves_through_the_series_and_clamps():
    s = series("ductile_iron_en545_c40")
    assert s.step("DN 200", 1).nominal == "DN 250"
    assert s.step("DN 200", -2).nominal == "DN 125"
    assert s.step("DN 200", 0).nominal == "DN 200"
    assert s.step("DN 500", 5).nominal == "DN 600"
    assert s.step("DN 100", -5).nominal == "DN 80"
    assert s.step("DN 80", -1).nominal == "DN 80"
    with pytest.raises(ModelError, match="steps"):
        s.step("DN 200", 1.5)  # deliberately the wrong type
    with pytest.raises(ModelError, match="nominal_size"):
        s.step("DN 220", 1)


def test_nearest_picks_the_closest_bore():
    s = series("pe100_sdr11")
    for z in s.sizes:
        assert s.nearest(z.internal_diameter_m) is z
    assert s.nearest(1e-6).nominal == "63"
    assert s.nearest(5.0).nominal == "800"
    a, b = s.size("110"), s.size("125")
    mid = 0.5 * (a.internal_diameter_m + b.internal_diameter_m)
    assert s.nearest(mid) is b  # a tie goes to the larger bore
    assert s.nearest(mid - 1e-6) is a
    exact = catalogue.PipeSeries(
        "t", "t", "pe100", "none", "invented", "", (
            catalogue.PipeSize("small", 0.6, 0.05, 0.5), catalogue.PipeSize("large", 1.2, 0.1, 1.0)))
    assert exact.nearest(0.75).nominal == "large"  # exact tie (binary-exact bores)
    assert exact.nearest(0.7499).nominal == "small"
    for bad in (0.0, -0.1, math.nan, math.inf, "0.1", True):
        with pytest.raises(ModelError, match="internal_diameter_m"):
            s.nearest(bad)  # deliberately the wrong type


@settings(max_examples=50, deadline=None)
@given(d=st.floats(0.01, 1.0), series_id=st.sampled_from(sorted(pipe_series())))
def test_nearest_is_never_beaten(d, series_id):
    s = series(series_id)
    best = s.nearest(d)
    assert all(abs(best.internal_diameter_m - d) <= abs(z.internal_diameter_m - d) for z in s.sizes)


# --------------------------------------------------------------------------- malformed files
def _valid_series() -> dict:
    return {
        "format": "pumpsketch-pipe-series", "version": 1, "id": "test_series", "name": "Test series",
        "material_id": "pe100", "standard": "none", "source": "invented for a test", "notes": "",
        "sizes": [
            {"nominal": "A", "outside_diameter_mm": 100.0, "wall_thickness_mm": 5.0, "internal_diameter_mm": 90.0},
            {"nominal": "B", "outside_diameter_mm": 200.0, "wall_thickness_mm": 10.0,
             "internal_diameter_mm": 180.0, "pressure_rating_bar": 10},
        ],
    }


def _write(tmp_path: Path, doc, name: str = "test_series.json") -> Path:
    path = tmp_path / name
    path.write_text(doc if isinstance(doc, str) else json.dumps(doc), encoding="utf-8")
    return path


def test_a_valid_series_file_loads(tmp_path):
    s = load_pipe_series_file(_write(tmp_path, _valid_series()))
    assert s.nominals() == ("A", "B")
    assert s.size("B").pressure_rating_bar == 10.0
    assert s.size("A").pressure_rating_bar is None and s.size("A").lining_thickness_m == 0.0


def _mutate(fn):
    doc = _valid_series()
    fn(doc)
    return doc


SERIES_DEFECTS = [
    (lambda d: d.pop("name"), "name", "missing"),
    (lambda d: d.update(format="other"), "format", "pumpsketch-pipe-series"),
    (lambda d: d.update(version=2), "version", "newer"),
    (lambda d: d.update(version="1"), "version", "whole version"),
    (lambda d: d.update(id="Test-Series"), "id", "lower-case"),
    (lambda d: d.update(id="other_name"), "id", "file name"),
    (lambda d: d.update(sizes=[]), "sizes", "empty"),
    (lambda d: d.update(sizes="A"), "sizes", "expected a list"),
    (lambda d: d.update(colour="blue"), "(top level)", "colour"),
    (lambda d: d["sizes"][1].update(outside_diamter_mm=1), "sizes[1] (B)", "outside_diamter_mm"),
    (lambda d: d["sizes"][0].pop("wall_thickness_mm"), "sizes[0] (A).wall_thickness_mm", "missing"),
    (lambda d: d["sizes"][0].update(wall_thickness_mm="5"), "sizes[0] (A).wall_thickness_mm", "finite number"),
    (lambda d: d["sizes"][0].update(wall_thickness_mm=-5), "sizes[0] (A).wall_thickness_mm", "allowed range"),
    (lambda d: d["sizes"][0].update(internal_diameter_mm=95.0), "sizes[0] (A).internal_diameter_mm", "differs"),
    (lambda d: d["sizes"][0].update(internal_diameter_mm=120.0), "sizes[0] (A).internal_diameter_mm",
     "not smaller"),
    (lambda d: d["sizes"].reverse(), "sizes[1] (A)", "ascending"),
    (lambda d: d["sizes"][1].update(nominal="a"), "sizes[1] (a)", "duplicate"),
    (lambda d: d["sizes"][1].update(pressure_rating_bar=0), "pressure_rating_bar", "allowed range"),
    (lambda d: d["sizes"].append(3), "sizes[2]", "expected an object"),
]


@pytest.mark.parametrize("defect, entry, words", SERIES_DEFECTS)
def test_a_malformed_series_file_names_file_and_entry(tmp_path, defect, entry, words):
    path = _write(tmp_path, _mutate(defect))
    with pytest.raises(CatalogueError) as info:
        load_pipe_series_file(path)
    message = str(info.value)
    assert message.startswith("test_series.json: ")
    assert entry in info.value.field_path
    assert words in message


def test_unreadable_json_reports_line_and_column(tmp_path):
    path = _write(tmp_path, '{"format": "pumpsketch-pipe-series",\n  "version": 1,,}')
    with pytest.raises(CatalogueError, match=r"test_series.json: line 2, column 16: not valid JSON"):
        load_pipe_series_file(path)
    with pytest.raises(CatalogueError, match="not found"):
        load_pipe_series_file(tmp_path / "absent.json")
    with pytest.raises(CatalogueError, match="top"):
        load_pipe_series_file(_write(tmp_path, "[]"))


def test_a_series_naming_an_unknown_material_is_refused(tmp_path):
    doc = _valid_series()
    doc["material_id"] = "balsa"
    _write(tmp_path, doc)
    with pytest.raises(CatalogueError, match="test_series.json: material_id: unknown material 'balsa'"):
        load_pipe_series(tmp_path, known_material_ids=frozenset(materials()))
    assert "test_series" in load_pipe_series(tmp_path)  # without a material list it loads
    with pytest.raises(CatalogueError, match="empty_dir_absent: pipe-series folder not found"):
        load_pipe_series(tmp_path / "empty_dir_absent")
    (tmp_path / "empty").mkdir()
    with pytest.raises(CatalogueError, match="no pipe-series files"):
        load_pipe_series(tmp_path / "empty")


def _valid_materials() -> dict:
    return copy.deepcopy({
        "format": "pumpsketch-materials", "version": 1,
        "materials": [{"id": "m1", "name": "Material one", "roughness_new_mm": 0.01, "roughness_aged_mm": 0.1,
                       "hw_c_new": 140, "hw_c_aged": 120, "youngs_modulus_gpa": 1.0, "source": "invented"}],
    })


MATERIAL_DEFECTS = [
    (lambda m: m.update(roughness_aged_mm=0.001), "materials[0] (m1).roughness_aged_mm", "below new"),
    (lambda m: m.update(hw_c_aged=150), "materials[0] (m1).hw_c_aged", "exceeds new"),
    (lambda m: m.update(hw_c_new=500), "materials[0] (m1).hw_c_new", "allowed range"),
    (lambda m: m.update(youngs_modulus_gpa=0), "materials[0] (m1).youngs_modulus_gpa", "allowed range"),
    (lambda m: m.pop("source"), "materials[0] (m1).source", "missing"),
    (lambda m: m.update(source=" "), "materials[0] (m1).source", "empty"),
    (lambda m: m.update(roughnes_new_mm=1), "materials[0] (m1)", "roughnes_new_mm"),
    (lambda m: m.update(roughness_new_mm=True), "roughness_new_mm", "finite number"),
]


@pytest.mark.parametrize("defect, entry, words", MATERIAL_DEFECTS)
def test_a_malformed_materials_file_names_file_and_entry(tmp_path, defect, entry, words):
    doc = _valid_materials()
    defect(doc["materials"][0])
    path = _write(tmp_path, doc, "materials.json")
    with pytest.raises(CatalogueError) as info:
        load_materials(path)
    assert str(info.value).startswith("materials.json: ")
    assert entry in info.value.field_path
    assert words in str(info.value)


def test_materials_file_level_defects(tmp_path):
    doc = _valid_materials()
    doc["materials"].append(dict(doc["materials"][0]))
    with pytest.raises(CatalogueError, match="duplicate id 'm1'"):
        load_materials(_write(tmp_path, doc, "materials.json"))
    doc = _valid_materials()
    doc["materials"] = []
    with pytest.raises(CatalogueError, match="materials.json: materials: the list is empty"):
        load_materials(_write(tmp_path, doc, "materials.json"))
    loaded = load_materials(_write(tmp_path, _valid_materials(), "materials.json"))
    assert loaded["m1"].roughness_aged_m == pytest.approx(1e-4)
    assert loaded["m1"].youngs_modulus_pa == pytest.approx(1e9)
