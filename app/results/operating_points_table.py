"""The operating-points table: one row per scenario and set of pumps running.

:class:`OperatingPointsModel` is a read-only table model over the solution's operating
points (SI values), shown in the unit system chosen; :class:`OperatingPointsTable` is the
view.  A scenario with no operating point shows the engine's reason across the value
columns.  "Pumps running" names the pumps by their tags (P1, P2, …).

Where pumps of other models are installed, each set of pumps running together
(:attr:`hydraulics.results.PumpSetResult.points`) follows the ordinary rows of its scenario:
one row for the set (station flow, manifold head, input power, specific energy), then one
indented row per running pump with what that pump does (its flow in "Flow per pump", its
own head, efficiency, powers, NPSH and share of best-efficiency flow).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from typing import Any

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt
from PySide6.QtGui import QBrush, QColor
from PySide6.QtWidgets import QAbstractItemView, QHeaderView, QTableView, QWidget

from app.results import scenarios
from hydraulics.number_format import MISSING, readout_number
from hydraulics.results import OperatingPoint, PumpSetPoint, PumpShare, Solution
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
    read_set: Callable[[PumpSetPoint], CellValue] | None = None
    """What a pump-set row shows here (``None``: nothing)."""
    read_share: Callable[[PumpShare], CellValue] | None = None
    """What the row of one pump of a set shows here (``None``: nothing)."""


COLUMNS: tuple[Column, ...] = (
    Column("Scenario", None, scenarios.scenario_phrase, tooltip="Static-head extreme and pipe state",
           read_set=scenarios.pump_set_phrase, read_share=scenarios.pump_share_phrase),
    Column("Pumps\nrunning", None, lambda p: p.pumps_running, tooltip="The pumps running (tags as in Pumps)",
           read_set=lambda s: s.label),
    Column("Speed", "percent", lambda p: p.speed_ratio, 3, 1, "Speed as a percentage of rated speed",
           read_share=lambda s: s.speed_ratio),
    Column("Flow", "flow", lambda p: p.flow_m3_s, tooltip="Station flow", read_set=lambda s: s.flow_m3_s),
    Column("Head", "head", lambda p: p.head_m,
           tooltip="Total head of the station at the operating point (of a set: at the manifold; of one "
                   "pump of a set: its own head)",
           read_set=lambda s: s.manifold_head_m, read_share=lambda s: s.head_m),
    Column("Efficiency", "percent", lambda p: p.efficiency, 3, 1, "Pump efficiency at the operating point",
           read_share=lambda s: s.efficiency),
    Column("Input power", "power", lambda p: p.input_power_w,
           tooltip="Electrical input power of all pumps running (of one pump of a set: its own)",
           read_set=lambda s: s.input_power_w, read_share=lambda s: s.input_power_w),
    Column("NPSH\nmargin", "head", lambda p: p.npsh_margin_m, tooltip="NPSH available − NPSH required",
           read_share=lambda s: s.npsh_margin_m),
    Column("Share of\nBEP flow", "percent", lambda p: p.bep_flow_ratio, 3, 0,
           "Flow per pump as a percentage of the best-efficiency flow", read_share=lambda s: s.bep_flow_ratio),
    Column("Flow per\npump", "flow", lambda p: p.flow_per_pump_m3_s, read_share=lambda s: s.flow_m3_s),
    Column("Shaft power\ntotal", "power", lambda p: p.shaft_power_total_w,
           tooltip="Shaft power of all pumps running (of one pump of a set: its own)",
           read_share=lambda s: s.shaft_power_w),
    Column("Specific\nenergy", "specific_energy", lambda p: p.specific_energy_kwh_m3, 3, 4,
           "Electrical energy per volume pumped", read_set=lambda s: s.specific_energy_kwh_m3),
    Column("NPSH\navailable", "head", lambda p: p.npsh_available_m, read_share=lambda s: s.npsh_available_m),
    Column("NPSH\nrequired", "head", lambda p: p.npsh_required_m, read_share=lambda s: s.npsh_required_m),
    Column("NPSH\nratio", None, lambda p: p.npsh_margin_ratio, 3, 2, "NPSH available / NPSH required"),
    Column("Extrapolated", None, lambda p: p.extrapolated, tooltip="Operating point beyond the pump's tested data",
           read_share=lambda s: s.extrapolated),
)
"""Key columns first (scenario, pumps, speed, flow, head, efficiency, input power, NPSH margin, share of
best-efficiency flow), so they are in view at the default window size; the rest follow."""

FIRST_VALUE_COLUMN = 3
"""Columns from here on hold values; a row without an operating point spans them."""


def _specific_energy_si(value_kwh_m3: float) -> float:
    """kWh/m³ (as the engine reports specific energy) to J/m³, the stored unit of the quantity."""
    return value_kwh_m3 * 3.6e6


Row = OperatingPoint | PumpSetPoint | PumpShare
"""A row: an ordinary operating point, a set of pumps of different models, or one pump of that set."""

_ROLES_ANSWERED = frozenset(int(r) for r in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.ToolTipRole,
                                              Qt.ItemDataRole.TextAlignmentRole, Qt.ItemDataRole.BackgroundRole,
                                              SI_VALUE_ROLE))
_ALIGN_LEFT = int(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter)
_ALIGN_RIGHT = int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
PUMP_SET_BACKGROUND = QBrush(QColor("#EAF0F8"))
"""Behind a pump set and its pumps' rows, so each set reads as one block."""
PUMP_SET_TIP = ("Pumps of different models in parallel at the manifold head. The indented rows below give "
                "each running pump's own flow, head, efficiency, power, NPSH and share of best-efficiency flow.")


class OperatingPointsModel(QAbstractTableModel):
    """Read-only table of operating points in display units."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self._rows: list[Row] = []
        self._found: list[bool] = []
        self._display_cache: dict[tuple[int, int], str] = {}
        self._unit_system = "SI"
        self._tags: Callable[[int], str] | None = None

    # ------------------------------------------------------------------ public API
    def set_points(self, points: Iterable[OperatingPoint], unit_system: str = "SI",
                   pump_sets: Iterable[PumpSetPoint] = (), tags: Callable[[int], str] | None = None) -> None:
        """Show ``points`` in ``unit_system``, each pump set of ``pump_sets`` after its scenario's points.

        ``tags`` names the pumps running of an ordinary point from their number (``None``: the number).
        """
        self.beginResetModel()
        self._rows = list(scenarios.rows_with_pump_sets(list(points), list(pump_sets)))
        self._found = [self._row_found(r) for r in self._rows]
        self._display_cache = {}
        self._unit_system = unit_system
        self._tags = tags
        self.endResetModel()

    @staticmethod
    def _row_found(row: Row) -> bool:
        if isinstance(row, OperatingPoint):
            return bool(scenarios.found_points([row]))
        if isinstance(row, PumpSetPoint):
            return row.found
        return True

    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Show the operating points of ``solution`` (``None`` empties the table)."""
        if solution is None:
            self.set_points([], unit_system)
            return
        pump_set = solution.pump_set
        self.set_points(scenarios.ordered_points(solution), unit_system,
                        () if pump_set is None else pump_set.points,
                        None if pump_set is None else pump_set.running_label)

    def row_item(self, row: int) -> Row:
        """What ``row`` shows: an operating point, a pump set or one pump of a set."""
        return self._rows[row]

    def point(self, row: int) -> OperatingPoint | None:
        """The ordinary operating point shown in ``row`` (``None`` on a pump-set row)."""
        item = self._rows[row]
        return item if isinstance(item, OperatingPoint) else None

    def is_found(self, row: int) -> bool:
        """True when ``row`` holds an operating point (not only a reason)."""
        return self._found[row]

    # ------------------------------------------------------------------ Qt model
    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008 - Qt signature
        return 0 if parent.isValid() else len(self._rows)

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
                and 0 <= section < len(self._rows):
            return str(section + 1)
        return None

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if int(role) not in _ROLES_ANSWERED:  # the view asks for many roles per cell; most have no answer
            return None
        if not index.isValid() or not (0 <= index.row() < len(self._rows)) \
                or not (0 <= index.column() < len(COLUMNS)):
            return None
        row = self._rows[index.row()]
        column = COLUMNS[index.column()]
        found = self._found[index.row()]
        if role == Qt.ItemDataRole.DisplayRole:
            key = (index.row(), index.column())
            text = self._display_cache.get(key)
            if text is None:
                text = self._display_cache[key] = self._display(row, column, index.column(), found)
            return text
        if role == Qt.ItemDataRole.ToolTipRole:
            tip = self._tooltip(row, column, index.column(), found)
            if found and index.column() >= 1:
                shown = self.data(index, Qt.ItemDataRole.DisplayRole)
                meaning = _blank_meaning(row, str(shown))
                if meaning:
                    return meaning + (f"\n\n{tip}" if tip else "")
            return tip
        if role == Qt.ItemDataRole.TextAlignmentRole:
            if index.column() == 0 or (not found and index.column() == FIRST_VALUE_COLUMN):
                return _ALIGN_LEFT
            return _ALIGN_RIGHT
        if role == Qt.ItemDataRole.BackgroundRole:
            return None if isinstance(row, OperatingPoint) else PUMP_SET_BACKGROUND
        if role == SI_VALUE_ROLE:
            return _read(row, column)
        return None

    # ------------------------------------------------------------------ formatting
    def _tooltip(self, row: Row, column: Column, column_index: int, found: bool) -> str | None:
        if isinstance(row, OperatingPoint):
            if not found:
                return f"No operating point: {scenarios.reason_text(row, self._unit_system)}"
            if column_index == 0:
                return scenarios.point_label(row, with_speed=True)
            return column.tooltip or None
        if isinstance(row, PumpSetPoint):
            if not found:
                return f"No operating point: {row.reason or 'not found'}"
            if column_index <= 1:
                basis = "" if row.basis == "run sequence" else f" ({row.basis})"
                return f"{row.label}: {scenarios.pump_set_phrase(row)}{basis}. {PUMP_SET_TIP}"
            return column.tooltip or None
        if column_index == 0 and row.shut_off:
            return (f"{row.tag} cannot open its check valve against the manifold head: it delivers nothing and "
                    "runs at shut-off.")
        return column.tooltip or None

    def _unit_text(self, column: Column) -> str:
        if column.quantity is None:
            return ""
        if column.quantity == "percent":
            return "%"
        return unit_label(column.quantity, self._unit_system)

    def _display(self, row: Row, column: Column, column_index: int, found: bool) -> str:
        value = _read(row, column)
        if column_index >= FIRST_VALUE_COLUMN and not found:
            if column_index == FIRST_VALUE_COLUMN:
                reason = (scenarios.reason_text(row, self._unit_system) if isinstance(row, OperatingPoint)
                          else (row.reason if isinstance(row, PumpSetPoint) else None) or "not found")
                return f"No operating point: {reason}"
            return ""
        if column_index == 0:
            return "" if value is None else str(value)
        if column.title == "Extrapolated":
            if value is None:
                return ""
            return "yes" if value else "no"
        if column.title.startswith("Pumps"):
            if isinstance(row, OperatingPoint):
                if value is None or not isinstance(value, int):
                    return MISSING
                return self._tags(value) if self._tags is not None else str(value)
            return "" if value is None else str(value)
        if value is None and not isinstance(row, OperatingPoint) and _reader(row, column) is None:
            return ""  # nothing of this kind for a set or one pump of it
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


BLANK_ON_SET_ROW = "Blank: not a value of the set as a whole; the rows of its running pumps below give their own."
BLANK_ON_PUMP_ROW = "Blank: a value of the whole set, given on the set's row above."
MISSING_MEANING = (f"{MISSING}: no value here — the pump data give none for it (no efficiency, power or NPSH "
                   "required points), or it cannot be computed at this point.")


def _blank_meaning(row: Row, shown: str) -> str:
    """What a blank or "—" cell of ``row`` means (for its tooltip); ``""`` for a cell with a value."""
    if shown == MISSING:
        return MISSING_MEANING
    if shown:
        return ""
    if isinstance(row, PumpSetPoint):
        return BLANK_ON_SET_ROW
    if isinstance(row, PumpShare):
        return BLANK_ON_PUMP_ROW
    return ""


def _reader(row: Row, column: Column) -> Callable[[Any], CellValue] | None:
    if isinstance(row, OperatingPoint):
        return column.read
    if isinstance(row, PumpSetPoint):
        return column.read_set
    return column.read_share


def _read(row: Row, column: Column) -> CellValue:
    read = _reader(row, column)
    return None if read is None else read(row)


MAX_SCENARIO_WIDTH = 300
"""Widest the scenario column is sized to its contents (px)."""


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
            if self.columnWidth(0) > MAX_SCENARIO_WIDTH:  # long set descriptions: elided, whole in the tooltip
                self.setColumnWidth(0, MAX_SCENARIO_WIDTH)

    def select_scenario(self, scenario: object) -> bool:
        """Select the row of ``(static, pipe, pumps_running, speed_ratio)``; False if not shown."""
        if not (isinstance(scenario, tuple) and len(scenario) == 4):
            return False
        static, pipe, pumps, speed = scenario
        for row in range(self.points_model.rowCount()):
            point = self.points_model.point(row)
            if point is not None and (point.static == static and point.pipe == pipe and point.pumps_running == pumps
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
