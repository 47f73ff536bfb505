"""Head against flow: system curves, pump curves and the operating points where they meet.

Where the pumps have their own suction and discharge branches, the engine gives each
pump-set curve as it acts at the manifold (net of the branch losses at the per-pump
flow): that curve is drawn as the pump curve, meeting the system curves of the common
pipework at the operating points, and the plain curve as tested is drawn thin and dashed
beside it.

Where pumps of other models are installed, the engine gives the combined curve of each
stage of the run sequence that includes them (``Solution.pump_set_curves``: the pumps'
flows added at equal manifold head); each is drawn dash-dotted and named by the tags of
the pumps running ("P1+P3"), and the identical-pump curves are named by their tags too.
The pump-set points (``Solution.pump_set``, the second stage of a solve) are marked and
labelled with the tags running when they arrive, without redrawing the rest.

:class:`HeadFlowPlot` only draws what the engine computed (a
:class:`~hydraulics.results.Solution`); stored data stays SI and is converted to the
chosen unit system when drawn.  Every curve item is created once and updated with
``setData``; pump-curve and label items come from pools that grow on demand and hide
what is not used.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QPointF, QRectF
from PySide6.QtWidgets import QWidget

from app import style
from app.plots.plot_base import (
    BandItem,
    HoverReadout,
    PointKey,
    completes_drawn,
    empty_array,
    make_points_item,
    nice_range,
    place_labels,
    set_axis_title,
    set_curve_data,
    set_visible,
    update_label_pool,
)
from app.plots.solution_plot import SolutionPlot
from app.results import scenarios
from hydraulics.model import Project, Segment
from hydraulics.number_format import cell_number, readout_number
from hydraulics.results import FloatArray, OperatingPoint, PumpCurve, PumpSetCurve, PumpSetPoint, Solution, SystemCurve
from hydraulics.units import to_display, unit_label

SYSTEM_CASES: tuple[tuple[str, str], ...] = (("max", "aged"), ("max", "new"), ("min", "aged"), ("min", "new"))
"""(static extreme, pipe state) of the four system curves, in legend order."""

IDLE_READOUT = "Point at the plot to read flow and head."

MANIFOLD_CURVE_NAME = "Pumps at the manifold"
"""The pump-set curve as it acts on the common pipework: each pump's own branch losses taken off."""
MANIFOLD_READOUT = ("Point at the plot to read flow and head.  Pump curves at the manifold are net of each "
                    "pump's own branch losses; thin dashed: the pumps as tested.")
"""The readout's idle text while curves at the manifold are drawn (the legend names stay short)."""
TESTED_CURVE_NAME = "Pumps as tested"
"""The plain pump-set curve (the manufacturer's test, at the speed drawn), shown thin beside it."""


POINT_LABEL_MAX_DISTANCE_PX = 24.0
"""Farthest (px) the nearest edge of a point's number label lies from the centre of its marker."""


def _system_curve_name(static: str, pipe: str) -> str:
    return f"System: {static} static, {pipe} pipe"


def speed_phrase(speed_ratio: float) -> str:
    """``" at 85 % speed"`` below rated speed, ``""`` at rated speed."""
    return "" if abs(speed_ratio - 1.0) < 0.005 else f" at {speed_ratio * 100:.0f} % speed"


def _size_text(segment: Segment, unit_system: str) -> str:
    """A segment's size as an engineer names it: the nominal size, or the bore."""
    if segment.nominal_size:
        return segment.nominal_size
    bore = cell_number(to_display(segment.internal_diameter_m, "diameter", unit_system), "diameter", unit_system)
    return f"bore {bore} {unit_label('diameter', unit_system)}"


def _short(name: str, length: int = 28) -> str:
    return name if len(name) <= length else name[: length - 1].rstrip() + "…"


def pinned_curve_name(pinned: Project | None, current: Project | None, unit_system: str) -> str:
    """The legend name of a pinned snapshot: what was pinned, as it differs from the project now.

    The pipe sizes that have changed since (``"Pinned: Rising main DN 150"``), else a changed
    pump or speed, else the sizes of every segment pinned.
    """
    if pinned is None:
        return "Pinned snapshot"
    changed: list[str] = []
    if current is not None and len(current.segments) == len(pinned.segments):
        for was, now in zip(pinned.segments, current.segments, strict=True):
            if _size_text(was, unit_system) != _size_text(now, unit_system):
                changed.append(f"{_short(was.name)} {_size_text(was, unit_system)}")
    if not changed and current is not None:
        was_pump, now_pump = pinned.duty_pump, current.duty_pump
        if was_pump is not None and (now_pump is None or now_pump.name != was_pump.name):
            changed.append(f"pump {_short(was_pump.name)}")
        was_speed = None if pinned.arrangement is None else pinned.arrangement.speed_ratio
        now_speed = None if current.arrangement is None else current.arrangement.speed_ratio
        if was_speed is not None and now_speed is not None and abs(was_speed - now_speed) > 1e-9:
            changed.append(f"{was_speed * 100:.0f} % speed")
    if not changed:
        sizes = list(dict.fromkeys(_size_text(segment, unit_system) for segment in pinned.segments))
        changed = [", ".join(sizes)] if sizes else []
    if len(changed) > 2:
        changed = [*changed[:2], "…"]
    return "Pinned: " + "; ".join(changed) if changed else "Pinned snapshot"


class _PumpCurveItems:
    """The items drawn for one number of pumps running."""

    def __init__(self, plot_item: pg.PlotItem, pumps_running: int, with_region_name: bool):
        self.pumps_running = pumps_running
        region_name = "Preferred operating region" if with_region_name else None
        self.region = pg.PlotDataItem(empty_array(), empty_array(), name=region_name,
                                      pen=style.preferred_region_pen(pumps_running))
        self.region.setZValue(5)
        self.curve = pg.PlotDataItem(empty_array(), empty_array(),
                                     name=f"Pump curve: {scenarios.pumps_phrase(pumps_running)}",
                                     pen=style.pump_pen(pumps_running))
        self.curve.setZValue(10)
        self.tested = pg.PlotDataItem(empty_array(), empty_array(), pen=style.tested_pump_pen(pumps_running))
        self.tested.setZValue(9)
        self.tested.setVisible(False)
        self.end_label = pg.TextItem(scenarios.pumps_phrase(pumps_running), color=style.pump_colour(pumps_running),
                                     anchor=(1.0, 1.1))
        self.end_label.setFont(style.annotation_font())
        self.end_label.setZValue(30)
        plot_item.addItem(self.region)
        plot_item.addItem(self.tested)
        plot_item.addItem(self.curve)
        plot_item.addItem(self.end_label, ignoreBounds=True)

    def set_visible(self, visible: bool) -> None:
        for item in (self.region, self.curve, self.tested, self.end_label):
            item.setVisible(visible)

    def set_names(self, at_manifold: bool, tags: str | None = None, speed_ratio: float = 1.0) -> None:
        """Legend names: the plain pump curve, or the curve at the manifold beside the tested one.

        ``tags`` (``"P1+P2"``) is added where pumps of other models are drawn as well; a
        curve below rated speed says its speed (``"1 pump at 85 % speed"``).
        """
        phrase = scenarios.pumps_phrase(self.pumps_running)
        if tags:
            phrase = f"{phrase} ({tags})"
        phrase += speed_phrase(speed_ratio)
        if self.end_label.toPlainText() != phrase:
            self.end_label.setText(phrase)
        if at_manifold:
            self.curve.opts["name"] = f"{MANIFOLD_CURVE_NAME}: {phrase}"
            self.tested.opts["name"] = f"{TESTED_CURVE_NAME}: {phrase}"
        else:
            self.curve.opts["name"] = f"Pump curve: {phrase}"
            self.tested.opts["name"] = None


class HeadFlowPlot(SolutionPlot):
    """Live plot of head against flow with a hover readout and a pinnable snapshot.

    Call :meth:`show_solution` whenever the engine produces a new solution or the unit
    system changes.
    """

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent, plot_rows=1, legend_columns=3)
        self._snapshot_si: list[tuple[np.ndarray, np.ndarray]] = []
        self.view_box: pg.ViewBox = self.plot_item.getViewBox()

        # System curves and the band between the lowest and the highest of them.
        self.system_band = BandItem(style.SYSTEM_BAND_BRUSH)
        self.system_band.setVisible(False)
        self.plot_item.addItem(self.system_band, ignoreBounds=True)
        self._system_items: dict[tuple[str, str], pg.PlotDataItem] = {}
        for static, pipe in SYSTEM_CASES:
            item = pg.PlotDataItem(empty_array(), empty_array(), name=_system_curve_name(static, pipe),
                                   pen=style.system_pen(static, pipe))
            item.setZValue(8)
            self.plot_item.addItem(item)
            self._system_items[(static, pipe)] = item

        self._pump_items: dict[int, _PumpCurveItems] = {}
        self._set_items: list[tuple[pg.PlotDataItem, pg.TextItem]] = []
        """Pool of combined curves of pumps of different models, with their end labels."""

        self.points_item = make_points_item()
        self.plot_item.addItem(self.points_item)
        self._point_labels: list[pg.TextItem] = []
        self._marked: list[tuple[float, float, str]] = []
        """Every point marked: (flow, head) in display units and its full label."""
        self._marker_key = PointKey()
        self._marked_pumps: list[int] = []
        self._key_items: list[pg.PlotDataItem] = []
        """Legend samples of the numbered key: point n's marker and its full label."""

        self.design_flow_line = pg.InfiniteLine(
            angle=90, movable=False, pen=style.design_flow_pen(), label="design flow",
            labelOpts={"position": 0.96, "color": style.PLOT_FOREGROUND, "anchors": [(0, 0), (0, 0)],
                       "fill": pg.mkBrush(255, 255, 255, 200)})
        self.design_flow_line.setVisible(False)
        self.design_flow_line.setZValue(20)
        self._design_text = ""
        self.plot_item.addItem(self.design_flow_line, ignoreBounds=True)

        self._snapshot_items: list[pg.PlotDataItem] = []
        self._snapshot_project: Project | None = None

        self.hover = HoverReadout([self.plot_item], self.readout, self._describe_position, IDLE_READOUT)
        self.view_box.sigTransformChanged.connect(self._place_point_labels)
        self.view_box.sigResized.connect(self._place_point_labels)
        self._apply_axis_titles()
        self._sync_legend()

    # ------------------------------------------------------------------ public API
    @property
    def unit_system(self) -> str:
        """The unit system on display ("SI" or "US")."""
        return self._unit_system

    @property
    def has_snapshot(self) -> bool:
        """True while a pinned snapshot is drawn."""
        return bool(self._snapshot_si)

    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Draw ``solution`` (``None`` clears the plot) in ``unit_system``."""
        if completes_drawn(self._solution, self._unit_system, solution, unit_system):
            self._solution = solution  # the finished solve of what is drawn: nothing to redraw
            if solution is not None and solution.pump_set is not None and solution.pump_set.points:
                self._update_points()  # but the pump-set points, solved in the second stage
                self._sync_legend()
            return
        self._solution = solution
        self._unit_system = unit_system
        self._apply_axis_titles()
        self._update_system_curves()
        self._update_pump_curves()
        self._update_pump_set_curves()
        self._update_points()
        self._update_design_flow()
        self._update_snapshot()
        self._sync_legend()
        self._follow_data()
        self.hover.refresh()

    def pin_snapshot(self) -> None:
        """Keep a faint grey copy of the system and pump curves now drawn, to compare against."""
        snapshot: list[tuple[np.ndarray, np.ndarray]] = []
        for curve in self._system_curves_si():
            snapshot.append((curve[0].copy(), curve[1].copy()))
        for pump_curve in self._pump_curves():
            snapshot.append((pump_curve.flow_m3_s.copy(), _acting_head(pump_curve).copy()))
        for set_curve in self._pump_set_curves():
            snapshot.append((set_curve.flow_m3_s.copy(), set_curve.head_m.copy()))
        self._snapshot_si = snapshot
        self._snapshot_project = None if self._solution is None else self._solution.project
        self._update_snapshot()
        self._sync_legend()

    def clear_snapshot(self) -> None:
        """Remove the pinned snapshot."""
        self._snapshot_si = []
        self._snapshot_project = None
        self._update_snapshot()
        self._sync_legend()

    def curve_data(self, static: str, pipe: str) -> tuple[np.ndarray, np.ndarray]:
        """The (flow, head) arrays drawn for one system curve, in display units."""
        x, y = self._system_items[(static, pipe)].getData()
        return _copy_or_empty(x), _copy_or_empty(y)

    def pump_curve_data(self, pumps_running: int) -> tuple[np.ndarray, np.ndarray]:
        """The (flow, head) arrays drawn for the curve of ``pumps_running`` pumps, in display units."""
        items = self._pump_items.get(pumps_running)
        if items is None or not items.curve.isVisible():
            return empty_array(), empty_array()
        x, y = items.curve.getData()
        return _copy_or_empty(x), _copy_or_empty(y)

    def tested_curve_data(self, pumps_running: int) -> tuple[np.ndarray, np.ndarray]:
        """The (flow, head) arrays of the plain pump curve drawn thin beside the curve at the manifold."""
        items = self._pump_items.get(pumps_running)
        if items is None or not items.tested.isVisible():
            return empty_array(), empty_array()
        x, y = items.tested.getData()
        return _copy_or_empty(x), _copy_or_empty(y)

    def pump_set_curve_data(self, label: str) -> tuple[np.ndarray, np.ndarray]:
        """The (flow, head) arrays drawn for the combined curve of the pumps ``label`` (``"P1+P3"``)."""
        for curve, (item, _end) in zip(self._pump_set_curves(), self._set_items, strict=False):
            if curve.label == label and item.isVisible():
                x, y = item.getData()
                return _copy_or_empty(x), _copy_or_empty(y)
        return empty_array(), empty_array()

    def preferred_region_data(self, pumps_running: int) -> tuple[np.ndarray, np.ndarray]:
        """The (flow, head) arrays of the preferred-region stroke for ``pumps_running`` pumps."""
        items = self._pump_items.get(pumps_running)
        if items is None or not items.region.isVisible():
            return empty_array(), empty_array()
        x, y = items.region.getData()
        return _copy_or_empty(x), _copy_or_empty(y)

    def marked_points(self) -> list[tuple[float, float, str]]:
        """The operating points marked, as (flow, head, label) in display units."""
        return list(self._marked)

    def snapshot_data(self) -> list[tuple[np.ndarray, np.ndarray]]:
        """The snapshot curves drawn, as (flow, head) arrays in display units."""
        out = []
        for item in self._snapshot_items:
            if item.isVisible():
                x, y = item.getData()
                out.append((_copy_or_empty(x), _copy_or_empty(y)))
        return out

    # ------------------------------------------------------------------ drawing
    def _flow(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(values, "flow", self._unit_system), dtype=float)

    def _head(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(values, "head", self._unit_system), dtype=float)

    def _system_curves(self) -> tuple[SystemCurve, ...]:
        return () if self._solution is None else self._solution.curves

    def _pump_curves(self) -> list[PumpCurve]:
        return [] if self._solution is None else scenarios.pump_curves_at_current_speed(self._solution)

    def _pump_set_curves(self) -> tuple[PumpSetCurve, ...]:
        sets = None if self._solution is None else self._solution.pump_set_curves
        return () if sets is None else tuple(c for c in sets.curves if c.flow_m3_s.size)

    def _stage_tags(self, pumps_running: int) -> str | None:
        """The tags of ``pumps_running`` identical pumps, where pumps of other models are drawn too."""
        sets = None if self._solution is None else self._solution.pump_set_curves
        if sets is None or not sets.curves or not 0 < pumps_running <= len(sets.arrangement_stages):
            return None
        return sets.arrangement_stages[pumps_running - 1]

    def _apply_axis_titles(self) -> None:
        set_axis_title(self.plot_item, "bottom", f"Flow ({unit_label('flow', self._unit_system)})")
        set_axis_title(self.plot_item, "left", f"Head ({unit_label('head', self._unit_system)})")

    def _system_curves_si(self) -> list[tuple[np.ndarray, np.ndarray]]:
        return [(curve.flow_m3_s, curve.head_m) for curve in self._system_curves() if curve.flow_m3_s.size]

    def _update_system_curves(self) -> None:
        by_case: dict[tuple[str, str], SystemCurve] = {(c.static, c.pipe): c for c in self._system_curves()}
        drawn: list[tuple[np.ndarray, np.ndarray]] = []
        for case, item in self._system_items.items():
            curve = by_case.get(case)
            if curve is None or not curve.flow_m3_s.size:
                set_curve_data(item, empty_array(), empty_array())
                set_visible(item, False)
                continue
            x, y = self._flow(curve.flow_m3_s), self._head(curve.head_m)
            set_curve_data(item, x, y)
            set_visible(item, True)
            drawn.append((x, y))
        self._update_band(drawn)

    def band_edges(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """The (flow, lowest head, highest head) arrays of the band, in display units."""
        return self.system_band.edges()

    def _update_band(self, drawn: list[tuple[np.ndarray, np.ndarray]]) -> None:
        if len(drawn) < 2:
            self.system_band.set_edges(empty_array(), empty_array(), empty_array())
            self.system_band.setVisible(False)
            return
        grid = drawn[0][0]
        if np.all(grid[1:] >= grid[:-1]) and all(np.array_equal(x, grid) for x, _ in drawn):
            stack = np.vstack([y for _, y in drawn])  # one shared, sorted flow grid (the engine's)
        else:
            grid = np.sort(grid)
            stack = np.vstack([np.interp(grid, *_sorted_xy(x, y)) for x, y in drawn])
        self.system_band.set_edges(grid, stack.min(axis=0), stack.max(axis=0))
        self.system_band.setVisible(True)

    def _pump_items_for(self, pumps_running: int) -> _PumpCurveItems:
        items = self._pump_items.get(pumps_running)
        if items is None:
            items = _PumpCurveItems(self.plot_item, pumps_running, with_region_name=not self._pump_items)
            self._pump_items[pumps_running] = items
        return items

    def _update_pump_curves(self) -> None:
        shown: set[int] = set()
        region_name_holder = None
        noted = False
        for pump_curve in self._pump_curves():
            pumps = pump_curve.pumps_running
            flow, head = pump_curve.flow_m3_s, _acting_head(pump_curve)
            if not flow.size or pumps in shown:
                continue
            items = self._pump_items_for(pumps)
            x, y = self._flow(flow), self._head(head)
            if set_curve_data(items.curve, x, y):
                items.end_label.setPos(float(x[-1]), float(y[-1]))
            at_manifold = pump_curve.head_at_manifold_m is not None
            items.set_names(at_manifold, self._stage_tags(pumps), pump_curve.speed_ratio)
            noted = noted or at_manifold
            if at_manifold:
                set_curve_data(items.tested, x, self._head(pump_curve.head_m))
            else:
                set_curve_data(items.tested, empty_array(), empty_array())
            set_visible(items.tested, at_manifold)
            bounds = scenarios.preferred_flow_bounds(pump_curve)
            if bounds is not None:
                rx, ry = self._region_stroke(flow, head, bounds)
                set_curve_data(items.region, self._flow(rx), self._head(ry))
                set_visible(items.region, rx.size > 0)
                if region_name_holder is None and items.region.isVisible():
                    region_name_holder = items
            else:
                set_curve_data(items.region, empty_array(), empty_array())
                set_visible(items.region, False)
            set_visible(items.curve, True)
            set_visible(items.end_label, True)
            shown.add(pumps)
        for pumps, items in self._pump_items.items():
            if pumps not in shown:
                set_curve_data(items.curve, empty_array(), empty_array())
                set_curve_data(items.tested, empty_array(), empty_array())
                set_curve_data(items.region, empty_array(), empty_array())
                items.set_visible(False)
        self._set_region_legend_name(region_name_holder)
        self.hover.set_idle_text(MANIFOLD_READOUT if noted else IDLE_READOUT)

    def _update_pump_set_curves(self) -> None:
        """The combined curve of each stage with pumps of other models, dash-dotted, named by its tags."""
        curves = self._pump_set_curves()
        at_manifold = any(c.head_at_manifold_m is not None for c in self._pump_curves())
        while len(self._set_items) < len(curves):
            item = pg.PlotDataItem(empty_array(), empty_array())
            item.setZValue(11)
            end = pg.TextItem("", anchor=(1.0, 1.1))
            end.setFont(style.annotation_font())
            end.setZValue(30)
            self.plot_item.addItem(item)
            self.plot_item.addItem(end, ignoreBounds=True)
            self._set_items.append((item, end))
        for index, (item, end) in enumerate(self._set_items):
            if index >= len(curves):
                set_curve_data(item, empty_array(), empty_array())
                set_visible(item, False)
                set_visible(end, False)
                continue
            curve = curves[index]
            running = len(curve.running)
            item.setPen(style.pump_set_pen(running))
            kind = MANIFOLD_CURVE_NAME if at_manifold else "Pump curve"
            item.opts["name"] = f"{kind}: {curve.label} (different models)"
            x, y = self._flow(curve.flow_m3_s), self._head(curve.head_m)
            set_curve_data(item, x, y)
            if end.toPlainText() != curve.label:
                end.setText(curve.label)
                end.setColor(style.pump_colour(running))
            end.setPos(float(x[-1]), float(y[-1]))
            set_visible(item, True)
            set_visible(end, True)

    @staticmethod
    def _region_stroke(flow: np.ndarray, head: np.ndarray,
                       bounds: tuple[float, float]) -> tuple[np.ndarray, np.ndarray]:
        """The part of a pump curve between the preferred-region flows, ends interpolated."""
        xs, ys = _sorted_xy(flow, head)
        low, high = max(bounds[0], xs[0]), min(bounds[1], xs[-1])
        if high <= low:
            return empty_array(), empty_array()
        inner = (xs > low) & (xs < high)
        x = np.concatenate(([low], xs[inner], [high]))
        return x, np.interp(x, xs, ys)

    def _set_region_legend_name(self, holder: _PumpCurveItems | None) -> None:
        text = "Preferred operating region"
        if self._solution is not None:
            low, high = scenarios.preferred_region_percent(self._solution)
            text += f" ({low:.0f}–{high:.0f} % of BEP flow)"
        for items in self._pump_items.values():
            items.region.opts["name"] = text if items is holder else None

    def _update_points(self) -> None:
        points: list[OperatingPoint] = [] if self._solution is None else scenarios.found_points(
            scenarios.ordered_points(self._solution, current_speed_only=True))
        spots = []
        self._marked = []
        looks: list[style.PointStyle] = []
        self._marked_pumps = []
        for point in points:
            x = to_display(float(point.flow_m3_s or 0.0), "flow", self._unit_system)
            y = to_display(float(point.head_m or 0.0), "head", self._unit_system)
            looks.append(style.operating_point_style(point.static, point.pipe, point.pumps_running))
            self._marked.append((x, y, scenarios.point_label(point) + speed_phrase(point.speed_ratio)))
            self._marked_pumps.append(point.pumps_running)
        for set_point in self._pump_set_points():
            x = to_display(float(set_point.flow_m3_s or 0.0), "flow", self._unit_system)
            y = to_display(float(set_point.manifold_head_m or 0.0), "head", self._unit_system)
            looks.append(style.operating_point_style(set_point.static, set_point.pipe, len(set_point.running)))
            self._marked.append((x, y, scenarios.pump_set_label(set_point)))
            self._marked_pumps.append(len(set_point.running))
        for number, ((x, y, label), look) in enumerate(zip(self._marked, looks, strict=True), start=1):
            spots.append({"pos": (x, y), "symbol": look.symbol, "brush": look.brush, "pen": look.pen,
                          "size": look.size, "data": f"{number}: {label}"})
        self.points_item.setData(spots)
        # Each marker carries its number; the key in the legend gives the number's full label.
        numbers = [(x, y, str(number)) for number, (x, y, _label) in enumerate(self._marked, start=1)]
        update_label_pool(self.plot_item, self._point_labels, numbers, fill_alpha=190)
        self._update_key(looks)
        self._place_point_labels()

    def _update_key(self, looks: list[style.PointStyle]) -> None:
        """The numbered key: one legend sample per marked point, its marker and ``"n: label"``."""
        while len(self._key_items) < len(self._marked):
            self._key_items.append(pg.PlotDataItem([0.0], [0.0], pen=None, symbol="o"))
        for index, item in enumerate(self._key_items):
            if index < len(self._marked):
                look = looks[index]
                item.setSymbol(look.symbol)
                item.setSymbolBrush(look.brush)
                item.setSymbolPen(look.pen)
                item.setSymbolSize(9)
                item.opts["name"] = f"{index + 1}: {self._marked[index][2]}"
            else:
                item.opts["name"] = None

    def point_key(self) -> list[str]:
        """The numbered key of the points marked, in number order (``"1: 1 pump · max static · aged"``)."""
        return [f"{number}: {label}" for number, (_x, _y, label) in enumerate(self._marked, start=1)]

    def point_label_geometry(self) -> list[tuple[QPointF, QRectF]]:
        """Each marked point's marker centre and its number label's box, in scene coordinates."""
        out = []
        for index, (x, y, _label) in enumerate(self._marked):
            label = self._point_labels[index]
            out.append((self.view_box.mapViewToScene(QPointF(x, y)), label.mapRectToScene(label.boundingRect())))
        return out

    def _pump_set_points(self) -> list[PumpSetPoint]:
        """The points of the run sequence's sets with other pumps, every pump at its highest speed."""
        pump_set = None if self._solution is None else self._solution.pump_set
        if pump_set is None:
            return []
        return [p for p in pump_set.points if p.found and p.basis == "run sequence" and p.speed == "highest speed"
                and p.flow_m3_s is not None and p.manifold_head_m is not None]

    def _place_point_labels(self, *_args: object) -> None:
        """Place the pump-curve end labels, then the point labels, clear of each other and the markers."""
        labels = []
        for pumps in sorted(self._pump_items):
            items = self._pump_items[pumps]
            if items.end_label.isVisible():
                position = items.end_label.pos()
                labels.append((items.end_label, position.x(), position.y()))
        for _item, end in self._set_items:
            if end.isVisible():
                position = end.pos()
                labels.append((end, position.x(), position.y()))
        labels += [(self._point_labels[i], x, y) for i, (x, y, _) in enumerate(self._marked)]
        if labels:
            place_labels(self.view_box, labels, obstacles=[(x, y) for x, y, _ in self._marked], marker_px=6.0)

    def _update_design_flow(self) -> None:
        design = None if self._solution is None else self._solution.design_flow_m3_s
        if design is None or not design > 0:
            self.design_flow_line.setVisible(False)
            return
        x = to_display(design, "flow", self._unit_system)
        text = f"design flow {readout_number(x, 3)} {unit_label('flow', self._unit_system)}"
        if self.design_flow_line.isVisible() and self.design_flow_line.value() == x and self._design_text == text:
            return
        self.design_flow_line.setVisible(True)  # the label only redraws while visible
        self.design_flow_line.setPos(x)
        self.design_flow_line.label.setFormat(text)
        self._design_text = text

    def _update_snapshot(self) -> None:
        while len(self._snapshot_items) < len(self._snapshot_si):
            item = pg.PlotDataItem(empty_array(), empty_array(), pen=style.snapshot_pen())
            item.setZValue(2)
            self.plot_item.addItem(item)
            self._snapshot_items.append(item)
        if self._snapshot_items:
            current = None if self._solution is None else self._solution.project
            self._snapshot_items[0].opts["name"] = pinned_curve_name(self._snapshot_project, current,
                                                                     self._unit_system)
        for index, item in enumerate(self._snapshot_items):
            if index < len(self._snapshot_si):
                flow, head = self._snapshot_si[index]
                set_curve_data(item, self._flow(flow), self._head(head))
                set_visible(item, True)
            else:
                set_curve_data(item, empty_array(), empty_array())
                set_visible(item, False)

    def _follow_data(self) -> None:
        """Flow from zero to the end of the curves; head up to a margin above the pump curves.

        System curves rise far beyond the pumps at high flow; the view stops at about a
        fifth above the highest pump head (or the static head, if that is higher), where
        the operating points are.  Without a pump the whole system curves are shown.
        """
        xs: list[float] = [0.0]
        ys_low: list[float] = [0.0]
        system_top: list[float] = []
        for item in self._system_items.values():
            if item.isVisible():
                x, y = item.getData()
                if x is not None and len(x):
                    xs.append(float(np.nanmax(x)))
                    ys_low.append(float(np.nanmin(y)))
                    system_top.append(float(np.nanmax(y)))
        pump_top: list[float] = []
        for items in self._pump_items.values():
            for item in (items.curve, items.tested):
                if item.isVisible():
                    x, y = item.getData()
                    if x is not None and len(x):
                        xs.append(float(np.nanmax(x)))
                        pump_top.append(float(np.nanmax(y)))
        for item, _end in self._set_items:
            if item.isVisible():
                x, y = item.getData()
                if x is not None and len(x):
                    xs.append(float(np.nanmax(x)))
                    pump_top.append(float(np.nanmax(y)))
        point_heads = [y for _, y, _ in self._marked]
        if pump_top:
            static = [] if self._solution is None else [
                to_display(self._solution.static_head_max_m, "head", self._unit_system)]
            top = 1.2 * max(pump_top + point_heads + static)
        elif system_top:
            top = max(system_top)
        else:
            return
        self._view.follow(nice_range(0.0, max(xs), headroom=0.02), nice_range(min(ys_low), top, headroom=0.0))

    def _sync_legend(self) -> None:
        ordered: list[pg.GraphicsObject] = [self._system_items[case] for case in SYSTEM_CASES]
        for pumps in sorted(self._pump_items):
            ordered.append(self._pump_items[pumps].curve)
        ordered.extend(item for item, _end in self._set_items)
        for pumps in sorted(self._pump_items):
            ordered.append(self._pump_items[pumps].tested)
        ordered.extend(items.region for items in self._pump_items.values())
        if self._snapshot_items:
            ordered.append(self._snapshot_items[0])
        if self._marked:
            ordered.extend(self._marker_key.items(self._marked_pumps, compact=True))
            ordered.extend(self._key_items[: len(self._marked)])
        self._legend_sync.sync(ordered)

    def _describe_position(self, _index: int, x: float, y: float) -> str:
        flow_unit = unit_label("flow", self._unit_system)
        head_unit = unit_label("head", self._unit_system)
        return f"Pointer: flow {readout_number(x)} {flow_unit}   ·   head {readout_number(y)} {head_unit}"


def _acting_head(pump_curve: PumpCurve) -> FloatArray:
    """The head the pumps give the common pipework: at the manifold where the engine gives it."""
    return pump_curve.head_m if pump_curve.head_at_manifold_m is None else pump_curve.head_at_manifold_m


def _sorted_xy(x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    order = np.argsort(x, kind="stable")
    return x[order], y[order]


def _copy_or_empty(values: np.ndarray | None) -> np.ndarray:
    return empty_array() if values is None else np.array(values, dtype=float)
