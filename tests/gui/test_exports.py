"""File ▸ Export (CSV tables, the plot as PNG or SVG) and Edit ▸ Copy plot, offscreen."""

from __future__ import annotations

import csv
import io
import xml.etree.ElementTree as ET
from dataclasses import replace

import pytest
from PySide6.QtCore import QByteArray, Qt
from PySide6.QtGui import QColor, QImage, QPainter
from PySide6.QtSvg import QSvgRenderer
from PySide6.QtWidgets import QApplication, QMenu

from app.plots import plot_image
from hydraulics import csv_export

INJECTION = "=HYPERLINK(\"http://example.invalid\",\"x\")"
"""A formula a spreadsheet would run (OWASP, "CSV Injection")."""
SVG = "{http://www.w3.org/2000/svg}"


class ExportAnswers:
    """Answers the window's ``ask_export_path`` and records the questions."""

    def __init__(self) -> None:
        self.path = ""
        self.asked: list[tuple[str, str, str]] = []

    def __call__(self, title: str, suggested: str, file_filter: str) -> str:
        self.asked.append((title, suggested, file_filter))
        return str(self.path)


@pytest.fixture
def shown(window, qtbot, monkeypatch):
    """The hilltop window shown (the plots laid out at their size), its export question answered."""
    answers = ExportAnswers()
    monkeypatch.setattr(window.exports, "ask_export_path", answers)
    window.show()
    qtbot.waitExposed(window)
    window.answers = answers
    return window


def _non_white_pixels(image: QImage) -> int:
    image = image.convertToFormat(QImage.Format.Format_RGB32)
    step = 3
    return sum(1 for y in range(0, image.height(), step) for x in range(0, image.width(), step)
               if image.pixelColor(x, y) != QColor("white"))


def _table_rows(text: str) -> list[list[str]]:
    return list(csv.reader(io.StringIO(text.removeprefix("\ufeff"), newline="")))


def test_the_export_entries_are_in_the_file_and_edit_menus(shown):
    export_menu = shown.findChild(QMenu, "menu_export")
    titles = [a.text() for a in export_menu.actions() if not a.isSeparator()]
    assert titles == ["&System curves (CSV)…", "&Operating points (CSV)…", "S&egments (CSV)…", "Plot as &PNG…",
                      "Plot as S&VG…"]
    menus = {m.title(): m for m in shown.menuBar().findChildren(QMenu)}
    assert export_menu.menuAction() in menus["&File"].actions()
    assert shown.named_actions["copy_plot"] in menus["&Edit"].actions()


@pytest.mark.parametrize(("action", "writer"), [("export_curves", csv_export.system_curves_csv),
                                                ("export_points", csv_export.operating_points_csv),
                                                ("export_segments", csv_export.segments_csv)])
def test_each_table_is_written_in_the_windows_units(shown, tmp_path, action, writer):
    shown.set_unit_system("US")
    shown.answers.path = tmp_path / "table"  # the extension is added
    shown.named_actions[action].trigger()
    written = tmp_path / "table.csv"
    assert written.read_bytes().decode("utf-8") == writer(shown.document.solution, "US")
    assert _table_rows(written.read_bytes().decode("utf-8"))[2] == ["units", "US"]
    title, suggested, file_filter = shown.answers.asked[-1]
    assert suggested.endswith(".csv") and "*.csv" in file_filter
    assert "written to table.csv" in shown.statusBar().currentMessage()


def test_names_with_formulas_come_out_neutralised(shown, tmp_path):
    document = shown.document
    project = document.project
    segments = (replace(project.segments[0], name="@SUM(1+1)"), *project.segments[1:])
    assert document.apply(replace(project, name=INJECTION, segments=segments), "Rename")
    shown.answers.path = tmp_path / "segments.csv"
    shown.exports.export_segments()  # the pending solve runs first: the table is of the renamed project
    rows = _table_rows((tmp_path / "segments.csv").read_bytes().decode("utf-8"))
    assert rows[0] == ["project", "'" + INJECTION]
    assert rows[csv_export.PREAMBLE_ROWS + 1][0] == "'@SUM(1+1)"


def test_a_cancelled_question_writes_nothing(shown, tmp_path, dialogs):
    shown.answers.path = ""
    shown.exports.export_system_curves()
    shown.exports.export_plot_png()
    assert list(tmp_path.glob("*.csv")) == [] and list(tmp_path.glob("*.png")) == []
    assert dialogs.errors == []


def test_a_file_that_cannot_be_written_is_reported(shown, tmp_path, dialogs):
    shown.answers.path = tmp_path / "no such folder" / "curves.csv"
    shown.exports.export_system_curves()
    assert dialogs.errors and dialogs.errors[0][0] == "Export failed"
    assert "curves.csv" in dialogs.errors[0][1]


@pytest.mark.parametrize("tab", range(5))
def test_the_png_has_the_plots_size_and_shows_it(shown, tmp_path, tab):
    shown.plot_tabs.setCurrentIndex(tab)
    QApplication.processEvents()
    shown.answers.path = tmp_path / "plot.png"
    shown.exports.export_plot_png()
    image = QImage(str(tmp_path / "plot.png"))
    canvas = shown.plot_tabs.current_canvas()
    assert not image.isNull()
    assert (image.width(), image.height()) == (canvas.viewport().width(), canvas.viewport().height())
    assert image.pixelColor(1, 1) == QColor("white")  # exported on white
    assert _non_white_pixels(image) > 200  # axes, curves and labels drawn


def _check_svg(text: str, width: int, height: int) -> None:
    root = ET.fromstring(text)  # valid XML
    assert root.tag == f"{SVG}svg"
    drawn = [e for e in root.iter() if e.tag in (f"{SVG}path", f"{SVG}polyline", f"{SVG}line", f"{SVG}rect")]
    assert len(drawn) > 20
    renderer = QSvgRenderer(QByteArray(text.encode("utf-8")))
    assert renderer.isValid()
    assert (renderer.viewBox().width(), renderer.viewBox().height()) == (width, height)
    image = QImage(width, height, QImage.Format.Format_ARGB32)
    image.fill(QColor("white"))
    painter = QPainter(image)
    renderer.render(painter)
    painter.end()
    assert _non_white_pixels(image) > 200


@pytest.mark.parametrize("tab", [0, 1, 3])
def test_the_svg_is_valid_xml_with_drawn_content(shown, tmp_path, tab):
    shown.plot_tabs.setCurrentIndex(tab)
    QApplication.processEvents()
    shown.answers.path = tmp_path / "plot"
    shown.exports.export_plot_svg()
    canvas = shown.plot_tabs.current_canvas()
    _check_svg((tmp_path / "plot.svg").read_text(encoding="utf-8"), canvas.viewport().width(),
               canvas.viewport().height())


def test_the_svg_falls_back_to_the_svg_generator(shown, tmp_path, monkeypatch, caplog):
    def failing(*_args):
        raise RuntimeError("no SVG here")

    monkeypatch.setattr(plot_image.pg_exporters, "SVGExporter", failing)
    shown.answers.path = tmp_path / "fallback.svg"
    shown.exports.export_plot_svg()
    canvas = shown.plot_tabs.current_canvas()
    _check_svg((tmp_path / "fallback.svg").read_text(encoding="utf-8"), canvas.viewport().width(),
               canvas.viewport().height())
    assert "SVG generator" in caplog.text


def test_copy_plot_puts_the_image_on_the_clipboard(shown):
    QApplication.clipboard().clear()
    shown.plot_tabs.setCurrentIndex(2)
    QApplication.processEvents()
    shown.named_actions["copy_plot"].trigger()
    image = QApplication.clipboard().image()
    canvas = shown.plot_tabs.current_canvas()
    assert not image.isNull()
    assert (image.width(), image.height()) == (canvas.viewport().width(), canvas.viewport().height())
    assert _non_white_pixels(image) > 200
    assert "copied" in shown.statusBar().currentMessage()


def test_copy_plot_has_a_shortcut(shown):
    assert shown.named_actions["copy_plot"].shortcut().toString() == "Ctrl+Shift+C"
    assert shown.named_actions["copy_plot"].shortcutContext() == Qt.ShortcutContext.WindowShortcut
