"""A container that keeps a panel's re-layouts from spreading through the window.

Qt passes every widget's geometry update (a label given new text, a button whose caption
changes) up through every enclosing layout to the window, whether or not any size hint
changed: each layout, once it has laid out its children again, calls ``updateGeometry()``
on its own widget.  On the way up, a ``QTabWidget`` that receives the request lays out
its tab bar and page afresh and repaints its whole area, so a one-word change in a
label on a tab page redraws every table and button on that page.

:class:`LayoutBarrier` holds one widget and fills itself with it.  It reports the
child's size hints, size policy and size limits as its own, and tells its parent about
a change only when one of those really changed, so a new label text costs a repaint of
the label alone.
"""

from __future__ import annotations

from PySide6.QtCore import QEvent, QSize
from PySide6.QtGui import QResizeEvent
from PySide6.QtWidgets import QWidget


class LayoutBarrier(QWidget):
    """Shows ``child`` filling the barrier; passes on geometry updates only on real change."""

    def __init__(self, child: QWidget, parent: QWidget | None = None):
        super().__init__(parent)
        self._child = child
        child.setParent(self)
        self._hints = self._child_hints()
        self._adopt_limits()

    def _child_hints(self) -> tuple[object, ...]:
        child = self._child
        policy = child.sizePolicy()
        return (child.sizeHint(), child.minimumSizeHint(), child.minimumSize(), child.maximumSize(),
                policy.horizontalPolicy(), policy.verticalPolicy(),
                policy.horizontalStretch(), policy.verticalStretch(), child.hasHeightForWidth(),
                child.isHidden())

    def _adopt_limits(self) -> None:
        self.setSizePolicy(self._child.sizePolicy())
        self.setMaximumSize(self._child.maximumSize())

    # ---------------------------------------------------------------- size reporting
    def sizeHint(self) -> QSize:
        return self._child.sizeHint()

    def minimumSizeHint(self) -> QSize:
        return self._child.minimumSizeHint().expandedTo(self._child.minimumSize())

    def hasHeightForWidth(self) -> bool:
        return self._child.hasHeightForWidth()

    def heightForWidth(self, width: int) -> int:
        return self._child.heightForWidth(width)

    # ---------------------------------------------------------------- events
    def resizeEvent(self, event: QResizeEvent) -> None:
        self._child.setGeometry(self.rect())
        super().resizeEvent(event)

    def event(self, event: QEvent) -> bool:
        if event.type() == QEvent.Type.LayoutRequest:
            hints = self._child_hints()
            if hints != self._hints:
                self._hints = hints
                self._adopt_limits()
                self.updateGeometry()
            return True
        return super().event(event)
