"""The layers inside ``app/``: a module imports only from its own layer or the layers below.

Every import counts, at module level or inside a function (including imports made only
for type checking), because a late import is still a dependency.  ``hydraulics`` lies
below every layer; it never imports ``app`` (``tests/test_boundary.py``).

=====  ==============  ==========================================================================
Layer  Name            Modules
=====  ==============  ==========================================================================
6      entry points    ``app.__main__``, ``app.cli``, ``app.gui``, ``app.screenshot``
5      main window     ``app.main_window``, ``app.focus``
4      views           ``app.panels.*``, ``app.plots.*``, ``app.results.*`` (but the two below),
                       ``app.help_page``, ``app.layout_barrier``
3      table models    ``app.table_models.*``, ``app.delegates``, ``app.clipboard``
2      document        ``app.document``, ``app.commands``, ``app.recovery``
1      foundation      ``app`` (the package), ``app.style``, ``app.settings``, ``app.cautions``,
                       ``app.text_report``, ``app.pump_report``, ``app.pump_set_report``,
                       ``app.results.formatting``,
                       ``app.results.scenarios``, ``app.samples``, ``app.platform_check``,
                       ``app.data_folder``, ``app.error_report``
0      engine          ``hydraulics.*`` (outside ``app``)
=====  ==============  ==========================================================================

The foundation holds what every layer may use and that knows nothing of the window:
styles, remembered settings, the bundled samples, the Qt system-library check, the cautions, number formatting and
the plain-text reports of the command line.  A new module must be given a layer here before it is accepted.
"""

from __future__ import annotations

import ast
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path

import pytest

APP_DIR = Path(__file__).resolve().parent.parent / "app"

LAYER_NAMES = ("engine", "foundation", "document", "table models", "views", "main window", "entry points")

LAYERS: dict[str, int] = {
    # exact modules first; a name ending in ".*" covers a package's modules
    "app": 1, "app.style": 1, "app.settings": 1, "app.cautions": 1, "app.text_report": 1,
    "app.pump_report": 1, "app.pump_set_report": 1, "app.results.formatting": 1, "app.results.scenarios": 1,
    "app.samples": 1, "app.platform_check": 1, "app.data_folder": 1, "app.error_report": 1,
    "app.document": 2, "app.commands": 2, "app.recovery": 2,
    "app.table_models": 3, "app.table_models.*": 3, "app.delegates": 3, "app.clipboard": 3,
    "app.panels": 4, "app.panels.*": 4, "app.plots": 4, "app.plots.*": 4, "app.results": 4,
    "app.results.*": 4, "app.help_page": 4, "app.layout_barrier": 4,
    "app.main_window": 5, "app.focus": 5,
    "app.__main__": 6, "app.cli": 6, "app.gui": 6, "app.screenshot": 6,
    "hydraulics": 0, "hydraulics.*": 0,
}


@dataclass(frozen=True)
class Violation:
    importer: str
    imported: str
    line: int

    def __str__(self) -> str:
        return (f"{self.importer} (line {self.line}) imports {self.imported}: "
                f"{_layer_text(self.importer)} may not depend on {_layer_text(self.imported)}")


def layer_of(module: str, layers: Mapping[str, int] = LAYERS) -> int | None:
    """The layer of ``module``: its exact entry, else the nearest enclosing ``package.*``."""
    if module in layers:
        return layers[module]
    parts = module.split(".")
    for end in range(len(parts) - 1, 0, -1):
        found = layers.get(".".join(parts[:end]) + ".*")
        if found is not None:
            return found
    return None


def _layer_text(module: str) -> str:
    layer = layer_of(module)
    return f"layer {layer} ({LAYER_NAMES[layer]})" if layer is not None else "no layer"


def imported_modules(source: str, module: str, known: frozenset[str]) -> list[tuple[str, int]]:
    """Every ``app`` or ``hydraulics`` module that ``source`` (the text of ``module``) imports.

    ``from package import name`` counts as importing ``package.name`` when that is a
    module in ``known``, else as importing ``package``.  Relative imports are resolved
    against ``module``'s package.
    """
    is_package = module == "app" or any(k.startswith(module + ".") for k in known)
    package = module if is_package else module.rpartition(".")[0]
    found: list[tuple[str, int]] = []
    for node in ast.walk(ast.parse(source)):
        if isinstance(node, ast.Import):
            found.extend((alias.name, node.lineno) for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.split(".")
                base = base[: len(base) - (node.level - 1)]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            for alias in node.names:
                sub = f"{target}.{alias.name}"
                found.append((sub if sub in known else target, node.lineno))
    return [(name, line) for name, line in found if name.split(".")[0] in ("app", "hydraulics")]


def layer_violations(sources: Mapping[str, str], layers: Mapping[str, int] = LAYERS,
                     extra_known: frozenset[str] = frozenset()) -> list[str]:
    """The imports in ``sources`` (module name → text) that reach up a layer, and unplaced modules."""
    known = frozenset(sources) | extra_known
    problems: list[str] = []
    for module, source in sorted(sources.items()):
        own = layer_of(module, layers)
        if own is None:
            problems.append(f"{module} has no layer: place it in the table of tests/test_app_layering.py")
            continue
        for imported, line in imported_modules(source, module, known):
            theirs = layer_of(imported, layers)
            if theirs is None:
                problems.append(f"{module} (line {line}) imports {imported}, which has no layer")
            elif theirs > own:
                problems.append(str(Violation(module, imported, line)))
    return problems


def app_sources() -> dict[str, str]:
    """Every module of ``app/`` by dotted name, with its text."""
    sources = {}
    for path in sorted(APP_DIR.rglob("*.py")):
        parts = path.relative_to(APP_DIR.parent).with_suffix("").parts
        if parts[-1] == "__init__":
            parts = parts[:-1]
        sources[".".join(parts)] = path.read_text(encoding="utf-8")
    return sources


def test_the_app_keeps_its_layers():
    problems = layer_violations(app_sources(), extra_known=_hydraulics_modules())
    assert problems == [], "\n".join(problems)


def _hydraulics_modules() -> frozenset[str]:
    engine = APP_DIR.parent / "hydraulics"
    return frozenset("hydraulics." + p.stem for p in engine.glob("*.py") if p.stem != "__init__") | {"hydraulics"}


def test_every_app_module_is_placed():
    assert all(layer_of(module) is not None for module in app_sources())


# ---------------------------------------------------------------------- the checker itself
SYNTHETIC = {
    "app.document": "from hydraulics.model import Project\n",
    "app.main_window": "from app.document import ProjectDocument\n",
    "app.panels": "",
    "app.panels.form": "from app.panels import table_view\n",
    "app.panels.table_view": "",
}


def test_the_checker_passes_imports_that_go_down():
    assert layer_violations(SYNTHETIC) == []


@pytest.mark.parametrize("module, source, imported", [
    ("app.document", "from app.main_window import MainWindow\n", "app.main_window"),
    ("app.document", "def late():\n    from app.panels import form\n    return form\n", "app.panels.form"),
    ("app.document", "import app.main_window\n", "app.main_window"),
    ("app.panels.form", "from .. import main_window\n", "app.main_window"),
    ("app.panels.form", "from typing import TYPE_CHECKING\nif TYPE_CHECKING:\n    from app.gui import run\n",
     "app.gui"),
])
def test_the_checker_finds_an_import_that_reaches_up(module, source, imported):
    sources = dict(SYNTHETIC, **{module: source})
    sources.setdefault("app.gui", "")
    problems = layer_violations(sources)
    assert len(problems) == 1 and f"imports {imported}" in problems[0], problems


def test_the_checker_refuses_an_unplaced_module():
    problems = layer_violations(dict(SYNTHETIC, **{"app.somewhere_new": ""}))
    assert problems == ["app.somewhere_new has no layer: place it in the table of tests/test_app_layering.py"]
