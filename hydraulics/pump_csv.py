"""Pump data files: manufacturer test points in a small CSV format.

The format (one pump per file, UTF-8)::

    # Any line starting with '#' is a comment; blank lines are ignored.
    # rated_speed [rpm] = 1480
    # impeller_diameter [mm] = 312
    flow [L/s], head [m], efficiency [%], npsh_required [m]
    0,   42.0,  0,    2.2
    40,  40.5,  39.7, 2.3
    ...

* **Header.** The first line that is neither blank nor a comment names the columns.
  Each name is followed by its unit in square brackets.  Columns may come in any order;
  ``flow`` and ``head`` are required, ``efficiency``, ``npsh_required`` and ``power``
  (shaft power) are optional.  Accepted names (case and surrounding spaces ignored):
  ``flow``; ``head``; ``efficiency`` (or ``eff``); ``npsh_required`` (or ``npshr``,
  ``npsh``); ``power`` (or ``shaft_power``).
* **Units.** Any unit of the right dimension that the application's unit registry
  (:mod:`hydraulics.units`) knows: flow ``L/s``, ``m3/h``, ``m3/s``, ``gpm``; head and
  NPSH ``m``, ``ft``; power ``kW``, ``W``, ``hp`` (mechanical horsepower, 550 ft·lbf/s);
  efficiency ``%`` (percent) or ``-`` (a plain fraction 0–1; ``fraction`` and ``1`` mean
  the same).
* **Separators.** Comma or semicolon, taken from the header line (a semicolon anywhere in
  the header means semicolons).  With semicolons a decimal comma is accepted in the
  numbers (``28,5``); with commas the decimal mark must be a point.
* **Metadata.** A comment line of the exact form ``# key [unit] = value`` sets
  ``rated_speed`` (units ``rpm``, ``1/min``) or ``impeller_diameter`` (``mm``, ``m``,
  ``in``).  The value follows the same decimal rule as the data.  Any other comment is
  ignored; an unknown ``key`` in this form is refused, so a typing slip does not pass
  silently.
* **Rows.** Every row has a number in every column: no empty cells, no negative values,
  efficiency within 0–1 after conversion.  At least three points (four or more are
  recommended for a second-order fit).  Rows out of flow order are sorted (with a
  message); two rows with the same flow are refused.

Power and efficiency: the file keeps whichever it gives (both when both are given);
:func:`hydraulics.pump_fit.fit_pump` derives the missing one with the actual fluid density
(η = ρ g Q H / P), so no density is assumed here.

Errors raise :class:`PumpCsvError`, which carries the 1-based ``line`` and ``column`` of
the offending cell (``None`` where the problem is not in one cell) and a plain message.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from pathlib import Path

from hydraulics.bounded_read import BoundedReadError, read_text_file
from hydraulics.input_excerpt import quote_input
from hydraulics.model import ModelError, PumpModel
from hydraulics.units import convert_to_si
from hydraulics.validation import (
    MAX_PUMP_CSV_BYTES,
    MAX_PUMP_POINTS,
    MAX_SOURCE_COMMENT_LINES,
    require_pump_points,
    validate_pump,
)

__all__ = ["PumpCsvError", "read_pump_csv", "read_pump_csv_with_messages"]

RECOMMENDED_POINTS = 4
"""Points recommended for a second-order least-squares fit (leaves a residual to show)."""


class PumpCsvError(ValueError):
    """A pump data file that cannot be read.

    ``line`` and ``column`` are 1-based positions in the file (``None`` when the problem
    is not in a single cell); ``problem`` is the plain message.  ``str(error)`` reads
    ``"line 7, column 2 (head): 'abc' is not a number"``.
    """

    def __init__(self, problem: str, line: int | None = None, column: int | None = None,
                 column_name: str | None = None, quotes_content: bool = True):
        self.problem = problem
        self.quotes_content = quotes_content
        """False when ``problem`` holds nothing of the file's content (its size, its kind, its encoding)."""
        self.line = line
        self.column = column
        self.column_name = column_name
        where = []
        if line is not None:
            where.append(f"line {line}")
        if column is not None:
            where.append(f"column {column}" + (f" ({column_name})" if column_name else ""))
        super().__init__(f"{', '.join(where)}: {problem}" if where else problem)


# canonical column -> (unit quantity in hydraulics.units, accepted names)
_COLUMNS: dict[str, tuple[str, tuple[str, ...]]] = {
    "flow": ("flow", ("flow",)),
    "head": ("head", ("head",)),
    "efficiency": ("ratio_percent", ("efficiency", "eff")),
    "npsh_required": ("head", ("npsh_required", "npshr", "npsh")),
    "power": ("power", ("power", "shaft_power")),
}
_NAME_TO_COLUMN = {alias: key for key, (_, names) in _COLUMNS.items() for alias in names}
_FRACTION_UNITS = {"-", "", "1", "fraction"}

_METADATA = re.compile(r"^#\s*(?P<key>[A-Za-z_]+)\s*\[(?P<unit>[^\]]*)\]\s*=\s*(?P<value>\S.*?)\s*$")
_METADATA_KEYS = {"rated_speed": "speed", "impeller_diameter": "diameter"}
_HEADER_CELL = re.compile(r"^(?P<name>[^\[\]]*?)\s*\[(?P<unit>[^\]]*)\]\s*$")
_NUMBER = re.compile(r"^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$")


@dataclass(frozen=True)
class _Column:
    key: str
    unit: str
    index: int  # 0-based position in the row


def _to_si(value: float, key: str, unit: str) -> float:
    quantity = _COLUMNS[key][0]
    if key == "efficiency" and unit.strip().lower() in _FRACTION_UNITS:
        return value
    return float(convert_to_si(value, quantity, unit))


def _finite_si(value: float, key: str, unit: str, line: int, column: int) -> float:
    """``value`` in SI; a value that overflows to infinity through its unit is refused, not kept."""
    si = _to_si(value, key, unit)
    if not math.isfinite(si):
        raise PumpCsvError(f"{value:g} [{unit}] is too large: it is not a finite number in SI units",
                           line, column, key)
    return si


def _check_unit(key: str, unit: str, line: int, column: int) -> None:
    """Refuse a unit of the wrong dimension or one the registry does not know."""
    try:
        _to_si(1.0, key, unit)
    except Exception:  # noqa: BLE001 - pint's parser raises assorted types for non-units
        expected = {
            "flow": "a flow unit such as L/s, m3/h or gpm",
            "head": "a length unit such as m or ft",
            "npsh_required": "a length unit such as m or ft",
            "power": "a power unit such as kW or hp",
            "efficiency": "% or - (a fraction)",
        }[key]
        raise PumpCsvError(f"unit {quote_input(unit)} is not {expected}", line, column, key) from None


def _parse_number(text: str, decimal_comma: bool) -> float | None:
    cell = text.strip()
    if decimal_comma:
        cell = cell.replace(",", ".")
    if not _NUMBER.match(cell):
        return None
    value = float(cell)
    return value if math.isfinite(value) else None


def _split(line: str, separator: str) -> list[str]:
    return [cell.strip() for cell in line.split(separator)]


MAX_SOURCE_COMMENTS = MAX_SOURCE_COMMENT_LINES
"""Comment lines kept with a pump as its provenance (the rest of a long preamble is dropped)."""
MAX_COMMENT_CHARACTERS = 200
"""Characters kept of each comment line."""


def _read_text(path_or_text: str | Path) -> str:
    """The file's text, or the argument itself when it is CSV text (has a line break).

    A file is read by :func:`hydraulics.bounded_read.read_text_file`: a regular file of at most
    :data:`~hydraulics.validation.MAX_PUMP_CSV_BYTES`, UTF-8 with or without a byte-order mark.
    """
    if isinstance(path_or_text, str) and ("\n" in path_or_text or "\r" in path_or_text):
        if len(path_or_text) > MAX_PUMP_CSV_BYTES:
            raise PumpCsvError(f"the data have {len(path_or_text)} characters; at most {MAX_PUMP_CSV_BYTES} are read")
        return path_or_text.removeprefix("\ufeff")
    try:
        return read_text_file(path_or_text, MAX_PUMP_CSV_BYTES)
    except BoundedReadError as exc:
        raise PumpCsvError(exc.problem, quotes_content=False) from None


def _parse_header(cells: list[str], line_no: int) -> list[_Column]:
    columns: list[_Column] = []
    seen: dict[str, int] = {}
    for index, cell in enumerate(cells):
        match = _HEADER_CELL.match(cell)
        if match is None:
            raise PumpCsvError(
                f"header cell {quote_input(cell)} needs a name and a unit in brackets, e.g. 'flow [L/s]'",
                line_no, index + 1)
        name = match.group("name").strip().lower().replace(" ", "_")
        key = _NAME_TO_COLUMN.get(name)
        if key is None:
            raise PumpCsvError(
                f"unknown column {quote_input(match.group('name').strip())}; expected flow, head, efficiency, "
                "npsh_required or power", line_no, index + 1)
        if key in seen:
            raise PumpCsvError(f"column '{key}' appears twice (also column {seen[key]})", line_no, index + 1, key)
        unit = match.group("unit").strip()
        _check_unit(key, unit, line_no, index + 1)
        seen[key] = index + 1
        columns.append(_Column(key, unit, index))
    for required in ("flow", "head"):
        if required not in seen:
            raise PumpCsvError(f"the header has no '{required}' column; flow and head are required", line_no)
    return columns


def _parse_metadata(line: str, line_no: int, decimal_comma: bool, metadata: dict[str, float]) -> None:
    match = _METADATA.match(line)
    if match is None:
        return
    key = match.group("key").lower()
    if key not in _METADATA_KEYS:
        raise PumpCsvError(
            f"unknown setting {quote_input(match.group('key'))}; the settings are rated_speed and impeller_diameter",
            line_no)
    value = _parse_number(match.group("value"), decimal_comma)
    if value is None or value <= 0:
        raise PumpCsvError(f"{key} {quote_input(match.group('value'))} is not a positive number", line_no)
    unit = match.group("unit").strip()
    try:
        converted = float(convert_to_si(value, _METADATA_KEYS[key], unit))
    except Exception:  # noqa: BLE001 - pint's parser raises assorted types for non-units
        raise PumpCsvError(f"{key}: unit {quote_input(unit)} is not a unit of {_METADATA_KEYS[key]}",
                           line_no) from None
    if not math.isfinite(converted):
        raise PumpCsvError(f"{key} {value:g} [{unit}] is too large: it is not a finite number in SI units", line_no)
    metadata[key] = converted


def read_pump_csv_with_messages(path_or_text: str | Path, pump_id: str, name: str,
                                rated_speed_rpm: float | None = None) -> tuple[PumpModel, tuple[str, ...]]:
    """Read a pump data file; return the pump and the notes made while reading it.

    Parameters
    ----------
    path_or_text : str or Path
        A file path, or the CSV text itself (any string containing a line break).
    pump_id, name : str
        Identity given to the pump.
    rated_speed_rpm : float, optional
        Speed at which the data were measured (rpm).  Overrides a ``# rated_speed`` line
        of the file (a note says so when they differ); one of the two is required.

    Raises
    ------
    FileNotFoundError, OSError
        The path cannot be read.
    PumpCsvError
        Anything wrong with the content; the error names line and column.

    Examples
    --------
    >>> text = '''# rated_speed [rpm] = 1480
    ... flow [m3/h]; head [m]; efficiency [%]
    ... 0; 40,0; 0
    ... 180; 31,5; 61,0
    ... 108; 36,0; 52,5
    ... 252; 24,0; 66,0
    ... '''
    >>> pump, notes = read_pump_csv_with_messages(text, "SW", "demo")
    >>> pump.flow_m3_s, pump.head_m[:2], pump.efficiency[1]
    ((0.0, 0.03, 0.05, 0.07), (40.0, 36.0), 0.525)
    >>> notes
    ('rows were not in order of flow; sorted by flow',)
    """
    text = _read_text(path_or_text)
    messages: list[str] = []
    metadata: dict[str, float] = {}
    columns: list[_Column] | None = None
    separator = ","
    decimal_comma = False
    rows: list[tuple[int, dict[str, float]]] = []
    pending_metadata: list[tuple[str, int]] = []
    comments: list[str] = []

    for line_no, raw in enumerate(text.splitlines(), start=1):
        line = raw.strip()
        if not line:
            continue
        if line.startswith("#"):
            if len(comments) < MAX_SOURCE_COMMENTS:
                comments.append(line[1:].strip()[:MAX_COMMENT_CHARACTERS])
            if columns is None:
                pending_metadata.append((line, line_no))
            else:
                _parse_metadata(line, line_no, decimal_comma, metadata)
            continue
        if columns is None:
            separator = ";" if ";" in line else ","
            decimal_comma = separator == ";"
            columns = _parse_header(_split(line, separator), line_no)
            for meta_line, meta_no in pending_metadata:
                _parse_metadata(meta_line, meta_no, decimal_comma, metadata)
            continue
        cells = _split(line, separator)
        if len(cells) > len(columns) and any(c for c in cells[len(columns):]):
            raise PumpCsvError(
                f"{len(cells)} cells but the header names {len(columns)} columns"
                + ("; with ',' as separator use a decimal point, or separate with ';'" if separator == "," else ""),
                line_no, len(columns) + 1)
        row: dict[str, float] = {}
        for col in columns:
            column_no = col.index + 1
            cell = cells[col.index] if col.index < len(cells) else ""
            if cell == "":
                raise PumpCsvError("missing value", line_no, column_no, col.key)
            value = _parse_number(cell, decimal_comma)
            if value is None:
                hint = " (decimal comma needs ';' as separator)" if ("," in cell and not decimal_comma) else ""
                raise PumpCsvError(f"{quote_input(cell)} is not a number{hint}", line_no, column_no, col.key)
            if value < 0:
                raise PumpCsvError(f"{value:g} is negative; {col.key} must be zero or more",
                                   line_no, column_no, col.key)
            si = _finite_si(value, col.key, col.unit, line_no, column_no)
            if col.key == "efficiency" and si > 1.0:
                raise PumpCsvError(
                    f"efficiency {value:g} [{col.unit}] is above 100 %"
                    + ("; a percentage needs the unit [%]" if col.unit in _FRACTION_UNITS else ""),
                    line_no, column_no, col.key)
            row[col.key] = si
        rows.append((line_no, row))
        if len(rows) > MAX_PUMP_POINTS:
            raise PumpCsvError(f"more than {MAX_PUMP_POINTS} data rows; a pump curve has at most {MAX_PUMP_POINTS} "
                               "points", line_no)

    if columns is None:
        raise PumpCsvError("no header line found; the first data line must name the columns, e.g. "
                           "'flow [L/s], head [m]'")
    try:
        require_pump_points(len(rows), "pump.points")
    except ModelError as exc:
        raise PumpCsvError(f"{len(rows)} data rows; {exc.problem} ({RECOMMENDED_POINTS} or more recommended)") from None
    if len(rows) < RECOMMENDED_POINTS:
        messages.append(f"only {len(rows)} points: a second-order fit passes through them exactly, "
                        f"so no residual can be shown; {RECOMMENDED_POINTS} or more are recommended")

    flow_column = next(c for c in columns if c.key == "flow").index + 1
    if any(rows[i][1]["flow"] > rows[i + 1][1]["flow"] for i in range(len(rows) - 1)):
        messages.append("rows were not in order of flow; sorted by flow")
    rows.sort(key=lambda r: r[1]["flow"])
    for (line_a, a), (line_b, b) in zip(rows, rows[1:], strict=False):
        if a["flow"] == b["flow"]:
            first, second = sorted((line_a, line_b))
            raise PumpCsvError(f"the same flow appears on lines {first} and {second}; each flow once",
                               second, flow_column, "flow")

    if rated_speed_rpm is not None:
        speed = float(rated_speed_rpm)
        in_file = metadata.get("rated_speed")
        if in_file is not None and abs(in_file - speed) > 1e-9 * speed:
            messages.append(f"rated speed {speed:g} rpm given overrides {in_file:g} rpm in the file")
    elif "rated_speed" in metadata:
        speed = metadata["rated_speed"]
    else:
        raise PumpCsvError("no rated speed: add a line '# rated_speed [rpm] = 1480' or give the speed")

    def column(key: str) -> tuple[float, ...]:
        if not any(c.key == key for c in columns):
            return ()
        return tuple(r[key] for _, r in rows)

    pump = PumpModel(
        pump_id=pump_id,
        name=name,
        rated_speed_rpm=speed,
        flow_m3_s=column("flow"),
        head_m=column("head"),
        efficiency=column("efficiency"),
        shaft_power_w=column("power"),
        npsh_required_m=column("npsh_required"),
        impeller_diameter_m=metadata.get("impeller_diameter"),
        source_file=path_or_text.name if isinstance(path_or_text, Path) else (
            "" if "\n" in path_or_text or "\r" in path_or_text else Path(path_or_text).name),
        source_comments=tuple(comments),
    )
    try:
        validate_pump(pump, "pump")
    except ModelError as exc:
        raise _csv_error(exc, rows, columns) from None
    return pump, tuple(messages)


_POINT_PATH = re.compile(r"^pump\.points\[(\d+)\]\.(\w+)$")
_CSV_KEYS = {"flow_m3_s": "flow", "head_m": "head", "efficiency": "efficiency",
             "shaft_power_w": "power", "npsh_required_m": "npsh_required"}


def _csv_error(exc: ModelError, rows: list[tuple[int, dict[str, float]]], columns: list[_Column]) -> PumpCsvError:
    """A pump rule broken by the file's data (:func:`validate_pump`), placed at its line and column."""
    found = _POINT_PATH.match(exc.field_path)
    if found is None:
        return PumpCsvError(exc.problem)
    key = _CSV_KEYS.get(found.group(2))
    column = next((c.index + 1 for c in columns if c.key == key), None)
    return PumpCsvError(exc.problem, rows[int(found.group(1))][0], column, key)


def read_pump_csv(path_or_text: str | Path, pump_id: str, name: str,
                  rated_speed_rpm: float | None = None) -> PumpModel:
    """Read a pump data file (see the module description); the notes are dropped.

    >>> text = "# rated_speed [rpm] = 2900\\nflow [L/s], head [m]\\n0, 95\\n20, 88\\n40, 68\\n"
    >>> read_pump_csv(text, "BP", "demo").head_m
    (95.0, 88.0, 68.0)
    """
    return read_pump_csv_with_messages(path_or_text, pump_id, name, rated_speed_rpm)[0]
