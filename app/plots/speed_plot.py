"""The duty pump set over its speed range: a map of head against station flow.

Drawn from :attr:`hydraulics.results.Solution.speed_map` and
:attr:`~hydraulics.results.Solution.variable_speed` (the solve's second stage): the
pump-set curves at the drive's maximum and minimum speed, at steps between and at the
lowest and highest speed found for the design flow, each labelled with its speed; the
lines of equal efficiency (labelled with their efficiency) and the best-efficiency line;
the minimum continuous stable flow across the speed range; the band of the four system
curves; and the design flow with the system head it needs at each static extreme and pipe
state.  A note under the plot says which speeds meet the design flow and which minimum
flow is used (and where it comes from).  Nothing here computes hydraulics.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtGui import QPen
from PySide6.QtWidgets import QLabel, QWidget

from app import style
from app.plots.plot_base import (
    BandItem,
    HoverReadout,
    empty_array,
    nice_range,
    place_labels,
    set_axis_title,
    set_curve_data,
    update_label_pool,
)
from app.plots.solution_plot import SolutionPlot
from hydraulics.model import PipeState, StaticCase
from hydraulics.number_format import percent_number, readout_number
from hydraulics.results import FloatArray, IsoEfficiencyLine, Solution, SpeedCurve, SpeedMap
from hydraulics.units import to_display, unit_label

IDLE_READOUT = "Point at the plot to read flow and head."
NO_PUMP_MESSAGE = "No pump: no speed range to show"
ONE_SPEED_MESSAGE = "The drive has one speed (minimum = maximum speed ratio): no speed range to show"
SYSTEM_CASES: tuple[tuple[StaticCase, PipeState], ...] = (
    ("min", "new"), ("min", "aged"), ("max", "new"), ("max", "aged"))

CURVE_NAMES: dict[str, str] = {
    "maximum": "Pump set at the maximum speed",
    "minimum": "Pump set at the minimum speed",
    "step": "Pump set at speeds between",
    "design": "Pump set at the speeds for the design flow",
}
EQUAL_EFFICIENCY_NAME = "Equal efficiency (labelled)"
BEST_EFFICIENCY_NAME = "Best efficiency"
MINIMUM_FLOW_NAME = "Minimum continuous stable flow"
DESIGN_POINTS_NAME = "Head needed at the design flow"


def _curve_pen(kind: str) -> QPen:
    if kind == "maximum":
        return style.make_pen(style.BLACK, 2.4)
    if kind == "minimum":
        return style.make_pen(style.BLACK, 2.0, Qt.PenStyle.DashLine)
    if kind == "design":
        return style.make_pen(style.BLUISH_GREEN, 2.0, Qt.PenStyle.DashDotLine)
    return style.make_pen(style.GREY, 1.3)


def _design_tip(_x: float, _y: float, data: object) -> str:
    return str(data)


class VariableSpeedPlot(SolutionPlot):
    """Pump-set curves at several speeds, lines of equal efficiency and the system band."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent, plot_rows=1, legend_columns=3)
        self.note = QLabel(self)
        self.note.setObjectName("speedMapNote")
        self.note.setWordWrap(True)
        self.note.setContentsMargins(6, 2, 6, 4)
        self.note.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self._column.addWidget(self.note)

        self.system_band = BandItem(style.SYSTEM_BAND_BRUSH)
        self.system_band.setVisible(False)
        self.plot_item.addItem(self.system_band, ignoreBounds=True)
        self.system_items: dict[tuple[str, str], pg.PlotDataItem] = {}
        for static, pipe in SYSTEM_CASES:
            pen = style.make_pen(style.STATIC_COLOURS[static], 1.4, style.PIPE_LINE_STYLES[pipe])
            item = pg.PlotDataItem(empty_array(), empty_array(), name=f"System: {static} static, {pipe} pipe",
                                   pen=pen)
            item.setZValue(8)
            self.plot_item.addItem(item)
            self.system_items[(static, pipe)] = item

        self._speed_items: list[pg.PlotDataItem] = []
        self._speed_drawn: list[tuple[float, str]] = []
        self._speed_labels: list[pg.TextItem] = []
        self._speed_marks: list[tuple[float, float, str]] = []
        self._iso_items: list[pg.PlotDataItem] = []
        self._iso_labels: list[pg.TextItem] = []
        self._iso_marks: list[tuple[float, float, str]] = []
        self._lines_drawn = 0
        self.best_item = pg.PlotDataItem(empty_array(), empty_array(), name=BEST_EFFICIENCY_NAME,
                                         pen=style.make_pen(style.REDDISH_PURPLE, 2.0, Qt.PenStyle.DashDotLine))
        self.best_item.setZValue(12)
        self.plot_item.addItem(self.best_item)
        self.minimum_flow_item = pg.PlotDataItem(empty_array(), empty_array(), name=MINIMUM_FLOW_NAME,
                                                 pen=style.make_pen(style.ORANGE, 3.5, Qt.PenStyle.DotLine))
        self.minimum_flow_item.setZValue(13)
        self.plot_item.addItem(self.minimum_flow_item)
        self.design_points = pg.ScatterPlotItem(pxMode=True, symbol="d", size=9, name=DESIGN_POINTS_NAME,
                                                brush=pg.mkBrush(style.GREY), pen=style.make_pen(style.GREY, 1.0),
                                                hoverable=True, tip=_design_tip)
        self.design_points.setZValue(40)
        self.plot_item.addItem(self.design_points)
        self.design_flow_line = pg.InfiniteLine(
            angle=90, movable=False, pen=style.design_flow_pen(), label="design flow",
            labelOpts={"position": 0.96, "color": style.PLOT_FOREGROUND, "anchors": [(0, 0), (0, 0)],
                       "fill": pg.mkBrush(255, 255, 255, 200)})
        self.design_flow_line.setVisible(False)
        self.design_flow_line.setZValue(20)
        self.plot_item.addItem(self.design_flow_line, ignoreBounds=True)

        self.hover = HoverReadout([self.plot_item], self.readout, self._describe_position, IDLE_READOUT)
        self.plot_item.getViewBox().sigTransformChanged.connect(self._place_labels)
        self.plot_item.getViewBox().sigResized.connect(self._place_labels)
        self._apply_titles()
        self._sync_legend()

    # ------------------------------------------------------------------ public API
    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Draw ``solution`` (``None`` clears the plot) in ``unit_system``.

        A first-stage solution of a project with a pump carries no speed map yet: the
        drawing stays as it is until the finished solve arrives.
        """
        if (solution is not None and not solution.complete and solution.project.arrangement is not None
                and unit_system == self._unit_system and self._solution is not None):
            return
        self._solution = solution
        self._unit_system = unit_system
        self._apply_titles()
        speed_map = None if solution is None else solution.speed_map
        if speed_map is not None and speed_map.max_speed_ratio <= speed_map.min_speed_ratio:
            message: str | None = ONE_SPEED_MESSAGE
            speed_map = None
        elif solution is not None and solution.complete and speed_map is None:
            message = NO_PUMP_MESSAGE
        else:
            message = None
        self._update_system(None if speed_map is None else solution)
        self._update_speed_curves(speed_map)
        self._update_lines(speed_map)
        self._update_design(None if speed_map is None else solution)
        self.note.setText(self._note_text(solution, speed_map))
        self.note.setVisible(bool(self.note.text()))
        self.plot_item.setTitle(message, color=style.GREY)
        self._follow_data()
        self._sync_legend()
        self.hover.refresh()

    def speed_curve_data(self) -> list[tuple[float, str, np.ndarray, np.ndarray]]:
        """(speed ratio, kind, flow, head) of each speed curve drawn, display units."""
        out = []
        for item, (speed_ratio, kind) in zip(self._speed_items, self._speed_drawn, strict=False):
            x, y = item.getData()
            out.append((speed_ratio, kind, np.array(x, dtype=float), np.array(y, dtype=float)))
        return out

    def equal_efficiency_data(self) -> list[tuple[str, np.ndarray, np.ndarray]]:
        """(label, flow, head) of each line of equal efficiency drawn, display units."""
        out = []
        for item, (_x, _y, text) in zip(self._iso_items, self._iso_marks[:self._lines_drawn], strict=False):
            if item.isVisible():
                x, y = item.getData()
                out.append((text, np.array(x, dtype=float), np.array(y, dtype=float)))
        return out

    def speed_labels(self) -> list[str]:
        """The texts written beside the speed curves."""
        return [text for _x, _y, text in self._speed_marks]

    # ------------------------------------------------------------------ drawing
    def _flow(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(values, "flow", self._unit_system), dtype=float)

    def _head(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(values, "head", self._unit_system), dtype=float)

    def _update_system(self, solution: Solution | None) -> None:
        drawn = []
        for static, pipe in SYSTEM_CASES:
            item = self.system_items[(static, pipe)]
            if solution is None:
                item.setVisible(False)
                continue
            curve = solution.curve(static, pipe)
            x, y = self._flow(curve.flow_m3_s), self._head(curve.head_m)
            set_curve_data(item, x, y)
            item.setVisible(True)
            drawn.append((x, y))
        if drawn and all(x.shape == drawn[0][0].shape for x, _ in drawn):
            heads = np.vstack([y for _, y in drawn])
            self.system_band.set_edges(drawn[0][0], heads.min(axis=0), heads.max(axis=0))
            self.system_band.setVisible(True)
        else:
            self.system_band.setVisible(False)

    def _update_speed_curves(self, speed_map: SpeedMap | None) -> None:
        curves: tuple[SpeedCurve, ...] = () if speed_map is None else speed_map.curves
        while len(self._speed_items) < len(curves):
            item = pg.PlotDataItem(empty_array(), empty_array())
            item.setZValue(15)
            self.plot_item.addItem(item)
            self._speed_items.append(item)
        named: set[str] = set()
        self._speed_marks = []
        self._speed_drawn = [(c.speed_ratio, c.kind) for c in curves]
        for index, item in enumerate(self._speed_items):
            if index >= len(curves):
                item.setVisible(False)
                continue
            curve = curves[index]
            x, y = self._flow(curve.flow_m3_s), self._head(curve.head_m)
            item.setPen(_curve_pen(curve.kind))
            item.opts["name"] = None if curve.kind in named else CURVE_NAMES.get(curve.kind, curve.kind)
            named.add(curve.kind)
            set_curve_data(item, x, y)
            item.setVisible(True)
            if curve.kind == "design":
                text = f"{percent_number(curve.speed_ratio, 1)} % (design flow, {curve.pipe} pipe)"
            else:
                text = f"{percent_number(curve.speed_ratio)} %"
            self._speed_marks.append((float(x[-1]), float(y[-1]), text))
        update_label_pool(self.plot_item, self._speed_labels, self._speed_marks, fill_alpha=190)

    def _update_lines(self, speed_map: SpeedMap | None) -> None:
        lines = () if speed_map is None else speed_map.equal_efficiency
        while len(self._iso_items) < len(lines):
            item = pg.PlotDataItem(empty_array(), empty_array(),
                                   pen=style.make_pen(style.REDDISH_PURPLE, 1.4, Qt.PenStyle.DotLine))
            item.setZValue(11)
            self.plot_item.addItem(item)
            self._iso_items.append(item)
        self._iso_marks = []
        self._lines_drawn = len(lines)
        for index, item in enumerate(self._iso_items):
            if index >= len(lines):
                item.setVisible(False)
                continue
            line = lines[index]
            x, y = self._flow(line.flow_m3_s), self._head(line.head_m)
            item.opts["name"] = EQUAL_EFFICIENCY_NAME if index == 0 else None
            set_curve_data(item, x, y)
            item.setVisible(True)
            self._iso_marks.append((float(x[-1]), float(y[-1]), f"η {percent_number(line.efficiency)} %"))
        extra: tuple[tuple[pg.PlotDataItem, IsoEfficiencyLine | None, str], ...] = (
            (self.best_item, None if speed_map is None else speed_map.best_efficiency, "best η"),
            (self.minimum_flow_item, None if speed_map is None else speed_map.minimum_flow_line, "min. stable flow"))
        for item, extra_line, text in extra:
            if extra_line is None:
                item.setVisible(False)
                continue
            x, y = self._flow(extra_line.flow_m3_s), self._head(extra_line.head_m)
            set_curve_data(item, x, y)
            item.setVisible(True)
            self._iso_marks.append((float(x[-1]), float(y[-1]), text))
        update_label_pool(self.plot_item, self._iso_labels, self._iso_marks, fill_alpha=170)
        for index, label in enumerate(self._iso_labels):
            on_minimum_flow = index < len(self._iso_marks) and self._iso_marks[index][2] == "min. stable flow"
            label.setColor(style.PLOT_FOREGROUND if on_minimum_flow else style.REDDISH_PURPLE)
        self._place_labels()

    def _place_labels(self, *_args: object) -> None:
        labels = [(self._speed_labels[i], x, y) for i, (x, y, _) in enumerate(self._speed_marks)]
        labels += [(self._iso_labels[i], x, y) for i, (x, y, _) in enumerate(self._iso_marks)]
        if labels:
            obstacles = [(s.pos().x(), s.pos().y()) for s in self.design_points.points()]
            place_labels(self.plot_item.getViewBox(), labels, obstacles=obstacles)

    def _update_design(self, solution: Solution | None) -> None:
        speed_map = None if solution is None else solution.speed_map
        if speed_map is None or not speed_map.design_points:
            self.design_points.setData([], [])
            self.design_flow_line.setVisible(False)
            return
        x = float(to_display(speed_map.design_points[0].flow_m3_s, "flow", self._unit_system))
        self.design_flow_line.setPos(x)
        self.design_flow_line.setVisible(True)
        spots = []
        for item in speed_map.design_points:
            look = style.operating_point_style(item.static, item.pipe, speed_map.pumps_running)
            speed = "no speed in range" if item.speed_ratio is None else f"{percent_number(item.speed_ratio, 1)} %"
            spots.append({"pos": (x, float(to_display(item.head_m, "head", self._unit_system))),
                          "symbol": "d", "size": 10, "pen": look.pen, "brush": look.brush,
                          "data": f"design flow · {item.static} static · {item.pipe} pipe · {speed}"})
        self.design_points.setData(spots)

    def _note_text(self, solution: Solution | None, speed_map: SpeedMap | None) -> str:
        if solution is None or speed_map is None or solution.variable_speed is None:
            return ""
        flow_unit = unit_label("flow", self._unit_system)
        speed = solution.variable_speed
        target = readout_number(float(to_display(speed.target_flow_m3_s, "flow", self._unit_system)))
        parts = []
        ranged = speed_map.design_speed_range
        if ranged is None:
            parts.append(f"No speed between {percent_number(speed_map.min_speed_ratio)} % and "
                         f"{percent_number(speed_map.max_speed_ratio)} % delivers the design flow {target} "
                         f"{flow_unit} with {speed_map.pumps_running} pump(s).")
        else:
            low, high = (percent_number(s, 1) for s in ranged)
            span = f"{low} %" if low == high else f"{low}–{high} %"
            parts.append(f"Design flow {target} {flow_unit} with {speed_map.pumps_running} pump(s): speed {span}"
                         + ("" if speed_map.design_flow_met_everywhere else
                            " where reachable; not met at every static extreme and pipe state (see the checks)")
                         + ".")
        if speed_map.minimum_flow_per_pump_m3_s is not None and speed_map.minimum_flow_fraction is not None:
            q_min = readout_number(float(to_display(speed_map.minimum_flow_per_pump_m3_s, "flow",
                                                    self._unit_system)))
            parts.append(f"Minimum continuous stable flow {q_min} {flow_unit} per pump at full speed, in proportion "
                         f"to speed below it; the value is a {speed_map.minimum_flow_source}.")
        else:
            parts.append(f"Minimum continuous stable flow not shown: {speed_map.minimum_flow_source}.")
        if speed_map.heads_at_manifold:
            parts.append("Pump heads at the manifold, net of each pump's own pipework.")
        parts.append("Equal-efficiency lines assume the efficiency unchanged with speed (affinity laws); "
                     "at low speeds the real efficiency is lower.")
        return "  ".join(parts)

    def _follow_data(self) -> None:
        xs, ys, lows = [0.0], [0.0], []
        for item in [*self._speed_items, *self.system_items.values()]:
            x, y = item.getData()
            if item.isVisible() and x is not None and len(x):
                xs.append(float(np.nanmax(x)))
                ys.append(float(np.nanmax(y)))
                lows.append(float(np.nanmin(y)))
        if len(xs) == 1:
            return
        # from zero, unless every curve lies high above it (a booster): then from below the lowest curve
        low = min(lows)
        y_min = 0.0 if low < 0.3 * max(ys) else low - 0.1 * (max(ys) - low)
        pump_x = [float(np.nanmax(i.getData()[0])) for i in self._speed_items
                  if i.isVisible() and i.getData()[0] is not None and len(i.getData()[0])]
        x_max = 1.15 * max(pump_x) if pump_x else max(xs)
        self._view.follow(nice_range(0.0, x_max, headroom=0.02), nice_range(y_min, max(ys), headroom=0.08))

    def _apply_titles(self) -> None:
        set_axis_title(self.plot_item, "bottom", f"Station flow ({unit_label('flow', self._unit_system)})")
        set_axis_title(self.plot_item, "left", f"Head ({unit_label('head', self._unit_system)})")

    def _sync_legend(self) -> None:
        ordered: list[pg.GraphicsObject] = [*self._speed_items, *self._iso_items, self.best_item,
                                            self.minimum_flow_item, *self.system_items.values()]
        if self.design_flow_line.isVisible():
            ordered.append(self.design_points)
        self._legend_sync.sync(ordered)

    def _describe_position(self, _index: int, x: float, y: float) -> str:
        return (f"Pointer: flow {readout_number(x)} {unit_label('flow', self._unit_system)}   ·   "
                f"head {readout_number(y)} {unit_label('head', self._unit_system)}")
