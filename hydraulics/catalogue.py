"""Pipe materials and pipe-series catalogues, read from the bundled ``resources/``.

Two kinds of data file, both JSON with a format name and a version number:

* ``resources/materials.json`` (format ``pumpsketch-materials``): per material the
  Colebrook–White absolute roughness k_s and the Hazen–Williams coefficient C for new
  and aged pipe, and Young's modulus of the pipe wall (for surge screening);
* ``resources/pipe_series/<id>.json`` (format ``pumpsketch-pipe-series``): the sizes
  of one product standard's series, nominal size → outside diameter, wall, bore.

Files give millimetres, gigapascals and bar as the trades and standards print them;
this module converts to SI (metres, pascals) on reading, so the engine sees the usual
plain floats.  Every file and entry is checked on reading; a malformed one raises
:class:`CatalogueError` naming the file and the entry.  The bundled catalogues are
read once and cached.

Each file names the published source of its values; ``resources/README.md`` lists
them and explains how to add a material or a series.  The two thickness rules below
(:func:`thermoplastic_min_wall_mm`, :func:`ductile_iron_wall_mm`) generated the
bundled plastic and ductile-iron series; the tests check them against published
table values.

>>> round(series("pe100_sdr11").size("110").internal_diameter_m, 4)
0.09
>>> material("pe100").hw_c_new
150.0
"""

from __future__ import annotations

import functools
import json
import math
import re
from collections.abc import Mapping
from dataclasses import dataclass
from fractions import Fraction
from pathlib import Path
from types import EllipsisType, MappingProxyType
from typing import Any, TypeVar, overload

from hydraulics.input_excerpt import quote_input
from hydraulics.model import ModelError, PipeState
from hydraulics.package_data import resources_dir

_T = TypeVar("_T")

RESOURCES_DIR = resources_dir()
"""Folder of the bundled catalogues (``resources/`` of the repository, installed as package data)."""

MATERIALS_FILE = RESOURCES_DIR / "materials.json"
PIPE_SERIES_DIR = RESOURCES_DIR / "pipe_series"

MATERIALS_FORMAT = "pumpsketch-materials"
PIPE_SERIES_FORMAT = "pumpsketch-pipe-series"
SUPPORTED_VERSION = 1
"""Newest file version this module reads (both formats)."""

_ID_PATTERN = re.compile(r"^[a-z0-9][a-z0-9_]*$")
_MM_PER_M = 1000.0
_GPA = 1.0e9
_TIE_M = 1.0e-9
_BORE_TOLERANCE_MM = 0.05
"""Allowed difference between a listed bore and OD − 2·(wall + lining), for rounding."""


# --------------------------------------------------------------------------- errors
class CatalogueError(ModelError):
    """A catalogue file that is missing or malformed.

    ``field_path`` reads ``<file name>: <entry>`` (for example
    ``pe100_sdr11.json: sizes[3].wall_thickness_mm``) so the message points at the
    line to fix.
    """

    def __init__(self, file: Path | str, entry: str, problem: str, value: object = None):
        self.file = Path(file)
        self.entry = entry
        where = f"{self.file.name}: {entry}" if entry else self.file.name
        super().__init__(where, problem, value)


class CatalogueLookupError(ModelError, KeyError):
    """An id or nominal size that the catalogue does not hold.

    A :class:`~hydraulics.model.ModelError` (field path, problem, value) that is also
    a :class:`KeyError`, so mapping-style callers can catch either.
    """

    def __str__(self) -> str:  # KeyError would quote the whole message
        return f"{self.field_path}: {self.problem}"


# --------------------------------------------------------------------------- records
@dataclass(frozen=True)
class Material:
    """Hydraulic and elastic properties of one pipe material (SI units).

    ``roughness_*_m`` is the Colebrook–White equivalent sand roughness k_s (m);
    ``hw_c_*`` the Hazen–Williams coefficient C (dimensionless, SI form of the
    formula); ``youngs_modulus_pa`` the modulus of elasticity E of the pipe wall (Pa),
    used by the pressure-wave-speed estimate of surge screening.  ``source`` names
    where each value comes from.
    """

    material_id: str
    name: str
    roughness_new_m: float
    roughness_aged_m: float
    hw_c_new: float
    hw_c_aged: float
    youngs_modulus_pa: float
    source: str

    def roughness_m(self, state: PipeState) -> float:
        """k_s (m) for ``state`` ``"new"`` or ``"aged"``.

        >>> round(material("steel_new").roughness_m("new"), 9), material("steel_new").roughness_m("aged") > 0.0001
        (4.5e-05, True)
        """
        return self.roughness_new_m if _pipe_state(state) == "new" else self.roughness_aged_m

    def hw_c(self, state: PipeState) -> float:
        """Hazen–Williams C for ``state`` ``"new"`` or ``"aged"``."""
        return self.hw_c_new if _pipe_state(state) == "new" else self.hw_c_aged


@dataclass(frozen=True)
class PipeSize:
    """One size of a pipe series (SI units).

    ``wall_thickness_m`` is the structural wall (for iron, without the lining; for
    plastics, the minimum wall of the standard); ``lining_thickness_m`` a cement-mortar
    or other lining inside it (0 when none).  ``internal_diameter_m`` is the bore the
    water sees.  ``pressure_rating_bar`` is the nominal pressure (PN) or allowable
    operating pressure (PFA) the standard gives the size, or ``None``.
    """

    nominal: str
    outside_diameter_m: float
    wall_thickness_m: float
    internal_diameter_m: float
    pressure_rating_bar: float | None = None
    lining_thickness_m: float = 0.0


@dataclass(frozen=True)
class PipeSeries:
    """The sizes of one product standard's series, smallest bore first."""

    series_id: str
    name: str
    material_id: str
    standard: str
    source: str
    notes: str
    sizes: tuple[PipeSize, ...]

    def nominals(self) -> tuple[str, ...]:
        """Nominal sizes in ascending order.

        >>> series("ductile_iron_en545_c40").nominals()[:3]
        ('DN 80', 'DN 100', 'DN 125')
        """
        return tuple(s.nominal for s in self.sizes)

    def size(self, nominal: str) -> PipeSize:
        """The size called ``nominal``.

        The match forgives spacing, case, a ``DN``/``NPS``/``dn``/``d`` prefix, a
        ``mm``/``in``/``"`` suffix and fractions, so ``"dn110"``, ``"110 mm"`` and
        ``"110"`` all find PE ``110``, and ``'1 1/4"'`` finds ``NPS 1-1/4``; a metric
        word never matches an inch size or the other way round.  An unknown size
        raises :class:`CatalogueLookupError` listing the nearby sizes.

        >>> series("steel_asme_b36_10_sch40").size('4"').outside_diameter_m
        0.1143
        """
        return self.sizes[self.index(nominal)]

    def index(self, nominal: str) -> int:
        """Position of ``nominal`` in :attr:`sizes` (same matching as :meth:`size`)."""
        if not isinstance(nominal, str):
            raise CatalogueLookupError(
                "nominal_size", f"expected a nominal size as text, got {type(nominal).__name__}",
                nominal)
        exact = self._index_by_squashed_nominal.get(_squash(nominal))
        if exact is not None:
            return exact
        query = _parse_nominal(nominal)
        if query is not None:
            hits = [i for i, s in enumerate(self.sizes) if _same_nominal(query, _parse_nominal(s.nominal))]
            if len(hits) == 1:
                return hits[0]
        raise CatalogueLookupError(
            "nominal_size",
            f"{quote_input(nominal)} is not a size of pipe series {quote_input(self.series_id)} ({self.name}); "
            f"{self._nearby_text(query)}",
            nominal,
        )

    @functools.cached_property
    def _index_by_squashed_nominal(self) -> dict[str, int]:
        """Position of each size by its nominal without spaces, lower case (first wins)."""
        found: dict[str, int] = {}
        for i, s in enumerate(self.sizes):
            found.setdefault(_squash(s.nominal), i)
        return found

    def step(self, nominal: str, steps: int) -> PipeSize:
        """The size ``steps`` places from ``nominal`` (negative: smaller), clamped at the ends.

        >>> pe = series("pe100_sdr11")
        >>> pe.step("110", 1).nominal, pe.step("110", -100).nominal, pe.step("800", 3).nominal
        ('125', '63', '800')
        """
        if isinstance(steps, bool) or not isinstance(steps, int):
            raise ModelError("steps", f"expected a whole number of steps, got {steps!r}", steps)
        i = self.index(nominal) + steps
        return self.sizes[min(max(i, 0), len(self.sizes) - 1)]

    def nearest(self, internal_diameter_m: float) -> PipeSize:
        """The size whose bore is closest to ``internal_diameter_m`` (m).

        A tie (bores within a nanometre of equally close) goes to the larger bore,
        which has the lower velocity and head loss.

        >>> series("steel_asme_b36_10_sch40").nearest(0.150).nominal
        'NPS 6'
        """
        d = internal_diameter_m
        if isinstance(d, bool) or not isinstance(d, (int, float)) or not math.isfinite(d) or d <= 0.0:
            raise ModelError(
                "internal_diameter_m", "must be a positive, finite length in metres", internal_diameter_m)
        gap = min(abs(s.internal_diameter_m - d) for s in self.sizes)
        return max((s for s in self.sizes if abs(s.internal_diameter_m - d) <= gap + _TIE_M),
                   key=lambda s: s.internal_diameter_m)

    def _nearby_text(self, query: tuple[float, str] | None) -> str:
        names = self.nominals()
        if query is not None:
            keyed = [(i, _parse_nominal(n)) for i, n in enumerate(names)]
            below = [i for i, k in keyed if k is not None and k[0] < query[0]]
            centre = below[-1] + 1 if below else 0
            near = names[max(centre - 2, 0): centre + 2]
            return f"nearby sizes: {', '.join(near)} (series runs {names[0]} to {names[-1]})"
        return f"valid sizes: {', '.join(names)}"


# --------------------------------------------------------------------------- public look-ups
@functools.cache
def materials() -> Mapping[str, Material]:
    """All bundled materials by id (read once, then cached; read-only mapping)."""
    return load_materials(MATERIALS_FILE)


def material(material_id: str) -> Material:
    """The bundled material ``material_id``; unknown ids raise :class:`CatalogueLookupError`.

    >>> material("ductile_iron_cml").youngs_modulus_pa
    170000000000.0
    """
    table = materials()
    try:
        return table[material_id]
    except (KeyError, TypeError):
        raise CatalogueLookupError(
            "material_id",
            f"unknown material {quote_input(material_id)}; valid ids: {', '.join(sorted(table))}",
            material_id,
        ) from None


@functools.cache
def pipe_series() -> Mapping[str, PipeSeries]:
    """All bundled pipe series by id (read once, then cached; read-only mapping).

    Every series' ``material_id`` is checked against :func:`materials`.
    """
    return load_pipe_series(PIPE_SERIES_DIR, known_material_ids=frozenset(materials()))


def series(series_id: str) -> PipeSeries:
    """The bundled pipe series ``series_id``; unknown ids raise :class:`CatalogueLookupError`.

    >>> series("pe100_sdr17").standard
    'ISO 4427-2:2019'
    """
    table = pipe_series()
    try:
        return table[series_id]
    except (KeyError, TypeError):
        raise CatalogueLookupError(
            "pipe_series",
            f"unknown pipe series {quote_input(series_id)}; valid ids: {', '.join(sorted(table))}",
            series_id,
        ) from None


# --------------------------------------------------------------------------- thickness rules
ISO_4065_SDR_TO_S: Mapping[float, float] = MappingProxyType({
    6.0: 2.5, 7.4: 3.2, 9.0: 4.0, 11.0: 5.0, 13.6: 6.3, 17.0: 8.0,
    21.0: 10.0, 26.0: 12.5, 33.0: 16.0, 41.0: 20.0,
})
"""Standard dimension ratios of ISO 4065 and their nominal pipe series S = (SDR − 1)/2."""


def thermoplastic_min_wall_mm(outside_diameter_mm: float, sdr: float) -> float:
    """Minimum wall thickness e_min (mm) of a thermoplastic pressure pipe (ISO 4065 series).

    ISO 4065 (universal wall thickness table, used by ISO 4427-2 for PE and ISO 1452-2
    for PVC-U) relates wall and outside diameter through the pipe series S,
    e = d_n / (2 S + 1) = d_n / SDR.  The tabulated thicknesses are reproduced exactly
    when S is the exact R10 preferred number that the nominal S rounds (ISO 3:
    S = 10^(k/10), e.g. S 5 → 5.0119, S 8 → 7.9433, S 12.5 → 12.589), the quotient
    is rounded to 0.01 mm and the result rounded *up* to the next 0.1 mm.  This
    reading was reconstructed here from the published tables: it matches every
    ISO 4427-2 (PE, SDR 11 and 17, d_n 63–560) and ISO 1452-2 (PVC-U, PN 10) value
    that the tests check, whereas plain "d_n/SDR rounded up" misses many of them by
    0.1–0.2 mm (e.g. 75 SDR 11: 6.8 tabulated, 6.9 by the plain rule).

    Parameters: ``outside_diameter_mm`` nominal outside diameter d_n (mm, > 0);
    ``sdr`` one of the ISO 4065 ratios in :data:`ISO_4065_SDR_TO_S`.
    Valid for the pipe sizes the tables cover (the small-size minimum walls of
    2.0/2.3/3.0 mm that some product standards add below d_n 40 are not applied).

    >>> thermoplastic_min_wall_mm(110, 11), thermoplastic_min_wall_mm(160, 11)
    (10.0, 14.6)
    >>> thermoplastic_min_wall_mm(250, 17), thermoplastic_min_wall_mm(75, 11)
    (14.8, 6.8)
    """
    nominal_s = ISO_4065_SDR_TO_S.get(float(sdr))
    if nominal_s is None:
        raise ModelError(
            "sdr", f"not an ISO 4065 standard dimension ratio; allowed: "
            f"{', '.join(f'{v:g}' for v in ISO_4065_SDR_TO_S)}", sdr)
    if not (math.isfinite(outside_diameter_mm) and outside_diameter_mm > 0.0):
        raise ModelError("outside_diameter_mm", "must be a positive, finite diameter in mm",
                         outside_diameter_mm)
    exact_s: float = 10.0 ** (round(10.0 * math.log10(nominal_s)) / 10.0)
    e = round(outside_diameter_mm / (2.0 * exact_s + 1.0), 2)
    return math.ceil(round(e * 10.0, 6)) / 10.0


DUCTILE_IRON_TENSILE_STRENGTH_MPA = 420.0
"""Minimum tensile strength R_m of ductile-iron pipes, EN 545:2010 (from memory; verify)."""

DUCTILE_IRON_SAFETY_FACTOR = 3.0
"""Safety factor on the allowable operating pressure PFA of EN 545:2010 (from memory; verify)."""


def ductile_iron_wall_mm(dn: int, outside_diameter_mm: float, pressure_class_bar: float) -> float:
    """Nominal iron wall thickness (mm) of an EN 545:2010 pressure-class pipe (class C).

    Thin-wall (Barlow) design with EN 545:2010's rule, as remembered:
    e_min = PFA·SF·DE / (20·R_m + PFA·SF), at least 3.0 mm, then
    e_nom = e_min + (1.3 + 0.001·DN), rounded up to the next 0.1 mm.
    PFA = class (bar), SF = :data:`DUCTILE_IRON_SAFETY_FACTOR`, R_m =
    :data:`DUCTILE_IRON_TENSILE_STRENGTH_MPA` (MPa), DE external diameter (mm).
    It reproduces the C40 walls DN 80–300 of the standard's table (from memory:
    4.4, 4.4, 4.5, 4.5, 4.7, 5.5, 6.2 mm); check larger sizes against the standard.

    >>> ductile_iron_wall_mm(100, 118.0, 40), ductile_iron_wall_mm(300, 326.0, 40)
    (4.4, 6.2)
    """
    for name, v in (("dn", dn), ("outside_diameter_mm", outside_diameter_mm),
                    ("pressure_class_bar", pressure_class_bar)):
        if not (math.isfinite(v) and v > 0):
            raise ModelError(name, "must be positive and finite", v)
    load = pressure_class_bar * DUCTILE_IRON_SAFETY_FACTOR
    e_min = max(load * outside_diameter_mm / (20.0 * DUCTILE_IRON_TENSILE_STRENGTH_MPA + load), 3.0)
    e_nom = e_min + 1.3 + 0.001 * dn
    return math.ceil(round(e_nom * 10.0, 6)) / 10.0


def ductile_iron_k_class_wall_mm(dn: int, k: float = 9.0) -> float:
    """Nominal iron wall (mm) of a ductile-iron pipe of thickness class K (ISO 2531:1998, EN 545:2006).

    e = K (0.5 + 0.001·DN), at least 6.0 mm, rounded to 0.1 mm (from memory; verify).

    >>> ductile_iron_k_class_wall_mm(100), ductile_iron_k_class_wall_mm(200), ductile_iron_k_class_wall_mm(600)
    (6.0, 6.3, 9.9)
    """
    if not (math.isfinite(dn) and dn > 0 and math.isfinite(k) and k > 0):
        raise ModelError("dn", "DN and K must be positive and finite", (dn, k))
    e = max(k * (0.5 + 0.001 * dn), 6.0)
    return math.floor(round(e * 10.0, 6) + 0.5) / 10.0


# --------------------------------------------------------------------------- readers
def load_materials(path: Path | str) -> Mapping[str, Material]:
    """Read and check a materials file; values converted to SI.  Not cached."""
    path = Path(path)
    data = _read_json(path, MATERIALS_FORMAT)
    entries = _field(data, "materials", list, path, "")
    if not entries:
        raise CatalogueError(path, "materials", "the list is empty")
    table: dict[str, Material] = {}
    for i, entry in enumerate(entries):
        where = f"materials[{i}]"
        if not isinstance(entry, dict):
            raise CatalogueError(path, where, f"expected an object, got {_kind(entry)}")
        mid = _identifier(entry, path, where)
        where = f"materials[{i}] ({mid})"
        _no_unknown_keys(entry, _MATERIAL_KEYS, path, where)
        if mid in table:
            raise CatalogueError(path, where, f"duplicate id {mid!r}")
        ks_new = _number(entry, "roughness_new_mm", path, where, 0.0, 100.0)
        ks_aged = _number(entry, "roughness_aged_mm", path, where, 0.0, 100.0)
        if ks_aged < ks_new:
            raise CatalogueError(path, f"{where}.roughness_aged_mm",
                                 f"aged roughness ({ks_aged:g} mm) is below new ({ks_new:g} mm)", ks_aged)
        c_new = _number(entry, "hw_c_new", path, where, 1.0, 200.0)
        c_aged = _number(entry, "hw_c_aged", path, where, 1.0, 200.0)
        if c_aged > c_new:
            raise CatalogueError(path, f"{where}.hw_c_aged",
                                 f"aged Hazen–Williams C ({c_aged:g}) exceeds new ({c_new:g})", c_aged)
        e_gpa = _number(entry, "youngs_modulus_gpa", path, where, 0.01, 400.0, low_open=True)
        table[mid] = Material(
            material_id=mid,
            name=_text(entry, "name", path, where),
            roughness_new_m=ks_new / _MM_PER_M,
            roughness_aged_m=ks_aged / _MM_PER_M,
            hw_c_new=c_new,
            hw_c_aged=c_aged,
            youngs_modulus_pa=e_gpa * _GPA,
            source=_text(entry, "source", path, where),
        )
    return MappingProxyType(table)


def load_pipe_series_file(path: Path | str) -> PipeSeries:
    """Read and check one pipe-series file; values converted to SI.  Not cached.

    The file name must be ``<id>.json``; sizes must be listed smallest bore first.
    """
    path = Path(path)
    data = _read_json(path, PIPE_SERIES_FORMAT)
    _no_unknown_keys(data, _SERIES_KEYS, path, "")
    sid = _identifier(data, path, "")
    if path.stem != sid:
        raise CatalogueError(path, "id", f"id {sid!r} differs from the file name; name the file {sid}.json", sid)
    raw_sizes = _field(data, "sizes", list, path, "")
    if not raw_sizes:
        raise CatalogueError(path, "sizes", "the list is empty")
    sizes: list[PipeSize] = []
    seen: set[str] = set()
    for i, entry in enumerate(raw_sizes):
        where = f"sizes[{i}]"
        if not isinstance(entry, dict):
            raise CatalogueError(path, where, f"expected an object, got {_kind(entry)}")
        nominal = _text(entry, "nominal", path, where)
        where = f"sizes[{i}] ({nominal})"
        _no_unknown_keys(entry, _SIZE_KEYS, path, where)
        if _squash(nominal) in seen:
            raise CatalogueError(path, where, f"duplicate nominal size {quote_input(nominal)}")
        seen.add(_squash(nominal))
        od = _number(entry, "outside_diameter_mm", path, where, 0.0, 10_000.0, low_open=True)
        wall = _number(entry, "wall_thickness_mm", path, where, 0.0, 1_000.0, low_open=True)
        lining = _number(entry, "lining_thickness_mm", path, where, 0.0, 1_000.0, default=0.0)
        bore = _number(entry, "internal_diameter_mm", path, where, 0.0, 10_000.0, low_open=True)
        if bore >= od:
            raise CatalogueError(path, f"{where}.internal_diameter_mm",
                                 f"bore {bore:g} mm is not smaller than the outside diameter {od:g} mm", bore)
        expected = od - 2.0 * (wall + lining)
        if abs(bore - expected) > _BORE_TOLERANCE_MM:
            raise CatalogueError(
                path, f"{where}.internal_diameter_mm",
                f"bore {bore:g} mm differs from OD − 2·(wall + lining) = {expected:.2f} mm", bore)
        rating = _number(entry, "pressure_rating_bar", path, where, 0.0, 1_000.0, low_open=True, default=None)
        if sizes and bore <= sizes[-1].internal_diameter_m * _MM_PER_M:
            raise CatalogueError(path, where, "sizes must be listed in ascending order of internal diameter")
        sizes.append(PipeSize(
            nominal=nominal,
            outside_diameter_m=od / _MM_PER_M,
            wall_thickness_m=wall / _MM_PER_M,
            internal_diameter_m=bore / _MM_PER_M,
            pressure_rating_bar=rating,
            lining_thickness_m=lining / _MM_PER_M,
        ))
    return PipeSeries(
        series_id=sid,
        name=_text(data, "name", path, ""),
        material_id=_text(data, "material_id", path, ""),
        standard=_text(data, "standard", path, ""),
        source=_text(data, "source", path, ""),
        notes=_text(data, "notes", path, "", allow_empty=True),
        sizes=tuple(sizes),
    )


def load_pipe_series(directory: Path | str,
                     known_material_ids: frozenset[str] | None = None) -> Mapping[str, PipeSeries]:
    """Read every ``*.json`` series in ``directory``.  Not cached.

    When ``known_material_ids`` is given, a series naming any other material is refused.
    """
    directory = Path(directory)
    if not directory.is_dir():
        raise CatalogueError(directory, "", "pipe-series folder not found")
    table: dict[str, PipeSeries] = {}
    for path in sorted(directory.glob("*.json")):
        s = load_pipe_series_file(path)
        if known_material_ids is not None and s.material_id not in known_material_ids:
            raise CatalogueError(
                path, "material_id",
                f"unknown material {quote_input(s.material_id)}; valid ids: {', '.join(sorted(known_material_ids))}",
                s.material_id)
        table[s.series_id] = s
    if not table:
        raise CatalogueError(directory, "", "no pipe-series files (*.json) found")
    return MappingProxyType(table)


# --------------------------------------------------------------------------- helpers
_MATERIAL_KEYS = frozenset({"id", "name", "roughness_new_mm", "roughness_aged_mm", "hw_c_new",
                            "hw_c_aged", "youngs_modulus_gpa", "source"})
_SERIES_KEYS = frozenset({"format", "version", "id", "name", "material_id", "standard", "source",
                          "notes", "sizes"})
_SIZE_KEYS = frozenset({"nominal", "outside_diameter_mm", "wall_thickness_mm", "lining_thickness_mm",
                        "internal_diameter_mm", "pressure_rating_bar"})


def _pipe_state(state: str) -> str:
    if state not in ("new", "aged"):
        raise ModelError("pipe_state", f"expected 'new' or 'aged', got {state!r}", state)
    return state


def _kind(value: object) -> str:
    return {dict: "an object", list: "a list", str: "text", bool: "true/false",
            type(None): "null"}.get(type(value), "a number" if isinstance(value, (int, float)) else
                                   type(value).__name__)


def _read_json(path: Path, expected_format: str) -> dict[str, Any]:
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise CatalogueError(path, "", "catalogue file not found") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise CatalogueError(path, "", f"cannot read the file ({exc})") from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise CatalogueError(path, f"line {exc.lineno}, column {exc.colno}", f"not valid JSON: {exc.msg}") from None
    if not isinstance(data, dict):
        raise CatalogueError(path, "", f"expected a JSON object at the top, got {_kind(data)}")
    fmt = data.get("format")
    if fmt != expected_format:
        raise CatalogueError(path, "format", f"expected {expected_format!r}, got {fmt!r}", fmt)
    version = data.get("version")
    if isinstance(version, bool) or not isinstance(version, int) or version < 1:
        raise CatalogueError(path, "version", f"expected a whole version number ≥ 1, got {version!r}", version)
    if version > SUPPORTED_VERSION:
        raise CatalogueError(
            path, "version",
            f"version {version} is newer than this program reads (up to {SUPPORTED_VERSION}); update the program",
            version)
    return data


def _field(obj: Mapping[str, object], key: str, kind: type[_T], path: Path, where: str) -> _T:
    entry = f"{where}.{key}" if where else key
    if key not in obj:
        raise CatalogueError(path, entry, "missing")
    value = obj[key]
    if not isinstance(value, kind):
        raise CatalogueError(path, entry, f"expected {_kind(kind())}, got {_kind(value)}", value)
    return value


def _text(obj: Mapping[str, object], key: str, path: Path, where: str, allow_empty: bool = False) -> str:
    value = _field(obj, key, str, path, where)
    if not allow_empty and not value.strip():
        raise CatalogueError(path, f"{where}.{key}" if where else key, "must not be empty", value)
    return value


def _identifier(obj: Mapping[str, object], path: Path, where: str) -> str:
    value = _text(obj, "id", path, where)
    if not _ID_PATTERN.match(value):
        raise CatalogueError(path, f"{where}.id" if where else "id",
                             "ids use lower-case letters, digits and '_' only", value)
    return value


@overload
def _number(obj: Mapping[str, object], key: str, path: Path, where: str, low: float, high: float,
            low_open: bool = False, *, default: float | EllipsisType = ...) -> float: ...
@overload
def _number(obj: Mapping[str, object], key: str, path: Path, where: str, low: float, high: float,
            low_open: bool = False, *, default: None) -> float | None: ...
def _number(obj: Mapping[str, object], key: str, path: Path, where: str, low: float, high: float,
            low_open: bool = False, *, default: float | None | EllipsisType = ...) -> float | None:
    """A finite number within [low, high] (or (low, high]); ``default`` where missing, else refused."""
    entry = f"{where}.{key}" if where else key
    if key not in obj:
        if default is ...:
            raise CatalogueError(path, entry, "missing")
        return default
    value = obj[key]
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise CatalogueError(path, entry, f"expected a finite number, got {_kind(value)}", value)
    too_low = value <= low if low_open else value < low
    if too_low or value > high:
        bracket = "(" if low_open else "["
        raise CatalogueError(path, entry, f"{value:g} is outside the allowed range {bracket}{low:g}, {high:g}]",
                             value)
    return float(value)


def _no_unknown_keys(obj: Mapping[str, object], allowed: frozenset[str], path: Path, where: str) -> None:
    unknown = sorted(set(obj) - allowed)
    if unknown:
        raise CatalogueError(path, where or "(top level)",
                             f"unknown key(s) {', '.join(unknown)}; allowed: {', '.join(sorted(allowed))}")


def _squash(text: str) -> str:
    return re.sub(r"\s+", "", text).lower()


_PREFIX = re.compile(r"^(nps|dn|de|od|d)\s*", re.IGNORECASE)
_SUFFIX = re.compile(r"\s*(mm|inches|inch|in|\"|″)$", re.IGNORECASE)
_METRIC_WORDS = {"dn", "de", "od", "d", "mm"}


def _parse_nominal(text: str) -> tuple[float, str] | None:
    """``(number, system)`` of a nominal size, system ``metric``/``inch``/``""``; ``None`` if unreadable.

    >>> _parse_nominal("NPS 1-1/4"), _parse_nominal("dn110"), _parse_nominal("8 in"), _parse_nominal("x")
    ((1.25, 'inch'), (110.0, 'metric'), (8.0, 'inch'), None)
    """
    s = text.strip()
    system = ""
    m = _PREFIX.match(s)
    if m:
        system = "metric" if m.group(1).lower() in _METRIC_WORDS else "inch"
        s = s[m.end():]
    m = _SUFFIX.search(s)
    if m:
        suffix_system = "metric" if m.group(1).lower() in _METRIC_WORDS else "inch"
        if system and suffix_system != system:
            return None
        system = suffix_system
        s = s[:m.start()]
    s = s.strip()
    mixed = re.fullmatch(r"(\d+)[\s-]+(\d+)/(\d+)", s)
    try:
        if mixed:
            whole, num, den = (int(g) for g in mixed.groups())
            value = whole + Fraction(num, den)
        elif re.fullmatch(r"\d+/\d+|\d+(\.\d+)?|\.\d+", s):
            value = Fraction(s)
        else:
            return None
    except (ValueError, ZeroDivisionError):
        return None
    return float(value), system


def _same_nominal(query: tuple[float, str], candidate: tuple[float, str] | None) -> bool:
    if candidate is None or query[0] != candidate[0]:
        return False
    return not query[1] or not candidate[1] or query[1] == candidate[1]
