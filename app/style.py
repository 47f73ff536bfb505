"""Colours, pens, symbols and fonts of PumpSketch's plots and result panels.

The palette is the eight-colour set proposed for colour-blind readers by Okabe, M. &
Ito, K. (2008), "Color Universal Design (CUD): how to make figures and presentations
that are friendly to colorblind people".  Colour is never the only cue: system curves
for new pipe are solid and for aged pipe dashed, operating points differ in symbol by
the number of pumps running and in fill by the pipe state, pump curves carry a text
label at their end, and every severity carries its word as well as its colour.

Plots use a white background so that screen, printed report and exported image look
the same.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

from PySide6.QtCore import QPointF, Qt
from PySide6.QtGui import QBrush, QColor, QFont, QIcon, QPainter, QPen, QPixmap, QPolygonF

# --------------------------------------------------------------------------- palette
# Okabe & Ito (2008), RGB values as published.
BLACK = "#000000"
ORANGE = "#E69F00"
SKY_BLUE = "#56B4E9"
BLUISH_GREEN = "#009E73"
YELLOW = "#F0E442"
BLUE = "#0072B2"
VERMILLION = "#D55E00"
REDDISH_PURPLE = "#CC79A7"

GREY = "#7F7F7F"
LIGHT_GREY = "#BDBDBD"
PLOT_BACKGROUND = "#FFFFFF"
PLOT_FOREGROUND = "#202020"
GRID_COLOUR = "#E4E4E4"
"""Light grid lines behind the data."""

# --------------------------------------------------------------------------- roles
STATIC_COLOURS: dict[str, str] = {"min": BLUE, "max": VERMILLION}
"""System curves and operating points: colour by static-head extreme."""

PIPE_LINE_STYLES: dict[str, Qt.PenStyle] = {
    "new": Qt.PenStyle.SolidLine,
    "aged": Qt.PenStyle.DashLine,
}
"""System curves: new pipe solid, aged pipe dashed."""

PUMP_COLOURS: tuple[str, ...] = (BLACK, BLUISH_GREEN, REDDISH_PURPLE, ORANGE, SKY_BLUE)
"""Pump curves for 1, 2, 3 … pumps running (repeats beyond five)."""

PUMP_SYMBOLS: tuple[str, ...] = ("o", "s", "t", "d", "star")
"""Operating-point symbol for 1, 2, 3 … pumps running (repeats beyond five)."""

SYSTEM_BAND_BRUSH = QColor(86, 180, 233, 45)
"""Light sky-blue fill between the lowest and highest system curve."""

PREFERRED_REGION_ALPHA = 90
"""Opacity (0–255) of the broad stroke marking the preferred operating region."""

CRITICAL_RED = "#A50F15"
"""Dark red of critical findings: darker than the vermillion of the maximum-static system curves,
so a critical mark is never read as one of them (the octagon and the word tell it as well)."""

SEVERITY_COLOURS: dict[str, str] = {"critical": CRITICAL_RED, "warning": ORANGE, "info": SKY_BLUE}
"""Critical, warning and information: none of them the colour of a system curve (vermillion, blue)."""
SEVERITY_TITLES: dict[str, str] = {"critical": "Critical", "warning": "Warning", "info": "Information"}

EFFICIENCY_COLOUR = BLUE
POWER_COLOUR = VERMILLION
NPSH_AVAILABLE_COLOUR = BLUE
NPSH_REQUIRED_COLOUR = VERMILLION


def _cycle(values: tuple[str, ...], pumps_running: int) -> str:
    return values[(max(int(pumps_running), 1) - 1) % len(values)]


def pump_colour(pumps_running: int) -> str:
    """Colour of the curve and points for ``pumps_running`` pumps."""
    return _cycle(PUMP_COLOURS, pumps_running)


def pump_symbol(pumps_running: int) -> str:
    """pyqtgraph symbol name of operating points with ``pumps_running`` pumps."""
    return _cycle(PUMP_SYMBOLS, pumps_running)


# --------------------------------------------------------------------------- pens
def make_pen(colour: str | QColor, width: float = 2.0,
             style: Qt.PenStyle = Qt.PenStyle.SolidLine, alpha: int = 255) -> QPen:
    """A cosmetic pen (width in screen pixels, independent of the axis scales)."""
    qcolour = QColor(colour)
    qcolour.setAlpha(alpha)
    pen = QPen(qcolour)
    pen.setWidthF(width)
    pen.setStyle(style)
    pen.setCosmetic(True)
    pen.setCapStyle(Qt.PenCapStyle.FlatCap)
    return pen


def system_pen(static: str, pipe: str) -> QPen:
    """Pen of the system curve for one static extreme and pipe state."""
    return make_pen(STATIC_COLOURS.get(static, GREY), 2.0, PIPE_LINE_STYLES.get(pipe, Qt.PenStyle.DotLine))


def pump_pen(pumps_running: int) -> QPen:
    """Pen of the pump curve for ``pumps_running`` pumps."""
    return make_pen(pump_colour(pumps_running), 2.0)


def tested_pump_pen(pumps_running: int) -> QPen:
    """Thin dashed pen of the plain (as tested) pump curve, beside the curve at the manifold."""
    return make_pen(pump_colour(pumps_running), 1.2, Qt.PenStyle.DashLine, alpha=200)


def pump_set_pen(pumps_running: int) -> QPen:
    """Dash-dot pen of the combined curve of pumps of different models (colour by pumps running)."""
    return make_pen(pump_colour(pumps_running), 2.2, Qt.PenStyle.DashDotLine)


def preferred_region_pen(pumps_running: int) -> QPen:
    """Broad translucent stroke under the pump curve across the preferred region."""
    pen = make_pen(pump_colour(pumps_running), 9.0, alpha=PREFERRED_REGION_ALPHA)
    pen.setCapStyle(Qt.PenCapStyle.RoundCap)
    return pen


def snapshot_pen() -> QPen:
    """Faint grey dotted pen of a pinned snapshot curve."""
    return make_pen(GREY, 1.5, Qt.PenStyle.DotLine, alpha=200)


def design_flow_pen() -> QPen:
    """Dash-dot black pen of the design-flow marker line."""
    return make_pen(BLACK, 1.2, Qt.PenStyle.DashDotLine)


def crosshair_pen() -> QPen:
    """Thin grey pen of the hover crosshair."""
    return make_pen(GREY, 1.0, Qt.PenStyle.SolidLine, alpha=160)


@dataclass(frozen=True)
class PointStyle:
    """Marker style of one operating point (pyqtgraph ``symbol``, ``brush``, ``pen``, ``size``)."""

    symbol: str
    brush: QBrush
    pen: QPen
    size: float


@functools.lru_cache(maxsize=64)
def operating_point_style(static: str, pipe: str, pumps_running: int) -> PointStyle:
    """Operating point: symbol by pumps running, colour by static extreme, hollow for aged pipe.

    One style object per combination, shared by every caller (treat its pen and brush as
    read-only): the scatter items key their pre-drawn marker images on the pen and brush
    objects, so handing them the same objects on each redraw lets them reuse the images
    instead of drawing the markers afresh every time.
    """
    colour = QColor(STATIC_COLOURS.get(static, GREY))
    pen = make_pen(colour, 2.0)
    pen.setCapStyle(Qt.PenCapStyle.SquareCap)
    brush = QBrush(QColor(PLOT_BACKGROUND)) if pipe == "aged" else QBrush(colour)
    return PointStyle(symbol=pump_symbol(pumps_running), brush=brush, pen=pen, size=11.0)


# --------------------------------------------------------------------------- fonts
def tick_font() -> QFont:
    """Font of axis tick labels."""
    font = QFont()
    font.setPointSizeF(9.5)
    return font


LABEL_FONT_SIZE = "11pt"
"""CSS size of axis titles."""

ANNOTATION_FONT_SIZE_PT = 8.5
"""Size of point and curve labels inside the plot."""


def annotation_font() -> QFont:
    """Font of text placed inside a plot (point labels, curve labels)."""
    font = QFont()
    font.setPointSizeF(ANNOTATION_FONT_SIZE_PT)
    return font


# --------------------------------------------------------------------------- icons
def severity_icon(severity: str, size: int = 16) -> QIcon:
    """An icon whose shape as well as colour tells the severity.

    Critical: octagon; warning: triangle; information: circle.
    """
    pixmap = QPixmap(size, size)
    pixmap.fill(Qt.GlobalColor.transparent)
    painter = QPainter(pixmap)
    painter.setRenderHint(QPainter.RenderHint.Antialiasing)
    colour = QColor(SEVERITY_COLOURS.get(severity, GREY))
    painter.setBrush(QBrush(colour))
    painter.setPen(QPen(colour.darker(130), 1.0))
    s = float(size)
    if severity == "critical":
        a, b = 0.29 * s, 0.71 * s
        points = [(a, 1), (b, 1), (s - 1, a), (s - 1, b), (b, s - 1), (a, s - 1), (1, b), (1, a)]
        painter.drawPolygon(QPolygonF([QPointF(x, y) for x, y in points]))
    elif severity == "warning":
        points = [(s / 2, 1), (s - 1, s - 1), (1, s - 1)]
        painter.drawPolygon(QPolygonF([QPointF(x, y) for x, y in points]))
    else:
        painter.drawEllipse(QPointF(s / 2, s / 2), s / 2 - 1, s / 2 - 1)
    painter.end()
    return QIcon(pixmap)
