"""The installed-pumps table: every pump of the station, P1, P2, …, and how each runs.

The first rows are the arrangement's identical duty and standby pumps, read-only here (their
count, speed and efficiencies are set under "How the station runs it"), so the whole list
shows in one place; the rows after them are the pumps installed beside them
(:attr:`hydraulics.model.Project.other_pumps`), each with its model, role, speed control,
speeds, impeller diameter and motor and drive efficiencies.  The tags are those of
:func:`hydraulics.pump_set.installed_pumps` (the results and the reports use the same).

Every edit goes through :mod:`hydraulics.project_edits` and is checked by the document
(:func:`hydraulics.validation.validate_project`) before it becomes one undo step.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from PySide6.QtCore import QObject

from app.document import ProjectDocument
from app.table_models.base import Column, ProjectTableModel
from hydraulics import project_edits
from hydraulics.model import InstalledPump, Project
from hydraulics.pump_set import SetPump, installed_pumps

ROLE_CHOICES: list[tuple[str | None, str]] = [("duty", "Duty"), ("assist", "Assist"), ("standby", "Standby")]
"""When a pump runs: in normal operation, switched in after the duty pumps, or only for a pump out of service."""

CONTROL_CHOICES: list[tuple[str | None, str]] = [("fixed", "Fixed speed"), ("variable", "Variable speed")]

ARRANGEMENT_ROW_TIP = ("One of the arrangement's identical pumps: set their number, speed and efficiencies under "
                       "\"How the station runs it\".")

_COLUMNS: tuple[Column, ...] = (
    Column("tag", "Pump", kind="readonly", tooltip="The tag the results and reports use."),
    Column("model", "Model", kind="choice", tooltip="One of the project's pump models."),
    Column("role", "Role", kind="choice",
           tooltip="Duty: runs in normal operation. Assist: switched in after the duty pumps when the flow "
                   "needs it. Standby: runs only in place of a pump out of service."),
    Column("control", "Speed control", kind="choice",
           tooltip="Fixed speed runs only at its speed; variable speed may slow down to its lowest speed, "
                   "together with the other variable-speed pumps running."),
    Column("speed_ratio", "Speed", quantity="ratio_percent", limit="arrangement.speed_ratio",
           tooltip="Speed it runs at in the operating points, as a percentage of rated speed "
                   "(a variable-speed pump's highest)."),
    Column("min_speed_ratio", "Lowest speed", quantity="ratio_percent", limit="arrangement.speed_ratio",
           tooltip="Lowest speed of a variable-speed pump, as a percentage of rated speed.",
           blank="a fixed-speed pump: it runs only at its speed."),
    Column("trim_ratio", "Impeller diameter", quantity="ratio_percent", limit="arrangement.trim_ratio",
           tooltip="Impeller diameter as a percentage of the tested one (100 %: not trimmed). The trim is the "
                   "reduction: a diameter of 95 % is a 5 % trim."),
    Column("motor_efficiency", "Motor efficiency", quantity="ratio_percent", limit="arrangement.efficiency"),
    Column("drive_efficiency", "Drive efficiency", quantity="ratio_percent", limit="arrangement.efficiency",
           tooltip="Efficiency of the variable-speed drive; 100 % for a motor direct on line."),
    Column("motor_rating_w", "Motor rating", quantity="power", limit="arrangement.motor_rating_w", optional=True,
           tooltip="The motor's rated output power.",
           blank="no motor chosen yet; the check then gives the non-overloading size only."),
    Column("service_factor", "Service factor", quantity="dimensionless", limit="arrangement.service_factor",
           tooltip="NEMA MG 1 motors 1.0 or 1.15, IEC motors 1.0 (common practice)."),
)

Row = SetPump | InstalledPump
"""A row: an arrangement pump (as the installed list has it) or a pump beside the arrangement's."""


def _arrangement_rows(project: Project) -> list[SetPump]:
    return [p for p in installed_pumps(project) if p.from_arrangement]


class InstalledPumpsModel(ProjectTableModel):
    """Every installed pump; the rows after the arrangement's edit ``project.other_pumps``."""

    def __init__(self, document: ProjectDocument, parent: QObject | None = None) -> None:
        super().__init__(document, parent)

    # ------------------------------------------------------------------ rows
    def available(self) -> bool:
        return self.document.project.arrangement is not None

    def columns_for(self, project: Project) -> tuple[Column, ...]:
        return _COLUMNS

    def items(self, project: Project) -> Sequence[Row]:
        rows: list[Row] = list(_arrangement_rows(project))
        return rows + list(project.other_pumps)

    def arrangement_row_count(self, project: Project | None = None) -> int:
        """Rows at the top that belong to the arrangement (read-only)."""
        return len(_arrangement_rows(self.project if project is None else project))

    def is_arrangement_row(self, row: int) -> bool:
        return 0 <= row < self.arrangement_row_count()

    def with_items(self, project: Project, items: Sequence[Any]) -> Project:
        return project_edits.with_other_pumps(project, [i for i in items if isinstance(i, InstalledPump)])

    def new_item(self, project: Project, row: int) -> InstalledPump:
        others = project.other_pumps
        first = self.arrangement_row_count(project)
        before = others[row - first - 1] if 0 <= row - first - 1 < len(others) else None
        return project_edits.new_other_pump(project, before)

    def item_word(self) -> str:
        return "installed pump"

    def _tag(self, project: Project, row: int) -> str:
        pumps = installed_pumps(project)
        return pumps[row].tag if 0 <= row < len(pumps) else f"row {row + 1}"

    def row_name(self, project: Project, row: int) -> str:
        return f"pump {self._tag(project, row)}"

    def field_path(self, row: int, column: Column) -> str:
        key = "motor_rating" if column.key == "motor_rating_w" else column.key  # the file's name of the field
        return f"other_pumps[{row - self.arrangement_row_count()}].{key}"

    def focus_target(self, row: int) -> tuple[str, object] | None:
        return ("installed_pump", row)

    def insert_row(self, row: int) -> bool:
        """Add a pump beside the arrangement's before ``row`` (never among the arrangement's rows)."""
        if not self.available():
            self.document.refuse("Cannot add an installed pump: the project has no pump arrangement yet; "
                                 "import or add a pump first")
            return False
        return super().insert_row(max(row, self.arrangement_row_count()))

    def remove_rows(self, rows: Sequence[int]) -> bool:
        """Remove pumps beside the arrangement's; the arrangement's own are counted under its fields."""
        if any(self.is_arrangement_row(r) for r in rows):
            tags = ", ".join(self._tag(self.project, r) for r in sorted(set(rows)) if self.is_arrangement_row(r))
            self.document.refuse(f"Cannot remove {tags}: the arrangement's pumps are set by its duty and standby "
                                 "counts under \"How the station runs it\"")
            return False
        return super().remove_rows(rows)

    def move_row(self, row: int, offset: int) -> bool:
        """Move a pump beside the arrangement's; the arrangement's own stay first."""
        if self.is_arrangement_row(row) or self.is_arrangement_row(row + offset):
            return False
        return super().move_row(row, offset)

    # ------------------------------------------------------------------ cells
    def cell_editable(self, project: Project, row: int, column: Column) -> bool:
        if not column.editable or self.is_arrangement_row(row):
            return False
        if column.key == "min_speed_ratio":
            item = self.items(project)[row]
            return isinstance(item, InstalledPump) and item.variable_speed
        return True

    def value(self, project: Project, row: int, column: Column) -> Any:
        item = self.items(project)[row]
        key = column.key
        if key == "tag":
            return self._tag(project, row)
        if key == "model":
            return item.pump_id
        if key == "control":
            return "variable" if item.variable_speed else "fixed"
        if key == "min_speed_ratio" and not item.variable_speed:
            return None  # a fixed-speed pump has no lowest speed: the cell stays blank
        return getattr(item, key)

    def choices(self, project: Project, row: int, column: Column) -> list[tuple[str | None, str]]:
        if column.key == "model":
            return [(p.pump_id, p.name) for p in project.pumps]
        if column.key == "role":
            return ROLE_CHOICES
        if column.key == "control":
            return CONTROL_CHOICES
        return []

    def cell_tooltip(self, project: Project, row: int, column: Column) -> str | None:
        if self.is_arrangement_row(row):
            return ARRANGEMENT_ROW_TIP
        if column.key == "min_speed_ratio" and not self.cell_editable(project, row, column):
            return "A fixed-speed pump runs only at its speed; choose variable speed to give a lowest speed."
        return super().cell_tooltip(project, row, column)

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        index = row - self.arrangement_row_count(project)
        key = column.key
        if key == "model":
            return project_edits.with_other_pump_changes(project, index, pump_id=value)
        if key == "control":
            return project_edits.with_other_pump_changes(project, index, variable_speed=value == "variable")
        return project_edits.with_other_pump_changes(project, index, **{key: value})
