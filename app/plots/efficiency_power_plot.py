"""Efficiency and shaft power of one pump against its own flow, with the operating points.

Two stacked plots share the flow axis: efficiency (%) above, shaft power per pump below.
The curves are those of one pump at the arrangement's current speed; each operating
point is placed at its flow per pump, so points with several pumps running sit where
each of those pumps runs.  The preferred operating region is shaded in both.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QWidget

from app import style
from app.plots.plot_base import (
    HoverReadout,
    PointKey,
    completes_drawn,
    drawn_xy,
    empty_array,
    make_points_item,
    nice_range,
    point_spots,
    set_axis_title,
)
from app.plots.solution_plot import SolutionPlot
from app.results import scenarios
from hydraulics.number_format import readout_number
from hydraulics.results import FloatArray, OperatingPoint, PumpCurve, Solution
from hydraulics.units import to_display, unit_label

IDLE_READOUT = "Point at a plot to read flow per pump and efficiency or shaft power."
PREFERRED_BRUSH = (86, 180, 233, 40)


class EfficiencyPowerPlot(SolutionPlot):
    """Efficiency (%) and shaft power per pump against flow per pump."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent, plot_rows=2, legend_columns=4)
        self.efficiency_plot, self.power_plot = self.plot_items

        # Preferred region as filled rectangles (a legend sample shows the fill).
        self._preferred = []
        for plot_item, name in ((self.efficiency_plot, None), (self.power_plot, None)):
            band = pg.PlotDataItem(empty_array(), empty_array(), pen=None, fillLevel=0.0,
                                   brush=pg.mkBrush(*PREFERRED_BRUSH), name=name)
            band.setZValue(-5)
            plot_item.addItem(band)
            self._preferred.append(band)
        self.efficiency_curve = pg.PlotDataItem(empty_array(), empty_array(), name="Efficiency, one pump",
                                                pen=style.make_pen(style.EFFICIENCY_COLOUR, 2.0))
        self.power_curve = pg.PlotDataItem(empty_array(), empty_array(), name="Shaft power, one pump",
                                           pen=style.make_pen(style.POWER_COLOUR, 2.0, Qt.PenStyle.DashDotLine))
        self.efficiency_plot.addItem(self.efficiency_curve)
        self.power_plot.addItem(self.power_curve)
        self.efficiency_points = make_points_item()
        self.power_points = make_points_item()
        self.efficiency_plot.addItem(self.efficiency_points)
        self.power_plot.addItem(self.power_points)
        self._key = PointKey()
        self._pump_counts: list[int] = []
        self.bep_lines = []
        for plot_item, label in ((self.efficiency_plot, "BEP"), (self.power_plot, None)):
            line = pg.InfiniteLine(angle=90, movable=False, pen=style.make_pen(style.GREY, 1.2, Qt.PenStyle.DashLine),
                                   label=label, labelOpts={"position": 0.08, "color": style.PLOT_FOREGROUND,
                                                           "anchors": [(0, 1), (0, 1)]})
            line.setVisible(False)
            plot_item.addItem(line, ignoreBounds=True)
            self.bep_lines.append(line)

        self.hover = HoverReadout([self.efficiency_plot, self.power_plot], self.readout,
                                  self._describe_position, IDLE_READOUT)
        self._apply_titles()
        self._sync_legend()

    # ------------------------------------------------------------------ public API
    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Draw ``solution`` (``None`` clears the plots) in ``unit_system``."""
        if completes_drawn(self._solution, self._unit_system, solution, unit_system):
            self._solution = solution  # the finished solve of what is drawn: nothing to redraw
            return
        self._solution = solution
        self._unit_system = unit_system
        self._apply_titles()
        curve = None if solution is None else scenarios.single_pump_curve(solution)
        pumps = 1 if curve is None else curve.pumps_running
        per_pump_flow = None if curve is None else curve.flow_per_pump_m3_s
        efficiency = None if curve is None else curve.efficiency
        power = None if curve is None else curve.shaft_power_w
        self._set_curve(self.efficiency_curve, per_pump_flow, None if efficiency is None else efficiency * 100.0,
                        quantity=None)
        self._set_curve(self.power_curve, per_pump_flow, power, quantity="power")
        self.efficiency_plot.setTitle(None if self.efficiency_curve.isVisible()
                                      else "No efficiency data for this pump", color=style.GREY)
        self.power_plot.setTitle(None if self.power_curve.isVisible()
                                 else "No shaft-power data for this pump", color=style.GREY)

        points = ([] if solution is None
                  else scenarios.found_points(scenarios.ordered_points(solution, current_speed_only=True)))
        self._pump_counts = sorted({p.pumps_running for p in points})
        x_of = self._point_flow
        self.efficiency_points.setData(point_spots(
            points, x_of, lambda p: _times(p.efficiency, 100.0), scenarios.point_label))
        self.power_points.setData(point_spots(
            points, x_of, lambda p: self._power(p.shaft_power_w), scenarios.point_label))
        self._update_preferred(curve, pumps)
        self._update_bep(curve, pumps)
        self._follow_data()
        self._sync_legend()
        self.hover.refresh()

    def efficiency_data(self) -> tuple[np.ndarray, np.ndarray]:
        """(flow per pump, efficiency %) drawn, flow in display units."""
        return drawn_xy(self.efficiency_curve)

    def power_data(self) -> tuple[np.ndarray, np.ndarray]:
        """(flow per pump, shaft power per pump) drawn, in display units."""
        return drawn_xy(self.power_curve)

    def marked_points(self) -> list[tuple[float, float, float, str]]:
        """(flow per pump, efficiency %, shaft power, label) of each point marked, display units."""
        eff = {spot.data(): (spot.pos().x(), spot.pos().y()) for spot in self.efficiency_points.points()}
        power = {spot.data(): spot.pos().y() for spot in self.power_points.points()}
        return [(x, y, power.get(label, float("nan")), label) for label, (x, y) in eff.items()]

    def preferred_region(self) -> tuple[float, float] | None:
        """Flow-per-pump bounds of the shaded preferred region (display units), or ``None``."""
        x, _ = self._preferred[0].getData()
        if not self._preferred[0].isVisible() or x is None or len(x) < 2:
            return None
        return float(x[0]), float(x[-1])

    # ------------------------------------------------------------------ drawing
    def _power(self, value: float | None) -> float | None:
        return None if value is None else to_display(value, "power", self._unit_system)

    def _point_flow(self, point: OperatingPoint) -> float | None:
        value = point.flow_per_pump_m3_s
        return None if value is None else to_display(value, "flow", self._unit_system)

    def _set_curve(self, item: pg.PlotDataItem, flow: FloatArray | None, values: FloatArray | None,
                   quantity: str | None) -> None:
        if flow is None or values is None or not flow.size or flow.size != values.size:
            item.setData(empty_array(), empty_array())
            item.setVisible(False)
            return
        y = values if quantity is None else to_display(values, quantity, self._unit_system)
        item.setData(to_display(flow, "flow", self._unit_system), y)
        item.setVisible(True)

    def _update_preferred(self, curve: PumpCurve | None, pumps: int) -> None:
        bounds = scenarios.preferred_flow_bounds(curve) if curve is not None else None
        name = "Preferred operating region"
        if self._solution is not None:
            low, high = scenarios.preferred_region_percent(self._solution)
            name += f" ({low:.0f}–{high:.0f} % of BEP flow)"
        for index, band in enumerate(self._preferred):
            band.opts["name"] = name if index == 0 else None
            if bounds is None:
                band.setData(empty_array(), empty_array())
                band.setVisible(False)
                continue
            low, high = (to_display(b / pumps, "flow", self._unit_system) for b in bounds)
            band.setData(np.array([low, high]), np.array([1.0, 1.0]))  # height set in _follow_data
            band.setVisible(True)

    def _update_bep(self, curve: PumpCurve | None, pumps: int) -> None:
        bep = None if curve is None else curve.bep_flow_m3_s
        for line in self.bep_lines:
            line.setVisible(bep is not None)  # before the label text: the label redraws only while visible
            if bep is not None:
                x = float(to_display(bep / pumps, "flow", self._unit_system))
                line.setPos(x)
                if getattr(line, "label", None) is not None:
                    line.label.setFormat(f"BEP {readout_number(x, 3)} {unit_label('flow', self._unit_system)}")

    def bep_flow(self) -> float | None:
        """Best-efficiency flow per pump marked (display units), or ``None``."""
        return float(self.bep_lines[0].value()) if self.bep_lines[0].isVisible() else None

    def _follow_data(self) -> None:
        xs = [0.0]
        for item in (self.efficiency_curve, self.power_curve):
            x, _ = item.getData()
            if item.isVisible() and x is not None and len(x):
                xs.append(float(np.nanmax(x)))
        x_range = nice_range(0.0, max(xs), headroom=0.02)
        top_eff = 100.0
        _, py = self.power_curve.getData()
        point_power = [spot.pos().y() for spot in self.power_points.points()]
        power_values = list(point_power)
        if self.power_curve.isVisible() and py is not None and len(py):
            power_values.append(float(np.nanmax(py)))
        top_power = 1.1 * max(power_values) if power_values else 1.0
        for band, top in zip(self._preferred, (top_eff, top_power), strict=True):
            x, _ = band.getData()
            if band.isVisible() and x is not None and len(x) == 2:
                band.setData(x, np.array([top, top]))
        self._views[0].follow(x_range, nice_range(0.0, top_eff, headroom=0.04))
        self._views[1].follow(x_range, nice_range(0.0, top_power, headroom=0.0))

    def _apply_titles(self) -> None:
        flow_unit = unit_label("flow", self._unit_system)
        set_axis_title(self.efficiency_plot, "left", "Efficiency (%)")
        set_axis_title(self.power_plot, "left", f"Shaft power ({unit_label('power', self._unit_system)})")
        set_axis_title(self.power_plot, "bottom", f"Flow per pump ({flow_unit})")

    def _sync_legend(self) -> None:
        self._legend_sync.sync([self.efficiency_curve, self.power_curve, self._preferred[0],
                                *self._key.items(self._pump_counts)])

    def _describe_position(self, index: int, x: float, y: float) -> str:
        flow = f"flow per pump {readout_number(x)} {unit_label('flow', self._unit_system)}"
        if index == 0:
            return f"Pointer: {flow}   ·   efficiency {readout_number(y, 3, 1)} %"
        return f"Pointer: {flow}   ·   shaft power {readout_number(y)} {unit_label('power', self._unit_system)}"


def _times(value: float | None, factor: float) -> float | None:
    return None if value is None else value * factor
