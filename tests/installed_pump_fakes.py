"""Invented pumps installed beside a sample's arrangement, for the tests of the installed-pump views.

``JP40`` is an invented small assist pump (demo data, no real product): shut-off head 84 m at
2900 rpm, best efficiency near 15 L/s.  Beside the hilltop sample's BP80 (shut-off 103 m)
it is the weaker pump: at the sample's maximum static head the stronger pump holds the
manifold near 83 m and pushes it back towards shut-off.  ``weak_jp40`` is the same curve
lowered by 8 m, below that manifold head: its check valve stays shut.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

from hydraulics.model import InstalledPump, Project, PumpModel
from hydraulics.project_io import load_project, save_project

ROOT = Path(__file__).resolve().parent.parent
HILLTOP = ROOT / "sample_projects" / "hilltop_booster.pumpsketch.json"

_FLOWS_L_S = (0.0, 5.0, 10.0, 15.0, 20.0, 25.0)
_HEADS_M = (84.0, 83.0, 80.5, 76.5, 71.0, 64.0)
_EFFICIENCY = (0.0, 0.40, 0.60, 0.68, 0.66, 0.58)


def jp40(head_offset_m: float = 0.0, pump_id: str = "JP40") -> PumpModel:
    """The invented JP40 assist pump, its heads moved by ``head_offset_m``."""
    return PumpModel(pump_id, f"{pump_id} jockey (invented)", 2900.0, tuple(q / 1000.0 for q in _FLOWS_L_S),
                     tuple(h + head_offset_m for h in _HEADS_M), _EFFICIENCY,
                     notes="INVENTED test pump, not a real product.")


def hilltop() -> Project:
    return load_project(HILLTOP)


def with_model(project: Project, pump: PumpModel) -> Project:
    """``project`` with one more pump model (the arrangement unchanged)."""
    return replace(project, pumps=project.pumps + (pump,))


def with_assist(project: Project, pump: PumpModel, role: str = "assist") -> Project:
    """``project`` with ``pump`` as a model and installed beside the arrangement's pumps in ``role``."""
    return replace(with_model(project, pump), other_pumps=project.other_pumps + (InstalledPump(pump.pump_id, role),))


def write(project: Project, path: Path) -> Path:
    save_project(project, path)
    return path
