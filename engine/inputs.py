"""The allowed ranges of the engine's inputs and the checks that enforce them.

Every door (Python, CLI, API, pages) meets the same limits: the lower modules
(``thermo``, ``window``) and the front door (``diagram``) import them from here.
"""

import math

from .errors import InputError

__all__ = ["ACTIVITY_RANGE", "DEFAULT_ACTIVITY", "LIGAND_ACTIVITY_RANGE", "TEMPERATURE_RANGE_C", "check_activity",
           "check_number", "check_temperature"]

DEFAULT_ACTIVITY = 1e-6
"""Activity of every dissolved species: 10^-6, the usual corrosion convention (Pourbaix 1966, ch. 3) [common practice]."""

ACTIVITY_RANGE = (1e-8, 1.0)
"""Allowed dissolved-species activities."""

LIGAND_ACTIVITY_RANGE = (1e-8, 20.0)
"""Allowed free-ligand activities (saturated NaCl has a(Cl−) near 6; common practice)."""

TEMPERATURE_RANGE_C = (0.0, 150.0)
"""Allowed temperatures [°C]: liquid water at or above its saturation pressure."""


def check_number(value, field: str, low: float | None = None, high: float | None = None, what: str = "") -> float:
    """``value`` as a finite float within [low, high], or an :class:`InputError` naming ``field``.

    >>> check_number(3, "ph", 0, 14)
    3.0
    """
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"{field} must be a number (given {value!r})", field=field)
    value = float(value)
    if not math.isfinite(value):
        raise InputError(f"{field} must be a finite number (given {value!r})", field=field)
    if (low is not None and value < low) or (high is not None and value > high):
        raise InputError(f"{field} must be between {low:g} and {high:g}{what} (given {value:g})", field=field)
    return value


def check_activity(activity) -> float:
    """The dissolved-species activity, checked against :data:`ACTIVITY_RANGE`."""
    return check_number(activity, "activity", *ACTIVITY_RANGE)


def check_temperature(temperature_c) -> float:
    """The temperature [°C], checked against :data:`TEMPERATURE_RANGE_C`."""
    return check_number(temperature_c, "temperature", *TEMPERATURE_RANGE_C, what=" °C")
