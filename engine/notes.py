"""Notes where thermodynamics misleads: kinetic facts, the trade's practice and cautions, from ``data/notes.toml``.

A diagram says what may happen, not how fast: carbon "should" turn into methane at cathodic
potentials, yet it does not at any measurable rate (Kinoshita 1988); a valve metal's film passes
cathodic but not anodic current (Lohrengel 1993). Each rule in the data file names its conditions
and its source (or says common practice); a ``kinetic`` rule may waive species that then do not count
against the material.
"""

from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, model_validator

from .catalog import Catalog, builtin_data_dir
from .conduction import COMMON_PRACTICE
from .datafiles import Number, read_toml, validate_rows
from .errors import CatalogError

__all__ = ["KINDS", "Note", "NoteRule", "Situation", "load_notes", "note_rules", "notes_for", "waived_species"]

KINDS = ("kinetic", "practice", "caution")
"""Kinds of note: a reaction too slow to matter, the trade's practice, a hazard or failure mode."""


class NoteRule(BaseModel):
    """One ``[[note]]`` row: the note and the conditions under which it applies (all given ones must hold)."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    id: str
    kind: Literal[KINDS]  # type: ignore[valid-type]
    text: str
    source: str | None = None
    common_practice: bool = False
    from_memory: bool = False
    elements: tuple[str, ...] = ()
    families: tuple[str, ...] = ()
    roles: tuple[str, ...] = ()
    meets: tuple[str, ...] = ()
    regions: tuple[str, ...] = ()
    below_v_rhe: Number | None = None
    hydrogen_evolves: bool | None = None
    oxygen_evolves: bool | None = None
    anions: tuple[str, ...] = ()
    waives: tuple[str, ...] = ()

    @model_validator(mode="before")
    @classmethod
    def _lists_to_tuples(cls, values):
        if isinstance(values, dict):
            return {k: tuple(v) if isinstance(v, list) else v for k, v in values.items()}
        return values

    @model_validator(mode="after")
    def _checked(self) -> "NoteRule":
        if (self.source is None) == (not self.common_practice):
            raise ValueError("give either a source key or common_practice = true, not both and not neither")
        if self.waives and self.kind != "kinetic":
            raise ValueError("only a kinetic note may waive species")
        return self


@dataclass(frozen=True)
class Note:
    """A note shown with a result: ``kind`` (one of :data:`KINDS`), plain-words ``text`` and its ``source``
    (a key of ``data/sources.toml`` or ``"common practice"``)."""

    kind: str
    text: str
    source: str
    waives: tuple[str, ...] = ()


@dataclass(frozen=True)
class Situation:
    """What a note's conditions are tested against: one material in one role over one window.

    ``met_species`` and ``met_regions``: the species (and their regions) the window meets on the
    element's diagram; ``hydrogen_evolves`` / ``oxygen_evolves``: the window reaches past the H2 or O2
    line; ``highest_v_rhe``: the window's highest potential vs RHE [V]; ``anions``: ions the electrolyte
    is known to hold (e.g. ``"Cl^-"``).
    """

    element: str
    family: str
    role: str
    met_species: frozenset[str]
    met_regions: frozenset[str]
    hydrogen_evolves: bool
    oxygen_evolves: bool
    highest_v_rhe: float = 0.0
    anions: frozenset[str] = frozenset()


def load_notes(path: Path, sources: dict | None = None) -> tuple[NoteRule, ...]:
    """Read ``notes.toml``; each id once, each source key known."""
    rules = validate_rows(path, read_toml(path).get("note", []), NoteRule, "note")
    seen: set[str] = set()
    for rule in rules:
        where = f"{path}: note {rule.id!r}"
        if rule.id in seen:
            raise CatalogError(f"{where}: field 'id': appears twice")
        seen.add(rule.id)
        if sources is not None and rule.source is not None and rule.source not in sources:
            raise CatalogError(f"{where}: field 'source': unknown source key {rule.source!r}")
    return tuple(rules)


@lru_cache(maxsize=4)
def note_rules(data_dir: Path | None = None) -> tuple[NoteRule, ...]:
    """The note rules of the built-in ``data/`` directory (or of ``data_dir``), read once."""
    base = Path(data_dir) if data_dir else builtin_data_dir()
    return load_notes(base / "notes.toml", read_toml(base / "sources.toml"))


def _applies(rule: NoteRule, situation: Situation) -> bool:
    tests = [
        not rule.elements or situation.element in rule.elements,
        not rule.families or situation.family in rule.families,
        not rule.roles or situation.role in rule.roles,
        not rule.meets or bool(situation.met_species & set(rule.meets)),
        not rule.regions or bool(situation.met_regions & set(rule.regions)),
        rule.below_v_rhe is None or situation.highest_v_rhe < rule.below_v_rhe,
        rule.hydrogen_evolves is None or rule.hydrogen_evolves == situation.hydrogen_evolves,
        rule.oxygen_evolves is None or rule.oxygen_evolves == situation.oxygen_evolves,
        not rule.anions or bool(situation.anions & set(rule.anions)),
    ]
    return all(tests)


def notes_for(situation: Situation, rules: tuple[NoteRule, ...] | None = None) -> tuple[Note, ...]:
    """The notes whose conditions hold, in file order.

    >>> s = Situation("C", "carbon", "counter-electrode", frozenset({"CO2"}), frozenset({"corrosion"}), False, False, 0.5)
    >>> [n.kind for n in notes_for(s)]
    ['kinetic']
    """
    rules = note_rules() if rules is None else rules
    return tuple(Note(kind=r.kind, text=r.text, source=r.source or COMMON_PRACTICE, waives=r.waives)
                 for r in rules if _applies(r, situation))


CATALOG_KINDS = {"kinetic": "kinetic", "scope": "caution", "hazard": "caution"}
"""How a species file's note kinds (``Catalog.notes``) read beside a result: a kinetic note stays kinetic (and
waives its species); what the data leave out, or a hazard, is a caution."""


def element_notes(catalog: Catalog, element: str) -> tuple[Note, ...]:
    """The notes of ``element``'s species file (``Catalog.notes``) as result notes; a kinetic note waives its
    species (e.g. methane on carbon, Pourbaix 1966)."""
    return tuple(Note(kind=CATALOG_KINDS[n.kind], text=" ".join(n.text.split()), source=n.source,
                      waives=tuple(n.species) if n.kind == "kinetic" else ())
                 for n in catalog.notes(element))


def waived_species(notes: tuple[Note, ...]) -> frozenset[str]:
    """Species that the kinetic notes say do not count against the material."""
    return frozenset(name for note in notes if note.kind == "kinetic" for name in note.waives)
