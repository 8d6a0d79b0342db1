"""Species whose absence or value flips a verdict: each checked by a consequence a practitioner recognises.

Every check names its source beside the value; values recalled from memory say so. Boundaries are read
from the exact diagram at a dissolved activity of 10^-6 (the corrosion convention, Pourbaix 1966, ch. 3).
"""

import pytest

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import GAS_CONSTANT, LN10, T_STANDARD
from electrosieve.engine.diagram import diagram
from tests.utils.reactions import Check, log10_k, standard_potential

RT_LN10 = GAS_CONSTANT * T_STANDARD * LN10 / 1000.0
"""kJ/mol per log10 unit at 298.15 K."""


CHECKS = [
    # Baes & Mesmer 1976, molybdenum(VI), recalled: spread of published values 3.7-4.3 and 3.5-4.0
    Check("Mo", "MoO4^2- + H^+ = HMoO4^-", "logK", 4.0, 0.3, "Baes & Mesmer 1976, molybdenum(VI)"),
    Check("Mo", "HMoO4^- + H^+ = H2MoO4", "logK", 3.7, 0.3, "Baes & Mesmer 1976, molybdenum(VI)"),
    # Baes & Mesmer 1976, zinc, recalled: Zn(OH)3- + H2O = Zn(OH)4 2- + H+, log *beta4 - log *beta3 = -12.8
    Check("Zn", "HZnO2^- = ZnO2^2- + H^+", "logK", -12.8, 0.3, "Baes & Mesmer 1976, zinc"),
    # Brown et al. 2005 (NEA-TDB, zirconium), selected, recalled: log *Ks0 = -7.0 +/- 1.6, log *beta1 = 0.32
    Check("Zr", "ZrO2 + 4 H^+ = Zr^4+ + 2 H2O", "logK", -7.0, 0.2, "Brown et al. 2005, NEA-TDB zirconium"),
    Check("Zr", "Zr^4+ + H2O = ZrOH^3+ + H^+", "logK", 0.32, 0.1, "Brown et al. 2005, NEA-TDB zirconium"),
    Check("Zr", "Zr^4+ + 4 H2O = Zr(OH)4 + 4 H^+", "logK", -2.19, 0.1, "Brown et al. 2005, NEA-TDB zirconium"),
    Check("Zr", "Zr^4+ + 6 H2O = Zr(OH)6^2- + 6 H^+", "logK", -29.0, 0.1, "Brown et al. 2005, NEA-TDB zirconium"),
    # Bratsch 1989 (J. Phys. Chem. Ref. Data 18, 1), recalled: Hf4+/Hf -1.55 V; the catalog's Hf4+ follows the
    # crystalline-HfO2 solubility bound of Rai et al. 2016 (-1.49 V): the tolerance spans the two.
    Check("Hf", "Hf^4+ + 4 e- = Hf", "E0", -1.55, 0.07, "Bratsch 1989; Rai et al. 2016"),
    # Bard, Parsons & Jordan 1985, ruthenium, recalled: RuO4/RuO4- 1.00 V, RuO4-/RuO4 2- 0.59 V
    Check("Ru", "RuO4 + e- = RuO4^-", "E0", 1.00, 0.02, "Bard, Parsons & Jordan 1985, ruthenium"),
    Check("Ru", "RuO4^- + e- = RuO4^2-", "E0", 0.59, 0.02, "Bard, Parsons & Jordan 1985, ruthenium"),
]
"""Published constants the audited rows must reproduce (each names its table)."""


@pytest.mark.parametrize("check", CHECKS, ids=str)
def test_audited_rows_reproduce_their_published_constants(check):
    assert abs(check.computed() - check.expected) <= check.tolerance, check.source


def _boundary_ph(element: str, potential: float, left: str, right: str, low: float, high: float) -> float:
    """pH where the stable species changes from ``left`` to ``right`` at ``potential`` (bisection on the exact diagram)."""
    d = diagram(element)
    assert d.stable_species_at(low, potential).name == left
    assert d.stable_species_at(high, potential).name == right
    for _ in range(50):
        middle = (low + high) / 2
        if d.stable_species_at(middle, potential).name == left:
            low = middle
        else:
            high = middle
    return (low + high) / 2


# --- 1. lead: plumbate ---

def test_lead_dioxide_dissolves_as_plumbate_in_strong_alkali():
    # Pourbaix 1966, lead: PbO2 + H2O = PbO3^2- + 2 H+ at about pH 12.5 for 10^-6 (the atlas's plumbate,
    # recalled); tolerance 0.4 pH spans the atlas and NBS values of PbO2 (1.7 kJ/mol apart).
    assert _boundary_ph("Pb", 1.0, "PbO2", "PbO3^2-", 11.0, 14.0) == pytest.approx(12.5, abs=0.4)


def test_lead_dioxide_is_no_alkaline_oxygen_anode():
    # common practice: PbO2 anodes serve in acid (lead-acid, electrowinning), never in strong alkali
    found = diagram("Pb").stable_species_at(14.0, 0.7)
    assert found.name == "PbO3^2-" and found.region == "corrosion"


# --- 2. molybdenum: molybdic acid ---

def test_molybdite_is_soluble_in_acid_at_oxygen_evolution():
    # common practice: MoO3 dissolves in acid (solubility about 1 g/L, i.e. 10^-2.2 mol/L with polymolybdates);
    # the monomer alone must still exceed 10^-6.
    assert -6.0 < log10_k("MoO3 + H2O = H2MoO4") < -2.0
    found = diagram("Mo").stable_species_at(1.0, 1.6)
    assert found.name == "H2MoO4" and found.region == "corrosion"


# --- 3. zinc: one compilation ---

def test_zinc_passive_band_ends_near_ph_eleven():
    # Baes & Mesmer 1976, zinc (log *beta3 = -28.4, log *beta4 = -41.2, recalled) on the NBS ZnO:
    # the ZnO/HZnO2- boundary at 10^-6 lies at about pH 11.2; 0.4 pH spans the NBS and CODATA ZnO (2.2 kJ/mol).
    assert _boundary_ph("Zn", 0.0, "ZnO", "HZnO2^-", 9.0, 12.5) == pytest.approx(11.2, abs=0.4)


def test_zinc_system_takes_one_compilation():
    sources = {s.source for s in default_catalog().system("Zn").species}
    assert sources <= {"wagman1982", "baes1976"}  # NBS rows, and one row derived from an NBS row


# --- 4. hydrides ---

def test_zirconium_hydride_matches_the_crc_table():
    # CRC Handbook (chemicals' CRC_standard_data, CAS 7704-99-6): ZrH2 dGf = -128.8 kJ/mol
    from tests.utils.libraries import crc_standard_gibbs

    assert default_catalog().system("Zr").find("ZrH2").dgf == pytest.approx(crc_standard_gibbs("7704-99-6"), abs=0.1)


def test_titanium_and_zirconium_cathodes_form_hydrides_not_immune_metal():
    # common practice: titanium and zirconium cathodes take up hydrogen and embrittle; thermodynamically the
    # hydride replaces the metal's immunity entirely (Ti + H2 = TiH2, dGf = -105 kJ/mol, NBS recalled)
    for element, hydride in (("Ti", "TiH2"), ("Zr", "ZrH2")):
        d = diagram(element)
        assert "immunity" not in {dom.region for dom in d.domains}, element
        for ph in (0.0, 7.0, 14.0):
            found = d.stable_species_at(ph, -0.0592 * ph - 0.9)
            assert found.name == hydride and found.region == "hydride", (element, ph)


def test_hydride_couples_lie_well_above_the_metal_couples():
    # ZrO2/ZrH2 at -0.76 V and ZrO2/Zr at -1.47 V (from NBS values); TiO2/TiH2 near -0.54 V
    assert standard_potential("ZrO2 + 6 H^+ + 6 e- = ZrH2 + 2 H2O") == pytest.approx(-0.76, abs=0.03)
    assert standard_potential("ZrO2 + 4 H^+ + 4 e- = Zr + 2 H2O") < -1.4
    assert standard_potential("TiO2 (rutile) + 6 H^+ + 6 e- = TiH2 + 2 H2O") == pytest.approx(-0.54, abs=0.03)


# --- 5. zirconium and hafnium ions ---

@pytest.mark.parametrize("ph", [0.0, 1.0, 3.0, 7.0, 12.0])
def test_zirconium_stays_passive_across_the_water_window(ph):
    # long practice: zirconium serves in hot hydrochloric and sulfuric acids and in alkali (passive ZrO2)
    d = diagram("Zr")
    for potential in (-0.0592 * ph, -0.0592 * ph + 0.6, 1.229 - 0.0592 * ph):
        found = d.stable_species_at(ph, potential)
        assert found.name == "ZrO2" and found.region == "passivation", (ph, potential)


@pytest.mark.parametrize("ph", [0.0, 1.0, 7.0])
def test_hafnium_stays_passive_in_acid_like_zirconium(ph):
    # practice: hafnium resists acids as zirconium does; Rai et al. 2016: crystalline HfO2 log *Ks0 < -7
    found = diagram("Hf").stable_species_at(ph, 0.6 - 0.0592 * ph)
    assert found.name == "HfO2" and found.region == "passivation"


# --- 6. niobium and tantalum ---

@pytest.mark.parametrize("element", ["Nb", "Ta"])
def test_elements_without_dissolved_species_say_so(element):
    # Pourbaix 1966 (Nb, Ta) gives no dissolved species with a value: the catalog flags it, never "insoluble"
    catalog = default_catalog()
    assert catalog.lacks_dissolved(element)
    assert not any(s.is_dissolved for s in catalog.system(element).species)
    assert catalog.notes(element, "scope")


def test_elements_with_dissolved_species_are_not_flagged():
    catalog = default_catalog()
    assert not any(catalog.lacks_dissolved(e) for e in catalog.systems if e not in ("Nb", "Ta"))


# --- 8. carbon ---

def test_carbon_carries_the_kinetic_note_on_methane():
    # Pourbaix 1966, carbon; common practice: methane from graphite is thermodynamically allowed, kinetically nil
    notes = default_catalog().notes("C", "kinetic")
    assert len(notes) == 1 and notes[0].species == ["CH4"] and notes[0].source in default_catalog().sources
    assert diagram("C").stable_species_at(0.0, -0.5).name == "CH4"


# --- uncertainty ---

def test_every_species_carries_a_float_uncertainty():
    catalog = default_catalog()
    for system in catalog.systems.values():
        for species in system.species:
            assert isinstance(species.uncertainty, float) and species.uncertainty >= 0.0, species.name
    assert all(isinstance(s.uncertainty, float) for s in catalog.water.values())


def test_default_uncertainty_follows_the_data_class():
    catalog = default_catalog()
    classes = catalog.uncertainty_classes
    assert classes["reviewed"].uncertainty < classes["estimate"].uncertainty < classes["from_memory"].uncertainty
    assert catalog.system("Mo").find("MoO3").uncertainty == classes["reviewed"].uncertainty  # read off CRC/NBS
    assert catalog.system("Pb").find("PbO3^2-").uncertainty == 5.0  # the row's own
    assert catalog.system("Zn").find("Zn").uncertainty == 0.0  # the element: zero by definition


def test_uncertainty_classes_cite_resolvable_sources():
    catalog = default_catalog()
    for name, row in catalog.uncertainty_classes.items():
        for key in [row.source, *row.sources]:
            assert not key or key in catalog.sources, (name, key)
