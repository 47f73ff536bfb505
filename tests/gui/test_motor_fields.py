"""The arrangement form's speed control, motor rating and service factor."""

from __future__ import annotations


def test_speed_control_motor_rating_and_service_factor(window, document):
    form = window.pumps_panel.arrangement_form
    assert document.project.arrangement.variable_speed  # the hilltop sample has a drive 88-100 %
    assert form.editor("min_speed_ratio").isEnabled()
    steps = document.undo_stack.count()
    form.choose("speed_control", False)
    a = document.project.arrangement
    assert not a.variable_speed and a.min_speed_ratio == a.max_speed_ratio == a.speed_ratio
    assert not form.editor("min_speed_ratio").isEnabled() and not form.editor("max_speed_ratio").isEnabled()
    form.set_text("motor_rating", "30 kW")
    assert document.project.arrangement.motor_rating_w == 30_000.0
    form.set_text("service_factor", "1.15")  # NEMA MG 1 service factor, common practice
    assert document.project.arrangement.service_factor == 1.15
    before = document.project
    form.set_text("service_factor", "3")  # outside 1.0-1.5: refused, the project unchanged
    assert document.project is before
    assert document.undo_stack.count() == steps + 3
    for _ in range(3):
        document.undo_stack.undo()
    assert document.project.arrangement.variable_speed
    assert document.project.arrangement.min_speed_ratio == 0.88 and document.project.arrangement.motor_rating_w is None
    assert form.editor("min_speed_ratio").isEnabled()
