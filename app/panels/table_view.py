"""A table view that moves like a spreadsheet.

* typing starts editing the current cell (the typed text replaces it); F2 or a double
  click edits the existing text;
* Enter commits and moves down, Tab commits and moves right (Shift+Tab left); an entry
  the model refuses keeps the cursor on its cell;
* Delete clears the selected optional values;
* copy and paste of cell blocks are driven by the window's Edit actions
  (see :mod:`app.clipboard`);
* the context menu inserts, removes and moves rows (each one undo step).
"""

from __future__ import annotations

from collections.abc import Callable

from PySide6.QtCore import QAbstractItemModel, QItemSelectionModel, QModelIndex, Qt, Signal
from PySide6.QtGui import QAction, QContextMenuEvent, QKeyEvent
from PySide6.QtWidgets import (
    QAbstractItemDelegate,
    QAbstractItemView,
    QHBoxLayout,
    QHeaderView,
    QMenu,
    QPushButton,
    QTableView,
    QWidget,
)

from app import clipboard
from app.delegates import ProjectTableDelegate
from app.table_models.base import ProjectTableModel

MAX_COLUMN_WIDTH = 230
"""Widest a column grows when sized to its contents (px); long names show in full as tooltips."""


class SpreadsheetView(QTableView):
    """A :class:`QTableView` over a :class:`~app.table_models.base.ProjectTableModel`.

    ``currentRowChanged(int)`` is emitted when the current row changes (−1 for none).
    """

    currentRowChanged = Signal(int)

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self.setItemDelegate(ProjectTableDelegate(self))
        self.setEditTriggers(QAbstractItemView.EditTrigger.AnyKeyPressed
                             | QAbstractItemView.EditTrigger.DoubleClicked
                             | QAbstractItemView.EditTrigger.EditKeyPressed)
        self.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectItems)
        self.setSelectionMode(QAbstractItemView.SelectionMode.ExtendedSelection)
        self.setTabKeyNavigation(True)
        self.setAlternatingRowColors(True)
        self.setWordWrap(False)
        header = self.horizontalHeader()
        header.setDefaultAlignment(Qt.AlignmentFlag.AlignCenter)
        header.setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        header.setHighlightSections(False)
        self.verticalHeader().setDefaultSectionSize(self.fontMetrics().height() + 8)
        self.verticalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Fixed)
        self._last_row = -1
        self._refused = False

    def setModel(self, model: QAbstractItemModel | None) -> None:
        super().setModel(model)
        if model is None:
            return
        self.selectionModel().currentRowChanged.connect(self._on_current_row)
        model.modelReset.connect(self._after_reset)
        model.rowsInserted.connect(self._after_insert)
        model.headerDataChanged.connect(self._after_header_change)
        self.fit_columns()

    def fit_columns(self) -> None:
        """Size the columns to their contents, none wider than :data:`MAX_COLUMN_WIDTH`."""
        self.resizeColumnsToContents()
        for column in range(self.horizontalHeader().count()):
            if self.columnWidth(column) > MAX_COLUMN_WIDTH:
                self.setColumnWidth(column, MAX_COLUMN_WIDTH)

    def _after_reset(self) -> None:
        self.fit_columns()
        self._on_current_row(self.currentIndex(), QModelIndex())

    def _after_insert(self, _parent: QModelIndex, _first: int, _last: int) -> None:
        self.fit_columns()

    def _after_header_change(self, orientation: Qt.Orientation, _first: int, _last: int) -> None:
        # The column titles change with the unit system, and with them every value shown
        # ("15" L/s becomes "237.75" gpm): the columns are fitted to the new texts.
        if orientation == Qt.Orientation.Horizontal:
            self.fit_columns()

    def _on_current_row(self, current: QModelIndex, _previous: QModelIndex) -> None:
        row = current.row() if current.isValid() else -1
        if row != self._last_row:
            self._last_row = row
            self.currentRowChanged.emit(row)

    # ------------------------------------------------------------------ navigation
    def select_row(self, row: int) -> None:
        """Make ``row`` current and selected (first column if none is current), and show it."""
        model = self.model()
        if model is None or not 0 <= row < model.rowCount():
            return
        column = max(self.currentIndex().column(), 0)
        index = model.index(row, column)
        self.selectionModel().setCurrentIndex(
            index, QItemSelectionModel.SelectionFlag.ClearAndSelect | QItemSelectionModel.SelectionFlag.Rows)
        self.scrollTo(index)

    def table_model(self) -> ProjectTableModel | None:
        """The project table shown, if the model is one."""
        model = self.model()
        return model if isinstance(model, ProjectTableModel) else None

    def current_row(self) -> int:
        index = self.currentIndex()
        return index.row() if index.isValid() else -1

    def _move(self, rows: int, columns: int) -> None:
        model = self.model()
        current = self.currentIndex()
        if model is None or not current.isValid():
            return
        row = min(max(current.row() + rows, 0), model.rowCount() - 1)
        column = min(max(current.column() + columns, 0), model.columnCount() - 1)
        self.setCurrentIndex(model.index(row, column))

    def commitData(self, editor: QWidget) -> None:
        model = self.table_model()
        document = model.document if model is not None else None
        before = document.refusal_count if document is not None else 0
        super().commitData(editor)
        self._refused = document is not None and document.refusal_count != before

    def closeEditor(self, editor: QWidget, hint: QAbstractItemDelegate.EndEditHint) -> None:
        moves = {
            QAbstractItemDelegate.EndEditHint.SubmitModelCache: (1, 0),
            QAbstractItemDelegate.EndEditHint.EditNextItem: (0, 1),
            QAbstractItemDelegate.EndEditHint.EditPreviousItem: (0, -1),
        }
        move = moves.get(hint)
        super().closeEditor(editor, QAbstractItemDelegate.EndEditHint.NoHint)
        if move is not None and not self._refused:
            self._move(*move)
        self._refused = False

    def keyPressEvent(self, event: QKeyEvent) -> None:
        if self.state() != QAbstractItemView.State.EditingState:
            key = event.key()
            if key in (Qt.Key.Key_Return, Qt.Key.Key_Enter) and event.modifiers() in (
                    Qt.KeyboardModifier.NoModifier, Qt.KeyboardModifier.KeypadModifier):
                self._move(1, 0)
                event.accept()
                return
            if key in (Qt.Key.Key_Delete, Qt.Key.Key_Backspace) and event.modifiers() == Qt.KeyboardModifier.NoModifier:
                clipboard.clear_selection(self)
                event.accept()
                return
        super().keyPressEvent(event)

    # ------------------------------------------------------------------ row buttons
    def add_row_below_current(self, select: bool = True) -> bool:
        """Insert a row after the current one (at the end without one); select it when asked."""
        model = self.table_model()
        if model is None:
            return False
        row = self.current_row()
        target = row + 1 if row >= 0 else model.rowCount()
        if not model.insert_row(target):
            return False
        if select:
            self.select_row(min(target, model.rowCount() - 1))
        return True

    def selected_rows(self) -> list[int]:
        """The rows with a selected cell, else the current row (sorted; empty without either)."""
        rows = {i.row() for i in self.selectionModel().selectedIndexes()}
        if not rows and self.current_row() >= 0:
            rows = {self.current_row()}
        return sorted(rows)

    def remove_selected_rows(self) -> bool:
        """Remove :meth:`selected_rows` through the model (which refuses what it must)."""
        model = self.table_model()
        return model is not None and model.remove_rows(self.selected_rows())

    # ------------------------------------------------------------------ context menu
    def row_actions(self) -> list[QAction | None]:
        """The context-menu actions for the current row (``None`` is a separator)."""
        model = self.table_model()
        row = self.current_row()
        rows = sorted({i.row() for i in self.selectionModel().selectedIndexes()} or ({row} if row >= 0 else set()))
        available = model is not None and model.available()
        word = model.item_word() if model is not None else "row"
        entries = [
            (f"Insert {word} above", available, lambda: self._insert(max(row, 0))),
            (f"Insert {word} below", available, lambda: self._insert(row + 1 if row >= 0 else self._row_total())),
            (f"Remove selected {word}s" if len(rows) > 1 else f"Remove {word}", bool(rows),
             lambda: self._remove_rows(rows)),
            None,
            (f"Move {word} up", row > 0, lambda: self._move_row(row, -1)),
            (f"Move {word} down", 0 <= row < (model.rowCount() - 1 if model else 0), lambda: self._move_row(row, 1)),
            None,
            ("Copy", bool(rows), lambda: clipboard.copy_selection(self)),
            ("Paste", available, lambda: clipboard.paste_clipboard(self)),
            ("Clear", bool(rows), lambda: clipboard.clear_selection(self)),
        ]
        actions: list[QAction | None] = []
        for entry in entries:
            if entry is None:
                actions.append(None)
                continue
            text, enabled, slot = entry
            action = QAction(text, self)
            action.setEnabled(bool(enabled))
            action.triggered.connect(slot)
            actions.append(action)
        return actions

    def _row_total(self) -> int:
        model = self.model()
        return model.rowCount() if model is not None else 0

    def _remove_rows(self, rows: list[int]) -> None:
        model = self.table_model()
        if model is not None:
            model.remove_rows(rows)

    def _insert(self, row: int) -> None:
        model = self.table_model()
        if model is not None and model.insert_row(row):
            self.select_row(row)

    def _move_row(self, row: int, offset: int) -> None:
        model = self.table_model()
        if model is not None and model.move_row(row, offset):
            self.select_row(row + offset)

    def contextMenuEvent(self, event: QContextMenuEvent) -> None:
        menu = QMenu(self)
        for action in self.row_actions():
            if action is None:
                menu.addSeparator()
            else:
                menu.addAction(action)
        menu.exec(event.globalPos())


def button_row(*buttons: tuple[str, Callable[[], object], str]) -> QHBoxLayout:
    """A row of push buttons under a table, each ``(text, slot, tooltip)``, then a stretch."""
    row = QHBoxLayout()
    for text, slot, tip in buttons:
        button = QPushButton(text)
        button.setToolTip(tip)
        button.clicked.connect(slot)
        row.addWidget(button)
    row.addStretch(1)
    return row
