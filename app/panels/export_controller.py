"""File ▸ Export and Edit ▸ Copy plot: the results as CSV tables, the visible plot as PNG, SVG or on the clipboard.

The tables come from :mod:`hydraulics.csv_export` in the window's unit system; the
images from :mod:`app.plots.plot_image`.  Which file to write is asked by
:meth:`ExportController.ask_export_path` (tests replace it, as they replace the window's
``ask_*`` questions); a failure is shown with the window's ``show_error`` and nothing
half-written is left behind (every file is written atomically).
"""

from __future__ import annotations

import re
from collections.abc import Callable
from pathlib import Path
from typing import Protocol

from PySide6.QtCore import QObject
from PySide6.QtGui import QGuiApplication
from PySide6.QtWidgets import QFileDialog, QWidget

from app.document import ProjectDocument
from app.plots import plot_image
from app.plots.plot_base import PlotCanvas
from app.plots.plot_tabs import PlotTabs
from hydraulics import csv_export
from hydraulics.results import Solution

CSV_FILTER = "CSV tables (*.csv);;All files (*)"
PNG_FILTER = "PNG images (*.png);;All files (*)"
SVG_FILTER = "SVG drawings (*.svg);;All files (*)"

TABLES: dict[str, tuple[str, str, Callable[[Solution, str], str]]] = {
    "curves": ("System curves", "system curves", csv_export.system_curves_csv),
    "points": ("Operating points", "operating points", csv_export.operating_points_csv),
    "segments": ("Segments", "segments", csv_export.segments_csv),
}
"""Key → (dialog title, file-name part, writer) of each CSV table."""


class ExportWindow(Protocol):
    """What the export commands need of the window."""

    @property
    def document(self) -> ProjectDocument: ...

    @property
    def plot_tabs(self) -> PlotTabs: ...

    def show_error(self, title: str, text: str) -> None: ...

    def show_status(self, message: str) -> None: ...


def with_extension(path: str, extension: str) -> Path:
    """``path`` ending in ``extension`` (``".csv"``), added when it has none of its own."""
    result = Path(path)
    return result if result.suffix else result.with_name(result.name + extension)


def _file_part(text: str) -> str:
    """Words of a title as a file-name part: ``"Head – flow"`` → ``"head-flow"``."""
    return re.sub(r"[^a-z0-9]+", "-", text.lower()).strip("-") or "plot"


class ExportController(QObject):
    """Carries out the export commands for a main window (see the module docstring)."""

    def __init__(self, window: ExportWindow) -> None:
        self._dialog_parent = window if isinstance(window, QWidget) else None
        super().__init__(self._dialog_parent)
        self._window = window

    # ------------------------------------------------------------------ the question (tests replace it)
    def ask_export_path(self, title: str, suggested_name: str, file_filter: str) -> str:
        """Which file to export to, beside the project file ("" to cancel)."""
        folder = self._window.document.file_path
        start = (folder.parent if folder is not None else Path.home()) / suggested_name
        path, _filter = QFileDialog.getSaveFileName(self._dialog_parent, title, str(start), file_filter)
        return path

    # ------------------------------------------------------------------ the menu commands
    def export_system_curves(self) -> None:
        self.export_table("curves")

    def export_operating_points(self) -> None:
        self.export_table("points")

    def export_segments(self) -> None:
        self.export_table("segments")

    def export_plot_png(self) -> None:
        self.export_plot("png")

    def export_plot_svg(self) -> None:
        self.export_plot("svg")

    # ------------------------------------------------------------------ tables
    def export_table(self, key: str) -> Path | None:
        """Ask for a file and write table ``key`` (``curves``, ``points``, ``segments``); the path written."""
        title, part, writer = TABLES[key]
        solution = self._current_solution(f"Export {title.lower()}")
        if solution is None:
            return None
        chosen = self.ask_export_path(f"Export {title.lower()} (CSV)", self._suggested(part, ".csv"),
                                              CSV_FILTER)
        if not chosen:
            return None
        path = with_extension(chosen, ".csv")
        unit_system = self._window.document.unit_system
        return self._write(path, lambda: csv_export.write_csv(str(path), writer(solution, unit_system)),
                           f"{title} written to {path.name} ({unit_system} units).")

    # ------------------------------------------------------------------ plot images
    def export_plot(self, kind: str) -> Path | None:
        """Ask for a file and write the visible plot as ``"png"`` or ``"svg"``; the path written."""
        tabs = self._window.plot_tabs
        name = tabs.tabText(tabs.currentIndex()).replace("&&", "&")
        if self._current_solution(f"Export the {name} plot") is None:
            return None
        extension, file_filter = (".png", PNG_FILTER) if kind == "png" else (".svg", SVG_FILTER)
        chosen = self.ask_export_path(f"Export the {name} plot as {kind.upper()}",
                                              self._suggested(_file_part(name), extension), file_filter)
        if not chosen:
            return None
        path = with_extension(chosen, extension)
        canvas = self._prepared_canvas()

        def write() -> None:
            if kind == "png":
                plot_image.write_file_atomically(path, plot_image.png_bytes(plot_image.plot_image(canvas)))
            else:
                plot_image.write_file_atomically(path, plot_image.plot_svg(canvas).encode("utf-8"))

        return self._write(path, write, f"The {name} plot written to {path.name}.")

    def copy_plot(self) -> bool:
        """Put the visible plot on the clipboard as an image."""
        tabs = self._window.plot_tabs
        name = tabs.tabText(tabs.currentIndex()).replace("&&", "&")
        if self._current_solution(f"Copy the {name} plot") is None:
            return False
        image = plot_image.plot_image(self._prepared_canvas())
        QGuiApplication.clipboard().setImage(image)
        self._window.show_status(f"The {name} plot copied as an image ({image.width()} × {image.height()} px).")
        return True

    # ------------------------------------------------------------------ shared steps
    def _current_solution(self, what: str) -> Solution | None:
        """The solution of the project as it is now (a pending solve is run first), or ``None`` with a message."""
        document = self._window.document
        if document.recompute_pending:
            document.recompute_now()
        solution = document.solution
        if solution is None:
            reason = document.solve_error or "the project has not been solved yet"
            self._window.show_error(what, f"Nothing to export: {reason}")
        return solution

    def _prepared_canvas(self) -> PlotCanvas:
        """The visible plot's canvas, without the hover crosshair (a pointer position is no part of a figure)."""
        tabs = self._window.plot_tabs
        tabs.plots()[tabs.currentIndex()].hover.hide()
        return tabs.current_canvas()

    def _suggested(self, part: str, extension: str) -> str:
        """``"<project file name> - <part><extension>"`` (``"project - <part>"`` before the first save)."""
        return f"{self._window.document.display_name()} - {part}{extension}"

    def _write(self, path: Path, write: Callable[[], None], done: str) -> Path | None:
        try:
            write()
        except OSError as exc:
            self._window.show_error("Export failed", f"{path}: {exc.strerror or exc}")
            return None
        self._window.show_status(done)
        return path
