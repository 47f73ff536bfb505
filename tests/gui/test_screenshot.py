"""The offscreen screenshot of the window (``pumpsketch shot``)."""

from __future__ import annotations

import pytest
from PySide6.QtGui import QImage

from app import settings
from app.screenshot import render_window_png
from hydraulics.project_io import ProjectFileError


def test_render_window_png_writes_an_image_of_the_window(hilltop, tmp_path):
    out = render_window_png(hilltop, tmp_path / "window.png", width=900, height=600)
    assert out == (tmp_path / "window.png").resolve()
    image = QImage(str(out))
    assert (image.width(), image.height()) == (900, 600)
    # A drawn window, not a blank: many distinct colours across a row through the plot.
    row = image.height() // 3
    colours = {image.pixel(x, row) for x in range(0, image.width(), 3)}
    assert len(colours) > 8


def test_render_window_png_leaves_the_settings_alone(hilltop, tmp_path):
    render_window_png(hilltop, tmp_path / "a.png", width=640, height=480)
    assert settings.window_state() == (None, [])
    assert settings.recent_files() == []


def test_a_bad_project_raises_the_file_error(tmp_path):
    bad = tmp_path / "missing.pumpsketch.json"
    with pytest.raises(ProjectFileError):
        render_window_png(bad, tmp_path / "b.png")
    assert not (tmp_path / "b.png").exists()
