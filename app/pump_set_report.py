"""The installed pumps in the plain-text report: the list, the run sequence, and each pump's share.

Part of the summary printed by ``pumpsketch solve FILE`` (:func:`app.text_report.summary_text`);
it only formats :attr:`hydraulics.results.Solution.pump_set`.
"""

from __future__ import annotations

from hydraulics.energy import JOULES_PER_KWH
from hydraulics.number_format import MISSING, fixed_decimals, percent_number
from hydraulics.results import PumpSetPoint, PumpSetResult, PumpShare, Solution
from hydraulics.units import to_display, unit_label


def _aligned(headers: list[str], rows: list[list[str]], left: int = 1) -> list[str]:
    """Columns padded to their widest cell; the first ``left`` columns left-aligned, the rest right."""
    widths = [max([len(h)] + [len(r[i]) for r in rows]) for i, h in enumerate(headers)]

    def line(cells: list[str]) -> str:
        return "  ".join(c.ljust(w) if i < left else c.rjust(w)
                         for i, (c, w) in enumerate(zip(cells, widths, strict=True))).rstrip()

    return [line(headers), "  ".join("-" * w for w in widths)] + [line(r) for r in rows]


def _list_section(pump_set: PumpSetResult) -> list[str]:
    rows = [[p.tag, p.pump_name, p.role, p.control + (", the arrangement's" if p.from_arrangement else "")]
            for p in pump_set.pumps]
    out = ["", "Installed pumps (each with its own branch; the arrangement's identical pumps first):"]
    out += ["  " + line for line in _aligned(["pump", "model", "role", "control"], rows, left=4)]
    stages = "; ".join("+".join(stage) for stage in pump_set.stages) or "none"
    out.append(f"  run sequence (duty pumps, then assist pumps as the flow needs them): {stages}")
    standby = [p.tag for p in pump_set.pumps if p.role == "standby"]
    if standby:
        out.append(f"  standby ({', '.join(standby)}): runs only in place of a pump out of service")
    return out


def _set_title(point: PumpSetPoint) -> str:
    text = f"{point.label}, {point.static} static, {point.pipe} pipe, {point.speed}"
    return text if point.basis == "run sequence" else f"{text} ({point.basis})"


def pump_set_section(solution: Solution, system: str = "SI") -> list[str]:
    """Report lines: the installed pumps, and every set of pumps of different models with each pump's share."""
    pump_set = solution.pump_set
    if pump_set is None or not pump_set.pumps:
        return []
    out = _list_section(pump_set)
    if not pump_set.points:
        return out
    fl, hd, pw = unit_label("flow", system), unit_label("head", system), unit_label("power", system)

    def d(value: float | None, quantity: str, decimals: int = 2) -> str:
        return MISSING if value is None else fixed_decimals(to_display(value, quantity, system), decimals)

    def specific(kwh_m3: float | None) -> str:  # the engine reports kWh/m³; the quantity is stored in J/m³
        return MISSING if kwh_m3 is None else d(kwh_m3 * JOULES_PER_KWH, "specific_energy", 3)

    def share_row(share: PumpShare) -> list[str]:
        note = "held shut by its check valve" if share.shut_off else ("extrapolated" if share.extrapolated else "")
        return [f"{share.tag} ({share.role})", percent_number(share.speed_ratio), d(share.flow_m3_s, "flow", 1),
                d(share.head_m, "head", 1), percent_number(share.efficiency, 1), d(share.shaft_power_w, "power", 1),
                d(share.input_power_w, "power", 1), percent_number(share.bep_flow_ratio),
                d(share.npsh_available_m, "head", 1), d(share.npsh_margin_m, "head", 1), note]

    out += ["", "Pumps of different models together (in parallel at the manifold head; each pump's share):"]
    headers = ["pump", "speed %", f"flow {fl}", f"head {hd}", "eff %", f"shaft {pw}", f"input {pw}", "% BEP",
               f"NPSHa {hd}", f"NPSH margin {hd}", "note"]
    for point in pump_set.points:
        title = _set_title(point)
        if not point.found:
            out.append(f"  {title}: no operating point ({point.reason or 'not found'})")
            continue
        out.append(f"  {title}: station {d(point.flow_m3_s, 'flow', 1)} {fl} at manifold head "
                   f"{d(point.manifold_head_m, 'head', 1)} {hd}, input {d(point.input_power_w, 'power', 1)} {pw}, "
                   f"{specific(point.specific_energy_kwh_m3)} {unit_label('specific_energy', system)}")
        out += ["    " + line for line in _aligned(headers, [share_row(s) for s in point.shares])]
    return out
