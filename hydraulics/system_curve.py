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

:func:`prepare_system` turns a project into arrays of segment properties once;
:class:`SystemHydraulics` then evaluates heads for any array of flows in one vectorised
pass over (flows × segments) — no Python loop over flow points.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from functools import cached_property

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics import catalogue, fittings, friction
from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import (
    Carries,
    ModelError,
    PipeState,
    PressurisedDelivery,
    Project,
    Site,
    StaticCase,
    TankDelivery,
)
from hydraulics.results import FloatArray, FluidProperties, SegmentResult, SystemCurve

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
class SystemHydraulics:
    """Segment properties as arrays, ready for vectorised evaluation.

    Every per-segment array has shape ``(n_segments,)``.  Flows passed to the methods
    are the total station flow in m³/s, of any shape ``S``; results have shape ``S``
    (totals) or ``S + (n_segments,)`` (per segment).  ``pumps_running`` (N ≥ 1, a scalar
    or an array broadcasting with the flows) sets the flow Q/N of the pump-branch
    segments; the common pipework carries Q whatever N is.
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

    def _constants_for(self, mask: NDArray[np.bool_]) -> _LossConstants:
        d, n, length = self.diameter_m[mask], self.parallel_pipes[mask], self.length_m[mask]
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
            minor_sum=float(np.dot(self.k_total[mask], c * c)),
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
        """
        fric, minor = self.losses(flow_m3_s, aged)
        total = np.asarray(static_m, dtype=float) + fric + minor
        if self.has_branches:
            total = total + self.branch_loss(self._per_pump(flow_m3_s, pumps_running), aged)
        return total

    def suction_loss(self, flow_m3_s: ArrayLike, aged: ArrayLike, pumps_running: ArrayLike = 1) -> FloatArray:
        """Friction plus minor loss from the suction tank to one running pump's inlet (m).

        The common suction segments at the station flow Q plus that pump's own suction
        branch at Q/N (the same sums as :meth:`losses`; zero without suction segments).
        """
        fric, minor = self._loss_totals(flow_m3_s, aged, self._suction_loss_constants)
        total = fric + minor
        if self.has_branches:
            b_fric, b_minor = self._loss_totals(self._per_pump(flow_m3_s, pumps_running), aged,
                                                self._branch_suction_loss_constants)
            total = total + (b_fric + b_minor)
        return total

    @staticmethod
    def _per_pump(flow_m3_s: ArrayLike, pumps_running: ArrayLike) -> FloatArray:
        """Q/N, the flow of one of N running pumps."""
        per_pump: FloatArray = np.asarray(flow_m3_s, dtype=float) / np.asarray(pumps_running, dtype=float)
        return per_pump


def _segment_arrays(project: Project) -> tuple[tuple[str, ...], tuple[str, ...], tuple[Carries, ...], FloatArray]:
    """Catalogue look-ups per segment (materials, fittings); done once per solve."""
    names: list[str] = []
    sides: list[str] = []
    carries: list[Carries] = []
    rows = []
    for i, seg in enumerate(project.segments):
        path = f"segments[{i}]"
        try:
            mat = catalogue.material(seg.material_id)
        except ModelError as exc:
            raise ModelError(f"{path}.material", exc.problem, seg.material_id) from None
        try:
            k_total = fittings.segment_k_total(seg.fittings, seg.internal_diameter_m)
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
    return tuple(names), tuple(sides), tuple(carries), table


def prepare_system(project: Project, fluid: FluidProperties) -> SystemHydraulics:
    """Resolve catalogues and build the :class:`SystemHydraulics` of ``project``."""
    names, sides, carries, table = _segment_arrays(project)
    return SystemHydraulics(
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
        for static in static_cases:
            hs = np.full_like(flows, system.static_head_m[static])
            curves.append(SystemCurve(static=static, pipe=pipe, flow_m3_s=flows, head_m=hs + fric + minor,
                                      static_m=hs, friction_m=fric, minor_m=minor))
    order = {("min", "new"): 0, ("min", "aged"): 1, ("max", "new"): 2, ("max", "aged"): 3}
    return tuple(sorted(curves, key=lambda c: order[(c.static, c.pipe)]))


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
