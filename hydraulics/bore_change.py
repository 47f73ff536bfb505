"""Loss coefficients of fittings between two bores: reducers and expanders.

A reducer (contraction) takes the flow from a larger bore D_large into a smaller bore
D_small; an expander (enlargement) takes it from the smaller into the larger.  Both are
sudden (included cone angle θ = 180°) or conical (0° < θ < 180°).  Their K comes from the
contraction and enlargement formulas of Crane Technical Paper 410 (2009), Appendix A
("sudden and gradual contraction", "sudden and gradual enlargement"), with the diameter
ratio β = D_small / D_large ≤ 1.

Reference velocity
------------------
The K of :func:`contraction_k` and :func:`enlargement_k` is Crane's K₁: it refers to the
mean velocity in the SMALL bore, v_small (h = K₁ v_small² / 2g), for both directions of
flow.  Crane also gives K₂ = K₁ / β⁴ for the large-bore velocity.  PumpSketch adds every
fitting's K to the segment that lists it, referred to that segment's own velocity, so
:func:`bore_change_k` converts K₁ with :func:`k_referred_to_diameter`.

Where a transition sits
-----------------------
A reducer or expander row belongs to the segment downstream of it: the fitting sits at
the INLET of the segment that lists it, and its "other bore" is the upstream bore.  A
reducer therefore has its other bore larger than the segment's bore, an expander smaller.
Two bores within :data:`BORE_MATCH_TOLERANCE` (1 %) of each other count as the same bore.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics.model import ModelError
from hydraulics.validation import check

BoreChangeKind = Literal["reducer", "expander"]
"""Catalogue methods of the fittings between bores: contraction and enlargement."""

BORE_CHANGE_KINDS: tuple[BoreChangeKind, ...] = ("reducer", "expander")
"""The kinds of :data:`BoreChangeKind`, in display order."""

SUDDEN_ANGLE_DEG = 180.0
"""Included angle of a sudden (square-shouldered) change of bore [°]."""

CRANE_ANGLE_LIMIT_DEG = 45.0
"""Cone angle up to which Crane's first formula applies (θ ≤ 45°); the second above it [°]."""

BORE_MATCH_TOLERANCE = 0.01
"""Two bores whose difference is at most this fraction of the larger count as equal (1 %)."""


# --------------------------------------------------------------------------- input checks
def _diameters(small_diameter_m: ArrayLike, large_diameter_m: ArrayLike) -> tuple[NDArray[np.float64], ...]:
    small = np.asarray(small_diameter_m, dtype=np.float64)
    large = np.asarray(large_diameter_m, dtype=np.float64)
    if not np.all(np.isfinite(small)) or np.any(small <= 0.0):
        raise ModelError("small_diameter_m", "must be a finite diameter greater than 0", small_diameter_m)
    if not np.all(np.isfinite(large)) or np.any(large < small):
        raise ModelError("large_diameter_m", "must be finite and not smaller than the small diameter",
                         large_diameter_m)
    return small, large


def _cone_angle(angle_deg: ArrayLike) -> tuple[NDArray[np.float64], NDArray[np.bool_]]:
    """sin(θ/2), and where Crane's first (θ ≤ 45°) formula applies."""
    angle = np.asarray(angle_deg, dtype=np.float64)
    if not np.all(np.isfinite(angle)) or np.any(angle <= 0.0) or np.any(angle > SUDDEN_ANGLE_DEG):
        raise ModelError("angle_deg", "included cone angle must be more than 0° and at most 180°", angle_deg)
    sin_half = np.asarray(np.sin(np.radians(angle) / 2.0), dtype=np.float64)
    return sin_half, np.asarray(angle <= CRANE_ANGLE_LIMIT_DEG)


def _result(k: NDArray[np.float64]) -> float | NDArray[np.float64]:
    return float(k) if k.ndim == 0 else k


# --------------------------------------------------------------------------- Crane K₁
def contraction_k(
    small_diameter_m: ArrayLike, large_diameter_m: ArrayLike, angle_deg: ArrayLike = SUDDEN_ANGLE_DEG,
) -> float | NDArray[np.float64]:
    r"""K of a contraction (reducer), referred to the velocity in the SMALL bore.

    Crane Technical Paper 410 (2009), Appendix A, sudden and gradual contraction, with
    β = D_small / D_large and θ the included cone angle:

    .. math::
        K_1 = 0.8 \sin\tfrac{\theta}{2}\,(1 - \beta^2)            \qquad \theta \le 45^\circ

        K_1 = 0.5 \sqrt{\sin\tfrac{\theta}{2}}\,(1 - \beta^2)     \qquad 45^\circ < \theta \le 180^\circ

    A sudden contraction is θ = 180°: K₁ = 0.5 (1 − β²).  h = K₁ v_small² / (2g); Crane's
    K₂ = K₁ / β⁴ refers to the large bore.  The friction along the cone is not included.

    Parameters
    ----------
    small_diameter_m, large_diameter_m : float or array_like
        Internal diameters of the outlet (small) and inlet (large) bores [m], D_large ≥ D_small > 0.
    angle_deg : float or array_like
        Included cone angle θ [°], 0 < θ ≤ 180 (default 180: sudden).

    Returns
    -------
    float or numpy.ndarray
        K₁ [-]; a float when every input is a scalar.

    Examples
    --------
    >>> round(contraction_k(0.1, 0.2), 6)            # sudden, β = 0.5: 0.5 × 0.75
    0.375
    >>> round(contraction_k(0.1, 0.2, 30.0), 6)      # 0.8 sin 15° × 0.75
    0.155291
    """
    small, large = _diameters(small_diameter_m, large_diameter_m)
    sin_half, first_formula = _cone_angle(angle_deg)
    area_term = 1.0 - (small / large) ** 2
    k = np.where(first_formula, 0.8 * sin_half * area_term, 0.5 * np.sqrt(sin_half) * area_term)
    return _result(np.asarray(k, dtype=np.float64))


def enlargement_k(
    small_diameter_m: ArrayLike, large_diameter_m: ArrayLike, angle_deg: ArrayLike = SUDDEN_ANGLE_DEG,
) -> float | NDArray[np.float64]:
    r"""K of an enlargement (expander), referred to the velocity in the SMALL bore.

    Crane Technical Paper 410 (2009), Appendix A, sudden and gradual enlargement, with
    β = D_small / D_large and θ the included cone angle:

    .. math::
        K_1 = 2.6 \sin\tfrac{\theta}{2}\,(1 - \beta^2)^2     \qquad \theta \le 45^\circ

        K_1 = (1 - \beta^2)^2                             \qquad 45^\circ < \theta \le 180^\circ

    A sudden enlargement (θ = 180°) is the Borda–Carnot loss (1 − β²)².  h = K₁ v_small² / (2g);
    Crane's K₂ = K₁ / β⁴ refers to the large bore.  The friction along the cone is not included.

    Parameters
    ----------
    small_diameter_m, large_diameter_m : float or array_like
        Internal diameters of the inlet (small) and outlet (large) bores [m], D_large ≥ D_small > 0.
    angle_deg : float or array_like
        Included cone angle θ [°], 0 < θ ≤ 180 (default 180: sudden).

    Returns
    -------
    float or numpy.ndarray
        K₁ [-]; a float when every input is a scalar.

    Examples
    --------
    >>> round(enlargement_k(0.1, 0.2), 6)            # sudden, β = 0.5: 0.75²
    0.5625
    >>> round(enlargement_k(0.1, 0.2, 20.0), 6)      # 2.6 sin 10° × 0.75²
    0.25396
    """
    small, large = _diameters(small_diameter_m, large_diameter_m)
    sin_half, first_formula = _cone_angle(angle_deg)
    area_term = (1.0 - (small / large) ** 2) ** 2
    k = np.where(first_formula, 2.6 * sin_half * area_term, area_term)
    return _result(np.asarray(k, dtype=np.float64))


def k_referred_to_diameter(
    k: ArrayLike, reference_diameter_m: ArrayLike, target_diameter_m: ArrayLike,
) -> float | NDArray[np.float64]:
    r"""The same loss coefficient referred to the velocity in another bore.

    Equal head loss, K_ref v_ref² / 2g = K_target v_target² / 2g, with continuity
    v ∝ 1/D² for one flow, gives

    .. math:: K_\text{target} = K_\text{ref}\,\left(\frac{D_\text{target}}{D_\text{ref}}\right)^4

    (the change of velocity basis of a loss coefficient, as in Crane TP-410's K₂ = K₁/β⁴).

    >>> round(k_referred_to_diameter(0.5625, 0.1, 0.2), 6)    # Crane's K₂ = K₁ / β⁴, β = 0.5
    9.0
    """
    ref = np.asarray(reference_diameter_m, dtype=np.float64)
    target = np.asarray(target_diameter_m, dtype=np.float64)
    if not np.all(np.isfinite(ref)) or np.any(ref <= 0.0):
        raise ModelError("reference_diameter_m", "must be a finite diameter greater than 0", reference_diameter_m)
    if not np.all(np.isfinite(target)) or np.any(target <= 0.0):
        raise ModelError("target_diameter_m", "must be a finite diameter greater than 0", target_diameter_m)
    return _result(np.asarray(np.asarray(k, dtype=np.float64) * (target / ref) ** 4, dtype=np.float64))


# --------------------------------------------------------------------------- fitting rows
def bores_match(first_diameter_m: float, second_diameter_m: float) -> bool:
    """True when two bores differ by at most :data:`BORE_MATCH_TOLERANCE` (1 %) of the larger.

    >>> bores_match(0.200, 0.1985), bores_match(0.200, 0.196)
    (True, False)
    """
    return abs(first_diameter_m - second_diameter_m) <= BORE_MATCH_TOLERANCE * max(first_diameter_m, second_diameter_m)


def bore_change_k(
    kind: str,
    segment_diameter_m: float,
    other_diameter_m: float | None,
    angle_deg: float | None,
    field_path: str = "fitting",
) -> float:
    """K of one reducer or expander, referred to the velocity of the segment that lists it.

    The fitting sits at the inlet of that segment; ``other_diameter_m`` is the bore on
    its upstream side (the caller passes the previous segment's bore in flow order when
    the row gives none).

    - ``"reducer"``: flow from the larger other bore into the smaller segment bore;
      K = :func:`contraction_k` (Crane TP-410), whose small-bore velocity is the
      segment's, so no conversion is needed.
    - ``"expander"``: flow from the smaller other bore into the larger segment bore;
      K = :func:`enlargement_k` (Crane TP-410) referred to the segment's velocity by
      :func:`k_referred_to_diameter`: K_seg = K₁ (D_seg / D_other)⁴.

    Bores within 1 % of each other (:func:`bores_match`) give K = 0.  ``angle_deg`` is
    the included cone angle; ``None`` means sudden (180°).

    Raises
    ------
    ModelError
        ``{field_path}.fitting_id`` for a kind that is not a reducer or expander, or whose
        direction contradicts the bores (a reducer into a larger bore, an expander into a
        smaller one); ``{field_path}.other_diameter`` for a missing or out-of-range other bore;
        ``{field_path}.angle_deg`` for a cone angle outside 0–180°; ``internal_diameter``
        for a segment bore outside the allowed range.

    >>> round(bore_change_k("expander", 0.2, 0.1, None), 6)    # sudden, K₁ = 0.5625, × 2⁴
    9.0
    >>> round(bore_change_k("reducer", 0.1, 0.2, None), 6)     # sudden, K₁ = 0.375
    0.375
    """
    if kind not in BORE_CHANGE_KINDS:
        raise ModelError(f"{field_path}.fitting_id", f"must be a reducer or an expander; got {kind!r}", kind)
    segment = check("segment.internal_diameter_m", segment_diameter_m, "internal_diameter")
    if other_diameter_m is None:
        raise ModelError(
            f"{field_path}.other_diameter",
            f"a {kind} needs the bore on its upstream side: give it, or place the segment after the one it joins",
        )
    other = check("segment.internal_diameter_m", other_diameter_m, f"{field_path}.other_diameter")
    if angle_deg is None:
        angle = SUDDEN_ANGLE_DEG
    else:
        if isinstance(angle_deg, bool) or not isinstance(angle_deg, (int, float)) or not math.isfinite(angle_deg) \
                or not 0.0 < angle_deg <= SUDDEN_ANGLE_DEG:
            raise ModelError(
                f"{field_path}.angle_deg",
                f"included cone angle must be more than 0° and at most 180° (none for sudden); got {angle_deg!r}",
                angle_deg,
            )
        angle = float(angle_deg)
    if bores_match(segment, other):
        return 0.0
    if kind == "reducer":
        if other < segment:
            raise ModelError(
                f"{field_path}.fitting_id",
                f"a reducer takes the flow from a larger bore into a smaller one, but the upstream bore "
                f"{other * 1000:g} mm is smaller than this segment's {segment * 1000:g} mm; use an expander",
                kind,
            )
        return float(contraction_k(segment, other, angle))
    if other > segment:
        raise ModelError(
            f"{field_path}.fitting_id",
            f"an expander takes the flow from a smaller bore into a larger one, but the upstream bore "
            f"{other * 1000:g} mm is larger than this segment's {segment * 1000:g} mm; use a reducer",
            kind,
        )
    return float(k_referred_to_diameter(enlargement_k(other, segment, angle), other, segment))


def transition_angle_deg(
    entry_angle_deg: float | None, row_angle_deg: float | None, kind: str, field_path: str = "fitting",
) -> float:
    """The included cone angle [°] to use for a reducer or expander row (180 = sudden).

    ``entry_angle_deg`` is the angle fixed by the catalogue entry (180° for the sudden
    entries, ``None`` for the conical ones, whose angle the row must give);
    ``row_angle_deg`` is the row's own included cone angle.

    Raises
    ------
    ModelError
        ``{field_path}.angle_deg`` when a conical entry has no angle on its row, or a sudden
        entry is given a different angle on its row.

    >>> transition_angle_deg(None, 20.0, "reducer"), transition_angle_deg(180.0, None, "reducer")
    (20.0, 180.0)
    """
    if entry_angle_deg is None:
        if row_angle_deg is None:
            raise ModelError(
                f"{field_path}.angle_deg",
                f"a conical {kind} needs its included cone angle, more than 0° and at most 180°",
            )
        return row_angle_deg
    if row_angle_deg is not None and row_angle_deg != entry_angle_deg:
        raise ModelError(
            f"{field_path}.angle_deg",
            f"this {kind} is sudden; choose the conical {kind} to give a cone angle "
            f"(got {row_angle_deg!r}°)",
            row_angle_deg,
        )
    return entry_angle_deg


# --------------------------------------------------------------------------- junction check
@dataclass(frozen=True)
class TransitionRow:
    """One fitting row as the junction check sees it.

    ``kind`` is the catalogue method of the row's fitting (``"reducer"``, ``"expander"``
    or any other method, which the check ignores); ``other_diameter_m`` the bore on its
    upstream side (``None`` = the previous segment's bore); ``count`` the row's count
    (rows of count 0 are ignored).
    """

    kind: str
    other_diameter_m: float | None = None
    count: int = 1


@dataclass(frozen=True)
class PathSegment:
    """One segment of a flow path: its index in the project, its bore and its fitting rows."""

    index: int
    internal_diameter_m: float
    fittings: tuple[TransitionRow, ...] = ()


@dataclass(frozen=True)
class BoreJunction:
    """A junction of two consecutive segments whose bores differ with no transition fitting."""

    upstream_index: int
    downstream_index: int
    upstream_diameter_m: float
    downstream_diameter_m: float

    @property
    def needed_kind(self) -> BoreChangeKind:
        """The fitting that belongs at this junction: a reducer into a smaller bore, else an expander."""
        return "reducer" if self.downstream_diameter_m < self.upstream_diameter_m else "expander"


def _has_transition(upstream_m: float, downstream: PathSegment) -> bool:
    needed = "reducer" if downstream.internal_diameter_m < upstream_m else "expander"
    for row in downstream.fittings:
        if row.kind != needed or row.count <= 0:
            continue
        if row.other_diameter_m is None or bores_match(row.other_diameter_m, upstream_m):
            return True
    return False


def unfitted_bore_changes(path: Iterable[PathSegment]) -> tuple[BoreJunction, ...]:
    """The junctions along one flow path where the bore changes with no reducer or expander.

    ``path`` lists the segments in flow order.  A junction is reported when the two bores
    differ by more than 1 % (:func:`bores_match`) and the downstream segment has no row of
    the fitting the change needs — a reducer where the bore gets smaller, an expander where
    it gets larger — whose other bore is the upstream bore within 1 % (an other bore of
    ``None`` stands for the upstream bore).  A transition of the wrong kind, or sized for
    another bore, does not count.

    >>> path = [PathSegment(0, 0.15), PathSegment(1, 0.25), PathSegment(2, 0.25)]
    >>> unfitted_bore_changes(path)
    (BoreJunction(upstream_index=0, downstream_index=1, upstream_diameter_m=0.15, downstream_diameter_m=0.25),)
    >>> unfitted_bore_changes([PathSegment(0, 0.15), PathSegment(1, 0.25, (TransitionRow("expander"),))])
    ()
    """
    segments = list(path)
    found: list[BoreJunction] = []
    for upstream, downstream in zip(segments, segments[1:], strict=False):
        up, down = upstream.internal_diameter_m, downstream.internal_diameter_m
        if bores_match(up, down) or _has_transition(up, downstream):
            continue
        found.append(BoreJunction(upstream.index, downstream.index, up, down))
    return tuple(found)
