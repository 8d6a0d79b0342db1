"""JSON-ready payloads built from engine results: one shape shared by the CLI, the API and the pages."""

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.diagram import Diagram
from electrosieve.engine.species import Species
from electrosieve.engine.thermo import temperature_notes
from electrosieve.engine.water import conditions_note

from .cautions import CAUTIONS


def species_payload(species: Species) -> dict:
    """The identity of a species as every payload shows it."""
    return {"formula": species.name, "phase": species.phase, "region": species.region}


def diagram_payload(diagram: Diagram, catalog: Catalog) -> dict:
    """An element's diagram: domains with exact polygons [[pH, E vs SHE], …], boundaries and water lines."""
    water = diagram.water
    return {
        "element": diagram.element,
        "activity": diagram.activity,
        "temperature_c": diagram.temperature_c,
        "window": {"ph": [diagram.window.ph_min, diagram.window.ph_max],
                   "potential": [diagram.window.e_min, diagram.window.e_max], "scale": "SHE"},
        "domains": [
            {**species_payload(d.species), "area": round(d.area, 9),
             "polygon": [[round(float(x), 6), round(float(y), 6)] for x, y in d.vertices]}
            for d in diagram.domains
        ],
        "boundaries": [
            {"species": [b.first.name, b.second.name], "equation": b.equation,
             "intercept": b.intercept, "slope": b.slope, "ph": b.ph,
             "start": [round(v, 6) for v in b.start], "end": [round(v, 6) for v in b.end]}
            for b in diagram.boundaries
        ],
        "water": {
            "hydrogen": {"intercept": water.hydrogen_intercept, "slope": -water.slope,
                         "equation": f"E = {water.hydrogen_intercept:.4f} - {water.slope:.4f} pH"},
            "oxygen": {"intercept": water.oxygen_intercept, "slope": -water.slope,
                       "equation": f"E = {water.oxygen_intercept:.4f} - {water.slope:.4f} pH"},
            "pressure_bar": 1.0,
            "neutral_ph": round(water.neutral_ph, 4),
        },
        "conditions": conditions_note(diagram.temperature_c),
        "temperature_notes": [] if diagram.temperature_c == 25.0 else temperature_notes(
            catalog.systems[diagram.element].species, catalog),
        "catalog_version": catalog.version,
    }


def point_payload(diagram: Diagram, ph: float, potential: float, potential_she: float, scale: str) -> dict:
    """What is stable at one point, with the point restated on both scales."""
    species = diagram.stable_species_at(ph, potential_she)
    return {
        **species_payload(species),
        "element": diagram.element,
        "ph": ph,
        "potential": potential,
        "scale": scale,
        "potential_she": round(potential_she, 9),
        "activity": diagram.activity,
        "temperature_c": diagram.temperature_c,
    }


def scales_payload(catalog: Catalog) -> list[dict]:
    """Every reference scale with its potential vs SHE at 25 °C and its source."""
    return [
        {"id": key, "name": row.name, "potential_vs_she": row.potential, "ph_dependent": row.ph_dependent,
         "dE_dT": row.dE_dT, "valid_c": [row.t_min, row.t_max], "source": row.source,
         "citation": citation(catalog, row.source), "from_memory": row.from_memory, "note": row.note}
        for key, row in catalog.scales.items()
    ]


def citation(catalog: Catalog, key: str) -> str:
    """A source key resolved to a one-line citation."""
    row = catalog.sources[key]
    parts = [f"{row.authors} ({row.year}). {row.title}."]
    if row.publication:
        parts.append(f"{row.publication}.")
    if row.table:
        parts.append(f"{row.table}.")
    if row.doi:
        parts.append(f"doi:{row.doi}")
    return " ".join(parts)


def materials_payload(catalog: Catalog) -> list[dict]:
    """Every material with its practical metadata and citations."""
    rows = []
    for m in catalog.materials.values():
        rows.append({
            "id": m.id, "name": m.name, "element": m.element, "phase": m.phase, "family": m.family,
            "price_usd_per_kg": m.price_usd_per_kg, "price_year": m.price_year, "price_source": m.price_source,
            "abundance_mg_per_kg": m.abundance_mg_per_kg, "abundance_source": m.abundance_source,
            "hazards": [{"species": h.species, "note": h.note} for h in m.hazards],
            "from_memory": m.from_memory, "note": m.note,
        })
    return rows


def sources_payload(catalog: Catalog, element: str) -> dict:
    """An element's species values, each with its source key, and the citations they resolve to."""
    system = catalog.systems[element]
    species = [
        {"formula": s.name, "phase": s.phase, "region": s.region, "charge": s.charge, "dgf": s.dgf, "dhf": s.dhf,
         "s": s.s, "cp": s.cp, "uncertainty": s.uncertainty, "source": s.source, "from_memory": s.from_memory,
         "note": s.note}
        for s in system.species
    ]
    keys = sorted({row["source"] for row in species})
    return {"element": element, "species": species, "citations": {key: citation(catalog, key) for key in keys},
            "units": {"dgf": "kJ/mol", "dhf": "kJ/mol", "s": "J/(mol K)", "cp": "J/(mol K)"},
            "catalog_version": catalog.version}


def screen_payload(result: dict) -> dict:
    """The screen result with the cautions that go wherever results appear."""
    return {**result, "cautions": list(CAUTIONS)}


CSV_COLUMNS = ("rank", "material", "name", "element", "phase", "family", "verdict", "immunity", "passivation", "hydride",
               "corrosion", "instability_ev", "log10_dissolved", "margin_mv", "price_usd_per_kg", "price_year",
               "hazards", "reason")


def csv_rows(result: dict) -> list[dict]:
    """One flat row per ranked candidate (the CSV download)."""
    rows = []
    for row in result["results"]:
        flat = {key: row.get(key) for key in CSV_COLUMNS}
        flat.update(row["fractions"])
        flat["hazards"] = "; ".join(f"{h['species']}: {h['note']}" for h in row["hazards"])
        rows.append(flat)
    return rows
