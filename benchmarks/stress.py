"""``make stress``: generated inputs, kills during saves and kills after edits, with a summary.

Three parts, each counted in the summary printed at the end (every count but the inputs
tried is expected to be zero; the exit status is 1 when one is not):

1. Generated inputs — ``run_fuzz(n, seed) -> dict[str, int]`` (keys ``inputs``,
   ``uncaught_exceptions``, ``hangs``, ``non_finite_results``), taken from
   ``tests.fuzz_cases`` or ``benchmarks.fuzz``, whichever this build has.  Without either, the
   summary says "generated inputs: not available in this build".
2. Kill during save — a subprocess (:mod:`benchmarks.crash_children` ``save-loop``) saves a
   generated project of :data:`SAVE_SEGMENTS` segments over and over, alternating two
   versions; it is killed with SIGKILL at a random moment.  The file must then read back as
   exactly one of the two versions (else it counts as corrupted), its backup too when there
   is one; the next save (from here) must leave no temporary file beside it.
3. Kill after edit — the window in a subprocess (``edit``) makes a series of edits through
   its document; once at least one has been kept in the recovery file it is killed at a random
   moment.  A window started here must find the edits, and restoring them must give back at
   least the last edit reported kept (else the trial counts as work lost).

``python benchmarks/stress.py [--inputs N] [--save-trials N] [--edit-trials N] [--seed S]``
"""

from __future__ import annotations

import argparse
import importlib
import os
import random
import signal
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import IO

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from benchmarks.crash_children import save_versions  # noqa: E402
from hydraulics.validation import MAX_SEGMENTS  # noqa: E402

FUZZ_MODULES = ("tests.fuzz_cases", "benchmarks.fuzz")
FUZZ_KEYS = ("inputs", "uncaught_exceptions", "hangs", "non_finite_results")
SAVE_SEGMENTS = MAX_SEGMENTS
"""Segments of the project saved in the kill-during-save trials: the most a project may have, so
the file is the largest the program saves and a kill is likely to land mid-write."""
EDITS_PER_TRIAL = 6
CHILD_START_TIMEOUT_S = 120.0
NOT_AVAILABLE = "generated inputs: not available in this build"

FuzzRunner = Callable[[int, int], dict[str, int]]


def find_run_fuzz() -> tuple[FuzzRunner | None, str]:
    """The generated-input runner of this build and the module it came from (``None``, "" when absent)."""
    for name in FUZZ_MODULES:
        try:
            module = importlib.import_module(name)
        except ImportError:
            continue
        runner = getattr(module, "run_fuzz", None)
        if callable(runner):
            return runner, name
    return None, ""


@dataclass
class Summary:
    """The counts of one stress run."""

    inputs: int | None = None
    uncaught_exceptions: int = 0
    hangs: int = 0
    non_finite_results: int = 0
    save_trials: int = 0
    killed_mid_save: int = 0
    """Kills that left a temporary file behind (the save was interrupted between its steps)."""
    files_corrupted: int = 0
    backups_corrupted: int = 0
    temporaries_left: int = 0
    edit_trials: int = 0
    work_lost: int = 0
    notes: list[str] = field(default_factory=list)

    def failures(self) -> int:
        return (self.uncaught_exceptions + self.hangs + self.non_finite_results + self.files_corrupted
                + self.backups_corrupted + self.temporaries_left + self.work_lost)


def _environment(data_dir: Path, config_dir: Path) -> dict[str, str]:
    from app.data_folder import DATA_DIR_VARIABLE

    env = dict(os.environ)
    env["PYTHONPATH"] = os.pathsep.join([str(ROOT), *filter(None, [env.get("PYTHONPATH")])])
    env["QT_QPA_PLATFORM"] = "offscreen"
    env[DATA_DIR_VARIABLE] = str(data_dir)
    env["XDG_CONFIG_HOME"] = str(config_dir)
    return env


def _child(args: list[str], env: dict[str, str]) -> subprocess.Popen[str]:
    return subprocess.Popen([sys.executable, "-m", "benchmarks.crash_children", *args], cwd=ROOT, env=env,
                            stdout=subprocess.PIPE, stderr=subprocess.DEVNULL, text=True, bufsize=1)


def _read_line(stream: IO[str], timeout_s: float) -> str:
    """One line from a child's output ("" at its end); gives up after ``timeout_s``."""
    import selectors

    with selectors.DefaultSelector() as selector:
        selector.register(stream, selectors.EVENT_READ)
        if not selector.select(timeout_s):
            raise TimeoutError(f"no output from the child within {timeout_s:.0f} s")
    return stream.readline()


def _kill(child: subprocess.Popen[str]) -> None:
    child.send_signal(signal.SIGKILL)
    child.wait()
    if child.stdout is not None:
        child.stdout.close()


def _temporaries(path: Path) -> list[Path]:
    return [p for p in path.parent.iterdir() if p.name.startswith(f".{path.name}.") and p.name.endswith(".tmp")]


# =========================================================================== generated inputs
def run_generated_inputs(summary: Summary, n: int, seed: int) -> None:
    runner, module = find_run_fuzz()
    if runner is None:
        summary.notes.append(NOT_AVAILABLE)
        print(NOT_AVAILABLE)
        return
    print(f"generated inputs: {n} from {module}.run_fuzz (seed {seed}) …", flush=True)
    counts = runner(n, seed)
    missing = [key for key in FUZZ_KEYS if key not in counts]
    if missing:
        raise SystemExit(f"{module}.run_fuzz returned no {', '.join(missing)}")
    summary.inputs = int(counts["inputs"])
    summary.uncaught_exceptions += int(counts["uncaught_exceptions"])
    summary.hangs += int(counts["hangs"])
    summary.non_finite_results += int(counts["non_finite_results"])
    print(f"   inputs tried {summary.inputs}, uncaught exceptions {counts['uncaught_exceptions']}, "
          f"hangs {counts['hangs']}, non-finite values reaching a result {counts['non_finite_results']}")


# =========================================================================== kill during save
def run_save_trials(summary: Summary, trials: int, rng: random.Random, work: Path) -> None:
    from hydraulics.project_io import ProjectFileError, backup_path, load_project, project_to_json, save_project

    versions = save_versions(SAVE_SEGMENTS)
    folder = work / "saves"
    folder.mkdir()
    texts = [work / "version_a.json", work / "version_b.json"]
    for text_file, version in zip(texts, versions, strict=True):
        text_file.write_text(project_to_json(version), encoding="utf-8")
    path = folder / "stress.pumpsketch.json"
    save_project(versions[0], path)
    env = _environment(work / "save-data", work / "save-config")
    size_mb = path.stat().st_size / 1e6
    print(f"kill-during-save trials: {trials}, a project of {SAVE_SEGMENTS} segments ({size_mb:.1f} MB) …",
          flush=True)

    def is_whole(candidate: Path) -> bool:
        try:
            return load_project(candidate) in versions
        except ProjectFileError:
            return False

    started = time.perf_counter()
    for trial in range(trials):
        child = _child(["save-loop", str(path), *map(str, texts)], env)
        assert child.stdout is not None
        first = _read_line(child.stdout, CHILD_START_TIMEOUT_S)  # one whole save, so the timing is warm
        if not first.startswith("saved"):
            _kill(child)
            raise SystemExit(f"the save loop did not start (trial {trial + 1}): {first!r}")
        time.sleep(rng.uniform(0.0, 0.6))
        _kill(child)
        summary.save_trials += 1
        if _temporaries(path):
            summary.killed_mid_save += 1
        if not is_whole(path):
            summary.files_corrupted += 1
            summary.notes.append(f"save trial {trial + 1}: the file is neither version")
        backup = backup_path(path)
        if backup.exists() and not is_whole(backup):
            summary.backups_corrupted += 1
            summary.notes.append(f"save trial {trial + 1}: the backup is neither version")
        save_project(versions[trial % 2], path)  # the next save cleans up after the killed one
        left = _temporaries(path)
        if left:
            summary.temporaries_left += len(left)
            summary.notes.append(f"save trial {trial + 1}: left {', '.join(p.name for p in left)}")
    print(f"   {summary.save_trials} kills in {time.perf_counter() - started:.0f} s; "
          f"{summary.killed_mid_save} interrupted a save half-way (a temporary file was left);"
          f" files corrupted {summary.files_corrupted}, backups corrupted {summary.backups_corrupted},"
          f" temporary files left after the next save {summary.temporaries_left}")


# =========================================================================== kill after edit
def _restore_in_process(data_dir: Path, settings_dir: Path) -> tuple[str | None, bool]:
    """Start a window here as after a crash, accept the restore offer; (project name, modified)."""
    from PySide6.QtCore import QSettings

    from app.data_folder import DATA_DIR_VARIABLE
    from app.gui import application, open_window
    from app.main_window import MainWindow

    os.environ[DATA_DIR_VARIABLE] = str(data_dir)
    QSettings.setPath(QSettings.Format.IniFormat, QSettings.Scope.UserScope, str(settings_dir))
    application()
    offers: list[object] = []

    def accept(_window: MainWindow, edits: object) -> bool:
        offers.append(edits)
        return True

    original = MainWindow.ask_restore
    MainWindow.ask_restore = accept  # type: ignore[method-assign, assignment]  # answers the restore question
    try:
        window = open_window(None)
    finally:
        MainWindow.ask_restore = original  # type: ignore[method-assign]  # put the real question back
    name = window.document.project.name if offers else None
    modified = window.document.is_modified
    window.document.undo_stack.setClean()
    window.close()
    window.deleteLater()
    return name, modified


def run_edit_trials(summary: Summary, trials: int, rng: random.Random, work: Path) -> None:
    from hydraulics.project_io import new_project, save_project

    print(f"kill-after-edit recovery trials: {trials} (the window in a subprocess, offscreen) …", flush=True)
    started = time.perf_counter()
    for trial in range(trials):
        data_dir = work / f"edit-data-{trial}"
        project_file = work / f"edited-{trial}.pumpsketch.json"
        save_project(new_project(), project_file)
        env = _environment(data_dir, work / f"edit-config-{trial}")
        child = _child(["edit", str(project_file), "--idle-ms", "150", "--edits", str(EDITS_PER_TRIAL),
                        "--pause-ms", str(rng.randint(50, 400))], env)
        assert child.stdout is not None
        last_kept = 0
        kill_after = rng.uniform(0.0, 1.5)
        deadline: float | None = None
        while True:
            timeout = CHILD_START_TIMEOUT_S if deadline is None else max(deadline - time.perf_counter(), 0.0)
            try:
                line = _read_line(child.stdout, timeout)
            except TimeoutError:
                if deadline is None:
                    _kill(child)
                    raise SystemExit(f"edit trial {trial + 1}: no edit was kept for recovery") from None
                break
            if not line:
                break
            if line.startswith("kept"):
                last_kept = max(last_kept, int(line.split()[1]))
                if deadline is None and last_kept > 0:
                    deadline = time.perf_counter() + kill_after
        _kill(child)
        summary.edit_trials += 1
        name, modified = _restore_in_process(data_dir, work / "restore-settings")
        restored = int(name.rsplit(" ", 1)[1]) if name and name.startswith("scripted edit ") else 0
        if restored < last_kept or not modified:
            summary.work_lost += 1
            summary.notes.append(f"edit trial {trial + 1}: edit {last_kept} was kept, restored {name!r}")
    print(f"   {summary.edit_trials} kills in {time.perf_counter() - started:.0f} s; work lost {summary.work_lost}")


# =========================================================================== summary
def print_summary(summary: Summary) -> None:
    inputs = str(summary.inputs) if summary.inputs is not None else "not available in this build"
    print()
    print("Summary")
    print(f"   inputs tried                          {inputs}")
    print(f"   uncaught exceptions                   {summary.uncaught_exceptions}")
    print(f"   hangs                                 {summary.hangs}")
    print(f"   non-finite values reaching a result   {summary.non_finite_results}")
    print(f"   kill-during-save trials               {summary.save_trials}")
    print(f"   files corrupted                       {summary.files_corrupted + summary.backups_corrupted}")
    print(f"   temporary files left after next save  {summary.temporaries_left}")
    print(f"   kill-after-edit trials                {summary.edit_trials}")
    print(f"   work lost                             {summary.work_lost}")
    for note in summary.notes:
        print(f"   note: {note}")
    print("   all zero: " + ("yes" if summary.failures() == 0 else "NO"))


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="PumpSketch stress run (make stress)")
    parser.add_argument("--inputs", type=int, default=10_000, help="generated inputs to try (default 10000)")
    parser.add_argument("--save-trials", type=int, default=100, help="kill-during-save trials (default 100)")
    parser.add_argument("--edit-trials", type=int, default=10, help="kill-after-edit trials (default 10)")
    parser.add_argument("--seed", type=int, default=20240601)
    args = parser.parse_args(argv)
    if sys.platform == "win32":
        print("make stress needs POSIX signals (SIGKILL); not run on Windows")
        return 2
    rng = random.Random(args.seed)
    summary = Summary()
    print(f"PumpSketch stress run (seed {args.seed})\n", flush=True)
    with tempfile.TemporaryDirectory(prefix="pumpsketch-stress-") as folder:
        work = Path(folder)
        run_generated_inputs(summary, args.inputs, args.seed)
        run_save_trials(summary, args.save_trials, rng, work)
        run_edit_trials(summary, args.edit_trials, rng, work)
    print_summary(summary)
    return 1 if summary.failures() else 0


if __name__ == "__main__":
    sys.exit(main())
