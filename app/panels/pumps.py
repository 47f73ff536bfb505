"""The "Pumps" panel: the pump model used, its curve points, and how the station runs it.

The chooser picks the pump model the station uses (``arrangement.pump_id``); the data
and points below are that pump's.  The arrangement says how many identical pumps run in
parallel (duty), how many stand by, series stages, speed and impeller diameter.  The
installed-pumps table below lists every pump of the station (P1, P2, …): the arrangement's,
read-only, then the pumps installed beside them, of any of the project's models, each
with its role and speed control.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path
from typing import Any

from PySide6.QtCore import QSignalBlocker, Qt, Signal
from PySide6.QtWidgets import (
    QComboBox,
    QFileDialog,
    QGroupBox,
    QHBoxLayout,
    QInputDialog,
    QLabel,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from app.document import ProjectDocument
from app.panels.form import ChoiceField, FormPanel, NumberField, Section, TextField
from app.panels.table_view import SpreadsheetView
from app.table_models.installed_pumps import InstalledPumpsModel
from app.table_models.pump_points import PumpPointsModel
from hydraulics import project_edits
from hydraulics.model import ModelError, Project, PumpModel
from hydraulics.pump_csv import PumpCsvError, read_pump_csv_with_messages


def _has_pump(project: Project) -> bool:
    return project.duty_pump is not None


def _duty_pump(project: Project) -> PumpModel:
    """The pump the fields edit (they are shown only when there is one)."""
    pump = project.duty_pump
    if pump is None:
        raise ModelError("pumps", "the project has no pump yet; import or add a pump first")
    return pump


def _with_duty_pump_changes(project: Project, **changes: Any) -> Project:
    return project_edits.with_pump_changes(project, _duty_pump(project).pump_id, **changes)


def _pump_field(key: str, label: str, quantity: str, limit: str, attribute: str, optional: bool = False,
                tooltip: str = "") -> NumberField:
    return NumberField(
        key, label, quantity, limit,
        lambda p: getattr(p.duty_pump, attribute) if p.duty_pump is not None else None,
        lambda p, v: _with_duty_pump_changes(p, **{attribute: v}),
        visible=_has_pump, optional=optional, tooltip=tooltip)


def _arrangement_field(key: str, label: str, quantity: str, limit: str, attribute: str,
                       tooltip: str = "", optional: bool = False,
                       enabled: Callable[[Project], bool] = _has_pump) -> NumberField:
    return NumberField(
        key, label, quantity, limit,
        lambda p: getattr(p.arrangement, attribute) if p.arrangement is not None else None,
        lambda p, v: project_edits.with_arrangement_changes(p, **{attribute: v}),
        visible=_has_pump, tooltip=tooltip, optional=optional, enabled=enabled)


def _variable_speed(project: Project) -> bool:
    return project.arrangement is not None and project.arrangement.variable_speed


TRIM_MEANING = ("The impeller diameter as a percentage of the tested one (100 %: not trimmed). The trim is the "
                "reduction: a diameter of 95 % is a 5 % trim, as the criteria and the checks count it.")
"""What "trim" means wherever the window says it: the reduction of impeller diameter, 100 % − D/D_tested."""

SPEED_CONTROL_CHOICES = [(False, "Fixed speed"), (True, "Variable speed (drive)")]


PUMP_SECTIONS = (
    Section("Pump data", (
        TextField("pump_name", "Name", lambda p: p.duty_pump.name if p.duty_pump else "",
                  lambda p, v: _with_duty_pump_changes(p, name=v), visible=_has_pump),
        _pump_field("rated_speed", "Rated (test) speed", "speed", "pump.rated_speed_rpm", "rated_speed_rpm",
                    tooltip="Speed at which the curve points were measured."),
        _pump_field("impeller_diameter", "Impeller diameter", "diameter", "pump.impeller_diameter_m",
                    "impeller_diameter_m", optional=True, tooltip="Tested impeller diameter (optional)."),
        _pump_field("head_fit_order", "Fit order: head", "dimensionless", "pump.fit_order", "head_fit_order",
                    tooltip="Polynomial order of the head curve fit (1–4)."),
        _pump_field("efficiency_fit_order", "Fit order: efficiency", "dimensionless", "pump.fit_order",
                    "efficiency_fit_order"),
        _pump_field("power_fit_order", "Fit order: power", "dimensionless", "pump.fit_order", "power_fit_order"),
    ), visible=_has_pump),
)

ARRANGEMENT_SECTIONS = (
    Section("How the station runs it", (
        _arrangement_field("duty_count", "Duty pumps (in parallel)", "dimensionless", "arrangement.duty_count",
                           "duty_count", tooltip="Curves are drawn for 1 up to this many identical pumps."),
        _arrangement_field("standby_count", "Standby pumps", "dimensionless", "arrangement.standby_count",
                           "standby_count"),
        _arrangement_field("series_stages", "Pumps in series per line", "dimensionless",
                           "arrangement.series_stages", "series_stages"),
        ChoiceField("speed_control", "Speed control", lambda _p: SPEED_CONTROL_CHOICES,
                    lambda p: _variable_speed(p), project_edits.with_speed_control, visible=_has_pump,
                    tooltip="Fixed speed runs only at the running speed; variable speed searches the drive's range."),
        _arrangement_field("speed_ratio", "Running speed (% of rated)", "ratio_percent", "arrangement.speed_ratio",
                           "speed_ratio"),
        _arrangement_field("min_speed_ratio", "Variable speed from (% of rated)", "ratio_percent",
                           "arrangement.speed_ratio", "min_speed_ratio", enabled=_variable_speed),
        _arrangement_field("max_speed_ratio", "Variable speed to (% of rated)", "ratio_percent",
                           "arrangement.speed_ratio", "max_speed_ratio", enabled=_variable_speed),
        _arrangement_field("trim_ratio", "Impeller diameter (% of tested)", "ratio_percent",
                           "arrangement.trim_ratio", "trim_ratio", tooltip=TRIM_MEANING),
        _arrangement_field("motor_efficiency", "Motor efficiency", "ratio_percent", "arrangement.efficiency",
                           "motor_efficiency"),
        _arrangement_field("drive_efficiency", "Drive (VSD) efficiency", "ratio_percent", "arrangement.efficiency",
                           "drive_efficiency", tooltip="100 % for a direct-on-line motor."),
        _arrangement_field("motor_rating", "Motor rating", "power", "arrangement.motor_rating_w", "motor_rating_w",
                           optional=True, tooltip="Rated output power of the motor (blank: not given)."),
        _arrangement_field("service_factor", "Service factor", "dimensionless", "arrangement.service_factor",
                           "service_factor", tooltip="1.0 for IEC motors; NEMA MG 1 motors 1.0 or 1.15."),
    ), visible=_has_pump),
)

INSTALLED_PUMPS_NOTE = (
    "Every pump of the station, tagged P1, P2, … as in the results. The grey rows are the arrangement's "
    "identical duty and standby pumps (set above); add pumps of any of the project's models beside them. "
    "Roles: duty pumps run in normal operation; assist pumps are switched in after them when the flow needs "
    "them; standby pumps run only in place of a pump out of service. Pumps of different models run in "
    "parallel at the manifold head. Each pump has its own suction and discharge branch, built like the "
    "Pipework segments that carry \"Each pump\".")

NO_ARRANGEMENT_TEXT = "No pump arrangement yet: import or add a pump first, then add the pumps installed beside it."

NO_PUMP_TEXT = ("No pump yet. Import a manufacturer's curve (CSV with a header naming each column and its "
                "unit, e.g. \"flow [L/s], head [m], efficiency [%]\"), or start a new pump from an example "
                "curve and type its points.")


SOURCE_COMMENT_LINES = 3
"""Comment lines of the pump data file shown under its name (all of them in the tooltip)."""


def pump_source_texts(pump: PumpModel) -> tuple[str, str]:
    """The "Source" line of a pump and its tooltip: the data file's name and its comment lines."""
    comments = [line.strip() for line in pump.source_comments if line.strip()]
    if pump.source_file:
        text = f"Source: {pump.source_file}"
    else:
        text = "Source: typed in or example data (no data file)"
    if comments:
        text += "\n" + "\n".join(f"  # {line}" for line in comments[:SOURCE_COMMENT_LINES])
        if len(comments) > SOURCE_COMMENT_LINES:
            text += f"\n  … {len(comments) - SOURCE_COMMENT_LINES} more (every line in the tooltip)"
    if comments:
        tooltip = "\n".join([f"Pump data read from {pump.source_file or 'a file'}:", *(f"# {c}" for c in comments)])
    elif pump.source_file:
        tooltip = f"Pump data read from {pump.source_file}; the file had no comment lines."
    else:
        tooltip = "These points were typed in (or are the example curve); no data file records where they came from."
    return text, tooltip


class PumpsPanel(QWidget):
    """The "Pumps" input panel.  ``message(str)`` reports notes made while importing."""

    message = Signal(str)

    def __init__(self, document: ProjectDocument, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._document = document
        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)

        chooser_row = QHBoxLayout()
        chooser_row.addWidget(QLabel("Pump model"))
        self.chooser = QComboBox()
        self.chooser.setObjectName("pump_chooser")
        self.chooser.setToolTip("The pump model the station uses.")
        self.chooser.activated.connect(self._on_chosen)
        chooser_row.addWidget(self.chooser, 1)
        layout.addLayout(chooser_row)
        buttons = QHBoxLayout()
        self.import_button = QPushButton("Import CSV…")
        self.import_button.clicked.connect(lambda: self.import_csv())
        self.new_button = QPushButton("New pump")
        self.new_button.setToolTip("Add a pump with an example curve meeting the design flow, to edit.")
        self.new_button.clicked.connect(self.add_example_pump)
        self.remove_button = QPushButton("Remove pump")
        self.remove_button.clicked.connect(self.remove_pump)
        for button in (self.import_button, self.new_button, self.remove_button):
            buttons.addWidget(button)
        buttons.addStretch(1)
        layout.addLayout(buttons)

        self.no_pump_label = QLabel(NO_PUMP_TEXT)
        self.no_pump_label.setWordWrap(True)
        layout.addWidget(self.no_pump_label)

        self.source_label = QLabel()
        self.source_label.setObjectName("pump_source")
        self.source_label.setWordWrap(True)
        self.source_label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.source_label.setStyleSheet("color: #505050;")
        layout.addWidget(self.source_label)

        self.pump_form = FormPanel(document, "pump", PUMP_SECTIONS)
        layout.addWidget(self.pump_form)

        self.points_box = QGroupBox("Curve points at rated speed (one pump)")
        points_layout = QVBoxLayout(self.points_box)
        self.points_model = PumpPointsModel(document, self)
        self.points_view = SpreadsheetView()
        self.points_view.setObjectName("pump_points_table")
        self.points_view.setModel(self.points_model)
        self.points_view.setMinimumHeight(180)
        points_layout.addWidget(self.points_view)
        point_buttons = QHBoxLayout()
        add_point = QPushButton("Add point")
        add_point.clicked.connect(self._add_point)
        remove_point = QPushButton("Remove point")
        remove_point.clicked.connect(self._remove_points)
        point_buttons.addWidget(add_point)
        point_buttons.addWidget(remove_point)
        point_buttons.addStretch(1)
        points_layout.addLayout(point_buttons)
        hint = QLabel("Efficiency, NPSH required and power are optional: give each at every point or "
                      "none (paste a whole column from a spreadsheet).")
        hint.setWordWrap(True)
        hint.setStyleSheet("color: #505050;")
        points_layout.addWidget(hint)
        layout.addWidget(self.points_box)

        self.arrangement_form = FormPanel(document, "arrangement", ARRANGEMENT_SECTIONS)
        layout.addWidget(self.arrangement_form)
        layout.addWidget(self._build_installed_box(document))
        layout.addStretch(1)

        self._shown: tuple[tuple[PumpModel, ...], str | None] | None = None
        document.projectChanged.connect(self.refresh)
        self.refresh()

    def _build_installed_box(self, document: ProjectDocument) -> QGroupBox:
        self.installed_box = QGroupBox("Installed pumps")
        box_layout = QVBoxLayout(self.installed_box)
        note = QLabel(INSTALLED_PUMPS_NOTE)
        note.setWordWrap(True)
        note.setStyleSheet("color: #505050;")
        box_layout.addWidget(note)
        self.no_arrangement_label = QLabel(NO_ARRANGEMENT_TEXT)
        self.no_arrangement_label.setWordWrap(True)
        box_layout.addWidget(self.no_arrangement_label)
        self.installed_model = InstalledPumpsModel(document, self)
        self.installed_view = SpreadsheetView()
        self.installed_view.setObjectName("installed_pumps_table")
        self.installed_view.setModel(self.installed_model)
        self.installed_view.setMinimumHeight(130)
        box_layout.addWidget(self.installed_view)
        row = QHBoxLayout()
        self.add_installed_button = QPushButton("Add installed pump")
        self.add_installed_button.setToolTip("Add a pump beside the arrangement's (an assist pump to start with).")
        self.add_installed_button.clicked.connect(self.add_installed_pump)
        self.remove_installed_button = QPushButton("Remove installed pump")
        self.remove_installed_button.clicked.connect(self.remove_installed_pumps)
        row.addWidget(self.add_installed_button)
        row.addWidget(self.remove_installed_button)
        row.addStretch(1)
        box_layout.addLayout(row)
        return self.installed_box

    def _refresh_installed(self, project: Project) -> None:
        has_arrangement = project.arrangement is not None
        self.no_arrangement_label.setVisible(not has_arrangement)
        self.installed_view.setVisible(has_arrangement)
        self.add_installed_button.setEnabled(has_arrangement)
        self.remove_installed_button.setEnabled(bool(project.other_pumps))

    # ------------------------------------------------------------------ display
    def refresh(self) -> None:
        project = self._document.project
        self._refresh_installed(project)
        pump = project.duty_pump
        shown = (project.pumps, project.arrangement.pump_id if project.arrangement is not None else None)
        if shown == self._shown:
            return  # an edit elsewhere (the pipework): the chooser and points stay as they are
        self._shown = shown
        with QSignalBlocker(self.chooser):
            self.chooser.clear()
            for p in project.pumps:
                self.chooser.addItem(p.name, p.pump_id)
            self.chooser.setCurrentIndex(self.chooser.findData(pump.pump_id) if pump is not None else -1)
        self.chooser.setEnabled(bool(project.pumps))
        self.remove_button.setEnabled(pump is not None)
        self.no_pump_label.setVisible(pump is None)
        self.points_box.setVisible(pump is not None)
        self.points_model.set_pump(pump.pump_id if pump is not None else None)
        self._show_source(pump)

    def _show_source(self, pump: PumpModel | None) -> None:
        """The pump data's provenance: the file read and its comment lines (read-only)."""
        self.source_label.setVisible(pump is not None)
        if pump is None:
            return
        text, tooltip = pump_source_texts(pump)
        self.source_label.setText(text)
        self.source_label.setToolTip(tooltip)

    def show_pump(self, pump_id: str) -> None:
        """Bring a pump into view (the chooser shows the station's pump)."""
        self.points_view.setFocus()

    def show_installed_pump(self, row: int) -> None:
        """Select row ``row`` of the installed-pumps table."""
        if 0 <= row < self.installed_model.rowCount():
            self.installed_view.select_row(row)
        self.installed_view.setFocus()

    def add_installed_pump(self) -> bool:
        """Add a pump beside the arrangement's after the current row (at the end without one)."""
        return self.installed_view.add_row_below_current(select=False)

    def remove_installed_pumps(self) -> bool:
        """Remove the selected pumps beside the arrangement's (the last one when none is selected)."""
        rows = self.installed_view.selected_rows()
        if not rows and self._document.project.other_pumps:
            rows = [self.installed_model.rowCount() - 1]
        return self.installed_model.remove_rows(rows)

    # ------------------------------------------------------------------ edits
    def _on_chosen(self, position: int) -> None:
        pump_id = self.chooser.itemData(position)
        if pump_id is None:
            return
        project = self._document.project
        self._document.apply(project_edits.with_duty_pump(project, pump_id), "Choose pump model", ("pump", pump_id))

    def add_example_pump(self) -> bool:
        project = self._document.project
        pump = project_edits.example_pump(project, self._document.solution)
        return self._document.apply(project_edits.with_added_pump(project, pump), "New pump", ("pump", pump.pump_id))

    def remove_pump(self) -> bool:
        project = self._document.project
        pump = project.duty_pump
        if pump is None:
            return False
        return self._document.apply(project_edits.with_removed_pump(project, pump.pump_id),
                                    f"Remove pump '{pump.name}'", ("pump", pump.pump_id))

    def ask_csv_path(self) -> str:
        """Ask for a pump data file (tests replace this method)."""
        path, _filter = QFileDialog.getOpenFileName(self, "Import pump curve", "",
                                                    "Pump data (*.csv *.txt);;All files (*)")
        return path

    def ask_rated_speed(self, file_name: str) -> float | None:
        """Ask the rated speed when a file does not give it (tests replace this method)."""
        value, ok = QInputDialog.getDouble(
            self, "Rated speed", f"{file_name} does not give the speed of the test (rpm):",
            1450.0, 100.0, 10000.0, 0)
        return value if ok else None

    def import_csv(self, path: str | None = None) -> bool:
        """Read a pump data file and make it the station's pump (one undo step)."""
        path = path or self.ask_csv_path()
        if not path:
            return False
        project = self._document.project
        file_name = Path(path).name
        pump_id = project_edits.imported_pump_id(project, Path(path))
        name = Path(path).stem
        try:
            try:
                pump, notes = read_pump_csv_with_messages(Path(path), pump_id, name)
            except PumpCsvError as exc:
                if "speed" not in str(exc):
                    raise
                speed = self.ask_rated_speed(file_name)
                if speed is None:
                    return False
                pump, notes = read_pump_csv_with_messages(Path(path), pump_id, name, rated_speed_rpm=speed)
        except (PumpCsvError, OSError, ValueError) as exc:
            self._document.refuse(f"Pump data not imported — {file_name}: {exc}")
            return False
        applied = self._document.apply(project_edits.with_added_pump(project, pump),
                                       f"Import pump curve {file_name}", ("pump", pump_id))
        if applied:
            summary = f"Imported {len(pump.flow_m3_s)} points from {file_name}."
            self.message.emit(" ".join([summary] + [f"Note: {n}." for n in notes]))
        return applied

    def _add_point(self) -> None:
        self.points_view.add_row_below_current(select=False)

    def _remove_points(self) -> None:
        self.points_view.remove_selected_rows()
