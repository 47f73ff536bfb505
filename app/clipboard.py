"""Copy and paste of cell blocks as tab-separated text, the way spreadsheets exchange them.

A copy puts the selected block on the clipboard, one line per row and a tab between
cells, with typed values in the units on display and full precision (no unit labels,
so a spreadsheet sees numbers).  A paste applies a block from the current cell right
and down through :meth:`~app.table_models.base.ProjectTableModel.paste_block`: one undo
step, and a single bad cell refuses the whole paste with a message naming its row and
column.  A single value pasted over a larger selection fills the selection.
"""

from __future__ import annotations

from PySide6.QtWidgets import QAbstractItemView, QApplication

from app.table_models.base import ProjectTableModel

Block = list[list[str]]


def _table_model(view: QAbstractItemView) -> ProjectTableModel:
    """The project table shown by ``view`` (copy and paste work on those only)."""
    model = view.model()
    if not isinstance(model, ProjectTableModel):
        raise TypeError(f"copy and paste need a project table, not {type(model).__name__}")
    return model


def block_to_text(block: Block) -> str:
    """Tab-separated text of a block, a newline after every row.

    >>> block_to_text([["1", "2"], ["3", ""]])
    '1\\t2\\n3\\t\\n'
    """
    return "".join("\t".join(_quote(cell) for cell in row) + "\n" for row in block)


def _quote(cell: str) -> str:
    if any(ch in cell for ch in "\t\n\r\""):
        return '"' + cell.replace('"', '""') + '"'
    return cell


def text_to_block(text: str) -> Block:
    """Rows of cells from tab-separated text (spreadsheet quoting understood).

    Line ends may be ``\\n`` or ``\\r\\n``; a final line end adds no empty row.  A cell in
    double quotes may hold tabs, line ends and doubled quotes.

    >>> text_to_block("DN 200\\t2400\\r\\nDN 250\\t9\\r\\n")
    [['DN 200', '2400'], ['DN 250', '9']]
    >>> text_to_block('"a ""b""\\tc"\\t1\\n')
    [['a "b"\\tc', '1']]
    """
    rows: Block = []
    row: list[str] = []
    cell: list[str] = []
    quoted = False
    at_cell_start = True
    i = 0
    n = len(text)
    while i < n:
        ch = text[i]
        if quoted:
            if ch == '"' and i + 1 < n and text[i + 1] == '"':
                cell.append('"')
                i += 1
            elif ch == '"':
                quoted = False
            else:
                cell.append(ch)
        elif ch == '"' and at_cell_start:
            quoted = True
            at_cell_start = False
        elif ch == "\t":
            row.append("".join(cell))
            cell, at_cell_start = [], True
        elif ch in "\r\n":
            if ch == "\r" and i + 1 < n and text[i + 1] == "\n":
                i += 1
            row.append("".join(cell))
            rows.append(row)
            row, cell, at_cell_start = [], [], True
        else:
            cell.append(ch)
            at_cell_start = False
        i += 1
    if cell or row or not at_cell_start:
        row.append("".join(cell))
        rows.append(row)
    return rows


def _selected_rectangle(view: QAbstractItemView) -> tuple[int, int, int, int] | None:
    """``(top, left, bottom, right)`` bounding the selection, else the current cell."""
    indexes = view.selectionModel().selectedIndexes() if view.selectionModel() else []
    if not indexes:
        current = view.currentIndex()
        if not current.isValid():
            return None
        return current.row(), current.column(), current.row(), current.column()
    rows = [i.row() for i in indexes]
    columns = [i.column() for i in indexes]
    return min(rows), min(columns), max(rows), max(columns)


def selected_block(view: QAbstractItemView) -> Block:
    """The text of the selected block (cells of the bounding box outside the selection are blank)."""
    rectangle = _selected_rectangle(view)
    if rectangle is None:
        return []
    top, left, bottom, right = rectangle
    model = _table_model(view)
    selection = view.selectionModel()
    block: Block = []
    for r in range(top, bottom + 1):
        row = []
        for c in range(left, right + 1):
            index = model.index(r, c)
            chosen = selection is None or selection.isSelected(index) or not selection.hasSelection()
            row.append(model.copy_text(r, c) if chosen else "")
        block.append(row)
    return block


def copy_selection(view: QAbstractItemView) -> bool:
    """Put the selected block on the clipboard; False when nothing is selected."""
    block = selected_block(view)
    if not block:
        return False
    QApplication.clipboard().setText(block_to_text(block))
    return True


def paste_text(view: QAbstractItemView, text: str) -> bool:
    """Apply tab-separated ``text`` at the view's selection (one undo step)."""
    block = text_to_block(text)
    if not block:
        return False
    rectangle = _selected_rectangle(view)
    model = _table_model(view)
    if rectangle is None:
        top, left, bottom, right = 0, 0, 0, 0
    else:
        top, left, bottom, right = rectangle
    if len(block) == 1 and len(block[0]) == 1 and (bottom > top or right > left):
        block = [[block[0][0]] * (right - left + 1) for _ in range(bottom - top + 1)]
    applied = model.paste_block(top, left, block)
    if applied:
        height = len(block)
        width = max(len(r) for r in block)
        _select(view, top, left, top + height - 1, left + width - 1)
    return applied


def paste_clipboard(view: QAbstractItemView) -> bool:
    """Paste the clipboard's text into the view (see :func:`paste_text`)."""
    text = QApplication.clipboard().text()
    return paste_text(view, text) if text else False


def clear_selection(view: QAbstractItemView) -> bool:
    """Blank the selected cells of a view: optional values cleared; one undo step.

    A blank in a required cell refuses the whole clear with the reason.
    """
    rectangle = _selected_rectangle(view)
    if rectangle is None:
        return False
    top, left, bottom, right = rectangle
    model = _table_model(view)
    columns = model.table_columns
    block: Block = []
    for r in range(top, bottom + 1):
        row = []
        for c in range(left, right + 1):
            kind = columns[c].kind
            row.append(model.copy_text(r, c) if kind in ("readonly", "choice", "text") else "")
        block.append(row)
    return model.paste_block(top, left, block)


def _select(view: QAbstractItemView, top: int, left: int, bottom: int, right: int) -> None:
    from PySide6.QtCore import QItemSelection, QItemSelectionModel

    model = view.model()
    bottom = min(bottom, model.rowCount() - 1)
    right = min(right, model.columnCount() - 1)
    if bottom < top or right < left:
        return
    selection = QItemSelection(model.index(top, left), model.index(bottom, right))
    view.selectionModel().select(selection, QItemSelectionModel.SelectionFlag.ClearAndSelect)
    view.selectionModel().setCurrentIndex(model.index(top, left), QItemSelectionModel.SelectionFlag.NoUpdate)
