"""Generated malformed input for the readers, shared by the property tests and the stress run.

Four families of input, each built from a seeded :class:`random.Random` (so a case is reproduced
from its seed alone, and hypothesis can drive the same builders with its own ``randoms()``):

* project files: a sample project's JSON mutated in its structure (a value replaced by a hostile
  one, a key dropped, repeated or misspelt, a list inflated past a count limit) or in its text
  (cut short, a character changed, brackets nested deep, a byte-order mark);
* pump data files: a sample pump CSV with a cell, a unit, a setting line or a separator changed;
* unit strings typed with a number (``5 m*10**10**7``) in every quantity;
* typed cells checked against their limits, as the window's tables check them.

Each case ends in one of two accepted outcomes: refused with the one error type of its reader
(``ProjectFileError``, ``PumpCsvError``, ``UnitInputError``, ``CellError``), or accepted, and then
every number of the result is finite and a project survives save and load unchanged.
:func:`run_fuzz` runs N cases and counts what happened; ``python -m tests.fuzz_cases N SEED``
prints the counts as JSON.
"""

from __future__ import annotations

import copy
import json
import math
import random
import sys
import time
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from functools import cache
from pathlib import Path
from typing import Any

from hydraulics.model import PumpModel
from hydraulics.project_io import (
    ProjectFileError,
    load_project,
    parse_project_json,
    project_from_dict,
    project_to_dict,
    project_to_json,
)
from hydraulics.pump_csv import PumpCsvError, read_pump_csv
from hydraulics.units import QUANTITIES, UnitInputError, parse_quantity

ROOT = Path(__file__).resolve().parent.parent
SAMPLES_DIR = ROOT / "sample_projects"
SAMPLE_FILES = tuple(sorted(SAMPLES_DIR.glob("*.pumpsketch.json")))
PUMP_FILES = tuple(sorted((SAMPLES_DIR / "pumps").glob("*.csv")))

HANG_SECONDS = 2.0
"""A case that takes longer than this counts as a hang (measured, never asserted)."""

HOSTILE_NUMBERS: tuple[str, ...] = (
    "9" * 400, "-" + "9" * 400, "1" + "0" * 4300, "1e308", "-1e308", "1e309", "1e-400", "0", "-1",
    "NaN", "Infinity", "-Infinity", "0.0", "123456789012345678901", "2.5e307", "-0",
)
"""Number literals as they stand in a JSON text (some are not JSON at all)."""

HOSTILE_UNITS: tuple[str, ...] = (
    "m*9**9**9", "m*10**10**7", "m" + "*m" * 15_000, "m\x00", "m\x1b[2J", "\u043c", "\u217f", "ｍ", "m\u200b",
    "m**5", "m**-9", "m**0.5", "m^^2", "((((m))))", "m)", "(m", "m**(2)", "9" * 500 + "*m", "km", "1/s",
    "__import__('os')", "m; import os", "lambda: m", "m*pi**4", "1e308*m", "", " ", "%", "°C", "degF", "mm²/s",
    "L/s", "m³/h", "gpm", "kWh/m³", "rpm", "min-1", "1/min", "Hz", "m H2O", "mH2O", "µm", "ft³/s", "inHg",
)
"""Unit texts: towers, long and control-character texts, look-alike letters, code, and the trade's own."""

HOSTILE_TEXTS: tuple[str, ...] = (
    "", " ", "x" * 100_000, "\x00", "\n", "é" * 300, "../../../../etc/passwd", "/dev/zero", "/proc/self/environ",
    "pumps/../../README.md", "pumps/booster_bp80.csv", "pumps", "nul\x00.csv",
)


def _hostile_value(rng: random.Random) -> object:
    """A value to put where the file has any other (the JSON tree level)."""
    choice = rng.randrange(14)
    if choice == 0:
        return 10 ** rng.choice((19, 30, 400))
    if choice == 1:
        return rng.choice((1e308, -1e308, 1e-320, 0.0, -0.0, -1.0, 1e20))
    if choice == 2:
        return rng.choice(HOSTILE_TEXTS)
    if choice == 3:
        return {"value": rng.choice((1e308, -1e308, 1.0, 0.0)), "unit": rng.choice(HOSTILE_UNITS)}
    if choice == 4:
        return {}
    if choice == 5:
        return []
    if choice == 6:
        return None
    if choice == 7:
        return rng.choice((True, False))
    if choice == 8:
        nested: object = []
        for _ in range(rng.choice((5, 25, 60))):
            nested = [nested]
        return nested
    if choice == 9:
        return {"unit": rng.choice(HOSTILE_UNITS), "values": [rng.choice((1e308, 1.0, -1.0)) for _ in range(5)]}
    if choice == 10:
        return rng.randint(-5, 5)
    if choice == 11:
        return "".join(rng.choice("ab\x00\x7f\u202e 1") for _ in range(rng.randint(0, 12)))
    if choice == 12:
        return {"value": 1.0}
    return [{}]


def _paths(node: object, path: tuple[Any, ...] = ()) -> Iterator[tuple[Any, ...]]:
    yield path
    if isinstance(node, dict):
        for key, value in node.items():
            yield from _paths(value, (*path, key))
    elif isinstance(node, list):
        for index, value in enumerate(node):
            yield from _paths(value, (*path, index))


def _at(node: Any, path: tuple[Any, ...]) -> Any:
    for step in path:
        node = node[step]
    return node


@cache
def sample_dicts() -> tuple[dict[str, Any], ...]:
    """Each sample as read from its file (pumps by ``source_csv``) and with its pumps' points inline."""
    raw = tuple(json.loads(path.read_text(encoding="utf-8")) for path in SAMPLE_FILES)
    inline = tuple(project_to_dict(load_project(path)) for path in SAMPLE_FILES)
    return raw + inline


def _structural(rng: random.Random, data: dict[str, Any]) -> dict[str, Any]:
    """One to three changes to the tree of a project."""
    for _ in range(rng.randint(1, 3)):
        paths = [p for p in _paths(data) if p]
        path = rng.choice(paths)
        parent = _at(data, path[:-1])
        action = rng.randrange(6)
        if action <= 2:
            parent[path[-1]] = _hostile_value(rng)
        elif action == 3 and isinstance(parent, dict):
            del parent[path[-1]]
        elif action == 4 and isinstance(parent, dict):
            parent[str(path[-1]) + rng.choice(("_", "s", "X"))] = parent.pop(path[-1])
        elif action == 5 and isinstance(parent, list):
            parent.extend([copy.deepcopy(parent[path[-1]])] * rng.choice((1, 3, 600)))
        else:
            parent[path[-1]] = _hostile_value(rng)
    return data


def _textual(rng: random.Random, text: str) -> str:
    """One change to the text of a project file."""
    action = rng.randrange(9)
    position = rng.randrange(len(text))
    if action == 0:
        return text[:position]
    if action == 1:
        return text[:position] + text[position + 1:]
    if action == 2:
        return text[:position] + rng.choice('{}[]",:0-e\x00\\') + text[position:]
    if action == 3:
        depth = rng.choice((30, 1000, 100_000))
        return "[" * depth + "]" * depth
    if action == 4:
        return "\ufeff" + text
    if action == 5:
        anchor = text.find('"value": ', position)
        if anchor < 0:
            anchor = text.find('"value": ')
        start = anchor + len('"value": ')
        end = start
        while end < len(text) and text[end] not in ",}":
            end += 1
        return text[:start] + rng.choice(HOSTILE_NUMBERS) + text[end:]
    if action == 6:
        anchor = text.find('"name": ', position)
        anchor = text.find('"name": ') if anchor < 0 else anchor
        return text[:anchor] + '"name": "repeated", ' + text[anchor:]
    if action == 7:
        return text.rstrip()[:-1] + ', "segments": []}'  # a key of the root repeated
    return text.replace('"', "'", rng.randint(1, 3))


@dataclass(frozen=True)
class ProjectCase:
    """A generated project-file text and the folder it is read from (the samples' folder)."""

    text: str
    base_dir: Path = SAMPLES_DIR


def project_case(rng: random.Random) -> ProjectCase:
    """A malformed (or, by chance, still valid) project file."""
    data = copy.deepcopy(rng.choice(sample_dicts()))
    if rng.random() < 0.6:
        return ProjectCase(json.dumps(_structural(rng, data), ensure_ascii=rng.random() < 0.5))
    return ProjectCase(_textual(rng, json.dumps(data, indent=rng.choice((None, 1)))))


def _walk_numbers(node: object) -> Iterator[float]:
    if isinstance(node, dict):
        for value in node.values():
            yield from _walk_numbers(value)
    elif isinstance(node, (list, tuple)):
        for value in node:
            yield from _walk_numbers(value)
    elif isinstance(node, float):
        yield node


class RoundTripError(AssertionError):
    """An accepted project that save and load changed, or that could not be saved."""


def check_project_case(case: ProjectCase) -> str:
    """``"accepted"`` (and round-tripped) or ``"refused"``; ``"non_finite"`` when a number is not finite.

    Raises :class:`RoundTripError` when load → save → load changes the project, and lets any
    other exception through: that is a defect of the reader.
    """
    try:
        project = project_from_dict(parse_project_json(case.text), base_dir=case.base_dir)
    except ProjectFileError:
        return "refused"
    saved = project_to_dict(project)
    if not all(math.isfinite(x) for x in _walk_numbers(saved)):
        return "non_finite"
    text = project_to_json(project)
    again = project_from_dict(parse_project_json(text), base_dir=case.base_dir)
    if again != project:
        raise RoundTripError("load → save → load changed the project")
    return "accepted"


@cache
def pump_texts() -> tuple[str, ...]:
    return tuple(path.read_text(encoding="utf-8") for path in PUMP_FILES)


def pump_case(rng: random.Random) -> str:
    """A pump data file with one to three cells, units, settings or separators changed."""
    lines = rng.choice(pump_texts()).splitlines()
    for _ in range(rng.randint(1, 3)):
        index = rng.randrange(len(lines))
        line = lines[index]
        action = rng.randrange(8)
        if action == 0 and "," in line:
            cells = line.split(",")
            cells[rng.randrange(len(cells))] = rng.choice(HOSTILE_NUMBERS + HOSTILE_TEXTS[:5] + ("", "1,5", "-0"))
            lines[index] = ",".join(cells)
        elif action == 1 and "[" in line:
            start, end = line.index("["), line.index("]")
            lines[index] = line[: start + 1] + rng.choice(HOSTILE_UNITS) + line[end:]
        elif action == 2:
            lines.insert(index, f"# rated_speed [{rng.choice(('1/s', 'rpm', 'Hz', 'm*9**9**9'))}] = "
                                f"{rng.choice(('1e308', '2900', '0', '-5', '9' * 400))}")
        elif action == 3:
            lines[index] = line.replace(",", ";")
        elif action == 4:
            lines.insert(index, line)
        elif action == 5:
            del lines[index]
        elif action == 6:
            lines.extend([lines[-1]] * rng.choice((2, 300)))
        else:
            lines[index] = "\ufeff" + line if index == 0 else line + rng.choice((",", ", 5", "\x00", " \u043c"))
    return "\n".join(lines) + "\n"


def check_pump_case(text: str) -> str:
    """``"accepted"``, ``"refused"`` or ``"non_finite"`` for one pump data text."""
    try:
        pump = read_pump_csv(text, "P", "fuzz")
    except PumpCsvError:
        return "refused"
    values = [pump.rated_speed_rpm, *pump.flow_m3_s, *pump.head_m, *pump.efficiency, *pump.shaft_power_w,
              *pump.npsh_required_m]
    if pump.impeller_diameter_m is not None:
        values.append(pump.impeller_diameter_m)
    return "accepted" if all(math.isfinite(v) for v in values) and isinstance(pump, PumpModel) else "non_finite"


_UNIT_PIECES = ("m", "mm", "km", "s", "h", "min", "L", "gpm", "ft", "in", "kW", "hp", "Pa", "bar", "psi", "°C",
                "degF", "rpm", "%", "*", "/", "**", "^", "(", ")", "2", "3", "9", "-", " ", "²", "³", "⁻¹", ".", "e",
                "x", "\x00", "\t", "м", "ｍ", "_", "10", "**9**9")


def typed_case(rng: random.Random) -> tuple[str, str]:
    """A typed value: a number and a unit, either hostile as known or assembled from pieces."""
    quantity = rng.choice(tuple(QUANTITIES))
    number = rng.choice(("5", "0", "-1", "1e308", "2.5", "9" * rng.choice((3, 400)), "nan", "", ".", "1,5"))
    if rng.random() < 0.4:
        unit = rng.choice(HOSTILE_UNITS)
    else:
        unit = "".join(rng.choice(_UNIT_PIECES) for _ in range(rng.randint(0, 12)))
    return f"{number} {unit}" if rng.random() < 0.9 else unit, quantity


def check_typed_case(text: str, quantity: str) -> str:
    """``"accepted"`` (a finite float), ``"refused"`` or ``"non_finite"``."""
    try:
        value = parse_quantity(text, quantity)
    except UnitInputError:
        return "refused"
    return "accepted" if isinstance(value, float) and math.isfinite(value) else "non_finite"


@cache
def _cell_limits() -> tuple[tuple[str, str], ...]:
    from hydraulics.validation import LIMITS

    return tuple((key, limit.quantity) for key, limit in LIMITS.items() if limit.quantity in QUANTITIES)


def cell_case(rng: random.Random) -> tuple[str, str, str, str]:
    """Typed cell text, its limit key, its quantity and the unit system on display."""
    text, _ = typed_case(rng)
    key, quantity = rng.choice(_cell_limits())
    return text, key, quantity, rng.choice(("SI", "US"))


def check_cell_case(text: str, key: str, quantity: str, system: str) -> str:
    """``"accepted"`` (inside the limit), ``"refused"`` (CellError) or ``"non_finite"``."""
    from app.table_models.cells import CellError, parse_value
    from hydraulics.validation import LIMITS

    try:
        value = parse_value(text, label="Value", quantity=quantity, limit_key=key, system=system)
    except CellError:
        return "refused"
    limit = LIMITS[key]
    if value is None or not math.isfinite(value):
        return "non_finite"
    return "accepted" if limit.low <= value <= limit.high else "non_finite"


def _project_check(rng: random.Random) -> Callable[[], str]:
    case = project_case(rng)
    return lambda: check_project_case(case)


def _pump_check(rng: random.Random) -> Callable[[], str]:
    text = pump_case(rng)
    return lambda: check_pump_case(text)


def _typed_check(rng: random.Random) -> Callable[[], str]:
    text, quantity = typed_case(rng)
    return lambda: check_typed_case(text, quantity)


def _cell_check(rng: random.Random) -> Callable[[], str]:
    case = cell_case(rng)
    return lambda: check_cell_case(*case)


FAMILIES: tuple[tuple[str, Callable[[random.Random], Callable[[], str]]], ...] = (
    ("project", _project_check), ("project", _project_check), ("pump_csv", _pump_check), ("unit", _typed_check),
    ("cell", _cell_check),
)
"""Each family: a builder of one case from a Random, returning the check to run (projects twice as often)."""


def run_fuzz(n: int, seed: int, on_failure: Callable[[str, int, BaseException | None], None] | None = None,
             ) -> dict[str, int]:
    """Run ``n`` generated inputs from ``seed`` and count the outcomes.

    Keys: ``inputs`` (cases run), ``uncaught_exceptions`` (a reader raised anything but its one
    error type; a failed round trip counts here too), ``hangs`` (cases that took more than
    :data:`HANG_SECONDS`: measured, each case still runs to its end under the program's own
    limits), ``non_finite_results`` (an accepted result holding NaN or infinity), and for
    information ``accepted``, ``refused`` and ``round_trip_failures``.  Case ``i`` is built from
    ``random.Random(f"{seed}:{i}")``, so any one case is reproduced alone.  ``on_failure`` is called
    with the family, the case number and the exception (None for a hang or a non-finite result).
    """
    counts = {"inputs": 0, "uncaught_exceptions": 0, "hangs": 0, "non_finite_results": 0,
              "accepted": 0, "refused": 0, "round_trip_failures": 0}
    for i in range(n):
        rng = random.Random(f"{seed}:{i}")
        family, build = FAMILIES[i % len(FAMILIES)]
        counts["inputs"] += 1
        start = time.perf_counter()
        error: BaseException | None = None
        try:
            outcome = build(rng)()
        except RoundTripError as exc:
            counts["round_trip_failures"] += 1
            counts["uncaught_exceptions"] += 1
            outcome, error = "", exc
        except Exception as exc:  # noqa: BLE001 - counting every uncaught exception is the point
            counts["uncaught_exceptions"] += 1
            outcome, error = "", exc
        if time.perf_counter() - start > HANG_SECONDS:
            counts["hangs"] += 1
            if on_failure is not None:
                on_failure(family, i, None)
        if outcome == "non_finite":
            counts["non_finite_results"] += 1
        elif outcome:
            counts[outcome] += 1
        if (error is not None or outcome == "non_finite") and on_failure is not None:
            on_failure(family, i, error)
    return counts


def main(argv: list[str]) -> int:
    n = int(argv[0]) if argv else 1000
    seed = int(argv[1]) if len(argv) > 1 else 0

    def report(family: str, index: int, error: BaseException | None) -> None:
        print(f"{family} case {index} (seed {seed}): {type(error).__name__ if error else 'hang or non-finite'}: "
              f"{str(error)[:200] if error else ''}", file=sys.stderr)

    counts = run_fuzz(n, seed, on_failure=report)
    print(json.dumps(counts))
    return 1 if counts["uncaught_exceptions"] or counts["hangs"] or counts["non_finite_results"] else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
