"""The methods page: every method PumpSketch uses, with its published source, and the cautions.

The page is built from :data:`METHODS` (data, so tests and reports can list the same
entries) and the default limits of :class:`hydraulics.model.Criteria`, so the numbers it
quotes are the ones the checks use.
"""

from __future__ import annotations

import html
from dataclasses import dataclass

from PySide6.QtWidgets import QDialog, QDialogButtonBox, QTextBrowser, QVBoxLayout, QWidget

from hydraulics.cautions import CAUTIONS_TEXT
from hydraulics.model import Criteria
from hydraulics.number_format import fixed_decimals, percent_number


@dataclass(frozen=True)
class MethodEntry:
    """One method: its name, the equation or rule, what it is used for and its source.

    ``equation``, ``use`` and ``source`` are HTML fragments of our own; ``name`` and
    ``group`` are plain text.
    """

    name: str
    group: str
    equation: str
    use: str
    source: str


def _pct(fraction: float) -> str:
    return f"{percent_number(fraction)} %"


def _methods(criteria: Criteria) -> tuple[MethodEntry, ...]:
    c = criteria
    return (
        # ------------------------------------------------------------ friction
        MethodEntry(
            "Darcy–Weisbach", "Pipe friction",
            "h<sub>f</sub> = f · (L/D) · v²/(2g), &nbsp; v = Q/A, &nbsp; Re = v·D/ν",
            "Friction head loss of each pipe segment, new and aged roughness.",
            "Darcy, H. (1857), <i>Recherches expérimentales relatives au mouvement de l'eau dans les "
            "tuyaux</i>; Weisbach, J. (1845), <i>Lehrbuch der Ingenieur- und Maschinen-Mechanik</i>."),
        MethodEntry(
            "Colebrook–White", "Pipe friction",
            "1/√f = −2 log<sub>10</sub>( ε/(3.7 D) + 2.51/(Re √f) ), for Re ≥ 4000",
            "Turbulent friction factor, solved to machine precision: the exact closed form through the "
            "Lambert W function where its argument stays in floating-point range, otherwise Clamond's "
            "two-step method.",
            "Colebrook, C. F. (1939), J. Inst. Civil Eng. 11, 133–156; Lambert W form: Keady (1998), "
            "J. Hydraul. Eng. 124(1), 96, and More (2006), Chem. Eng. Sci. 61, 5515–5519; Clamond, D. "
            "(2009), “Efficient resolution of the Colebrook equation”, Ind. Eng. Chem. Res. 48, 3665–3671."),
        MethodEntry(
            "Laminar friction factor", "Pipe friction",
            "f = 64/Re, for Re ≤ 2000",
            "Laminar flow (Hagen–Poiseuille); reported as an information finding at design flow.",
            "Hagen–Poiseuille law; any fluid-mechanics textbook."),
        MethodEntry(
            "Transition zone", "Pipe friction",
            "2000 &lt; Re &lt; 4000: f interpolated linearly in Re between 64/2000 and the "
            "Colebrook–White value at Re = 4000",
            "No published law is exact here; the treatment is our documented choice and every segment "
            "in this range at design flow is flagged with a warning.",
            "Documented treatment of this program (no single published source)."),
        MethodEntry(
            "Hazen–Williams", "Pipe friction",
            "h<sub>f</sub> = 10.67 · L · Q<sup>1.852</sup> / (C<sup>1.852</sup> · D<sup>4.8704</sup>) (SI)",
            "Alternative friction method for water at ordinary temperatures in turbulent flow; "
            "C for new and aged pipe.",
            "Williams, G. S. &amp; Hazen, A. (1920), <i>Hydraulic Tables</i>, 3rd ed., Wiley."),
        MethodEntry(
            "Minor losses", "Fittings",
            "h<sub>m</sub> = K · v²/(2g), K referred to the velocity of the fitting's own segment; "
            "size-dependent fittings K = N · f<sub>T</sub>",
            "Losses of entrances, exits, bends, valves and reducers, from the fittings catalogue "
            "(K override per row). f<sub>T</sub> is the fully turbulent friction factor of clean "
            "commercial steel at the fitting's size.",
            "Crane Co., Technical Paper No. 410, <i>Flow of Fluids through Valves, Fittings and Pipe</i>; "
            "constant K values as cited per entry in the fittings catalogue."),
        MethodEntry(
            "Reducers and expanders", "Fittings",
            "Contraction: K<sub>1</sub> = 0.8 sin(θ/2)(1 − β²) for θ ≤ 45°, 0.5 (1 − β²) √sin(θ/2) above; "
            "enlargement: K<sub>1</sub> = 2.6 sin(θ/2)(1 − β²)² for θ ≤ 45°, (1 − β²)² above; "
            "β = d<sub>small</sub>/d<sub>large</sub>, K<sub>1</sub> on the small bore, converted to the "
            "segment's velocity by K = K<sub>1</sub> (D/d<sub>small</sub>)⁴",
            "A change of bore at the inlet of the segment that lists it, sudden (θ = 180°) or conical; "
            "the upstream bore is the row's own or the previous segment's in flow order.",
            "Crane Co., Technical Paper No. 410, <i>Flow of Fluids through Valves, Fittings and Pipe</i>, "
            "formulas for sudden and gradual contraction and enlargement."),
        MethodEntry(
            "Pump branches and common pipework", "Pipe friction",
            "H<sub>system</sub>(Q, N) = H<sub>static</sub> + L<sub>station</sub>(Q) + "
            "L<sub>branch</sub>(Q/N)",
            "Each pump's own suction and discharge branch carries one running pump's flow; the header, "
            "manifold and main carry the station flow. The head–flow plot shows the common system curve "
            "and the pump curves as they act at the manifold, net of their branch losses.",
            "Continuity and the energy equation for pipes in parallel and series, e.g. Karassik et al., "
            "<i>Pump Handbook</i> (McGraw-Hill), chapter on pump systems."),
        MethodEntry(
            "Hydraulic grade line and vented summits", "Pipe friction",
            "H(x) = H<sub>delivery</sub> + losses from x to the end; where a summit with an air valve "
            "would fall above the grade line it governs: H(x) = z<sub>summit</sub> + losses from x to it, "
            "and the main beyond runs partly full; pressure head p = H − z",
            "The grade line along the main at every operating point and at rest, the governing high "
            "point, sub-atmospheric pressure (air entry, column separation where the absolute pressure "
            "reaches the vapour pressure) and pressures above the pipe's rating, each with its chainage.",
            "Energy equation with head loss, e.g. Chadwick, Morfett &amp; Borthwick, <i>Hydraulics in Civil "
            "and Environmental Engineering</i>; air valves at high points: AWWA M51, <i>Air Valves</i>; "
            "column separation: Wylie &amp; Streeter, <i>Fluid Transients in Systems</i> (1993)."),
        # ------------------------------------------------------------ properties
        MethodEntry(
            "IAPWS-IF97", "Water and site",
            "Region 4 saturation equation (vapour pressure); region 1 (density of liquid water)",
            "Vapour pressure and density of water from its temperature (0–100 °C).",
            "IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the "
            "Thermodynamic Properties of Water and Steam."),
        MethodEntry(
            "IAPWS 2008 viscosity", "Water and site",
            "μ = μ<sub>0</sub>(T) · μ<sub>1</sub>(T, ρ) · μ<sub>2</sub>, with μ<sub>2</sub> = 1 away from "
            "the critical point (as the release recommends for industrial use); ν = μ/ρ",
            "Viscosity of water from its temperature, for the Reynolds number.",
            "IAPWS R12-08, Release on the IAPWS Formulation 2008 for the Viscosity of Ordinary Water "
            "Substance; Huber, M. L. et al. (2009), J. Phys. Chem. Ref. Data 38, 101."),
        MethodEntry(
            "ISO 2533 standard atmosphere", "Water and site",
            "p = 101 325 · (1 − 2.25577 × 10<sup>−5</sup> · h)<sup>5.25588</sup> Pa, h = altitude (m)",
            "Atmospheric pressure at the site for NPSH available, unless a pressure is given.",
            "ISO 2533:1975, Standard Atmosphere."),
        # ------------------------------------------------------------ pumps
        MethodEntry(
            "Least-squares polynomial pump-curve fits", "Pumps",
            "H(Q), η(Q) and P(Q): ordinary least-squares polynomials of the order chosen per pump; "
            "NPSH<sub>r</sub>(Q): a quadratic with non-negative coefficients (non-negative least squares), "
            "so that it never falls with flow",
            "Smooth pump curves through the manufacturer's points; the residuals are shown, and "
            "operation beyond the tested flows is flagged as extrapolated, never hidden.",
            "Ordinary least squares (Legendre 1805; Gauss 1809); non-negative least squares: Lawson, C. L. "
            "&amp; Hanson, R. J. (1974), <i>Solving Least Squares Problems</i>, Prentice-Hall, ch. 23."),
        MethodEntry(
            "Affinity laws", "Pumps",
            "Q ∝ n, &nbsp; H ∝ n², &nbsp; P ∝ n³ (speed); the same ratios with impeller diameter for "
            "small trims",
            "Pump curves at reduced speed (variable speed) and for a trimmed impeller.",
            "Pump similarity laws, e.g. Karassik et al., <i>Pump Handbook</i> (McGraw-Hill)."),
        MethodEntry(
            "Parallel and series combination", "Pumps",
            "Parallel identical pumps: flows add at equal head; series stages: heads add at equal flow",
            "Curves for 1…N duty pumps running and for series stages.",
            "Standard pump-system practice."),
        MethodEntry(
            "Bracketing root finder", "Pumps",
            "Operating point: root of H<sub>pumps</sub>(Q) − H<sub>system</sub>(Q) = 0 inside a bracket "
            "where the difference changes sign, by Chandrupatla's hybrid of inverse quadratic "
            "interpolation and bisection",
            "Operating points for every static extreme, pipe state, number of pumps and speed; at each "
            "speed the curves are intersected afresh. No bracket means no operating point, reported as "
            "a finding with its reason.",
            "Chandrupatla, T. R. (1997), “A new hybrid quadratic/bisection algorithm for finding the zero "
            "of a nonlinear function without using derivatives”, Adv. Eng. Software 28(3), 145–149."),
        MethodEntry(
            "NPSH available", "Pumps",
            "NPSH<sub>a</sub> = (p<sub>atm</sub> − p<sub>v</sub>)/(ρg) + (suction level − pump "
            "datum) − suction losses (common suction at Q, the pump's own suction branch at Q/N)",
            "At each operating point, at its own scenario's suction level (the highest level with the "
            "minimum static head, the lowest with the maximum); the NPSH plot at the lowest level. In "
            "addition the conservative case: the highest flow per pump with the lowest suction level and "
            "aged suction pipe, with a warning when it falls short of the criteria.",
            "Energy equation from the suction surface to the pump; definition of NPSH in ISO 9906:2012; "
            "Karassik et al., <i>Pump Handbook</i> (McGraw-Hill)."),
        MethodEntry(
            "NPSH margin guideline", "Checks",
            f"NPSH<sub>a</sub> ≥ max( {fixed_decimals(c.npsh_margin_ratio, 2)} × NPSH<sub>r</sub>, "
            f"NPSH<sub>r</sub> + {fixed_decimals(c.npsh_margin_min_m, 1)} m ) by default; editable in the criteria",
            "Warning when the margin is below the criterion; critical when NPSH available is below NPSH "
            "required.",
            "ANSI/HI 9.6.1, Rotodynamic Pumps – Guideline for NPSH Margin (defaults for water and "
            "wastewater pumps of ordinary suction energy, from a secondary summary: verify against the "
            "standard for the application)."),
        MethodEntry(
            "Operating region", "Checks",
            f"Preferred region {_pct(c.preferred_region_low)}–{_pct(c.preferred_region_high)} of "
            f"best-efficiency flow; allowable region {_pct(c.allowable_region_low)}–"
            f"{_pct(c.allowable_region_high)} by default; editable in the criteria",
            "Warning outside the preferred region, critical outside the allowable region; the preferred "
            "region is drawn on the pump curves.",
            "ANSI/HI 9.6.3, Rotodynamic Pumps – Guideline for Operating Regions (limits quoted from "
            "memory: verify against the standard and the manufacturer's allowable region)."),
        MethodEntry(
            "Specific speeds", "Pumps",
            "n<sub>s</sub> = n √Q / H<sup>0.75</sup> and S = n √Q / NPSH<sub>r</sub><sup>0.75</sup> at the "
            "best-efficiency point (rpm, m³/s per impeller eye, m per stage); US forms (gpm, ft) = 51.645 × "
            "SI; ω<sub>s</sub> = ω √Q / (gH)<sup>0.75</sup> = 0.018 897 × n<sub>s</sub>",
            "Shown with the pump. They suggest criteria: the NPSH margin ratio by suction specific speed "
            "and the operating regions by pump specific speed; an information finding when the project's "
            "criteria are looser. The criteria are never changed automatically.",
            "Gülich, <i>Centrifugal Pumps</i> (Springer), ch. 3 and 6; margins after ANSI/HI 9.6.1 and "
            "regions after ANSI/HI 9.6.3 (values from memory: verify against the standards)."),
        MethodEntry(
            "Velocity limits", "Checks",
            f"Suction {fixed_decimals(c.suction_velocity_min_m_s, 1)}–"
            f"{fixed_decimals(c.suction_velocity_max_m_s, 1)} m/s; delivery "
            f"{fixed_decimals(c.delivery_velocity_min_m_s, 1)}–"
            f"{fixed_decimals(c.delivery_velocity_max_m_s, 1)} m/s; sewage rising mains "
            f"at least {fixed_decimals(c.sewage_velocity_min_m_s, 2)} m/s by default; editable in the criteria",
            "Warning when a segment's velocity leaves its side's range at the lowest or highest "
            "expected flow.",
            "Common practice of the trade (no single published source)."),
        MethodEntry(
            "Power and energy", "Energy",
            "P<sub>shaft</sub> = ρ g Q H / η; &nbsp; P<sub>input</sub> = P<sub>shaft</sub> / "
            "(η<sub>motor</sub> η<sub>drive</sub>); &nbsp; specific energy = ρ g H / (η<sub>total</sub> "
            "· 3.6 × 10⁶) kWh/m³",
            "Shaft and input power at each operating point and specific energy. The annual energy of the "
            "Criteria tab is a simple estimate: all operating hours at the duty point; with duty bands the "
            "station's energy is the year of duty below.",
            "Pump power output and efficiency as defined in ISO 9906:2012, clause 3."),
        MethodEntry(
            "Pumps of different models in parallel", "Pumps",
            "h<sub>i</sub>(q) = c<sub>i</sub>² H<sub>i</sub>(q / c<sub>i</sub>) − L<sub>branch</sub>(q); "
            "q<sub>i</sub>(H) from h<sub>i</sub>(q<sub>i</sub>) = H, or 0 when H ≥ h<sub>i</sub>'s highest head; "
            "Q = Σ q<sub>i</sub>(H) with H = H<sub>static</sub> + L<sub>common</sub>(Q)",
            "Pumps in parallel share the head at the manifold; each delivers the flow at which its own curve, "
            "less the loss of its own branch, gives that head. A pump whose head cannot open its check valve "
            "runs at shut-off (critical); one pushed below its allowable region is a warning. Variable-speed "
            "pumps running together share one speed ratio; the run sequence is the duty pumps (the "
            "arrangement's first), then the assist pumps; a standby runs only in place of the largest pump.",
            "Head balance of parallel pumps, e.g. Karassik et al., <i>Pump Handbook</i>, 4th ed.; Gülich, "
            "<i>Centrifugal Pumps</i>, 3rd ed., ch. 11; equal speed of parallel drives: common practice."),
        MethodEntry(
            "Energy over a year of duty", "Energy",
            "Band time t = hours, or share × 8760 h; with an annual volume V the band flows are scaled by "
            "k = V / Σ Q<sub>b</sub> t<sub>b</sub>; staging: t<sub>run</sub> = Q<sub>b</sub> t<sub>b</sub> / "
            "Q<sub>stage</sub>; variable speed: slowed to Q<sub>b</sub> for the band's hours; E = Σ P<sub>in</sub> "
            "t<sub>run</sub>; η<sub>wire-to-water</sub> = Σ ρ g q<sub>i</sub> H<sub>i</sub> / P<sub>in</sub>; "
            "mean specific energy E / V",
            "For each duty band the fewest pumps of the run sequence whose flow reaches it, their speed, power, "
            "efficiency and specific energy, at the mean static head (the levels move between the extremes); the "
            "year's energy, cost and mean kWh/m³. A band above the station's capacity is a warning.",
            "Pump output power after ISO 9906:2012, clause 3; parallel pumps at a common manifold head after "
            "Karassik et al., <i>Pump Handbook</i>, 4th ed.; stop–start and variable-speed duty: common practice."),
    )


METHODS: tuple[MethodEntry, ...] = _methods(Criteria())
"""Every method, in the order the page lists them (defaults of :class:`Criteria`)."""


def methods_html(criteria: Criteria | None = None) -> str:
    """The methods page as HTML (our own wording), quoting the limits of ``criteria``."""
    entries = METHODS if criteria is None else _methods(criteria)
    parts = [
        "<html><body style='font-family: sans-serif;'>",
        "<h2>Methods and references</h2>",
        "<p>Every result in PumpSketch comes from the published methods below. Labels: a method's "
        "source is named beside it; <i>common practice</i> marks a rule of thumb of the trade; "
        "<i>verify</i> marks a value quoted from a summary that should be checked against the "
        "standard itself.</p>",
    ]
    group = None
    for entry in entries:
        if entry.group != group:
            if group is not None:
                parts.append("</table>")
            group = entry.group
            parts.append(f"<h3>{html.escape(group)}</h3>")
            parts.append("<table cellspacing='0' cellpadding='4' width='100%'>")
        parts.append(
            "<tr><td valign='top' width='24%'><b>" + html.escape(entry.name) + "</b></td>"
            "<td valign='top'>" + entry.equation + "<br/>" + entry.use
            + "<br/><span style='color:#555555;'>Source: " + entry.source + "</span></td></tr>")
    parts.append("</table>")
    parts.append("<h2>Cautions</h2>")
    parts.append(f"<p><b>{html.escape(CAUTIONS_TEXT)}</b></p>")
    parts.append("<p>Symbols: Q flow, H head, v velocity, D internal diameter, L length, ε absolute "
                 "roughness, f Darcy friction factor, Re Reynolds number, ν kinematic viscosity, ρ density, "
                 "g standard gravity 9.80665 m/s², η efficiency, n rotational speed.</p>")
    parts.append("</body></html>")
    return "\n".join(parts)


class MethodsPage(QTextBrowser):
    """A read-only page listing each method with its reference, and the cautions."""

    def __init__(self, parent: QWidget | None = None, criteria: Criteria | None = None):
        super().__init__(parent)
        self.setObjectName("methodsPage")
        self.setOpenExternalLinks(False)
        self.set_criteria(criteria)

    def set_criteria(self, criteria: Criteria | None) -> None:
        """Quote the limits of ``criteria`` (the project's own) instead of the defaults."""
        self.setHtml(methods_html(criteria))


class HelpDialog(QDialog):
    """A non-modal window holding the :class:`MethodsPage` (open it with ``show()``)."""

    def __init__(self, parent: QWidget | None = None, criteria: Criteria | None = None):
        super().__init__(parent)
        self.setWindowTitle("PumpSketch – methods and cautions")
        self.resize(760, 640)
        self.page = MethodsPage(self, criteria)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Close, self)
        buttons.rejected.connect(self.close)
        layout = QVBoxLayout(self)
        layout.addWidget(self.page)
        layout.addWidget(buttons)
