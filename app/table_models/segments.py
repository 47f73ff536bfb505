"""The Pipework table: one row per pipe segment.

Diameter and pipe series work together:

* choosing a nominal size sets the internal diameter from the pipe-series catalogue;
* choosing a pipe series picks the size whose bore is nearest the current diameter;
* typing an internal diameter detaches the segment from its series (series and nominal
  size are cleared; the column then reads "typed");
* choosing a material of another kind detaches a series made of a different material.

The roughness (Darcy–Weisbach) or Hazen–Williams C columns show the material's catalogue
values in grey; typing a value overrides them for this segment, clearing it returns to
the catalogue.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace
from typing import Any

from PySide6.QtCore import QObject, Qt

from app.document import ProjectDocument
from app.table_models import choices
from app.table_models.base import Column, ProjectTableModel
from app.table_models.cells import CellError, display_text
from hydraulics import catalogue
from hydraulics.model import ModelError, Project, Segment
from hydraulics.validation import MIN_SEGMENTS

_COMMON_COLUMNS: tuple[Column, ...] = (
    Column("name", "Name", kind="text"),
    Column("side", "Side", kind="choice", tooltip="Suction side (before the pump) or delivery side."),
    Column("carries", "Carries", kind="choice",
           tooltip="Each pump: part of each pump's own suction or discharge branch, carrying one running "
                   "pump's flow (idle pumps' branches carry nothing). Station flow: common pipework "
                   "(suction header, manifold, rising main) carrying the station flow."),
    Column("length", "Length", quantity="length", limit="segment.length_m"),
    Column("nominal_size", "Nominal size", kind="choice",
           tooltip="Sets the internal diameter from the series. Step with Ctrl+Up / Ctrl+Down."),
    Column("internal_diameter", "Internal diameter", quantity="diameter", limit="segment.internal_diameter_m",
           tooltip="Bore of one pipe. Typing a value detaches the segment from its pipe series."),
    Column("material", "Material", kind="choice", tooltip="Sets the roughness and Hazen–Williams C."),
    Column("pipe_series", "Pipe series", kind="choice",
           tooltip="A product series whose sizes set the bore; \"typed\" when the diameter was typed."),
    Column("start_elevation", "Start elevation", quantity="elevation", limit="segment.elevation_m", optional=True,
           tooltip="Pipe elevation at the start (used to find a high point above the delivery level).",
           blank="not given: this segment is left out of the high-point check."),
    Column("end_elevation", "End elevation", quantity="elevation", limit="segment.elevation_m", optional=True,
           tooltip="Pipe elevation at the end (used to find a high point above the delivery level).",
           blank="not given: this segment is left out of the high-point check."),
    Column("parallel_pipes", "Parallel pipes", quantity="dimensionless", limit="segment.parallel_pipes",
           tooltip="Identical pipes sharing the flow."),
)

_DARCY_COLUMNS: tuple[Column, ...] = (
    Column("roughness_new", "Roughness, new", quantity="roughness", limit="segment.roughness_m", optional=True,
           tooltip="Absolute roughness of new pipe.", blank="the material catalogue's value (shown in grey)."),
    Column("roughness_aged", "Roughness, aged", quantity="roughness", limit="segment.roughness_m", optional=True,
           tooltip="Absolute roughness of aged pipe.", blank="the material catalogue's value (shown in grey)."),
)

_HAZEN_COLUMNS: tuple[Column, ...] = (
    Column("hw_c_new", "H–W C, new", quantity="dimensionless", limit="segment.hw_c", optional=True,
           tooltip="Hazen–Williams coefficient of new pipe.",
           blank="the material catalogue's value (shown in grey)."),
    Column("hw_c_aged", "H–W C, aged", quantity="dimensionless", limit="segment.hw_c", optional=True,
           tooltip="Hazen–Williams coefficient of aged pipe.",
           blank="the material catalogue's value (shown in grey)."),
)

_VELOCITY_COLUMN = Column("velocity", "Velocity at design flow", kind="readonly", quantity="velocity",
                          tooltip="Mean velocity in one pipe at the design flow (calculated).")

_FIELDS = {
    "name": "name", "side": "side", "carries": "carries", "material": "material_id", "pipe_series": "pipe_series",
    "nominal_size": "nominal_size", "internal_diameter": "internal_diameter_m", "length": "length_m",
    "start_elevation": "start_elevation_m", "end_elevation": "end_elevation_m",
    "parallel_pipes": "parallel_pipes", "roughness_new": "roughness_new_m", "roughness_aged": "roughness_aged_m",
    "hw_c_new": "hw_c_new", "hw_c_aged": "hw_c_aged",
}

_MATERIAL_FIELDS = {
    "roughness_new": "roughness_new_m", "roughness_aged": "roughness_aged_m",
    "hw_c_new": "hw_c_new", "hw_c_aged": "hw_c_aged",
}


class SegmentsModel(ProjectTableModel):
    """The project's pipe segments (see the module docstring for the diameter rules)."""

    def __init__(self, document: ProjectDocument, parent: QObject | None = None) -> None:
        super().__init__(document, parent)
        document.solutionChanged.connect(self._on_solution)

    # ------------------------------------------------------------------ columns and rows
    def columns_for(self, project: Project) -> tuple[Column, ...]:
        method = _HAZEN_COLUMNS if project.friction_method == "hazen_williams" else _DARCY_COLUMNS
        return _COMMON_COLUMNS + method + (_VELOCITY_COLUMN,)

    def items(self, project: Project) -> Sequence[Segment]:
        return project.segments

    def with_items(self, project: Project, items: Sequence[Any]) -> Project:
        return replace(project, segments=tuple(items))

    def item_word(self) -> str:
        return "segment"

    def min_rows(self) -> int:
        return MIN_SEGMENTS

    def row_name(self, project: Project, row: int) -> str:
        if 0 <= row < len(project.segments):
            return f"segment {row + 1} '{project.segments[row].name}'"
        return f"segment {row + 1}"

    def field_path(self, row: int, column: Column) -> str:
        return f"segments[{row}].{column.key}"

    def focus_target(self, row: int) -> tuple[str, object]:
        return ("segment", row)

    def new_item(self, project: Project, row: int) -> Segment:
        segments = project.segments
        template = segments[min(max(row - 1, 0), len(segments) - 1)] if segments else None
        names = {s.name for s in segments}
        number = len(segments) + 1
        while f"Segment {number}" in names:
            number += 1
        if template is None:
            return Segment(name=f"Segment {number}", side="delivery", material_id="ductile_iron_cml",
                           length_m=100.0, internal_diameter_m=0.2)
        return replace(template, name=f"Segment {number}", fittings=(), start_elevation_m=None,
                       end_elevation_m=None, carries="station")

    # ------------------------------------------------------------------ cells
    def value(self, project: Project, row: int, column: Column) -> Any:
        segment = project.segments[row]
        if column.key == "velocity":
            solution = self.document.solution
            if solution is None or solution.project is not project or row >= len(solution.segments):
                return None
            return solution.segments[row].velocity_m_s
        return getattr(segment, _FIELDS[column.key])

    def display(self, project: Project, row: int, column: Column) -> str:
        if column.key == "pipe_series" and project.segments[row].pipe_series is None:
            return choices.TYPED_SERIES_LABEL
        if column.key == "nominal_size" and project.segments[row].pipe_series is None:
            return "—"
        return super().display(project, row, column)

    def choices(self, project: Project, row: int, column: Column) -> list[tuple[str | None, str]]:
        segment = project.segments[row]
        if column.key == "side":
            return choices.SIDE_CHOICES
        if column.key == "carries":
            return choices.CARRIES_CHOICES
        if column.key == "material":
            return choices.material_choices()
        if column.key == "pipe_series":
            return choices.series_choices(segment.material_id, segment.pipe_series)
        if column.key == "nominal_size":
            return choices.nominal_choices(segment.pipe_series)
        return []

    def cell_editable(self, project: Project, row: int, column: Column) -> bool:
        if column.key == "nominal_size":
            return project.segments[row].pipe_series is not None
        return column.editable

    def derived_hint(self, project: Project, row: int, column: Column) -> str | None:
        attribute = _MATERIAL_FIELDS.get(column.key)
        if attribute is None or column.quantity is None:
            return None
        found = catalogue.materials().get(project.segments[row].material_id)
        if found is None:
            return None
        return display_text(getattr(found, attribute), column.quantity, self.unit_system)

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        segment = project.segments[row]
        key = column.key
        if key == "material":
            changed = replace(segment, material_id=value)
            if segment.pipe_series is not None and catalogue.series(segment.pipe_series).material_id != value:
                changed = replace(changed, pipe_series=None, nominal_size=None)
        elif key == "pipe_series":
            changed = self._with_series(segment, value)
        elif key == "nominal_size":
            if segment.pipe_series is None:
                raise CellError("Nominal size: choose a pipe series first")
            size = choices.size_of(segment.pipe_series, value)
            changed = replace(segment, nominal_size=size.nominal, internal_diameter_m=size.internal_diameter_m)
        elif key == "internal_diameter":
            changed = replace(segment, internal_diameter_m=value, pipe_series=None, nominal_size=None)
        else:
            changed = replace(segment, **{_FIELDS[key]: value})
        return replace(project, segments=project.segments[:row] + (changed,) + project.segments[row + 1:])

    @staticmethod
    def _with_series(segment: Segment, series_id: str | None) -> Segment:
        if series_id is None:
            return replace(segment, pipe_series=None, nominal_size=None)
        try:
            found = catalogue.series(series_id)
        except ModelError as exc:
            raise CellError(f"Pipe series: {exc.problem}") from None
        size = found.nearest(segment.internal_diameter_m)
        return replace(segment, pipe_series=series_id, nominal_size=size.nominal,
                       internal_diameter_m=size.internal_diameter_m, material_id=found.material_id)

    # ------------------------------------------------------------------ calculated column
    def refresh(self) -> None:
        """Follow the project; the calculated velocities of every row go blank with it.

        The velocities shown belong to the solution of one project, so after any edit
        they are out of date in all rows (not only the edited one) until the next solve.
        """
        super().refresh()
        if self.rowCount() and self.table_columns:
            column = len(self.table_columns) - 1
            self.dataChanged.emit(self.index(0, column), self.index(self.rowCount() - 1, column))

    def _on_solution(self, _solution: object) -> None:
        if self.rowCount() == 0:
            return
        column = len(self.table_columns) - 1
        self.dataChanged.emit(self.index(0, column), self.index(self.rowCount() - 1, column),
                              [Qt.ItemDataRole.DisplayRole])
