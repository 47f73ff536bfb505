"""The checks list: the engine's findings grouped by severity, each pointing at its cause.

The panel only shows :class:`~hydraulics.results.Finding` objects from the solution; it
never judges a value itself.  Clicking (or activating with the keyboard) a finding emits
:attr:`ChecksPanel.findingActivated` with the finding's ``target`` — ``("segment", 2)``,
``("pump", "P1")``, ``("site", "suction")``, ``("scenario", (static, pipe, pumps_running, speed_ratio))`` — so the
window can select the row or panel concerned.
"""

from __future__ import annotations

from collections.abc import Iterable

from PySide6.QtCore import QModelIndex, QPersistentModelIndex, QRect, QSize, Qt, Signal
from PySide6.QtGui import QBrush, QColor, QFont, QStandardItem, QStandardItemModel
from PySide6.QtWidgets import (
    QAbstractItemView,
    QHeaderView,
    QStyledItemDelegate,
    QStyleOptionViewItem,
    QTreeView,
    QVBoxLayout,
    QWidget,
)

from app import style
from hydraulics.results import SEVERITY_ORDER, Finding

FINDING_INDEX_ROLE = Qt.ItemDataRole.UserRole + 1
"""Item data role holding the position of a finding in :attr:`ChecksPanel.findings`."""

_SEVERITY_ROLE = Qt.ItemDataRole.UserRole + 2
"""Item data role holding the severity of a group row."""

COLUMNS = ("Finding", "Where", "Remedy")
FINDING_COLUMN, WHERE_COLUMN, REMEDY_COLUMN = 0, 1, 2
WHERE_WIDTH = 170
"""Width (px) of the "Where" column, shown first; a longer place wraps onto further lines of its row."""
MAX_ROW_LINES = 4
"""Lines a finding's row grows to; a longer text ends in "…" (whole in the tooltip)."""
TEXT_MARGIN_PX = 18
"""Room (px) the item style takes beside a cell's text."""
SEVERITIES = tuple(sorted(SEVERITY_ORDER, key=SEVERITY_ORDER.__getitem__))

_Group = tuple[str, list[tuple[int, Finding]]]
"""One severity and its findings, each with its position in :attr:`ChecksPanel.findings`."""


class _WrappingDelegate(QStyledItemDelegate):
    """Rows as tall as their wrapped "Where" and finding texts at the columns' present widths
    (at most :data:`MAX_ROW_LINES` lines)."""

    def __init__(self, view: QTreeView) -> None:
        super().__init__(view)
        self._view = view

    def sizeHint(self, option: QStyleOptionViewItem, index: QModelIndex | QPersistentModelIndex) -> QSize:
        hint = super().sizeHint(option, index)
        if index.column() not in (WHERE_COLUMN, FINDING_COLUMN) or not index.parent().isValid():
            return hint
        width = self._view.columnWidth(index.column()) - TEXT_MARGIN_PX
        if index.column() == self._view.treePosition():
            width -= self._view.indentation() * 2
        text = str(index.data() or "")
        wrapped = option.fontMetrics.boundingRect(QRect(0, 0, max(width, 20), 100000),
                                                  int(Qt.TextFlag.TextWordWrap), text)
        most = option.fontMetrics.lineSpacing() * MAX_ROW_LINES
        return QSize(hint.width(), max(hint.height(), min(wrapped.height(), most) + 4))


def _group_title(severity: str, count: int) -> str:
    noun = style.SEVERITY_TITLES.get(severity, severity.title())
    return f"{noun} ({count})"


class ChecksPanel(QWidget):
    """Findings in a tree: one group per severity (critical, warning, information)."""

    findingActivated = Signal(object)
    """Emitted with ``finding.target`` (a tuple, or ``None``) when a finding is clicked or activated."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self._findings: list[Finding] = []
        self._unit_system = "SI"
        self._shown = False
        self._shape: tuple[tuple[str, int], ...] | None = None  # (severity, count) per group shown
        self._placeholder_text: str | None = None
        self.model = QStandardItemModel(0, len(COLUMNS), self)
        self.model.setHorizontalHeaderLabels(list(COLUMNS))
        self.view = QTreeView(self)
        self.view.setModel(self.model)
        self.view.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.view.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.view.setUniformRowHeights(False)
        self.view.setWordWrap(True)
        self.view.setAlternatingRowColors(True)
        self.view.setExpandsOnDoubleClick(True)
        # A scroll bar that came and went with the number of findings would re-lay out the
        # tree (and repaint it whole) on every edit that crosses the count that fits.
        self.view.setVerticalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOn)
        header = self.view.header()
        header.setStretchLastSection(False)
        header.setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        # "Where" is shown first and the finding fills the rest, both wrapped, so the place and
        # the text of every finding are in view without scrolling sideways (the model keeps its
        # columns: finding, where, remedy; the remedy is in every cell's tooltip).
        header.moveSection(WHERE_COLUMN, 0)
        header.setSectionResizeMode(FINDING_COLUMN, QHeaderView.ResizeMode.Stretch)
        self.view.setColumnHidden(REMEDY_COLUMN, True)
        self.view.setTreePosition(FINDING_COLUMN)
        self.view.setColumnWidth(WHERE_COLUMN, WHERE_WIDTH)
        self.view.setItemDelegate(_WrappingDelegate(self.view))
        header.sectionResized.connect(self._on_column_resized)
        self.view.clicked.connect(self._on_index)
        self.view.activated.connect(self._on_index)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.view)
        self.show_findings((), "SI", solved=False)

    # ------------------------------------------------------------------ public API
    @property
    def findings(self) -> tuple[Finding, ...]:
        """The findings shown, most serious first."""
        return tuple(self._findings)

    def show_findings(self, findings: Iterable[Finding] | None, unit_system: str = "SI",
                      solved: bool = True) -> None:
        """Show ``findings`` (from ``solution.findings``).

        Quoted values are stated in ``unit_system`` (``Finding.text``).  ``solved=False`` shows
        that there is no result yet rather than "no findings".
        """
        self._unit_system = unit_system
        self._findings = sorted(findings or (), key=lambda f: SEVERITY_ORDER.get(f.severity, 9))
        if not self._findings:
            text = "Every check passed: no findings." if solved else "No results yet."
            if self._shape == () and self._placeholder_text == text:
                return
            self.model.removeRows(0, self.model.rowCount())
            placeholder = QStandardItem(text)
            placeholder.setEditable(False)
            placeholder.setForeground(QBrush(QColor(style.GREY)))
            self.model.appendRow([placeholder, _plain(""), _plain("")])
            self._shape, self._placeholder_text = (), text
            return
        groups: list[_Group] = []
        for severity in SEVERITIES:
            members = [(i, f) for i, f in enumerate(self._findings) if f.severity == severity]
            if members:
                groups.append((severity, members))
        shape = tuple((severity, len(members)) for severity, members in groups)
        if shape != self._shape:
            self._reshape(groups)
        self._refresh_rows(groups)  # new texts in place: the tree is never rebuilt for an edit
        self._shape, self._placeholder_text = shape, None

    def group_titles(self) -> list[str]:
        """Titles of the severity groups shown, top to bottom (e.g. ``"Warning (2)"``)."""
        return [self.model.item(row, 0).text() for row in range(self.model.rowCount())
                if self.model.item(row, 0).hasChildren()]

    def index_of_finding(self, position: int) -> QModelIndex:
        """Model index (first column) of the finding at ``position`` in :attr:`findings`."""
        for row in range(self.model.rowCount()):
            group = self.model.item(row, 0)
            for child in range(group.rowCount()):
                item = group.child(child, 0)
                if item.data(FINDING_INDEX_ROLE) == position:
                    return item.index()
        return QModelIndex()

    # ------------------------------------------------------------------ internals
    def _reshape(self, groups: list[_Group]) -> None:
        """Make the tree hold one group row per severity of ``groups`` and one row per finding.

        Groups already shown stay (with their expanded state); groups that are gone are
        removed, new ones inserted in severity order and expanded, and each group gains or
        loses finding rows at its end.  Texts are written afterwards by :meth:`_refresh_rows`.
        """
        wanted = [severity for severity, _members in groups]
        if self._shape == () or self._shape is None:  # a placeholder (or nothing) is shown
            self.model.removeRows(0, self.model.rowCount())
        for row in reversed(range(self.model.rowCount())):
            if self.model.item(row, 0).data(_SEVERITY_ROLE) not in wanted:
                self.model.removeRow(row)
        for row, (severity, members) in enumerate(groups):
            group = self.model.item(row, 0)
            if group is None or group.data(_SEVERITY_ROLE) != severity:
                group = _group_item(severity)
                self.model.insertRow(row, [group, _plain(""), _plain("")])
                self.view.setFirstColumnSpanned(row, QModelIndex(), True)
                self.view.expand(group.index())
            title = _group_title(severity, len(members))
            if group.text() != title:
                group.setText(title)
            have = group.rowCount()
            if have > len(members):
                group.removeRows(len(members), have - len(members))
            for index, finding in members[have:]:
                group.appendRow(self._finding_row(index, finding))

    def _refresh_rows(self, groups: list[_Group]) -> None:
        """Write the texts of ``groups`` into the rows shown (the tree has their shape)."""
        for row, (_severity, members) in enumerate(groups):
            group = self.model.item(row, 0)
            for child, (index, finding) in enumerate(members):
                for column, (text, tooltip) in enumerate(self._finding_cells(finding)):
                    cell = group.child(child, column)
                    if cell.text() != text:
                        cell.setText(text)
                    if cell.toolTip() != tooltip:
                        cell.setToolTip(tooltip)
                    if cell.data(FINDING_INDEX_ROLE) != index:
                        cell.setData(index, FINDING_INDEX_ROLE)

    def _finding_cells(self, finding: Finding) -> list[tuple[str, str]]:
        """(text, tooltip) of the three cells of ``finding``'s row."""
        message = finding.text(self._unit_system)
        where, remedy, code = finding.where, finding.remedy, finding.code
        tooltip = ((f"Where: {where}\n\n" if where else "") + message
                   + (f"\n\nRemedy: {remedy}" if remedy else "") + (f"\n\nCheck: {code}" if code else ""))
        return [(message, tooltip), (where, tooltip), (remedy, tooltip)]

    def _finding_row(self, index: int, finding: Finding) -> list[QStandardItem]:
        cells = []
        for message, tooltip in self._finding_cells(finding):
            cell = _plain(message)
            cell.setToolTip(tooltip)
            cell.setData(index, FINDING_INDEX_ROLE)
            cells.append(cell)
        return cells

    def _on_column_resized(self, logical: int, _old: int, _new: int) -> None:
        if logical in (WHERE_COLUMN, FINDING_COLUMN):
            self.view.scheduleDelayedItemsLayout()  # the rows re-measure their wrapped texts

    def where_rect(self, position: int) -> QRect:
        """The rectangle (viewport coordinates) of the "Where" cell of the finding at ``position``."""
        index = self.index_of_finding(position)
        return self.view.visualRect(index.siblingAtColumn(WHERE_COLUMN)) if index.isValid() else QRect()

    def _on_index(self, index: QModelIndex) -> None:
        position = index.data(FINDING_INDEX_ROLE)
        if position is None or not 0 <= int(position) < len(self._findings):
            return
        self.findingActivated.emit(self._findings[int(position)].target)


def _group_item(severity: str) -> QStandardItem:
    """The bold, icon-marked group row of one severity."""
    group = QStandardItem(style.severity_icon(severity), _group_title(severity, 0))
    group.setEditable(False)
    group.setSelectable(False)
    group.setData(severity, _SEVERITY_ROLE)
    font = QFont(group.font())
    font.setBold(True)
    group.setFont(font)
    return group


def _plain(text: str) -> QStandardItem:
    item = QStandardItem(text)
    item.setEditable(False)
    return item
