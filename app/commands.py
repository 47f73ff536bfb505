"""The undo command of the window: one edit swaps the whole immutable project.

Every edit in the window is one :class:`ReplaceProjectCommand`: it holds the project
before and after the edit and swaps the whole immutable
:class:`~hydraulics.model.Project`.  That makes undo and redo exact (the restored project
is equal to, indeed the same object as, the one before) and makes compound edits — a
block paste, a pump import — a single step without child commands.

The command knows nothing of the document: it is given the function that makes a
project current.  What a project must satisfy is checked before the command is made,
by :func:`hydraulics.validation.validate_project`.
"""

from __future__ import annotations

from collections.abc import Callable

from PySide6.QtGui import QUndoCommand

from hydraulics.model import Project

Focus = tuple[str, object]
"""What the window should bring into view, e.g. ``("segment", 2)``."""

InstallProject = Callable[[Project, Focus | None], None]
"""Makes a project current; the focus is ``None`` when nothing needs bringing into view."""


class ReplaceProjectCommand(QUndoCommand):
    """Install ``after`` (redo) or ``before`` (undo) through ``install``.

    ``focus`` is what the window should bring into view when the command is undone or
    redone; the first redo (the edit itself) brings nothing into view, the user is
    already looking at it.
    """

    def __init__(self, install: InstallProject, before: Project, after: Project,
                 description: str, focus: Focus | None = None):
        super().__init__(description)
        self._install = install
        self.before = before
        self.after = after
        self.focus = focus
        self._first_redo = True

    def redo(self) -> None:
        self._install(self.after, None if self._first_redo else self.focus)
        self._first_redo = False

    def undo(self) -> None:
        self._install(self.before, self.focus)
