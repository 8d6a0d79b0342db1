"""Load and validate the data files: species, sources, reference scales, materials.

The built-in catalog lives in ``data/`` (installed as the ``electrosieve.data``
package); a user's own directory of the same layout may be laid over it.
Every problem is reported as a :class:`CatalogError` naming the file, the
entry and the field.
"""

import hashlib
from dataclasses import dataclass, field, replace
from functools import lru_cache
from importlib import resources
from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field, ValidationError, field_validator

from .datafiles import Number, describe, read_toml, validate_rows, validate_table
from .errors import CatalogError
from .lint import check_catalog
from .materials import load_materials
from .formula import FormulaError, parse_formula
from .species import PHASES, SOLVENT_ELEMENTS, Ligand, Species

LIGANDS_DIR = "ligands"
"""Folder of ``data/`` holding one file per ligand (chloride, sulfate, …)."""

WATER_FILE = "water.toml"
"""Species file holding H2O, H+, OH-, H2 and O2 (the solvent and its ions)."""


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True)


class SpeciesRow(_Strict):
    """One ``[[species]]`` row of a species file."""

    formula: str
    charge: int
    phase: Literal[PHASES]  # type: ignore[valid-type]
    dgf: Number = Field(description="standard Gibbs energy of formation at 298.15 K [kJ/mol]")
    source: str
    dhf: Number | None = Field(None, description="standard enthalpy of formation at 298.15 K [kJ/mol]")
    s: Number | None = Field(None, description="standard (conventional) entropy at 298.15 K [J/(mol K)]")
    cp: Number | None = Field(None, description="standard heat capacity at 298.15 K [J/(mol K)]")
    uncertainty: Number | None = Field(None, ge=0, description="uncertainty of dgf [kJ/mol]")
    from_memory: bool | None = None
    label: str | None = None
    note: str = ""

    @field_validator("formula")
    @classmethod
    def _formula_parses(cls, value: str) -> str:
        try:
            parse_formula(value)
        except FormulaError as error:
            raise ValueError(str(error)) from None
        return value


class SpeciesFile(_Strict):
    """A species file: one element system (or the water file)."""

    element: str
    from_memory: bool = False
    note: str = ""
    species: list[SpeciesRow] = Field(min_length=1)


class SourceRow(_Strict):
    """One bibliography entry of ``sources.toml``."""

    authors: str
    title: str
    year: int
    publication: str = ""
    table: str = ""
    doi: str = ""
    url: str = ""
    note: str = ""


class ScaleRow(_Strict):
    """One reference electrode of ``scales.toml``."""

    name: str
    potential: Number = Field(description="potential vs SHE at 25 °C [V]; 0 for the pH-dependent RHE")
    source: str
    ph_dependent: bool = False
    dE_dT: Number = Field(0.0, description="temperature coefficient [V/K]")
    t_min: Number = Field(0.0, description="lowest temperature of validity [°C]")
    t_max: Number = Field(150.0, description="highest temperature of validity [°C]")
    from_memory: bool = False
    note: str = ""



class LigandRow(SpeciesRow):
    """One ``[[species]]`` row of a ligand file: a species row with the metal system it joins."""

    element: str


@dataclass(frozen=True)
class LigandSet:
    """One ligand: the free ligand, its counting element's standard state, and its species per metal."""

    ligand: Ligand
    reference: Species
    species: dict[str, tuple[Species, ...]]
    path: str


def _ligand_file_species(path: Path, table: dict, entry: str, element: str) -> Species:
    try:
        row = SpeciesRow.model_validate(table)
    except ValidationError as error:
        raise CatalogError(describe(error, path, entry)) from None
    return Species.create(element, **{**row.model_dump(), "from_memory": bool(row.from_memory)})


def load_ligand_file(path: Path, systems: dict, sources: dict) -> LigandSet:
    """Read and check one ligand file against the metal ``systems`` and the bibliography ``sources``."""
    document = read_toml(path)
    counting = document.get("counting_element")
    if not isinstance(counting, str) or not isinstance(document.get("free"), dict) \
            or not isinstance(document.get("reference"), dict):
        raise CatalogError(f"{path}: needs 'counting_element', a [free] ligand and the element's [reference] state")
    reference = _ligand_file_species(path, document["reference"], "[reference]", counting)
    if reference.composition.keys() != {counting} or reference.dgf != 0.0:
        raise CatalogError(f"{path}: [reference]: field 'formula': the element {counting} in its standard state, dgf = 0")
    free = _ligand_file_species(path, document["free"], "[free]", counting)
    if counting not in free.composition or set(free.composition) - {counting, *SOLVENT_ELEMENTS}:
        raise CatalogError(f"{path}: [free]: field 'formula': must contain {counting} and otherwise only H and O")
    ligand = Ligand(species=free, counting_element=counting)
    by_metal: dict[str, list[Species]] = {}
    for index, row in enumerate(validate_rows(path, document.get("species", []), LigandRow, "species")):
        where = f"{path}: species #{index + 1} ({row.formula})"
        if row.element not in systems:
            raise CatalogError(f"{where}: field 'element': no species file for {row.element!r}")
        values = row.model_dump()
        element = values.pop("element")
        values["from_memory"] = bool(values["from_memory"])
        species = Species.create(element, ligand=ligand, **values)
        extra = set(species.composition) - {element, counting, *SOLVENT_ELEMENTS}
        if extra or species.metal_atoms < 1 or species.ligand_count < 1 \
                or species.composition[counting] % free.composition[counting]:
            raise CatalogError(f"{where}: field 'formula': must hold {element}, whole ligands {free.name} and "
                               "otherwise only H and O")
        if min(species.hydrogen_atoms, species.oxygen_atoms) < 0:
            raise CatalogError(f"{where}: field 'formula': fewer H or O atoms than its ligands hold")
        taken = {s.name for s in systems[element].species} | {s.name for s in by_metal.get(element, [])}
        if species.name in taken:
            raise CatalogError(f"{where}: {species.name!r} appears twice in the {element} system")
        by_metal.setdefault(element, []).append(species)
    for species in (reference, free, *(s for group in by_metal.values() for s in group)):
        if species.source not in sources:
            raise CatalogError(f"{path}: species {species.name!r}: field 'source': unknown source key "
                               f"{species.source!r} (add it to sources.toml)")
    return LigandSet(ligand=ligand, reference=reference, path=str(path),
                     species={element: tuple(group) for element, group in by_metal.items()})


def load_ligands(directory: Path, systems: dict, sources: dict) -> dict[str, LigandSet]:
    """Every ligand file of ``directory`` (none if it does not exist), keyed by the free ligand's name.

    A ligand file describes one ligand L: its free species (``Cl^-``), the standard state of the element
    counting it (Cl2 gas, for the temperature method of ``engine.thermo``) and ``[[species]]`` rows, each
    naming the metal system it joins. Those species join their metal's diagram only when the ligand's
    activity is given (``engine.diagram``). Another ligand is added by data alone: a new file.
    """
    ligands: dict[str, LigandSet] = {}
    for path in sorted(Path(directory).glob("*.toml")) if Path(directory).is_dir() else []:
        found = load_ligand_file(path, systems, sources)
        if found.ligand.name in ligands:
            raise CatalogError(f"{path}: ligand {found.ligand.name} is already described in {ligands[found.ligand.name].path}")
        ligands[found.ligand.name] = found
    return ligands


@dataclass(frozen=True)
class ElementSystem:
    """All species of one element, in file order."""

    element: str
    species: tuple[Species, ...]
    path: str = ""

    def find(self, name: str) -> Species:
        """The species called ``name`` (as shown to users), case-sensitive."""
        for candidate in self.species:
            if candidate.name == name:
                return candidate
        known = ", ".join(s.name for s in self.species)
        raise CatalogError(f"{self.element} has no species {name!r}; known: {known}", field="species")


@dataclass(frozen=True, eq=False)
class Catalog:
    """Everything loaded from a data directory (compared and hashed by identity, so it can key caches)."""

    systems: dict[str, ElementSystem]
    water: dict[str, Species]
    sources: dict[str, SourceRow]
    scales: dict[str, ScaleRow]
    materials: dict = field(default_factory=dict)
    version: str = ""
    ligands: dict = field(default_factory=dict)

    def system(self, element: str) -> ElementSystem:
        """The element system for ``element`` (case-insensitive), or a clear error listing the known ones."""
        found = _systems_by_lower_symbol(self).get(str(element).lower())
        if found is not None:
            return found
        known = ", ".join(sorted(self.systems))
        raise CatalogError(f"unknown element {element!r}; known elements: {known}", field="element")


@lru_cache(maxsize=16)
def _systems_by_lower_symbol(catalog: Catalog) -> dict[str, ElementSystem]:
    """The catalog's element systems keyed by lower-case symbol (catalogs hash by identity)."""
    return {symbol.lower(): system for symbol, system in catalog.systems.items()}


def load_species_file(path: Path) -> SpeciesFile:
    """Read and validate one species file."""
    document = read_toml(path)
    rows = validate_rows(path, document.pop("species", []), SpeciesRow, "species")
    try:
        return SpeciesFile.model_validate({**document, "species": rows})
    except ValidationError as error:
        raise CatalogError(describe(error, path, "file header")) from None


def _to_system(path: Path, parsed: SpeciesFile) -> ElementSystem:
    species = []
    for index, row in enumerate(parsed.species):
        values = row.model_dump()
        if values["from_memory"] is None:
            values["from_memory"] = parsed.from_memory
        species.append(Species.create(parsed.element, **values))
    return ElementSystem(element=parsed.element, species=tuple(species), path=str(path))


def _load_table(path: Path, model: type[BaseModel], entry_word: str) -> dict:
    return validate_table(path, read_toml(path), model, entry_word)


def builtin_data_dir() -> Path:
    """The built-in ``data/`` directory (from the checkout or the installed wheel)."""
    return Path(str(resources.files("electrosieve.data")))


def load_catalog(data_dir: Path | None = None, overlay: Path | None = None) -> Catalog:
    """Load a catalog from ``data_dir`` (built-in by default), with ``overlay``'s species files laid over it.

    A species file in ``overlay`` replaces the built-in system of the same
    element or adds a new one; the built-in files are never changed.
    """
    base = Path(data_dir) if data_dir else builtin_data_dir()
    if overlay is not None:
        overlay = Path(overlay)
        if not overlay.is_dir():
            raise CatalogError(f"--data {overlay}: not a directory", field="data")
    sources = _load_table(base / "sources.toml", SourceRow, "source")
    scales = _load_table(base / "scales.toml", ScaleRow, "scale")
    species_files = {path.name: path for path in sorted((base / "species").glob("*.toml"))}
    if overlay is not None:
        extra = sorted((overlay / "species").glob("*.toml")) + sorted(overlay.glob("*.toml"))
        if (overlay / "sources.toml").exists():
            sources = {**sources, **_load_table(overlay / "sources.toml", SourceRow, "source")}
        extra = [path for path in extra if path.name not in ("sources.toml", "scales.toml", "materials.toml")]
        if not extra:
            raise CatalogError(f"--data {overlay}: no species files (*.toml) found", field="data")
        for path in extra:
            species_files[path.name] = path
    systems: dict[str, ElementSystem] = {}
    water: dict[str, Species] = {}
    for name, path in species_files.items():
        parsed = load_species_file(path)
        system = _to_system(path, parsed)
        if name == WATER_FILE:
            water = {s.name: s for s in system.species}
        else:
            systems[parsed.element] = system
    ligands = load_ligands(base / LIGANDS_DIR, systems, sources)
    read = [base / "sources.toml", base / "scales.toml", base / "materials.toml", *species_files.values(),
            *(Path(found.path) for found in ligands.values())]
    if overlay is not None:
        read.append(overlay / "sources.toml")
    catalog = Catalog(systems=systems, water=water, sources=sources, scales=scales, version=_digest(read),
                      ligands=ligands)
    check_catalog(catalog)
    materials_path = base / "materials.toml"
    if materials_path.exists():
        catalog = replace(catalog, materials=load_materials(materials_path, catalog))
    return catalog


def _digest(paths: list[Path]) -> str:
    """A short digest of every data file a catalog was built from: the catalog's version."""
    digest = hashlib.sha256()
    for path in paths:
        if path.exists():
            digest.update(path.name.encode())
            digest.update(path.read_bytes())
    return digest.hexdigest()[:12]


@lru_cache(maxsize=1)
def default_catalog() -> Catalog:
    """The built-in catalog, loaded once per process."""
    return load_catalog()
