"""The E–pH diagram of one element: domains, boundaries and water lines, and what is stable at a point.

This is the engine's front door: it checks the inputs, builds the free-energy
planes (``planes``), computes the exact domains (``domains``, all elements in one
pass by ``envelope``) and caches the diagrams of every element of the catalog per
(activity, temperature, limits): the first question under new conditions answers
every element, since a screen asks about them all.
"""

from dataclasses import dataclass
from functools import cached_property, lru_cache

import numpy as np

from .catalog import Catalog, ElementSystem, default_catalog
from .constants import ZERO_CELSIUS
from .domains import Boundary, Domain, PlotLimits, boundaries, stability_domains, stable_index_at
from .envelope import Job, domains_of
from .errors import InputError
from .geometry import stack
from .inputs import DEFAULT_ACTIVITY, check_activity, check_number, check_temperature
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


def planes_for(system: ElementSystem, catalog: Catalog, activity: float, temperature_c: float) -> Planes:
    """The free-energy planes of every species of ``system``."""
    temperature_k = temperature_c + ZERO_CELSIUS
    return build_planes(system.species, water_gibbs(catalog, temperature_k), activity, temperature_k, catalog)


def diagram(element: str, activity: float = DEFAULT_ACTIVITY, temperature_c: float = 25.0,
            limits: PlotLimits = PlotLimits(), catalog: Catalog | None = None) -> Diagram:
    """The exact E–pH diagram of ``element`` at ``activity`` and ``temperature_c`` [°C] within ``limits``.

    >>> d = diagram("Zn")
    >>> sorted({dom.region for dom in d.domains})
    ['corrosion', 'immunity', 'passivation']
    """
    catalog = catalog or default_catalog()
    system = catalog.system(element)
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
