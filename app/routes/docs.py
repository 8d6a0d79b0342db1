"""The API reference at /docs, rendered here from FastAPI's own OpenAPI schema (works offline, no CDN)."""

from fastapi import APIRouter, Request
from fastapi.responses import HTMLResponse

from ..payloads import roles_payload
from .common import get_catalog, render

router = APIRouter(tags=["pages"])

METHODS = ("get", "post", "put", "patch", "delete")


def _schema_name(schema: dict) -> str:
    if not schema:
        return ""
    if "$ref" in schema:
        return schema["$ref"].rsplit("/", 1)[-1]
    if schema.get("type") == "array":
        return f"list of {_schema_name(schema.get('items', {}))}"
    if "anyOf" in schema:
        return " or ".join(_schema_name(s) or s.get("type", "") for s in schema["anyOf"])
    return schema.get("type", "")


def reference(openapi: dict) -> list[dict]:
    """One entry per operation: method, path, summary, parameters, request body model and responses."""
    entries = []
    for path, operations in openapi["paths"].items():
        for method in METHODS:
            operation = operations.get(method)
            if operation is None:
                continue
            body = operation.get("requestBody", {}).get("content", {})
            entries.append({
                "method": method.upper(), "path": path, "summary": operation.get("summary", ""),
                "tag": (operation.get("tags") or [""])[0],
                "parameters": [{"name": p["name"], "in": p["in"], "required": p.get("required", False),
                                "description": p.get("description") or p.get("schema", {}).get("description", "")}
                               for p in operation.get("parameters", [])],
                "body": ", ".join(f"{kind}: {_schema_name(v.get('schema', {}))}" for kind, v in body.items()),
                "responses": [{"status": status, "description": r.get("description", ""),
                               "types": ", ".join(r.get("content", {}))}
                              for status, r in operation.get("responses", {}).items()],
            })
    return entries


@router.get("/docs", response_class=HTMLResponse, response_model=None, include_in_schema=False)
def docs_html(request: Request):
    entries = reference(request.app.openapi())
    return render(request, "docs.html", {"entries": entries, "roles": roles_payload(get_catalog(request))},
                  json_twin="/openapi.json")
