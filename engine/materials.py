"""Candidate electrode materials: an element system plus the phase put in the cell, with practical metadata."""

from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field

from .datafiles import Number, read_toml, validate_rows
from .errors import CatalogError

FAMILIES = ("noble", "platinum-group", "transition", "valve metal", "post-transition", "carbon", "oxide")
"""Families a material may belong to."""


class HazardRow(BaseModel):
    """A dissolved species a lab safety officer would flag, with the reason."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    species: str
    note: str


class MaterialRow(BaseModel):
    """A candidate the user can pick (one ``[[material]]`` row of ``materials.toml``); ``phase`` is the species it is made of."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)
    id: str = Field(pattern=r"^[A-Za-z][A-Za-z0-9_-]*$")
    name: str
    element: str
    phase: str = Field(description="the species (name as in the species file) put in the cell")
    family: Literal[FAMILIES]  # type: ignore[valid-type]
    price_usd_per_kg: Number | None = None
    price_year: int | None = None
    price_source: str | None = None
    abundance_mg_per_kg: Number | None = None
    abundance_source: str | None = None
    hazards: list[HazardRow] = []
    from_memory: bool = False
    note: str = ""


Material = MaterialRow
"""A loaded material is its validated row."""


def load_materials(path: Path, catalog, overlaid: dict[str, Path] | None = None) -> dict[str, Material]:
    """Read ``materials.toml`` and check each row against ``catalog`` (element, phase, source keys).

    ``overlaid`` maps each element whose species file a user's overlay replaced to that file: a material
    the overlay breaks is reported against the overlay file, its species and the field.
    """
    overlaid = overlaid or {}
    document = read_toml(path)
    rows = validate_rows(path, document.get("material", []), MaterialRow, "material")
    materials: dict[str, Material] = {}
    for row in rows:
        where = f"{path}: material {row.id!r}"
        if row.id.lower() in {key.lower() for key in materials}:
            raise CatalogError(f"{where}: field 'id': appears twice (ids are case-insensitive)")
        if row.element not in catalog.systems:
            raise CatalogError(f"{where}: field 'element': no species file for {row.element!r}")
        names = {s.name for s in catalog.systems[row.element].species}
        if row.element in overlaid:
            where = f"{overlaid[row.element]}: species {{}}: field 'formula': the built-in material {row.id!r} needs it"
            for needed in [row.phase, *(hazard.species for hazard in row.hazards)]:
                if needed not in names:
                    raise CatalogError(where.format(repr(needed)) + f" (known: {', '.join(sorted(names))})")
            where = f"{path}: material {row.id!r}"
        if row.phase not in names:
            raise CatalogError(f"{where}: field 'phase': {row.phase!r} is not a species of {row.element}")
        for key_field in ("price_source", "abundance_source"):
            key = getattr(row, key_field)
            if key is not None and key not in catalog.sources:
                raise CatalogError(f"{where}: field {key_field!r}: unknown source key {key!r}")
        for hazard in row.hazards:
            if hazard.species not in names:
                raise CatalogError(f"{where}: field 'hazards': {hazard.species!r} is not a species of {row.element}")
        materials[row.id] = row
    return materials
