"""Are the system libraries of Qt's X11 platform plugin present?  ``python -m app.platform_check``.

On Linux the window opens through Qt's ``xcb`` platform plugin, which the PySide6 wheel ships
(``PySide6/Qt/plugins/platforms/libqxcb.so``) but whose X11 libraries it does not: a minimal
system lacks some of them, and Qt then stops with "could not load the Qt platform plugin xcb".
This check runs before ``make run`` opens the window:

1. it runs ``ldd`` on the plugin and on ``libQt6XcbQpa.so.6`` beside Qt's libraries and collects
   the libraries reported "not found", and tries to load ``libxcb-cursor.so.0``, which Qt 6.5
   and later loads at run time;
2. it maps each missing library to the Debian/Ubuntu package that holds it
   (:data:`DEBIAN_PACKAGES`; a library not in the table is named as it is);
3. run as root where ``apt-get`` exists, it installs the packages (``apt-get update`` first when
   the package lists are empty) and checks again; otherwise it prints the missing packages and
   the one command that installs them, and exits with status 2.

Nothing is checked on other systems, or when ``QT_QPA_PLATFORM`` names no ``xcb`` platform
(``offscreen`` for the tests, ``wayland``).  The module imports no Qt, so it runs where Qt
itself cannot load.
"""

from __future__ import annotations

import ctypes
import importlib.util
import os
import shutil
import subprocess
import sys
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass
from pathlib import Path

MISSING = 2
"""Exit status when libraries are missing and were not installed."""

RUNTIME_LOADED = ("libxcb-cursor.so.0",)
"""Libraries Qt loads at run time (``dlopen``), so ``ldd`` cannot report them."""

DEBIAN_PACKAGES: dict[str, str] = {
    "libxcb-cursor.so.0": "libxcb-cursor0",
    "libxcb-icccm.so.4": "libxcb-icccm4",
    "libxcb-keysyms.so.1": "libxcb-keysyms1",
    "libxcb-image.so.0": "libxcb-image0",
    "libxcb-render-util.so.0": "libxcb-render-util0",
    "libxcb-randr.so.0": "libxcb-randr0",
    "libxcb-render.so.0": "libxcb-render0",
    "libxcb-shape.so.0": "libxcb-shape0",
    "libxcb-shm.so.0": "libxcb-shm0",
    "libxcb-sync.so.1": "libxcb-sync1",
    "libxcb-xfixes.so.0": "libxcb-xfixes0",
    "libxcb-xinerama.so.0": "libxcb-xinerama0",
    "libxcb-xinput.so.0": "libxcb-xinput0",
    "libxcb-xkb.so.1": "libxcb-xkb1",
    "libxcb-glx.so.0": "libxcb-glx0",
    "libxcb-util.so.1": "libxcb-util1",
    "libxcb.so.1": "libxcb1",
    "libX11-xcb.so.1": "libx11-xcb1",
    "libX11.so.6": "libx11-6",
    "libxkbcommon.so.0": "libxkbcommon0",
    "libxkbcommon-x11.so.0": "libxkbcommon-x11-0",
    "libEGL.so.1": "libegl1",
    "libGL.so.1": "libgl1",
    "libGLX.so.0": "libglx0",
    "libGLdispatch.so.0": "libglvnd0",
    "libOpenGL.so.0": "libopengl0",
    "libfontconfig.so.1": "libfontconfig1",
    "libfreetype.so.6": "libfreetype6",
    "libdbus-1.so.3": "libdbus-1-3",
    "libglib-2.0.so.0": "libglib2.0-0",
    "libgthread-2.0.so.0": "libglib2.0-0",
    "libz.so.1": "zlib1g",
}
"""Library (soname) → Debian 12 package holding it (checked with ``dpkg -S`` on Debian 12
bookworm for the installed ones and ``apt-cache policy`` for the others; Ubuntu uses the same
names for these)."""


# --------------------------------------------------------------------------- finding what is missing
def not_found_in_ldd(output: str) -> list[str]:
    """The sonames ``ldd`` reports as ``not found``, in order, each once.

    >>> not_found_in_ldd("\\tlibxcb.so.1 => /lib/libxcb.so.1 (0x1)\\n\\tlibxcb-icccm.so.4 => not found\\n")
    ['libxcb-icccm.so.4']
    """
    found: list[str] = []
    for line in output.splitlines():
        name, arrow, target = line.strip().partition("=>")
        if arrow and target.strip() == "not found" and name.strip() not in found:
            found.append(name.strip())
    return found


def packages_for(sonames: Iterable[str]) -> tuple[list[str], list[str]]:
    """``(Debian packages, sonames with no known package)`` for the missing ``sonames``, each once.

    >>> packages_for(["libxcb-icccm.so.4", "libglib-2.0.so.0", "libgthread-2.0.so.0", "libodd.so.3"])
    (['libxcb-icccm4', 'libglib2.0-0'], ['libodd.so.3'])
    """
    packages: list[str] = []
    unknown: list[str] = []
    for soname in sonames:
        package = DEBIAN_PACKAGES.get(soname)
        target, item = (packages, package) if package else (unknown, soname)
        if item not in target:
            target.append(item)
    return packages, unknown


def xcb_plugin_files(pyside_dir: Path) -> list[Path]:
    """The xcb platform plugin and the Qt library it is built on, those of them that exist."""
    qt = pyside_dir / "Qt"
    candidates = (qt / "plugins" / "platforms" / "libqxcb.so", qt / "lib" / "libQt6XcbQpa.so.6")
    return [path for path in candidates if path.is_file()]


def pyside_dir() -> Path | None:
    """PySide6's package folder, found without importing it (importing may be what fails)."""
    spec = importlib.util.find_spec("PySide6")
    if spec is None or not spec.submodule_search_locations:
        return None
    return Path(next(iter(spec.submodule_search_locations)))


def run_ldd(path: Path) -> str:
    """``ldd path`` (its standard output; empty when ldd cannot run)."""
    try:
        return subprocess.run(["ldd", str(path)], capture_output=True, text=True, timeout=60).stdout
    except (OSError, subprocess.SubprocessError):
        return ""


def loadable(soname: str) -> bool:
    """Whether the dynamic loader finds and loads ``soname`` (as Qt's ``dlopen`` would)."""
    try:
        ctypes.CDLL(soname)
    except OSError:
        return False
    return True


def missing_libraries(files: Sequence[Path], ldd: Callable[[Path], str] = run_ldd,
                      can_load: Callable[[str], bool] = loadable) -> list[str]:
    """Sonames the plugin ``files`` need that the system lacks (``ldd``), and the run-time ones."""
    missing: list[str] = []
    for path in files:
        missing += [name for name in not_found_in_ldd(ldd(path)) if name not in missing]
    missing += [name for name in RUNTIME_LOADED if name not in missing and not can_load(name)]
    return missing


# --------------------------------------------------------------------------- deciding what to do
def check_wanted(platform: str, environ: dict[str, str]) -> bool:
    """Whether the xcb plugin will be used: Linux, and ``QT_QPA_PLATFORM`` unset or naming xcb.

    >>> check_wanted("linux", {"QT_QPA_PLATFORM": "offscreen"}), check_wanted("linux", {})
    (False, True)
    >>> check_wanted("win32", {}), check_wanted("linux", {"QT_QPA_PLATFORM": "wayland;xcb"})
    (False, True)
    """
    if not platform.startswith("linux"):
        return False
    chosen = environ.get("QT_QPA_PLATFORM", "").strip()
    if not chosen:
        return True
    return any(entry.split(":", 1)[0].strip() == "xcb" for entry in chosen.split(";"))


@dataclass(frozen=True)
class Plan:
    """What to do about the missing libraries."""

    install: tuple[str, ...] = ()
    """Packages to install now (as root with apt-get)."""
    report: str = ""
    """Text for the user when the libraries stay missing; empty when nothing is missing."""
    unknown: tuple[str, ...] = ()
    """Missing sonames with no known package."""


def plan(missing: Sequence[str], is_root: bool, has_apt: bool, after_install: bool = False) -> Plan:
    """The install or the report for the ``missing`` sonames (see the module docstring).

    ``after_install``: the packages were just installed and these are still missing (report them).
    """
    if not missing:
        return Plan()
    packages, unknown = packages_for(missing)
    if is_root and has_apt and packages and not after_install:
        return Plan(install=tuple(packages), unknown=tuple(unknown))
    return Plan(report=report_text(missing, packages, unknown, is_root, has_apt, after_install),
                unknown=tuple(unknown))


def report_text(missing: Sequence[str], packages: Sequence[str], unknown: Sequence[str],
                is_root: bool, has_apt: bool, after_install: bool = False) -> str:
    """The message naming what is missing and the one command that installs it."""
    lines = [f"PumpSketch: the window needs system libraries that are missing: {', '.join(missing)}."]
    if after_install and packages:
        lines.append("apt-get did not install them (see its messages above).")
    if packages:
        sudo = "" if is_root else "sudo "
        lines.append(f"Missing packages: {' '.join(packages)}")
        if has_apt:
            lines.append(f"Install them with:\n    {sudo}apt-get install {' '.join(packages)}")
        else:
            lines.append("Install the packages of your distribution that provide these libraries "
                         f"(on Debian or Ubuntu: {sudo}apt-get install {' '.join(packages)}).")
    if unknown:
        lines.append(f"No package is known for {', '.join(unknown)}; install the package that provides "
                     f"{'it' if len(unknown) == 1 else 'them'} (on Debian: apt-file search {unknown[0]}).")
    lines.append("Then start PumpSketch again.")
    return "\n".join(lines)


# --------------------------------------------------------------------------- acting
def apt_lists_empty(lists_dir: Path = Path("/var/lib/apt/lists")) -> bool:
    """Whether apt has no package lists yet (a fresh minimal image): ``apt-get update`` first."""
    try:
        return not any("Packages" in path.name for path in lists_dir.iterdir())
    except OSError:
        return True


def apt_install(packages: Sequence[str], run: Callable[..., subprocess.CompletedProcess[bytes]] = subprocess.run,
                lists_empty: Callable[[], bool] = apt_lists_empty) -> bool:
    """Install ``packages`` with apt-get (updating the lists first if needed, or on a failure)."""
    env = {**os.environ, "DEBIAN_FRONTEND": "noninteractive"}
    install = ["apt-get", "install", "-y", "--no-install-recommends", *packages]
    update = ["apt-get", "update"]
    if lists_empty():
        run(update, env=env, check=False)
    if run(install, env=env, check=False).returncode == 0:
        return True
    return run(update, env=env, check=False).returncode == 0 and run(install, env=env, check=False).returncode == 0


def main(argv: Sequence[str] | None = None) -> int:
    """Check (and where allowed install); 0 when the window can start, :data:`MISSING` otherwise."""
    del argv  # no options
    if not check_wanted(sys.platform, dict(os.environ)):
        return 0
    folder = pyside_dir()
    if folder is None:
        print("PumpSketch: PySide6 is not installed in this Python; run `make install`.", file=sys.stderr)
        return MISSING
    files = xcb_plugin_files(folder)
    if not files or shutil.which("ldd") is None:
        print("PumpSketch: note: cannot check Qt's X11 libraries here (no xcb plugin or no ldd).", file=sys.stderr)
        return 0
    missing = missing_libraries(files)
    step = plan(missing, is_root=os.geteuid() == 0, has_apt=shutil.which("apt-get") is not None)
    if step.install:
        print(f"PumpSketch: installing the libraries the window needs: {' '.join(step.install)}", file=sys.stderr)
        apt_install(step.install)
        step = plan(missing_libraries(files), is_root=True, has_apt=True, after_install=True)
    if step.report:
        print(step.report, file=sys.stderr)
        return MISSING
    return 0


if __name__ == "__main__":
    sys.exit(main())
