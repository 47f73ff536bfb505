"""The text printed by ``pumpsketch import-pump CSV``: the data, the fits and their quality."""

from __future__ import annotations

import numpy as np

from hydraulics.model import PumpModel


def _quality_line(label: str, quality, unit: str, scale: float = 1.0) -> str:
    if quality is None:
        return f"  {label:16s} no data"
    return (f"  {label:16s} order {quality.order}, {quality.n_points} points, "
            f"RMS residual {quality.rms * scale:.3g} {unit}, largest {quality.max_abs * scale:.3g} {unit}")


def pump_fit_text(pump: PumpModel, fitted) -> str:
    """Points beside the fitted values, fit residuals, BEP and the valid range."""
    q = np.asarray(pump.flow_m3_s)
    lines = [f"Pump data: {pump.name} (rated speed {pump.rated_speed_rpm:g} rpm)", ""]
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
        row = f"  {q[i] * 1000:9.2f} {pump.head_m[i]:8.2f} {head_fit[i]:8.2f}"
        if eff_fit is not None:
            given = f"{pump.efficiency[i] * 100:7.1f}" if pump.efficiency else f"{'—':>7s}"
            row += f" {given} {eff_fit[i] * 100:7.1f}"
        if npsh_fit is not None:
            row += f" {pump.npsh_required_m[i]:8.2f} {npsh_fit[i]:7.2f}"
        lines.append(row)
    lines += [
        "",
        "Fits (least squares):",
        _quality_line("head", fitted.head_fit, "m"),
        _quality_line("efficiency", fitted.efficiency_fit, "%-points", 100.0),
        _quality_line("shaft power", fitted.power_fit, "kW", 1e-3),
        _quality_line("NPSH required", fitted.npsh_fit, "m"),
        "",
        f"Valid flow range (the data): {fitted.flow_min_m3_s * 1000:.2f} – {fitted.flow_max_m3_s * 1000:.2f} L/s;"
        " results outside it are flagged as extrapolated.",
        f"Shut-off head: {fitted.shutoff_head_m:.2f} m" + (" (extrapolated from the data)" if fitted.shutoff_extrapolated else ""),
    ]
    if fitted.bep_flow_m3_s is not None:
        lines.append(f"Best-efficiency point: {fitted.bep_flow_m3_s * 1000:.2f} L/s at {fitted.bep_head_m:.2f} m, "
                     f"efficiency {fitted.bep_efficiency * 100:.1f} %"
                     + (" (at the end of the data: the true BEP may lie beyond)" if fitted.bep_at_end_of_data else ""))
    else:
        lines.append("Best-efficiency point: unknown (no efficiency or power data)")
    if fitted.has_rising_then_falling_head:
        lines.append(f"Note: the head curve rises to {fitted.head_peak_m:.2f} m at "
                     f"{fitted.head_peak_flow_m3_s * 1000:.2f} L/s and then falls (unstable in parallel).")
    return "\n".join(lines) + "\n"
