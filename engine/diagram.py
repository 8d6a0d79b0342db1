"""The E–pH diagram of one element: domains, boundaries and water lines, and what is stable at a point.

This is the engine's front door: it checks the inputs, builds the free-energy
planes (``planes``), computes the exact domains (``domains``, all elements in one
pass by ``envelope``) and caches the diagrams of every element of the catalog per
(activity, temperature, limits): the first question under new conditions answers
every element, since a screen asks about them all. A question with per-ion or ligand
activities is answered and cached per element instead.
"""

from dataclasses import dataclass
from functools import cached_property, lru_cache

import numpy as np

from .catalog import Catalog, ElementSystem, default_catalog
from .constants import ZERO_CELSIUS
from .domains import Boundary, Domain, PlotLimits, boundaries, stability_domains, stable_index_at
from .envelope import Job, domains_of
from .errors import InputError
from .formula import FormulaError, parse_formula
from .geometry import stack
from .inputs import (ACTIVITY_RANGE, DEFAULT_ACTIVITY, LIGAND_ACTIVITY_RANGE, check_activity, check_number,
                     check_temperature)
from .planes import Planes, build_planes
from .scales import canonical_scale, to_she
from .species import Species
from .thermo import formation_gibbs
from .water import WaterLines, water_lines

@dataclass(frozen=True)
class Diagram:
    """An element's exact E–pH diagram under given conditions."""

    element: str
    activity: float
    temperature_c: float
    limits: PlotLimits
    planes: Planes
    domains: tuple[Domain, ...]
    boundaries: tuple[Boundary, ...]
    water: WaterLines
    ion_activities: tuple[tuple[str, float], ...] = ()
    ligand_activities: tuple[tuple[str, float], ...] = ()

    @cached_property
    def solid_domains(self) -> tuple[Domain, ...]:
        """Domains of the solids alone (dissolved species left out): where each solid is the most stable solid."""
        return tuple(stability_domains(self.planes, self.limits, competitors=~self.planes.dissolved))

    @cached_property
    def outline_stack(self) -> np.ndarray:
        """Every domain's polygon, then every solid domain's, as one padded stack (``engine.geometry.stack``)."""
        polygons = [d.vertices for d in self.domains] + [d.vertices for d in self.solid_domains]
        return stack(polygons, max(len(p) for p in polygons))

    def stable_species_at(self, ph: float, potential: float) -> Species:
        """The species of lowest Φ at (pH, E [V vs SHE])."""
        return self.planes.species[stable_index_at(self.planes, ph, potential)]


def check_limits(limits: PlotLimits) -> PlotLimits:
    """The diagram's plot limits, finite and increasing."""
    for name in ("ph_min", "ph_max", "e_min", "e_max"):
        check_number(getattr(limits, name), name, -1e3, 1e3)
    if limits.ph_min >= limits.ph_max:
        raise InputError(f"pH limits are empty or inverted ({limits.ph_min:g} to {limits.ph_max:g})", field="ph_min")
    if limits.e_min >= limits.e_max:
        raise InputError(f"potential limits are empty or inverted ({limits.e_min:g} to {limits.e_max:g})", field="e_min")
    return limits


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


def check_ion_activities(ion_activities, system: ElementSystem | None, catalog: Catalog) -> tuple[tuple[str, float], ...]:
    """The (name, activity) pairs of ``ion_activities`` that concern ``system`` (every element's when None),
    checked and sorted.

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
    if system is None:
        own = known
    else:
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
            limits: PlotLimits = PlotLimits(), catalog: Catalog | None = None, *,
            ion_activities: dict[str, float] | None = None,
            ligand_activities: dict[str, float] | None = None) -> Diagram:
    """The exact E–pH diagram of ``element`` at ``activity`` and ``temperature_c`` [°C] within ``limits``.

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
    ions = check_ion_activities(ion_activities, system, catalog)
    ligands = check_ligand_activities(ligand_activities, catalog)
    if ions or ligands:
        return _cached_diagram(catalog, system.element, check_activity(activity), check_temperature(temperature_c),
                               check_limits(limits), ions, ligands)
    return _catalog_diagrams(catalog, check_activity(activity), check_temperature(temperature_c),
                             check_limits(limits))[system.element]


CONDITIONS = 16
"""How many (catalog, activity, temperature, limits) conditions keep their diagrams, least recently used dropped
first. One condition holds every element's diagram (about 0.5 MB for the built-in catalog, see
``bench/memory.py``), so the diagram cache stays under about 8 MB."""


@lru_cache(maxsize=CONDITIONS)
def _catalog_diagrams(catalog: Catalog, activity: float, temperature_c: float, limits: PlotLimits) -> dict[str, Diagram]:
    return build_diagrams(catalog, tuple(catalog.systems), activity, temperature_c, limits)


def build_diagrams(catalog: Catalog, elements: tuple[str, ...], activity: float, temperature_c: float,
                   limits: PlotLimits) -> dict[str, Diagram]:
    """Uncached diagrams of ``elements`` (checked inputs), every domain and solid domain found in one pass
    (``engine.envelope``: the same polygons :func:`engine.domains.stability_domains` finds)."""
    temperature_k = temperature_c + ZERO_CELSIUS
    water = water_lines(water_gibbs(catalog, temperature_k), temperature_k)
    planes = [planes_for(catalog.systems[e], catalog, activity, temperature_c) for e in elements]
    found = domains_of([Job(p, limits) for p in planes] + [Job(p, limits, ~p.dissolved) for p in planes])
    result = {}
    for k, (element, plane) in enumerate(zip(elements, planes)):
        domains = [Domain(index=i, species=plane.species[i], vertices=v, neighbours=n) for i, v, n in found[k]]
        solids = tuple(Domain(index=i, species=plane.species[i], vertices=v, neighbours=n)
                       for i, v, n in found[len(elements) + k])
        made = Diagram(element=element, activity=activity, temperature_c=temperature_c, limits=limits,
                       planes=plane, domains=tuple(domains), boundaries=tuple(boundaries(plane, domains)), water=water)
        made.__dict__["solid_domains"] = solids  # already found: fills the cached property
        result[element] = made
    return result


@lru_cache(maxsize=512)
def _cached_diagram(catalog: Catalog, element: str, activity: float, temperature_c: float,
                    limits: PlotLimits, ion_activities: tuple[tuple[str, float], ...] = (),
                    ligand_activities: tuple[tuple[str, float], ...] = ()) -> Diagram:
    """One element's diagram under per-ion or ligand activities (one element at a time: these conditions are
    rarely shared across a catalog)."""
    system = catalog.systems[element]
    planes = planes_for(system, catalog, activity, temperature_c, ion_activities=ion_activities,
                        ligand_activities=ligand_activities)
    domains = stability_domains(planes, limits)
    temperature_k = temperature_c + ZERO_CELSIUS
    return Diagram(
        element=element, activity=activity, temperature_c=temperature_c, limits=limits, planes=planes,
        domains=tuple(domains), boundaries=tuple(boundaries(planes, domains)),
        water=water_lines(water_gibbs(catalog, temperature_k), temperature_k),
        ion_activities=ion_activities, ligand_activities=ligand_activities,
    )


def check_point(limits: PlotLimits, ph, potential) -> tuple[float, float]:
    """A (pH, E vs SHE) point, checked to lie inside ``limits``."""
    ph = check_number(ph, "ph", limits.ph_min, limits.ph_max, " (the diagram's pH limits)")
    potential = check_number(potential, "potential", limits.e_min, limits.e_max, " V vs SHE (the diagram's limits)")
    return ph, potential



@dataclass(frozen=True)
class PointResult:
    """What is most stable at one point of an element's diagram."""

    diagram: Diagram
    species: Species
    ph: float
    potential: float
    """The potential as given [V on ``scale``]."""
    scale: str
    potential_she: float
    """The same potential [V vs SHE]."""


def stable_at(diagram: Diagram, scales: dict, ph, potential, scale: str = "SHE") -> PointResult:
    """The stable species of ``diagram`` at ``ph`` and ``potential`` [V on ``scale``], the point checked to lie
    within the diagram's limits once converted to the SHE.

    >>> from electrosieve.engine.catalog import default_catalog
    >>> stable_at(diagram("Zn"), default_catalog().scales, 3.0, -1.2).species.name
    'Zn'
    """
    scale_id = canonical_scale(scales, scale)
    ph = check_number(ph, "ph")
    potential = check_number(potential, "potential")
    potential_she = to_she(scales, potential, scale_id, ph, diagram.temperature_c + ZERO_CELSIUS)
    ph, potential_she = check_point(diagram.limits, ph, potential_she)
    return PointResult(diagram=diagram, species=diagram.stable_species_at(ph, potential_she), ph=ph,
                       potential=potential, scale=scale_id, potential_she=potential_she)
