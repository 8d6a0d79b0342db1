"""Saved shortlists: the read-only page /s/{id}, its JSON twin and CSV, and the screen page's save form.

A shortlist stores the screen result computed at save time (with its catalog
version); the page re-runs the scenario on today's catalog and says so when the
order of the candidates would differ.
"""

import re

from fastapi import APIRouter, Depends, Request
from fastapi.responses import HTMLResponse, RedirectResponse, Response
from pydantic import ValidationError

from electrosieve.engine.catalog import Catalog

from .. import urls
from ..models import FieldError, RankCheck, ScenarioIn, ShortlistCreate, ShortlistLinks, ShortlistPublic
from ..viewstate import ViewQuery, field_errors
from ..storage import ID_PATTERN, StoredShortlist, load_shortlist, save_shortlist
from .common import (BODY_RESPONSES, CSV_RESPONSES, ERROR_RESPONSES, HTML_RESPONSES, Unprocessable, csv_response, get_catalog,
                     get_storage, not_found, render, run_screen)
from .screen import result_citations

router = APIRouter(tags=["pages"])

NOTE_FIELD_PREFIX = "note_"
"""The save form's note fields are ``note_<material id>``."""


def create_shortlist(body: ShortlistCreate, catalog: Catalog, storage) -> StoredShortlist:
    """Screen ``body.scenario`` now, check the notes name ranked materials, and store it all at once."""
    result = run_screen(body.scenario, catalog, where=["body", "scenario"])
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
        today = run_screen(ScenarioIn.model_validate(stored.scenario, strict=False), catalog)
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
                     message=message)


def shortlist_public(stored: StoredShortlist, catalog: Catalog) -> ShortlistPublic:
    """The one data object behind /s/{id}, /s/{id}.json and /api/v1/shortlists/{id}."""
    result = stored.result
    rows = [{**row, "note": stored.notes.get(row["material"], "")} for row in result["results"]]
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


@router.get("/s/{shortlist_id}.json", response_model=ShortlistPublic, responses=ERROR_RESPONSES,
            summary="A shortlist's data (JSON twin of /s/{id})")
def shortlist_json(shortlist_id: str, catalog: Catalog = Depends(get_catalog), storage=Depends(get_storage)):
    return shortlist_public(find_shortlist(shortlist_id, storage), catalog)


@router.get("/s/{shortlist_id}.csv", response_class=Response, response_model=None, responses=CSV_RESPONSES,
            summary="A shortlist's ranked candidates as CSV, with the notes")
def shortlist_csv(shortlist_id: str, storage=Depends(get_storage)) -> Response:
    stored = find_shortlist(shortlist_id, storage)
    return csv_response(stored.result, f"electrosieve-shortlist-{stored.id}.csv", notes=stored.notes)


@router.get("/s/{shortlist_id}", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="A saved shortlist, read-only")
def shortlist_html(request: Request, shortlist_id: str, catalog: Catalog = Depends(get_catalog),
                   storage=Depends(get_storage)):
    page = shortlist_public(find_shortlist(shortlist_id, storage), catalog)
    return render(request, "shortlist.html", {"page": page}, json_twin=page.links.json_twin)


@router.post("/shortlists", response_class=RedirectResponse, response_model=None, status_code=303,
             responses={303: {"description": "saved: go to the new shortlist's page"}, **HTML_RESPONSES,
                        400: BODY_RESPONSES[400], 413: ERROR_RESPONSES[413]},
             summary="Save a shortlist from the screen page's form (without JavaScript)")
async def shortlist_form(request: Request, catalog: Catalog = Depends(get_catalog), storage=Depends(get_storage)):
    form = await request.form()
    view = ViewQuery.from_params(form)
    scenario, errors = view.scenario_in()
    notes = {key.removeprefix(NOTE_FIELD_PREFIX): str(value) for key, value in form.items()
             if key.startswith(NOTE_FIELD_PREFIX) and str(value).strip()}
    stored = None
    if not errors:
        try:
            body = ShortlistCreate.model_validate({"title": str(form.get("title", "")), "scenario": scenario.model_dump(),
                                                   "notes": notes}, strict=False)
            stored = create_shortlist(body, catalog, storage)
        except ValidationError as error:
            errors = field_errors(error, "form")
        except Unprocessable as problem:
            errors = problem.errors
    if errors:
        return render(request, "error.html", {"status": 422, "title": "The shortlist was not saved",
                                              "errors": errors, "back": urls.screen_page(view)}, status_code=422)
    return RedirectResponse(urls.shortlist_page(stored.id), status_code=303)

