"""The fittings table of the selected segment: type, count, catalogue K, K override.

Every K refers to the velocity of the segment holding the fitting.  The catalogue K is
shown for the segment's bore (size-dependent entries follow the bore as it changes);
a K override replaces it for that row, clearing the override returns to the catalogue.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace
from typing import Any

from PySide6.QtCore import QObject

from app.document import ProjectDocument
from app.table_models import choices
from app.table_models.base import Column, ProjectTableModel
from hydraulics.model import Fitting, Project
from hydraulics.number_format import general_number

_COLUMNS: tuple[Column, ...] = (
    Column("fitting_id", "Fitting type", kind="choice", tooltip="From the fittings catalogue."),
    Column("count", "Count", quantity="dimensionless", limit="fitting.count",
           tooltip="How many identical fittings."),
    Column("catalogue_k", "Catalogue K", kind="readonly", quantity="dimensionless",
           tooltip="K of one fitting from the catalogue at this segment's bore, "
                   "referred to the segment velocity."),
    Column("k_override", "K override", quantity="dimensionless", limit="fitting.k_override", optional=True,
           tooltip="Your own K for one fitting, e.g. from a manufacturer; replaces the catalogue K."),
)

DEFAULT_FITTING_ID = "elbow_90_long_radius"


class FittingsModel(ProjectTableModel):
    """The fittings of one segment; :meth:`set_segment` chooses which."""

    def __init__(self, document: ProjectDocument, parent: QObject | None = None) -> None:
        self._segment: int | None = None
        super().__init__(document, parent)

    # ------------------------------------------------------------------ which segment
    @property
    def segment_index(self) -> int | None:
        return self._segment

    def set_segment(self, index: int | None) -> None:
        """Show the fittings of segment ``index`` (``None``: no segment selected)."""
        if index is not None and not 0 <= index < len(self.document.project.segments):
            index = None
        if index != self._segment:
            self._segment = index
            self.reset()

    def available(self) -> bool:
        return self._segment is not None and self._segment < len(self.document.project.segments)

    def refresh(self) -> None:
        if self._segment is not None and self._segment >= len(self.document.project.segments):
            self._segment = None
            self.reset()
            return
        previous, project = self.project, self.document.project
        old, new = tuple(self.items(previous)), tuple(self.items(project))
        if (self._segment is not None and old and old == new and len(old) == self.rowCount()
                and self.columns_for(project) == self.table_columns):
            # The cells read the fitting records, the catalogue and the segment's bore only:
            # with the same records, just the catalogue K can change (a new bore).
            self._project = project
            if (previous.segments[self._segment].internal_diameter_m
                    != project.segments[self._segment].internal_diameter_m):
                column = self.column_index("catalogue_k")
                self.dataChanged.emit(self.index(0, column), self.index(len(new) - 1, column))
            return
        super().refresh()

    def _count(self, project: Project) -> int:
        if self._segment is None or self._segment >= len(project.segments):
            return 0
        return len(project.segments[self._segment].fittings)

    # ------------------------------------------------------------------ rows
    def columns_for(self, project: Project) -> tuple[Column, ...]:
        return _COLUMNS

    def items(self, project: Project) -> Sequence[Fitting]:
        if self._segment is None or self._segment >= len(project.segments):
            return ()
        return project.segments[self._segment].fittings

    def with_items(self, project: Project, items: Sequence[Any]) -> Project:
        assert self._segment is not None
        segments = list(project.segments)
        segments[self._segment] = replace(segments[self._segment], fittings=tuple(items))
        return replace(project, segments=tuple(segments))

    def item_word(self) -> str:
        return "fitting"

    def row_name(self, project: Project, row: int) -> str:
        segment = "" if self._segment is None else f" of segment {self._segment + 1}"
        return f"fitting {row + 1}{segment}"

    def field_path(self, row: int, column: Column) -> str:
        return f"segments[{self._segment}].fittings[{row}].{column.key}"

    def focus_target(self, row: int) -> tuple[str, object] | None:
        return None if self._segment is None else ("segment", self._segment)

    def new_item(self, project: Project, row: int) -> Fitting:
        current = self.items(project)
        if current:
            return Fitting(current[min(max(row - 1, 0), len(current) - 1)].fitting_id)
        return Fitting(DEFAULT_FITTING_ID)

    # ------------------------------------------------------------------ cells
    def value(self, project: Project, row: int, column: Column) -> Any:
        fitting = self.items(project)[row]
        if column.key == "catalogue_k":
            assert self._segment is not None  # a fitting row exists only with a segment shown
            segment = project.segments[self._segment]
            return choices.catalogue_k(fitting.fitting_id, segment.internal_diameter_m)
        return getattr(fitting, column.key)

    def display(self, project: Project, row: int, column: Column) -> str:
        if column.key == "catalogue_k":
            k = self.value(project, row, column)
            return general_number(k, 3)
        return super().display(project, row, column)

    def choices(self, project: Project, row: int, column: Column) -> list[tuple[str | None, str]]:
        if column.key == "fitting_id":
            return choices.fitting_choices()
        return []

    def cell_tooltip(self, project: Project, row: int, column: Column) -> str | None:
        if column.key in ("fitting_id", "catalogue_k"):
            name = self.display(project, row, self.table_columns[0])
            return f"{name}: {choices.fitting_source(self.items(project)[row].fitting_id)}"
        return super().cell_tooltip(project, row, column)

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        items = list(self.items(project))
        items[row] = replace(items[row], **{column.key: value})
        return self.with_items(project, items)
