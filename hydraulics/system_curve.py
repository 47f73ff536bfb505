"""System curves: the head the pipework demands across the flow range.

The total head required at flow Q (the head balance of a pumped system, e.g. Karassik et
al., *Pump Handbook*, 4th ed., ch. on system curves) is

    H(Q) = H_static + Σ_segments h_f,i(Q) + Σ_segments K_i v_i² / (2 g)

with the friction loss h_f of each segment by Darcy–Weisbach and the Colebrook–White
friction factor (or Hazen–Williams where the project chooses it), and the minor losses
with every K referred to the velocity of its own segment.

Pipework roles (flow continuity in a branched network, e.g. Karassik et al., *Pump
Handbook*, 4th ed., ch. on parallel operation): the common pipework (``carries ==
"station"``: suction header, manifold, rising main) carries the station flow Q; each
running pump's own branch (``carries == "pump"``) carries that pump's share Q/N, and the
branches of idle pumps carry nothing.  The head the N running pumps must produce is then

    H(Q, N) = H_static + L_station(Q) + L_branch(Q/N)

where L_branch is the loss through ONE pump's suction and discharge branch (the N
branches are identical and in parallel, so the loss across them equals the loss of one).
The system curves drawn for the station are those of the common pipework,
H_static + L_station(Q); the pump-set curve as it acts at the manifold is the plain
curve less L_branch(Q/N).

Crest control (a profile with vented summits): where an air valve holds a summit k of the
main at atmospheric pressure, the pumps must lift to that summit, so

    H(Q, N) = max(H_delivery(Q, N), max_k H_k(Q, N)),
    H_k = z_k − z_suction + L_suction(Q, N) + L_discharge branch(Q/N) + L_main(0 → x_k, Q)

(the energy equation to each control; see :func:`hydraulics.main_profile.crest_heads`).
Written against the head to the delivery, H_k − H_delivery = (z_k − H_del) − L_main(x_k →
end, Q): the crest lifts the head by the summit's height above the delivery level less the
loss beyond the summit.  The loss beyond each summit is a weighted sum over the delivery
segments (friction pro rata of the length past x_k, the whole minor loss of the segments
starting after it), precomputed as constants like the totals, so no per-segment loss is
formed over the flows.

:func:`prepare_system` turns a project into arrays of segment properties once;
:class:`SystemHydraulics` then evaluates heads for any array of flows in one vectorised
pass over (flows × segments) — no Python loop over flow points.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace
from functools import cached_property, lru_cache

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics import catalogue, fittings, friction
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.main_profile import DELIVERY_CONTROL, loss_weights
from hydraulics.model import (
    Carries,
    ModelError,
    PipeState,
    PressurisedDelivery,
    Project,
    Segment,
    Site,
    StaticCase,
    TankDelivery,
)
from hydraulics.results import FloatArray, FluidProperties, SegmentResult, SystemCurve, control_label

G = STANDARD_GRAVITY_M_S2


def static_heads(site: Site, density_kg_m3: float) -> dict[str, float]:
    """Static head at both water-level extremes (m).

    maximum static = highest delivery level − lowest suction level;
    minimum static = lowest delivery level − highest suction level.
    A pressurised delivery point at elevation z needing gauge pressure p counts as a
    level of z + p/(ρ g) (hydrostatics), the same at both extremes.

    >>> from hydraulics.model import Site, TankDelivery
    >>> site = Site(10.0, 12.0, TankDelivery(50.0, 53.0), pump_datum_m=9.0, design_flow_m3_s=0.03)
    >>> static_heads(site, 1000.0)
    {'min': 38.0, 'max': 43.0}
    """
    delivery = site.delivery
    if isinstance(delivery, TankDelivery):
        delivery_low, delivery_high = delivery.level_low_m, delivery.level_high_m
    elif isinstance(delivery, PressurisedDelivery):
        level = delivery.elevation_m + delivery.pressure_pa / (density_kg_m3 * G)
        delivery_low = delivery_high = level
    else:  # pragma: no cover - the model has two kinds only
        raise ModelError("site.delivery", "must be a tank or a pressurised point")
    return {
        "min": float(delivery_low - site.suction_level_high_m),
        "max": float(delivery_high - site.suction_level_low_m),
    }


@dataclass(frozen=True, eq=False)
class _LossConstants:
    """What :meth:`SystemHydraulics.losses` needs per segment, independent of the flow.

    With c_i = 1 / (n_i π D_i²/4) the velocity per unit station flow: Re per unit flow
    c_i D_i / ν, ε/D new and aged, the Darcy–Weisbach weight c_i² L_i / D_i, the minor-loss
    sum Σ K_i c_i², and the Hazen–Williams per-flow sums (zero for Darcy–Weisbach).
    """

    minor_sum: float
    reynolds_per_flow: np.ndarray
    relative_roughness_new: np.ndarray
    relative_roughness_aged: np.ndarray
    friction_weight: np.ndarray
    hw_sum_new: float
    hw_sum_aged: float


@dataclass(frozen=True, eq=False)
class CrestTerms:
    """The vented summits of the main that can govern, and what :class:`SystemHydraulics` needs of them.

    Shapes ``(n_vented,)``: ``profile_index`` (index of the point in the project's
    profile), ``chainage_m``, ``elevation_m``; ``height_above_delivery_m[case]`` is
    z_k − H_del of that static extreme (``"min"``: the low delivery level, ``"max"``: the
    high one).  ``beyond`` holds the loss constants of the main beyond each summit.  Only
    summits above the delivery level of at least one extreme are kept (a summit below the
    delivery level never governs: the loss beyond it is never negative).
    """

    profile_index: NDArray[np.int64]
    chainage_m: FloatArray
    elevation_m: FloatArray
    height_above_delivery_m: Mapping[str, FloatArray]
    beyond: tuple[_LossConstants, ...]


@dataclass(frozen=True, eq=False)
class SystemHydraulics:
    """Segment properties as arrays, ready for vectorised evaluation.

    Every per-segment array has shape ``(n_segments,)``.  Flows passed to the methods
    are the total station flow in m³/s, of any shape ``S``; results have shape ``S``
    (totals) or ``S + (n_segments,)`` (per segment).  ``pumps_running`` (N ≥ 1, a scalar
    or an array broadcasting with the flows) sets the flow Q/N of the pump-branch
    segments; the common pipework carries Q whatever N is.

    ``crest`` (``None`` without a profile or without a vented summit above the delivery)
    adds crest control to :meth:`head` and to the system curves.  The static heads passed
    to the methods are those of ``static_head_m`` (the heads to the delivery); for crest
    control each is matched to its water levels (see :meth:`crest_excess`).
    """

    static_head_m: Mapping[str, float]
    segment_names: tuple[str, ...]
    sides: tuple[str, ...]
    carries: tuple[Carries, ...]
    method: str
    diameter_m: np.ndarray
    length_m: np.ndarray
    parallel_pipes: np.ndarray
    roughness_new_m: np.ndarray
    roughness_aged_m: np.ndarray
    hw_c_new: np.ndarray
    hw_c_aged: np.ndarray
    k_total: np.ndarray
    suction_mask: np.ndarray
    kinematic_viscosity_m2_s: float
    crest: CrestTerms | None = None

    @property
    def n_segments(self) -> int:
        return len(self.segment_names)

    @cached_property
    def branch_mask(self) -> NDArray[np.bool_]:
        """True for the segments of each pump's own branch (``carries == "pump"``)."""
        return np.array([c == "pump" for c in self.carries], dtype=bool).reshape(self.n_segments)

    @cached_property
    def has_branches(self) -> bool:
        """Whether any segment belongs to the pumps' own branches."""
        return bool(self.branch_mask.any())

    def segment_flows(self, flow_m3_s: ArrayLike, pumps_running: ArrayLike = 1) -> FloatArray:
        """Flow through each segment (all its parallel pipes), shape ``S + (n_segments,)``.

        Continuity at the manifold: the common pipework carries the station flow Q, each
        pump-branch segment Q/N with N pumps running.  Without branches the result is
        ``Q[..., None]`` (shape ``S + (1,)``), which broadcasts over the segments.
        """
        q = np.asarray(flow_m3_s, dtype=float)[..., None]
        if not self.has_branches:
            return q
        per_pump = q / np.asarray(pumps_running, dtype=float)[..., None]
        return np.where(self.branch_mask, per_pump, q)

    def segment_velocities(self, flow_m3_s: ArrayLike, pumps_running: ArrayLike = 1) -> FloatArray:
        """Mean velocity in each pipe of each segment, v = Q_seg / (n_parallel · π D²/4).

        Q_seg is the segment's flow (:meth:`segment_flows`): the station flow in the
        common pipework, the flow of one of the N running pumps in a pump branch.
        """
        area = np.pi * self.diameter_m**2 / 4.0
        velocity: FloatArray = self.segment_flows(flow_m3_s, pumps_running) / (self.parallel_pipes * area)
        return velocity

    def segment_friction(self, flow_m3_s: ArrayLike, aged: bool,
                         pumps_running: ArrayLike = 1) -> friction.PipeFriction:
        """Velocity, Reynolds number, friction factor and friction loss per segment.

        Each segment at its own flow (:meth:`segment_flows`).
        """
        q = self.segment_flows(flow_m3_s, pumps_running)
        if self.method == "hazen_williams":
            c = self.hw_c_aged if aged else self.hw_c_new
            return friction.hazen_williams(q, self.diameter_m, self.length_m, c, self.parallel_pipes,
                                           kinematic_viscosity_m2_s=self.kinematic_viscosity_m2_s)
        eps = self.roughness_aged_m if aged else self.roughness_new_m
        return friction.darcy_weisbach(q, self.diameter_m, self.length_m, eps,
                                       self.kinematic_viscosity_m2_s, self.parallel_pipes)

    def losses(self, flow_m3_s: ArrayLike, aged: ArrayLike) -> tuple[FloatArray, FloatArray]:
        """Total friction and total minor loss of the common pipework at station flow (shape ``S``).

        The common pipework is every ``"station"`` segment (all segments when the project
        has no pump branches); the pump branches are in :meth:`branch_loss`.

        The sums over segments are taken without forming per-segment losses:
        with the velocity per unit flow c_i = 1 / (n_i π D_i²/4), v_i = c_i Q, so

        * Darcy–Weisbach: Σ f_i (L_i/D_i) v_i²/2g = (Q|Q|/2g) · Σ_i f_i c_i² L_i/D_i,
          the weighted sum of the friction factors taken a block of flows at a time
          (:func:`hydraulics.friction.darcy_weighted_sums`);
        * Hazen–Williams: Σ 10.67 L_i (Q/n_i)^1.852 / (C_i^1.852 D_i^4.8704)
          = Q^1.852 · Σ_i (per-segment constant), no per-element work;
        * minor losses: Σ K_i v_i²/2g = (Q|Q|/2g) · Σ_i K_i c_i².

        A mixed ``aged`` array picks each flow's roughness row, so new and aged pipe are
        evaluated in one pass.
        """
        return self._loss_totals(flow_m3_s, aged, self._loss_constants)

    def _loss_totals(self, flow_m3_s: ArrayLike, aged: ArrayLike,
                     k: _LossConstants) -> tuple[FloatArray, FloatArray]:
        """Friction and minor totals over the segments that ``k`` was built for."""
        q = np.asarray(flow_m3_s, dtype=float)
        aged = np.asarray(aged, dtype=bool)
        if aged.shape != q.shape:
            q, aged = np.broadcast_arrays(q, aged)
        flat = q.ravel()
        aged_flat = aged.ravel()
        n_aged = int(np.count_nonzero(aged_flat))
        q_abs_q = flat * np.abs(flat) * (0.5 / G)
        minor = q_abs_q * k.minor_sum
        if self.method == "hazen_williams":
            per_flow: float | FloatArray
            if n_aged in (0, flat.size):
                per_flow = k.hw_sum_aged if n_aged else k.hw_sum_new
            else:
                per_flow = np.where(aged_flat, k.hw_sum_aged, k.hw_sum_new)
            fric = np.sign(flat) * np.abs(flat) ** friction.HAZEN_WILLIAMS_FLOW_EXPONENT * per_flow
        else:
            if n_aged == 0:
                rr = k.relative_roughness_new
            elif n_aged == flat.size:
                rr = k.relative_roughness_aged
            else:
                rr = np.where(aged_flat[:, None], k.relative_roughness_aged, k.relative_roughness_new)
            fric = q_abs_q * friction.darcy_weighted_sums(np.abs(flat), k.reynolds_per_flow, rr, k.friction_weight)
        return fric.reshape(q.shape), minor.reshape(q.shape)

    @cached_property
    def _loss_constants(self) -> _LossConstants:
        """Per-segment constants of :meth:`losses` (the common pipework), computed once per prepared system."""
        return self._constants_for(~self.branch_mask)

    @cached_property
    def _suction_loss_constants(self) -> _LossConstants:
        """The same for the common suction segments only (:meth:`suction_loss`)."""
        return self._constants_for(self.suction_mask & ~self.branch_mask)

    @cached_property
    def _branch_loss_constants(self) -> _LossConstants:
        """The same for one pump's branch, suction and discharge (:meth:`branch_loss`)."""
        return self._constants_for(self.branch_mask)

    @cached_property
    def _branch_suction_loss_constants(self) -> _LossConstants:
        """The same for one pump's suction branch (:meth:`suction_loss`)."""
        return self._constants_for(self.suction_mask & self.branch_mask)

    def _constants_for(self, mask: NDArray[np.bool_], length_share: FloatArray | None = None,
                       minor_share: FloatArray | None = None) -> _LossConstants:
        """Constants of the segments in ``mask``; the shares (per segment, 0–1) scale each
        segment's length (friction ∝ L in Darcy–Weisbach and Hazen–Williams) and its K."""
        d, n, length = self.diameter_m[mask], self.parallel_pipes[mask], self.length_m[mask]
        k_total = self.k_total[mask]
        if length_share is not None:
            length = length * length_share[mask]
        if minor_share is not None:
            k_total = k_total * minor_share[mask]
        c = 1.0 / (n * (np.pi / 4.0) * d**2)
        if self.method == "hazen_williams":
            hw_sums = [float(np.sum(friction.HAZEN_WILLIAMS_SI_CONSTANT * length
                                    / (hw_c[mask] ** friction.HAZEN_WILLIAMS_FLOW_EXPONENT
                                       * d**friction.HAZEN_WILLIAMS_DIAMETER_EXPONENT
                                       * n**friction.HAZEN_WILLIAMS_FLOW_EXPONENT)))
                       for hw_c in (self.hw_c_new, self.hw_c_aged)]
        else:
            hw_sums = [0.0, 0.0]
        return _LossConstants(
            minor_sum=float(np.dot(k_total, c * c)),
            reynolds_per_flow=c * d / self.kinematic_viscosity_m2_s,
            relative_roughness_new=self.roughness_new_m[mask] / d,
            relative_roughness_aged=self.roughness_aged_m[mask] / d,
            friction_weight=c * c * length / d,
            hw_sum_new=hw_sums[0],
            hw_sum_aged=hw_sums[1],
        )

    def branch_loss(self, flow_per_pump_m3_s: ArrayLike, aged: ArrayLike) -> FloatArray:
        """Friction plus minor loss through one pump's own branch, suction and discharge (m).

        The same sums as :meth:`losses` (Darcy–Weisbach or Hazen–Williams friction and
        K v²/2g minor losses) over the ``"pump"`` segments, at the flow of ONE pump;
        zero without branches.  The pump-set curve at the manifold is the plain curve
        less this loss at Q/N.
        """
        fric, minor = self._loss_totals(flow_per_pump_m3_s, aged, self._branch_loss_constants)
        return fric + minor

    def head(self, flow_m3_s: ArrayLike, static_m: ArrayLike, aged: ArrayLike,
             pumps_running: ArrayLike = 1) -> FloatArray:
        """Head the running pumps must produce, H = H_static + L_station(Q) + L_branch(Q/N), elementwise.

        L_station is the friction and minor loss of the common pipework at the station
        flow Q, L_branch that of one pump's branch at Q/N (see the module description).

        With vented summits on the main (``crest``) the head is the larger of that and the
        head to each summit (crest control, see the module description): the governing
        excess of :meth:`crest_excess` is added where it is positive.
        """
        total = self.manifold_head(flow_m3_s, static_m, aged)
        if self.has_branches:
            total = total + self.branch_loss(self._per_pump(flow_m3_s, pumps_running), aged)
        return total

    def manifold_head(self, flow_m3_s: ArrayLike, static_m: ArrayLike, aged: ArrayLike) -> FloatArray:
        """Head the system needs at the manifold, H_static + L_station(Q) (+ crest control), elementwise.

        :meth:`head` without any pump's own branch: what every running pump must deliver
        at its branch's downstream end, whatever its model (pumps in parallel share this
        head; see :mod:`hydraulics.pump_set`).
        """
        fric, minor = self.losses(flow_m3_s, aged)
        total: FloatArray = np.asarray(static_m, dtype=float) + fric + minor
        if self.crest is not None:
            excess = self.crest_excess(flow_m3_s, static_m, aged)
            total = total + np.maximum(np.max(excess, axis=-1), 0.0)
        return total

    def crest_excess(self, flow_m3_s: ArrayLike, static_m: ArrayLike, aged: ArrayLike) -> FloatArray:
        """Head to each vented summit less the head to the delivery, H_k − H_D (m), shape ``S + (n_vented,)``.

        H_k − H_D = (z_k − H_del) − L_main(x_k → end, Q), the summit's height above the
        delivery level less the friction and minor loss of the main beyond it (energy
        equation to each control; the losses upstream of x_k are common to both heads).
        The delivery level belongs to the static head passed: the low level for the
        minimum static head, the high level for the maximum; a static head between them
        takes the delivery level linearly between the two (both water levels moving
        together), and where both extremes have one static head the larger height (the
        low delivery level) is taken, the side of safety.  Shape ``S + (0,)`` without
        crest terms.
        """
        fric, minor = self.crest_losses_beyond(flow_m3_s, aged)
        return self._height_above_delivery(static_m) - fric - minor

    def crest_losses_beyond(self, flow_m3_s: ArrayLike, aged: ArrayLike) -> tuple[FloatArray, FloatArray]:
        """Friction and minor loss of the main beyond each vented summit, shapes ``S + (n_vented,)``.

        The same weighted sums as :meth:`losses` (Darcy–Weisbach or Hazen–Williams and
        K v²/2g) over the station delivery segments, each weighted by its share past the
        summit (:func:`hydraulics.main_profile.loss_weights`: friction pro rata of the
        length, the minor loss of a segment wholly with the segment's start).
        """
        q = np.asarray(flow_m3_s, dtype=float)
        shape = np.broadcast_shapes(q.shape, np.shape(aged))
        if self.crest is None or not self.crest.beyond:
            empty = np.zeros(shape + (0,))
            return empty, empty.copy()
        parts = [self._loss_totals(q, aged, k) for k in self.crest.beyond]
        fric = np.stack([np.broadcast_to(f, shape) for f, _ in parts], axis=-1)
        minor = np.stack([np.broadcast_to(m, shape) for _, m in parts], axis=-1)
        return fric, minor

    def _height_above_delivery(self, static_m: ArrayLike) -> FloatArray:
        """z_k − H_del for the delivery level of each static head, shape ``static.shape + (n_vented,)``."""
        assert self.crest is not None
        low, high = self.static_head_m["min"], self.static_head_m["max"]
        at_min = self.crest.height_above_delivery_m["min"]
        at_max = self.crest.height_above_delivery_m["max"]
        static = np.asarray(static_m, dtype=float)[..., None]
        if high == low:
            return np.broadcast_to(np.maximum(at_min, at_max), static.shape[:-1] + at_min.shape).copy()
        t = np.clip((static - low) / (high - low), 0.0, 1.0)
        height: FloatArray = np.where(t >= 1.0, at_max, at_min + t * (at_max - at_min))
        return height

    def control_index(self, flow_m3_s: ArrayLike, static_m: ArrayLike, aged: ArrayLike) -> NDArray[np.int64]:
        """The governing control at each flow: the profile point of a vented summit, or
        :data:`hydraulics.main_profile.DELIVERY_CONTROL` (−1) where the delivery governs.

        The summit with the largest positive :meth:`crest_excess` governs; the delivery
        wins a tie (no summit strictly above it).
        """
        shape = np.broadcast_shapes(np.shape(flow_m3_s), np.shape(static_m), np.shape(aged))
        if self.crest is None:
            return np.full(shape, DELIVERY_CONTROL, dtype=np.int64)
        excess = np.broadcast_to(self.crest_excess(flow_m3_s, static_m, aged), shape + self.crest.chainage_m.shape)
        best = np.argmax(excess, axis=-1)
        governs = np.take_along_axis(excess, best[..., None], axis=-1)[..., 0] > 0.0
        return np.where(governs, self.crest.profile_index[best], DELIVERY_CONTROL).astype(np.int64)

    def control_chainage(self, flow_m3_s: ArrayLike, static_m: ArrayLike, aged: ArrayLike) -> FloatArray:
        """Chainage of the governing summit at each flow (m), NaN where the delivery governs."""
        shape = np.broadcast_shapes(np.shape(flow_m3_s), np.shape(static_m), np.shape(aged))
        if self.crest is None:
            return np.full(shape, np.nan)
        excess = np.broadcast_to(self.crest_excess(flow_m3_s, static_m, aged), shape + self.crest.chainage_m.shape)
        best = np.argmax(excess, axis=-1)
        governs = np.take_along_axis(excess, best[..., None], axis=-1)[..., 0] > 0.0
        chainage: FloatArray = np.where(governs, self.crest.chainage_m[best], np.nan)
        return chainage

    def control_at_zero_flow(self, static_m: float) -> str:
        """The governing control with no flow: ``"delivery"`` or ``"crest at 1900 m"``."""
        return control_label(float(self.control_chainage(0.0, static_m, False)))

    def lift_head(self, static_m: float) -> float:
        """Head at zero flow for a static head (m): the static head to the governing control.

        Without losses the head is the larger of the static head to the delivery and to each
        vented summit (z_k − z_suction), see :meth:`head`.
        """
        return float(self.head(0.0, static_m, False))

    def suction_loss(self, flow_m3_s: ArrayLike, aged: ArrayLike, pumps_running: ArrayLike = 1) -> FloatArray:
        """Friction plus minor loss from the suction tank to one running pump's inlet (m).

        The common suction segments at the station flow Q plus that pump's own suction
        branch at Q/N (the same sums as :meth:`losses`; zero without suction segments).
        """
        total = self.common_suction_loss(flow_m3_s, aged)
        if self.has_branches:
            total = total + self.branch_suction_loss(self._per_pump(flow_m3_s, pumps_running), aged)
        return total

    def common_suction_loss(self, flow_m3_s: ArrayLike, aged: ArrayLike) -> FloatArray:
        """Friction plus minor loss of the common suction segments at the station flow Q (m)."""
        fric, minor = self._loss_totals(flow_m3_s, aged, self._suction_loss_constants)
        total: FloatArray = fric + minor
        return total

    def branch_suction_loss(self, flow_per_pump_m3_s: ArrayLike, aged: ArrayLike) -> FloatArray:
        """Friction plus minor loss of one pump's own suction branch at that pump's flow (m; 0 without)."""
        if not self.has_branches:
            return np.zeros(np.shape(flow_per_pump_m3_s))
        fric, minor = self._loss_totals(flow_per_pump_m3_s, aged, self._branch_suction_loss_constants)
        total: FloatArray = fric + minor
        return total

    @staticmethod
    def _per_pump(flow_m3_s: ArrayLike, pumps_running: ArrayLike) -> FloatArray:
        """Q/N, the flow of one of N running pumps."""
        per_pump: FloatArray = np.asarray(flow_m3_s, dtype=float) / np.asarray(pumps_running, dtype=float)
        return per_pump


def flow_paths(segments: Sequence[Segment]) -> tuple[tuple[int, ...], tuple[int, ...]]:
    """Segment indices of the suction path and the delivery path, each in flow order.

    Flow order (see :class:`hydraulics.model.Segment`): the common suction (``"station"``
    suction segments, table order), then one pump's suction branch (``"pump"`` suction
    segments, table order) to the pump; from the pump its discharge branch (``"pump"``
    delivery segments), then the manifold and main (``"station"`` delivery segments).  The
    pump lies between the two paths: its flanges are no junction of two pipes.

    >>> from hydraulics.model import Segment
    >>> segs = [Segment("main", "delivery", "pvc", 100.0, 0.2),
    ...         Segment("bellmouth", "suction", "pvc", 2.0, 0.2, carries="pump"),
    ...         Segment("header", "suction", "pvc", 5.0, 0.3),
    ...         Segment("check valve", "delivery", "pvc", 3.0, 0.15, carries="pump")]
    >>> flow_paths(segs)
    ((2, 1), (3, 0))
    """
    def indices(side: str, carries: str) -> list[int]:
        return [i for i, seg in enumerate(segments) if seg.side == side and seg.carries == carries]

    suction = indices("suction", "station") + indices("suction", "pump")
    delivery = indices("delivery", "pump") + indices("delivery", "station")
    return tuple(suction), tuple(delivery)


def upstream_diameters(segments: Sequence[Segment]) -> tuple[float | None, ...]:
    """The bore of the segment upstream of each segment in flow order (``None`` at a path's start).

    The first segment of the suction path (fed by the suction tank) and of the delivery path
    (fed by the pump) have no upstream bore; see :func:`flow_paths`.
    """
    upstream: list[float | None] = [None] * len(segments)
    for path in flow_paths(segments):
        for before, after in zip(path, path[1:], strict=False):
            upstream[after] = segments[before].internal_diameter_m
    return tuple(upstream)


def resolve_segments(project: Project) -> None:
    """Resolve every segment against the catalogues (materials, fittings, bore changes), or raise
    :class:`ModelError` naming the field: the catalogue side of
    :func:`hydraulics.validation.validate_project`."""
    _segment_arrays(project)


def _segment_arrays(project: Project) -> tuple[tuple[str, ...], tuple[str, ...], tuple[Carries, ...], FloatArray]:
    """Catalogue look-ups per segment (materials, fittings), reused while the segments are unchanged.

    The window checks a candidate project (:func:`resolve_segments`) and then solves it; both
    need these terms, so they are cached on the immutable segments (the catalogues do not
    change while the program runs).  The table is read-only: callers copy its columns.
    """
    return _segment_terms(project.segments)


@lru_cache(maxsize=32)
def _segment_terms(segments: tuple[Segment, ...]) -> tuple[tuple[str, ...], tuple[str, ...], tuple[Carries, ...],
                                                              FloatArray]:
    """The work of :func:`_segment_arrays`.

    A reducer or expander row without its own other bore takes the bore of the segment
    upstream of it in flow order (:func:`upstream_diameters`).
    """
    names: list[str] = []
    sides: list[str] = []
    carries: list[Carries] = []
    rows = []
    upstream = upstream_diameters(segments)
    for i, seg in enumerate(segments):
        path = f"segments[{i}]"
        try:
            mat = catalogue.material(seg.material_id)
        except ModelError as exc:
            raise ModelError(f"{path}.material", exc.problem, seg.material_id) from None
        try:
            k_total = fittings.segment_k_total(seg.fittings, seg.internal_diameter_m,
                                               upstream_diameter_m=upstream[i])
        except ModelError as exc:
            raise ModelError(f"{path}.{exc.field_path}", exc.problem, exc.value) from None
        rows.append((
            seg.internal_diameter_m, seg.length_m, seg.parallel_pipes,
            mat.roughness_new_m if seg.roughness_new_m is None else seg.roughness_new_m,
            mat.roughness_aged_m if seg.roughness_aged_m is None else seg.roughness_aged_m,
            mat.hw_c_new if seg.hw_c_new is None else seg.hw_c_new,
            mat.hw_c_aged if seg.hw_c_aged is None else seg.hw_c_aged,
            k_total,
        ))
        names.append(seg.name)
        sides.append(seg.side)
        carries.append(seg.carries)
    table = np.array(rows, dtype=float).reshape(len(rows), 8)
    table.flags.writeable = False
    return tuple(names), tuple(sides), tuple(carries), table


def main_segments(project: Project) -> tuple[int, ...]:
    """Indices of the common delivery pipework (manifold and main) in flow order: the profile's segments."""
    return tuple(i for i, seg in enumerate(project.segments) if seg.side == "delivery" and seg.carries == "station")


def delivery_levels(site: Site, density_kg_m3: float) -> dict[str, float]:
    """The delivery level of each static extreme (m): low for ``"min"``, high for ``"max"``.

    A pressurised point counts as elevation + p/(ρ g) (hydrostatics), as in :func:`static_heads`.
    """
    delivery = site.delivery
    if isinstance(delivery, TankDelivery):
        return {"min": float(delivery.level_low_m), "max": float(delivery.level_high_m)}
    if isinstance(delivery, PressurisedDelivery):
        level = float(delivery.elevation_m + delivery.pressure_pa / (density_kg_m3 * G))
        return {"min": level, "max": level}
    raise ModelError("site.delivery", "must be a tank or a pressurised point")  # pragma: no cover


def _crest_terms(system: SystemHydraulics, project: Project, density_kg_m3: float) -> CrestTerms | None:
    """The vented summits above a delivery level, with the loss constants of the main beyond each."""
    if not project.profile:
        return None
    main = np.array(main_segments(project), dtype=np.int64)
    levels = delivery_levels(project.site, density_kg_m3)
    points = [(i, p) for i, p in enumerate(project.profile) if p.air_valve
              and p.elevation_m > min(levels.values())]
    if not points or main.size == 0:
        return None
    chainage = np.array([p.chainage_m for _, p in points], dtype=np.float64)
    friction_upstream, minor_upstream = loss_weights(system.length_m[main], chainage)
    beyond = []
    for k in range(chainage.size):
        length_share = np.zeros(system.n_segments)
        minor_share = np.zeros(system.n_segments)
        length_share[main] = 1.0 - friction_upstream[k]
        minor_share[main] = 1.0 - minor_upstream[k]
        past_summit = (length_share > 0.0) | (minor_share > 0.0)  # segments wholly upstream add nothing
        beyond.append(system._constants_for(past_summit, length_share, minor_share))
    elevation = np.array([p.elevation_m for _, p in points], dtype=np.float64)
    return CrestTerms(profile_index=np.array([i for i, _ in points], dtype=np.int64), chainage_m=chainage,
                      elevation_m=elevation,
                      height_above_delivery_m={case: elevation - level for case, level in levels.items()},
                      beyond=tuple(beyond))


def prepare_system(project: Project, fluid: FluidProperties) -> SystemHydraulics:
    """Resolve catalogues and build the :class:`SystemHydraulics` of ``project``.

    With a profile whose vented summits rise above a delivery level, the system carries
    their crest terms (:class:`CrestTerms`).
    """
    names, sides, carries, table = _segment_arrays(project)
    system = SystemHydraulics(
        static_head_m=static_heads(project.site, fluid.density_kg_m3),
        segment_names=names,
        sides=sides,
        carries=carries,
        method=project.friction_method,
        diameter_m=table[:, 0].copy(),
        length_m=table[:, 1].copy(),
        parallel_pipes=table[:, 2].copy(),
        roughness_new_m=table[:, 3].copy(),
        roughness_aged_m=table[:, 4].copy(),
        hw_c_new=table[:, 5].copy(),
        hw_c_aged=table[:, 6].copy(),
        k_total=table[:, 7].copy(),
        suction_mask=np.array([s == "suction" for s in sides], dtype=bool),
        kinematic_viscosity_m2_s=fluid.kinematic_viscosity_m2_s,
    )
    crest = _crest_terms(system, project, fluid.density_kg_m3)
    return system if crest is None else replace(system, crest=crest)


def flow_grid(max_flow_m3_s: float, n_points: int = 256) -> np.ndarray:
    """Evenly spaced flows from zero to ``max_flow_m3_s`` inclusive."""
    return np.linspace(0.0, max_flow_m3_s, n_points)


def system_curves(system: SystemHydraulics, flow_m3_s: np.ndarray) -> tuple[SystemCurve, ...]:
    """The four system curves (min/max static × new/aged pipe) of the common pipework over ``flow_m3_s``.

    H_static + L_station(Q): the pump branches are not part of these curves; their loss is
    taken off the pump-set curves instead (the curves as they act at the manifold).
    Friction and minor losses do not depend on the static head, so they are computed once
    per pipe state and shared by both static extremes.
    """
    flows = np.asarray(flow_m3_s, dtype=np.float64)
    curves = []
    pipe_states: tuple[tuple[PipeState, bool], ...] = (("new", False), ("aged", True))
    static_cases: tuple[StaticCase, ...] = ("min", "max")
    for pipe, aged in pipe_states:
        fric, minor = system.losses(flows, aged)
        beyond = system.crest_losses_beyond(flows, aged) if system.crest is not None else None
        for static in static_cases:
            hs = np.full_like(flows, system.static_head_m[static])
            if beyond is None:
                curves.append(SystemCurve(static=static, pipe=pipe, flow_m3_s=flows, head_m=hs + fric + minor,
                                          static_m=hs, friction_m=fric, minor_m=minor))
            else:
                curves.append(_crest_curve(system, static, pipe, flows, hs, fric, minor, beyond))
    order = {("min", "new"): 0, ("min", "aged"): 1, ("max", "new"): 2, ("max", "aged"): 3}
    return tuple(sorted(curves, key=lambda c: order[(c.static, c.pipe)]))


def _crest_curve(system: SystemHydraulics, static: StaticCase, pipe: PipeState, flows: FloatArray, hs: FloatArray,
                 fric: FloatArray, minor: FloatArray, beyond: tuple[FloatArray, FloatArray]) -> SystemCurve:
    """One system curve with crest control: where a vented summit governs, the static head is
    the static head to it and the losses are counted up to it (see :meth:`SystemHydraulics.crest_excess`)."""
    assert system.crest is not None
    fric_beyond, minor_beyond = beyond
    height = system._height_above_delivery(hs)
    excess = height - fric_beyond - minor_beyond
    best = np.argmax(excess, axis=-1)[..., None]
    governs = np.take_along_axis(excess, best, axis=-1)[..., 0] > 0.0

    def pick(values: FloatArray) -> FloatArray:
        return np.asarray(np.take_along_axis(values, best, axis=-1)[..., 0], dtype=np.float64)

    static_m = np.where(governs, hs + pick(height), hs)
    friction_m = np.where(governs, fric - pick(fric_beyond), fric)
    minor_m = np.where(governs, minor - pick(minor_beyond), minor)
    chainage = np.where(governs, system.crest.chainage_m[best[..., 0]], np.nan)
    head = np.where(governs, hs + fric + minor + pick(excess), hs + fric + minor)
    return SystemCurve(static=static, pipe=pipe, flow_m3_s=flows, head_m=head, static_m=static_m,
                       friction_m=friction_m, minor_m=minor_m, control_chainage_m=chainage)


def segment_results(system: SystemHydraulics, flow_m3_s: float, aged: bool = False,
                    pumps_running: int = 1) -> tuple[SegmentResult, ...]:
    """Velocity, Reynolds number, friction factor and losses of every segment at one station flow.

    ``flow_m3_s`` is the station flow Q with ``pumps_running`` (N) pumps running: the
    common segments are evaluated at Q, the pump-branch segments at one pump's flow Q/N
    (their ``flow_m3_s`` is that per-pump flow).
    """
    q = float(flow_m3_s)
    n = int(pumps_running)
    eps = system.roughness_aged_m if aged else system.roughness_new_m
    result = system.segment_friction(q, aged, n)
    velocity, reynolds, f = result.velocity_m_s, result.reynolds, result.friction_factor
    fric = result.head_loss_m
    minor = fittings.minor_loss(system.k_total, velocity)
    regimes = friction.flow_regime(reynolds)
    flows = np.broadcast_to(system.segment_flows(q, n), (system.n_segments,)).tolist()
    out = []
    for i, name in enumerate(system.segment_names):
        out.append(SegmentResult(
            index=i, name=name, side=system.sides[i],
            length_m=float(system.length_m[i]), internal_diameter_m=float(system.diameter_m[i]),
            roughness_m=float(eps[i]), parallel_pipes=int(system.parallel_pipes[i]),
            flow_m3_s=float(flows[i]), velocity_m_s=float(velocity[i]), reynolds=float(reynolds[i]),
            friction_factor=float(f[i]), regime=str(regimes[i]),  # type: ignore[arg-type]
            friction_loss_m=float(fric[i]), minor_k_total=float(system.k_total[i]),
            minor_loss_m=float(minor[i]), carries=system.carries[i], pumps_running=n,
        ))
    return tuple(out)
