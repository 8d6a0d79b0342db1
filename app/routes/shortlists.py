"""Saved shortlists: the read-only page /s/{id}, its JSON twin and CSV, and the screen page's save form."""

from datetime import datetime, timezone

from fastapi import APIRouter, Depends, Request
from fastapi.concurrency import run_in_threadpool
from fastapi.responses import HTMLResponse, RedirectResponse, Response
from pydantic import ValidationError

from electrosieve.engine.catalog import Catalog

from .. import urls
from ..csvheader import csv_preamble, scenario_text
from ..filenames import download_name
from ..errors import Unprocessable
from ..models import ShortlistCreate, ShortlistPublic
from ..shortlists import SAVE_REFUSALS, create_shortlist, find_shortlist, saved_result, shortlist_public
from ..viewstate import ViewQuery, field_errors
from .common import (BODY_RESPONSES, CSV_RESPONSES, ERROR_RESPONSES, HTML_RESPONSES, csv_response, get_catalog,
                     get_storage, render)

router = APIRouter(tags=["pages"])

NOTE_FIELD_PREFIX = "note_"
"""The save form's note fields are ``note_<material id>``."""


@router.get("/s/{shortlist_id}.json", response_model=ShortlistPublic, responses=ERROR_RESPONSES,
            summary="A shortlist's data (JSON twin of /s/{id})")
def shortlist_json(shortlist_id: str, catalog: Catalog = Depends(get_catalog), storage=Depends(get_storage)):
    return shortlist_public(find_shortlist(shortlist_id, storage), catalog)


@router.get("/s/{shortlist_id}.csv", response_class=Response, response_model=None, responses=CSV_RESPONSES,
            summary="A shortlist's ranked candidates as CSV, with the notes")
def shortlist_csv(shortlist_id: str, catalog: Catalog = Depends(get_catalog), storage=Depends(get_storage)) -> Response:
    stored = find_shortlist(shortlist_id, storage)
    result = saved_result(stored, catalog)
    preamble = csv_preamble([
        ("electrosieve shortlist", stored.title), ("link", urls.shortlist_page(stored.id)),
        ("scenario", scenario_text(stored.scenario)), ("rule", result["rule"]),
        ("catalog version", f"{stored.catalog_version} (today: {catalog.version})"),
        ("saved", stored.created_at), ("downloaded", datetime.now(timezone.utc).isoformat(timespec="seconds")),
    ])
    return csv_response(result, download_name("electrosieve-shortlist", stored.title, stored.created_at, "csv"),
                        notes=stored.notes, preamble=preamble)


@router.get("/s/{shortlist_id}", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="A saved shortlist, read-only")
def shortlist_html(request: Request, shortlist_id: str, catalog: Catalog = Depends(get_catalog),
                   storage=Depends(get_storage)):
    page = shortlist_public(find_shortlist(shortlist_id, storage), catalog)
    return render(request, "shortlist.html", {"page": page}, json_twin=page.links.json_twin)


@router.post("/shortlists", response_class=RedirectResponse, response_model=None, status_code=303,
             responses={303: {"description": "saved: go to the new shortlist's page"}, **HTML_RESPONSES,
                        400: BODY_RESPONSES[400], 413: ERROR_RESPONSES[413], **SAVE_REFUSALS},
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
            stored = await run_in_threadpool(create_shortlist, body, catalog, storage)  # off the event loop
        except ValidationError as error:
            errors = field_errors(error, "form")
        except Unprocessable as problem:
            errors = problem.errors
    if errors:
        return render(request, "error.html", {"status": 422, "title": "The shortlist was not saved",
                                              "errors": errors, "back": urls.screen_page(view)}, status_code=422)
    return RedirectResponse(urls.shortlist_page(stored.id), status_code=303)

