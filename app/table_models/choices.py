"""Drop-down choices from the catalogues: materials, pipe series, nominal sizes, fittings.

Each function returns ``(value, label)`` pairs; the value is what the project stores
(an id or a nominal size), the label what the user reads.  ``None`` as a value means
"no pipe series: the diameter is typed".
"""

from __future__ import annotations

from hydraulics import catalogue, fittings
from hydraulics.catalogue import PipeSize
from hydraulics.model import ModelError
from hydraulics.project_edits import series_of_material

TYPED_SERIES_LABEL = "typed (no series)"
"""The pipe-series choice meaning that the internal diameter was typed."""

SIDE_CHOICES: list[tuple[str | None, str]] = [("suction", "Suction"), ("delivery", "Delivery")]

CARRIES_CHOICES: list[tuple[str | None, str]] = [("pump", "Each pump"), ("station", "Station flow")]
"""What a segment carries: one running pump's flow (its own branch) or the station flow."""

AIR_VALVE_CHOICES: list[tuple[str | None, str]] = [("no", "No"), ("yes", "Yes")]
"""Whether a profile point is a vented summit."""


def material_choices() -> list[tuple[str | None, str]]:
    """Every catalogue material, in catalogue order."""
    return [(m.material_id, m.name) for m in catalogue.materials().values()]


def series_choices(material_id: str, current: str | None = None) -> list[tuple[str | None, str]]:
    """"typed", then the series of the segment's material (and the current one if other)."""
    found = series_of_material(material_id)
    every = catalogue.pipe_series()
    if current is not None and current in every and current not in {s.series_id for s in found}:
        found.append(every[current])
    return [(None, TYPED_SERIES_LABEL)] + [(s.series_id, s.name) for s in found]


def nominal_choices(series_id: str | None) -> list[tuple[str | None, str]]:
    """The nominal sizes of a series, smallest first (none for a typed diameter)."""
    if series_id is None:
        return []
    try:
        found = catalogue.series(series_id)
    except ModelError:
        return []
    return [(n, n) for n in found.nominals()]


def size_of(series_id: str, nominal: str) -> PipeSize:
    """The catalogue size (raises ModelError for an unknown series or size)."""
    return catalogue.series(series_id).size(nominal)


def fitting_choices() -> list[tuple[str | None, str]]:
    """Every catalogue fitting type, grouped by category in the catalogue's order."""
    entries = list(fittings.fitting_catalogue().values())
    order = {c: i for i, c in enumerate(fittings.CATEGORIES)}
    entries.sort(key=lambda f: order.get(f.category, len(order)))
    return [(f.fitting_id, f.name) for f in entries]


def catalogue_k(fitting_id: str, internal_diameter_m: float) -> float | None:
    """The catalogue K of one fitting in a pipe of the given bore, ``None`` if unknown."""
    fitting_type = fittings.fitting_catalogue().get(fitting_id)
    if fitting_type is None:
        return None
    try:
        return fittings.fitting_k(fitting_type, internal_diameter_m)
    except ModelError:
        return None


def fitting_source(fitting_id: str) -> str:
    """Where a fitting's catalogue K comes from (for tooltips)."""
    fitting_type = fittings.fitting_catalogue().get(fitting_id)
    if fitting_type is None:
        return "not in the fittings catalogue"
    if fitting_type.method == "constant":
        how = "constant K"
    elif fitting_type.method == "crane":
        how = f"K = {fitting_type.n:g} × f_T at the pipe bore"
    elif fitting_type.method == "user_k":
        how = "K is the row's K override"
    else:
        how = "K from the bores either side and the cone angle"
    return f"{how}; source: {fitting_type.source}"
