"""The main window: it assembles the panels, the plots and the results, and wires the actions.

Layout: the input panels on the left (tabs: Site & fluid, Pipework, Pumps, Criteria, Duty), the
plots in the centre, the checks and the operating points below the plots, the cautions
banner along the bottom edge, always visible.  Everything the window shows comes from
its :class:`~app.document.ProjectDocument`; the window itself holds no project data.
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QByteArray, Qt
from PySide6.QtGui import QAction, QActionGroup, QCloseEvent
from PySide6.QtWidgets import (
    QApplication,
    QComboBox,
    QFileDialog,
    QLabel,
    QLineEdit,
    QMainWindow,
    QMenu,
    QMessageBox,
    QScrollArea,
    QSplitter,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

from app import clipboard, focus, settings
from app.cautions import CautionsBanner
from app.document import ProjectDocument
from app.focus import INPUT_TABS
from app.help_page import HelpDialog
from app.layout_barrier import LayoutBarrier
from app.panels import actions as action_table
from app.panels.criteria import CriteriaPanel
from app.panels.duty import DutyPanel
from app.panels.export_controller import ExportController
from app.panels.file_controller import FileController
from app.panels.message_bar import MessageBar
from app.panels.pipework import PipeworkPanel
from app.panels.pumps import PumpsPanel
from app.panels.site_fluid import SiteFluidPanel
from app.panels.table_view import SpreadsheetView
from app.plots.plot_tabs import PlotTabs
from app.recovery import Autosaver, RecoveredEdits
from app.results.checks_panel import ChecksPanel
from app.results.operating_points_table import OperatingPointsTable
from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.project_io import FILE_SUFFIX
from hydraulics.results import Solution

APP_TITLE = "PumpSketch"
UNIT_SYSTEM_LABELS = {"SI": "SI (m, L/s, kPa)", "US": "US customary (ft, gpm, psi)"}
PROJECT_FILTER = f"PumpSketch projects (*{FILE_SUFFIX});;All files (*)"
STATUS_TIMEOUT_MS = 10_000


def _scrolled(widget: QWidget) -> QScrollArea:
    area = QScrollArea()
    area.setWidget(widget)
    area.setWidgetResizable(True)
    area.setFrameShape(QScrollArea.Shape.NoFrame)
    return area


class MainWindow(QMainWindow):
    """The PumpSketch window on one :class:`ProjectDocument`."""

    def __init__(self, document: ProjectDocument | None = None, parent: QWidget | None = None,
                 remember_layout: bool = True):
        super().__init__(parent)
        self.document = document or ProjectDocument(unit_system=settings.unit_system())
        if self.document.parent() is None:
            self.document.setParent(self)  # the window owns its document
        self._remember_layout = remember_layout
        self.files = FileController(self)
        self.exports = ExportController(self)  # File > Export and Edit > Copy plot
        self.autosaver = Autosaver(self.document, parent=self)  # unsaved edits to a recovery file (app.recovery)
        self._help_dialog: HelpDialog | None = None
        self._build_widgets()
        self._build_layout()
        self._build_actions()
        self._connect()
        self._update_title()
        self.statusBar().showMessage("Ready")
        self.resize(1400, 900)
        if remember_layout:
            self._restore_state()
        self.document.schedule_recompute()

    # ------------------------------------------------------------------ assembly
    def _build_widgets(self) -> None:
        doc = self.document
        self.site_panel = SiteFluidPanel(doc)
        self.pipework = PipeworkPanel(doc)
        self.pumps_panel = PumpsPanel(doc)
        self.criteria_panel = CriteriaPanel(doc)
        self.duty_panel = DutyPanel(doc)
        self.input_tabs = QTabWidget()
        self.input_tabs.setObjectName("input_tabs")
        for title, panel in zip(INPUT_TABS, (self.site_panel, self.pipework, self.pumps_panel,
                                             self.criteria_panel, self.duty_panel), strict=True):
            page = LayoutBarrier(panel) if panel is self.pipework else _scrolled(panel)
            self.input_tabs.addTab(page, title.replace("&", "&&"))
        self.input_tabs.setCurrentIndex(1)
        self.plot_tabs = PlotTabs()
        self.checks_panel = ChecksPanel()
        self.points_table = OperatingPointsTable()
        self.cautions = CautionsBanner()
        self.message_bar = MessageBar()
        self.units_combo = QComboBox()
        self.units_combo.setObjectName("units_combo")
        self.units_combo.setToolTip("Units on display; the project is stored in SI whatever is shown.")
        for system, label in UNIT_SYSTEM_LABELS.items():
            self.units_combo.addItem(label, system)

    def _titled(self, title: str, widget: QWidget) -> QWidget:
        box = QWidget()
        layout = QVBoxLayout(box)
        layout.setContentsMargins(2, 2, 2, 2)
        layout.setSpacing(2)
        heading = QLabel(f"<b>{title}</b>")
        layout.addWidget(heading)
        layout.addWidget(widget, 1)
        return box

    def _build_layout(self) -> None:
        results = QSplitter(Qt.Orientation.Horizontal)
        results.addWidget(self._titled("Checks", self.checks_panel))
        results.addWidget(self._titled("Operating points", self.points_table))
        results.setSizes([470, 530])
        self.centre_splitter = QSplitter(Qt.Orientation.Vertical)
        self.centre_splitter.addWidget(self.plot_tabs)
        self.centre_splitter.addWidget(results)
        self.centre_splitter.setStretchFactor(0, 3)
        self.centre_splitter.setStretchFactor(1, 2)
        self.main_splitter = QSplitter(Qt.Orientation.Horizontal)
        self.main_splitter.setObjectName("main_splitter")
        self.main_splitter.addWidget(self.input_tabs)
        self.main_splitter.addWidget(self.centre_splitter)
        self.main_splitter.setStretchFactor(0, 2)
        self.main_splitter.setStretchFactor(1, 3)
        self.main_splitter.setSizes([560, 840])
        self.results_splitter = results
        central = QWidget()
        layout = QVBoxLayout(central)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.setSpacing(0)
        layout.addWidget(self.message_bar)
        layout.addWidget(self.main_splitter, 1)
        layout.addWidget(self.cautions)
        self.setCentralWidget(central)

    def _build_actions(self) -> None:
        self.named_actions = action_table.build_actions(self, self.document.undo_stack)
        self.units_group = QActionGroup(self)
        units_menu = QMenu("&Units", self)
        for system, label in UNIT_SYSTEM_LABELS.items():
            action = QAction(label, self, checkable=True)
            action.setData(system)
            action.setObjectName(f"action_units_{system}")
            self.units_group.addAction(action)
            units_menu.addAction(action)
        self.samples_menu = self.files.samples_menu()
        self.recent_menu = self.files.recent_menu()
        action_table.build_menus(self, self.named_actions,
                                 {"units": units_menu, "samples": self.samples_menu, "recent": self.recent_menu})
        self.toolbar = action_table.build_toolbar(self, self.named_actions, {"units": self.units_combo})
        self._show_unit_system(self.document.unit_system)

    def _connect(self) -> None:
        doc = self.document
        doc.curvesReady.connect(self._show_first_stage)
        doc.solutionChanged.connect(self._show_solution)
        doc.solveFailed.connect(self._show_solve_failure)
        doc.editRefused.connect(self._show_refusal)
        doc.fileStateChanged.connect(self._update_title)
        doc.projectChanged.connect(self._on_project_changed)
        doc.unitSystemChanged.connect(self._on_unit_system_changed)
        doc.focusRequested.connect(self.focus_target)
        doc.undo_stack.indexChanged.connect(self._on_undo_index)
        self.units_combo.activated.connect(self._on_units_chosen)
        self.units_group.triggered.connect(self._on_units_action)
        self.checks_panel.findingActivated.connect(self.focus_target)
        self.cautions.helpRequested.connect(self.show_methods)
        self.pumps_panel.message.connect(self.show_status)
        self.autosaver.failed.connect(self.show_status)

    # ------------------------------------------------------------------ showing results
    def _show_first_stage(self, first: Solution) -> None:  # the plot is painted first, the checks a few ms later
        self.plot_tabs.show_and_paint(first, self.document.unit_system)

    def _show_solution(self, solution: Solution) -> None:
        system = self.document.unit_system
        self.plot_tabs.show_solution(solution, system)  # no redraw when only the checks were added
        self.checks_panel.show_findings(solution.findings, system)
        self.points_table.show_solution(solution, system)
        self.message_bar.dismiss("stale")

    def _show_solve_failure(self, message: str) -> None:
        self.plot_tabs.show_solution(None, self.document.unit_system)
        self.checks_panel.show_findings((), self.document.unit_system, solved=False)
        self.points_table.show_solution(None, self.document.unit_system)
        self.message_bar.show_message(message, "stale")

    def _show_refusal(self, message: str) -> None:
        self.message_bar.show_message(message, "refused")
        self.statusBar().showMessage(message, STATUS_TIMEOUT_MS)

    def show_status(self, message: str) -> None:
        """A passing note in the status bar."""
        self.statusBar().showMessage(message, STATUS_TIMEOUT_MS)

    def _on_project_changed(self) -> None:
        self._update_title()
        if self._help_dialog is not None:
            self._help_dialog.page.set_criteria(self.document.project.criteria)

    def _update_title(self) -> None:
        self.setWindowTitle(f"{self.document.display_name()}[*] — {APP_TITLE}")
        self.setWindowModified(self.document.is_modified)

    def _on_undo_index(self, _index: int) -> None:
        self.message_bar.dismiss("refused")  # an accepted edit, undo or redo supersedes a refusal

    # ------------------------------------------------------------------ units
    def _on_units_chosen(self, position: int) -> None:
        self.set_unit_system(self.units_combo.itemData(position))

    def _on_units_action(self, action: QAction) -> None:
        self.set_unit_system(action.data())

    def set_unit_system(self, system: str) -> None:
        """Show everything in ``system`` ("SI" or "US") and remember the choice."""
        self.document.set_unit_system(system)
        settings.set_unit_system(system)

    def _on_unit_system_changed(self, system: str) -> None:
        self._show_unit_system(system)
        solution = self.document.solution
        if solution is not None:
            self._show_solution(solution)

    def _show_unit_system(self, system: str) -> None:
        self.units_combo.setCurrentIndex(self.units_combo.findData(system))
        for action in self.units_group.actions():
            action.setChecked(action.data() == system)

    # ------------------------------------------------------------------ focus
    def focus_target(self, target: tuple[object, ...] | None) -> None:
        """Bring what a finding or an undone edit is about into view (:func:`app.focus.focus_target`)."""
        focus.focus_target(self, target)

    # ------------------------------------------------------------------ action slots
    def new_project(self) -> bool:
        return self.files.new()

    def open_project(self) -> bool:
        return self.files.open()

    def open_path(self, path: str | Path) -> bool:
        """Open ``path`` (asking about unsaved changes first)."""
        return self.files.open_path(path)

    def save_project(self) -> bool:
        return self.files.save()

    def save_project_as(self) -> bool:
        return self.files.save_as()

    def _focused_table(self) -> SpreadsheetView | None:
        widget = QApplication.focusWidget()
        while widget is not None and not isinstance(widget, SpreadsheetView):
            widget = widget.parentWidget()
        return widget

    def copy_cells(self) -> None:
        widget = QApplication.focusWidget()
        if isinstance(widget, QLineEdit):
            widget.copy()
            return
        table = self._focused_table()
        if table is not None and clipboard.copy_selection(table):
            self.show_status("Copied the selected cells as tab-separated text.")

    def paste_cells(self) -> None:
        widget = QApplication.focusWidget()
        if isinstance(widget, QLineEdit):
            widget.paste()
            return
        table = self._focused_table()
        if table is None:
            self.show_status("Click a cell of a table to paste into it.")
            return
        if clipboard.paste_clipboard(table):
            self.show_status("Pasted (one undo step).")

    def larger_pipe(self) -> bool:
        return self.pipework.step_selected(1)

    def smaller_pipe(self) -> bool:
        return self.pipework.step_selected(-1)

    def pin_curves(self) -> None:
        self.plot_tabs.pin_snapshot()
        self.show_status("Present curves pinned as a faint snapshot.")

    def clear_pinned(self) -> None:
        self.plot_tabs.clear_snapshot()

    def fit_plots(self) -> None:
        self.plot_tabs.fit_view()

    def show_methods(self) -> None:
        if self._help_dialog is None:
            self._help_dialog = HelpDialog(self, self.document.project.criteria)
        if self._help_dialog.isVisible():
            self._help_dialog.raise_()  # already open behind the window: bring it forward
        else:
            self._help_dialog.show()

    def show_shortcuts(self) -> None:
        self.show_information("Keyboard shortcuts", action_table.shortcuts_html(self.named_actions))

    def show_about(self) -> None:
        self.show_information(f"About {APP_TITLE}", action_table.about_html(APP_TITLE, CAUTIONS_TEXT))

    # ------------------------------------------------------------------ questions (tests replace these)
    def ask_save_changes(self) -> str:
        """Ask whether to save unsaved changes: "save", "discard" or "cancel"."""
        buttons = QMessageBox.StandardButton
        answer = QMessageBox.question(self, APP_TITLE, f"Save the changes to {self.document.display_name()}?",
                                      buttons.Save | buttons.Discard | buttons.Cancel, buttons.Save)
        return {buttons.Save: "save", buttons.Discard: "discard"}.get(answer, "cancel")

    def ask_restore(self, edits: RecoveredEdits) -> bool:
        """Ask whether to restore unsaved edits left by a window that did not close normally."""
        text = f"PumpSketch did not close normally.\n\n{edits.description()}.\n\nRestore them? (No deletes them.)"
        yes, no = QMessageBox.StandardButton.Yes, QMessageBox.StandardButton.No
        return QMessageBox.question(self, APP_TITLE, text, yes | no, yes) == yes

    def ask_open_path(self) -> str:
        path, _filter = QFileDialog.getOpenFileName(self, "Open project", self._start_folder(), PROJECT_FILTER)
        return path

    def ask_save_path(self) -> str:
        suggested = str(Path(self._start_folder()) / (self.document.display_name() + FILE_SUFFIX))
        path, _filter = QFileDialog.getSaveFileName(self, "Save project as", suggested, PROJECT_FILTER)
        return path

    def show_error(self, title: str, text: str) -> None:
        QMessageBox.warning(self, title, text)

    def show_information(self, title: str, html: str) -> None:
        QMessageBox.about(self, title, html)

    def _start_folder(self) -> str:
        path = self.document.file_path
        return str(path.parent) if path is not None else str(Path.home())

    # ------------------------------------------------------------------ closing
    def closeEvent(self, event: QCloseEvent) -> None:
        if self.files.maybe_save():
            if self._remember_layout:
                settings.set_window_state(bytes(self.saveGeometry().data()),
                                          [bytes(s.saveState().data()) for s in self._splitters()])
            self.autosaver.close()  # a clean exit: the recovery file goes
            event.accept()
        else:
            event.ignore()

    def _splitters(self) -> tuple[QSplitter, ...]:
        return self.main_splitter, self.centre_splitter, self.results_splitter

    def _restore_state(self) -> None:
        geometry, splitters = settings.window_state()
        if geometry:
            self.restoreGeometry(QByteArray(geometry))
        # Settings from an older layout may hold fewer (or more) splitter states than the window has now.
        for splitter, state in zip(self._splitters(), splitters, strict=False):
            if state:
                splitter.restoreState(QByteArray(bytes(state)))
