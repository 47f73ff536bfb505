"""What the engine returns: frozen dataclasses of SI floats and float64 numpy arrays.

:func:`hydraulics.solve.solve` builds one :class:`Solution` from a
:class:`~hydraulics.model.Project`.  The window, the command line and the reports only
read these objects; none of them computes hydraulics.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

import numpy as np

from hydraulics.model import PipeState, Project, StaticCase

Severity = Literal["info", "warning", "critical"]
Regime = Literal["none", "laminar", "transition", "turbulent"]


@dataclass(frozen=True)
class FluidProperties:
    """Properties of the fluid used in the calculation (SI)."""

    temperature_c: float
    density_kg_m3: float
    kinematic_viscosity_m2_s: float
    vapour_pressure_pa: float
    description: str


@dataclass(frozen=True, eq=False)
class SystemCurve:
    """One system curve: head required against flow, with its breakdown.

    All arrays have the same length as ``flow_m3_s``.
    """

    static: StaticCase
    pipe: PipeState
    flow_m3_s: np.ndarray
    head_m: np.ndarray
    static_m: np.ndarray
    friction_m: np.ndarray
    minor_m: np.ndarray


@dataclass(frozen=True)
class SegmentResult:
    """Hydraulics of one segment at one flow (per pipe where pipes run in parallel)."""

    index: int
    name: str
    side: str
    length_m: float
    internal_diameter_m: float
    roughness_m: float
    parallel_pipes: int
    flow_m3_s: float
    velocity_m_s: float
    reynolds: float
    friction_factor: float
    regime: Regime
    friction_loss_m: float
    minor_k_total: float
    minor_loss_m: float


@dataclass(frozen=True)
class Finding:
    """One result of the checks.

    ``code`` is stable (tests and scripts may rely on it).  ``target`` lets the window
    select what the finding is about: ``("segment", index)``, ``("pump", pump_id)``,
    ``("site", field)``, ``("scenario", label)`` or ``None``.
    """

    severity: Severity
    code: str
    message: str
    where: str
    remedy: str = ""
    target: tuple[str, object] | None = None


SEVERITY_ORDER: dict[str, int] = {"critical": 0, "warning": 1, "info": 2}
"""Sort order of severities, most serious first."""


@dataclass(frozen=True)
class Solution:
    """Everything the engine computed for a project.

    Pump-related parts (``pump_fits``, ``operating_points``, ``variable_speed``,
    ``energy``, ``pump_curves``) are empty/``None`` when the project has no pump.
    """

    project: Project
    fluid: FluidProperties
    atmospheric_pressure_pa: float
    static_head_min_m: float
    static_head_max_m: float
    design_flow_m3_s: float
    curves: tuple[SystemCurve, ...]
    segments: tuple[SegmentResult, ...]
    findings: tuple[Finding, ...] = ()
    pump_fits: tuple = ()
    operating_points: tuple = ()
    variable_speed: object | None = None
    energy: object | None = None
    pump_curves: tuple = ()
    npsh_available_curve: object | None = None
    extras: dict = field(default_factory=dict)

    def curve(self, static: StaticCase, pipe: PipeState) -> SystemCurve:
        """The system curve for one static extreme and pipe state."""
        for c in self.curves:
            if c.static == static and c.pipe == pipe:
                return c
        raise KeyError((static, pipe))
