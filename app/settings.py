"""What the window remembers between runs: unit system, recent files, last project.

Everything goes through one INI-format :class:`QSettings` in the user scope, so tests can
point it at a temporary folder with ``QSettings.setPath(IniFormat, UserScope, folder)``.
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QByteArray, QSettings

from hydraulics.units import UNIT_SYSTEMS

ORGANISATION = "PumpSketch"
APPLICATION = "PumpSketch"
MAX_RECENT_FILES = 8

_UNIT_SYSTEM_KEY = "display/unit_system"
_RECENT_KEY = "files/recent"
_LAST_PROJECT_KEY = "files/last_project"
_GEOMETRY_KEY = "window/geometry"
_SPLITTER_KEY = "window/splitters"


def _store() -> QSettings:
    return QSettings(QSettings.Format.IniFormat, QSettings.Scope.UserScope, ORGANISATION, APPLICATION)


def unit_system() -> str:
    """The unit system last chosen ("SI" when none was chosen or the stored one is unknown)."""
    value = _store().value(_UNIT_SYSTEM_KEY, "SI")
    return value if value in UNIT_SYSTEMS else "SI"


def set_unit_system(system: str) -> None:
    """Remember the unit system ("SI" or "US")."""
    if system not in UNIT_SYSTEMS:
        raise ValueError(f"unknown unit system {system!r}; known: {', '.join(UNIT_SYSTEMS)}")
    store = _store()
    store.setValue(_UNIT_SYSTEM_KEY, system)
    store.sync()


def recent_files() -> list[str]:
    """Recently opened or saved project files, newest first, only those that still exist."""
    value = _store().value(_RECENT_KEY, [], type=list)
    paths = [v for v in value if isinstance(v, str) and v] if isinstance(value, list) else []
    return [p for p in paths if Path(p).is_file()][:MAX_RECENT_FILES]


def add_recent_file(path: str | Path) -> list[str]:
    """Put ``path`` at the head of the recent files; return the new list."""
    text = str(Path(path).resolve())
    paths = [text] + [p for p in recent_files() if p != text]
    paths = paths[:MAX_RECENT_FILES]
    store = _store()
    store.setValue(_RECENT_KEY, paths)
    store.setValue(_LAST_PROJECT_KEY, text)
    store.sync()
    return paths


def clear_recent_files() -> None:
    """Forget the recent files (the last project too)."""
    store = _store()
    store.remove(_RECENT_KEY)
    store.remove(_LAST_PROJECT_KEY)
    store.sync()


def last_project() -> str | None:
    """The project file open when the window last saved or opened one, if it still exists."""
    value = _store().value(_LAST_PROJECT_KEY, "")
    if isinstance(value, str) and value and Path(value).is_file():
        return value
    return None


def window_state() -> tuple[bytes | None, list[bytes]]:
    """Saved window geometry and splitter states (``None``/empty when never saved).

    A stored splitter state that is not a byte string reads as empty (that splitter keeps its layout).
    """
    store = _store()
    geometry = store.value(_GEOMETRY_KEY)
    splitters = store.value(_SPLITTER_KEY, [], type=list)
    states = [_state_bytes(s) for s in splitters] if isinstance(splitters, list) else []
    return (bytes(geometry) if geometry is not None else None), states


def _state_bytes(value: object) -> bytes:
    if isinstance(value, QByteArray):
        return bytes(value.data())
    return value if isinstance(value, bytes) else b""


def set_window_state(geometry: bytes, splitters: list[bytes]) -> None:
    """Remember the window geometry and the splitter positions."""
    store = _store()
    store.setValue(_GEOMETRY_KEY, geometry)
    store.setValue(_SPLITTER_KEY, splitters)
    store.sync()
