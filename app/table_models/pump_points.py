"""The curve-point table of one pump: flow, head, efficiency, NPSH required, shaft power.

Flow and head are needed at every point.  Efficiency, NPSH required and shaft power are
optional columns: each is given at every point or at none.  While a table is being
edited a missing value is held as NaN; the document refuses a project in which a column
is partly filled (see :func:`hydraulics.validation.validate_pump`), so a lone value typed into an
empty column is refused with that reason — paste the whole column, or import a CSV.
Clearing every cell of an optional column removes it.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import replace
from typing import Any

from PySide6.QtCore import QObject

from app.document import ProjectDocument
from app.table_models.base import Column, ProjectTableModel
from hydraulics.model import Project, PumpModel
from hydraulics.validation import MIN_PUMP_POINTS

_COLUMNS: tuple[Column, ...] = (
    Column("flow_m3_s", "Flow", quantity="flow", limit="pump.flow_m3_s", tooltip="Flow of one pump."),
    Column("head_m", "Head", quantity="head", limit="pump.head_m", tooltip="Head of one pump at rated speed."),
    Column("efficiency", "Efficiency", quantity="ratio_percent", limit="pump.efficiency", optional=True,
           tooltip="Pump (hydraulic) efficiency.",
           blank="not given at this point (give it at every point or at none; none: no efficiency, power or "
                 "energy results)."),
    Column("npsh_required_m", "NPSH required", quantity="head", limit="pump.npsh_required_m", optional=True,
           blank="not given at this point (give it at every point or at none; none: the NPSH margin is not "
                 "checked)."),
    Column("shaft_power_w", "Shaft power", quantity="power", limit="pump.shaft_power_w", optional=True,
           blank="not given at this point (give it at every point or at none; none: the power follows from "
                 "head, flow and efficiency)."),
)
_ATTRIBUTES = tuple(c.key for c in _COLUMNS)
_OPTIONAL = tuple(c.key for c in _COLUMNS if c.optional)

Point = tuple[float, ...]
"""One row: values in the order of the columns, NaN for a missing optional value."""


def _missing(value: float | None) -> bool:
    return value is None or (isinstance(value, float) and math.isnan(value))


def pump_points(pump: PumpModel) -> tuple[Point, ...]:
    """The pump's points as rows (NaN where an optional column is absent)."""
    n = len(pump.flow_m3_s)
    columns = []
    for key in _ATTRIBUTES:
        values = getattr(pump, key)
        columns.append(tuple(values) if len(values) == n else (math.nan,) * n)
    return tuple(zip(*columns, strict=True)) if n else ()


def pump_with_points(pump: PumpModel, points: Sequence[Point]) -> PumpModel:
    """``pump`` with its point columns rebuilt from rows; an all-missing optional column is dropped."""
    columns: dict[str, tuple[float, ...]] = {}
    for j, key in enumerate(_ATTRIBUTES):
        values = tuple(float(p[j]) if not _missing(p[j]) else math.nan for p in points)
        if key in _OPTIONAL and all(math.isnan(v) for v in values):
            values = ()
        columns[key] = values
    return replace(pump, flow_m3_s=columns["flow_m3_s"], head_m=columns["head_m"], efficiency=columns["efficiency"],
                   npsh_required_m=columns["npsh_required_m"], shaft_power_w=columns["shaft_power_w"])


class PumpPointsModel(ProjectTableModel):
    """Curve points of one pump of the project; :meth:`set_pump` chooses which."""

    def __init__(self, document: ProjectDocument, parent: QObject | None = None) -> None:
        self._pump_id: str | None = None
        super().__init__(document, parent)

    @property
    def pump_id(self) -> str | None:
        return self._pump_id

    def set_pump(self, pump_id: str | None) -> None:
        """Show the points of the pump ``pump_id`` (``None``: none)."""
        if pump_id != self._pump_id:
            self._pump_id = pump_id
            self.reset()

    def _pump_index(self, project: Project) -> int | None:
        for i, pump in enumerate(project.pumps):
            if pump.pump_id == self._pump_id:
                return i
        return None

    def available(self) -> bool:
        return self._pump_index(self.document.project) is not None

    def _count(self, project: Project) -> int:
        index = self._pump_index(project)
        return 0 if index is None else len(project.pumps[index].flow_m3_s)

    def refresh(self) -> None:
        if self._pump_id is not None and self._pump_index(self.document.project) is None:
            self._pump_id = None
            self.reset()
            return
        super().refresh()

    # ------------------------------------------------------------------ rows
    def columns_for(self, project: Project) -> tuple[Column, ...]:
        return _COLUMNS

    def rows_source(self, project: Project) -> PumpModel | None:
        index = self._pump_index(project)
        return None if index is None else project.pumps[index]

    def items(self, project: Project) -> Sequence[Point]:
        index = self._pump_index(project)
        return () if index is None else pump_points(project.pumps[index])

    def with_items(self, project: Project, items: Sequence[Any]) -> Project:
        index = self._pump_index(project)
        assert index is not None
        pumps = list(project.pumps)
        pumps[index] = pump_with_points(pumps[index], items)
        return replace(project, pumps=tuple(pumps))

    def item_word(self) -> str:
        return "point"

    def min_rows(self) -> int:
        return MIN_PUMP_POINTS

    def row_name(self, project: Project, row: int) -> str:
        index = self._pump_index(project)
        name = "" if index is None else f" of pump '{project.pumps[index].name}'"
        return f"point {row + 1}{name}"

    def field_path(self, row: int, column: Column) -> str:
        return f"pumps[{self._pump_index(self.project)}].points[{row}].{column.key}"

    def focus_target(self, row: int) -> tuple[str, object] | None:
        return None if self._pump_id is None else ("pump", self._pump_id)

    def new_item(self, project: Project, row: int) -> Point:
        """Midway between the neighbours; past the last point, 10 % more flow and less head."""
        points = self.items(project)
        if not points:
            return (0.0, 10.0) + (math.nan,) * len(_OPTIONAL)
        if 0 < row < len(points):
            before, after = points[row - 1], points[row]
            return tuple((a + b) / 2.0 for a, b in zip(before, after, strict=True))
        if row >= len(points):
            last = points[-1]
            return (last[0] * 1.1 if last[0] > 0 else 0.001, last[1] * 0.9) + tuple(last[2:])
        first = points[0]
        return (first[0] / 2.0, first[1]) + tuple(first[2:])

    # ------------------------------------------------------------------ cells
    def value(self, project: Project, row: int, column: Column) -> Any:
        value = self.items(project)[row][_ATTRIBUTES.index(column.key)]
        return None if _missing(value) else value

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        points = [list(p) for p in self.items(project)]
        points[row][_ATTRIBUTES.index(column.key)] = math.nan if value is None else float(value)
        return self.with_items(project, [tuple(p) for p in points])
