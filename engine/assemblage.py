"""The E–pH diagram of a material of several elements: exact domains of the stable phase assemblage.

Persson, Waldwick, Lazic & Ceder, Phys. Rev. B 85, 235438 (2012): at each (pH, E) the stable state of a
bulk composition x (element → atom fraction) is the lower convex hull, over composition, of the Gibbs
energies of every solid, dissolved species (at the set activity) and alloy. With g_p(pH, E) the energy
of phase p per formula unit (formed from the metals, H2O, H+ and e−, as in ``engine.planes``) and c_p its
metal atoms, that is the linear programme

    G(pH, E) = min Σ λ_p·g_p(pH, E)   subject to   Σ λ_p·c_p = x,  λ_p ≥ 0        [eV per metal atom]

whose optimum is a basic solution: at most k phases for k metals. Each feasible basis (an *assemblage*)
has fixed amounts λ and an energy linear in pH and E, so the stable assemblage is the lowest of finitely
many planes and its domains are convex polygons, computed with ``engine.domains.envelope_piece``.

Pruning, exact: in an assemblage the phases of one metal only enter with a fixed amount of that metal,
so among them only the metal's own lowest species can be optimal; an assemblage's domain therefore lies
in the intersection of its single-metal species' own domains (its *cell*), and only non-empty cells are
candidates. Domains are found from the window's centre outwards across their edges; when they do not tile
the window every candidate is computed, so no domain is ever missed.

Metallic solution: with ``mixing="ideal"`` every set of two or more of the material's metals in their
bulk ratio is a solution phase of Gibbs energy ``engine.mixing.mixing_gibbs``. A metal leaving the alloy
is represented by the end states (all of it in the solution or none): intermediate compositions of a
partly dealloyed solution are not phases, which moves the boundaries where a metal starts to leave by
at most a few RT/(nF) (about 10 mV for a binary at 25 °C).
"""

import math
from dataclasses import dataclass
from functools import lru_cache
from itertools import combinations

import numpy as np

from .alloydata import AlloyData, alloy_data
from .catalog import Catalog, default_catalog
from .constants import KJ_PER_EV, ZERO_CELSIUS, nernst_slope, thermal_voltage
from .diagram import check_limits, diagram, water_gibbs
from .inputs import DEFAULT_ACTIVITY, check_activity, check_number, check_temperature
from .domains import MIN_DOMAIN_AREA, SEVERITY, TIE, PlotLimits, envelope_piece
from .errors import InputError
from .geometry import WINDOW_EDGE, area, rectangle
from .mixing import mixing_gibbs, mixing_model
from .species import Species
from .thermo import formation_gibbs
from .water import WaterLines, water_lines

__all__ = ["Phase", "Assemblage", "AssemblagePlanes", "AssemblageDomain", "ComponentFate", "Hazard",
           "MaterialDiagram", "Exposure", "material_diagram", "material_exposures", "check_composition",
           "parse_composition", "MIXING_MODELS", "MAX_ELEMENTS"]

MIXING_MODELS = ("ideal", "none")
"""Metallic solution models: an ideal solution with published excess terms, or none (each metal apart)."""

MAX_ELEMENTS = 6
"""Most metals in one material (the number of candidate bases grows as C(phases, metals))."""

AMOUNT_TOL = 1e-10
"""Amounts [formula units per metal atom] at or below this are zero: that phase is not in the assemblage."""

SHARE_TOL = 1e-9
"""A component's share of a phase below this does not count towards its region."""

_PROBE = -2
"""Label of a cell edge: the neighbour across it is found by probing, not by label."""


@dataclass(frozen=True)
class Phase:
    """One phase an assemblage may hold: a species, a mixed compound or a metallic solution.

    ``atoms`` [metal atoms per formula unit] by element; ``mixing`` [J per mole of atoms] for a solution.
    """

    name: str
    region: str
    atoms: tuple[tuple[str, float], ...]
    species: Species | None = None
    mixing: float = 0.0

    @property
    def is_solution(self) -> bool:
        return self.species is None


@dataclass(frozen=True)
class Assemblage:
    """Phases with their amounts [formula units per metal atom of the material] that make up the bulk composition."""

    phases: tuple[Phase, ...]
    amounts: tuple[float, ...]

    @property
    def name(self) -> str:
        """The phases joined by ' + ', as shown to users."""
        return " + ".join(p.name for p in self.phases)

    @property
    def region(self) -> str:
        """The most severe region of its phases: corrosion over passivation over immunity."""
        return max((p.region for p in self.phases), key=SEVERITY.__getitem__)

    def shares(self, element: str) -> dict[str, float]:
        """Share of ``element``'s atoms in each phase holding it (summing to 1)."""
        held = {p.name: amount * dict(p.atoms).get(element, 0.0) for p, amount in zip(self.phases, self.amounts)}
        total = sum(held.values())
        return {name: value / total for name, value in held.items() if value > 0}


@dataclass(frozen=True)
class AssemblagePlanes:
    """G_i = offset_i + ph_slope_i·pH + e_slope_i·E [eV per metal atom of the material] of each candidate assemblage i."""

    assemblages: tuple[Assemblage, ...]
    offset: np.ndarray
    ph_slope: np.ndarray
    e_slope: np.ndarray

    def at(self, ph: float, potential: float) -> np.ndarray:
        """G of every candidate at one point (pH, E vs SHE [V])."""
        return self.offset + self.ph_slope * ph + self.e_slope * potential

    def stable_index_at(self, ph: float, potential: float) -> int:
        """The lowest candidate; on a boundary (within ``engine.domains.TIE``) the most severe region, then the first."""
        values = self.at(ph, potential)
        tied = np.flatnonzero(values <= values.min() + TIE)
        return int(max(tied, key=lambda i: (SEVERITY[self.assemblages[i].region], -i)))


@dataclass(frozen=True)
class AssemblageDomain:
    """Where one assemblage is the most stable: a convex polygon [pH, V vs SHE], counter-clockwise."""

    index: int
    assemblage: Assemblage
    vertices: np.ndarray

    @property
    def region(self) -> str:
        return self.assemblage.region

    @property
    def area(self) -> float:
        return area(self.vertices)


@dataclass(frozen=True)
class ComponentFate:
    """Where one element of the material goes: stays in the metal, goes into a film, or dissolves.

    ``fractions``: share of the element's atoms in each phase (over a window: averaged over its area, or
    length for a segment), summing to 1; ``region_fractions`` the same by region; ``region`` the most
    severe region it reaches (corrosion when any of it dissolves).
    """

    element: str
    region: str
    species: tuple[str, ...]
    fractions: dict[str, float]
    region_fractions: dict[str, float]


@dataclass(frozen=True)
class Hazard:
    """A dissolved species a component forms that a lab safety officer would flag (``data/materials.toml``)."""

    element: str
    species: str
    note: str


@dataclass(frozen=True)
class MaterialDiagram:
    """The exact E–pH diagram of a material of bulk ``composition`` ((element, atom fraction), …)."""

    composition: tuple[tuple[str, float], ...]
    activity: float
    temperature_c: float
    window: PlotLimits
    mixing: str
    planes: AssemblagePlanes
    domains: tuple[AssemblageDomain, ...]
    water: WaterLines
    catalog: Catalog

    @property
    def elements(self) -> tuple[str, ...]:
        return tuple(element for element, _ in self.composition)

    def assemblage_at(self, ph: float, potential: float) -> Assemblage:
        """The stable assemblage at (pH, E [V vs SHE])."""
        ph, potential = _check_inside(self.window, ph, potential)
        return self.planes.assemblages[self.planes.stable_index_at(ph, potential)]

    def components_at(self, ph: float, potential: float) -> tuple[ComponentFate, ...]:
        """Each element's fate at (pH, E [V vs SHE]).

        >>> d = material_diagram({"Ni": 0.7, "Cu": 0.3})
        >>> [(c.element, c.region) for c in d.components_at(2.0, 0.0)]
        [('Ni', 'corrosion'), ('Cu', 'immunity')]
        """
        return _fates(self.elements, [(self.assemblage_at(ph, potential), 1.0)])

    def components_over(self, vertices: np.ndarray) -> tuple[ComponentFate, ...]:
        """Each element's fate over a convex window (vertices [[pH, E vs SHE], …] counter-clockwise; a
        segment or a point too), weighted exactly by area (or length) of each domain's piece of it."""
        vertices = np.asarray(vertices, dtype=float).reshape(-1, 2)
        for ph, potential in vertices:
            _check_inside(self.window, float(ph), float(potential))
        if len(vertices) == 1:
            return self.components_at(*vertices[0])
        weighted = []
        for domain in self.domains:
            if len(vertices) == 2:
                weight = _segment_length_inside(domain.vertices, vertices[0], vertices[1])
            else:
                piece, _ = envelope_piece(self.planes, domain.index, vertices, np.full(len(vertices), WINDOW_EDGE))
                weight = area(piece) if len(piece) >= 3 else 0.0
            if weight > 0:
                weighted.append((domain.assemblage, weight))
        if not weighted:  # a degenerate piece on a boundary: judge its first corner
            return self.components_at(*vertices[0])
        return _fates(self.elements, weighted)

    def hazards(self, components: tuple[ComponentFate, ...]) -> tuple[Hazard, ...]:
        """Flagged dissolved species among ``components`` (the hazards of each element's own material)."""
        flagged = []
        for fate in components:
            notes = {h.species: h.note for m in self.catalog.materials.values() if m.element == fate.element
                     for h in m.hazards}
            flagged += [Hazard(fate.element, name, notes[name]) for name in fate.species if name in notes]
        return tuple(dict.fromkeys(flagged))


@dataclass(frozen=True)
class Exposure:
    """One surface a material shows the electrolyte: ``label`` ('surface', 'coating', 'substrate if the coating fails')."""

    label: str
    diagram: MaterialDiagram


def _fates(elements: tuple[str, ...], weighted: list[tuple[Assemblage, float]]) -> tuple[ComponentFate, ...]:
    total = sum(weight for _, weight in weighted)
    fates = []
    for element in elements:
        fractions: dict[str, float] = {}
        regions: dict[str, float] = {}
        for assemblage, weight in weighted:
            region_of = {p.name: p.region for p in assemblage.phases}
            for name, share in assemblage.shares(element).items():
                fractions[name] = fractions.get(name, 0.0) + share * weight / total
                regions[region_of[name]] = regions.get(region_of[name], 0.0) + share * weight / total
        present = [r for r, share in regions.items() if share > SHARE_TOL]
        fates.append(ComponentFate(element=element, region=max(present, key=SEVERITY.__getitem__),
                                   species=tuple(n for n, s in fractions.items() if s > SHARE_TOL),
                                   fractions=fractions, region_fractions=regions))
    return tuple(fates)


def _segment_length_inside(polygon: np.ndarray, start: np.ndarray, end: np.ndarray) -> float:
    """Length of the segment start→end inside a counter-clockwise convex polygon (Cyrus & Beck, Comput.
    Graph. 3, 23, 1978: clip the parameter t ∈ [0, 1] by each edge's half-plane)."""
    direction = end - start
    low, high = 0.0, 1.0
    following = np.roll(polygon, -1, axis=0)
    for a, b in zip(polygon, following):
        normal = np.array([b[1] - a[1], a[0] - b[0]])  # outward for a counter-clockwise polygon
        offset, rate = float(normal @ (start - a)), float(normal @ direction)
        if rate == 0.0:
            if offset > 0.0:
                return 0.0
        elif rate > 0.0:
            high = min(high, -offset / rate)
        else:
            low = max(low, -offset / rate)
        if low >= high:
            return 0.0
    return (high - low) * float(np.hypot(*direction))


def _check_inside(window: PlotLimits, ph, potential) -> tuple[float, float]:
    ph = check_number(ph, "ph", window.ph_min, window.ph_max, " (the diagram's pH window)")
    potential = check_number(potential, "potential", window.e_min, window.e_max, " V vs SHE (the diagram's window)")
    return ph, potential


def parse_composition(text: str) -> dict[str, float]:
    """A composition written ``Fe=0.7,Cr=0.18,Ni=0.12`` (atom fractions or percentages; normalised later).

    >>> parse_composition("Ni=70, Cu=30")
    {'Ni': 70.0, 'Cu': 30.0}
    """
    composition: dict[str, float] = {}
    for part in str(text).split(","):
        element, sep, amount = part.partition("=")
        element = element.strip()
        if not sep or not element:
            raise InputError(f"composition: write element=amount pairs separated by commas, e.g. Fe=0.7,Cr=0.3 "
                             f"(given {text!r})", field="composition")
        try:
            composition[element] = float(amount)
        except ValueError:
            raise InputError(f"composition: amount of {element} must be a number (given {amount.strip()!r})",
                             field="composition") from None
    return composition


def check_composition(composition, catalog: Catalog) -> tuple[tuple[str, float], ...]:
    """The composition as ((element, atom fraction), …) summing to 1, each element known, each amount positive."""
    if not isinstance(composition, dict) or not composition:
        raise InputError("composition: give at least one element with its amount", field="composition")
    checked: dict[str, float] = {}
    for element, amount in composition.items():
        symbol = catalog.system(element).element
        value = check_number(amount, "composition", 0.0, 1e6, f" (amount of {symbol})")
        if value <= 0.0 or symbol in checked:
            raise InputError(f"composition: {symbol} must appear once with a positive amount (given {amount!r})",
                             field="composition")
        checked[symbol] = value
    if len(checked) > MAX_ELEMENTS:
        raise InputError(f"composition: at most {MAX_ELEMENTS} elements (given {len(checked)})", field="composition")
    total = sum(checked.values())
    return tuple((element, value / total) for element, value in checked.items())


def material_diagram(composition, activity: float = DEFAULT_ACTIVITY, temperature_c: float = 25.0,
                     window: PlotLimits = PlotLimits(), mixing: str = "ideal", catalog: Catalog | None = None,
                     data: AlloyData | None = None) -> MaterialDiagram:
    """The exact E–pH diagram of a material of bulk ``composition`` (element → amount) at ``activity`` of
    every dissolved species, ``temperature_c`` [°C], within ``window``; ``mixing`` is 'ideal' or 'none'.

    For one element the domains are those of ``engine.diagram.diagram``.

    >>> d = material_diagram({"Fe": 2, "Ni": 1})
    >>> d.assemblage_at(9.0, -0.3).name
    'NiFe2O4 (trevorite)'
    """
    catalog = catalog or default_catalog()
    if mixing not in MIXING_MODELS:
        raise InputError(f"mixing must be one of {', '.join(MIXING_MODELS)} (given {mixing!r})", field="mixing")
    data = data or alloy_data(catalog)
    return _cached(catalog, data, check_composition(composition, catalog), check_activity(activity),
                   check_temperature(temperature_c), check_limits(window), mixing)


def material_exposures(material_id: str, activity: float = DEFAULT_ACTIVITY, temperature_c: float = 25.0,
                       window: PlotLimits = PlotLimits(), catalog: Catalog | None = None) -> tuple[Exposure, ...]:
    """The diagrams of what a material of ``data/alloys.toml`` shows the electrolyte: its surface, or for a
    coated electrode its coating and the substrate where the coating fails."""
    catalog = catalog or default_catalog()
    data = alloy_data(catalog)
    row = data.alloy(material_id)
    surface = material_diagram(data.composition_of(row.id), activity, temperature_c, window, row.mixing, catalog, data)
    if row.substrate is None:
        return (Exposure("surface", surface),)
    bare = material_diagram({row.substrate: 1.0}, activity, temperature_c, window, "none", catalog, data)
    return Exposure("coating", surface), Exposure("substrate if the coating fails", bare)


@lru_cache(maxsize=128)
def _cached(catalog: Catalog, data: AlloyData, composition: tuple[tuple[str, float], ...], activity: float,
            temperature_c: float, window: PlotLimits, mixing: str) -> MaterialDiagram:
    elements = tuple(element for element, _ in composition)
    x = np.array([fraction for _, fraction in composition])
    temperature_k = temperature_c + ZERO_CELSIUS
    water = water_gibbs(catalog, temperature_k)
    singles = {element: diagram(element, activity, temperature_c, window, catalog) for element in elements}
    solution = mixing == "ideal"
    interactions = tuple(p for p in data.interactions if set(p.elements) <= set(elements))
    multi = _compound_phases(data, elements, water, activity, temperature_k, catalog)
    if solution:
        multi += _solution_phases(composition, temperature_k, interactions)
    candidates, cells = [], []
    rect = rectangle(window.ph_min, window.ph_max, window.e_min, window.e_max)
    cell_cache: dict[tuple[str, ...], list] = {}
    for chosen, amounts, free in _supports(elements, x, multi):
        base = [(phase, amount, amount, plane) for (phase, plane), amount in zip(chosen, amounts)]
        key = tuple(element for element, _ in free)
        if key not in cell_cache:
            cell_cache[key] = _cells(singles, key, rect)
        for picks, vertices, labels in cell_cache[key]:
            parts = list(base)
            for (element, atoms), index in zip(free, picks):
                planes = singles[element].planes
                species = planes.species[index]
                phase = Phase(species.name, species.region, ((element, float(species.metal_atoms)),), species)
                # Φ is per metal atom, so ``atoms`` metal atoms of it weigh ``atoms``·Φ (exactly Φ for one element)
                parts.append((phase, atoms / species.metal_atoms, atoms,
                              (planes.offset[index], planes.ph_slope[index], planes.e_slope[index])))
            candidates.append(parts)
            cells.append((vertices, labels))
    planes = _planes(candidates)
    domains = _domains(planes, cells, window)
    return MaterialDiagram(composition=composition, activity=activity, temperature_c=temperature_c, window=window,
                           mixing=mixing_model(elements, interactions, solution), planes=planes,
                           domains=tuple(domains), water=water_lines(water, temperature_k), catalog=catalog)


def _compound_phases(data: AlloyData, elements, water: float, activity: float, temperature_k: float, catalog) -> list:
    """Each mixed compound of the material's metals with its plane per formula unit [eV]:
    ΔG = ΔfG − o·ΔfG(H2O) (+ kT ln a if dissolved) − (2o − h)·(RT ln10/F)·pH − (2o − h + z)·E (``engine.planes``)."""
    phases = []
    for compound in data.compounds:
        metals = {e: n for e, n in compound.composition.items() if e not in ("H", "O")}
        if not set(metals) <= set(elements):
            continue
        energy = (formation_gibbs(compound, temperature_k, catalog) - compound.oxygen_atoms * water) / KJ_PER_EV
        if compound.is_dissolved:
            energy += thermal_voltage(temperature_k) * math.log(activity)
        plane = (energy, -compound.protons_released * nernst_slope(temperature_k), -float(compound.electrons_released))
        atoms = tuple((e, float(metals.get(e, 0))) for e in elements if e in metals)
        phases.append((Phase(compound.name, compound.region, atoms, compound), plane))
    return phases


def _solution_phases(composition, temperature_k: float, interactions) -> list:
    """The metallic solution of every set of two or more metals in their bulk ratio, per atom [eV]."""
    phases = []
    for size in range(2, len(composition) + 1):
        for subset in combinations(composition, size):
            total = sum(fraction for _, fraction in subset)
            atoms = tuple((element, fraction / total) for element, fraction in subset)
            gibbs = mixing_gibbs(dict(atoms), temperature_k, interactions)
            name = "–".join(element for element, _ in subset) + " alloy"
            phases.append((Phase(name, "immunity", atoms, None, gibbs), (gibbs / 1000.0 / KJ_PER_EV, 0.0, 0.0)))
    return phases


def _supports(elements, x: np.ndarray, multi: list):
    """Every feasible assemblage shape: (multi-element phases with their amounts, ((element, atoms), …) left to
    the element's own species). Bases of k columns from the multi-element phases and the k unit vectors,
    solved all at once; each support (the columns with positive amount) is kept once."""
    k = len(elements)
    columns = np.zeros((k, len(multi) + k))
    for j, (phase, _) in enumerate(multi):
        for element, atoms in phase.atoms:
            columns[elements.index(element), j] = atoms
    columns[:, len(multi):] = np.eye(k)
    bases = np.array(list(combinations(range(columns.shape[1]), k)), dtype=int)
    matrices = np.transpose(columns[:, bases], (1, 0, 2))
    independent = np.abs(np.linalg.det(matrices)) > 1e-9
    bases, matrices = bases[independent], matrices[independent]
    amounts = np.linalg.solve(matrices, np.broadcast_to(x, (len(bases), k))[..., None])[..., 0]
    feasible = (amounts >= -AMOUNT_TOL).all(axis=1)
    seen = set()
    for basis, amount in zip(bases[feasible], amounts[feasible]):
        keep = amount > AMOUNT_TOL
        support = tuple(int(c) for c in basis[keep])
        if support in seen:
            continue
        seen.add(support)
        chosen = [multi[c] for c in support if c < len(multi)]
        chosen_amounts = [float(a) for c, a in zip(basis[keep], amount[keep]) if c < len(multi)]
        free = tuple((elements[c - len(multi)], float(a)) for c, a in zip(basis[keep], amount[keep]) if c >= len(multi))
        yield chosen, chosen_amounts, free


def _cells(singles: dict, free: tuple[str, ...], rect) -> list:
    """The non-empty intersections of the free elements' own domains: (species indices, vertices, labels)."""
    cells = [((), *rect)]
    for element in free:
        planes = singles[element].planes
        grown = []
        for picks, vertices, labels in cells:
            for domain in singles[element].domains:
                piece, edges = envelope_piece(planes, domain.index, vertices, labels)
                if len(piece) >= 3 and area(piece) > MIN_DOMAIN_AREA:
                    grown.append((picks + (domain.index,), piece, np.where(edges >= 0, _PROBE, edges)))
        cells = grown
    return cells


def _planes(candidates: list) -> AssemblagePlanes:
    """Each candidate's energy Σ multiplier·plane [eV per metal atom of the material] and its assemblage."""
    coefficients = np.array([[sum(m * plane[axis] for _, _, m, plane in parts) for axis in range(3)]
                             for parts in candidates]).reshape(-1, 3)
    assemblages = tuple(Assemblage(tuple(p[0] for p in parts), tuple(p[1] for p in parts)) for parts in candidates)
    return AssemblagePlanes(assemblages, coefficients[:, 0].copy(), coefficients[:, 1].copy(), coefficients[:, 2].copy())


def _domains(planes: AssemblagePlanes, cells: list, window: PlotLimits) -> list[AssemblageDomain]:
    """Every non-empty domain: grown from the window's centre across domain edges (each neighbour found by
    its label or by probing just outside the edge); if they do not tile the window, every candidate is computed."""
    found: dict[int, np.ndarray | None] = {}

    def compute(index: int) -> np.ndarray | None:
        vertices, labels = envelope_piece(planes, index, *cells[index])
        keep = len(vertices) >= 3 and area(vertices) > MIN_DOMAIN_AREA
        found[index] = vertices if keep else None
        return labels if keep else None

    size = max(window.ph_max - window.ph_min, window.e_max - window.e_min)
    queue = [planes.stable_index_at(0.5 * (window.ph_min + window.ph_max), 0.5 * (window.e_min + window.e_max))]
    while queue:
        index = queue.pop()
        if index in found:
            continue
        labels = compute(index)
        if labels is None:
            continue
        vertices = found[index]
        following = np.roll(vertices, -1, axis=0)
        for k, label in enumerate(labels):
            if label == WINDOW_EDGE:
                continue
            if label >= 0:
                queue.append(int(label))
            edge = following[k] - vertices[k]
            normal = np.array([edge[1], -edge[0]]) / max(float(np.hypot(*edge)), 1e-300)
            for t in (0.25, 0.5, 0.75):
                ph, potential = vertices[k] + t * edge + 1e-7 * size * normal
                if window.ph_min <= ph <= window.ph_max and window.e_min <= potential <= window.e_max:
                    queue.append(planes.stable_index_at(ph, potential))
    covered = sum(area(v) for v in found.values() if v is not None)
    if abs(covered - window.area) > 0.5 * MIN_DOMAIN_AREA:  # a missed domain of any counted size shows here
        for index in range(len(cells)):
            if index not in found:
                compute(index)
    return [AssemblageDomain(i, planes.assemblages[i], found[i]) for i in sorted(found) if found[i] is not None]
