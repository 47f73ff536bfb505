"""PumpSketch benchmarks (``make bench``): medians and ratios against references run here.

Targets (checked by reading the printout, not by timed tests, which flake on shared
machines):

1. System-curve family — 2 static extremes × new/aged pipe × 512 flows for a generated
   project of 100 segments and 300 fittings: median <= 2 ms, >= 100× faster than a
   per-point scalar loop over the same points calling ``fluids.friction.friction_factor``
   (measured in the same run), friction factors equal to 1e-9 relative.
2. Operating points — all points (2 static × 2 pipe × up to 4 pumps × 5 speeds) for the
   largest sample project: median <= 5 ms.
3. Window — edit → redrawn plot <= 16 ms median on each sample project: a pipe-size step
   pushed as the user's, the live solve fired from the event loop, until the plot canvas
   has painted the new solution, drawn from the solve's first stage
   (:func:`benchmarks.redraw_timing.measure_edit_to_redraw`).  The time
   until every other panel is painted too is printed beside it.
4. Start-up — fresh processes beside baselines started in the same run (bare
   ``python -c pass`` and ``python -c "import PySide6.QtWidgets"``): ``pumpsketch solve`` on
   the largest sample <= 0.5 s wall; the window on it, until its plot has painted the solved
   project, <= 1.2 s wall (:mod:`benchmarks.startup_timing`).
5. Large project — 500 segments and a pump of 200 points: the solve <= 250 ms (it runs on
   the GUI thread), opening it and an edit in the window <= 1 s (:mod:`benchmarks.large_solve`).
"""

from __future__ import annotations

import os
import statistics
import sys
import time
from collections.abc import Callable
from dataclasses import replace
from functools import partial
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from hydraulics import fittings as fittings_catalogue  # noqa: E402
from hydraulics.fluid import fluid_properties  # noqa: E402
from hydraulics.model import Fitting, Project, Segment, Site, TankDelivery, WaterFluid  # noqa: E402
from hydraulics.project_io import load_project  # noqa: E402
from hydraulics.system_curve import prepare_system, system_curves  # noqa: E402

SAMPLES = sorted((ROOT / "sample_projects").glob("*.pumpsketch.json"))


def median_ms(func: Callable[[], object], repeats: int = 51, warmup: int = 3) -> float:
    """Median wall time of ``func()`` in milliseconds."""
    for _ in range(warmup):
        func()
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        func()
        times.append((time.perf_counter() - start) * 1000.0)
    return statistics.median(times)


def generated_project(n_segments: int = 100, n_fittings: int = 300, seed: int = 7) -> Project:
    """A synthetic project (benchmark data only): random diameters, lengths and fittings."""
    rng = np.random.default_rng(seed)
    # Fittings whose K comes from the catalogue alone (not bore changes or user K rows).
    ids = sorted(fid for fid, entry in fittings_catalogue.fitting_catalogue().items()
                 if entry.method in ("constant", "crane"))
    materials = ["pe100", "ductile_iron_cml", "steel_new", "pvc_u"]
    per_segment = np.bincount(rng.integers(0, n_segments, n_fittings), minlength=n_segments)
    segments = []
    for i in range(n_segments):
        segments.append(Segment(
            name=f"S{i}", side="suction" if i < 5 else "delivery",
            material_id=materials[i % len(materials)],
            length_m=float(rng.uniform(5, 400)),
            internal_diameter_m=float(rng.uniform(0.08, 0.6)),
            fittings=tuple(Fitting(ids[int(rng.integers(len(ids)))], int(rng.integers(1, 3)))
                           for _ in range(per_segment[i])),
        ))
    return Project(
        name="benchmark (generated)",
        site=Site(10.0, 12.0, TankDelivery(60.0, 63.0), pump_datum_m=9.0, design_flow_m3_s=0.1),
        fluid=WaterFluid(15.0), segments=tuple(segments),
    )


def bench_system_curves() -> None:
    import fluids.friction

    project = generated_project()
    fluid = fluid_properties(project.fluid)
    system = prepare_system(project, fluid)
    flows = np.linspace(0.0, 0.3, 512)

    t_prepare = median_ms(lambda: prepare_system(project, fluid), repeats=21)
    t_curves = median_ms(lambda: system_curves(system, flows))

    # Plain reference: the same head-loss sums, point by point, with the scalar
    # fluids.friction.friction_factor (Colebrook by default) — same physics, no arrays.
    g = 9.80665
    nu = fluid.kinematic_viscosity_m2_s
    seg = [(float(system.diameter_m[i]), float(system.length_m[i]), float(system.roughness_new_m[i]),
            float(system.roughness_aged_m[i]), float(system.k_total[i])) for i in range(system.n_segments)]

    def scalar_family() -> list[list[float]]:
        out = []
        for aged in (False, True):
            for static in (system.static_head_m["min"], system.static_head_m["max"]):
                heads = []
                for q in flows:
                    h = static
                    for d, length, eps_new, eps_aged, k in seg:
                        v = q / (np.pi * d * d / 4.0)
                        if v == 0.0:
                            continue
                        re = v * d / nu
                        f = fluids.friction.friction_factor(Re=re, eD=(eps_aged if aged else eps_new) / d)
                        h += (f * length / d + k) * v * v / (2 * g)
                    heads.append(h)
                out.append(heads)
        return out

    t_scalar = median_ms(scalar_family, repeats=3, warmup=0)

    # Friction factors: ours against fluids' Colebrook over every (segment, flow) turbulent point.
    from hydraulics.friction import darcy_friction_factor

    v = system.segment_velocities(flows[1:])
    re = v * system.diameter_m / nu
    ours = darcy_friction_factor(re, system.roughness_new_m / system.diameter_m)
    mask = re >= 4000
    ref = np.array([fluids.friction.Colebrook(r, e) for r, e in
                    zip(re[mask], np.broadcast_to(system.roughness_new_m / system.diameter_m, re.shape)[mask],
                        strict=True)])
    worst = float(np.max(np.abs(ours[mask] / ref - 1.0)))

    print("1. System-curve family: 2 static × new/aged × 512 flows, 100 segments, 300 fittings")
    print(f"   prepare (catalogues, K totals, once per edit): {t_prepare:8.3f} ms")
    print(f"   curve family (vectorised), median:             {t_curves:8.3f} ms   target <= 2 ms"
          f"   {'MET' if t_curves <= 2 else 'MISSED'}")
    print(f"   scalar loop with fluids.friction.friction_factor: {t_scalar:8.1f} ms")
    print(f"   speed ratio scalar / vectorised:               {t_scalar / t_curves:8.0f} ×  target >= 100 ×"
          f"   {'MET' if t_scalar / t_curves >= 100 else 'MISSED'}")
    print(f"   largest relative difference in f vs fluids.friction.Colebrook ({mask.sum()} points): "
          f"{worst:.2e}   target <= 1e-9   {'MET' if worst <= 1e-9 else 'MISSED'}")


def bench_operating_points() -> None:
    from hydraulics.operating_points import operating_points
    from hydraulics.pump_fit import fit_pump
    from hydraulics.solve import atmospheric_pressure, npsh_static_head, solve

    print("2. Operating points: 2 static × 2 pipe × up to 4 pumps × 5 speeds")
    for sample in SAMPLES:
        project = load_project(sample)
        if project.arrangement is None:
            continue
        arrangement = replace(project.arrangement, duty_count=4)
        project = replace(project, arrangement=arrangement)
        pump = project.duty_pump
        if pump is None:
            continue
        fluid = fluid_properties(project.fluid)
        system = prepare_system(project, fluid)
        fitted = fit_pump(pump, fluid.density_kg_m3)
        npsh_static = npsh_static_head(project, atmospheric_pressure(project), fluid)
        # Bound now: the timed call sees this sample's inputs only.
        points_of_this_sample = partial(operating_points, system, fitted, arrangement, npsh_static,
                                        fluid.density_kg_m3, speed_ratios=(0.8, 0.85, 0.9, 0.95, 1.0))
        t = median_ms(points_of_this_sample)
        n = len(points_of_this_sample())
        t_solve = median_ms(partial(solve, project), repeats=21)
        print(f"   {sample.name:38s} {n:3d} points: {t:7.3f} ms   target <= 5 ms   "
              f"{'MET' if t <= 5 else 'MISSED'}    (whole solve: {t_solve:.2f} ms)")


def bench_window() -> None:
    os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
    try:
        from benchmarks.redraw_timing import measure_edit_to_redraw
    except ImportError as exc:
        print(f"3. Window: not measured ({exc})")
        return
    from PySide6.QtWidgets import QApplication

    from app.main_window import MainWindow

    app = QApplication.instance() or QApplication([])
    print("3. Window: edit → redrawn plot")
    for sample in SAMPLES:
        window = MainWindow()
        window.open_path(str(sample))
        window.resize(1400, 900)
        window.show()
        app.processEvents()
        times = measure_edit_to_redraw(window, n=40)
        med = statistics.median(times.plot_ms)
        whole = statistics.median(times.window_ms)
        solve_part = statistics.median(times.solve_ms)
        finishing = statistics.median(times.finishing_ms)
        print(f"   {sample.name:38s} median {med:6.2f} ms   target <= 16 ms   {'MET' if med <= 16 else 'MISSED'}"
              f"    (of which the solve's first stage: {solve_part:.2f} ms; until every panel is painted:"
              f" {whole:.2f} ms, with the checks' stage: {finishing:.2f} ms)")
        window.document.undo_stack.setClean()
        window.close()


if __name__ == "__main__":
    print("PumpSketch benchmarks (medians; references measured in the same run)\n")
    bench_system_curves()
    print()
    bench_operating_points()
    print()
    bench_window()
    print()
    from benchmarks.startup_timing import bench_startup

    bench_startup()
    print()
    from benchmarks.large_solve import bench_large_project

    bench_large_project()
