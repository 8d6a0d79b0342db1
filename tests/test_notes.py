"""Notes where thermodynamics misleads: rules from data, each with a source or marked common practice."""

import pytest

from electrosieve.engine.catalog import builtin_data_dir, default_catalog
from electrosieve.engine.conduction import COMMON_PRACTICE
from electrosieve.engine.errors import CatalogError
from electrosieve.engine.notes import KINDS, Situation, element_notes, load_notes, note_rules, notes_for, waived_species


def situation(element="C", family="carbon", role="cathode", met=(), regions=(), h2=False, o2=False, anions=(), top=0.0):
    return Situation(element, family, role, frozenset(met), frozenset(regions), h2, o2, top, frozenset(anions))


def test_every_rule_names_a_known_source_or_common_practice():
    sources = default_catalog().sources
    rules = load_notes(builtin_data_dir() / "notes.toml", sources)
    assert len(rules) == 8  # checksum: a deliberate edit of data/notes.toml updates it
    for rule in rules:
        assert rule.kind in KINDS
        assert rule.common_practice or rule.source in sources


def test_waived_species_exist_in_the_catalog():
    names = {s.name for system in default_catalog().systems.values() for s in system.species}
    for rule in note_rules():
        assert set(rule.waives) <= names and set(rule.meets) <= names, rule.id


def test_carbon_methane_is_kinetically_negligible_and_waived():
    # Pourbaix (1966), carbon chapter: methane formation on carbon cathodes is negligible at room temperature; the
    # note lives once, in carbon's species file (Catalog.notes), and waives CH4.
    notes = element_notes(default_catalog(), "C")
    assert [n.kind for n in notes] == ["kinetic"]
    assert waived_species(notes) == {"CH4"}
    assert notes[0].source == "pourbaix1966"
    assert not notes_for(situation(met={"C", "CH4"}, regions={"immunity", "corrosion"}, h2=True))


def test_scope_notes_of_the_catalog_read_as_cautions():
    # Palladium takes up hydrogen (common practice, Pd species file); Ta's dissolution is unknown from the data.
    assert [n.kind for n in element_notes(default_catalog(), "Pd")] == ["caution"]
    assert "unknown" in element_notes(default_catalog(), "Ta")[0].text


def test_carbon_oxidation_is_not_waived_where_it_is_fast():
    # Kinoshita (1988): carbon corrodes while oxygen is evolved on it.
    notes = notes_for(situation(met={"CO2"}, regions={"corrosion"}, o2=True, role="oer-anode", top=1.7))
    assert [n.kind for n in notes] == ["caution"] and not waived_species(notes)


def test_slow_carbon_oxidation_is_waived_below_its_threshold():
    notes = notes_for(situation(met={"C", "CO2"}, regions={"immunity", "corrosion"}, role="working-electrode", top=0.8))
    assert waived_species(notes) == {"CO2", "HCO3^-", "CO3^2-"}


def test_valve_metal_film_note_needs_the_film():
    assert not notes_for(situation("Ti", "valve metal", met={"Ti"}, regions={"immunity"}))
    notes = notes_for(situation("Ti", "valve metal", "anode", met={"TiO2 (rutile)"}, regions={"passivation"}))
    assert any("valve metal" in n.text and n.kind == "practice" for n in notes)


def test_hydride_cautions_from_the_region_and_from_hydrogen_uptake():
    assert notes_for(situation("Zr", "valve metal", met={"ZrH2"}, regions={"hydride"}))[0].kind == "caution"
    assert any("hydride" in n.text for n in notes_for(situation("Pd", "platinum-group", met={"Pd"},
                                                                 regions={"immunity"}, h2=True)))
    assert not notes_for(situation("Pt", "platinum-group", met={"Pt"}, regions={"immunity"}, h2=True))


def test_chloride_pitting_waits_for_the_electrolyte():
    without = notes_for(situation("Fe", "transition", "anode", met={"Fe2O3"}, regions={"passivation"}))
    with_chloride = notes_for(situation("Fe", "transition", "anode", met={"Fe2O3"}, regions={"passivation"},
                                        anions={"Cl^-"}))
    assert not without and "pitting" in with_chloride[0].text


def test_common_practice_is_said():
    notes = notes_for(situation("Hg", "post-transition", met={"Hg"}, regions={"immunity"}))
    assert notes[0].source == COMMON_PRACTICE


@pytest.mark.parametrize("body, message", [
    ('[[note]]\nid = "x"\nkind = "kinetic"\ntext = "t"\n', "common_practice"),
    ('[[note]]\nid = "x"\nkind = "caution"\ntext = "t"\ncommon_practice = true\nwaives = ["CH4"]\n', "only a kinetic"),
    ('[[note]]\nid = "x"\nkind = "rumour"\ntext = "t"\ncommon_practice = true\n', "field 'kind'"),
])
def test_bad_rules_are_refused_naming_the_field(tmp_path, body, message):
    path = tmp_path / "notes.toml"
    path.write_text(body)
    with pytest.raises(CatalogError, match=message):
        load_notes(path)
