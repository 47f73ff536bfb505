"""Checks that know how a station is built: branch-to-manifold tees and pump flange pieces."""

from dataclasses import replace
from pathlib import Path

import pytest

from hydraulics.checks import pump_flange_pieces
from hydraulics.project_io import load_project
from hydraulics.solve import solve

SAMPLES = Path(__file__).resolve().parent.parent / "sample_projects"


def _codes(project, code):
    return [f for f in solve(project).findings if f.code == code]


def test_a_branch_meeting_the_manifold_through_its_tee_is_no_unfitted_bore_change():
    # The booster sample: the 154 mm discharge branch joins the 207 mm manifold at a tee
    # (segment bores read from sample_projects/hilltop_booster.pumpsketch.json).
    project = load_project(SAMPLES / "hilltop_booster.pumpsketch.json")
    assert _codes(project, "bore_change_without_transition") == []
    # The same change inside the common pipework, manifold into a smaller main, is flagged.
    main = max(range(len(project.segments)), key=lambda i: project.segments[i].length_m)
    narrowed = replace(project.segments[main], internal_diameter_m=0.15, pipe_series=None, nominal_size=None,
                       fittings=tuple(f for f in project.segments[main].fittings
                                      if not f.fitting_id.startswith(("reducer", "expander"))))
    flagged = _codes(replace(project, segments=project.segments[:main] + (narrowed,)
                             + project.segments[main + 1:]), "bore_change_without_transition")
    assert [f.target for f in flagged] == [("segment", main)]


def test_a_pump_flange_piece_is_not_held_to_the_pipe_velocity_limits():
    project = load_project(SAMPLES / "hilltop_booster.pumpsketch.json")
    (piece,) = [i for i in pump_flange_pieces(project) if project.segments[i].side == "suction"]
    flagged = [f.target for f in _codes(project, "velocity_high")]
    assert ("segment", piece) not in flagged
    # Made a 2 m pipe run at the same bore, it is pipework again and its velocity (above the
    # 1.5 m/s suction limit, common practice) is flagged.
    long_run = replace(project.segments[piece], length_m=2.0)
    longer = replace(project, segments=project.segments[:piece] + (long_run,) + project.segments[piece + 1:])
    assert piece not in pump_flange_pieces(longer)
    assert ("segment", piece) in [f.target for f in _codes(longer, "velocity_high")]


def test_a_reducer_contradicting_its_bores_is_refused_by_the_one_rules_home():
    from hydraulics.model import Fitting, ModelError
    from hydraulics.project_io import ProjectFileError, project_from_dict, project_to_dict
    from hydraulics.validation import validate_project

    project = load_project(SAMPLES / "hilltop_booster.pumpsketch.json")
    branch = next(i for i, s in enumerate(project.segments) if s.side == "delivery" and s.carries == "pump")
    # An "expander" into this branch from a bore larger than the branch's own is a contraction.
    wrong = replace(project.segments[branch], fittings=(
        Fitting("expander_sudden", other_diameter_m=project.segments[branch].internal_diameter_m * 1.5),))
    bad = replace(project, segments=project.segments[:branch] + (wrong,) + project.segments[branch + 1:])
    with pytest.raises(ModelError) as caught:
        validate_project(bad)
    assert caught.value.field_path.startswith(f"segments[{branch}].fittings[0]")
    with pytest.raises(ProjectFileError) as from_file:
        project_from_dict(project_to_dict(bad))
    assert from_file.value.field_path == caught.value.field_path


def test_the_lowest_lifting_speed_message_names_the_head_a_vented_summit_sets():
    # The sewage sample: 44.5 m ridge with an air valve over a 38 m delivery (sample file); at zero
    # flow the summit governs, H_lift = 44.5 − 21.0 = 23.5 m.  The sample pump's fitted shut-off head
    # is 41.19 m (its data give 41.2 m at zero flow), so the pumps need s = √(23.5 / 41.19) = 75.5 %
    # (affinity laws, H ∝ s², as worked out in tests/test_crest_control.py).  The sample's drive
    # minimum of 85 % lifts; a 70 % minimum cannot.
    project = load_project(SAMPLES / "sewage_wet_well.pumpsketch.json")
    assert project.arrangement.min_speed_ratio == 0.85
    assert "minimum_speed_cannot_lift" not in {f.code for f in solve(project).findings}
    slow = replace(project, arrangement=replace(project.arrangement, min_speed_ratio=0.7))
    solution = solve(slow)
    assert solution.pump_fits[0].shutoff_head_m == pytest.approx(41.19, abs=0.01)
    (found,) = [f for f in solution.findings if f.code == "minimum_speed_cannot_lift"]
    assert "vented summit" in found.message and "75.5 %" in found.message
