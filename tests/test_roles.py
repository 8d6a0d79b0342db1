"""Electrode roles: each with its regions, conduction, phase rule, kinetic criterion, words and sources."""

import pytest

from electrosieve.engine.catalog import builtin_data_dir, default_catalog
from electrosieve.engine.errors import CatalogError, InputError
from electrosieve.engine.kinetics import Kinetics
from electrosieve.engine.roles import check_role, criterion_value, load_roles, roles

ISSUE_ROLES = ("oer-anode", "her-cathode", "deposition-cathode", "working-electrode", "counter-electrode",
               "current-collector", "anode", "cathode")


def test_every_role_the_trade_asks_for_is_defined_with_words_and_sources():
    table = load_roles(builtin_data_dir() / "roles.toml", default_catalog().sources)
    assert tuple(table) == ISSUE_ROLES
    for role in table.values():
        assert role.description and role.sources and role.accept


@pytest.mark.parametrize("name, criterion, prefer", [
    ("oer-anode", "oxygen-onset", "low"),            # Trasatti (1984): lowest oxygen overpotential
    ("her-cathode", "hydrogen-onset", "zero"),       # Trasatti (1972): hydrogen onset closest to 0 V vs RHE
    ("deposition-cathode", "hydrogen-held-back", "low"),  # Pletcher & Walsh (1990): high hydrogen overpotential
    ("working-electrode", "window-width", "high"),   # Bard & Faulkner (2001): widest window
])
def test_kinetic_criteria(name, criterion, prefer):
    role = roles()[name]
    assert role.criterion.name == criterion and role.criterion.prefer == prefer


def test_roles_that_carry_current_without_reacting_rank_by_stability():
    for name in ("counter-electrode", "current-collector", "anode", "cathode"):
        assert roles()[name].criterion is None


def test_what_each_role_asks_of_the_surface():
    table = roles()
    assert all(table[n].needs_conduction for n in ISSUE_ROLES if n != "current-collector")
    assert not table["current-collector"].needs_conduction  # a passive film toward the electrolyte is welcome
    assert table["her-cathode"].keeps_phase and table["cathode"].keeps_phase  # an oxide cathode is reduced
    assert not table["oer-anode"].keeps_phase  # a conducting oxide grown on the anode is expected
    assert table["cathode"].accept == ("immunity",) and table["anode"].accept == ("immunity", "passivation")


def test_criterion_reads_the_right_kinetic_value():
    k = Kinetics(1.0, hydrogen_onset_v_rhe=-0.3, oxygen_onset_v_rhe=1.6, sources=())
    table = roles()
    assert criterion_value(table["oer-anode"], k) == 1.6
    assert criterion_value(table["her-cathode"], k) == -0.3
    assert criterion_value(table["working-electrode"], k) == pytest.approx(1.9)
    assert criterion_value(table["counter-electrode"], k) is None
    assert criterion_value(table["oer-anode"], Kinetics(1.0, None, None, ())) is None


def test_rule_in_words_says_unknowns_go_last():
    rule = roles()["her-cathode"].rule
    assert "closest to 0 V vs RHE" in rule and rule.endswith("unknowns last.")


def test_check_role_ignores_case_and_names_the_field():
    assert check_role("HER-cathode").name == "her-cathode"
    with pytest.raises(InputError) as caught:
        check_role("sacrificial")
    assert caught.value.field == "role" and "oer-anode" in str(caught.value)


@pytest.mark.parametrize("body, message", [
    ('[[role]]\nname = "x"\ntitle = "t"\naccept = ["immunity"]\nneeds_conduction = true\nkeeps_phase = true\n'
     'description = "d"\n', "common_practice"),
    ('[[role]]\nname = "x"\ntitle = "t"\naccept = ["bliss"]\nneeds_conduction = true\nkeeps_phase = true\n'
     'description = "d"\ncommon_practice = true\n', "field 'accept"),
    ('[[role]]\nname = "x"\ntitle = "t"\naccept = ["immunity"]\nneeds_conduction = true\nkeeps_phase = true\n'
     'criterion = "speed"\ndescription = "d"\ncommon_practice = true\n', "unknown criterion 'speed'"),
])
def test_bad_role_rows_are_refused_naming_the_field(tmp_path, body, message):
    path = tmp_path / "roles.toml"
    path.write_text(body)
    with pytest.raises(CatalogError, match=message):
        load_roles(path)
