"""Fixtures of the window tests: isolated settings, a clean clipboard, answered dialogs.

* Every test gets its own QSettings INI folder, so the unit system and the recent
  files of one test never leak into another (or into the user's own settings).
* Every test gets its own data folder (recovery files, error log), subprocesses included.
* The clipboard is cleared after each test (a clipboard holding data at exit has
  crashed offscreen Qt).
* ``window`` is a main window on a sample project whose questions (save changes? which
  file?) are answered by a :class:`Dialogs` recorder instead of modal boxes.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest
from PySide6.QtCore import QSettings
from PySide6.QtWidgets import QApplication

from app.data_folder import DATA_DIR_VARIABLE
from app.document import ProjectDocument
from app.main_window import MainWindow

SAMPLE_DIR = Path(__file__).resolve().parents[2] / "sample_projects"
SAMPLE_PATHS = sorted(SAMPLE_DIR.glob("*.pumpsketch.json"))
HILLTOP_NAME = "hilltop_booster.pumpsketch.json"
"""The sample most tests use: three segments with pipe series, one pump with efficiency and NPSH data."""


@pytest.fixture
def sample_copies(tmp_path) -> Path:
    """A copy of the sample folder (projects and their pump files) that tests may overwrite.

    Tests open and save these copies, never the samples themselves.
    """
    target = tmp_path / "samples"
    shutil.copytree(SAMPLE_DIR, target)
    return target


@pytest.fixture
def hilltop(sample_copies) -> Path:
    """The copied hilltop booster sample."""
    return sample_copies / HILLTOP_NAME


@pytest.fixture(autouse=True, scope="session")
def samples_stay_untouched():
    """Fail the run if any window test wrote into the real sample folder."""
    before = {p: p.read_bytes() for p in SAMPLE_DIR.rglob("*") if p.is_file()}
    yield
    after = {p: p.read_bytes() for p in SAMPLE_DIR.rglob("*") if p.is_file()}
    assert after == before, "a test changed the sample projects; tests must work on copies"


@pytest.fixture(autouse=True)
def isolated_settings(tmp_path):
    """Point the application's INI settings at a folder of this test."""
    folder = tmp_path / "settings"
    folder.mkdir()
    QSettings.setPath(QSettings.Format.IniFormat, QSettings.Scope.UserScope, str(folder))
    yield folder


@pytest.fixture(autouse=True)
def isolated_data_folder(tmp_path, monkeypatch):
    """Point the user's data folder (recovery files, error log) at a folder of this test.

    Set in the environment, so windows started in subprocesses by a test use it too.
    """
    folder = tmp_path / "data"
    monkeypatch.setenv(DATA_DIR_VARIABLE, str(folder))
    yield folder


@pytest.fixture(autouse=True)
def clean_clipboard(qapp):
    """Clear the clipboard when the test ends."""
    yield
    QApplication.clipboard().clear()


class Dialogs:
    """Answers the window's questions and records what it asked and reported."""

    def __init__(self):
        self.save_answer = "discard"
        self.open_path = ""
        self.save_path = ""
        self.save_questions = 0
        self.errors: list[tuple[str, str]] = []
        self.information: list[tuple[str, str]] = []

    def install(self, monkeypatch, window: MainWindow) -> None:
        monkeypatch.setattr(window, "ask_save_changes", self._ask_save_changes)
        monkeypatch.setattr(window, "ask_open_path", lambda: str(self.open_path))
        monkeypatch.setattr(window, "ask_save_path", lambda: str(self.save_path))
        monkeypatch.setattr(window, "show_error", lambda title, text: self.errors.append((title, text)))
        monkeypatch.setattr(window, "show_information",
                            lambda title, text: self.information.append((title, text)))

    def _ask_save_changes(self) -> str:
        self.save_questions += 1
        return self.save_answer


@pytest.fixture
def dialogs() -> Dialogs:
    return Dialogs()


@pytest.fixture
def make_window(qtbot, monkeypatch, dialogs, hilltop):
    """Build main windows with answered dialogs: ``make_window(path=hilltop copy, units="SI")``.

    Pass ``None`` for a window on a new project.
    """

    def build(path: Path | None | str = "hilltop", units: str = "SI") -> MainWindow:
        if path == "hilltop":
            path = hilltop
        window = MainWindow(ProjectDocument(unit_system=units), remember_layout=False)
        qtbot.addWidget(window)
        dialogs.install(monkeypatch, window)
        if path is not None:
            assert window.files.open_path(path, ask=False), dialogs.errors
        window.document.recompute_now()
        return window

    return build


@pytest.fixture
def window(make_window) -> MainWindow:
    """A main window on a copy of the hilltop booster sample, solved."""
    return make_window()


@pytest.fixture
def document(window) -> ProjectDocument:
    return window.document

