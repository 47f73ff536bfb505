"""Identical pumps in parallel and in series, at reduced speed or with a trimmed impeller.

Affinity laws (similarity of a pump with itself at another speed; e.g. Karassik et al.,
*Pump Handbook*, 4th ed., ch. 2; Gülich, *Centrifugal Pumps*, 3rd ed., ch. 3): for a speed
ratio s = n / n_rated, at corresponding points

    Q = s Q_rated,   H = s² H_rated,   P = s³ P_rated,   η = η_rated.

An impeller trimmed to t = D / D_rated is treated with the same laws in t (Q ∝ D, H ∝ D²,
P ∝ D³).  This holds for **small trims only** (a few per cent up to about 10–15 %;
beyond that the trimmed pump must be tested): the checks warn past the project's trim
limit.  Speed and trim combine into one scale c = s · t.

Parallel and series (identical pumps; the head balance of a pump set): N pumps in parallel
share the flow equally at a common head, Q_total = N Q_pump; S pumps (stages) in series
carry the same flow and their heads add, H = S H_pump.  So for a station flow Q

    q_pump = Q / N,   q_rated = q_pump / c,   H(Q) = S c² H_rated(q_rated).

Per pump: efficiency η_rated(q_rated) (unchanged at corresponding points), shaft power
c³ P_rated(q_rated), and NPSH required s² NPSHr_rated(q_pump / s).  The NPSH scaling by
the square of speed is the common approximation (measured exponents scatter around 2); a
trimmed impeller is taken to keep its NPSH required at a given flow because the impeller
eye is not cut.  In series only the first stage's suction matters; the NPSH required is
that of one pump.

Everything is vectorised: the flow and each arrangement parameter may be numpy arrays
that broadcast against each other (one value per scenario).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from hydraulics.pump_fit import FittedPump
from hydraulics.results import FloatArray, PumpCurve

__all__ = [
    "rated_equivalent_flow",
    "arrangement_head",
    "ArrangementPerformance",
    "arrangement_performance",
    "arrangement_flow_range",
    "PumpCurve",
    "arrangement_curve",
]


def _arrays(*values: ArrayLike) -> list[FloatArray]:
    return [np.asarray(v, dtype=np.float64) for v in values]


def rated_equivalent_flow(flow_total_m3_s: ArrayLike, pumps_in_parallel: ArrayLike = 1, speed_ratio: ArrayLike = 1.0,
                          trim_ratio: ArrayLike = 1.0) -> FloatArray:
    """The flow at rated speed and full impeller corresponding to one pump's share.

    q_rated = Q / (N · s · t)  (affinity laws; parallel pumps share the flow equally).

    >>> float(rated_equivalent_flow(0.12, 2, 0.8))
    0.075
    """
    q, n, s, t = _arrays(flow_total_m3_s, pumps_in_parallel, speed_ratio, trim_ratio)
    return q / (n * s * t)


def arrangement_head(fitted: FittedPump, flow_total_m3_s: ArrayLike, pumps_in_parallel: ArrayLike = 1,
                     series_stages: ArrayLike = 1, speed_ratio: ArrayLike = 1.0,
                     trim_ratio: ArrayLike = 1.0) -> FloatArray:
    """Head of the pump set (m) at station flow Q (m³/s): H = S (s t)² H_rated(Q / (N s t)).

    Parameters broadcast against each other.  No clipping: outside the data range the
    fitted polynomial is extrapolated (see :func:`arrangement_performance` for the flag).

    >>> from hydraulics.model import PumpModel
    >>> from hydraulics.pump_fit import fit_pump
    >>> q = (0.0, 0.01, 0.02, 0.03)
    >>> fitted = fit_pump(PumpModel("P", "demo", 2900.0, q, tuple(60 - 20000 * x * x for x in q)), 1000.0)
    >>> round(float(arrangement_head(fitted, 0.02, pumps_in_parallel=2)), 9)  # 60 - 20000 * 0.01²
    58.0
    >>> # 2 * 0.25 * (60 - 20000 * 0.02²)
    >>> round(float(arrangement_head(fitted, 0.01, series_stages=2, speed_ratio=0.5)), 9)
    26.0
    """
    q, n, stages, s, t = _arrays(flow_total_m3_s, pumps_in_parallel, series_stages, speed_ratio, trim_ratio)
    c = s * t
    return stages * c * c * fitted.head(q / (n * c))


@dataclass(frozen=True, eq=False)
class ArrangementPerformance:
    """The pump set at each station flow (arrays of the broadcast shape).

    ``efficiency``, ``shaft_power_per_pump_w`` and ``npsh_required_m`` are NaN where the
    pump has no such data.  ``extrapolated`` is True where one pump's corresponding rated
    flow lies outside the data range.
    """

    flow_total_m3_s: FloatArray
    flow_per_pump_m3_s: FloatArray
    rated_flow_m3_s: FloatArray
    head_m: FloatArray
    efficiency: FloatArray
    shaft_power_per_pump_w: FloatArray
    npsh_required_m: FloatArray
    extrapolated: NDArray[np.bool_]


def arrangement_performance(fitted: FittedPump, flow_total_m3_s: ArrayLike, pumps_in_parallel: ArrayLike = 1,
                            series_stages: ArrayLike = 1, speed_ratio: ArrayLike = 1.0,
                            trim_ratio: ArrayLike = 1.0) -> ArrangementPerformance:
    """Head, per-pump efficiency, shaft power and NPSH required of the pump set at each flow."""
    q, n, stages, s, t = np.broadcast_arrays(
        *_arrays(flow_total_m3_s, pumps_in_parallel, series_stages, speed_ratio, trim_ratio))
    c = s * t
    q_pump = q / n
    q_rated = q_pump / c
    head = stages * c * c * fitted.head(q_rated)
    efficiency = fitted.efficiency(q_rated)
    power = c**3 * fitted.shaft_power(q_rated)
    npsh = s * s * fitted.npsh_required(q_pump / s)
    return ArrangementPerformance(
        flow_total_m3_s=q, flow_per_pump_m3_s=q_pump, rated_flow_m3_s=q_rated, head_m=head,
        efficiency=efficiency, shaft_power_per_pump_w=power, npsh_required_m=npsh,
        extrapolated=fitted.is_extrapolated(q_rated),
    )


def arrangement_flow_range(fitted: FittedPump, pumps_in_parallel: ArrayLike = 1, speed_ratio: ArrayLike = 1.0,
                           trim_ratio: ArrayLike = 1.0) -> tuple[FloatArray, FloatArray]:
    """Station-flow range (m³/s) covered by the pump data: N · s · t · [Q_min, Q_max].

    >>> from hydraulics.model import PumpModel
    >>> from hydraulics.pump_fit import fit_pump
    >>> fitted = fit_pump(PumpModel("P", "demo", 2900.0, (0.01, 0.02, 0.03), (50.0, 45.0, 37.0)), 1000.0)
    >>> [round(float(v), 9) for v in arrangement_flow_range(fitted, 2, 0.9)]
    [0.018, 0.054]
    """
    n, s, t = _arrays(pumps_in_parallel, speed_ratio, trim_ratio)
    scale = n * s * t
    return scale * fitted.flow_min_m3_s, scale * fitted.flow_max_m3_s


def arrangement_curve(fitted: FittedPump, pumps_running: int = 1, series_stages: int = 1,
                      speed_ratio: float = 1.0, trim_ratio: float = 1.0, n_points: int = 101,
                      preferred_region: tuple[float, float] = (0.70, 1.20),
                      reach_flow_m3_s: float | None = None) -> PumpCurve:
    """The pump set's curve over its data range, for plotting.

    ``reach_flow_m3_s`` (station flow) carries the curve on beyond the data range as far
    as that flow: the furthest duty point found on it, where the fitted curve is
    extrapolated (the point is flagged as such), so the drawn curve meets every point.

    ``preferred_region`` gives the preferred operating region as fractions of
    best-efficiency flow (default 70–120 %, the pump-industry guideline ANSI/HI 9.6.3 as
    summarised in :class:`~hydraulics.model.Criteria`; pass the project's criteria).

    >>> from hydraulics.model import PumpModel
    >>> from hydraulics.pump_fit import fit_pump
    >>> q = (0.0, 0.01, 0.02, 0.03)
    >>> fitted = fit_pump(PumpModel("P", "demo", 2900.0, q, tuple(60 - 20000 * x * x for x in q)), 1000.0)
    >>> curve = arrangement_curve(fitted, 2, speed_ratio=0.5, n_points=4)
    >>> [round(float(v), 6) for v in curve.flow_m3_s], round(float(curve.head_m[0]), 9)
    ([0.0, 0.01, 0.02, 0.03], 15.0)
    """
    n, stages = int(pumps_running), int(series_stages)
    s, t = float(speed_ratio), float(trim_ratio)
    lo, hi = arrangement_flow_range(fitted, n, s, t)
    end = float(hi) if reach_flow_m3_s is None else max(float(hi), float(reach_flow_m3_s))
    flows = np.linspace(float(lo), end, int(n_points))
    perf = arrangement_performance(fitted, flows, n, stages, s, t)
    bep = pref_lo = pref_hi = None
    if fitted.bep_flow_m3_s is not None:
        bep = float(fitted.bep_flow_m3_s * s * t * n)
        pref_lo, pref_hi = bep * preferred_region[0], bep * preferred_region[1]
    return PumpCurve(
        pumps_running=n, series_stages=stages, speed_ratio=s, trim_ratio=t,
        flow_m3_s=flows, flow_per_pump_m3_s=perf.flow_per_pump_m3_s, head_m=perf.head_m,
        efficiency=perf.efficiency if fitted.has_efficiency else None,
        shaft_power_w=perf.shaft_power_per_pump_w if fitted.has_efficiency else None,
        npsh_required_m=perf.npsh_required_m if fitted.has_npsh else None,
        bep_flow_m3_s=bep, preferred_flow_min_m3_s=pref_lo, preferred_flow_max_m3_s=pref_hi,
    )
