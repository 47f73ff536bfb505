"""Autosave of unsaved edits and the restore offer after an abnormal exit (in this process).

An abnormal exit is simulated by releasing a session's lock without the clean close: what a
killed window leaves (its lock no longer held, its recovery file in place).  The real kill of
a window process is in ``test_crash_recovery.py``.
"""

from __future__ import annotations

import json

import pytest
from PySide6.QtCore import Qt

from app.gui import open_window
from app.main_window import MainWindow
from app.recovery import (
    LOCK_NAME,
    RECOVERY_SUFFIX,
    RecoverySession,
    orphaned_recoveries,
    read_recovery_file,
    recovery_key,
    recovery_root,
)
from hydraulics.project_io import load_project

EDIT = Qt.ItemDataRole.EditRole


def _edit_length(window, text: str = "2500") -> None:
    model = window.pipework.segments_model
    assert model.setData(model.index(model.rowCount() - 1, model.column_index("length")), text, EDIT)


def _recovery_files() -> list:
    return sorted(recovery_root().glob("*/*" + RECOVERY_SUFFIX))


def _abandon(window: MainWindow) -> None:
    """Leave the window's recovery file as a killed process would: the lock released, nothing removed."""
    lock = window.autosaver.session._lock
    assert lock is not None
    lock.unlock()
    window.autosaver.session._lock = None
    window.autosaver._closed = True  # this window no longer keeps anything


@pytest.fixture
def restart(qtbot, monkeypatch, dialogs):
    """Start a window as ``pumpsketch [FILE]`` does, its other questions answered by ``dialogs``."""

    def start(path=None) -> MainWindow:
        started = open_window(path)
        qtbot.addWidget(started)
        dialogs.install(monkeypatch, started)
        return started

    return start


@pytest.fixture
def answers(monkeypatch):
    """Answers the restore question of every window (class-wide: open_window asks while it builds the window)."""
    given: list = []
    reply = {"restore": True}

    def ask(_window, edits) -> bool:
        given.append(edits)
        return reply["restore"]

    monkeypatch.setattr(MainWindow, "ask_restore", ask)
    return given, reply


def test_an_edit_is_kept_in_a_recovery_file_when_the_user_pauses(window, qtbot, hilltop):
    window.autosaver.set_intervals(50)
    assert _recovery_files() == []
    _edit_length(window)
    qtbot.waitUntil(lambda: len(_recovery_files()) == 1, timeout=10_000)
    (path,) = _recovery_files()
    assert path.name == recovery_key(hilltop) + RECOVERY_SUFFIX
    edits = read_recovery_file(path)
    assert edits.project == window.document.project
    assert edits.project_path == hilltop.resolve()


def test_long_runs_of_edits_are_kept_at_the_longest_interval(window, qtbot):
    window.autosaver.set_intervals(idle_ms=60_000, interval_ms=50)
    _edit_length(window, "2500")
    qtbot.waitUntil(lambda: len(_recovery_files()) == 1, timeout=10_000)


def test_saving_removes_the_recovery_file_and_so_does_undoing_back_to_the_saved_state(window):
    _edit_length(window)
    assert window.autosaver.save_now() is not None
    assert len(_recovery_files()) == 1
    assert window.save_project()
    assert _recovery_files() == []
    _edit_length(window, "3000")
    window.autosaver.save_now()
    assert len(_recovery_files()) == 1
    window.document.undo_stack.undo()
    assert not window.document.is_modified
    assert _recovery_files() == []
    assert window.autosaver.save_now() is None  # nothing unsaved: nothing written


def test_an_unedited_window_leaves_nothing_and_a_clean_close_removes_its_folder(make_window):
    quiet = make_window()
    assert not recovery_root().exists() or list(recovery_root().iterdir()) == []
    edited = make_window()
    _edit_length(edited)
    edited.autosaver.save_now()
    folder = edited.autosaver.session.folder
    assert folder is not None and (folder / LOCK_NAME).is_file()
    edited.document.undo_stack.setClean()
    assert edited.close() and quiet.close()
    assert not folder.exists()


def test_a_running_window_s_edits_are_not_offered_to_another(window):
    _edit_length(window)
    window.autosaver.save_now()
    assert orphaned_recoveries() == []


def test_after_an_abnormal_exit_the_restore_brings_the_edits_back_unsaved(restart, window, answers, hilltop, dialogs):
    _edit_length(window)
    window.site_panel.set_text("name", "Edited before the crash")
    edited = window.document.project
    window.autosaver.save_now()
    _abandon(window)
    given, _reply = answers
    restarted = restart()
    assert len(given) == 1 and given[0].project_path == hilltop.resolve()
    assert "Unsaved edits of" in given[0].description()
    assert restarted.document.project == edited
    assert restarted.document.file_path == hilltop.resolve()
    assert restarted.document.is_modified and restarted.isWindowModified()
    # The edits moved into the new window's own recovery file; the old one is gone.
    (kept,) = _recovery_files()
    assert kept.parent == restarted.autosaver.session.folder
    assert read_recovery_file(kept).project == edited
    assert restarted.save_project()  # Save writes them to the file they were made to
    assert load_project(hilltop) == edited
    assert _recovery_files() == []
    restarted.close()


def test_declining_the_restore_deletes_the_edits_and_opens_as_usual(restart, window, answers, hilltop):
    _edit_length(window)
    window.autosaver.save_now()
    _abandon(window)
    given, reply = answers
    reply["restore"] = False
    restarted = restart()
    assert len(given) == 1
    assert restarted.document.project == load_project(hilltop)  # the last project, as saved
    assert not restarted.document.is_modified
    assert _recovery_files() == []
    assert list(recovery_root().iterdir()) == []  # the abandoned folder went with it
    restarted.close()
    restart()
    assert len(given) == 1  # asked once only


def test_an_untitled_project_is_restored_as_untitled(restart, make_window, answers, dialogs, tmp_path):
    window = make_window(None)
    window.site_panel.set_text("name", "Never saved")
    edited = window.document.project
    assert window.autosaver.save_now().name == "untitled" + RECOVERY_SUFFIX
    _abandon(window)
    restarted = restart()
    assert restarted.document.project == edited and restarted.document.file_path is None
    assert restarted.document.is_modified
    dialogs.save_path = tmp_path / "rescued"
    assert restarted.save_project()  # asks where
    assert load_project(tmp_path / "rescued.pumpsketch.json") == edited
    restarted.close()


def test_restored_edits_win_over_a_file_given_at_start_which_is_not_opened(restart, window, answers, sample_copies):
    _edit_length(window)
    edited = window.document.project
    window.autosaver.save_now()
    _abandon(window)
    other = sorted(sample_copies.glob("*.pumpsketch.json"))[-1]
    restarted = restart(str(other))
    assert restarted.document.project == edited
    assert other.name in restarted.statusBar().currentMessage()
    restarted.close()


def test_the_newest_of_several_is_offered_first(restart, make_window, answers):
    for name in ("older", "newer"):
        window = make_window(None)
        window.site_panel.set_text("name", name)
        path = window.autosaver.save_now()
        data = json.loads(path.read_text(encoding="utf-8"))
        data["written"] = "2030-01-01T10:00:00" if name == "older" else "2030-01-01T11:00:00"
        path.write_text(json.dumps(data), encoding="utf-8")
        _abandon(window)
    assert [e.project.name for e in orphaned_recoveries()] == ["newer", "older"]
    given, _reply = answers
    restarted = restart()
    assert restarted.document.project.name == "newer"
    assert [e.project.name for e in orphaned_recoveries()] == ["older"]  # offered at a later start
    restarted.document.undo_stack.setClean()
    restarted.close()


def test_an_unreadable_recovery_file_is_skipped_without_a_crash(restart, tmp_path, answers):
    session = RecoverySession()
    from hydraulics.project_io import new_project

    path = session.write(new_project(), None)
    path.write_text('{"format": "pumpsketch-recovery", "version": 1, "project": {', encoding="utf-8")
    session._lock.unlock()
    assert orphaned_recoveries() == []
    window = restart()
    given, _reply = answers
    assert given == [] and window.document.project.name == "New project"
    assert path.exists()  # left for a person to look at, never deleted unread
    window.close()


def test_an_abandoned_folder_with_nothing_to_recover_is_removed():
    session = RecoverySession()
    from hydraulics.project_io import new_project

    session.write(new_project(), None)
    session.discard()
    session._lock.unlock()
    folder = session.folder
    assert folder is not None and folder.exists()
    assert orphaned_recoveries() == []
    assert not folder.exists()
