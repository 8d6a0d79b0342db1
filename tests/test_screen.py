"""Screening scenarios: known outcomes, a worked example by hand, RHE bands, ranking rules and bad input."""

import math

import pytest

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import KJ_PER_EV, nernst_slope
from electrosieve.engine.errors import InputError
from electrosieve.engine.screen import make_scenario, screen

CATALOG = default_catalog()


def run(**kwargs):
    return screen(make_scenario(**kwargs), CATALOG)


def ranks(result):
    return {row.id: row.rank for row in result.rows}


def rows(result):
    return {row.id: row for row in result.rows}


def test_cathode_in_strong_acid_prefers_noble_metals_and_copper():
    # Common practice: at pH 0-1 and -0.2 to 0 V vs SHE noble metals and copper stay metallic; Zn, Fe, Al, Mg dissolve.
    result = run(ph=[0, 1], potential=[-0.2, 0.0], role="cathode")
    order = ranks(result)
    for good in ("Pt", "Au", "Ag", "Cu"):
        for bad in ("Zn", "Fe", "Al", "Mg"):
            assert order[good] < order[bad], (good, bad)
    assert rows(result)["Zn"].verdict == "rejected"
    assert rows(result)["Pt"].verdict == "acceptable"


def test_anode_in_alkali_at_oxygen_evolution():
    # Common practice: in 1 M alkali (pH 14) at 1.5-1.7 V vs RHE nickel is passive, zinc and aluminium dissolve.
    result = run(ph=14, potential=[1.5, 1.7], scale="RHE", role="anode")
    table = rows(result)
    assert table["Ni"].verdict == "acceptable"
    assert table["Ni"].judged.fractions["passivation"] == pytest.approx(1.0)
    for bad in ("Zn", "Al"):
        assert table[bad].verdict == "rejected"
        assert ranks(result)["Ni"] < ranks(result)[bad]
    assert any(h.species == "O2" for h in table["Ni"].hazards)


def test_worked_example_copper_cathode_by_hand():
    """Cu at pH 2 and 0.00 V vs SHE, dissolved species at 10^-6, 25 °C, by the Nernst equation.

    Handbook values (Bard, Parsons & Jordan 1985, copper chapter; from memory):
      Cu2+ + 2 e- = Cu   E° = 0.340 V
      Cu+  +   e- = Cu   E° = 0.520 V
    1. Cu2+/Cu line at a = 10^-6: E = 0.340 + (0.05916/2)·log(10^-6) = 0.340 − 0.1775 = 0.1625 V.
       The point (0.00 V) lies below it, so Cu is immune; it can rise 162 mV before Cu2+ forms:
       margin ≈ +162 mV.
    2. Equilibrium dissolved copper with Cu metal at 0.00 V:
       log a(Cu2+) = 2·(0.00 − 0.340)/0.05916 = −11.49
       log a(Cu+)  = (0.00 − 0.520)/0.05916 = −8.79
       total ≈ 10^-8.79 (Cu+ dominates; hydroxo complexes are negligible at pH 2).
    3. Cu is its own stable state: instability 0.00 eV.
    """
    row = rows(run(ph=2, potential=0.0, role="cathode", materials=["Cu"]))["Cu"]
    slope = nernst_slope()
    cu2_line = 0.340 + slope / 2 * math.log10(1e-6)
    assert row.judged.fractions == {"immunity": 1.0, "passivation": 0.0, "hydride": 0.0, "corrosion": 0.0}
    assert 1000 * row.margin_v == pytest.approx(1000 * cu2_line, abs=10)
    log_cu1 = (0.0 - 0.520) / slope
    log_cu2 = 2 * (0.0 - 0.340) / slope
    assert row.log10_dissolved == pytest.approx(math.log10(10 ** log_cu1 + 10 ** log_cu2), abs=0.3)
    assert row.instability_ev == 0.0
    assert row.reason.startswith("immune as Cu at this point")


def test_rhe_window_is_a_slanted_band():
    # 0 to 0.1 V vs RHE over pH 0-14: on the SHE diagram the band falls 0.0592 V per pH unit.
    result = run(ph=[0, 14], potential=[0.0, 0.1], scale="RHE", materials=["Pt"])
    vertices = result.window.vertices.tolist()
    slope = nernst_slope()
    assert vertices == [[0, 0.0], [14, pytest.approx(-14 * slope)], [14, pytest.approx(0.1 - 14 * slope)], [0, 0.1]]


def test_instability_of_an_oxide_equals_its_reduction_free_energy():
    # IrO2 at pH 0, -0.5 V: Ir is stable; IrO2 -> Ir + 2 H2O: ΔG per Ir = -ΔGf(IrO2) + 2ΔGf(H2O) - 4F·E ... in eV:
    # Φ(IrO2) - Φ(Ir) = [ΔGf(IrO2) - 2 ΔGf(H2O)]/F - 4·E (the formation plane, Pourbaix 1966 ch. 2)
    ir = CATALOG.systems["Ir"]
    dgf = ir.find("IrO2").dgf
    expected = (dgf - 2 * CATALOG.water["H2O"].dgf) / KJ_PER_EV - 4 * (-0.5)
    row = rows(run(ph=0, potential=-0.5, materials=["IrO2"]))["IrO2"]
    assert row.instability_ev == pytest.approx(expected, abs=1e-9)


def test_family_and_list_selection():
    noble = run(ph=1, potential=0.5, family="noble")
    assert {row.material.family for row in noble.rows} == {"noble"}
    chosen = run(ph=1, potential=0.5, materials=["pt", "NI"])
    assert sorted(row.id for row in chosen.rows) == ["Ni", "Pt"]


def test_custom_order_and_weights():
    by_price = run(ph=[0, 1], potential=[-0.2, 0.0], role="cathode", materials=["Pt", "Cu", "Au"], rank_by=["price"])
    prices = [row.price_usd_per_kg for row in by_price.rows]
    assert prices == sorted(prices)
    weighted = run(ph=[0, 1], potential=[-0.2, 0.0], role="cathode", materials=["Pt", "Cu", "Zn"],
                   weights={"unacceptable": 1.0, "price": 0.1})
    assert weighted.rows[-1].id == "Zn"
    assert "weighted" in weighted.rule


def test_accept_override():
    strict = rows(run(ph=14, potential=[1.5, 1.7], scale="RHE", role="anode", accept=["immunity"], materials=["Ni"]))
    assert strict["Ni"].verdict == "rejected"


def test_hazard_flags_chromate():
    # Common practice: chromium dissolves as Cr(VI) chromate at high potential in alkali; the catalog flags it.
    row = rows(run(ph=13, potential=[0.6, 0.9], materials=["Cr"]))["Cr"]
    assert any("CrO4" in h.species for h in row.hazards if h.kind == "toxic")


def test_hydrogen_evolution_flagged_below_the_h2_line():
    row = rows(run(ph=0, potential=-0.3, materials=["Pt"], role="cathode"))["Pt"]
    assert any(h.species == "H2" and "flammable" in h.note for h in row.hazards)


@pytest.mark.parametrize("kwargs, field, message", [
    (dict(ph=[5, 1], potential=0), "ph", "inverted"),
    (dict(ph=[1, 2, 3], potential=0), "ph", "pair"),
    (dict(ph=[], potential=0), "ph", "pair"),
    (dict(ph=20, potential=0), "ph", "between -2 and 16"),
    (dict(ph=7, potential=[1, 0]), "potential", "inverted"),
    (dict(ph=7, potential=4), "potential", "diagram's -3 to 3 V"),
    (dict(ph=7, potential=float("nan")), "potential", "finite"),
    (dict(ph=7, potential="high"), "potential", "number"),
    (dict(ph=True, potential=0), "ph", "number"),
    (dict(ph=7, potential=0, scale="XYZ"), "scale", "unknown reference scale"),
    (dict(ph=7, potential=0, role="bipolar"), "role", "anode, cathode"),
    (dict(ph=7, potential=0, accept=["sparkle"]), "accept", "allowed: immunity"),
    (dict(ph=7, potential=0, accept=[]), "accept", "at least one"),
    (dict(ph=7, potential=0, materials=["Unobtainium"]), "materials", "known materials"),
    (dict(ph=7, potential=0, materials=[]), "materials", "empty"),
    (dict(ph=7, potential=0, family="exotic"), "family", "allowed: noble"),
    (dict(ph=7, potential=0, family="noble", materials=["Pt"]), "materials", "not both"),
    (dict(ph=7, potential=0, rank_by=["luck"]), "rank_by", "unknown ranking key"),
    (dict(ph=7, potential=0, weights={"price": -1}), "weights", "≥ 0"),
    (dict(ph=7, potential=0, activity=0), "activity", "between"),
    (dict(ph=7, potential=0, temperature=200), "temperature", "between"),
])
def test_bad_scenarios_name_their_field(kwargs, field, message):
    with pytest.raises(InputError, match=message) as caught:
        make_scenario(**kwargs)
    assert caught.value.field == field


def test_a_repeated_scenario_reuses_element_verdicts_and_answers_the_same():
    from electrosieve.engine.screen import VERDICTS

    scenario = make_scenario(ph=[4.2, 5.3], potential=[-0.31, 0.44], role="cathode")
    VERDICTS.clear()
    fresh = screen(scenario)
    computed = VERDICTS.computed
    assert computed == len(default_catalog().systems)
    again = screen(make_scenario(ph=[4.2, 5.3], potential=[-0.31, 0.44], role="cathode"))
    assert VERDICTS.computed == computed  # every verdict came from the first screen
    assert again.rows == fresh.rows
    other = screen(make_scenario(ph=[4.2, 5.3], potential=[-0.31, 0.44], role="anode"))  # other accepted regions
    assert VERDICTS.computed == 2 * computed
    assert other.rows != fresh.rows


def test_an_overlay_catalog_never_shares_verdicts_with_the_built_in_one(tmp_path):
    # Zn2+ made far less stable in an overlay (a value invented for this test): the same scenario,
    # screened first on the built-in catalog, must then see the overlay's own diagram.
    from electrosieve.engine.catalog import builtin_data_dir, load_catalog

    original = (builtin_data_dir() / "species" / "Zn.toml").read_text(encoding="utf-8")
    (tmp_path / "Zn.toml").write_text(original.replace("dgf = -147.06", "dgf = -50.00"), encoding="utf-8")
    scenario = dict(ph=[2, 3], potential=[-0.9, -0.8], materials=["Zn"], role="cathode")
    built_in = screen(make_scenario(**scenario)).rows[0]
    overlay = load_catalog(overlay=tmp_path)
    changed = screen(make_scenario(**scenario, catalog=overlay), overlay).rows[0]
    # Zn/Zn2+ at 10^-6 lies at -0.762 - 0.177 = -0.94 V vs SHE (E° from Bard, Parsons & Jordan 1985; Nernst)
    assert built_in.judged.fractions["corrosion"] == 1.0
    assert changed.judged.fractions["immunity"] == 1.0  # now at -50/(2F) - 0.177 = -0.44 V
