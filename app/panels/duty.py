"""The "Duty" panel: the station's duty over a year and the energy it costs.

Above, how the duty is given (the bands' time basis, an optional annual volume that scales
the band flows, the control strategy and the pipe state of the year); below, the bands
themselves in a table (flow and time typed, pasted or inserted, each edit one undo step) whose
calculated columns show how the solved station meets each band; under it the totals of the
year.  Everything shown comes from the solution's ``duty_profile``; the panel computes
nothing.
"""

from __future__ import annotations

from PySide6.QtGui import QShowEvent
from PySide6.QtWidgets import QGroupBox, QLabel, QVBoxLayout, QWidget

from app.document import ProjectDocument
from app.panels.form import ChoiceField, FormPanel, NumberField, Section
from app.panels.table_view import SpreadsheetView, button_row
from app.table_models.cells import display_text, unit_suffix
from app.table_models.duty_bands import JOULES_PER_KWH, DutyBandsModel
from hydraulics.model import Project
from hydraulics.number_format import MISSING, general_number, grouped_whole_number
from hydraulics.project_edits import with_duty_profile_changes, with_duty_time_basis
from hydraulics.results import DutyProfileResult, Solution
from hydraulics.units import to_display

BANDS_HINT = ("One row per band of the year: the station flow and the time it is needed. Paste a block of "
              "flows and times from a spreadsheet, or add rows below.")
NO_BANDS_TEXT = ("No duty bands: the station's energy is only the simple estimate (all operating hours at the duty "
                 "point, Criteria tab).")


def _basis(project: Project) -> str:
    return project.duty_profile.time_basis


SECTIONS = (
    Section("How the duty is given", (
        ChoiceField("duty_time_basis", "Band time given as",
                    lambda p: [("hours", "hours per year"), ("share", "share of the year")],
                    _basis, with_duty_time_basis,
                    tooltip="Switching converts the times (share = hours / 8760)."),
        NumberField("duty_annual_volume", "Volume per year (optional)", "volume", "duty_profile.annual_volume_m3",
                    lambda p: p.duty_profile.annual_volume_m3,
                    lambda p, v: with_duty_profile_changes(p, annual_volume_m3=v), optional=True,
                    placeholder=lambda _doc: "not given: the band flows as typed",
                    tooltip="Given: the band flows are an inflow pattern, all scaled by one factor so that the "
                            "year's volume is this."),
        ChoiceField("duty_strategy", "Control",
                    lambda p: [("fixed_staging", "fixed-speed staging (stop–start)"),
                               ("variable_speed", "variable speed to match the flow")],
                    lambda p: p.duty_profile.strategy, lambda p, v: with_duty_profile_changes(p, strategy=v),
                    tooltip="Staging: the fewest pumps whose flow reaches the band run at their own speeds and stop "
                            "and start. Variable speed: the variable-speed pumps slow until the flow matches."),
        ChoiceField("duty_pipe", "Pipe over the year",
                    lambda p: [("aged", "aged"), ("new", "new")],
                    lambda p: p.duty_profile.pipe, lambda p, v: with_duty_profile_changes(p, pipe=v),
                    tooltip="Aged: the condition over most of a main's life."),
    ), note="The year is computed at the mean static head: the levels move between the extremes."),
)


def totals_text(duty: DutyProfileResult | None, project: Project, system: str) -> str:
    """The year's totals in plain words (display units), or why there are none."""
    if not project.duty_profile.bands:
        return NO_BANDS_TEXT
    if duty is None:
        return "The energy over the year is not computed (see the checks)."
    se_unit, vol_unit = unit_suffix("specific_energy", system), unit_suffix("volume", system)
    specific = (MISSING if duty.specific_energy_kwh_m3 is None
                else display_text(duty.specific_energy_kwh_m3 * JOULES_PER_KWH, "specific_energy", system, 3))
    lines = [
        f"Station energy over the year: {grouped_whole_number(duty.energy_kwh)} kWh, "
        f"cost {grouped_whole_number(duty.cost)} {duty.currency} "
        f"(at {general_number(duty.tariff_per_kwh, 6)} {duty.currency}/kWh)",
        f"Volume {grouped_whole_number(to_display(duty.volume_m3, 'volume', system))} {vol_unit} a year, "
        f"mean specific energy {specific} {se_unit}; pumps running {grouped_whole_number(duty.run_hours)} h of "
        f"{grouped_whole_number(duty.hours)} h",
    ]
    if duty.shortfall_volume_m3 > 0.0:
        short = grouped_whole_number(to_display(duty.shortfall_volume_m3, "volume", system))
        lines.append(f"Not pumped: {short} {vol_unit} a year (bands above the station's capacity)")
    lines += [f"Note: {note}" for note in duty.notes]
    lines += [f"Band {b.index + 1}: {b.note}" for b in duty.bands if b.note]
    return "\n".join(lines)


class DutyPanel(QWidget):
    """The "Duty" input panel: the profile's fields, the bands table and the year's totals."""

    def __init__(self, document: ProjectDocument, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._document = document
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        self.form = FormPanel(document, "duty", SECTIONS)
        layout.addWidget(self.form)

        self.bands_box = QGroupBox("Duty bands")
        bands_layout = QVBoxLayout(self.bands_box)
        hint = QLabel(BANDS_HINT)
        hint.setWordWrap(True)
        bands_layout.addWidget(hint)
        self.bands_model = DutyBandsModel(document, self)
        self.bands_view = SpreadsheetView()
        self.bands_view.setObjectName("duty_bands_table")
        self.bands_view.setModel(self.bands_model)
        self.bands_view.setMinimumHeight(180)
        bands_layout.addWidget(self.bands_view, 1)
        bands_layout.addLayout(button_row(
            ("Add band", self._add_band, "Insert a band below the selected one (it takes the rest of the year)."),
            ("Remove band", self._remove_bands, "Remove the selected bands.")))
        self.totals = QLabel()
        self.totals.setObjectName("duty_totals")
        self.totals.setWordWrap(True)
        bands_layout.addWidget(self.totals)
        layout.addWidget(self.bands_box, 1)

        document.solutionChanged.connect(self._show_totals)
        document.projectChanged.connect(self._show_stale)
        document.unitSystemChanged.connect(self._show_totals)
        self._show_totals()

    # ------------------------------------------------------------------ totals
    def _show_totals(self, *_args: object) -> None:
        solution: Solution | None = self._document.solution
        project = self._document.project
        if solution is None or solution.project is not project:
            self._show_stale()
            return
        self.totals.setText(totals_text(solution.duty_profile, project, self._document.unit_system))
        if self.isVisible():  # the calculated columns now hold text; a hidden panel fits them when shown
            self.bands_view.fit_columns()

    def _show_stale(self, *_args: object) -> None:
        project = self._document.project
        solution = self._document.solution
        if solution is not None and solution.project is project:
            return
        if not project.duty_profile.bands:
            self.totals.setText(NO_BANDS_TEXT)
        else:
            self.totals.setText("Solving…" if solution is not None else "No results: the project is not solved.")

    def showEvent(self, event: QShowEvent) -> None:
        self.bands_view.fit_columns()
        super().showEvent(event)

    # ------------------------------------------------------------------ bands
    def show_band(self, row: int) -> None:
        """Select band ``row`` (a finding or an undone edit about it)."""
        if self.bands_model.rowCount():
            self.bands_view.select_row(min(row, self.bands_model.rowCount() - 1))
            self.bands_view.setFocus()

    def _add_band(self) -> None:
        self.bands_view.add_row_below_current()

    def _remove_bands(self) -> None:
        self.bands_view.remove_selected_rows()
