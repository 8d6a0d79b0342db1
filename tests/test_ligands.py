"""Ligands (data/ligands/): standard potentials implied by the data, and verdicts chloride changes.

Standard potentials are those of Bard, Parsons & Jordan (1985), Standard Potentials in Aqueous Solution
(IUPAC), recalled from memory, except AgCl/Ag from Bates & Bower (1954), J. Res. NBS 53, 283
(0.22234 V). Tolerances span the published spread named beside each.
"""

import pytest

from electrosieve.engine.catalog import default_catalog, load_catalog
from electrosieve.engine.diagram import diagram, planes_for
from electrosieve.engine.errors import CatalogError, InputError

from tests.utils.libraries import crc_standard_gibbs


def standard_potential(element: str, oxidised: str, reduced: str, ligand: str) -> float:
    """E° [V vs SHE] of oxidised/reduced at 25 °C, pH 0, unit activities of ligand and dissolved species."""
    catalog = default_catalog()
    planes = planes_for(catalog.system(element), catalog, 1.0, 25.0, ligand_activities=((ligand, 1.0),))
    i, j = planes.index_of[oxidised], planes.index_of[reduced]
    return float((planes.offset[j] - planes.offset[i]) / (planes.e_slope[i] - planes.e_slope[j]))


COUPLES = [
    # element, oxidised, reduced, ligand, E° [V], tolerance [V], source and spread
    ("Ag", "AgCl", "Ag", "Cl^-", 0.2223, 0.002, "Bates & Bower 1954: 0.22234"),
    ("Au", "AuCl4^-", "Au", "Cl^-", 1.002, 0.01, "Bard et al. 1985: 1.002"),
    ("Au", "AuCl2^-", "Au", "Cl^-", 1.154, 0.01, "Bard et al. 1985: 1.154"),
    ("Pt", "PtCl4^2-", "Pt", "Cl^-", 0.755, 0.03, "Bard et al. 1985: 0.755; CRC 0.73"),
    ("Pt", "PtCl6^2-", "PtCl4^2-", "Cl^-", 0.68, 0.03, "Bard et al. 1985: 0.68"),
    ("Pd", "PdCl4^2-", "Pd", "Cl^-", 0.591, 0.05, "Bard et al. 1985: 0.591; others to 0.64"),
    ("Hg", "Hg2Cl2", "Hg", "Cl^-", 0.2681, 0.002, "Bard et al. 1985: 0.2681"),
    ("Cu", "CuCl2^-", "Cu", "Cl^-", 0.20, 0.04, "Bard et al. 1985: about 0.20; NBS-implied 0.232"),
    ("Cu", "CuCl", "Cu", "Cl^-", 0.121, 0.01, "Bard et al. 1985: 0.121-0.137"),
    ("Pb", "PbCl2", "Pb", "Cl^-", -0.2675, 0.005, "Bard et al. 1985: -0.2675"),
    ("Ag", "Ag2SO4", "Ag", "SO4^2-", 0.654, 0.005, "Bard et al. 1985: 0.654"),
    ("Hg", "Hg2SO4", "Hg", "SO4^2-", 0.6125, 0.005, "Bard et al. 1985: 0.6125"),
    ("Pb", "PbSO4", "Pb", "SO4^2-", -0.3588, 0.005, "Bard et al. 1985: -0.3588"),
]


@pytest.mark.parametrize("element, oxidised, reduced, ligand, expected, tolerance, source", COUPLES,
                         ids=[f"{c[1]}/{c[2]}" for c in COUPLES])
def test_standard_potential_implied_by_the_data_matches_published(element, oxidised, reduced, ligand, expected,
                                                                   tolerance, source):
    assert standard_potential(element, oxidised, reduced, ligand) == pytest.approx(expected, abs=tolerance), source


@pytest.mark.parametrize("formula, cas", [("AgCl", "7783-90-6"), ("CuCl", "7758-89-6"), ("Hg2Cl2", "10112-91-1"),
                                          ("PbCl2", "7758-95-4"), ("PbSO4", "7446-14-2"), ("Ag2SO4", "10294-26-5")])
def test_chloride_and_sulfate_solids_match_the_crc_table(formula, cas):
    # chemicals.heat_capacity.CRC_standard_data (the CRC Handbook's standard properties table).
    reference = crc_standard_gibbs(cas)
    if reference is None:
        pytest.skip(f"no ΔGf° of {formula} in the CRC table of the library")
    found = next(s for ligand in default_catalog().ligands.values() for group in ligand.species.values()
                 for s in group if s.name == formula)
    assert found.dgf == pytest.approx(reference, abs=1.0)


def region_at(element: str, ph: float, potential: float, **conditions) -> tuple[str, str]:
    species = diagram(element, **conditions).stable_species_at(ph, potential)
    return species.name, species.region


def test_silver_leaves_the_metal_in_chloride_where_it_is_immune_without():
    # Without chloride silver is immune up to the Ag+/Ag line, 0.445 V at 10^-6 (Pourbaix 1966, §14.2).
    assert region_at("Ag", 5.0, 0.40) == ("Ag", "immunity")
    # Dilute chloride (a = 0.01): AgCl, since AgCl's solubility there (K·a(Cl−) = 10^-6.5) is below 10^-6.
    assert region_at("Ag", 5.0, 0.40, ligand_activities={"Cl^-": 0.01}) == ("AgCl", "passivation")
    # Concentrated chloride (a = 1): AgCl2^- is held at 10^-4.5 over AgCl, above 10^-6: the metal corrodes.
    assert region_at("Ag", 5.0, 0.30, ligand_activities={"Cl^-": 1.0}) == ("AgCl2^-", "corrosion")
    assert region_at("Ag", 5.0, 0.30) == ("Ag", "immunity")


def test_gold_and_platinum_dissolve_in_molar_chloride_where_they_are_immune_without():
    assert region_at("Au", 2.0, 1.0)[1] == "immunity"
    assert region_at("Au", 2.0, 1.0, ligand_activities={"Cl^-": 1.0})[0] in ("AuCl2^-", "AuCl4^-")
    assert region_at("Pt", 1.0, 0.7)[1] == "immunity"
    assert region_at("Pt", 1.0, 0.65, ligand_activities={"Cl^-": 1.0}) == ("PtCl4^2-", "corrosion")
    # above PtCl6^2-/PtCl4^2- (0.68 V at equal activities) platinum(IV) takes over
    assert region_at("Pt", 1.0, 0.75, ligand_activities={"Cl^-": 1.0}) == ("PtCl6^2-", "corrosion")


def test_copper_in_acid_chloride_dissolves_as_a_chloro_complex_below_the_cupric_line():
    # Cu2+/Cu at 10^-6 lies at 0.163 V; in acid chloride CuCl2^- takes the metal from about -0.12 V.
    assert region_at("Cu", 1.0, 0.10) == ("Cu", "immunity")
    assert region_at("Cu", 1.0, 0.10, ligand_activities={"Cl^-": 1.0}) == ("CuCl2^-", "corrosion")


def test_lead_in_sulfate_is_covered_by_lead_sulfate():
    # The lead-acid negative plate: PbSO4 forms above the PbSO4/Pb line, -0.359 V (common practice).
    assert region_at("Pb", 1.0, -0.2, ligand_activities={"SO4^2-": 0.1}) == ("PbSO4", "passivation")


def test_per_ion_activity_moves_only_its_own_boundaries_by_the_nernst_term():
    import numpy as np

    plain = diagram("Zn")
    bath = diagram("Zn", ion_activities={"Zn^2+": 0.1, "Cu^2+": 0.5})   # Cu^2+ concerns another element
    assert bath.ion_activities == (("Zn^2+", 0.1),)

    def line(d, first, second):
        return next(b for b in d.boundaries if {b.first.name, b.second.name} == {first, second})

    shift = line(bath, "Zn", "Zn^2+").intercept - line(plain, "Zn", "Zn^2+").intercept
    assert shift == pytest.approx(0.05916 / 2 * 5, abs=1e-4)   # (RT/2F)·ln(0.1/10^-6)
    # only the Zn^2+ plane moves, by (RT/F)·ln(10^5)/1 per metal atom
    moved = bath.planes.offset - plain.planes.offset
    index = plain.planes.index_of["Zn^2+"]
    assert moved[index] == pytest.approx(0.025693 * np.log(1e5), rel=1e-4)
    assert np.count_nonzero(moved) == 1
    copper = diagram("Cu", ion_activities={"Cu^2+": 0.1})
    # a copper bath: Cu+ at 10^-6 now lies between the metal and Cu^2+ (Cu + Cu^2+ = 2 Cu+ shifts right)
    assert line(copper, "Cu^+", "Cu^2+").intercept == pytest.approx(0.159 + 0.05916 * (-1 - -6), abs=0.01)  # Bard 1985: 0.159


def test_a_recipes_ions_pass_straight_to_the_diagram():
    from electrosieve.engine.electrolyte import electrolyte

    bath = electrolyte("1 M KOH + 0.01 M CuSO4")   # K^+ has no species file: accepted and left out
    result = diagram("Cu", ion_activities=bath.ion_activities, ligand_activities=bath.ligand_activities(default_catalog().ligands))
    assert result.ion_activities == (("Cu^2+", bath.activities["Cu^2+"]),)


def test_defaults_leave_diagrams_unchanged_and_results_are_cached_per_conditions():
    assert diagram("Ag").domains == diagram("Ag", ion_activities={}, ligand_activities={}).domains
    assert diagram("Ag", ligand_activities={"Cl^-": 0.01}) is diagram("Ag", ligand_activities={"Cl^-": 0.01})
    assert diagram("Ag", ligand_activities={"Cl^-": 0.01}) is not diagram("Ag", ligand_activities={"Cl^-": 0.1})
    assert "AgCl" not in diagram("Ag").planes.index_of


@pytest.mark.parametrize("conditions, field, words", [
    ({"ion_activities": {"Cu2+": 0.1}}, "ion_activities", "no dissolved species is called 'Cu2+'"),
    ({"ion_activities": {"Cu^2+": 5.0}}, "ion_activities[Cu^2+]", "between 1e-08 and 1"),
    ({"ligand_activities": {"CN^-": 0.1}}, "ligand_activities", "known ligands: Cl^-, SO4^2-"),
    ({"ligand_activities": {"Cl^-": 0.0}}, "ligand_activities[Cl^-]", "between"),
    ({"ion_activities": [("Cu^2+", 0.1)]}, "ion_activities", "must map"),
    ({"ion_activities": {"Zn^+2": 0.1}}, "ion_activities", "no dissolved species is called 'Zn^+2'"),
    ({"ion_activities": {"CuCl3^2-": 0.1}}, "ion_activities", "no dissolved species is called 'CuCl3^2-'"),
])
def test_bad_activities_are_named(conditions, field, words):
    with pytest.raises(InputError) as error:
        diagram("Cu", **conditions)
    assert error.value.field == field and words in str(error.value)


def test_ligand_species_hold_at_temperature():
    # ΔfG(T) of the ligand species uses Cl2(g) and S(rhombic) of the ligand files as element states:
    # the AgCl/Ag couple moves by dE°/dT = −0.645 mV/K (Bates & Bower 1954: −0.6455 mV/K at 25 °C).
    catalog = default_catalog()
    hot = planes_for(catalog.system("Ag"), catalog, 1.0, 35.0, ligand_activities=(("Cl^-", 1.0),))
    i = hot.index_of["AgCl"]
    assert float(-hot.offset[i] / hot.e_slope[i]) == pytest.approx(0.2223 - 0.000645 * 10, abs=0.0008)


def test_ligand_file_errors_name_the_file_and_field(tmp_path):
    import shutil

    from electrosieve.engine.catalog import builtin_data_dir

    copy = tmp_path / "data"
    shutil.copytree(builtin_data_dir(), copy)
    path = copy / "ligands" / "chloride.toml"
    path.write_text(path.read_text(encoding="utf-8").replace('formula = "AgCl2"', 'formula = "AgBr2"'))
    with pytest.raises(CatalogError, match=r"chloride.toml: species #2 \(AgBr2\): field 'formula'"):
        load_catalog(copy)


def test_ligand_files_checksum():
    # Row count and dgf sum per ligand: a deliberate data edit updates this line.
    counts = {name: (sum(len(g) for g in found.species.values()),
                     round(sum(s.dgf for g in found.species.values() for s in g), 3))
              for name, found in default_catalog().ligands.items()}
    assert counts == {"Cl^-": (14, -3576.404), "SO4^2-": (3, -2057.365)}
