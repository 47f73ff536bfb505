"""Tests of hydraulics.fittings: the catalogue, Crane K values and segment K totals.

Reference library used only here: ``fluids`` (``fluids.fittings`` implements the Crane
TP-410 loss coefficients; ``fluids.friction.ft_Crane`` an independent fit of Crane's f_T table).
"""

from __future__ import annotations

import json
import math

import fluids.fittings as ff
import fluids.friction
import numpy as np
import pytest

from hydraulics.bore_change import bore_change_k, transition_angle_deg
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.fittings import (
    CATEGORIES,
    CRANE_STEEL_ROUGHNESS_M,
    DEFAULT_CATALOGUE_PATH,
    FittingType,
    crane_friction_factor,
    fitting_catalogue,
    fitting_k,
    load_fitting_catalogue,
    minor_loss,
    segment_k_total,
)
from hydraulics.friction import fully_turbulent_friction_factor
from hydraulics.model import Fitting, ModelError

DIAMETERS_M = (0.0266, 0.0525, 0.1023, 0.2027, 0.3032, 0.5747)  # schedule 40 bores, 1–24 in

# Each catalogue entry checked against fluids: a function (D, f_T) -> K.  ``fd`` is passed so
# that the test checks Crane's multiplier n exactly; f_T itself is checked separately.
CRANE_REFERENCES = {
    "gate_valve_open": lambda d, fd: ff.K_gate_valve_Crane(d, d, 0.0, fd=fd),
    "ball_valve_full_bore": lambda d, fd: ff.K_ball_valve_Crane(d, d, 0.0, fd=fd),
    "plug_valve_straight": lambda d, fd: ff.K_plug_valve_Crane(d, d, 0.0, fd=fd, style=0),
    "globe_valve": lambda d, fd: ff.K_globe_valve_Crane(d, d, fd=fd),
    "swing_check_valve": lambda d, fd: ff.K_swing_check_valve_Crane(d, fd=fd, angled=True),
    "swing_check_valve_clearway": lambda d, fd: ff.K_swing_check_valve_Crane(d, fd=fd, angled=False),
    "lift_check_valve": lambda d, fd: ff.K_lift_check_valve_Crane(d, d, fd=fd, angled=False),
    "lift_check_valve_angle": lambda d, fd: ff.K_lift_check_valve_Crane(d, d, fd=fd, angled=True),
    "foot_valve_poppet": lambda d, fd: ff.K_foot_valve_Crane(d, fd=fd, style=0),
    "foot_valve_hinged": lambda d, fd: ff.K_foot_valve_Crane(d, fd=fd, style=1),
}

# Butterfly valves: fluids.fittings.K_butterfly_valve_Crane (centric, style 0) chooses the size
# band from the diameter; each of our band entries is checked at diameters inside its band.
BUTTERFLY_BANDS = {
    "butterfly_valve_2_8in": (0.0525, 0.1023, 0.2027),
    "butterfly_valve_10_14in": (0.2545, 0.3032, 0.3334),
    "butterfly_valve_16_24in": (0.3874, 0.4778, 0.5747),
}

# Bends: fluids.fittings.bend_rounded_Crane_ratios / _fds hold Crane's table of n against r/d.
BEND_RATIOS = {
    "bend_90_r_d_1": 1.0, "elbow_90_long_radius": 1.5, "bend_90_r_d_2": 2.0,
    "bend_90_r_d_3": 3.0, "bend_90_r_d_4": 4.0, "bend_90_r_d_6": 6.0,
}
MITRE_ANGLES = {"mitre_bend_90": 90.0, "mitre_bend_45": 45.0}

# Constant K entries against fluids.fittings (Crane methods).
CONSTANT_REFERENCES = {
    "entrance_sharp": lambda d: ff.entrance_sharp(method="Crane"),
    "entrance_inward_projecting": lambda d: ff.entrance_distance(d, method="Crane"),
    "entrance_rounded_r_d_0_04": lambda d: ff.entrance_rounded(d, 0.04 * d, method="Crane"),
    "entrance_rounded_r_d_0_10": lambda d: ff.entrance_rounded(d, 0.10 * d, method="Crane"),
    "entrance_bellmouth": lambda d: ff.entrance_rounded(d, 0.15 * d, method="Crane"),
    "exit": lambda d: ff.exit_normal(),
}

# Reducer and expander entries against fluids.fittings (Crane TP-410 contraction and enlargement
# formulas): a function (D_small, D_large, cone angle) -> K referred to the small-bore velocity.
BORE_CHANGE_REFERENCES = {
    "reducer_sudden": lambda small, large, angle: ff.contraction_sharp(large, small, method="Crane"),
    "reducer_conical": lambda small, large, angle: ff.contraction_conical_Crane(large, small, angle=angle),
    "expander_sudden": lambda small, large, angle: ff.diffuser_sharp(small, large),
    "expander_conical": lambda small, large, angle: ff.diffuser_conical(small, large, angle=angle, method="Crane"),
}


# --------------------------------------------------------------------------- catalogue
def test_catalogue_loads_and_every_entry_names_its_source():
    catalogue = fitting_catalogue()
    assert DEFAULT_CATALOGUE_PATH.is_file()
    assert len(catalogue) >= 15
    for fitting_id, entry in catalogue.items():
        assert isinstance(entry, FittingType) and entry.fitting_id == fitting_id
        assert entry.category in CATEGORIES
        assert entry.name and ("Crane" in entry.source or entry.method == "user_k")
        assert (entry.method == "constant") == (entry.k is not None)
        assert (entry.method == "crane") == (entry.n is not None)
        assert entry.angle_deg is None or entry.method in ("reducer", "expander")


def test_entries_claimed_checked_are_the_ones_checked_here():
    catalogue = fitting_catalogue()
    checked_here = set(CRANE_REFERENCES) | set(BUTTERFLY_BANDS) | set(BEND_RATIOS) | set(MITRE_ANGLES)
    checked_here |= set(CONSTANT_REFERENCES) | set(BORE_CHANGE_REFERENCES)
    claimed = {fid for fid, entry in catalogue.items() if "fluids" in entry.checked}
    assert claimed == checked_here
    for fid, entry in catalogue.items():
        if fid not in checked_here and entry.method != "user_k":
            assert "from memory" in entry.checked


def test_catalogue_holds_the_common_fittings_with_their_crane_multipliers():
    # Crane TP-410 (2009), representative resistance coefficients (from memory; these four
    # have no independent implementation to check against): standard 90° elbow 30 f_T,
    # standard 45° elbow 16 f_T, standard tee through run 20 f_T and through branch 60 f_T.
    catalogue = fitting_catalogue()
    expected = {"elbow_90_standard": 30.0, "elbow_45_standard": 16.0,
                "tee_through_run": 20.0, "tee_through_branch": 60.0}
    for fid, n in expected.items():
        assert catalogue[fid].method == "crane" and catalogue[fid].n == n


def test_catalogue_is_cached_and_read_only():
    assert fitting_catalogue() is fitting_catalogue()
    with pytest.raises(TypeError):
        fitting_catalogue()["exit"] = None  # deliberately the wrong type


# --------------------------------------------------------------------------- f_T
def test_crane_friction_factor_is_the_rough_pipe_law_for_clean_steel():
    assert CRANE_STEEL_ROUGHNESS_M == pytest.approx(0.0457e-3, rel=1e-3)  # Crane TP-410: 0.00015 ft
    d = np.array(DIAMETERS_M)
    # von Kármán rough-pipe law f = 0.25 / log10(ε/(3.7 D))², written out.
    expected = 0.25 / np.log10(CRANE_STEEL_ROUGHNESS_M / (3.7 * d)) ** 2
    np.testing.assert_allclose(crane_friction_factor(d), expected, rtol=1e-14)
    np.testing.assert_allclose(crane_friction_factor(d), fully_turbulent_friction_factor(CRANE_STEEL_ROUGHNESS_M / d))
    assert isinstance(crane_friction_factor(0.1), float)


def test_crane_friction_factor_reproduces_crane_table():
    # Schedule 40 bores of the nominal sizes of Crane's f_T table (ASME B36.10, mm).
    bores_mm = [15.80, 20.93, 26.64, 35.05, 40.89, 52.50, 62.71, 77.93, 102.26, 128.19,
                154.05, 202.72, 254.51, 303.23, 333.4, 381.0, 428.65, 477.83, 574.65]
    matches = 0
    for bore in bores_mm:
        d = bore / 1000.0
        # fluids.friction.ft_Crane: a fit made to reproduce Crane's rounded f_T table (test-only).
        reference = fluids.friction.ft_Crane(d)
        assert crane_friction_factor(d) == pytest.approx(reference, rel=0.015)
        matches += round(crane_friction_factor(d), 3) == round(reference, 3)
    assert matches >= len(bores_mm) - 1


def test_crane_friction_factor_refuses_bad_diameters():
    for bad in (0.0, -0.1, float("nan")):
        with pytest.raises(ModelError) as info:
            crane_friction_factor(bad)
        assert info.value.field_path == "internal_diameter_m"


# --------------------------------------------------------------------------- K values
@pytest.mark.parametrize("fitting_id", sorted(CRANE_REFERENCES))
@pytest.mark.parametrize("diameter", DIAMETERS_M)
def test_crane_valves_match_fluids(fitting_id, diameter):
    entry = fitting_catalogue()[fitting_id]
    f_t = crane_friction_factor(diameter)
    reference = CRANE_REFERENCES[fitting_id]
    assert fitting_k(entry, diameter) == pytest.approx(reference(diameter, f_t), rel=1e-12)
    # With fluids' own f_T (its fit of Crane's table) the K differs only by the f_T fit.
    assert fitting_k(entry, diameter) == pytest.approx(reference(diameter, None), rel=0.015)


@pytest.mark.parametrize("fitting_id", sorted(BUTTERFLY_BANDS))
def test_butterfly_valve_bands_match_fluids(fitting_id):
    entry = fitting_catalogue()[fitting_id]
    for d in BUTTERFLY_BANDS[fitting_id]:
        f_t = crane_friction_factor(d)
        # fluids.fittings.K_butterfly_valve_Crane, centric (style 0): 45/35/25 f_T by size band.
        assert fitting_k(entry, d) == pytest.approx(ff.K_butterfly_valve_Crane(d, fd=f_t, style=0), rel=1e-12)


@pytest.mark.parametrize("fitting_id", sorted(BEND_RATIOS))
def test_bends_match_crane_bend_table(fitting_id):
    entry = fitting_catalogue()[fitting_id]
    ratio = BEND_RATIOS[fitting_id]
    # Crane's table of n against r/d as digitised in fluids.fittings.
    table_n = ff.bend_rounded_Crane_fds[ff.bend_rounded_Crane_ratios.index(ratio)]
    assert entry.n == table_n
    for d in DIAMETERS_M:
        # fluids.fittings.bend_rounded_Crane smooths the table with a polynomial (within 3 %).
        fluids_n = ff.bend_rounded_Crane(d, 90.0, bend_diameters=ratio) / fluids.friction.ft_Crane(d)
        assert fitting_k(entry, d) / crane_friction_factor(d) == pytest.approx(fluids_n, rel=0.03)


@pytest.mark.parametrize("fitting_id", sorted(MITRE_ANGLES))
def test_mitre_bends_match_fluids(fitting_id):
    entry = fitting_catalogue()[fitting_id]
    for d in DIAMETERS_M:
        # fluids.fittings.bend_miter, Crane method: K = n(α) f_T.
        reference = ff.bend_miter(angle=MITRE_ANGLES[fitting_id], Di=d, method="Crane") / fluids.friction.ft_Crane(d)
        assert fitting_k(entry, d) / crane_friction_factor(d) == pytest.approx(reference, rel=1e-12)


@pytest.mark.parametrize("fitting_id", sorted(CONSTANT_REFERENCES))
def test_constant_entries_match_fluids(fitting_id):
    entry = fitting_catalogue()[fitting_id]
    for d in DIAMETERS_M:
        assert fitting_k(entry, d) == pytest.approx(CONSTANT_REFERENCES[fitting_id](d), rel=1e-12)


@pytest.mark.parametrize("fitting_id", sorted(BORE_CHANGE_REFERENCES))
def test_reducer_and_expander_entries_match_fluids(fitting_id):
    entry = fitting_catalogue()[fitting_id]
    # Sudden entries fix the angle at 180°; conical entries take the row's angle, in both of
    # Crane's regimes (θ ≤ 45° and θ > 45°).
    row_angles = [None] if entry.angle_deg is not None else [10.0, 30.0, 60.0, 120.0]
    for small, large in ((0.1023, 0.1541), (0.1541, 0.3032), (0.0525, 0.2027)):
        segment, other = (small, large) if entry.method == "reducer" else (large, small)
        for row_angle in row_angles:
            angle = transition_angle_deg(entry.angle_deg, row_angle, entry.method)
            k_small = BORE_CHANGE_REFERENCES[fitting_id](small, large, angle)
            # fluids.fittings.change_K_basis: the K referred to the segment's own velocity.
            expected = ff.change_K_basis(k_small, small, segment)
            assert bore_change_k(entry.method, segment, other, angle) == pytest.approx(expected, rel=1e-12)


def test_bore_change_and_user_k_entries_have_no_k_of_their_own():
    catalogue = fitting_catalogue()
    for fid in ("reducer_sudden", "reducer_conical", "expander_sudden", "expander_conical"):
        with pytest.raises(ModelError, match="depends on the bores") as info:
            fitting_k(catalogue[fid], 0.1, "segments[2].fittings[0]")
        assert info.value.field_path == "segments[2].fittings[0].fitting_id"
    with pytest.raises(ModelError, match="needs its K") as info:
        fitting_k(catalogue["user_k"], 0.1)
    assert info.value.field_path == "fitting.k_override"


def test_user_k_fitting_takes_its_override_and_refuses_without_one():
    assert segment_k_total([Fitting("user_k", 2, k_override=0.7), Fitting("exit")], 0.1) == pytest.approx(2.4)
    with pytest.raises(ModelError) as info:
        segment_k_total([Fitting("exit"), Fitting("user_k")], 0.1)
    assert info.value.field_path == "fittings[1].k_override"
    with pytest.raises(ModelError) as info:  # a reducer needs the bore upstream of it (and its angle)
        segment_k_total([Fitting("reducer_conical")], 0.1, field_path="segments[1].fittings")
    assert info.value.field_path == "segments[1].fittings[0].other_diameter"
    assert segment_k_total([Fitting("reducer_conical", k_override=0.2)], 0.1) == 0.2


# --------------------------------------------------------------------------- segment totals
def test_segment_total_sums_count_times_k():
    d = 0.2027
    catalogue = fitting_catalogue()
    rows = [Fitting("entrance_bellmouth"), Fitting("elbow_90_long_radius", 3), Fitting("gate_valve_open", 2),
            Fitting("swing_check_valve"), Fitting("exit")]
    expected = 0.04 + 1.0 + crane_friction_factor(d) * (3 * 14.0 + 2 * 8.0 + 100.0)
    assert segment_k_total(rows, d) == pytest.approx(expected, rel=1e-14)
    assert segment_k_total(rows, d) == pytest.approx(
        sum(r.count * fitting_k(catalogue[r.fitting_id], d) for r in rows), rel=1e-14
    )
    assert segment_k_total([], d) == 0.0


def test_override_replaces_catalogue_k_of_each_fitting():
    assert segment_k_total([Fitting("globe_valve", 2, k_override=5.0)], 0.1) == 10.0
    assert segment_k_total([Fitting("globe_valve", 1, k_override=0.0)], 0.1) == 0.0
    assert segment_k_total([Fitting("globe_valve", 1, k_override=1000.0)], 0.1) == 1000.0


def test_count_zero_contributes_nothing():
    assert segment_k_total([Fitting("globe_valve", 0), Fitting("exit", 1)], 0.1) == 1.0


def test_unknown_fitting_id_is_refused_by_name():
    with pytest.raises(ModelError) as info:
        segment_k_total([Fitting("exit"), Fitting("flux_capacitor")], 0.1)
    assert info.value.field_path == "fittings[1].fitting_id"
    assert "flux_capacitor" in str(info.value)
    with pytest.raises(ModelError) as info:
        segment_k_total([Fitting("flux_capacitor", k_override=1.0)], 0.1, field_path="segments[3].fittings")
    assert info.value.field_path == "segments[3].fittings[0].fitting_id"


@pytest.mark.parametrize("count", [-1, 1.5, 2.0, True, "2"])
def test_bad_count_is_refused(count):
    with pytest.raises(ModelError) as info:
        segment_k_total([Fitting("exit", count)], 0.1)  # deliberately the wrong type
    assert info.value.field_path == "fittings[0].count"


@pytest.mark.parametrize("override", [-0.1, 1000.5, float("nan"), float("inf"), "3"])
def test_bad_override_is_refused(override):
    with pytest.raises(ModelError) as info:
        segment_k_total([Fitting("exit", 1, k_override=override)], 0.1)  # deliberately the wrong type
    assert info.value.field_path == "fittings[0].k_override"


def test_minor_loss_is_k_velocity_head():
    v = np.array([[0.0, 1.0, 2.5, -2.5]])
    k = np.array([[1.5], [0.0]])
    h = minor_loss(k, v)
    assert h.shape == (2, 4)
    # h = K v² / (2 g) with g = 9.80665 m/s² (standard gravity).
    assert h[0, 2] == pytest.approx(1.5 * 2.5**2 / (2.0 * 9.80665), rel=1e-15)
    assert h[0, 0] == 0.0 and h[0, 3] == -h[0, 2] and np.all(h[1] == 0.0)
    assert STANDARD_GRAVITY_M_S2 == 9.80665


# --------------------------------------------------------------------------- catalogue files
def _write(tmp_path, document) -> str:
    path = tmp_path / "fittings.json"
    path.write_text(json.dumps(document), encoding="utf-8")
    return str(path)


def _document(**changes):
    entry = {"id": "exit", "name": "Exit", "category": "entrance/exit", "method": "constant", "k": 1.0,
             "source": "a handbook"}
    entry.update(changes)
    return {"format": "pumpsketch-fittings", "version": 1, "fittings": [entry]}


def test_missing_catalogue_file_gives_a_clear_error(tmp_path):
    with pytest.raises(FileNotFoundError, match="fittings catalogue not found"):
        load_fitting_catalogue(tmp_path / "nowhere.json")


def test_small_catalogue_file_loads(tmp_path):
    catalogue = load_fitting_catalogue(_write(tmp_path, _document()))
    assert list(catalogue) == ["exit"] and catalogue["exit"].k == 1.0
    assert segment_k_total([Fitting("exit", 2)], 0.1, catalogue=catalogue) == 2.0


@pytest.mark.parametrize(
    "document, field",
    [
        ({**_document(), "format": "something-else"}, "fittings.json: format"),
        ({**_document(), "version": 2}, "fittings.json: version"),
        ({**_document(), "fittings": []}, "fittings.json: fittings"),
        (_document(method="guess"), "fittings.json: fittings[0].method"),
        (_document(k=-1.0), "fittings.json: fittings[0].k"),
        (_document(method="crane", k=None), "fittings.json: fittings[0].n"),
        (_document(category="pump"), "fittings.json: fittings[0].category"),
        (_document(source=""), "fittings.json: fittings[0].source"),
        (_document(method="reducer", angle_deg=0.0), "fittings.json: fittings[0].angle_deg"),
        (_document(method="expander", angle_deg=190.0), "fittings.json: fittings[0].angle_deg"),
        (_document(method="expander", angle_deg="wide"), "fittings.json: fittings[0].angle_deg"),
    ],
)
def test_malformed_catalogue_is_refused_naming_the_field(tmp_path, document, field):
    with pytest.raises(ModelError) as info:
        load_fitting_catalogue(_write(tmp_path, document))
    assert info.value.field_path == field


def test_bore_change_and_user_k_entries_load(tmp_path):
    document = _document(method="reducer", angle_deg=180.0)
    document["fittings"] += [{**document["fittings"][0], "id": "cone", "angle_deg": None},
                             {**document["fittings"][0], "id": "mine", "method": "user_k"}]
    catalogue = load_fitting_catalogue(_write(tmp_path, document))
    assert catalogue["exit"].method == "reducer" and catalogue["exit"].angle_deg == 180.0
    assert catalogue["cone"].angle_deg is None and catalogue["cone"].k is None and catalogue["cone"].n is None
    assert catalogue["mine"].method == "user_k"


def test_duplicate_ids_are_refused(tmp_path):
    document = _document()
    document["fittings"] = document["fittings"] * 2
    with pytest.raises(ModelError) as info:
        load_fitting_catalogue(_write(tmp_path, document))
    assert info.value.field_path == "fittings.json: fittings[1].id"


def test_shipped_file_is_the_documented_format():
    document = json.loads(DEFAULT_CATALOGUE_PATH.read_text(encoding="utf-8"))
    assert document["format"] == "pumpsketch-fittings" and document["version"] == 1
    assert document["categories"] == list(CATEGORIES)
    numbered = [e for e in document["fittings"] if e["method"] in ("constant", "crane")]
    assert all(math.isfinite(e.get("k") or e.get("n")) for e in numbered)
    assert {e["method"] for e in document["fittings"]} == {"constant", "crane", "reducer", "expander", "user_k"}
