"""The "Pipework" panel: the segments table, the pipe-size stepper, the selected segment's
fittings and the profile of the main.

Segments are listed in flow order.  Selecting one shows its fittings below; beside the
fittings, a second tab holds the main's profile (chainage, pipe elevation, air valves).  The size
stepper moves the selected segment one nominal size up or down its pipe series (arrow
buttons, mouse wheel over it, Up/Down keys in it, or Ctrl+Up / Ctrl+Down anywhere in the
window); each step is one undo step and the curves and checks follow at once.
"""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import (
    QAbstractSpinBox,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QPushButton,
    QSizePolicy,
    QSplitter,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

from app.document import ProjectDocument
from app.panels.table_view import SpreadsheetView, button_row
from app.table_models.cells import display_text, unit_suffix
from app.table_models.fittings import FittingsModel, previous_bore_m
from app.table_models.profile import ProfileModel
from app.table_models.segments import SegmentsModel
from hydraulics import catalogue, fittings
from hydraulics.model import ModelError, Segment
from hydraulics.number_format import general_number
from hydraulics.project_edits import main_length_m, stepped_segment, with_segment

PROFILE_HINT = ("Chainage along the common delivery pipework, from 0 at the first station delivery segment; "
                "mark vented summits with an air valve.")


class SizeStepper(QAbstractSpinBox):
    """A spin box that steps through nominal sizes: it shows text and asks for steps.

    ``stepRequested(int)`` carries +1 (larger) or −1 (smaller) per click, wheel notch
    or key press; the panel turns each into an undoable edit.
    """

    stepRequested = Signal(int)

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self.lineEdit().setReadOnly(True)
        self.setButtonSymbols(QAbstractSpinBox.ButtonSymbols.UpDownArrows)
        self.setAlignment(Qt.AlignmentFlag.AlignCenter)
        self.setMinimumWidth(130)
        self.setFocusPolicy(Qt.FocusPolicy.WheelFocus)
        self._can_up = False
        self._can_down = False

    def set_state(self, text: str, can_up: bool, can_down: bool) -> None:
        """Show ``text`` and enable the directions that can still step."""
        self.lineEdit().setText(text)
        self._can_up = can_up
        self._can_down = can_down
        self.update()

    def stepEnabled(self) -> QAbstractSpinBox.StepEnabledFlag:
        flags = QAbstractSpinBox.StepEnabledFlag.StepNone
        if self._can_up:
            flags |= QAbstractSpinBox.StepEnabledFlag.StepUpEnabled
        if self._can_down:
            flags |= QAbstractSpinBox.StepEnabledFlag.StepDownEnabled
        return flags

    def stepBy(self, steps: int) -> None:
        if steps:
            self.stepRequested.emit(int(steps))


class PipeworkPanel(QWidget):
    """The "Pipework" input panel."""

    def __init__(self, document: ProjectDocument, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._document = document
        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)
        splitter = QSplitter(Qt.Orientation.Vertical)
        layout.addWidget(splitter)

        # ---- segments
        top = QWidget()
        top_layout = QVBoxLayout(top)
        top_layout.setContentsMargins(0, 0, 0, 0)
        intro = QLabel("Pipe segments in flow order, suction side first. Type values with any unit "
                       "(\"300 mm\", \"12 in\"); a bare number is in the unit under the heading.")
        intro.setWordWrap(True)
        top_layout.addWidget(intro)
        self.segments_model = SegmentsModel(document, self)
        self.segments_view = SpreadsheetView()
        self.segments_view.setObjectName("segments_table")
        self.segments_view.setModel(self.segments_model)
        top_layout.addWidget(self.segments_view, 1)
        top_layout.addLayout(button_row(
            ("Add segment", self._add_segment, "Insert a segment below the selected one."),
            ("Remove", self._remove_segments, "Remove the selected segments."),
            ("Move up", lambda: self._move_segment(-1), "Move the selected segment up the route."),
            ("Move down", lambda: self._move_segment(1), "Move the selected segment down the route.")))
        size_row = QHBoxLayout()
        size_row.addWidget(QLabel("Pipe size of selected segment:"))
        self.size_stepper = SizeStepper()
        self.size_stepper.setObjectName("size_stepper")
        self.size_stepper.setToolTip("Step through the segment's pipe series: arrows, mouse wheel, "
                                     "or Ctrl+Up / Ctrl+Down anywhere in the window.")
        self.size_stepper.stepRequested.connect(self.step_selected)
        size_row.addWidget(self.size_stepper)
        size_row.addStretch(1)
        top_layout.addLayout(size_row)
        self.size_label = QLabel()
        self.size_label.setWordWrap(True)
        self.size_label.setSizePolicy(QSizePolicy.Policy.Ignored, QSizePolicy.Policy.Preferred)
        top_layout.addWidget(self.size_label)
        splitter.addWidget(top)

        # ---- fittings of the selected segment
        self.fittings_box = QGroupBox("Fittings")
        fittings_layout = QVBoxLayout(self.fittings_box)
        self.fittings_model = FittingsModel(document, self)
        self.fittings_view = SpreadsheetView()
        self.fittings_view.setObjectName("fittings_table")
        self.fittings_view.setModel(self.fittings_model)
        fittings_layout.addWidget(self.fittings_view, 1)
        fitting_buttons = QHBoxLayout()
        add_fitting = QPushButton("Add fitting")
        add_fitting.clicked.connect(self._add_fitting)
        remove_fitting = QPushButton("Remove fitting")
        remove_fitting.clicked.connect(self._remove_fittings)
        fitting_buttons.addWidget(add_fitting)
        fitting_buttons.addWidget(remove_fitting)
        fitting_buttons.addStretch(1)
        self.k_total_label = QLabel()
        fitting_buttons.addWidget(self.k_total_label)
        fittings_layout.addLayout(fitting_buttons)

        # ---- profile of the main
        self.profile_box = QGroupBox("Main profile")
        profile_layout = QVBoxLayout(self.profile_box)
        hint = QLabel(PROFILE_HINT)
        hint.setWordWrap(True)
        profile_layout.addWidget(hint)
        self.profile_model = ProfileModel(document, self)
        self.profile_view = SpreadsheetView()
        self.profile_view.setObjectName("profile_table")
        self.profile_view.setModel(self.profile_model)
        profile_layout.addWidget(self.profile_view, 1)
        profile_layout.addLayout(button_row(
            ("Add point", self._add_profile_point,
             "Insert a point below the selected one (an empty profile starts with the two ends of the main)."),
            ("Remove point", self._remove_profile_points, "Remove the selected points.")))

        self.lower_tabs = QTabWidget()
        self.lower_tabs.setObjectName("pipework_lower_tabs")
        self.lower_tabs.setDocumentMode(True)
        self.lower_tabs.addTab(self.fittings_box, "Fittings")
        self.lower_tabs.addTab(self.profile_box, "Main profile")
        self.lower_tabs.setTabToolTip(0, "The fittings of the selected segment")
        self.lower_tabs.setTabToolTip(1, "Chainage and pipe elevation along the main, with its air valves")
        splitter.addWidget(self.lower_tabs)
        splitter.setStretchFactor(0, 3)
        splitter.setStretchFactor(1, 2)

        self.segments_view.currentRowChanged.connect(self._on_segment_selected)
        self.segments_model.modelReset.connect(lambda: self.select_segment(0))
        document.projectChanged.connect(self._refresh_selected)
        document.unitSystemChanged.connect(self._refresh_selected)
        document.projectChanged.connect(self._refresh_profile_title)
        document.unitSystemChanged.connect(self._refresh_profile_title)
        self._refresh_profile_title()
        document.solutionChanged.connect(self._refresh_size_label)
        self.select_segment(0)
        self._refresh_selected()

    # ------------------------------------------------------------------ selection
    def current_segment(self) -> int | None:
        """The selected segment's index, or ``None``."""
        row = self.segments_view.current_row()
        return row if 0 <= row < len(self._document.project.segments) else None

    def select_segment(self, index: int) -> None:
        """Select segment ``index`` and show its fittings."""
        self.segments_view.select_row(index)
        self.fittings_model.set_segment(self.current_segment())
        self._refresh_selected()

    def _on_segment_selected(self, row: int) -> None:
        self.fittings_model.set_segment(row if row >= 0 else None)
        self._refresh_selected()

    def _refresh_selected(self, *_args: object) -> None:
        project = self._document.project
        index = self.current_segment()
        if self.fittings_model.segment_index != index:
            self.fittings_model.set_segment(index)
        if index is None:
            self.fittings_box.setTitle("Fittings (select a segment)")
            self.size_stepper.set_state("", False, False)
            self.size_label.setText("")
            self.k_total_label.setText("")
            return
        segment = project.segments[index]
        self.fittings_box.setTitle(f"Fittings of segment {index + 1} — {segment.name}")
        if segment.pipe_series is not None:
            self.size_stepper.set_state(segment.nominal_size or "", self._can_step(segment, 1),
                                        self._can_step(segment, -1))
        else:
            self.size_stepper.set_state("typed", True, True)
        self._refresh_size_label()
        try:
            total = fittings.segment_k_total(segment.fittings, segment.internal_diameter_m,
                                             upstream_diameter_m=previous_bore_m(project, index))
            self.k_total_label.setText(f"Total K of this segment: {general_number(total, 3)}")
        except ModelError as exc:
            self.k_total_label.setText(f"Total K: — ({exc.problem})")

    def _refresh_size_label(self, *_args: object) -> None:
        """The selected segment's bore, series and (once solved) velocity at design flow.

        The only part of this panel a new solution changes, so a solve updates just this.
        """
        project = self._document.project
        index = self.current_segment()
        if index is None:
            return
        segment = project.segments[index]
        system = self._document.unit_system
        bore = (f"Bore {display_text(segment.internal_diameter_m, 'diameter', system)} "
                f"{unit_suffix('diameter', system)}")
        solution = self._document.solution
        if solution is not None and solution.project is project and index < len(solution.segments):
            velocity = display_text(solution.segments[index].velocity_m_s, "velocity", system, 3)
            bore += f", {velocity} {unit_suffix('velocity', system)} at design flow"
        if segment.pipe_series is None:
            text = f"{bore} (typed; a step joins the material's first pipe series)"
        else:
            series = catalogue.pipe_series().get(segment.pipe_series)
            text = f"{bore} · {series.name}" if series is not None else bore
        if self.size_label.text() != text:
            self.size_label.setText(text)

    @staticmethod
    def _can_step(segment: Segment, steps: int) -> bool:
        try:
            return stepped_segment(segment, steps) != segment
        except ModelError:
            return False

    # ------------------------------------------------------------------ pipe size steps
    def step_size(self, index: int, steps: int) -> bool:
        """Move segment ``index`` ``steps`` nominal sizes through its series (one undo step)."""
        project = self._document.project
        if not 0 <= index < len(project.segments) or steps == 0:
            return False
        segment = project.segments[index]
        try:
            changed = stepped_segment(segment, steps)
        except ModelError as exc:
            self._document.refuse(f"Segment {index + 1} '{segment.name}' — {exc.problem}")
            return False
        if changed == segment:
            end = "largest" if steps > 0 else "smallest"
            self._document.refuse(f"Segment {index + 1} '{segment.name}' is already the {end} size of its series")
            return False
        word = "Larger" if steps > 0 else "Smaller"
        return self._document.apply(with_segment(project, index, changed),
                                    f"{word} pipe: segment {index + 1} to {changed.nominal_size}", ("segment", index))

    def step_selected(self, steps: int) -> bool:
        """Step the selected segment (the stepper, the wheel and Ctrl+Up/Down come here)."""
        index = self.current_segment()
        if index is None:
            self._document.refuse("Select a segment to change its pipe size")
            return False
        return self.step_size(index, steps)

    # ------------------------------------------------------------------ rows
    def _add_segment(self) -> None:
        index = self.current_segment()
        row = index + 1 if index is not None else self.segments_model.rowCount()
        if self.segments_model.insert_row(row):
            self.select_segment(row)

    def _remove_segments(self) -> None:
        rows = sorted({i.row() for i in self.segments_view.selectionModel().selectedIndexes()})
        current = self.current_segment()
        if not rows and current is not None:
            rows = [current]
        if self.segments_model.remove_rows(rows):
            self.select_segment(min(rows[0], self.segments_model.rowCount() - 1))

    def _move_segment(self, offset: int) -> None:
        index = self.current_segment()
        if index is not None and self.segments_model.move_row(index, offset):
            self.select_segment(index + offset)

    def _add_fitting(self) -> None:
        if self.fittings_model.segment_index is None:
            self._document.refuse("Select a segment to add a fitting to it")
            return
        self.fittings_view.add_row_below_current()

    def _remove_fittings(self) -> None:
        self.fittings_view.remove_selected_rows()

    # ------------------------------------------------------------------ profile points
    def _refresh_profile_title(self, *_args: object) -> None:
        """The profile's extent beside the main's length, so a short or long survey shows at once."""
        project = self._document.project
        system = self._document.unit_system
        unit = unit_suffix("length", system)
        main = f"main {display_text(main_length_m(project), 'length', system)} {unit} long"
        points = project.profile
        if not points:
            text = f"Main profile — no points; {main}"
        else:
            valves = sum(1 for p in points if p.air_valve)
            text = (f"Main profile — {len(points)} points from {display_text(points[0].chainage_m, 'length', system)}"
                    f" to {display_text(points[-1].chainage_m, 'length', system)} {unit}; {main}; "
                    f"{valves} air valve{'' if valves == 1 else 's'}")
        if self.profile_box.title() != text:
            self.profile_box.setTitle(text)

    def show_profile(self, row: int | None = None) -> None:
        """Bring the main's profile into view, with point ``row`` selected if given."""
        self.lower_tabs.setCurrentWidget(self.profile_box)
        if row is not None:
            self.profile_view.select_row(min(row, self.profile_model.rowCount() - 1))

    def _add_profile_point(self) -> None:
        self.profile_view.add_row_below_current()

    def _remove_profile_points(self) -> None:
        self.profile_view.remove_selected_rows()
