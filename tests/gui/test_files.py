"""Files: save and open, the unsaved-changes marker and prompt, samples, recent files, startup."""

from __future__ import annotations

from dataclasses import replace

import pytest
from PySide6.QtCore import Qt

from app import settings
from app.gui import open_window
from app.panels.file_controller import sample_projects, with_suffix
from hydraulics.project_io import load_project
from tests.bad_pump_files import BAD_FIELD, BAD_PROBLEM, write_bad_pump_project

try:
    from conftest import SAMPLE_PATHS
except ImportError:  # collected as a package
    from .conftest import SAMPLE_PATHS

EDIT = Qt.ItemDataRole.EditRole


def _edit_length(window, text: str = "2500") -> None:
    """Type a new length for the last segment."""
    model = window.pipework.segments_model
    assert model.setData(model.index(model.rowCount() - 1, model.column_index("length")), text, EDIT)


def test_save_then_open_reproduces_the_project(window, dialogs, tmp_path, make_window):
    _edit_length(window)
    window.site_panel.set_text("altitude", "250")
    edited = window.document.project
    dialogs.save_path = tmp_path / "copy"  # the suffix is added
    assert window.save_project_as()
    saved = tmp_path / "copy.pumpsketch.json"
    assert saved.is_file()
    assert window.document.file_path == saved.resolve()
    assert load_project(saved) == edited
    other = make_window(None)
    dialogs.open_path = saved
    assert other.open_project()
    assert other.document.project == edited
    assert other.windowTitle() == "copy[*] — PumpSketch"


def test_the_unsaved_marker_follows_the_undo_stack(window, dialogs, tmp_path):
    assert "[*]" in window.windowTitle()
    assert not window.isWindowModified()
    _edit_length(window)
    assert window.isWindowModified()
    window.document.undo_stack.undo()
    assert not window.isWindowModified()  # back at the saved state
    _edit_length(window)
    dialogs.save_path = tmp_path / "marker.pumpsketch.json"
    assert window.save_project_as()
    assert not window.isWindowModified()
    assert window.save_project()  # saves to the same file without asking
    assert settings.recent_files()[0] == str((tmp_path / "marker.pumpsketch.json").resolve())


@pytest.mark.parametrize("command", ["new_project", "open_project", "close"])
def test_cancel_at_the_unsaved_prompt_keeps_the_work(window, dialogs, command, hilltop):
    _edit_length(window)
    edited = window.document.project
    dialogs.save_answer = "cancel"
    dialogs.open_path = hilltop
    result = getattr(window, command)()
    assert not result
    assert dialogs.save_questions == 1
    assert window.document.project is edited
    assert window.isWindowModified()
    dialogs.save_answer = "discard"


def test_discard_at_the_prompt_opens_a_new_project(window, dialogs):
    _edit_length(window)
    dialogs.save_answer = "discard"
    assert window.new_project()
    assert dialogs.save_questions == 1
    assert window.document.file_path is None
    assert window.document.project.name == "New project"
    assert not window.isWindowModified()


def test_save_at_the_prompt_saves_before_going_on(window, dialogs, hilltop):
    _edit_length(window, "2600")
    dialogs.save_answer = "save"
    assert window.new_project()
    assert load_project(hilltop).segments[-1].length_m == 2600.0  # saved to its own file
    assert window.document.project.name == "New project"


def test_save_at_the_prompt_of_an_unsaved_project_asks_where(make_window, dialogs, tmp_path):
    window = make_window(None)
    _edit_length(window, "600")
    dialogs.save_answer = "save"
    dialogs.save_path = tmp_path / "kept"
    assert window.new_project()
    assert load_project(tmp_path / "kept.pumpsketch.json").segments[-1].length_m == 600.0


def test_no_prompt_without_changes(window, dialogs):
    assert window.new_project()
    assert dialogs.save_questions == 0


def test_a_file_that_cannot_be_read_is_reported_and_nothing_changes(window, dialogs, tmp_path):
    bad = tmp_path / "broken.pumpsketch.json"
    bad.write_text('{"format": "pumpsketch-project", "version": 1, "segments": [', encoding="utf-8")
    before = window.document.project
    assert not window.open_path(bad)
    assert window.document.project is before
    title, text = dialogs.errors[-1]
    assert title == "Cannot open the project" and "not valid JSON" in text


def test_a_file_with_an_impossible_pump_is_refused_and_later_edits_still_apply(window, dialogs, tmp_path):
    path = write_bad_pump_project(tmp_path)
    before = window.document.project
    assert not window.open_path(path)
    assert window.document.project is before
    title, text = dialogs.errors[-1]
    assert title == "Cannot open the project" and text == f"{path}: {BAD_FIELD}: {BAD_PROBLEM}"
    window.site_panel.set_text("name", "Renamed after the refusal")
    assert window.document.project.name == "Renamed after the refusal"


def test_an_edit_making_the_pump_impossible_is_refused_in_the_same_words(window):
    refusals: list[str] = []
    window.document.editRefused.connect(refusals.append)
    project = window.document.project
    pump = project.pumps[0]
    heads = pump.head_m[:2] + (-5.0,) + pump.head_m[3:]
    candidate = replace(project, pumps=(replace(pump, head_m=heads),) + project.pumps[1:])
    assert not window.document.apply(candidate, "Impossible head")
    assert window.document.project is project
    assert refusals == [f"Not applied — {BAD_PROBLEM} ({BAD_FIELD})"]
    window.site_panel.set_text("name", "Renamed after the refusal")
    assert window.document.project.name == "Renamed after the refusal"


def test_a_sample_opens_as_an_unsaved_copy(window, dialogs, tmp_path):
    titles = [title for title, _path in sample_projects()]
    assert len(titles) == len(SAMPLE_PATHS) >= 3
    menu_titles = [a.text() for a in window.samples_menu.actions()]
    assert menu_titles == titles
    window.samples_menu.actions()[0].trigger()
    assert window.document.file_path is None
    assert window.document.project == load_project(SAMPLE_PATHS[0])
    dialogs.save_path = tmp_path / "mine"
    assert window.save_project()  # no file yet: asks where
    assert (tmp_path / "mine.pumpsketch.json").is_file()


@pytest.mark.parametrize("name", [p.name for p in SAMPLE_PATHS])
def test_every_sample_project_opens_and_computes(make_window, sample_copies, name):
    window = make_window(sample_copies / name)
    document = window.document
    assert document.solve_error is None
    assert document.solution is not None and document.solution.project is document.project
    assert window.pipework.segments_model.rowCount() == len(document.project.segments)
    flows, heads = window.plot_tabs.head_flow.curve_data("max", "aged")
    assert len(flows) > 10 and heads[-1] > heads[0]
    pump = document.project.duty_pump
    if pump is not None:
        assert window.pumps_panel.points_model.rowCount() == len(pump.flow_m3_s)


def test_recent_files_are_remembered_and_offered(window, dialogs, tmp_path, make_window):
    dialogs.save_path = tmp_path / "first.pumpsketch.json"
    assert window.save_project_as()
    dialogs.save_path = tmp_path / "second.pumpsketch.json"
    assert window.save_project_as()
    recent = settings.recent_files()
    assert recent[:2] == [str((tmp_path / n).resolve()) for n in ("second.pumpsketch.json", "first.pumpsketch.json")]
    other = make_window(None)
    other.recent_menu.aboutToShow.emit()
    names = [a.text() for a in other.recent_menu.actions() if a.text()]
    assert names[:2] == ["second.pumpsketch.json", "first.pumpsketch.json"]
    other.recent_menu.actions()[1].trigger()
    assert other.document.file_path == (tmp_path / "first.pumpsketch.json").resolve()


def test_startup_opens_the_last_project_or_a_new_one(qtbot, window, hilltop, sample_copies):
    fresh = open_window(None)
    qtbot.addWidget(fresh)
    assert fresh.document.file_path == hilltop.resolve()  # the window fixture opened it last
    settings.clear_recent_files()
    empty = open_window(None)
    qtbot.addWidget(empty)
    assert empty.document.file_path is None and empty.document.project.name == "New project"
    given_path = sample_copies / SAMPLE_PATHS[-1].name
    given = open_window(str(given_path))
    qtbot.addWidget(given)
    assert given.document.file_path == given_path.resolve()


def test_a_sample_opened_from_the_command_line_is_an_unsaved_copy(qtbot, dialogs, monkeypatch, tmp_path):
    from app.samples import sample_path

    path = sample_path("river_intake")
    assert path is not None and sample_path("no_such_sample") is None and sample_path("") is None
    before = path.read_bytes()
    window = open_window(str(path), as_copy=True)
    qtbot.addWidget(window)
    dialogs.install(monkeypatch, window)
    assert window.document.file_path is None and not window.document.is_modified
    assert window.document.project.name == load_project(path).name
    dialogs.save_path = tmp_path / "mine.pumpsketch.json"
    assert window.files.save()  # Save asks where: the sample itself is never written
    assert window.document.file_path == dialogs.save_path.resolve()
    assert path.read_bytes() == before


def test_the_suffix_rule():
    assert with_suffix("a/b").name == "b.pumpsketch.json"
    assert with_suffix("b.json").name == "b.pumpsketch.json"
    assert with_suffix("b.pumpsketch.json").name == "b.pumpsketch.json"
