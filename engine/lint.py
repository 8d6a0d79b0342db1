"""Consistency checks run on every catalog load: the data must be coherent before any number is used."""

from .errors import CatalogError
from .species import SOLVENT_ELEMENTS

WATER_SPECIES = ("H2O", "H^+", "OH^-", "H2", "O2")
"""Species the water file must hold."""


def check_catalog(catalog) -> None:
    """Raise :class:`CatalogError` on the first inconsistency found in ``catalog``.

    Checks: every species balances (only its element, H and O; at least one
    atom of the element), no species name appears twice in a system, every
    system holds its element, every source key resolves, and the water file
    holds H2O, H+, OH-, H2 and O2. A file's ``unchecked`` list and ``notes`` name
    only its own species and known sources, and a file flagged as holding no
    dissolved species holds none.
    """
    for name in WATER_SPECIES:
        if name not in catalog.water:
            raise CatalogError(f"water.toml: missing species {name!r} (needs {', '.join(WATER_SPECIES)})")
    for species in catalog.water.values():
        _check_source(catalog, "water.toml", species)
    for element, system in catalog.systems.items():
        where = system.path or element
        seen: set[str] = set()
        for species in system.species:
            extra = set(species.composition) - {element, *SOLVENT_ELEMENTS}
            if extra or species.metal_atoms < 1:
                raise CatalogError(
                    f"{where}: species {species.name!r}: field 'formula': must contain {element} "
                    f"and otherwise only H and O (found {', '.join(sorted(species.composition))})"
                )
            if species.name in seen:
                raise CatalogError(f"{where}: species {species.name!r} appears twice; give polymorphs a 'label'")
            seen.add(species.name)
            _check_source(catalog, where, species)
        if not any(s.is_element for s in system.species):
            raise CatalogError(f"{where}: no species for the element {element} itself (the metal, at dgf = 0)")
        _check_flags(catalog, where, system, seen)
    for key, scale in catalog.scales.items():
        if scale.source not in catalog.sources:
            raise CatalogError(f"scales.toml: scale {key!r}: field 'source': unknown source key {scale.source!r}")


def _check_source(catalog, where: str, species) -> None:
    if species.source not in catalog.sources:
        raise CatalogError(
            f"{where}: species {species.name!r}: field 'source': unknown source key {species.source!r} "
            "(add it to sources.toml)"
        )


def _check_flags(catalog, where: str, system, names: set[str]) -> None:
    """The file-level flags and notes of ``system`` agree with its species and the bibliography."""
    for name in system.unchecked:
        if name not in names:
            raise CatalogError(f"{where}: field 'unchecked': no species {name!r} in this file")
    for index, note in enumerate(system.notes, start=1):
        if note.source not in catalog.sources:
            raise CatalogError(f"{where}: notes #{index}: field 'source': unknown source key {note.source!r} "
                               "(add it to sources.toml)")
        for name in note.species:
            if name not in names:
                raise CatalogError(f"{where}: notes #{index}: field 'species': no species {name!r} in this file")
    if system.lacks_dissolved:
        dissolved = [s.name for s in system.species if s.is_dissolved]
        if dissolved:
            raise CatalogError(f"{where}: field 'dissolved_species': says \"none in data\" but the file holds "
                               f"{', '.join(dissolved)}")
