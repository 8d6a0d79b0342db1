"""The wire format: typed engine results turned into JSON-ready dicts, shared by the CLI, the API, the pages and
the CSV download. Numbers are rounded here, once, and nowhere else (the engine never rounds).

Each result type has one function here; adding a result field means adding one line to that function (and the
field to its response model in ``app.schemas``).
"""

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.diagram import Diagram, PointResult
from electrosieve.engine.electrolyte import Electrolyte
from electrosieve.engine.roles import roles
from electrosieve.engine.kinetics import DEFAULT_CURRENT_DENSITY, kinetic_table, kinetics
from electrosieve.engine.screen import Hazard, Scenario, ScreenResult, ScreenRow
from electrosieve.engine.solution import Solution
from electrosieve.engine.species import Species
from electrosieve.engine.thermo import temperature_notes
from electrosieve.engine.water import conditions_note
from electrosieve.engine.window import OperatingWindow

from .cautions import CAUTIONS, ELECTROLYTE_CAUTIONS

DIGITS = {"fraction": 12, "share": 9, "energy_ev": 9, "log10": 6, "millivolt": 3, "coordinate": 6, "area": 9,
          "potential": 9, "ph": 4, "significant": 4, "ionic_strength": 5, "water_activity": 4}
"""Decimal places on the wire for each kind of number: fractions of the window, a species' share, energies [eV],
log10 activities, margins [mV], polygon coordinates [pH, V], areas [pH·V], converted potentials [V], pH values;
``significant`` is significant digits of activities and molalities, which span many decades."""


def _significant(value: float) -> float:
    return float(f"{value:.{DIGITS['significant']}g}")


def electrolyte_payload(result: Electrolyte) -> dict:
    """A recipe at a temperature: pH, ionic strength [mol/kg], free-ion activities and molalities, the model
    and its range, warnings, sources and the cautions of handling it (``electrosieve electrolyte --json``)."""
    return {
        "recipe": result.recipe, "temperature_c": result.temperature_c, "ph": round(result.ph, DIGITS["ph"]),
        "ionic_strength": round(result.ionic_strength, DIGITS["ionic_strength"]),
        "activities": {ion: _significant(a) for ion, a in result.activities.items()},
        "molalities": {ion: _significant(m) for ion, m in result.molalities.items()},
        "water_activity": round(result.water_activity, DIGITS["water_activity"]), "model": result.model,
        "validity": result.validity, "warnings": list(result.warnings), "sources": list(result.sources),
        "cautions": list(ELECTROLYTE_CAUTIONS),
    }


def solution_payload(solution: Solution) -> dict:
    """The dissolved conditions every result restates: the recipe's result, per-ion activities, free chloride
    and the warnings."""
    return {
        "electrolyte": None if solution.electrolyte is None else electrolyte_payload(solution.electrolyte),
        "ion_activities": {name: _significant(a) for name, a in solution.ion_activities},
        "chloride": None if solution.chloride is None else _significant(solution.chloride),
        "warnings": list(solution.warnings),
    }


def _points(vertices) -> list[list[float]]:
    return [[round(float(x), DIGITS["coordinate"]), round(float(y), DIGITS["coordinate"])] for x, y in vertices]


def species_payload(species: Species) -> dict:
    """The identity of a species as every payload shows it."""
    return {"formula": species.name, "phase": species.phase, "region": species.region}


def diagram_payload(diagram: Diagram, catalog: Catalog, solution: Solution = Solution()) -> dict:
    """An element's diagram: domains with exact polygons [[pH, E vs SHE], …], boundaries and water lines, with
    the dissolved conditions it was drawn for."""
    water = diagram.water
    return {
        "element": diagram.element,
        "activity": diagram.activity,
        "temperature_c": diagram.temperature_c,
        "limits": {"ph": [diagram.limits.ph_min, diagram.limits.ph_max],
                   "potential": [diagram.limits.e_min, diagram.limits.e_max], "scale": "SHE"},
        "domains": [
            {**species_payload(d.species), "area": round(d.area, DIGITS["area"]), "polygon": _points(d.vertices)}
            for d in diagram.domains
        ],
        "boundaries": [
            {"species": [b.first.name, b.second.name], "equation": b.equation,
             "intercept": b.intercept, "slope": b.slope, "ph": b.ph,
             "start": [round(v, DIGITS["coordinate"]) for v in b.start],
             "end": [round(v, DIGITS["coordinate"]) for v in b.end]}
            for b in diagram.boundaries
        ],
        "water": {
            "hydrogen": {"intercept": water.hydrogen_intercept, "slope": -water.slope,
                         "equation": f"E = {water.hydrogen_intercept:.4f} - {water.slope:.4f} pH"},
            "oxygen": {"intercept": water.oxygen_intercept, "slope": -water.slope,
                       "equation": f"E = {water.oxygen_intercept:.4f} - {water.slope:.4f} pH"},
            "pressure_bar": 1.0,
            "neutral_ph": round(water.neutral_ph, DIGITS["ph"]),
        },
        "conditions": conditions_note(diagram.temperature_c),
        "temperature_notes": [] if diagram.temperature_c == 25.0 else temperature_notes(
            catalog.systems[diagram.element].species, catalog),
        "catalog_version": catalog.version,
        "ligand_activities": {name: _significant(a) for name, a in diagram.ligand_activities},
        **solution_payload(solution),
    }


def point_payload(point: PointResult, solution: Solution = Solution()) -> dict:
    """What is stable at one point, with the point restated on both scales."""
    return {
        **species_payload(point.species),
        "element": point.diagram.element,
        "ph": point.ph,
        "potential": point.potential,
        "scale": point.scale,
        "potential_she": round(point.potential_she, DIGITS["potential"]),
        "activity": point.diagram.activity,
        "temperature_c": point.diagram.temperature_c,
        **solution_payload(solution),
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


def scenario_payload(scenario: Scenario) -> dict:
    """The checked scenario, in the same shape the API accepts (a point as one number, a range as a pair)."""
    point = lambda pair: pair[0] if pair[0] == pair[1] else list(pair)  # noqa: E731
    return {
        "ph": point(tuple(round(v, DIGITS["ph"]) for v in scenario.ph)), "potential": point(scenario.potential),
        "scale": scenario.scale,
        "activity": scenario.activity, "temperature": scenario.temperature, "role": scenario.role,
        "accept": list(scenario.accept), "materials": None if scenario.materials is None else list(scenario.materials),
        "family": scenario.family, "rank_by": list(scenario.rank_by), "weights": dict(scenario.weights),
        "electrolyte": None if scenario.solution.electrolyte is None else scenario.solution.electrolyte.recipe,
        "ion_activities": dict(scenario.solution.ion_activities) or None, "chloride": scenario.solution.chloride,
        "current_density": scenario.current_density_ma_cm2,
    }


def window_payload(window: OperatingWindow) -> dict:
    """The operating window's corners on the SHE diagram and its dimension."""
    return {"vertices_she": _points(window.vertices), "dimension": window.dimension}


def hazard_payload(hazard: Hazard) -> dict:
    return {"kind": hazard.kind, "species": hazard.species, "note": hazard.note}


def row_payload(row: ScreenRow) -> dict:
    """One ranked candidate (the fields of ``app.schemas.ScreenRow``)."""
    material, judged = row.material, row.judged
    return {
        "rank": row.rank, "material": material.id, "name": material.name, "element": material.element,
        "phase": material.phase, "family": material.family,
        "fractions": {region: round(value, DIGITS["fraction"]) for region, value in judged.fractions.items()},
        "unacceptable_fraction": round(judged.unacceptable_fraction, DIGITS["fraction"]),
        "stable_phases": [{"species": p.species, "region": p.region, "fraction": round(p.fraction, DIGITS["share"])}
                          for p in judged.pieces],
        "window_dimension": row.window_dimension,
        "instability_ev": round(row.instability_ev, DIGITS["energy_ev"]), "instability_at": list(row.instability_at),
        "log10_dissolved": None if row.log10_dissolved is None else round(row.log10_dissolved, DIGITS["log10"]),
        "dissolved_at": None if judged.dissolved_at is None else list(judged.dissolved_at),
        "margin_mv": round(1000 * judged.margin_v, DIGITS["millivolt"]), "margin_capped": judged.margin_capped,
        "hazards": [hazard_payload(h) for h in row.hazards],
        "price_usd_per_kg": material.price_usd_per_kg, "price_year": material.price_year,
        "verdict": row.verdict, "reason": row.reason, "caution": row.caution,
        "surface": None if row.surface is None else {
            "phase": row.surface.phase, "conduction": row.surface.conduction, "source": row.surface.source},
        "kinetics": None if row.kinetics is None else kinetics_payload(row.kinetics),
        "robustness": None if row.robustness is None else {
            "verdict_probability": round(row.robustness.verdict_probability, DIGITS["share"]),
            "draws": row.robustness.draws},
        "notes": [{"kind": n.kind, "text": n.text, "source": n.source} for n in row.notes],
        "order_robust": row.order_robust,
        "dissolved": row.dissolved_text,
    }


def onset_lines_payload(material_id: str, diagram: Diagram, current_density_ma_cm2: float = DEFAULT_CURRENT_DENSITY) -> list[dict]:
    """The material's own hydrogen and oxygen onsets [V vs RHE] per medium with data, each over its medium's pH
    band within the diagram's limits (``engine.kinetics``); none where the material has no published data."""
    water, limits = diagram.water, diagram.limits
    lines = []
    for medium in kinetic_table().media:
        ph = [max(medium.ph_min, limits.ph_min), min(medium.ph_max, limits.ph_max)]
        if ph[0] >= ph[1]:
            continue
        found = kinetics(material_id, (ph[0], ph[1]), current_density_ma_cm2,
                         oxygen_reversible_v_rhe=water.oxygen_intercept - water.hydrogen_intercept)
        for gas, value in (("hydrogen", found.hydrogen_onset_v_rhe), ("oxygen", found.oxygen_onset_v_rhe)):
            if value is not None:
                lines.append({"material": material_id, "gas": gas, "medium": medium.name, "ph": ph,
                              "v_rhe": round(value, DIGITS["potential"]),
                              "current_density_ma_cm2": found.current_density_ma_cm2, "sources": list(found.sources)})
    return lines


def roles_payload(catalog: Catalog) -> list[dict]:
    """Every electrode role: what it checks, its ranking rule in words and the citations behind it."""
    rows = []
    for role in roles().values():
        keys = [*role.sources, *([role.criterion.source] if role.criterion else [])]
        rows.append({"name": role.name, "title": role.title, "description": role.description, "rule": role.rule,
                     "accept": list(role.accept), "needs_conduction": role.needs_conduction,
                     "keeps_phase": role.keeps_phase,
                     "citations": [key if key not in catalog.sources else citation(catalog, key)
                                   for key in dict.fromkeys(keys)]})
    return rows


def kinetics_payload(kinetics) -> dict:
    """A material's own hydrogen and oxygen onsets vs RHE [V] at a current density [mA cm^-2]; null where no data."""
    onset = lambda v: None if v is None else round(v, DIGITS["potential"])  # noqa: E731
    return {"current_density_ma_cm2": kinetics.current_density_ma_cm2,
            "hydrogen_onset_v_rhe": onset(kinetics.hydrogen_onset_v_rhe),
            "oxygen_onset_v_rhe": onset(kinetics.oxygen_onset_v_rhe), "sources": list(kinetics.sources)}


def screen_payload(result: ScreenResult) -> dict:
    """The ranked screen with the cautions that go wherever results appear (the fields of ``app.schemas.ScreenResult``)."""
    return {
        "scenario": scenario_payload(result.scenario),
        "rule": result.rule,
        "window": window_payload(result.window),
        "catalog_version": result.catalog_version,
        "conditions": result.conditions,
        "neutral_ph": round(result.neutral_ph, DIGITS["ph"]),
        "temperature_notes": {element: list(notes) for element, notes in result.temperature_notes.items()},
        "results": [row_payload(row) for row in result.rows],
        "cautions": list(CAUTIONS),
        "warnings": list(result.warnings),
        "electrolyte": None if result.scenario.solution.electrolyte is None
        else electrolyte_payload(result.scenario.solution.electrolyte),
    }


CSV_COLUMNS = ("rank", "material", "name", "element", "phase", "family", "verdict", "immunity", "passivation", "hydride",
               "corrosion", "instability_ev", "log10_dissolved", "margin_mv", "price_usd_per_kg", "price_year",
               "hazards", "reason", "caution", "surface_phase", "surface_conduction", "hydrogen_onset_v_rhe", "oxygen_onset_v_rhe",
               "current_density_ma_cm2", "verdict_probability", "order_robust", "dissolved", "notes")


def csv_rows(result: dict) -> list[dict]:
    """One flat row per ranked candidate (the CSV download), from the screen payload."""
    rows = []
    for row in result["results"]:
        flat = {key: row.get(key) for key in CSV_COLUMNS}
        flat.update(row["fractions"])
        flat["hazards"] = "; ".join(f"{h['species']}: {h['note']}" for h in row["hazards"])
        surface, kinetics, robustness = row.get("surface") or {}, row.get("kinetics") or {}, row.get("robustness") or {}
        flat.update(surface_phase=surface.get("phase"), surface_conduction=surface.get("conduction"),
                    hydrogen_onset_v_rhe=kinetics.get("hydrogen_onset_v_rhe"),
                    oxygen_onset_v_rhe=kinetics.get("oxygen_onset_v_rhe"),
                    current_density_ma_cm2=kinetics.get("current_density_ma_cm2"),
                    verdict_probability=robustness.get("verdict_probability"),
                    notes="; ".join(f"{n['kind']}: {n['text']}" for n in row.get("notes") or []))
        rows.append(flat)
    return rows
