"""Alloys, coated electrodes and mixed oxides against published outcomes (engine/alloydata.py,
engine/mixing.py, engine/assemblage.py; data/alloys.toml, data/compounds.toml)."""

import numpy as np
import pytest

from electrosieve.engine.alloydata import alloy_data
from electrosieve.engine.assemblage import material_diagram, material_exposures
from electrosieve.engine.catalog import default_catalog


def fates(material_id, ph, potential):
    diagram = material_exposures(material_id)[0].diagram
    return {c.element: c for c in diagram.components_at(ph, potential)}


def test_stainless_316_keeps_chromium_in_an_oxide_film_over_the_neutral_range():
    # Beverskog & Puigdomenech (1999), Fe–Cr–Ni diagrams at 25 °C, and Pourbaix (1966) §10.1 (Cr): chromium(III)
    # oxide or chromite holds chromium from pH 6 to 8 between about −0.4 and +0.3 V vs SHE (10^-6 activity).
    diagram = material_exposures("SS316")[0].diagram
    window = np.array([[6.0, -0.4], [8.0, -0.4], [8.0, 0.3], [6.0, 0.3]])
    chromium = {c.element: c for c in diagram.components_over(window)}["Cr"]
    assert chromium.region == "passivation"
    assert chromium.region_fractions == {"passivation": pytest.approx(1.0)}
    assert set(chromium.species) <= {"Cr2O3", "FeCr2O4 (chromite)", "NiCr2O4", "Cr(OH)3"}


@pytest.mark.parametrize("material_id", ["SS316", "SS430", "C276"])
def test_chromium_leaves_as_chromate_at_transpassive_potentials_and_is_flagged(material_id):
    # Pourbaix (1966) §10.1: Cr2O3 → CrO4^2- above about +0.6 V at pH 7 (10^-6); the transpassive dissolution
    # of stainless steels and Ni–Cr–Mo alloys releases Cr(VI) (Beverskog & Puigdomenech 1999).
    diagram = material_exposures(material_id)[0].diagram
    components = diagram.components_at(7.0, 0.8)
    chromium = {c.element: c for c in components}["Cr"]
    assert chromium.region == "corrosion" and chromium.species == ("CrO4^2-",)
    assert any(h.element == "Cr" and "chromium(VI)" in h.note for h in diagram.hazards(components))


def test_nickel_leaves_nickel_copper_alloy_in_acid_where_copper_is_immune():
    # Standard potentials Ni2+/Ni −0.257 V and Cu2+/Cu +0.342 V (Bard, Parsons & Jordan 1985): at 10^-6 nickel
    # dissolves above about −0.43 V and copper stays metallic up to about +0.16 V, so between them alloy 400
    # loses its nickel selectively (dealloying of Monel in acid).
    for potential in (-0.35, -0.2, 0.0, 0.1):
        found = fates("NiCu400", 2.0, potential)
        assert found["Ni"].region == "corrosion" and found["Ni"].species == ("Ni^2+",)
        assert found["Cu"].region == "immunity" and found["Cu"].species == ("Cu",)
    diagram = material_exposures("NiCu400")[0].diagram
    onset = next(e for e in np.arange(-0.60, 0.0, 0.001) if diagram.assemblage_at(2.0, e).region == "corrosion")
    assert -0.45 <= onset <= -0.39   # the Ni2+/Ni line at 10^-6, within the data's spread
    assert "Cu–Ni" in diagram.mixing and "mey1992" in diagram.mixing


def test_chromite_is_stable_in_neutral_to_alkaline_water_at_low_potentials():
    # Beverskog & Puigdomenech (1999), Fe–Cr diagram at 25 °C: FeCr2O4 occupies the neutral and alkaline
    # region below the Fe2O3/Cr2O3 field.
    diagram = material_diagram({"Fe": 1.0, "Cr": 2.0})
    for ph in (8.0, 10.0, 12.0):
        assert diagram.assemblage_at(ph, -0.4).name == "FeCr2O4 (chromite)"
    assert diagram.assemblage_at(10.0, 0.2).name == "Fe2O3 + Cr2O3"


def test_nickel_ferrite_is_stable_in_alkaline_water_for_iron_nickel():
    # Beverskog & Puigdomenech (1999), Fe–Ni diagram at 25 °C: NiFe2O4 forms in neutral and alkaline water
    # between the metal and the higher oxides.
    diagram = material_diagram({"Fe": 2.0, "Ni": 1.0})
    assert diagram.assemblage_at(9.0, -0.3).name == "NiFe2O4 (trevorite)"
    assert any("NiFe2O4" in d.assemblage.name for d in material_exposures("SS316")[0].diagram.domains)


def test_coated_titanium_shows_the_coating_and_the_bare_substrate():
    # Comninellis & Vercesi (1991): IrO2–Ta2O5 holds at oxygen evolution in acid; titanium under a failed
    # coating passivates as TiO2 (Pourbaix 1966, §8.1).
    coating, substrate = material_exposures("Ti-IrTa")
    assert (coating.label, substrate.label) == ("coating", "substrate if the coating fails")
    assert coating.diagram.assemblage_at(0.0, 1.5).name == "IrO2 + Ta2O5"
    assert substrate.diagram.assemblage_at(0.0, 1.5).region == "passivation"
    # RuO2 oxidises to volatile RuO4 at high anodic potentials (the known loss route of RuO2 coatings)
    ruthenium = {c.element: c for c in material_exposures("Ti-RuTi")[0].diagram.components_at(0.0, 1.5)}["Ru"]
    assert ruthenium.species == ("RuO4",)


def test_kinetically_stable_carbons_carry_a_window_note_and_no_thermodynamic_verdict():
    # Macpherson (2015) for boron-doped diamond; Bard & Faulkner (2001) for glassy carbon (common practice).
    data = alloy_data()
    for material_id in ("GC", "BDD"):
        row = data.alloy(material_id)
        assert row.stability == "kinetic" and row.window_source and "V vs S" in row.window_note


def test_nominal_compositions_lie_inside_the_standard_ranges():
    # ASTM A240 Table 1 (S31600: Cr 16–18, Ni 10–14, Mo 2–3; S43000: Cr 16–18), ASTM B575 (N10276: Mo 15–17,
    # Cr 14.5–16.5, Fe 4–7, W 3–4.5), ASTM B127 (N04400: Cu 28–34, Ni 63 min).
    ranges = {"SS316": {"Cr": (16, 18), "Ni": (10, 14), "Mo": (2, 3)}, "SS430": {"Cr": (16, 18)},
              "C276": {"Mo": (15, 17), "Cr": (14.5, 16.5), "Fe": (4, 7), "W": (3, 4.5)},
              "NiCu400": {"Cu": (28, 34), "Ni": (63, 100)}}
    data = alloy_data()
    for material_id, limits in ranges.items():
        row = data.alloy(material_id)
        assert row.basis == "mass"
        for element, (low, high) in limits.items():
            assert low <= row.composition[element] <= high, (material_id, element)


def test_atom_fractions_of_316_from_mass_percent():
    # x_i = (w_i/M_i)/Σ(w_j/M_j) with CIAAW 2021 atomic weights: Cr 17 % by mass is 18.3 % of the atoms in 316.
    fractions = alloy_data().composition_of("SS316")
    assert sum(fractions.values()) == pytest.approx(1.0)
    assert fractions["Cr"] == pytest.approx(0.1833, abs=5e-4)


def test_chromite_enthalpy_agrees_with_an_independent_determination():
    # Kessel, Beckett & Stolper (2003), Am. Mineral. 88, 1021: ΔfH°298(FeCr2O4) = −1438 kJ/mol.
    chromite = next(c for c in alloy_data().compounds if c.formula == "FeCr2O4")
    assert abs(chromite.dhf - (-1438.0)) <= 8.0


def test_spinel_forming_energies_from_the_binary_oxides_are_small_and_negative():
    # Navrotsky & Kleppa (1968): spinels form from their oxides with a few tens of kJ/mol at most.
    catalog = default_catalog()
    oxide = {name: catalog.systems[el].find(name).dgf for el, name in
             (("Ni", "NiO"), ("Fe", "Fe2O3"), ("Cr", "Cr2O3"), ("Co", "CoO"))}
    compounds = {c.formula: c.dgf for c in alloy_data().compounds}
    assert -40 < compounds["NiFe2O4"] - oxide["NiO"] - oxide["Fe2O3"] < 0
    assert -40 < compounds["NiCr2O4"] - oxide["NiO"] - oxide["Cr2O3"] < 0
    assert -40 < compounds["CoFe2O4"] - oxide["CoO"] - oxide["Fe2O3"] < 0


def test_data_checksums():
    # A deliberate data edit changes these: update them in the same commit.
    data = alloy_data()
    assert len(data.compounds) == 4
    assert sum(c.dgf for c in data.compounds) == pytest.approx(-4575.5)
    assert len(data.alloys) == 10
    assert sum(sum(row.composition.values()) for row in data.alloys.values()) == pytest.approx(1000.0)
    assert len(data.interactions) == 1
