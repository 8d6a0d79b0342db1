"""The judgement of one material in one role: stability, a conducting surface, kinetics, robustness, notes.

This is the one place the screen calls (``judge_all``, after its thermodynamic overlay): it takes what the
window meets on each element's exact diagram and answers, in typed values, whether a practitioner would
accept each material for the role and why. A material is acceptable when every species the window meets
(kinetically negligible ones waived) lies in a region the role accepts, its surface conducts where the
role passes current through it, and it keeps its own phase where the role asks that. Sources: roles
(``engine.roles``), surface conduction (``engine.conduction``), Tafel onsets (``engine.kinetics``), Monte
Carlo robustness (``engine.robustness``), notes (``engine.notes``).
"""

from dataclasses import dataclass

import numpy as np

from .conduction import Surface, governing_surface, surface_of
from .kinetics import DEFAULT_CURRENT_DENSITY, Kinetics, kinetics
from .materials import Material
from .notes import Note, Situation, notes_for, waived_species
from .ordering import dissolved_words, order_key, unknown_reason
from .planes import Planes
from .robustness import Question, Robustness, robustness_many, robustness_settings
from .roles import Role, criterion_value
from .water import WaterLines

__all__ = ["Conditions", "ElementState", "Judgement", "Met", "judge", "judge_all", "notes_of", "order_holds",
           "question_of", "rank_key"]

SHARE = 1e-9
"""Window shares below this count as none (the screen's tolerance on fractions)."""


@dataclass(frozen=True)
class Met:
    """One species the window meets on the element's diagram: its name, region and share of the window."""

    species: str
    region: str
    fraction: float


@dataclass(frozen=True)
class Judgement:
    """A material judged for a role over one window.

    ``surface``: the least conducting surface the window meets (it decides whether current passes);
    ``criterion_value``: the role's kinetic value [V] (None when unknown or none); ``log10_dissolved``
    [log10 M] and ``price_usd_per_kg`` carried for ranking; ``reasons`` in plain words, worst first.
    """

    material: str
    role: str
    acceptable: bool
    surface: Surface
    surfaces: tuple[Surface, ...]
    kinetics: Kinetics
    robustness: Robustness
    notes: tuple[Note, ...]
    reasons: tuple[str, ...]
    criterion_value: float | None
    log10_dissolved: float | None
    price_usd_per_kg: float | None


def _article(words: str) -> str:
    return "an" if words[:1].lower() in "aeiou" else "a"


def _surface(material: Material, name: str, phase: str) -> Surface:
    """A met species' surface: a solid or liquid is its own surface; where the metal dissolves or gasifies,
    the surface is the material's own phase, being consumed."""
    return surface_of(name) if phase in ("solid", "liquid") else surface_of(material.phase)


@dataclass(frozen=True, eq=False)
class ElementState:
    """What the window meets on one element's diagram (shared by the element's materials).

    ``met``: the species met with their regions and shares (e.g. the screen's ``metrics.Piece`` values);
    ``planes``: the element's Φ planes; ``log10_dissolved``: the largest equilibrium dissolved metal over
    the window [log10 M], None without dissolved species.
    """

    planes: Planes
    met: tuple[Met, ...]
    log10_dissolved: float | None
    notes: tuple[Note, ...] = ()
    """The element's own notes (``engine.notes.element_notes``); a kinetic one applies where its species is met."""

    @classmethod
    def of(cls, planes: Planes, pieces, log10_dissolved: float | None, notes: tuple[Note, ...] = ()) -> "ElementState":
        """From any objects with ``species``, ``region`` and ``fraction`` (shares at or below 1e-9 dropped)."""
        return cls(planes, tuple(Met(p.species, p.region, p.fraction) for p in pieces if p.fraction > SHARE),
                   log10_dissolved, notes)


@dataclass(frozen=True, eq=False)
class Conditions:
    """The cell shared by every material: the window's vertices [(pH, E vs SHE), …], its pH range, the water
    lines at the temperature, the current density for kinetic onsets [mA cm^-2] and the anions the
    electrolyte is known to hold (e.g. ``"Cl^-"``)."""

    corners: np.ndarray
    ph: tuple[float, float]
    water: WaterLines
    current_density_ma_cm2: float = DEFAULT_CURRENT_DENSITY
    anions: frozenset[str] = frozenset()


def notes_of(material: Material, role: Role, state: ElementState, conditions: Conditions) -> tuple[Note, ...]:
    """The notes that apply to ``material`` in ``role`` over the window: the element's own, then the rules of
    ``data/notes.toml`` (``engine.notes``)."""
    water, corners = conditions.water, np.asarray(conditions.corners, dtype=float).reshape(-1, 2)
    met = {m.species for m in state.met}
    own = tuple(n for n in state.notes if not n.waives or met & set(n.waives))
    return own + notes_for(Situation(
        element=material.element, family=material.family, role=role.name,
        met_species=frozenset(m.species for m in state.met), met_regions=frozenset(m.region for m in state.met),
        hydrogen_evolves=any(e < water.hydrogen(p) - 1e-9 for p, e in corners),
        oxygen_evolves=any(e > water.oxygen(p) + 1e-9 for p, e in corners),
        highest_v_rhe=max(e - water.hydrogen(p) for p, e in corners), anions=frozenset(conditions.anions)))


def _bulk_conducts(material: Material) -> bool:
    """Whether the material's own phase passes current (a role that carries current in the bulk needs it)."""
    return surface_of(material.phase).passes_current


def question_of(material: Material, role: Role, state: ElementState, notes: tuple[Note, ...]) -> Question:
    """The robustness question of one judgement: which species count against the material.

    A species counts when its region is not acceptable for the role, when it is an insulating film and
    the role passes current through the surface, or when it is not the material's own phase and the role
    keeps the phase; species waived by a kinetic note never count. Where the role carries current in the
    bulk and the material itself is an insulator, every species counts.
    """
    waived = waived_species(notes)
    against = set()
    for species in state.planes.species:
        name = species.name
        insulating = (role.needs_conduction and species.phase in ("solid", "liquid")
                      and not surface_of(name).passes_current)
        changed = role.keeps_phase and name != material.phase
        if species.region not in role.accept or insulating or changed:
            against.add(name)
    if not role.needs_conduction and not _bulk_conducts(material):  # no draw can make an insulator carry current
        against = {species.name for species in state.planes.species}
    return Question(state.planes, frozenset(against - waived))


def judge(material: Material, role: Role, state: ElementState, conditions: Conditions, *,
          robustness: Robustness | None = None, draws: int | None = None,
          notes: tuple[Note, ...] | None = None) -> Judgement:
    """Judge ``material`` for ``role`` over the window; ``robustness`` and ``notes`` may come precomputed from
    :func:`judge_all`'s single pass (else they are computed here, robustness with ``draws``)."""
    notes = notes_of(material, role, state, conditions) if notes is None else notes
    waived = waived_species(notes)
    phases = {s.name: s.phase for s in state.planes.species}
    counted = [m for m in state.met if m.species not in waived]
    surfaces = tuple(dict.fromkeys(_surface(material, m.species, phases[m.species]) for m in counted)) or (
        surface_of(material.phase),)  # only waived species met: the material's own surface stays
    surface = governing_surface(list(surfaces))

    reasons = []
    outside = [m for m in counted if m.region not in role.accept]
    for m in outside:
        verb = "dissolves as" if m.region == "corrosion" else ("stays metallic as" if m.region == "immunity" else
                                                              "forms")
        reasons.append(f"{verb} {m.species} over {100 * m.fraction:.0f}% of the window, "
                       f"not acceptable for {_article(role.title)} {role.title}")
    blocked = [s for s in surfaces if not s.passes_current] if role.needs_conduction else []
    if not role.needs_conduction and not _bulk_conducts(material):  # current crosses the bulk instead
        blocked.append(surface_of(material.phase))
    reasons += [s.reason for s in blocked]
    changed = [m for m in counted if m.species != material.phase] if role.keeps_phase else []
    if changed and not outside:
        shown = ", ".join(m.species for m in changed)
        reasons.append(f"{material.phase} does not stay as put in the cell: it turns into {shown} over the window")
    acceptable = not outside and not blocked and not changed

    water = conditions.water
    kinetic = kinetics(material.id, conditions.ph, conditions.current_density_ma_cm2,
                       oxygen_reversible_v_rhe=water.oxygen_intercept - water.hydrogen_intercept)
    value = criterion_value(role, kinetic)
    if role.criterion is not None and value is None:
        needed = {"oxygen-onset": ("oxygen",), "window-width": ("hydrogen", "oxygen")}.get(role.criterion.name,
                                                                                          ("hydrogen",))
        why = "; ".join(text.split(": ", 1)[1] for text in kinetic.unknown if text.split()[0] in needed)
        reasons.append(unknown_reason(role.criterion.name.replace("-", " "), why))
    log10_dissolved = state.log10_dissolved
    waived_dissolved = sorted(m.species for m in state.met if m.species in waived and phases[m.species] == "aqueous")
    if waived_dissolved:  # the equilibrium figure counts what the kinetic note sets aside
        log10_dissolved = None
        reasons.append(unknown_reason("dissolved metal", f"the equilibrium figure counts {', '.join(waived_dissolved)}, "
                                                         "which forms too slowly to matter"))
    elif log10_dissolved is None or log10_dissolved > -6:
        reasons.append(dissolved_words(log10_dissolved, material.element))

    if robustness is None:
        robustness = robustness_many([question_of(material, role, state, notes)], conditions.corners, draws=draws)[0]
    if robustness.verdict_probability < robustness_settings().fragile_below:
        reasons.append(f"fragile verdict: it holds in {100 * robustness.verdict_probability:.0f}% of "
                       f"{robustness.draws} draws within the data's uncertainties")
    reasons += [note.text for note in notes if note.kind == "kinetic"]
    return Judgement(material=material.id, role=role.name, acceptable=acceptable, surface=surface,
                     surfaces=surfaces, kinetics=kinetic, robustness=robustness, notes=notes, reasons=tuple(reasons),
                     criterion_value=value, log10_dissolved=log10_dissolved,
                     price_usd_per_kg=material.price_usd_per_kg)


def judge_all(materials: list[Material], role: Role, states: dict[str, ElementState], conditions: Conditions, *,
              draws: int | None = None) -> list[Judgement]:
    """:func:`judge` of every material (``states`` keyed by element), robustness in one vectorised pass."""
    notes = [notes_of(m, role, states[m.element], conditions) for m in materials]
    questions = [question_of(m, role, states[m.element], n) for m, n in zip(materials, notes)]
    results = robustness_many(questions, conditions.corners, draws=draws)
    return [judge(m, role, states[m.element], conditions, robustness=r, notes=n)
            for m, r, n in zip(materials, results, notes)]


NEGLIGIBLE_DISSOLVED_LOG10 = -6.0
"""Dissolved metal at or below 10^-6 M counts as none when ranking: the corrosion convention that draws the
immunity and passivation domains (Pourbaix 1966, ch. 3), so a practitioner's next question, price, decides."""


def rank_key(judgement: Judgement, role: Role) -> tuple:
    """Sort key: acceptable first, then the role's criterion, least dissolved metal (all levels at or below
    10^-6 M equal), lowest price, id; every unknown after every known value of its criterion
    (``engine.ordering``)."""
    criterion = order_key(judgement.criterion_value, role.criterion.prefer) if role.criterion else (0, 0.0)
    dissolved = judgement.log10_dissolved
    dissolved = None if dissolved is None else round(max(dissolved, NEGLIGIBLE_DISSOLVED_LOG10), 6)
    return (0 if judgement.acceptable else 1, criterion, order_key(dissolved, "low"),
            order_key(judgement.price_usd_per_kg, "low"), judgement.material.lower())


def _criterion_spread(judgement: Judgement, role: Role) -> float:
    """Standard uncertainty [V] of the role's kinetic value (0 where none is stated)."""
    k = judgement.kinetics
    hydrogen, oxygen = k.hydrogen_uncertainty_v or 0.0, k.oxygen_uncertainty_v or 0.0
    name = role.criterion.name
    return oxygen if name == "oxygen-onset" else (
        float(np.hypot(hydrogen, oxygen)) if name == "window-width" else hydrogen)


def order_holds(upper: Judgement, lower: Judgement, role: Role) -> bool:
    """Whether ``upper`` stays ranked above its neighbour ``lower`` within the data's uncertainties.

    Across the acceptable/rejected line, the order holds when both verdicts are robust (each holds in at
    least ``fragile_below`` of the draws); within one group, when the role's kinetic values differ by more
    than their combined standard uncertainty (GUM, JCGM 100:2008, eq. 10 for a difference). Orders set by
    the rule itself (unknown after known, dissolved metal, price) hold.
    """
    fragile = robustness_settings().fragile_below
    if upper.acceptable != lower.acceptable:
        return min(upper.robustness.verdict_probability, lower.robustness.verdict_probability) >= fragile
    if role.criterion is None or upper.criterion_value is None or lower.criterion_value is None:
        return True
    spread = float(np.hypot(_criterion_spread(upper, role), _criterion_spread(lower, role)))
    return abs(upper.criterion_value - lower.criterion_value) > spread
