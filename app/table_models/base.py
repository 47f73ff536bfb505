"""The shared table model: columns declared as data over a list inside the project.

A :class:`ProjectTableModel` never holds data of its own: it keeps a reference to the
document's current immutable :class:`~hydraulics.model.Project` and shows one of its
lists (segments, fittings of a segment, points of a pump).  An edit builds a candidate
project and hands it to :meth:`ProjectDocument.apply`, which validates it and pushes one
undo command; a refused value leaves the project untouched and the document reports why.

Subclasses say which list they show and how to rebuild the project with one value (or
one list) changed; parsing, unit handling, ranges, headers, insert/remove/move and
block paste live here once.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QObject, QPersistentModelIndex, Qt
from PySide6.QtGui import QBrush, QColor

from app.document import ProjectDocument
from app.table_models.cells import (
    DISPLAY_DIGITS,
    CellError,
    display_text,
    edit_text,
    parse_choice,
    parse_value,
    range_text,
    same_value,
    unit_suffix,
)
from hydraulics.model import Project
from hydraulics.validation import LIMITS

ModelIndex = QModelIndex | QPersistentModelIndex
_TOP_LEVEL = QModelIndex()
"""The invalid index Qt passes as the parent of a flat table's rows."""

CALCULATED_DIGITS = 3
"""Significant digits of calculated (read-only) values."""

READ_ONLY_BACKGROUND = QBrush(QColor("#F2F2F2"))
DERIVED_FOREGROUND = QBrush(QColor("#707070"))


@dataclass(frozen=True)
class Column:
    """One column of a table.

    ``kind`` is ``"number"`` (typed with units, checked against ``LIMITS[limit]``),
    ``"text"``, ``"choice"`` (a drop-down; see :meth:`ProjectTableModel.choices`) or
    ``"readonly"`` (a derived value shown for information).  ``quantity`` names the
    kind of value for units (:mod:`hydraulics.units`); ``optional`` numbers may be left
    blank (``None`` in the model).
    """

    key: str
    title: str
    kind: str = "number"
    quantity: str | None = None
    limit: str | None = None
    optional: bool = False
    tooltip: str = ""
    blank: str = ""
    """What a blank cell of this column means (said in the tooltips), e.g. "the catalogue K is used"."""

    @property
    def editable(self) -> bool:
        return self.kind != "readonly"


_ROLES_ANSWERED = frozenset(int(r) for r in (
    Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.EditRole, Qt.ItemDataRole.TextAlignmentRole,
    Qt.ItemDataRole.BackgroundRole, Qt.ItemDataRole.ForegroundRole, Qt.ItemDataRole.ToolTipRole))
_ALIGN_LEFT = int(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter)
_ALIGN_RIGHT = int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
_READ_ONLY_FLAGS = Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsSelectable
_EDITABLE_FLAGS = _READ_ONLY_FLAGS | Qt.ItemFlag.ItemIsEditable


class ProjectTableModel(QAbstractTableModel):
    """A table over one list of the document's project (see module docstring)."""

    def __init__(self, document: ProjectDocument, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._document = document
        self._project: Project = document.project
        self._row_count = self._count(self._project)
        self._columns: tuple[Column, ...] = self.columns_for(self._project)
        document.projectReplaced.connect(self.reset)
        document.projectChanged.connect(self.refresh)
        document.unitSystemChanged.connect(self._on_units_changed)

    # ------------------------------------------------------------------ to override
    def columns_for(self, project: Project) -> tuple[Column, ...]:
        """The columns shown for ``project`` (may depend on e.g. the friction method)."""
        raise NotImplementedError

    def items(self, project: Project) -> Sequence[Any]:
        """The records shown as rows."""
        raise NotImplementedError

    def rows_source(self, project: Project) -> Any:
        """The one model object every cell of ``project`` is read from, if there is one.

        When it is the very same object in the old and the new project (an edit elsewhere
        in the frozen model), no cell can have changed and :meth:`refresh` announces
        nothing.  ``None`` (the default) means no such object: the rows are compared.
        """
        return None

    def value(self, project: Project, row: int, column: Column) -> Any:
        """The stored value of one cell (SI float, text, choice value or ``None``)."""
        raise NotImplementedError

    def with_value(self, project: Project, row: int, column: Column, value: Any) -> Project:
        """``project`` with one cell set to ``value`` (already parsed and range-checked)."""
        raise NotImplementedError

    def with_items(self, project: Project, items: Sequence[Any]) -> Project:
        """``project`` with the whole list replaced by ``items``."""
        raise NotImplementedError

    def new_item(self, project: Project, row: int) -> Any:
        """A record to insert at ``row`` (a sensible copy of a neighbour)."""
        raise NotImplementedError

    def row_name(self, project: Project, row: int) -> str:
        """How messages name a row: ``"segment 2 'Rising main'"``."""
        return f"row {row + 1}"

    def field_path(self, row: int, column: Column) -> str:
        """Dotted path of a cell for messages and ModelError."""
        return f"{column.key}[{row}]"

    def focus_target(self, row: int) -> tuple[str, object] | None:
        """What undo/redo of an edit in ``row`` should bring into view."""
        return None

    def choices(self, project: Project, row: int, column: Column) -> list[tuple[str | None, str]]:
        """``(value, label)`` pairs offered by a choice column in ``row``."""
        return []

    def cell_editable(self, project: Project, row: int, column: Column) -> bool:
        """Whether one cell may be edited (a column may be editable only on some rows)."""
        return column.editable

    def derived_hint(self, project: Project, row: int, column: Column) -> str | None:
        """Grey text shown in an empty optional cell (a value from a catalogue)."""
        return None

    def min_rows(self) -> int:
        """Rows that must remain (removing below it is refused)."""
        return 0

    def item_word(self) -> str:
        """A word for one row in undo texts ("segment", "fitting", "point")."""
        return "row"

    def can_extend(self) -> bool:
        """Whether a paste beyond the last row adds rows."""
        return True

    def available(self) -> bool:
        """Whether the model currently shows a list at all (e.g. a segment is selected)."""
        return True

    # ------------------------------------------------------------------ public helpers
    @property
    def document(self) -> ProjectDocument:
        return self._document

    @property
    def project(self) -> Project:
        return self._project

    @property
    def unit_system(self) -> str:
        return self._document.unit_system

    @property
    def table_columns(self) -> tuple[Column, ...]:
        return self._columns

    def column_index(self, key: str) -> int:
        """Index of the column with ``key``."""
        for i, column in enumerate(self._columns):
            if column.key == key:
                return i
        raise KeyError(key)

    def refresh(self) -> None:
        """Follow the document's project with the precise row signals.

        A pure insertion or removal of rows (the other rows unchanged, as for insert,
        delete and their undo) is announced as such, so views keep their selection; a
        change of row count together with other rows changing (a paste that adds rows)
        resets the model; otherwise the cells are announced as changed.
        """
        project = self._document.project
        columns = self.columns_for(project)
        if columns != self._columns:
            self.reset()
            return
        source = self.rows_source(project)
        if source is not None and source is self.rows_source(self._project):
            self._project = project
            return
        old = tuple(self.items(self._project)) if self._row_count else ()
        new = tuple(self.items(project))
        if len(old) != self._row_count:
            self.reset()
            return
        prefix = 0
        while prefix < min(len(old), len(new)) and old[prefix] == new[prefix]:
            prefix += 1
        suffix = 0
        while (suffix < min(len(old), len(new)) - prefix
               and old[len(old) - 1 - suffix] == new[len(new) - 1 - suffix]):
            suffix += 1
        old_middle = len(old) - prefix - suffix
        new_middle = len(new) - prefix - suffix
        if len(new) > len(old):
            if old_middle:
                self.reset()
                return
            self.beginInsertRows(QModelIndex(), prefix, prefix + new_middle - 1)
            self._project, self._row_count = project, len(new)
            self.endInsertRows()
        elif len(new) < len(old):
            if new_middle:
                self.reset()
                return
            self.beginRemoveRows(QModelIndex(), prefix, prefix + old_middle - 1)
            self._project, self._row_count = project, len(new)
            self.endRemoveRows()
        previous, self._project = self._project, project
        if not (self._row_count and self._columns):
            return
        first, last = 0, self._row_count - 1
        if len(new) == len(old) and self.with_items(project, old) == previous:
            # Only the listed items changed: the cells of the rows whose item is unchanged
            # read exactly what they read before, so only the changed rows are announced.
            first, last = prefix, len(new) - suffix - 1
            if last < first:
                return
        self.dataChanged.emit(self.index(first, 0), self.index(last, len(self._columns) - 1))

    def reset(self) -> None:
        """Re-read everything (after the list shown changes, e.g. another segment)."""
        self.beginResetModel()
        self._project = self._document.project
        self._columns = self.columns_for(self._project)
        self._row_count = self._count(self._project)
        self.endResetModel()

    def _count(self, project: Project) -> int:
        return len(self.items(project)) if self.available() else 0

    def _on_units_changed(self, _system: str) -> None:
        if self._columns:
            self.headerDataChanged.emit(Qt.Orientation.Horizontal, 0, len(self._columns) - 1)
        if self._row_count and self._columns:
            self.dataChanged.emit(self.index(0, 0), self.index(self._row_count - 1, len(self._columns) - 1))

    # ------------------------------------------------------------------ Qt interface
    def rowCount(self, parent: ModelIndex = _TOP_LEVEL) -> int:
        return 0 if parent.isValid() else self._row_count

    def columnCount(self, parent: ModelIndex = _TOP_LEVEL) -> int:
        return 0 if parent.isValid() else len(self._columns)

    def headerData(self, section: int, orientation: Qt.Orientation, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if orientation == Qt.Orientation.Vertical:
            if role == Qt.ItemDataRole.DisplayRole and 0 <= section < self._row_count:
                return str(section + 1)
            return None
        if not 0 <= section < len(self._columns):
            return None
        column = self._columns[section]
        if role == Qt.ItemDataRole.DisplayRole:
            if column.quantity is None:
                return column.title
            return f"{column.title}\n[{unit_suffix(column.quantity, self.unit_system)}]"
        if role == Qt.ItemDataRole.ToolTipRole:
            return self._column_tooltip(column)
        return None

    def _column_tooltip(self, column: Column) -> str:
        parts = [column.tooltip] if column.tooltip else []
        if column.blank:
            parts.append(f"Blank: {column.blank}")
        if column.kind == "number" and column.limit is not None and column.quantity is not None:
            parts.append(f"Allowed: {range_text(LIMITS[column.limit], column.quantity, self.unit_system)}.")
            parts.append("A bare number is read in the unit shown; any unit may be typed (\"300 mm\", \"12 in\").")
        if column.optional and not column.blank:
            parts.append("Leave blank for none.")
        return " ".join(parts)

    def flags(self, index: ModelIndex) -> Qt.ItemFlag:
        if not self._valid(index):
            return Qt.ItemFlag.NoItemFlags
        if self.cell_editable(self._project, index.row(), self._columns[index.column()]):
            return _EDITABLE_FLAGS
        return _READ_ONLY_FLAGS

    def _valid(self, index: ModelIndex) -> bool:
        return (index.isValid() and 0 <= index.row() < self._row_count
                and 0 <= index.column() < len(self._columns))

    def data(self, index: ModelIndex, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if int(role) not in _ROLES_ANSWERED:  # the view asks for many roles per cell; most have no answer
            return None
        if not self._valid(index):
            return None
        row, column = index.row(), self._columns[index.column()]
        if role == Qt.ItemDataRole.DisplayRole:
            text = self.display(self._project, row, column)
            if text == "" and column.optional:
                hint = self.derived_hint(self._project, row, column)
                return hint if hint is not None else ""
            return text
        if role == Qt.ItemDataRole.EditRole:
            return self.edit_value(self._project, row, column)
        if role == Qt.ItemDataRole.TextAlignmentRole:
            return _ALIGN_RIGHT if column.quantity is not None else _ALIGN_LEFT
        if role == Qt.ItemDataRole.BackgroundRole:
            if not self.cell_editable(self._project, row, column):
                return READ_ONLY_BACKGROUND
            return None
        if role == Qt.ItemDataRole.ForegroundRole:
            if column.optional and self.value(self._project, row, column) is None:
                return DERIVED_FOREGROUND
            return None
        if role == Qt.ItemDataRole.ToolTipRole:
            return self.cell_tooltip(self._project, row, column)
        return None

    def display(self, project: Project, row: int, column: Column) -> str:
        """The text shown in one cell."""
        value = self.value(project, row, column)
        if column.kind == "choice":
            for choice_value, label in self.choices(project, row, column):
                if choice_value == value:
                    return label
            return "" if value is None else str(value)
        if column.quantity is not None and (isinstance(value, (int, float)) or value is None):
            digits = CALCULATED_DIGITS if column.kind == "readonly" else DISPLAY_DIGITS
            return display_text(value, column.quantity, self.unit_system, digits)
        return "" if value is None else str(value)

    def edit_value(self, project: Project, row: int, column: Column) -> str | None:
        """The text (or choice value, ``None`` for none chosen) an editor starts from."""
        value = self.value(project, row, column)
        if column.kind == "choice":
            choice: str | None = value
            return choice
        if column.quantity is not None and (isinstance(value, (int, float)) or value is None):
            return edit_text(value, column.quantity, self.unit_system)
        return "" if value is None else str(value)

    def copy_text(self, row: int, column_index: int) -> str:
        """The text a copy puts on the clipboard for one cell (pastes back unchanged).

        Choices and calculated values copy as shown; typed values with full precision
        and without catalogue hints, so a copied block pasted back changes nothing.
        """
        column = self._columns[column_index]
        if column.kind in ("choice", "readonly"):
            return self.display(self._project, row, column)
        return str(self.edit_value(self._project, row, column) or "")

    def cell_tooltip(self, project: Project, row: int, column: Column) -> str | None:
        if column.kind in ("text", "choice"):
            return self.display(project, row, column) or None
        if column.optional and self.value(project, row, column) is None:
            hint = self.derived_hint(project, row, column)
            if hint is not None:
                if column.blank:
                    return f"Blank: {column.blank} Type a value to override it."
                return "Catalogue value; type a value to override it."
        if column.blank and self.display(project, row, column) == "":
            rest = self._column_tooltip(column).replace(f"Blank: {column.blank}", "").strip()
            return f"Blank: {column.blank}" + (f"\n\n{rest}" if rest else "")
        return self._column_tooltip(column) or None

    def setData(self, index: ModelIndex, value: Any, role: int = Qt.ItemDataRole.EditRole) -> bool:
        if role != Qt.ItemDataRole.EditRole or not self._valid(index):
            return False
        row, column = index.row(), self._columns[index.column()]
        if not self.cell_editable(self._project, row, column):
            return False
        try:
            candidate = self.with_text(self._project, row, column, value)
        except CellError as exc:
            name = self.row_name(self._project, row)
            self._document.refuse(f"{name[:1].upper()}{name[1:]} — {exc}")
            return False
        if candidate is self._project or candidate == self._project:
            return True
        description = f"Edit {column.title.lower()} of {self.row_name(self._project, row)}"
        return self._document.apply(candidate, description, self.focus_target(row))

    # ------------------------------------------------------------------ parsing
    def with_text(self, project: Project, row: int, column: Column, text: Any) -> Project:
        """``project`` with the text typed in one cell applied, or :class:`CellError`."""
        if column.kind == "readonly":
            raise CellError(f"{column.title} is calculated and cannot be typed")
        if column.kind == "choice":
            value = parse_choice(text, label=column.title, choices=self.choices(project, row, column))
            if value == self.value(project, row, column):
                return project
            return self.with_value(project, row, column, value)
        if column.kind == "text":
            value = "" if text is None else str(text).strip()
            if not value:
                raise CellError(f"{column.title}: cannot be empty")
            if value == self.value(project, row, column):
                return project
            return self.with_value(project, row, column, value)
        assert column.quantity is not None and column.limit is not None
        number = parse_value(text, label=column.title, quantity=column.quantity, limit_key=column.limit,
                             system=self.unit_system, field_path=self.field_path(row, column),
                             optional=column.optional)
        if same_value(number, self.value(project, row, column)):
            return project
        return self.with_value(project, row, column, number)

    # ------------------------------------------------------------------ row operations
    def insert_row(self, row: int) -> bool:
        """Insert a new record before ``row`` (at the end when ``row`` is the row count)."""
        if not self.available():
            return False
        items = list(self.items(self._project))
        row = max(0, min(row, len(items)))
        items.insert(row, self.new_item(self._project, row))
        return self._apply_items(items, f"Insert {self.item_word()} {row + 1}", row)

    def remove_rows(self, rows: Sequence[int]) -> bool:
        """Remove the records at ``rows`` (one undo step)."""
        if not self.available():
            return False
        items = list(self.items(self._project))
        doomed = sorted({r for r in rows if 0 <= r < len(items)})
        if not doomed:
            return False
        if len(items) - len(doomed) < self.min_rows():
            self._document.refuse(
                f"Cannot remove: at least {self.min_rows()} {self.item_word()}"
                f"{'s' if self.min_rows() != 1 else ''} must remain")
            return False
        kept = [item for i, item in enumerate(items) if i not in doomed]
        word = self.item_word() if len(doomed) == 1 else f"{len(doomed)} {self.item_word()}s"
        return self._apply_items(kept, f"Remove {word}", min(doomed[0], max(len(kept) - 1, 0)))

    def move_row(self, row: int, offset: int) -> bool:
        """Move the record at ``row`` up (``offset`` < 0) or down."""
        items = list(self.items(self._project))
        target = row + offset
        if not (0 <= row < len(items) and 0 <= target < len(items)) or offset == 0:
            return False
        items.insert(target, items.pop(row))
        direction = "up" if offset < 0 else "down"
        return self._apply_items(items, f"Move {self.item_word()} {row + 1} {direction}", target)

    def _apply_items(self, items: list[Any], description: str, focus_row: int) -> bool:
        try:
            candidate = self.with_items(self._project, tuple(items))
        except CellError as exc:
            self._document.refuse(str(exc))
            return False
        return self._document.apply(candidate, description, self.focus_target(focus_row))

    # ------------------------------------------------------------------ block paste
    def with_block(self, project: Project, top: int, left: int, block: Sequence[Sequence[str]]) -> Project:
        """``project`` with a block of typed texts applied from cell (``top``, ``left``).

        Rows beyond the last are added when :meth:`can_extend`; a block wider than the
        table, or any refused cell, raises :class:`CellError` naming the row and column.
        """
        if not self.available():
            raise CellError("nothing to paste into")
        width = max((len(r) for r in block), default=0)
        columns = self.columns_for(project)
        if left + width > len(columns):
            raise CellError(
                f"the block is {width} columns wide but only {len(columns) - left} columns lie right of "
                f"column '{columns[left].title}'")
        needed = top + len(block)
        items = list(self.items(project))
        if needed > len(items):
            if not self.can_extend():
                raise CellError(f"the block has {len(block)} rows but only {len(items) - top} rows lie below")
            while len(items) < needed:
                items.append(self.new_item(self.with_items(project, tuple(items)), len(items)))
            project = self.with_items(project, tuple(items))
        for r, texts in enumerate(block):
            for c, text in enumerate(texts):
                row, column = top + r, columns[left + c]
                if not self.cell_editable(project, row, column):
                    if column.kind == "readonly" or str(text).strip() == self.display(project, row, column):
                        continue
                    raise CellError(f"row {row + 1}, column '{column.title}': this cell cannot be edited here")
                try:
                    project = self.with_text(project, row, column, text)
                except CellError as exc:
                    raise CellError(f"row {row + 1}, column '{column.title}': {exc}") from None
        return project

    def paste_block(self, top: int, left: int, block: Sequence[Sequence[str]]) -> bool:
        """Apply a pasted block as ONE undo step; refuse all of it if any cell is bad."""
        if not block or not any(block):
            return False
        try:
            candidate = self.with_block(self._project, top, left, block)
        except CellError as exc:
            self._document.refuse(f"Paste refused: {exc}")
            return False
        if candidate == self._project:
            return True
        width = max(len(r) for r in block)
        return self._document.apply(candidate, f"Paste {len(block)} × {width} cells", self.focus_target(top))
