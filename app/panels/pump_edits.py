"""Project edits of the Pumps panel: choose, add, import and remove pump models.

Each function returns a new :class:`~hydraulics.model.Project`; the panel hands it to
the document as one undo step.
"""

from __future__ import annotations

import re
from dataclasses import replace
from pathlib import Path

import numpy as np

from hydraulics.model import Arrangement, Project, PumpModel
from hydraulics.results import Solution

EXAMPLE_RATED_SPEED_RPM = 1450.0
"""Rated speed given to a new pump's example curve (a common four-pole speed at 50 Hz)."""

_EXAMPLE_FLOW_FRACTIONS = (0.0, 0.5, 1.0, 1.25, 1.5)


def unique_pump_id(project: Project, wanted: str) -> str:
    """``wanted`` made into an id (letters, digits, ``_``) not used by another pump."""
    base = re.sub(r"[^A-Za-z0-9_]+", "_", wanted).strip("_") or "pump"
    taken = {p.pump_id for p in project.pumps}
    candidate, number = base, 2
    while candidate in taken:
        candidate = f"{base}_{number}"
        number += 1
    return candidate


def with_duty_pump(project: Project, pump_id: str) -> Project:
    """The station uses pump ``pump_id`` (an arrangement of one duty pump is made if none)."""
    if project.arrangement is None:
        return replace(project, arrangement=Arrangement(pump_id=pump_id))
    if project.arrangement.pump_id == pump_id:
        return project
    return replace(project, arrangement=replace(project.arrangement, pump_id=pump_id))


def with_added_pump(project: Project, pump: PumpModel) -> Project:
    """``pump`` added to the project and made the station's pump."""
    return with_duty_pump(replace(project, pumps=project.pumps + (pump,)), pump.pump_id)


def with_removed_pump(project: Project, pump_id: str) -> Project:
    """The pump ``pump_id`` removed; the station then uses the first remaining pump, or none."""
    pumps = tuple(p for p in project.pumps if p.pump_id != pump_id)
    arrangement = project.arrangement
    if arrangement is not None and arrangement.pump_id == pump_id:
        arrangement = replace(arrangement, pump_id=pumps[0].pump_id) if pumps else None
    return replace(project, pumps=pumps, arrangement=arrangement)


def with_pump_changes(project: Project, pump_id: str, **changes) -> Project:
    """The pump ``pump_id`` with fields changed."""
    pumps = tuple(replace(p, **changes) if p.pump_id == pump_id else p for p in project.pumps)
    return replace(project, pumps=pumps)


def with_arrangement_changes(project: Project, **changes) -> Project:
    """The arrangement with fields changed (the project must have one)."""
    assert project.arrangement is not None
    return replace(project, arrangement=replace(project.arrangement, **changes))


def example_pump(project: Project, solution: Solution | None) -> PumpModel:
    """A starting curve to edit: an invented pump that meets the design flow.

    Its head at the design flow is the highest system head there (maximum static, aged
    pipe) from ``solution``, else the maximum static head plus 20 %; the curve is the
    parabola H = H₀ − kQ² with a shut-off head 25 % higher.  Clearly named as an example:
    replace its points with a manufacturer's test data.
    """
    q_design = project.site.design_flow_m3_s
    head_design = None
    if solution is not None:
        try:
            curve = solution.curve("max", "aged")
            head_design = float(np.interp(q_design, curve.flow_m3_s, curve.head_m))
        except KeyError:
            head_design = None
    if head_design is None or not np.isfinite(head_design) or head_design <= 0:
        delivery = project.site.delivery
        top = getattr(delivery, "level_high_m", getattr(delivery, "elevation_m", 0.0))
        head_design = max(1.2 * (top - project.site.suction_level_low_m), 5.0)
    shutoff = 1.25 * head_design
    k = (shutoff - head_design) / q_design**2
    flows = tuple(f * q_design for f in _EXAMPLE_FLOW_FRACTIONS)
    heads = tuple(max(shutoff - k * q * q, 0.0) for q in flows)
    return PumpModel(
        pump_id=unique_pump_id(project, "example_pump"),
        name="Example pump (replace with test data)",
        rated_speed_rpm=EXAMPLE_RATED_SPEED_RPM,
        flow_m3_s=flows, head_m=heads,
        notes="Invented example curve made by PumpSketch; replace with the manufacturer's test points.",
    )


def imported_pump_id(project: Project, path: Path) -> str:
    """An id for a pump read from ``path``: its file name without the suffix, made unique."""
    return unique_pump_id(project, Path(path).stem)
