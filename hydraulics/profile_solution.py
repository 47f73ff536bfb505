"""The main's profile of a solved project: grade lines at the operating points and at rest.

:func:`solved_profile` gathers, for every operating point at the arrangement's speed (both
static extremes, new and aged pipe, 1..N pumps running; the design flow where the project
has no pump), the friction and minor loss of each segment of the common delivery pipework
(manifold and main, in flow order), and hands them to
:func:`hydraulics.main_profile.profile_result` with the delivery level of each static
extreme; the grade lines at rest take the high and the low delivery level.  The pressure
rating of each segment comes from its pipe series (:func:`segment_ratings_pa`).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import replace

import numpy as np

from hydraulics import catalogue, fittings
from hydraulics.main_profile import OperatingLosses, PipeProfile, ProfileResult, profile_result
from hydraulics.model import ModelError, PipeState, Project, StaticCase
from hydraulics.results import FloatArray, OperatingPoint
from hydraulics.system_curve import SystemHydraulics, delivery_levels, main_segments

__all__ = ["pipe_profile", "segment_ratings_pa", "solved_profile", "BAR_PA"]

BAR_PA = 1.0e5
"""One bar in pascals (SI Brochure, 9th ed., 2019, table 8: 1 bar = 100 kPa)."""


def pipe_profile(project: Project) -> PipeProfile | None:
    """The project's profile as arrays, ``None`` when it has none."""
    if not project.profile:
        return None
    return PipeProfile(np.array([p.chainage_m for p in project.profile], dtype=np.float64),
                       np.array([p.elevation_m for p in project.profile], dtype=np.float64),
                       np.array([p.air_valve for p in project.profile], dtype=np.bool_))


def segment_ratings_pa(project: Project, segments: Sequence[int]) -> FloatArray:
    """Pressure rating of each segment (Pa, gauge): its pipe series' PN or allowable operating pressure.

    ``pressure_rating_bar`` of the segment's series and nominal size × 10⁵ Pa/bar; NaN for a
    typed bore (no series), a size without a rating, or a series no longer in the catalogue.
    """
    out = np.full(len(segments), math.nan)
    for j, i in enumerate(segments):
        seg = project.segments[i]
        if seg.pipe_series is None or seg.nominal_size is None:
            continue
        try:
            rating = catalogue.series(seg.pipe_series).size(seg.nominal_size).pressure_rating_bar
        except ModelError:
            continue
        if rating is not None:
            out[j] = rating * BAR_PA
    return out


def _label(pumps_running: int | None, static: str, pipe: str) -> str:
    who = "design flow" if pumps_running is None else ("1 pump" if pumps_running == 1 else f"{pumps_running} pumps")
    return f"{who}, {static} static, {pipe} pipe"


def solved_profile(project: Project, system: SystemHydraulics, points: Sequence[OperatingPoint],
                   density_kg_m3: float) -> ProfileResult | None:
    """Grade lines and pressures along the main at ``points`` and at rest; ``None`` without a profile.

    ``points`` are the operating points to draw (those not found are left out); with none
    (a project without a pump) the design flow is drawn at both static extremes, new and
    aged pipe, with the duty pumps sharing it.  Per-segment losses: Darcy–Weisbach (or
    Hazen–Williams) friction and K v²/2g of each main segment at the station flow
    (:meth:`SystemHydraulics.segment_friction`, :func:`hydraulics.fittings.minor_loss`).
    """
    profile = pipe_profile(project)
    if profile is None:
        return None
    main = list(main_segments(project))
    levels = delivery_levels(project.site, density_kg_m3)
    cases: list[tuple[str, StaticCase, PipeState, float, int]] = []
    for p in points:
        if p.found and p.flow_m3_s is not None:
            cases.append((_label(p.pumps_running, p.static, p.pipe), p.static,  # type: ignore[arg-type]
                          p.pipe, float(p.flow_m3_s), p.pumps_running))  # static/pipe are the model's literals
    if not points:
        arrangement = project.arrangement
        n = 1 if arrangement is None else max(1, int(arrangement.duty_count))
        statics: tuple[StaticCase, ...] = ("min", "max")
        pipes: tuple[PipeState, ...] = ("new", "aged")
        cases = [(_label(None, s, pipe), s, pipe, project.site.design_flow_m3_s, n) for s in statics for pipe in pipes]
    friction = np.zeros((len(cases), len(main)))
    minor = np.zeros((len(cases), len(main)))
    for aged in (False, True):
        rows = [i for i, case in enumerate(cases) if (case[2] == "aged") == aged]
        if not rows or not main:
            continue
        flows = np.array([cases[i][3] for i in rows])
        running = np.array([cases[i][4] for i in rows], dtype=float)
        losses = system.segment_friction(flows, aged, running)
        velocity = np.broadcast_to(losses.velocity_m_s, (len(rows), system.n_segments))
        loss = np.broadcast_to(losses.head_loss_m, (len(rows), system.n_segments))
        friction[rows] = loss[:, main]
        minor[rows] = fittings.minor_loss(system.k_total, velocity)[:, main]
    operating = [OperatingLosses(label=label, static=static, pipe=pipe, flow_m3_s=flow,
                                 delivery_level_m=levels[static], friction_m=friction[i], minor_m=minor[i])
                 for i, (label, static, pipe, flow, _) in enumerate(cases)]
    lengths = system.length_m[main] if main else np.zeros(0)
    result = profile_result(profile, lengths, operating, {"max": levels["max"], "min": levels["min"]}, density_kg_m3)
    return replace(result, segment_rating_pa=segment_ratings_pa(project, main))
