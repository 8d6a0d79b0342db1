"""The OpenAPI schema is the complete contract: real responses carry exactly the keys it declares.

Each response is held against its route's declared 200 schema recursively: every key of every object must be a
declared property (only a free-form map, one with no declared properties, such as the plotting library's
figure, may carry keys of its own), every required key must be there,
and every value must have the declared type.
"""

import pytest

from electrosieve.app.payloads import scenario_payload
from electrosieve.engine.screen import make_scenario

SCENARIO = {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn", "Cr"],
            "temperature": 60}
QUERY = "ph_low=0&ph_high=1&potential_low=-0.2&potential_high=0&scale=SHE&role=cathode&temperature=60"

TYPES = {"object": dict, "array": list, "string": str, "boolean": bool, "null": type(None)}


def resolve(schema: dict, spec: dict) -> dict:
    while "$ref" in schema:
        name = schema["$ref"].rsplit("/", 1)[-1]
        schema = spec["components"]["schemas"][name]
    return schema


def problems(value, schema: dict, spec: dict, path: str = "$") -> list[str]:
    """Where ``value`` departs from ``schema`` (empty when it conforms)."""
    schema = resolve(schema, spec)
    branches = schema.get("anyOf") or schema.get("oneOf")
    if branches:
        found = [problems(value, branch, spec, path) for branch in branches]
        return [] if any(not f for f in found) else min(found, key=len)
    kind = schema.get("type")
    if kind in ("number", "integer"):
        ok = isinstance(value, (int, float)) and not isinstance(value, bool)
        if kind == "integer":
            ok = ok and float(value).is_integer()
        return [] if ok else [f"{path}: {value!r} is not a {kind}"]
    if kind in TYPES and not isinstance(value, TYPES[kind]):
        return [f"{path}: {type(value).__name__} where the schema says {kind}"]
    if "const" in schema and value != schema["const"]:
        return [f"{path}: {value!r} is not {schema['const']!r}"]
    if "enum" in schema and value not in schema["enum"]:
        return [f"{path}: {value!r} is not one of {schema['enum']}"]
    found = []
    if isinstance(value, dict):
        properties = schema.get("properties", {})
        extra = schema.get("additionalProperties", True)
        if properties and not isinstance(extra, dict):
            extra = False  # an object with declared fields: nothing else may ride along
        for key in schema.get("required", []):
            if key not in value:
                found.append(f"{path}: required key {key!r} missing")
        for key, item in value.items():
            if key in properties:
                found += problems(item, properties[key], spec, f"{path}.{key}")
            elif isinstance(extra, dict):
                found += problems(item, extra, spec, f"{path}.{key}")
            elif extra is not True:
                found.append(f"{path}: key {key!r} is not declared in the schema")
    if isinstance(value, list) and "items" in schema:
        for k, item in enumerate(value):
            found += problems(item, schema["items"], spec, f"{path}[{k}]")
    return found


def declared(spec: dict, path: str, method: str = "get") -> dict:
    responses = spec["paths"][path][method]["responses"]
    answer = responses.get("200") or responses["201"]
    return answer["content"]["application/json"]["schema"]


@pytest.fixture()
def spec(client):
    return client.get("/openapi.json").json()


def test_the_checker_refuses_an_undeclared_key(spec):
    schema = declared(spec, "/api/v1/point/{element}")
    assert problems({"formula": "Zn"}, schema, spec)  # required keys missing
    good = {"formula": "Zn", "phase": "solid", "region": "immunity", "element": "Zn", "ph": 3.0, "potential": -1.2,
            "scale": "SHE", "potential_she": -1.2, "activity": 1e-6, "temperature_c": 25.0}
    assert problems(good, schema, spec) == []
    assert problems({**good, "surprise": 1}, schema, spec) == ["$: key 'surprise' is not declared in the schema"]
    assert problems({**good, "ph": "3"}, schema, spec)


def test_the_response_models_forbid_undeclared_keys(spec):
    for name, schema in spec["components"]["schemas"].items():
        if schema.get("type") == "object" and schema.get("properties") and name not in ("HTTPValidationError",
                                                                                         "ValidationError"):
            assert schema.get("additionalProperties") is not True, name


def test_screen_response_matches_the_schema(client, spec):
    body = client.post("/api/v1/screen", json=SCENARIO).json()
    assert body["temperature_notes"] and body["conditions"] and "neutral_ph" in body
    assert problems(body, declared(spec, "/api/v1/screen", "post"), spec) == []


@pytest.mark.parametrize("temperature", [25, 60])
def test_diagram_response_matches_the_schema(client, spec, temperature):
    body = client.get(f"/api/v1/diagram/Zn?temperature={temperature}").json()
    assert problems(body, declared(spec, "/api/v1/diagram/{element}"), spec) == []


def test_point_response_matches_the_schema(client, spec):
    body = client.get("/api/v1/point/Zn?ph=3&potential=0.2&scale=RHE").json()
    assert problems(body, declared(spec, "/api/v1/point/{element}"), spec) == []


def test_compare_and_screen_pages_match_the_schema(client, spec):
    page = client.get(f"/compare.json?{QUERY}&compare=Pt&compare=Zn&compare=Cr").json()
    assert problems(page, declared(spec, "/compare.json"), spec) == []
    page = client.get(f"/screen.json?{QUERY}").json()
    assert problems(page, declared(spec, "/screen.json"), spec) == []


def test_shortlist_responses_match_the_schema(client, spec):
    created = client.post("/api/v1/shortlists", json={"title": "contract", "scenario": SCENARIO,
                                                      "notes": {"Pt": "in stock"}})
    assert problems(created.json(), declared(spec, "/api/v1/shortlists", "post"), spec) == []
    shortlist_id = created.json()["id"]
    body = client.get(f"/api/v1/shortlists/{shortlist_id}").json()
    assert problems(body, declared(spec, "/api/v1/shortlists/{shortlist_id}"), spec) == []
    page = client.get(f"/s/{shortlist_id}.json").json()
    assert problems(page, declared(spec, "/s/{shortlist_id}.json"), spec) == []


def test_catalog_responses_match_the_schema(client, spec):
    for path, url in (("/api/v1/materials", "/api/v1/materials"), ("/api/v1/scales", "/api/v1/scales"),
                      ("/api/v1/sources/{element}", "/api/v1/sources/Zn"), ("/materials.json", "/materials.json"),
                      ("/materials/{material_id}.json", "/materials/Pt.json")):
        assert problems(client.get(url).json(), declared(spec, path), spec) == [], path


def test_the_scenario_echo_is_a_body_the_api_accepts_again():
    scenario = make_scenario(ph=[2, 3], potential=-0.1, scale="sce", role="Cathode", materials=["Cu"])
    echo = scenario_payload(scenario)
    assert echo["scale"] == "SCE" and echo["role"] == "cathode" and echo["potential"] == -0.1
    assert scenario_payload(make_scenario(**echo)) == echo


def store_as_saved(client, shortlist_id: str, layout: int, scenario: dict, result: dict) -> None:
    """Write a shortlist row as an older release wrote it (layout 1: the whole screen result; 2: the compact record)."""
    import json

    from sqlalchemy import insert

    from electrosieve.app.storage import shortlists

    with client.app.state.electrosieve.storage.begin() as connection:
        connection.execute(insert(shortlists).values(
            id=shortlist_id, title="saved by an older release", created_at="2026-01-01T00:00:00+00:00",
            catalog_version=result["catalog_version"], format=layout, scenario=json.dumps(scenario),
            result=json.dumps(result), notes="{}"))


def test_a_whole_record_with_a_since_retired_field_and_without_a_since_added_region_still_reads(client, spec):
    result = client.post("/api/v1/screen", json=SCENARIO).json()
    for row in result["results"]:  # as an older release might have stored it (test data)
        row["retired_field"] = 1.0
        del row["fractions"]["hydride"]
    store_as_saved(client, "WholeRecordOld01", 1, result["scenario"], result)
    body = client.get("/api/v1/shortlists/WholeRecordOld01")
    assert body.status_code == 200
    assert problems(body.json(), declared(spec, "/api/v1/shortlists/{shortlist_id}"), spec) == []
    assert all(row["fractions"]["hydride"] == 0.0 for row in body.json()["results"])
    assert client.get("/s/WholeRecordOld01.csv").status_code == 200


def test_a_compact_record_with_a_since_retired_column_and_without_a_since_added_region_still_reads(client, spec):
    from electrosieve.app.shortlists import compact_record

    result = client.post("/api/v1/screen", json=SCENARIO).json()
    record = compact_record(result)
    gone = record["columns"].index("hydride")  # as saved before the hydride region existed (test data)
    record["columns"] = [*record["columns"][:gone], *record["columns"][gone + 1:], "retired_column"]
    record["results"] = [[*values[:gone], *values[gone + 1:], 1.0] for values in record["results"]]
    store_as_saved(client, "CompactRecOld001", 2, result["scenario"], record)
    body = client.get("/api/v1/shortlists/CompactRecOld001")
    assert body.status_code == 200
    assert problems(body.json(), declared(spec, "/api/v1/shortlists/{shortlist_id}"), spec) == []
    assert all(row["fractions"]["hydride"] == 0.0 for row in body.json()["results"])
    assert client.get("/s/CompactRecOld001.csv").status_code == 200
