"""The ``pumpsketch`` command.

``pumpsketch``                     open the window (empty, or on the last project)
``pumpsketch FILE``                open the window on a project file
``pumpsketch --sample NAME``       open the window on a bundled sample, as an unsaved copy
``pumpsketch solve FILE [--json] [--units SI|US]``   print the results
``pumpsketch solve --sample NAME [...]``             the same for a bundled sample
``pumpsketch import-pump CSV [--speed RPM]``          validate pump data and show the fit
``pumpsketch shot FILE -o OUT.png``                   render the window offscreen to a PNG
``pumpsketch shot --sample NAME -o OUT.png``          the same for a bundled sample
``pumpsketch export FILE [--sample NAME] [--units SI|US] --curves F --points F --segments F``
                                                     write the results as CSV tables (at least one)

Exit status: 0 on success, 2 on bad input (with a one-line reason on stderr).
"""

from __future__ import annotations

import argparse
import json
import math
import sys
from collections.abc import Callable
from pathlib import Path
from typing import TYPE_CHECKING, NoReturn

if TYPE_CHECKING:  # the engine is imported by each sub-command only, to keep start-up short
    from hydraulics.results import Solution

SUBCOMMANDS = ("solve", "import-pump", "shot", "export")
BAD_INPUT = 2


class BadInputError(Exception):
    """A problem with what the user gave: reported in one line, exit status 2."""


MAX_MESSAGE_CHARACTERS = 600
"""Longest line the command prints about bad input (the messages quote only excerpts of the input)."""


def one_line(message: str) -> str:
    r"""``message`` as one printable line: line breaks and control characters escaped, at most
    :data:`MAX_MESSAGE_CHARACTERS` characters.

    >>> print(one_line("a\nb\x00c"))
    a\nb\x00c
    """
    text = "".join(c if c.isprintable() else repr(c)[1:-1] for c in message[: 2 * MAX_MESSAGE_CHARACTERS])
    return text if len(text) <= MAX_MESSAGE_CHARACTERS else text[: MAX_MESSAGE_CHARACTERS - 1] + "…"


def _number_in(low: float, high: float, what: str) -> Callable[[str], float]:
    """An argparse type: a finite number in ``[low, high]`` (``inf`` and ``nan`` refused)."""
    def parse(text: str) -> float:
        from hydraulics.input_excerpt import quote_input

        try:
            value = float(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"{quote_input(text)} is not a number") from None
        if not math.isfinite(value) or not low <= value <= high:
            raise argparse.ArgumentTypeError(f"{what} must be a number between {low:g} and {high:g}; "
                                             f"got {quote_input(text)}")
        return value
    return parse


def _whole_number_in(low: int, high: int, what: str) -> Callable[[str], int]:
    """An argparse type: a whole number in ``[low, high]``."""
    def parse(text: str) -> int:
        from hydraulics.input_excerpt import quote_input

        stripped = text.strip()
        if len(stripped) > 9 or not stripped.isdigit() or not low <= int(stripped) <= high:
            raise argparse.ArgumentTypeError(f"{what} must be a whole number between {low} and {high}; "
                                             f"got {quote_input(text)}")
        return int(stripped)
    return parse


def _load_and_solve(path: str) -> Solution:
    from hydraulics.model import ModelError
    from hydraulics.project_io import ProjectFileError, load_project
    from hydraulics.solve import solve

    try:
        project = load_project(path)
        return solve(project)
    except ProjectFileError as exc:
        raise BadInputError(str(exc)) from None
    except ModelError as exc:
        raise BadInputError(f"{path}: {exc}") from None


def _project_file(args: argparse.Namespace) -> str:
    """The project file a sub-command works on: FILE, or the bundled sample ``--sample NAME``."""
    if (args.file is None) == (args.sample is None):
        raise BadInputError("give a project file or --sample NAME (one of the two)")
    if args.sample is None:
        return str(args.file)
    from app.samples import sample_names, sample_path
    from hydraulics.input_excerpt import quote_input

    path = sample_path(args.sample)
    if path is None:
        raise BadInputError(f"--sample: no sample called {quote_input(args.sample)}; "
                            f"the samples are {', '.join(sample_names())}")
    return str(path)


def _cmd_solve(args: argparse.Namespace) -> int:
    from hydraulics.results_json import solution_to_json_dict

    solution = _load_and_solve(_project_file(args))
    if args.json:
        json.dump(solution_to_json_dict(solution), sys.stdout, indent=1)
        sys.stdout.write("\n")
    else:
        from app.text_report import summary_text

        sys.stdout.write(summary_text(solution, args.units))
    return 0


def _cmd_import_pump(args: argparse.Namespace) -> int:
    from hydraulics.model import ModelError
    from hydraulics.pump_csv import PumpCsvError, read_pump_csv_with_messages
    from hydraulics.pump_fit import fit_pump

    path = Path(args.csv)
    try:
        pump, messages = read_pump_csv_with_messages(path, pump_id=path.stem, name=args.name or path.stem,
                                                     rated_speed_rpm=args.speed)
        fitted = fit_pump(pump, args.density)
    except FileNotFoundError:
        raise BadInputError(f"{path}: file not found") from None
    except (PumpCsvError, ModelError, ValueError) as exc:
        raise BadInputError(f"{path}: {exc}") from None
    except OSError as exc:
        raise BadInputError(f"{path}: cannot read the file ({exc.strerror or type(exc).__name__})") from None
    from app.pump_report import pump_fit_text

    for message in messages:
        print(f"note: {message}")
    sys.stdout.write(pump_fit_text(pump, fitted))
    return 0


def _cmd_shot(args: argparse.Namespace) -> int:
    from hydraulics.project_io import ProjectFileError, load_project

    file = _project_file(args)
    try:
        load_project(file)
    except ProjectFileError as exc:
        raise BadInputError(str(exc)) from None
    from app.screenshot import render_window_png

    out = render_window_png(file, args.output, width=args.width, height=args.height)
    print(f"wrote {out}")
    return 0


EXPORT_TABLES = (("curves", "system curves"), ("points", "operating points"), ("segments", "segments"))
"""The CSV tables of ``pumpsketch export``: option name, what it holds."""


def _cmd_export(args: argparse.Namespace) -> int:
    outputs = [(option, Path(getattr(args, option))) for option, _what in EXPORT_TABLES
               if getattr(args, option) is not None]
    if not outputs:
        raise BadInputError("export: give at least one of --curves F, --points F, --segments F")
    file = _project_file(args)
    resolved = [path.resolve() for _option, path in outputs]
    for (option, path), full in zip(outputs, resolved, strict=True):
        if full == Path(file).resolve():
            raise BadInputError(f"--{option}: {path} is the project file itself; choose another file name")
        if resolved.count(full) > 1:
            raise BadInputError(f"--{option}: {path} is given for two tables; give each its own file")
        if not full.parent.is_dir():
            raise BadInputError(f"--{option}: {path.parent}: no such folder")
    solution = _load_and_solve(file)
    from hydraulics import csv_export

    writers = {"curves": csv_export.system_curves_csv, "points": csv_export.operating_points_csv,
               "segments": csv_export.segments_csv}
    for option, path in outputs:
        try:
            csv_export.write_csv(str(path), writers[option](solution, args.units))
        except OSError as exc:
            raise BadInputError(f"--{option}: {path}: {exc.strerror or exc}") from None
        print(f"wrote {path}")
    return 0


def _open_sample(names: list[str]) -> int:
    from app.samples import sample_names, sample_path
    from hydraulics.input_excerpt import quote_input

    path = sample_path(names[0]) if len(names) == 1 else None
    if path is None:
        given = f"no sample called {quote_input(names[0])}" if len(names) == 1 else "give one sample name"
        print(f"pumpsketch: --sample: {one_line(given)}; the samples are {', '.join(sample_names())}", file=sys.stderr)
        return BAD_INPUT
    from app.gui import run_gui

    return run_gui(str(path), as_copy=True)


SHOT_PIXELS = (200, 8000)
"""Smallest and largest width or height of a rendered window (pixels)."""


class _Parser(argparse.ArgumentParser):
    """argparse with its usage errors reported as one line (exit status 2), like every other bad input."""

    def error(self, message: str) -> NoReturn:
        raise BadInputError(f"{self.prog}: {message} (see --help)")


def build_parser() -> argparse.ArgumentParser:
    from hydraulics.validation import LIMITS

    parser = _Parser(
        prog="pumpsketch",
        description="System curves, pump operating points and pipe sizing for pumping stations. "
                    "Without a sub-command, opens the window.",
    )
    sub = parser.add_subparsers(dest="command")
    solve = sub.add_parser("solve", help="solve a project file and print the results")
    solve.add_argument("file", nargs="?", help="the project file (*.pumpsketch.json)")
    solve.add_argument("--sample", metavar="NAME", help="solve a bundled sample instead of a file")
    solve.add_argument("--json", action="store_true", help="print the results as JSON in SI units")
    solve.add_argument("--units", choices=("SI", "US"), default="SI", help="unit system of the text summary")
    solve.set_defaults(handler=_cmd_solve)
    imp = sub.add_parser("import-pump", help="validate a pump-curve CSV file and show the fitted curves")
    imp.add_argument("csv")
    imp.add_argument("--name", default=None)
    speed, density = LIMITS["pump.rated_speed_rpm"], LIMITS["fluid.density_kg_m3"]
    imp.add_argument("--speed", type=_number_in(speed.low, speed.high, "--speed (rpm)"), default=None,
                     help="rated speed in rpm (if the file lacks it)")
    imp.add_argument("--density", type=_number_in(density.low, density.high, "--density (kg/m³)"), default=998.2,
                     help="fluid density in kg/m³ for power (default 998.2)")
    imp.set_defaults(handler=_cmd_import_pump)
    shot = sub.add_parser("shot", help="render the window for a project offscreen to a PNG")
    shot.add_argument("file", nargs="?", help="the project file (*.pumpsketch.json)")
    shot.add_argument("--sample", metavar="NAME", help="render a bundled sample instead of a file")
    shot.add_argument("-o", "--output", required=True)
    shot.add_argument("--width", type=_whole_number_in(*SHOT_PIXELS, "--width"), default=1500)
    shot.add_argument("--height", type=_whole_number_in(*SHOT_PIXELS, "--height"), default=950)
    shot.set_defaults(handler=_cmd_shot)
    export = sub.add_parser("export", help="write the system curves, operating points and segments as CSV tables")
    export.add_argument("file", nargs="?", help="the project file (*.pumpsketch.json)")
    export.add_argument("--sample", metavar="NAME", help="export a bundled sample instead of a file")
    export.add_argument("--units", choices=("SI", "US"), default="SI", help="unit system of the tables (default SI)")
    for option, what in EXPORT_TABLES:
        export.add_argument(f"--{option}", metavar="F", default=None, help=f"write the {what} to the CSV file F")
    export.set_defaults(handler=_cmd_export)
    return parser


def main(argv: list[str] | None = None) -> int:
    """Run the command; bad input of any kind ends with one line on stderr and exit status 2, never a traceback."""
    try:
        return _main(list(sys.argv[1:] if argv is None else argv))
    except BadInputError as exc:
        print(f"pumpsketch: {one_line(str(exc))}", file=sys.stderr)
        return BAD_INPUT
    except BrokenPipeError:
        return 0
    except Exception as exc:  # noqa: BLE001 - the last guard: whatever the input, one line and exit 2
        print(f"pumpsketch: cannot process this input ({type(exc).__name__}: {one_line(str(exc))[:200]})",
              file=sys.stderr)
        return BAD_INPUT


def _main(argv: list[str]) -> int:
    if argv and argv[0] == "--sample":
        return _open_sample(argv[1:])
    if not argv or (argv[0] not in SUBCOMMANDS and not argv[0].startswith("-")):
        if len(argv) > 1:
            print("pumpsketch: give at most one project file to open", file=sys.stderr)
            return BAD_INPUT
        if argv and ("\x00" in argv[0] or not Path(argv[0]).is_file()):
            print(f"pumpsketch: {one_line(argv[0])}: file not found", file=sys.stderr)
            return BAD_INPUT
        from app.gui import run_gui

        return run_gui(argv[0] if argv else None)
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:
        return BAD_INPUT if exc.code else 0
    if args.command is None:
        parser.print_help()
        return 0
    handler: Callable[[argparse.Namespace], int] = args.handler
    return handler(args)


if __name__ == "__main__":
    sys.exit(main())
