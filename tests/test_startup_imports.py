"""What the command line loads: solving a project pulls in neither Qt nor the slow parts of scipy.

A structural check, not a timed one (start-up times are printed by ``make bench``):
``scipy.special`` and ``scipy.optimize`` each take about 0.1 s to import and the engine's
solve needs neither; Qt and pyqtgraph belong to the window only.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = sorted((ROOT / "sample_projects").glob("*.pumpsketch.json"))
PUMP_FILES = sorted((ROOT / "sample_projects" / "pumps").glob("*.csv"))
NOT_AT_START = ("scipy.special", "scipy.optimize", "PySide6", "pyqtgraph")


def _loaded_after(code: str) -> list[str]:
    """Modules of NOT_AT_START loaded by ``code`` in a fresh interpreter."""
    probe = (
        "import contextlib, io, sys\n"
        f"{code}\n"
        f"bad = sorted(n for n in sys.modules if any(n == p or n.startswith(p + '.') for p in {NOT_AT_START!r}))\n"
        "sys.__stdout__.write('LOADED:' + ','.join(bad) + '\\n')\n"
    )
    result = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, cwd=ROOT, check=True)
    line = [text for text in result.stdout.splitlines() if text.startswith("LOADED:")][-1]
    return [name for name in line.removeprefix("LOADED:").split(",") if name]


def test_importing_the_engine_entry_points_loads_none_of_them():
    code = "import hydraulics.solve, hydraulics.project_io, hydraulics.results_json, hydraulics.pump_csv, app.cli"
    assert _loaded_after(code) == []


@pytest.mark.parametrize("options", [(), ("--json",), ("--units", "US")])
def test_cli_solve_of_every_sample_loads_none_of_them(options):
    calls = "\n".join(
        f"    assert main(['solve', {str(sample)!r}, *{options!r}]) == 0" for sample in SAMPLES
    )
    code = f"from app.cli import main\nwith contextlib.redirect_stdout(io.StringIO()):\n{calls}"
    assert SAMPLES
    assert _loaded_after(code) == []


def test_cli_import_pump_of_every_sample_pump_loads_none_of_them():
    calls = "\n".join(f"    assert main(['import-pump', {str(path)!r}]) == 0" for path in PUMP_FILES)
    code = f"from app.cli import main\nwith contextlib.redirect_stdout(io.StringIO()):\n{calls}"
    assert PUMP_FILES
    assert _loaded_after(code) == []


def test_the_probe_sees_a_module_that_is_loaded():
    # The checks above must be able to fail: a loaded module is seen.
    assert "scipy.special" in _loaded_after("import scipy.special")
    assert "PySide6" in _loaded_after("import PySide6.QtCore")
