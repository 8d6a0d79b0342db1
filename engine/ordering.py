"""Unknown is never best: sort keys that put a missing value after every known one, and honest wording.

A material with no dissolved species in the data, no price or no kinetic data is unknown on that
criterion, not best on it: it sorts after every known value, and its reason says "unknown" and why.
Dissolved-metal levels above 1 M lie outside the range where activities mean anything (the
dilute-solution conventions of the diagram, Pourbaix 1966, ch. 3): they read "dissolves freely (> 1 M)"
rather than as numbers such as 10^108.
"""

import math
from typing import Literal

__all__ = ["DISSOLVED_FREELY_LOG10", "Prefer", "dissolved_words", "order_key", "unknown_reason"]

Prefer = Literal["low", "high", "zero"]
"""What a criterion prefers: the lowest value, the highest, or the one closest to zero."""

DISSOLVED_FREELY_LOG10 = 0.0
"""log10 of 1 M: above it no solid holds the metal and the number itself means nothing (common practice)."""


def order_key(value: float | None, prefer: Prefer) -> tuple[int, float]:
    """A key that sorts better values first and every unknown (None or NaN) after every known value.

    >>> sorted([None, 0.3, -0.1], key=lambda v: order_key(v, "low"))
    [-0.1, 0.3, None]
    >>> sorted([-0.5, None, -0.01], key=lambda v: order_key(v, "zero"))
    [-0.01, -0.5, None]
    """
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return (1, 0.0)
    if prefer == "low":
        return (0, value)
    if prefer == "high":
        return (0, -value)
    if prefer == "zero":
        return (0, abs(value))
    raise ValueError(f"prefer must be 'low', 'high' or 'zero' (given {prefer!r})")


def unknown_reason(what: str, why: str) -> str:
    """The words shown for an unknown criterion.

    >>> unknown_reason("price", "no published price for Os")
    'price unknown (no published price for Os): ranked after every known price'
    """
    return f"{what} unknown ({why}): ranked after every known {what}"


def dissolved_words(log10_molal: float | None, element: str = "") -> str:
    """An equilibrium dissolved-metal level [log10 mol/kg ≈ log10 M] in plain words.

    >>> dissolved_words(108.3)
    'dissolves freely (> 1 M)'
    >>> dissolved_words(-0.04)
    'up to 0.91 M dissolved'
    >>> dissolved_words(-4.25)
    'up to 10^-4.2 M dissolved'
    >>> dissolved_words(None, "Ta")
    'dissolved metal unknown (no dissolved species of Ta in the data): ranked after every known dissolved metal'
    """
    if log10_molal is None:
        whose = f" of {element}" if element else ""
        return unknown_reason("dissolved metal", f"no dissolved species{whose} in the data")
    if log10_molal >= DISSOLVED_FREELY_LOG10:
        return "dissolves freely (> 1 M)"
    if log10_molal >= -2.0:
        return f"up to {10 ** log10_molal:.2g} M dissolved"
    return f"up to 10^{log10_molal:.1f} M dissolved"
