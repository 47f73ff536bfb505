"""The plot area of the main window: head–flow, efficiency and power, NPSH, variable speed, profile of the main,
as tabs."""

from __future__ import annotations

from PySide6.QtCore import QCoreApplication, QEvent
from PySide6.QtWidgets import QTabWidget, QWidget

from app.plots.efficiency_power_plot import EfficiencyPowerPlot
from app.plots.head_flow_plot import HeadFlowPlot
from app.plots.npsh_plot import NpshPlot
from app.plots.plot_base import PlotCanvas
from app.plots.profile_plot import ProfilePlot
from app.plots.speed_plot import VariableSpeedPlot
from hydraulics.results import Solution

Plot = HeadFlowPlot | EfficiencyPowerPlot | NpshPlot | VariableSpeedPlot | ProfilePlot


class PlotTabs(QTabWidget):
    """Tabs holding :class:`HeadFlowPlot`, :class:`EfficiencyPowerPlot`, :class:`NpshPlot`,
    :class:`VariableSpeedPlot` and :class:`ProfilePlot`."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self.setDocumentMode(True)
        self.head_flow = HeadFlowPlot()
        self.efficiency_power = EfficiencyPowerPlot()
        self.npsh = NpshPlot()
        self.variable_speed = VariableSpeedPlot()
        self.profile = ProfilePlot()
        self.addTab(self.head_flow, "Head – flow")
        self.addTab(self.efficiency_power, "Efficiency and power")
        self.addTab(self.npsh, "NPSH")
        self.addTab(self.variable_speed, "Variable speed")
        self.addTab(self.profile, "Profile")
        self.setTabToolTip(0, "System curves, pump curves and operating points")
        self.setTabToolTip(1, "Efficiency and shaft power of one pump against its flow")
        self.setTabToolTip(2, "NPSH available against NPSH required, with the margin at each point")
        self.setTabToolTip(3, "Pump-set curves over the drive's speed range, lines of equal efficiency, the system "
                              "band and the speeds that meet the design flow")
        self.setTabToolTip(4, "Pipe elevation and hydraulic grade lines along the main, with its high points")
        self._pending: dict[int, tuple[Solution | None, str]] = {}
        self.currentChanged.connect(self._draw_pending)

    def plots(self) -> tuple[Plot, ...]:
        """The plot widgets, in tab order."""
        return self.head_flow, self.efficiency_power, self.npsh, self.variable_speed, self.profile

    def show_solution(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """Draw ``solution`` in the visible tab now and in the others when they are shown.

        ``None`` clears them.  Hidden tabs keep the newest solution pending, so a burst
        of edits redraws only what the user can see.
        """
        current = self.currentIndex()
        for index, plot in enumerate(self.plots()):
            if index == current or not self.isVisible():
                plot.show_solution(solution, unit_system)
                self._pending.pop(index, None)
            else:
                self._pending[index] = (solution, unit_system)

    def drawn_solution(self) -> Solution | None:
        """The solution the visible plot has drawn."""
        return self.plots()[self.currentIndex()].drawn_solution

    def current_canvas(self) -> PlotCanvas:
        """The plot canvas of the visible tab."""
        return self.plots()[self.currentIndex()].canvas

    def show_and_paint(self, solution: Solution | None, unit_system: str = "SI") -> None:
        """:meth:`show_solution`, then :meth:`paint_now` (the live path's first stage)."""
        self.show_solution(solution, unit_system)
        self.paint_now()

    def paint_now(self) -> None:
        """Paint the visible plot's new drawing now, with whatever else of the window waits.

        A graphics scene gathers its changed items in a queued call and only then asks
        its view to repaint, so the plot would otherwise wait for a later paint, behind
        the checks and tables updated meanwhile.  Delivering that call now makes the
        scene hand its changes to the view, which then paints the window's pending
        updates at once (Qt's own behaviour for scenes); the plot is painted once.
        """
        if self.isVisible():
            scene = self.current_canvas().scene()
            QCoreApplication.sendPostedEvents(scene, QEvent.Type.MetaCall.value)

    def _draw_pending(self, index: int) -> None:
        pending = self._pending.pop(index, None)
        if pending is not None:
            self.plots()[index].show_solution(*pending)

    def flush(self) -> None:
        """Draw every pending solution now (before exporting or grabbing all tabs)."""
        for index in list(self._pending):
            self._draw_pending(index)

    def pin_snapshot(self) -> None:
        """Pin the head–flow curves now drawn as a faint snapshot."""
        self.head_flow.pin_snapshot()

    def clear_snapshot(self) -> None:
        """Remove the pinned snapshot."""
        self.head_flow.clear_snapshot()

    @property
    def has_snapshot(self) -> bool:
        """True while a snapshot is pinned."""
        return self.head_flow.has_snapshot

    def fit_view(self) -> None:
        """Return every plot to the automatic view of its data."""
        self.flush()
        for plot in self.plots():
            plot.fit_view()
