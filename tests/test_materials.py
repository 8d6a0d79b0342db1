"""The materials catalog (data/materials.toml): shape, safety flags, and prices and abundances cross-checked.

The catalog's prices come from the USGS Mineral Commodity Summaries 2024 and its
crustal abundances from the CRC Handbook (section 14), both recalled from
memory. They are compared here with the ``mendeleev`` package (a test-only
dependency): ``element(...).abundance_crust`` [mg/kg] is taken from the CRC
Handbook's "Abundance of Elements in the Earth's Crust and in the Sea" table,
and ``element(...).price_per_kg`` [USD/kg] is of unstated source and date.
"""

import math
import shutil
from pathlib import Path

import pytest

from electrosieve.engine.catalog import builtin_data_dir, default_catalog, load_catalog
from electrosieve.engine.errors import CatalogError
from electrosieve.engine.materials import FAMILIES

# The 35 metals of the element systems; each is a material whose id is its symbol.
METALS = ("Pt", "Pd", "Rh", "Ir", "Ru", "Au", "Ag", "Cu", "Ni", "Co", "Fe", "Cr", "Mn", "Zn", "Cd", "Pb", "Sn",
          "In", "Bi", "Sb", "Ti", "Zr", "V", "Nb", "Ta", "Mo", "W", "Al", "Mg", "Hg", "Re", "Ga", "Ge", "Os", "Hf")

# Pinned checksums of data/materials.toml: change them only together with a deliberate data edit.
ROW_COUNT = 51
ABUNDANCE_SUM_MG_PER_KG = 288779.9247
PRICE_SUM_USD_PER_KG = 663974.3693

# Catalog abundance vs mendeleev's abundance_crust (CRC Handbook table): agree within a factor of 2.
ABUNDANCE_FACTOR = 2.0
ABUNDANCE_DIFFERENCES: dict[str, str] = {}

# Catalog price (USGS, 2023 averages) vs mendeleev's price_per_kg (undated): agree within a factor of 5.
PRICE_FACTOR = 5.0
PRICE_DIFFERENCES = {
    "graphite": "mendeleev prices the element carbon at 0.12 USD/kg, a bulk-carbon figure; the catalog gives "
                "natural flake graphite (about 1.3 USD/kg), the form an electrode is made from.",
}


@pytest.fixture(scope="module")
def mendeleev_table():
    """mendeleev's element table (one row per element), read once: {symbol: {column: value or None}}."""
    fetch = pytest.importorskip("mendeleev.fetch")
    table = fetch.fetch_table("elements").set_index("symbol")
    columns = ("abundance_crust", "price_per_kg", "atomic_weight")
    return {
        symbol: {c: (None if math.isnan(row[c]) else float(row[c])) for c in columns}
        for symbol, row in table[list(columns)].iterrows()
    }


@pytest.fixture(scope="module")
def catalog():
    return default_catalog()


@pytest.fixture(scope="module")
def materials(catalog):
    return catalog.materials


def _phase(catalog, material):
    return catalog.systems[material.element].find(material.phase)


def _element_materials(catalog, materials):
    return [m for m in materials.values() if _phase(catalog, m).is_element]


def test_checksum_pins_every_data_edit(materials):
    assert len(materials) == ROW_COUNT
    abundances = [m.abundance_mg_per_kg for m in materials.values() if m.abundance_mg_per_kg is not None]
    prices = [m.price_usd_per_kg for m in materials.values() if m.price_usd_per_kg is not None]
    assert math.fsum(abundances) == pytest.approx(ABUNDANCE_SUM_MG_PER_KG, rel=1e-9)
    assert math.fsum(prices) == pytest.approx(PRICE_SUM_USD_PER_KG, rel=1e-9)


def test_every_metal_and_graphite_is_a_material(catalog, materials):
    assert len(materials) >= 44
    for symbol in METALS:
        assert symbol in materials, f"no material for the metal {symbol}"
        assert materials[symbol].element == symbol and materials[symbol].phase == symbol
    assert materials["Hg"].phase == "Hg" and _phase(catalog, materials["Hg"]).phase == "liquid"
    graphite = materials["graphite"]
    assert (graphite.element, graphite.phase, graphite.family) == ("C", "C", "carbon")
    for required in ("IrO2", "RuO2", "PbO2", "MnO2", "SnO2"):
        assert materials[required].family == "oxide"


def test_every_family_has_a_member(materials):
    present = {m.family for m in materials.values()}
    assert present == set(FAMILIES)


def test_families_follow_the_brief(materials):
    # Common practice (periodic-table groups), with the valve metals as electrochemists name them.
    expected = {
        "noble": {"Au", "Ag"},
        "platinum-group": {"Pt", "Pd", "Rh", "Ir", "Ru", "Os"},
        "valve metal": {"Ti", "Zr", "Hf", "Nb", "Ta", "Al", "W"},
        "transition": {"Cu", "Ni", "Co", "Fe", "Cr", "Mn", "Zn", "Cd", "V", "Mo", "Re"},
        "post-transition": {"Pb", "Sn", "In", "Bi", "Sb", "Ga", "Ge", "Hg", "Mg"},
        "carbon": {"graphite"},
    }
    for family, ids in expected.items():
        assert {m.id for m in materials.values() if m.family == family} == ids, family
    for odd_one in ("W", "Al", "Mg"):
        assert "Family:" in materials[odd_one].note, f"{odd_one}: the note should explain its family"


def test_ids_are_unique_ignoring_case(materials):
    lowered = [key.lower() for key in materials]
    assert len(set(lowered)) == len(lowered)
    assert all(key == m.id for key, m in materials.items())


def test_metal_phases_are_the_element_and_oxide_phases_are_solid_compounds(catalog, materials):
    for material in materials.values():
        phase = _phase(catalog, material)
        if material.family == "oxide":
            assert phase.region == "passivation", material.id
            assert phase.oxygen_atoms > 0, material.id
            assert material.note.startswith("Electrode use:"), f"{material.id}: say why it is an electrode"
        else:
            assert phase.is_element, material.id
            assert phase.region == "immunity", material.id


def test_rutile_is_the_titania_polymorph(materials):
    assert materials["TiO2"].phase == "TiO2 (rutile)"


def test_every_value_has_a_source_year_and_the_memory_flag(catalog, materials):
    for material in materials.values():
        if material.price_usd_per_kg is None:
            assert material.price_year is None and material.price_source is None, material.id
            assert "no price" in material.note.lower(), f"{material.id}: say why the price is missing"
        else:
            assert material.price_usd_per_kg > 0, material.id
            assert material.price_year == 2023 and material.price_source == "usgs_mcs2024", material.id
        assert material.abundance_mg_per_kg is not None and material.abundance_mg_per_kg > 0, material.id
        assert material.abundance_source == "crc_abundance", material.id
        assert material.from_memory, f"{material.id}: prices and abundances were recalled from memory"
    assert catalog.sources["usgs_mcs2024"].doi == "10.3133/mcs2024"
    assert "Abundance of Elements" in catalog.sources["crc_abundance"].table


def test_oxides_carry_their_element_abundance_and_contained_price(materials, mendeleev_table):
    from electrosieve.engine.formula import parse_formula

    for material in materials.values():
        if material.family != "oxide":
            continue
        metal = materials[material.element]
        assert material.abundance_mg_per_kg == metal.abundance_mg_per_kg, material.id
        if material.price_usd_per_kg is None:
            assert metal.price_usd_per_kg is None, f"{material.id}: the contained-element price is available"
            continue
        # Price of the contained element per kg of oxide, atomic masses from mendeleev (IUPAC standard weights).
        counts = parse_formula(material.id)
        masses = {symbol: mendeleev_table[symbol]["atomic_weight"] for symbol in counts}
        fraction = counts[material.element] * masses[material.element] / sum(n * masses[s] for s, n in counts.items())
        assert "contained" in material.note, material.id
        assert material.price_usd_per_kg == pytest.approx(metal.price_usd_per_kg * fraction, rel=0.005), material.id


def test_pgm_prices_are_troy_ounce_prices_converted(materials):
    # 1 kg = 1000 / 31.1034768 troy oz = 32.1507 troy oz (NIST SP 811, appendix B: troy ounce = 31.103 4768 g).
    for symbol in ("Pt", "Pd", "Rh", "Ir", "Ru", "Au", "Ag"):
        note = materials[symbol].note
        per_ounce = float(note.split("Price: ")[1].split(" USD/troy oz")[0].replace(",", ""))
        assert materials[symbol].price_usd_per_kg == pytest.approx(per_ounce * 1000 / 31.1034768, abs=1.0), symbol


def test_abundance_agrees_with_mendeleev(catalog, materials, mendeleev_table):
    """mendeleev's abundance_crust (CRC Handbook, Abundance of Elements in the Earth's Crust), within a factor of 2."""
    outliers = {}
    for material in _element_materials(catalog, materials):
        theirs = mendeleev_table[material.element]["abundance_crust"]
        ours = material.abundance_mg_per_kg
        assert theirs is not None, material.id
        if max(ours / theirs, theirs / ours) > ABUNDANCE_FACTOR:
            outliers[material.id] = (ours, theirs)
    assert set(outliers) == set(ABUNDANCE_DIFFERENCES), f"unexplained or stale differences: {outliers}"


def test_price_agrees_with_mendeleev(catalog, materials, mendeleev_table):
    """mendeleev's price_per_kg (undated), within a factor of 5 where both have a price."""
    outliers = {}
    compared = 0
    for material in _element_materials(catalog, materials):
        theirs = mendeleev_table[material.element]["price_per_kg"]
        ours = material.price_usd_per_kg
        if theirs is None or ours is None:
            continue
        compared += 1
        if max(ours / theirs, theirs / ours) > PRICE_FACTOR:
            outliers[material.id] = (ours, theirs)
    assert compared >= 28
    assert set(outliers) == set(PRICE_DIFFERENCES), f"unexplained or stale differences: {outliers}"


def test_hazards_name_dissolved_species(catalog, materials):
    for material in materials.values():
        system = catalog.systems[material.element]
        for hazard in material.hazards:
            assert system.find(hazard.species).is_dissolved, f"{material.id}: {hazard.species}"
            assert hazard.note.strip(), f"{material.id}: {hazard.species} needs a plain-words note"
        flagged = [h.species for h in material.hazards]
        assert len(flagged) == len(set(flagged)), material.id


def _flagged(material):
    return {h.species for h in material.hazards}


def test_toxic_dissolved_metals_are_flagged(catalog, materials):
    # Common practice (lab safety): every dissolved Pb, Cd and Hg species, and chromium(VI), are flagged.
    for material in materials.values():
        system = catalog.systems[material.element]
        if material.element in ("Pb", "Cd", "Hg"):
            dissolved = {s.name for s in system.species if s.is_dissolved}
            assert dissolved <= _flagged(material), material.id
        if material.element == "Cr":
            assert {"CrO4^2-", "HCrO4^-", "Cr2O7^2-"} <= _flagged(material)
            assert all("carcinogen" in h.note for h in material.hazards if h.species in ("CrO4^2-", "HCrO4^-", "Cr2O7^2-"))
    expected = {
        "Ni": {"Ni^2+"}, "NiO": {"Ni^2+"}, "Co": {"Co^2+"}, "Co3O4": {"Co^2+"}, "Mn": {"MnO4^-"}, "MnO2": {"MnO4^-"},
        "Cu": {"Cu^2+"}, "Ag": {"Ag^+"}, "Zn": {"Zn^2+"}, "V": {"VO2^+", "H2VO4^-", "HVO4^2-", "VO4^3-"},
        "Sb": {"SbO^+", "SbO3^-"}, "Os": {"OsO4 (aq)"}, "Ru": {"RuO4^-"},
    }
    for material_id, species in expected.items():
        assert species <= _flagged(materials[material_id]), material_id


def test_volatile_tetroxides_are_mentioned(materials):
    assert "OsO4" in materials["Os"].note and "toxic" in materials["Os"].note
    for ruthenium in ("Ru", "RuO2"):
        assert "RuO4" in materials[ruthenium].note and "volatile" in materials[ruthenium].note
    assert "vapour" in materials["Hg"].note


def _data_copy(tmp_path: Path) -> Path:
    copy = tmp_path / "data"
    shutil.copytree(builtin_data_dir(), copy, ignore=shutil.ignore_patterns("__pycache__"))
    return copy


@pytest.mark.parametrize("edit, message", [
    (lambda text: text + '\n[[material]]\nid = "pt"\nname = "x"\nelement = "Pt"\nphase = "Pt"\nfamily = "noble"\n',
     "field 'id': appears twice"),
    (lambda text: text.replace('species = "CrO4^2-"', 'species = "CrO4--"', 1), "'CrO4--' is not a species of Cr"),
    (lambda text: text.replace('phase = "TiO2 (rutile)"', 'phase = "TiO2"', 1), "field 'phase'"),
    (lambda text: text.replace('abundance_source = "crc_abundance"', 'abundance_source = "crc"', 1),
     "unknown source key 'crc'"),
    (lambda text: text.replace('family = "oxide"', 'family = "ceramic"', 1), "family"),
])
def test_a_bad_materials_row_is_rejected_by_name(tmp_path, edit, message):
    copy = _data_copy(tmp_path)
    path = copy / "materials.toml"
    path.write_text(edit(path.read_text(encoding="utf-8")), encoding="utf-8")
    with pytest.raises(CatalogError, match=message.replace("(", r"\(").replace(")", r"\)").replace("^", r"\^")):
        load_catalog(copy)
