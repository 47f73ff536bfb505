"""Cell editors: a drop-down for choice columns, a plain text editor for typed values.

Choice columns (side, material, pipe series, nominal size, fitting type) get a
:class:`QComboBox` filled from the model's :meth:`~app.table_models.base.ProjectTableModel.choices`;
picking an entry commits at once.  Number columns get a plain line editor: the text,
units and all, goes to the model's ``setData``, which parses and range-checks it —
no validator, so "300 mm" or "12 in" can be typed in any column of that kind.
"""

from __future__ import annotations

from PySide6.QtCore import QAbstractItemModel, QModelIndex, QPersistentModelIndex, Qt
from PySide6.QtWidgets import QComboBox, QLineEdit, QStyledItemDelegate, QStyleOptionViewItem, QWidget

from app.table_models.base import Column, ProjectTableModel

ModelIndex = QModelIndex | QPersistentModelIndex


def _choice_column(index: ModelIndex) -> tuple[ProjectTableModel, Column] | None:
    """The project table and column of ``index`` when that column is a drop-down."""
    model = index.model()
    if not isinstance(model, ProjectTableModel) or not 0 <= index.column() < len(model.table_columns):
        return None
    column = model.table_columns[index.column()]
    return (model, column) if column.kind == "choice" else None


class ProjectTableDelegate(QStyledItemDelegate):
    """Editors for :class:`~app.table_models.base.ProjectTableModel` cells."""

    def createEditor(self, parent: QWidget, option: QStyleOptionViewItem, index: ModelIndex) -> QWidget:
        choice = _choice_column(index)
        if choice is not None:
            model, column = choice
            combo = QComboBox(parent)
            combo.setFrame(False)
            combo.setMaxVisibleItems(20)
            for value, label in model.choices(model.project, index.row(), column):
                combo.addItem(label, value)
            combo.activated.connect(lambda _i, c=combo: self._commit_and_close(c))
            return combo
        editor = QLineEdit(parent)
        editor.setFrame(False)
        return editor

    def _commit_and_close(self, editor: QWidget) -> None:
        self.commitData.emit(editor)
        self.closeEditor.emit(editor, QStyledItemDelegate.EndEditHint.NoHint)

    def setEditorData(self, editor: QWidget, index: ModelIndex) -> None:
        value = index.data(Qt.ItemDataRole.EditRole)
        if isinstance(editor, QComboBox):
            position = editor.findData(value)
            if position < 0:
                position = editor.findText(str(index.data(Qt.ItemDataRole.DisplayRole) or ""))
            editor.setCurrentIndex(max(position, 0))
        elif isinstance(editor, QLineEdit):
            editor.setText("" if value is None else str(value))
        else:  # only the two editors above are created
            super().setEditorData(editor, index)

    def setModelData(self, editor: QWidget, model: QAbstractItemModel, index: ModelIndex) -> None:
        if isinstance(editor, QComboBox):
            model.setData(index, editor.currentText(), Qt.ItemDataRole.EditRole)
        elif isinstance(editor, QLineEdit):
            model.setData(index, editor.text(), Qt.ItemDataRole.EditRole)
        else:
            super().setModelData(editor, model, index)
