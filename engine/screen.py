"""Screen candidate materials against a cell's operating window and rank them.

A scenario gives the pH (point or range), the potential (point or range) on a
reference scale, the dissolved-ion activity, the temperature, the electrode's
role and what counts as acceptable. Every candidate is judged on its element's
exact diagram (``engine.metrics``) and ranked by a rule shown to the user
(``engine.ranking``).
"""

from collections import OrderedDict
from dataclasses import dataclass, field, replace
from functools import cached_property
from threading import Lock

from .catalog import Catalog, default_catalog
from .diagram import Diagram, diagram
from .domains import PlotLimits
from .errors import InputError
from .inputs import DEFAULT_ACTIVITY, check_activity, check_temperature
from .materials import FAMILIES, Material
from .metrics import Piece, largest_gap, margin, overlays, region_fractions
from .ranking import DEFAULT_ORDER, RANK_KEYS, check_order, check_weights, rank, reason
from .thermo import temperature_notes
from .water import conditions_note
from .window import OperatingWindow, operating_window

ROLES = ("anode", "cathode")
REGIONS = ("immunity", "passivation", "hydride", "corrosion")
DEFAULT_ACCEPT = {"cathode": ("immunity",), "anode": ("immunity", "passivation")}
"""Acceptable regions by role: a cathode must stay metallic; an anode may also carry a solid film (common practice)."""


@dataclass(frozen=True)
class Scenario:
    """A cell's operating conditions and the question asked of the catalog (checked by :func:`make_scenario`).

    ``ph`` and ``potential`` are (low, high) pairs, equal for a point; ``potential`` is in V on ``scale``;
    ``temperature`` in °C; ``window`` is the operating window they make on the SHE diagram, built once.
    """

    ph: tuple[float, float]
    potential: tuple[float, float]
    window: OperatingWindow
    scale: str = "SHE"
    activity: float = DEFAULT_ACTIVITY
    temperature: float = 25.0
    role: str = "anode"
    accept: tuple[str, ...] = ()
    materials: tuple[str, ...] | None = None
    family: str | None = None
    rank_by: tuple[str, ...] = DEFAULT_ORDER
    weights: dict = field(default_factory=dict)


def make_scenario(*, ph, potential, scale: str = "SHE", activity=DEFAULT_ACTIVITY, temperature=25.0,
                  role: str = "anode", accept=None, materials=None, family=None, rank_by=None, weights=None,
                  catalog: Catalog | None = None) -> Scenario:
    """A checked :class:`Scenario`; every problem is an :class:`InputError` naming its field."""
    catalog = catalog or default_catalog()
    role = str(role).strip().lower()
    if role not in ROLES:
        raise InputError(f"role must be one of {', '.join(ROLES)} (given {role!r})", field="role")
    if accept is None:
        accept_tuple = DEFAULT_ACCEPT[role]
    else:
        accept_tuple = tuple(dict.fromkeys(str(a).strip().lower() for a in accept))
        if not accept_tuple:
            raise InputError(f"accept must name at least one of {', '.join(REGIONS)}", field="accept")
        unknown = [a for a in accept_tuple if a not in REGIONS]
        if unknown:
            raise InputError(f"accept: unknown region {unknown[0]!r}; allowed: {', '.join(REGIONS)}", field="accept")
    if materials is not None and family is not None:
        raise InputError("give either materials or family, not both", field="materials")
    if family is not None and family not in FAMILIES:
        raise InputError(f"unknown family {family!r}; allowed: {', '.join(FAMILIES)}", field="family")
    ids = None
    if materials is not None:
        if isinstance(materials, str) or not all(isinstance(m, str) for m in materials):
            raise InputError("materials must be a list of material ids", field="materials")
        if not materials:
            raise InputError("materials is empty: leave it out to screen every material", field="materials")
        ids = tuple(dict.fromkeys(material_id(catalog, m) for m in materials))
    temperature = check_temperature(temperature)
    window = operating_window(catalog.scales, ph, potential, scale, temperature, PlotLimits())
    return Scenario(
        ph=window.ph, potential=window.potential, window=window, scale=window.scale, activity=check_activity(activity),
        temperature=temperature, role=role, accept=accept_tuple, materials=ids, family=family,
        rank_by=check_order(rank_by) if rank_by is not None else DEFAULT_ORDER,
        weights=check_weights(weights) if weights else {},
    )


def material_id(catalog: Catalog, given: str) -> str:
    """The catalog id of a material (ids are case-insensitive), or an error listing the known ones."""
    for key in catalog.materials:
        if key.lower() == str(given).strip().lower():
            return key
    raise InputError(f"unknown material {given!r}; known materials: {', '.join(catalog.materials)}", field="materials")


def candidates(catalog: Catalog, scenario: Scenario) -> list[Material]:
    """The materials a scenario asks about."""
    if scenario.materials is not None:
        return [catalog.materials[m] for m in scenario.materials]
    chosen = [m for m in catalog.materials.values() if scenario.family in (None, m.family)]
    if not chosen:
        raise InputError(f"no material in family {scenario.family!r}", field="family")
    return chosen


@dataclass(frozen=True)
class Hazard:
    """Something a lab safety officer would flag: a toxic dissolved species (``kind`` "toxic") or a gas (``kind`` "gas")."""

    kind: str
    species: str
    note: str


def gas_evolution(window: OperatingWindow, water) -> tuple[Hazard, ...]:
    """Hazards from leaving the water-stability window: H2 below the H2 line, O2 above the O2 line."""
    below = [e < water.hydrogen(ph) - 1e-9 for ph, e in window.vertices]
    above = [e > water.oxygen(ph) + 1e-9 for ph, e in window.vertices]
    hazards = []
    if any(below):
        extent = "the whole window" if all(below) else "part of the window"
        hazards.append(Hazard("gas", "H2", f"hydrogen evolves over {extent}: flammable gas; ventilate"))
    if any(above):
        extent = "the whole window" if all(above) else "part of the window"
        hazards.append(Hazard("gas", "O2", f"oxygen evolves over {extent}; in chloride media chlorine (toxic) may form"))
    return tuple(hazards)


VERDICT_WORDS = ("acceptable", "partly acceptable", "rejected")
"""A row's verdict: the window lies wholly, partly or not at all in acceptable regions."""


@dataclass(frozen=True)
class ElementVerdict:
    """What the window meets on one element's diagram: shared by every material of that element."""

    pieces: tuple[Piece, ...]
    """Each species' share of the window, largest first."""
    fractions: dict[str, float]
    """Share of the window [0–1] in immunity, passivation and corrosion."""
    unacceptable_fraction: float
    """Share of the window [0–1] outside the accepted regions."""
    log10_dissolved: float | None
    """Largest equilibrium total dissolved metal over the window, log10 [mol/kg]; None without dissolved species."""
    dissolved_at: tuple[float, float] | None
    """(pH, E [V vs SHE]) where it occurs."""
    margin_v: float
    """Potential margin [V]: shift along E before meeting an unacceptable region (negative: needed to leave one)."""
    margin_capped: bool
    """True when the margin is limited by the diagram's own potential limits."""
    gas: tuple[Hazard, ...]
    gaps: list
    """Φ_i − min Φ [eV per metal atom] of each species i (rows) at each window corner (columns)."""
    diagram: Diagram
    accept: tuple[str, ...]

    @property
    def verdict(self) -> str:
        """One of :data:`VERDICT_WORDS`."""
        if self.unacceptable_fraction <= 1e-9:
            return VERDICT_WORDS[0]
        return VERDICT_WORDS[2] if self.unacceptable_fraction >= 1 - 1e-9 else VERDICT_WORDS[1]

    @cached_property
    def met(self) -> frozenset[str]:
        """The species the window meets: only their hazards are flagged."""
        return frozenset(p.species for p in self.pieces)


@dataclass(frozen=True)
class ScreenRow:
    """One candidate judged over the window; ``rank`` is set once the rows are ranked (0 before)."""

    material: Material
    judged: ElementVerdict
    """The verdict on the material's element, shared with the element's other materials."""
    window_dimension: int
    """2 for an area, 1 for a segment, 0 for a point."""
    instability_ev: float
    """Largest Φ of the material's own phase above the most stable state over the window [eV per metal atom]."""
    instability_at: tuple[float, float]
    """(pH, E [V vs SHE]) of the window corner where it occurs."""
    hazards: tuple[Hazard, ...]
    reason: str = ""
    """One line in plain words (``engine.ranking.reason``)."""
    rank: int = 0

    @property
    def id(self) -> str:
        return self.material.id

    @property
    def verdict(self) -> str:
        return self.judged.verdict

    @property
    def unacceptable_fraction(self) -> float:
        return self.judged.unacceptable_fraction

    @property
    def log10_dissolved(self) -> float | None:
        return self.judged.log10_dissolved

    @property
    def margin_v(self) -> float:
        return self.judged.margin_v

    @property
    def price_usd_per_kg(self) -> float | None:
        return self.material.price_usd_per_kg


@dataclass(frozen=True)
class ScreenResult:
    """The ranked answer to a scenario."""

    scenario: Scenario
    rule: str
    """The ranking rule in words."""
    rows: tuple[ScreenRow, ...]
    """Ranked, best first."""
    catalog_version: str
    conditions: str
    """The assumptions behind the result (temperature, pressures, activities), in words."""
    neutral_ph: float
    """pH of neutral water at the scenario's temperature."""
    temperature_notes: dict[str, tuple[str, ...]]
    """Per element, the approximations its species' ΔfG(T) used; empty at 25 °C."""

    @property
    def window(self) -> OperatingWindow:
        return self.scenario.window


class VerdictStore:
    """Element verdicts per question — (catalog, activity, temperature, window, accepted regions) — for
    the ``size`` questions asked most recently; safe to share between threads.

    The same question comes back often (the page, its CSV, the saved shortlist, every opening of a
    shared link), so a repeated screen reuses every verdict. The catalog is keyed by identity: a
    catalog overlay never shares verdicts with the built-in catalog.
    """

    def __init__(self, size: int):
        self.size = size
        self.computed = 0
        self._questions: OrderedDict[tuple, dict[str, ElementVerdict]] = OrderedDict()
        self._lock = Lock()

    def known(self, question: tuple) -> dict[str, "ElementVerdict"]:
        """The verdicts kept for ``question`` (a copy: element → verdict)."""
        with self._lock:
            kept = self._questions.get(question)
            if kept is None:
                return {}
            self._questions.move_to_end(question)
            return dict(kept)

    def keep(self, question: tuple, verdicts: dict[str, "ElementVerdict"]) -> None:
        """Add newly computed verdicts for ``question``, dropping the least recently asked questions beyond ``size``."""
        with self._lock:
            self.computed += len(verdicts)
            self._questions.setdefault(question, {}).update(verdicts)
            self._questions.move_to_end(question)
            while len(self._questions) > self.size:
                self._questions.popitem(last=False)

    def clear(self) -> None:
        with self._lock:
            self._questions.clear()
            self.computed = 0


VERDICTS = VerdictStore(size=64)
"""The engine's verdict store: the last 64 questions, each with up to one verdict per element (a verdict holds its
diagram, so a question under new conditions keeps a whole catalog of diagrams alive: about 0.8 MB, see bench/memory.py)."""


def judge_elements(catalog: Catalog, scenario: Scenario, elements: list[str]) -> dict[str, ElementVerdict]:
    """Region shares, largest dissolved metal, potential margin and gas evolution for each element.

    Verdicts already in :data:`VERDICTS` are reused; the others are computed together, every
    domain of every element clipped by the window in one pass (``engine.metrics.overlays``).
    """
    window = scenario.window
    accept = tuple(sorted(scenario.accept))
    question = (catalog, scenario.activity, scenario.temperature, window, accept)
    known = VERDICTS.known(question)
    missing = [element for element in elements if element not in known]
    if missing:
        diagrams = [diagram(element, scenario.activity, scenario.temperature, catalog=catalog) for element in missing]
        gas = gas_evolution(window, diagrams[0].water)
        computed = {}
        for element, result, overlay in zip(missing, diagrams, overlays(diagrams, window)):
            distance, capped = margin(overlay, result, window, set(accept))
            fractions = region_fractions(overlay.pieces)
            computed[element] = ElementVerdict(
                pieces=overlay.pieces, fractions=fractions,
                unacceptable_fraction=sum(v for k, v in fractions.items() if k not in accept),
                log10_dissolved=overlay.dissolved, dissolved_at=overlay.dissolved_at, margin_v=distance,
                margin_capped=capped, gas=gas, gaps=overlay.gaps, diagram=result, accept=accept)
        VERDICTS.keep(question, computed)
        known.update(computed)
    return {element: known[element] for element in elements}


def screen_material(material: Material, window: OperatingWindow, verdict: ElementVerdict) -> ScreenRow:
    """One candidate judged (unranked), given its element's verdict."""
    energy, energy_at = largest_gap(verdict.gaps[verdict.diagram.planes.index_of[material.phase]], window)
    toxic = tuple(Hazard("toxic", h.species, h.note) for h in material.hazards if h.species in verdict.met)
    row = ScreenRow(material=material, judged=verdict, window_dimension=window.dimension, instability_ev=energy,
                    instability_at=energy_at, hazards=toxic + verdict.gas)
    return replace(row, reason=reason(row))


def rule_text(scenario: Scenario) -> str:
    """The ranking rule in words, as shown beside the table."""
    if scenario.weights:
        parts = [f"{weight:g} × {key}" for key, weight in scenario.weights.items()]
        return "lowest weighted score first: " + " + ".join(parts) + " (each key scaled 0-1 across candidates)"
    return "Ranked by " + ", then ".join(RANK_KEYS[key] for key in scenario.rank_by) + "."


def screen(scenario: Scenario, catalog: Catalog | None = None) -> ScreenResult:
    """The ranked results of every candidate for ``scenario``."""
    catalog = catalog or default_catalog()
    chosen = candidates(catalog, scenario)
    verdicts = judge_elements(catalog, scenario, list(dict.fromkeys(m.element for m in chosen)))
    rows = [screen_material(m, scenario.window, verdicts[m.element]) for m in chosen]
    ranked = rank(rows, scenario.rank_by, scenario.weights or None)
    water = next(iter(verdicts.values())).diagram.water
    return ScreenResult(
        scenario=scenario, rule=rule_text(scenario),
        rows=tuple(replace(row, rank=position) for position, row in enumerate(ranked, start=1)),
        catalog_version=catalog.version, conditions=conditions_note(scenario.temperature),
        neutral_ph=water.neutral_ph,
        temperature_notes={} if scenario.temperature == 25.0 else {
            element: tuple(temperature_notes(catalog.systems[element].species, catalog)) for element in verdicts},
    )
