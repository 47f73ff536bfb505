"""Pump and suction specific speeds, and the criteria they suggest.

Definitions (at the best-efficiency point, rated speed, full impeller):

* Pump specific speed n_s = n √Q / H^0.75 — SI form with n in rpm, Q in m³/s, H in m
  (the n_q of Gülich, *Centrifugal Pumps*, ch. 3; ANSI/HI 9.6.3 uses the same definition in
  its own units).  Q is the flow **per impeller eye** (a double-suction impeller counts
  half its flow) and H the head **per stage**; the pump data here are taken as one stage.
* US customary form N_s = n √Q_gpm / H_ft^0.75 (US gallons per minute, feet).
* Dimensionless form ω_s = ω √Q / (g H)^0.75 with ω = 2π n / 60 in rad/s (SI throughout).
* Suction specific speed S = n √Q / NPSH_R^0.75 (same units as n_s; US form N_ss with gpm
  and ft), NPSH_R at the best-efficiency flow (ANSI/HI 9.6.1 and Gülich ch. 6 define it at
  BEP with the flow per eye; the NPSH_R given with the pump data is used as it is).

Conversion factors, derived from the exact unit definitions (1 US gal = 3.785 411 784 L and
1 ft = 0.3048 m, NIST SP 811 Appendix B; g = 9.806 65 m/s², CGPM 1901):

* Q_gpm = Q · 60 / 0.003 785 411 784 and H_ft = H / 0.3048, so
  N_s / n_s = √(60 / 0.003 785 411 784) · 0.3048^0.75 = 51.645 (the 51.64 quoted in the
  pump literature).
* ω_s / n_s = (2π / 60) / g^0.75 = 0.018 897, i.e. n_s = 52.919 ω_s (Gülich quotes
  n_q = 52.9 ω_s — from memory; verify), and N_s = 2733 ω_s.

Suggested criteria (:func:`suggested_criteria`), each default with its source:

* NPSH margin ratio by suction specific speed — :data:`NPSH_MARGIN_BANDS`, after the
  margins ANSI/HI 9.6.1 gives for water and wastewater service by suction energy (from
  memory; verify).  The standard classes suction energy by eye diameter × speed × S × SG;
  the eye diameter is not part of the pump data, so S alone is used as the measure of
  suction energy (common practice, e.g. the S ≈ 8500 / 11 000 US limits of the reliability
  literature — from memory; verify).
* Operating regions by pump specific speed — :data:`OPERATING_REGION_BANDS`, after
  ANSI/HI 9.6.3: preferred region 70–120 % of BEP flow for N_s below 4500 US, 80–115 %
  above (from memory; verify); the allowable region is the manufacturer's to state — the
  values here are common practice (from memory; verify).

Finding code raised here (stable; see :func:`criteria_findings`):

==================================  =================================================
``criteria_looser_than_suggested``  a criterion is looser than the one the specific speeds
                                    suggest (info; the project's criteria are kept)
==================================  =================================================
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, overload

import numpy as np
from numpy.typing import ArrayLike

from hydraulics.constants import STANDARD_GRAVITY_M_S2
from hydraulics.model import Criteria
from hydraulics.number_format import fixed_decimals, general_number, percent_number
from hydraulics.results import Finding, FloatArray, PumpSpecificSpeeds

if TYPE_CHECKING:
    from hydraulics.pump_fit import FittedPump

__all__ = [
    "US_GALLON_M3", "FOOT_M", "US_PER_SI", "DIMENSIONLESS_PER_SI", "specific_speed", "suction_specific_speed",
    "dimensionless_specific_speed", "pump_specific_speeds", "NpshMarginBand", "OperatingRegionBand",
    "NPSH_MARGIN_BANDS", "OPERATING_REGION_BANDS", "SuggestedCriteria", "suggested_criteria", "criteria_findings",
]

US_GALLON_M3 = 3.785411784e-3
"""One US liquid gallon in m³ (exact; NIST SP 811, Appendix B.8)."""
FOOT_M = 0.3048
"""One international foot in m (exact; NIST SP 811, Appendix B.8)."""
US_PER_SI = math.sqrt(60.0 / US_GALLON_M3) * FOOT_M**0.75
"""N_s (rpm, gpm, ft) per n_s (rpm, m³/s, m): √(60 / gal) · ft^0.75 = 51.645."""
DIMENSIONLESS_PER_SI = (2.0 * math.pi / 60.0) / STANDARD_GRAVITY_M_S2**0.75
"""ω_s per n_s (rpm, m³/s, m): (2π/60) / g^0.75 = 0.018897."""


@overload
def specific_speed(speed_rpm: float, flow_m3_s: float, head_m: float, impeller_eyes: int = 1) -> float: ...
@overload
def specific_speed(speed_rpm: ArrayLike, flow_m3_s: ArrayLike, head_m: ArrayLike,
                   impeller_eyes: int = 1) -> float | FloatArray: ...
def specific_speed(speed_rpm: ArrayLike, flow_m3_s: ArrayLike, head_m: ArrayLike,
                   impeller_eyes: int = 1) -> float | FloatArray:
    """Pump specific speed n_s = n √(Q / eyes) / H^0.75 (rpm, m³/s, m; Gülich ch. 3).

    Multiply by :data:`US_PER_SI` for the US form N_s, by :data:`DIMENSIONLESS_PER_SI`
    for ω_s.  Hand calculation: 1450 rpm, 0.1 m³/s, 30 m:
    1450 × 0.316228 / 12.8190 = 35.77.

    >>> round(specific_speed(1450.0, 0.1, 30.0), 2)
    35.77
    """
    value = (np.asarray(speed_rpm, dtype=np.float64) * np.sqrt(np.asarray(flow_m3_s, dtype=np.float64) / impeller_eyes)
             / np.asarray(head_m, dtype=np.float64) ** 0.75)
    return float(value) if value.ndim == 0 else value


@overload
def suction_specific_speed(speed_rpm: float, flow_m3_s: float, npsh_required_m: float,
                           impeller_eyes: int = 1) -> float: ...
@overload
def suction_specific_speed(speed_rpm: ArrayLike, flow_m3_s: ArrayLike, npsh_required_m: ArrayLike,
                           impeller_eyes: int = 1) -> float | FloatArray: ...
def suction_specific_speed(speed_rpm: ArrayLike, flow_m3_s: ArrayLike, npsh_required_m: ArrayLike,
                           impeller_eyes: int = 1) -> float | FloatArray:
    """Suction specific speed S = n √(Q / eyes) / NPSH_R^0.75 (rpm, m³/s, m; ANSI/HI 9.6.1, Gülich ch. 6).

    Multiply by :data:`US_PER_SI` for the US form N_ss.
    """
    return specific_speed(speed_rpm, flow_m3_s, npsh_required_m, impeller_eyes)


def dimensionless_specific_speed(speed_rpm: float, flow_m3_s: float, head_m: float,
                                 gravity_m_s2: float = STANDARD_GRAVITY_M_S2) -> float:
    """ω_s = ω √Q / (g H)^0.75 with ω = 2π n/60 (rad/s, m³/s, m; dimensionless; Gülich ch. 3)."""
    omega = 2.0 * math.pi * speed_rpm / 60.0
    return float(omega * math.sqrt(flow_m3_s) / (gravity_m_s2 * head_m) ** 0.75)


def pump_specific_speeds(fitted: FittedPump, impeller_eyes: int = 1) -> PumpSpecificSpeeds | None:
    """The specific speeds of ``fitted`` at its best-efficiency point (``None`` without one).

    At the rated speed and full impeller of the data; NPSH_R from the fitted NPSH curve at
    the best-efficiency flow (the suction values ``None`` without NPSH data or with a
    non-positive NPSH_R there).
    """
    q, h = fitted.bep_flow_m3_s, fitted.bep_head_m
    if q is None or h is None or not (q > 0.0 and h > 0.0):
        return None
    n = float(fitted.pump.rated_speed_rpm)
    n_s = specific_speed(n, q, h, impeller_eyes)
    npshr: float | None = None
    s_si: float | None = None
    if fitted.has_npsh:
        value = float(fitted.npsh_required(q))
        if math.isfinite(value) and value > 0.0:
            npshr = value
            s_si = suction_specific_speed(n, q, value, impeller_eyes)
    return PumpSpecificSpeeds(
        rated_speed_rpm=n, bep_flow_m3_s=float(q), bep_head_m=float(h), impeller_eyes=int(impeller_eyes),
        specific_speed_si=n_s, specific_speed_us=n_s * US_PER_SI,
        specific_speed_dimensionless=dimensionless_specific_speed(n, q / impeller_eyes, h),
        npsh_required_at_bep_m=npshr, suction_specific_speed_si=s_si,
        suction_specific_speed_us=None if s_si is None else s_si * US_PER_SI,
    )


@dataclass(frozen=True)
class NpshMarginBand:
    """NPSH margin ratio NPSH_A / NPSH_R for suction specific speeds up to ``s_us_max`` (US units)."""

    s_us_max: float
    margin_ratio: float
    label: str
    source: str


@dataclass(frozen=True)
class OperatingRegionBand:
    """Operating regions (fractions of BEP flow) for pump specific speeds up to ``ns_us_max`` (US units)."""

    ns_us_max: float
    preferred_low: float
    preferred_high: float
    allowable_low: float
    allowable_high: float
    label: str
    source: str


NPSH_MARGIN_BANDS: tuple[NpshMarginBand, ...] = (
    NpshMarginBand(8500.0, 1.1, "ordinary suction energy (S up to 8500 US, 165 SI)",
                   "after ANSI/HI 9.6.1, water and wastewater, low suction energy; from memory; verify"),
    NpshMarginBand(11000.0, 1.3, "high suction energy (S 8500–11 000 US, 165–213 SI)",
                   "after ANSI/HI 9.6.1, water and wastewater, high suction energy; from memory; verify"),
    NpshMarginBand(math.inf, 1.5, "very high suction energy (S above 11 000 US, 213 SI)",
                   "after ANSI/HI 9.6.1, very high suction energy; the ratio is common practice; "
                   "from memory; verify"),
)
"""NPSH margin ratio by suction specific speed (bands in US units; upper bounds inclusive)."""

NPSH_MARGIN_MIN_M = 0.6
"""Least NPSH margin NPSH_A − NPSH_R (m), the project default's value (after ANSI/HI 9.6.1; from a
secondary summary; verify)."""

OPERATING_REGION_BANDS: tuple[OperatingRegionBand, ...] = (
    OperatingRegionBand(4500.0, 0.70, 1.20, 0.40, 1.30, "radial-flow impeller (N_s up to 4500 US, 87 SI)",
                        "preferred after ANSI/HI 9.6.3 (from memory; verify); allowable common practice "
                        "(from memory; verify; the manufacturer states it)"),
    OperatingRegionBand(math.inf, 0.80, 1.15, 0.60, 1.20, "mixed or axial-flow impeller (N_s above 4500 US, 87 SI)",
                        "preferred after ANSI/HI 9.6.3 (from memory; verify); allowable common practice "
                        "(from memory; verify; the manufacturer states it)"),
)
"""Preferred and allowable operating regions by pump specific speed (bands in US units)."""


@dataclass(frozen=True)
class SuggestedCriteria:
    """Criteria suggested for a pump: ``criteria`` is the given criteria with the suggested fields replaced.

    ``npsh_band`` is ``None`` when the suction specific speed is unknown (no NPSH data); the
    NPSH fields of ``criteria`` are then left as given.
    """

    speeds: PumpSpecificSpeeds
    criteria: Criteria
    npsh_band: NpshMarginBand | None
    region_band: OperatingRegionBand


def _npsh_band(s_us: float) -> NpshMarginBand:
    return next(b for b in NPSH_MARGIN_BANDS if s_us <= b.s_us_max)


def _region_band(ns_us: float) -> OperatingRegionBand:
    return next(b for b in OPERATING_REGION_BANDS if ns_us <= b.ns_us_max)


def suggested_criteria(fitted: FittedPump, base: Criteria | None = None,
                       impeller_eyes: int = 1) -> SuggestedCriteria | None:
    """The criteria the pump's specific speeds suggest (``None`` without a best-efficiency point).

    Fields other than the NPSH margin and the operating regions are those of ``base``
    (default :class:`~hydraulics.model.Criteria`).  A suggestion only: the project's
    criteria are never changed by the solve.
    """
    speeds = pump_specific_speeds(fitted, impeller_eyes)
    if speeds is None:
        return None
    criteria = Criteria() if base is None else base
    region = _region_band(speeds.specific_speed_us)
    criteria = replace(criteria, preferred_region_low=region.preferred_low,
                       preferred_region_high=region.preferred_high,
                       allowable_region_low=region.allowable_low, allowable_region_high=region.allowable_high)
    npsh: NpshMarginBand | None = None
    if speeds.suction_specific_speed_us is not None:
        npsh = _npsh_band(speeds.suction_specific_speed_us)
        criteria = replace(criteria, npsh_margin_ratio=npsh.margin_ratio, npsh_margin_min_m=NPSH_MARGIN_MIN_M)
    return SuggestedCriteria(speeds, criteria, npsh, region)


def _looser_fields(given: Criteria, suggested: SuggestedCriteria) -> list[str]:
    s = suggested.criteria
    out = []
    if suggested.npsh_band is not None:
        if given.npsh_margin_ratio < s.npsh_margin_ratio - 1e-9:
            out.append(f"NPSH margin ratio {fixed_decimals(given.npsh_margin_ratio, 2)} "
                       f"(suggested {fixed_decimals(s.npsh_margin_ratio, 2)}, {suggested.npsh_band.label}; "
                       f"{suggested.npsh_band.source})")
        if given.npsh_margin_min_m < s.npsh_margin_min_m - 1e-9:
            out.append(f"least NPSH margin {fixed_decimals(given.npsh_margin_min_m, 2)} m "
                       f"(suggested {fixed_decimals(s.npsh_margin_min_m, 2)} m)")
    band = suggested.region_band
    pairs = (("preferred", given.preferred_region_low, given.preferred_region_high, s.preferred_region_low,
              s.preferred_region_high),
             ("allowable", given.allowable_region_low, given.allowable_region_high, s.allowable_region_low,
              s.allowable_region_high))
    for name, low, high, s_low, s_high in pairs:
        if low < s_low - 1e-9 or high > s_high + 1e-9:
            out.append(f"{name} region {percent_number(low)}–{percent_number(high)} % of BEP flow "
                       f"(suggested {percent_number(s_low)}–{percent_number(s_high)} %, {band.label}; {band.source})")
    return out


def criteria_findings(criteria: Criteria, fitted: FittedPump, impeller_eyes: int = 1) -> list[Finding]:
    """An info finding when ``criteria`` are looser than the specific speeds suggest, quoting them.

    Looser: a smaller NPSH margin ratio or least margin, or an operating region reaching
    further from the best-efficiency flow on either side.  The criteria are not changed.
    """
    suggested = suggested_criteria(fitted, criteria, impeller_eyes)
    if suggested is None:
        return []
    looser = _looser_fields(criteria, suggested)
    if not looser:
        return []
    sp = suggested.speeds
    speeds = (f"specific speed n_s {general_number(sp.specific_speed_si, 3)} (rpm, m³/s, m; "
              f"N_s {fixed_decimals(sp.specific_speed_us, 0)} US)")
    if sp.suction_specific_speed_si is not None and sp.suction_specific_speed_us is not None:
        speeds += (f", suction specific speed S {general_number(sp.suction_specific_speed_si, 3)} "
                   f"(N_ss {fixed_decimals(sp.suction_specific_speed_us, 0)} US)")
    return [Finding(
        "info", "criteria_looser_than_suggested",
        f"At its best-efficiency point the pump has {speeds}; the project's criteria are looser than these "
        "suggest: " + "; ".join(looser) + ". The project's criteria are used.",
        f"pump '{fitted.pump.name}'",
        "Review the criteria; tighten them unless the manufacturer states wider limits for this pump.",
        ("pump", fitted.pump.pump_id))]
