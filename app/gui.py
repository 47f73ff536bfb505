"""Start the window: ``run_gui(path)`` is what ``pumpsketch`` and ``pumpsketch FILE`` call."""

from __future__ import annotations

import os
import sys
from pathlib import Path

from PySide6.QtWidgets import QApplication

from app import error_report, settings
from app.main_window import APP_TITLE, MainWindow
from app.recovery import offer_recovered_edits


def application() -> QApplication:
    """The running QApplication, created (with PumpSketch's names) if there is none."""
    existing = QApplication.instance()
    if isinstance(existing, QApplication):
        return existing
    created = QApplication(sys.argv[:1])
    created.setApplicationName(APP_TITLE)
    created.setOrganizationName(settings.ORGANISATION)
    created.setApplicationDisplayName(APP_TITLE)
    return created


def open_window(path: str | Path | None, as_copy: bool = False) -> MainWindow:
    """A main window on ``path``; on the last project when ``path`` is None and one is
    remembered; else on a new project.  A file that cannot be read leaves a new project
    open and says why.  Unsaved edits left by a window that did not close normally are offered
    first; restored, they are opened instead.  ``as_copy`` opens ``path`` as an unsaved copy (a sample), so
    that saving asks where instead of overwriting it."""
    window = MainWindow()
    if offer_recovered_edits(window):
        if path is not None:
            window.show_status(f"Unsaved edits restored; {Path(path).name} was not opened.")
        return window
    if path is not None and as_copy:
        window.files.open_sample(path)
        return window
    target = path if path is not None else settings.last_project()
    if target is not None:
        window.files.open_path(target, ask=False)
    return window


STARTUP_PROBE_VARIABLE = "PUMPSKETCH_STARTUP_PROBE"
"""When this environment variable is set, the window prints ``painted`` as soon as its plot
has first painted a solution and the process ends at once: the start-up benchmark
(``benchmarks/startup_timing.py``) times a real start this way."""


def _end_after_first_plot_paint(window: MainWindow) -> None:
    canvas = window.plot_tabs.current_canvas()

    def on_paint() -> None:
        if window.plot_tabs.drawn_solution() is None:
            return
        canvas.painted.disconnect(on_paint)
        sys.stdout.write("painted\n")
        sys.stdout.flush()
        os._exit(0)  # at once: tearing the window down is not part of start-up

    canvas.painted.connect(on_paint)


def run_gui(path: str | None, as_copy: bool = False) -> int:
    """Open the window (see :func:`open_window`) and run until it closes; the exit code."""
    app = application()
    reporter = error_report.install()
    window = open_window(path, as_copy)
    reporter.on_error = window.autosaver.save_now
    if os.environ.get(STARTUP_PROBE_VARIABLE):
        _end_after_first_plot_paint(window)
    window.show()
    return int(app.exec())
