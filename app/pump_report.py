"""The text printed by ``pumpsketch import-pump CSV``: the data, the fits and their quality."""

from __future__ import annotations

import numpy as np

from hydraulics.model import PumpModel
from hydraulics.number_format import MISSING, fixed_decimals, general_number, percent_number
from hydraulics.results import FitQuality, FittedPump


def _quality_line(label: str, quality: FitQuality | None, unit: str, scale: float = 1.0) -> str:
    if quality is None:
        return f"  {label:16s} no data"
    return (f"  {label:16s} order {quality.order}, {quality.n_points} points, "
            f"RMS residual {general_number(quality.rms * scale, 3)} {unit}, "
            f"largest {general_number(quality.max_abs * scale, 3)} {unit}")


def _litres(flow_m3_s: float) -> str:
    """A flow in L/s with two decimals (the report is in SI)."""
    return fixed_decimals(float(flow_m3_s) * 1000.0, 2)


def pump_fit_text(pump: PumpModel, fitted: FittedPump) -> str:
    """Points beside the fitted values, fit residuals, BEP and the valid range."""
    q = np.asarray(pump.flow_m3_s)
    lines = [f"Pump data: {pump.name} (rated speed {general_number(pump.rated_speed_rpm, 6)} rpm)", ""]
    header = f"  {'flow L/s':>9s} {'head m':>8s} {'fit m':>8s}"
    if fitted.has_efficiency:
        header += f" {'eff %':>7s} {'fit %':>7s}"
    if fitted.has_npsh:
        header += f" {'NPSHr m':>8s} {'fit m':>7s}"
    lines.append(header)
    head_fit = fitted.head(q)
    eff_fit = fitted.efficiency(q) if fitted.has_efficiency else None
    npsh_fit = fitted.npsh_required(q) if fitted.has_npsh else None
    for i in range(len(q)):
        row = f"  {_litres(q[i]):>9s} {fixed_decimals(pump.head_m[i]):>8s} {fixed_decimals(head_fit[i]):>8s}"
        if eff_fit is not None:
            given = percent_number(pump.efficiency[i], 1) if pump.efficiency else MISSING
            row += f" {given:>7s} {percent_number(eff_fit[i], 1):>7s}"
        if npsh_fit is not None:
            row += f" {fixed_decimals(pump.npsh_required_m[i]):>8s} {fixed_decimals(npsh_fit[i]):>7s}"
        lines.append(row)
    lines += [
        "",
        "Fits (least squares):",
        _quality_line("head", fitted.head_fit, "m"),
        _quality_line("efficiency", fitted.efficiency_fit, "%-points", 100.0),
        _quality_line("shaft power", fitted.power_fit, "kW", 1e-3),
        _quality_line("NPSH required", fitted.npsh_fit, "m"),
        "",
        f"Valid flow range (the data): {_litres(fitted.flow_min_m3_s)} – {_litres(fitted.flow_max_m3_s)} L/s;"
        " results outside it are flagged as extrapolated.",
        f"Shut-off head: {fixed_decimals(fitted.shutoff_head_m)} m"
        + (" (extrapolated from the data)" if fitted.shutoff_extrapolated else ""),
    ]
    if fitted.bep_flow_m3_s is not None:
        lines.append(f"Best-efficiency point: {_litres(fitted.bep_flow_m3_s)} L/s at "
                     f"{fixed_decimals(fitted.bep_head_m)} m, efficiency {percent_number(fitted.bep_efficiency, 1)} %"
                     + (" (at the end of the data: the true BEP may lie beyond)" if fitted.bep_at_end_of_data else ""))
    else:
        lines.append("Best-efficiency point: unknown (no efficiency or power data)")
    if fitted.has_rising_then_falling_head:
        lines.append(f"Note: the head curve rises to {fixed_decimals(fitted.head_peak_m)} m at "
                     f"{_litres(fitted.head_peak_flow_m3_s)} L/s and then falls (unstable in parallel).")
    return "\n".join(lines) + "\n"
