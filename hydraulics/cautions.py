"""The cautions every PumpSketch result carries: one text for the window, the command line,
the JSON results and every report.

Plain text, no markup: the window escapes it for its pages, the text report wraps it, the JSON
carries it as it is (key ``cautions``).
"""

CAUTIONS_TEXT = (
    "Preliminary design aid. The results are preliminary estimates by simplified published methods "
    "and are only as good as the data entered. Surge (water hammer), structural and electrical checks "
    "need specialist analysis. Local codes and standards and a licensed engineer govern the design."
)
"""The full paragraph: in every report, the JSON results, the methods page, the About box and the
window banner's tooltip."""

CAUTIONS_SHORT = (
    "Preliminary design aid: surge, structural and electrical checks need specialist analysis; "
    "local codes and a licensed engineer govern the design."
)
"""The one-line form, for the window's banner (where a paragraph does not fit)."""
