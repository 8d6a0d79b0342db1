"""Each electrode role end to end (``engine.screen.screen`` and the API): the practitioner's known answer, with its
source or "common practice" named beside each check."""

from functools import lru_cache

import pytest

from electrosieve.engine.conduction import CONDUCTIONS
from electrosieve.engine.screen import make_scenario, screen

PLATINUM_GROUP = {"Pt", "Pd", "Rh", "Ru", "Ir", "Os"}
HIGH_HYDROGEN_OVERPOTENTIAL = ("Hg", "Pb", "Cd", "Zn")
"""Metals with the highest hydrogen overpotentials (Trasatti 1972, J. Electroanal. Chem. 39, 163, the volcano's
low branch; Bockris & Reddy 2000, ch. 7)."""


@lru_cache(maxsize=16)
def rows(role: str, ph, potential, scale: str = "RHE", current_density: float = 1.0):
    return screen(make_scenario(ph=ph, potential=potential, scale=scale, role=role,
                                current_density=current_density)).rows


def acceptable(found) -> list[str]:
    return [row.id for row in found if row.verdict == "acceptable"]


def order(found) -> list[str]:
    return [row.id for row in found]


ALKALINE_OER = ("oer-anode", (13.5, 14.0), (1.5, 1.7))
ACID_OER = ("oer-anode", (0.0, 1.0), (1.5, 1.8))
ACID_HER = ("her-cathode", (0.0, 1.0), (-0.3, 0.0))
DEPOSITION = ("deposition-cathode", (2.0, 3.0), (-0.9, -0.7), "SHE")
WORKING = ("working-electrode", (0.0, 1.0), (0.05, 0.85))
COLLECTOR = ("current-collector", (6.5, 7.5), (-0.2, 0.8), "SHE")


def test_alkaline_oer_nickel_and_cobalt_lead():
    # 1 M alkali, 1.5-1.7 V vs RHE. Common practice: nickel anodes in alkaline electrolysers; McCrory et al. (2013),
    # JACS 135, 16977: NiOx and CoOx among the most active non-noble catalysts in 1 M NaOH.
    assert set(acceptable(rows(*ALKALINE_OER))[:4]) == {"Ni", "NiO", "Co", "Co3O4"}


@pytest.mark.parametrize("scenario", [ALKALINE_OER, ACID_OER], ids=["alkaline", "acid"])
def test_oer_accepts_no_insulator(scenario):
    # Insulating films block current (Lohrengel 1993, Mater. Sci. Eng. R 11, 243): Ta2O5, TiO2, ZrO2, HfO2 anodes
    # pass no current; the complaint was exactly these at the top.
    found = rows(*scenario)
    for row in found:
        if row.verdict == "acceptable":
            assert row.surface.conduction != "insulator", row.id
    assert {"Ta2O5", "TiO2", "Ti", "Zr", "Hf"}.isdisjoint(acceptable(found))
    assert all(row.verdict == "rejected" for row in found if row.id in ("Ta2O5", "TiO2"))


def test_acid_oer_iridium_oxide_in_the_top_group():
    # Common practice and Trasatti (2000), Electrochim. Acta 45, 2377: IrO2 is the acid OER anode (PEM electrolysers).
    assert "IrO2" in acceptable(rows(*ACID_OER))[:3]


def test_acid_her_platinum_group_first_high_overpotential_metals_last():
    # Trasatti (1972): the platinum-group metals top the volcano (log j0 about -3 A cm^-2), Hg, Pb, Cd, Zn at the foot.
    found = rows(*ACID_HER)
    good = acceptable(found)
    assert set(good[:5]) <= PLATINUM_GROUP and {"Pt", "Pd"} <= set(good[:3])
    with_data = {row.id for row in found if row.kinetics.hydrogen_onset_v_rhe is not None}
    last_platinum = max(order(found).index(m) for m in PLATINUM_GROUP & with_data if m in good)
    for metal in HIGH_HYDROGEN_OVERPOTENTIAL:
        assert order(found).index(metal) > last_platinum, metal
    known = [row for row in found if row.verdict == "acceptable" and row.kinetics.hydrogen_onset_v_rhe is not None]
    assert known[-1].id == "Hg"  # the most negative onset of the acceptable metals with data


def test_acid_her_oxides_are_not_acceptable_cathodes():
    # The complaint: IrO2 and Ag2O are reduced at cathodic potentials (common practice).
    found = {row.id: row for row in rows(*ACID_HER)}
    assert found["IrO2"].verdict == "rejected" and found["Ag2O"].verdict == "rejected"


def test_deposition_cathode_high_overpotential_metals_first():
    # Pletcher & Walsh (1990), Industrial Electrochemistry: mercury, lead and cadmium cathodes where hydrogen is a loss.
    assert acceptable(rows(*DEPOSITION))[:3] == ["Hg", "Pb", "Cd"]


def test_working_electrode_window_width_follows_published_overpotentials():
    # Bard & Faulkner (2001), Electrochemical Methods, the potential ranges in 1 M H2SO4: carbon widest, then gold,
    # platinum narrowest of the three (hydrogen evolves on Pt at the reversible potential).
    found = rows(*WORKING)
    width = {row.id: row.kinetics.window_v for row in found}
    assert width["graphite"] > width["Au"] > width["Pt"]
    assert acceptable(found)[:3] == ["graphite", "Au", "Pt"]
    carbon = next(row for row in found if row.id == "graphite")
    assert carbon.log10_dissolved is None and "unknown" in carbon.reason  # CO2 is waived (Kinoshita 1988)


def test_current_collector_in_a_neutral_buffer():
    # Common practice: titanium, platinum and gold feeders and substrates; zinc, iron, copper and magnesium corrode;
    # a bulk insulator carries no current at all.
    found = {row.id: row for row in rows(*COLLECTOR)}
    for good in ("Ti", "Pt", "Au"):
        assert found[good].verdict == "acceptable", good
    for bad in ("Zn", "Fe", "Cu", "Mg", "TiO2", "Ta2O5"):
        assert found[bad].verdict != "acceptable", bad
    ranked = order(rows(*COLLECTOR))
    assert ranked.index("Ti") < ranked.index("Hf")  # nothing dissolves measurably from either: price decides


def test_unknown_dissolved_metal_is_never_best():
    # Ta has no dissolved species in the data: unknown, after every acceptable material with a known figure.
    found = rows(*COLLECTOR)
    tantalum = order(found).index("Ta")
    assert all(tantalum > i for i, row in enumerate(found) if row.verdict == "acceptable" and row.log10_dissolved is not None)
    assert "dissolved metal unknown" in found[tantalum].reason


def test_unknown_kinetics_rank_after_known():
    found = rows(*ACID_OER)
    good = [row for row in found if row.verdict == "acceptable"]
    known = [row.kinetics.oxygen_onset_v_rhe is not None for row in good]
    assert known == sorted(known, reverse=True)
    assert any("oxygen onset unknown" in row.reason for row in good if row.kinetics.oxygen_onset_v_rhe is None)


def test_neighbours_whose_order_is_not_robust_are_marked():
    # Co3O4 and Co share one oxide and one onset: their order is a tie within the data's uncertainties.
    found = rows(*ALKALINE_OER)
    assert found[order(found).index("Co3O4")].order_robust is False or found[order(found).index("Co")].order_robust is False
    assert found[-1].order_robust is None


def test_current_density_moves_the_onsets_by_the_tafel_slope():
    # Trasatti (1972): mercury's Tafel slope is about 118 mV per decade.
    low = next(row for row in rows(*ACID_HER) if row.id == "Hg")
    high = next(row for row in rows(*ACID_HER, "RHE", 10.0) if row.id == "Hg")
    assert high.kinetics.hydrogen_onset_v_rhe == pytest.approx(low.kinetics.hydrogen_onset_v_rhe - 0.118, abs=0.005)


def test_the_api_carries_the_judgement(client):
    body = {"ph": [0, 1], "potential": [-0.3, 0], "scale": "RHE", "role": "her-cathode", "current_density": 10,
            "materials": ["Pt", "Hg", "Ta", "IrO2"]}
    response = client.post("/api/v1/screen", json=body)
    assert response.status_code == 200, response.text
    result = response.json()
    assert result["scenario"]["current_density"] == 10 and result["rule"].startswith("Ranked as a hydrogen-evolving")
    first = result["results"][0]
    assert first["material"] == "Pt" and first["surface"]["conduction"] in CONDUCTIONS
    assert first["kinetics"]["current_density_ma_cm2"] == 10 and first["kinetics"]["sources"]
    assert 0 <= first["robustness"]["verdict_probability"] <= 1 and first["robustness"]["draws"] >= 200
    tantalum = next(row for row in result["results"] if row["material"] == "Ta")
    assert tantalum["log10_dissolved"] is None and "unknown" in tantalum["dissolved"]
    assert client.post("/api/v1/screen", json={**body, "role": "anodes"}).status_code == 422
    assert client.post("/api/v1/screen", json={**body, "current_density": 0}).status_code == 422


def test_the_screen_page_offers_every_role_with_its_description(client):
    page = client.get("/screen?ph_low=14&potential_low=1.5&potential_high=1.7&scale=RHE&role=oer-anode"
                      "&current_density=10").text
    assert 'value="oer-anode" checked' in page and 'name="current_density"' in page
    assert "Surface, kinetics, robustness" in page and "10 mA cm<sup>-2</sup>" in page
