"""Results as CSV tables for re-use in spreadsheets and scripts: system curves, operating points, segments.

Each file is UTF-8 with a byte-order mark (so spreadsheets read the units' superscripts,
``m³/h``), comma-separated, quoted where needed (:mod:`csv`, RFC 4180), and opens with a
preamble of four ``key,value`` rows and a blank row: ``project``, ``table``, ``units``
(the unit system written) and ``caution``.  The table's header row is row 6; a header
cell carries its unit in brackets (``"flow [L/s]"``); a cell without brackets is
dimensionless or text.

Numbers are converted from SI at the edge (:func:`hydraulics.units.to_display`) into the
chosen unit system (SI by default) and written at full precision: the shortest decimal
text that reads back as the same float (``repr``), so a value read back and converted
to SI again differs from the engine's by rounding in the last digit at most.  A missing
value (no point, no data, not finite) is an empty cell.  Numbers stay numbers.

Text cells (names, tags, notes) that begin with ``=``, ``+``, ``-``, ``@``, a tab or a
carriage return are neutralised with a leading apostrophe, so that a spreadsheet shows
them as text instead of running them as a formula (common practice: OWASP, "CSV
Injection").
"""

from __future__ import annotations

import csv
import io
import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import TypeAlias

from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.project_io import atomic_write_text
from hydraulics.results import OperatingPoint, PumpSetPoint, PumpShare, Solution
from hydraulics.units import to_display, unit_label

__all__ = ["FORMULA_TRIGGERS", "neutralise_text", "system_curves_csv", "operating_points_csv", "segments_csv",
           "write_csv", "PREAMBLE_ROWS"]

FORMULA_TRIGGERS = ("=", "+", "-", "@", "\t", "\r")
"""Leading characters that make a spreadsheet read a cell as a formula (OWASP, "CSV Injection")."""

PREAMBLE_ROWS = 5
"""Rows before the header row: project, table, units, caution and a blank row."""

JOULES_PER_KWH = 3.6e6
"""1 kWh = 3.6 MJ (exact, by the definition of the watt-hour)."""

Cell: TypeAlias = str | float | int | bool | None


def neutralise_text(text: str) -> str:
    """``text`` made safe for a spreadsheet cell: an apostrophe before a formula trigger.

    >>> neutralise_text("=HYPERLINK(1)"), neutralise_text("-1 main"), neutralise_text("Rising main")
    ("'=HYPERLINK(1)", "'-1 main", 'Rising main')
    """
    return "'" + text if text.startswith(FORMULA_TRIGGERS) else text


def _cell(value: Cell) -> str:
    """One cell's text: numbers in full precision (``repr``), booleans as yes/no, text neutralised."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else ""
    return neutralise_text(value)


def _header(title: str, quantity: str | None, system: str) -> str:
    """``"flow [L/s]"``; no brackets for a quantity without unit (``None`` or dimensionless)."""
    if quantity is None:
        return title
    label = unit_label(quantity, system)
    return f"{title} [{label}]" if label else title


def _table_text(solution: Solution, table: str, system: str, header: Sequence[str],
                rows: Iterable[Sequence[Cell]]) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer)
    writer.writerow([_cell("project"), _cell(solution.project.name)])
    writer.writerow(["table", _cell(table)])
    writer.writerow(["units", system])
    writer.writerow(["caution", _cell(CAUTIONS_TEXT)])
    writer.writerow([])
    writer.writerow([_cell(h) for h in header])
    for row in rows:
        writer.writerow([_cell(value) for value in row])
    return "\ufeff" + buffer.getvalue()


@dataclass(frozen=True)
class _Converter:
    """SI → the unit system written, for one file."""

    system: str

    def __call__(self, value_si: float | None, quantity: str) -> float | None:
        if value_si is None or not math.isfinite(value_si):
            return None
        return float(to_display(float(value_si), quantity, self.system))

    def specific_energy(self, kwh_m3: float | None) -> float | None:
        """A specific energy the engine gives in kWh/m³, in the file's unit."""
        return None if kwh_m3 is None else self(kwh_m3 * JOULES_PER_KWH, "specific_energy")


# ------------------------------------------------------------------ system curves
def system_curves_csv(solution: Solution, unit_system: str = "SI") -> str:
    """The system curves: one row per flow of each curve (static extreme × pipe state).

    Columns: static, pipe, flow, total head and its parts (static head, friction loss,
    minor loss; their sum is the total), and the control governing the head there:
    ``delivery``, or ``crest`` with the chainage of the vented summit of the main that governs.
    """
    to = _Converter(unit_system)
    header = ["static", "pipe", _header("flow", "flow", unit_system), _header("total head", "head", unit_system),
              _header("static head", "head", unit_system), _header("friction loss", "head", unit_system),
              _header("minor loss", "head", unit_system), "control",
              _header("control chainage", "length", unit_system)]

    def rows() -> Iterable[list[Cell]]:
        for curve in solution.curves:
            flows = to_display(curve.flow_m3_s, "flow", unit_system)
            columns = [to_display(a, "head", unit_system)
                       for a in (curve.head_m, curve.static_m, curve.friction_m, curve.minor_m)]
            chainages = curve.control_chainage_m
            for i in range(len(flows)):  # one row per flow: writing text, not a computation
                chainage = None if chainages is None else _finite(float(chainages[i]))
                yield [curve.static, curve.pipe, *(_finite(float(c[i])) for c in (flows, *columns)),
                       _control_word(chainage), to(chainage, "length")]

    return _table_text(solution, "System curves", unit_system, header, rows())


def _finite(value: float) -> float | None:
    return value if math.isfinite(value) else None


def _control_word(chainage_m: float | None) -> str:
    """What governs the system head: ``delivery``, or ``crest`` (a vented summit, its chainage beside it)."""
    return "delivery" if chainage_m is None else "crest"


# ------------------------------------------------------------------ operating points
def _point_columns(system: str) -> list[str]:
    h = _header
    return ["set", "static", "pipe", "pumps running", "running", "pump", "basis", h("speed", "ratio_percent", system),
            "found", h("flow", "flow", system), h("flow per pump", "flow", system), h("head", "head", system),
            h("efficiency", "ratio_percent", system), h("shaft power per pump", "power", system),
            h("shaft power total", "power", system), h("input power", "power", system),
            h("specific energy", "specific_energy", system), h("flow / BEP flow", "ratio_percent", system),
            h("NPSH available", "head", system), h("NPSH required", "head", system),
            h("NPSH margin", "head", system), "control", h("control chainage", "length", system), "note"]


def _arrangement_row(point: OperatingPoint, tags: str, to: _Converter) -> list[Cell]:
    note = point.reason_text(to.system) or ("extrapolated beyond the tested flows" if point.extrapolated else "")
    return ["arrangement", point.static, point.pipe, point.pumps_running, tags, "",
            "identical pumps at the arrangement's speed", to(point.speed_ratio, "ratio_percent"), point.found,
            to(point.flow_m3_s, "flow"), to(point.flow_per_pump_m3_s, "flow"), to(point.head_m, "head"),
            to(point.efficiency, "ratio_percent"), to(point.shaft_power_w, "power"),
            to(point.shaft_power_total_w, "power"), to(point.input_power_w, "power"),
            to.specific_energy(point.specific_energy_kwh_m3), to(point.bep_flow_ratio, "ratio_percent"),
            to(point.npsh_available_m, "head"), to(point.npsh_required_m, "head"), to(point.npsh_margin_m, "head"),
            _control_word(point.control_chainage_m), to(point.control_chainage_m, "length"), note]


def _set_row(point: PumpSetPoint, to: _Converter) -> list[Cell]:
    return ["pump set", point.static, point.pipe, len(point.running), point.label, "", f"{point.basis}, {point.speed}",
            None, point.found, to(point.flow_m3_s, "flow"), None, to(point.manifold_head_m, "head"), None, None,
            None, to(point.input_power_w, "power"), to.specific_energy(point.specific_energy_kwh_m3), None, None, None,
            None, "", None, point.reason or ""]


def _share_row(point: PumpSetPoint, share: PumpShare, to: _Converter) -> list[Cell]:
    notes = [text for flag, text in ((share.shut_off, "held shut by its check valve"),
                                     (share.extrapolated, "extrapolated beyond the tested flows")) if flag]
    return ["pump set", point.static, point.pipe, len(point.running), point.label, share.tag,
            f"{share.pump_name} ({share.role})", to(share.speed_ratio, "ratio_percent"), point.found,
            to(share.flow_m3_s, "flow"), to(share.flow_m3_s, "flow"), to(share.head_m, "head"),
            to(share.efficiency, "ratio_percent"), to(share.shaft_power_w, "power"), to(share.shaft_power_w, "power"),
            to(share.input_power_w, "power"), None, to(share.bep_flow_ratio, "ratio_percent"),
            to(share.npsh_available_m, "head"), to(share.npsh_required_m, "head"), to(share.npsh_margin_m, "head"),
            "", None, "; ".join(notes)]


def operating_points_csv(solution: Solution, unit_system: str = "SI") -> str:
    """Every operating point: the arrangement's scenarios, then the pump-set points with each pump's share.

    ``set`` is ``arrangement`` for the identical pumps at the arrangement's speed (one row
    per static extreme × pipe state × pumps running) or ``pump set`` for a set with pumps of
    other models or a standby in service: one row for the set (station flow, manifold
    head, input power; ``pump`` empty), then one row per running pump (``pump`` its tag:
    its own flow, its own head at its flanges, efficiency, powers, NPSH).  ``head`` is the
    system head at the manifold for the arrangement and set rows.
    """
    to = _Converter(unit_system)
    pump_set = solution.pump_set

    def tags(pumps_running: int) -> str:
        return pump_set.running_label(pumps_running) if pump_set is not None else ""

    def rows() -> Iterable[list[Cell]]:
        for point in solution.operating_points:
            yield _arrangement_row(point, tags(point.pumps_running), to)
        for set_point in (pump_set.points if pump_set is not None else ()):
            yield _set_row(set_point, to)
            for share in set_point.shares:
                yield _share_row(set_point, share, to)

    return _table_text(solution, "Operating points", unit_system, _point_columns(unit_system), rows())


# ------------------------------------------------------------------ segments
def segments_csv(solution: Solution, unit_system: str = "SI") -> str:
    """The segment table at the design flow with the duty pumps running.

    A segment of each pump's own branch (``carries`` = ``pump``) is at the flow of one of
    ``pumps running`` pumps sharing the design flow; the common pipework at the station
    flow.  Velocity, Reynolds number, Darcy friction factor and flow regime are per pipe
    where pipes run in parallel; ``total loss`` is friction plus minor loss.
    """
    to = _Converter(unit_system)
    h = _header
    header = ["segment", "side", "carries", "pumps running", h("flow", "flow", unit_system),
              h("length", "length", unit_system), h("internal diameter", "diameter", unit_system),
              h("roughness", "roughness", unit_system), "parallel pipes", h("velocity", "velocity", unit_system),
              "Reynolds number", "friction factor", "regime", h("friction loss", "head", unit_system), "K total",
              h("minor loss", "head", unit_system), h("total loss", "head", unit_system)]
    plain = _finite
    rows = ([s.name, s.side, s.carries, s.pumps_running, to(s.flow_m3_s, "flow"), to(s.length_m, "length"),
             to(s.internal_diameter_m, "diameter"), to(s.roughness_m, "roughness"), s.parallel_pipes,
             to(s.velocity_m_s, "velocity"), plain(s.reynolds), plain(s.friction_factor), s.regime,
             to(s.friction_loss_m, "head"), plain(s.minor_k_total), to(s.minor_loss_m, "head"),
             to(s.friction_loss_m + s.minor_loss_m, "head")] for s in solution.segments)
    return _table_text(solution, "Segments at the design flow", unit_system, header, rows)


def write_csv(path: str, text: str) -> None:
    """Write one of these tables atomically (the old file survives any failure)."""
    atomic_write_text(path, text)
