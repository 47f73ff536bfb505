"""Unexpected errors reach the user: a report in a dialog, the same report in a log file.

:func:`install` routes every uncaught Python exception (``sys.excepthook``, which PySide
calls for an exception escaping a slot or an overridden Qt method) and Qt's critical
messages (``qInstallMessageHandler``) to :class:`ErrorReporter`.  The reporter appends the
report to :data:`LOG_NAME` in the user's data folder (:func:`app.data_folder.data_folder`),
calls the window's ``on_error`` callback (the window writes its recovery file, so the
edits are safe whatever comes next), and shows the report in a dialog whose text can be
selected and copied.  The event loop goes on: the project stays open and can be saved.

The dialog is shown from the event loop, never from inside the failing code (which may be
a paint event).  While one report is on the screen, further ones are logged only.  Tests
replace :func:`show_report_dialog`.
"""

from __future__ import annotations

import logging
import platform
import sys
import traceback
from collections.abc import Callable
from datetime import datetime
from pathlib import Path
from types import TracebackType

from PySide6 import __version__ as pyside_version
from PySide6.QtCore import QMessageLogContext, QTimer, QtMsgType, qInstallMessageHandler
from PySide6.QtGui import QGuiApplication
from PySide6.QtWidgets import (
    QApplication,
    QDialog,
    QDialogButtonBox,
    QLabel,
    QPlainTextEdit,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from app.data_folder import data_folder

log = logging.getLogger(__name__)

LOG_NAME = "errors.log"
LOG_LIMIT_BYTES = 1_000_000
"""A log larger than this is renamed to ``errors.log.1`` (one old generation) before the next report."""
TITLE = "PumpSketch — unexpected error"

ExcInfo = tuple[type[BaseException], BaseException, TracebackType | None]


def log_path() -> Path:
    """The error log in the user's data folder."""
    return data_folder() / LOG_NAME


def format_report(what: str, detail: str) -> str:
    """The text of a report: when, the versions, then ``what`` happened and its ``detail``."""
    return (f"PumpSketch error report, {datetime.now().isoformat(timespec='seconds')}\n"
            f"Python {platform.python_version()}, PySide6 {pyside_version}, {platform.platform()}\n"
            f"{what}\n\n{detail.rstrip()}\n")


def exception_report(exc_type: type[BaseException], exc: BaseException, tb: TracebackType | None) -> str:
    """The report of an uncaught exception, with its traceback."""
    detail = "".join(traceback.format_exception(exc_type, exc, tb))
    return format_report(f"Uncaught {exc_type.__name__}: {exc}", detail)


def append_to_log(report: str) -> Path | None:
    """Append ``report`` to the error log; the log file, or ``None`` when it cannot be written."""
    try:
        path = log_path()
        if path.is_file() and path.stat().st_size > LOG_LIMIT_BYTES:
            path.replace(path.with_name(LOG_NAME + ".1"))
        with path.open("a", encoding="utf-8") as handle:
            handle.write(report)
            handle.write("\n" + "-" * 72 + "\n")
        return path
    except OSError as exc:
        sys.stderr.write(f"pumpsketch: the error log could not be written ({exc})\n")
        return None


class ErrorReportDialog(QDialog):
    """The report of an unexpected error, selectable, with a button that copies it."""

    def __init__(self, report: str, log_file: Path | None, parent: QWidget | None = None):
        super().__init__(parent)
        self.setWindowTitle(TITLE)
        where = f" It was also written to {log_file}." if log_file is not None else ""
        note = QLabel("Something went wrong inside PumpSketch. Your project is still open: save it now "
                      "(Save As keeps a separate copy) and check the last change you made." + where +
                      " Please send the report below with a description of what you were doing.")
        note.setWordWrap(True)
        self.report_view = QPlainTextEdit(report)
        self.report_view.setObjectName("error_report_text")
        self.report_view.setReadOnly(True)
        self.report_view.setLineWrapMode(QPlainTextEdit.LineWrapMode.NoWrap)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Close)
        self.copy_button = QPushButton("Copy report")
        buttons.addButton(self.copy_button, QDialogButtonBox.ButtonRole.ActionRole)
        self.copy_button.clicked.connect(self.copy_report)
        buttons.rejected.connect(self.reject)
        layout = QVBoxLayout(self)
        layout.addWidget(note)
        layout.addWidget(self.report_view, 1)
        layout.addWidget(buttons)
        self.resize(760, 420)

    def copy_report(self) -> None:
        """Put the whole report on the clipboard."""
        QGuiApplication.clipboard().setText(self.report_view.toPlainText())


def show_report_dialog(report: str, log_file: Path | None) -> None:
    """Show ``report`` in a modal :class:`ErrorReportDialog` (tests replace this function)."""
    parent = QApplication.activeWindow()
    ErrorReportDialog(report, log_file, parent).exec()


class ErrorReporter:
    """Logs and shows unexpected errors (see the module docstring)."""

    def __init__(self) -> None:
        self.on_error: Callable[[], object] | None = None
        """Called at each report before the dialog (the window writes its recovery file)."""
        self.reports: list[str] = []
        """Every report of this run, oldest first."""
        self._waiting: list[tuple[str, Path | None]] = []
        self._showing = False
        self._previous_hook: Callable[[type[BaseException], BaseException, TracebackType | None], object] | None = None
        self._previous_handler: object = None

    # ------------------------------------------------------------------ entry points
    def excepthook(self, exc_type: type[BaseException], exc: BaseException, tb: TracebackType | None) -> None:
        """``sys.excepthook``: report the exception (Ctrl+C in a terminal ends the program as usual)."""
        if issubclass(exc_type, KeyboardInterrupt):
            sys.__excepthook__(exc_type, exc, tb)
            return
        self.report(exception_report(exc_type, exc, tb))

    def qt_message(self, mode: QtMsgType, _context: QMessageLogContext, message: str) -> None:
        """Qt's message handler: warnings go to stderr and the log, critical and fatal ones to a report too."""
        sys.stderr.write(message + "\n")
        if mode in (QtMsgType.QtCriticalMsg, QtMsgType.QtFatalMsg):
            self.report(format_report("Qt reported a critical error", message))
        elif mode == QtMsgType.QtWarningMsg:
            append_to_log(format_report("Qt warning", message))

    # ------------------------------------------------------------------ reporting
    def report(self, report: str) -> None:
        """Log ``report``, let the window secure its edits, and show the report from the event loop."""
        sys.stderr.write(report)
        self.reports.append(report)
        log_file = append_to_log(report)
        self._secure_edits()
        self._waiting.append((report, log_file))
        if QApplication.instance() is not None:
            QTimer.singleShot(0, self._show_waiting)

    def _secure_edits(self) -> None:
        if self.on_error is None:
            return
        try:
            self.on_error()
        except Exception:  # the reporter must never raise from inside a hook
            log.exception("securing the edits after an error failed")

    def _show_waiting(self) -> None:
        if self._showing or not self._waiting:
            return
        report, log_file = self._waiting.pop(0)
        if self._waiting:  # several errors at once (a burst from one fault): one dialog, every report logged
            more = len(self._waiting)
            report += f"\n({more} further report{'s' if more > 1 else ''} of this moment in the log.)\n"
            self._waiting.clear()
        self._showing = True
        try:
            show_report_dialog(report, log_file)
        finally:
            self._showing = False

    # ------------------------------------------------------------------ installing
    def install(self) -> None:
        """Become ``sys.excepthook`` and Qt's message handler."""
        self._previous_hook = sys.excepthook
        sys.excepthook = self.excepthook
        self._previous_handler = qInstallMessageHandler(self.qt_message)

    def uninstall(self) -> None:
        """Put back the hook and the message handler found at :meth:`install`."""
        if self._previous_hook is not None:
            sys.excepthook = self._previous_hook
            self._previous_hook = None
        qInstallMessageHandler(self._previous_handler)  # None restores Qt's own
        self._previous_handler = None


def install() -> ErrorReporter:
    """A reporter installed as the exception hook and the Qt message handler (see the module docstring)."""
    reporter = ErrorReporter()
    reporter.install()
    return reporter
