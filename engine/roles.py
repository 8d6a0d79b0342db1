"""Electrode roles as the trade knows them: what each asks of a material and how it ranks candidates.

Thermodynamic stability is necessary, not sufficient. An oxygen-evolving anode needs a stable,
conducting surface with a low oxygen overpotential (Trasatti 1984, Electrochim. Acta 29, 1503); a
hydrogen-evolving cathode the least hydrogen overpotential (Trasatti 1972, J. Electroanal. Chem. 39,
163); a deposition cathode the most (Pletcher & Walsh 1990); a working electrode the widest window
free of water's reactions (Bard & Faulkner 2001). Roles and their criteria, with words and sources,
live in ``data/roles.toml``.
"""

from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field, model_validator

from .catalog import builtin_data_dir
from .conduction import COMMON_PRACTICE
from .datafiles import read_toml, validate_rows
from .errors import CatalogError, InputError
from .kinetics import Kinetics
from .ordering import Prefer

__all__ = ["QUANTITIES", "Criterion", "Role", "check_role", "criterion_value", "load_roles", "roles"]

REGIONS = ("immunity", "passivation", "corrosion")

QUANTITIES = {
    "oxygen-onset": "oxygen_onset_v_rhe",
    "hydrogen-onset": "hydrogen_onset_v_rhe",
    "hydrogen-held-back": "hydrogen_onset_v_rhe",
    "window-width": "window_v",
}
"""Which :class:`~engine.kinetics.Kinetics` value each criterion reads [V]."""


class CriterionRow(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    name: Literal[tuple(QUANTITIES)]  # type: ignore[valid-type]
    words: str
    prefer: Literal["low", "high", "zero"]
    source: str


class RoleRow(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    name: str = Field(pattern=r"^[a-z][a-z-]*$")
    title: str
    accept: list[Literal[REGIONS]] = Field(min_length=1)  # type: ignore[valid-type]
    needs_conduction: bool
    keeps_phase: bool
    criterion: str | None = None
    description: str
    sources: list[str] = []
    common_practice: bool = False

    @model_validator(mode="after")
    def _one_origin(self) -> "RoleRow":
        if bool(self.sources) == self.common_practice:
            raise ValueError("give either sources or common_practice = true, not both and not neither")
        return self


@dataclass(frozen=True)
class Criterion:
    """A kinetic ranking criterion: its name, the words shown, what it prefers and its source key."""

    name: str
    words: str
    prefer: Prefer
    source: str


@dataclass(frozen=True)
class Role:
    """What a role asks: acceptable regions, a conducting surface, an unchanged phase, a kinetic criterion.

    ``sources`` are keys of ``data/sources.toml`` (or ``("common practice",)``).
    """

    name: str
    title: str
    accept: tuple[str, ...]
    needs_conduction: bool
    keeps_phase: bool
    criterion: Criterion | None
    description: str
    sources: tuple[str, ...]

    @property
    def rule(self) -> str:
        """The ranking rule in words."""
        first = "acceptable materials first (stable over the window" + (
            ", conducting surface" if self.needs_conduction else ", conducting bulk") + (
            ", unchanged phase" if self.keeps_phase else "") + ")"
        middle = [self.criterion.words] if self.criterion else []
        return "; then ".join([first, *middle, "least dissolved metal (levels at or below 10^-6 M count as equal)",
                               "lowest price"]) + "; unknowns last."


def load_roles(path: Path, sources: dict | None = None) -> dict[str, Role]:
    """Read ``roles.toml``: role name → :class:`Role`; criteria and source keys checked."""
    document = read_toml(path)
    criteria = {row.name: Criterion(row.name, row.words, row.prefer, row.source)
                for row in validate_rows(path, document.get("criterion", []), CriterionRow, "criterion")}
    table: dict[str, Role] = {}
    for row in validate_rows(path, document.get("role", []), RoleRow, "role"):
        where = f"{path}: role {row.name!r}"
        if row.name in table:
            raise CatalogError(f"{where}: field 'name': appears twice")
        if row.criterion is not None and row.criterion not in criteria:
            raise CatalogError(f"{where}: field 'criterion': unknown criterion {row.criterion!r}; "
                               f"known: {', '.join(criteria)}")
        keys = [*row.sources, *([criteria[row.criterion].source] if row.criterion else [])]
        unknown = [key for key in keys if sources is not None and key not in sources]
        if unknown:
            raise CatalogError(f"{where}: field 'sources': unknown source key {unknown[0]!r}")
        table[row.name] = Role(
            name=row.name, title=row.title, accept=tuple(row.accept), needs_conduction=row.needs_conduction,
            keeps_phase=row.keeps_phase, criterion=criteria.get(row.criterion) if row.criterion else None,
            description=row.description, sources=tuple(row.sources) or (COMMON_PRACTICE,))
    return table


@lru_cache(maxsize=4)
def roles(data_dir: Path | None = None) -> dict[str, Role]:
    """The roles of the built-in ``data/`` directory (or of ``data_dir``), read once, in file order."""
    base = Path(data_dir) if data_dir else builtin_data_dir()
    return load_roles(base / "roles.toml", read_toml(base / "sources.toml"))


def check_role(given, table: dict[str, Role] | None = None) -> Role:
    """The role called ``given`` (case and spaces ignored), or an :class:`InputError` naming ``role``.

    >>> check_role(" OER-Anode ").title
    'oxygen-evolving anode'
    """
    table = roles() if table is None else table
    name = str(given).strip().lower()
    if name not in table:
        raise InputError(f"role must be one of {', '.join(table)} (given {given!r})", field="role")
    return table[name]


def criterion_value(role: Role, kinetics: Kinetics) -> float | None:
    """The kinetic value [V] that ranks ``role`` (None when unknown or when the role has no criterion)."""
    if role.criterion is None:
        return None
    return getattr(kinetics, QUANTITIES[role.criterion.name])
