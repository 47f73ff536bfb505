"""An inline message strip: why an entry was refused, or why the results are not up to date."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QHBoxLayout, QLabel, QToolButton, QWidget

_STYLES = {
    "refused": "#messageBar { background: #FDE7E1; border: 1px solid #D55E00; }",
    "stale": "#messageBar { background: #FFF1D6; border: 1px solid #E69F00; }",
    "info": "#messageBar { background: #E3F1FA; border: 1px solid #56B4E9; }",
}
_TITLES = {"refused": "Not accepted:", "stale": "Results not updated:", "info": ""}


class MessageBar(QWidget):
    """A strip above the panels; hidden until :meth:`show_message`."""

    def __init__(self, parent: QWidget | None = None):
        super().__init__(parent)
        self.setObjectName("messageBar")
        self.setAttribute(Qt.WidgetAttribute.WA_StyledBackground, True)
        self.kind = ""
        self.title = QLabel()
        font = self.title.font()
        font.setBold(True)
        self.title.setFont(font)
        self.label = QLabel()
        self.label.setObjectName("messageText")
        self.label.setWordWrap(True)
        self.label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        close = QToolButton()
        close.setText("✕")
        close.setAutoRaise(True)
        close.setToolTip("Dismiss")
        close.clicked.connect(self.dismiss)
        layout = QHBoxLayout(self)
        layout.setContentsMargins(8, 3, 4, 3)
        layout.addWidget(self.title, 0, Qt.AlignmentFlag.AlignTop)
        layout.addWidget(self.label, 1)
        layout.addWidget(close, 0, Qt.AlignmentFlag.AlignTop)
        self.hide()

    def show_message(self, text: str, kind: str = "refused") -> None:
        """Show ``text``; ``kind`` is "refused", "stale" (results out of date) or "info"."""
        self.kind = kind
        self.setStyleSheet(_STYLES.get(kind, _STYLES["info"]))
        self.title.setText(_TITLES.get(kind, ""))
        self.title.setVisible(bool(_TITLES.get(kind)))
        self.label.setText(text)
        self.show()

    def text(self) -> str:
        """The message shown ("" when hidden)."""
        return "" if self.isHidden() else self.label.text()

    def dismiss(self, kind: str | None = None) -> None:
        """Hide the strip (only if it shows a message of ``kind`` when given)."""
        if kind is None or kind == self.kind:
            self.kind = ""
            self.label.setText("")
            self.hide()
