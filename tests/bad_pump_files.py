"""A project file whose pump has impossible curve points, shared by the file, command-line and window tests.

The hilltop sample with its pump's points written inline, then point 3 (index 2) given a
head of −5 m and an efficiency of 150 %.  The expected refusal is the range of the pump
head in the engine's one table of limits (``hydraulics.validation.LIMITS["pump.head_m"]``:
0 to 3000 m); the head is checked before the efficiency, so the head is what is named.
"""

from __future__ import annotations

import json
from pathlib import Path

from hydraulics.project_io import load_project, project_to_dict

SAMPLE = Path(__file__).resolve().parent.parent / "sample_projects" / "hilltop_booster.pumpsketch.json"

BAD_FIELD = "pumps[0].points[2].head_m"
BAD_PROBLEM = "pump head must be between 0 and 3000 m; got -5"
"""The words of LIMITS["pump.head_m"] (hydraulics/validation.py) for a head of −5 m."""


def bad_pump_dict() -> dict:
    """The sample as a dictionary, its pump's point 3 at −5 m head and 150 % efficiency."""
    data = project_to_dict(load_project(SAMPLE))
    points = data["pumps"][0]["points"]
    points["head"]["values"][2] = -5.0
    points["efficiency"]["values"][2] = 1.5  # stored as a fraction: 150 %
    return data


def write_bad_pump_project(folder: Path) -> Path:
    """Write :func:`bad_pump_dict` as a project file in ``folder``; return its path."""
    path = Path(folder) / "bad_pump.pumpsketch.json"
    path.write_text(json.dumps(bad_pump_dict(), indent=1), encoding="utf-8")
    return path
