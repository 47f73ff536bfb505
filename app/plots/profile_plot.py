"""The profile of the main: pipe elevation, grade lines, the pressure-rating envelope, high points.

Chainage runs along the common delivery pipework.  :class:`ProfilePlot` only draws the
engine's :class:`~hydraulics.main_profile.ProfileResult` (``Solution.profile``):

* the pipe elevation, a solid dark line;
* the hydraulic grade line at each operating point, coloured by static extreme and solid
  for new pipe, dashed for aged pipe (as the system curves);
* the grade lines at rest (check valves closed), dotted, coloured by static extreme;
* the pressure-rating envelope: pipe elevation plus the segment's rating as a head of the
  fluid, a step at each segment boundary, where the catalogue gives a rating;
* the air valves, and the vented crest that governs the system head, marked and labelled.

Where the pipe rises above a grade line the pressure there is below atmospheric.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QWidget

from app import style
from app.plots.plot_base import (
    HoverReadout,
    completes_drawn,
    drawn_xy,
    empty_array,
    nice_range,
    place_labels,
    set_axis_title,
    set_curve_data,
    set_visible,
    update_label_pool,
)
from app.plots.solution_plot import SolutionPlot
from hydraulics.main_profile import DELIVERY_CONTROL, ProfileLine, ProfileResult
from hydraulics.number_format import readout_number
from hydraulics.results import FloatArray, Solution
from hydraulics.units import to_display, unit_label

NO_PROFILE_MESSAGE = ("No profile of the main: enter chainage and elevation points in "
                      "Pipework → Main profile.")
IDLE_READOUT = "Point at the plot to read chainage, head and the pipe elevation there."

ELEVATION_COLOUR = style.PLOT_FOREGROUND
RATING_COLOUR = style.REDDISH_PURPLE
LINE_PREFIX = "HGL"
"""Legend prefix of a hydraulic grade line (the engine's label follows: scenario, or "at rest, …")."""
RATING_NAME = "Pipe + pressure rating as head"
RATING_ABOVE_NAME = "Pipe + pressure rating (above view)"
AIR_VALVE_LABEL = "air valve"
GOVERNS_ALWAYS_LABEL = "governing high point"
GOVERNS_LOW_FLOW_LABEL = "governs at low flow"


def _line_pen(line: ProfileLine) -> object:
    colour = style.STATIC_COLOURS.get(line.static, style.GREY)
    if line.pipe is None:  # at rest
        return style.make_pen(colour, 2.0, Qt.PenStyle.DotLine)
    return style.make_pen(colour, 2.0, style.PIPE_LINE_STYLES.get(line.pipe, Qt.PenStyle.DashDotLine))


class ProfilePlot(SolutionPlot):
    """Pipe elevation and hydraulic grade lines along the main (see the module docstring)."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent, plot_rows=1, legend_columns=3)

        self.rating_item = pg.PlotDataItem(empty_array(), empty_array(), connect="finite",
                                           name=RATING_NAME,
                                           pen=style.make_pen(RATING_COLOUR, 1.5, Qt.PenStyle.DashDotLine))
        self.rating_item.setZValue(6)
        self.plot_item.addItem(self.rating_item)
        self.elevation_item = pg.PlotDataItem(empty_array(), empty_array(), name="Pipe elevation",
                                              pen=style.make_pen(ELEVATION_COLOUR, 2.5))
        self.elevation_item.setZValue(20)
        self.plot_item.addItem(self.elevation_item)
        self._scenario_items: list[pg.PlotDataItem] = []
        self._rest_items: list[pg.PlotDataItem] = []

        self.air_valve_points = pg.ScatterPlotItem(pxMode=True, symbol="t1", size=11,
                                                   brush=pg.mkBrush(style.PLOT_BACKGROUND),
                                                   pen=style.make_pen(ELEVATION_COLOUR, 1.8), name="Air valve")
        self.air_valve_points.setZValue(40)
        self.plot_item.addItem(self.air_valve_points)
        self.governing_points = pg.ScatterPlotItem(pxMode=True, symbol="star", size=15,
                                                   brush=pg.mkBrush(style.ORANGE),
                                                   pen=style.make_pen(ELEVATION_COLOUR, 1.2),
                                                   name="Governing vented crest")
        self.governing_points.setZValue(41)
        self.plot_item.addItem(self.governing_points)
        self._labels: list[pg.TextItem] = []
        self._marks: list[tuple[float, float, str]] = []

        self.hover = HoverReadout([self.plot_item], self.readout, self._describe_position, IDLE_READOUT)
        self.plot_item.getViewBox().sigTransformChanged.connect(self._place_labels)
        self._apply_titles()
        self._sync_legend()

    # ------------------------------------------------------------------ public API
    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Draw ``solution``'s profile (``None``, or a solution without one, shows a message)."""
        if (completes_drawn(self._solution, self._unit_system, solution, unit_system)
                and solution is not None and self._solution is not None
                and solution.profile is self._solution.profile):
            self._solution = solution  # the finished solve of what is drawn: nothing to redraw
            return
        self._solution = solution
        self._unit_system = unit_system
        self._apply_titles()
        profile = None if solution is None else solution.profile
        self._update_elevation(profile)
        self._update_lines(self._scenario_items, () if profile is None else profile.scenarios)
        self._update_lines(self._rest_items, () if profile is None else profile.at_rest)
        self._update_rating(profile)
        self._update_marks(profile)
        self.plot_item.setTitle(NO_PROFILE_MESSAGE if profile is None and solution is not None else None,
                                color=style.GREY)
        self._follow_data()
        self._sync_legend()
        self.hover.refresh()

    def message(self) -> str:
        """The plot's title: the no-profile message, or empty."""
        return str(self.plot_item.titleLabel.text or "")

    def elevation_data(self) -> tuple[np.ndarray, np.ndarray]:
        """(chainage, pipe elevation) drawn, display units."""
        return drawn_xy(self.elevation_item)

    def scenario_data(self) -> list[tuple[str, np.ndarray, np.ndarray]]:
        """(legend name, chainage, grade line) of each operating point drawn, display units."""
        return [(str(item.name()), *drawn_xy(item)) for item in self._scenario_items if item.isVisible()]

    def rest_data(self) -> list[tuple[str, np.ndarray, np.ndarray]]:
        """(legend name, chainage, grade line) of each line at rest drawn, display units."""
        return [(str(item.name()), *drawn_xy(item)) for item in self._rest_items if item.isVisible()]

    def rating_data(self) -> tuple[np.ndarray, np.ndarray]:
        """(chainage, rating envelope) drawn (NaN between unrated segments), display units."""
        return drawn_xy(self.rating_item)

    def marks(self) -> list[tuple[float, float, str]]:
        """(chainage, elevation, text) of each label written on the plot, display units."""
        return list(self._marks)

    # ------------------------------------------------------------------ drawing
    def _x(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(np.asarray(values, dtype=float), "length", self._unit_system), dtype=float)

    def _y(self, values: FloatArray) -> FloatArray:
        return np.asarray(to_display(np.asarray(values, dtype=float), "elevation", self._unit_system), dtype=float)

    def _update_elevation(self, profile: ProfileResult | None) -> None:
        if profile is None:
            set_curve_data(self.elevation_item, empty_array(), empty_array())
            set_visible(self.elevation_item, False)
            return
        set_curve_data(self.elevation_item, self._x(profile.chainage_m), self._y(profile.elevation_m))
        set_visible(self.elevation_item, True)

    def _update_lines(self, pool: list[pg.PlotDataItem], lines: tuple[ProfileLine, ...]) -> None:
        while len(pool) < len(lines):
            item = pg.PlotDataItem(empty_array(), empty_array())
            item.setZValue(10)
            self.plot_item.addItem(item)
            pool.append(item)
        profile = None if self._solution is None else self._solution.profile
        for index, item in enumerate(pool):
            if index < len(lines) and profile is not None:
                line = lines[index]
                item.setPen(_line_pen(line))
                item.opts["name"] = f"{LINE_PREFIX} {line.label}"
                set_curve_data(item, self._x(profile.chainage_m), self._y(line.grade_line_m))
                set_visible(item, True)
            else:
                set_curve_data(item, empty_array(), empty_array())
                set_visible(item, False)

    def _update_rating(self, profile: ProfileResult | None) -> None:
        x, y = (empty_array(), empty_array()) if profile is None else self._rating_envelope(profile)
        set_curve_data(self.rating_item, x, y)
        set_visible(self.rating_item, bool(np.isfinite(y).any()))

    def _rating_envelope(self, profile: ProfileResult) -> tuple[np.ndarray, np.ndarray]:
        """The engine's rating envelope (:meth:`ProfileResult.rating_envelope`) in display units."""
        x, head = profile.rating_envelope()
        if not x.size:
            return empty_array(), empty_array()
        return self._x(x), self._y(head)

    def _update_marks(self, profile: ProfileResult | None) -> None:
        self._marks = []
        if profile is None:
            self.air_valve_points.setData([], [])
            self.governing_points.setData([], [])
            update_label_pool(self.plot_item, self._labels, [])
            return
        governing = self._governing_chainages(profile)
        valves = [float(c) for c in profile.air_valve_chainage_m]
        valve_z = np.interp(valves, profile.chainage_m, profile.elevation_m) if valves else empty_array()
        vx, vy = self._x(np.array(valves, dtype=float)), self._y(valve_z)
        self.air_valve_points.setData(vx, vy)
        gx_si = np.array(sorted(governing), dtype=float)
        gz = np.interp(gx_si, profile.chainage_m, profile.elevation_m) if gx_si.size else empty_array()
        gx, gy = self._x(gx_si), self._y(gz)
        self.governing_points.setData(gx, gy)
        for x_si, x, y in zip(valves, vx, vy, strict=True):
            if x_si not in governing:
                self._marks.append((float(x), float(y), AIR_VALVE_LABEL))
        for x_si, x, y in zip(gx_si, gx, gy, strict=True):
            self._marks.append((float(x), float(y), f"{AIR_VALVE_LABEL}, {governing[float(x_si)]}"))
        update_label_pool(self.plot_item, self._labels, self._marks, fill_alpha=190)
        self._place_labels()

    @staticmethod
    def _governing_chainages(profile: ProfileResult) -> dict[float, str]:
        """Chainage of each vented crest that governs some operating point, with how it is labelled.

        A crest governs at every operating point, or (the usual case: the loss beyond the
        crest grows with the flow) only at the lower flows.
        """
        lines = profile.scenarios
        out: dict[float, str] = {}
        for chainage in {line.control_chainage_m for line in lines if line.control_index != DELIVERY_CONTROL}:
            governed = [line for line in lines if line.control_chainage_m == chainage]
            out[float(chainage)] = GOVERNS_ALWAYS_LABEL if len(governed) == len(lines) else GOVERNS_LOW_FLOW_LABEL
        return out

    def _place_labels(self, *_args: object) -> None:
        labels = [(self._labels[i], x, y) for i, (x, y, _) in enumerate(self._marks)]
        if labels:
            place_labels(self.plot_item.getViewBox(), labels, obstacles=[(x, y) for x, y, _ in self._marks])

    def _follow_data(self) -> None:
        xs: list[float] = []
        ys: list[float] = []
        for item in [self.elevation_item, *self._scenario_items, *self._rest_items]:
            x, y = item.getData()
            if item.isVisible() and x is not None and len(x) and np.isfinite(y).any():
                xs.extend([float(np.nanmin(x)), float(np.nanmax(x))])
                ys.extend([float(np.nanmin(y)), float(np.nanmax(y))])
        if not xs:
            return
        low, high = min(ys), max(ys)
        self.rating_item.opts["name"] = RATING_NAME
        _, rating = self.rating_item.getData()
        if self.rating_item.isVisible() and rating is not None and np.isfinite(rating).any():
            # The envelope is shown where it comes within one span of the lines; far above,
            # it would squash them, so it is left above the view and the legend says so.
            closest = float(np.nanmin(rating))
            if closest <= high + (high - low):
                high = max(high, closest)
            else:
                self.rating_item.opts["name"] = RATING_ABOVE_NAME
        self._view.follow(nice_range(min(xs), max(xs), headroom=0.02), nice_range(low, high, headroom=0.08))

    def _apply_titles(self) -> None:
        set_axis_title(self.plot_item, "bottom", f"Chainage ({unit_label('length', self._unit_system)})")
        set_axis_title(self.plot_item, "left", f"Elevation / head ({unit_label('elevation', self._unit_system)})")

    def _sync_legend(self) -> None:
        ordered: list[pg.GraphicsObject] = [self.elevation_item, *self._scenario_items, *self._rest_items,
                                            self.rating_item]
        if len(self.air_valve_points.data):
            ordered.append(self.air_valve_points)
        if len(self.governing_points.data):
            ordered.append(self.governing_points)
        self._legend_sync.sync(ordered)

    def _describe_position(self, _index: int, x: float, y: float) -> str:
        unit = unit_label("elevation", self._unit_system)
        text = (f"Pointer: chainage {readout_number(x)} {unit_label('length', self._unit_system)}   ·   "
                f"elevation / head {readout_number(y)} {unit}")
        px, pz = self.elevation_data()
        if px.size and px[0] <= x <= px[-1]:
            text += f"   ·   pipe at {readout_number(float(np.interp(x, px, pz)))} {unit}"
        return text
