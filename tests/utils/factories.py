"""Test data builders: catalogs with chosen materials, without touching data/materials.toml."""

from electrosieve.engine.catalog import Catalog, default_catalog
from electrosieve.engine.materials import HazardRow, Material


def metal(element: str, family: str = "transition", price: float | None = None, hazards=()) -> Material:
    """A metal material whose id and phase are the element symbol (test data, not catalog data)."""
    return Material(id=element, name=element, element=element, phase=element, family=family,
                    price_usd_per_kg=price, price_year=None, price_source=None, abundance_mg_per_kg=None,
                    abundance_source=None, hazards=[HazardRow(species=s, note=n) for s, n in hazards],
                    from_memory=False, note="test material")


def catalog_with(*materials: Material) -> Catalog:
    """The built-in catalog with its materials replaced by ``materials``."""
    base = default_catalog()
    return Catalog(**{**base.__dict__, "materials": {m.id: m for m in materials}})
