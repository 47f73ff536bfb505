"""Render the window for a project to a PNG without a screen (``pumpsketch shot``)."""

from __future__ import annotations

import os
from pathlib import Path

from PySide6.QtWidgets import QApplication


def render_window_png(project_path: str | Path, out_path: str | Path, width: int = 1400,
                      height: int = 900) -> Path:
    """Open ``project_path`` in a main window of ``width`` × ``height`` pixels, solve it,
    and save the window's image to ``out_path``; return the written path.

    Uses an offscreen QApplication when none is running (so it works on a server).
    Raises :class:`hydraulics.project_io.ProjectFileError` for a file that cannot be read
    and ``OSError`` when the image cannot be written.
    """
    if QApplication.instance() is None:
        os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
    from app.document import ProjectDocument
    from app.gui import application
    from app.main_window import MainWindow

    app = application()
    window = MainWindow(ProjectDocument(unit_system="SI"), remember_layout=False)
    try:
        window.document.open(project_path)
        window.resize(width, height)
        window.show()
        app.processEvents()
        window.document.recompute_now()
        for _ in range(3):
            app.processEvents()
        image = window.grab()
        out = Path(out_path)
        if not image.save(str(out), "PNG"):
            raise OSError(f"cannot write the image {out}")
        return out.resolve()
    finally:
        window.document.undo_stack.setClean()
        window.close()
        window.deleteLater()
        app.processEvents()
