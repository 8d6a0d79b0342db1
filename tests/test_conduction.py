"""Surface conduction: every solid phase of the catalog has an electronic character with a source."""

import pytest

from electrosieve.engine.catalog import builtin_data_dir, default_catalog
from electrosieve.engine.conduction import (COMMON_PRACTICE, CONDUCTIONS, Surface, governing_surface, load_surfaces,
                                            missing_surfaces, surface_of, surfaces)
from electrosieve.engine.errors import CatalogError


def test_every_solid_phase_of_the_catalog_has_an_entry():
    missing = missing_surfaces(default_catalog())
    assert not missing, f"solid phases without a row in data/surfaces.toml: {missing}"


def test_no_entry_names_a_phase_the_catalog_lacks():
    catalog = default_catalog()
    names = {s.name for system in catalog.systems.values() for s in system.species}
    names |= {s.name for ligand in catalog.ligands.values() for group in ligand.species.values() for s in group}
    assert set(surfaces()) <= names


def test_every_entry_has_a_known_source_or_says_common_practice():
    sources = default_catalog().sources
    for surface in surfaces().values():
        assert surface.source == COMMON_PRACTICE or surface.source in sources, surface
        assert surface.conduction in CONDUCTIONS
        assert surface.note, f"{surface.phase}: say which figure puts it in its class"


def test_checksum_of_the_data_file():
    # A deliberate edit of data/surfaces.toml updates these two numbers.
    table = surfaces()
    assert len(table) == 140
    assert sum(CONDUCTIONS.index(s.conduction) for s in table.values()) == 229


@pytest.mark.parametrize("phase", ["TiO2 (rutile)", "TiO2 (anatase)", "Ta2O5", "ZrO2", "HfO2", "Nb2O5", "Al2O3", "MgO"])
def test_valve_metal_films_and_wide_gap_oxides_block_current(phase):
    # Band gaps of 3 eV and more (CRC Handbook, section 12, Properties of semiconductors);
    # anodic films of valve metals (Lohrengel 1993, Mater. Sci. Eng. R 11, 243).
    surface = surface_of(phase)
    assert surface.conduction == "insulator"
    assert not surface.passes_current
    assert "blocks current" in surface.reason


@pytest.mark.parametrize("phase", ["RuO2", "IrO2", "PbO2", "Fe3O4", "ReO3"])
def test_metallic_oxides_conduct(phase):
    # RuO2, IrO2, PbO2: Trasatti & Lodi (1980); ReO3, Fe3O4: Goodenough (1971), Prog. Solid State Chem. 5, 145.
    assert surface_of(phase).conduction == "conducting"


def test_nickel_hydroxide_insulates_and_its_oxidised_form_conducts():
    # Trotochaud et al. (2014), JACS 136, 6744: in situ conductivity of Ni(OH)2/NiOOH films.
    assert surface_of("Ni(OH)2").conduction == "insulator"
    assert surface_of("NiO2").passes_current


@pytest.mark.parametrize("element", ["Pt", "Au", "Ni", "Cu", "Hg", "Pb"])
def test_metals_are_metals(element):
    # CRC Handbook, section 12, Electrical resistivity of pure metals.
    assert surface_of(element).conduction == "metal"


def test_governing_surface_is_the_least_conducting():
    found = [surface_of("Ti"), surface_of("TiO2 (rutile)"), surface_of("Ti2O3")]
    assert governing_surface(found).phase == "TiO2 (rutile)"


def test_unknown_phase_is_a_clear_error():
    with pytest.raises(CatalogError, match=r"no electronic character known for 'Unobtainium'"):
        surface_of("Unobtainium")


def test_a_row_needs_a_source_or_common_practice(tmp_path):
    path = tmp_path / "surfaces.toml"
    path.write_text('[[surface]]\nphase = "X"\nconduction = "metal"\nnote = "n"\n')
    with pytest.raises(CatalogError, match="common_practice"):
        load_surfaces(path)


def test_a_bad_class_names_the_field(tmp_path):
    path = tmp_path / "surfaces.toml"
    path.write_text('[[surface]]\nphase = "X"\nconduction = "superconductor"\nsource = "crc_resistivity"\nnote = "n"\n')
    with pytest.raises(CatalogError, match="field 'conduction'"):
        load_surfaces(path)


def test_an_unknown_source_key_is_refused(tmp_path):
    path = tmp_path / "surfaces.toml"
    path.write_text('[[surface]]\nphase = "X"\nconduction = "metal"\nsource = "nowhere"\nnote = "n"\n')
    with pytest.raises(CatalogError, match="unknown source key 'nowhere'"):
        load_surfaces(path, default_catalog().sources)


def test_builtin_file_loads_with_sources_checked():
    table = load_surfaces(builtin_data_dir() / "surfaces.toml", default_catalog().sources)
    assert isinstance(table["C"], Surface)
