"""A large project through the engine and the window: no user action may hold the window for long.

The project: the hilltop booster sample with its pipework replaced by :data:`SEGMENTS`
generated segments (three fittings each) and its duty pump resampled to :data:`PUMP_POINTS`
points along its own curves (benchmark data only).  Timed, as medians: the whole solve
(both stages, what a live edit costs the engine), opening the saved file in a window (read,
tables filled, solved) and an edit in the window until its complete solution is shown.
The solve against :data:`SOLVE_TARGET_S` (it runs on the GUI thread; above that it would
have to move to a worker), the window's actions against :data:`ACTION_TARGET_S`.  When the loader has its size limits
(``hydraulics.validation.LIMITS``), the sizes here should be set to those limits.
"""

from __future__ import annotations

import statistics
import tempfile
import time
from collections.abc import Callable
from dataclasses import replace
from pathlib import Path

import numpy as np

from hydraulics.model import Project

ROOT = Path(__file__).resolve().parent.parent
SEGMENTS = 500
PUMP_POINTS = 200
SOLVE_TARGET_S = 0.25
"""A live solve runs on the GUI thread: well inside the second an action may hold the window."""
ACTION_TARGET_S = 1.0
"""No single user action holds the window longer than about this."""


def large_project(n_segments: int = SEGMENTS, n_points: int = PUMP_POINTS) -> Project:
    """The large benchmark project (see the module docstring)."""
    from benchmarks.run_benchmarks import generated_project
    from hydraulics.project_io import load_project
    from hydraulics.validation import validate_project

    sample = load_project(ROOT / "sample_projects" / "hilltop_booster.pumpsketch.json")
    pump = sample.duty_pump
    assert pump is not None, "the hilltop sample has a duty pump"
    flows = np.asarray(pump.flow_m3_s)
    resampled = np.linspace(flows[0], flows[-1], n_points)

    def along(values: tuple[float, ...]) -> tuple[float, ...]:
        return tuple(float(v) for v in np.interp(resampled, flows, np.asarray(values))) if values else ()

    big_pump = replace(pump, flow_m3_s=tuple(float(q) for q in resampled), head_m=along(pump.head_m),
                       efficiency=along(pump.efficiency), shaft_power_w=along(pump.shaft_power_w),
                       npsh_required_m=along(pump.npsh_required_m))
    segments = generated_project(n_segments=n_segments, n_fittings=3 * n_segments, seed=5).segments
    project = replace(sample, name="large (generated)", segments=segments,
                      pumps=tuple(big_pump if p is pump else p for p in sample.pumps))
    validate_project(project)
    return project


def _median_s(func: Callable[[], object], repeats: int) -> float:
    func()
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        func()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def _verdict(seconds: float, target_s: float) -> str:
    return f"target <= {target_s * 1000:.0f} ms   {'MET' if seconds <= target_s else 'MISSED'}"


def bench_large_project() -> None:
    from hydraulics.project_io import save_project
    from hydraulics.solve import solve

    project = large_project()
    print(f"5. Large project: {len(project.segments)} segments, {PUMP_POINTS} pump points")
    t_solve = _median_s(lambda: solve(project), repeats=7)
    print(f"   solve (both stages), median:              {t_solve * 1000:8.1f} ms   "
          f"{_verdict(t_solve, SOLVE_TARGET_S)}")
    try:
        from PySide6.QtWidgets import QApplication

        from app.main_window import MainWindow
    except ImportError as exc:
        print(f"   window: not measured ({exc})")
        return
    app = QApplication.instance() or QApplication([])
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "large.pumpsketch.json"
        save_project(project, path)
        window = MainWindow(remember_layout=False)
        window.show()

        def open_and_solve() -> None:  # File > Open's path, without remembering the file among the recent ones
            window.document.open(path)
            window.document.recompute_now()
            app.processEvents()

        t_open = _median_s(open_and_solve, repeats=3)
        last = window.document.project.segments[-1]
        lengths = iter(last.length_m + k for k in range(1, 1000))

        def edit_and_show() -> None:
            current = window.document.project
            edited = replace(current, segments=current.segments[:-1]
                             + (replace(current.segments[-1], length_m=next(lengths)),))
            window.document.apply(edited, "Length")
            window.document.recompute_now()
            app.processEvents()

        t_edit = _median_s(edit_and_show, repeats=5)
        window.document.undo_stack.setClean()
        window.close()
    print(f"   open in the window (read, tables, solve): {t_open * 1000:8.1f} ms   {_verdict(t_open, ACTION_TARGET_S)}")
    print(f"   edit in the window until shown solved:    {t_edit * 1000:8.1f} ms   {_verdict(t_edit, ACTION_TARGET_S)}")


if __name__ == "__main__":
    bench_large_project()
