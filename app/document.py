"""The open project: current model, undo stack, file, unit system and live recompute.

:class:`ProjectDocument` is the one place the window's state lives.  Panels and table
models read ``document.project`` and hand candidate projects to :meth:`apply`; they
never keep data of their own.  After every change the document schedules a live solve
(:meth:`ProjectDocument.schedule_recompute`) in the engine's two stages: the first
(:func:`hydraulics.solve.solve_curves`: curves and operating points) is emitted as
``curvesReady`` for the plot, the finished solution
(:func:`hydraulics.solve.complete_solution`: with the checks) as ``solutionChanged``.
The first edit after a pause is solved as soon as control returns to the event loop,
before the window repaints; edits that arrive while a solve is pending join it, and
solves follow each other no closer than :data:`RECOMPUTE_DELAY_MS` (a single-shot timer
holds the next one back), so a burst of edits (mouse-wheel steps, typing) redraws live
without queuing a solve per edit.

Changing the unit system changes only what is shown: the stored project stays in SI.
"""

from __future__ import annotations

import logging
import math
import time
from pathlib import Path

from PySide6.QtCore import QCoreApplication, QEvent, QObject, Qt, QTimer, Signal
from PySide6.QtGui import QUndoStack

from app.commands import Focus, ReplaceProjectCommand
from hydraulics.model import ModelError, Project
from hydraulics.project_io import FILE_SUFFIX, load_project, new_project, save_project
from hydraulics.results import Solution
from hydraulics.solve import complete_solution, solve_curves
from hydraulics.units import UNIT_SYSTEMS
from hydraulics.validation import validate_project

log = logging.getLogger(__name__)

RECOMPUTE_DELAY_MS = 30
"""Shortest time between two live solves while edits keep coming (a burst is throttled)."""

_SOLVE_EVENT = QEvent.Type(QEvent.registerEventType())
"""Posted to the document to solve at the next turn of the event loop.

A posted event of high priority is delivered before the window's pending repaints (Qt
posts those at low priority), so the plot shows the edit's result in the first paint
after it; a zero-interval timer would only fire once the whole window had repainted.
"""


def describe_model_error(exc: ModelError) -> str:
    """A ModelError as one plain sentence naming the field."""
    return f"{exc.problem} ({exc.field_path})" if exc.field_path else exc.problem


class ProjectDocument(QObject):
    """The project being edited (see the module docstring).

    Signals
    -------
    projectChanged()
        The project changed (an edit, undo, redo, open or new).
    projectReplaced()
        A different project was opened or started (emitted before ``projectChanged``);
        tables reset rather than follow row by row.
    curvesReady(object)
        The first stage of a solve of the current project (a
        :class:`~hydraulics.results.Solution` with ``complete`` False: curves, pump curves
        and operating points, no checks yet), emitted just before ``solutionChanged``
        so that the plot can be drawn and painted first.
    solutionChanged(object)
        A fresh, complete :class:`~hydraulics.results.Solution` of the current project.
    solveFailed(str)
        The current project could not be solved; the message says why.
    unitSystemChanged(str)
        The display unit system changed ("SI" or "US").
    fileStateChanged()
        The file path or the saved/unsaved state changed.
    editRefused(str)
        An edit was refused; the message names the field and the allowed range.
    focusRequested(object)
        Undo or redo changed something the window should bring into view, e.g.
        ``("segment", 2)``.
    """

    projectChanged = Signal()
    projectReplaced = Signal()
    curvesReady = Signal(object)
    solutionChanged = Signal(object)
    solveFailed = Signal(str)
    unitSystemChanged = Signal(str)
    fileStateChanged = Signal()
    editRefused = Signal(str)
    focusRequested = Signal(object)

    def __init__(self, project: Project | None = None, unit_system: str = "SI", parent: QObject | None = None):
        super().__init__(parent)
        self._project = project if project is not None else new_project()
        self._unit_system = unit_system if unit_system in UNIT_SYSTEMS else "SI"
        self._file_path: Path | None = None
        self._solution: Solution | None = None
        self._solve_error: str | None = None
        self._refusals = 0
        self.undo_stack = QUndoStack(self)
        self.undo_stack.cleanChanged.connect(self._on_clean_changed)
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.timeout.connect(self.recompute_now)
        self._solve_posted = False
        self._last_solve_end = -math.inf
        self.last_solve_ms = 0.0
        """How long the engine took for the last live solve (the views not included)."""
        self.last_curves_ms = 0.0
        """The part of :attr:`last_solve_ms` spent in its first stage (the plot's data)."""

    def _on_clean_changed(self, _clean: bool) -> None:
        self.fileStateChanged.emit()

    # ------------------------------------------------------------------ state
    @property
    def project(self) -> Project:
        """The current (immutable) project."""
        return self._project

    @property
    def solution(self) -> Solution | None:
        """The solution of the current project, ``None`` before the first solve or after a failure."""
        return self._solution

    @property
    def solve_error(self) -> str | None:
        """Why the current project could not be solved, or ``None``."""
        return self._solve_error

    @property
    def file_path(self) -> Path | None:
        return self._file_path

    @property
    def unit_system(self) -> str:
        return self._unit_system

    @property
    def is_modified(self) -> bool:
        """True when there are edits not saved to :attr:`file_path`."""
        return not self.undo_stack.isClean()

    def display_name(self) -> str:
        """The file name without the project suffix, or the project name for an unsaved project."""
        if self._file_path is None:
            return self._project.name or "Untitled"
        name = self._file_path.name
        return name[: -len(FILE_SUFFIX)] if name.endswith(FILE_SUFFIX) else name

    def set_unit_system(self, system: str) -> None:
        """Show values in ``system``; the stored project does not change."""
        if system not in UNIT_SYSTEMS:
            raise ValueError(f"unknown unit system {system!r}; known: {', '.join(UNIT_SYSTEMS)}")
        if system != self._unit_system:
            self._unit_system = system
            self.unitSystemChanged.emit(system)

    # ------------------------------------------------------------------ edits
    def apply(self, candidate: Project, description: str, focus: Focus | None = None) -> bool:
        """Replace the project by ``candidate`` as one undoable step.

        The candidate is checked first (:func:`hydraulics.validation.validate_project`,
        the same rules as the file reader and the command line); a refusal
        emits ``editRefused`` with the reason and leaves the project unchanged.  Returns
        whether the edit was applied (an edit that changes nothing counts as applied).
        """
        if candidate == self._project:
            return True
        try:
            validate_project(candidate)
        except ModelError as exc:
            self.refuse(f"Not applied — {describe_model_error(exc)}")
            return False
        self.undo_stack.push(ReplaceProjectCommand(self._install, self._project, candidate, description, focus))
        return True

    def refuse(self, message: str) -> None:
        """Tell the window an edit was refused (the project is unchanged)."""
        self._refusals += 1
        self.editRefused.emit(message)

    @property
    def refusal_count(self) -> int:
        """How many edits were refused so far (lets a view tell whether its last commit was)."""
        return self._refusals

    def _install(self, project: Project, focus: Focus | None) -> None:
        """Make ``project`` current (called by the undo commands only)."""
        self._project = project
        self.projectChanged.emit()
        if focus is not None:
            self.focusRequested.emit(focus)
        self.schedule_recompute()

    # ------------------------------------------------------------------ files
    def replace_project(self, project: Project, path: Path | None) -> None:
        """Start over on ``project`` (open or new): clears the undo history, marks it saved."""
        self._project = project
        self._file_path = Path(path).resolve() if path is not None else None
        self.undo_stack.clear()
        self.undo_stack.setClean()
        self.projectReplaced.emit()
        self.projectChanged.emit()
        self.fileStateChanged.emit()
        self.schedule_recompute()

    def restore(self, project: Project, path: Path | None) -> None:
        """Start over on recovered unsaved edits of the file ``path`` (``None``: never saved).

        Like opening, but the project is marked unsaved: Save writes it to ``path`` (or asks
        where), and closing asks first.  The undo history of the lost session is not recovered.
        """
        self.replace_project(project, path)
        self.undo_stack.resetClean()  # no state of this stack matches the file on disk (emits fileStateChanged)

    def new(self) -> None:
        """A fresh editable project, not yet saved anywhere."""
        self.replace_project(new_project(), None)

    def open(self, path: str | Path) -> None:
        """Read a project file (raises :class:`hydraulics.project_io.ProjectFileError`)."""
        project = load_project(path)
        self.replace_project(project, Path(path))

    def save(self, path: str | Path | None = None) -> Path:
        """Save atomically to ``path`` (or the current file); mark the project saved.

        Raises ``ValueError`` when there is no path, and passes on the errors of
        :func:`hydraulics.project_io.save_project` (OSError, ModelError).
        """
        target = Path(path) if path is not None else self._file_path
        if target is None:
            raise ValueError("the project has no file yet; choose where to save it")
        save_project(self._project, target)
        self._file_path = target.resolve()
        self.undo_stack.setClean()
        self.fileStateChanged.emit()
        return self._file_path

    # ------------------------------------------------------------------ recompute
    def schedule_recompute(self) -> None:
        """Solve soon: at the next turn of the event loop, or when the throttle interval ends.

        A solve already pending will see the newest project, so it is not restarted.
        """
        if self.recompute_pending:
            return
        wait_ms = RECOMPUTE_DELAY_MS - (time.perf_counter() - self._last_solve_end) * 1000.0
        if wait_ms > 0:
            self._timer.start(int(math.ceil(wait_ms)))
            return
        self._solve_posted = True
        QCoreApplication.postEvent(self, QEvent(_SOLVE_EVENT), Qt.EventPriority.HighEventPriority.value)

    def event(self, event: QEvent) -> bool:
        if event.type() == _SOLVE_EVENT:
            if self._solve_posted:  # not already solved by an explicit recompute_now()
                self.recompute_now()
            return True
        return super().event(event)

    def recompute_now(self) -> Solution | None:
        """Solve the current project now (cancels a pending debounced solve).

        A project the engine refuses emits ``solveFailed`` with the reason; it never
        raises.
        """
        self._timer.stop()
        self._solve_posted = False
        try:
            return self._solve_and_publish()
        finally:
            self._last_solve_end = time.perf_counter()

    def _solve_and_publish(self) -> Solution | None:
        project = self._project
        start = time.perf_counter()
        try:
            stage = solve_curves(project)
            self.last_curves_ms = (time.perf_counter() - start) * 1000.0
            curves_end = time.perf_counter()
            self.curvesReady.emit(stage.solution)
            views_ms = (time.perf_counter() - curves_end) * 1000.0
            solution = complete_solution(stage)
        except ModelError as exc:
            self._fail(f"Results not updated — {describe_model_error(exc)}")
            return None
        except Exception as exc:  # an engine fault is reported, never allowed to close the window
            log.exception("solve failed")
            self._fail(f"Results not updated — the calculation failed: {exc}")
            return None
        self.last_solve_ms = (time.perf_counter() - start) * 1000.0 - views_ms
        self._solution = solution
        self._solve_error = None
        self.solutionChanged.emit(solution)
        return solution

    def _fail(self, message: str) -> None:
        self._solution = None
        self._solve_error = message
        self.solveFailed.emit(message)

    @property
    def last_solve_end(self) -> float:
        """When the last live solve ended (``time.perf_counter()``; ``-inf`` before the first)."""
        return self._last_solve_end

    @property
    def recompute_pending(self) -> bool:
        """True while a live solve is waiting (posted, or held back by the throttle)."""
        return self._solve_posted or self._timer.isActive()
