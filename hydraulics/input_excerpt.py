"""The one way a message quotes what a user or a file gave: a short excerpt, never the whole input.

A message that repeats its input without limit grows with the input (a five-million-character
value gave a five-million-character message) and can show text that was never meant to be shown.
Every message that quotes input calls :func:`quote_input`: the text is cut to
:data:`MAX_EXCERPT_CHARACTERS`, control characters are shown as escapes, and a cut excerpt says
how long the whole was.
"""

from __future__ import annotations

from typing import Final

MAX_EXCERPT_CHARACTERS: Final = 40
"""Characters of the input a message quotes (enough to recognise a typed value or a cell)."""


def quote_input(value: object, limit: int = MAX_EXCERPT_CHARACTERS) -> str:
    """``value`` as a message quotes it: text in quotes, cut to ``limit`` characters; other values short.

    Text reads as ``repr`` would show it (control characters escaped); a cut excerpt ends in
    "…" and says how long the whole was.  A number or other value is shown as ``repr`` shows
    it, cut the same way (a huge integer is described, never written out in decimal digits).

    >>> quote_input("12 kg")
    "'12 kg'"
    >>> quote_input("x" * 5_000_000)
    "'xxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxx…' (5000000 characters)"
    >>> quote_input("m\\x00")
    "'m\\\\x00'"
    >>> quote_input(-5.0), quote_input(10 ** 400)
    ('-5.0', 'a whole number of 401 digits')
    """
    if isinstance(value, str):
        cut = repr(value[:limit])
        if len(value) > limit:
            return f"{cut[:-1]}…{cut[-1]} ({len(value)} characters)"
        return cut
    if isinstance(value, int) and not isinstance(value, bool) and value.bit_length() > 64:
        return f"a whole number of {_digits(value)} digits"
    if isinstance(value, (list, tuple, dict, set)):
        return f"a {type(value).__name__} of {len(value)} items"
    text = repr(value)
    return text if len(text) <= limit else f"{text[:limit]}…"


def excerpt(text: str, limit: int = MAX_EXCERPT_CHARACTERS) -> str:
    """``text`` cut to ``limit`` characters without quotes, for a message that shows a typed value as typed.

    >>> excerpt("-5 m")
    '-5 m'
    >>> excerpt("9" * 50)
    '9999999999999999999999999999999999999999… (50 characters)'
    """
    shown = "".join(c if c.isprintable() else repr(c)[1:-1] for c in text[:limit])
    return shown if len(text) <= limit else f"{shown}… ({len(text)} characters)"


def _digits(value: int) -> int:
    """Decimal digits of a whole number, without converting it to text (that is slow and limited)."""
    magnitude = abs(value)
    estimate = int(magnitude.bit_length() * 0.30102999566398120) + 1
    return estimate if magnitude >= 10 ** (estimate - 1) else estimate - 1
