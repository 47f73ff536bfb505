"""The combined head–flow curve of each stage of the run sequence that includes other pumps.

Method: pumps in parallel add their flows at equal head (the parallel-pump curve; e.g.
Karassik et al., *Pump Handbook*, 4th ed., ch. on pump and system curves; Gülich,
*Centrifugal Pumps*, 3rd ed., ch. 11).  At the manifold each pump i gives the head
hᵢ(q) = cᵢ² Hᵢ,rated(q / cᵢ) − L_branch(q) (its curve at its speed and trim, less the loss
of its own branch, new pipe, as the curves of the arrangement's identical pumps are drawn).
For a grid of manifold heads H the station flow is

    Q(H) = Σᵢ qᵢ(H),

with qᵢ(H) the root of hᵢ(q) = H on the stable branch of pump i, and zero where H is at or
above the head at which pump i can open its check valve.  The roots are those of
:mod:`hydraulics.pump_set` (one vectorised bracketed root search over the whole head grid,
per pump of the set).  The grid runs from the highest head any pump of the set reaches down
to the head at which the first pump reaches the end of its tested data, and includes each
pump's own highest head so the kink where a weaker pump starts to deliver is drawn exactly.

The curves are those of the pump-set points (:mod:`hydraulics.pump_set_points`): every
pump at its highest speed (a variable-speed pump at its ``speed_ratio``, the arrangement's
at its maximum speed).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

import numpy as np

from hydraulics.model import Project
from hydraulics.pump_fit import FittedPump
from hydraulics.pump_set import PumpHeads, SetPump, installed_pumps, pump_speeds, run_stages, stage_label
from hydraulics.results import PumpSetCurve, PumpSetCurves
from hydraulics.system_curve import SystemHydraulics

__all__ = ["pump_set_curves", "combined_curve", "CURVE_POINTS"]

CURVE_POINTS = 96
"""Manifold heads per combined curve (besides each pump's own highest head)."""


def combined_curve(system: SystemHydraulics, fitted_by_id: Mapping[str, FittedPump], pumps: Sequence[SetPump],
                   n_points: int = CURVE_POINTS) -> PumpSetCurve:
    """The curve of ``pumps`` in parallel at the manifold: Q(H) = Σ qᵢ(H) (module description).

    Points are in order of rising station flow (falling head).  Empty arrays when the pumps
    reach no head above the end of the first pump's data.
    """
    fitted = [fitted_by_id[p.pump_id] for p in pumps]
    trims = np.array([p.trim_ratio for p in pumps], dtype=float)

    def heads_for(n: int) -> PumpHeads:
        scale = pump_speeds(pumps, n, None) * trims
        return PumpHeads(system, fitted, scale, np.zeros(n, dtype=bool), extension=1.0)

    ends = heads_for(1)
    tops, bottoms = ends.top[0], ends.bottom[0]
    high, low = float(np.max(tops)), float(np.max(bottoms))
    tags = tuple(p.tag for p in pumps)
    if not high > low:
        empty = np.empty(0)
        return PumpSetCurve(tags, empty, empty.copy(), np.empty((0, len(pumps))))
    inner = tops[(tops > low) & (tops < high)]
    grid = np.unique(np.concatenate((np.linspace(low, high, n_points), inner)))[::-1]
    flows, _ = heads_for(grid.size).flows_at(grid)
    for array in (grid, flows):
        array.flags.writeable = False
    total = np.sum(flows, axis=1)
    total.flags.writeable = False
    return PumpSetCurve(tags, total, grid, flows)


def pump_set_curves(project: Project, system: SystemHydraulics,
                    fitted_by_id: Mapping[str, FittedPump]) -> PumpSetCurves | None:
    """The tags of the arrangement's identical stages and the combined curve of every stage with other pumps.

    ``None`` without an arrangement.  Without other pumps the curves are empty (the
    arrangement's identical pumps are the ordinary pump curves).
    """
    pumps = installed_pumps(project)
    if not pumps:
        return None
    duty = [p for p in pumps if p.from_arrangement and p.role == "duty"]
    identical = tuple(stage_label(duty[:k]) for k in range(1, len(duty) + 1))
    curves = tuple(combined_curve(system, fitted_by_id, stage) for stage in run_stages(project)
                   if any(not p.from_arrangement for p in stage))
    return PumpSetCurves(identical, curves)
