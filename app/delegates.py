"""Cell editors: a drop-down for choice columns, a plain text editor for typed values.

Choice columns (side, material, pipe series, nominal size, fitting type) get a
:class:`QComboBox` filled from the model's :meth:`~app.table_models.base.ProjectTableModel.choices`;
picking an entry commits at once.  Number columns get a plain line editor: the text,
units and all, goes to the model's ``setData``, which parses and range-checks it —
no validator, so "300 mm" or "12 in" can be typed in any column of that kind.
"""

from __future__ import annotations

from PySide6.QtCore import QModelIndex, QPersistentModelIndex, Qt
from PySide6.QtWidgets import QComboBox, QLineEdit, QStyledItemDelegate, QStyleOptionViewItem, QWidget

ModelIndex = QModelIndex | QPersistentModelIndex


def _column(index: ModelIndex):
    model = index.model()
    columns = getattr(model, "table_columns", ())
    return model, (columns[index.column()] if 0 <= index.column() < len(columns) else None)


class ProjectTableDelegate(QStyledItemDelegate):
    """Editors for :class:`~app.table_models.base.ProjectTableModel` cells."""

    def createEditor(self, parent: QWidget, option: QStyleOptionViewItem, index: ModelIndex) -> QWidget:
        model, column = _column(index)
        if column is not None and column.kind == "choice":
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

    def setModelData(self, editor: QWidget, model, index: ModelIndex) -> None:
        if isinstance(editor, QComboBox):
            model.setData(index, editor.currentText(), Qt.ItemDataRole.EditRole)
        elif isinstance(editor, QLineEdit):
            model.setData(index, editor.text(), Qt.ItemDataRole.EditRole)
        else:
            super().setModelData(editor, model, index)
