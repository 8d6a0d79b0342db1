"""The E–pH diagram of one element: domains, boundaries and water lines, and what is stable at a point.

This is the engine's front door: it checks the inputs, builds the free-energy
planes (``planes``), computes the exact domains (``domains``) and caches the
result per (element, activity, temperature, window, ion activities, ligand activities).
"""

import math
from dataclasses import dataclass
from functools import cached_property, lru_cache

import numpy as np

from .catalog import Catalog, ElementSystem, default_catalog
from .constants import ZERO_CELSIUS
from .domains import Boundary, Domain, Window, boundaries, stability_domains, stable_index_at
from .errors import InputError
from .formula import FormulaError, parse_formula
from .geometry import stack
from .planes import Planes, build_planes
from .species import Species
from .thermo import formation_gibbs
from .water import WaterLines, water_lines

DEFAULT_ACTIVITY = 1e-6
"""Activity of every dissolved species: 10^-6, the usual corrosion convention (Pourbaix 1966, ch. 3) [common practice]."""

ACTIVITY_RANGE = (1e-8, 1.0)
"""Allowed dissolved-species activities."""

LIGAND_ACTIVITY_RANGE = (1e-8, 20.0)
"""Allowed free-ligand activities (saturated NaCl has a(Cl−) near 6; common practice)."""

TEMPERATURE_RANGE_C = (0.0, 150.0)
"""Allowed temperatures [°C]: liquid water at or above its saturation pressure."""


@dataclass(frozen=True)
class Diagram:
    """An element's exact E–pH diagram under given conditions."""

    element: str
    activity: float
    temperature_c: float
    window: Window
    planes: Planes
    domains: tuple[Domain, ...]
    boundaries: tuple[Boundary, ...]
    water: WaterLines
    ion_activities: tuple[tuple[str, float], ...] = ()
    ligand_activities: tuple[tuple[str, float], ...] = ()

    @cached_property
    def solid_domains(self) -> tuple[Domain, ...]:
        """Domains of the solids alone (dissolved species left out): where each solid is the most stable solid."""
        return tuple(stability_domains(self.planes, self.window, competitors=~self.planes.dissolved))

    @cached_property
    def outline_stack(self) -> np.ndarray:
        """Every domain's polygon, then every solid domain's, as one padded stack (``engine.geometry.stack``)."""
        polygons = [d.vertices for d in self.domains] + [d.vertices for d in self.solid_domains]
        return stack(polygons, max(len(p) for p in polygons))

    def stable_species_at(self, ph: float, potential: float) -> Species:
        """The species of lowest Φ at (pH, E [V vs SHE])."""
        return self.planes.species[stable_index_at(self.planes, ph, potential)]


def check_number(value, field: str, low: float | None = None, high: float | None = None, what: str = "") -> float:
    """``value`` as a finite float within [low, high], or an :class:`InputError` naming ``field``."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"{field} must be a number (given {value!r})", field=field)
    value = float(value)
    if not math.isfinite(value):
        raise InputError(f"{field} must be a finite number (given {value!r})", field=field)
    if (low is not None and value < low) or (high is not None and value > high):
        raise InputError(f"{field} must be between {low:g} and {high:g}{what} (given {value:g})", field=field)
    return value


def check_activity(activity) -> float:
    """The dissolved-species activity, checked against :data:`ACTIVITY_RANGE`."""
    return check_number(activity, "activity", *ACTIVITY_RANGE)


def check_temperature(temperature_c) -> float:
    """The temperature [°C], checked against :data:`TEMPERATURE_RANGE_C`."""
    return check_number(temperature_c, "temperature", *TEMPERATURE_RANGE_C, what=" °C")


def check_window(window: Window) -> Window:
    """The plot window with finite, increasing limits."""
    for name in ("ph_min", "ph_max", "e_min", "e_max"):
        check_number(getattr(window, name), name, -1e3, 1e3)
    if window.ph_min >= window.ph_max:
        raise InputError(f"pH window is empty or inverted ({window.ph_min:g} to {window.ph_max:g})", field="ph_min")
    if window.e_min >= window.e_max:
        raise InputError(f"potential window is empty or inverted ({window.e_min:g} to {window.e_max:g})", field="e_min")
    return window


def water_gibbs(catalog: Catalog, temperature_k: float) -> float:
    """ΔGf°(H2O, l) [kJ/mol] at ``temperature_k`` [K] from the water file."""
    return formation_gibbs(catalog.water["H2O"], temperature_k, catalog)


def planes_for(system: ElementSystem, catalog: Catalog, activity: float, temperature_c: float, *,
               ion_activities: tuple[tuple[str, float], ...] = (),
               ligand_activities: tuple[tuple[str, float], ...] = ()) -> Planes:
    """The free-energy planes of every species of ``system``, with the species of each ligand given."""
    temperature_k = temperature_c + ZERO_CELSIUS
    species = system.species + tuple(s for name, _ in ligand_activities
                                     for s in catalog.ligands[name].species.get(system.element, ()))
    return build_planes(species, water_gibbs(catalog, temperature_k), activity, temperature_k, catalog,
                        ion_activities=ion_activities, ligand_activities=ligand_activities)


def check_ion_activities(ion_activities, system: ElementSystem, catalog: Catalog) -> tuple[tuple[str, float], ...]:
    """The (name, activity) pairs of ``ion_activities`` that concern ``system``, checked and sorted.

    Names of dissolved species of other elements are accepted and left out (a screen passes one set
    to every element), as are ions of elements without a species file (K^+, Na^+ of a recipe); any
    other name no dissolved species of the catalog bears is an error.
    """
    if not ion_activities:
        return ()
    if not isinstance(ion_activities, dict):
        raise InputError(f"ion_activities must map species names to activities, e.g. {{'Cu^2+': 0.1}} "
                         f"(given {ion_activities!r})", field="ion_activities")
    known = {s.name for other in catalog.systems.values() for s in other.species if s.is_dissolved}
    known |= {s.name for found in catalog.ligands.values() for group in found.species.values()
              for s in group if s.is_dissolved}
    own = {s.name for s in system.species if s.is_dissolved}
    own |= {s.name for found in catalog.ligands.values() for s in found.species.get(system.element, ())
            if s.is_dissolved}
    chosen = []
    for name, value in ion_activities.items():
        if name not in known and not _foreign_ion(name, catalog):
            raise InputError(f"ion_activities: no dissolved species is called {name!r}; write names as "
                             "`electrosieve sources ELEMENT` shows them, e.g. Cu^2+, HZnO2^-, AuCl4^-",
                             field="ion_activities")
        value = check_number(value, f"ion_activities[{name}]", *ACTIVITY_RANGE)
        if name in own:
            chosen.append((name, value))
    return tuple(sorted(chosen))


def _foreign_ion(name, catalog: Catalog) -> bool:
    """True for an ion such as K^+ whose elements (besides H and O) have no species file in ``catalog``."""
    try:
        elements = set(parse_formula(str(name).partition("^")[0])) - {"H", "O"}
    except FormulaError:
        return False
    return bool(elements) and "^" in str(name) and not elements & (set(catalog.systems) | _ligand_elements(catalog))


def _ligand_elements(catalog: Catalog) -> set[str]:
    return {found.ligand.counting_element for found in catalog.ligands.values()}


def check_ligand_activities(ligand_activities, catalog: Catalog) -> tuple[tuple[str, float], ...]:
    """The (ligand, activity) pairs of ``ligand_activities``, checked against the catalog's ligands and sorted."""
    if not ligand_activities:
        return ()
    if not isinstance(ligand_activities, dict):
        raise InputError(f"ligand_activities must map ligands to activities, e.g. {{'Cl^-': 1.0}} "
                         f"(given {ligand_activities!r})", field="ligand_activities")
    chosen = []
    for name, value in ligand_activities.items():
        if name not in catalog.ligands:
            known = ", ".join(sorted(catalog.ligands)) or "none"
            raise InputError(f"ligand_activities: unknown ligand {name!r}; known ligands: {known}",
                             field="ligand_activities")
        chosen.append((name, check_number(value, f"ligand_activities[{name}]", *LIGAND_ACTIVITY_RANGE)))
    return tuple(sorted(chosen))


def diagram(element: str, activity: float = DEFAULT_ACTIVITY, temperature_c: float = 25.0,
            window: Window = Window(), catalog: Catalog | None = None, *,
            ion_activities: dict[str, float] | None = None,
            ligand_activities: dict[str, float] | None = None) -> Diagram:
    """The exact E–pH diagram of ``element`` at ``activity`` and ``temperature_c`` [°C] within ``window``.

    ``ion_activities`` sets the activity of named dissolved species (``{"Cu^2+": 0.1}``) in place of
    ``activity``; ``ligand_activities`` (``{"Cl^-": 1.0}``) adds the complexes and salts of those
    ligands (``data/ligands/``) at the given free-ligand activities.

    >>> d = diagram("Zn")
    >>> sorted({dom.region for dom in d.domains})
    ['corrosion', 'immunity', 'passivation']
    >>> diagram("Ag", ligand_activities={"Cl^-": 0.01}).stable_species_at(5.0, 0.4).name
    'AgCl'
    """
    catalog = catalog or default_catalog()
    system = catalog.system(element)
    return _cached_diagram(catalog, system.element, check_activity(activity),
                           check_temperature(temperature_c), check_window(window),
                           check_ion_activities(ion_activities, system, catalog),
                           check_ligand_activities(ligand_activities, catalog))


@lru_cache(maxsize=512)
def _cached_diagram(catalog: Catalog, element: str, activity: float, temperature_c: float,
                    window: Window, ion_activities: tuple[tuple[str, float], ...] = (),
                    ligand_activities: tuple[tuple[str, float], ...] = ()) -> Diagram:
    system = catalog.systems[element]
    planes = planes_for(system, catalog, activity, temperature_c, ion_activities=ion_activities,
                        ligand_activities=ligand_activities)
    domains = stability_domains(planes, window)
    temperature_k = temperature_c + ZERO_CELSIUS
    return Diagram(
        element=element, activity=activity, temperature_c=temperature_c, window=window, planes=planes,
        domains=tuple(domains), boundaries=tuple(boundaries(planes, domains)),
        water=water_lines(water_gibbs(catalog, temperature_k), temperature_k),
        ion_activities=ion_activities, ligand_activities=ligand_activities,
    )


def check_point(window: Window, ph, potential) -> tuple[float, float]:
    """A (pH, E vs SHE) point, checked to lie inside ``window``."""
    ph = check_number(ph, "ph", window.ph_min, window.ph_max, " (the diagram's pH window)")
    potential = check_number(potential, "potential", window.e_min, window.e_max, " V vs SHE (the diagram's window)")
    return ph, potential

