"""Table models of the editing panels: each a QAbstractTableModel over one list of the project."""

from app.table_models.base import Column, ProjectTableModel
from app.table_models.fittings import FittingsModel
from app.table_models.installed_pumps import InstalledPumpsModel
from app.table_models.profile import ProfileModel
from app.table_models.pump_points import PumpPointsModel
from app.table_models.segments import SegmentsModel

__all__ = ["Column", "ProjectTableModel", "SegmentsModel", "FittingsModel", "PumpPointsModel", "ProfileModel",
           "InstalledPumpsModel"]
