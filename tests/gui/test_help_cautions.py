"""The methods page names every method with its source; the cautions are always in view."""

from __future__ import annotations

import pytest
from PySide6.QtWidgets import QDialog

from app.cautions import CautionsBanner
from app.help_page import METHODS, HelpDialog, MethodsPage, methods_html
from hydraulics.cautions import CAUTIONS_SHORT, CAUTIONS_TEXT
from hydraulics.model import Criteria

# The offscreen platform warns whenever a top-level widget with a layout is shown; the
# message says nothing about our widgets, so only that one message is let through.
pytestmark = pytest.mark.qt_log_ignore(r"This plugin does not support propagateSizeHints\(\)")

# Each method the engine uses and a phrase naming its source that the page must show.
EXPECTED = [
    ("Darcy–Weisbach", "Weisbach"),
    ("Colebrook–White", "Colebrook, C. F. (1939)"),
    ("Lambert W", "Keady (1998)"),
    ("Clamond", "Ind. Eng. Chem. Res. 48"),
    ("64/Re", "Hagen–Poiseuille"),
    ("2000 < Re < 4000", "flagged"),
    ("Hazen–Williams", "Williams, G. S. & Hazen, A. (1920)"),
    ("K · v²/(2g)", "Crane"),
    ("K = N · fT", "Technical Paper No. 410"),
    ("IAPWS-IF97", "R7-97"),
    ("IAPWS 2008 viscosity", "R12-08"),
    ("ISO 2533", "Standard Atmosphere"),
    ("least-squares", "Legendre"),
    ("Affinity laws", "Pump Handbook"),
    ("flows add at equal head", "heads add at equal flow"),
    ("Bracketing root finder", "Chandrupatla"),
    ("NPSH available", "ISO 9906"),
    ("ANSI/HI 9.6.1", "NPSH Margin"),
    ("ANSI/HI 9.6.3", "70 %–120 %"),
    ("Velocity limits", "Common practice"),
    ("ρ g Q H / η", "ISO 9906:2012"),
]


@pytest.fixture
def page_text(qtbot) -> str:
    page = MethodsPage()
    qtbot.addWidget(page)
    return page.toPlainText()


@pytest.mark.parametrize(("method", "source"), EXPECTED)
def test_methods_page_names_each_method_and_its_source(page_text, method, source):
    assert method.lower() in page_text.lower()
    assert source in page_text


def test_every_method_entry_has_a_source(page_text):
    for entry in METHODS:
        assert entry.name in page_text
        assert entry.source.strip()
        assert entry.use.strip()


def test_page_quotes_the_project_criteria(qtbot):
    page = MethodsPage(criteria=Criteria(npsh_margin_ratio=1.3, preferred_region_low=0.8))
    qtbot.addWidget(page)
    text = page.toPlainText()
    assert "1.30 × NPSHr" in text
    assert "80 %–120 %" in text
    assert "1.10 × NPSHr" in MethodsPage().toPlainText() or "1.10 × NPSHr" in methods_html()


def test_page_ends_with_the_cautions(page_text):
    assert "Cautions" in page_text
    assert CAUTIONS_TEXT in page_text


def test_cautions_text_says_what_matters():
    text = CAUTIONS_TEXT.lower()
    for phrase in ("preliminary", "surge", "water hammer", "structural", "electrical", "specialist",
                   "local codes", "licensed engineer"):
        assert phrase in text
    short = CAUTIONS_SHORT.lower()
    for phrase in ("preliminary", "surge", "structural", "electrical", "licensed engineer"):
        assert phrase in short


def test_banner_is_a_slim_widget_with_the_cautions(qtbot):
    banner = CautionsBanner()
    qtbot.addWidget(banner)
    assert not isinstance(banner, QDialog)
    assert banner.toolTip() == CAUTIONS_TEXT == banner.text()
    assert banner.sizeHint().height() < 40  # one line
    banner.resize(1400, banner.sizeHint().height())
    banner.show()
    qtbot.waitExposed(banner)
    assert banner.label.text() == CAUTIONS_SHORT  # wide enough: the whole sentence
    banner.resize(400, banner.sizeHint().height())
    qtbot.waitUntil(lambda: banner.label.text().endswith("…"), timeout=1000)
    assert CAUTIONS_SHORT.startswith(banner.label.text()[:-1])
    with qtbot.waitSignal(banner.helpRequested, timeout=1000):
        banner.link.linkActivated.emit("methods")


def test_help_dialog_is_not_modal_and_renders(qtbot, tmp_path):
    dialog = HelpDialog()
    qtbot.addWidget(dialog)
    assert not dialog.isModal()
    dialog.show()
    qtbot.waitExposed(dialog)
    banner = CautionsBanner()
    qtbot.addWidget(banner)
    banner.resize(1200, banner.sizeHint().height())
    banner.show()
    qtbot.waitExposed(banner)
    for name, widget in (("help", dialog), ("banner", banner)):
        path = tmp_path / f"{name}.png"
        assert widget.grab().save(str(path))
        assert path.stat().st_size > 1000
    dialog.close()
