"""Plain number formatting for tables, readouts and labels (no units attached)."""

from __future__ import annotations

import math

DASH = "–"
"""Shown where a value does not exist (no pump data, no operating point)."""


def format_number(value: float | None, significant: int = 4, max_decimals: int = 3) -> str:
    """``value`` with about ``significant`` significant digits, never in exponent form.

    >>> format_number(35.2149)
    '35.21'
    >>> format_number(1234.56)
    '1235'
    >>> format_number(0.04567)
    '0.046'
    >>> format_number(None)
    '–'
    """
    if value is None or not math.isfinite(value):
        return DASH
    if value == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(value)))
    decimals = min(max(significant - 1 - magnitude, 0), max_decimals)
    text = f"{value:.{decimals}f}"
    if text.startswith("-") and float(text) == 0.0:
        text = text[1:]
    return text


def format_percent(fraction: float | None, decimals: int = 0) -> str:
    """A fraction shown as a percentage number: ``0.823`` → ``'82'``.

    >>> format_percent(0.823)
    '82'
    >>> format_percent(None)
    '–'
    """
    if fraction is None or not math.isfinite(fraction):
        return DASH
    return f"{fraction * 100.0:.{decimals}f}"
