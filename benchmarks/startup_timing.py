"""Start-up times of fresh processes, against bare-interpreter baselines run alongside.

Each figure is the median wall time of several fresh subprocesses, started from this
script with the same interpreter:

* baseline ``python -c pass`` — the interpreter alone;
* baseline ``python -c "import PySide6.QtWidgets"`` — the least any window can cost;
* ``pumpsketch solve SAMPLE`` (as ``python -m app solve``), until the process has ended;
* the window on a sample (``python -m app SAMPLE``, offscreen, with the variable named by
  :data:`app.gui.STARTUP_PROBE_VARIABLE` set), until the process prints ``painted``: the
  moment its plot has first painted the solved project.

The runs of the four kinds are interleaved, so a burst of load from other work on a shared
machine falls on all of them alike; the ratios to the baselines are the figures to compare
between machines.  Bytecode caching is left on (as after an install, where the installer
writes it) and a first untimed run of each command writes it.  The window remembers
nothing between these runs: its settings go to a temporary folder.  The window's process
ends at once after the paint, so its CPU time is the CPU time of its start-up; CPU times
are printed beside the walls because they suffer far less from other work on the machine.
"""

from __future__ import annotations

import os
import resource
import selectors
import statistics
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent

SOLVE_TARGET_S = 0.5
WINDOW_TARGET_S = 1.2
PAINTED = "painted"
PROBE_TIMEOUT_S = 60.0
BUSY_MACHINE_RATIO = 1.25
"""A baseline whose wall time exceeds its CPU time by more than this waited for a core."""


@dataclass(frozen=True)
class Run:
    """One fresh process: wall time until ready (ended, or printed ``painted``) and its CPU time."""

    wall_s: float
    cpu_s: float


def _environment(settings_folder: str) -> dict[str, str]:
    from app.gui import STARTUP_PROBE_VARIABLE

    env = dict(os.environ)
    env.pop("PYTHONDONTWRITEBYTECODE", None)
    env["PYTHONPATH"] = os.pathsep.join([str(ROOT), *filter(None, [env.get("PYTHONPATH")])])
    env["QT_QPA_PLATFORM"] = "offscreen"
    env["XDG_CONFIG_HOME"] = settings_folder
    env["PUMPSKETCH_DATA_DIR"] = os.path.join(settings_folder, "data")  # no recovery files of the user's offered
    env[STARTUP_PROBE_VARIABLE] = "1"
    return env


def _children_cpu_s() -> float:
    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    return usage.ru_utime + usage.ru_stime


def run_once(args: list[str], env: dict[str, str], ready_line: str | None = None) -> Run:
    """Start ``python args`` and time it until it ends or, with ``ready_line``, prints that line."""
    cpu_before = _children_cpu_s()
    start = time.perf_counter()
    process = subprocess.Popen([sys.executable, *args], cwd=ROOT, env=env, text=True,
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    ready_at = None
    if ready_line is not None:
        stdout = process.stdout
        assert stdout is not None  # opened as a pipe above
        with selectors.DefaultSelector() as selector:
            selector.register(stdout, selectors.EVENT_READ)
            while ready_at is None and time.perf_counter() - start < PROBE_TIMEOUT_S:
                if not selector.select(timeout=1.0):
                    continue
                line = stdout.readline()
                if line == "":
                    break  # ended without painting
                if line.strip() == ready_line:
                    ready_at = time.perf_counter()
        if ready_at is None:
            process.kill()
    _, stderr = process.communicate(timeout=PROBE_TIMEOUT_S)
    ended_at = time.perf_counter()
    if process.returncode != 0 or (ready_line is not None and ready_at is None):
        raise RuntimeError(f"{' '.join(args)} failed (status {process.returncode}): {stderr.strip()[-500:]}")
    return Run((ready_at or ended_at) - start, _children_cpu_s() - cpu_before)


def largest_sample() -> Path:
    """The sample with the most segments and fittings (ties: the longest file)."""
    from hydraulics.project_io import load_project

    def size(path: Path) -> tuple[int, int]:
        project = load_project(path)
        return (len(project.segments) + sum(len(s.fittings) for s in project.segments), path.stat().st_size)

    return max(sorted((ROOT / "sample_projects").glob("*.pumpsketch.json")), key=size)


def _median(runs: list[Run]) -> Run:
    return Run(statistics.median(r.wall_s for r in runs), statistics.median(r.cpu_s for r in runs))


def measure_startup(repeats: int = 7) -> tuple[Path, dict[str, Run]]:
    """The sample timed and the median start-up of each kind, by name; the runs of all kinds interleaved."""
    sample = largest_sample()
    with tempfile.TemporaryDirectory(prefix="pumpsketch-bench-") as folder:
        env = _environment(folder)
        kinds: dict[str, tuple[list[str], str | None]] = {
            "pass": (["-c", "pass"], None),
            "qtwidgets": (["-c", "import PySide6.QtWidgets"], None),
            "solve": (["-m", "app", "solve", str(sample)], None),
            "window": (["-m", "app", str(sample)], PAINTED),
        }
        for args, ready in kinds.values():
            run_once(args, env, ready)  # writes bytecode, warms the file cache
        runs: dict[str, list[Run]] = {name: [] for name in kinds}
        for _ in range(repeats):
            for name, (args, ready) in kinds.items():
                runs[name].append(run_once(args, env, ready))
    return sample, {name: _median(found) for name, found in runs.items()}


def bench_startup(repeats: int = 7) -> None:
    """Print the start-up section of ``make bench``."""
    sample, found = measure_startup(repeats)
    bare, qt = found["pass"], found["qtwidgets"]
    solve, window = found["solve"], found["window"]

    def verdict(value: float, target: float) -> str:
        return "MET" if value <= target else f"MISSED by {(value - target) * 1000:.0f} ms"

    print(f"4. Start-up: fresh processes, median of {repeats} (interleaved; bytecode cached as after an install)")
    print(f"   baseline python -c pass:                        {bare.wall_s * 1000:7.0f} ms wall"
          f"  ({bare.cpu_s * 1000:5.0f} ms CPU)")
    print(f"   baseline python -c 'import PySide6.QtWidgets':  {qt.wall_s * 1000:7.0f} ms wall"
          f"  ({qt.cpu_s * 1000:5.0f} ms CPU)")
    print(f"   pumpsketch solve {sample.name} (largest sample), until it has ended:")
    print(f"      {solve.wall_s * 1000:7.0f} ms wall ({solve.cpu_s * 1000:.0f} ms CPU) = "
          f"{solve.wall_s / bare.wall_s:5.1f} × bare python, {solve.wall_s / qt.wall_s:4.2f} × the Qt import"
          f"   target <= {SOLVE_TARGET_S * 1000:.0f} ms   {verdict(solve.wall_s, SOLVE_TARGET_S)}")
    print(f"   window on {sample.name}, until its plot has painted the solved project:")
    print(f"      {window.wall_s * 1000:7.0f} ms wall ({window.cpu_s * 1000:.0f} ms CPU) = "
          f"{window.wall_s / bare.wall_s:5.1f} × bare python, "
          f"{window.wall_s / qt.wall_s:4.2f} × the Qt import; {(window.wall_s - qt.wall_s) * 1000:.0f} ms beyond it"
          f"   target <= {WINDOW_TARGET_S * 1000:.0f} ms   {verdict(window.wall_s, WINDOW_TARGET_S)}")
    waiting = (qt.wall_s / qt.cpu_s) if qt.cpu_s > 0 else 1.0
    if waiting > BUSY_MACHINE_RATIO:
        print(f"   The machine was busy: the Qt-import baseline took {waiting:.1f} × its CPU time in wall time, "
              "so the walls above are inflated; compare the ratios, or run again when it is quiet.")


if __name__ == "__main__":
    sys.path.insert(0, str(ROOT))
    bench_startup()
