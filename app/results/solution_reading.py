"""Read the pump parts of a :class:`~hydraulics.results.Solution` defensively.

A project without a pump has no pump curves, operating points or NPSH curve, and an
older or partial solution may lack some fields; the widgets ask through these helpers
so that a missing part shows as "nothing to draw" rather than an exception.  Nothing
here computes hydraulics: it selects, orders and names what the engine returned.
"""

from __future__ import annotations

import math
from typing import Any, Iterable

import numpy as np

STATIC_ORDER: dict[str, int] = {"max": 0, "min": 1}
PIPE_ORDER: dict[str, int] = {"aged": 0, "new": 1}
SPEED_TOLERANCE = 1e-6


def field(obj: Any, name: str, default: Any = None) -> Any:
    """``obj.name`` or ``default`` when the object or the field is absent."""
    if obj is None:
        return default
    return getattr(obj, name, default)


def reason_text(point: Any, unit_system: str = "SI") -> str:
    """Why ``point`` has no operating point, with its quoted values in ``unit_system``."""
    method = getattr(point, "reason_text", None)
    text = method(unit_system) if callable(method) else field(point, "reason")
    return text or "not found"


def as_array(value: Any) -> np.ndarray | None:
    """A float64 1-D array, or ``None`` for a missing or empty value."""
    if value is None:
        return None
    array = np.asarray(value, dtype=float).reshape(-1)
    return array if array.size else None


def finite_float(value: Any) -> float | None:
    """``value`` as a float when it is a finite number, else ``None``."""
    if value is None or isinstance(value, bool):
        return None
    try:
        number = float(value)
    except (TypeError, ValueError):
        return None
    return number if math.isfinite(number) else None


def current_speed_ratio(solution: Any) -> float | None:
    """The speed the arrangement runs at (n/n_rated), or ``None`` without a pump."""
    arrangement = field(field(solution, "project"), "arrangement")
    return finite_float(field(arrangement, "speed_ratio"))


def _speed_filter(items: Iterable[Any], solution: Any) -> list[Any]:
    items = list(items)
    if not items:
        return []
    speeds = [finite_float(field(item, "speed_ratio", 1.0)) for item in items]
    known = [s for s in speeds if s is not None]
    if not known:
        return items
    target = current_speed_ratio(solution)
    if target is None:
        target = max(known)
    nearest = min(known, key=lambda s: abs(s - target))
    return [item for item, s in zip(items, speeds) if s is None or abs(s - nearest) <= SPEED_TOLERANCE]


def pump_curves_at_current_speed(solution: Any) -> list[Any]:
    """Pump curves for 1..N pumps running at the arrangement's speed, ordered by N."""
    curves = _speed_filter(field(solution, "pump_curves", ()) or (), solution)
    curves = [c for c in curves if as_array(field(c, "flow_m3_s")) is not None
              and as_array(field(c, "head_m")) is not None]
    return sorted(curves, key=lambda c: int(field(c, "pumps_running", 1) or 1))


def single_pump_curve(solution: Any) -> Any | None:
    """The curve of one pump running at the current speed, or ``None``."""
    curves = pump_curves_at_current_speed(solution)
    for curve in curves:
        if int(field(curve, "pumps_running", 1) or 1) == 1:
            return curve
    return curves[0] if curves else None


def operating_points(solution: Any, current_speed_only: bool = False) -> list[Any]:
    """Operating points ordered by static extreme (max first), pipe (aged first), pumps running."""
    points = list(field(solution, "operating_points", ()) or ())
    if current_speed_only:
        points = _speed_filter(points, solution)

    def key(point: Any) -> tuple:
        return (
            STATIC_ORDER.get(str(field(point, "static", "")), 9),
            PIPE_ORDER.get(str(field(point, "pipe", "")), 9),
            int(field(point, "pumps_running", 1) or 1),
            -(finite_float(field(point, "speed_ratio", 1.0)) or 0.0),
        )

    return sorted(points, key=key)


def found_points(points: Iterable[Any]) -> list[Any]:
    """Points where the engine found an intersection with finite flow and head."""
    result = []
    for point in points:
        found = field(point, "found", True)
        if found is False:
            continue
        if finite_float(field(point, "flow_m3_s")) is None or finite_float(field(point, "head_m")) is None:
            continue
        result.append(point)
    return result


def pumps_phrase(pumps_running: int) -> str:
    """``"1 pump"``, ``"2 pumps"``."""
    return f"{pumps_running} pump" if pumps_running == 1 else f"{pumps_running} pumps"


def scenario_phrase(point: Any) -> str:
    """``"max static · aged pipe"``."""
    return f"{field(point, 'static', '?')} static · {field(point, 'pipe', '?')} pipe"


def point_label(point: Any, with_speed: bool = False) -> str:
    """Short label of an operating point: ``"2 pumps · max static · aged"``."""
    pumps = int(field(point, "pumps_running", 1) or 1)
    text = f"{pumps_phrase(pumps)} · {field(point, 'static', '?')} static · {field(point, 'pipe', '?')}"
    speed = finite_float(field(point, "speed_ratio"))
    if with_speed and speed is not None:
        text += f" · {speed * 100:.0f} % speed"
    return text


def preferred_flow_bounds(curve: Any) -> tuple[float, float] | None:
    """Preferred-region flow bounds of a pump curve (SI, same flow basis as the curve)."""
    low = finite_float(field(curve, "preferred_flow_min_m3_s"))
    high = finite_float(field(curve, "preferred_flow_max_m3_s"))
    if low is None or high is None or high <= low:
        return None
    return low, high


def preferred_region_percent(solution: Any) -> tuple[float, float] | None:
    """The preferred region as percentages of best-efficiency flow, from the criteria."""
    criteria = field(field(solution, "project"), "criteria")
    low = finite_float(field(criteria, "preferred_region_low"))
    high = finite_float(field(criteria, "preferred_region_high"))
    if low is None or high is None:
        return None
    return low * 100.0, high * 100.0
