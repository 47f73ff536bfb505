"""The duty bands: the station's flows over a year, each with its time, and what the year costs.

Each row is one band of :attr:`hydraulics.model.Project.duty_profile`: a flow and its hours
per year, or its share of the year, as the profile's time basis says (the time column
changes with it).  Times may add up to a leap year's hours (8784 h) or the whole year; an
edit beyond that is refused naming the bands, and the profile is left as it was.

The columns right of the inputs are calculated: how the solved station meets each band
(:attr:`hydraulics.results.Solution.duty_profile`): the pumps running, the control, the
drive speed, the wire-to-water efficiency, the input power, the specific energy, the hours
run and the energy a year.  They read the solution of the project shown and go blank after
an edit until the next solve; the model computes nothing.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from PySide6.QtCore import QObject, Qt

from app.document import ProjectDocument
from app.table_models.base import Column, ProjectTableModel
from hydraulics.model import DutyBand, Project
from hydraulics.number_format import MISSING, grouped_whole_number, percent_number
from hydraulics.project_edits import new_duty_band, with_duty_band_changes, with_duty_bands
from hydraulics.results import DutyBandResult

JOULES_PER_KWH = 3.6e6
"""1 kWh = 3.6 × 10⁶ J: the engine gives specific energy in kWh/m³, the unit tables store J/m³."""

_FLOW = Column("flow", "Flow", quantity="flow", limit="duty_band.flow_m3_s",
               tooltip="The station flow this band of the year needs (with an annual volume: a pattern, scaled so "
                       "the year's volume is the annual volume).")
_HOURS = Column("hours", "Hours per year", quantity="dimensionless", limit="duty_band.hours",
                tooltip="Hours a year the station sees this flow; all bands together at most a leap year's 8784 h.")
_SHARE = Column("share", "Share of the year", quantity="ratio_percent", limit="duty_band.share",
                tooltip="Share of the year (of 8760 h) the station sees this flow; all bands together at most 100 %.")
_CALCULATED: tuple[Column, ...] = (
    Column("flow_met", "Flow of the year", kind="readonly", quantity="flow",
           tooltip="The band flow the year is computed for: the typed flow, scaled to the annual volume when one "
                   "is given."),
    Column("pumps", "Pumps running", kind="readonly", tooltip="The stage of the run sequence that meets the band."),
    Column("control", "Control", kind="readonly",
           tooltip="Stop–start at fixed speed, variable speed (slowed to the band flow), stop–start at the lowest "
                   "speed, or above capacity."),
    Column("speed", "Speed", kind="readonly", quantity="ratio_percent",
           tooltip="Common speed of the variable-speed pumps where they are slowed; blank: every pump at its own."),
    Column("efficiency", "Overall efficiency", kind="readonly", quantity="ratio_percent",
           tooltip="Wire to water: the hydraulic power of the pumps over the electrical input power (pumps, motors "
                   "and drives)."),
    Column("power", "Input power", kind="readonly", quantity="power", tooltip="Electrical input power while running."),
    Column("specific_energy", "Specific energy", kind="readonly", quantity="specific_energy",
           tooltip="Electrical energy per volume pumped while running."),
    Column("run_hours", "Hours run", kind="readonly", tooltip="Hours a year the pumps run in this band."),
    Column("energy", "kWh a year", kind="readonly", tooltip="Electrical energy drawn in this band a year."),
)


class DutyBandsModel(ProjectTableModel):
    """The bands of the project's duty profile, with how the solved station meets them."""

    def __init__(self, document: ProjectDocument, parent: QObject | None = None) -> None:
        super().__init__(document, parent)
        document.solutionChanged.connect(self._on_solution)

    # ------------------------------------------------------------------ columns and rows
    def columns_for(self, project: Project) -> tuple[Column, ...]:
        time = _HOURS if project.duty_profile.time_basis == "hours" else _SHARE
        return (_FLOW, time) + _CALCULATED

    def items(self, project: Project) -> Sequence[DutyBand]:
        return project.duty_profile.bands

    def with_items(self, project: Project, items: Sequence[Any]) -> Project:
        return with_duty_bands(project, items)

    def new_item(self, project: Project, row: int) -> DutyBand:
        return new_duty_band(project, row)

    def item_word(self) -> str:
        return "band"

    def row_name(self, project: Project, row: int) -> str:
        return f"duty band {row + 1}"

    def field_path(self, row: int, column: Column) -> str:
        return f"duty_profile.bands[{row}].{column.key}"

    def focus_target(self, row: int) -> tuple[str, object]:
        return ("duty", row)

    # ------------------------------------------------------------------ cells
    def band_result(self, project: Project, row: int) -> DutyBandResult | None:
        """The solved band shown in ``row``, when the solution is of ``project``."""
        solution = self.document.solution
        if solution is None or solution.project is not project or solution.duty_profile is None:
            return None
        bands = solution.duty_profile.bands
        return bands[row] if row < len(bands) else None

    def value(self, project: Project, row: int, column: Column) -> Any:
        band = project.duty_profile.bands[row]
        if column.key == "flow":
            return band.flow_m3_s
        if column.key in ("hours", "share"):
            return band.time
        result = self.band_result(project, row)
        if result is None:
            return None
        if column.key == "flow_met":
            return result.flow_m3_s
        if column.key == "pumps":
            return result.pumps or "none"
        if column.key == "control":
            return result.control
        if column.key == "speed":
            return result.speed_ratio
        if column.key == "efficiency":
            return result.efficiency
        if column.key == "power":
            return result.input_power_w
        if column.key == "specific_energy":
            e_s = result.specific_energy_kwh_m3
            return None if e_s is None else e_s * JOULES_PER_KWH
        if column.key == "run_hours":
            return result.run_hours
        return result.energy_kwh

    def display(self, project: Project, row: int, column: Column) -> str:
        if column.key in ("run_hours", "energy"):
            value = self.value(project, row, column)
            return "" if self.band_result(project, row) is None else grouped_whole_number(value)
        if column.key in ("speed", "efficiency"):
            value = self.value(project, row, column)
            if self.band_result(project, row) is None:
                return ""
            return MISSING if value is None else percent_number(value, 1)
        return super().display(project, row, column)

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        if column.key == "flow":
            return with_duty_band_changes(project, row, flow_m3_s=float(value))
        return with_duty_band_changes(project, row, time=float(value))

    # ------------------------------------------------------------------ calculated columns
    def refresh(self) -> None:
        """Follow the project; the calculated columns of every row go blank until the next solve."""
        super().refresh()
        self._announce_calculated()

    def _on_solution(self, _solution: object) -> None:
        self._announce_calculated()

    def _announce_calculated(self) -> None:
        if self.rowCount() == 0 or not self.table_columns:
            return
        first = len(self.table_columns) - len(_CALCULATED)
        self.dataChanged.emit(self.index(0, first), self.index(self.rowCount() - 1, len(self.table_columns) - 1),
                              [Qt.ItemDataRole.DisplayRole])
