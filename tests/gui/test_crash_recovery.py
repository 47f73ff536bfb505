"""A window process killed after an edit: the next start offers the edit back, and restoring it works.

The window runs in a subprocess (offscreen) that makes one edit through its document
(``benchmarks.crash_children edit``) and waits; once its recovery file has appeared it is
killed with SIGKILL, so nothing of a clean exit runs.  The next start is a window in this
process on the same data folder, whose restore question is answered yes.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from app.gui import open_window
from app.main_window import MainWindow
from app.recovery import RECOVERY_SUFFIX, recovery_root
from benchmarks.crash_children import edited_project
from hydraulics.project_io import load_project

ROOT = Path(__file__).resolve().parents[2]
APPEAR_TIMEOUT_S = 120.0


def _wait_for_file(folder: Path, pattern: str, child: subprocess.Popen) -> Path:
    """The first file matching ``pattern`` under ``folder`` (the one wait of this test; generous)."""
    deadline = time.monotonic() + APPEAR_TIMEOUT_S
    while time.monotonic() < deadline:
        found = sorted(folder.glob(pattern)) if folder.exists() else []
        if found:
            return found[0]
        if child.poll() is not None:
            pytest.fail(f"the window process ended by itself: {child.stderr.read() if child.stderr else ''}")
        time.sleep(0.1)
    pytest.fail(f"no {pattern} appeared in {APPEAR_TIMEOUT_S:.0f} s")


@pytest.mark.skipif(sys.platform == "win32", reason="SIGKILL is POSIX")
def test_a_window_killed_after_an_edit_gets_the_edit_back_at_the_next_start(
        hilltop, tmp_path, isolated_data_folder, monkeypatch, qtbot, dialogs):
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen", XDG_CONFIG_HOME=str(tmp_path / "child-config"))
    env["PYTHONPATH"] = os.pathsep.join([str(ROOT), *filter(None, [env.get("PYTHONPATH")])])
    saved = load_project(hilltop)
    child = subprocess.Popen([sys.executable, "-m", "benchmarks.crash_children", "edit", str(hilltop)],
                             cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    try:
        kept = _wait_for_file(isolated_data_folder / "recovery", "*/*" + RECOVERY_SUFFIX, child)
    finally:
        child.send_signal(signal.SIGKILL)
        child.wait()
        if child.stderr is not None:
            child.stderr.close()
    assert kept.exists()  # a kill leaves it
    assert load_project(hilltop) == saved  # the edit was never saved to the file

    offers = []
    monkeypatch.setattr(MainWindow, "ask_restore", lambda _self, edits: offers.append(edits) or True)
    window = open_window(None)
    qtbot.addWidget(window)
    dialogs.install(monkeypatch, window)
    assert len(offers) == 1 and offers[0].project_path == hilltop.resolve()
    assert window.document.project == edited_project(saved, 1)
    assert window.document.file_path == hilltop.resolve() and window.document.is_modified
    assert not kept.exists() and len(list(recovery_root().glob("*/*" + RECOVERY_SUFFIX))) == 1
    assert window.save_project()
    assert load_project(hilltop) == edited_project(saved, 1)
