"""The bundled sample projects: where they are and what they are called (no Qt).

The samples are ``sample_projects/`` of the repository, installed as package data inside
``app`` (see :mod:`hydraulics.package_data`).  The window's File ▸ Open sample, the window's
``--sample NAME`` and ``pumpsketch solve --sample NAME`` all find them here.
"""

from __future__ import annotations

import json
from pathlib import Path

from hydraulics.package_data import bundled_folder
from hydraulics.project_io import FILE_SUFFIX


def sample_dir() -> Path:
    """The folder holding the bundled sample projects (and their ``pumps/`` data files)."""
    return bundled_folder("app", "sample_projects")


def sample_path(name: str) -> Path | None:
    """The bundled sample called ``name`` (its file name without the suffix), or ``None``."""
    if not name or "/" in name or "\\" in name:
        return None
    path = sample_dir() / f"{name}{FILE_SUFFIX}"
    return path if path.is_file() else None


def sample_names() -> list[str]:
    """The names :func:`sample_path` accepts, in file-name order."""
    return [path.name[: -len(FILE_SUFFIX)] for path in sorted(sample_dir().glob(f"*{FILE_SUFFIX}"))]


def sample_projects() -> list[tuple[str, Path]]:
    """``(title, path)`` of every sample project, in file-name order (the title is the project's name)."""
    found = []
    for path in sorted(sample_dir().glob(f"*{FILE_SUFFIX}")):
        title = path.name[: -len(FILE_SUFFIX)].replace("_", " ")
        try:
            name = json.loads(path.read_text(encoding="utf-8")).get("name")
        except (OSError, ValueError, AttributeError):
            name = None
        found.append((name if isinstance(name, str) and name else title, path))
    return found
