"""Every rule by which a number becomes display text (no units attached).

The engine's messages, the window's tables, plots and fields, and the plain-text reports
all format numbers through these functions, so a value reads the same wherever it
appears.  Unit conversion and labels live in :mod:`hydraulics.units`
(:func:`~hydraulics.units.format_quantity` joins a number from here to its unit).

The rules, each for one kind of place:

* :func:`significant_figures` — quoted values in messages: ``digits`` significant
  figures, trailing zeros kept (``35.0``), exponent form only for very small or very
  large magnitudes.
* :func:`readout_number` — plot readouts and result tables: about ``significant``
  figures but at most ``max_decimals`` decimals, never in exponent form.
* :func:`plain_number` — editable cells and fields: up to ``digits`` significant
  figures without trailing zeros, so that the text can be typed back unchanged.
* :func:`cell_number` — the value of a cell or field as shown (not while edited): SI with
  :func:`plain_number`; US customary rounded as a practising engineer writes it, by the
  quantity's rule in :data:`US_CUSTOMARY_PRECISION`.
* :func:`fixed_decimals`, :func:`percent_number`, :func:`general_number` and
  :func:`grouped_whole_number` — report columns with a set number of decimals
  (fractions shown as percentages), dimensionless numbers of any magnitude, and annual
  totals.

A value that does not exist (``None``) or is not finite shows as :data:`MISSING`.
"""

from __future__ import annotations

import math

__all__ = ["MISSING", "significant_figures", "readout_number", "plain_number", "cell_number", "fixed_decimals",
           "general_number", "grouped_whole_number", "percent_number", "US_CUSTOMARY_PRECISION"]

MISSING = "—"
"""Shown where a value does not exist (no pump data, no operating point, not a number)."""


def _drop_negative_zero(text: str) -> str:
    """``"-0.00"`` → ``"0.00"``: a value that rounds to zero carries no sign."""
    if text.startswith("-") and float(text) == 0.0:
        return text[1:]
    return text


def significant_figures(value: float, digits: int = 3) -> str:
    """``value`` with ``digits`` significant figures, as quoted in messages.

    Whole-number parts are never cut (12345 stays 12345); very small or very large
    magnitudes use scientific notation; NaN shows as :data:`MISSING`, infinities as ∞.

    >>> significant_figures(35.0), significant_figures(0.0456), significant_figures(12345.6)
    ('35.0', '0.0456', '12346')
    >>> significant_figures(1.08e-5), significant_figures(float("nan"))
    ('1.08e-05', '—')
    """
    if not math.isfinite(value):
        return MISSING if math.isnan(value) else ("∞" if value > 0 else "−∞")
    if value == 0.0:
        return "0"
    magnitude = abs(value)
    if magnitude < 1e-3 or magnitude >= 1e9:
        return f"{value:.{max(digits - 1, 0)}e}"
    decimals = max(digits - 1 - math.floor(math.log10(magnitude)), 0)
    text = f"{value:.{decimals}f}"
    return "0" if float(text) == 0.0 else text


def readout_number(value: float | None, significant: int = 4, max_decimals: int = 3) -> str:
    """``value`` with about ``significant`` significant figures, never in exponent form.

    >>> readout_number(35.2149), readout_number(1234.56), readout_number(0.04567)
    ('35.21', '1235', '0.046')
    >>> readout_number(82.34, 3, 1), readout_number(None)
    ('82.3', '—')
    """
    if value is None or not math.isfinite(value):
        return MISSING
    if value == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(value)))
    decimals = min(max(significant - 1 - magnitude, 0), max_decimals)
    return _drop_negative_zero(f"{value:.{decimals}f}")


def plain_number(value: float, digits: int = 5) -> str:
    """Up to ``digits`` significant figures, no trailing zeros, no exponent for ordinary magnitudes.

    >>> plain_number(11.811023622), plain_number(300.0), plain_number(1250.5), plain_number(1.0e-5)
    ('11.811', '300', '1250.5', '1e-05')
    >>> plain_number(2500000.0)
    '2500000'
    """
    if not math.isfinite(value):
        return MISSING
    text = f"{value:.{digits}g}"
    if "e" in text and abs(value) >= 1.0:
        text = f"{value:.0f}"
    if text == "-0":
        text = "0"
    return text


US_CUSTOMARY_PRECISION: dict[str, tuple[int, int]] = {
    # quantity: (decimals, at least this many significant figures), common practice in US drawings and
    # calculations: lengths, levels and heads to 0.1 ft; bores to 0.01 in; velocities to 0.01 ft/s;
    # pressures, powers and temperatures to 0.1 psi / hp / °F; flows to whole gpm.
    "length": (1, 2),
    "elevation": (1, 2),
    "head": (1, 2),
    "diameter": (2, 2),
    "velocity": (2, 2),
    "pressure": (1, 2),
    "power": (1, 2),
    "temperature": (1, 2),
    "flow": (0, 3),
    "density": (2, 2),
    "roughness": (0, 2),
    "kinematic_viscosity": (0, 3),
    "volume": (0, 3),
    "specific_energy": (0, 3),
}
"""How a US customary value is shown, by quantity: ``(decimals, minimum significant figures)``.

The value is rounded to ``decimals`` places, but a small value keeps at least the minimum
significant figures (a 0.164 ft length is 0.16, a roughness of 0.00197 in is 0.002).
The basis is common practice: the precision to which quantities are written on US
drawings and in calculations, not a standard.  SI values are shown as typed
(:func:`plain_number`); quantities not listed here too."""


def cell_number(value: float, quantity: str, system: str, digits: int = 5) -> str:
    """``value`` (already in the display unit of ``system``) as a cell or field shows it.

    SI and quantities without a US rule: :func:`plain_number` with ``digits``.  US customary:
    the rule of :data:`US_CUSTOMARY_PRECISION`, trailing zeros dropped (the text can be typed
    back).

    >>> cell_number(29.527559, "length", "US"), cell_number(8.133858, "diameter", "US")
    ('29.5', '8.13')
    >>> cell_number(554.79, "flow", "US"), cell_number(0.0019685, "roughness", "US")
    ('555', '0.002')
    >>> cell_number(6.5617, "length", "US"), cell_number(0.164, "length", "US"), cell_number(29.527559, "length", "SI")
    ('6.6', '0.16', '29.528')
    """
    rule = US_CUSTOMARY_PRECISION.get(quantity) if system == "US" else None
    if rule is None or not math.isfinite(value):
        return plain_number(value, digits)
    if value == 0.0:
        return "0"
    decimals, significant = rule
    decimals = max(decimals, significant - 1 - math.floor(math.log10(abs(value))))
    text = f"{value:.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return _drop_negative_zero(text)


def fixed_decimals(value: float | None, decimals: int = 2) -> str:
    """``value`` with exactly ``decimals`` decimals (report columns).

    >>> fixed_decimals(3.14159, 3), fixed_decimals(12.0, 1), fixed_decimals(None)
    ('3.142', '12.0', '—')
    """
    if value is None or not math.isfinite(value):
        return MISSING
    return f"{value:.{decimals}f}"


def general_number(value: float | None, digits: int = 3) -> str:
    """``value`` in Python's general form with ``digits`` significant figures (``1.2e+05``).

    For dimensionless numbers of any magnitude in reports (Reynolds numbers, K factors).

    >>> general_number(123456.0), general_number(0.5), general_number(1.0034e-6, 4)
    ('1.23e+05', '0.5', '1.003e-06')
    """
    if value is None or not math.isfinite(value):
        return MISSING
    return f"{value:.{digits}g}"


def percent_number(fraction: float | None, decimals: int = 0) -> str:
    """A fraction as a percentage number (no ``%`` sign): ``0.823`` → ``'82'``.

    >>> percent_number(0.823), percent_number(0.8234, 1), percent_number(None)
    ('82', '82.3', '—')
    """
    if fraction is None or not math.isfinite(fraction):
        return MISSING
    return f"{fraction * 100.0:.{decimals}f}"


def grouped_whole_number(value: float | None) -> str:
    """``value`` rounded to a whole number with thousands separators (annual totals).

    >>> grouped_whole_number(1234567.8), grouped_whole_number(None)
    ('1,234,568', '—')
    """
    if value is None or not math.isfinite(value):
        return MISSING
    return f"{value:,.0f}"
