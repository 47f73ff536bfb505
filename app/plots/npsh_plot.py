"""NPSH available against NPSH required, with the margin at every operating point.

The flow axis is the station flow, as for the system curves: NPSH available falls with
the suction losses at that flow (new and aged pipe, lowest suction level), and NPSH
required for N pumps running is each pump's requirement at its share of the flow.  At
every operating point a thin vertical bar joins the two, and the smallest margin for
each number of pumps running is written beside its bar.
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
    place_labels,
    point_spots,
    set_axis_title,
    update_label_pool,
)
from app.plots.solution_plot import SolutionPlot
from app.results import scenarios
from hydraulics.number_format import readout_number
from hydraulics.results import FloatArray, NpshCurve, OperatingPoint, Solution
from hydraulics.units import to_display, unit_label

IDLE_READOUT = "Point at the plot to read flow and NPSH."


class NpshPlot(SolutionPlot):
    """NPSH available (new and aged pipe; at the lowest suction level, and thinner at the highest,
    where the minimum-static points take it) and NPSH required (1..N pumps) against flow."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent, plot_rows=1, legend_columns=3)

        self.available_items: dict[str, pg.PlotDataItem] = {}
        for pipe in ("new", "aged"):
            item = pg.PlotDataItem(empty_array(), empty_array(), name=f"NPSH available, {pipe} pipe",
                                   pen=style.make_pen(style.NPSH_AVAILABLE_COLOUR, 2.0, style.PIPE_LINE_STYLES[pipe]))
            self.plot_item.addItem(item)
            self.available_items[pipe] = item
        # Minimum-static points take NPSH available at the highest suction level: its curves too.
        self.available_high_items: dict[str, pg.PlotDataItem] = {}
        for pipe in ("new", "aged"):
            item = pg.PlotDataItem(empty_array(), empty_array(),
                                   name=f"NPSH available, highest suction level, {pipe} pipe",
                                   pen=style.make_pen(style.NPSH_AVAILABLE_COLOUR, 1.0, style.PIPE_LINE_STYLES[pipe]))
            self.plot_item.addItem(item)
            self.available_high_items[pipe] = item
        self._required_items: dict[int, pg.PlotDataItem] = {}
        self.margin_bars = pg.PlotDataItem(empty_array(), empty_array(), connect="pairs",
                                           pen=style.make_pen(style.GREY, 1.5),
                                           name="Margin at each operating point (◆ required)")
        self.margin_bars.setZValue(30)
        self.plot_item.addItem(self.margin_bars)
        self.available_points = make_points_item()
        self.required_points = pg.ScatterPlotItem(pxMode=True, symbol="d", size=8,
                                                  brush=pg.mkBrush(style.NPSH_REQUIRED_COLOUR),
                                                  pen=pg.mkPen(style.NPSH_REQUIRED_COLOUR))
        self.required_points.setZValue(39)
        self.plot_item.addItem(self.required_points)
        self.plot_item.addItem(self.available_points)
        self._margin_labels: list[pg.TextItem] = []
        self._margin_marks: list[tuple[float, float, str]] = []
        self._key = PointKey()
        self._pump_counts: list[int] = []

        self.hover = HoverReadout([self.plot_item], self.readout, self._describe_position, IDLE_READOUT)
        self.plot_item.getViewBox().sigTransformChanged.connect(self._place_margin_labels)
        self._apply_titles()
        self._sync_legend()

    # ------------------------------------------------------------------ public API
    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Draw ``solution`` (``None`` clears the plot) in ``unit_system``."""
        if completes_drawn(self._solution, self._unit_system, solution, unit_system):
            self._solution = solution  # the finished solve of what is drawn: nothing to redraw
            return
        self._solution = solution
        self._unit_system = unit_system
        self._apply_titles()
        npsh = None if solution is None else solution.npsh_available_curve
        self._set_curve(self.available_items["new"], None if npsh is None else npsh.flow_m3_s,
                        None if npsh is None else npsh.available_new_m)
        self._set_curve(self.available_items["aged"], None if npsh is None else npsh.flow_m3_s,
                        None if npsh is None else npsh.available_aged_m)
        self._set_curve(self.available_high_items["new"], None if npsh is None else npsh.flow_m3_s,
                        None if npsh is None else npsh.available_highest_level_new_m)
        self._set_curve(self.available_high_items["aged"], None if npsh is None else npsh.flow_m3_s,
                        None if npsh is None else npsh.available_highest_level_aged_m)
        self._update_required(npsh)
        self._update_points()
        has_data = any(item.isVisible() for item in self.available_items.values()) or any(
            item.isVisible() for item in self._required_items.values())
        self.plot_item.setTitle(None if has_data or solution is None else "No pump: no NPSH to show",
                                color=style.GREY)
        self._follow_data()
        self._sync_legend()
        self.hover.refresh()

    def available_data(self, pipe: str) -> tuple[np.ndarray, np.ndarray]:
        """(flow, NPSH available) drawn for ``pipe`` ("new" or "aged"), display units."""
        return drawn_xy(self.available_items[pipe])

    def required_data(self, pumps_running: int) -> tuple[np.ndarray, np.ndarray]:
        """(station flow, NPSH required) drawn for ``pumps_running`` pumps, display units."""
        item = self._required_items.get(pumps_running)
        return (empty_array(), empty_array()) if item is None else drawn_xy(item)

    def margin_marks(self) -> list[tuple[float, float, str]]:
        """(flow, NPSH available, text) of each margin written on the plot, display units."""
        return list(self._margin_marks)

    # ------------------------------------------------------------------ drawing
    def _flow(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(values, "flow", self._unit_system), dtype=float)

    def _head(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(values, "head", self._unit_system), dtype=float)

    def _flow_at(self, point: OperatingPoint) -> float:
        return float(to_display(float(point.flow_m3_s or 0.0), "flow", self._unit_system))

    def _head_at(self, value_m: float | None) -> float:
        return float(to_display(float(value_m or 0.0), "head", self._unit_system))

    def _set_curve(self, item: pg.PlotDataItem, flow: FloatArray | None, values: FloatArray | None) -> None:
        if flow is None or values is None or not flow.size or flow.size != values.size:
            item.setData(empty_array(), empty_array())
            item.setVisible(False)
            return
        item.setData(self._flow(flow), self._head(values))
        item.setVisible(True)

    def _required_item(self, pumps: int) -> pg.PlotDataItem:
        item = self._required_items.get(pumps)
        if item is None:
            pen = style.make_pen(style.pump_colour(pumps), 2.0, Qt.PenStyle.DashDotLine)
            item = pg.PlotDataItem(empty_array(), empty_array(),
                                   name=f"NPSH required, {scenarios.pumps_phrase(pumps)}", pen=pen)
            self.plot_item.addItem(item)
            self._required_items[pumps] = item
        return item

    def _update_required(self, npsh: NpshCurve | None) -> None:
        shown: set[int] = set()
        curves = [] if self._solution is None else scenarios.pump_curves_at_current_speed(self._solution)
        for curve in curves:
            pumps = curve.pumps_running
            if curve.npsh_required_m is None or not curve.npsh_required_m.size or pumps in shown:
                continue
            self._set_curve(self._required_item(pumps), curve.flow_m3_s, curve.npsh_required_m)
            shown.add(pumps)
        if not shown and npsh is not None and npsh.required_m is not None and npsh.required_m.size:
            # without pump curves at this speed, the NPSH curve's own one-pump requirement
            self._set_curve(self._required_item(1), npsh.required_flow_m3_s, npsh.required_m)
            shown.add(1)
        for pumps, item in self._required_items.items():
            if pumps not in shown:
                item.setData(empty_array(), empty_array())
                item.setVisible(False)

    def _update_points(self) -> None:
        ordered = [] if self._solution is None else scenarios.ordered_points(self._solution, current_speed_only=True)
        points = [p for p in scenarios.found_points(ordered) if p.npsh_available_m is not None]
        self._pump_counts = sorted({p.pumps_running for p in points})
        self.available_points.setData(point_spots(
            points, self._flow_at, lambda p: self._head_at(p.npsh_available_m), scenarios.point_label))
        with_required = [p for p in points if p.npsh_required_m is not None]
        self.required_points.setData(
            [self._flow_at(p) for p in with_required], [self._head_at(p.npsh_required_m) for p in with_required])
        bars_x, bars_y = [], []
        for p in with_required:
            x = self._flow_at(p)
            bars_x += [x, x]
            bars_y += [self._head_at(p.npsh_available_m), self._head_at(p.npsh_required_m)]
        self.margin_bars.setData(np.array(bars_x, dtype=float), np.array(bars_y, dtype=float))
        self._update_margin_labels(with_required)

    def _update_margin_labels(self, points: list[OperatingPoint]) -> None:
        least: dict[int, tuple[float, OperatingPoint]] = {}
        for point in points:
            margin = point.npsh_margin_m
            if margin is None:
                continue
            pumps = point.pumps_running
            if pumps not in least or margin < least[pumps][0]:
                least[pumps] = (margin, point)
        head_unit = unit_label("head", self._unit_system)
        self._margin_marks = []
        for pumps in sorted(least):
            margin, point = least[pumps]
            ratio = point.npsh_margin_ratio
            text = (f"least margin, {scenarios.pumps_phrase(pumps)}: {readout_number(self._head_at(margin), 3)} "
                    f"{head_unit}" + (f" (ratio {ratio:.2f})" if ratio is not None else ""))
            self._margin_marks.append((self._flow_at(point), self._head_at(point.npsh_available_m), text))
        update_label_pool(self.plot_item, self._margin_labels, self._margin_marks, fill_alpha=170)
        self._place_margin_labels()

    def _place_margin_labels(self, *_args: object) -> None:
        labels = [(self._margin_labels[i], x, y) for i, (x, y, _) in enumerate(self._margin_marks)]
        if labels:
            obstacles = [(s.pos().x(), s.pos().y()) for s in self.available_points.points()]
            place_labels(self.plot_item.getViewBox(), labels, obstacles=obstacles)

    def _follow_data(self) -> None:
        xs, ys = [0.0], [0.0]
        for item in [*self.available_items.values(), *self.available_high_items.values(),
                     *self._required_items.values()]:
            x, y = item.getData()
            if item.isVisible() and x is not None and len(x):
                xs.append(float(np.nanmax(x)))
                ys.extend([float(np.nanmin(y)), float(np.nanmax(y))])
        if len(xs) == 1:
            return
        self._view.follow(nice_range(0.0, max(xs), headroom=0.02), nice_range(min(ys), max(ys), headroom=0.12))

    def _apply_titles(self) -> None:
        set_axis_title(self.plot_item, "bottom", f"Flow ({unit_label('flow', self._unit_system)})")
        set_axis_title(self.plot_item, "left", f"NPSH ({unit_label('head', self._unit_system)})")

    def _sync_legend(self) -> None:
        ordered = [self.available_items["new"], self.available_items["aged"]]
        ordered += [item for item in self.available_high_items.values() if item.isVisible()]
        ordered += [self._required_items[n] for n in sorted(self._required_items)]
        if len(self.margin_bars.getData()[0] if self.margin_bars.getData()[0] is not None else ()):
            ordered.append(self.margin_bars)
        ordered += self._key.items(self._pump_counts)
        self._legend_sync.sync(ordered)

    def _describe_position(self, _index: int, x: float, y: float) -> str:
        return (f"Pointer: flow {readout_number(x)} {unit_label('flow', self._unit_system)}   ·   "
                f"NPSH {readout_number(y)} {unit_label('head', self._unit_system)}")
