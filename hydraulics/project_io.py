"""Project files: reading, writing and migrating ``*.pumpsketch.json``.

The format is documented in ``sample_projects/README.md``.  In short: a JSON object with
``"format": "pumpsketch-project"`` and an integer ``"version"``; every quantity is an
object ``{"value": number, "unit": "text"}`` whose unit any pint unit of the right
dimension may be (the writer always uses SI, so save → load is lossless).

Reading is all-or-nothing: the file is parsed, converted and validated into a new
:class:`~hydraulics.model.Project`; the first problem raises one
:class:`ProjectFileError` naming the field path (``segments[2].length``) and the
problem, and nothing is returned half-built.  Writing is atomic: a temporary file in the
same folder is written, flushed, synced and then renamed over the target, so a failed
save leaves the old file whole.
"""

from __future__ import annotations

import json
import math
import os
import shutil
import tempfile
from collections.abc import Mapping
from dataclasses import replace
from pathlib import Path
from typing import Any

from hydraulics import units
from hydraulics.bounded_read import BoundedReadError, read_text_file
from hydraulics.format_migrations import MigrationError, migrate
from hydraulics.input_excerpt import quote_input
from hydraulics.model import (
    Arrangement,
    Carries,
    ControlStrategy,
    Criteria,
    DutyBand,
    DutyProfile,
    EnergyInputs,
    Fitting,
    FrictionMethod,
    InstalledPump,
    ModelError,
    PipeState,
    PressurisedDelivery,
    ProfilePoint,
    Project,
    PumpModel,
    PumpRole,
    Segment,
    Side,
    Site,
    TankDelivery,
    TimeBasis,
    TitleBlock,
    UserFluid,
    WaterFluid,
)
from hydraulics.validation import (
    MAX_FITTINGS_PER_SEGMENT,
    MAX_INTEGER_DIGITS,
    MAX_JSON_NESTING,
    MAX_NOTES_CHARACTERS,
    MAX_PROFILE_POINTS,
    MAX_PROJECT_FILE_BYTES,
    MAX_PUMP_POINTS,
    MAX_PUMPS,
    MAX_SEGMENTS,
    require_at_most,
    validate_project,
)

FORMAT_NAME = "pumpsketch-project"
FORMAT_VERSION = 5
FILE_SUFFIX = ".pumpsketch.json"


class ProjectFileError(ValueError):
    """A project file that cannot be read: names the field path and the problem."""

    def __init__(self, field_path: str, problem: str, source: str = ""):
        self.field_path = field_path
        self.problem = problem
        self.source = source
        where = f"{source}: " if source else ""
        at = f"{field_path}: " if field_path else ""
        super().__init__(f"{where}{at}{problem}")


# =========================================================================== reading
class _Reader:
    """Walks the JSON tree, converting each value and remembering where it is."""

    def __init__(self, base_dir: Path | None, data_folders: tuple[Path, ...] = ()):
        self.base_dir = base_dir
        self.data_folders = data_folders

    # ---- primitive accessors -------------------------------------------------
    @staticmethod
    def obj(node: object, path: str, known: frozenset[str] | None = None) -> dict[str, object]:
        """``node`` as an object; with ``known``, refuse keys the format does not have.

        A misspelt key would otherwise be ignored silently and its value lost.
        """
        if not isinstance(node, dict):
            raise ProjectFileError(path, f"expected an object, got {_kind(node)}")
        if known is not None:
            for key in node:
                if key not in known:
                    raise ProjectFileError(_join(path, key), "unknown field (misspelt?); allowed: "
                                                             + ", ".join(sorted(known)))
        return node

    def get(self, node: Mapping[str, object], key: str, path: str) -> object:
        """The value at ``key``; a missing key or null is refused."""
        value = node.get(key)
        if value is None:
            raise ProjectFileError(_join(path, key), "is missing")
        return value

    def text(self, node: Mapping[str, object], key: str, path: str, default: str | None = None) -> str:
        value = node.get(key)
        if value is None:
            if default is None:
                raise ProjectFileError(_join(path, key), "is missing")
            return default
        if not isinstance(value, str):
            raise ProjectFileError(_join(path, key), f"expected text, got {_kind(value)}")
        return _bounded_text(value, _join(path, key))

    def optional_text(self, node: Mapping[str, object], key: str, path: str) -> str | None:
        value = node.get(key)
        if value is None:
            return None
        if not isinstance(value, str):
            raise ProjectFileError(_join(path, key), f"expected text or null, got {_kind(value)}")
        return _bounded_text(value, _join(path, key))

    def integer(self, node: Mapping[str, object], key: str, path: str, default: int | None = None) -> int:
        value = node.get(key)
        if value is None:
            if default is None:
                raise ProjectFileError(_join(path, key), "is missing")
            return default
        if isinstance(value, bool) or not isinstance(value, int):
            raise ProjectFileError(_join(path, key), f"expected a whole number, got {_kind(value)}")
        return value

    def number(self, node: Mapping[str, object], key: str, path: str, default: float | None = None) -> float:
        """A plain number; missing or null gives ``default``, or is refused when there is none."""
        value = node.get(key)
        if value is None:
            if default is None:
                raise ProjectFileError(_join(path, key), "is missing")
            return default
        return _finite(value, _join(path, key))

    def optional_number(self, node: Mapping[str, object], key: str, path: str) -> float | None:
        """A plain number, or None where the file leaves it out or gives null."""
        value = node.get(key)
        if value is None:
            return None
        return _finite(value, _join(path, key))

    @staticmethod
    def list_or_empty(node: Mapping[str, object], key: str, path: str) -> list[object]:
        """The list at ``key``; absent or null is an empty list, anything else (``{}``, ``""``) is refused."""
        value = node.get(key)
        if value is None:
            return []
        if not isinstance(value, list):
            raise ProjectFileError(_join(path, key), f"expected a list, got {_kind(value)}")
        return value

    @staticmethod
    def obj_or_empty(node: Mapping[str, object], key: str, path: str) -> object:
        """The object at ``key``; absent or null is an empty object, anything else is passed on to be refused."""
        value = node.get(key)
        return {} if value is None else value

    def boolean(self, node: Mapping[str, object], key: str, path: str, default: bool) -> bool:
        value = node.get(key)
        if value is None:
            return default
        if not isinstance(value, bool):
            raise ProjectFileError(_join(path, key), f"expected true or false, got {_kind(value)}")
        return value

    def quantity(self, node: Mapping[str, object], key: str, path: str, quantity: str,
                 default: float | None = None) -> float:
        """A ``{"value": v, "unit": u}`` object converted to the SI float.

        Missing or null gives ``default``, or is refused when there is none.
        """
        value = node.get(key)
        where = _join(path, key)
        if value is None:
            if default is None:
                raise ProjectFileError(where, "is missing")
            return default
        return _quantity_to_si(value, where, quantity)

    def optional_quantity(self, node: Mapping[str, object], key: str, path: str, quantity: str) -> float | None:
        """A quantity object converted to the SI float, or None where the file leaves it out."""
        value = node.get(key)
        if value is None:
            return None
        return _quantity_to_si(value, _join(path, key), quantity)

    def quantity_list(self, node: Mapping[str, object], key: str, path: str, quantity: str) -> tuple[float, ...]:
        value = node.get(key)
        where = _join(path, key)
        if value is None:
            return ()
        list_node = self.obj(value, where)
        unit = self.text(list_node, "unit", where)
        values = self.get(list_node, "values", where)
        if not isinstance(values, list):
            raise ProjectFileError(_join(where, "values"), f"expected a list of numbers, got {_kind(values)}")
        numbers = [_finite(v, f"{where}.values[{i}]") for i, v in enumerate(values)]
        factor, offset = _unit_factor(unit, quantity, _join(where, "unit"))
        return tuple(_finite_si(n * factor + offset, n, unit, f"{where}.values[{i}]") for i, n in enumerate(numbers))

    # ---- sections ----------------------------------------------------------
    def fluid(self, node: object, path: str = "fluid") -> WaterFluid | UserFluid:
        node = self.obj(node, path, frozenset({
            "kind", "temperature", "name", "density", "kinematic_viscosity", "vapour_pressure",
        }))
        kind = self.text(node, "kind", path)
        if kind == "water":
            return WaterFluid(temperature_c=self.quantity(node, "temperature", path, "temperature"))
        if kind == "user":
            return UserFluid(
                name=self.text(node, "name", path, default="user fluid"),
                density_kg_m3=self.quantity(node, "density", path, "density"),
                kinematic_viscosity_m2_s=self.quantity(node, "kinematic_viscosity", path, "kinematic_viscosity"),
                vapour_pressure_pa=self.quantity(node, "vapour_pressure", path, "pressure"),
                temperature_c=self.quantity(node, "temperature", path, "temperature", default=20.0),
            )
        raise ProjectFileError(_join(path, "kind"), f"must be 'water' or 'user', got {quote_input(kind)}")

    def site(self, node: object, path: str = "site") -> Site:
        node = self.obj(node, path, frozenset({
            "altitude", "atmospheric_pressure", "suction", "delivery", "pump_datum", "design_flow",
        }))
        suction = self.obj(self.get(node, "suction", path), _join(path, "suction"),
                           frozenset({"level_low", "level_high"}))
        spath = _join(path, "suction")
        delivery_node = self.obj(self.get(node, "delivery", path), _join(path, "delivery"),
                                 frozenset({"kind", "level_low", "level_high", "elevation", "pressure"}))
        dpath = _join(path, "delivery")
        kind = self.text(delivery_node, "kind", dpath)
        if kind == "tank":
            delivery: TankDelivery | PressurisedDelivery = TankDelivery(
                level_low_m=self.quantity(delivery_node, "level_low", dpath, "elevation"),
                level_high_m=self.quantity(delivery_node, "level_high", dpath, "elevation"),
            )
        elif kind == "pressurised":
            delivery = PressurisedDelivery(
                elevation_m=self.quantity(delivery_node, "elevation", dpath, "elevation"),
                pressure_pa=self.quantity(delivery_node, "pressure", dpath, "pressure"),
            )
        else:
            raise ProjectFileError(_join(dpath, "kind"), f"must be 'tank' or 'pressurised', got {quote_input(kind)}")
        return Site(
            suction_level_low_m=self.quantity(suction, "level_low", spath, "elevation"),
            suction_level_high_m=self.quantity(suction, "level_high", spath, "elevation"),
            delivery=delivery,
            pump_datum_m=self.quantity(node, "pump_datum", path, "elevation"),
            design_flow_m3_s=self.quantity(node, "design_flow", path, "flow"),
            altitude_m=self.quantity(node, "altitude", path, "elevation", default=0.0),
            atmospheric_pressure_pa=self.optional_quantity(node, "atmospheric_pressure", path, "pressure"),
        )

    def fitting(self, node: object, path: str) -> Fitting:
        node = self.obj(node, path, frozenset({"type", "count", "k_override", "angle_deg", "other_diameter"}))
        return Fitting(
            fitting_id=self.text(node, "type", path),
            count=self.integer(node, "count", path, default=1),
            k_override=self.optional_number(node, "k_override", path),
            angle_deg=self.optional_number(node, "angle_deg", path),
            other_diameter_m=self.optional_quantity(node, "other_diameter", path, "diameter"),
        )

    def profile_point(self, node: object, path: str) -> ProfilePoint:
        node = self.obj(node, path, frozenset({"chainage", "elevation", "air_valve"}))
        return ProfilePoint(
            chainage_m=self.quantity(node, "chainage", path, "length"),
            elevation_m=self.quantity(node, "elevation", path, "elevation"),
            air_valve=self.boolean(node, "air_valve", path, default=False),
        )

    def segment(self, node: object, path: str) -> Segment:
        node = self.obj(node, path, frozenset({
            "name", "side", "material", "pipe_series", "nominal_size", "internal_diameter", "length",
            "start_elevation", "end_elevation", "parallel_pipes", "roughness_new", "roughness_aged",
            "hw_c_new", "hw_c_aged", "fittings", "carries",
        }))
        series_id = self.optional_text(node, "pipe_series", path)
        nominal = self.optional_text(node, "nominal_size", path)
        if (series_id is None) != (nominal is None):
            raise ProjectFileError(path, "give both pipe_series and nominal_size, or neither")
        if series_id is None or nominal is None:
            diameter = self.quantity(node, "internal_diameter", path, "diameter")
        else:
            self.optional_quantity(node, "internal_diameter", path, "diameter")  # a stored bore must still be valid
            diameter = _catalogue_diameter(series_id, nominal, path)
        fittings_node = self.list_or_empty(node, "fittings", path)
        side = _side(self.text(node, "side", path), _join(path, "side"))
        carries = _carries(self.text(node, "carries", path), _join(path, "carries"))
        return Segment(
            name=self.text(node, "name", path),
            side=side,
            material_id=self.text(node, "material", path),
            length_m=self.quantity(node, "length", path, "length"),
            internal_diameter_m=diameter,
            pipe_series=series_id,
            nominal_size=nominal,
            start_elevation_m=self.optional_quantity(node, "start_elevation", path, "elevation"),
            end_elevation_m=self.optional_quantity(node, "end_elevation", path, "elevation"),
            parallel_pipes=self.integer(node, "parallel_pipes", path, default=1),
            fittings=tuple(self.fitting(f, f"{path}.fittings[{j}]") for j, f in enumerate(fittings_node)),
            roughness_new_m=self.optional_quantity(node, "roughness_new", path, "roughness"),
            roughness_aged_m=self.optional_quantity(node, "roughness_aged", path, "roughness"),
            hw_c_new=self.optional_number(node, "hw_c_new", path),
            hw_c_aged=self.optional_number(node, "hw_c_aged", path),
            carries=carries,
        )

    def pump(self, node: object, path: str) -> PumpModel:
        node = self.obj(node, path, frozenset({
            "id", "name", "rated_speed", "impeller_diameter", "fit_orders", "notes", "points", "source_csv",
            "source",
        }))
        pump_id = self.text(node, "id", path)
        name = self.text(node, "name", path, default=pump_id)
        rated_speed = self.optional_quantity(node, "rated_speed", path, "speed")
        orders = self.obj(self.obj_or_empty(node, "fit_orders", path), _join(path, "fit_orders"),
                          frozenset({"head", "efficiency", "power"}))
        opath = _join(path, "fit_orders")
        points_node = node.get("points")
        source_csv = self.optional_text(node, "source_csv", path)
        if points_node is not None:
            ppath = _join(path, "points")
            points = self.obj(points_node, ppath,
                              frozenset({"flow", "head", "efficiency", "shaft_power", "npsh_required"}))
            columns = {
                "flow_m3_s": self.quantity_list(points, "flow", ppath, "flow"),
                "head_m": self.quantity_list(points, "head", ppath, "head"),
                "efficiency": self.quantity_list(points, "efficiency", ppath, "dimensionless"),
                "shaft_power_w": self.quantity_list(points, "shaft_power", ppath, "power"),
                "npsh_required_m": self.quantity_list(points, "npsh_required", ppath, "head"),
            }
            pump = PumpModel(
                pump_id=pump_id, name=name,
                rated_speed_rpm=rated_speed if rated_speed is not None else 1450.0,
                impeller_diameter_m=self.optional_quantity(node, "impeller_diameter", path, "diameter"),
                head_fit_order=self.integer(orders, "head", opath, default=2),
                efficiency_fit_order=self.integer(orders, "efficiency", opath, default=2),
                power_fit_order=self.integer(orders, "power", opath, default=2),
                notes=self.text(node, "notes", path, default=""),
                flow_m3_s=columns["flow_m3_s"], head_m=columns["head_m"], efficiency=columns["efficiency"],
                shaft_power_w=columns["shaft_power_w"], npsh_required_m=columns["npsh_required_m"],
            )
            pump = replace(pump, **self.pump_source(node.get("source"), _join(path, "source")))
        elif source_csv is not None:
            pump = self._pump_from_csv(source_csv, pump_id, name, rated_speed, _join(path, "source_csv"))
            impeller = self.optional_quantity(node, "impeller_diameter", path, "diameter")
            pump = replace(
                pump,
                head_fit_order=self.integer(orders, "head", opath, default=pump.head_fit_order),
                efficiency_fit_order=self.integer(orders, "efficiency", opath, default=pump.efficiency_fit_order),
                power_fit_order=self.integer(orders, "power", opath, default=pump.power_fit_order),
                impeller_diameter_m=pump.impeller_diameter_m if impeller is None else impeller,
                notes=self.text(node, "notes", path, default=pump.notes),
            )
        else:
            raise ProjectFileError(path, "a pump needs 'points' or 'source_csv'")
        return pump  # its points are checked with the whole project (validation.validate_project)

    def pump_source(self, node: object, path: str) -> dict[str, Any]:
        """``source_file`` and ``source_comments`` of a pump from its ``"source"`` object (absent: unknown)."""
        if node is None:
            return {}
        node = self.obj(node, path, frozenset({"file", "comments"}))
        comments = node.get("comments")
        comments = [] if comments is None else comments
        if not isinstance(comments, list) or not all(isinstance(c, str) for c in comments):
            raise ProjectFileError(_join(path, "comments"), "expected a list of text lines")
        return {"source_file": self.text(node, "file", path, default=""), "source_comments": tuple(comments)}

    def title_block(self, node: object, path: str = "title_block") -> TitleBlock:
        node = self.obj(node, path, frozenset({"site", "revision", "date", "prepared_by", "checked_by"}))
        return TitleBlock(**{key: self.text(node, key, path, default="")
                             for key in ("site", "revision", "date", "prepared_by", "checked_by")})

    def _pump_from_csv(self, relative: str, pump_id: str, name: str, rated_speed: float | None,
                       path: str) -> PumpModel:
        from hydraulics.pump_csv import PumpCsvError, read_pump_csv

        csv_path = self._allowed_csv_path(relative, path)
        try:
            return read_pump_csv(csv_path, pump_id=pump_id, name=name, rated_speed_rpm=rated_speed)
        except FileNotFoundError:
            raise ProjectFileError(path, f"pump data file not found: {quote_input(relative)}") from None
        except PumpCsvError as exc:
            if not exc.quotes_content:
                raise ProjectFileError(path, f"pump data file {quote_input(relative)}: {exc.problem}") from None
            # Where the problem is, not what the file holds: a refusal never shows the file's content.
            where = ", ".join(part for part in (
                f"line {exc.line}" if exc.line is not None else "",
                f"column {exc.column}" + (f" ({exc.column_name})" if exc.column_name else "")
                if exc.column is not None else "") if part)
            raise ProjectFileError(path, f"pump data file {quote_input(relative)} is not valid pump data"
                                         + (f" at {where}" if where else "")
                                         + "; `pumpsketch import-pump FILE` shows the problem in detail") from None
        except (OSError, ValueError) as exc:
            reason = exc.strerror if isinstance(exc, OSError) and exc.strerror else type(exc).__name__
            raise ProjectFileError(path, f"pump data file {quote_input(relative)} cannot be read ({reason})") from None

    def _allowed_csv_path(self, relative: str, path: str) -> Path:
        """The pump data file named by ``source_csv``, resolved inside the project's folder or a chosen folder.

        Links and ``..`` are resolved first, so a path may not leave those folders by either; the
        file must be a ``.csv`` file.  Anything else is refused without opening the file.
        """
        if "\x00" in relative:
            raise ProjectFileError(path, "a file name cannot contain a NUL character")
        folders = tuple(f.resolve() for f in ((self.base_dir,) if self.base_dir is not None else ())
                        + self.data_folders)
        given = Path(relative)
        if not given.is_absolute():
            if self.base_dir is None:
                raise ProjectFileError(path, "a pump data file is named relative to the project's folder, "
                                             "and this project has no folder (save it first)")
            given = self.base_dir / given
        try:
            resolved = given.resolve()
        except (OSError, RuntimeError):
            raise ProjectFileError(path, f"pump data file {quote_input(relative)} cannot be resolved") from None
        if not any(resolved.is_relative_to(folder) for folder in folders):
            raise ProjectFileError(path, f"pump data file {quote_input(relative)} is outside the project's folder; "
                                         "keep pump data files in the project's folder (or one below it)")
        if resolved.suffix.lower() != ".csv":
            raise ProjectFileError(path, f"pump data file {quote_input(relative)} is not a .csv file")
        return resolved

    def arrangement(self, node: object, path: str = "arrangement") -> Arrangement:
        node = self.obj(node, path, frozenset({
            "pump", "duty_count", "standby_count", "series_stages", "speed_ratio", "trim_ratio",
            "min_speed_ratio", "max_speed_ratio", "motor_efficiency", "drive_efficiency",
            "variable_speed", "motor_rating", "service_factor",
        }))
        speed = self.number(node, "speed_ratio", path, default=1.0)
        return Arrangement(
            pump_id=self.text(node, "pump", path),
            duty_count=self.integer(node, "duty_count", path, default=1),
            standby_count=self.integer(node, "standby_count", path, default=0),
            series_stages=self.integer(node, "series_stages", path, default=1),
            speed_ratio=speed,
            trim_ratio=self.number(node, "trim_ratio", path, default=1.0),
            min_speed_ratio=self.number(node, "min_speed_ratio", path, default=speed),
            max_speed_ratio=self.number(node, "max_speed_ratio", path, default=speed),
            motor_efficiency=self.number(node, "motor_efficiency", path, default=0.95),
            drive_efficiency=self.number(node, "drive_efficiency", path, default=1.0),
            variable_speed=self.boolean(node, "variable_speed", path, default=False),
            motor_rating_w=self.optional_quantity(node, "motor_rating", path, "power"),
            service_factor=self.number(node, "service_factor", path, default=1.0),
        )

    def other_pump(self, node: object, path: str) -> InstalledPump:
        node = self.obj(node, path, frozenset({
            "pump", "role", "variable_speed", "speed_ratio", "min_speed_ratio", "trim_ratio",
            "motor_efficiency", "drive_efficiency", "motor_rating", "service_factor",
        }))
        speed = self.number(node, "speed_ratio", path, default=1.0)
        role: PumpRole = _choice(self.text(node, "role", path, default="assist"), ("duty", "assist", "standby"),
                                 f"{path}.role")
        return InstalledPump(
            pump_id=self.text(node, "pump", path),
            role=role,
            variable_speed=self.boolean(node, "variable_speed", path, default=False),
            speed_ratio=speed,
            min_speed_ratio=self.number(node, "min_speed_ratio", path, default=speed),
            trim_ratio=self.number(node, "trim_ratio", path, default=1.0),
            motor_efficiency=self.number(node, "motor_efficiency", path, default=0.95),
            drive_efficiency=self.number(node, "drive_efficiency", path, default=1.0),
            motor_rating_w=self.optional_quantity(node, "motor_rating", path, "power"),
            service_factor=self.number(node, "service_factor", path, default=1.0),
        )

    def duty_profile(self, node: object, path: str = "duty_profile") -> DutyProfile:
        node = self.obj(node, path, frozenset({"bands", "time_basis", "annual_volume", "strategy", "pipe"}))
        basis: TimeBasis = _choice(self.text(node, "time_basis", path, default="hours"), ("hours", "share"),
                                   f"{path}.time_basis")
        bands_node = self.list_or_empty(node, "bands", path)
        bands = []
        for i, band in enumerate(bands_node):
            bpath = f"{path}.bands[{i}]"
            band = self.obj(band, bpath, frozenset({"flow", "hours", "share"}))
            key = "hours" if basis == "hours" else "share"
            other = "share" if basis == "hours" else "hours"
            if other in band:
                raise ProjectFileError(f"{bpath}.{other}", f"the profile's time basis is {basis!r}: give {key!r}")
            bands.append(DutyBand(flow_m3_s=self.quantity(band, "flow", bpath, "flow"),
                                  time=self.number(band, key, bpath)))
        strategy: ControlStrategy = _choice(self.text(node, "strategy", path, default="fixed_staging"),
                                            ("fixed_staging", "variable_speed"), f"{path}.strategy")
        pipe: PipeState = _choice(self.text(node, "pipe", path, default="aged"), ("new", "aged"), f"{path}.pipe")
        return DutyProfile(bands=tuple(bands), time_basis=basis, strategy=strategy, pipe=pipe,
                           annual_volume_m3=self.optional_quantity(node, "annual_volume", path, "volume"))

    def criteria(self, node: object, path: str = "criteria") -> Criteria:
        node = self.obj(node, path, frozenset({
            "suction_velocity_min", "suction_velocity_max", "delivery_velocity_min", "delivery_velocity_max",
            "sewage", "sewage_velocity_min", "npsh_margin_ratio", "npsh_margin_min",
            "preferred_region_low", "preferred_region_high", "allowable_region_low", "allowable_region_high",
            "trim_warning_limit",
        }))
        d = Criteria()
        q = self.quantity
        return Criteria(
            suction_velocity_min_m_s=q(node, "suction_velocity_min", path, "velocity",
                                       default=d.suction_velocity_min_m_s),
            suction_velocity_max_m_s=q(node, "suction_velocity_max", path, "velocity",
                                       default=d.suction_velocity_max_m_s),
            delivery_velocity_min_m_s=q(node, "delivery_velocity_min", path, "velocity",
                                        default=d.delivery_velocity_min_m_s),
            delivery_velocity_max_m_s=q(node, "delivery_velocity_max", path, "velocity",
                                        default=d.delivery_velocity_max_m_s),
            sewage=self.boolean(node, "sewage", path, default=d.sewage),
            sewage_velocity_min_m_s=q(node, "sewage_velocity_min", path, "velocity",
                                      default=d.sewage_velocity_min_m_s),
            npsh_margin_ratio=self.number(node, "npsh_margin_ratio", path, default=d.npsh_margin_ratio),
            npsh_margin_min_m=q(node, "npsh_margin_min", path, "head", default=d.npsh_margin_min_m),
            preferred_region_low=self.number(node, "preferred_region_low", path, default=d.preferred_region_low),
            preferred_region_high=self.number(node, "preferred_region_high", path, default=d.preferred_region_high),
            allowable_region_low=self.number(node, "allowable_region_low", path, default=d.allowable_region_low),
            allowable_region_high=self.number(node, "allowable_region_high", path, default=d.allowable_region_high),
            trim_warning_limit=self.number(node, "trim_warning_limit", path, default=d.trim_warning_limit),
        )

    def energy(self, node: object, path: str = "energy") -> EnergyInputs:
        node = self.obj(node, path,
                        frozenset({"operating_hours_per_year", "annual_volume", "tariff_per_kwh", "currency"}))
        return EnergyInputs(
            operating_hours_per_year=self.optional_number(node, "operating_hours_per_year", path),
            annual_volume_m3=self.optional_quantity(node, "annual_volume", path, "volume"),
            tariff_per_kwh=self.number(node, "tariff_per_kwh", path, default=EnergyInputs().tariff_per_kwh),
            currency=self.text(node, "currency", path, default=EnergyInputs().currency),
        )

    def project(self, data: object) -> Project:
        root = self.obj(data, "(file)", frozenset({
            "format", "version", "name", "notes", "fluid", "site", "friction_method", "segments", "pumps",
            "arrangement", "criteria", "energy", "flow_grid_max_factor", "profile", "other_pumps", "duty_profile",
            "title_block",
        }))
        fmt = root.get("format")
        if fmt != FORMAT_NAME:
            raise ProjectFileError("format",
                                   f"not a PumpSketch project (expected {FORMAT_NAME!r}, got {quote_input(fmt)})")
        version = root.get("version")
        if isinstance(version, bool) or not isinstance(version, int):
            raise ProjectFileError("version", f"expected a whole number, got {_kind(version)}")
        if version > FORMAT_VERSION:
            raise ProjectFileError(
                "version",
                f"this file is format version {version}, newer than this program reads "
                f"(up to {FORMAT_VERSION}); open it with a newer PumpSketch",
            )
        if version < 1:
            raise ProjectFileError("version", f"unknown format version {version}")
        segments_node = self.get(root, "segments", "")
        if not isinstance(segments_node, list):
            raise ProjectFileError("segments", f"expected a list, got {_kind(segments_node)}")
        pumps_node = self.list_or_empty(root, "pumps", "")
        method = _friction_method(self.text(root, "friction_method", "", default="darcy_weisbach"), "friction_method")
        arrangement_node = root.get("arrangement")
        profile_node = self.get(root, "profile", "")
        if not isinstance(profile_node, list):
            raise ProjectFileError("profile", f"expected a list, got {_kind(profile_node)}")
        others_node = self.list_or_empty(root, "other_pumps", "")
        return Project(
            name=self.text(root, "name", "", default="Untitled"),
            notes=self.text(root, "notes", "", default=""),
            fluid=self.fluid(self.get(root, "fluid", "")),
            site=self.site(self.get(root, "site", "")),
            segments=tuple(self.segment(s, f"segments[{i}]") for i, s in enumerate(segments_node)),
            friction_method=method,
            pumps=tuple(self.pump(p, f"pumps[{i}]") for i, p in enumerate(pumps_node)),
            arrangement=None if arrangement_node is None else self.arrangement(arrangement_node),
            criteria=self.criteria(self.obj_or_empty(root, "criteria", "")),
            energy=self.energy(self.obj_or_empty(root, "energy", "")),
            flow_grid_max_factor=self.number(root, "flow_grid_max_factor", "", default=1.6),
            profile=tuple(self.profile_point(p, f"profile[{i}]") for i, p in enumerate(profile_node)),
            other_pumps=tuple(self.other_pump(p, f"other_pumps[{i}]") for i, p in enumerate(others_node)),
            duty_profile=self.duty_profile(self.obj_or_empty(root, "duty_profile", "")),
            title_block=self.title_block(self.obj_or_empty(root, "title_block", "")),
        )


def _choice(text: str, allowed: tuple[str, ...], path: str) -> Any:
    """``text`` when it is one of ``allowed`` (typed by the caller's annotation), else a clear refusal."""
    if text in allowed:
        return text
    names = ", ".join(repr(a) for a in allowed[:-1]) + f" or {allowed[-1]!r}"
    raise ProjectFileError(path, f"must be {names}, got {quote_input(text)}")


def _side(text: str, path: str) -> Side:
    if text == "suction":
        return "suction"
    if text == "delivery":
        return "delivery"
    raise ProjectFileError(path, f"must be 'suction' or 'delivery', got {quote_input(text)}")


def _carries(text: str, path: str) -> Carries:
    if text == "pump":
        return "pump"
    if text == "station":
        return "station"
    raise ProjectFileError(path, f"must be 'pump' or 'station', got {quote_input(text)}")


def _friction_method(text: str, path: str) -> FrictionMethod:
    if text == "darcy_weisbach":
        return "darcy_weisbach"
    if text == "hazen_williams":
        return "hazen_williams"
    raise ProjectFileError(path, f"must be 'darcy_weisbach' or 'hazen_williams', got {quote_input(text)}")


def _bounded_text(value: str, path: str) -> str:
    """Text of a file no longer than the longest field allows (notes); the exact limits are the model's rules."""
    if len(value) > MAX_NOTES_CHARACTERS:
        raise ProjectFileError(path, f"at most {MAX_NOTES_CHARACTERS} characters are allowed; it has {len(value)}")
    return value


def _join(path: str, key: str) -> str:
    return f"{path}.{key}" if path else key


def _kind(value: object) -> str:
    if value is None:
        return "null"
    if isinstance(value, bool):
        return "true/false"
    if isinstance(value, (int, float)):
        return f"the number {quote_input(value)}"
    if isinstance(value, str):
        return f"the text {quote_input(value)}"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, dict):
        return "an object"
    return type(value).__name__


def _finite(value: object, path: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ProjectFileError(path, f"expected a number, got {_kind(value)}")
    number = float(value)
    if not math.isfinite(number):
        raise ProjectFileError(path, "must be a finite number")
    return number


_FACTOR_CACHE: dict[tuple[str, str], tuple[float, float]] = {}


FILE_UNITS: dict[str, str] = {
    "flow": "m3/s", "head": "m", "length": "m", "elevation": "m", "diameter": "m", "roughness": "m",
    "velocity": "m/s", "pressure": "Pa", "power": "W", "temperature": "degC", "density": "kg/m3",
    "kinematic_viscosity": "m2/s", "volume": "m3", "speed": "rpm", "dimensionless": "1",
}
"""The unit the writer uses for each quantity (SI; °C and rpm as stored in the model)."""


def _file_unit(quantity: str) -> str:
    return FILE_UNITS[quantity]


def _unit_factor(unit: str, quantity: str, path: str) -> tuple[float, float]:
    """``(factor, offset)`` so that ``si = value * factor + offset`` for ``unit``."""
    key = (unit, quantity)
    if key not in _FACTOR_CACHE:
        try:
            zero = float(units.convert_to_si(0.0, quantity, unit))
            one = float(units.convert_to_si(1.0, quantity, unit))
        except Exception:  # noqa: BLE001 - pint raises several error types for unknown or wrong units
            expected = FILE_UNITS[quantity]
            raise ProjectFileError(path, f"{quote_input(unit)} is not a unit of {quantity.replace('_', ' ')} "
                                         f"(for example {expected!r})") from None
        _FACTOR_CACHE[key] = (one - zero, zero)
    return _FACTOR_CACHE[key]


def _quantity_to_si(node: object, path: str, quantity: str) -> float:
    if not isinstance(node, dict):
        raise ProjectFileError(path, f'expected {{"value": number, "unit": text}}, got {_kind(node)}')
    if "value" not in node:
        raise ProjectFileError(f"{path}.value", "is missing")
    value = _finite(node["value"], f"{path}.value")
    unit = node.get("unit")
    if not isinstance(unit, str):
        raise ProjectFileError(f"{path}.unit", f"expected a unit as text, got {_kind(unit)}")
    if unit == _file_unit(quantity):
        return value
    factor, offset = _unit_factor(unit, quantity, f"{path}.unit")
    return _finite_si(value * factor + offset, value, unit, f"{path}.value")


def _finite_si(si: float, value: float, unit: str, path: str) -> float:
    """A converted value; one that overflows to infinity through its unit is refused (it could not be saved)."""
    if not math.isfinite(si):
        raise ProjectFileError(path, f"{value:g} {quote_input(unit)} is too large: it is not a finite number in SI "
                                     "units")
    return si


def _catalogue_diameter(series_id: str, nominal: str, path: str) -> float:
    from hydraulics.catalogue import series

    try:
        return series(series_id).size(nominal).internal_diameter_m
    except ModelError as exc:
        field = exc.field_path if exc.field_path in ("pipe_series", "nominal_size") else "nominal_size"
        raise ProjectFileError(_join(path, field), exc.problem) from None


class _LongInteger:
    """A whole number of the file with more than MAX_INTEGER_DIGITS digits, kept as its digit count.

    Converting it would be slow (or refused by Python's limit on digits) and no range of the
    format holds it; :func:`_check_tree` refuses it with its field path.
    """

    def __init__(self, digits: int):
        self.digits = digits


class _NonFiniteConstant:
    """``NaN``, ``Infinity`` or ``-Infinity`` in a file: not JSON, and never a value of a project."""

    def __init__(self, name: str):
        self.name = name


class _DuplicateKeys(dict[str, object]):
    """An object of the file in which a key appears twice (the first repeated key is remembered)."""

    duplicate = ""


def _integer(text: str) -> int | _LongInteger:
    digits = len(text.lstrip("-"))
    return _LongInteger(digits) if digits > MAX_INTEGER_DIGITS else int(text)


def _object(pairs: list[tuple[str, object]]) -> dict[str, object]:
    result = dict(pairs)
    if len(result) == len(pairs):
        return result
    seen: set[str] = set()
    duplicated = _DuplicateKeys(result)
    for key, _ in pairs:
        if key in seen:
            duplicated.duplicate = key
            break
        seen.add(key)
    return duplicated


def parse_project_json(text: str, source: str = "") -> object:
    """The parsed JSON of a project file's text, or :class:`ProjectFileError` with the line and column.

    Whole numbers longer than :data:`~hydraulics.validation.MAX_INTEGER_DIGITS`, ``NaN`` and
    ``Infinity`` and repeated keys are kept as markers, refused with their field path by
    :func:`project_from_dict`.
    """
    try:
        return json.loads(text, parse_int=_integer, parse_constant=_NonFiniteConstant,
                          object_pairs_hook=_object)
    except json.JSONDecodeError as exc:
        raise ProjectFileError(
            "", f"not valid JSON (line {exc.lineno}, column {exc.colno}: {exc.msg}); the file may be truncated",
            source,
        ) from None
    except RecursionError:
        raise ProjectFileError("", f"objects and lists are nested too deeply (at most {MAX_JSON_NESTING} levels)",
                               source) from None


def _check_tree(data: object) -> None:
    """Refuse, with the field path, what the reader must never see: too deep a nesting, a repeated key,
    a whole number too long, NaN or infinity.  Iterative: a deep file cannot exhaust the stack."""
    stack: list[tuple[object, str, int]] = [(data, "", 0)]
    while stack:
        node, path, depth = stack.pop()
        if depth > MAX_JSON_NESTING:
            raise ProjectFileError(path, f"nested too deeply (at most {MAX_JSON_NESTING} levels of objects and lists)")
        if isinstance(node, dict):
            if isinstance(node, _DuplicateKeys):
                raise ProjectFileError(_join(path, node.duplicate),
                                       "this key appears twice in the same object; keep one")
            stack.extend((value, _join(path, str(key)), depth + 1) for key, value in node.items())
        elif isinstance(node, list):
            stack.extend((value, f"{path}[{i}]", depth + 1) for i, value in enumerate(node))
        elif isinstance(node, _LongInteger):
            raise ProjectFileError(path, f"a whole number of {node.digits} digits; a number in a project file has "
                                         f"at most {MAX_INTEGER_DIGITS} digits")
        elif isinstance(node, _NonFiniteConstant):
            raise ProjectFileError(path, f"{node.name} is not a number of a project; give a finite number")
        elif isinstance(node, float) and not math.isfinite(node):
            raise ProjectFileError(path, "must be a finite number (too large a number?)")
        elif isinstance(node, int) and not isinstance(node, bool) and abs(node) >= 10 ** MAX_INTEGER_DIGITS:
            raise ProjectFileError(path, f"a whole number of {quote_input(node)}; at most {MAX_INTEGER_DIGITS} "
                                         "digits are allowed")


def _check_counts(data: object) -> None:
    """The counts of the file within the size limits, before any value is converted."""
    if not isinstance(data, dict):
        return
    counted: list[tuple[object, int, str, str]] = [
        (data.get("segments"), MAX_SEGMENTS, "pipe segments", "segments"),
        (data.get("pumps"), MAX_PUMPS, "pumps", "pumps"),
        (data.get("profile"), MAX_PROFILE_POINTS, "profile points", "profile"),
    ]
    for i, segment in enumerate(data.get("segments") or ()) if isinstance(data.get("segments"), list) else ():
        if isinstance(segment, dict):
            counted.append((segment.get("fittings"), MAX_FITTINGS_PER_SEGMENT, "fitting rows in a segment",
                            f"segments[{i}].fittings"))
    for i, pump in enumerate(data.get("pumps") or ()) if isinstance(data.get("pumps"), list) else ():
        points = pump.get("points") if isinstance(pump, dict) else None
        for key, column in points.items() if isinstance(points, dict) else ():
            values = column.get("values") if isinstance(column, dict) else None
            counted.append((values, MAX_PUMP_POINTS, "points in a pump curve", f"pumps[{i}].points.{key}.values"))
    for value, limit, what, path in counted:
        if isinstance(value, list):
            try:
                require_at_most(len(value), limit, what, path)
            except ModelError as exc:
                raise ProjectFileError(exc.field_path, exc.problem) from None


def project_from_dict(data: object, source: str = "", base_dir: Path | None = None,
                      data_folders: tuple[Path, ...] = ()) -> Project:
    """Build a validated :class:`Project` from parsed JSON, or raise ProjectFileError.

    A file of an older format version is first brought up to :data:`FORMAT_VERSION` by the
    registered migrations (:mod:`hydraulics.format_migrations`); the caller's ``data`` is not
    changed.  Before any of that the tree is checked (nesting, repeated keys, long numbers) and
    the counts are held against the size limits of :mod:`hydraulics.validation`.

    A pump's ``source_csv`` is read only when it resolves to a ``.csv`` file inside ``base_dir``
    (the project's folder) or one of ``data_folders`` (folders the user chose for pump data).
    """
    try:
        _check_tree(data)
        _check_counts(data)
        if isinstance(data, dict) and data.get("format") == FORMAT_NAME:
            data = migrate(data, FORMAT_VERSION)
        project = _Reader(base_dir, data_folders).project(data)
        validate_project(project)
    except (ProjectFileError, MigrationError) as exc:
        raise ProjectFileError(exc.field_path, exc.problem, source) from None
    except ModelError as exc:
        raise ProjectFileError(exc.field_path, exc.problem, source) from None
    return project


def load_project(path: str | os.PathLike[str], data_folders: tuple[Path, ...] = ()) -> Project:
    """Read a project file; raise :class:`ProjectFileError` for any problem.

    The file is read by :func:`hydraulics.bounded_read.read_text_file`: a regular file of at most
    :data:`~hydraulics.validation.MAX_PROJECT_FILE_BYTES`, UTF-8 with or without a byte-order mark.
    ``data_folders`` are folders besides the project's own from which pump data files may be read.
    """
    path = Path(path)
    try:
        text = read_text_file(path, MAX_PROJECT_FILE_BYTES)
    except FileNotFoundError:
        raise ProjectFileError("", "file not found", str(path)) from None
    except BoundedReadError as exc:
        raise ProjectFileError("", f"cannot read the file ({exc.problem})", str(path)) from None
    except OSError as exc:
        raise ProjectFileError("", f"cannot read the file ({exc.strerror or type(exc).__name__})", str(path)) from None
    data = parse_project_json(text, str(path))
    return project_from_dict(data, source=str(path), base_dir=path.parent, data_folders=data_folders)


# =========================================================================== writing
def _q(value: float | None, quantity: str) -> dict[str, object] | None:
    if value is None:
        return None
    return {"value": float(value), "unit": _file_unit(quantity)}


def _qlist(values: tuple[float, ...], quantity: str) -> dict[str, object] | None:
    if not values:
        return None
    return {"unit": _file_unit(quantity), "values": [float(v) for v in values]}


def _drop_none(d: dict[str, object]) -> dict[str, object]:
    return {k: v for k, v in d.items() if v is not None}


def project_to_dict(project: Project) -> dict[str, object]:
    """The JSON-ready dictionary of ``project``, every quantity in SI."""
    fluid = project.fluid
    if isinstance(fluid, WaterFluid):
        fluid_d = {"kind": "water", "temperature": _q(fluid.temperature_c, "temperature")}
    else:
        fluid_d = {
            "kind": "user", "name": fluid.name,
            "density": _q(fluid.density_kg_m3, "density"),
            "kinematic_viscosity": _q(fluid.kinematic_viscosity_m2_s, "kinematic_viscosity"),
            "vapour_pressure": _q(fluid.vapour_pressure_pa, "pressure"),
            "temperature": _q(fluid.temperature_c, "temperature"),
        }
    site = project.site
    if isinstance(site.delivery, TankDelivery):
        delivery = {"kind": "tank", "level_low": _q(site.delivery.level_low_m, "elevation"),
                    "level_high": _q(site.delivery.level_high_m, "elevation")}
    else:
        delivery = {"kind": "pressurised", "elevation": _q(site.delivery.elevation_m, "elevation"),
                    "pressure": _q(site.delivery.pressure_pa, "pressure")}
    site_d = _drop_none({
        "altitude": _q(site.altitude_m, "elevation"),
        "atmospheric_pressure": _q(site.atmospheric_pressure_pa, "pressure"),
        "suction": {"level_low": _q(site.suction_level_low_m, "elevation"),
                    "level_high": _q(site.suction_level_high_m, "elevation")},
        "delivery": delivery,
        "pump_datum": _q(site.pump_datum_m, "elevation"),
        "design_flow": _q(site.design_flow_m3_s, "flow"),
    })
    segments = []
    for s in project.segments:
        segments.append(_drop_none({
            "name": s.name, "side": s.side, "carries": s.carries, "material": s.material_id,
            "pipe_series": s.pipe_series, "nominal_size": s.nominal_size,
            "internal_diameter": _q(s.internal_diameter_m, "diameter"),
            "length": _q(s.length_m, "length"),
            "start_elevation": _q(s.start_elevation_m, "elevation"),
            "end_elevation": _q(s.end_elevation_m, "elevation"),
            "parallel_pipes": s.parallel_pipes,
            "roughness_new": _q(s.roughness_new_m, "roughness"),
            "roughness_aged": _q(s.roughness_aged_m, "roughness"),
            "hw_c_new": s.hw_c_new, "hw_c_aged": s.hw_c_aged,
            "fittings": [_drop_none({"type": f.fitting_id, "count": f.count, "k_override": f.k_override,
                                     "angle_deg": f.angle_deg,
                                     "other_diameter": _q(f.other_diameter_m, "diameter")})
                         for f in s.fittings],
        }))
    pumps = []
    for p in project.pumps:
        pumps.append(_drop_none({
            "id": p.pump_id, "name": p.name,
            "rated_speed": _q(p.rated_speed_rpm, "speed"),
            "impeller_diameter": _q(p.impeller_diameter_m, "diameter"),
            "fit_orders": {"head": p.head_fit_order, "efficiency": p.efficiency_fit_order, "power": p.power_fit_order},
            "notes": p.notes or None,
            "source": {"file": p.source_file, "comments": list(p.source_comments)}
            if p.source_file or p.source_comments else None,
            "points": _drop_none({
                "flow": _qlist(p.flow_m3_s, "flow"),
                "head": _qlist(p.head_m, "head"),
                "efficiency": _qlist(p.efficiency, "dimensionless"),
                "shaft_power": _qlist(p.shaft_power_w, "power"),
                "npsh_required": _qlist(p.npsh_required_m, "head"),
            }),
        }))
    a = project.arrangement
    arrangement = None if a is None else {
        "pump": a.pump_id, "duty_count": a.duty_count, "standby_count": a.standby_count,
        "series_stages": a.series_stages, "speed_ratio": a.speed_ratio, "trim_ratio": a.trim_ratio,
        "min_speed_ratio": a.min_speed_ratio, "max_speed_ratio": a.max_speed_ratio,
        "motor_efficiency": a.motor_efficiency, "drive_efficiency": a.drive_efficiency,
        "variable_speed": a.variable_speed,
        "motor_rating": None if a.motor_rating_w is None else _q(a.motor_rating_w, "power"),
        "service_factor": a.service_factor,
    }
    c = project.criteria
    criteria = {
        "suction_velocity_min": _q(c.suction_velocity_min_m_s, "velocity"),
        "suction_velocity_max": _q(c.suction_velocity_max_m_s, "velocity"),
        "delivery_velocity_min": _q(c.delivery_velocity_min_m_s, "velocity"),
        "delivery_velocity_max": _q(c.delivery_velocity_max_m_s, "velocity"),
        "sewage": c.sewage,
        "sewage_velocity_min": _q(c.sewage_velocity_min_m_s, "velocity"),
        "npsh_margin_ratio": c.npsh_margin_ratio,
        "npsh_margin_min": _q(c.npsh_margin_min_m, "head"),
        "preferred_region_low": c.preferred_region_low, "preferred_region_high": c.preferred_region_high,
        "allowable_region_low": c.allowable_region_low, "allowable_region_high": c.allowable_region_high,
        "trim_warning_limit": c.trim_warning_limit,
    }
    e = project.energy
    energy = _drop_none({
        "operating_hours_per_year": e.operating_hours_per_year,
        "annual_volume": _q(e.annual_volume_m3, "volume"),
        "tariff_per_kwh": e.tariff_per_kwh, "currency": e.currency,
    })
    others = [_drop_none({"pump": o.pump_id, "role": o.role, "variable_speed": o.variable_speed,
               "speed_ratio": o.speed_ratio, "min_speed_ratio": o.min_speed_ratio, "trim_ratio": o.trim_ratio,
               "motor_efficiency": o.motor_efficiency, "drive_efficiency": o.drive_efficiency,
               "motor_rating": _q(o.motor_rating_w, "power"), "service_factor": o.service_factor})
              for o in project.other_pumps]
    d = project.duty_profile
    time_key = "hours" if d.time_basis == "hours" else "share"
    duty_profile = _drop_none({
        "bands": [{"flow": _q(b.flow_m3_s, "flow"), time_key: b.time} for b in d.bands],
        "time_basis": d.time_basis,
        "annual_volume": _q(d.annual_volume_m3, "volume"),
        "strategy": d.strategy, "pipe": d.pipe,
    })
    return _drop_none({
        "format": FORMAT_NAME,
        "version": FORMAT_VERSION,
        "name": project.name,
        "notes": project.notes,
        "fluid": fluid_d,
        "site": site_d,
        "friction_method": project.friction_method,
        "segments": segments,
        "pumps": pumps,
        "arrangement": arrangement,
        "criteria": criteria,
        "energy": energy,
        "flow_grid_max_factor": project.flow_grid_max_factor,
        "profile": [{"chainage": _q(p.chainage_m, "length"), "elevation": _q(p.elevation_m, "elevation"),
                     "air_valve": p.air_valve} for p in project.profile],
        "other_pumps": others,
        "duty_profile": duty_profile,
        "title_block": {"site": project.title_block.site, "revision": project.title_block.revision,
                        "date": project.title_block.date, "prepared_by": project.title_block.prepared_by,
                        "checked_by": project.title_block.checked_by},
    })


def project_to_json(project: Project) -> str:
    """The file text: two-space indented, keys in a fixed order, newline at the end."""
    return json.dumps(project_to_dict(project), indent=2, ensure_ascii=False, allow_nan=False) + "\n"


BACKUP_SUFFIX = ".bak"
"""The previous version of a saved project is kept beside it as ``NAME.pumpsketch.json.bak`` (one generation)."""


def backup_path(path: str | os.PathLike[str]) -> Path:
    """Where :func:`save_project` keeps the previous version of ``path``."""
    path = Path(path)
    return path.with_name(path.name + BACKUP_SUFFIX)


def _is_temporary_of(name: str, target_name: str) -> bool:
    """True for the name of a temporary file :func:`atomic_write_text` makes for ``target_name``.

    Those are ``"." + target_name + "." + random + ".tmp"``; the temporaries of the backup
    (``target_name + ".bak"``) share the prefix and are matched too.
    """
    prefix = f".{target_name}."
    return name.startswith(prefix) and name.endswith(".tmp") and len(name) > len(prefix) + len(".tmp")


def remove_stale_temporaries(path: str | os.PathLike[str]) -> list[Path]:
    """Delete the temporary files an interrupted save of ``path`` left beside it; the ones removed.

    A save killed between creating its temporary file and the rename leaves that file
    behind (the project itself is whole: the old or the new version).  Files that cannot be
    removed are left alone: cleaning up never makes a save fail.
    """
    path = Path(path)
    removed: list[Path] = []
    try:
        entries = list(os.scandir(path.parent))
    except OSError:
        return removed
    for entry in entries:
        if _is_temporary_of(entry.name, path.name) and entry.is_file(follow_symlinks=False):
            try:
                os.unlink(entry.path)
            except OSError:
                continue
            removed.append(Path(entry.path))
    return removed


def _keep_backup(path: Path) -> None:
    """Make ``path``'s present contents its backup (:func:`backup_path`), atomically.

    A hard link costs no copy and leaves the backup a whole file at every moment; where the
    file system has no hard links the bytes are copied through a temporary file instead.
    """
    backup = backup_path(path)
    try:
        if os.path.samefile(path, backup):
            return  # a save stopped after this step last time: the backup already is the present file
    except OSError:
        pass  # no backup yet
    fd, tmp_name = tempfile.mkstemp(prefix=f".{backup.name}.", suffix=".tmp", dir=path.parent)
    os.close(fd)
    try:
        try:
            os.unlink(tmp_name)
            os.link(path, tmp_name)
        except OSError:
            shutil.copy2(path, tmp_name)
        os.replace(tmp_name, backup)
    except BaseException:
        _remove_if_there(tmp_name)
        raise


def _remove_if_there(name: str) -> None:
    """Delete the file ``name``; one already gone is fine."""
    try:
        os.unlink(name)
    except FileNotFoundError:
        pass


def atomic_write_text(path: str | os.PathLike[str], text: str, keep_backup: bool = False) -> None:
    """Write ``text`` to ``path`` atomically: temporary file, fsync, then rename over.

    With ``keep_backup``, an existing ``path`` first becomes its backup (:func:`backup_path`),
    after the new text is safely on disk and before the rename.  At every moment ``path`` is
    the old or the new version, whole.  Temporary files that an interrupted earlier write
    left for ``path`` are removed (:func:`remove_stale_temporaries`).
    """
    path = Path(path)
    remove_stale_temporaries(path)
    try:
        mode = path.stat().st_mode & 0o777  # keep the permissions of the file replaced
        exists = True
    except FileNotFoundError:
        umask = os.umask(0)
        os.umask(umask)
        mode = 0o666 & ~umask  # what an ordinary new file would get
        exists = False
    fd, tmp_name = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as handle:
            handle.write(text)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(tmp_name, mode)
        if keep_backup and exists:
            _keep_backup(path)
        os.replace(tmp_name, path)
    except BaseException:
        _remove_if_there(tmp_name)
        raise


def save_project(project: Project, path: str | os.PathLike[str]) -> None:
    """Validate and save ``project`` atomically (the old file survives any failure).

    The rules are those of reading (:func:`~hydraulics.validation.validate_project`), and the
    text never holds ``NaN`` or ``Infinity`` (``allow_nan=False``): what is saved can be opened.
    The version replaced is kept as ``NAME.pumpsketch.json.bak`` beside the file (one
    generation, :func:`backup_path`).
    """
    validate_project(project)
    atomic_write_text(path, project_to_json(project), keep_backup=True)


def new_project() -> Project:
    """A small editable starting project: one suction and one delivery segment, no pump."""
    return Project(
        name="New project",
        site=Site(
            suction_level_low_m=100.0, suction_level_high_m=102.0,
            delivery=TankDelivery(level_low_m=130.0, level_high_m=133.0),
            pump_datum_m=99.0, design_flow_m3_s=0.02,
        ),
        segments=(
            Segment(name="Suction", side="suction", material_id="ductile_iron_cml", length_m=5.0,
                    internal_diameter_m=0.2, fittings=(Fitting("entrance_sharp"),)),
            Segment(name="Rising main", side="delivery", material_id="ductile_iron_cml", length_m=500.0,
                    internal_diameter_m=0.15, fittings=(Fitting("exit"),)),
        ),
    )
