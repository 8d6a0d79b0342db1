"""Saved shortlists: saving a screened scenario, re-checking it against today's catalog, the public view.

A shortlist stores the screen result computed at save time (with its catalog
version); :func:`rank_check` re-runs the scenario on today's catalog and says so when the
order of the candidates would differ.
"""

import re

from pydantic import ValidationError

from electrosieve.engine.catalog import Catalog

from . import urls
from .errors import Unprocessable, not_found
from .models import FieldError, RankCheck, ScenarioIn, ShortlistCreate, ShortlistLinks, ShortlistPublic, ShortlistRow
from .pages import result_citations, screen_result
from .rankdiff import ranking_changes
from .storage import ID_PATTERN, StoredShortlist, load_shortlist, save_shortlist
from .viewstate import ViewQuery

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
    if errors:
        raise Unprocessable(errors)
    return save_shortlist(engine=storage, title=body.title, scenario=result["scenario"], result=result, notes=notes)


def rank_check(stored: StoredShortlist, catalog: Catalog) -> RankCheck:
    """Today's ranking of the stored scenario compared with the stored one."""
    saved = [row["material"] for row in stored.result["results"]]
    same_version = catalog.version == stored.catalog_version

    try:
        today = screen_result(ScenarioIn.model_validate(stored.scenario, strict=False), catalog)
    except (Unprocessable, ValidationError) as problem:
        reason = "; ".join(e.msg for e in problem.errors) if isinstance(problem, Unprocessable) else str(problem)
        return RankCheck(catalog_version=catalog.version, same_version=same_version, same_order=None, order=[],
                         message=f"Today's catalog ({catalog.version}) can no longer screen this scenario: {reason}")
    order = [row["material"] for row in today["results"]]
    same = order == saved
    if same:
        message = ("Today's catalog ranks these candidates in the same order."
                   + ("" if same_version else f" (The data changed since: {stored.catalog_version} → {catalog.version}.)"))
    else:
        message = (f"Today's catalog ({catalog.version}) would rank differently: {', '.join(order)}. "
                   f"This shortlist shows the ranking as computed with catalog {stored.catalog_version}.")
    return RankCheck(catalog_version=catalog.version, same_version=same_version, same_order=same, order=order,
                     message=message, changes=ranking_changes(stored.result["results"], today["results"]))


def shortlist_public(stored: StoredShortlist, catalog: Catalog) -> ShortlistPublic:
    """The one data object behind /s/{id}, /s/{id}.json and /api/v1/shortlists/{id}."""
    result = stored.result
    # a row saved by an older release may carry a field since retired: the contract shows today's fields only
    fields = ShortlistRow.model_fields
    rows = [{**{key: value for key, value in row.items() if key in fields}, "note": stored.notes.get(row["material"], "")}
            for row in result["results"]]
    links = ShortlistLinks(page=urls.shortlist_page(stored.id), json_twin=urls.shortlist_json(stored.id),
                           csv=urls.shortlist_csv(stored.id),
                           start_from_this=urls.screen_page(ViewQuery.from_scenario(stored.scenario)))
    return ShortlistPublic(id=stored.id, title=stored.title, created_at=stored.created_at,
                           catalog_version=stored.catalog_version, scenario=stored.scenario, rule=result["rule"],
                           window=result["window"], results=rows, cautions=result["cautions"],
                           today=rank_check(stored, catalog), links=links,
                           citations=result_citations(stored.result, catalog))


def find_shortlist(shortlist_id: str, storage) -> StoredShortlist:
    """The stored shortlist or a 404 (ids that cannot be ours are refused without a query)."""
    stored = load_shortlist(engine=storage, shortlist_id=shortlist_id) if re.match(ID_PATTERN, shortlist_id) else None
    if stored is None:
        raise not_found(f"no shortlist {shortlist_id!r}")
    return stored
