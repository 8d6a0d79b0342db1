"""Loading the catalog: clear messages for malformed files, and the built-in catalog left untouched."""

import shutil
from pathlib import Path

import pytest

from electrosieve.engine import chloride as engine_chloride
from electrosieve.engine.catalog import builtin_data_dir, default_catalog, load_catalog
from electrosieve.engine.errors import CatalogError

ZINC_ROW = """
[[species]]
formula = "Zn"
charge = 0
phase = "solid"
dgf = 0.0
source = "wagman1982"
"""


def _overlay(tmp_path: Path, text: str, name: str = "Zn.toml") -> Path:
    folder = tmp_path / "mine"
    folder.mkdir()
    (folder / name).write_text(text, encoding="utf-8")
    return folder


@pytest.mark.parametrize("text, expected", [
    ('element = "Zn"\n' + ZINC_ROW.replace("dgf = 0.0", 'dgf = "zero"'), r"species #1 \(Zn\): field 'dgf'"),
    ('element = "Zn"\n' + ZINC_ROW.replace('phase = "solid"', 'phase = "plasma"'), "field 'phase'"),
    ('element = "Zn"\n' + ZINC_ROW.replace('formula = "Zn"', 'formula = "Zn(OH"'), "field 'formula'"),
    ('element = "Zn"\n' + ZINC_ROW.replace("charge = 0", "charge = 0.5"), "field 'charge'"),
    ('element = "Zn"\n' + ZINC_ROW.replace('source = "wagman1982"', 'source = "nowhere"'), "unknown source key 'nowhere'"),
    ('element = "Zn"\n' + ZINC_ROW + "colour = 'blue'\n", "field 'colour'"),
    ('element = "Zn"\n' + ZINC_ROW.replace('formula = "Zn"', 'formula = "CuO"'), "must contain Zn"),
    ('element = "Zn"\n' + ZINC_ROW + ZINC_ROW, "appears twice"),
    ('element = "Zn"\n[[species]\n', "not valid TOML"),
    ('element = "Zn"\n', "field 'species'"),
])
def test_malformed_species_file_names_file_species_and_field(tmp_path, text, expected):
    folder = _overlay(tmp_path, text)
    with pytest.raises(CatalogError, match=expected) as caught:
        load_catalog(overlay=folder)
    assert "Zn.toml" in str(caught.value)


def test_bad_overlay_never_changes_the_builtin_catalog(tmp_path):
    before = {path.name: path.read_bytes() for path in (builtin_data_dir() / "species").glob("*.toml")}
    folder = _overlay(tmp_path, 'element = "Zn"\n' + ZINC_ROW.replace("dgf = 0.0", "dgf = []"))
    with pytest.raises(CatalogError):
        load_catalog(overlay=folder)
    after = {path.name: path.read_bytes() for path in (builtin_data_dir() / "species").glob("*.toml")}
    assert before == after
    assert len(default_catalog().systems["Zn"].species) > 1


def test_overlay_replaces_one_element(tmp_path):
    original = (builtin_data_dir() / "species" / "Zn.toml").read_text(encoding="utf-8")
    changed = original.replace("dgf = -318.30", "dgf = -320.00")
    assert changed != original
    catalog = load_catalog(overlay=_overlay(tmp_path, changed))
    assert catalog.systems["Zn"].find("ZnO").dgf == -320.00
    assert default_catalog().systems["Zn"].find("ZnO").dgf == -318.30
    built_in = default_catalog().systems["Fe"]
    assert catalog.systems["Fe"] is built_in or catalog.systems["Fe"].species == built_in.species


def test_missing_overlay_directory(tmp_path):
    with pytest.raises(CatalogError, match="not a directory"):
        load_catalog(overlay=tmp_path / "absent")


def test_broken_builtin_copy_reports_the_file(tmp_path):
    copy = tmp_path / "data"
    shutil.copytree(builtin_data_dir(), copy)
    (copy / "scales.toml").write_text('[SCE]\nname = "x"\npotential = "high"\nsource = "bard_faulkner2001"\n')
    with pytest.raises(CatalogError, match=r"scales.toml: scale 'SCE': field 'potential'"):
        load_catalog(copy)


def test_every_source_key_resolves_and_none_is_unused():
    catalog = default_catalog()
    used = {s.source for system in catalog.systems.values() for s in system.species}
    used |= {s.source for s in catalog.water.values()}
    used |= {row.source for row in catalog.scales.values()}
    for material in catalog.materials.values():
        used |= {key for key in (material.price_source, material.abundance_source) if key}
    assert used <= set(catalog.sources)
    referenced_in_text = _keys_cited_by_code()
    unused = set(catalog.sources) - used - referenced_in_text
    assert not unused, f"sources never used: {sorted(unused)}"


def _keys_cited_by_code() -> set[str]:
    """Source keys cited by name in any data file's text (notes, or parameter files such as water properties), or by
    an engine module for guidance that is words, not numbers (``engine/chloride.py``)."""
    import re

    keys = set()
    paths = [*builtin_data_dir().glob("*.toml"), *builtin_data_dir().glob("species/*.toml"),
             *builtin_data_dir().glob("ligands/*.toml"), Path(engine_chloride.__file__)]
    for path in paths:
        if path.name == "sources.toml":
            continue
        text = path.read_text(encoding="utf-8")
        keys |= {key for key in default_catalog().sources if re.search(rf"\b{re.escape(key)}\b", text)}
    return keys


def test_every_source_field_in_every_data_file_resolves():
    """Parameter files (IAPWS, Criss-Cobble, Connick-Powell, ...) cite sources by key too: each key resolves."""
    import tomllib

    known = set(default_catalog().sources)

    def source_keys(node):
        if isinstance(node, dict):
            for key, value in node.items():
                if key.endswith("source") and isinstance(value, str):
                    yield value
                else:
                    yield from source_keys(value)
        elif isinstance(node, list):
            for item in node:
                yield from source_keys(item)

    for path in [*builtin_data_dir().glob("*.toml"), *builtin_data_dir().glob("species/*.toml")]:
        if path.name == "sources.toml":
            continue
        with path.open("rb") as handle:
            unknown = set(source_keys(tomllib.load(handle))) - known
        assert not unknown, f"{path.name}: unknown source keys {sorted(unknown)}"


def test_overlay_flag_of_no_dissolved_species_must_be_true(tmp_path):
    overlay = _overlay(tmp_path, 'element = "Zn"\ndissolved_species = "none in data"\n'
                       '[[species]]\nformula = "Zn"\ncharge = 0\nphase = "solid"\ndgf = 0.0\nsource = "wagman1982"\n'
                       '[[species]]\nformula = "Zn"\ncharge = 2\nphase = "aqueous"\ndgf = -147.06\nsource = "wagman1982"\n')
    with pytest.raises(CatalogError, match=r"Zn.toml: field 'dissolved_species'.*Zn\^2\+"):
        load_catalog(overlay=overlay)


def test_overlay_note_must_cite_a_known_source(tmp_path):
    overlay = _overlay(tmp_path, 'element = "Zn"\n[[notes]]\nkind = "kinetic"\ntext = "slow"\nsource = "nowhere"\n'
                       '[[species]]\nformula = "Zn"\ncharge = 0\nphase = "solid"\ndgf = 0.0\nsource = "wagman1982"\n')
    with pytest.raises(CatalogError, match=r"Zn.toml: notes #1: field 'source'"):
        load_catalog(overlay=overlay)


def test_unchecked_list_names_only_species_of_its_file(tmp_path):
    overlay = _overlay(tmp_path, 'element = "Zn"\nunchecked = ["ZnO9"]\n'
                       '[[species]]\nformula = "Zn"\ncharge = 0\nphase = "solid"\ndgf = 0.0\nsource = "wagman1982"\n')
    with pytest.raises(CatalogError, match=r"Zn.toml: field 'unchecked'"):
        load_catalog(overlay=overlay)


def test_overlay_rows_without_uncertainty_get_their_class_default(tmp_path):
    overlay = _overlay(tmp_path, 'element = "Zn"\n'
                       '[[species]]\nformula = "Zn"\ncharge = 0\nphase = "solid"\ndgf = 0.0\nsource = "wagman1982"\n'
                       '[[species]]\nformula = "ZnO"\ncharge = 0\nphase = "solid"\ndgf = -318.30\nsource = "wagman1982"\n'
                       '[[species]]\nformula = "Zn"\ncharge = 2\nphase = "aqueous"\ndgf = -147.06\nsource = "pourbaix1966"\n'
                       '[[species]]\nformula = "HZnO2"\ncharge = -1\nphase = "aqueous"\ndgf = -457.3\nsource = "baes1976"\n'
                       '[[species]]\nformula = "ZnO2"\ncharge = -2\nphase = "aqueous"\ndgf = -384.2\nsource = "wagman1982"\n')
    catalog = load_catalog(overlay=overlay)
    zinc = catalog.system("Zn")
    assert zinc.find("ZnO").uncertainty == catalog.uncertainty_classes["reviewed"].uncertainty
    assert zinc.find("Zn^2+").uncertainty == catalog.uncertainty_classes["estimate"].uncertainty
    assert zinc.find("Zn").uncertainty == 0.0


def test_overlay_that_breaks_a_built_in_material_names_the_overlay_species_and_field(tmp_path):
    # the built-in zinc material flags Zn^2+ as a hazard; an overlay without it is at fault, not materials.toml
    overlay = _overlay(tmp_path, 'element = "Zn"\n' + ZINC_ROW)
    with pytest.raises(CatalogError) as caught:
        load_catalog(overlay=overlay)
    message = str(caught.value)
    assert message.startswith(str(overlay / "Zn.toml")) and "species 'Zn^2+'" in message and "field" in message
    assert "materials.toml" not in message
