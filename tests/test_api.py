"""The JSON API under /api/v1 and /healthz: the same JSON as the CLI, and a 422 naming the field for bad input."""

import json
import re

import pytest
from fastapi.testclient import TestClient

from electrosieve.app import payloads
from electrosieve.app.cautions import CAUTIONS
from electrosieve.app.payloads import screen_payload
from electrosieve.app.main import create_app
from electrosieve.app.settings import Settings
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.diagram import diagram
from electrosieve.engine.screen import make_scenario, rule_text, screen
from tests.utils.factories import catalog_with, metal

CATALOG = default_catalog()


@pytest.fixture()
def small_client(tmp_path):
    """A fixed three-material catalog (test data): Pt, Zn and Pb with a lead hazard."""
    catalog = catalog_with(metal("Pt", "platinum-group", 30000.0), metal("Zn", price=3.0),
                           metal("Pb", "post-transition", 2.0, hazards=[("Pb^2+", "lead salts are toxic")]))
    app = create_app(Settings(data_dir=tmp_path), catalog=catalog)
    with TestClient(app, raise_server_exceptions=False) as test_client:
        yield test_client


def roundtrip(value):
    return json.loads(json.dumps(value))


def assert_names_field(response, field: str, where: str = "body"):
    assert response.status_code == 422, response.text
    detail = response.json()["detail"]
    assert isinstance(detail, list) and detail
    locs = [item["loc"] for item in detail]
    assert any(loc[0] == where and field in [str(part) for part in loc[1:]] for loc in locs), locs
    assert any(field in item["msg"] for item in detail), detail


# --- screen -------------------------------------------------------------------------------

def test_screen_matches_the_cli_json(client):
    body = {"ph": [0, 1], "potential": [-0.2, 0.0], "scale": "SHE", "role": "cathode", "materials": ["Pt", "Zn"]}
    response = client.post("/api/v1/screen", json=body)
    assert response.status_code == 200, response.text
    expected = screen_payload(screen(make_scenario(**body, catalog=CATALOG), CATALOG))
    assert response.json() == roundtrip(expected)


def test_screen_body_is_the_scenario_the_engine_echoes(client):
    first = client.post("/api/v1/screen", json={"ph": 14, "potential": [1.5, 1.7], "scale": "RHE"}).json()
    again = client.post("/api/v1/screen", json=first["scenario"])
    assert again.status_code == 200, again.text
    assert again.json() == first


def test_screen_single_numbers_mean_a_point(client):
    result = client.post("/api/v1/screen", json={"ph": 7, "potential": -0.5, "materials": ["Pt"]}).json()
    assert result["window"]["dimension"] == 0
    assert result["scenario"]["ph"] == 7 and result["scenario"]["potential"] == -0.5


def test_screen_without_materials_ranks_the_whole_catalog(client):
    result = client.post("/api/v1/screen", json={"ph": [0, 1], "potential": [1.4, 1.8], "scale": "RHE"}).json()
    assert sorted(row["material"] for row in result["results"]) == sorted(CATALOG.materials)
    assert [row["rank"] for row in result["results"]] == list(range(1, len(CATALOG.materials) + 1))
    assert result["cautions"] == list(CAUTIONS)
    assert result["rule"] == rule_text(make_scenario(ph=[0, 1], potential=[1.4, 1.8], scale="RHE", catalog=CATALOG))


def test_screen_in_acid_ranks_platinum_above_zinc_for_a_cathode(small_client):
    # Common practice: a cathode at pH 0-1 and -0.2 to 0 V vs SHE: platinum stays metallic, zinc dissolves.
    result = small_client.post("/api/v1/screen", json={"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode"}).json()
    order = [row["material"] for row in result["results"]]
    assert order.index("Pt") < order.index("Zn")
    verdicts = {row["material"]: row["verdict"] for row in result["results"]}
    assert verdicts["Pt"] == "acceptable" and verdicts["Zn"] == "rejected"


BAD_SCREENS = [
    ({"ph": True, "potential": 0}, "ph"),
    ({"ph": 7, "potential": False}, "potential"),
    ({"ph": "7", "potential": 0}, "ph"),
    ({"ph": [1, 0], "potential": 0}, "ph"),
    ({"ph": [0, 1, 2], "potential": 0}, "ph"),
    ({"ph": 20, "potential": 0}, "ph"),
    ({"ph": 7, "potential": [0.5, -0.5]}, "potential"),
    ({"ph": 7, "potential": 2.9, "scale": "SCE"}, "potential"),
    ({"ph": 7, "potential": 0, "scale": "XYZ"}, "scale"),
    ({"ph": 7, "potential": 0, "scale": "SCE", "temperature": 100}, "scale"),
    ({"ph": 7, "potential": 0, "role": "both"}, "role"),
    ({"ph": 7, "potential": 0, "accept": []}, "accept"),
    ({"ph": 7, "potential": 0, "accept": ["shiny"]}, "accept"),
    ({"ph": 7, "potential": 0, "materials": ["Unobtainium"]}, "materials"),
    ({"ph": 7, "potential": 0, "materials": []}, "materials"),
    ({"ph": 7, "potential": 0, "materials": "Pt"}, "materials"),
    ({"ph": 7, "potential": 0, "materials": ["Pt"], "family": "noble"}, "materials"),
    ({"ph": 7, "potential": 0, "family": "cheese"}, "family"),
    ({"ph": 7, "potential": 0, "rank_by": ["beauty"]}, "rank_by"),
    ({"ph": 7, "potential": 0, "rank_by": ["price", "price"]}, "rank_by"),
    ({"ph": 7, "potential": 0, "weights": {"price": -1}}, "weights"),
    ({"ph": 7, "potential": 0, "weights": {"price": 0}}, "weights"),
    ({"ph": 7, "potential": 0, "temperature": 500}, "temperature"),
    ({"ph": 7, "potential": 0, "temperature": True}, "temperature"),
    ({"ph": 7, "potential": 0, "activity": 0}, "activity"),
    ({"ph": 7, "potential": 0, "activity": 2}, "activity"),
    ({"ph": 7, "potential": 0, "colour": "red"}, "colour"),
    ({"potential": 0}, "ph"),
    ({"ph": 7}, "potential"),
]


@pytest.mark.parametrize("body, field", BAD_SCREENS, ids=lambda v: json.dumps(v) if isinstance(v, dict) else v)
def test_bad_screen_gets_422_naming_the_field(client, body, field):
    assert_names_field(client.post("/api/v1/screen", json=body), field)


@pytest.mark.parametrize("raw", [b'{"ph": NaN, "potential": 0}', b'{"ph": 7, "potential": Infinity}',
                                 b'{"ph": 7, "potential": -Infinity}', b'{"ph": [0, NaN], "potential": 0}'])
def test_nan_and_infinity_are_refused(client, raw):
    response = client.post("/api/v1/screen", content=raw, headers={"content-type": "application/json"})
    assert response.status_code == 422, response.text
    field = "ph" if b'"ph": NaN' in raw or b"NaN]" in raw else "potential"
    assert_names_field(response, field)


@pytest.mark.parametrize("raw", [b"", b"not json", b"[1, 2]", b'"ph"', b"{"])
def test_malformed_bodies_get_422_not_500(client, raw):
    response = client.post("/api/v1/screen", content=raw, headers={"content-type": "application/json"})
    assert response.status_code == 422, response.text
    assert response.json()["detail"]


def test_a_body_over_the_cap_gets_413(client):
    big = json.dumps({"ph": 7, "potential": 0, "materials": ["Pt"] * 20000}).encode()
    assert len(big) > 64 * 1024
    response = client.post("/api/v1/screen", content=big, headers={"content-type": "application/json"})
    assert response.status_code == 413
    assert "body" in response.json()["detail"][0]["loc"]


def test_a_streamed_body_over_the_cap_gets_413(client):
    def chunks():
        yield b'{"ph": 7, "potential": 0, "title": "'
        for _ in range(100):
            yield b"x" * 1024
        yield b'"}'

    response = client.post("/api/v1/screen", content=chunks(), headers={"content-type": "application/json"})
    assert response.status_code == 413


# --- diagram, point, catalog ---------------------------------------------------------------

def test_diagram_matches_the_cli_json(client):
    response = client.get("/api/v1/diagram/Zn", params={"activity": 1e-6, "temperature": 25})
    assert response.status_code == 200
    assert response.json() == roundtrip(payloads.diagram_payload(diagram("Zn", catalog=CATALOG), CATALOG))


def test_diagram_activity_moves_the_zinc_line(client):
    # Zn2+/Zn: E = -0.762 + 0.0296 log a (Bard, Parsons & Jordan 1985; Nernst)
    high = client.get("/api/v1/diagram/zn", params={"activity": 1}).json()
    line = next(b for b in high["boundaries"] if set(b["species"]) == {"Zn", "Zn^2+"})
    assert line["intercept"] == pytest.approx(-0.762, abs=0.01)


@pytest.mark.parametrize("params, field, where", [
    ({"activity": "nan"}, "activity", "query"),
    ({"activity": "inf"}, "activity", "query"),
    ({"activity": "0"}, "activity", "query"),
    ({"activity": "true"}, "activity", "query"),
    ({"temperature": "200"}, "temperature", "query"),
    ({"temperature": "warm"}, "temperature", "query"),
])
def test_bad_diagram_query_gets_422(client, params, field, where):
    assert_names_field(client.get("/api/v1/diagram/Zn", params=params), field, where)


def test_unknown_element_gets_422_naming_the_element(client):
    assert_names_field(client.get("/api/v1/diagram/Xx"), "element", "path")


def test_point_zinc_is_immune_far_below_its_line(client):
    # Common practice: zinc metal is stable at -1.5 V vs SHE at pH 7 (the Zn2+/Zn line lies near -0.94 V at 10^-6).
    point = client.get("/api/v1/point/Zn", params={"ph": 7, "potential": -1.5}).json()
    assert point["formula"] == "Zn" and point["region"] == "immunity"


def test_point_on_the_calomel_scale(client):
    # SCE = +0.2412 V vs SHE at 25 °C (Bard & Faulkner 2001, Table C.2): -1.2 V vs SCE = -0.9588 V vs SHE
    point = client.get("/api/v1/point/Zn", params={"ph": 4, "potential": -1.2, "scale": "sce"}).json()
    assert point["scale"] == "SCE"
    assert point["potential_she"] == pytest.approx(-0.9588, abs=1e-4)


def test_point_on_the_rhe_follows_the_ph(client):
    # E(SHE) = E(RHE) - 0.05916 pH at 25 °C (Nernst; Bard & Faulkner 2001, §2.1): 0 V vs RHE at pH 14 = -0.8282 V vs SHE
    point = client.get("/api/v1/point/Pt", params={"ph": 14, "potential": 0, "scale": "RHE"}).json()
    assert point["potential_she"] == pytest.approx(-0.8282, abs=2e-4)


@pytest.mark.parametrize("params, field", [
    ({"potential": 0}, "ph"),
    ({"ph": 7}, "potential"),
    ({"ph": "nan", "potential": 0}, "ph"),
    ({"ph": 7, "potential": "-inf"}, "potential"),
    ({"ph": 99, "potential": 0}, "ph"),
    ({"ph": 7, "potential": 0, "scale": "nowhere"}, "scale"),
    ({"ph": 7, "potential": 4.9}, "potential"),
])
def test_bad_point_query_gets_422(client, params, field):
    assert_names_field(client.get("/api/v1/point/Zn", params=params), field, "query")


def test_materials_match_the_cli_json(client):
    response = client.get("/api/v1/materials")
    assert response.status_code == 200
    assert response.json() == roundtrip(payloads.materials_payload(CATALOG))


def test_scales_and_sources(client):
    scales = client.get("/api/v1/scales").json()
    assert {row["id"] for row in scales} == set(CATALOG.scales)
    sources = client.get("/api/v1/sources/Fe").json()
    assert sources == roundtrip(payloads.sources_payload(CATALOG, "Fe"))
    assert all(row["source"] in sources["citations"] for row in sources["species"])
    assert_names_field(client.get("/api/v1/sources/Xx"), "element", "path")


# --- shortlists ---------------------------------------------------------------------------

SCENARIO = {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn", "Pb"]}


def test_shortlist_create_and_get(small_client):
    response = small_client.post("/api/v1/shortlists", json={"title": "Acid cathodes", "scenario": SCENARIO,
                                                              "notes": {"Pt": "ask stores", "zn": "no"}})
    assert response.status_code == 201, response.text
    created = response.json()
    assert set(created) == {"id", "url"}
    assert re.fullmatch(r"[A-Za-z0-9_-]{16}", created["id"])  # 96 random bits
    assert created["url"] == f"/s/{created['id']}"
    assert response.headers["location"] == created["url"]
    stored = small_client.get(f"/api/v1/shortlists/{created['id']}")
    assert stored.status_code == 200
    body = stored.json()
    assert body["title"] == "Acid cathodes"
    notes = {row["material"]: row["note"] for row in body["results"]}
    assert notes == {"Pt": "ask stores", "Zn": "no", "Pb": ""}
    assert body["today"]["same_order"] is True
    assert body["links"]["csv"] == f"/s/{created['id']}.csv"


def test_shortlist_ids_differ(small_client):
    ids = {small_client.post("/api/v1/shortlists", json={"title": "t", "scenario": SCENARIO}).json()["id"]
           for _ in range(20)}
    assert len(ids) == 20


@pytest.mark.parametrize("path", ["/api/v1/shortlists/AAAAAAAAAAAAAAAA", "/api/v1/shortlists/nope",
                                  "/api/v1/shortlists/..%2F..%2Fetc"])
def test_unknown_shortlist_is_404(small_client, path):
    response = small_client.get(path)
    assert response.status_code == 404
    assert response.json()["detail"]


@pytest.mark.parametrize("body, field", [
    ({"title": "x" * 201, "scenario": SCENARIO}, "title"),
    ({"title": "   ", "scenario": SCENARIO}, "title"),
    ({"title": 5, "scenario": SCENARIO}, "title"),
    ({"scenario": SCENARIO}, "title"),
    ({"title": "t"}, "scenario"),
    ({"title": "t", "scenario": {**SCENARIO, "ph": [3, 1]}}, "ph"),
    ({"title": "t", "scenario": SCENARIO, "notes": {"Pt": "n" * 2001}}, "Pt"),
    ({"title": "t", "scenario": SCENARIO, "notes": {"Au": "not ranked here"}}, "Au"),
    ({"title": "t", "scenario": SCENARIO, "notes": {"Pt": 3}}, "Pt"),
    ({"title": "t", "scenario": SCENARIO, "extra": 1}, "extra"),
])
def test_bad_shortlist_gets_422_naming_the_field(small_client, body, field):
    assert_names_field(small_client.post("/api/v1/shortlists", json=body), field)


def test_shortlist_length_limits_are_inclusive(small_client):
    response = small_client.post("/api/v1/shortlists", json={"title": "t" * 200, "scenario": SCENARIO,
                                                              "notes": {"Pt": "n" * 2000}})
    assert response.status_code == 201, response.text


# --- health, headers, schema ---------------------------------------------------------------

def test_healthz(client):
    body = client.get("/healthz").json()
    assert body["status"] == "ok" and body["storage"] == "ok"
    assert body["catalog_version"] == CATALOG.version and body["materials"] == len(CATALOG.materials)


def test_every_response_carries_a_strict_content_security_policy(client):
    for path in ("/healthz", "/api/v1/materials", "/api/v1/shortlists/nope"):
        policy = client.get(path).headers["content-security-policy"]
        assert "script-src 'self'" in policy and "unsafe-eval" not in policy
        assert "'unsafe-inline'" not in policy.split("script-src")[1].split(";")[0]


def test_openapi_declares_the_4xx_responses(client):
    schema = client.get("/openapi.json").json()
    for path, methods in schema["paths"].items():
        if not path.startswith("/api/v1"):
            continue
        for method, operation in methods.items():
            assert "422" in operation["responses"], (method, path)
            assert "200" in operation["responses"] or "201" in operation["responses"], (method, path)
            content = (operation["responses"].get("200") or operation["responses"]["201"]).get("content", {})
            assert "application/json" in content, (method, path)
    assert "404" in schema["paths"]["/api/v1/shortlists/{shortlist_id}"]["get"]["responses"]
    assert "413" in schema["paths"]["/api/v1/screen"]["post"]["responses"]
    assert "201" in schema["paths"]["/api/v1/shortlists"]["post"]["responses"]


def api_routes(routes):
    """Every APIRoute, descending into included routers."""
    from fastapi.routing import APIRoute

    for route in routes:
        if isinstance(route, APIRoute):
            yield route
        inner = getattr(route, "original_router", None) or route  # included routers, old and new FastAPI
        yield from api_routes(getattr(inner, "routes", []) or [])


def test_every_json_route_has_a_response_model():
    from fastapi.responses import HTMLResponse, RedirectResponse, Response

    routes = list(api_routes(create_app(Settings(), catalog=CATALOG).routes))
    json_routes = [r for r in routes if getattr(r.response_class, "value", r.response_class)
                   not in (HTMLResponse, RedirectResponse, Response)]
    assert len(json_routes) >= 12, [r.path for r in routes]
    missing = [r.path for r in json_routes if r.response_model is None]
    assert not missing, missing
