"""Errors reach the user: uncaught exceptions in a dialog and the log; bad files refused, never fatal."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest
from PySide6.QtCore import QMessageLogContext, QTimer, QtMsgType
from PySide6.QtGui import QGuiApplication
from PySide6.QtWidgets import QPlainTextEdit

from app import error_report, settings
from app.data_folder import DATA_DIR_VARIABLE
from app.error_report import ErrorReportDialog, ErrorReporter, log_path
from app.gui import open_window
from app.main_window import MainWindow
from hydraulics.project_io import ProjectFileError, load_project

ROOT = Path(__file__).resolve().parents[2]
DEEP_NESTING = "[" * 100_000 + "]" * 100_000
"""Valid JSON the standard reader cannot parse (recursion limit): a fault outside ProjectFileError."""


class Shown:
    """Stands in for the report dialog."""

    def __init__(self):
        self.reports: list[tuple[str, object]] = []

    def __call__(self, report, log_file) -> None:
        self.reports.append((report, log_file))


@pytest.fixture
def shown(monkeypatch) -> Shown:
    recorder = Shown()
    monkeypatch.setattr(error_report, "show_report_dialog", recorder)
    return recorder


@pytest.fixture
def reporter(monkeypatch, shown, window) -> ErrorReporter:
    """The window's error reporter as ``pumpsketch`` installs it (its exception hook; Qt's log stays pytest-qt's)."""
    installed = ErrorReporter()
    installed.on_error = window.autosaver.save_now
    monkeypatch.setattr(sys, "excepthook", installed.excepthook)
    return installed


def _raise_in_a_slot(message: str = "a fault in a slot") -> None:
    def slot() -> None:
        raise RuntimeError(message)

    QTimer.singleShot(0, slot)


def test_an_exception_in_a_slot_shows_a_report_logs_it_and_the_project_stays_saveable(
        window, reporter, shown, qtbot, dialogs, tmp_path):
    window.site_panel.set_text("name", "Edited before the fault")
    edited = window.document.project
    _raise_in_a_slot()
    qtbot.waitUntil(lambda: len(shown.reports) == 1, timeout=10_000)
    report, log_file = shown.reports[0]
    assert "RuntimeError: a fault in a slot" in report and "Traceback" in report and "in slot" in report
    assert log_file == log_path() and "RuntimeError: a fault in a slot" in log_path().read_text(encoding="utf-8")
    assert window.document.project == edited  # still open, still the user's
    assert len(list(log_path().parent.glob("recovery/*/*.recovery.json"))) == 1  # the edits were kept at once
    dialogs.save_path = tmp_path / "after_the_fault"
    assert window.save_project_as()
    assert load_project(tmp_path / "after_the_fault.pumpsketch.json") == edited
    window.site_panel.set_text("name", "Edited after the fault")  # and editing goes on
    assert window.document.project.name == "Edited after the fault"


def test_a_burst_of_errors_shows_one_dialog_and_logs_every_one(window, reporter, shown, qtbot):
    for k in range(3):
        _raise_in_a_slot(f"fault {k}")
    qtbot.waitUntil(lambda: len(reporter.reports) == 3, timeout=10_000)
    qtbot.waitUntil(lambda: len(shown.reports) == 1, timeout=10_000)
    qtbot.wait(50)
    assert len(shown.reports) == 1
    assert "2 further reports" in shown.reports[0][0]
    logged = log_path().read_text(encoding="utf-8")
    assert all(f"fault {k}" in logged for k in range(3))


def test_a_qt_critical_message_is_reported_and_a_warning_only_logged(window, reporter, shown, qtbot):
    context = QMessageLogContext()
    reporter.qt_message(QtMsgType.QtWarningMsg, context, "a Qt warning for the log")
    reporter.qt_message(QtMsgType.QtCriticalMsg, context, "a critical Qt failure")
    qtbot.waitUntil(lambda: len(shown.reports) == 1, timeout=10_000)
    assert "a critical Qt failure" in shown.reports[0][0]
    logged = log_path().read_text(encoding="utf-8")
    assert "a Qt warning for the log" in logged and "a critical Qt failure" in logged


INSTALLED_HOOK_SCRIPT = """
import sys
from PySide6.QtCore import QTimer, qCritical
from app import error_report
from app.gui import application

app = application()
shown = []
error_report.show_report_dialog = lambda report, log_file: shown.append(report)
before = sys.excepthook
reporter = error_report.install()
assert sys.excepthook == reporter.excepthook
QTimer.singleShot(0, lambda: 1 / 0)
QTimer.singleShot(10, lambda: qCritical("a critical message from Qt"))
QTimer.singleShot(200, app.quit)
app.exec()
reporter.uninstall()
assert sys.excepthook is before
print(len(shown), "ZeroDivisionError" in shown[0], "a critical message from Qt" in shown[1])
"""


def test_the_installed_hook_and_message_handler_report_from_a_running_application(tmp_path):
    # In a process of its own: installing replaces the message handler pytest-qt watches in this one.
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen", XDG_CONFIG_HOME=str(tmp_path))
    result = subprocess.run([sys.executable, "-c", INSTALLED_HOOK_SCRIPT], cwd=ROOT, env=env, capture_output=True,
                            text=True, timeout=120)
    assert result.returncode == 0, result.stderr
    assert result.stdout.split() == ["2", "True", "True"]
    assert "ZeroDivisionError" in result.stderr  # the report goes to stderr too
    logged = (Path(env[DATA_DIR_VARIABLE]) / "errors.log").read_text(encoding="utf-8")
    assert "ZeroDivisionError" in logged and "a critical message from Qt" in logged


def test_ctrl_c_is_not_reported(reporter, shown, monkeypatch, qtbot):
    passed_on = []
    monkeypatch.setattr(sys, "__excepthook__", lambda *info: passed_on.append(info[0]))
    reporter.excepthook(KeyboardInterrupt, KeyboardInterrupt(), None)
    qtbot.wait(20)
    assert passed_on == [KeyboardInterrupt] and shown.reports == [] and reporter.reports == []


def test_the_dialog_shows_the_report_to_copy(qtbot):
    report = error_report.exception_report(ValueError, ValueError("bad thing"), None)
    dialog = ErrorReportDialog(report, None)
    qtbot.addWidget(dialog)
    view = dialog.findChild(QPlainTextEdit, "error_report_text")
    assert view is dialog.report_view and view.isReadOnly() and view.toPlainText() == report
    assert "ValueError: bad thing" in report and "PySide6" in report
    dialog.copy_button.click()
    assert QGuiApplication.clipboard().text() == report


def test_a_log_that_grew_too_long_is_started_afresh_keeping_one_old_generation(monkeypatch):
    monkeypatch.setattr(error_report, "LOG_LIMIT_BYTES", 100)
    error_report.append_to_log("first report " + "x" * 200)
    error_report.append_to_log("second report")
    assert "second report" in log_path().read_text(encoding="utf-8")
    assert "first report" not in log_path().read_text(encoding="utf-8")
    assert "first report" in log_path().with_name("errors.log.1").read_text(encoding="utf-8")


# ---------------------------------------------------------------------- bad files never crash the window
def test_file_open_of_a_file_the_reader_fails_on_shows_its_message_and_keeps_the_project(window, dialogs, tmp_path):
    bad = tmp_path / "deep.pumpsketch.json"
    bad.write_text(DEEP_NESTING, encoding="utf-8")
    before = window.document.project
    dialogs.open_path = bad
    assert not window.open_project()
    assert window.document.project is before
    title, text = dialogs.errors[-1]
    assert title == "Cannot open the project" and str(bad) in text
    assert window.statusBar().currentMessage().startswith("Not opened: deep.pumpsketch.json")


def test_an_unexpected_reader_fault_is_reported_in_its_own_words(window, dialogs, monkeypatch, hilltop):
    def faulty(_path):
        raise ValueError("Exceeds the limit (4300 digits) for integer string conversion")

    monkeypatch.setattr("app.document.load_project", faulty)
    before = window.document.project
    assert not window.open_path(hilltop)
    assert window.document.project is before
    assert dialogs.errors[-1] == ("Cannot open the project", f"{hilltop}: cannot read the project "
                                  "(Exceeds the limit (4300 digits) for integer string conversion)")


@pytest.fixture
def startup_errors(monkeypatch) -> list[tuple[str, str]]:
    """The messages of windows started by open_window (answered class-wide: the window asks while it starts)."""
    errors: list[tuple[str, str]] = []
    monkeypatch.setattr(MainWindow, "show_error", lambda _self, title, text: errors.append((title, text)))
    return errors


@pytest.mark.parametrize("content", [DEEP_NESTING, '{"format": "pumpsketch-project", "version": 3, "segm'],
                         ids=["reader fault", "truncated"])
def test_start_up_on_a_malformed_file_opens_empty_with_the_reader_s_message(qtbot, tmp_path, startup_errors, content):
    bad = tmp_path / "bad.pumpsketch.json"
    bad.write_text(content, encoding="utf-8")
    window = open_window(str(bad))
    qtbot.addWidget(window)
    assert window.document.file_path is None and window.document.project.name == "New project"
    (title, text), = startup_errors
    assert title == "Cannot open the project" and str(bad) in text
    try:
        load_project(bad)
    except ProjectFileError as exc:
        assert text == str(exc)  # the reader's own message, when it has one
    except RecursionError:  # a reader that does not catch this itself: the window words it
        assert text.startswith(f"{bad}: cannot read the project (maximum recursion depth exceeded")


def test_start_up_on_a_bad_remembered_project_opens_empty_with_a_message(qtbot, tmp_path, startup_errors):
    bad = tmp_path / "remembered.pumpsketch.json"
    bad.write_text(DEEP_NESTING, encoding="utf-8")
    settings.add_recent_file(bad)
    assert settings.last_project() == str(bad.resolve())
    window = open_window(None)
    qtbot.addWidget(window)
    assert window.document.file_path is None and window.document.project.name == "New project"
    assert len(startup_errors) == 1 and str(bad.resolve()) in startup_errors[0][1]
