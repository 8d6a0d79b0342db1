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

WATER_SPECIES_FILE = "water.toml"
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


NO_DISSOLVED = "none in data"
"""A species file's ``dissolved_species`` flag: the sources give no dissolved species of the element, so
how much of it dissolves is unknown (never "nothing dissolves")."""

NOTE_KINDS = ("kinetic", "scope", "hazard")
"""Kinds of file-level notes: a kinetic caveat on a thermodynamic prediction, what the system leaves out, a hazard."""


class NoteRow(_Strict):
    """One ``[[notes]]`` entry of a species file: a fact about the system that is not a number."""

    kind: Literal[NOTE_KINDS]  # type: ignore[valid-type]
    text: str = Field(min_length=1)
    source: str
    species: list[str] = Field(default_factory=list, description="species names the note is about")


class SpeciesFile(_Strict):
    """A species file: one element system (or the water file)."""

    element: str
    from_memory: bool = False
    note: str = ""
    dissolved_species: Literal[NO_DISSOLVED] | None = None  # type: ignore[valid-type]
    unchecked: list[str] = Field(default_factory=list, description="species with no independent cross-check")
    notes: list[NoteRow] = Field(default_factory=list)
    species: list[SpeciesRow] = Field(min_length=1)


class UncertaintyClass(_Strict):
    """A default uncertainty of dgf for rows that state none (``data/uncertainty.toml``)."""

    uncertainty: Number = Field(gt=0, description="uncertainty of dgf [kJ/mol]")
    basis: str = Field(min_length=1)
    source: str = ""
    sources: list[str] = Field(default_factory=list, description="source keys of the compilations in this class")


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


def _with_uncertainty(values: dict, classes: dict) -> dict:
    """A ligand row's values with ``from_memory`` a bool and a missing uncertainty filled from its data class."""
    values = {**values, "from_memory": bool(values["from_memory"])}
    if values["uncertainty"] is None and classes:
        values["uncertainty"] = classes[uncertainty_class(values["source"], values["from_memory"], classes)].uncertainty
    return values


def _ligand_file_species(path: Path, table: dict, entry: str, element: str, classes: dict) -> Species:
    try:
        row = SpeciesRow.model_validate(table)
    except ValidationError as error:
        raise CatalogError(describe(error, path, entry)) from None
    values = row.model_dump()
    if row.dgf == 0.0 and values["uncertainty"] is None:
        values["uncertainty"] = 0.0  # the element in its reference state: dgf = 0 by definition
    return Species.create(element, **_with_uncertainty(values, classes))


def load_ligand_file(path: Path, systems: dict, sources: dict, classes: dict | None = None) -> LigandSet:
    """Read and check one ligand file against the metal ``systems`` and the bibliography ``sources``."""
    document = read_toml(path)
    counting = document.get("counting_element")
    if not isinstance(counting, str) or not isinstance(document.get("free"), dict) \
            or not isinstance(document.get("reference"), dict):
        raise CatalogError(f"{path}: needs 'counting_element', a [free] ligand and the element's [reference] state")
    reference = _ligand_file_species(path, document["reference"], "[reference]", counting, classes or {})
    if reference.composition.keys() != {counting} or reference.dgf != 0.0:
        raise CatalogError(f"{path}: [reference]: field 'formula': the element {counting} in its standard state, dgf = 0")
    free = _ligand_file_species(path, document["free"], "[free]", counting, classes or {})
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
        species = Species.create(element, ligand=ligand, **_with_uncertainty(values, classes or {}))
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


def load_ligands(directory: Path, systems: dict, sources: dict, classes: dict | None = None) -> dict[str, LigandSet]:
    """Every ligand file of ``directory`` (none if it does not exist), keyed by the free ligand's name.

    A ligand file describes one ligand L: its free species (``Cl^-``), the standard state of the element
    counting it (Cl2 gas, for the temperature method of ``engine.thermo``) and ``[[species]]`` rows, each
    naming the metal system it joins. Those species join their metal's diagram only when the ligand's
    activity is given (``engine.diagram``). Another ligand is added by data alone: a new file.
    """
    ligands: dict[str, LigandSet] = {}
    for path in sorted(Path(directory).glob("*.toml")) if Path(directory).is_dir() else []:
        found = load_ligand_file(path, systems, sources, classes)
        if found.ligand.name in ligands:
            raise CatalogError(f"{path}: ligand {found.ligand.name} is already described in {ligands[found.ligand.name].path}")
        ligands[found.ligand.name] = found
    return ligands


@dataclass(frozen=True)
class ElementSystem:
    """All species of one element, in file order, with the file's flags and notes."""

    element: str
    species: tuple[Species, ...]
    path: str = ""
    lacks_dissolved: bool = False
    unchecked: tuple[str, ...] = ()
    notes: tuple[NoteRow, ...] = ()

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
    uncertainty_classes: dict = field(default_factory=dict)
    ligands: dict = field(default_factory=dict)

    def system(self, element: str) -> ElementSystem:
        """The element system for ``element`` (case-insensitive), or a clear error listing the known ones."""
        found = _systems_by_lower_symbol(self).get(str(element).lower())
        if found is not None:
            return found
        known = ", ".join(sorted(self.systems))
        raise CatalogError(f"unknown element {element!r}; known elements: {known}", field="element")

    def lacks_dissolved(self, element: str) -> bool:
        """True when the data hold no dissolved species of ``element``: its dissolution is unknown, not nil."""
        return self.system(element).lacks_dissolved

    def notes(self, element: str, kind: str | None = None) -> tuple[NoteRow, ...]:
        """The file-level notes of ``element``'s system, of one ``kind`` (see :data:`NOTE_KINDS`) or all."""
        return tuple(n for n in self.system(element).notes if kind is None or n.kind == kind)

    def unchecked(self, element: str) -> tuple[Species, ...]:
        """Species of ``element`` whose values no independent published check covers (kept true by a test)."""
        system = self.system(element)
        return tuple(s for s in system.species if s.name in system.unchecked)


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


def _to_system(path: Path, parsed: SpeciesFile, classes: dict[str, UncertaintyClass]) -> ElementSystem:
    species = []
    for row in parsed.species:
        values = row.model_dump()
        if values["from_memory"] is None:
            values["from_memory"] = parsed.from_memory
        if values["uncertainty"] is None and parse_formula(values["formula"]) == {parsed.element: 1} \
                and values["charge"] == 0 and values["phase"] != "aqueous":
            values["uncertainty"] = 0.0  # the element in its reference state: dgf = 0 by definition
        if values["uncertainty"] is None:
            values["uncertainty"] = classes[uncertainty_class(values["source"], values["from_memory"], classes)].uncertainty
        species.append(Species.create(parsed.element, **values))
    return ElementSystem(element=parsed.element, species=tuple(species), path=str(path),
                         lacks_dissolved=parsed.dissolved_species == NO_DISSOLVED,
                         unchecked=tuple(parsed.unchecked), notes=tuple(parsed.notes))


UNCERTAINTY_CLASSES = ("reviewed", "estimate", "from_memory")
"""Data classes of ``data/uncertainty.toml``, each with its default uncertainty of dgf."""


def uncertainty_class(source: str, from_memory: bool, classes: dict[str, UncertaintyClass]) -> str:
    """The data class of a row that states no uncertainty: from memory, a reviewed table, or an estimate.

    >>> reviewed = UncertaintyClass(uncertainty=0.5, basis="b", sources=["wagman1982"])
    >>> uncertainty_class("wagman1982", False, {"reviewed": reviewed})
    'reviewed'
    """
    if from_memory:
        return "from_memory"
    if source in classes["reviewed"].sources:
        return "reviewed"
    return "estimate"


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
            raise CatalogError(f"overlay {overlay}: not a directory", field="overlay")
    sources = _load_table(base / "sources.toml", SourceRow, "source")
    scales = _load_table(base / "scales.toml", ScaleRow, "scale")
    classes = _load_table(base / "uncertainty.toml", UncertaintyClass, "data class")
    missing = [name for name in UNCERTAINTY_CLASSES if name not in classes]
    if missing:
        raise CatalogError(f"{base / 'uncertainty.toml'}: missing data class {missing[0]!r} "
                           f"(needs {', '.join(UNCERTAINTY_CLASSES)})")
    species_files = {path.name: path for path in sorted((base / "species").glob("*.toml"))}
    if overlay is not None:
        extra = sorted((overlay / "species").glob("*.toml")) + sorted(overlay.glob("*.toml"))
        if (overlay / "sources.toml").exists():
            sources = {**sources, **_load_table(overlay / "sources.toml", SourceRow, "source")}
        extra = [path for path in extra if path.name not in ("sources.toml", "scales.toml", "materials.toml")]
        if not extra:
            raise CatalogError(f"overlay {overlay}: no species files (*.toml) found", field="overlay")
        for path in extra:
            species_files[path.name] = path
    systems: dict[str, ElementSystem] = {}
    water: dict[str, Species] = {}
    for name, path in species_files.items():
        parsed = load_species_file(path)
        system = _to_system(path, parsed, classes)
        if name == WATER_SPECIES_FILE:
            water = {s.name: s for s in system.species}
        else:
            systems[parsed.element] = system
    ligands = load_ligands(base / LIGANDS_DIR, systems, sources, classes)
    read = [base / "sources.toml", base / "scales.toml", base / "uncertainty.toml", base / "materials.toml",
            *species_files.values(), *(Path(found.path) for found in ligands.values())]
    if overlay is not None:
        read.append(overlay / "sources.toml")
    catalog = Catalog(systems=systems, water=water, sources=sources, scales=scales, version=_digest(read),
                      uncertainty_classes=classes, ligands=ligands)
    check_catalog(catalog)
    materials_path = base / "materials.toml"
    if materials_path.exists():
        overlaid = {system.element: Path(system.path) for system in systems.values()
                    if overlay is not None and Path(system.path).parent != base / "species"}
        catalog = replace(catalog, materials=load_materials(materials_path, catalog, overlaid))
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
