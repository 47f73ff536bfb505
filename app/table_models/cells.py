"""Typed values in cells and fields: parse with units, check the allowed range, format.

Every editable number in the window goes through :func:`parse_value`: the text is parsed
by :func:`hydraulics.units.parse_quantity` (a bare number is read in the unit on
display), then checked against the same :data:`hydraulics.validation.LIMITS` entry the
project-file reader uses.  A refusal raises :class:`CellError` whose message names the
field and states the allowed range in the units on display.
"""

from __future__ import annotations

import math

from hydraulics.input_excerpt import excerpt, quote_input
from hydraulics.model import ModelError
from hydraulics.number_format import cell_number, plain_number
from hydraulics.units import UnitInputError, display_unit, parse_quantity, to_display, unit_label
from hydraulics.validation import LIMITS, Limit

EDIT_DIGITS = 10
"""Significant digits put in an editor: enough that re-entering the text changes nothing."""

DISPLAY_DIGITS = 5
"""Significant digits shown in an SI cell (204.2 mm, 1250.5 m); US values follow their own rule."""

SAME_VALUE_TOLERANCE = 1e-9
"""Relative difference below which a re-typed value counts as unchanged."""


class CellError(ValueError):
    """A typed value the window refuses; ``str(error)`` is the message shown to the user."""


def display_text(value_si: float | None, quantity: str, system: str, digits: int = DISPLAY_DIGITS) -> str:
    """The text of a stored value in the display unit of ``system`` (no unit label).

    US customary values are rounded by :func:`hydraulics.number_format.cell_number` (29.5 ft, 8.13 in).
    """
    if value_si is None:
        return ""
    return cell_number(float(to_display(float(value_si), quantity, system)), quantity, system, digits)


def edit_text(value_si: float | None, quantity: str, system: str) -> str:
    """The text put in an editor: the display value with enough digits to round-trip."""
    if value_si is None:
        return ""
    return plain_number(float(to_display(float(value_si), quantity, system)), EDIT_DIGITS)


def unit_suffix(quantity: str | None, system: str) -> str:
    """The unit label of a quantity on display ("mm", "L/s"), "–" for a plain number."""
    if quantity is None:
        return ""
    label = unit_label(quantity, system)
    return label or "–"


def range_text(limit: Limit, quantity: str, system: str) -> str:
    """The allowed range of ``limit`` in the display unit: ``"between 5 and 5000 mm"``."""
    low = plain_number(float(to_display(limit.low, quantity, system)))
    high = plain_number(float(to_display(limit.high, quantity, system)))
    label = unit_label(quantity, system)
    unit = f" {label}" if label else ""
    kind = "a whole number " if limit.integer else ""
    return f"{kind}between {low} and {high}{unit}"


def same_value(a: float | None, b: float | None) -> bool:
    """True when two stored values are equal within :data:`SAME_VALUE_TOLERANCE`."""
    if a is None or b is None:
        return a is None and b is None
    return abs(a - b) <= SAME_VALUE_TOLERANCE * max(abs(a), abs(b), 1e-300)


def parse_value(text: object, *, label: str, quantity: str, limit_key: str, system: str,
                field_path: str = "", optional: bool = False) -> float | int | None:
    """Parse ``text`` typed for one field and check it against ``LIMITS[limit_key]``.

    Returns the stored (SI) value — an ``int`` for whole-number limits — or ``None`` for
    blank text when ``optional``.  Raises :class:`CellError` otherwise.

    >>> parse_value("300 mm", label="Internal diameter", quantity="diameter",
    ...             limit_key="segment.internal_diameter_m", system="SI")
    0.3
    >>> round(parse_value("12", label="Internal diameter", quantity="diameter",
    ...             limit_key="segment.internal_diameter_m", system="US"), 12)
    0.3048
    >>> parse_value("-5 m", label="Length", quantity="length", limit_key="segment.length_m", system="SI")
    Traceback (most recent call last):
    ...
    app.table_models.cells.CellError: Length: must be between 0 and 100000 m; got -5 m
    """
    limit = LIMITS[limit_key]
    typed = "" if text is None else str(text).strip()
    if not typed:
        if optional:
            return None
        raise CellError(f"{label}: a value is needed ({range_text(limit, quantity, system)})")
    try:
        value = parse_quantity(typed, quantity, default_unit=display_unit(quantity, system), field=label)
    except UnitInputError as exc:
        raise CellError(f"{exc}; allowed: {range_text(limit, quantity, system)}") from None
    if limit.integer and math.isfinite(value) and abs(value - round(value)) < 1e-9:
        value = float(round(value))
    try:
        limit.check(value, field_path or limit_key)
    except ModelError:
        if limit.integer and math.isfinite(value) and value != int(value):
            raise CellError(f"{label}: must be a whole number; got {excerpt(typed)}") from None
        raise CellError(f"{label}: must be {range_text(limit, quantity, system)}; got {excerpt(typed)}") from None
    return int(value) if limit.integer else value


def parse_choice(text: object, *, label: str, choices: list[tuple[str | None, str]]) -> str | None:
    """The value of the choice whose value or label matches ``text`` (case-insensitive).

    ``choices`` is a list of ``(value, label)``.  Raises :class:`CellError` listing the
    labels when nothing matches.

    >>> parse_choice("Delivery", label="Side", choices=[("suction", "Suction"), ("delivery", "Delivery")])
    'delivery'
    """
    typed = "" if text is None else str(text).strip()
    folded = typed.casefold()
    for value, shown in choices:
        if folded == shown.casefold() or (value is not None and folded == value.casefold()):
            return value
    names = ", ".join(shown for _, shown in choices[:12])
    more = ", …" if len(choices) > 12 else ""
    raise CellError(f"{label}: {quote_input(typed)} is not one of the choices ({names}{more})")
