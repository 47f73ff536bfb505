"""Minor losses of pipe fittings: the fittings catalogue and K factors.

A fitting's loss is h_m = K v²/(2g), with K referred to the mean velocity of the segment
that holds the fitting.  The catalogue (``resources/fittings.json``) gives K either as a
constant or by the Crane Technical Paper 410 method K = n·f_T, where f_T is the fully
turbulent friction factor of clean commercial steel pipe of the fitting's size.  Reducers and
expanders (methods ``"reducer"``/``"expander"``) have a K that depends on the two bores and
the cone angle (:mod:`hydraulics.bore_change`); a ``"user_k"`` fitting's K is the row's own
K override.

Each catalogue entry names its source; the file's ``source_notes`` say how to read them.
"""

from __future__ import annotations

import json
import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from functools import cache
from pathlib import Path
from types import MappingProxyType
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike

from hydraulics.bore_change import SUDDEN_ANGLE_DEG, bore_change_k, transition_angle_deg
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.friction import fully_turbulent_friction_factor
from hydraulics.input_excerpt import quote_input
from hydraulics.model import Fitting, ModelError
from hydraulics.package_data import resources_dir

CATALOGUE_FORMAT = "pumpsketch-fittings"
"""Format name in the ``format`` field of the fittings catalogue."""

CATALOGUE_VERSION = 1
"""Catalogue file version this module reads."""

CATEGORIES: tuple[str, ...] = ("entrance/exit", "bend", "valve", "tee", "other")
"""Allowed fitting categories, in display order."""

CRANE_STEEL_ROUGHNESS_M = 0.00015 * 0.3048
"""Roughness of clean commercial steel behind Crane's f_T: 0.00015 ft = 0.04572 mm (Crane TP-410)."""

K_OVERRIDE_MAX = 1000.0
"""Largest K a user may give as an override (same range as hydraulics.validation)."""

FittingMethod = Literal["constant", "crane", "reducer", "expander", "user_k"]

BORE_CHANGE_METHODS: tuple[FittingMethod, ...] = ("reducer", "expander")
"""Methods whose K depends on the bores either side and the cone angle (hydraulics.bore_change)."""

DEFAULT_CATALOGUE_PATH = resources_dir() / "fittings.json"
"""The fittings catalogue shipped with PumpSketch (in the bundled ``resources/``)."""


@dataclass(frozen=True)
class FittingType:
    """One entry of the fittings catalogue.

    ``method`` ``"constant"`` uses ``k``; ``"crane"`` uses K = ``n``·f_T
    (:func:`crane_friction_factor`); ``"reducer"``/``"expander"`` take K from the bores
    and the cone angle (:func:`hydraulics.bore_change.bore_change_k`), ``angle_deg`` being
    180 for a sudden entry and ``None`` where the row gives the angle; ``"user_k"`` takes
    the row's K override.  ``source`` names the published value; ``checked`` says how the
    test suite checks it (or that it is from memory).
    """

    fitting_id: str
    name: str
    method: FittingMethod
    k: float | None
    n: float | None
    category: str
    source: str
    checked: str = ""
    angle_deg: float | None = None
    full_lift_velocity_factor_us: float | None = None
    full_lift_velocity_source: str = ""

    @property
    def is_check_valve(self) -> bool:
        """Whether the entry has a minimum velocity for full disc lift (a check or foot valve)."""
        return self.full_lift_velocity_factor_us is not None


# --------------------------------------------------------------------------- catalogue
def _entry_error(path: Path, index: int, field: str, problem: str, value: object = None) -> ModelError:
    return ModelError(f"{path.name}: fittings[{index}].{field}", problem, value)


def _number(entry: Mapping[str, object], key: str, path: Path, index: int) -> float:
    value = entry.get(key)
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or value < 0:
        raise _entry_error(path, index, key, f"must be a number, 0 or more; got {value!r}", value)
    return float(value)


def _parse_entry(entry: object, path: Path, index: int) -> FittingType:
    if not isinstance(entry, dict):
        raise _entry_error(path, index, "", "each fitting must be a JSON object", entry)
    for key in ("id", "name", "category", "method", "source"):
        if not isinstance(entry.get(key), str) or not entry[key].strip():
            raise _entry_error(path, index, key, "must be a non-empty text", entry.get(key))
    if entry["category"] not in CATEGORIES:
        raise _entry_error(path, index, "category", f"must be one of {', '.join(CATEGORIES)}", entry["category"])
    method = entry["method"]
    angle: float | None = None
    if method == "constant":
        k, n = _number(entry, "k", path, index), None
    elif method == "crane":
        k, n = None, _number(entry, "n", path, index)
    elif method in BORE_CHANGE_METHODS:
        k = n = None
        if entry.get("angle_deg") is not None:
            angle = _number(entry, "angle_deg", path, index)
            if not 0.0 < angle <= SUDDEN_ANGLE_DEG:
                raise _entry_error(
                    path, index, "angle_deg", f"must be more than 0 and at most 180; got {angle:g}", angle
                )
    elif method == "user_k":
        k = n = None
    else:
        raise _entry_error(
            path, index, "method", "must be 'constant', 'crane', 'reducer', 'expander' or 'user_k'", method
        )
    lift_factor: float | None = None
    lift_source = ""
    if entry.get("full_lift_velocity_factor_us") is not None:
        lift_factor = _number(entry, "full_lift_velocity_factor_us", path, index)
        if lift_factor <= 0.0:
            raise _entry_error(path, index, "full_lift_velocity_factor_us", "must be more than 0", lift_factor)
        given = entry.get("full_lift_velocity_source")
        if not isinstance(given, str) or not given.strip():
            raise _entry_error(path, index, "full_lift_velocity_source",
                               "must name the published source of the full-lift velocity factor", given)
        lift_source = given
    return FittingType(
        fitting_id=entry["id"], name=entry["name"], method=method, k=k, n=n,
        category=entry["category"], source=entry["source"], checked=str(entry.get("checked", "")), angle_deg=angle,
        full_lift_velocity_factor_us=lift_factor, full_lift_velocity_source=lift_source,
    )


def load_fitting_catalogue(path: Path | str) -> Mapping[str, FittingType]:
    """Read a fittings catalogue file into a read-only mapping ``fitting_id → FittingType``.

    Raises
    ------
    FileNotFoundError
        When the file does not exist (the message gives the expected place).
    ModelError
        When the file is not a version-1 ``pumpsketch-fittings`` document or an entry is
        malformed (the field path names the file, the entry and the field).
    """
    path = Path(path)
    if not path.is_file():
        raise FileNotFoundError(
            f"fittings catalogue not found at {path}; it ships in the resources/ folder "
            "next to the hydraulics package"
        )
    try:
        document = json.loads(path.read_text(encoding="utf-8"))
    except (json.JSONDecodeError, UnicodeDecodeError) as exc:
        raise ModelError(path.name, f"is not valid JSON ({exc})") from None
    if not isinstance(document, dict) or document.get("format") != CATALOGUE_FORMAT:
        raise ModelError(f"{path.name}: format", f"must be {CATALOGUE_FORMAT!r}")
    if document.get("version") != CATALOGUE_VERSION:
        raise ModelError(
            f"{path.name}: version",
            f"version {document.get('version')!r} is not supported (this program reads version {CATALOGUE_VERSION})",
            document.get("version"),
        )
    entries = document.get("fittings")
    if not isinstance(entries, list) or not entries:
        raise ModelError(f"{path.name}: fittings", "must be a non-empty list")
    catalogue: dict[str, FittingType] = {}
    for index, entry in enumerate(entries):
        fitting_type = _parse_entry(entry, path, index)
        if fitting_type.fitting_id in catalogue:
            raise _entry_error(path, index, "id", f"duplicate id {fitting_type.fitting_id!r}", fitting_type.fitting_id)
        catalogue[fitting_type.fitting_id] = fitting_type
    return MappingProxyType(catalogue)


@cache
def fitting_catalogue() -> Mapping[str, FittingType]:
    """The shipped fittings catalogue (read once, then cached), ``fitting_id → FittingType``.

    >>> fitting_catalogue()["exit"].k
    1.0
    """
    return load_fitting_catalogue(DEFAULT_CATALOGUE_PATH)


# --------------------------------------------------------------------------- check valves
FOOT_M = 0.3048
"""The international foot in metres (exact; NIST SP 811, appendix B)."""

POUND_KG = 0.45359237
"""The avoirdupois pound in kilograms (exact; NIST SP 811, appendix B)."""

FULL_LIFT_SI_PER_US = math.sqrt(POUND_KG / FOOT_M)
r"""Factor turning Crane's US-customary full-lift constant into the SI one (≈ 1.219903).

Crane TP-410 gives v_min [ft/s] = C √V̄ with V̄ in ft³/lb.  Since 1 ft³/lb = 0.3048³ m³ / 0.45359237 kg,
V̄_US = V̄_SI · 0.45359237 / 0.3048³ (V̄_SI in m³/kg), and with 1 ft/s = 0.3048 m/s

.. math:: v_{min} = 0.3048\,C\sqrt{\bar V_{SI}\,\frac{0.45359237}{0.3048^3}}
          = C\sqrt{\frac{0.45359237}{0.3048}}\,\sqrt{\bar V_{SI}}
          = 1.219903\,C\,\sqrt{\bar V_{SI}}\ \text{m/s}

with V̄_SI = 1/ρ in m³/kg.  A conventional swing check (C = 35) in water at 1000 kg/m³ needs
42.70 × 0.031623 = 1.350 m/s.  Crane's metric edition prints the SI constants rounded
(45 for C = 35); PumpSketch converts the US constant exactly.
"""


def full_lift_velocity_m_s(fitting_type: FittingType, density_kg_m3: float) -> float | None:
    """Minimum pipe velocity for full disc lift of a check valve (m/s), ``None`` for other fittings.

    Crane TP-410, Appendix A: v_min = C √V̄, V̄ = 1/ρ the specific volume, with the entry's
    US-customary C converted by :data:`FULL_LIFT_SI_PER_US`.  Lift check entries are full bore
    (Crane's β² = 1).

    >>> round(full_lift_velocity_m_s(fitting_catalogue()["swing_check_valve"], 1000.0), 3)
    1.35
    """
    factor = fitting_type.full_lift_velocity_factor_us
    if factor is None:
        return None
    return factor * FULL_LIFT_SI_PER_US * math.sqrt(1.0 / density_kg_m3)


# --------------------------------------------------------------------------- K values
def crane_friction_factor(internal_diameter_m: ArrayLike) -> float | np.ndarray:
    r"""Crane's fully turbulent friction factor f_T for a fitting of internal diameter D.

    .. math:: f_T = \frac{0.25}{\left[\log_{10}\left(\dfrac{\varepsilon}{3.7\,D}\right)\right]^2}

    the von Kármán rough-pipe law (:func:`hydraulics.friction.fully_turbulent_friction_factor`)
    for clean commercial steel, ε = 0.00015 ft = 0.0457 mm, as stated in Crane Technical
    Paper 410 (2009).  Crane tabulates f_T to three decimals by nominal size from ½ in
    to 24 in (about 0.026 down to 0.011).  Evaluated at the schedule 40 bores, this
    formula is within 1.5 % of that table and rounds to the same three decimals at all
    tabulated sizes but one that sits on a rounding boundary (checked in the tests against
    an independent digitisation of the table); it extends smoothly beyond the table.
    Crane evaluates f_T at the nominal size; PumpSketch uses the segment's internal
    diameter.

    Parameters
    ----------
    internal_diameter_m : float or array_like
        Internal diameter D [m], greater than ε/3.7 (any real pipe).

    Returns
    -------
    float or numpy.ndarray
        f_T [-]; a float for a scalar diameter.

    Examples
    --------
    >>> round(crane_friction_factor(0.1023), 4)   # 4 in schedule 40
    0.0163
    """
    d = np.asarray(internal_diameter_m, dtype=float)
    if not np.all(np.isfinite(d)) or np.any(d <= CRANE_STEEL_ROUGHNESS_M / 3.7):
        raise ModelError("internal_diameter_m", "must be a finite diameter greater than 0.012 mm", internal_diameter_m)
    f_t = fully_turbulent_friction_factor(CRANE_STEEL_ROUGHNESS_M / d)
    return float(f_t) if f_t.ndim == 0 else f_t


def fitting_k(fitting_type: FittingType, internal_diameter_m: float, field_path: str = "fitting") -> float:
    """K of one fitting of ``fitting_type`` in a pipe of internal diameter D [m].

    ``"constant"`` entries return their K; ``"crane"`` entries K = n·f_T(D)
    (Crane TP-410), with f_T from :func:`crane_friction_factor` at the segment's
    internal diameter.  Reducers, expanders and user-K fittings have no K of their own
    here: a :class:`ModelError` at ``{field_path}.fitting_id`` (the K depends on the bores
    and the cone angle, :mod:`hydraulics.bore_change`) or ``{field_path}.k_override``
    (a user K fitting needs its K override) says so.

    >>> round(fitting_k(fitting_catalogue()["gate_valve_open"], 0.1023), 4)
    0.1303
    """
    if fitting_type.method in BORE_CHANGE_METHODS:
        raise ModelError(
            f"{field_path}.fitting_id",
            f"the K of a {fitting_type.method} depends on the bores either side and the cone angle, "
            "not on this segment's bore alone; give its K as a K override",
            fitting_type.fitting_id,
        )
    if fitting_type.method == "user_k":
        raise ModelError(f"{field_path}.k_override", "a user K fitting needs its K: give the K override (0 to 1000)")
    if fitting_type.method == "constant":
        assert fitting_type.k is not None
        return fitting_type.k
    assert fitting_type.n is not None
    return fitting_type.n * float(crane_friction_factor(float(internal_diameter_m)))


def segment_k_total(
    fittings: Iterable[Fitting],
    internal_diameter_m: float,
    field_path: str = "fittings",
    catalogue: Mapping[str, FittingType] | None = None,
    upstream_diameter_m: float | None = None,
) -> float:
    """Sum of K over the fitting rows of one segment: Σ count × K.

    K is the row's ``k_override`` when given, otherwise the catalogue K of its
    ``fitting_id`` (:func:`fitting_k` at the segment's internal diameter).  A reducer or
    expander sits at the segment's inlet: its K comes from the bores either side and its
    cone angle (:func:`hydraulics.bore_change.bore_change_k`, Crane TP-410), the upstream
    bore being the row's ``other_diameter_m`` or else ``upstream_diameter_m`` (the bore of
    the previous segment in flow order).  The total refers to the segment's own velocity.

    Raises
    ------
    ModelError
        ``fittings[j].fitting_id`` for an id not in the catalogue,
        ``fittings[j].count`` for a count that is not a whole number 0 or more,
        ``fittings[j].k_override`` for an override outside 0–1000, or missing on a user K
        fitting; ``fittings[j].fitting_id`` for a reducer or expander without an override
        (its K depends on the bores either side, :mod:`hydraulics.bore_change`).
        ``field_path`` prefixes the path (default ``"fittings"``).

    >>> from hydraulics.model import Fitting
    >>> segment_k_total([Fitting("entrance_sharp"), Fitting("exit"), Fitting("elbow_90_standard", 0)], 0.2)
    1.5
    """
    catalogue = fitting_catalogue() if catalogue is None else catalogue
    total = 0.0
    for j, fitting in enumerate(fittings):
        path = f"{field_path}[{j}]"
        count = fitting.count
        if isinstance(count, bool) or not isinstance(count, (int, np.integer)) or count < 0:
            raise ModelError(f"{path}.count", f"fitting count must be a whole number, 0 or more; got {count!r}", count)
        fitting_type = catalogue.get(fitting.fitting_id)
        if fitting_type is None:
            raise ModelError(
                f"{path}.fitting_id",
                f"unknown fitting type {quote_input(fitting.fitting_id)} (not in the fittings catalogue)",
                fitting.fitting_id,
            )
        override = fitting.k_override
        if override is None and fitting_type.method in BORE_CHANGE_METHODS:
            other = fitting.other_diameter_m if fitting.other_diameter_m is not None else upstream_diameter_m
            if other is None:
                raise ModelError(f"{path}.other_diameter",
                                 f"a {fitting_type.method} on the first segment of its path needs the bore "
                                 "upstream of it (give the other diameter)")
            angle = transition_angle_deg(fitting_type.angle_deg, fitting.angle_deg, fitting_type.method, path)
            k = bore_change_k(fitting_type.method, float(internal_diameter_m), other, angle, path)
        elif override is None:
            k = fitting_k(fitting_type, internal_diameter_m, path)
        else:
            if (
                isinstance(override, bool)
                or not isinstance(override, (int, float))
                or not math.isfinite(override)
                or not 0.0 <= override <= K_OVERRIDE_MAX
            ):
                raise ModelError(
                    f"{path}.k_override", f"K override must be between 0 and {K_OVERRIDE_MAX:g}; got {override!r}",
                    override,
                )
            k = float(override)
        total += int(count) * k
    return total


def minor_loss(k_total: ArrayLike, velocity_m_s: ArrayLike) -> np.ndarray:
    r"""Minor (fittings) head loss h_m = K v|v| / (2g) [m].

    K is referred to the velocity of its own segment: pass the segment's K total and the
    mean velocity in that segment's pipe.  The loss takes the sign of the velocity, like
    the friction loss of :func:`hydraulics.friction.darcy_weisbach` (for forward flow it
    is the usual K v²/(2g)).  g = :data:`hydraulics.constants.STANDARD_GRAVITY_M_S2`.

    Parameters
    ----------
    k_total : array_like
        Sum of the loss coefficients K [-].
    velocity_m_s : array_like
        Mean velocity v in the segment [m/s].

    Examples
    --------
    >>> round(float(minor_loss(1.5, 2.0)), 4)
    0.3059
    """
    k = np.asarray(k_total, dtype=float)
    v = np.asarray(velocity_m_s, dtype=float)
    return np.asarray(k * v * np.abs(v) / (2.0 * STANDARD_GRAVITY_M_S2))
