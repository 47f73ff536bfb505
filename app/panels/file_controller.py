"""File commands of the window: new, open, open sample, recent files, save, save as.

The questions the user is asked (save changes? which file?) are methods of the main
window (``ask_save_changes``, ``ask_open_path``, ``ask_save_path``, ``show_error``) so
tests can replace them.  A sample opens as an unsaved copy: saving asks where, and the
sample itself is never overwritten.
"""

from __future__ import annotations

import logging
from pathlib import Path
from typing import Protocol

from PySide6.QtCore import QObject
from PySide6.QtWidgets import QMenu, QWidget

from app import settings
from app.document import ProjectDocument
from app.samples import sample_projects
from hydraulics.model import ModelError
from hydraulics.project_io import FILE_SUFFIX, ProjectFileError, load_project

log = logging.getLogger(__name__)


def with_suffix(path: str | Path) -> Path:
    """``path`` ending in ``.pumpsketch.json`` (added when missing)."""
    path = Path(path)
    if path.name.endswith(FILE_SUFFIX):
        return path
    if path.suffix == ".json":
        path = path.with_suffix("")
    return path.with_name(path.name + FILE_SUFFIX)


def unreadable_message(path: str | Path, exc: Exception) -> str:
    """What the window says about a file the reader failed on with something other than a ProjectFileError."""
    return f"{path}: cannot read the project ({exc or type(exc).__name__})"


class FileWindow(Protocol):
    """What the file commands need of the window: its document, its questions and its notes."""

    @property
    def document(self) -> ProjectDocument: ...

    def ask_save_changes(self) -> str: ...

    def ask_open_path(self) -> str: ...

    def ask_save_path(self) -> str: ...

    def show_error(self, title: str, text: str) -> None: ...

    def show_status(self, message: str) -> None: ...


class FileController(QObject):
    """Carries out the File menu for a main window (see the module docstring)."""

    def __init__(self, window: FileWindow) -> None:
        self._menu_parent = window if isinstance(window, QWidget) else None
        super().__init__(self._menu_parent)
        self._window = window
        self._document = window.document

    # ------------------------------------------------------------------ menus
    def samples_menu(self) -> QMenu:
        """File ▸ Open sample: one entry per sample project."""
        menu = QMenu("Open &sample", self._menu_parent)
        for title, path in sample_projects():
            menu.addAction(title, lambda p=path: self.open_sample(p)).setToolTip(str(path))
        menu.setEnabled(not menu.isEmpty())
        return menu

    def recent_menu(self) -> QMenu:
        """File ▸ Open recent, filled from the settings each time it opens."""
        menu = QMenu("Open &recent", self._menu_parent)
        menu.aboutToShow.connect(lambda: self._fill_recent(menu))
        return menu

    def _fill_recent(self, menu: QMenu) -> None:
        menu.clear()
        recent = settings.recent_files()
        for path in recent:
            menu.addAction(Path(path).name, lambda p=path: self.open_path(p)).setToolTip(path)
        if not recent:
            menu.addAction("(none yet)").setEnabled(False)
        else:
            menu.addSeparator()
            menu.addAction("Clear list", settings.clear_recent_files)

    # ------------------------------------------------------------------ guarding unsaved work
    def maybe_save(self) -> bool:
        """True when it is safe to drop the current project (saved, discarded or unchanged)."""
        if not self._document.is_modified:
            return True
        answer = self._window.ask_save_changes()
        if answer == "save":
            return self.save()
        return answer == "discard"

    # ------------------------------------------------------------------ commands
    def new(self) -> bool:
        if not self.maybe_save():
            return False
        self._document.new()
        self._window.show_status("New project: edit the inputs on the left.")
        return True

    def open(self) -> bool:
        if not self.maybe_save():
            return False
        path = self._window.ask_open_path()
        return self.open_path(path, ask=False) if path else False

    def open_path(self, path: str | Path, ask: bool = True) -> bool:
        """Open the project file ``path`` (after the unsaved-changes question when ``ask``)."""
        if ask and not self.maybe_save():
            return False
        try:
            self._document.open(path)
        except ProjectFileError as exc:
            self._refuse_open(path, str(exc))
            return False
        except Exception as exc:  # a reader fault (nesting too deep, a number too long): refused, never fatal
            log.exception("reading %s failed", path)
            self._refuse_open(path, unreadable_message(path, exc))
            return False
        settings.add_recent_file(path)
        self._window.show_status(f"Opened {Path(path).name}")
        return True

    def _refuse_open(self, path: str | Path, message: str) -> None:
        self._window.show_error("Cannot open the project", message)
        self._window.show_status(f"Not opened: {Path(path).name} (the project shown is unchanged)")

    def open_sample(self, path: str | Path) -> bool:
        """Open a sample project as an unsaved copy."""
        if not self.maybe_save():
            return False
        try:
            project = load_project(path)
        except ProjectFileError as exc:
            self._window.show_error("Cannot open the sample", str(exc))
            return False
        except Exception as exc:  # as in open_path
            log.exception("reading %s failed", path)
            self._window.show_error("Cannot open the sample", unreadable_message(path, exc))
            return False
        self._document.replace_project(project, None)
        self._window.show_status(f"Sample '{project.name}' opened as a copy: Save As to keep your changes.")
        return True

    def save(self) -> bool:
        if self._document.file_path is None:
            return self.save_as()
        return self._save_to(self._document.file_path)

    def save_as(self) -> bool:
        path = self._window.ask_save_path()
        if not path:
            return False
        return self._save_to(with_suffix(path))

    def _save_to(self, path: Path) -> bool:
        try:
            saved = self._document.save(path)
        except (OSError, ModelError, ValueError) as exc:
            self._window.show_error("Cannot save the project", f"{path}: {exc}")
            return False
        settings.add_recent_file(saved)
        self._window.show_status(f"Saved {saved.name}")
        return True
