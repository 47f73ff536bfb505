"""Physical constants used throughout the engine (SI)."""

STANDARD_GRAVITY_M_S2 = 9.80665
"""Standard acceleration of gravity g_n, exact by definition (CGPM 1901; ISO 80000-3)."""

STANDARD_ATMOSPHERE_PA = 101325.0
"""Standard atmosphere at mean sea level, exact by definition (ISO 2533:1975)."""

ZERO_CELSIUS_K = 273.15
"""Kelvin temperature of 0 °C, exact by definition (SI Brochure, 9th edition)."""
