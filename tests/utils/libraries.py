"""The general-purpose reference libraries the species tests compare the catalog with (test-only dependencies).

- ``thermo.electrochem.CRC_aqueous_thermodynamics``: the CRC Handbook's aqueous ions, by formula
  (``Cu+2``, ``ReO4-``), with ``Gf(aq)`` in J/mol.
- ``chemicals.heat_capacity.CRC_standard_data``: the CRC Handbook's solids, liquids and gases, by CAS
  number, with ``Gfs``, ``Gfl`` and ``Gfg`` in J/mol.

Each function skips the calling test when its library is missing.
"""

import math
from functools import lru_cache

import pytest

LIBRARY_TOLERANCE = 2.0
"""kJ/mol: a catalog ΔGf° further than this from a library's must be explained beside the check."""

GIBBS_COLUMN = {"solid": "Gfs", "liquid": "Gfl", "gas": "Gfg"}
"""The column of ``CRC_standard_data`` holding ΔGf° of each phase."""


def ion_formula(formula: str, charge: int) -> str:
    """An ion as the aqueous table writes it: Cu+2, Ag+, Hg2+2, ReO4-; a neutral solute as its formula."""
    if charge == 0:
        return formula
    sign = "+" if charge > 0 else "-"
    return f"{formula}{sign}{abs(charge) if abs(charge) > 1 else ''}"


def crc_aqueous_gibbs() -> dict[str, float]:
    """ΔGf° [kJ/mol] of every solute in the CRC aqueous table that has one, by the table's formula."""
    pytest.importorskip("thermo.electrochem")
    return _aqueous()


@lru_cache(maxsize=1)
def _aqueous() -> dict[str, float]:
    from thermo.electrochem import CRC_aqueous_thermodynamics as table

    return {formula: gibbs / 1000.0 for formula, gibbs in zip(table["Formula"], table["Gf(aq)"])
            if not math.isnan(gibbs)}


def crc_standard_gibbs(cas: str, column: str = "Gfs") -> float | None:
    """ΔGf° [kJ/mol] in ``CRC_standard_data`` for CAS number ``cas`` (``column`` Gfs, Gfl or Gfg), or None."""
    heat_capacity = pytest.importorskip("chemicals.heat_capacity")
    table = heat_capacity.CRC_standard_data
    if cas not in table.index:
        return None
    value = table.loc[cas, column]
    return None if math.isnan(value) else value / 1000.0
