"""Edit-to-redraw timing of the window, through the window's own path (``make bench``).

:func:`measure_edit_to_redraw` steps a pipe size as the user would, lets the throttled
live solve fire from the event loop and stops the clock when the plot canvas has painted
the edit's solution.  It lives beside the benchmarks, not in the application: the
document only holds the project.
"""

from __future__ import annotations

import time
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

from PySide6.QtCore import QEventLoop
from PySide6.QtWidgets import QApplication

from app.document import RECOMPUTE_DELAY_MS
from hydraulics.project_edits import stepped_segment, with_segment

if TYPE_CHECKING:  # for the annotation only
    from app.main_window import MainWindow


@dataclass(frozen=True)
class RedrawTimings:
    """Milliseconds per edit from :func:`measure_edit_to_redraw`."""

    plot_ms: tuple[float, ...]
    """From the edit to the visible plot painted with the edit's solution."""
    window_ms: tuple[float, ...]
    """From the edit to every panel updated and painted (checks, operating points, tables)."""
    solve_ms: tuple[float, ...]
    """The part of ``plot_ms`` spent in the engine: the first stage of the solve."""
    finishing_ms: tuple[float, ...]
    """The engine's second stage (checks, variable speed), run after the plot is painted."""


def measure_edit_to_redraw(window: MainWindow, n: int = 50) -> RedrawTimings:
    """Time real edits through the window's own path: edit, live solve, plot painted.

    Alternately steps the first segment with a pipe series one size up and back (down
    and back when it is already the largest size; or, without one, changes the last
    segment's length by 1 % and back).  Nothing is bypassed: the edit is pushed as the
    user's would be, the throttled recompute fires from the event loop, and the clock
    stops when the plot canvas has painted the new solution, drawn from the solve's
    first stage (and again when the event loop has brought up every other panel).  Each
    edit waits out the throttle interval first, as a single keystroke or click would.
    The edits are undone afterwards, so the project is left as it was.
    """
    document = window.document
    app = QApplication.instance()
    assert app is not None, "a QApplication must exist"
    canvas = window.plot_tabs.current_canvas()
    painted_at: list[float | None] = [None]

    def on_paint() -> None:
        drawn = window.plot_tabs.drawn_solution()
        if painted_at[0] is None and drawn is not None and drawn.project is document.project:
            painted_at[0] = time.perf_counter()  # the plot is painted; the rest may follow in the same turn

    canvas.painted.connect(on_paint)
    start_index = document.undo_stack.index()
    series_rows = [i for i, s in enumerate(document.project.segments) if s.pipe_series is not None]
    first_step = 1
    if series_rows:
        segment = document.project.segments[series_rows[0]]
        first_step = 1 if stepped_segment(segment, 1) != segment else -1  # at the top: step down first
    plot_ms: list[float] = []
    window_ms: list[float] = []
    solve_ms: list[float] = []
    finishing_ms: list[float] = []
    try:
        for k in range(n):
            app.processEvents()
            rest = RECOMPUTE_DELAY_MS / 1000.0 - (time.perf_counter() - document.last_solve_end)
            if rest > 0:
                time.sleep(rest)
            painted_at[0] = None
            t0 = time.perf_counter()
            if series_rows:
                window.pipework.step_size(series_rows[0], first_step if k % 2 == 0 else -first_step)
            else:
                project = document.project
                last = project.segments[-1]
                factor = 1.01 if k % 2 == 0 else 1 / 1.01
                lengthened = replace(last, length_m=last.length_m * factor)
                document.apply(with_segment(project, len(project.segments) - 1, lengthened), "Benchmark edit")
            deadline = t0 + 5.0
            while painted_at[0] is None and time.perf_counter() < deadline:
                app.processEvents(QEventLoop.ProcessEventsFlag.AllEvents, 5)
            app.processEvents()
            t2 = time.perf_counter()
            painted = painted_at[0]
            if painted is None:
                raise RuntimeError("the plot was not repainted within 5 s of an edit")
            plot_ms.append((painted - t0) * 1000.0)
            window_ms.append((t2 - t0) * 1000.0)
            solve_ms.append(document.last_curves_ms)
            finishing_ms.append(document.last_solve_ms - document.last_curves_ms)
    finally:
        canvas.painted.disconnect(on_paint)
        document.undo_stack.setIndex(start_index)
        document.recompute_now()
    return RedrawTimings(plot_ms=tuple(plot_ms), window_ms=tuple(window_ms), solve_ms=tuple(solve_ms),
                         finishing_ms=tuple(finishing_ms))
