"""The judgement of one material in one role: stability, a conducting surface, kinetics, robustness, notes.

This is the one place the screen calls per material (after its thermodynamic overlay): it takes what the
window meets on the element's exact diagram and answers, in typed values, whether a practitioner would
accept the material for the role and why. Sources: roles (``engine.roles``), surface conduction
(``engine.conduction``), Tafel onsets (``engine.kinetics``), Monte Carlo robustness
(``engine.robustness``), notes (``engine.notes``).
"""

from dataclasses import dataclass
from typing import Iterable

import numpy as np

from .conduction import Surface, governing_surface, surface_of
from .kinetics import DEFAULT_CURRENT_DENSITY, Kinetics, kinetics
from .materials import Material
from .notes import Note, Situation, notes_for, waived_species
from .ordering import dissolved_words, order_key, unknown_reason
from .planes import Planes
from .robustness import Robustness, robustness
from .roles import Role, criterion_value
from .water import WaterLines

__all__ = ["Judgement", "Met", "judge", "rank_key"]

SHARE = 1e-9
"""Window shares below this count as none (the screen's tolerance on fractions)."""

ROBUST = 0.9
"""A verdict that holds in fewer draws than this is called fragile in the reasons (common practice)."""


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


def judge(material: Material, role: Role, *, met: Iterable[Met], planes: Planes, corners, water: WaterLines,
          ph: tuple[float, float], log10_dissolved: float | None,
          current_density_ma_cm2: float = DEFAULT_CURRENT_DENSITY, anions: frozenset[str] = frozenset(),
          draws: int | None = None) -> Judgement:
    """Judge ``material`` for ``role``.

    ``met``: the species the window meets (from the screen's exact overlay, e.g. ``metrics.Piece``
    values); ``planes``: the element's Φ planes; ``corners``: the window's vertices [(pH, E vs SHE), …];
    ``water``: the water lines at the temperature; ``ph``: the window's pH range; ``log10_dissolved``:
    the largest equilibrium dissolved metal [log10 M] or None; ``current_density_ma_cm2`` [mA cm^-2];
    ``anions``: ions the electrolyte holds (e.g. ``"Cl^-"``).
    """
    met = tuple(Met(m.species, m.region, m.fraction) for m in met if m.fraction > SHARE)
    corners = np.asarray(corners, dtype=float).reshape(-1, 2)
    phases = {s.name: s.phase for s in planes.species}
    below_h2 = any(e < water.hydrogen(p) - 1e-9 for p, e in corners)
    above_o2 = any(e > water.oxygen(p) + 1e-9 for p, e in corners)
    highest_rhe = max(e - water.hydrogen(p) for p, e in corners)
    notes = notes_for(Situation(
        element=material.element, family=material.family, role=role.name,
        met_species=frozenset(m.species for m in met), met_regions=frozenset(m.region for m in met),
        hydrogen_evolves=below_h2, oxygen_evolves=above_o2, highest_v_rhe=highest_rhe, anions=frozenset(anions)))
    waived = waived_species(notes)
    counted = [m for m in met if m.species not in waived]
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
    blocked = []
    if role.needs_conduction:
        blocked = [s for s in surfaces if not s.passes_current]
        reasons += [s.reason for s in blocked]
    changed = [m for m in counted if m.species != material.phase] if role.keeps_phase else []
    if changed and not outside:
        shown = ", ".join(m.species for m in changed)
        reasons.append(f"{material.phase} does not stay as put in the cell: it turns into {shown} over the window")
    acceptable = not outside and not blocked and not changed

    kinetic = kinetics(material.id, ph, current_density_ma_cm2,
                       oxygen_reversible_v_rhe=water.oxygen_intercept - water.hydrogen_intercept)
    value = criterion_value(role, kinetic)
    if role.criterion is not None and value is None:
        needed = {"oxygen-onset": ("oxygen",), "window-width": ("hydrogen", "oxygen")}.get(role.criterion.name,
                                                                                          ("hydrogen",))
        why = "; ".join(text.split(": ", 1)[1] for text in kinetic.unknown if text.split()[0] in needed)
        reasons.append(unknown_reason(role.criterion.name.replace("-", " "), why))
    waived_dissolved = sorted(m.species for m in met if m.species in waived and phases[m.species] == "aqueous")
    if waived_dissolved:  # the equilibrium figure counts what the kinetic note sets aside
        log10_dissolved = None
        reasons.append(unknown_reason("dissolved metal", f"the equilibrium figure counts {', '.join(waived_dissolved)}, "
                                                         "which forms too slowly to matter"))
    elif log10_dissolved is None or log10_dissolved > -6:
        reasons.append(dissolved_words(log10_dissolved, material.element))

    insulating = {name for name, phase in phases.items() if phase in ("solid", "liquid")
                  and not surface_of(name).passes_current} if role.needs_conduction else set()
    others = {name for name in phases if name != material.phase} if role.keeps_phase else set()
    result = robustness(planes, corners, role.accept, blocking=frozenset((insulating | others) - waived),
                        waived=waived, verdict=None, draws=draws)
    if result.verdict_probability < ROBUST:
        reasons.append(f"fragile verdict: it holds in {100 * result.verdict_probability:.0f}% of "
                       f"{result.draws} draws within the data's uncertainties")
    reasons += [note.text for note in notes if note.kind == "kinetic"]
    return Judgement(material=material.id, role=role.name, acceptable=acceptable, surface=surface,
                     surfaces=surfaces, kinetics=kinetic, robustness=result, notes=notes, reasons=tuple(reasons),
                     criterion_value=value, log10_dissolved=log10_dissolved,
                     price_usd_per_kg=material.price_usd_per_kg)


def rank_key(judgement: Judgement, role: Role) -> tuple:
    """Sort key: acceptable first, then the role's criterion, least dissolved metal, lowest price, id;
    every unknown after every known value of its criterion (``engine.ordering``)."""
    criterion = order_key(judgement.criterion_value, role.criterion.prefer) if role.criterion else (0, 0.0)
    return (0 if judgement.acceptable else 1, criterion, order_key(judgement.log10_dissolved, "low"),
            order_key(judgement.price_usd_per_kg, "low"), judgement.material.lower())
