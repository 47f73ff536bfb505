"""Processes that the stress runner and the crash tests kill on purpose (``python -m benchmarks.crash_children``).

``save-loop FILE TEXT_A TEXT_B``
    Saves to FILE over and over, alternating between the two project texts read from the
    files TEXT_A and TEXT_B (the caller writes them with ``project_to_json``: what
    :func:`hydraulics.project_io.save_project` would write), through the same atomic writer
    with the backup, and prints ``saved A`` / ``saved B`` after each save.  The texts are
    serialised once, so nearly all the loop's time is spent in the writer, where a kill matters.
``edit FILE [--idle-ms MS] [--edits N] [--pause-ms MS]``
    Opens the window (offscreen) on FILE and makes N edits through the document
    (:func:`edited_project`), one every ``--pause-ms``; prints ``edited K`` after edit K and
    ``kept K`` each time the recovery file has been written with edit K.  It then runs until
    it is killed.

Both run until killed; neither has any other use.  The data folder, the settings folder and
the Qt platform come from the environment the caller sets.
"""

from __future__ import annotations

import argparse
import sys
from dataclasses import replace
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from hydraulics.model import Project  # noqa: E402


def save_versions(n_segments: int) -> tuple[Project, Project]:
    """Two versions A and B of one generated project (benchmark data only), differing in every segment."""
    from benchmarks.run_benchmarks import generated_project

    base = generated_project(n_segments=n_segments, n_fittings=3 * n_segments, seed=11)
    version_a = replace(base, name="version A")
    version_b = replace(base, name="version B",
                        segments=tuple(replace(s, length_m=s.length_m + 1.0) for s in base.segments))
    return version_a, version_b


def edited_project(project: Project, k: int) -> Project:
    """The project after scripted edit ``k`` (1, 2, …): a new name and a longer last segment."""
    last = project.segments[-1]
    return replace(project, name=f"scripted edit {k}",
                   segments=project.segments[:-1] + (replace(last, length_m=last.length_m + 10.0 * k),))


def _save_loop(path: Path, version_files: list[Path]) -> int:
    from hydraulics.project_io import atomic_write_text

    texts = [file.read_text(encoding="utf-8") for file in version_files]
    turn = 0
    while True:
        atomic_write_text(path, texts[turn % 2], keep_backup=True)
        sys.stdout.write(f"saved {'AB'[turn % 2]}\n")
        sys.stdout.flush()
        turn += 1


def _edit_and_wait(path: Path, idle_ms: int | None, edits: int, pause_ms: int) -> int:
    from PySide6.QtCore import QTimer

    from app.gui import application, open_window

    app = application()
    window = open_window(str(path))
    if idle_ms is not None:
        window.autosaver.set_intervals(idle_ms)
    original = window.document.project
    state = {"applied": 0}

    def on_written(_path: object) -> None:
        sys.stdout.write(f"kept {state['applied']}\n")
        sys.stdout.flush()

    def next_edit() -> None:
        k = state["applied"] + 1
        if not window.document.apply(edited_project(original, k), f"Scripted edit {k}"):
            sys.stdout.write(f"refused {k}\n")
            sys.stdout.flush()
            return
        state["applied"] = k
        sys.stdout.write(f"edited {k}\n")
        sys.stdout.flush()
        if k < edits:
            QTimer.singleShot(pause_ms, next_edit)

    window.autosaver.written.connect(on_written)
    window.show()
    QTimer.singleShot(0, next_edit)
    return int(app.exec())


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="crash_children")
    sub = parser.add_subparsers(dest="mode", required=True)
    loop = sub.add_parser("save-loop")
    loop.add_argument("file", type=Path)
    loop.add_argument("texts", type=Path, nargs=2)
    edit = sub.add_parser("edit")
    edit.add_argument("file", type=Path)
    edit.add_argument("--idle-ms", type=int, default=None)
    edit.add_argument("--edits", type=int, default=1)
    edit.add_argument("--pause-ms", type=int, default=200)
    args = parser.parse_args(argv)
    if args.mode == "save-loop":
        return _save_loop(args.file, list(args.texts))
    return _edit_and_wait(args.file, args.idle_ms, args.edits, args.pause_ms)


if __name__ == "__main__":
    sys.exit(main())
