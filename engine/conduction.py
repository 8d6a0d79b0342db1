"""Does current pass through a surface? The electronic character of every solid phase of the catalog.

An electrode passes current only through a surface that conducts electrons. Thermodynamic
stability alone would crown the valve-metal oxides (TiO2, Ta2O5, ZrO2, ...), whose films block
anodic current: they are substrates for a conducting coating, not electrode surfaces (Lohrengel
1993, Mater. Sci. Eng. R 11, 243). Each phase is classed ``metal``, ``conducting`` (a compound that
conducts like a metal: RuO2, IrO2, PbO2, Fe3O4), ``semiconductor`` (passes current at a cost) or
``insulator`` in ``data/surfaces.toml``, each row with its source or marked common practice.
"""

from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, model_validator

from .catalog import Catalog, builtin_data_dir
from .datafiles import read_toml, validate_rows
from .errors import CatalogError

__all__ = ["CONDUCTIONS", "COMMON_PRACTICE", "Surface", "blocks_current", "governing_surface", "load_surfaces",
           "missing_surfaces", "surface_of", "surfaces"]

CONDUCTIONS = ("metal", "conducting", "semiconductor", "insulator")
"""Electronic characters, from most to least conducting."""

COMMON_PRACTICE = "common practice"
"""The source shown for a fact of the trade with no single source."""

REASONS = {
    "metal": "a metal: current passes freely",
    "conducting": "a conducting compound: current passes as through a metal",
    "semiconductor": "a semiconductor: current passes, at the cost of extra resistance that depends on doping and film thickness",
    "insulator": "an insulator: its film blocks current, so it is a substrate for a conducting coating, not an electrode surface",
}
"""Each character in plain words."""


class SurfaceRow(BaseModel):
    """One ``[[surface]]`` row of ``surfaces.toml``."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    phase: str
    conduction: Literal[CONDUCTIONS]  # type: ignore[valid-type]
    source: str | None = None
    common_practice: bool = False
    from_memory: bool = False
    note: str

    @model_validator(mode="after")
    def _one_origin(self) -> "SurfaceRow":
        if (self.source is None) == (not self.common_practice):
            raise ValueError("give either a source key or common_practice = true, not both and not neither")
        return self


@dataclass(frozen=True)
class Surface:
    """The electronic character of one phase [`conduction` one of :data:`CONDUCTIONS`] and where it comes from.

    ``source`` is a key of ``data/sources.toml`` or :data:`COMMON_PRACTICE`; ``note`` carries the figure
    (band gap [eV] or resistivity [ohm m]) behind the class.
    """

    phase: str
    conduction: str
    source: str
    note: str = ""
    from_memory: bool = False

    @property
    def passes_current(self) -> bool:
        """False only for an insulator."""
        return not blocks_current(self)

    @property
    def reason(self) -> str:
        """The phase's character in plain words."""
        return f"{self.phase} is {REASONS[self.conduction]}"


def blocks_current(surface: Surface) -> bool:
    """True when the surface is an insulator.

    >>> blocks_current(Surface("Ta2O5", "insulator", "lohrengel1993"))
    True
    """
    return surface.conduction == "insulator"


def load_surfaces(path: Path, sources: dict | None = None) -> dict[str, Surface]:
    """Read ``surfaces.toml``: phase name → :class:`Surface`; each phase once, each source key known."""
    document = read_toml(path)
    rows = validate_rows(path, document.get("surface", []), SurfaceRow, "surface")
    table: dict[str, Surface] = {}
    for row in rows:
        where = f"{path}: surface {row.phase!r}"
        if row.phase in table:
            raise CatalogError(f"{where}: field 'phase': appears twice")
        if sources is not None and row.source is not None and row.source not in sources:
            raise CatalogError(f"{where}: field 'source': unknown source key {row.source!r}")
        table[row.phase] = Surface(phase=row.phase, conduction=row.conduction,
                                   source=row.source or COMMON_PRACTICE, note=row.note, from_memory=row.from_memory)
    return table


@lru_cache(maxsize=4)
def surfaces(data_dir: Path | None = None) -> dict[str, Surface]:
    """The surfaces of the built-in ``data/`` directory (or of ``data_dir``), read once."""
    base = Path(data_dir) if data_dir else builtin_data_dir()
    sources = read_toml(base / "sources.toml")
    return load_surfaces(base / "surfaces.toml", sources)


def surface_of(phase: str, table: dict[str, Surface] | None = None) -> Surface:
    """The :class:`Surface` of ``phase`` (a species name as ``electrosieve sources EL`` shows it).

    >>> surface_of("RuO2").conduction
    'conducting'
    >>> surface_of("TiO2 (rutile)").passes_current
    False
    """
    table = surfaces() if table is None else table
    try:
        return table[phase]
    except KeyError:
        raise CatalogError(f"no electronic character known for {phase!r}: add it to data/surfaces.toml",
                           field="phase") from None


def governing_surface(found: list[Surface]) -> Surface:
    """Of the surfaces a window meets, the least conducting: it decides whether current passes everywhere."""
    if not found:
        raise ValueError("governing_surface needs at least one surface")
    return max(found, key=lambda s: CONDUCTIONS.index(s.conduction))


def missing_surfaces(catalog: Catalog, table: dict[str, Surface] | None = None) -> list[str]:
    """Names of the catalog's solid and liquid phases that have no row in ``surfaces.toml``."""
    table = surfaces() if table is None else table
    return [s.name for system in catalog.systems.values() for s in system.species
            if s.phase in ("solid", "liquid") and s.name not in table]
