"""The dissolved conditions of a question (engine/solution.py) and the pitting caution (engine/chloride.py), through
the engine and every door: a recipe, per-ion activities and chloride on screen, point and diagram."""

import json

import pytest

from electrosieve.app.cli import main
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.chloride import pitting_caution
from electrosieve.engine.diagram import diagram
from electrosieve.engine.errors import InputError
from electrosieve.engine.screen import VERDICTS, make_scenario, screen
from electrosieve.engine.solution import make_solution


def rows_by_id(result):
    return {row.id: row for row in result.rows}


# --- the solution ------------------------------------------------------------------------------

def test_a_recipe_sets_its_ions_and_chloride_and_named_ions_override_it():
    catalog = default_catalog()
    solution = make_solution(catalog=catalog, electrolyte="0.5 M H2SO4 + 0.1 M CuSO4")
    assert 0.001 < dict(solution.ion_activities)["Cu^2+"] < 0.1      # activity coefficient of a 2:2 salt well below 1
    assert "SO4^2-" in dict(solution.ligand_activities) and solution.chloride is None
    mine = make_solution(catalog=catalog, electrolyte="0.5 M H2SO4 + 0.1 M CuSO4", ion_activities={"Cu^2+": 0.05},
                         chloride=0.01)
    assert dict(mine.ion_activities)["Cu^2+"] == 0.05 and mine.chloride == 0.01


def test_the_recipe_ph_is_used_when_none_is_given_and_a_different_given_ph_is_said():
    scenario = make_scenario(potential=0.0, electrolyte="0.1 M HCl")
    assert scenario.ph[0] == pytest.approx(1.1, abs=0.05)     # γ± 0.796 at 0.1 mol/kg (Robinson & Stokes 1959)
    given = make_scenario(ph=7, potential=0.0, electrolyte="0.1 M HCl")
    assert given.ph == (7.0, 7.0)
    assert any("0.1 M HCl" in w and "pH 7 was given" in w for w in given.solution.warnings)


def test_a_ph_water_cannot_reach_at_the_temperature_is_a_warning_on_the_result():
    # pKw(80 °C) = 12.6 (IAPWS R11-07): pH 14 cannot exist there
    result = screen(make_scenario(ph=14, potential=-0.5, temperature=80, materials=["Ni"]))
    assert any("cannot be reached at 80 °C" in w for w in result.warnings)
    assert not screen(make_scenario(ph=12, potential=-0.5, temperature=80, materials=["Ni"])).warnings


def test_without_ph_or_recipe_the_ph_is_required():
    with pytest.raises(InputError, match="ph is required") as caught:
        make_scenario(potential=0.0)
    assert caught.value.field == "ph"


@pytest.mark.parametrize("kwargs, field, message", [
    (dict(electrolyte="1 M NaFoo"), "electrolyte", "known"),
    (dict(ion_activities={"Cu^5+": 0.1}), "ion_activities", "no dissolved species"),
    (dict(ion_activities={"Cu^2+": 5.0}), "ion_activities[Cu^2+]", "between"),
    (dict(chloride=100.0), "chloride", "between"),
])
def test_bad_solutions_name_their_field(kwargs, field, message):
    with pytest.raises(InputError, match=message) as caught:
        make_scenario(ph=7, potential=0.0, **kwargs)
    assert caught.value.field == field


def test_a_named_ion_moves_only_its_own_boundary_by_the_nernst_term():
    # Zn2+/Zn: E = -0.762 + 0.0296 log a(Zn2+) (Bard, Parsons & Jordan 1985): -0.939 V at 1e-6, -0.792 V at 0.1
    plain = diagram("Zn")
    bath = diagram("Zn", ion_activities={"Zn^2+": 0.1})
    assert plain.stable_species_at(3.0, -0.85).name == "Zn^2+"
    assert bath.stable_species_at(3.0, -0.85).name == "Zn"
    assert bath.stable_species_at(3.0, -0.80).name == "Zn"
    assert bath.stable_species_at(3.0, -0.78).name == "Zn^2+"
    # the other zinc species keep the common activity: the zincate boundary at high pH does not move
    assert plain.stable_species_at(13.5, 0.0).name == bath.stable_species_at(13.5, 0.0).name


def test_the_verdict_store_keys_on_ion_and_ligand_activities():
    VERDICTS.clear()
    plain = screen(make_scenario(ph=5, potential=0.4, materials=["Ag"]))
    salty = screen(make_scenario(ph=5, potential=0.4, materials=["Ag"], chloride=0.01))
    assert rows_by_id(plain)["Ag"].judged.pieces[0].species == "Ag"
    assert rows_by_id(salty)["Ag"].judged.pieces[0].species == "AgCl"   # E°(AgCl/Ag) 0.2224 V (Bates & Bower 1954)


# --- the pitting caution -------------------------------------------------------------------------

def test_the_pitting_caution_is_only_for_passive_film_formers_in_chloride():
    assert pitting_caution("passivation", "Fe", None) is None
    assert pitting_caution("immunity", "Fe", 0.5) is None
    assert pitting_caution("passivation", "Pt", 0.5) is None       # chloride dissolves noble metals: in the diagram
    assert "pits" in pitting_caution("passivation", "Al", 0.5)
    assert "resists" in pitting_caution("passivation", "Ti", 0.5)


# --- scenarios a practitioner recognises (common practice) ----------------------------------------

SEAWATER_SENSOR = dict(electrolyte="seawater", potential=[-0.2, 0.6], scale="AgAgCl-3M",
                       materials=["Au", "Pt", "Ag", "Fe", "Al", "Ti"])
"""A sensing electrode in seawater at 25 °C (pH about 8.1 from the recipe), −0.2 to +0.6 V vs Ag/AgCl."""


def test_seawater_sensor_gold_and_platinum_stay_usable_silver_chloridises():
    # common practice: gold and platinum are the usual sensing electrodes in seawater at moderate potentials
    # (AuCl4-/Au 1.002 V and AuCl2-/Au 1.154 V, Bard, Parsons & Jordan 1985, lie above the window); silver
    # turns to silver chloride there, which is why Ag/AgCl works as a seawater reference (Ag/AgCl 0.2224 V,
    # Bates & Bower 1954): above it the metal is no longer immune
    result = screen(make_scenario(**SEAWATER_SENSOR))
    assert result.scenario.ph[0] == pytest.approx(8.1, abs=0.05)
    rows = rows_by_id(result)
    assert rows["Au"].verdict == "acceptable" and rows["Au"].judged.fractions["immunity"] == pytest.approx(1.0)
    assert rows["Pt"].verdict == "acceptable" and not any("Cl" in p.species for p in rows["Pt"].judged.pieces)
    silver = {p.species for p in rows["Ag"].judged.pieces}
    assert silver & {"AgCl", "AgCl2^-"} and rows["Ag"].judged.fractions["immunity"] < 0.5
    # at a dissolved-metal level of 1e-4 (a small electrode in a cell) the solid chloride forms
    thick = screen(make_scenario(**SEAWATER_SENSOR, activity=1e-4))
    assert "AgCl" in {p.species for p in rows_by_id(thick)["Ag"].judged.pieces}


def test_seawater_passive_metals_carry_the_pitting_caution():
    # common practice (Szklarska-Smialowska 2005): aluminium and plain iron/stainless pit in seawater,
    # titanium does not
    result = screen(make_scenario(**SEAWATER_SENSOR))
    rows = rows_by_id(result)
    for metal in ("Fe", "Al"):
        assert rows[metal].judged.fractions["passivation"] > 0.5 and "pits" in rows[metal].caution
    assert "resists" in rows["Ti"].caution
    assert rows["Au"].caution is None and rows["Pt"].caution is None
    assert any("can pit the passive films of" in w and "Al" in w for w in result.warnings)


CHLOR_ALKALI = dict(electrolyte="26 wt% NaCl", ph=[2, 4], potential=[1.3, 1.5],
                    materials=["Pt", "Au", "IrO2", "RuO2", "Ti", "TiO2"])
"""The anode of a chlor-alkali cell: saturated brine (26.4 wt% NaCl at 25 °C), acidified to pH 2–4, at the
chlorine-evolution potentials 1.3–1.5 V vs SHE (E°(Cl2/Cl−) 1.358 V, Bard, Parsons & Jordan 1985)."""


def test_chlor_alkali_platinum_and_gold_dissolve_as_chloro_complexes():
    # common practice: platinum and gold anodes lose metal in hot chlorinated brine as PtCl6 2-/AuCl4-,
    # which is why dimensionally stable anodes replaced them
    rows = rows_by_id(screen(make_scenario(**CHLOR_ALKALI)))
    assert rows["Pt"].verdict == "rejected" and {p.species for p in rows["Pt"].judged.pieces} <= {"PtCl4^2-", "PtCl6^2-"}
    assert rows["Au"].verdict == "rejected" and {p.species for p in rows["Au"].judged.pieces} <= {"AuCl2^-", "AuCl4^-"}


def test_chlor_alkali_titanium_and_iridium_oxide_hold_as_dimensionally_stable_anodes_do():
    # Trasatti (2000): RuO2–TiO2 and IrO2 coatings on titanium; the titanium substrate is passive as TiO2
    # (with the chloride caution saying its film resists), IrO2 stays mostly passive; RuO2 is only metastable
    # (RuO4 above about 1.1 V at pH 2–4, its slow loss of ruthenium is why TiO2 is mixed in), and the
    # volatile RuO4 is flagged
    result = screen(make_scenario(**CHLOR_ALKALI))
    rows = rows_by_id(result)
    for ti in ("Ti", "TiO2"):  # survives as a passive substrate, but its insulating film is no anode surface
        assert rows[ti].judged.fractions["passivation"] == pytest.approx(1.0) and "resists" in rows[ti].caution
        assert rows[ti].verdict == "rejected" and rows[ti].surface.conduction == "insulator"
    assert rows["IrO2"].judged.fractions["passivation"] > 0.8
    assert "RuO4" in {h.species for h in rows["RuO2"].hazards}
    assert any("26 wt% NaCl" in w and "pH 2 to 4 was given" in w for w in result.warnings)


# --- the doors ---------------------------------------------------------------------------------

def test_cli_screen_takes_a_recipe_ion_activities_and_chloride(capsys):
    assert main(["screen", "--electrolyte", "seawater", "--potential=-0.2:0.6", "--scale", "AgAgCl-3M",
                 "--materials", "Au,Al", "--ion-activity", "Cu^2+=0.1", "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["scenario"]["electrolyte"] == "seawater" and out["scenario"]["ion_activities"]["Cu^2+"] == 0.1
    assert out["electrolyte"]["ph"] == pytest.approx(8.1, abs=0.05) and out["warnings"]
    assert {row["material"]: row["caution"] for row in out["results"]}["Au"] is None
    assert main(["screen", "--ph", "3", "--potential", "0.5", "--materials", "Ag", "--chloride", "1", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["scenario"]["chloride"] == 1.0


def test_cli_point_and_diagram_take_them_too(capsys):
    assert main(["point", "Zn", "--ph", "3", "--potential=-0.85", "--ion-activity", "Zn^2+=0.1", "--json"]) == 0
    point = json.loads(capsys.readouterr().out)
    assert point["formula"] == "Zn" and point["ion_activities"] == {"Zn^2+": 0.1}
    assert main(["point", "Zn", "--ph", "14", "--potential", "0", "--temperature", "80", "--json"]) == 0
    assert "cannot be reached" in json.loads(capsys.readouterr().out)["warnings"][0]
    assert main(["diagram", "Ag", "--chloride", "0.01", "--json"]) == 0
    drawn = json.loads(capsys.readouterr().out)
    assert "AgCl" in {d["formula"] for d in drawn["domains"]} and drawn["ligand_activities"] == {"Cl^-": 0.01}
    assert main(["point", "Cu", "--ph", "3", "--potential", "0", "--ion-activity", "Cu^2+"]) == 2
    assert "--ion-activity must look like Cu^2+=0.1" in capsys.readouterr().err


def test_api_takes_a_recipe_ion_activities_and_chloride(client):
    point = client.get("/api/v1/point/Zn", params={"ph": 3, "potential": -0.85, "ion_activities": "Zn^2+=0.1"})
    assert point.status_code == 200 and point.json()["formula"] == "Zn"
    drawn = client.get("/api/v1/diagram/Ag", params={"electrolyte": "0.6 M NaCl"}).json()
    # a(Cl-) 0.41: AgCl's solubility (Ksp 1.8e-10, CRC; beta2(AgCl2-) 10^5.25, Smith & Martell 1976; both from
    # memory) exceeds 1e-6, so the complex holds
    assert "AgCl2^-" in {d["formula"] for d in drawn["domains"]} and drawn["electrolyte"]["ionic_strength"] > 0.5
    screened = client.post("/api/v1/screen", json={"electrolyte": "seawater", "potential": [0.0, 0.8],
                                                   "materials": ["Al", "Au"]})
    assert screened.status_code == 200
    body = screened.json()
    assert body["scenario"]["ph"] == pytest.approx(8.1, abs=0.05) and body["warnings"]
    assert [row["material"] for row in body["results"] if row["caution"]] == ["Al"]
    bad = client.post("/api/v1/screen", json={"electrolyte": "1 M NaFoo", "potential": 0.0})
    assert bad.status_code == 422 and "NaFoo" in json.dumps(bad.json())


def test_api_electrolyte_is_the_cli_json(client, capsys):
    # 0.1 mol/kg HCl: γ± 0.796 (Robinson & Stokes 1959, Appendix 8.10), pH about 1.1
    answer = client.get("/api/v1/electrolyte", params={"recipe": "0.1 mol/kg HCl"})
    assert answer.status_code == 200
    assert main(["electrolyte", "0.1 mol/kg HCl", "--json"]) == 0
    assert answer.json() == json.loads(capsys.readouterr().out)
    assert answer.json()["ph"] == pytest.approx(1.1, abs=0.02)
    bad = client.get("/api/v1/electrolyte", params={"recipe": "3 M NaFoo"})
    assert bad.status_code == 422 and "recipe" in json.dumps(bad.json())


def test_screen_page_shows_the_recipe_ph_and_ionic_strength(client):
    fragment = client.get("/screen/ranking", params={"electrolyte": "seawater", "potential_low": "0",
                                                     "potential_high": "0.8", "pick": "names", "materials": "Al"})
    assert fragment.status_code == 200
    assert 'id="electrolyte-readout"' in fragment.text and "pH 8.10" in fragment.text
    assert "ionic strength 0.723 mol/kg" in fragment.text and 'class="row-caution"' in fragment.text
    page = client.get("/screen", params={"electrolyte": "seawater", "potential_low": "0", "potential_high": "0.8"})
    assert page.status_code == 200 and 'name="electrolyte"' in page.text and "pH 8.10" in page.text
