"""Images of a plot canvas as it is shown: PNG, SVG and the clipboard, on a white background.

The canvas's scene is exported over the view's visible rectangle, so an image has the
plot's size on screen (in device-independent pixels) and shows what the user sees.
PNG and clipboard images come from pyqtgraph's image exporter.  SVG comes from
pyqtgraph's SVG exporter, which works on the pinned PySide6 6.10; should it fail (an
exception, or text that is not XML), the scene is painted into a
:class:`~PySide6.QtSvg.QSvgGenerator` instead, with the items in pyqtgraph's export mode
(markers drawn as shapes rather than from the screen's pixmap cache) and the
generator's resolution set to the screen's, so cached axis pictures keep their scale.
"""

from __future__ import annotations

import logging
import os
import tempfile
import xml.etree.ElementTree as ET
from pathlib import Path

import pyqtgraph as pg
import pyqtgraph.exporters as pg_exporters
from PySide6.QtCore import QBuffer, QByteArray, QIODevice, QRectF
from PySide6.QtGui import QColor, QImage, QPainter
from PySide6.QtSvg import QSvgGenerator

log = logging.getLogger(__name__)

EXPORT_BACKGROUND = "#FFFFFF"
"""Exports are on white, whatever the window's theme."""


def _source_rect(canvas: pg.GraphicsView) -> QRectF:
    """The part of the scene the view shows, in scene coordinates."""
    return QRectF(canvas.mapToScene(canvas.viewport().rect()).boundingRect())


def plot_image(canvas: pg.GraphicsView) -> QImage:
    """The canvas as shown, as an image of its size on screen, on white."""
    exporter = pg_exporters.ImageExporter(canvas.scene())
    exporter.parameters()["background"] = QColor(EXPORT_BACKGROUND)
    image = exporter.export(toBytes=True)
    if not isinstance(image, QImage) or image.isNull():
        raise OSError("the plot could not be drawn into an image")
    return image


def png_bytes(image: QImage) -> bytes:
    """``image`` encoded as PNG."""
    data = QByteArray()
    buffer = QBuffer(data)
    buffer.open(QIODevice.OpenModeFlag.WriteOnly)
    saved = image.save(buffer, "PNG")  # type: ignore[call-overload]  # the stub says bytes; the binding takes str
    if not saved:
        raise OSError("the image could not be encoded as PNG")
    buffer.close()
    return bytes(data.data())


def plot_svg(canvas: pg.GraphicsView) -> str:
    """The canvas as shown, as SVG text (see the module docstring for the two ways)."""
    try:
        text = bytes(pg_exporters.SVGExporter(canvas.scene()).export(toBytes=True)).decode("utf-8")
        ET.fromstring(text)
    except Exception:  # the library's exporter is replaced by the plain one, never a crash
        log.exception("pyqtgraph's SVG export failed; painting the scene into an SVG generator instead")
        return svg_by_generator(canvas)
    return text


def svg_by_generator(canvas: pg.GraphicsView) -> str:
    """The canvas as shown, painted into a QSvgGenerator (the fallback of :func:`plot_svg`)."""
    source = _source_rect(canvas)
    target = QRectF(0.0, 0.0, source.width(), source.height())
    data = QByteArray()
    buffer = QBuffer(data)
    buffer.open(QIODevice.OpenModeFlag.WriteOnly)
    generator = QSvgGenerator()
    generator.setOutputDevice(buffer)
    generator.setResolution(canvas.logicalDpiX())
    generator.setSize(target.size().toSize())
    generator.setViewBox(target)
    generator.setTitle("PumpSketch plot")
    painter = QPainter(generator)
    # pyqtgraph items draw for export (no screen caches) while export mode is on
    switch = pg_exporters.ImageExporter(canvas.scene())
    try:
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        painter.fillRect(target, QColor(EXPORT_BACKGROUND))
        switch.setExportMode(True, {"antialias": True, "background": QColor(EXPORT_BACKGROUND), "painter": painter})
        canvas.scene().render(painter, target, source)
    finally:
        switch.setExportMode(False)
        painter.end()
    buffer.close()
    return bytes(data.data()).decode("utf-8")


def write_file_atomically(path: str | os.PathLike[str], data: bytes) -> None:
    """Write ``data`` to ``path``: a temporary file beside it, flushed, then renamed over (the old file survives)."""
    path = Path(path)
    umask = os.umask(0)
    os.umask(umask)
    fd, tmp_name = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(tmp_name, 0o666 & ~umask)  # what an ordinary new file would get
        os.replace(tmp_name, path)
    except BaseException:
        Path(tmp_name).unlink(missing_ok=True)
        raise
