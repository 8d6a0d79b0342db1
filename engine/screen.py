"""Screen candidate materials against a cell's operating window and rank them.

A scenario gives the pH (point or range), the potential (point or range) on a
reference scale, the dissolved-ion activity, the temperature, the electrode's
role (``engine.roles``) and what counts as acceptable. Every candidate is judged on its
element's exact diagram (``engine.metrics``), then for its role: surface conduction, kinetic
onsets, robustness and notes (``engine.judgement``), and ranked by the role's rule or a rule
the user gives (``engine.ranking``).
"""

from collections import OrderedDict
from dataclasses import dataclass, field, replace
from functools import cached_property
from threading import Lock

from .catalog import Catalog, default_catalog
from .chloride import pitting_caution
from .diagram import Diagram, diagram
from .domains import PlotLimits
from .errors import InputError
from .inputs import DEFAULT_ACTIVITY, check_activity, check_number, check_temperature
from .conduction import Surface
from .judgement import Conditions, ElementState, Judgement, judge_all, order_holds, rank_key
from .kinetics import CURRENT_DENSITY_RANGE, DEFAULT_CURRENT_DENSITY, Kinetics
from .materials import FAMILIES, Material
from .metrics import Piece, largest_gap, margin, overlays, region_fractions
from .notes import Note, element_notes
from .ordering import dissolved_words, unknown_reason
from .ranking import RANK_KEYS, check_order, check_weights, rank, reason
from .robustness import Robustness
from .roles import Role, check_role, roles
from .solution import Solution, make_solution
from .thermo import temperature_notes
from .water import conditions_note
from .window import OperatingWindow, operating_window

ROLES = tuple(roles())
"""The electrode roles of ``data/roles.toml``; each role's accepted regions are its default ``accept``."""
REGIONS = ("immunity", "passivation", "hydride", "corrosion")


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
    rank_by: tuple[str, ...] = ()
    """A ranking order the user chose; empty means the role's own rule (``engine.judgement.rank_key``)."""
    weights: dict = field(default_factory=dict)
    solution: Solution = Solution()
    """The electrolyte recipe, per-ion and ligand activities and the warnings they raised (``engine.solution``)."""
    current_density_ma_cm2: float = DEFAULT_CURRENT_DENSITY
    """Current density at which the kinetic onsets are read [mA cm^-2]."""

    @property
    def judged_role(self) -> Role:
        """The role with the scenario's accepted regions."""
        return replace(check_role(self.role), accept=self.accept)


def make_scenario(*, ph=None, potential, scale: str = "SHE", activity=DEFAULT_ACTIVITY, temperature=25.0,
                  role: str = "anode", accept=None, materials=None, family=None, rank_by=None, weights=None,
                  catalog: Catalog | None = None, electrolyte: str | None = None, ion_activities=None,
                  chloride=None, current_density=DEFAULT_CURRENT_DENSITY) -> Scenario:
    """A checked :class:`Scenario`; every problem is an :class:`InputError` naming its field.

    Without ``ph`` the ``electrolyte`` recipe's computed pH at the temperature is used (a point).
    """
    catalog = catalog or default_catalog()
    chosen_role = check_role(role)
    if accept is None:
        accept_tuple = chosen_role.accept
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
    solution = make_solution(catalog=catalog, temperature_c=temperature, ph=_given_ph(ph),
                             electrolyte=electrolyte, ion_activities=ion_activities, chloride=chloride)
    if ph is None:
        if solution.electrolyte is None:
            raise InputError("ph is required (a number or a range), unless an electrolyte recipe gives it", field="ph")
        ph = solution.electrolyte.ph
    window = operating_window(catalog.scales, ph, potential, scale, temperature, PlotLimits())
    return Scenario(
        ph=window.ph, potential=window.potential, window=window, scale=window.scale, activity=check_activity(activity),
        temperature=temperature, role=chosen_role.name, accept=accept_tuple, materials=ids, family=family,
        rank_by=check_order(rank_by) if rank_by else (),
        weights=check_weights(weights) if weights else {}, solution=solution,
        current_density_ma_cm2=check_number(current_density, "current_density", *CURRENT_DENSITY_RANGE,
                                            what=" mA cm^-2"),
    )


def _given_ph(ph):
    """A given pH as numbers to check for the warnings, or None when it is left out or not yet checked numbers
    (``operating_window`` then names the problem)."""
    values = [ph] if isinstance(ph, (int, float)) else (list(ph) if isinstance(ph, (list, tuple)) else [])
    if not values or len(values) > 2 or not all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in values):
        return None
    if not all(-1e3 < float(v) < 1e3 for v in values):
        return None
    return float(values[0]) if len(values) == 1 else (float(values[0]), float(values[-1]))


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
    """One line in plain words (``engine.ranking.reason``), the role's reasons first."""
    rank: int = 0
    caution: str | None = None
    """Pitting in chloride, in plain words, when the window meets a passive region (``engine.chloride``)."""
    surface: Surface | None = None
    """The least conducting surface the window meets (it decides whether current passes)."""
    kinetics: Kinetics | None = None
    """The material's own hydrogen and oxygen onsets vs RHE at the scenario's current density."""
    robustness: Robustness | None = None
    """How often the verdict holds when the Gibbs energies vary within their uncertainties."""
    notes: tuple[Note, ...] = ()
    """Kinetic, practice and caution notes where thermodynamics alone misleads."""
    acceptable: bool | None = None
    """The role's judgement (``engine.judgement``): stable, conducting and unchanged where the role asks it."""
    order_robust: bool | None = None
    """False when this row's place above the next one could swap within the data's uncertainties; None for the last."""
    dissolved_unknown: bool = False
    """True when the element's equilibrium figure counts species a kinetic note sets aside (carbon's CO2), or the
    data hold no dissolved species: the dissolved metal is unknown, never best."""

    @property
    def id(self) -> str:
        return self.material.id

    @property
    def verdict(self) -> str:
        """The element's verdict, overruled by the role's judgement: a blocking film or a changed phase rejects,
        a kinetically waived species does not count."""
        if self.acceptable is None:
            return self.judged.verdict
        if self.acceptable:
            return VERDICT_WORDS[0]
        if self.judged.verdict == VERDICT_WORDS[1] and (self.surface is None or self.surface.passes_current):
            return VERDICT_WORDS[1]
        return VERDICT_WORDS[2]

    @property
    def unacceptable_fraction(self) -> float:
        return self.judged.unacceptable_fraction

    @property
    def log10_dissolved(self) -> float | None:
        """Largest equilibrium dissolved metal over the window [log10 mol/kg]; None where unknown."""
        return None if self.dissolved_unknown else self.judged.log10_dissolved

    @property
    def margin_v(self) -> float:
        return self.judged.margin_v

    @property
    def price_usd_per_kg(self) -> float | None:
        return self.material.price_usd_per_kg

    @property
    def dissolved_text(self) -> str:
        """The dissolved metal in words: "dissolves freely (> 1 M)" above 1 M; "unknown" and why where unknown."""
        if self.dissolved_unknown and self.judged.log10_dissolved is not None:
            return unknown_reason("dissolved metal", "the equilibrium figure counts species that form too slowly to matter")
        return dissolved_words(self.log10_dissolved, self.material.element)


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
    warnings: tuple[str, ...] = ()
    """Doubtful conditions in plain words: the pH water allows, the recipe's model range, pitting in chloride."""

    @property
    def window(self) -> OperatingWindow:
        return self.scenario.window


class VerdictStore:
    """Element verdicts per question — (catalog, activity, temperature, window, accepted regions, ion and
    ligand activities) — for
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
    solution = scenario.solution
    question = (catalog, scenario.activity, scenario.temperature, window, accept, solution.ion_activities,
                solution.ligand_activities)
    known = VERDICTS.known(question)
    missing = [element for element in elements if element not in known]
    if missing:
        diagrams = [diagram(element, scenario.activity, scenario.temperature, catalog=catalog,
                            **solution.diagram_arguments()) for element in missing]
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


def screen_material(material: Material, window: OperatingWindow, verdict: ElementVerdict,
                    chloride: float | None = None) -> ScreenRow:
    """One candidate judged (unranked), given its element's verdict and the free chloride activity."""
    energy, energy_at = largest_gap(verdict.gaps[verdict.diagram.planes.index_of[material.phase]], window)
    toxic = tuple(Hazard("toxic", h.species, h.note) for h in material.hazards if h.species in verdict.met)
    row = ScreenRow(material=material, judged=verdict, window_dimension=window.dimension, instability_ev=energy,
                    instability_at=energy_at, hazards=toxic + verdict.gas,
                    caution=pitting_caution("passivation" if verdict.fractions.get("passivation", 0.0) > 0 else "",
                                            material.element, chloride))
    return replace(row, reason=reason(row))


def rule_text(scenario: Scenario) -> str:
    """The ranking rule in words, as shown beside the table."""
    if scenario.weights:
        parts = [f"{weight:g} × {key}" for key, weight in scenario.weights.items()]
        return "lowest weighted score first: " + " + ".join(parts) + " (each key scaled 0-1 across candidates)"
    if not scenario.rank_by:
        role = scenario.judged_role
        return f"Ranked as {_article(role.title)} {role.title}: {role.rule}"
    return "Ranked by " + ", then ".join(RANK_KEYS[key] for key in scenario.rank_by) + "."


def _article(words: str) -> str:
    return "an" if words[:1].lower() in "aeiou" else "a"


def judge_rows(rows: list[ScreenRow], scenario: Scenario, catalog: Catalog,
               verdicts: dict[str, ElementVerdict]) -> list[tuple[ScreenRow, Judgement]]:
    """Each row judged for the scenario's role (``engine.judgement.judge_all``, robustness in one pass), its
    surface, kinetics, robustness, notes and acceptability filled in and the role's reasons put first."""
    states = {element: ElementState.of(v.diagram.planes, v.pieces,
                                       None if catalog.lacks_dissolved(element) else v.log10_dissolved,
                                       element_notes(catalog, element))
              for element, v in verdicts.items()}
    window = scenario.window
    conditions = Conditions(window.vertices, window.ph, next(iter(verdicts.values())).diagram.water,
                            scenario.current_density_ma_cm2)
    judgements = judge_all([row.material for row in rows], scenario.judged_role, states, conditions)
    judged = []
    for row, j in zip(rows, judgements):
        row = replace(row, surface=j.surface, kinetics=j.kinetics, robustness=j.robustness, notes=j.notes,
                      acceptable=j.acceptable, dissolved_unknown=j.log10_dissolved is None)
        said = dissolved_words(row.log10_dissolved) if row.log10_dissolved is not None else None
        reasons = [text for text in j.reasons if text != said]  # the row's own line says it
        judged.append((replace(row, reason="; ".join([*reasons, reason(row)])), j))
    return judged


def role_order(judged: list[tuple[ScreenRow, Judgement]], role: Role) -> list[ScreenRow]:
    """Rows in the role's order (``engine.judgement.rank_key``); after the acceptable ones, partly acceptable
    before rejected, the least unacceptable share of the window first. Each row's ``order_robust`` says whether
    its place above the next one holds."""
    def key(pair):
        row, judgement = pair
        first, *rest = rank_key(judgement, role)
        return (first, VERDICT_WORDS.index(row.verdict), 0.0 if judgement.acceptable else round(row.unacceptable_fraction, 9),
                *rest)

    ordered = sorted(judged, key=key)
    return [replace(row, order_robust=order_holds(j, below[1], role) if below else None)
            for (row, j), below in zip(ordered, [*ordered[1:], None])]


def screen(scenario: Scenario, catalog: Catalog | None = None) -> ScreenResult:
    """The ranked results of every candidate for ``scenario``."""
    catalog = catalog or default_catalog()
    chosen = candidates(catalog, scenario)
    verdicts = judge_elements(catalog, scenario, list(dict.fromkeys(m.element for m in chosen)))
    chloride = scenario.solution.chloride
    rows = [screen_material(m, scenario.window, verdicts[m.element], chloride) for m in chosen]
    judged = judge_rows(rows, scenario, catalog, verdicts)
    if scenario.rank_by or scenario.weights:
        ranked = rank([row for row, _ in judged], scenario.rank_by, scenario.weights or None)
    else:
        ranked = role_order(judged, scenario.judged_role)
    water = next(iter(verdicts.values())).diagram.water
    return ScreenResult(
        scenario=scenario, rule=rule_text(scenario),
        rows=tuple(replace(row, rank=position) for position, row in enumerate(ranked, start=1)),
        catalog_version=catalog.version, conditions=conditions_note(scenario.temperature),
        neutral_ph=water.neutral_ph,
        temperature_notes={} if scenario.temperature == 25.0 else {
            element: tuple(temperature_notes(catalog.systems[element].species, catalog)) for element in verdicts},
        warnings=scenario.solution.warnings + pitting_warning(rows, chloride),
    )


def pitting_warning(rows: list[ScreenRow], chloride: float | None) -> tuple[str, ...]:
    """One line naming the candidates judged passive in chloride (each row's ``caution`` says more)."""
    passive = [row.id for row in rows if row.caution]
    if not passive:
        return ()
    return (f"chloride (activity {chloride:.2g}) can pit the passive films of {', '.join(passive)}: "
            "passive here does not mean safe in chloride; see each row's caution",)
