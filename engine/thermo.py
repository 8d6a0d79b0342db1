"""Gibbs energies of formation of species and of water at the working temperature (0–150 °C).

For a species of charge z, with ΔfG°, ΔfS° and ΔfCp at T0 = 298.15 K,

    ΔfG(T) = ΔfG° − ΔfS°·(T − T0) + ΔfCp·[(T − T0) − T·ln(T/T0)]            [kJ/mol, S and Cp /1000]

the integral of dG = −S dT with a heat capacity ΔfCp held at its mean value
between T0 and T, as in the method of Criss & Cobble (1964, J. Am. Chem. Soc.
86, 5390). At T0 it returns the tabulated ΔfG° exactly.

Ionic convention (Wagman et al. 1982, introduction): the properties of H+ are zero
at every temperature, so the SHE is zero at every temperature and the formation
reaction of an ion carries z/2 H2(g):

    ΔfS°(ion) = S°(ion) − Σ n_k·S°(element k in its standard state) + (z/2)·S°(H2, g)

and the same for ΔfCp. The element standard states are the element's own row
of its species file (the one at ΔfG° = 0: Zn solid, Hg liquid, C graphite), and
½ H2(g), ½ O2(g) from ``water.toml``.

Where data are missing, in this order (:func:`temperature_method` says which
was used, so that interfaces can show it):

* S° missing, ΔfH° present: ΔfS° = (ΔfH° − ΔfG°)/T0.
* S° and ΔfH° missing, aqueous oxy anion: S° from Connick & Powell (1953), J.
  Chem. Phys. 21, 2206 (``data/oxyanion_entropy.toml``).
* otherwise: the species' formation half-reaction from M and H2O keeps its
  25 °C standard potential (isothermal dE°/dT = 0), i.e. ΔfS and ΔfCp are o times
  those of H2O(l).
* Cp° of an aqueous ion missing: Criss–Cobble mean heat capacity from S° (Criss &
  Cobble 1964, J. Am. Chem. Soc. 86, 5385 and 5390; ``data/criss_cobble.toml``).
* Cp° of another species missing: ΔfCp = 0 (Kopp-type rule: the compound has
  the heat capacity of its elements).

Tabulated Cp° values are held constant at their 298.15 K value. OH− of the
water file is the exception: ΔfG(OH−, T) = ΔfG(H2O, l, T) + RT ln10·pKw(T) with
Kw from IAPWS R11-07 (:mod:`engine.kw`), shifted to equal the tabulated value at
T0, so that basic-solution couples follow the same Kw as the neutral pH. Pressure
effects on the condensed phases are neglected (liquid water at its saturation
pressure above 100 °C, at most 4.8 bar at 150 °C; gases at 1 bar).
"""

import math
from dataclasses import dataclass
from functools import lru_cache

from .constants import GAS_CONSTANT, LN10, T_STANDARD, ZERO_CELSIUS
from .datafiles import read_toml
from .catalog import builtin_data_dir, default_catalog
from .errors import CatalogError, InputError
from .kw import pkw
from .inputs import TEMPERATURE_RANGE_C
from .species import Species

CRISS_COBBLE_FILE = "criss_cobble.toml"
"""Data file of the Criss–Cobble entropy correspondence (with its source keys)."""

OXYANION_FILE = "oxyanion_entropy.toml"
"""Data file of the Connick–Powell oxy-anion entropy estimate (with its source key)."""

METHOD_TABULATED = "S° and Cp° tabulated"
"""What :func:`temperature_method` says of a species with all its data."""

METHOD_REFERENCE = "element in its standard state: ΔfG = 0 at every temperature"
"""What :func:`temperature_method` says of an element's reference row (and of H+, H2, O2)."""

METHOD_HYDROXIDE = "ΔfG(H2O, l, T) + RT ln10 · pKw(T), Kw of IAPWS R11-07"
"""What :func:`temperature_method` says of OH− (see :func:`formation_gibbs`)."""


@dataclass(frozen=True)
class TemperatureData:
    """How one species' ΔfG(T) is computed.

    ``entropy`` is ΔfS° [J/(mol K)]; ``heat_capacity`` is a constant ΔfCp
    [J/(mol K)], or None when the Criss–Cobble mean heat capacity is used for
    the ion of class ``criss_cobble_class`` (then ``elements_cp`` [J/(mol K)]
    is Σ n_k·Cp°(element k) − (z/2)·Cp°(H2) and ``entropy_298`` the ion's S°
    [J/(mol K)]). ``notes`` lists the approximations used, in words.
    """

    entropy: float
    heat_capacity: float | None
    notes: tuple[str, ...] = ()
    criss_cobble_class: str | None = None
    elements_cp: float = 0.0
    entropy_298: float = 0.0
    reference: bool = False
    hydroxide: bool = False


def _data_file(name: str) -> tuple[dict, object]:
    path = builtin_data_dir() / name
    return read_toml(path), path


@lru_cache(maxsize=1)
def criss_cobble_table() -> dict:
    """The Criss–Cobble parameters of ``data/criss_cobble.toml``, checked for shape."""
    document, path = _data_file(CRISS_COBBLE_FILE)
    try:
        temperatures = [float(t) for t in document["temperatures_c"]]
        count = len(temperatures)
        if temperatures[0] != 25.0 or sorted(temperatures) != temperatures:
            raise ValueError("temperatures_c must start at 25 and increase")
        for name, row in document["classes"].items():
            if len(row["a"]) != count or len(row["b"]) != count:
                raise ValueError(f"class {name}: a and b need {count} values")
            if row["a"][0] != 0.0 or row["b"][0] != 1.0:
                raise ValueError(f"class {name}: a and b must be 0 and 1 at 25 °C")
        if len(document["h_plus_entropy"]) != count:
            raise ValueError(f"h_plus_entropy needs {count} values")
        float(document["calorie"])
    except (KeyError, TypeError, ValueError) as error:
        raise CatalogError(f"{path}: {error}") from None
    return document


@lru_cache(maxsize=1)
def oxyanion_entropy_table() -> dict:
    """The Connick–Powell parameters of ``data/oxyanion_entropy.toml``."""
    document, path = _data_file(OXYANION_FILE)
    missing = [key for key in ("intercept", "slope", "oxygen_weight", "source") if key not in document]
    if missing:
        raise CatalogError(f"{path}: missing field(s) {', '.join(missing)}")
    return document


def _interpolate(xs: list[float], ys: list[float], x: float) -> float:
    """Piecewise-linear interpolation of ``ys`` at ``x``, extended linearly beyond the ends."""
    index = 1
    while index < len(xs) - 1 and x > xs[index]:
        index += 1
    x0, x1, y0, y1 = xs[index - 1], xs[index], ys[index - 1], ys[index]
    return y0 + (y1 - y0) * (x - x0) / (x1 - x0)


def criss_cobble_class(species: Species) -> str | None:
    """The Criss–Cobble class of an aqueous ion, or None for species the method does not cover.

    >>> criss_cobble_class(Species.create("Zn", formula="HZnO2", charge=-1, phase="aqueous", dgf=-464.0, source="x"))
    'acid_oxy_anion'
    """
    if not species.is_dissolved or species.charge == 0:
        return None
    if species.charge > 0:
        return "cation"
    oxygen, hydrogen = species.composition.get("O", 0), species.composition.get("H", 0)
    if oxygen == 0 or species.composition == {"O": 1, "H": 1}:
        return "anion"
    return "acid_oxy_anion" if hydrogen else "oxy_anion"


def criss_cobble_mean_cp(entropy_298: float, charge: int, ion_class: str, temperature_k: float) -> float:
    """Mean conventional heat capacity of an ion between 298.15 K and ``temperature_k`` [J/(mol K)].

    From the entropy correspondence S°abs(T) = a(T) + b(T)·S°abs(298.15 K),
    S°abs = S°conv − z·S°abs(H+), and Cp(mean) = [S°conv(T) − S°conv(298.15 K)]/ln(T/298.15 K)
    (Criss & Cobble 1964, J. Am. Chem. Soc. 86, 5385 and 5390). ``entropy_298``
    is the conventional S° [J/(mol K)].

    >>> round(criss_cobble_mean_cp(-112.1, 2, "cation", 373.15), 1)   # Zn2+, 25–100 °C
    16.1
    """
    table = criss_cobble_table()
    calorie = float(table["calorie"])
    kelvins = [t + ZERO_CELSIUS for t in table["temperatures_c"]]
    row = table["classes"][ion_class]
    h_plus = table["h_plus_entropy"]
    s0_conv = entropy_298 / calorie
    s0_abs = s0_conv + charge * h_plus[0]

    def conventional_change(t: float) -> float:   # S°conv(t) − S°conv(T0) [cal/(mol K)]
        a, b = _interpolate(kelvins, row["a"], t), _interpolate(kelvins, row["b"], t)
        return a + (b - 1.0) * s0_abs - charge * (_interpolate(kelvins, h_plus, t) - h_plus[0])

    if abs(temperature_k - T_STANDARD) < 1e-6:   # the limit of the ratio at T0: T0 · d/dT
        slope = (conventional_change(T_STANDARD + 1.0) - conventional_change(T_STANDARD - 1.0)) / 2.0
        return slope * T_STANDARD * calorie
    return conventional_change(temperature_k) / math.log(temperature_k / T_STANDARD) * calorie


def connick_powell_entropy(species: Species) -> float:
    """Estimated S° [J/(mol K)] of an aqueous oxy anion XO_n(OH)_m^z− (Connick & Powell 1953).

    S° = A − B·(|z| − w·n) cal/(mol K), with n = o − h the oxygens not bound to hydrogen.

    >>> round(connick_powell_entropy(Species.create("Zn", formula="HZnO2", charge=-1, phase="aqueous", dgf=-464.0, source="x")), 1)
    41.9
    """
    table = oxyanion_entropy_table()
    calorie = float(criss_cobble_table()["calorie"])
    free_oxygens = species.composition.get("O", 0) - species.composition.get("H", 0)
    value = table["intercept"] - table["slope"] * (abs(species.charge) - table["oxygen_weight"] * free_oxygens)
    return value * calorie


@lru_cache(maxsize=16)
def _element_states(catalog) -> dict[str, tuple[float | None, float | None]]:
    """Per-atom (S°, Cp°) [J/(mol K)] of each element's standard state in ``catalog``."""
    states: dict[str, tuple[float | None, float | None]] = {}
    for element, system in catalog.systems.items():
        for species in system.species:
            if species.is_element and species.dgf == 0.0:
                atoms = species.metal_atoms
                states[element] = (None if species.s is None else species.s / atoms,
                                   None if species.cp is None else species.cp / atoms)
                break
    for found in getattr(catalog, "ligands", {}).values():   # Cl2(g), S(rhombic): a ligand's counting element
        reference = found.reference
        atoms = reference.composition[reference.element]
        states[reference.element] = (None if reference.s is None else reference.s / atoms,
                                     None if reference.cp is None else reference.cp / atoms)
    for element, gas in (("H", "H2"), ("O", "O2")):
        row = catalog.water.get(gas)
        if row is not None:
            states[element] = (None if row.s is None else row.s / 2, None if row.cp is None else row.cp / 2)
    return states


def _elements_sum(species: Species, catalog, index: int) -> float | None:
    """Σ n_k·X(element k) − (z/2)·X(H2) for X = S° (index 0) or Cp° (index 1), or None if one is missing."""
    states = _element_states(catalog)
    total = 0.0
    for element, count in species.composition.items():
        value = states.get(element, (None, None))[index]
        if value is None:
            return None
        total += count * value
    if species.charge:
        hydrogen = states.get("H", (None, None))[index]
        if hydrogen is None:
            return None
        total -= species.charge * hydrogen   # (z/2)·X(H2) = z·X(½ H2)
    return total


def _is_reference(species: Species, catalog) -> bool:
    if species.dgf != 0.0:
        return False
    if species.is_element:
        return True
    water = catalog.water
    return any(species is water.get(name) or species == water.get(name) for name in ("H^+", "H2", "O2"))


def _water_formation(catalog) -> tuple[float, float]:
    """ΔfS° and ΔfCp of H2O(l) [J/(mol K)] from the water file."""
    water = catalog.water["H2O"]
    entropy, heat_capacity = _elements_sum(water, catalog, 0), _elements_sum(water, catalog, 1)
    if water.s is None or entropy is None or water.cp is None or heat_capacity is None:
        raise CatalogError("water.toml: H2O, H2 and O2 need s and cp for temperatures other than 25 °C")
    return water.s - entropy, water.cp - heat_capacity


@lru_cache(maxsize=4096)
def _temperature_data(species: Species, catalog) -> TemperatureData:
    if _is_reference(species, catalog):
        return TemperatureData(entropy=0.0, heat_capacity=0.0, reference=True)
    hydroxide = catalog.water.get("OH^-")
    if hydroxide is not None and (species is hydroxide or species == hydroxide):
        return TemperatureData(entropy=formation_entropy_from_s(species, catalog), heat_capacity=None, hydroxide=True)
    notes: list[str] = []
    elements_s = _elements_sum(species, catalog, 0)
    elements_cp = _elements_sum(species, catalog, 1)
    entropy_298 = species.s
    if species.s is not None and elements_s is not None:
        formation_entropy = species.s - elements_s
    elif species.dhf is not None:
        formation_entropy = (species.dhf - species.dgf) * 1000.0 / T_STANDARD
        why = "S° missing" if species.s is None else "S° of an element's standard state missing"
        notes.append(f"{why}: ΔfS° = (ΔfH° − ΔfG°)/T0 used")
        entropy_298 = None if elements_s is None else formation_entropy + elements_s
    elif species.is_dissolved and species.charge < 0 and species.composition.get("O", 0) and elements_s is not None:
        entropy_298 = connick_powell_entropy(species)
        formation_entropy = entropy_298 - elements_s
        notes.append(f"S° and ΔfH° missing: S° = {entropy_298:.0f} J/(mol K) estimated (Connick & Powell 1953)")
    else:
        water_entropy, water_cp = _water_formation(catalog)
        o = species.composition.get("O", 0)
        notes.append("S° and ΔfH° missing: standard potential of its formation from the element and water "
                     "assumed independent of temperature (dE°/dT = 0)")
        return TemperatureData(entropy=o * water_entropy, heat_capacity=o * water_cp, notes=tuple(notes))

    if species.cp is not None and elements_cp is not None:
        return TemperatureData(entropy=formation_entropy, heat_capacity=species.cp - elements_cp, notes=tuple(notes))
    ion_class = criss_cobble_class(species)
    if ion_class is not None and entropy_298 is not None and elements_cp is not None:
        notes.append("Cp° missing: Criss–Cobble mean heat capacity used")
        return TemperatureData(entropy=formation_entropy, heat_capacity=None, notes=tuple(notes),
                               criss_cobble_class=ion_class, elements_cp=elements_cp, entropy_298=entropy_298)
    why = "Cp° missing" if species.cp is None else "Cp° of an element's standard state missing"
    notes.append(f"{why}: ΔfCp = 0 assumed (Kopp-type rule)")
    return TemperatureData(entropy=formation_entropy, heat_capacity=0.0, notes=tuple(notes))


def temperature_data(species: Species, catalog=None) -> TemperatureData:
    """ΔfS°, ΔfCp and the approximations used for ``species`` (data of ``catalog``, built-in by default).

    >>> from electrosieve.engine.catalog import default_catalog
    >>> round(temperature_data(default_catalog().water["H2O"]).entropy, 2)   # ΔfS°(H2O, l) [J/(mol K)]
    -163.34
    """
    return _temperature_data(species, catalog or default_catalog())


def temperature_method(species: Species, catalog=None) -> str:
    """In words, how ``species``' ΔfG(T) is obtained: tabulated data, or which approximation.

    >>> from electrosieve.engine.catalog import default_catalog
    >>> zinc = default_catalog().system("Zn")
    >>> temperature_method(zinc.find("Zn^2+"))
    'S° and Cp° tabulated'
    >>> temperature_method(zinc.find("Zn(OH)2"))
    'Cp° missing: ΔfCp = 0 assumed (Kopp-type rule)'
    """
    data = temperature_data(species, catalog)
    if data.reference:
        return METHOD_REFERENCE
    if data.hydroxide:
        return METHOD_HYDROXIDE
    return "; ".join(data.notes) or METHOD_TABULATED


def temperature_notes(species: tuple[Species, ...] | list[Species], catalog=None) -> list[str]:
    """"name: approximation" for each species whose ΔfG(T) is not from tabulated S° and Cp° alone."""
    return [f"{s.name}: {'; '.join(temperature_data(s, catalog).notes)}"
            for s in species if temperature_data(s, catalog).notes]


def _check_kelvin(temperature_k) -> float:
    if isinstance(temperature_k, bool) or not isinstance(temperature_k, (int, float)):
        raise InputError(f"temperature must be a number (given {temperature_k!r})", field="temperature")
    value = float(temperature_k)
    low, high = (t + ZERO_CELSIUS for t in TEMPERATURE_RANGE_C)
    if not math.isfinite(value) or not (low - 1e-9 <= value <= high + 1e-9):
        raise InputError(f"temperature must be between {TEMPERATURE_RANGE_C[0]:g} and {TEMPERATURE_RANGE_C[1]:g} °C "
                         f"(given {value - ZERO_CELSIUS:g} °C)", field="temperature")
    return value


def formation_gibbs(species: Species, temperature_k: float = T_STANDARD, catalog=None) -> float:
    """Standard Gibbs energy of formation of ``species`` [kJ/mol] at ``temperature_k`` [K].

    ΔfG(T) = ΔfG° − ΔfS°·(T − T0) + ΔfCp·[(T − T0) − T·ln(T/T0)], T0 = 298.15 K;
    at T0 exactly the tabulated ΔfG°. Element data come from ``catalog``
    (built-in by default). See the module docstring for the conventions.

    >>> from electrosieve.engine.catalog import default_catalog
    >>> water = default_catalog().water["H2O"]
    >>> formation_gibbs(water), round(formation_gibbs(water, 353.15), 3)
    (-237.129, -228.297)
    """
    if temperature_k == T_STANDARD:
        return species.dgf
    temperature_k = _check_kelvin(temperature_k)
    if abs(temperature_k - T_STANDARD) <= 1e-9:
        return species.dgf
    return _formation_gibbs(species, temperature_k, catalog or default_catalog())


@lru_cache(maxsize=8192)
def _formation_gibbs(species: Species, temperature_k: float, catalog) -> float:
    data = _temperature_data(species, catalog)
    if data.reference:
        return species.dgf
    if data.hydroxide:
        return species.dgf + _ionization_gibbs(temperature_k, catalog) - _ionization_gibbs(T_STANDARD, catalog)
    delta = temperature_k - T_STANDARD
    if data.heat_capacity is None:
        heat_capacity = criss_cobble_mean_cp(data.entropy_298, species.charge, data.criss_cobble_class,
                                             temperature_k) - data.elements_cp
    else:
        heat_capacity = data.heat_capacity
    return species.dgf + (-data.entropy * delta
                          + heat_capacity * (delta - temperature_k * math.log(temperature_k / T_STANDARD))) / 1000.0


def _ionization_gibbs(temperature_k: float, catalog) -> float:
    """ΔfG(H2O, l, T) + ΔrG(H2O = H+ + OH−, T) [kJ/mol], the latter RT ln10 · pKw(T) (Bandura & Lvov 2006)."""
    water = catalog.water["H2O"]
    gibbs = water.dgf if temperature_k == T_STANDARD else _formation_gibbs(water, temperature_k, catalog)
    return gibbs + GAS_CONSTANT * temperature_k * LN10 * pkw(temperature_k) / 1000.0


def formation_entropy_from_s(species: Species, catalog) -> float:
    """ΔfS° [J/(mol K)] from the species' S° and its elements' (ionic convention), or NaN if one is missing."""
    elements = _elements_sum(species, catalog, 0)
    return math.nan if species.s is None or elements is None else species.s - elements


def formation_enthalpy(species: Species, catalog=None) -> float:
    """ΔfH° [kJ/mol] at 298.15 K: tabulated, or ΔfG° + T0·ΔfS° when missing.

    >>> from electrosieve.engine.catalog import default_catalog
    >>> round(formation_enthalpy(default_catalog().water["H2O"]), 2)
    -285.83
    """
    if species.dhf is not None:
        return species.dhf
    return species.dgf + T_STANDARD * temperature_data(species, catalog).entropy / 1000.0


def formation_entropy(species: Species, catalog=None) -> float:
    """ΔfS° [J/(mol K)] at 298.15 K, in the ionic convention (see the module docstring)."""
    return temperature_data(species, catalog).entropy


def reaction_gibbs(terms: dict[Species, float], temperature_k: float = T_STANDARD, catalog=None) -> float:
    """ΔrG(T) [kJ/mol] of a reaction given as {species: stoichiometric number}, products positive.

    H+ and electrons need no entry: both are zero in the SHE convention at every T.
    """
    return sum(nu * formation_gibbs(s, temperature_k, catalog) for s, nu in terms.items())
