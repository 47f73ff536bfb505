"""The window's actions declared as data, and the menus and tool bar built from them.

Each :class:`ActionSpec` names the window method it calls, its shortcut and where it
appears.  :func:`build_actions` makes the :class:`QAction` objects once; the menus and
the tool bar only arrange them.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from PySide6.QtCore import QEvent, QObject, Qt, SignalInstance
from PySide6.QtGui import QAction, QHelpEvent, QKeySequence, QUndoStack
from PySide6.QtWidgets import QMainWindow, QMenu, QToolBar, QToolTip, QWidget

Shortcut = QKeySequence.StandardKey | str | None

LARGER_PIPE_SHORTCUT = "Ctrl+Up"
SMALLER_PIPE_SHORTCUT = "Ctrl+Down"


@dataclass(frozen=True)
class ActionSpec:
    """One command of the window: ``slot`` names a window method (``"exports.copy_plot"``: a method of a part)."""

    key: str
    text: str
    slot: str
    shortcut: Shortcut = None
    tip: str = ""
    toolbar: bool = False


ACTIONS: tuple[ActionSpec, ...] = (
    ActionSpec("new", "&New", "new_project", QKeySequence.StandardKey.New, "Start a new project", True),
    ActionSpec("open", "&Open…", "open_project", QKeySequence.StandardKey.Open, "Open a project file", True),
    ActionSpec("save", "&Save", "save_project", QKeySequence.StandardKey.Save, "Save the project", True),
    ActionSpec("save_as", "Save &As…", "save_project_as", QKeySequence.StandardKey.SaveAs,
               "Save the project to a new file"),
    ActionSpec("quit", "&Quit", "close", QKeySequence.StandardKey.Quit),
    ActionSpec("copy", "&Copy", "copy_cells", QKeySequence.StandardKey.Copy,
               "Copy the selected cells as tab-separated text (for spreadsheets)"),
    ActionSpec("paste", "&Paste", "paste_cells", QKeySequence.StandardKey.Paste,
               "Paste tab-separated cells from a spreadsheet at the current cell (one undo step)"),
    ActionSpec("larger_pipe", "&Larger pipe size", "larger_pipe", LARGER_PIPE_SHORTCUT,
               "Step the selected segment one nominal size up its pipe series", True),
    ActionSpec("smaller_pipe", "S&maller pipe size", "smaller_pipe", SMALLER_PIPE_SHORTCUT,
               "Step the selected segment one nominal size down its pipe series", True),
    ActionSpec("pin", "&Pin curves", "pin_curves", "Ctrl+B",
               "Keep the present curves as a faint snapshot to compare with", True),
    ActionSpec("clear_pin", "C&lear pinned curves", "clear_pinned", "Ctrl+Shift+B",
               "Remove the pinned snapshot", True),
    ActionSpec("fit_view", "&Fit plots to data", "fit_plots", "Ctrl+0",
               "Return the plots to the automatic view of their data"),
    # File ▸ Export and Edit ▸ Copy plot (every export entry of the window is declared here and in SUBMENUS)
    ActionSpec("export_curves", "&System curves (CSV)…", "exports.export_system_curves",
               tip="Write the system curves (flow, total head and its parts) as a CSV table"),
    ActionSpec("export_points", "&Operating points (CSV)…", "exports.export_operating_points",
               tip="Write every operating point, with each pump's share in sets of other models, as a CSV table"),
    ActionSpec("export_segments", "S&egments (CSV)…", "exports.export_segments",
               tip="Write the segment table at the design flow as a CSV table"),
    ActionSpec("export_png", "Plot as &PNG…", "exports.export_plot_png",
               tip="Save the plot now shown as a PNG image"),
    ActionSpec("export_svg", "Plot as S&VG…", "exports.export_plot_svg",
               tip="Save the plot now shown as an SVG drawing"),
    ActionSpec("copy_plot", "Copy p&lot", "exports.copy_plot", "Ctrl+Shift+C",
               "Copy the plot now shown to the clipboard as an image"),
    ActionSpec("methods", "&Methods and references", "show_methods", QKeySequence.StandardKey.HelpContents,
               "The methods used, with their references, and the cautions"),
    ActionSpec("shortcuts", "&Keyboard shortcuts", "show_shortcuts"),
    ActionSpec("about", "&About PumpSketch", "show_about"),
)

MENUS: tuple[tuple[str, tuple[str | None, ...]], ...] = (
    ("&File", ("new", "open", "@samples", "@recent", None, "save", "save_as", None, "@export", None, "quit")),
    ("&Edit", ("undo", "redo", None, "copy", "paste", "copy_plot", None, "larger_pipe", "smaller_pipe")),
    ("&View", ("@units", None, "pin", "clear_pin", "fit_view")),
    ("&Help", ("methods", "shortcuts", None, "about")),
)
"""Menu titles and their entries: action keys, ``None`` for a separator, ``@name`` for a submenu."""

SUBMENUS: dict[str, tuple[str, tuple[str | None, ...]]] = {
    "export": ("&Export", ("export_curves", "export_points", "export_segments", None, "export_png", "export_svg")),
}
"""Submenus made of actions: ``@name`` in :data:`MENUS` → (title, entries).  File ▸ Export: the CSV
tables, then the images of the plot now shown."""

TOOLBAR: tuple[str | None, ...] = ("new", "open", "save", None, "undo_button", "redo_button", None,
                                  "smaller_pipe", "larger_pipe", None, "pin", "clear_pin", None, "@units")


def build_actions(window: QMainWindow, stack: QUndoStack) -> dict[str, QAction]:
    """Make the window's actions from :data:`ACTIONS` plus undo/redo from its undo ``stack``."""
    actions: dict[str, QAction] = {}
    for spec in ACTIONS:
        action = QAction(spec.text.replace("&&", "&"), window)
        action.setObjectName(f"action_{spec.key}")
        if spec.shortcut is not None:
            action.setShortcut(QKeySequence(spec.shortcut))
            action.setShortcutContext(Qt.ShortcutContext.WindowShortcut)
        if spec.tip:
            action.setStatusTip(spec.tip)
            action.setToolTip(f"{spec.tip} ({action.shortcut().toString(QKeySequence.SequenceFormat.NativeText)})"
                              if spec.shortcut is not None else spec.tip)
        target: object = window
        for name in spec.slot.split("."):
            target = getattr(target, name)
        action.triggered.connect(target)
        actions[spec.key] = action
    undo = stack.createUndoAction(window, "&Undo")
    undo.setShortcut(QKeySequence(QKeySequence.StandardKey.Undo))
    redo = stack.createRedoAction(window, "&Redo")
    redo.setShortcut(QKeySequence(QKeySequence.StandardKey.Redo))
    for key, action in (("undo", undo), ("redo", redo)):
        action.setObjectName(f"action_{key}")
        actions[key] = action
    actions["undo_button"] = _stack_button(window, "Undo", stack.undo, stack.canUndoChanged,
                                           stack.undoText, stack.canUndo())
    actions["redo_button"] = _stack_button(window, "Redo", stack.redo, stack.canRedoChanged,
                                           stack.redoText, stack.canRedo())
    return actions


def _stack_button(window: QObject, text: str, slot: Callable[[], None], can_signal: SignalInstance,
                  describe: Callable[[], str], enabled: bool) -> QAction:
    """A tool-bar twin of the undo (redo) action with a fixed label; the step is in its tooltip.

    The action itself never changes per edit (any change of a tool-bar action re-lays out
    the tool bar and with it the window); the tooltip is composed when it is asked for.
    """
    action = StepButtonAction(text, describe, window)
    action.setObjectName(f"action_{text.lower()}_button")
    action.setEnabled(enabled)
    action.setToolTip(text)
    action.triggered.connect(slot)
    can_signal.connect(action.setEnabled)
    return action


class StepButtonAction(QAction):
    """A tool-bar action whose button's tooltip names the step now on the undo stack."""

    def __init__(self, text: str, describe: Callable[[], str], parent: QObject) -> None:
        super().__init__(text, parent)
        self.step_tooltip = StepTooltip(text, describe, self)


class StepTooltip(QObject):
    """Answers tooltip requests on a tool-bar button with "Undo <step>" as it is now."""

    def __init__(self, text: str, describe: Callable[[], str], parent: QObject) -> None:
        super().__init__(parent)
        self._text = text
        self._describe = describe

    def text_now(self) -> str:
        return f"{self._text} {self._describe()}".strip()

    def eventFilter(self, watched: QObject, event: QEvent) -> bool:
        if event.type() == QEvent.Type.ToolTip and isinstance(event, QHelpEvent):
            QToolTip.showText(event.globalPos(), self.text_now(), watched if isinstance(watched, QWidget) else None)
            return True
        return False


def build_menus(window: QMainWindow, actions: dict[str, QAction], submenus: dict[str, QMenu]) -> None:
    """Fill the window's menu bar from :data:`MENUS` (``submenus`` given, or declared in :data:`SUBMENUS`)."""
    bar = window.menuBar()
    for title, entries in MENUS:
        menu = bar.addMenu(title)
        for entry in entries:
            if entry is None:
                menu.addSeparator()
            elif entry.startswith("@"):
                name = entry[1:]
                menu.addMenu(submenus[name] if name in submenus else build_submenu(window, actions, name))
            else:
                menu.addAction(actions[entry])


def build_submenu(parent: QWidget, actions: dict[str, QAction], name: str) -> QMenu:
    """The submenu ``name`` of :data:`SUBMENUS` (action keys, ``None`` for a separator)."""
    title, entries = SUBMENUS[name]
    menu = QMenu(title, parent)
    menu.setObjectName(f"menu_{name}")
    for entry in entries:
        if entry is None:
            menu.addSeparator()
        else:
            menu.addAction(actions[entry])
    return menu


def build_toolbar(window: QMainWindow, actions: dict[str, QAction], widgets: dict[str, QWidget]) -> QToolBar:
    """The main tool bar from :data:`TOOLBAR` (``@name`` entries are widgets)."""
    toolbar = QToolBar("Main", window)
    toolbar.setObjectName("main_toolbar")
    toolbar.setToolButtonStyle(Qt.ToolButtonStyle.ToolButtonTextOnly)
    toolbar.setMovable(False)
    for entry in TOOLBAR:
        if entry is None:
            toolbar.addSeparator()
        elif entry.startswith("@"):
            toolbar.addWidget(widgets[entry[1:]])
        else:
            action = actions[entry]
            toolbar.addAction(action)
            if isinstance(action, StepButtonAction):
                toolbar.widgetForAction(action).installEventFilter(action.step_tooltip)
    window.addToolBar(toolbar)
    return toolbar


def shortcut_rows(actions: dict[str, QAction]) -> list[tuple[str, str]]:
    """``(command, shortcut)`` for every action that has one, plus the table keys."""
    rows = []
    for key in ("new", "open", "save", "save_as", "undo", "redo", "copy", "paste", "larger_pipe",
                "smaller_pipe", "copy_plot", "pin", "clear_pin", "fit_view", "methods", "quit"):
        action = actions[key]
        shortcut = action.shortcut().toString(QKeySequence.SequenceFormat.NativeText)
        if shortcut:
            rows.append((action.text().replace("&", ""), shortcut))
    rows += [
        ("Edit the current cell (typing replaces it)", "any key; F2 keeps the text"),
        ("Commit and move down / right / left", "Enter / Tab / Shift+Tab"),
        ("Clear the selected optional cells", "Delete"),
        ("Step the pipe size in the size box", "Up / Down, or the mouse wheel over it"),
    ]
    return rows


def shortcuts_html(actions: dict[str, QAction]) -> str:
    """The Help ▸ Keyboard shortcuts page."""
    rows = "".join(f"<tr><td>{command}</td><td><b>{keys}</b></td></tr>" for command, keys in shortcut_rows(actions))
    return f"<table cellpadding='3'>{rows}</table>"


def about_html(title: str, cautions: str) -> str:
    """The Help ▸ About page, with the cautions."""
    return (f"<h3>{title}</h3><p>System curves, pump operating points, velocities, NPSH margin and energy "
            f"for water and wastewater pumping stations.</p><p><b>Caution.</b> {cautions}</p>")
