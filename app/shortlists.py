"""Saved shortlists: saving a screened scenario, re-checking it against today's catalog, the public view.

A shortlist stores a compact record of what its table shows (:func:`compact_record`: the ranked
ids with their verdicts, fractions, figures and hazards, the rule and the window, with the catalog
version); reading it re-runs the scenario on today's catalog, fills in the rest (names, reasons,
stable phases, the points where the worst figures sit) from it (:func:`expand_record`), and
:func:`rank_check` says so when the order of the candidates would differ. Records saved before the
compact layout hold the whole screen result and are shown as saved. Nothing stored is lost: a row
field or region added since a record was saved reads with its default (a region as 0), a field
retired since is dropped.
"""

import re

from pydantic import ValidationError

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.screen import REGIONS

from . import urls
from .cautions import CAUTIONS
from .errors import Unprocessable, not_found
from .models import (ErrorBody, FieldError, RankCheck, ScenarioIn, ShortlistCreate, ShortlistLinks, ShortlistPublic,
                     ShortlistRow)
from .pages import result_citations, screen_result
from .rankdiff import ranking_changes
from .storage import ID_PATTERN, NOTES_TOTAL_MAX, StoredShortlist, load_shortlist, save_shortlist
from .viewstate import ViewQuery

SAVE_REFUSALS = {
    403: {"model": ErrorBody, "description": "sent from another site's page (Origin / Sec-Fetch-Site)"},
    429: {"model": ErrorBody, "description": "too many saves from this address; see Retry-After"},
    503: {"model": ErrorBody, "description": "busy, or the database is unavailable or read-only; see Retry-After"},
    507: {"model": ErrorBody, "description": "the disk holding the database is full"},
}
"""The refusals a save may get besides bad input (``app.overload``, ``app.routes.http``), declared on both save routes."""


def create_shortlist(body: ShortlistCreate, catalog: Catalog, storage) -> StoredShortlist:
    """Screen ``body.scenario`` now, check the notes name ranked materials, and store it all at once."""
    result = screen_result(body.scenario, catalog, where=["body", "scenario"])
    ranked = {row["material"].lower(): row["material"] for row in result["results"]}
    notes, errors = {}, []
    for key, note in body.notes.items():
        if key.lower() not in ranked:
            errors.append(FieldError(loc=["body", "notes", key],
                                     msg=f"notes.{key}: not a material of this shortlist (ranked: {', '.join(ranked.values())})"))
        elif note.strip():
            notes[ranked[key.lower()]] = note.strip()
    if sum(len(note) for note in notes.values()) > NOTES_TOTAL_MAX:
        errors.append(FieldError(loc=["body", "notes"],
                                 msg=f"notes: at most {NOTES_TOTAL_MAX} characters together (given "
                                     f"{sum(len(note) for note in notes.values())})"))
    if errors:
        raise Unprocessable(errors)
    return save_shortlist(engine=storage, title=body.title, scenario=result["scenario"], result=compact_record(result),
                          notes=notes)


FIGURES = ("material", "verdict", *REGIONS, "instability_ev", "log10_dissolved", "margin_mv", "margin_capped",
           "price_usd_per_kg", "price_year", "hazards")
"""The columns of a compact record's rows: what a shortlist's table shows, in rank order."""
REASON_UNAVAILABLE = "reason not available: today's catalog cannot screen this candidate in this scenario"


def compact_record(result: dict) -> dict:
    """What a shortlist keeps of a screen result: the ranked ids with the figures its table shows.

    Hazards are kept as (kind, species) with each note once; names, reasons, stable phases and the
    points where the worst figures sit are recomputed on reading (:func:`expand_record`)."""
    hazard_notes, rows = {}, []
    for row in result["results"]:
        for hazard in row["hazards"]:
            hazard_notes[f"{hazard['kind']} {hazard['species']}"] = hazard["note"]
        flat = {**row, **row["fractions"], "hazards": [[hazard["kind"], hazard["species"]] for hazard in row["hazards"]]}
        rows.append([flat[column] for column in FIGURES])
    return {"catalog_version": result["catalog_version"], "rule": result["rule"], "window": result["window"],
            "hazard_notes": hazard_notes, "columns": list(FIGURES), "results": rows}


def _today_fields(row: dict) -> dict:
    """``row`` with only today's row fields (a field retired since it was saved is dropped), every region
    in its fractions (a region added since reads 0: the saved fractions already add up to 1)."""
    kept = {key: value for key, value in row.items() if key in ShortlistRow.model_fields}
    if "fractions" in kept:
        kept["fractions"] = {region: kept["fractions"].get(region, 0.0) for region in REGIONS}
    return kept


def expand_record(stored: StoredShortlist, today: dict | None, catalog: Catalog) -> dict:
    """The stored record as a screen result: the saved figures; names from the catalog, and reasons,
    stable phases, worst points and any row field added since from ``today``'s screen of the same
    scenario (when it has the candidate). A whole record (layout 1) is shown as saved."""
    if stored.format == 1:
        return {**stored.result, "results": [_today_fields(row) for row in stored.result["results"]]}
    record = stored.result
    today_rows = {row["material"]: row for row in today["results"]} if today else {}
    accepted = set(stored.scenario["accept"])
    rows = []
    for rank, values in enumerate(record["results"], start=1):
        saved = dict(zip(record["columns"], values))
        now = today_rows.get(saved["material"], {})
        material = catalog.materials.get(saved["material"])
        fractions = {region: saved.get(region, 0.0) for region in REGIONS}
        rows.append({
            **_today_fields(now),
            "rank": rank, "material": saved["material"],
            "name": material.name if material else saved["material"],
            "element": material.element if material else "",
            "phase": material.phase if material else "",
            "family": material.family if material else "",
            "verdict": saved["verdict"], "fractions": fractions,
            "unacceptable_fraction": sum(share for region, share in fractions.items() if region not in accepted),
            "stable_phases": now.get("stable_phases", []),
            "window_dimension": record["window"]["dimension"],
            "instability_ev": saved["instability_ev"], "instability_at": now.get("instability_at", []),
            "log10_dissolved": saved["log10_dissolved"], "dissolved_at": now.get("dissolved_at"),
            "margin_mv": saved["margin_mv"], "margin_capped": saved["margin_capped"],
            "hazards": [{"kind": kind, "species": species, "note": record["hazard_notes"].get(f"{kind} {species}", "")}
                        for kind, species in saved["hazards"]],
            "price_usd_per_kg": saved["price_usd_per_kg"], "price_year": saved["price_year"],
            "reason": now.get("reason", REASON_UNAVAILABLE),
        })
    return {"scenario": stored.scenario, "rule": record["rule"], "window": record["window"],
            "catalog_version": stored.catalog_version, "results": rows, "cautions": list(CAUTIONS)}


def screen_today(stored: StoredShortlist, catalog: Catalog) -> tuple[dict | None, str]:
    """The stored scenario screened with today's catalog, or None and why it cannot be."""
    try:
        return screen_result(ScenarioIn.model_validate(stored.scenario, strict=False), catalog), ""
    except (Unprocessable, ValidationError) as problem:
        return None, "; ".join(e.msg for e in problem.errors) if isinstance(problem, Unprocessable) else str(problem)


def saved_result(stored: StoredShortlist, catalog: Catalog) -> dict:
    """The shortlist's ranked table as a screen result (for its CSV): :func:`expand_record` with today's screen."""
    return expand_record(stored, screen_today(stored, catalog)[0], catalog)


def rank_check(stored: StoredShortlist, saved_result: dict, today: dict | None, problem: str,
               catalog: Catalog) -> RankCheck:
    """Today's ranking of the stored scenario compared with the stored one."""
    saved = [row["material"] for row in saved_result["results"]]
    same_version = catalog.version == stored.catalog_version
    if today is None:
        return RankCheck(catalog_version=catalog.version, same_version=same_version, same_order=None, order=[],
                         message=f"Today's catalog ({catalog.version}) can no longer screen this scenario: {problem}")
    order = [row["material"] for row in today["results"]]
    same = order == saved
    if same:
        message = ("Today's catalog ranks these candidates in the same order."
                   + ("" if same_version else f" (The data changed since: {stored.catalog_version} → {catalog.version}.)"))
    else:
        message = (f"Today's catalog ({catalog.version}) would rank differently: {', '.join(order)}. "
                   f"This shortlist shows the ranking as computed with catalog {stored.catalog_version}.")
    return RankCheck(catalog_version=catalog.version, same_version=same_version, same_order=same, order=order,
                     message=message, changes=ranking_changes(saved_result["results"], today["results"]))


def shortlist_public(stored: StoredShortlist, catalog: Catalog) -> ShortlistPublic:
    """The one data object behind /s/{id}, /s/{id}.json and /api/v1/shortlists/{id}."""
    today, problem = screen_today(stored, catalog)
    result = expand_record(stored, today, catalog)
    rows = [{**row, "note": stored.notes.get(row["material"], "")} for row in result["results"]]
    links = ShortlistLinks(page=urls.shortlist_page(stored.id), json_twin=urls.shortlist_json(stored.id),
                           csv=urls.shortlist_csv(stored.id),
                           start_from_this=urls.screen_page(ViewQuery.from_scenario(stored.scenario)))
    return ShortlistPublic(id=stored.id, title=stored.title, created_at=stored.created_at,
                           catalog_version=stored.catalog_version, scenario=stored.scenario, rule=result["rule"],
                           window=result["window"], results=rows, cautions=result["cautions"],
                           today=rank_check(stored, result, today, problem, catalog), links=links,
                           citations=result_citations(result, catalog))


def find_shortlist(shortlist_id: str, storage) -> StoredShortlist:
    """The stored shortlist or a 404 (ids that cannot be ours are refused without a query)."""
    stored = load_shortlist(engine=storage, shortlist_id=shortlist_id) if re.match(ID_PATTERN, shortlist_id) else None
    if stored is None:
        raise not_found(f"no shortlist {shortlist_id!r}")
    return stored
