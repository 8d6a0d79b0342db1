"""Electrolyte recipes: grammar, conversions, speciation and pH against published values."""

import dataclasses
import math

import pytest

from electrosieve.engine.activity import PITZER
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.electrolyte import (electrolyte, known_media, known_solutes, parse_recipe, ph_warnings,
                                             reachable_ph)
from electrosieve.engine.errors import InputError
from electrosieve.engine.kw import pkw


def test_hydrochloric_acid_ph_matches_bates_reference_values():
    # Bates (1973), Determination of pH, 2nd ed., table of pH of HCl solutions (from memory): 0.01 mol/kg
    # 2.044 and 0.1 mol/kg 1.085 at 25 °C, on the Bates–Guggenheim convention for the single-ion split.
    # Pitzer's split of γ± differs from that convention by up to 0.015 at 0.1 mol/kg, hence 0.02.
    assert electrolyte("0.01 mol/kg HCl").ph == pytest.approx(2.044, abs=0.01)
    assert electrolyte("0.1 mol/kg HCl").ph == pytest.approx(1.085, abs=0.02)


def test_one_molar_caustic_at_80_celsius_is_about_ph_12_5():
    # Kw of IAPWS R11-07 (pKw 12.6 at 80 °C) and γ±(KOH) held at its 25 °C parameters: 1 M KOH at 80 °C
    # is about pH 12.5, as the issue states; at 25 °C about 13.9 (γ± 0.756, Robinson & Stokes 1959).
    hot = electrolyte("1 M KOH", 80.0)
    assert hot.ph == pytest.approx(12.5, abs=0.1)
    assert any("no temperature derivatives for K^+–OH^-" in w for w in hot.warnings)
    assert electrolyte("1 M KOH").ph == pytest.approx(14.0 + math.log10(0.756) + 0.0, abs=0.05)


def test_neutral_salt_is_neutral_at_every_temperature():
    # A strong-acid/strong-base salt leaves m(H+) = m(OH−) (electroneutrality); pH is pKw(T)/2 but for the
    # single-ion activity coefficients (γ of H+ set by H–Cl, of OH− by Na–OH interactions) and the water
    # activity, together a few hundredths at 0.6 mol/kg.
    for celsius in (25.0, 37.0, 80.0):
        result = electrolyte("0.6 mol/kg NaCl", celsius)
        assert result.molalities["H^+"] == pytest.approx(result.molalities["OH^-"], rel=1e-6)
        assert result.ph == pytest.approx(pkw(celsius + 273.15) / 2, abs=0.05)


def test_molarity_to_molality_matches_handbook_density():
    # CRC Handbook, "Concentrative properties of aqueous solutions": 1.000 mol/L NaCl has density
    # 1.0369 g/cm³ at 20 °C, i.e. 1.0218 mol/kg (from memory). Infinite-dilution apparent volumes: 0.5 %.
    result = electrolyte("1 M NaCl")
    assert result.molalities["Na^+"] == pytest.approx(1.0218, rel=0.005)


def test_mass_percent_is_converted_exactly():
    # 30 wt% KOH: 300 g KOH (56.106 g/mol) in 700 g water = 7.638 mol/kg (arithmetic).
    assert electrolyte("30 wt% KOH", 80.0).molalities["K^+"] == pytest.approx(300 / 56.106 / 0.7, rel=1e-9)


def test_seawater_ionic_strength_and_sodium_chloride_activity_match_published_values():
    # DOE (1994), Handbook of methods for the analysis of the various parameters of the carbon dioxide system
    # in sea water, ch. 5: I = 19.924 S/(1000 − 1.005 S) mol/kg-H2O, 0.7228 at S = 35.
    sea = electrolyte("seawater")
    assert sea.ionic_strength == pytest.approx(0.7228, rel=0.003)
    # Mean activity coefficient of NaCl in seawater at S = 35, 25 °C: 0.668 (Millero & Schreiber 1982,
    # Am. J. Sci. 282, 1508, from memory). Binary parameters only: within 2 %.
    gamma_na = sea.activities["Na^+"] / sea.molalities["Na^+"]
    gamma_cl = sea.activities["Cl^-"] / sea.molalities["Cl^-"]
    assert math.sqrt(gamma_na * gamma_cl) == pytest.approx(0.668, rel=0.02)
    assert sea.ph == pytest.approx(8.1) and any("carbonate buffer" in w for w in sea.warnings)
    assert sea.model == PITZER


def test_sulfuric_acid_second_dissociation():
    # HSO4^- = H+ + SO4^2-, K = 0.0105 at 25 °C (Pitzer, Roy & Silvester 1977): in 0.5 M H2SO4 most sulfate
    # is HSO4^-; in 1 mmol/kg almost all is SO4^2- (common practice).
    strong = electrolyte("0.5 M H2SO4 + 0.1 M CuSO4")
    assert strong.molalities["HSO4^-"] > 2 * strong.molalities["SO4^2-"]
    assert 0.0 < strong.ion_activities["Cu^2+"] < 0.1
    assert strong.ligand_activities(["Cl^-", "SO4^2-"]) == {"SO4^2-": strong.activities["SO4^2-"]}
    dilute = electrolyte("1 mmol/kg H2SO4")
    assert dilute.molalities["SO4^2-"] > 5 * dilute.molalities["HSO4^-"]
    assert -math.log10(0.002) < dilute.ph < -math.log10(0.001)   # between one and two protons per H2SO4


def test_saline_is_nine_grams_per_litre():
    result = electrolyte("saline", 37.0)
    assert result.molalities["Cl^-"] == pytest.approx(9.0 / 58.443 / 0.993, rel=0.01)
    assert any("carbon dioxide" in w for w in result.warnings)


def test_recipe_grammar_sums_parts_and_ignores_case():
    parts = parse_recipe("0.5 M h2so4 + 100 mM CuSO4 + 2 g/L NaCl + seawater")
    assert [p.kind for p in parts] == ["molar", "molar", "mass_per_litre", "medium"]
    assert [p.amount for p in parts[:3]] == [0.5, pytest.approx(0.1), 2.0]
    twice = electrolyte("0.1 mol/kg NaCl + 0.2 mol/kg NaCl")
    assert twice.molalities["Na^+"] == pytest.approx(0.3)


@pytest.mark.parametrize("recipe, words", [
    ("1 M NaOCl", ["unknown solute 'NaOCl'", "KOH", "seawater"]),
    ("7 mol/kg NaCl", ["above its solubility", "6.15 mol/kg at 25 °C", "crc_solubility"]),
    ("1 m KOH", ["unknown unit 'm'", "mol/kg for molal"]),
    ("1 M KOH + 10 wt% KOH", ["not both"]),
    ("60 wt% KOH + 50 wt% NaOH", ["no water is left"]),
    ("seawater + 0.1 M HCl", ["buffer", "HCl"]),
    ("KOH", ["cannot read 'KOH'"]),
    ("", ["must be a recipe"]),
    ("0 M KOH", ["must be positive"]),
])
def test_bad_recipes_get_clear_errors(recipe, words):
    with pytest.raises(InputError) as error:
        electrolyte(recipe)
    assert error.value.field == "electrolyte"
    for word in words:
        assert word in str(error.value)


def test_ph_beyond_what_water_allows_is_said():
    message = ph_warnings(14.0, 80.0)[0]
    assert message.startswith("pH 14 cannot be reached at 80 °C: even 1 M KOH is about pH 12.5 there")
    assert ph_warnings(12.0, 80.0) == ()
    assert ph_warnings(14.0, 25.0) == ()
    assert "needs a hydroxide activity" in ph_warnings(13.2, 80.0)[0]
    assert "cannot be reached" in ph_warnings(-2.0, 25.0)[0]
    low, high = reachable_ph(25.0)
    assert low < -1.0 and high > 15.0


def test_result_is_frozen_and_cites_known_sources():
    result = electrolyte("0.5 M H2SO4 + 0.1 M CuSO4")
    with pytest.raises(dataclasses.FrozenInstanceError):
        result.ph = 7.0  # type: ignore[misc]
    sources = default_catalog().sources
    assert result.sources and all(key in sources for key in result.sources)
    assert list(result.activities)[:2] == ["H^+", "OH^-"]


def test_every_solute_and_medium_is_listed():
    assert {"HCl", "H2SO4", "NaCl", "KCl", "NaOH", "KOH", "CuSO4"} <= set(known_solutes())
    assert known_media() == ["seawater", "saline"]
    for formula in known_solutes():   # every solute evaluates with the Pitzer model at 0.1 mol/kg
        assert electrolyte(f"0.1 mol/kg {formula}").model == PITZER, formula


def test_cli_electrolyte_json_contract(capsys):
    import json

    from electrosieve.app.cli import main

    assert main(["electrolyte", "0.5 M H2SO4 + 0.1 M CuSO4", "--temperature", "40", "--json"]) == 0
    payload = json.loads(capsys.readouterr().out)
    assert {"ph", "ionic_strength", "activities", "model", "warnings"} <= set(payload)
    assert "Cu^2+" in payload["activities"] and payload["temperature_c"] == 40.0
    assert payload["cautions"]


def test_cli_electrolyte_human_output_and_errors(capsys):
    from electrosieve.app.cli import main

    assert main(["electrolyte", "seawater"]) == 0
    out = capsys.readouterr().out
    assert "pH 8.10" in out and "Cl^-" in out and "Cautions" in out
    assert main(["electrolyte", "1 M NaOCl"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("error: RECIPE: unknown solute 'NaOCl'") and "Traceback" not in err
    assert main(["electrolyte", "1 M KOH", "--temperature", "hot"]) == 2
    assert "--temperature must be a number" in capsys.readouterr().err
