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
    ``("site", field)``, ``("scenario", (static, pipe, pumps_running, speed_ratio))`` or
    ``None``.

    ``message`` is the text in SI units.  Where a finding quotes physical values,
    ``template`` holds the same text with ``{name}`` placeholders and ``values`` the
    ``(name, value_si, quantity)`` triples, so :meth:`text` can state it in any unit
    system.  Build such findings with :func:`finding`.
    """

    severity: Severity
    code: str
    message: str
    where: str
    remedy: str = ""
    target: tuple[str, object] | None = None
    template: str = ""
    values: tuple[tuple[str, float, str], ...] = ()

    def text(self, unit_system: str = "SI") -> str:
        """The message with every quoted value in ``unit_system`` ("SI" or "US")."""
        if not self.template:
            return self.message
        return render_template(self.template, self.values, unit_system)


def render_template(template: str, values, unit_system: str) -> str:
    """Fill ``{name}`` placeholders with values formatted in ``unit_system``."""
    from hydraulics.units import format_quantity

    return template.format(**{name: format_quantity(v, quantity, unit_system) for name, v, quantity in values})


def finding(severity: Severity, code: str, template: str, values: dict[str, tuple[float, str]], where: str,
            remedy: str = "", target: tuple[str, object] | None = None) -> Finding:
    """A :class:`Finding` whose quoted values follow the display unit system.

    ``values`` maps each placeholder to ``(value_si, quantity)``.

    >>> f = finding("warning", "velocity_high", "Velocity {v} exceeds {limit}.",
    ...             {"v": (2.9, "velocity"), "limit": (2.5, "velocity")}, "segment 'main'")
    >>> f.message
    'Velocity 2.90 m/s exceeds 2.50 m/s.'
    >>> f.text("US")
    'Velocity 9.51 ft/s exceeds 8.20 ft/s.'
    """
    triples = tuple((name, float(v), q) for name, (v, q) in values.items())
    return Finding(severity, code, render_template(template, triples, "SI"), where, remedy, target,
                   template=template, values=triples)


SEVERITY_ORDER: dict[str, int] = {"critical": 0, "warning": 1, "info": 2}
"""Sort order of severities, most serious first."""


@dataclass(frozen=True)
class Solution:
    """Everything the engine computed for a project.

    Pump-related parts (``pump_fits``, ``operating_points``, ``variable_speed``,
    ``energy``, ``pump_curves``) are empty/``None`` when the project has no pump.

    ``complete`` is False for the first stage of a solve
    (:func:`hydraulics.solve.solve_curves`): curves, pump curves, operating points, NPSH
    and energy are final, but the checks (``findings``) and the variable-speed results
    are not computed yet.
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
    complete: bool = True

    def curve(self, static: StaticCase, pipe: PipeState) -> SystemCurve:
        """The system curve for one static extreme and pipe state."""
        for c in self.curves:
            if c.static == static and c.pipe == pipe:
                return c
        raise KeyError((static, pipe))
