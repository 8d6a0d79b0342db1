"""Judgements a practitioner would act on: one scenario per role, with the trade's known answer and its source.

The thermodynamic part comes from the existing engine, read-only: each element's exact diagram and the
window's overlay (``engine.metrics.overlays``); ``judge`` adds roles, conduction, kinetics, robustness, notes.
"""

from functools import lru_cache

import pytest

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.conduction import surface_of
from electrosieve.engine.diagram import diagram
from electrosieve.engine.domains import PlotLimits
from electrosieve.engine.judgement import Conditions, ElementState, Met, judge, judge_all, rank_key
from electrosieve.engine.metrics import overlays
from electrosieve.engine.notes import element_notes
from electrosieve.engine.roles import roles
from electrosieve.engine.window import operating_window


@lru_cache(maxsize=16)
def ranked(role_name: str, ph: tuple, potential: tuple, scale: str = "RHE", current_density: float = 1.0):
    """Every catalog material judged for ``role_name`` over the window, in rank order."""
    catalog = default_catalog()
    role = roles()[role_name]
    window = operating_window(catalog.scales, list(ph), list(potential), scale, 25.0, PlotLimits())
    elements = list(dict.fromkeys(m.element for m in catalog.materials.values()))
    diagrams = {e: diagram(e) for e in elements}
    overlay = dict(zip(elements, overlays(list(diagrams.values()), window)))
    states = {e: ElementState.of(diagrams[e].planes, overlay[e].pieces, overlay[e].dissolved, element_notes(catalog, e))
              for e in elements}
    conditions = Conditions(window.vertices, window.ph, diagrams[elements[0]].water, current_density)
    judged = judge_all(list(catalog.materials.values()), role, states, conditions)
    return sorted(judged, key=lambda j: rank_key(j, role))


def acceptable(results):
    return [j.material for j in results if j.acceptable]


def position(results, material):
    return [j.material for j in results].index(material)


# --- Alkaline oxygen evolution: 1 M alkali, 1.5-1.7 V vs RHE -------------------------------------------------
ALKALINE_OER = ("oer-anode", (13.5, 14.0), (1.5, 1.7))


def test_alkaline_oer_nickel_and_cobalt_lead_the_acceptable_group():
    # Common practice: nickel anodes in alkaline electrolysers; McCrory et al. (2013), JACS 135, 16977:
    # NiOx and CoOx among the most active non-noble catalysts in 1 M NaOH.
    results = ranked(*ALKALINE_OER)
    top = acceptable(results)[:4]
    assert set(top) == {"Ni", "NiO", "Co", "Co3O4"}


def test_alkaline_oer_accepts_no_insulator():
    # Insulating films block current (Lohrengel 1993): Ta2O5, TiO2, ZrO2, HfO2 ... are never acceptable anodes.
    for j in ranked(*ALKALINE_OER):
        if j.acceptable:
            assert j.surface.passes_current, j.material
    for material in ("Ta2O5", "TiO2", "Ti", "Zr", "Hf"):
        j = next(j for j in ranked(*ALKALINE_OER) if j.material == material)
        assert not j.acceptable and any("blocks current" in r for r in j.reasons)


# --- Acid oxygen evolution: pH 0-1, 1.5-1.8 V vs RHE ---------------------------------------------------------
ACID_OER = ("oer-anode", (0.0, 1.0), (1.5, 1.8))


def test_acid_oer_iridium_oxide_is_in_the_top_group():
    # Common practice: iridium oxide anodes in PEM electrolysers; Trasatti (1984); McCrory et al. (2013).
    assert "IrO2" in acceptable(ranked(*ACID_OER))[:3]
    assert position(ranked(*ACID_OER), "IrO2") == 0


def test_acid_oer_accepts_no_insulator_and_rejects_dissolving_oxides():
    results = {j.material: j for j in ranked(*ACID_OER)}
    assert not any(j.acceptable and not j.surface.passes_current for j in results.values())
    assert not results["RuO2"].acceptable  # RuO4 forms: RuO2 alone corrodes in acid oxygen evolution (Trasatti 1984)


# --- Acid hydrogen evolution: pH 0-1, -0.3-0 V vs RHE --------------------------------------------------------
ACID_HER = ("her-cathode", (0.0, 1.0), (-0.3, 0.0))


def test_acid_her_platinum_group_metals_first():
    # Trasatti (1972), J. Electroanal. Chem. 39, 163: the platinum-group metals top the volcano.
    first = [j.material for j in ranked(*ACID_HER)[:5]]
    assert set(first) == {"Pt", "Pd", "Rh", "Ru", "Ir"}


def test_acid_her_high_overpotential_metals_last():
    # Pb, Hg, Cd, Zn have the highest hydrogen overpotentials (Trasatti 1972; Bockris & Reddy 2000, ch. 7).
    results = ranked(*ACID_HER)
    known = [j for j in results if j.acceptable and j.criterion_value is not None]
    assert known[-1].material == "Hg"
    last_metals = {"Pb", "Cd", "Zn"}
    for j in results:
        if j.material in last_metals:
            assert not j.acceptable  # they also dissolve in acid at these potentials
            assert position(results, j.material) > position(results, "Hg")


def test_oxides_are_not_acceptable_cathodes():
    # The complaint of issue 14: IrO2 and Ag2O are reduced at cathodic potentials.
    results = {j.material: j for j in ranked(*ACID_HER)}
    for oxide in ("IrO2", "Ag2O", "RuO2"):
        assert not results[oxide].acceptable
        assert any("does not stay as put" in r for r in results[oxide].reasons)


def test_unknown_kinetics_rank_after_known():
    results = ranked(*ACID_HER)
    osmium = next(j for j in results if j.material == "Os")
    assert osmium.acceptable and osmium.criterion_value is None
    assert any("unknown" in r for r in osmium.reasons)
    assert all(position(results, "Os") > position(results, j.material)
               for j in results if j.acceptable and j.criterion_value is not None)


# --- Deposition cathode: pH 2-3, -0.9 to -0.7 V vs SHE (metal deposition from acid sulfate) -------------------
DEPOSITION = ("deposition-cathode", (2.0, 3.0), (-0.9, -0.7), "SHE")


def test_deposition_cathode_high_overpotential_metals_first():
    # Pletcher & Walsh (1990): mercury, lead and cadmium cathodes where hydrogen evolution is a loss.
    assert acceptable(ranked(*DEPOSITION))[:3] == ["Hg", "Pb", "Cd"]


# --- Working electrode: acid, 0.05-0.85 V vs RHE -------------------------------------------------------------
WORKING = ("working-electrode", (0.0, 1.0), (0.05, 0.85))


def test_working_electrode_window_order():
    # Bard & Faulkner (2001), figure of potential ranges in 1 M H2SO4: carbon widest, then gold, platinum narrowest
    # (hydrogen evolves on platinum at the reversible potential).
    widths = {j.material: j.criterion_value for j in ranked(*WORKING)}
    assert widths["graphite"] > widths["Au"] > widths["Pt"]
    assert acceptable(ranked(*WORKING))[:3] == ["graphite", "Au", "Pt"]


def test_working_electrode_carbon_is_not_rejected_for_slow_reactions():
    # Kinoshita (1988): methane formation and slow oxidation of carbon do not count at these potentials.
    carbon = next(j for j in ranked(*WORKING) if j.material == "graphite")
    assert carbon.acceptable and {n.kind for n in carbon.notes} == {"kinetic"}
    assert carbon.log10_dissolved is None  # the equilibrium figure counted CO2: unknown, not "dissolves freely"


# --- Current collector in a neutral buffer: pH 6.5-7.5, -0.2 to 0.8 V vs SHE ---------------------------------
COLLECTOR = ("current-collector", (6.5, 7.5), (-0.2, 0.8), "SHE")


def test_current_collector_in_neutral_buffer():
    # Common practice: titanium, tantalum, platinum and gold feeders and substrates; zinc and iron corrode.
    results = {j.material: j for j in ranked(*COLLECTOR)}
    for good in ("Ti", "Ta", "Nb", "Pt", "Au"):
        assert results[good].acceptable, good
    for bad in ("Zn", "Fe", "Cu", "Mg"):
        assert not results[bad].acceptable, bad


def test_unknown_dissolved_metal_ranks_after_known():
    # Ta has no dissolved species in the data: unknown, so after every acceptable material with a known figure.
    results = ranked(*COLLECTOR)
    tantalum = position(results, "Ta")
    assert all(tantalum > position(results, j.material)
               for j in results if j.acceptable and j.log10_dissolved is not None)


# --- Units of the judgement -----------------------------------------------------------------------------------

@pytest.mark.parametrize("scenario", [ALKALINE_OER, ACID_OER, ACID_HER, DEPOSITION, WORKING, COLLECTOR])
def test_robustness_verdict_agrees_with_the_exact_verdict(scenario):
    for j in ranked(*scenario):
        assert (j.robustness.verdict == "acceptable") == j.acceptable, j.material
        assert 0.0 <= j.robustness.verdict_probability <= 1.0 and j.robustness.draws >= 200


def test_kinetics_follow_the_chosen_current_density():
    low = next(j for j in ranked("her-cathode", (0.0, 1.0), (-0.3, 0.0), "RHE", 1.0) if j.material == "Hg")
    high = next(j for j in ranked("her-cathode", (0.0, 1.0), (-0.3, 0.0), "RHE", 10.0) if j.material == "Hg")
    assert high.kinetics.hydrogen_onset_v_rhe == pytest.approx(low.kinetics.hydrogen_onset_v_rhe - 0.118)


def test_a_dissolving_material_keeps_its_own_surface():
    catalog = default_catalog()
    zinc = diagram("Zn")
    window = operating_window(catalog.scales, [0, 1], [0.0, 0.2], "SHE", 25.0, PlotLimits())
    j = judge(catalog.materials["Zn"], roles()["anode"], ElementState(zinc.planes, (Met("Zn^2+", "corrosion", 1.0),), 108.0),
              Conditions(window.vertices, window.ph, zinc.water))
    assert j.surface == surface_of("Zn") and not j.acceptable
    assert "dissolves freely (> 1 M)" in j.reasons


def test_judging_one_by_one_gives_the_same_answers_as_the_single_pass():
    catalog = default_catalog()
    role = roles()["oer-anode"]
    window = operating_window(catalog.scales, [13.5, 14.0], [1.5, 1.7], "RHE", 25.0, PlotLimits())
    for material in ("Ni", "Cu", "Ag", "Sn"):
        d = diagram(catalog.materials[material].element)
        (overlay,) = overlays([d], window)
        alone = judge(catalog.materials[material], role, ElementState.of(d.planes, overlay.pieces, overlay.dissolved),
                      Conditions(window.vertices, window.ph, d.water))
        together = next(j for j in ranked(*ALKALINE_OER) if j.material == material)
        assert alone == together
