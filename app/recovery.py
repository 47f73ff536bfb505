"""Autosave of unsaved edits and their recovery after an abnormal exit.

Each running window has a :class:`RecoverySession`: a folder of its own under
``recovery/`` in the user's data folder (:func:`app.data_folder.data_folder`), holding a
lock file (:class:`QLockFile`, held while the window runs) and at most one recovery file,
``KEY.recovery.json``, where KEY names the project's file (:func:`recovery_key`; "untitled"
for a project never saved).  A recovery file is the whole project in the file format,
wrapped with the path it belongs to and when it was written; it is written atomically.

:class:`Autosaver` writes it when the user pauses (:data:`IDLE_MS` after the last edit)
and, during a long run of edits, at least every :data:`INTERVAL_MS`; it removes it as soon
as the project is saved (or undone back to the saved state), and the session removes its
folder at a clean exit.

After an abnormal exit (a crash, a kill, a power cut) the folder stays behind with its lock
no longer held: :func:`orphaned_recoveries` finds such recovery files at the next start, and
the window offers to restore the newest (:func:`offer_recovered_edits`).
"""

from __future__ import annotations

import hashlib
import json
import logging
import os
import re
import shutil
import uuid
from dataclasses import dataclass
from datetime import datetime
from pathlib import Path
from typing import Protocol

from PySide6.QtCore import QLockFile, QObject, QTimer, Signal

from app.data_folder import data_folder
from app.document import ProjectDocument
from hydraulics.model import ModelError, Project
from hydraulics.project_io import ProjectFileError, atomic_write_text, project_from_dict, project_to_dict

log = logging.getLogger(__name__)

RECOVERY_FOLDER = "recovery"
LOCK_NAME = "session.lock"
RECOVERY_SUFFIX = ".recovery.json"
RECOVERY_FORMAT = "pumpsketch-recovery"
RECOVERY_VERSION = 1
IDLE_MS = 5_000
"""A pause this long after an edit writes the recovery file."""
INTERVAL_MS = 30_000
"""While edits keep coming, the recovery file is written at least this often."""
UNTITLED = "untitled"


def recovery_root() -> Path:
    """The folder holding every session's recovery folder."""
    return data_folder() / RECOVERY_FOLDER


def recovery_key(project_path: Path | None) -> str:
    """The recovery file's name for a project at ``project_path`` (without the suffix).

    The file's name (letters, digits, ``-_.`` only) and a hash of its full path, so two files
    of one name in different folders never share a recovery file; "untitled" without a file.
    """
    if project_path is None:
        return UNTITLED
    text = str(Path(project_path).resolve())
    stem = re.sub(r"[^A-Za-z0-9_.-]+", "_", Path(text).name)[:60]
    return f"{stem}-{hashlib.sha256(text.encode('utf-8')).hexdigest()[:12]}"


@dataclass(frozen=True)
class RecoveredEdits:
    """Unsaved edits found in a recovery file."""

    recovery_file: Path
    project: Project
    project_path: Path | None
    """The file the edits were made to (``None``: a project never saved)."""
    written: datetime

    def description(self) -> str:
        """One sentence for the restore question."""
        if self.project_path is not None:
            what = f"of {self.project_path}"
        else:
            what = f"of the unsaved project '{self.project.name}'"
        return f"Unsaved edits {what}, kept at {self.written.strftime('%Y-%m-%d %H:%M:%S')}"

    def discard(self) -> None:
        """Delete the recovery file (and its session folder when nothing else is left in it)."""
        _remove_quietly(self.recovery_file)
        _remove_folder_if_done(self.recovery_file.parent)


def recovery_text(project: Project, project_path: Path | None) -> str:
    """The recovery file's JSON for ``project`` made to ``project_path``."""
    data = {
        "format": RECOVERY_FORMAT, "version": RECOVERY_VERSION,
        "project_path": str(project_path) if project_path is not None else None,
        "written": datetime.now().isoformat(timespec="seconds"),
        "project": project_to_dict(project),
    }
    return json.dumps(data, indent=1, ensure_ascii=False) + "\n"


def read_recovery_file(path: Path) -> RecoveredEdits:
    """Read a recovery file (raises :class:`ProjectFileError` when it is not a whole, valid one)."""
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, ValueError, RecursionError) as exc:
        raise ProjectFileError("", f"cannot read the recovery file ({exc})", str(path)) from None
    if not isinstance(data, dict) or data.get("format") != RECOVERY_FORMAT or data.get("version") != RECOVERY_VERSION:
        raise ProjectFileError("", "not a recovery file of this version", str(path))
    raw_path = data.get("project_path")
    project_path = Path(raw_path) if isinstance(raw_path, str) and raw_path else None
    base_dir = project_path.parent if project_path is not None else None
    project = project_from_dict(data.get("project"), source=str(path), base_dir=base_dir)
    try:
        written = datetime.fromisoformat(str(data.get("written")))
    except ValueError:
        written = datetime.fromtimestamp(path.stat().st_mtime)
    return RecoveredEdits(path, project, project_path, written)


def _remove_quietly(path: Path) -> None:
    try:
        path.unlink()
    except FileNotFoundError:
        pass
    except OSError as exc:
        log.warning("could not remove %s: %s", path, exc)


def _remove_folder_if_done(folder: Path) -> None:
    """Remove a session folder that holds no recovery file and whose lock is not held."""
    if any(folder.glob("*" + RECOVERY_SUFFIX)):
        return
    lock = QLockFile(str(folder / LOCK_NAME))
    lock.setStaleLockTime(0)  # only a dead owner makes a lock stale, never its age
    if lock.tryLock(0):
        lock.unlock()
        shutil.rmtree(folder, ignore_errors=True)


class RecoverySession:
    """This window's recovery folder, locked while the window runs (see the module docstring).

    The folder and the lock are made at the first :meth:`write`, so a window that is never
    edited leaves nothing behind.
    """

    def __init__(self, root: Path | None = None):
        self._root = root
        self._folder: Path | None = None
        self._lock: QLockFile | None = None

    @property
    def folder(self) -> Path | None:
        """The session folder (``None`` before the first write)."""
        return self._folder

    def _ensure_folder(self) -> Path:
        if self._folder is not None:
            return self._folder
        root = self._root if self._root is not None else recovery_root()
        folder = root / f"{os.getpid()}-{uuid.uuid4().hex[:8]}"
        folder.mkdir(parents=True)
        lock = QLockFile(str(folder / LOCK_NAME))
        lock.setStaleLockTime(0)
        if not lock.tryLock(0):
            raise OSError(f"cannot lock the recovery folder {folder}: {lock.error().name}")
        self._folder, self._lock = folder, lock
        return folder

    def recovery_files(self) -> list[Path]:
        """The recovery files of this session (none or one)."""
        return sorted(self._folder.glob("*" + RECOVERY_SUFFIX)) if self._folder is not None else []

    def write(self, project: Project, project_path: Path | None) -> Path:
        """Write the recovery file of ``project`` atomically (replacing this session's earlier one)."""
        folder = self._ensure_folder()
        target = folder / (recovery_key(project_path) + RECOVERY_SUFFIX)
        atomic_write_text(target, recovery_text(project, project_path))
        for other in self.recovery_files():
            if other != target:
                _remove_quietly(other)
        return target

    def discard(self) -> None:
        """Remove this session's recovery file (the edits were saved or deliberately dropped)."""
        for path in self.recovery_files():
            _remove_quietly(path)

    def close(self) -> None:
        """A clean end: remove the recovery file, release the lock, remove the folder."""
        self.discard()
        if self._lock is not None:
            self._lock.unlock()
            self._lock = None
        if self._folder is not None:
            shutil.rmtree(self._folder, ignore_errors=True)
            self._folder = None


def orphaned_recoveries(root: Path | None = None) -> list[RecoveredEdits]:
    """Recovery files left by windows that did not end cleanly, newest first.

    A session folder whose lock is held belongs to a running window and is skipped.  A
    recovery file that cannot be read (cut short by the crash itself, which the atomic write
    should prevent) is logged and left alone; an abandoned folder with nothing to recover is
    removed.
    """
    root = root if root is not None else recovery_root()
    found: list[RecoveredEdits] = []
    try:
        folders = [p for p in root.iterdir() if p.is_dir()]
    except OSError:
        return found
    for folder in folders:
        lock = QLockFile(str(folder / LOCK_NAME))
        lock.setStaleLockTime(0)
        if not lock.tryLock(0):
            continue  # a window still running holds it
        try:
            files = sorted(folder.glob("*" + RECOVERY_SUFFIX))
            for path in files:
                try:
                    found.append(read_recovery_file(path))
                except (ProjectFileError, ModelError, OSError) as exc:
                    log.warning("unreadable recovery file %s: %s", path, exc)
        finally:
            lock.unlock()
        if not files:
            shutil.rmtree(folder, ignore_errors=True)
    found.sort(key=lambda edits: edits.written, reverse=True)
    return found


class Autosaver(QObject):
    """Keeps the document's unsaved edits in its session's recovery file (see the module docstring).

    Signals
    -------
    written(object)
        The recovery file was written (its :class:`~pathlib.Path`).
    failed(str)
        The recovery file could not be written; the message says why.
    """

    written = Signal(object)
    failed = Signal(str)

    def __init__(self, document: ProjectDocument, session: RecoverySession | None = None,
                 idle_ms: int = IDLE_MS, interval_ms: int = INTERVAL_MS, parent: QObject | None = None):
        super().__init__(parent)
        self._document = document
        self.session = session if session is not None else RecoverySession()
        self._idle = QTimer(self)
        self._idle.setSingleShot(True)
        self._idle.setInterval(idle_ms)
        self._idle.timeout.connect(self.save_now)
        self._longest = QTimer(self)
        self._longest.setSingleShot(True)
        self._longest.setInterval(interval_ms)
        self._longest.timeout.connect(self.save_now)
        self._closed = False
        document.projectChanged.connect(self._on_change)
        document.fileStateChanged.connect(self._on_change)

    def set_intervals(self, idle_ms: int, interval_ms: int | None = None) -> None:
        """Change the pause that triggers a write (and the longest time between writes)."""
        self._idle.setInterval(idle_ms)
        if interval_ms is not None:
            self._longest.setInterval(interval_ms)

    @property
    def pending(self) -> bool:
        """True while unsaved edits wait to be written."""
        return self._idle.isActive() or self._longest.isActive()

    def _on_change(self) -> None:
        if self._closed:
            return
        if not self._document.is_modified:
            self._idle.stop()
            self._longest.stop()
            self.session.discard()
            return
        self._idle.start()  # restarted by every edit: written when the user pauses
        if not self._longest.isActive():
            self._longest.start()  # ... and at least this often during a long run of edits

    def save_now(self) -> Path | None:
        """Write the recovery file now if there are unsaved edits; the file written, or ``None``."""
        self._idle.stop()
        self._longest.stop()
        if self._closed or not self._document.is_modified:
            return None
        try:
            path = self.session.write(self._document.project, self._document.file_path)
        except (OSError, ModelError) as exc:
            message = f"Unsaved edits could not be kept for recovery: {exc}"
            log.warning(message)
            self.failed.emit(message)
            return None
        self.written.emit(path)
        return path

    def close(self) -> None:
        """The window closes cleanly: stop, and remove the recovery file and the session folder."""
        self._idle.stop()
        self._longest.stop()
        self._closed = True
        self.session.close()


class RestoringWindow(Protocol):
    """What :func:`offer_recovered_edits` needs of the window (the main window has it)."""

    document: ProjectDocument
    autosaver: Autosaver

    def ask_restore(self, edits: RecoveredEdits) -> bool: ...

    def show_status(self, message: str) -> None: ...


def offer_recovered_edits(window: RestoringWindow) -> bool:
    """At start-up: offer the newest unsaved edits a window left after an abnormal exit.

    Restored, they become ``window``'s project, marked unsaved, and are kept in its own
    recovery file before the old one is removed; declined, the old recovery file is deleted.
    Older ones (several windows lost at once) are offered at later starts.  The question is
    the window's :meth:`~app.main_window.MainWindow.ask_restore`.  Returns whether edits were
    restored.
    """
    found = orphaned_recoveries()
    if not found:
        return False
    edits = found[0]
    if not window.ask_restore(edits):
        edits.discard()
        window.show_status("Recovered edits discarded.")
        return False
    window.document.restore(edits.project, edits.project_path)
    if window.autosaver.save_now() is not None:
        edits.discard()
    window.show_status("Unsaved edits restored: save them to keep them.")
    return True
