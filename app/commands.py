"""Undo commands and the checks a candidate project passes before it replaces the current one.

Every edit in the window is one :class:`ReplaceProjectCommand`: it holds the project
before and after the edit and swaps the whole immutable
:class:`~hydraulics.model.Project`.  That makes undo and redo exact (the restored project
is equal to, indeed the same object as, the one before) and makes compound edits — a
block paste, a pump import — a single step without child commands.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from PySide6.QtGui import QUndoCommand

from hydraulics.model import ModelError, Project, PumpModel
from hydraulics.validation import LIMITS, validate_project

if TYPE_CHECKING:  # pragma: no cover
    from app.document import ProjectDocument

MIN_PUMP_POINTS = 3
"""Fewest curve points a pump may have (the same rule as the project-file reader)."""

_POINT_COLUMNS = (
    ("flow_m3_s", "pump.flow_m3_s", "flow"),
    ("head_m", "pump.head_m", "head"),
    ("efficiency", "pump.efficiency", "efficiency"),
    ("npsh_required_m", "pump.npsh_required_m", "NPSH required"),
    ("shaft_power_w", "pump.shaft_power_w", "shaft power"),
)
_OPTIONAL_COLUMNS = ("efficiency", "npsh_required_m", "shaft_power_w")


class ReplaceProjectCommand(QUndoCommand):
    """Swap the document's project for ``after`` (redo) or back to ``before`` (undo).

    ``focus`` is what the window should bring into view when the command is undone or
    redone, e.g. ``("segment", 2)``.
    """

    def __init__(self, document: "ProjectDocument", before: Project, after: Project,
                 description: str, focus: tuple[str, object] | None = None):
        super().__init__(description)
        self._document = document
        self.before = before
        self.after = after
        self.focus = focus
        self._first_redo = True

    def redo(self) -> None:
        self._document._install(self.after, None if self._first_redo else self.focus)
        self._first_redo = False

    def undo(self) -> None:
        self._document._install(self.before, self.focus)


def check_pump(pump: PumpModel, path: str) -> None:
    """Check one pump's curve points; raise :class:`ModelError` naming the field.

    At least three points, every column as long as the flows, flows strictly
    increasing, every value inside its :data:`~hydraulics.validation.LIMITS` range; an
    optional column (efficiency, NPSH required, power) is given at every point or none
    (a missing value is held as NaN while a table is being edited).
    """
    if not pump.name.strip():
        raise ModelError(f"{path}.name", "a pump needs a name")
    LIMITS["pump.rated_speed_rpm"].check(pump.rated_speed_rpm, f"{path}.rated_speed")
    n = len(pump.flow_m3_s)
    if n < MIN_PUMP_POINTS:
        raise ModelError(f"{path}.points", f"a pump curve needs at least {MIN_PUMP_POINTS} points; it has {n}")
    for attribute, key, words in _POINT_COLUMNS:
        values = getattr(pump, attribute)
        if attribute in _OPTIONAL_COLUMNS and not values:
            continue
        if len(values) != n:
            raise ModelError(f"{path}.points.{attribute}", f"has {len(values)} values; the curve has {n} points")
        for j, value in enumerate(values):
            if isinstance(value, float) and math.isnan(value):
                raise ModelError(
                    f"{path}.points[{j}].{attribute}",
                    f"{words} is missing at point {j + 1}; give it at every point or clear the whole column")
            LIMITS[key].check(value, f"{path}.points[{j}].{attribute}")
    flows = pump.flow_m3_s
    for j in range(1, n):
        if flows[j] <= flows[j - 1]:
            raise ModelError(f"{path}.points[{j}].flow_m3_s",
                             f"flows must increase from point to point (point {j + 1} is not above point {j})")
    for name in ("head_fit_order", "efficiency_fit_order", "power_fit_order"):
        LIMITS["pump.fit_order"].check(getattr(pump, name), f"{path}.{name}")
    if pump.impeller_diameter_m is not None:
        LIMITS["segment.internal_diameter_m"].check(pump.impeller_diameter_m, f"{path}.impeller_diameter")


def check_candidate(project: Project) -> None:
    """Everything a project must satisfy before the window accepts it.

    :func:`hydraulics.validation.validate_project` (the whole-project rules, such as a
    low level above a high level) plus the pump-curve rules of :func:`check_pump`.
    """
    validate_project(project)
    for i, pump in enumerate(project.pumps):
        check_pump(pump, f"pumps[{i}]")
