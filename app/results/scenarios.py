"""Which operating points and pump curves a view shows, in which order, and their names.

Nothing here computes hydraulics: it selects the parts of a
:class:`~hydraulics.results.Solution` that run at the arrangement's current speed, puts
the scenarios in the order the tables and plots use (maximum static head first, aged pipe
first, then by pumps running) and names them.
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator, Sequence
from typing import TypeVar

from hydraulics.results import OperatingPoint, PumpCurve, PumpSetPoint, PumpShare, Solution

STATIC_ORDER: dict[str, int] = {"max": 0, "min": 1}
PIPE_ORDER: dict[str, int] = {"aged": 0, "new": 1}
SPEED_TOLERANCE = 1e-6
"""Speed ratios closer than this count as the same speed."""

_AtSpeed = TypeVar("_AtSpeed", OperatingPoint, PumpCurve)


def current_speed_ratio(solution: Solution) -> float | None:
    """The speed the arrangement runs at (n/n_rated), or ``None`` without a pump."""
    arrangement = solution.project.arrangement
    return None if arrangement is None else float(arrangement.speed_ratio)


def at_current_speed(items: Sequence[_AtSpeed], solution: Solution) -> list[_AtSpeed]:
    """The items at the speed nearest the arrangement's (the highest speed without a pump)."""
    if not items:
        return []
    target = current_speed_ratio(solution)
    if target is None:
        target = max(item.speed_ratio for item in items)
    nearest = min((item.speed_ratio for item in items), key=lambda s: abs(s - target))
    return [item for item in items if abs(item.speed_ratio - nearest) <= SPEED_TOLERANCE]


def pump_curves_at_current_speed(solution: Solution) -> list[PumpCurve]:
    """Pump curves for 1..N pumps running at the arrangement's speed, ordered by N."""
    return sorted(at_current_speed(solution.pump_curves, solution), key=lambda c: c.pumps_running)


def single_pump_curve(solution: Solution) -> PumpCurve | None:
    """The curve of one pump running at the current speed, or ``None`` without a pump."""
    curves = pump_curves_at_current_speed(solution)
    for curve in curves:
        if curve.pumps_running == 1:
            return curve
    return curves[0] if curves else None


def scenario_order(point: OperatingPoint) -> tuple[int, int, int, float]:
    """Sort key: static extreme (max first), pipe (aged first), pumps running, speed (fastest first)."""
    return (STATIC_ORDER.get(point.static, 9), PIPE_ORDER.get(point.pipe, 9), point.pumps_running,
            -point.speed_ratio)


def ordered_points(solution: Solution, current_speed_only: bool = False) -> list[OperatingPoint]:
    """The solution's operating points in :func:`scenario_order`, optionally at the current speed only."""
    points: Sequence[OperatingPoint] = solution.operating_points
    if current_speed_only:
        points = at_current_speed(points, solution)
    return sorted(points, key=scenario_order)


def found_points(points: Iterable[OperatingPoint]) -> list[OperatingPoint]:
    """Points where the engine found an intersection (with a flow and a head)."""
    return [p for p in points if p.found and p.flow_m3_s is not None and p.head_m is not None]


def reason_text(point: OperatingPoint, unit_system: str = "SI") -> str:
    """Why ``point`` has no operating point, with its quoted values in ``unit_system``."""
    return point.reason_text(unit_system) or "not found"


def pumps_phrase(pumps_running: int) -> str:
    """``"1 pump"``, ``"2 pumps"``.

    >>> pumps_phrase(1), pumps_phrase(3)
    ('1 pump', '3 pumps')
    """
    return f"{pumps_running} pump" if pumps_running == 1 else f"{pumps_running} pumps"


def scenario_phrase(point: OperatingPoint) -> str:
    """``"max static · aged pipe"``."""
    return f"{point.static} static · {point.pipe} pipe"


def pump_set_phrase(point: PumpSetPoint) -> str:
    """``"max static · aged pipe"``, with ``· lowest speed`` and why the set was solved when a pump is out."""
    text = f"{point.static} static · {point.pipe} pipe"
    if point.speed == "lowest speed":
        text += " · lowest speed"
    if point.basis != "run sequence":
        text += f" · {point.basis.split(',')[0]}"  # "P1 out of service"; the standby is in "Pumps running"
    return text


def pump_share_phrase(share: PumpShare) -> str:
    """``"    P3 'JP40 jockey', assist"`` (indented under its set), ``— held shut`` at shut-off."""
    text = f"      {share.tag}  {share.pump_name}, {share.role}"
    return text + " — held shut by its check valve" if share.shut_off else text


def pump_set_label(point: PumpSetPoint) -> str:
    """Short label of a pump-set point on the plot: ``"P1+P3 · max static · aged"``."""
    return f"{point.label} · {point.static} static · {point.pipe}"


def rows_with_pump_sets(points: Sequence[OperatingPoint], pump_sets: Sequence[PumpSetPoint],
                        ) -> Iterator[OperatingPoint | PumpSetPoint | PumpShare]:
    """The rows of the operating-points table: each scenario's ordinary points, then its pump sets.

    A pump set (stages of the run sequence first, by pumps running, highest speed first, then
    the sets with a pump out of service) is followed by its running pumps.
    """
    keyed: list[tuple[tuple[int, int, int, int, float], int, OperatingPoint | PumpSetPoint]] = []
    for i, point in enumerate(points):
        keyed.append(((STATIC_ORDER.get(point.static, 9), PIPE_ORDER.get(point.pipe, 9), 0, point.pumps_running,
                       -point.speed_ratio), i, point))
    for i, item in enumerate(pump_sets):
        keyed.append(((STATIC_ORDER.get(item.static, 9), PIPE_ORDER.get(item.pipe, 9),
                       1 if item.basis == "run sequence" else 2, len(item.running),
                       0.0 if item.speed != "lowest speed" else 1.0), len(points) + i, item))
    for _key, _i, row in sorted(keyed, key=lambda k: (k[0], k[1])):
        yield row
        if isinstance(row, PumpSetPoint):
            yield from row.shares


def point_label(point: OperatingPoint, with_speed: bool = False) -> str:
    """Short label of an operating point: ``"2 pumps · max static · aged"``."""
    text = f"{pumps_phrase(point.pumps_running)} · {point.static} static · {point.pipe}"
    if with_speed:
        text += f" · {point.speed_ratio * 100:.0f} % speed"
    return text


def preferred_flow_bounds(curve: PumpCurve) -> tuple[float, float] | None:
    """Preferred-region flow bounds of a pump curve (SI, station flow), ``None`` without them."""
    low, high = curve.preferred_flow_min_m3_s, curve.preferred_flow_max_m3_s
    if low is None or high is None or high <= low:
        return None
    return low, high


def preferred_region_percent(solution: Solution) -> tuple[float, float]:
    """The preferred region as percentages of best-efficiency flow, from the criteria."""
    criteria = solution.project.criteria
    return criteria.preferred_region_low * 100.0, criteria.preferred_region_high * 100.0
