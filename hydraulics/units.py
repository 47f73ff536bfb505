"""Units at the edges: the application's single pint registry, typed-input parsing and display units.

The engine works in plain SI floats (see :mod:`hydraulics.model`).  This module is the
only place that talks to pint.  Its registry knows the units of ``unit_definitions.txt``
(beside this module, shipped as package data): the ones a pumping-station tool reads,
shows and accepts, each with its published definition.

* :func:`parse_quantity` turns what a user types (``"300 mm"``, ``"550 gpm"``,
  ``"20 °C"``) into the SI float the model stores, or raises :class:`UnitInputError`
  with a message that names the field and says what is expected.
* :func:`to_display` / :func:`from_display` convert SI floats or numpy arrays to and
  from the display unit of a unit system ("SI" or "US") with precomputed factors, so
  they cost a multiplication, not a pint call.
* :func:`unit_label` gives our own short label of a display unit (``"L/s"``, ``"m³/h"``,
  ``"gpm"``) and :func:`format_quantity` a finished string such as ``"35.0 L/s"`` (the
  number formatted by :func:`hydraulics.number_format.significant_figures`).

Conventions kept throughout:

* Temperatures are offset units.  A typed temperature is split into its number and its
  unit and built as ``Q_(number, unit)``; it is never parsed as the product
  ``20 * degC``, which pint rightly refuses as ambiguous.  The model stores temperature
  as a float in °C.
* A decimal comma is refused rather than guessed: pint reads ``"1,5 m"`` as 15 m.
* Shaft speed is stored in rpm.  pint counts a revolution as 2π radians, so it would
  convert ``"1450 1/min"`` to 230.8 rpm; here a unit without an angle in it (``1/min``,
  ``min-1``, ``1/s``, ``Hz``) counts revolutions, as the pump trade writes it.
* ``gpm`` is the US gallon (3.785411784 L exactly) per minute, ``MGD`` a million US
  gallons per day and ``mwc`` a metre of water column (9806.65 Pa, conventional).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cached_property, lru_cache
from importlib import resources
from typing import Final, overload

import numpy as np
import pint
from numpy.typing import NDArray

from hydraulics.input_excerpt import quote_input
from hydraulics.number_format import significant_figures
from hydraulics.results import FloatArray

__all__ = [
    "ureg",
    "Q_",
    "UnitInputError",
    "UnitTextError",
    "check_unit_text",
    "QUANTITIES",
    "UNIT_SYSTEMS",
    "parse_quantity",
    "display_unit",
    "unit_label",
    "label_for_unit",
    "to_display",
    "from_display",
    "convert_to_si",
    "convert_from_si",
    "format_quantity",
]

# --------------------------------------------------------------------------- registry
UNIT_DEFINITIONS: Final = "unit_definitions.txt"
"""Our definitions file, beside this module: only the units the application reads, shows
or accepts, each with its published definition.  pint's complete default set takes about
ten times longer to load, at every start."""


def _build_registry() -> pint.UnitRegistry[float]:
    with resources.as_file(resources.files("hydraulics").joinpath(UNIT_DEFINITIONS)) as path:
        return pint.UnitRegistry(str(path))


ureg: Final = _build_registry()
"""The one unit registry of the application (never create another: pint#725)."""

pint.set_application_registry(ureg)  # type: ignore[no-untyped-call]  # pint leaves this function unannotated

Q_ = ureg.Quantity
"""Quantity constructor bound to :data:`ureg`."""


class UnitInputError(ValueError):
    """Typed text that is not a valid value of the quantity asked for.

    ``field`` is the plain name of the input (``"Length"``), ``text`` what was typed and
    ``problem`` what is wrong and what is expected.  ``str(error)`` is
    ``"<field>: <problem>"``, ready to show to the user.
    """

    def __init__(self, field: str, text: str, problem: str):
        self.field = field
        self.text = text
        self.problem = problem
        super().__init__(f"{field}: {problem}" if field else problem)


class UnitTextError(ValueError):
    """A unit text refused before pint sees it (too long, a character or a unit outside the allow-list,
    an exponent tower or an exponent out of range); ``problem`` says which, in plain words."""

    def __init__(self, problem: str):
        self.problem = problem
        super().__init__(problem)


# --------------------------------------------------------------------------- quantities
QUANTITIES: Final[dict[str, tuple[str, str]]] = {
    "flow": ("[length] ** 3 / [time]", "meter ** 3 / second"),
    "head": ("[length]", "meter"),
    "length": ("[length]", "meter"),
    "elevation": ("[length]", "meter"),
    "diameter": ("[length]", "meter"),
    "roughness": ("[length]", "meter"),
    "velocity": ("[length] / [time]", "meter / second"),
    "pressure": ("[mass] / [length] / [time] ** 2", "pascal"),
    "power": ("[mass] * [length] ** 2 / [time] ** 3", "watt"),
    "energy": ("[mass] * [length] ** 2 / [time] ** 2", "joule"),
    "specific_energy": ("[mass] / [length] / [time] ** 2", "joule / meter ** 3"),
    "temperature": ("[temperature]", "degree_Celsius"),
    "density": ("[mass] / [length] ** 3", "kilogram / meter ** 3"),
    "kinematic_viscosity": ("[length] ** 2 / [time]", "meter ** 2 / second"),
    "volume": ("[length] ** 3", "meter ** 3"),
    "speed": ("1 / [time]", "revolutions_per_minute"),
    "dimensionless": ("", "dimensionless"),
    "ratio_percent": ("", "dimensionless"),
}
"""Quantity name -> (pint dimensionality, unit of the value stored in the model).

The stored unit is SI except temperature (°C) and shaft speed (rpm).  ``ratio_percent``
is a fraction in the model (0.85) shown as a percentage (85 %).
"""


@dataclass(frozen=True)
class _Wording:
    """How messages speak of one quantity."""

    label: str
    noun: str
    examples: str


_WORDING: Final[dict[str, _Wording]] = {
    "flow": _Wording("Flow", "a flow", "35 L/s, 120 m³/h or 550 gpm"),
    "head": _Wording("Head", "a head (a height of liquid)", "12 m or 40 ft"),
    "length": _Wording("Length", "a length", "300 mm or 12 in"),
    "elevation": _Wording("Elevation", "an elevation", "104.5 m or 340 ft"),
    "diameter": _Wording("Diameter", "a diameter", "300 mm or 12 in"),
    "roughness": _Wording("Roughness", "a roughness", "0.05 mm or 0.002 in"),
    "velocity": _Wording("Velocity", "a velocity", "1.5 m/s or 5 ft/s"),
    "pressure": _Wording("Pressure", "a pressure", "2.5 bar, 250 kPa or 36 psi"),
    "power": _Wording("Power", "a power", "45 kW or 60 hp"),
    "energy": _Wording("Energy", "an energy", "1200 kWh or 4.3 GJ"),
    "specific_energy": _Wording("Specific energy", "a specific energy", "0.25 kWh/m³ or 1.0 kWh/kgal"),
    "temperature": _Wording("Temperature", "a temperature", "20 °C, 68 °F or 293.15 K"),
    "density": _Wording("Density", "a density", "998 kg/m³ or 62.3 lb/ft³"),
    "kinematic_viscosity": _Wording("Kinematic viscosity", "a kinematic viscosity", "1.0 mm²/s or 1 cSt"),
    "volume": _Wording("Volume", "a volume", "250 m³ or 66 kgal"),
    "speed": _Wording("Speed", "a rotational speed", "1450 rpm or 1450 1/min"),
    "dimensionless": _Wording("Value", "a plain number", "0.85 or 12"),
    "ratio_percent": _Wording("Percentage", "a percentage or fraction", "85 % or 0.85"),
}

# --------------------------------------------------------------------------- display units
UNIT_SYSTEMS: Final = ("SI", "US")
"""The unit systems the window offers."""

_DISPLAY_UNITS: Final[dict[str, dict[str, str]]] = {
    "SI": {
        "flow": "liter / second",
        "head": "meter",
        "length": "meter",
        "elevation": "meter",
        "diameter": "millimeter",
        "roughness": "millimeter",
        "velocity": "meter / second",
        "pressure": "kilopascal",
        "power": "kilowatt",
        "energy": "kilowatt_hour",
        "specific_energy": "kilowatt_hour / meter ** 3",
        "temperature": "degree_Celsius",
        "density": "kilogram / meter ** 3",
        "kinematic_viscosity": "millimeter ** 2 / second",
        "volume": "meter ** 3",
        "speed": "revolutions_per_minute",
        "dimensionless": "dimensionless",
        "ratio_percent": "percent",
    },
    "US": {
        "flow": "gallon_per_minute",
        "head": "foot",
        "length": "foot",
        "elevation": "foot",
        "diameter": "inch",
        "roughness": "inch",
        "velocity": "foot / second",
        "pressure": "pound_force_per_square_inch",
        "power": "horsepower",
        "energy": "kilowatt_hour",
        "specific_energy": "kilowatt_hour / kilogallon",
        "temperature": "degree_Fahrenheit",
        "density": "pound / foot ** 3",
        "kinematic_viscosity": "foot ** 2 / second",
        "volume": "kilogallon",
        "speed": "revolutions_per_minute",
        "dimensionless": "dimensionless",
        "ratio_percent": "percent",
    },
}

_LABELS: Final[dict[str, str]] = {
    "meter ** 3 / second": "m³/s",
    "meter ** 3 / hour": "m³/h",
    "liter / second": "L/s",
    "liter / minute": "L/min",
    "megaliter / day": "ML/d",
    "gallon_per_minute": "gpm",
    "gallon / minute": "gpm",
    "million_gallons_per_day": "MGD",
    "meter": "m",
    "millimeter": "mm",
    "kilometer": "km",
    "foot": "ft",
    "inch": "in",
    "meter / second": "m/s",
    "foot / second": "ft/s",
    "pascal": "Pa",
    "kilopascal": "kPa",
    "megapascal": "MPa",
    "bar": "bar",
    "pound_force_per_square_inch": "psi",
    "metre_water_column": "mwc",
    "watt": "W",
    "kilowatt": "kW",
    "horsepower": "hp",
    "joule": "J",
    "kilowatt_hour": "kWh",
    "megawatt_hour": "MWh",
    "joule / meter ** 3": "J/m³",
    "kilowatt_hour / meter ** 3": "kWh/m³",
    "kilowatt_hour / kilogallon": "kWh/kgal",
    "degree_Celsius": "°C",
    "degree_Fahrenheit": "°F",
    "kelvin": "K",
    "kilogram / meter ** 3": "kg/m³",
    "pound / foot ** 3": "lb/ft³",
    "meter ** 2 / second": "m²/s",
    "millimeter ** 2 / second": "mm²/s",
    "centistokes": "cSt",
    "foot ** 2 / second": "ft²/s",
    "meter ** 3": "m³",
    "liter": "L",
    "gallon": "gal",
    "kilogallon": "kgal",
    "megagallon": "Mgal",
    "revolutions_per_minute": "rpm",
    "dimensionless": "",
    "percent": "%",
}

# --------------------------------------------------------------------------- conversion factors
Scalar = float | int


@dataclass(frozen=True)
class _Linear:
    """``stored = scale * value + offset``: a unit's conversion to the stored unit."""

    scale: float
    offset: float = 0.0

    @cached_property
    def inverse_scale(self) -> float:
        """``1 / scale``, snapped like the factors themselves."""
        return _snap(1.0 / self.scale)

    @cached_property
    def inverse_offset(self) -> float:
        """Offset of the inverse conversion, ``-offset / scale``."""
        return _snap(-self.offset / self.scale) if self.offset else 0.0


def _snap(number: float) -> float:
    """Remove float noise from a conversion factor that is a short exact decimal.

    pint builds factors by chains of float operations (a litre comes out as
    0.0010000000000000002 m³).  When the factor lies within 1e-14 of a decimal of
    12 significant digits, that decimal is the exact definition (NIST SP 811
    Appendix B: 1 in = 0.0254 m, 1 US gal = 3.785411784 L) and is used instead;
    other factors (1/3600) are kept as computed.
    """
    candidate = float(f"{number:.12g}")
    return candidate if abs(candidate - number) <= 1e-14 * abs(number) else number


def _has_angle(unit: pint.Unit) -> bool:
    return "radian" in Q_(1.0, unit).to_root_units().units._units


_TEMPERATURES_TO_CELSIUS: Final[dict[str, _Linear]] = {
    # Exact by definition (SI Brochure, 9th edition; NIST SP 811 Appendix B.8):
    # t/°C = T/K − 273.15;  t/°C = (t/°F − 32)/1.8;  T/K = (T/°R)/1.8.
    "degree_Celsius": _Linear(1.0),
    "kelvin": _Linear(1.0, -273.15),
    "degree_Fahrenheit": _Linear(1.0 / 1.8, -32.0 / 1.8),
    "degree_Rankine": _Linear(1.0 / 1.8, -273.15),
}


def _linear_to_stored(unit: pint.Unit, quantity: str) -> _Linear:
    """Factor and offset from ``unit`` to the stored unit of ``quantity`` (calls pint)."""
    dimensionality, stored_unit = QUANTITIES[quantity]
    if quantity == "temperature" and str(unit) in _TEMPERATURES_TO_CELSIUS:
        # pint's offset arithmetic leaves noise of order 1e-13 °C; use the definitions.
        return _TEMPERATURES_TO_CELSIUS[str(unit)]
    if quantity == "speed" and not _has_angle(unit):
        # A rate without an angle (1/min, Hz) counts revolutions, as the trade writes it.
        return _Linear(_snap(Q_(1.0, unit).to("1 / minute").magnitude))
    zero = Q_(0.0, unit).to(stored_unit).magnitude
    one = Q_(1.0, unit).to(stored_unit).magnitude
    return _Linear(_snap(one - zero), _snap(zero))


def _system_factors(system: str) -> dict[str, _Linear]:
    return {q: _linear_to_stored(ureg.Unit(u), q) for q, u in _DISPLAY_UNITS[system].items()}


_DISPLAY_FACTORS: Final[dict[str, dict[str, _Linear]]] = {s: _system_factors(s) for s in UNIT_SYSTEMS}


def _check_quantity(quantity: str) -> None:
    if quantity not in QUANTITIES:
        raise KeyError(f"unknown quantity {quantity!r}; known: {', '.join(QUANTITIES)}")


def _check_system(system: str) -> None:
    if system not in _DISPLAY_UNITS:
        raise KeyError(f"unknown unit system {system!r}; known: {', '.join(UNIT_SYSTEMS)}")


def display_unit(quantity: str, system: str) -> str:
    """The pint unit string in which ``quantity`` is shown in ``system``.

    >>> display_unit("flow", "US")
    'gallon_per_minute'
    """
    _check_quantity(quantity)
    _check_system(system)
    return _DISPLAY_UNITS[system][quantity]


def label_for_unit(unit: str) -> str:
    """Our short label of a pint unit string (``"liter / second"`` -> ``"L/s"``).

    Units outside our table fall back to pint's abbreviated pretty form.

    >>> label_for_unit("meter ** 3 / hour")
    'm³/h'
    """
    canonical = str(ureg.Unit(_normalise_unit_text(unit)))
    if canonical in _LABELS:
        return _LABELS[canonical]
    return format(ureg.Unit(canonical), "~P")


def unit_label(quantity: str, system: str) -> str:
    """The short label of the display unit of ``quantity`` in ``system``.

    >>> unit_label("kinematic_viscosity", "SI"), unit_label("temperature", "US")
    ('mm²/s', '°F')
    """
    return _LABELS[display_unit(quantity, system)]


@overload
def _apply(values: Scalar, scale: float, offset: float) -> float: ...
@overload
def _apply(values: NDArray[np.number], scale: float, offset: float) -> FloatArray: ...
def _apply(values: Scalar | NDArray[np.number], scale: float, offset: float) -> float | FloatArray:
    if isinstance(values, np.ndarray):
        array = values.astype(np.float64, copy=False)
    elif isinstance(values, (float, int, np.floating, np.integer)) and not isinstance(values, bool):
        return float(values) * scale + offset
    else:
        array = np.asarray(values, dtype=np.float64)
    return array * scale + offset if offset else array * scale


@overload
def to_display(value_si: Scalar, quantity: str, system: str) -> float: ...
@overload
def to_display(value_si: NDArray[np.number], quantity: str, system: str) -> FloatArray: ...
def to_display(value_si: Scalar | NDArray[np.number], quantity: str, system: str) -> float | FloatArray:
    """Convert a stored value (float or numpy array) to the display unit of ``system``.

    Uses precomputed factors; no pint call.

    >>> to_display(0.035, "flow", "SI")
    35.0
    >>> round(to_display(20.0, "temperature", "US"), 9)
    68.0
    """
    _check_quantity(quantity)
    _check_system(system)
    linear = _DISPLAY_FACTORS[system][quantity]
    return _apply(value_si, linear.inverse_scale, linear.inverse_offset)


@overload
def from_display(value: Scalar, quantity: str, system: str) -> float: ...
@overload
def from_display(value: NDArray[np.number], quantity: str, system: str) -> FloatArray: ...
def from_display(value: Scalar | NDArray[np.number], quantity: str, system: str) -> float | FloatArray:
    """Convert a value (float or numpy array) in the display unit of ``system`` to the stored unit.

    >>> round(from_display(12.0, "diameter", "US"), 12)
    0.3048
    """
    _check_quantity(quantity)
    _check_system(system)
    linear = _DISPLAY_FACTORS[system][quantity]
    return _apply(value, linear.scale, linear.offset)


@lru_cache(maxsize=512)
def _cached_linear(unit_text: str, quantity: str) -> _Linear:
    """Conversion of a normalised unit text; raises pint errors for bad units."""
    unit = ureg.parse_units(unit_text)
    if not Q_(1.0, unit).check(QUANTITIES[quantity][0] or "[]"):
        raise pint.DimensionalityError(unit, QUANTITIES[quantity][1])
    return _linear_to_stored(unit, quantity)


_UNIT_CHARACTERS: Final = frozenset(
    "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789 */^()._-%"
    "°²³¹⁰⁴⁵⁶⁷⁸⁹⁻µμℓ·×℃℉\u2212\u2013\u00a0\u202f\u2009"
)
"""Every character a unit may contain: ASCII letters and digits, the operators, and the symbols the
trade writes (degree, superscript powers, micro, litre, middle dot and times).  Anything else (a
control character, a letter of another script that only looks like a Latin one) is refused."""
_UNIT_TOKEN: Final = re.compile(r"\s*(?:(?P<name>[A-Za-z_%°][A-Za-z0-9_]*)|(?P<number>\d+(?:\.\d+)?)"
                                r"|(?P<power>\*\*|\^)|(?P<op>[*/()])|(?P<minus>-))")
_MAX_UNIT_TOKENS: Final = 16
_MAX_UNIT_PARENTHESES: Final = 2
_MAX_UNIT_FACTOR_DIGITS: Final = 6


def check_unit_text(unit_text: str, quantity: str = "") -> str:
    """``unit_text`` normalised for pint, or :class:`UnitTextError` when it is outside the allow-list.

    A unit is refused, in far less than a second, when it is longer than
    :data:`~hydraulics.validation.MAX_UNIT_CHARACTERS`, holds a character outside the trade's set, a
    name the registry does not know, a power tower (``m**2**3``) or a power beyond
    :data:`~hydraulics.validation.MAX_UNIT_EXPONENT`, a factor of more than six digits, or more
    than two levels of brackets.  Nothing is evaluated: pint parses only what passes.

    >>> check_unit_text("m³/h")
    'm**3/h'
    >>> check_unit_text("m*9**9**9")
    Traceback (most recent call last):
    ...
    hydraulics.units.UnitTextError: a power of a power ('**9**') is not a unit
    >>> check_unit_text("\u043c")  # Cyrillic em, which looks like m
    Traceback (most recent call last):
    ...
    hydraulics.units.UnitTextError: the character 'м' (U+043C) is not allowed in a unit
    """
    from hydraulics.validation import MAX_UNIT_CHARACTERS, MAX_UNIT_EXPONENT

    if len(unit_text) > MAX_UNIT_CHARACTERS:
        raise UnitTextError(f"a unit has at most {MAX_UNIT_CHARACTERS} characters; this one has {len(unit_text)}")
    for character in unit_text:
        if character not in _UNIT_CHARACTERS:
            raise UnitTextError(f"the character {character!r} (U+{ord(character):04X}) is not allowed in a unit")
    text = _normalise_unit_text(unit_text, quantity)
    tokens: list[tuple[str, str]] = []
    position = 0
    while position < len(text):
        match = _UNIT_TOKEN.match(text, position)
        if match is None or match.end() == position:
            if text[position:].strip() == "":
                break
            raise UnitTextError(f"{text[position:position + 1]!r} is not understood in a unit")
        kind = match.lastgroup or ""
        tokens.append((kind, match.group(kind)))
        position = match.end()
    if len(tokens) > _MAX_UNIT_TOKENS:
        raise UnitTextError(f"a unit has at most {_MAX_UNIT_TOKENS} parts; this one has {len(tokens)}")
    depth = 0
    for index, (kind, token) in enumerate(tokens):
        before = tokens[index - 1][0] if index else ""
        if kind == "name" and token not in ureg:
            raise UnitTextError(f"the unit {token!r} is not known")
        if kind == "number" and before not in ("power", "minus") and len(token) > _MAX_UNIT_FACTOR_DIGITS:
            raise UnitTextError(f"a factor in a unit has at most {_MAX_UNIT_FACTOR_DIGITS} digits")
        if kind == "minus" and before != "power":
            raise UnitTextError("a minus sign in a unit belongs to a power (m**-1)")
        if kind == "power":
            rest = tokens[index + 1:index + 4]
            sign = 1
            if rest and rest[0][0] == "minus":
                sign, rest = -1, rest[1:]
            if not rest or rest[0][0] != "number" or "." in rest[0][1]:
                raise UnitTextError("a power in a unit is a whole number (m**3, s**-1)")
            if len(rest) > 1 and rest[1][0] == "power":
                raise UnitTextError(f"a power of a power ('**{rest[0][1]}**') is not a unit")
            if len(rest[0][1]) > 2 or int(rest[0][1]) > MAX_UNIT_EXPONENT:
                power = sign * int(rest[0][1][:3])
                raise UnitTextError(f"a power in a unit is at most {MAX_UNIT_EXPONENT}; got {power}")
        if token == "(":
            depth += 1
            if depth > _MAX_UNIT_PARENTHESES:
                raise UnitTextError(f"a unit has at most {_MAX_UNIT_PARENTHESES} levels of brackets")
        elif token == ")":
            depth -= 1
            if depth < 0:
                raise UnitTextError("a closing bracket without its opening one")
    if depth:
        raise UnitTextError("an opening bracket without its closing one")
    return text


def _linear_for(unit_text: str, quantity: str) -> _Linear:
    """The conversion of a unit text after :func:`check_unit_text`; raises it or pint's errors."""
    return _cached_linear(check_unit_text(unit_text, quantity), quantity)


@overload
def convert_to_si(value: Scalar, quantity: str, unit: str) -> float: ...
@overload
def convert_to_si(value: NDArray[np.number], quantity: str, unit: str) -> FloatArray: ...
def convert_to_si(value: Scalar | NDArray[np.number], quantity: str, unit: str) -> float | FloatArray:
    """Convert a float or array in any ``unit`` of ``quantity`` to the stored unit.

    The first call per unit asks pint; later calls reuse the cached factor.

    >>> convert_to_si(120.0, "flow", "m³/h")
    0.03333333333333333
    """
    _check_quantity(quantity)
    linear = _linear_for(unit, quantity)
    return _apply(value, linear.scale, linear.offset)


@overload
def convert_from_si(value_si: Scalar, quantity: str, unit: str) -> float: ...
@overload
def convert_from_si(value_si: NDArray[np.number], quantity: str, unit: str) -> FloatArray: ...
def convert_from_si(value_si: Scalar | NDArray[np.number], quantity: str, unit: str) -> float | FloatArray:
    """Convert a stored float or array of ``quantity`` to any ``unit`` of it.

    >>> convert_from_si(0.1, "flow", "m3/h")
    360.0
    """
    _check_quantity(quantity)
    linear = _linear_for(unit, quantity)
    return _apply(value_si, linear.inverse_scale, linear.inverse_offset)


# --------------------------------------------------------------------------- parsing
_NUMBER_AND_UNIT = re.compile(
    r"""^\s*
    (?P<number>[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)
    \s*
    (?P<unit>.*?)
    \s*$""",
    re.VERBOSE,
)
_NOT_FINITE = re.compile(r"^\s*[+-]?(nan|inf|infinity)\b", re.IGNORECASE)
_SUPERSCRIPTS = re.compile(r"⁻?[⁰¹²³⁴⁵⁶⁷⁸⁹]+")
_SUPERSCRIPT_DIGITS = str.maketrans("⁻⁰¹²³⁴⁵⁶⁷⁸⁹", "-0123456789")
_TRAILING_EXPONENT = re.compile(r"(?<=[A-Za-z])(-?[1-9])(?![\w.])")  # m3 -> m**3, min-1 -> min**-1
_DEGREE_WORDS = re.compile(r"\b(?:deg\s*|°\s*)([CF])\b|℃|℉")
_CHARACTER_SUBSTITUTES = str.maketrans(
    {"\u2212": "-", "\u2013": "-", "\u00a0": " ", "\u202f": " ", "\u2009": " ", "·": "*", "×": "*", "µ": "u", "μ": "u"}
)


def _degree_replacement(match: re.Match[str]) -> str:
    text = match.group(0)
    if text == "℃":
        return "degC"
    if text == "℉":
        return "degF"
    return "deg" + match.group(1)


def _normalise_unit_text(unit_text: str, quantity: str = "") -> str:
    """Rewrite a typed unit into a form pint parses (``m³/h`` -> ``m**3/h``, ``°C`` -> ``degC``)."""
    text = unit_text.translate(_CHARACTER_SUBSTITUTES).strip()
    text = _SUPERSCRIPTS.sub(lambda m: "**" + m.group(0).translate(_SUPERSCRIPT_DIGITS), text)
    text = _DEGREE_WORDS.sub(_degree_replacement, text)
    text = _TRAILING_EXPONENT.sub(r"**\1", text)
    if quantity == "temperature" and text in ("C", "F"):
        text = "deg" + text  # a bare C or F typed for a temperature is Celsius or Fahrenheit
    if text == "":
        text = "dimensionless"
    return text


def _expected(quantity: str) -> str:
    return f"type a number with a unit such as {_WORDING[quantity].examples}"


def parse_quantity(text: str, quantity: str, default_unit: str | None = None, field: str = "") -> float:
    """Parse typed text such as ``"300 mm"`` into the float stored for ``quantity``.

    Parameters
    ----------
    text : str
        What the user typed: a number, optionally followed by a unit.
    quantity : str
        A key of :data:`QUANTITIES`; the result is in its stored unit (SI; °C for
        temperature, rpm for speed, a fraction for ``ratio_percent``).
    default_unit : str, optional
        Unit of a bare number.  Defaults to the stored unit of ``quantity``.
    field : str
        Plain name of the input for messages; defaults to the quantity's name.

    Raises
    ------
    UnitInputError
        Empty text, not a number, NaN or infinity, a comma (decimal or thousands
        separator: refused, never guessed), an unknown unit or a unit of the wrong
        dimension.

    Examples
    --------
    >>> parse_quantity("300 mm", "diameter")
    0.3
    >>> round(parse_quantity("12 in", "diameter"), 12)
    0.3048
    >>> parse_quantity("35 L/s", "flow")
    0.035
    >>> round(parse_quantity("550 gpm", "flow"), 14)
    0.03469960802
    >>> parse_quantity("2.5 bar", "pressure")
    250000.0
    >>> parse_quantity("120 m³/h", "flow") == parse_quantity("120 m3/h", "flow")
    True
    >>> parse_quantity("20 °C", "temperature")
    20.0
    >>> round(parse_quantity("68 degF", "temperature"), 9)
    20.0
    >>> round(parse_quantity("1.5", "length", default_unit="ft"), 12)
    0.4572
    >>> parse_quantity("12 kg", "length", field="Length")
    Traceback (most recent call last):
    ...
    hydraulics.units.UnitInputError: Length: '12 kg' is not a length; type a number with a unit such as 300 mm or 12 in
    >>> parse_quantity("1,5 m", "length", field="Length")
    Traceback (most recent call last):
    ...
    hydraulics.units.UnitInputError: Length: '1,5 m' has a comma; use a decimal point (1.5) and no thousands separator
    """
    from hydraulics.validation import MAX_TYPED_CHARACTERS

    _check_quantity(quantity)
    wording = _WORDING[quantity]
    label = field or wording.label
    if not isinstance(text, str):
        raise UnitInputError(label, quote_input(text), f"expected text, got {type(text).__name__}")
    if len(text) > MAX_TYPED_CHARACTERS:
        raise UnitInputError(label, quote_input(text), f"{quote_input(text)} is too long: a value with its unit has "
                                                       f"at most {MAX_TYPED_CHARACTERS} characters")
    shown = text.strip()
    quoted = quote_input(shown)
    if not shown:
        raise UnitInputError(label, text, f"nothing typed; {_expected(quantity)}")
    if "," in shown:
        raise UnitInputError(
            label, text, f"{quoted} has a comma; use a decimal point (1.5) and no thousands separator"
        )
    if _NOT_FINITE.match(shown):
        raise UnitInputError(label, text, f"{quoted} is not a finite number; {_expected(quantity)}")
    match = _NUMBER_AND_UNIT.match(shown.translate(_CHARACTER_SUBSTITUTES))
    if match is None:
        raise UnitInputError(label, text, f"{quoted} does not start with a number; {_expected(quantity)}")
    number = float(match.group("number"))
    if not math.isfinite(number):
        raise UnitInputError(label, text, f"{quoted} is too large a number; {_expected(quantity)}")
    unit_text = match.group("unit")
    if not unit_text:
        unit_text = default_unit if default_unit is not None else QUANTITIES[quantity][1]
    try:
        linear = _linear_for(unit_text, quantity)
    except UnitTextError as exc:
        raise UnitInputError(label, text, f"{quoted}: {exc.problem}; {_expected(quantity)}") from None
    except pint.DimensionalityError:
        raise UnitInputError(label, text, f"{quoted} is not {wording.noun}; {_expected(quantity)}") from None
    except pint.UndefinedUnitError:
        raise UnitInputError(
            label, text, f"{quoted}: the unit {quote_input(unit_text)} is not known; {_expected(quantity)}"
        ) from None
    except Exception:  # noqa: BLE001 - pint's parser raises many types for non-units
        # For text that is not a unit expression at all pint raises assorted types
        # (tokenize.TokenError, AssertionError, ValueError, ...); all mean the same here.
        raise UnitInputError(
            label, text, f"{quoted} is not understood; {_expected(quantity)}"
        ) from None
    value = number * linear.scale + linear.offset
    if not math.isfinite(value):
        raise UnitInputError(label, text, f"{quoted} is too large a number; {_expected(quantity)}")
    return value


# --------------------------------------------------------------------------- formatting
def format_quantity(value_si: float, quantity: str, system: str, digits: int = 3) -> str:
    """A stored value as display text in ``system``, e.g. ``"35.0 L/s"``.

    >>> format_quantity(0.035, "flow", "SI")
    '35.0 L/s'
    >>> format_quantity(0.035, "flow", "US")
    '555 gpm'
    >>> format_quantity(0.82, "ratio_percent", "SI")
    '82.0 %'
    """
    text = significant_figures(to_display(float(value_si), quantity, system), digits)
    label = unit_label(quantity, system)
    return f"{text} {label}" if label else text
