"""The operating-points table: one row per scenario and number of pumps running.

:class:`OperatingPointsModel` is a read-only table model over the solution's operating
points (SI values), shown in the unit system chosen; :class:`OperatingPointsTable` is the
view.  A scenario with no operating point shows the engine's reason across the value
columns.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from typing import Any

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt
from PySide6.QtWidgets import QAbstractItemView, QHeaderView, QTableView, QWidget

from app.results import scenarios
from hydraulics.number_format import MISSING, readout_number
from hydraulics.results import OperatingPoint, Solution
from hydraulics.units import to_display, unit_label

SI_VALUE_ROLE = Qt.ItemDataRole.UserRole + 1
"""Role returning the stored value of a cell (SI float, fraction, int, bool or text)."""

Index = QModelIndex | QPersistentModelIndex
CellValue = str | int | float | bool | None
"""What a column reads from an operating point (SI float, fraction, int, bool or text)."""


@dataclass(frozen=True)
class Column:
    """One column: its title, the quantity of its values (for units) and how to read them.

    ``quantity`` names a :mod:`hydraulics.units` quantity converted to display units;
    ``"percent"`` shows a fraction as a percentage; ``None`` shows the value as it is.
    """

    title: str
    quantity: str | None
    read: Callable[[OperatingPoint], CellValue]
    significant: int = 4
    max_decimals: int = 3
    tooltip: str = ""


COLUMNS: tuple[Column, ...] = (
    Column("Scenario", None, scenarios.scenario_phrase, tooltip="Static-head extreme and pipe state"),
    Column("Pumps\nrunning", None, lambda p: p.pumps_running, tooltip="Identical pumps running in parallel"),
    Column("Speed", "percent", lambda p: p.speed_ratio, 3, 1, "Speed as a percentage of rated speed"),
    Column("Flow", "flow", lambda p: p.flow_m3_s, tooltip="Station flow"),
    Column("Flow per\npump", "flow", lambda p: p.flow_per_pump_m3_s),
    Column("Head", "head", lambda p: p.head_m, tooltip="Total head of the station at the operating point"),
    Column("Efficiency", "percent", lambda p: p.efficiency, 3, 1, "Pump efficiency at the operating point"),
    Column("Shaft power\ntotal", "power", lambda p: p.shaft_power_total_w, tooltip="Shaft power of all pumps running"),
    Column("Input power", "power", lambda p: p.input_power_w, tooltip="Electrical input power of all pumps running"),
    Column("Specific\nenergy", "specific_energy", lambda p: p.specific_energy_kwh_m3, 3, 4,
           "Electrical energy per volume pumped"),
    Column("NPSH\navailable", "head", lambda p: p.npsh_available_m),
    Column("NPSH\nrequired", "head", lambda p: p.npsh_required_m),
    Column("NPSH\nmargin", "head", lambda p: p.npsh_margin_m, tooltip="NPSH available − NPSH required"),
    Column("NPSH\nratio", None, lambda p: p.npsh_margin_ratio, 3, 2, "NPSH available / NPSH required"),
    Column("Share of\nBEP flow", "percent", lambda p: p.bep_flow_ratio, 3, 0,
           "Flow per pump as a percentage of the best-efficiency flow"),
    Column("Extrapolated", None, lambda p: p.extrapolated, tooltip="Operating point beyond the pump's tested data"),
)

FIRST_VALUE_COLUMN = 3
"""Columns from here on hold values; a row without an operating point spans them."""


def _specific_energy_si(value_kwh_m3: float) -> float:
    """kWh/m³ (as the engine reports specific energy) to J/m³, the stored unit of the quantity."""
    return value_kwh_m3 * 3.6e6


_ROLES_ANSWERED = frozenset(int(r) for r in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.ToolTipRole,
                                              Qt.ItemDataRole.TextAlignmentRole, SI_VALUE_ROLE))
_ALIGN_LEFT = int(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter)
_ALIGN_RIGHT = int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)


class OperatingPointsModel(QAbstractTableModel):
    """Read-only table of operating points in display units."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self._points: list[OperatingPoint] = []
        self._found: list[bool] = []
        self._display_cache: dict[tuple[int, int], str] = {}
        self._unit_system = "SI"

    # ------------------------------------------------------------------ public API
    def set_points(self, points: Iterable[OperatingPoint], unit_system: str = "SI") -> None:
        """Show ``points`` in ``unit_system``."""
        self.beginResetModel()
        self._points = list(points)
        self._found = [bool(scenarios.found_points([p])) for p in self._points]
        self._display_cache = {}
        self._unit_system = unit_system
        self.endResetModel()

    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Show the operating points of ``solution`` (``None`` empties the table)."""
        self.set_points([] if solution is None else scenarios.ordered_points(solution), unit_system)

    def point(self, row: int) -> OperatingPoint:
        """The operating point shown in ``row``."""
        return self._points[row]

    def is_found(self, row: int) -> bool:
        """True when ``row`` holds an operating point (not only a reason)."""
        return self._found[row]

    # ------------------------------------------------------------------ Qt model
    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008 - Qt signature
        return 0 if parent.isValid() else len(self._points)

    def columnCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(COLUMNS)

    def flags(self, index: Index) -> Qt.ItemFlag:
        if not index.isValid():
            return Qt.ItemFlag.NoItemFlags
        return Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsSelectable

    def headerData(self, section: int, orientation: Qt.Orientation, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if orientation == Qt.Orientation.Horizontal and 0 <= section < len(COLUMNS):
            column = COLUMNS[section]
            if role == Qt.ItemDataRole.DisplayRole:
                unit = self._unit_text(column)
                return f"{column.title}\n{unit}" if unit else column.title
            if role == Qt.ItemDataRole.ToolTipRole:
                return column.tooltip or None
            return None
        if orientation == Qt.Orientation.Vertical and role == Qt.ItemDataRole.DisplayRole \
                and 0 <= section < len(self._points):
            return str(section + 1)
        return None

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if int(role) not in _ROLES_ANSWERED:  # the view asks for many roles per cell; most have no answer
            return None
        if not index.isValid() or not (0 <= index.row() < len(self._points)) \
                or not (0 <= index.column() < len(COLUMNS)):
            return None
        point = self._points[index.row()]
        column = COLUMNS[index.column()]
        found = self._found[index.row()]
        if role == Qt.ItemDataRole.DisplayRole:
            key = (index.row(), index.column())
            text = self._display_cache.get(key)
            if text is None:
                text = self._display_cache[key] = self._display(point, column, index.column(), found)
            return text
        if role == Qt.ItemDataRole.ToolTipRole:
            if not found:
                return f"No operating point: {scenarios.reason_text(point, self._unit_system)}"
            if index.column() == 0:
                return scenarios.point_label(point, with_speed=True)
            return column.tooltip or None
        if role == Qt.ItemDataRole.TextAlignmentRole:
            if index.column() == 0 or (not found and index.column() == FIRST_VALUE_COLUMN):
                return _ALIGN_LEFT
            return _ALIGN_RIGHT
        if role == SI_VALUE_ROLE:
            return column.read(point)
        return None

    # ------------------------------------------------------------------ formatting
    def _unit_text(self, column: Column) -> str:
        if column.quantity is None:
            return ""
        if column.quantity == "percent":
            return "%"
        return unit_label(column.quantity, self._unit_system)

    def _display(self, point: OperatingPoint, column: Column, column_index: int, found: bool) -> str:
        value = column.read(point)
        if column_index >= FIRST_VALUE_COLUMN and not found:
            if column_index == FIRST_VALUE_COLUMN:
                return f"No operating point: {scenarios.reason_text(point, self._unit_system)}"
            return ""
        if column_index == 0:
            return str(value)
        if column.title == "Extrapolated":
            return "yes" if value else "no"
        if column.title.startswith("Pumps"):
            return MISSING if value is None else str(int(value))
        if not isinstance(value, (int, float)) or not math.isfinite(value):
            return MISSING
        number = float(value)
        if column.quantity == "percent":
            number *= 100.0
        elif column.quantity == "specific_energy":
            number = to_display(_specific_energy_si(number), "specific_energy", self._unit_system)
        elif column.quantity is not None:
            number = to_display(number, column.quantity, self._unit_system)
        return readout_number(number, column.significant, column.max_decimals)


class OperatingPointsTable(QTableView):
    """Read-only view of :class:`OperatingPointsModel`; rows without a point span their reason."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self.points_model = OperatingPointsModel(self)
        self.setModel(self.points_model)
        self.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.setAlternatingRowColors(True)
        self.setWordWrap(False)
        self.setCornerButtonEnabled(False)
        header = self.horizontalHeader()
        header.setDefaultAlignment(Qt.AlignmentFlag.AlignCenter)
        header.setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        self.verticalHeader().setVisible(False)
        self.points_model.modelReset.connect(self._update_spans)
        self._sized_for: tuple[int, str] | None = None

    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Show the operating points of ``solution`` in ``unit_system``.

        Columns are sized to their contents when the rows or the units change, not on
        every solve (measuring every cell on each edit would slow the live redraw).
        """
        self.points_model.show_solution(solution, unit_system)
        shape = (self.points_model.rowCount(), unit_system)
        if shape != self._sized_for:
            self._sized_for = shape
            self.resizeColumnsToContents()

    def select_scenario(self, scenario: object) -> bool:
        """Select the row of ``(static, pipe, pumps_running, speed_ratio)``; False if not shown."""
        if not (isinstance(scenario, tuple) and len(scenario) == 4):
            return False
        static, pipe, pumps, speed = scenario
        for row in range(self.points_model.rowCount()):
            point = self.points_model.point(row)
            if (point.static == static and point.pipe == pipe and point.pumps_running == pumps
                    and abs(point.speed_ratio - float(speed)) < 1e-9):
                self.selectRow(row)
                self.scrollTo(self.points_model.index(row, 0))
                return True
        return False

    def _update_spans(self) -> None:
        self.clearSpans()
        span = len(COLUMNS) - FIRST_VALUE_COLUMN
        for row in range(self.points_model.rowCount()):
            if not self.points_model.is_found(row):
                self.setSpan(row, FIRST_VALUE_COLUMN, 1, span)
