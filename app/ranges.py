"""The range of every number a user types, the same at every door: the CLI checks what the API models check.

>>> within(7.0, "--ph", "ph")
7.0
>>> within(1e308, "VALUE", "potential")
Traceback (most recent call last):
...
electrosieve.engine.errors.InputError: VALUE must be between -5 and 5 V (given 1e+308)
"""

from electrosieve.engine.errors import InputError

from .models import PLOT, POTENTIAL_LIMIT, WEIGHT_MAX

__all__ = ["RANGES", "within"]

RANGES = {
    "ph": (PLOT.ph_min, PLOT.ph_max, ""),
    "potential": (-POTENTIAL_LIMIT, POTENTIAL_LIMIT, " V"),
    "weight": (0.0, WEIGHT_MAX, ""),
}
"""Allowed (low, high, unit) per kind of number, as ``app.models`` declares them for the API."""


def within(value: float, field: str, kind: str) -> float:
    """``value`` when it lies in the range of ``kind``; else an :class:`InputError` naming ``field``."""
    low, high, unit = RANGES[kind]
    if not low <= value <= high:  # NaN fails too
        raise InputError(f"{field} must be between {low:g} and {high:g}{unit} (given {value:g})", field=field)
    return value
