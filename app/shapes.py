"""The shape of a point-or-range input (``ph``, ``potential``): one number, or a pair [low, high].

Checked before the numbers themselves, so a wrong shape is told as such rather than as "not a number".

>>> point_or_pair([1, 2])
[1, 2]
>>> point_or_pair([1, 2, 3])
Traceback (most recent call last):
...
pydantic_core._pydantic_core.PydanticCustomError: must be one number or a pair [low, high] (given a list of 3)
"""

from pydantic import BeforeValidator
from pydantic_core import PydanticCustomError

__all__ = ["POINT_OR_PAIR", "point_or_pair"]

_NAMES = {str: "text", dict: "an object", bool: "true/false", type(None): "null"}


def point_or_pair(value):
    """``value`` unchanged when it is a number, a list of one or two items, or None (an optional field left out);
    else a readable error."""
    if value is None:
        return value
    if isinstance(value, list):
        if len(value) in (1, 2):
            return value
        given = "an empty list" if not value else f"a list of {len(value)}"
    elif isinstance(value, (int, float)) and not isinstance(value, bool):
        return value
    else:
        given = _NAMES.get(type(value), type(value).__name__)
    raise PydanticCustomError("point_or_pair", "must be one number or a pair [low, high] (given {given})",
                              {"given": given})


POINT_OR_PAIR = BeforeValidator(point_or_pair)
"""Annotate a point-or-range field with this."""
