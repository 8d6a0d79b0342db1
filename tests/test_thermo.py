"""Gibbs energies of formation at temperature: regression at 25 °C, published temperature coefficients,
the documented approximations, and bad temperatures."""

import math
import re

import pytest

from electrosieve.engine import diagram as diagram_module
from electrosieve.engine import planes as planes_module
from electrosieve.engine import thermo
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import KJ_PER_EV, T_STANDARD, ZERO_CELSIUS, nernst_slope
from electrosieve.engine.diagram import build_diagrams, diagram
from electrosieve.engine.inputs import check_temperature
from electrosieve.engine.domains import PlotLimits
from electrosieve.engine.errors import InputError
from electrosieve.engine.species import Species

_TERM = re.compile(r"^\s*(\d+(?:\.\d+)?)?\s*(\S+)\s*$")


def _species(catalog, element: str, name: str) -> Species:
    if name in catalog.water:
        return catalog.water[name]
    return catalog.system(element).find(name)


def _side(text: str) -> list[tuple[float, str]]:
    terms = []
    for part in re.split(r"\s\+\s", text):
        number, name = _TERM.match(part).groups()
        terms.append((float(number or 1), name))
    return terms


def standard_potential(element: str, reaction: str, temperature_k: float, catalog=None) -> float:
    """E° [V vs SHE at the same T] of a reduction "Ox + n e- = Red": −ΔrG(T)/(nF), H+ and e- at zero."""
    catalog = catalog or default_catalog()
    left, right = (_side(side) for side in reaction.split("="))
    electrons = sum(n for n, s in left if s == "e-") - sum(n for n, s in right if s == "e-")

    def gibbs(terms):
        return sum(n * thermo.formation_gibbs(_species(catalog, element, s), temperature_k, catalog)
                   for n, s in terms if s not in ("e-", "H^+"))

    return -(gibbs(right) - gibbs(left)) / (electrons * KJ_PER_EV)


def isothermal_coefficient(element: str, reaction: str, step: float = 1.0) -> float:
    """dE°/dT [mV/K] at 298.15 K by central difference of the engine's E°(T)."""
    upper = standard_potential(element, reaction, T_STANDARD + step)
    lower = standard_potential(element, reaction, T_STANDARD - step)
    return (upper - lower) / (2 * step) * 1000.0


# Bratsch, S. G. (1989), J. Phys. Chem. Ref. Data 18, 1-21, Table of standard potentials and isothermal
# temperature coefficients dE°/dT at 298.15 K [mV/K]. All values recalled from memory.
BRATSCH_1989 = [
    ("H2O", "O2 + 4 H^+ + 4 e- = 2 H2O", -0.846),
    ("H2O", "2 H2O + 2 e- = H2 + 2 OH^-", -0.836),
    ("H2O", "O2 + 2 H2O + 4 e- = 4 OH^-", -1.680),
    ("Zn", "Zn^2+ + 2 e- = Zn", 0.119),
    ("Fe", "Fe^3+ + e- = Fe^2+", 1.175),
    ("Cu", "Cu^2+ + 2 e- = Cu", 0.011),
    ("Cu", "Cu^+ + e- = Cu", -0.754),
    ("Cu", "Cu^2+ + e- = Cu^+", 0.776),
    ("Ag", "Ag^+ + e- = Ag", -0.989),
    ("Ag", "Ag2O + H2O + 2 e- = 2 Ag + 2 OH^-", -1.337),
    ("Ni", "Ni^2+ + 2 e- = Ni", 0.146),
    ("Co", "Co^2+ + 2 e- = Co", 0.065),
    ("Al", "Al^3+ + 3 e- = Al", 0.533),
    ("Hg", "Hg^2+ + 2 e- = Hg", -0.116),
    ("Hg", "Hg2^2+ + 2 e- = 2 Hg", -0.327),
]


def _available(element: str, reaction: str) -> bool:
    catalog = default_catalog()
    try:
        for side in reaction.split("="):
            for _, name in _side(side):
                if name not in ("e-", "H^+"):
                    _species(catalog, element, name)
    except Exception:
        return False
    return True


@pytest.mark.parametrize(("element", "reaction", "expected"), BRATSCH_1989, ids=[r for _, r, _ in BRATSCH_1989])
def test_isothermal_temperature_coefficients_match_bratsch_1989(element, reaction, expected):
    if not _available(element, reaction):
        pytest.skip(f"{reaction}: species not in the catalog")
    assert isothermal_coefficient(element, reaction) == pytest.approx(expected, abs=0.1)


def test_at_least_eight_bratsch_couples_are_checked():
    assert sum(_available(e, r) for e, r, _ in BRATSCH_1989) >= 8


def test_zinc_standard_potential_at_25_c_is_unchanged():
    # E°(Zn2+/Zn) = −0.7618 V (Bratsch 1989, from memory); the data's value reproduced at T0 exactly.
    zinc_ion = default_catalog().system("Zn").find("Zn^2+")
    assert standard_potential("Zn", "Zn^2+ + 2 e- = Zn", T_STANDARD) == zinc_ion.dgf / (2 * KJ_PER_EV)
    assert standard_potential("Zn", "Zn^2+ + 2 e- = Zn", T_STANDARD) == pytest.approx(-0.7618, abs=0.002)


# --- regression at 25 °C -------------------------------------------------------------------------------

def test_formation_gibbs_at_25_c_is_the_tabulated_value_for_every_species():
    catalog = default_catalog()
    everything = [*catalog.water.values(), *(s for system in catalog.systems.values() for s in system.species)]
    for species in everything:
        assert thermo.formation_gibbs(species, T_STANDARD) == species.dgf
        assert thermo.formation_gibbs(species, 25.0 + ZERO_CELSIUS) == species.dgf
        assert thermo.formation_gibbs(species) == species.dgf


def _tabulated_only(species, temperature_k=T_STANDARD, catalog=None):
    return species.dgf   # the engine before temperature support: ΔfG° at any T


@pytest.mark.parametrize("element", ["Zn", "Fe", "Cu", "Ni", "Pt", "Ag"])
def test_diagram_at_25_c_is_identical_to_the_tabulated_one(element, monkeypatch):
    catalog = default_catalog()
    if element not in catalog.systems:
        pytest.skip(f"no {element} in the catalog")
    now = build_diagrams(catalog, (element,), 1e-6, 25.0, PlotLimits())[element]
    monkeypatch.setattr(planes_module, "formation_gibbs", _tabulated_only)
    monkeypatch.setattr(diagram_module, "formation_gibbs", _tabulated_only)
    before = build_diagrams(catalog, (element,), 1e-6, 25.0, PlotLimits())[element]
    assert [(b.first, b.second, b.start, b.end, b.intercept, b.slope, b.ph) for b in now.boundaries] == \
           [(b.first, b.second, b.start, b.end, b.intercept, b.slope, b.ph) for b in before.boundaries]
    assert [d.species for d in now.domains] == [d.species for d in before.domains]
    for new, old in zip(now.domains, before.domains):
        assert (new.vertices == old.vertices).all()
    assert now.water == before.water


def test_diagram_changes_with_temperature_as_the_nernst_equation_says():
    # Zn/Zn2+ boundary at a = 1e-6: E = E°(T) + (RT ln10 / 2F)·log10 a (Nernst; Pourbaix 1966, ch. 2).
    warm = diagram("Zn", temperature_c=80.0)
    temperature = 80.0 + ZERO_CELSIUS
    expected = standard_potential("Zn", "Zn^2+ + 2 e- = Zn", temperature) + nernst_slope(temperature) / 2 * -6
    names = {"Zn", "Zn^2+"}
    boundary = next(b for b in warm.boundaries if {b.first.name, b.second.name} == names)
    assert boundary.slope == pytest.approx(0.0, abs=1e-12)
    assert boundary.intercept == pytest.approx(expected, abs=1e-9)
    cold = next(b for b in diagram("Zn").boundaries if {b.first.name, b.second.name} == names)
    # By hand from the NBS data (Wagman 1982) for Zn2+ + H2 = Zn + 2 H+: ΔrS° = 41.63 + 112.1 − 130.684
    # = 23.046 J/(mol K), ΔrCp = 25.40 − 46.0 − 28.824 = −49.424 J/(mol K); E° = −ΔrG/2F; plus the Nernst term.
    delta = temperature - T_STANDARD
    d_gibbs = -23.046 * delta - 49.424 * (delta - temperature * math.log(temperature / T_STANDARD))   # [J/mol]
    by_hand = -d_gibbs / (2 * KJ_PER_EV * 1000) - 6 * (nernst_slope(temperature) - nernst_slope(T_STANDARD)) / 2
    assert boundary.intercept - cold.intercept == pytest.approx(by_hand, abs=1e-5)


# --- conventions ---------------------------------------------------------------------------------------

@pytest.mark.parametrize("celsius", [0.0, 60.0, 150.0])
def test_elements_and_h_plus_stay_at_zero(celsius):
    # ΔfG of an element in its standard state and of H+ are zero at every T (Wagman et al. 1982, introduction).
    catalog = default_catalog()
    temperature = celsius + ZERO_CELSIUS
    for name in ("H^+", "H2", "O2"):
        assert thermo.formation_gibbs(catalog.water[name], temperature) == 0.0
    for system in catalog.systems.values():
        for species in system.species:
            if species.is_element and species.dgf == 0.0:
                assert thermo.formation_gibbs(species, temperature) == 0.0


def test_ionic_convention_for_formation_entropy():
    # ΔfS°(OH-) = S°(OH-) − ½S°(O2) − ½S°(H2) − ½S°(H2): NBS values −10.75, 205.138, 130.684 (Wagman 1982)
    # give −244.00 J/(mol K); and (ΔfH° − ΔfG°)/T0 = (−229.994 + 157.244)/298.15 = −244.00 likewise.
    hydroxide = default_catalog().water["OH^-"]
    assert thermo.formation_entropy_from_s(hydroxide, default_catalog()) == pytest.approx(-244.00, abs=0.01)
    zinc_ion = default_catalog().system("Zn").find("Zn^2+")
    # Zn2+: S° − S°(Zn) + S°(H2) = −112.1 − 41.63 + 130.684 (NBS) = −23.05 J/(mol K).
    assert thermo.formation_entropy(zinc_ion) == pytest.approx(-23.046, abs=0.001)


@pytest.mark.parametrize("file_species", ["water", "Zn"])
def test_tabulated_gibbs_enthalpy_and_entropy_agree(file_species):
    # ΔfG° = ΔfH° − T0·ΔfS° holds within rounding for the NBS/CODATA rows (Wagman 1982; Cox et al. 1989).
    catalog = default_catalog()
    rows = catalog.water.values() if file_species == "water" else catalog.system(file_species).species
    checked = 0
    for species in rows:
        entropy = thermo.formation_entropy_from_s(species, catalog)
        if species.dhf is None or math.isnan(entropy):
            continue
        assert species.dhf - T_STANDARD * entropy / 1000 == pytest.approx(species.dgf, abs=0.1), species.name
        checked += 1
    assert checked >= 3


def test_hydroxide_follows_the_iapws_ionic_product():
    from electrosieve.engine.constants import GAS_CONSTANT, LN10
    from electrosieve.engine.kw import pkw

    catalog = default_catalog()
    for celsius in (0.0, 60.0, 100.0, 150.0):
        temperature = celsius + ZERO_CELSIUS
        ionization = (thermo.formation_gibbs(catalog.water["OH^-"], temperature)
                      - thermo.formation_gibbs(catalog.water["H2O"], temperature))
        assert ionization * 1000 / (GAS_CONSTANT * temperature * LN10) == pytest.approx(pkw(temperature), abs=0.001)


def test_formation_gibbs_of_water_integrates_the_heat_capacity():
    # ΔfG(T) = ΔfG° − ΔfS°ΔT + ΔfCp[ΔT − T ln(T/T0)], NBS ΔfCp = 75.291 − 28.824 − 29.355/2 = 31.79 J/(mol K).
    water = default_catalog().water["H2O"]
    temperature = 373.15
    delta = temperature - T_STANDARD
    expected = -237.129 + 0.163343 * delta + 0.0317885 * (delta - temperature * math.log(temperature / T_STANDARD))
    assert thermo.formation_gibbs(water, temperature) == pytest.approx(expected, abs=2e-4)


# --- approximations for missing data --------------------------------------------------------------------

def _synthetic(**values) -> Species:
    base = dict(formula="Zn", charge=2, phase="aqueous", dgf=-147.06, source="wagman1982")
    return Species.create("Zn", **{**base, **values})


def test_methods_are_reported_per_species():
    zinc = default_catalog().system("Zn")
    assert thermo.temperature_method(zinc.find("Zn")) == thermo.METHOD_REFERENCE
    assert thermo.temperature_method(zinc.find("Zn^2+")) == thermo.METHOD_TABULATED
    assert "Kopp" in thermo.temperature_method(zinc.find("Zn(OH)2"))
    assert "Connick & Powell" in thermo.temperature_method(zinc.find("HZnO2^-"))
    assert "Criss–Cobble" in thermo.temperature_method(zinc.find("HZnO2^-"))
    notes = thermo.temperature_notes(zinc.species)
    assert any(note.startswith("HZnO2^-: S° and ΔfH° missing") for note in notes)
    assert not any(note.startswith("Zn^2+:") for note in notes)


def test_entropy_from_enthalpy_when_s_is_missing():
    full = _synthetic(dhf=-153.89, s=-112.1, cp=46.0)
    no_entropy = _synthetic(dhf=-153.89, cp=46.0)
    assert "ΔfS° = (ΔfH° − ΔfG°)/T0" in thermo.temperature_method(no_entropy)
    # NBS Zn2+ values are consistent to 0.04 kJ: both routes agree within 0.02 kJ at 150 °C.
    assert thermo.formation_gibbs(no_entropy, 423.15) == pytest.approx(thermo.formation_gibbs(full, 423.15), abs=0.02)
    assert thermo.formation_enthalpy(_synthetic(s=-112.1)) == pytest.approx(-153.89, abs=0.05)


def test_missing_entropy_and_enthalpy_keep_the_formation_potential():
    # Fallback: E° of "M^z+ + z e- = M" held at its 25 °C value; and for an oxide, E° of its formation from M and H2O.
    ion = _synthetic(formula="Zn", charge=2, dgf=-147.06)
    for temperature in (273.15, 353.15, 423.15):
        assert thermo.formation_gibbs(ion, temperature) == pytest.approx(-147.06, abs=1e-12)
    oxide = Species.create("Zn", formula="ZnO", charge=0, phase="solid", dgf=-318.30, source="wagman1982")
    water = default_catalog().water["H2O"]
    shift = thermo.formation_gibbs(oxide, 353.15) - oxide.dgf
    assert shift == pytest.approx(thermo.formation_gibbs(water, 353.15) - water.dgf, abs=1e-12)
    assert "dE°/dT = 0" in thermo.temperature_method(oxide)


# Connick & Powell (1953) estimate against NBS entropies (Wagman et al. 1982) [J/(mol K)], from memory.
NBS_OXYANION_ENTROPIES = [
    ("N", "NO3", -1, 146.4),
    ("C", "HCO3", -1, 91.2),
    ("C", "CO3", -2, -56.9),
    ("S", "SO4", -2, 20.1),
    ("Cl", "ClO4", -1, 182.0),
    ("Mn", "MnO4", -1, 191.2),
]


@pytest.mark.parametrize(("element", "formula", "charge", "expected"), NBS_OXYANION_ENTROPIES)
def test_connick_powell_estimate_is_within_25_j_of_tabulated_entropies(element, formula, charge, expected):
    species = Species.create(element, formula=formula, charge=charge, phase="aqueous", dgf=0.0, source="x")
    assert thermo.connick_powell_entropy(species) == pytest.approx(expected, abs=25.0)


def test_criss_cobble_table_reproduces_the_published_mean_heat_capacity_parameters():
    # Criss & Cobble 1964b (J. Am. Chem. Soc. 86, 5390) Table of alpha, beta [cal/(mol K)] at 60, 100, 150 °C,
    # from memory; alpha = a/ln(T/T0) and beta = (b − 1)/ln(T/T0) from the 1964a correspondence table.
    published = {
        "cation": ([35, 46, 46], [-0.41, -0.55, -0.59]),
        "anion": ([-46, -58, -61], None),
        "acid_oxy_anion": ([-122, -135, -143], [3.44, 3.97, 3.95]),
        "oxy_anion": ([-127, -138, -133], None),
    }
    table = thermo.criss_cobble_table()
    for ion_class, (alphas, betas) in published.items():
        row = table["classes"][ion_class]
        for index, celsius in enumerate((60.0, 100.0, 150.0)):
            column = table["temperatures_c"].index(celsius)
            log_ratio = math.log((celsius + ZERO_CELSIUS) / T_STANDARD)
            assert row["a"][column] / log_ratio == pytest.approx(alphas[index], abs=1.0), (ion_class, celsius)
            if betas:
                assert (row["b"][column] - 1) / log_ratio == pytest.approx(betas[index], abs=0.03), (ion_class, celsius)
    # Mean Cp of H+ on the absolute scale: 23, 31, 33 cal/(mol K) (Criss & Cobble 1964b, from memory).
    for celsius, expected in ((60.0, 23), (100.0, 31), (150.0, 33)):
        column = table["temperatures_c"].index(celsius)
        rise = table["h_plus_entropy"][column] - table["h_plus_entropy"][0]
        assert rise / math.log((celsius + ZERO_CELSIUS) / T_STANDARD) == pytest.approx(expected, abs=1.0)


def test_criss_cobble_mean_heat_capacity_is_continuous_at_25_c():
    at_t0 = thermo.criss_cobble_mean_cp(-112.1, 2, "cation", T_STANDARD)
    near = thermo.criss_cobble_mean_cp(-112.1, 2, "cation", T_STANDARD + 0.01)
    assert at_t0 == pytest.approx(near, rel=1e-3)
    # Zn2+ (S° = −112.1 J/(mol K)), 25–60 °C by hand from the table: ΔS°conv = 0.55 cal/(mol K) over ln(333.15/298.15).
    by_hand = (3.9 - 0.045 * (-112.1 / 4.184 - 10.0) - 2 * 2.5) / math.log(333.15 / 298.15) * 4.184
    assert thermo.criss_cobble_mean_cp(-112.1, 2, "cation", 333.15) == pytest.approx(by_hand, rel=1e-9)


def test_criss_cobble_classes():
    def ion(formula, charge):
        return Species.create("Fe", formula=formula, charge=charge, phase="aqueous", dgf=0.0, source="x")

    assert thermo.criss_cobble_class(ion("Fe", 3)) == "cation"
    assert thermo.criss_cobble_class(ion("FeO4", -2)) == "oxy_anion"
    assert thermo.criss_cobble_class(ion("HFeO2", -1)) == "acid_oxy_anion"
    assert thermo.criss_cobble_class(Species.create("Fe", formula="Fe", charge=0, phase="solid", dgf=0.0,
                                                    source="x")) is None


# --- bad temperatures ----------------------------------------------------------------------------------

@pytest.mark.parametrize("value", [-0.1, 150.1, -273.15, 1e9, math.nan, math.inf, "80", None, True, [25]])
def test_check_temperature_refuses_bad_values_naming_the_field(value):
    with pytest.raises(InputError) as error:
        check_temperature(value)
    assert error.value.field == "temperature"
    assert "temperature" in str(error.value)


@pytest.mark.parametrize("value", [-5.0, 151.0, math.nan, "hot"])
def test_diagram_and_formation_gibbs_refuse_bad_temperatures(value):
    with pytest.raises(InputError) as error:
        diagram("Zn", temperature_c=value)
    assert error.value.field == "temperature"
    kelvin = value + ZERO_CELSIUS if isinstance(value, float) else value
    with pytest.raises(InputError) as error:
        thermo.formation_gibbs(default_catalog().water["H2O"], kelvin)
    assert error.value.field == "temperature"


@pytest.mark.parametrize("value", [0, 0.0, 25, 80.5, 150])
def test_check_temperature_accepts_the_range(value):
    assert check_temperature(value) == float(value)
    assert math.isfinite(thermo.formation_gibbs(default_catalog().water["H2O"], float(value) + ZERO_CELSIUS))
