"""Read the data of materials of several elements: mixed compounds (``data/compounds.toml``), alloy
materials, their mixing terms and atomic weights (``data/alloys.toml``); every row checked against the catalog.

A compound row has the fields of a species row (``engine.catalog.SpeciesRow``); its composition across
elements comes from its formula. Alloy compositions given by mass are turned into atom fractions with the
standard atomic weights: x_i = (w_i/M_i) / Σ_j (w_j/M_j).
"""

from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field

from .catalog import Catalog, SpeciesRow, builtin_data_dir, default_catalog
from .datafiles import Number, read_toml, validate_rows
from .errors import CatalogError
from .mixing import Interaction
from .species import SOLVENT_ELEMENTS, Species

__all__ = ["AlloyData", "AlloyRow", "alloy_data", "load_alloy_data", "atom_fractions"]

COMPOUNDS_FILE = "compounds.toml"
ALLOYS_FILE = "alloys.toml"


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)


class InteractionRow(_Strict):
    """One ``[[interaction]]`` row: Redlich–Kister terms of a binary metallic solution."""

    class Term(_Strict):
        a: Number = Field(description="temperature-independent part of L_v [J/mol]")
        b: Number = Field(0.0, description="temperature coefficient of L_v [J/(mol K)]")

    elements: list[str] = Field(min_length=2, max_length=2)
    parameters: list[Term] = Field(min_length=1)
    source: str
    uncertainty: Number | None = Field(None, ge=0, description="uncertainty of L_0 [J/mol]")
    from_memory: bool = False
    note: str = ""


class AtomicWeights(_Strict):
    """The ``[atomic_weights]`` table: element → g/mol, with its source."""

    source: str
    values: dict[str, Number]
    note: str = ""


class AlloyRow(_Strict):
    """A material of several elements (one ``[[alloy]]`` row); ``composition`` in percent by ``basis``."""

    id: str = Field(pattern=r"^[A-Za-z][A-Za-z0-9_-]*$")
    name: str
    designation: str
    family: str
    basis: Literal["mass", "mole"]
    composition: dict[str, Number] = Field(min_length=1)
    composition_source: str
    mixing: Literal["ideal", "none"]
    stability: Literal["thermodynamic", "kinetic"] = "thermodynamic"
    substrate: str | None = None
    substrate_source: str | None = None
    window_note: str = ""
    window_source: str | None = None
    note: str = ""


@dataclass(frozen=True, eq=False)
class AlloyData:
    """Mixed compounds, mixing terms, atomic weights and the materials of several elements (hashed by identity, so it can key caches)."""

    compounds: tuple[Species, ...]
    interactions: tuple[Interaction, ...]
    atomic_weights: dict[str, float]
    alloys: dict[str, AlloyRow] = field(default_factory=dict)

    def composition_of(self, material_id: str) -> dict[str, float]:
        """Atom fractions of the material ``material_id`` (case-insensitive)."""
        row = self.alloy(material_id)
        return atom_fractions(row.composition, row.basis, self.atomic_weights)

    def alloy(self, material_id: str) -> AlloyRow:
        """The row of ``material_id`` (case-insensitive), or an error listing the known ids."""
        for key, row in self.alloys.items():
            if key.lower() == str(material_id).lower():
                return row
        raise CatalogError(f"unknown material {material_id!r}; materials of several elements: "
                           f"{', '.join(self.alloys)}", field="material")


def atom_fractions(composition: dict[str, float], basis: str, atomic_weights: dict[str, float]) -> dict[str, float]:
    """Atom fractions from percentages by mass or by atoms, in the given element order.

    >>> atom_fractions({"Fe": 50.0, "Ni": 50.0}, "mass", {"Fe": 55.845, "Ni": 58.693})["Fe"] > 0.5
    True
    """
    if basis == "mass":
        amounts = {element: value / atomic_weights[element] for element, value in composition.items()}
    else:
        amounts = dict(composition)
    total = sum(amounts.values())
    return {element: amount / total for element, amount in amounts.items()}


def _compound(path: Path, row: SpeciesRow, catalog: Catalog) -> Species:
    values = row.model_dump()
    values["from_memory"] = bool(values["from_memory"])
    probe = Species.create("?", **values)
    metals = [element for element in probe.composition if element not in SOLVENT_ELEMENTS]
    where = f"{path}: compound {probe.name!r}"
    unknown = [element for element in metals if element not in catalog.systems]
    if unknown:
        raise CatalogError(f"{where}: field 'formula': no species file for {', '.join(unknown)}")
    if len(metals) < 2:
        raise CatalogError(f"{where}: field 'formula': a compound holds two or more metals (one element belongs "
                           "in data/species)")
    if row.source not in catalog.sources:
        raise CatalogError(f"{where}: field 'source': unknown source key {row.source!r}")
    return Species.create(metals[0], **values)


def _check_key(catalog: Catalog, where: str, name: str, key: str | None) -> None:
    if key is not None and key not in catalog.sources:
        raise CatalogError(f"{where}: field {name!r}: unknown source key {key!r}")


def load_alloy_data(catalog: Catalog, data_dir: Path | None = None) -> AlloyData:
    """Read and check ``compounds.toml`` and ``alloys.toml`` of ``data_dir`` (built-in by default) against ``catalog``."""
    base = Path(data_dir) if data_dir else builtin_data_dir()
    compounds_path, alloys_path = base / COMPOUNDS_FILE, base / ALLOYS_FILE
    compounds = []
    if compounds_path.exists():
        rows = validate_rows(compounds_path, read_toml(compounds_path).get("compound", []), SpeciesRow, "compound")
        compounds = [_compound(compounds_path, row, catalog) for row in rows]
        names = [c.name for c in compounds]
        if len(set(names)) != len(names):
            raise CatalogError(f"{compounds_path}: a compound appears twice; give polymorphs a 'label'")
    if not alloys_path.exists():
        return AlloyData(compounds=tuple(compounds), interactions=(), atomic_weights={})
    document = read_toml(alloys_path)
    weights = AtomicWeights.model_validate(document.get("atomic_weights", {"source": "", "values": {}}))
    _check_key(catalog, f"{alloys_path}: [atomic_weights]", "source", weights.source)
    interactions = []
    for row in validate_rows(alloys_path, document.get("interaction", []), InteractionRow, "interaction"):
        where = f"{alloys_path}: interaction {'-'.join(row.elements)}"
        _check_key(catalog, where, "source", row.source)
        for element in row.elements:
            if element not in catalog.systems:
                raise CatalogError(f"{where}: field 'elements': no species file for {element!r}")
        interactions.append(Interaction(elements=tuple(row.elements), terms=tuple((t.a, t.b) for t in row.parameters),
                                        source=row.source, uncertainty=row.uncertainty,
                                        from_memory=row.from_memory, note=row.note))
    alloys: dict[str, AlloyRow] = {}
    single_ids = {key.lower() for key in catalog.materials}
    for row in validate_rows(alloys_path, document.get("alloy", []), AlloyRow, "alloy"):
        where = f"{alloys_path}: alloy {row.id!r}"
        if row.id.lower() in single_ids | {key.lower() for key in alloys}:
            raise CatalogError(f"{where}: field 'id': already used (ids are case-insensitive, shared with materials.toml)")
        for element, value in row.composition.items():
            if element not in catalog.systems:
                raise CatalogError(f"{where}: field 'composition': no species file for {element!r}")
            if value <= 0:
                raise CatalogError(f"{where}: field 'composition': {element} must be a positive percentage")
            if row.basis == "mass" and element not in weights.values:
                raise CatalogError(f"{where}: field 'composition': no atomic weight for {element!r}")
        if abs(sum(row.composition.values()) - 100.0) > 1e-6:
            raise CatalogError(f"{where}: field 'composition': percentages must add up to 100 "
                               f"(given {sum(row.composition.values()):g})")
        if row.substrate is not None and row.substrate not in catalog.systems:
            raise CatalogError(f"{where}: field 'substrate': no species file for {row.substrate!r}")
        for name in ("composition_source", "substrate_source", "window_source"):
            _check_key(catalog, where, name, getattr(row, name))
        if row.stability == "kinetic" and not (row.window_note and row.window_source):
            raise CatalogError(f"{where}: field 'window_note': a kinetically stable material needs its window and source")
        alloys[row.id] = row
    return AlloyData(compounds=tuple(compounds), interactions=tuple(interactions),
                     atomic_weights=dict(weights.values), alloys=alloys)


@lru_cache(maxsize=16)
def alloy_data(catalog: Catalog | None = None) -> AlloyData:
    """The built-in alloy data checked against ``catalog`` (the built-in catalog by default), loaded once."""
    return load_alloy_data(catalog or default_catalog())
