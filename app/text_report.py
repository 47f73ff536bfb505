"""The human-readable summary printed by ``pumpsketch solve FILE``."""

from __future__ import annotations

import math

import numpy as np

from app.pump_set_report import pump_set_section
from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.energy import JOULES_PER_KWH
from hydraulics.number_format import (
    MISSING,
    fixed_decimals,
    general_number,
    grouped_whole_number,
    percent_number,
)
from hydraulics.results import FluidProperties, MotorResult, Solution
from hydraulics.units import to_display, unit_label


def _table(headers: list[str], rows: list[list[str]]) -> list[str]:
    widths = [max(len(h), *(len(r[i]) for r in rows)) if rows else len(h) for i, h in enumerate(headers)]
    line = "  ".join(h.rjust(w) for h, w in zip(headers, widths, strict=True))
    out = [line, "  ".join("-" * w for w in widths)]
    out += ["  ".join(c.rjust(w) for c, w in zip(r, widths, strict=True)) for r in rows]
    return out


def _wrap(text: str, width: int = 96) -> list[str]:
    words, lines, line = text.split(), [], ""
    for word in words:
        if len(line) + len(word) + 1 > width:
            lines.append(line)
            line = word
        else:
            line = f"{line} {word}".strip()
    return lines + ([line] if line else [])


def _fluid_description(fluid: FluidProperties, system: str) -> str:
    """The engine's fluid description (temperature in °C) with the temperature in ``system``."""
    si = f"at {fixed_decimals(fluid.temperature_c, 1)} °C"
    shown = (f"at {fixed_decimals(to_display(fluid.temperature_c, 'temperature', system), 1)} "
             f"{unit_label('temperature', system)}")
    return fluid.description.replace(si, shown, 1)


def _profile_section(solution: Solution, system: str) -> list[str]:
    """The main's profile: the governing control per scenario, its lowest and highest pressure, the ratings."""
    profile = solution.profile
    if profile is None:
        return []

    def d(value: float, quantity: str, decimals: int = 2) -> str:
        return MISSING if not math.isfinite(value) else fixed_decimals(to_display(value, quantity, system), decimals)

    ln, hd, pr = unit_label("length", system), unit_label("head", system), unit_label("pressure", system)

    def control(chainage_m: float) -> str:
        return "delivery" if math.isnan(chainage_m) else f"crest at {d(chainage_m, 'length', 0)} {ln}"

    x = profile.chainage_m
    vented = ", ".join(d(v, "length", 0) for v in profile.air_valve_chainage_m.tolist()) or "none"
    out = ["", f"Profile of the main (chainage {d(float(x[0]), 'length', 0)}–{d(float(x[-1]), 'length', 0)} {ln}; "
               f"air valves at: {vented}{'' if vented == 'none' else ' ' + ln}):"]
    rows = []
    for line in profile.scenarios + profile.at_rest:
        low, high = int(np.argmin(line.pressure_head_m)), int(np.argmax(line.pressure_head_m))
        rows.append([line.label, control(line.control_chainage_m),
                     d(float(line.pressure_head_m[low]), "head"), d(float(x[low]), "length", 0),
                     d(float(line.pressure_head_m[high]), "head"), d(float(x[high]), "length", 0)])
    out += ["  " + row for row in _table(
        ["scenario", "governing control", f"lowest {hd}", f"at {ln}", f"highest {hd}", f"at {ln}"], rows)]
    main = [s for s in solution.segments if s.side == "delivery" and s.carries == "station"]
    ratings = profile.segment_rating_pa
    if ratings is not None and len(main) == len(ratings):
        parts = [f"'{seg.name}' " + (f"{d(float(r), 'pressure', 0)} {pr}" if math.isfinite(float(r)) else "not known")
                 for seg, r in zip(main, ratings.tolist(), strict=True)]
        out.append("  pipe rating (gauge, from the pipe series): " + "; ".join(parts))
    return out


def _specific_speed_section(solution: Solution, system: str) -> list[str]:
    """The pump's specific speeds at its best-efficiency point and the conservative NPSH case."""
    out: list[str] = []
    for fitted, speeds in zip(solution.pump_fits, solution.specific_speeds, strict=False):
        if speeds is None:
            out += ["", f"Pump '{fitted.pump.name}': no best-efficiency point, specific speeds unknown"]
            continue
        out += ["", f"Pump '{fitted.pump.name}' at its best-efficiency point "
                    f"({general_number(speeds.rated_speed_rpm, 6)} rpm, flow per impeller eye, one stage):",
                f"  specific speed n_s {general_number(speeds.specific_speed_si, 4)} (rpm, m³/s, m), "
                f"N_s {fixed_decimals(speeds.specific_speed_us, 0)} (rpm, gpm, ft), "
                f"ω_s {general_number(speeds.specific_speed_dimensionless, 3)}"]
        if speeds.suction_specific_speed_si is not None and speeds.suction_specific_speed_us is not None:
            out.append(f"  suction specific speed S {general_number(speeds.suction_specific_speed_si, 4)} "
                       f"(rpm, m³/s, m), N_ss {fixed_decimals(speeds.suction_specific_speed_us, 0)} (rpm, gpm, ft)")
    if solution.operating_points:
        out.append("  NPSH available at each operating point is taken at its own scenario's suction level.")
    worst = solution.npsh_worst_case
    if worst is not None:
        hd = unit_label("head", system)

        def d(value: float, quantity: str) -> str:
            return fixed_decimals(to_display(value, quantity, system), 2)

        out.append(f"  NPSH, conservative case ({worst.basis}; {d(worst.flow_per_pump_m3_s, 'flow')} "
                   f"{unit_label('flow', system)} per pump): available {d(worst.npsh_available_m, 'head')} {hd}, "
                   f"required {d(worst.npsh_required_m, 'head')} {hd}, criteria ask for "
                   f"{d(worst.required_available_m, 'head')} {hd}"
                   + ("" if worst.sufficient else " — insufficient"))
    return out


def _capacity_section(solution: Solution, system: str) -> list[str]:
    """The design capacity at the worst case, with every duty pump and with one pump out."""
    cap = solution.capacity
    if cap is None:
        return []
    fl = unit_label("flow", system)

    def q(value: float) -> str:
        return f"{fixed_decimals(to_display(value, 'flow', system), 1)} {fl}"

    def short(flow: float, fraction: float) -> str:
        return "meets the design flow" if flow <= 0.0 else f"short by {q(flow)} ({percent_number(fraction, 1)} %)"

    pumps = "1 pump" if cap.duty_count == 1 else f"{cap.duty_count} pumps"
    out_pumps = "1 pump" if cap.pumps_one_out == 1 else f"{cap.pumps_one_out} pumps"
    how = "standby running" if cap.standby_count >= 1 else "no standby"
    return ["", f"Capacity (design flow {q(cap.design_flow_m3_s)}; {cap.static} static, {cap.pipe} pipe, "
                f"{percent_number(cap.speed_ratio)} % speed):",
            f"  all duty pumps ({pumps}): {q(cap.flow_all_duty_m3_s)}, "
            f"{short(cap.shortfall_all_duty_m3_s, cap.shortfall_all_duty_fraction)}",
            f"  one pump out of service ({out_pumps}, {how}): {q(cap.flow_one_out_m3_s)}, "
            f"{short(cap.shortfall_one_out_m3_s, cap.shortfall_one_out_fraction)}"]


def _motor_section(solution: Solution, system: str) -> list[str]:
    """The motor against the shaft power per pump (points, allowable region, run-out), the arrangement's
    and each pump's beside it."""
    if solution.motor is None:
        return []
    m, a = solution.motor, solution.project.arrangement
    control = (f"variable speed {percent_number(a.min_speed_ratio)}–{percent_number(m.max_speed_ratio)} %"
               if m.variable_speed and a is not None else f"fixed speed {percent_number(m.speed_ratio)} %")
    out = _one_motor("Motor", m, control, system)
    if solution.pump_set is None:
        return out
    controls = {row.tag: row.control for row in solution.pump_set.pumps}
    for each in solution.pump_set.motors:
        text = controls.get(each.tag, "")
        out += _one_motor(f"Motor of {each.tag} ({each.pump_name})", each.motor, text, system)
    return out


def _one_motor(title: str, m: MotorResult, control: str, system: str) -> list[str]:
    pl = unit_label("power", system)

    def p(value: float | None) -> str:
        return "not known" if value is None else f"{fixed_decimals(to_display(value, 'power', system), 1)} {pl}"

    rating = "not given" if m.rating_w is None else f"{p(m.rating_w)} × service factor {m.service_factor:g}"
    return ["", f"{title} ({control}; motor efficiency {percent_number(m.motor_efficiency)} %, "
                f"drive efficiency {percent_number(m.drive_efficiency)} %):",
            f"  rating: {rating}",
            f"  shaft power per pump: operating points up to {p(m.max_shaft_power_at_points_w)}; "
            f"allowable region up to {p(m.max_shaft_power_allowable_w)} "
            f"({p(m.max_shaft_power_allowable_at_max_speed_w)} at maximum speed)",
            f"  to the end of the curve: {p(m.max_shaft_power_run_out_w)} "
            f"({p(m.max_shaft_power_run_out_at_max_speed_w)} at maximum speed); "
            f"non-overloading motor {p(m.non_overloading_size_w)} (IEC 60072-1 series)"]


def _duty_profile_section(solution: Solution, system: str) -> list[str]:
    """The energy over a year of real duty: one row per band, then the totals."""
    duty = solution.duty_profile
    if duty is None:
        return []
    fl, hd, pw = unit_label("flow", system), unit_label("head", system), unit_label("power", system)
    se, vol = unit_label("specific_energy", system), unit_label("volume", system)

    def d(value: float | None, quantity: str, decimals: int = 1) -> str:
        return MISSING if value is None else fixed_decimals(to_display(value, quantity, system), decimals)

    def specific(kwh_m3: float | None) -> str:
        return MISSING if kwh_m3 is None else d(kwh_m3 * JOULES_PER_KWH, "specific_energy", 3)

    strategy = "variable speed to match the flow" if duty.strategy == "variable_speed" else "fixed-speed staging"
    out = ["", f"Energy over the year of duty ({strategy}; {duty.basis}, {d(duty.static_head_m, 'head', 2)} {hd}; "
               f"{duty.pipe} pipe):"]
    rows = []
    for b in duty.bands:
        rows.append([str(b.index + 1), d(b.flow_m3_s, "flow"), grouped_whole_number(b.hours), b.pumps or "none",
                     b.control, MISSING if b.speed_ratio is None else percent_number(b.speed_ratio, 1),
                     d(b.station_flow_m3_s, "flow"), d(b.manifold_head_m, "head"), percent_number(b.efficiency, 1),
                     d(b.input_power_w, "power"), specific(b.specific_energy_kwh_m3),
                     grouped_whole_number(b.run_hours), grouped_whole_number(to_display(b.pumped_volume_m3, "volume",
                                                                                        system)),
                     grouped_whole_number(b.energy_kwh)])
    out += ["  " + line for line in _table(
        ["band", f"flow {fl}", "hours", "pumps", "control", "speed %", f"running {fl}", f"head {hd}",
         "wire-water %", f"input {pw}", se, "run h", f"volume {vol}", "kWh/yr"], rows)]
    for b in duty.bands:
        if b.note:
            out.append(f"  band {b.index + 1}: {b.note}")
    stages = "; ".join(f"{s.pumps} {d(s.flow_m3_s, 'flow')} {fl}" for s in duty.stages)
    out.append(f"  stages at their own speeds: {stages}")
    out.append(f"  annual energy {grouped_whole_number(duty.energy_kwh)} kWh, cost {grouped_whole_number(duty.cost)} "
               f"{duty.currency} at {general_number(duty.tariff_per_kwh, 6)} {duty.currency}/kWh")
    out.append(f"  volume {grouped_whole_number(to_display(duty.volume_m3, 'volume', system))} {vol} a year, "
               f"mean specific energy {specific(duty.specific_energy_kwh_m3)} {se}, "
               f"pumps running {grouped_whole_number(duty.run_hours)} h of {grouped_whole_number(duty.hours)} h")
    if duty.shortfall_volume_m3 > 0.0:
        out.append(f"  not pumped: {grouped_whole_number(to_display(duty.shortfall_volume_m3, 'volume', system))} "
                   f"{vol} a year (bands above the station's capacity)")
    for note in duty.notes:
        out.append(f"  note: {note}")
    return out


def summary_text(solution: Solution, system: str = "SI") -> str:
    """A plain-text report of one solved project in the chosen unit system."""
    def d(value: float | None, quantity: str, decimals: int = 2) -> str:
        return MISSING if value is None else fixed_decimals(to_display(value, quantity, system), decimals)

    def specific(kwh_m3: float | None) -> str:  # the engine reports kWh/m³; the quantity is stored in J/m³
        return MISSING if kwh_m3 is None else d(kwh_m3 * JOULES_PER_KWH, "specific_energy", 3)

    fl, hd, vel, dia = (unit_label(q, system) for q in ("flow", "head", "velocity", "diameter"))
    p = solution.project
    f = solution.fluid
    out = [f"PumpSketch results — {p.name}", ""]
    out += [f"CAUTION: {line}" if i == 0 else f"         {line}" for i, line in enumerate(_wrap(CAUTIONS_TEXT, 86))]
    out += [
        "",
        f"Fluid: {_fluid_description(f, system)}",
        f"  density {d(f.density_kg_m3, 'density')} {unit_label('density', system)}, "
        f"kinematic viscosity "
        f"{general_number(to_display(f.kinematic_viscosity_m2_s, 'kinematic_viscosity', system), 4)} "
        f"{unit_label('kinematic_viscosity', system)}, vapour pressure "
        f"{d(f.vapour_pressure_pa, 'pressure', 3)} {unit_label('pressure', system)}",
        f"Atmospheric pressure: {d(solution.atmospheric_pressure_pa, 'pressure')} {unit_label('pressure', system)}",
        f"Static head: minimum {d(solution.static_head_min_m, 'head')} {hd}, "
        f"maximum {d(solution.static_head_max_m, 'head')} {hd}",
        f"Design flow: {d(solution.design_flow_m3_s, 'flow')} {fl}",
        "Friction method: "
        + ("Hazen–Williams" if p.friction_method == "hazen_williams" else "Darcy–Weisbach with Colebrook–White"),
        "",
        "Segments at design flow (new pipe):",
    ]
    branch = next((s for s in solution.segments if s.carries == "pump"), None)
    if branch is not None:
        out[-1] = (f"Segments at design flow (new pipe; 'per pump' rows carry one of {branch.pumps_running} "
                   f"duty pumps, {d(branch.flow_m3_s, 'flow', 1)} {fl}):")
    rows = [[s.name, s.side + (" per pump" if s.carries == "pump" else ""),
             d(s.internal_diameter_m, "diameter", 1), d(s.length_m, "length", 1),
             str(s.parallel_pipes), d(s.velocity_m_s, "velocity"), general_number(s.reynolds, 3),
             fixed_decimals(s.friction_factor, 5), d(s.friction_loss_m, "head", 3), fixed_decimals(s.minor_k_total, 2),
             d(s.minor_loss_m, "head", 3)] for s in solution.segments]
    out += ["  " + line for line in _table(
        ["segment", "side", f"ID {dia}", f"length {unit_label('length', system)}", "pipes", f"v {vel}", "Re", "f",
         f"friction {hd}", "ΣK", f"minor {hd}"], rows)]
    out += ["", f"System curves (head in {hd}):"]
    grid = solution.curves[0].flow_m3_s
    targets = np.array([0.0, 0.25, 0.5, 0.75, 1.0, 1.25, 1.5]) * solution.design_flow_m3_s
    targets = targets[targets <= grid[-1]]
    headers = [f"flow {fl}"] + [f"{c.static} static, {c.pipe}" for c in solution.curves]
    rows = []
    for q in targets:
        rows.append([d(q, "flow", 1)] + [d(float(np.interp(q, c.flow_m3_s, c.head_m)), "head")
                                                 for c in solution.curves])
    out += ["  " + line for line in _table(headers, rows)]
    out += _specific_speed_section(solution, system)
    if solution.operating_points:
        out += ["", "Operating points:"]
        rows = []
        for op in solution.operating_points:
            scenario = f"{op.static} static, {op.pipe}"
            if not op.found:
                rows.append([scenario, str(op.pumps_running), percent_number(op.speed_ratio)] + [MISSING] * 7
                            + [op.reason_text(system) or "no point"])
                continue
            rows.append([scenario, str(op.pumps_running), percent_number(op.speed_ratio),
                         d(op.flow_m3_s, "flow", 1), d(op.head_m, "head", 1), percent_number(op.efficiency, 1),
                         d(op.input_power_w, "power", 1),
                         specific(op.specific_energy_kwh_m3),
                         d(op.npsh_margin_m, "head", 1), percent_number(op.bep_flow_ratio),
                         "extrapolated" if op.extrapolated else ""])
        out += ["  " + line for line in _table(
            ["scenario", "pumps", "speed %", f"flow {fl}", f"head {hd}", "eff %",
             f"input {unit_label('power', system)}", unit_label("specific_energy", system), f"NPSH margin {hd}",
             "% BEP", "note"], rows)]
    out += pump_set_section(solution, system)
    vs = solution.variable_speed
    if vs is not None:
        out += ["", f"Variable speed (design flow {d(vs.target_flow_m3_s, 'flow', 1)} {fl} "
                    f"with {vs.pumps_running} pump(s); drive range {percent_number(vs.min_speed_ratio)}–"
                    f"{percent_number(vs.max_speed_ratio)} %):"]
        for item in vs.scenarios:
            speed = f"{percent_number(item.speed_ratio, 1)} %" if item.achievable else f"not reachable ({item.reason})"
            out.append(f"  {item.static} static, {item.pipe} pipe: {speed}")
        if vs.minimum_lift_speed_ratio is not None:
            out.append(f"  lowest speed that lifts against the maximum static head: "
                       f"{percent_number(vs.minimum_lift_speed_ratio, 1)} %")
    out += _capacity_section(solution, system)
    out += _motor_section(solution, system)
    out += _duty_profile_section(solution, system)
    e = solution.energy
    if e is not None:
        heading = ("Energy, simple estimate: all operating hours at the duty point (aged pipe, mean of the "
                   "static extremes)")
        if solution.duty_profile is not None:
            heading += "; the station's energy is the duty profile's above"
        out += ["", heading + ":"]
        if e.annual_energy_mean_kwh is None:
            out.append("  not computed: " + "; ".join(e.notes or ("no operating hours or annual volume",)))
        else:
            low = None if e.at_min_static is None else e.at_min_static.annual_energy_kwh
            high = None if e.at_max_static is None else e.at_max_static.annual_energy_kwh
            out.append(f"  {e.pumps_running} pump(s) at {percent_number(e.speed_ratio)} % speed, basis: "
                       f"{(e.basis or '').replace('_', ' ')}")
            out.append(f"  annual energy {grouped_whole_number(e.annual_energy_mean_kwh)} kWh "
                       f"(min static {grouped_whole_number(low)}, max static {grouped_whole_number(high)})")
            out.append(f"  annual cost {grouped_whole_number(e.annual_cost_mean)} {e.currency} at "
                       f"{general_number(e.tariff_per_kwh, 6)} {e.currency}/kWh; "
                       f"specific energy {specific(e.specific_energy_mean_kwh_m3)} "
                       f"{unit_label('specific_energy', system)}")
        for note in e.notes or ():
            out.append(f"  note: {note}")
    out += _profile_section(solution, system)
    out += ["", f"Checks ({len(solution.findings)}):"]
    if not solution.findings:
        out.append("  none")
    for finding in solution.findings:
        out.append(f"  [{finding.severity.upper()}] {finding.code}: {finding.text(system)}")
        out.append(f"      where: {finding.where}" + (f" — {finding.remedy}" if finding.remedy else ""))
    return "\n".join(out) + "\n"
