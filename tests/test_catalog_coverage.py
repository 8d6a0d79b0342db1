"""Catalog-wide checks: every element has a published cross-check, and every data file's content is pinned."""

import importlib
import tomllib

import pytest

from electrosieve.engine.catalog import builtin_data_dir, default_catalog
from tests.utils.checksums import SPECIES_CHECKSUMS
from tests.utils.libraries import CRC_SOLID_CAS, LIBRARY_TOLERANCE, crc_standard_gibbs, crc_value
from tests.utils.reactions import _side

GROUP_MODULES = ("tests.test_species_core", "tests.test_species_noble", "tests.test_species_transition",
                 "tests.test_species_post_transition", "tests.test_species_audit")

WITHOUT_CROSS_CHECK: dict[str, str] = {}
"""Elements still lacking an independently tabulated check; the suite fails if this list must grow."""


def _checked_elements() -> set[str]:
    checked = set()
    for name in GROUP_MODULES:
        module = importlib.import_module(name)
        checked |= {check.element for check in module.CHECKS}
        checked |= {row[0] for row in getattr(module, "LABELLED_CHECKS", [])}
    return checked


def test_every_element_has_a_published_cross_check_or_is_listed():
    missing = set(default_catalog().systems) - _checked_elements()
    assert missing <= set(WITHOUT_CROSS_CHECK), f"elements without a cross-check: {sorted(missing - set(WITHOUT_CROSS_CHECK))}"


def test_the_list_of_unchecked_elements_is_not_stale():
    assert not set(WITHOUT_CROSS_CHECK) & _checked_elements()


def _checksum(path) -> tuple[int, float]:
    with path.open("rb") as handle:
        rows = tomllib.load(handle)["species"]
    return len(rows), round(sum(row["dgf"] for row in rows), 3)


SPECIES_FILES = sorted((builtin_data_dir() / "species").glob("*.toml"))


@pytest.mark.parametrize("path", SPECIES_FILES, ids=lambda p: p.name)
def test_species_file_checksums(path):
    """Row count and sum of dgf per file, pinned in tests/utils/checksums.py: every data edit is deliberate."""
    assert path.name in SPECIES_CHECKSUMS, f"{path.name}: add its checksum to tests/utils/checksums.py"
    assert _checksum(path) == SPECIES_CHECKSUMS[path.name]


def test_no_checksum_for_a_missing_file():
    assert set(SPECIES_CHECKSUMS) == {path.name for path in SPECIES_FILES}


# --- the CRC tables (reference library) against every species they carry ---

CRC_DIFFERENCES = {
    ("C", "CH4"): "0.2 kJ/mol: NBS -50.72 against the CRC's CODATA-based -50.5; within the tolerance, listed for the record",
    ("Fe", "Fe^2+"): "Fe.toml keeps Bard, Parsons & Jordan's E0(Fe2+/Fe) = -0.447 V; the NBS/CRC -78.9 gives -0.409 V",
    ("Fe", "Fe^3+"): "follows the Fe2+ row through E0(Fe3+/Fe2+) = 0.771 V",
    ("Fe", "FeOH^+"): "derived from the catalog's Fe2+ with Baes & Mesmer's hydrolysis constant",
    ("Fe", "FeOH^2+"): "derived from the catalog's Fe3+ with Baes & Mesmer's hydrolysis constant",
    ("Pb", "PbOH^+"): "the NBS/CRC row implies log *beta11 = -6.2; Baes & Mesmer's -7.71 is used",
    ("Sn", "SnOH^+"): "the NBS/CRC row implies log *beta11 = -1.7; Baes & Mesmer's -3.40 is used",
    ("Cd", "CdOH^+"): "the NBS/CRC row implies log *beta11 = -9.4; Baes & Mesmer's -10.08 is used",
    ("Sn", "SnO"): "the CRC follows CODATA 1989; the catalog keeps NBS 1982 with the NBS Sn2+ and SnO2",
    ("Sn", "SnO2"): "the CRC follows CODATA 1989; the NBS value reproduces the tabulated SnO2/Sn potential",
    ("Zn", "ZnO"): "the CRC follows CODATA 1989 (-320.5); Zn.toml keeps the NBS -318.30 with the NBS Zn2+ and ZnO2 2-",
    ("Pt", "Pt^2+"): "the CRC's 254.8 implies Pt2+/Pt 1.32 V, 0.14 V off the tabulated 1.18 V; Pourbaix's value is kept "
                     "and never combined with complex constants from another source",
}
"""Each catalog-vs-CRC difference above LIBRARY_TOLERANCE [kJ/mol], with the reason (CH4 is within it)."""


def _crc_pairs():
    catalog = default_catalog()
    for element, system in catalog.systems.items():
        for species in system.species:
            found = crc_value(species)
            if found is not None:
                yield element, species, found


def test_crc_tables_agree_with_every_species_they_carry_or_the_difference_is_explained():
    pairs = list(_crc_pairs())
    assert len(pairs) >= 100, len(pairs)
    unexplained = [f"{e} {s.name}: catalog {s.dgf}, {where} {value:.1f}" for e, s, (where, value) in pairs
                   if abs(s.dgf - value) > LIBRARY_TOLERANCE and (e, s.name) not in CRC_DIFFERENCES]
    assert not unexplained, unexplained
    matched = {(e, s.name) for e, s, _ in pairs}
    assert set(CRC_DIFFERENCES) <= matched, "an explanation names a species the CRC tables do not carry"


def test_every_solid_in_the_cas_map_is_a_catalog_species():
    catalog = default_catalog()
    for element, name in CRC_SOLID_CAS:
        catalog.system(element).find(name)


def test_formula_lookup_trap_titanium_monoxide():
    """The library's formula look-up gives TiO the CAS number its CRC table files as Ti3O5: look solids up by CAS."""
    chemicals = pytest.importorskip("chemicals")
    by_formula = chemicals.CAS_from_any("TiO")
    assert by_formula != CRC_SOLID_CAS[("Ti", "TiO")]
    assert by_formula == CRC_SOLID_CAS[("Ti", "Ti3O5")]
    assert crc_standard_gibbs(by_formula) == pytest.approx(default_catalog().system("Ti").find("Ti3O5").dgf, abs=0.1)


def test_crc_platinum_and_palladium_ions_are_off_the_tabulated_potentials():
    """CRC aqueous Pt2+ and Pd2+ imply E0 about 0.14 V and 0.04 V off the tabulated 1.18 V and 0.951 V
    (Bard, Parsons & Jordan 1985, recalled): never combine them with complex constants from another source."""
    from tests.utils.libraries import crc_aqueous_gibbs

    table = crc_aqueous_gibbs()
    assert abs(table["Pt+2"] / (2 * 96.485) - 1.18) > 0.1
    assert abs(table["Pd+2"] / (2 * 96.485) - 0.951) > 0.03
    assert abs(default_catalog().system("Pt").find("Pt^2+").dgf / (2 * 96.485) - 1.18) < 0.015


# --- species with no independent check ---

SOLVENT = {"H2O", "H^+", "OH^-", "e-"}


def _checked_species() -> set[tuple[str, str]]:
    """(element, species) covered by a published check: a CRC value within tolerance, or a tabulated
    potential or constant reproduced in a species test."""
    checked = {(e, s.name) for e, s, (_, value) in _crc_pairs() if abs(s.dgf - value) <= LIBRARY_TOLERANCE}
    for name in GROUP_MODULES:
        module = importlib.import_module(name)
        for check in module.CHECKS:
            left, right = check.reaction.split("=")
            checked |= {(check.element, species) for _, species in _side(left) + _side(right)} - \
                {(check.element, s) for s in SOLVENT}
        for row in [*getattr(module, "LABELLED_CHECKS", []), *getattr(module, "LABELLED_LOGK", [])]:
            checked |= {(row[0], species) for species in row[1] if species not in SOLVENT}
    return checked


def _unchecked_by_element() -> dict[str, list[str]]:
    checked = _checked_species()
    catalog = default_catalog()
    return {element: [s.name for s in system.species if not s.is_element and (element, s.name) not in checked]
            for element, system in sorted(catalog.systems.items())}


def test_species_without_an_independent_check_are_listed_in_their_files(capsys):
    """Prints the species no published check covers; each species file lists the same names (``unchecked``),
    which the material pages show."""
    computed = _unchecked_by_element()
    with capsys.disabled():
        total = sum(len(names) for names in computed.values())
        print(f"\nspecies with no independent check ({total}):")
        for element, names in computed.items():
            if names:
                print(f"  {element}: {', '.join(names)}")
    catalog = default_catalog()
    stale = {e: (sorted(names), sorted(catalog.system(e).unchecked))
             for e, names in computed.items() if sorted(names) != sorted(catalog.system(e).unchecked)}
    assert not stale, f"update 'unchecked' in these species files (computed, listed): {stale}"


def test_material_page_shows_its_unchecked_species():
    from fastapi.testclient import TestClient

    from electrosieve.app.main import create_app

    client = TestClient(create_app())
    page = client.get("/materials/Ti.json").json()
    assert set(page["unchecked"]) == {s.name for s in default_catalog().unchecked("Ti")} and "TiH2" in page["unchecked"]
    assert "TiH2" in client.get("/materials/Ti").text.split("without an independent check")[1]
