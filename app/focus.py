"""Bringing what a finding or an undone edit is about into view in the main window."""

from __future__ import annotations

from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from app.main_window import MainWindow

INPUT_TABS = ("Site & fluid", "Pipework", "Pumps", "Criteria", "Duty")
"""Titles of the input tabs, in order (an ampersand is doubled on the tab so it shows)."""


def focus_target(window: MainWindow, target: tuple[object, ...] | None) -> None:
    """Bring what a finding or an undone edit is about into view.

    ``("segment", i)`` selects the row in Pipework, ``("profile", i)`` that point of the
    main's profile; ``("pump", …)`` and
    ``("arrangement", …)`` open Pumps, ``("installed_pump", row)`` selects that row of its
    installed pumps; ``("site", name)`` opens Site & fluid and
    focuses the field of that name where there is one; ``("criteria", name)`` opens
    Criteria; ``("duty", i)`` opens Duty with band i selected; ``("scenario", (static, pipe,
    pumps, speed))`` selects that row of the operating points.
    """
    if not target:
        return
    kind, what = target[0], target[1] if len(target) > 1 else None
    if kind == "segment" and isinstance(what, int):
        window.input_tabs.setCurrentIndex(INPUT_TABS.index("Pipework"))
        window.pipework.select_segment(what)
        window.pipework.segments_view.setFocus()
    elif kind == "profile" and isinstance(what, int):
        window.input_tabs.setCurrentIndex(INPUT_TABS.index("Pipework"))
        window.pipework.show_profile(what)
    elif kind in ("pump", "arrangement"):
        window.input_tabs.setCurrentIndex(INPUT_TABS.index("Pumps"))
        form = window.pumps_panel.arrangement_form if kind == "arrangement" else window.pumps_panel.pump_form
        if not (isinstance(what, str) and form.focus_field(what)):
            window.pumps_panel.show_pump(str(what))
    elif kind == "installed_pump" and isinstance(what, int):
        window.input_tabs.setCurrentIndex(INPUT_TABS.index("Pumps"))
        window.pumps_panel.show_installed_pump(what)
    elif kind == "site":
        window.input_tabs.setCurrentIndex(INPUT_TABS.index("Site & fluid"))
        if isinstance(what, str):
            window.site_panel.focus_field(what)
    elif kind == "criteria":
        window.input_tabs.setCurrentIndex(INPUT_TABS.index("Criteria"))
        if isinstance(what, str):
            window.criteria_panel.focus_field(what)
    elif kind == "duty":
        window.input_tabs.setCurrentIndex(INPUT_TABS.index("Duty"))
        if isinstance(what, str):
            window.duty_panel.form.focus_field(what)
        elif isinstance(what, int):
            window.duty_panel.show_band(what)
    elif kind == "scenario":
        window.points_table.select_scenario(what)
        window.points_table.setFocus()
