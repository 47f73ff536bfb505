"""Closed-form stand-ins for the pump tests.

``QuadraticSystem`` implements the methods of :class:`hydraulics.system_curve.SystemHydraulics`
that the pump engine uses, with a system curve H = H_s + k Q² (k depending on pipe state)
and a suction loss k_s Q², so that duty points have exact solutions.  It has common pipework
only (no pump branches), so the pumps running passed to its methods change nothing.  ``quadratic_pump``
builds a pump whose test points lie exactly on H = a − b Q².  The coefficients passed in by
the tests are invented for the checks; they are not data of any real pump or system.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from hydraulics.model import PumpModel


@dataclass(frozen=True, eq=False)
class QuadraticSystem:
    """H(Q) = H_s + k Q², k = ``k_new`` or ``k_aged``; suction loss ``k_suction`` Q² (× ``aged_suction_factor``)."""

    static_min_m: float = 20.0
    static_max_m: float = 30.0
    k_new: float = 4000.0
    k_aged: float = 6000.0
    k_suction: float = 200.0
    aged_suction_factor: float = 1.5
    diameters_m: tuple[float, ...] = (0.3, 0.2)
    segment_names: tuple[str, ...] = ("suction", "rising main")
    calls: list = field(default_factory=list)

    @property
    def static_head_m(self) -> dict[str, float]:
        return {"min": self.static_min_m, "max": self.static_max_m}

    @property
    def n_segments(self) -> int:
        return len(self.segment_names)

    def k(self, aged) -> np.ndarray:
        return np.where(np.asarray(aged, dtype=bool), self.k_aged, self.k_new)

    def head(self, flow_m3_s, static_m, aged, pumps_running=1) -> np.ndarray:
        self.calls.append("head")
        q = np.asarray(flow_m3_s, dtype=float)
        return np.asarray(static_m, dtype=float) + self.k(aged) * q * q

    def suction_loss(self, flow_m3_s, aged, pumps_running=1) -> np.ndarray:
        q = np.asarray(flow_m3_s, dtype=float)
        factor = np.where(np.asarray(aged, dtype=bool), self.aged_suction_factor, 1.0)
        return self.k_suction * factor * q * q

    def segment_velocities(self, flow_m3_s, pumps_running=1) -> np.ndarray:
        q = np.asarray(flow_m3_s, dtype=float)[..., None]
        return q / (np.pi * np.asarray(self.diameters_m) ** 2 / 4.0)


def quadratic_pump(a: float = 60.0, b: float = 20000.0, q_max: float = 0.04, n_points: int = 5,
                   q_min: float = 0.0, efficiency=None, power=None, npsh=None, **kwargs) -> PumpModel:
    """A pump whose points lie exactly on H = a − b Q² (Q from ``q_min`` to ``q_max``).

    ``efficiency``, ``power`` and ``npsh`` are callables of flow (m³/s) giving the columns.
    """
    flows = np.linspace(q_min, q_max, n_points)
    return PumpModel(
        pump_id=kwargs.pop("pump_id", "Q"), name=kwargs.pop("name", "quadratic test pump"),
        rated_speed_rpm=kwargs.pop("rated_speed_rpm", 1450.0),
        flow_m3_s=tuple(float(q) for q in flows),
        head_m=tuple(float(a - b * q * q) for q in flows),
        efficiency=() if efficiency is None else tuple(float(efficiency(q)) for q in flows),
        shaft_power_w=() if power is None else tuple(float(power(q)) for q in flows),
        npsh_required_m=() if npsh is None else tuple(float(npsh(q)) for q in flows),
        **kwargs,
    )


def parabolic_efficiency(bep_flow: float = 0.03, bep_efficiency: float = 0.8):
    """η(Q) = η* (1 − ½ ((Q − Q*)/Q*)²): an exact parabola with its vertex at (Q*, η*)."""

    def eta(q):
        return bep_efficiency - bep_efficiency * ((q - bep_flow) / bep_flow) ** 2 * 0.5

    return eta
