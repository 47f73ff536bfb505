"""The Duty panel: the bands table edited like the other tables, the year's totals shown from the solution.

Every value checked is typed by the test itself or read from the hilltop sample (an invented
scenario) and its solution; the hours of a common year are 365 × 24 = 8760.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest
from PySide6.QtCore import Qt

from app import clipboard
from app.panels.duty import NO_BANDS_TEXT
from hydraulics.number_format import grouped_whole_number
from hydraulics.project_edits import with_duty_bands

DISPLAY = Qt.ItemDataRole.DisplayRole
EDIT = Qt.ItemDataRole.EditRole


@pytest.fixture
def refusals(document) -> list[str]:
    messages: list[str] = []
    document.editRefused.connect(messages.append)
    return messages


@pytest.fixture
def panel(window):
    window.input_tabs.setCurrentIndex(window.input_tabs.count() - 1)
    return window.duty_panel


def _cell(model, row: int, key: str):
    return model.index(row, model.column_index(key))


def test_the_bands_model_passes_the_model_tester(qtmodeltester, panel, window):
    qtmodeltester.check(panel.bands_model)
    window.set_unit_system("US")
    qtmodeltester.check(panel.bands_model)


def test_editing_a_band_flow_changes_the_shown_totals_and_undo_restores_them(panel, document):
    model = panel.bands_model
    before_text = panel.totals.text()
    before = document.solution.duty_profile
    assert grouped_whole_number(before.energy_kwh) in before_text
    assert model.setData(_cell(model, 1, "flow"), "30", EDIT)  # L/s on display (was 26)
    assert document.project.duty_profile.bands[1].flow_m3_s == pytest.approx(0.030)
    document.recompute_now()
    after = document.solution.duty_profile
    assert after.energy_kwh > before.energy_kwh  # more volume pumped by the same pump
    assert grouped_whole_number(after.energy_kwh) in panel.totals.text()
    assert panel.totals.text() != before_text
    assert model.data(_cell(model, 1, "energy"), DISPLAY) == grouped_whole_number(after.bands[1].energy_kwh)
    assert model.data(_cell(model, 1, "pumps"), DISPLAY) == "P1"
    document.undo_stack.undo()
    document.recompute_now()
    assert panel.totals.text() == before_text


def test_a_bad_band_value_is_refused_naming_the_field_and_the_project_is_unchanged(panel, document, refusals):
    model = panel.bands_model
    project = document.project
    assert not model.setData(_cell(model, 0, "flow"), "-3", EDIT)
    assert document.project is project
    assert "Flow" in refusals[-1] and "between 0 and" in refusals[-1]
    # hours that take the bands beyond a leap year's 8784 h are refused by the profile's rule
    assert not model.setData(_cell(model, 0, "hours"), "8000", EDIT)
    assert document.project is project
    assert "duty_profile.bands" in refusals[-1] or "bands" in refusals[-1]


def test_a_pasted_block_of_bands_is_one_undo_step(panel, document):
    model = panel.bands_model
    project = document.project
    assert model.paste_block(0, 0, [["10", "1000"], ["20", "2000"], ["30", "3000"], ["36", "500"], ["5", "100"]])
    bands = document.project.duty_profile.bands
    assert [round(b.flow_m3_s * 1000.0, 9) for b in bands] == [10.0, 20.0, 30.0, 36.0, 5.0]
    assert [b.time for b in bands] == [1000.0, 2000.0, 3000.0, 500.0, 100.0]
    document.undo_stack.undo()
    assert document.project == project


def test_switching_to_shares_converts_the_times_and_the_column(panel, document):
    hours = [b.time for b in document.project.duty_profile.bands]
    panel.form.choose("duty_time_basis", "share")
    assert document.project.duty_profile.time_basis == "share"
    assert [b.time for b in document.project.duty_profile.bands] == pytest.approx([h / 8760.0 for h in hours])
    model = panel.bands_model
    assert model.column_index("share") == 1
    assert model.data(_cell(model, 0, "share"), DISPLAY) == f"{100.0 * hours[0] / 8760.0:.5g}"


def test_strategy_and_pipe_fields_are_undoable_edits(panel, document):
    panel.form.choose("duty_strategy", "variable_speed")
    assert document.project.duty_profile.strategy == "variable_speed"
    document.recompute_now()
    model = panel.bands_model
    assert model.data(_cell(model, 1, "control"), DISPLAY) == "variable speed"
    panel.form.choose("duty_pipe", "new")
    assert document.project.duty_profile.pipe == "new"
    document.undo_stack.undo()
    document.undo_stack.undo()
    assert document.project.duty_profile.strategy == "fixed_staging"


def test_adding_and_removing_bands(panel, document):
    view = panel.bands_view
    count = len(document.project.duty_profile.bands)
    view.select_row(count - 1)
    panel._add_band()
    assert len(document.project.duty_profile.bands) == count + 1
    view.select_row(count)
    panel._remove_bands()
    assert len(document.project.duty_profile.bands) == count


def test_without_bands_the_panel_says_only_the_simple_estimate_exists(panel, document):
    assert document.apply(with_duty_bands(document.project, ()), "no bands")
    document.recompute_now()
    assert panel.totals.text() == NO_BANDS_TEXT
    assert document.solution.duty_profile is None


def test_a_band_above_capacity_finding_selects_its_row(window, panel, document):
    model = panel.bands_model
    assert model.setData(_cell(model, 3, "flow"), "60", EDIT)  # far beyond the one duty pump
    document.recompute_now()
    found = [f for f in document.solution.findings if f.code == "duty_band_not_met"]
    assert found and found[0].target == ("duty", 3)
    window.input_tabs.setCurrentIndex(0)
    window.focus_target(found[0].target)
    assert window.input_tabs.tabText(window.input_tabs.currentIndex()) == "Duty"
    assert panel.bands_view.current_row() == 3
    assert "Not pumped" in panel.totals.text()


def test_a_copied_block_of_bands_pastes_back_unchanged(panel, document):
    view = panel.bands_view
    view.selectAll()
    block = clipboard.selected_block(view)  # calculated columns copy as shown and are skipped on paste
    project = document.project
    assert clipboard.paste_text(view, clipboard.block_to_text(block))
    assert document.project == project


def test_with_an_annual_volume_the_table_shows_the_flows_the_year_is_computed_for(make_window, tmp_path):
    samples = Path(__file__).resolve().parents[2] / "sample_projects"
    copy = tmp_path / "river.pumpsketch.json"
    shutil.copy(samples / "river_intake.pumpsketch.json", copy)
    shutil.copytree(samples / "pumps", tmp_path / "pumps")
    window = make_window(copy)
    window.document.recompute_now()
    model = window.duty_panel.bands_model
    duty = window.document.solution.duty_profile
    assert duty.flow_scale is not None and duty.flow_scale != 1.0  # the sample gives an annual volume
    for row, band in enumerate(window.document.project.duty_profile.bands):
        typed, met = model.data(_cell(model, row, "flow"), DISPLAY), model.data(_cell(model, row, "flow_met"), DISPLAY)
        # in L/s (1 m³/s = 1000 L/s), shown to three significant figures
        assert float(met) == pytest.approx(band.flow_m3_s * duty.flow_scale * 1000.0, rel=5e-3)
        assert typed != met
