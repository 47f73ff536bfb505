"""The banner that keeps the cautions in view in the window (the text is :mod:`hydraulics.cautions`)."""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QResizeEvent, QShowEvent
from PySide6.QtWidgets import QHBoxLayout, QLabel, QSizePolicy, QWidget

from app import style
from hydraulics.cautions import CAUTIONS_SHORT, CAUTIONS_TEXT


class CautionsBanner(QWidget):
    """A slim one-line strip, always visible, stating the cautions, with a link to the methods page.

    In a narrow window the sentence is shortened with an ellipsis; the full paragraph is
    the banner's tooltip.  ``helpRequested`` is emitted when the user follows the link, so
    the window can open the methods and cautions page.
    """

    helpRequested = Signal()

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self.setObjectName("cautionsBanner")
        self.setAttribute(Qt.WidgetAttribute.WA_StyledBackground, True)
        self.setStyleSheet(
            f"#cautionsBanner {{ background: #FFF6DB; border-top: 1px solid {style.ORANGE}; }}"
            "#cautionsBanner QLabel { color: #3A2E00; }")
        self.setToolTip(CAUTIONS_TEXT)
        self.title = QLabel("Caution.", self)
        font = self.title.font()
        font.setBold(True)
        self.title.setFont(font)
        self.label = QLabel(CAUTIONS_SHORT, self)
        self.label.setObjectName("cautionsText")
        self.label.setTextFormat(Qt.TextFormat.PlainText)
        self.label.setSizePolicy(QSizePolicy.Policy.Ignored, QSizePolicy.Policy.Preferred)
        self.label.setMinimumWidth(80)
        self.link = QLabel('<a href="methods">Methods and cautions…</a>', self)
        self.link.setObjectName("cautionsLink")
        self.link.setTextFormat(Qt.TextFormat.RichText)
        self.link.setTextInteractionFlags(Qt.TextInteractionFlag.LinksAccessibleByMouse
                                          | Qt.TextInteractionFlag.LinksAccessibleByKeyboard)
        self.link.linkActivated.connect(lambda _href: self.helpRequested.emit())
        layout = QHBoxLayout(self)
        layout.setContentsMargins(8, 3, 8, 3)
        layout.setSpacing(6)
        layout.addWidget(self.title)
        layout.addWidget(self.label, 1)
        layout.addSpacing(12)
        layout.addWidget(self.link, 0, Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        self.setSizePolicy(QSizePolicy.Policy.Preferred, QSizePolicy.Policy.Fixed)

    def text(self) -> str:
        """The full cautions paragraph this banner stands for."""
        return CAUTIONS_TEXT

    def resizeEvent(self, event: QResizeEvent) -> None:
        super().resizeEvent(event)
        self._fit_text()

    def showEvent(self, event: QShowEvent) -> None:
        super().showEvent(event)
        self._fit_text()

    def _fit_text(self) -> None:
        metrics = self.label.fontMetrics()
        self.label.setText(metrics.elidedText(CAUTIONS_SHORT, Qt.TextElideMode.ElideRight,
                                              max(self.label.width(), 10)))
