"""The fittings table of the selected segment: type, count, catalogue K, K override, and
the cone angle and upstream bore of a reducer or expander.

Every K refers to the velocity of the segment holding the fitting.  The catalogue K is
shown for the segment's bore (size-dependent entries follow the bore as it changes; a
reducer's or expander's K follows both bores and its cone angle); a K override replaces
it for that row, clearing the override returns to the catalogue.

A reducer or expander sits at the inlet of its segment.  Its upstream bore, left blank,
is the bore of the previous segment in flow order (station suction, each pump's suction
branch, each pump's discharge branch, station delivery, each in table order), shown in
grey; its cone angle, left blank, is that of the catalogue type (180° for a sudden one).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace
from typing import Any

from PySide6.QtCore import QObject, Qt

from app.document import ProjectDocument
from app.table_models import choices
from app.table_models.base import Column, ProjectTableModel
from app.table_models.cells import display_text
from hydraulics import fittings
from hydraulics.model import Fitting, ModelError, Project
from hydraulics.number_format import general_number, plain_number
from hydraulics.system_curve import upstream_diameters

_COLUMNS: tuple[Column, ...] = (
    Column("fitting_id", "Fitting type", kind="choice", tooltip="From the fittings catalogue."),
    Column("count", "Count", quantity="dimensionless", limit="fitting.count",
           tooltip="How many identical fittings."),
    Column("catalogue_k", "Catalogue K", kind="readonly", quantity="dimensionless",
           tooltip="K of one fitting from the catalogue at this segment's bore, "
                   "referred to the segment velocity."),
    Column("k_override", "K override", quantity="dimensionless", limit="fitting.k_override", optional=True,
           tooltip="Your own K for one fitting, e.g. from a manufacturer; replaces the catalogue K.",
           blank="the catalogue K is used."),
    Column("angle_deg", "Cone angle", quantity="dimensionless", limit="fitting.angle_deg", optional=True,
           tooltip="Included cone angle of a conical reducer or expander, in degrees. Used by reducers and "
                   "expanders only.",
           blank="a sudden reducer or expander (180°); nothing for other fittings."),
    Column("other_diameter_m", "Upstream bore", quantity="diameter", limit="fitting.other_diameter_m",
           optional=True,
           tooltip="Bore on the upstream side of a reducer or expander at this segment's inlet. Used by reducers "
                   "and expanders only.",
           blank="the previous segment's bore in flow order (shown in grey); nothing for other fittings."),
)

_BORE_CHANGE_METHODS = frozenset({"reducer", "expander"})
_ANGLE_HEADER = "Cone angle\n[°]"

def previous_bore_m(project: Project, index: int) -> float | None:
    """The bore upstream of segment ``index`` in flow order (``None`` at a path's start, and
    across the pump), as the engine takes it (:func:`hydraulics.system_curve.upstream_diameters`)."""
    upstream = upstream_diameters(project.segments)
    return upstream[index] if 0 <= index < len(upstream) else None


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
            # The cells read the fitting records, the catalogue, the segment's bore and the
            # bore before it in flow order only: with the same records, just the catalogue K
            # and the grey upstream bore can change (a new bore here or upstream).
            self._project = project
            upstream_changed = previous_bore_m(previous, self._segment) != previous_bore_m(project, self._segment)
            changed_columns = ["other_diameter_m"] if upstream_changed else []
            if upstream_changed or (previous.segments[self._segment].internal_diameter_m
                                    != project.segments[self._segment].internal_diameter_m):
                changed_columns.insert(0, "catalogue_k")
            for key in changed_columns:
                column = self.column_index(key)
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
            if self._method(fitting) in _BORE_CHANGE_METHODS:
                return self._bore_change_k(project, fitting)
            return choices.catalogue_k(fitting.fitting_id, segment.internal_diameter_m)
        return getattr(fitting, column.key)

    @staticmethod
    def _method(fitting: Fitting) -> str | None:
        entry = fittings.fitting_catalogue().get(fitting.fitting_id)
        return None if entry is None else entry.method

    def _bore_change_k(self, project: Project, fitting: Fitting) -> float | None:
        """K of one reducer or expander from the engine, referred to this segment's velocity."""
        assert self._segment is not None
        one = replace(fitting, count=1, k_override=None)
        try:
            return fittings.segment_k_total((one,), project.segments[self._segment].internal_diameter_m,
                                            upstream_diameter_m=previous_bore_m(project, self._segment))
        except ModelError:
            return None

    def derived_hint(self, project: Project, row: int, column: Column) -> str | None:
        fitting = self.items(project)[row]
        if self._method(fitting) not in _BORE_CHANGE_METHODS or self._segment is None:
            return None
        if column.key == "other_diameter_m":
            bore = previous_bore_m(project, self._segment)
            return None if bore is None else display_text(bore, "diameter", self.unit_system)
        if column.key == "angle_deg":
            entry = fittings.fitting_catalogue()[fitting.fitting_id]
            return None if entry.angle_deg is None else f"{plain_number(entry.angle_deg)} (sudden)"
        return None

    def headerData(self, section: int, orientation: Qt.Orientation, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if (orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.DisplayRole
                and 0 <= section < len(self.table_columns) and self.table_columns[section].key == "angle_deg"):
            return _ANGLE_HEADER
        return super().headerData(section, orientation, role)

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
        if column.key in ("angle_deg", "other_diameter_m"):
            return column.tooltip
        return super().cell_tooltip(project, row, column)

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        items = list(self.items(project))
        items[row] = replace(items[row], **{column.key: value})
        return self.with_items(project, items)
