"""The wheel carries the code, the catalogues and the samples, and an installed copy finds them.

The wheel is built the way pip builds it, from a copy of the sources, without network
(``--no-build-isolation --no-index``): the build back end comes from the test environment
(``setuptools`` is in the ``test`` extra, see ``pyproject.toml``).
"""

import json
import os
import shutil
import subprocess
import sys
import tomllib
import zipfile
from importlib import metadata
from pathlib import Path

import pytest
from packaging.requirements import Requirement
from packaging.version import Version

from hydraulics.package_data import BundledDataMissing, bundled_folder

ROOT = Path(__file__).resolve().parent.parent
PYPROJECT = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
SOURCES = ("pyproject.toml", "README.md", "app", "hydraulics", "resources", "sample_projects")

# Shipped data: repository folder → folder in the wheel, and the files that must travel.
SHIPPED = {
    "resources": ("hydraulics/resources", ("README.md", "*.json", "pipe_series/*.json")),
    "sample_projects": ("app/sample_projects", ("README.md", "*.pumpsketch.json", "pumps/*.csv")),
}


def _setuptools_meets_build_requirement() -> None:
    wanted = next(Requirement(r) for r in PYPROJECT["build-system"]["requires"] if r.startswith("setuptools"))
    have = Version(metadata.version("setuptools"))
    assert have in wanted.specifier, (
        f"setuptools {have} is installed, the build needs {wanted}; run `make install` "
        f"(the test extra of pyproject.toml brings it)")


@pytest.fixture(scope="module")
def wheel(tmp_path_factory) -> tuple[Path, str]:
    """The wheel built from a copy of the sources, and the build's output."""
    _setuptools_meets_build_requirement()
    work = tmp_path_factory.mktemp("wheel")
    source = work / "source"
    source.mkdir()
    for name in SOURCES:
        item = ROOT / name
        if item.is_dir():
            shutil.copytree(item, source / name, ignore=shutil.ignore_patterns("__pycache__", "*.pyc"))
        else:
            shutil.copy2(item, source / name)
    out = work / "dist"
    result = subprocess.run(
        [sys.executable, "-m", "pip", "wheel", "--no-deps", "--no-build-isolation", "--no-index",
         "--disable-pip-version-check", "-v", "-w", str(out), str(source)],
        capture_output=True, text=True, timeout=600, cwd=work)
    assert result.returncode == 0, result.stdout[-3000:] + result.stderr[-3000:]
    wheels = list(out.glob("pumpsketch-*.whl"))
    assert len(wheels) == 1, wheels
    return wheels[0], result.stdout + result.stderr


@pytest.fixture(scope="module")
def wheel_names(wheel) -> set[str]:
    with zipfile.ZipFile(wheel[0]) as archive:
        return set(archive.namelist())


def test_the_wheel_carries_the_catalogues(wheel_names):
    for name in ("fittings.json", "materials.json", "pipe_series/pe100_sdr11.json", "README.md"):
        assert f"hydraulics/resources/{name}" in wheel_names
    expected = {f"hydraulics/resources/{p.relative_to(ROOT / 'resources').as_posix()}"
                for pattern in SHIPPED["resources"][1] for p in (ROOT / "resources").glob(pattern)}
    assert expected <= wheel_names, sorted(expected - wheel_names)


def test_the_wheel_carries_the_samples_and_their_pump_files(wheel_names):
    for name in ("hilltop_booster", "river_intake", "sewage_wet_well"):
        assert f"app/sample_projects/{name}.pumpsketch.json" in wheel_names
    expected = {f"app/sample_projects/{p.relative_to(ROOT / 'sample_projects').as_posix()}"
                for pattern in SHIPPED["sample_projects"][1] for p in (ROOT / "sample_projects").glob(pattern)}
    assert expected <= wheel_names, sorted(expected - wheel_names)
    # every pump file a sample refers to travels with it
    for sample in (ROOT / "sample_projects").glob("*.pumpsketch.json"):
        for pump in json.loads(sample.read_text(encoding="utf-8")).get("pumps", []):
            if pump.get("source_csv"):
                assert f"app/sample_projects/{pump['source_csv']}" in wheel_names


def test_the_wheel_carries_every_module(wheel_names):
    modules = {p.relative_to(ROOT).as_posix() for package in ("app", "hydraulics")
               for p in (ROOT / package).rglob("*.py") if "__pycache__" not in p.parts}
    missing = modules - wheel_names
    assert not missing, f"add the package of {sorted(missing)} to [tool.setuptools] packages in pyproject.toml"


def test_the_wheel_declares_the_licence_and_the_command(wheel, wheel_names):
    path, build_output = wheel
    with zipfile.ZipFile(path) as archive:
        info = next(n for n in wheel_names if n.endswith(".dist-info/METADATA"))
        meta = archive.read(info).decode("utf-8")
        entry_points = archive.read(info.replace("METADATA", "entry_points.txt")).decode("utf-8")
    assert "License-Expression: MIT" in meta.splitlines()
    assert "pumpsketch = app.cli:main" in entry_points
    # the old table form `license = {text = ...}` made setuptools warn on every build
    assert "project.license" not in build_output
    assert "Package would be ignored" not in build_output


def test_an_installed_copy_solves_a_bundled_sample_from_elsewhere(wheel, tmp_path):
    """The wheel unpacked as site-packages would hold it, the repository out of reach."""
    site = tmp_path / "site"
    with zipfile.ZipFile(wheel[0]) as archive:
        archive.extractall(site)
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    env = {**os.environ, "PYTHONPATH": str(site), "PYTHONSAFEPATH": "1"}
    probe = subprocess.run(
        [sys.executable, "-c", "import hydraulics.catalogue as c, app.samples as s; "
         "print(c.RESOURCES_DIR); print(s.sample_dir())"],
        capture_output=True, text=True, timeout=120, cwd=elsewhere, env=env)
    assert probe.returncode == 0, probe.stderr
    assert probe.stdout.split() == [str(site / "hydraulics" / "resources"), str(site / "app" / "sample_projects")]
    solved = subprocess.run([sys.executable, "-m", "app", "solve", "--sample", "hilltop_booster", "--json"],
                            capture_output=True, text=True, timeout=120, cwd=elsewhere, env=env)
    assert solved.returncode == 0, solved.stderr
    assert json.loads(solved.stdout)["project"].startswith("Hollin Ridge")  # the sample's own name


# --------------------------------------------------------------------------- the lookup itself
def _package(root: Path, name: str) -> Path:
    package = root / name
    package.mkdir(parents=True)
    (package / "__init__.py").write_text("", encoding="utf-8")
    return package


def test_the_installed_folder_wins_over_the_checkout_folder(tmp_path, monkeypatch):
    package = _package(tmp_path, "ps_lookup_installed")
    (package / "data").mkdir()
    (tmp_path / "data").mkdir()
    monkeypatch.syspath_prepend(str(tmp_path))
    assert bundled_folder("ps_lookup_installed", "data") == package / "data"


def test_a_checkout_finds_the_folder_beside_the_package(tmp_path, monkeypatch):
    _package(tmp_path, "ps_lookup_checkout")
    (tmp_path / "data").mkdir()
    monkeypatch.syspath_prepend(str(tmp_path))
    assert bundled_folder("ps_lookup_checkout", "data") == tmp_path / "data"


def test_a_missing_folder_names_both_places(tmp_path, monkeypatch):
    package = _package(tmp_path, "ps_lookup_missing")
    monkeypatch.syspath_prepend(str(tmp_path))
    with pytest.raises(BundledDataMissing) as caught:
        bundled_folder("ps_lookup_missing", "data")
    assert str(package / "data") in str(caught.value) and str(tmp_path / "data") in str(caught.value)
