"""Where the bundled data folders are: installed inside a package, or at the top of a checkout.

The catalogues (``resources/``) and the sample projects (``sample_projects/``) live at the top
of the source repository.  An installed PumpSketch carries them as package data inside the
packages that read them (``pyproject.toml`` maps them):

=================== ================================ =============================
folder in the repo   installed as                     found by
=================== ================================ =============================
``resources/``       ``hydraulics/resources/``         :func:`resources_dir`
``sample_projects/`` ``app/sample_projects/``          ``bundled_folder("app", ...)``
=================== ================================ =============================

:func:`bundled_folder` asks :mod:`importlib.resources` for the folder inside the package and
falls back to the folder beside the package, which is where it is when the code runs from
the repository (an editable install, or the repository on ``sys.path``).

>>> (resources_dir() / "fittings.json").is_file()
True
"""

from __future__ import annotations

from importlib import resources
from pathlib import Path


class BundledDataMissingError(FileNotFoundError):
    """A bundled data folder is in neither place it can be (a broken installation)."""


BundledDataMissing = BundledDataMissingError
"""The former name, kept while callers move to :class:`BundledDataMissingError`."""


def bundled_folder(package: str, folder: str) -> Path:
    """The data folder ``folder`` shipped with the importable package ``package``.

    First ``<package>/<folder>`` as an installed wheel holds it, else ``<folder>`` beside the
    package's own directory (a source checkout).  Raises :class:`BundledDataMissingError`,
    naming both places, when neither exists.
    """
    root = resources.files(package)
    if not isinstance(root, Path):  # a zip import: the readers need real files
        raise BundledDataMissingError(
            f"package {package!r} is not installed as files on disk ({root}); "
            f"install PumpSketch with pip so that {folder}/ can be read")
    installed = root / folder
    if installed.is_dir():
        return installed
    checkout = root.parent / folder
    if checkout.is_dir():
        return checkout
    raise BundledDataMissingError(f"the bundled folder {folder}/ is missing: looked in {installed} and {checkout}")


def resources_dir() -> Path:
    """The folder of the bundled catalogues (materials, pipe series, fittings)."""
    return bundled_folder("hydraulics", "resources")
