"""Atmospheric pressure at a site from its altitude, by the standard atmosphere (troposphere)."""

from __future__ import annotations

from typing import Final

import numpy as np

from hydraulics.constants import STANDARD_ATMOSPHERE_PA
from hydraulics.model import ModelError

__all__ = ["ALTITUDE_MIN_M", "ALTITUDE_MAX_M", "EARTH_RADIUS_M", "geopotential_altitude",
           "standard_atmosphere_pressure"]

ALTITUDE_MIN_M: Final = -500.0
"""Lowest site altitude accepted (m above mean sea level)."""

ALTITUDE_MAX_M: Final = 11000.0
"""Highest site altitude accepted: the top of the troposphere layer of the standard atmosphere (m)."""

EARTH_RADIUS_M: Final = 6_356_766.0
"""Effective Earth radius r0 relating geometric and geopotential altitude (U.S. Standard Atmosphere 1976)."""

_LAPSE_OVER_T0_PER_M: Final = 2.25577e-5
"""L_b / T_b = 0.0065 K/m / 288.15 K (ISO 2533; U.S. Standard Atmosphere 1976)."""

_EXPONENT: Final = 5.25588
"""g0 M / (R* L_b) for the troposphere layer (ISO 2533; U.S. Standard Atmosphere 1976)."""


def geopotential_altitude(altitude_m: float | np.ndarray) -> float | np.ndarray:
    r"""Geopotential altitude H of a geometric altitude Z [m].

    .. math:: H = \frac{r_0 Z}{r_0 + Z}, \qquad r_0 = 6\,356\,766\ \mathrm{m}

    (U.S. Standard Atmosphere 1976, Eq. 18.)  The two differ by less than 0.2 % below
    11 km: 1000 m geometric is 999.84 m geopotential.

    >>> round(geopotential_altitude(1000.0), 4)
    999.8427
    """
    z = np.asarray(altitude_m, dtype=np.float64)
    h = EARTH_RADIUS_M * z / (EARTH_RADIUS_M + z)
    return float(h) if np.ndim(altitude_m) == 0 else h


def standard_atmosphere_pressure(altitude_m: float | np.ndarray) -> float | np.ndarray:
    r"""Atmospheric pressure of the standard atmosphere at an altitude [Pa].

    Barometric formula of the troposphere layer of the ISO 2533 standard atmosphere,
    identical to the U.S. Standard Atmosphere 1976 below 11 km (temperature falling
    linearly at 6.5 K/km from 288.15 K):

    .. math:: p = 101\,325\ \mathrm{Pa}\,\bigl(1 - 2.25577\times10^{-5}\,H\bigr)^{5.25588}

    where H [m] is the geopotential altitude, computed here from the geometric
    altitude by :func:`geopotential_altitude`.

    Parameters
    ----------
    altitude_m : float or ndarray
        Geometric altitude of the site above mean sea level [m]; valid −500 m to
        11 000 m.

    Returns
    -------
    float or ndarray
        Pressure [Pa] (a float for scalar input).  Actual barometric pressure varies
        with weather by a few per cent about this value.

    Raises
    ------
    ModelError
        ``site.altitude`` outside −500 m to 11 000 m, or not finite.

    Examples
    --------
    U.S. Standard Atmosphere 1976 table: 1000 m → 8.9876 × 10⁴ Pa.

    >>> round(standard_atmosphere_pressure(1000.0))
    89876
    """
    z = np.asarray(altitude_m, dtype=np.float64)
    if not np.all(np.isfinite(z)):
        raise ModelError("site.altitude", "must be a finite number of metres", altitude_m)
    if z.size and (np.min(z) < ALTITUDE_MIN_M or np.max(z) > ALTITUDE_MAX_M):
        bad = float(z[(z < ALTITUDE_MIN_M) | (z > ALTITUDE_MAX_M)].flat[0])
        raise ModelError(
            "site.altitude",
            f"allowed {ALTITUDE_MIN_M:g} to {ALTITUDE_MAX_M:g} m above sea level "
            f"(standard atmosphere, troposphere); got {bad:g} m",
            bad,
        )
    h = EARTH_RADIUS_M * z / (EARTH_RADIUS_M + z)
    pressure = STANDARD_ATMOSPHERE_PA * (1.0 - _LAPSE_OVER_T0_PER_M * h) ** _EXPONENT
    return float(pressure) if np.ndim(altitude_m) == 0 else pressure
