"""Chemical formulas: parse a composition and write a species' name with its charge.

Formulas are written the usual way, with optional parentheses and no charge:
``NiO(OH)``, ``Fe(OH)3``, ``HCOOH``, ``Cr2O7``. The charge is a separate integer
and is shown after a caret: ``Zn^2+``, ``HZnO2^-``, ``CrO4^2-`` (the caret keeps
``CrO4^2-`` from reading as ``CrO42-``).
"""

import re
from collections import Counter

_TOKEN = re.compile(r"([A-Z][a-z]?)(\d*)|(\()|(\))(\d*)")


class FormulaError(ValueError):
    """A formula that cannot be read."""


def parse_formula(formula: str) -> dict[str, int]:
    """Count the atoms of each element in ``formula``.

    >>> parse_formula("NiO(OH)")
    {'Ni': 1, 'O': 2, 'H': 1}
    >>> parse_formula("Fe(OH)3")
    {'Fe': 1, 'O': 3, 'H': 3}
    """
    stack: list[Counter] = [Counter()]
    position = 0
    while position < len(formula):
        match = _TOKEN.match(formula, position)
        if match is None:
            raise FormulaError(f"cannot read {formula!r} at character {position + 1} ({formula[position]!r})")
        symbol, count, opening, closing, group_count = match.groups()
        if symbol:
            stack[-1][symbol] += int(count or 1)
        elif opening:
            stack.append(Counter())
        else:
            if len(stack) == 1:
                raise FormulaError(f"unbalanced ')' in {formula!r}")
            group = stack.pop()
            for element, n in group.items():
                stack[-1][element] += n * int(group_count or 1)
        position = match.end()
    if len(stack) != 1 or not formula:
        raise FormulaError(f"unbalanced '(' or empty formula in {formula!r}")
    return dict(stack[0])


def charge_suffix(charge: int) -> str:
    """The charge as written after a caret: ``2+``, ``-``, ``3-``; empty when neutral.

    >>> charge_suffix(2), charge_suffix(-1), charge_suffix(0)
    ('2+', '-', '')
    """
    if charge == 0:
        return ""
    sign = "+" if charge > 0 else "-"
    magnitude = abs(charge)
    return f"{magnitude if magnitude > 1 else ''}{sign}"


def ion_name(formula: str, charge: int) -> str:
    """A species' formula with its charge after a caret.

    >>> ion_name("CrO4", -2)
    'CrO4^2-'
    >>> ion_name("Zn", 0)
    'Zn'
    """
    suffix = charge_suffix(charge)
    return f"{formula}^{suffix}" if suffix else formula
