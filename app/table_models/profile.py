"""The profile table of the main: chainage, pipe elevation and air valve at each point.

Chainage runs along the common delivery pipework (the station-flow delivery segments in
table order, laid end to end from 0 at the first of them); the pipe elevation is linear
between points; an air valve marks a vented summit.  Chainages must increase from row to
row: an edit that breaks the order is refused with the point named, and the profile is
left as it was.  A profile has no points or at least two, so the first row added to an
empty table brings a second one with it (the start and the end of the main).
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from app.table_models import choices
from app.table_models.base import Column, ProjectTableModel
from hydraulics.model import ProfilePoint, Project
from hydraulics.project_edits import new_profile_point, starting_profile, with_profile, with_profile_point_changes

_COLUMNS: tuple[Column, ...] = (
    Column("chainage", "Chainage", quantity="length", limit="profile.chainage_m",
           tooltip="Distance along the common delivery pipework from 0 at the first station delivery "
                   "segment; increasing from row to row."),
    Column("elevation", "Pipe elevation", quantity="elevation", limit="profile.elevation_m",
           tooltip="Elevation of the pipe at this chainage, on the project's datum."),
    Column("air_valve", "Air valve", kind="choice",
           tooltip="Yes: a vented summit (an air valve admits air, so the grade line cannot fall below the pipe "
                   "there and the summit may govern the system head)."),
)

_ATTRIBUTES = {"chainage": "chainage_m", "elevation": "elevation_m"}


class ProfileModel(ProjectTableModel):
    """The points of the main's longitudinal profile (``Project.profile``)."""

    def columns_for(self, project: Project) -> tuple[Column, ...]:
        return _COLUMNS

    def rows_source(self, project: Project) -> tuple[ProfilePoint, ...]:
        return project.profile

    def items(self, project: Project) -> Sequence[ProfilePoint]:
        return project.profile

    def with_items(self, project: Project, items: Sequence[Any]) -> Project:
        return with_profile(project, items)

    def item_word(self) -> str:
        return "point"

    def row_name(self, project: Project, row: int) -> str:
        return f"profile point {row + 1}"

    def field_path(self, row: int, column: Column) -> str:
        return f"profile[{row}].{column.key}"

    def focus_target(self, row: int) -> tuple[str, object]:
        return ("profile", row)

    def new_item(self, project: Project, row: int) -> ProfilePoint:
        return new_profile_point(project, row)

    def insert_row(self, row: int) -> bool:
        """Insert a point before ``row``; into an empty profile, its first two points."""
        if self.project.profile:
            return super().insert_row(row)
        return self.document.apply(with_profile(self.project, starting_profile(self.project)),
                                   "Start the profile of the main", self.focus_target(0))

    # ------------------------------------------------------------------ cells
    def value(self, project: Project, row: int, column: Column) -> Any:
        point = project.profile[row]
        if column.key == "air_valve":
            return "yes" if point.air_valve else "no"
        return getattr(point, _ATTRIBUTES[column.key])

    def choices(self, project: Project, row: int, column: Column) -> list[tuple[str | None, str]]:
        return choices.AIR_VALVE_CHOICES if column.key == "air_valve" else []

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        if column.key == "air_valve":
            return with_profile_point_changes(project, row, air_valve=value == "yes")
        return with_profile_point_changes(project, row, **{_ATTRIBUTES[column.key]: float(value)})
