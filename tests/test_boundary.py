"""The engine/GUI boundary: hydraulics/ never imports Qt, pyqtgraph or the app package."""

import ast
import subprocess
import sys
from pathlib import Path

ENGINE = Path(__file__).resolve().parent.parent / "hydraulics"
FORBIDDEN = ("PySide6", "pyqtgraph", "app", "PyQt5", "PyQt6", "fluids", "iapws")


def _imported_modules(path: Path) -> set[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    names: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names.update(alias.name.split(".")[0] for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names.add(node.module.split(".")[0])
    return names


def test_engine_sources_import_no_gui_or_reference_library():
    offenders = {}
    for path in ENGINE.rglob("*.py"):
        bad = _imported_modules(path) & set(FORBIDDEN)
        if bad:
            offenders[path.name] = sorted(bad)
    assert offenders == {}


def test_importing_the_whole_engine_loads_no_qt():
    code = (
        "import sys, pkgutil, importlib, hydraulics\n"
        "for m in pkgutil.iter_modules(hydraulics.__path__):\n"
        "    importlib.import_module('hydraulics.' + m.name)\n"
        "bad = [n for n in sys.modules if n.split('.')[0] in ('PySide6', 'pyqtgraph', 'app', 'fluids', 'iapws')]\n"
        "print(','.join(bad))\n"
    )
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                            cwd=ENGINE.parent, check=True)
    assert result.stdout.strip() == ""
