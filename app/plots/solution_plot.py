"""The frame every plot widget shares: a hover readout above a canvas of stacked plots and a legend row.

:class:`SolutionPlot` holds what the plots have in common (the parts, the solution and
unit system drawn, the view followers); each plot module adds its own items and
drawing.  Nothing here computes hydraulics.
"""

from __future__ import annotations

import pyqtgraph as pg
from PySide6.QtWidgets import QVBoxLayout, QWidget

from app.plots.plot_base import LegendSync, ViewFollower, add_legend_row, add_plot, make_canvas, make_readout_label
from hydraulics.results import Solution

STACKED_AXIS_WIDTH = 64
"""Width (px) of the left axis of stacked plots, so that their flow axes line up."""


class SolutionPlot(QWidget):
    """A readout label over a canvas of ``plot_rows`` stacked plots and a legend ``legend_columns`` wide.

    Stacked plots share the flow axis of the top one.  ``plot_items`` are the plots from
    the top (``plot_item`` is the first), each with its :class:`ViewFollower` in
    ``_views`` (``_view`` is the first).  A subclass draws into them and keeps
    ``_solution`` and ``_unit_system`` up to date.
    """

    def __init__(self, parent: QWidget | None = None, plot_rows: int = 1, legend_columns: int = 3):
        super().__init__(parent)
        self._solution: Solution | None = None
        self._unit_system = "SI"
        self.readout = make_readout_label(self)
        self.canvas = make_canvas()
        self.plot_items: tuple[pg.PlotItem, ...] = tuple(add_plot(self.canvas, row=row) for row in range(plot_rows))
        self.plot_item: pg.PlotItem = self.plot_items[0]
        if plot_rows > 1:
            for plot_item in self.plot_items[1:]:
                plot_item.setXLink(self.plot_item)
            for plot_item in self.plot_items:
                plot_item.getAxis("left").setWidth(STACKED_AXIS_WIDTH)
        self.legend = add_legend_row(self.canvas, row=plot_rows, columns=legend_columns)
        self._legend_sync = LegendSync(self.legend)
        self._views = tuple(ViewFollower(plot_item) for plot_item in self.plot_items)
        self._view = self._views[0]
        self._column = QVBoxLayout(self)
        self._column.setContentsMargins(0, 0, 0, 0)
        self._column.setSpacing(2)
        self._column.addWidget(self.readout)
        self._column.addWidget(self.canvas, 1)

    @property
    def drawn_solution(self) -> Solution | None:
        """The solution drawn now (each plot's ``show_solution`` says which stage of a solve it keeps)."""
        return self._solution

    def fit_view(self) -> None:
        """Return to the automatic view of the data after the user zoomed or panned."""
        for view in self._views:
            view.reset()

    def legend_names(self) -> list[str]:
        """The legend entries now listed, top to bottom."""
        return self._legend_sync.names()
