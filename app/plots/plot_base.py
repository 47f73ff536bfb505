"""Building blocks shared by the plots: a styled plot widget, a hover readout, a legend
that lists only what is shown, and a placer that keeps point labels from overlapping."""

from __future__ import annotations

from collections.abc import Callable, Iterable, Sequence
from typing import TYPE_CHECKING, Any

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QObject, QPointF, QRectF, Qt, Signal
from PySide6.QtGui import QBrush, QColor, QPainter, QPainterPath, QPaintEvent
from PySide6.QtWidgets import QLabel, QSizePolicy, QWidget

from app import style
from hydraulics.results import OperatingPoint, Solution

if TYPE_CHECKING:
    from pyqtgraph.GraphicsScene.mouseEvents import MouseClickEvent


def make_readout_label(parent: QWidget) -> QLabel:
    """The one-line label above a plot that shows the hover readout.

    Its width is ignored by the layout, so a longer readout never resizes the window.
    """
    label = QLabel(parent)
    label.setObjectName("plotReadout")
    label.setSizePolicy(QSizePolicy.Policy.Ignored, QSizePolicy.Policy.Fixed)
    label.setContentsMargins(6, 2, 6, 2)
    label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
    return label


class PlotCanvas(pg.GraphicsLayoutWidget):  # type: ignore[misc]  # pyqtgraph ships no types
    """A GraphicsLayoutWidget that says when it has painted (``painted``), for timing redraws."""

    painted = Signal()

    def paintEvent(self, event: QPaintEvent) -> None:
        super().paintEvent(event)
        self.painted.emit()


def make_canvas() -> PlotCanvas:
    """A white canvas to hold one or more plots and a legend row."""
    canvas = PlotCanvas()
    canvas.setBackground(style.PLOT_BACKGROUND)
    canvas.ci.setContentsMargins(4, 4, 8, 4)
    canvas.ci.setSpacing(4)
    return canvas


def add_plot(canvas: pg.GraphicsLayoutWidget, row: int) -> pg.PlotItem:
    """A styled PlotItem in ``row`` of ``canvas``."""
    plot_item = canvas.addPlot(row=row, col=0)
    style_plot_item(plot_item)
    return plot_item


class FixedItemSample(pg.ItemSample):  # type: ignore[misc]  # pyqtgraph ships no types
    """A legend sample that does not hide its curve when clicked.

    The plots decide what is shown (an unused pump curve is hidden and leaves the
    legend); a click that hid a curve behind the plot's back would lose it from view.
    """

    def mouseClickEvent(self, event: MouseClickEvent) -> None:
        event.ignore()


def add_legend_row(canvas: pg.GraphicsLayoutWidget, row: int, columns: int = 3) -> pg.LegendItem:
    """A legend laid out below the plots (so it never hides a curve), ``columns`` wide."""
    legend = pg.LegendItem(colCount=columns, labelTextColor=style.PLOT_FOREGROUND, labelTextSize="8.5pt",
                           brush=pg.mkBrush(255, 255, 255, 0), pen=pg.mkPen(None), verSpacing=-6,
                           horSpacing=16, sampleType=FixedItemSample)
    canvas.addItem(legend, row=row, col=0)
    canvas.ci.layout.setRowStretchFactor(row, 0)
    return legend


def style_plot_item(plot_item: pg.PlotItem) -> None:
    """Apply the PumpSketch axis style to one PlotItem."""
    for name in ("left", "bottom", "right", "top"):
        axis = plot_item.getAxis(name)
        axis.setPen(pg.mkPen(style.PLOT_FOREGROUND))
        axis.setTextPen(pg.mkPen(style.PLOT_FOREGROUND))
        axis.setTickFont(style.tick_font())
        axis.enableAutoSIPrefix(False)
    GridLines(plot_item)
    plot_item.hideButtons()


class GridLines(pg.PlotCurveItem):  # type: ignore[misc]  # pyqtgraph ships no types
    """Light grid lines at the axes' major and minor ticks, one path behind the data.

    The axes' own grid (``showGrid``) and ``pg.GridItem`` are replayed from large
    pictures on every repaint and cost tens of milliseconds per frame offscreen; one
    path of a few dozen segments, rebuilt only when the view range changes, costs
    almost nothing.
    """

    def __init__(self, plot_item: pg.PlotItem) -> None:
        super().__init__(pen=pg.mkPen(style.GRID_COLOUR, width=1), connect="pairs", antialias=False)
        self._plot_item = plot_item
        self.setZValue(-100)
        plot_item.addItem(self, ignoreBounds=True)
        plot_item.getViewBox().sigRangeChanged.connect(self._rebuild)
        self._rebuild()

    def _ticks(self, axis_name: str, low: float, high: float) -> list[float]:
        axis = self._plot_item.getAxis(axis_name)
        size = axis.height() if axis_name in ("left", "right") else axis.width()
        levels = axis.tickValues(low, high, max(size, 1.0))
        # major and minor levels: a line at every labelled value
        return [float(v) for _spacing, values in levels[:2] for v in values]

    def _rebuild(self, *_args: object) -> None:
        (x0, x1), (y0, y1) = self._plot_item.getViewBox().viewRange()
        xs, ys = [], []
        for x in self._ticks("bottom", x0, x1):
            xs += [x, x]
            ys += [y0, y1]
        for y in self._ticks("left", y0, y1):
            xs += [x0, x1]
            ys += [y, y]
        self.setData(np.array(xs, dtype=float), np.array(ys, dtype=float))


def update_label_pool(plot_item: pg.PlotItem, pool: list[pg.TextItem],
                      marks: Sequence[tuple[float, float, str]], fill_alpha: int = 150) -> None:
    """Show one TextItem per ``(x, y, text)`` mark, growing ``pool`` as needed, hiding the rest.

    Items are created once and reused, so a redraw only moves and retexts them.
    """
    while len(pool) < len(marks):
        item = pg.TextItem("", color=style.PLOT_FOREGROUND, fill=pg.mkBrush(255, 255, 255, fill_alpha))
        item.setFont(style.annotation_font())
        item.setZValue(45)
        plot_item.addItem(item, ignoreBounds=True)
        pool.append(item)
    for index, item in enumerate(pool):
        if index < len(marks):
            x, y, text = marks[index]
            if item.textItem.toPlainText() != text:
                item.setText(text)
            position = item.pos()
            if position.x() != x or position.y() != y:
                item.setPos(x, y)
            if not item.isVisible():
                item.setVisible(True)
        elif item.isVisible():
            item.setVisible(False)


def set_curve_data(item: pg.PlotDataItem | pg.PlotCurveItem, x: np.ndarray, y: np.ndarray) -> bool:
    """``item.setData(x, y)`` unless it already shows exactly these values; True if it changed.

    Most edits move the system curves only; the pump curves, their regions and the
    snapshot are then left alone instead of being rebuilt and re-measured.
    """
    drawn = getattr(item, "_drawn_xy", None)
    if drawn is not None and np.array_equal(drawn[0], x) and np.array_equal(drawn[1], y):
        return False
    item.setData(x, y)
    item._drawn_xy = (np.array(x, dtype=float), np.array(y, dtype=float))
    return True


class BandItem(pg.GraphicsObject):  # type: ignore[misc]  # pyqtgraph ships no types
    """The area between a lower and an upper edge over one x grid, filled without outline.

    One closed path is built from the edge arrays with numpy (``pg.arrayToQPath``);
    ``pg.FillBetweenItem`` instead rebuilds its path from the two curves' own paths in
    Python on every change.
    """

    def __init__(self, brush: QColor | QBrush) -> None:
        super().__init__()
        self._brush = pg.mkBrush(brush)
        self._path = QPainterPath()
        self._edges = (empty_array(), empty_array(), empty_array())

    def set_edges(self, x: np.ndarray, low: np.ndarray, high: np.ndarray) -> None:
        """Fill between ``low`` and ``high`` over ``x`` (fewer than two points: nothing)."""
        x, low, high = (np.array(v, dtype=float) for v in (x, low, high))
        self._edges = (x, low, high)
        self.prepareGeometryChange()
        if x.size < 2:
            self._path = QPainterPath()
        else:
            self._path = pg.arrayToQPath(np.concatenate([x, x[::-1]]), np.concatenate([low, high[::-1]]),
                                         connect="all")
            self._path.closeSubpath()
        self.update()

    def edges(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Copies of the (x, low, high) arrays filled."""
        x, low, high = self._edges
        return x.copy(), low.copy(), high.copy()

    def boundingRect(self) -> QRectF:
        return self._path.boundingRect()

    def paint(self, painter: QPainter, *_args: object) -> None:
        painter.setPen(Qt.PenStyle.NoPen)
        painter.setBrush(self._brush)
        painter.drawPath(self._path)


def set_axis_title(plot_item: pg.PlotItem, axis: str, text: str) -> None:
    """Axis title in the PumpSketch font, without pyqtgraph's automatic SI prefixes.

    Setting a title makes the axis lay itself out and draw its ticks afresh, so a title
    that is already shown as asked is left alone (the plots set theirs on every redraw).
    """
    label_style = {"color": style.PLOT_FOREGROUND, "font-size": style.LABEL_FONT_SIZE}
    axis_item = plot_item.getAxis(axis)
    shown_as_asked = (axis_item.labelText == text and axis_item.labelStyle == label_style
                      and axis_item.labelUnits == "" and axis_item.labelUnitPrefix == ""
                      and axis_item.unitPower == 1 and getattr(axis_item, "_siPrefixEnableRanges", 0) is None
                      and axis_item.label.isVisible() == bool(text) and axis_item.isVisible())
    if shown_as_asked:
        return
    plot_item.setLabel(axis, text, **label_style)


def completes_drawn(drawn: Solution | None, drawn_units: str | None, solution: Solution | None,
                    unit_system: str) -> bool:
    """True when ``solution`` only completes the first-stage solution ``drawn``.

    The engine finishes a solve in two stages (:func:`hydraulics.solve.solve_curves`,
    then :func:`hydraulics.solve.complete_solution`) and the window draws the plots from
    the first.  The finished solution adds checks and variable speed and passes every
    drawn part on as the very same object, so a plot showing ``drawn`` in the same units
    needs no redraw.
    """
    return (drawn is not None and solution is not None and drawn_units == unit_system
            and not drawn.complete and solution.complete
            and solution.project is drawn.project
            and solution.curves is drawn.curves
            and solution.segments is drawn.segments
            and solution.operating_points is drawn.operating_points
            and solution.pump_curves is drawn.pump_curves
            and solution.pump_fits is drawn.pump_fits
            and solution.npsh_available_curve is drawn.npsh_available_curve
            and solution.pump_set_curves is drawn.pump_set_curves)


def empty_array() -> np.ndarray:
    return np.empty(0, dtype=float)


def drawn_xy(item: pg.PlotDataItem) -> tuple[np.ndarray, np.ndarray]:
    """Copies of the (x, y) arrays ``item`` shows; empty arrays while it is hidden or empty."""
    x, y = item.getData()
    if not item.isVisible() or x is None:
        return empty_array(), empty_array()
    return np.array(x, dtype=float), np.array(y, dtype=float)


def set_visible(item: pg.GraphicsObject, visible: bool) -> None:
    """Show or hide ``item``, calling ``setVisible`` only when that changes it."""
    if item.isVisible() != visible:
        item.setVisible(visible)


class ViewFollower(QObject):
    """Sets a plot's range to what the data needs, until the user zooms or pans.

    After a manual zoom the view stays where the user put it; :meth:`reset` (the window's
    "fit view" command) returns to following the data.
    """

    def __init__(self, plot_item: pg.PlotItem):
        super().__init__(plot_item)
        self._view_box = plot_item.getViewBox()
        self._view_box.disableAutoRange()
        self._wanted: tuple[tuple[float, float], tuple[float, float]] | None = None
        self.user_moved = False
        self._view_box.sigRangeChangedManually.connect(self._on_manual)

    def _on_manual(self, *_args: object) -> None:
        self.user_moved = True

    def follow(self, x_range: tuple[float, float] | None, y_range: tuple[float, float] | None) -> None:
        """Show ``x_range`` × ``y_range`` (display units) unless the user has moved the view."""
        if x_range is None or y_range is None:
            return
        self._wanted = (x_range, y_range)
        if not self.user_moved:
            self._view_box.setRange(xRange=x_range, yRange=y_range, padding=0.0)

    def reset(self) -> None:
        """Forget the user's zoom and show the data range again."""
        self.user_moved = False
        if self._wanted is not None:
            self._view_box.setRange(xRange=self._wanted[0], yRange=self._wanted[1], padding=0.0)


def nice_range(low: float, high: float, headroom: float = 0.06) -> tuple[float, float] | None:
    """``(low, high)`` widened by ``headroom`` of the span at the top and 3 % at the bottom.

    The small margin below keeps the tick label of the lower end (usually zero) in view.
    Returns ``None`` for a non-finite range.
    """
    if not (np.isfinite(low) and np.isfinite(high)):
        return None
    if high <= low:
        high = low + 1.0
    span = high - low
    return low - 0.03 * span, high + headroom * span


class LegendSync:
    """Keep a legend listing exactly the visible items that carry a name, in a fixed order."""

    def __init__(self, legend: pg.LegendItem):
        self._legend = legend
        self._shown: list[tuple[int, str]] = []

    def sync(self, ordered_items: Iterable[pg.GraphicsObject]) -> None:
        wanted = []
        for item in ordered_items:
            name = item.name() if hasattr(item, "name") else None
            if name and item.isVisible():
                wanted.append((item, name))
        signature = [(id(item), name) for item, name in wanted]
        if signature == self._shown:
            return
        self._legend.clear()
        for item, name in wanted:
            self._legend.addItem(item, name)
        self._shown = signature

    def names(self) -> list[str]:
        """The entries now listed, top to bottom."""
        return [label.text for _, label in self._legend.items]


class HoverReadout(QObject):
    """A crosshair following the pointer and a text label saying where it is.

    Works over one or several PlotItems that share a scene and a flow axis (stacked
    plots): the vertical line follows the pointer in every plot, the horizontal line only
    in the plot under the pointer.  ``describe(index, x, y)`` receives the index of that
    plot and the view (display-unit) coordinates and returns the readout text.  Mouse
    moves arrive through a rate-limited :class:`pyqtgraph.SignalProxy`.
    """

    def __init__(self, plot_items: Sequence[pg.PlotItem], label: QLabel,
                 describe: Callable[[int, float, float], str], idle_text: str):
        super().__init__(label)
        self._plot_items = list(plot_items)
        self._label = label
        self._describe = describe
        self._idle_text = idle_text
        self._last: tuple[int, float, float] | None = None
        self.verticals: list[pg.InfiniteLine] = []
        self.horizontals: list[pg.InfiniteLine] = []
        for plot_item in self._plot_items:
            vertical = pg.InfiniteLine(angle=90, movable=False, pen=style.crosshair_pen())
            horizontal = pg.InfiniteLine(angle=0, movable=False, pen=style.crosshair_pen())
            for line in (vertical, horizontal):
                line.setVisible(False)
                line.setZValue(50)
                plot_item.addItem(line, ignoreBounds=True)
            self.verticals.append(vertical)
            self.horizontals.append(horizontal)
        scene = self._plot_items[0].scene()
        self._proxy = pg.SignalProxy(scene.sigMouseMoved, rateLimit=60, slot=self._on_moved)
        label.setText(idle_text)

    @property
    def active(self) -> bool:
        """True while the pointer is over one of the plots."""
        return self._last is not None

    def set_idle_text(self, text: str) -> None:
        """The text shown while the pointer is off the plots (shown at once if it is off now)."""
        if text == self._idle_text:
            return
        self._idle_text = text
        if self._last is None:
            self._label.setText(text)

    def refresh(self) -> None:
        """Describe the last position again (after a change of units or data)."""
        if self._last is None:
            self._label.setText(self._idle_text)
        else:
            self.show_at(*self._last)

    def show_at(self, index: int, x: float, y: float) -> None:
        """Put the crosshair at (x, y) of plot ``index`` and describe that point."""
        self._last = (index, x, y)
        for i, (vertical, horizontal) in enumerate(zip(self.verticals, self.horizontals, strict=True)):
            vertical.setPos(x)
            vertical.setVisible(True)
            horizontal.setPos(y)
            horizontal.setVisible(i == index)
        self._label.setText(self._describe(index, x, y))

    def hide(self) -> None:
        """Remove the crosshair and show the idle text."""
        self._last = None
        for line in self.verticals + self.horizontals:
            line.setVisible(False)
        self._label.setText(self._idle_text)

    def _on_moved(self, event: tuple[QPointF]) -> None:
        scene_pos = event[0]
        for index, plot_item in enumerate(self._plot_items):
            view_box = plot_item.getViewBox()
            if view_box.sceneBoundingRect().contains(scene_pos):
                point = view_box.mapSceneToView(scene_pos)
                self.show_at(index, point.x(), point.y())
                return
        self.hide()


_CANDIDATE_ANCHORS: tuple[tuple[float, float], ...] = (
    (1.04, 1.08),   # above left of the point
    (-0.04, -0.08),  # below right
    (-0.04, 1.08),  # above right
    (1.04, -0.08),  # below left
    (1.06, 0.5),    # left, level with the point
    (-0.06, 0.5),   # right, level with the point
    (0.5, 1.3),     # above, centred
    (0.5, -0.3),    # below, centred
    (1.04, 2.1),    # one line higher, left
    (-0.04, -1.1),  # one line lower, right
)


def place_labels(view_box: pg.ViewBox, labels: Sequence[tuple[pg.TextItem, float, float]],
                 obstacles: Sequence[tuple[float, float]] = (), marker_px: float = 7.0) -> None:
    """Anchor each text label next to its point so that labels do not overlap.

    Greedy: every label tries places around its point in turn and takes the first
    whose box stays inside the plot and clears the labels already placed and the markers
    in ``obstacles`` (view coordinates); failing that, the corner with the least overlap.
    """
    bounds = view_box.sceneBoundingRect()
    bounds_box = (bounds.left(), bounds.top(), bounds.width(), bounds.height())
    anchors = np.array(_CANDIDATE_ANCHORS, dtype=float)
    # Boxes taken so far, as (left, top, width, height) rows: the markers, then each label placed.
    taken = []
    for x, y in obstacles:
        p = view_box.mapViewToScene(QPointF(x, y))
        taken.append((p.x() - marker_px, p.y() - marker_px, 2 * marker_px, 2 * marker_px))
    n_markers = len(taken)
    for text_item, x, y in labels:
        p = view_box.mapViewToScene(QPointF(x, y))
        rect = text_item.textItem.boundingRect()
        width, height = rect.width(), rect.height()
        left = p.x() - anchors[:, 0] * width
        top = p.y() - anchors[:, 1] * height
        # Placed labels were tried first in the loop this replaces, then the markers; the
        # overlap areas are summed in that order (cumsum adds strictly left to right).
        others = np.array(taken[n_markers:] + taken[:n_markers], dtype=float).reshape(-1, 4)
        overlap = _overlap_areas(left, top, width, height, others)
        cost = np.cumsum(overlap, axis=1)[:, -1] if overlap.shape[1] else np.zeros(len(anchors))
        inside = _overlap_areas(left, top, width, height, np.array([bounds_box], dtype=float))[:, 0]
        outside = width * height - inside
        cost = cost + 4.0 * np.maximum(outside, 0.0)
        finite = np.flatnonzero(cost < float("inf"))
        best = int(finite[np.argmin(cost[finite])]) if finite.size else 0
        anchor = _CANDIDATE_ANCHORS[best]
        if (text_item.anchor.x(), text_item.anchor.y()) != anchor:
            text_item.setAnchor(anchor)
        if finite.size:
            taken.append((float(left[best]), float(top[best]), width, height))


def _overlap_areas(left: np.ndarray, top: np.ndarray, width: float, height: float,
                   others: np.ndarray) -> np.ndarray:
    """Areas of overlap (candidates × others) of boxes (left, top, width, height).

    Computed as QRectF.intersected does (edge = origin + size; no overlap, or a
    zero-width one, gives 0), so the areas equal those of the Qt rectangles.
    """
    right = left + width
    bottom = top + height
    o_left, o_top = others[:, 0], others[:, 1]
    o_right, o_bottom = o_left + others[:, 2], o_top + others[:, 3]
    overlap_w = np.minimum(right[:, None], o_right) - np.maximum(left[:, None], o_left)
    overlap_h = np.minimum(bottom[:, None], o_bottom) - np.maximum(top[:, None], o_top)
    hit = (overlap_w > 0.0) & (overlap_h > 0.0)
    return np.where(hit, overlap_w * overlap_h, 0.0)


class PointKey:
    """Legend entries that explain the operating-point markers of plots without point labels.

    Colour tells the static extreme, a filled marker new pipe and a hollow one aged pipe,
    the marker shape the number of pumps running (see :func:`app.style.operating_point_style`).
    The sample items are never drawn in a plot; they only lend their look to the legend.
    """

    def __init__(self) -> None:
        self.scenario_items: list[pg.PlotDataItem] = []
        for static in ("max", "min"):
            for pipe in ("new", "aged"):
                look = style.operating_point_style(static, pipe, 1)
                self.scenario_items.append(pg.PlotDataItem(
                    [0.0], [0.0], pen=None, symbol="o", symbolBrush=look.brush,
                    symbolPen=look.pen, symbolSize=look.size, name=f"{static} static, {pipe} pipe"))
        self._pump_items: dict[int, pg.PlotDataItem] = {}
        self.fill_items: list[pg.PlotDataItem] = []
        for pipe, words in (("new", "filled marker: new pipe"), ("aged", "hollow marker: aged pipe")):
            brush = pg.mkBrush(style.GREY) if pipe == "new" else pg.mkBrush(style.PLOT_BACKGROUND)
            self.fill_items.append(pg.PlotDataItem([0.0], [0.0], pen=None, symbol="o", symbolBrush=brush,
                                                   symbolPen=pg.mkPen(style.GREY, width=2), symbolSize=10,
                                                   name=words))

    def items(self, pump_counts: Iterable[int], compact: bool = False) -> list[pg.PlotDataItem]:
        """Sample items for the scenarios and for each number of pumps in ``pump_counts``.

        ``compact``: the pipe state by fill only (filled new, hollow aged), for a plot whose
        curves already tell the static extremes by colour.
        """
        out = list(self.fill_items if compact else self.scenario_items)
        for count in sorted(set(pump_counts)):
            item = self._pump_items.get(count)
            if item is None:
                item = pg.PlotDataItem([0.0], [0.0], pen=None, symbol=style.pump_symbol(count),
                                       symbolBrush=pg.mkBrush(style.LIGHT_GREY), symbolPen=pg.mkPen(style.GREY),
                                       symbolSize=10, name=f"{count} pump{'s' if count > 1 else ''} running")
                self._pump_items[count] = item
            out.append(item)
        return out


def point_spots(points: Iterable[OperatingPoint], x_of: Callable[[OperatingPoint], float | None],
                y_of: Callable[[OperatingPoint], float | None],
                label_of: Callable[[OperatingPoint], str]) -> list[dict[str, Any]]:
    """ScatterPlotItem spots for operating points; points whose x or y is missing are skipped."""
    spots = []
    for point in points:
        x, y = x_of(point), y_of(point)
        if x is None or y is None or not (np.isfinite(x) and np.isfinite(y)):
            continue
        look = style.operating_point_style(point.static, point.pipe, point.pumps_running)
        spots.append({"pos": (float(x), float(y)), "symbol": look.symbol, "brush": look.brush,
                      "pen": look.pen, "size": look.size, "data": label_of(point)})
    return spots


def make_points_item() -> pg.ScatterPlotItem:
    """A scatter item for operating points whose tooltip names the point."""
    item = pg.ScatterPlotItem(pxMode=True, hoverable=True, tip=_point_tip)
    item.setZValue(40)
    return item


def _point_tip(x: float, y: float, data: object) -> str:
    return str(data)
