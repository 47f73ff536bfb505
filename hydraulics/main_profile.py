"""The profile of the rising main: crest control, hydraulic grade line and pressures along it.

The common delivery pipework (manifold and main, in flow order) is laid end to end from
chainage 0 by the segments' lengths; the pipe elevation along it is a piecewise-linear
profile of surveyed points, some of them vented summits (air valves).  Everything here
works on plain float64 SI arrays, vectorised over the operating points:

* the head to each vented point and the governing control — the delivery or a crest
  (:func:`crest_heads`);
* the hydraulic grade line and the gauge pressure along the main at operating points and
  at rest (:func:`grade_line`, :func:`profile_result`);
* plain data for the findings: sub-atmospheric reaches and column separation
  (:func:`low_pressures`), pressures above the pipe rating (:func:`segment_pressure_peaks`).

Conventions (every function):

* chainage ``x`` in m along the main, elevation ``z`` in m above the project datum;
* per-segment losses of the delivery segments at each flow as arrays shaped
  ``S + (n_segments,)`` (``S`` is usually ``(n_flows,)``), friction and minor losses apart;
* the friction loss of a segment is spread uniformly over its length; its minor loss
  (fittings) is lumped at its upstream end, so it counts as upstream of every chainage
  past the segment's start;
* heads are piezometric heads (m of fluid), pressures gauge.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any, TypeAlias

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import ModelError, PipeState, StaticCase
from hydraulics.number_format import plain_number

__all__ = [
    "FloatArray", "PipeProfile", "ProfileCoverage", "CrestControl", "GradeLine", "OperatingLosses",
    "ProfileLine", "ProfileResult", "LowPressure", "SegmentPressurePeak", "DELIVERY_CONTROL",
    "segment_chainages", "profile_elevation", "profile_coverage", "loss_weights", "crest_heads",
    "sample_chainages", "grade_line", "rest_grade_line", "profile_result", "low_pressures",
    "segment_pressure_peaks",
]

FloatArray: TypeAlias = NDArray[np.float64]
IntArray: TypeAlias = NDArray[np.int64]
BoolArray: TypeAlias = NDArray[np.bool_]

DELIVERY_CONTROL = -1
"""Control index meaning "the delivery governs" (otherwise the index of a profile point)."""

COVERAGE_TOLERANCE_FRACTION = 0.01
COVERAGE_TOLERANCE_M = 1.0
"""The profile covers the main when its ends lie within the larger of 1 % of the main's
length and 1 m of chainage 0 and of the main's end (common practice for survey chainages
against scaled pipe lengths)."""


def _floats(values: ArrayLike) -> FloatArray:
    return np.asarray(values, dtype=np.float64)


# --------------------------------------------------------------------------- profile
@dataclass(frozen=True, eq=False)
class PipeProfile:
    """Surveyed points of the main: chainage (m), pipe elevation (m) and air valve, shape ``(n_points,)``.

    Chainages strictly increase from a first point at chainage ≥ 0; at least two points.
    Bad input raises :class:`~hydraulics.model.ModelError` naming the point and field.
    """

    chainage_m: FloatArray
    elevation_m: FloatArray
    air_valve: BoolArray

    def __post_init__(self) -> None:
        chainage = _floats(self.chainage_m)
        elevation = _floats(self.elevation_m)
        vented = np.asarray(self.air_valve, dtype=np.bool_)
        if chainage.ndim != 1 or chainage.size < 2:
            raise ModelError("profile", "needs at least two points (chainage and elevation)", chainage.size)
        for name, values in (("elevation", elevation), ("air_valve", vented)):
            if values.shape != chainage.shape:
                raise ModelError("profile", f"every point needs a chainage and an {name}", values.shape)
        for name, values in (("chainage", chainage), ("elevation", elevation)):
            bad = np.flatnonzero(~np.isfinite(values))
            if bad.size:
                raise ModelError(f"profile[{bad[0]}].{name}", "must be a finite number", float(values[bad[0]]))
        if chainage[0] < 0.0:
            raise ModelError("profile[0].chainage", "must be 0 m or more", float(chainage[0]))
        steps = np.flatnonzero(np.diff(chainage) <= 0.0)
        if steps.size:
            i = int(steps[0]) + 1
            raise ModelError(f"profile[{i}].chainage",
                             f"must be greater than the chainage before it ({chainage[i - 1]!r} m)",
                             float(chainage[i]))
        object.__setattr__(self, "chainage_m", chainage)
        object.__setattr__(self, "elevation_m", elevation)
        object.__setattr__(self, "air_valve", vented)

    @property
    def vented_index(self) -> IntArray:
        """Indices of the vented points (air valves), shape ``(n_vented,)``."""
        return np.flatnonzero(self.air_valve).astype(np.int64)


def segment_chainages(lengths_m: ArrayLike) -> tuple[FloatArray, FloatArray]:
    """Start and end chainage of each segment laid end to end from chainage 0, shapes ``(n_segments,)``.

    >>> segment_chainages([600.0, 900.0])
    (array([  0., 600.]), array([ 600., 1500.]))
    """
    lengths = _floats(lengths_m)
    end = np.cumsum(lengths)
    return end - lengths, end


def profile_elevation(profile: PipeProfile, x_m: ArrayLike) -> FloatArray:
    """Pipe elevation at chainages ``x_m`` (any shape) by linear interpolation between the points.

    Beyond the first or last point the elevation of that point holds.

    >>> p = PipeProfile(np.array([0.0, 600.0]), np.array([19.0, 44.5]), np.array([False, True]))
    >>> float(profile_elevation(p, 300.0))
    31.75
    """
    return np.interp(_floats(x_m), profile.chainage_m, profile.elevation_m)


@dataclass(frozen=True)
class ProfileCoverage:
    """How the profile's chainage range compares with the main's length (m)."""

    first_chainage_m: float
    last_chainage_m: float
    main_length_m: float
    tolerance_m: float

    @property
    def end_difference_m(self) -> float:
        """Last profile chainage − main length (negative: the profile stops short)."""
        return self.last_chainage_m - self.main_length_m

    @property
    def covers(self) -> bool:
        return self.first_chainage_m <= self.tolerance_m and abs(self.end_difference_m) <= self.tolerance_m


def profile_coverage(profile: PipeProfile, lengths_m: ArrayLike) -> ProfileCoverage | None:
    """``None`` when the profile covers the main, else the mismatch for a finding.

    The profile covers the main when its first point lies at chainage 0 and its last at the
    main's total length, each within the larger of 1 % of that length and 1 m.

    >>> p = PipeProfile(np.array([0.0, 1480.0]), np.array([19.0, 37.5]), np.array([False, False]))
    >>> profile_coverage(p, [600.0, 900.0])
    ProfileCoverage(first_chainage_m=0.0, last_chainage_m=1480.0, main_length_m=1500.0, tolerance_m=15.0)
    >>> profile_coverage(p, [600.0, 870.0]) is None
    True
    """
    total = float(np.sum(_floats(lengths_m)))
    coverage = ProfileCoverage(first_chainage_m=float(profile.chainage_m[0]),
                               last_chainage_m=float(profile.chainage_m[-1]), main_length_m=total,
                               tolerance_m=max(COVERAGE_TOLERANCE_M, COVERAGE_TOLERANCE_FRACTION * total))
    return None if coverage.covers else coverage


# --------------------------------------------------------------------------- loss weights
def loss_weights(lengths_m: ArrayLike, x_m: ArrayLike) -> tuple[FloatArray, FloatArray]:
    """Fractions of each segment's friction and minor loss counted upstream of chainage ``x``.

    Friction weight: 1 for a segment ending at or before x, (x − start)/length for the
    segment containing x (friction uniform along a pipe of one bore: Darcy–Weisbach
    h_f ∝ L), 0 after.  Minor weight: 1 for every segment starting before x (its fittings
    lumped at its upstream end), 0 otherwise.  A zero-length segment counts fully once x
    reaches it.  Shapes ``x.shape + (n_segments,)``.

    >>> friction, minor = loss_weights([600.0, 900.0], [300.0, 600.0, 1050.0])
    >>> friction.tolist(), minor.tolist()
    ([[0.5, 0.0], [1.0, 0.0], [1.0, 0.5]], [[1.0, 0.0], [1.0, 0.0], [1.0, 1.0]])
    """
    lengths = _floats(lengths_m)
    start, end = segment_chainages(lengths)
    x = _floats(x_m)[..., None]
    safe_length = np.where(lengths > 0.0, lengths, 1.0)
    pro_rata = np.clip((x - start) / safe_length, 0.0, 1.0)
    friction = np.where(lengths > 0.0, pro_rata, np.where(x >= end, 1.0, 0.0))
    minor = np.where(start < x, 1.0, 0.0)
    return friction, minor


def _loss_between(friction_m: FloatArray, minor_m: FloatArray, lengths_m: FloatArray,
                  x_from_m: FloatArray, x_to_m: FloatArray) -> FloatArray:
    """Loss between chainages (weights differenced before summing, so x_from = x_to gives exactly 0).

    ``friction_m``/``minor_m`` shaped ``S + (n_segments,)``; ``x_from_m``/``x_to_m`` of a shape
    ``X`` broadcast together; result ``S + X``.
    """
    f_from, m_from = loss_weights(lengths_m, x_from_m)
    f_to, m_to = loss_weights(lengths_m, x_to_m)
    lead = friction_m.shape[:-1]
    x_shape = np.broadcast_shapes(f_from.shape, f_to.shape)[:-1]
    fric = friction_m.reshape(lead + (1,) * len(x_shape) + friction_m.shape[-1:])
    minor = minor_m.reshape(lead + (1,) * len(x_shape) + minor_m.shape[-1:])
    return np.asarray(np.sum(fric * (f_to - f_from) + minor * (m_to - m_from), axis=-1), dtype=np.float64)


def _check_losses(lengths_m: ArrayLike, friction_m: ArrayLike,
                  minor_m: ArrayLike) -> tuple[FloatArray, FloatArray, FloatArray]:
    lengths = _floats(lengths_m)
    friction, minor = np.broadcast_arrays(_floats(friction_m), _floats(minor_m))
    if lengths.ndim != 1 or friction.ndim < 1 or friction.shape[-1] != lengths.size:
        raise ValueError(f"per-segment losses need a last axis of {lengths.size} segments, got {friction.shape}")
    return lengths, np.asarray(friction, dtype=np.float64), np.asarray(minor, dtype=np.float64)


# --------------------------------------------------------------------------- crest control
@dataclass(frozen=True, eq=False)
class CrestControl:
    """Heads seen at the pump set by each control, over flows of shape ``S``.

    ``delivery_head_m`` shape ``S``; ``crest_head_m`` shape ``S + (n_vented,)`` in the order
    of ``vented_index`` (profile point indices); ``system_head_m`` the larger of all, shape
    ``S``; ``control_index`` the governing profile point, or :data:`DELIVERY_CONTROL`.
    """

    delivery_head_m: FloatArray
    crest_head_m: FloatArray
    system_head_m: FloatArray
    control_index: IntArray
    vented_index: IntArray


def _control_levels(profile: PipeProfile, lengths: FloatArray, friction: FloatArray, minor: FloatArray,
                    delivery_level: FloatArray) -> tuple[FloatArray, FloatArray, IntArray]:
    """Head at chainage 0 each control demands: H_del + all main losses, z_k + losses up to x_k."""
    vented = profile.vented_index
    lead = np.broadcast_shapes(friction.shape[:-1], delivery_level.shape)
    zero = np.zeros(1)
    to_delivery = delivery_level + _loss_between(friction, minor, lengths, zero, np.array([np.sum(lengths)]))[..., 0]
    to_crest = profile.elevation_m[vented] + _loss_between(friction, minor, lengths, zero,
                                                           profile.chainage_m[vented])
    return np.broadcast_to(to_delivery, lead), np.broadcast_to(to_crest, lead + vented.shape), vented


def _governing(to_delivery: FloatArray, to_crest: FloatArray, vented: IntArray) -> tuple[FloatArray, IntArray]:
    """Largest head and its control; the delivery wins a tie (no crest strictly above it)."""
    if vented.size == 0:
        return to_delivery, np.full(to_delivery.shape, DELIVERY_CONTROL, dtype=np.int64)
    best = np.argmax(to_crest, axis=-1)
    best_head = np.take_along_axis(to_crest, best[..., None], axis=-1)[..., 0]
    crest_wins = best_head > to_delivery
    control = np.where(crest_wins, vented[best], DELIVERY_CONTROL).astype(np.int64)
    return np.where(crest_wins, best_head, to_delivery), control


def crest_heads(profile: PipeProfile, lengths_m: ArrayLike, friction_m: ArrayLike, minor_m: ArrayLike,
                delivery_level_m: ArrayLike, suction_level_m: ArrayLike,
                upstream_loss_m: ArrayLike) -> CrestControl:
    """System head with crest control: the larger of the head to the delivery and to every vented point.

    Energy equation (Bernoulli with head loss) between the suction water level and a control:
    the head to the delivery H_D(Q) = H_del − z_s + h_up(Q) + Σ_i [h_f,i(Q) + h_m,i(Q)], and the
    head to a vented point k, where an air valve holds the pipe at atmospheric pressure so the
    grade line cannot fall below the pipe (AWWA M51, *Air Valves: Air-Release, Air/Vacuum and
    Combination*, 2016, on air valves at high points):
    H_k(Q) = z_k − z_s + h_up(Q) + Σ_i [w_f,i(x_k) h_f,i(Q) + w_m,i(x_k) h_m,i(Q)] with the
    weights of :func:`loss_weights`.  Beyond a governing crest the main runs part full, so the
    system head is H(Q) = max(H_D, max_k H_k) (Chadwick, Morfett & Borthwick, *Hydraulics in
    Civil and Environmental Engineering*, 5th ed., 2013, ch. 4 on pipelines over high points;
    Streeter & Wylie, *Fluid Mechanics*, 8th ed., 1985, on the hydraulic grade line).

    ``friction_m``/``minor_m``: per-segment losses of the delivery segments (flow order), shape
    ``S + (n_segments,)``.  ``delivery_level_m`` (delivery water level, or elevation + pressure
    head), ``suction_level_m`` and ``upstream_loss_m`` (suction and pump-branch losses)
    broadcast against ``S``.

    >>> p = PipeProfile(np.array([0.0, 600.0, 1500.0]), np.array([19.0, 44.5, 37.5]),
    ...                 np.array([False, True, False]))
    >>> q2 = np.array([0.05, 0.08]) ** 2
    >>> c = crest_heads(p, [600.0, 900.0], np.outer(q2, [1000.0, 1500.0]), np.outer(q2, [200.0, 300.0]),
    ...                 38.0, 21.0, 100.0 * q2)
    >>> c.system_head_m.round(2).tolist(), c.control_index.tolist()
    ([26.75, 36.84], [1, -1])
    """
    lengths, friction, minor = _check_losses(lengths_m, friction_m, minor_m)
    to_delivery, to_crest, vented = _control_levels(profile, lengths, friction, minor, _floats(delivery_level_m))
    shift = _floats(upstream_loss_m) - _floats(suction_level_m)
    delivery_head = to_delivery + shift
    crest_head = to_crest + shift[..., None]
    system_head, control = _governing(delivery_head, crest_head, vented)
    return CrestControl(delivery_head_m=delivery_head, crest_head_m=crest_head,
                        system_head_m=np.asarray(system_head, dtype=np.float64), control_index=control,
                        vented_index=vented)


# --------------------------------------------------------------------------- grade line
def sample_chainages(profile: PipeProfile, lengths_m: ArrayLike, extra_m: ArrayLike = ()) -> FloatArray:
    """Chainages at which the grade line is given: profile points ∪ segment boundaries ∪ ``extra_m``.

    Sorted, unique, shape ``(n_x,)``.  Between consecutive samples the pipe elevation and the
    grade line are both linear, so the samples carry every extreme of the pressure.

    >>> p = PipeProfile(np.array([0.0, 600.0, 1500.0]), np.array([19.0, 44.5, 37.5]),
    ...                 np.array([False, True, False]))
    >>> sample_chainages(p, [400.0, 1100.0], [1000.0]).tolist()
    [0.0, 400.0, 600.0, 1000.0, 1500.0]
    """
    start, end = segment_chainages(lengths_m)
    return np.unique(np.concatenate([profile.chainage_m, start, end, _floats(extra_m).ravel()]))


@dataclass(frozen=True, eq=False)
class GradeLine:
    """Grade line along the main at operating points of shape ``S``.

    ``chainage_m``/``elevation_m`` shape ``(n_x,)``; ``head_m``/``pressure_head_m`` shape
    ``S + (n_x,)``; ``part_full`` where the pipe runs part full (or drained at rest) below
    atmospheric grade; ``control_index`` shape ``S`` (profile point or :data:`DELIVERY_CONTROL`).
    """

    chainage_m: FloatArray
    elevation_m: FloatArray
    head_m: FloatArray
    pressure_head_m: FloatArray
    part_full: BoolArray
    control_index: IntArray


def grade_line(profile: PipeProfile, lengths_m: ArrayLike, friction_m: ArrayLike, minor_m: ArrayLike,
               delivery_level_m: ArrayLike, chainage_m: ArrayLike | None = None) -> GradeLine:
    """Hydraulic grade line H(x) and gauge pressure head p(x) = H(x) − z(x) along the main.

    Energy equation with head loss (Bernoulli), written from the downstream controls back up
    the main (Streeter & Wylie, *Fluid Mechanics*, 8th ed., 1985, hydraulic grade line;
    Chadwick, Morfett & Borthwick, *Hydraulics in Civil and Environmental Engineering*,
    5th ed., 2013, ch. 4): the full-pipe grade at x is the largest of

    * H_del + h(x → end) — the delivery (water level, or elevation + pressure head);
    * z_j + h(x → x_j) for every vented point j at or downstream of x — an air valve admits
      air, so the grade there cannot fall below the pipe (AWWA M51, *Air Valves*, 2016).

    Upstream of a governing crest k this is z_k + h(x → x_k).  Downstream of a vented point
    whose grade from the downstream controls falls below the pipe, the main runs part full at
    atmospheric pressure, H(x) = z(x), down the falling pipe to where the full-pipe grade
    meets it again; a rise of the pipe ends that reach (a hump downstream with no air valve
    keeps its sub-atmospheric full-pipe grade, so a finding can flag it).  The velocity head
    is left out (the long-main approximation: v²/2g is small against the losses and the
    line), and the exit loss of a submerged outlet takes the velocity head, so the line ends
    at the delivery level.

    Losses as in :func:`crest_heads` (shape ``S + (n_segments,)``; zero losses give the line
    at rest, see :func:`rest_grade_line`); ``delivery_level_m`` broadcast against ``S``;
    ``chainage_m`` defaults to :func:`sample_chainages`.
    """
    lengths, friction, minor = _check_losses(lengths_m, friction_m, minor_m)
    delivery = _floats(delivery_level_m)
    x = sample_chainages(profile, lengths) if chainage_m is None else np.unique(_floats(chainage_m))
    z = profile_elevation(profile, x)
    lead = np.broadcast_shapes(friction.shape[:-1], delivery.shape)
    total = np.array([np.sum(lengths)])
    full = delivery[..., None] + _loss_between(friction, minor, lengths, x, total)
    vented = profile.vented_index
    if vented.size:
        x_vent = profile.chainage_m[vented]
        to_vent = profile.elevation_m[vented] + _loss_between(friction, minor, lengths, x[:, None], x_vent[None, :])
        to_vent = np.where(x[:, None] <= x_vent[None, :], to_vent, -np.inf)
        full = np.maximum(full, np.max(to_vent, axis=-1))
    full = np.broadcast_to(full, lead + x.shape)
    part_full = _part_full_reaches(x, z, full, np.isin(x, profile.chainage_m[vented]))
    head = np.where(part_full, z, full)
    to_delivery, to_crest, _ = _control_levels(profile, lengths, friction, minor, delivery)
    _, control = _governing(to_delivery, to_crest, vented)
    return GradeLine(chainage_m=x, elevation_m=z, head_m=head, pressure_head_m=head - z, part_full=part_full,
                     control_index=np.broadcast_to(control, lead).astype(np.int64))


def _part_full_reaches(x: FloatArray, z: FloatArray, full: FloatArray, vented_sample: BoolArray) -> BoolArray:
    """Samples on a falling reach that starts at a vented point and lies above the full-pipe grade.

    A sample is in such a reach when the pipe is above the full-pipe grade there, no higher
    than the sample before, and the last sample before it that is not so is a vented point at
    atmospheric pressure (its own control) — found with a running maximum over the sample
    index, no loop over samples.
    """
    falling = np.concatenate([[False], z[1:] <= z[:-1]])
    above = (z > full) & falling
    index = np.arange(x.size)
    last_not_above = np.maximum.accumulate(np.where(above, -1, index), axis=-1)
    start = np.maximum(last_not_above, 0)
    vent_holds_atmospheric = np.take_along_axis(np.broadcast_to(full, above.shape), start, axis=-1) <= z[start]
    starts_at_vent = vented_sample[start] & vent_holds_atmospheric
    return np.asarray(above & starts_at_vent, dtype=np.bool_)


def rest_grade_line(profile: PipeProfile, lengths_m: ArrayLike, delivery_level_m: ArrayLike,
                    chainage_m: ArrayLike | None = None) -> GradeLine:
    """Grade line at rest, check valves closed: no flow, so no loss anywhere.

    Hydrostatics: H(x) = delivery level, raised to z_k upstream of a vented crest k above it
    (the check valve holds the column, the air valve admits air at the summit, AWWA M51,
    *Air Valves*, 2016); downstream of such a crest the reach above the delivery level drains
    (pressure 0).  :func:`grade_line` with zero losses.
    """
    delivery = _floats(delivery_level_m)
    n_segments = _floats(lengths_m).size
    no_loss = np.zeros(delivery.shape + (n_segments,))
    return grade_line(profile, lengths_m, no_loss, no_loss, delivery, chainage_m)


# --------------------------------------------------------------------------- results
@dataclass(frozen=True, eq=False)
class OperatingLosses:
    """One operating point as the profile needs it: its scenario and the main's losses there.

    ``friction_m``/``minor_m`` shape ``(n_segments,)`` (delivery segments in flow order).
    """

    label: str
    static: StaticCase
    pipe: PipeState
    flow_m3_s: float
    delivery_level_m: float
    friction_m: FloatArray
    minor_m: FloatArray


@dataclass(frozen=True, eq=False)
class ProfileLine:
    """The grade line of one operating point or of the main at rest (``pipe`` is ``None`` at rest).

    Arrays shape ``(n_x,)`` on the chainages of the :class:`ProfileResult`.
    """

    label: str
    static: StaticCase
    pipe: PipeState | None
    flow_m3_s: float
    control_index: int
    control_chainage_m: float
    grade_line_m: FloatArray
    pressure_head_m: FloatArray
    pressure_pa: FloatArray

    @property
    def control(self) -> str:
        """``"delivery"`` or ``"crest at 600 m"``."""
        if self.control_index == DELIVERY_CONTROL:
            return "delivery"
        return f"crest at {plain_number(self.control_chainage_m)} m"

    def to_json_dict(self) -> dict[str, Any]:
        return {"label": self.label, "static": self.static, "pipe": self.pipe, "flow_m3_s": self.flow_m3_s,
                "control": self.control,
                "control_chainage_m": None if math.isnan(self.control_chainage_m) else self.control_chainage_m,
                "grade_line_m": self.grade_line_m.tolist(), "pressure_m": self.pressure_head_m.tolist()}


@dataclass(frozen=True, eq=False)
class ProfileResult:
    """The main's profile with the grade lines at the operating points and at rest.

    ``chainage_m``/``elevation_m`` shape ``(n_x,)``; ``air_valve_chainage_m`` shape ``(n_vented,)``;
    ``segment_start_m``/``segment_end_m`` shape ``(n_segments,)``.  ``segment_rating_pa`` is the
    pressure rating of each segment (PN or allowable operating pressure of its pipe series, gauge),
    NaN where the catalogue gives none; ``None`` when not looked up.  ``density_kg_m3`` and
    ``gravity_m_s2`` are those the pressures were computed with.
    """

    chainage_m: FloatArray
    elevation_m: FloatArray
    air_valve_chainage_m: FloatArray
    segment_start_m: FloatArray
    segment_end_m: FloatArray
    scenarios: tuple[ProfileLine, ...]
    at_rest: tuple[ProfileLine, ...]
    segment_rating_pa: FloatArray | None = None
    density_kg_m3: float = math.nan
    gravity_m_s2: float = STANDARD_GRAVITY_M_S2

    def rating_envelope(self) -> tuple[FloatArray, FloatArray]:
        """(chainage, head) of the highest grade line each segment's rating allows: pipe elevation
        plus the rating as a head of the fluid, z + p_rating/(ρ g) (hydrostatics).

        Segments follow each other along the chainage, so the line steps at a boundary where
        the rating changes; a segment without a known rating leaves a gap (one NaN point).
        Empty without ratings.
        """
        rating = self.segment_rating_pa
        if rating is None or not len(rating):
            return np.zeros(0), np.zeros(0)
        rho_g = self.density_kg_m3 * self.gravity_m_s2
        xs: list[FloatArray] = []
        heads: list[FloatArray] = []
        for start, end, pa in zip(self.segment_start_m, self.segment_end_m, rating, strict=True):
            inside = (self.chainage_m >= start) & (self.chainage_m <= end)
            if not (math.isfinite(float(pa)) and inside.any()):
                xs.append(np.array([math.nan]))
                heads.append(np.array([math.nan]))
            else:
                xs.append(self.chainage_m[inside])
                heads.append(self.elevation_m[inside] + float(pa) / rho_g)
        return np.concatenate(xs), np.concatenate(heads)

    def to_json_dict(self) -> dict[str, Any]:
        """Plain lists and numbers for a JSON document."""
        return {"chainage_m": self.chainage_m.tolist(), "elevation_m": self.elevation_m.tolist(),
                "air_valve_chainage_m": self.air_valve_chainage_m.tolist(),
                "scenarios": [line.to_json_dict() for line in self.scenarios],
                "at_rest": [line.to_json_dict() for line in self.at_rest]}


def _lines(profile: PipeProfile, grade: GradeLine, labels: Sequence[tuple[str, StaticCase, PipeState | None, float]],
           density_kg_m3: float, gravity_m_s2: float) -> tuple[ProfileLine, ...]:
    pressure_pa = density_kg_m3 * gravity_m_s2 * grade.pressure_head_m
    out = []
    for i, (label, static, pipe, flow) in enumerate(labels):
        control = int(grade.control_index[i])
        out.append(ProfileLine(
            label=label, static=static, pipe=pipe, flow_m3_s=flow, control_index=control,
            control_chainage_m=math.nan if control == DELIVERY_CONTROL else float(profile.chainage_m[control]),
            grade_line_m=grade.head_m[i], pressure_head_m=grade.pressure_head_m[i], pressure_pa=pressure_pa[i]))
    return tuple(out)


def profile_result(profile: PipeProfile, lengths_m: ArrayLike, operating: Sequence[OperatingLosses],
                   rest_delivery_level_m: Mapping[StaticCase, float], density_kg_m3: float,
                   gravity_m_s2: float = STANDARD_GRAVITY_M_S2) -> ProfileResult:
    """Grade lines of all operating points (one vectorised pass) and at rest, on common chainages.

    ``rest_delivery_level_m``: the delivery level at rest per static extreme (``"max"``: the
    high level, ``"min"``: the low level).  Pressures in Pa are p = ρ g h (hydrostatics).
    """
    lengths = _floats(lengths_m)
    x = sample_chainages(profile, lengths)
    n_segments = lengths.size
    if operating:
        friction = np.stack([_floats(op.friction_m) for op in operating]).reshape(len(operating), n_segments)
        minor = np.stack([_floats(op.minor_m) for op in operating]).reshape(len(operating), n_segments)
        levels = np.array([op.delivery_level_m for op in operating], dtype=np.float64)
        grade = grade_line(profile, lengths, friction, minor, levels, x)
        scenarios = _lines(profile, grade, [(op.label, op.static, op.pipe, op.flow_m3_s) for op in operating],
                           density_kg_m3, gravity_m_s2)
    else:
        scenarios = ()
    rest_cases = list(rest_delivery_level_m.items())
    if rest_cases:
        rest = rest_grade_line(profile, lengths, np.array([level for _, level in rest_cases]), x)
        at_rest = _lines(profile, rest, [(f"at rest, delivery {'high' if s == 'max' else 'low'}", s, None, 0.0)
                                         for s, _ in rest_cases], density_kg_m3, gravity_m_s2)
    else:
        at_rest = ()
    start, end = segment_chainages(lengths)
    return ProfileResult(chainage_m=x, elevation_m=profile_elevation(profile, x),
                         air_valve_chainage_m=profile.chainage_m[profile.vented_index],
                         segment_start_m=start, segment_end_m=end, scenarios=scenarios, at_rest=at_rest,
                         density_kg_m3=density_kg_m3, gravity_m_s2=gravity_m_s2)


# --------------------------------------------------------------------------- findings data
@dataclass(frozen=True)
class LowPressure:
    """The lowest gauge pressure of one line where it is below atmospheric (m of fluid, Pa)."""

    label: str
    static: StaticCase
    pipe: PipeState | None
    chainage_m: float
    pressure_head_m: float
    pressure_pa: float
    column_separation: bool


def low_pressures(result: ProfileResult, atmospheric_head_m: float, vapour_head_m: float) -> tuple[LowPressure, ...]:
    """Lines (operating and at rest) whose lowest pressure is below 0 gauge, with its chainage.

    Sub-atmospheric pressure in a full pipe risks air entry at joints and, where the
    absolute pressure head p + h_atm falls to the vapour pressure head h_v, column separation
    (Wylie & Streeter, *Fluid Transients in Systems*, 1993, ch. on column separation).
    ``column_separation`` is p_min + h_atm ≤ h_v.  The first chainage of the lowest value wins.
    """
    out = []
    for line in result.scenarios + result.at_rest:
        i = int(np.argmin(line.pressure_head_m))
        lowest = float(line.pressure_head_m[i])
        if lowest < 0.0:
            out.append(LowPressure(label=line.label, static=line.static, pipe=line.pipe,
                                   chainage_m=float(result.chainage_m[i]), pressure_head_m=lowest,
                                   pressure_pa=float(line.pressure_pa[i]),
                                   column_separation=lowest + atmospheric_head_m <= vapour_head_m))
    return tuple(out)


@dataclass(frozen=True)
class SegmentPressurePeak:
    """The highest pressure on one segment, operating and at rest, against its rating (Pa).

    ``rating_pa`` NaN = unknown (never exceeded).  Chainages are where each peak occurs.
    """

    segment: int
    rating_pa: float
    operating_pa: float
    operating_chainage_m: float
    operating_label: str
    rest_pa: float
    rest_chainage_m: float
    rest_label: str

    @property
    def operating_exceeds(self) -> bool:
        return self.operating_pa > self.rating_pa

    @property
    def rest_exceeds(self) -> bool:
        return self.rest_pa > self.rating_pa


def _peak(lines: tuple[ProfileLine, ...], inside: BoolArray, x: FloatArray) -> tuple[float, float, str]:
    """Largest pressure over ``lines`` within the sample mask ``inside``: (Pa, chainage, label)."""
    if not lines or not inside.any():
        return math.nan, math.nan, ""
    table = np.where(inside, np.stack([line.pressure_pa for line in lines]), -np.inf)
    row, col = np.unravel_index(int(np.argmax(table)), table.shape)
    return float(table[row, col]), float(x[col]), lines[row].label


def segment_pressure_peaks(result: ProfileResult, rating_pa: ArrayLike) -> tuple[SegmentPressurePeak, ...]:
    """Highest operating pressure and pressure at rest on each segment (both ends included).

    ``rating_pa`` shape ``(n_segments,)``: the pipe's allowable pressure (e.g. its PN), NaN
    where unknown.  Pressures are gauge, p = ρ g (H − z) (hydrostatics).
    """
    rating = _floats(rating_pa)
    x = result.chainage_m
    out = []
    for i, (start, end) in enumerate(zip(result.segment_start_m, result.segment_end_m, strict=True)):
        inside = (x >= start) & (x <= end)
        op_pa, op_x, op_label = _peak(result.scenarios, inside, x)
        rest_pa, rest_x, rest_label = _peak(result.at_rest, inside, x)
        out.append(SegmentPressurePeak(segment=i, rating_pa=float(rating[i]), operating_pa=op_pa,
                                       operating_chainage_m=op_x, operating_label=op_label, rest_pa=rest_pa,
                                       rest_chainage_m=rest_x, rest_label=rest_label))
    return tuple(out)
