"""Upgrading project files of an older format version, one version at a time.

A project file carries an integer ``"version"``.  When the format changes, the version goes up by
one and a *migration* is registered here: a pure function that takes the parsed JSON dictionary of
a version-n file and returns a new dictionary in the shape of version n + 1.  On reading,
:func:`migrate` applies the registered steps in order, from the file's version up to the version
the program writes, and the strict reader (:mod:`hydraulics.project_io`) then sees only the current
shape.  A migration

* never mutates its argument (build new dictionaries and lists; :func:`migrate` also hands the
  first step a deep copy, so the caller's data stays as parsed whatever a step does);
* need not set ``"version"``: :func:`migrate` writes n + 1 after the step;
* reads the old shape defensively (the strict reader validates what comes out); a step that
  fails on a damaged file with ``KeyError``, ``TypeError``, ``ValueError``, ``AttributeError``
  or ``IndexError`` is reported as a :class:`MigrationError`, not a crash.

Versions outside the range a migration can handle (not a whole number, below 1, or newer than the
program) pass through unchanged, so the reader refuses them with its own message.  A missing step
between the file's version and the current one is an error naming both versions.

Registered steps:

* 1 → 2 (:func:`v1_to_v2`): the station as built.  Every segment says what it carries
  (``"carries"``: ``"pump"`` for a pump's own branch, ``"station"`` for common pipework) and the
  project has a profile of its main (``"profile"``, a list of chainage/elevation points).  A
  version-1 file knew only common pipework and no profile, so every segment becomes
  ``"station"`` and the profile is empty: the file solves exactly as before.
* 2 → 3 (:func:`v2_to_v3`): speed control and the motor.  The arrangement says whether its pump
  runs at fixed or variable speed (``"variable_speed"``) and may give a motor rating
  (``"motor_rating"``) and a service factor (``"service_factor"``).  A version-2 arrangement
  searched speeds in its [min, max] range, so it becomes variable speed when that range is more
  than its own speed ratio (min and max differ, or differ from it); otherwise fixed speed.  The
  version-2 defaults (min 0.6, max 1.0, speed 1.0, drive efficiency 1.0) are written out, no
  motor rating is given and the service factor is 1.0: the file solves exactly as before.

* 3 → 4 (:func:`v3_to_v4`): dissimilar pumps and the duty profile.  The project may list
  installed pumps beside the arrangement's identical ones (``"other_pumps"``: model, role,
  speeds) and a duty over the year (``"duty_profile"``: flow bands with their time, an optional
  annual volume, the control strategy).  A version-3 file had neither: the list is empty and
  the profile has no bands, so the file solves exactly as before.

* 4 → 5 (:func:`v4_to_v5`): the report's title block and the pumps' provenance.  The project
  has a ``"title_block"`` (site, revision, date, prepared by, checked by; free text) and each
  pump may say which data file its points came from (``"source"``: file name and comment
  lines).  A version-4 file had neither: the title block is empty and no source is known.

``sample_projects/README.md`` explains how to add a migration.
"""

from __future__ import annotations

import copy
from collections.abc import Callable, Mapping
from typing import Any

Migration = Callable[[Mapping[str, Any]], dict[str, Any]]
"""A step from format version n to n + 1 (see the module docstring)."""

MIGRATIONS: dict[int, Migration] = {}
"""Registered steps, keyed by the version they upgrade *from*."""


class MigrationError(ValueError):
    """A file that cannot be brought up to the current format version."""

    field_path = "version"

    def __init__(self, problem: str):
        self.problem = problem
        super().__init__(problem)


def migration(from_version: int) -> Callable[[Migration], Migration]:
    """Register the decorated function as the step ``from_version`` → ``from_version + 1``."""
    def register(step: Migration) -> Migration:
        if from_version in MIGRATIONS:
            raise ValueError(f"a migration from format version {from_version} is already registered")
        MIGRATIONS[from_version] = step
        return step
    return register


def migrate(data: Any, target_version: int) -> Any:
    """``data`` (a parsed project file) brought up to ``target_version`` by the registered steps.

    The caller checks the file's ``format`` first: the steps are for project files only.
    Returns ``data`` itself when there is nothing to do: not a dictionary, a version that is not
    a whole number, below 1, or not below ``target_version`` (the reader decides on those).
    Otherwise returns a new dictionary; ``data`` is left as it was.  Raises
    :class:`MigrationError` when a step is missing or a step returns something other than a
    dictionary.

    >>> migrate({"format": "pumpsketch-project", "version": 1}, 1)
    {'format': 'pumpsketch-project', 'version': 1}
    """
    if not isinstance(data, dict):
        return data
    version = data.get("version")
    if isinstance(version, bool) or not isinstance(version, int) or not 1 <= version < target_version:
        return data
    current: dict[str, Any] = copy.deepcopy(data)
    for step_from in range(version, target_version):
        step = MIGRATIONS.get(step_from)
        if step is None:
            raise MigrationError(
                f"this file is format version {version} and cannot be upgraded to version {target_version}: "
                f"no migration from version {step_from} to {step_from + 1} is known")
        try:
            result = step(current)
        except (KeyError, IndexError, TypeError, ValueError, AttributeError) as exc:
            raise MigrationError(
                f"this file is format version {version} and could not be upgraded from version {step_from} "
                f"to {step_from + 1} ({type(exc).__name__}: {exc}); the file may be damaged") from None
        if not isinstance(result, dict):
            raise MigrationError(
                f"the migration from format version {step_from} to {step_from + 1} "
                f"returned {type(result).__name__}, not a dictionary")
        current = {**result, "version": step_from + 1}
    return current


@migration(1)
def v1_to_v2(data: Mapping[str, Any]) -> dict[str, Any]:
    """Format 1 → 2: every segment carries the station flow; the main has no profile yet.

    >>> v1_to_v2({"version": 1, "segments": [{"name": "Main"}]})
    {'version': 1, 'segments': [{'name': 'Main', 'carries': 'station'}], 'profile': []}
    """
    segments = data.get("segments")
    upgraded = dict(data)
    if isinstance(segments, list):
        upgraded["segments"] = [{**s, "carries": "station"} if isinstance(s, dict) else s for s in segments]
    upgraded.setdefault("profile", [])
    return upgraded


@migration(2)
def v2_to_v3(data: Mapping[str, Any]) -> dict[str, Any]:
    """Format 2 → 3: the arrangement's speed control, motor rating and service factor.

    >>> v2_to_v3({"version": 2, "arrangement": {"pump": "P", "min_speed_ratio": 0.7}})["arrangement"]
    ... # doctest: +NORMALIZE_WHITESPACE
    {'pump': 'P', 'min_speed_ratio': 0.7, 'speed_ratio': 1.0, 'max_speed_ratio': 1.0,
     'drive_efficiency': 1.0, 'variable_speed': True, 'service_factor': 1.0}
    """
    upgraded = dict(data)
    arrangement = data.get("arrangement")
    if isinstance(arrangement, dict):
        new = dict(arrangement)
        speed = new.setdefault("speed_ratio", 1.0)  # the version-2 defaults, written out
        low = new.setdefault("min_speed_ratio", 0.6)
        high = new.setdefault("max_speed_ratio", 1.0)
        new.setdefault("drive_efficiency", 1.0)
        new["variable_speed"] = not (low == high == speed)
        new["service_factor"] = 1.0
        upgraded["arrangement"] = new
    return upgraded


@migration(3)
def v3_to_v4(data: Mapping[str, Any]) -> dict[str, Any]:
    """Format 3 → 4: no other installed pumps, a duty profile without bands.

    >>> v3_to_v4({"version": 3})
    {'version': 3, 'other_pumps': [], 'duty_profile': {'bands': [], 'time_basis': 'hours', \
'strategy': 'fixed_staging', 'pipe': 'aged'}}
    """
    upgraded = dict(data)
    upgraded.setdefault("other_pumps", [])
    upgraded.setdefault("duty_profile", {"bands": [], "time_basis": "hours", "strategy": "fixed_staging",
                                         "pipe": "aged"})
    return upgraded


@migration(4)
def v4_to_v5(data: Mapping[str, Any]) -> dict[str, Any]:
    """Format 4 → 5: an empty title block (the pumps' sources are optional and stay unknown).

    >>> v4_to_v5({"version": 4})["title_block"]
    {'site': '', 'revision': '', 'date': '', 'prepared_by': '', 'checked_by': ''}
    """
    upgraded = dict(data)
    upgraded.setdefault("title_block", {"site": "", "revision": "", "date": "", "prepared_by": "", "checked_by": ""})
    return upgraded
