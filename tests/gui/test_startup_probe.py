"""The start-up probe the benchmark times the window with (not a timed test)."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

from app.gui import STARTUP_PROBE_VARIABLE

ROOT = Path(__file__).resolve().parents[2]
SAMPLE = ROOT / "sample_projects" / "hilltop_booster.pumpsketch.json"


def test_window_with_the_probe_says_painted_and_ends(tmp_path):
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen", XDG_CONFIG_HOME=str(tmp_path))
    env[STARTUP_PROBE_VARIABLE] = "1"
    result = subprocess.run([sys.executable, "-m", "app", str(SAMPLE)], cwd=ROOT, env=env, capture_output=True,
                            text=True, timeout=120)
    assert result.returncode == 0, result.stderr
    assert result.stdout.splitlines() == ["painted"]
