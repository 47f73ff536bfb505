"""The user's data folder: recovery files of unsaved edits and the error log live there.

It is Qt's per-user application data location (``QStandardPaths.AppDataLocation``), unless
the environment variable :data:`DATA_DIR_VARIABLE` names another folder (tests and the
stress runner point it at a temporary one).
"""

from __future__ import annotations

import os
from pathlib import Path

from PySide6.QtCore import QStandardPaths

from app.settings import APPLICATION, ORGANISATION

DATA_DIR_VARIABLE = "PUMPSKETCH_DATA_DIR"


def data_folder() -> Path:
    """The folder for PumpSketch's own files (created when missing)."""
    override = os.environ.get(DATA_DIR_VARIABLE)
    if override:
        folder = Path(override)
    else:
        location = QStandardPaths.writableLocation(QStandardPaths.StandardLocation.AppDataLocation)
        # Without a running application the location lacks our names; add them ourselves.
        folder = Path(location) if location.endswith(APPLICATION) else Path(location) / ORGANISATION / APPLICATION
    folder.mkdir(parents=True, exist_ok=True)
    return folder
