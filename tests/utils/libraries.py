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


CRC_SOLID_CAS = {
    # (element, catalog name) -> CAS number of that phase in CRC_standard_data. Looked up by the CAS of the
    # phase meant, never by formula: chemicals.CAS_from_any("TiO") returns 12065-65-5, which the CRC table
    # lists as Ti3O5 (tests/test_catalog_coverage.py keeps this trap in view). Labelled polymorphs map only
    # the form the CRC row describes.
    ("Ag", "Ag2O"): "20667-12-3", ("Al", "Al2O3"): "1344-28-1", ("C", "CH4"): "74-82-8",
    ("Cd", "Cd(OH)2"): "21041-95-2", ("Cd", "CdO"): "1306-19-0",
    ("Co", "Co(OH)2"): "21041-93-0", ("Co", "CoO"): "1307-96-6", ("Co", "Co3O4"): "1308-06-1",
    ("Cr", "Cr2O3"): "1308-38-9", ("Cu", "Cu2O"): "1317-39-1", ("Cu", "CuO"): "1317-38-0",
    ("Fe", "Fe2O3"): "1309-37-1", ("Ga", "Ga(OH)3"): "12023-99-3", ("Ga", "Ga2O3"): "12024-21-4",
    ("Ge", "GeO2 (tetragonal)"): "1310-53-8", ("Hf", "HfO2"): "12055-23-1", ("Hg", "HgO (red)"): "21908-53-2",
    ("In", "In2O3"): "1312-43-2", ("Bi", "Bi2O3"): "1304-76-3",
    ("Mg", "Mg(OH)2"): "1309-42-8", ("Mg", "MgO"): "1309-48-4",
    ("Mn", "MnO"): "1344-43-0", ("Mn", "Mn2O3"): "1317-34-6", ("Mn", "MnO2"): "1313-13-9",
    ("Mn", "Mn3O4"): "1317-35-7",
    ("Mo", "MoO2"): "18868-43-4", ("Mo", "MoO3"): "1313-27-5",
    ("Nb", "NbO"): "12034-57-0", ("Nb", "NbO2"): "12034-59-2", ("Nb", "Nb2O5"): "1313-96-8",
    ("Ni", "Ni(OH)2"): "12054-48-7", ("Os", "OsO4"): "20816-12-0", ("Os", "OsO4 (g)"): "20816-12-0",
    ("Pb", "PbO (red)"): "1317-36-8", ("Pb", "Pb3O4"): "1314-41-6", ("Pb", "PbO2"): "1309-60-0",
    ("Re", "Re2O7"): "1314-68-7", ("Sb", "Sb2O5"): "1314-60-9",
    ("Sn", "SnO"): "21651-19-4", ("Sn", "Sn(OH)2"): "12026-24-3", ("Sn", "SnO2"): "18282-10-5",
    ("Ta", "Ta2O5"): "1314-61-0",
    ("Ti", "TiO"): "12137-20-1", ("Ti", "Ti2O3"): "1344-54-3", ("Ti", "Ti3O5"): "12065-65-5",
    ("Ti", "TiO2 (rutile)"): "1317-80-2",
    ("V", "VO"): "12035-98-2", ("V", "V2O3"): "1314-34-7", ("V", "V2O5"): "1314-62-1",
    ("W", "WO2"): "12036-22-5", ("W", "WO3"): "1314-35-8",
    ("Zn", "ZnO"): "1314-13-2", ("Zn", "Zn(OH)2"): "20427-58-1",
    ("Zr", "ZrO2"): "1314-23-4", ("Zr", "ZrH2"): "7704-99-6",
}
"""Every condensed catalog species the CRC standard table carries with a Gibbs energy."""

CRC_AQUEOUS_ALIASES = {"HCOO^-": "CHOO-"}
"""Catalog names the CRC aqueous table writes otherwise (formate as CHOO-)."""


def crc_value(species) -> tuple[str, float] | None:
    """(where in the CRC tables, ΔGf° [kJ/mol]) for a catalog species, or None when the tables lack it."""
    if species.is_element:
        return None
    if species.is_dissolved:
        formula = CRC_AQUEOUS_ALIASES.get(species.name, ion_formula(species.formula, species.charge))
        value = crc_aqueous_gibbs().get(formula)
        return None if value is None else (f"CRC aqueous {formula}", value)
    cas = CRC_SOLID_CAS.get((species.element, species.name))
    if cas is None:
        return None
    column = GIBBS_COLUMN[species.phase]
    value = crc_standard_gibbs(cas, column)
    return None if value is None else (f"CRC standard {cas} {column}", value)
