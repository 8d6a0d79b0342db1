"""The OpenAPI schema made as tight as the server: the catalog's own ids as enums.

FastAPI writes the schema from the models, which know only the shape of an id (a pattern). The
ids themselves live in the catalog the app serves (built-in, or ``ELECTROSIEVE_CATALOG_DIR``), so
they are added here when the schema is first asked for: element symbols, material ids, reference
scale ids and families, each where the server accepts exactly those (ids are case-insensitive on
input; the enums list them as the catalog writes them). A shortlist id gets its pattern.
"""

from electrosieve.engine.catalog import Catalog

from .storage import ID_PATTERN

__all__ = ["tighten"]


def _enum_string(schema: dict, values: list[str]) -> None:
    """Put ``values`` as the enum of the string arm of ``schema`` (a string, or a string-or-null union)."""
    for arm in schema.get("anyOf", [schema]):
        if arm.get("type") == "string":
            arm["enum"] = values
        elif arm.get("type") == "array" and arm.get("items", {}).get("type") == "string":
            arm["items"]["enum"] = values


def tighten(schema: dict, catalog: Catalog) -> dict:
    """``schema`` (FastAPI's OpenAPI dict) with enums from ``catalog``; changed in place and returned."""
    enums = {
        "element": sorted(catalog.systems),
        "material_id": list(catalog.materials),
        "materials": list(catalog.materials),
        "compare": list(catalog.materials),
        "scale": list(catalog.scales),
        "axis": list(catalog.scales),
        "family": sorted({m.family for m in catalog.materials.values()}),
    }
    for operations in schema["paths"].values():
        for operation in operations.values():
            for parameter in operation.get("parameters", []):
                if parameter["name"] in enums:
                    _enum_string(parameter["schema"], enums[parameter["name"]])
                elif parameter["name"] == "shortlist_id":
                    parameter["schema"]["pattern"] = ID_PATTERN
    components = schema.get("components", {}).get("schemas", {})
    scenario = components.get("ScenarioIn", {}).get("properties", {})
    for name in ("materials", "scale"):
        if name in scenario:
            _enum_string(scenario[name], enums[name])
    notes = components.get("ShortlistCreate", {}).get("properties", {}).get("notes")
    if notes is not None:
        notes.setdefault("propertyNames", {})["enum"] = enums["materials"]
    return schema
