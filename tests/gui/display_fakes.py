"""Invented solutions for the display tests, built directly from numpy arrays.

Demo data only: the curves are simple parabolas of an invented station (static heads
12 m and 18 m, an invented pump with 40 m shut-off head).  They exercise the widgets; they
are not hydraulic results.  They are built from the engine's own result classes
(:mod:`hydraulics.results`), so a renamed field breaks these tests as it would break the
window.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from hydraulics.model import Arrangement, Criteria, Project, PumpModel, Site, TankDelivery
from hydraulics.results import Finding, FluidProperties, NpshCurve, OperatingPoint, PumpCurve, Solution, SystemCurve

STATIC_HEADS = {"min": 12.0, "max": 18.0}
FRICTION_COEFF = {"new": 4000.0, "aged": 6500.0}  # head = static + c Q², Q in m³/s (invented)
SHUTOFF_HEAD_M = 40.0
PUMP_COEFF = 9000.0  # one pump: head = 40 − 9000 Q² (invented)
BEP_FLOW_M3_S = 0.040  # invented best-efficiency flow of one pump
DESIGN_FLOW_M3_S = 0.045
INVENTED_FLUID = FluidProperties(temperature_c=15.0, density_kg_m3=1000.0, kinematic_viscosity_m2_s=1.1e-6,
                                 vapour_pressure_pa=1700.0, description="invented test liquid")


def _efficiency(q_per_pump: np.ndarray) -> np.ndarray:
    """Invented efficiency hill peaking at 0.80 at the BEP flow."""
    return np.clip(0.80 * (1.0 - ((q_per_pump - BEP_FLOW_M3_S) / BEP_FLOW_M3_S) ** 2), 0.0, None)


def _npshr(q_per_pump: np.ndarray) -> np.ndarray:
    return 1.5 + 1500.0 * q_per_pump**2


def _npsha(q_total: np.ndarray, pipe: str) -> np.ndarray:
    return 9.0 - (300.0 if pipe == "new" else 450.0) * q_total**2


_EMPTY_POINT = dict(
    extrapolated=False, flow_m3_s=None, flow_per_pump_m3_s=None, head_m=None, efficiency=None,
    hydraulic_power_w=None, shaft_power_w=None, shaft_power_total_w=None, input_power_w=None,
    specific_energy_kwh_m3=None, bep_flow_ratio=None, npsh_available_m=None, npsh_required_m=None,
    npsh_margin_m=None, npsh_margin_ratio=None, segment_velocities_m_s=(),
)


def _point(static: str, pipe: str, pumps: int, static_head_m: float, **values) -> OperatingPoint:
    """An engine OperatingPoint at full speed and full impeller; unspecified values unknown."""
    return OperatingPoint(static=static, pipe=pipe, pumps_running=pumps, speed_ratio=1.0, trim_ratio=1.0,
                          series_stages=1, static_head_m=static_head_m, **{**_EMPTY_POINT, **values})


def make_project(duty_count: int = 2, speed_ratio: float = 1.0) -> Project:
    site = Site(suction_level_low_m=100.0, suction_level_high_m=103.0,
                delivery=TankDelivery(level_low_m=115.0, level_high_m=118.0),
                pump_datum_m=99.0, design_flow_m3_s=DESIGN_FLOW_M3_S)
    pump = PumpModel(pump_id="P1", name="Invented pump A", rated_speed_rpm=1450.0,
                     flow_m3_s=(0.0, 0.03, 0.06), head_m=(40.0, 31.9, 7.6))
    return Project(name="Invented test station", site=site, pumps=(pump,),
                   arrangement=Arrangement(pump_id="P1", duty_count=duty_count, speed_ratio=speed_ratio),
                   criteria=Criteria())


def make_solution(duty_count: int = 2, scale: float = 1.0, with_pump: bool = True,
                  findings: tuple[Finding, ...] = (), unfound: tuple[tuple[str, str, int], ...] = ()) -> Solution:
    """An invented solution; ``scale`` multiplies every friction coefficient (a 'new design')."""
    flows = np.linspace(0.0, 0.12, 61)
    curves = []
    for static, hs in STATIC_HEADS.items():
        for pipe, c in FRICTION_COEFF.items():
            friction = 0.8 * scale * c * flows**2
            minor = 0.2 * scale * c * flows**2
            curves.append(SystemCurve(static=static, pipe=pipe, flow_m3_s=flows.copy(),
                                      head_m=hs + friction + minor, static_m=np.full_like(flows, hs),
                                      friction_m=friction, minor_m=minor))
    project = make_project(duty_count)
    base = dict(project=project, fluid=INVENTED_FLUID, atmospheric_pressure_pa=101325.0,
                static_head_min_m=STATIC_HEADS["min"], static_head_max_m=STATIC_HEADS["max"],
                design_flow_m3_s=DESIGN_FLOW_M3_S, curves=tuple(curves), segments=(), findings=findings)
    if not with_pump:
        base["project"] = replace(project, pumps=(), arrangement=None)
        return Solution(**base)

    pump_curves = []
    q1 = np.linspace(0.0, 0.065, 40)
    for n in range(1, duty_count + 1):
        head = SHUTOFF_HEAD_M - PUMP_COEFF * q1**2
        eff = _efficiency(q1)
        power = 5000.0 + 190000.0 * q1 - 600000.0 * q1**2  # invented shaft power per pump (W)
        pump_curves.append(PumpCurve(
            pumps_running=n, series_stages=1, speed_ratio=1.0, trim_ratio=1.0, flow_m3_s=n * q1,
            flow_per_pump_m3_s=q1.copy(), head_m=head, efficiency=eff, shaft_power_w=power,
            npsh_required_m=_npshr(q1), bep_flow_m3_s=n * BEP_FLOW_M3_S,
            preferred_flow_min_m3_s=n * 0.7 * BEP_FLOW_M3_S, preferred_flow_max_m3_s=n * 1.2 * BEP_FLOW_M3_S))

    points = []
    for static, hs in (("max", STATIC_HEADS["max"]), ("min", STATIC_HEADS["min"])):
        for pipe in ("aged", "new"):
            c = scale * FRICTION_COEFF[pipe]
            for n in range(1, duty_count + 1):
                if (static, pipe, n) in unfound:
                    points.append(_point(static, pipe, n, hs, found=False, reason="pump curve below system curve"))
                    continue
                # 40 − 9000 (Q/n)² = hs + c Q²  →  Q = sqrt((40 − hs) / (c + 9000/n²))
                q = float(np.sqrt((SHUTOFF_HEAD_M - hs) / (c + PUMP_COEFF / n**2)))
                h = hs + c * q**2
                qp = q / n
                eff = float(_efficiency(np.array([qp]))[0])
                p_shaft = 5000.0 + 190000.0 * qp - 600000.0 * qp**2
                npsha = float(_npsha(np.array([q]), pipe)[0])
                npshr = float(_npshr(np.array([qp]))[0])
                points.append(_point(
                    static, pipe, n, hs, found=True, reason=None,
                    flow_m3_s=q, flow_per_pump_m3_s=qp, head_m=h, efficiency=eff, shaft_power_w=p_shaft,
                    shaft_power_total_w=n * p_shaft, input_power_w=n * p_shaft / 0.95,
                    specific_energy_kwh_m3=n * p_shaft / 0.95 / q / 3.6e6, bep_flow_ratio=qp / BEP_FLOW_M3_S,
                    npsh_available_m=npsha, npsh_required_m=npshr, npsh_margin_m=npsha - npshr,
                    npsh_margin_ratio=npsha / npshr, extrapolated=qp > 0.06,
                    hydraulic_power_w=1000.0 * 9.80665 * q * h))
    npsh = NpshCurve(flow_m3_s=flows.copy(), available_new_m=_npsha(flows, "new"),
                     available_aged_m=_npsha(flows, "aged"), required_flow_m3_s=q1.copy(),
                     required_m=_npshr(q1))
    return Solution(**base, pump_curves=tuple(pump_curves), operating_points=tuple(points),
                    npsh_available_curve=npsh)


def sample_findings() -> tuple[Finding, ...]:
    """Invented findings of each severity with targets of each kind."""
    return (
        Finding("critical", "npsh_insufficient", "NPSH available 2.1 m is below NPSH required 3.0 m.",
                "pump 'Invented pump A', 2 pumps, max static, aged pipe", "Lower the pump.",
                ("scenario", ("max", "aged", 2, 1.0))),
        Finding("warning", "velocity_high", "Velocity 2.9 m/s is above the maximum 2.5 m/s.",
                "segment 'Rising main' (delivery)", "Try a larger diameter.", ("segment", 2)),
        Finding("warning", "outside_preferred", "Runs at 135 % of best-efficiency flow.",
                "pump 'Invented pump A'", "Consider variable speed.", ("pump", "P1")),
        Finding("info", "laminar_flow", "Laminar flow at design flow.", "site suction level",
                "Check the viscosity.", ("site", "suction")),
    )
