"""Loading the catalog: clear messages for malformed files, and the built-in catalog left untouched."""

import shutil
from pathlib import Path

import pytest

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
    assert catalog.systems["Fe"] is default_catalog().systems["Fe"] or catalog.systems["Fe"].species == default_catalog().systems["Fe"].species


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
    """Source keys cited by name in any data file's text (notes, or parameter files such as water properties)."""
    import re

    keys = set()
    paths = [*builtin_data_dir().glob("*.toml"), *builtin_data_dir().glob("species/*.toml"),
             *builtin_data_dir().glob("ligands/*.toml")]
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
