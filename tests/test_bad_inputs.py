"""A catalogue of named bad inputs across the command line and the API: each gets the right exit code or
status and a message naming its field, never a traceback or a 500.

Command line: ``app.cli.main([...])`` returns 2 and prints exactly one line on stderr that names the
field, and nothing on stdout. API (TestClient, in-process): the status given in the table, and a
``detail`` entry whose ``loc`` and ``msg`` name the field. Titles in any script are accepted and come
back unchanged.
"""

import json
from dataclasses import dataclass, field as dataclass_field

import pytest
from fastapi.testclient import TestClient

from electrosieve.app.cli import EXIT_BAD_INPUT, main
from electrosieve.app.main import create_app
from electrosieve.app.settings import DEFAULT_MAX_BODY_BYTES, Settings
from electrosieve.app.storage import NOTE_MAX, TITLE_MAX
from electrosieve.engine.catalog import default_catalog

CATALOG = default_catalog()
CAP = DEFAULT_MAX_BODY_BYTES
JSON = {"content-type": "application/json"}
SCENARIO = {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn"]}


# --- the command line ----------------------------------------------------------------------

@dataclass(frozen=True)
class CliCase:
    name: str
    argv: list
    field: str
    """Text the one-line message must contain: the option or field at fault."""


CLI_CASES = [
    CliCase("screen: pH not a number", ["screen", "--ph", "seven", "--potential", "0"], "--ph"),
    CliCase("screen: empty pH", ["screen", "--ph", "", "--potential", "0"], "--ph"),
    CliCase("screen: pH range with three ends", ["screen", "--ph", "1:2:3", "--potential", "0"], "--ph"),
    CliCase("screen: pH range with no ends", ["screen", "--ph", ":", "--potential", "0"], "--ph"),
    CliCase("screen: NaN pH", ["screen", "--ph", "nan", "--potential", "0"], "ph"),
    CliCase("screen: infinite pH", ["screen", "--ph", "inf", "--potential", "0"], "ph"),
    CliCase("screen: minus infinite potential", ["screen", "--ph", "7", "--potential=-inf"], "potential"),
    CliCase("screen: potential overflowing to infinity", ["screen", "--ph", "7", "--potential", "1e400"], "potential"),
    CliCase("screen: huge pH", ["screen", "--ph", "1e308", "--potential", "0"], "ph"),
    CliCase("screen: inverted pH range", ["screen", "--ph", "3:1", "--potential", "0"], "ph"),
    CliCase("screen: inverted potential range", ["screen", "--ph", "7", "--potential", "0.5:-0.5"], "potential"),
    CliCase("screen: NaN activity", ["screen", "--ph", "7", "--potential", "0", "--activity", "nan"], "activity"),
    CliCase("screen: zero activity", ["screen", "--ph", "7", "--potential", "0", "--activity", "0"], "activity"),
    CliCase("screen: infinite temperature", ["screen", "--ph", "7", "--potential", "0", "--temperature", "inf"],
            "temperature"),
    CliCase("screen: huge temperature", ["screen", "--ph", "7", "--potential", "0", "--temperature", "1e9"],
            "temperature"),
    CliCase("screen: unknown material", ["screen", "--ph", "7", "--potential", "0", "--materials", "Unobtainium"],
            "Unobtainium"),
    CliCase("screen: empty material list", ["screen", "--ph", "7", "--potential", "0", "--materials", ","],
            "materials"),
    CliCase("screen: unknown role", ["screen", "--ph", "7", "--potential", "0", "--role", "both"], "role"),
    CliCase("screen: empty acceptance", ["screen", "--ph", "7", "--potential", "0", "--accept", ","], "--accept"),
    CliCase("screen: unknown scale", ["screen", "--ph", "7", "--potential", "0", "--scale", "XYZ"], "scale"),
    CliCase("screen: weights without values", ["screen", "--ph", "7", "--potential", "0", "--weights", "price"],
            "--weights"),
    CliCase("screen: NaN weight", ["screen", "--ph", "7", "--potential", "0", "--weights", "price=nan"], "price"),
    CliCase("screen: infinite weight", ["screen", "--ph", "7", "--potential", "0", "--weights", "price=inf"], "price"),
    CliCase("screen: unknown ranking key", ["screen", "--ph", "7", "--potential", "0", "--rank-by", "beauty"],
            "ranking key"),
    CliCase("screen: unknown family", ["screen", "--ph", "7", "--potential", "0", "--family", "cheese"], "family"),
    CliCase("screen: both --json and --csv", ["screen", "--ph", "7", "--potential", "0", "--json", "--csv"], "--csv"),
    CliCase("screen: missing overlay directory", ["screen", "--ph", "7", "--potential", "0", "--overlay", "/nonexistent/x"],
            "overlay"),
    CliCase("diagram: unknown element", ["diagram", "Xx"], "element"),
    CliCase("diagram: NaN activity", ["diagram", "Zn", "--activity", "nan"], "activity"),
    CliCase("diagram: negative activity", ["diagram", "Zn", "--activity", "-1"], "activity"),
    CliCase("diagram: empty pH limits", ["diagram", "Zn", "--ph-limits", "5:5"], "pH limits"),
    CliCase("diagram: inverted pH limits", ["diagram", "Zn", "--ph-limits", "5:1"], "pH limits"),
    CliCase("diagram: NaN in the potential limits", ["diagram", "Zn", "--potential-limits", "nan:1"], "--potential-limits"),
    CliCase("diagram: temperature below absolute zero", ["diagram", "Zn", "--temperature", "-300"], "temperature"),
    CliCase("diagram: unknown figure type", ["diagram", "Zn", "--out", "figure.bmp"], "--out"),
    CliCase("point: NaN pH", ["point", "Zn", "--ph", "nan", "--potential", "0"], "ph"),
    CliCase("point: infinite potential", ["point", "Zn", "--ph", "7", "--potential", "inf"], "potential"),
    CliCase("point: pH outside the diagram", ["point", "Zn", "--ph", "99", "--potential", "0"], "ph"),
    CliCase("point: missing potential", ["point", "Zn", "--ph", "7"], "--potential"),
    CliCase("convert: RHE without pH", ["convert", "0", "--from", "SHE", "--to", "RHE"], "--ph"),
    CliCase("convert: unknown scale", ["convert", "0", "--from", "SHE", "--to", "XYZ"], "XYZ"),
    CliCase("sources: empty element", ["sources", ""], "element"),
    CliCase("serve: no workers", ["serve", "--workers", "0"], "--workers"),
    CliCase("serve: port out of range", ["serve", "--port", "99999"], "--port"),
    CliCase("serve: port not a number", ["serve", "--port", "abc"], "--port"),
    CliCase("unknown command", ["frobnicate"], "command"),
    CliCase("convert: NaN value", ["convert", "nan", "--from", "SHE", "--to", "SCE"], "VALUE"),
    CliCase("convert: infinite value", ["convert", "inf", "--from", "SHE", "--to", "SCE"], "VALUE"),
    CliCase("convert: NaN pH for the RHE", ["convert", "0", "--from", "SHE", "--to", "RHE", "--ph", "nan"], "--ph"),
    CliCase("serve: fractional workers", ["serve", "--workers", "2.5"], "--workers"),
    CliCase("serve: NaN workers", ["serve", "--workers", "nan"], "--workers"),
]


class WouldServe(Exception):
    """Raised instead of starting uvicorn: a bad `serve` command line must stop before that."""


@pytest.fixture()
def no_server(monkeypatch, tmp_path):
    import uvicorn

    def refuse(*_args, **_kwargs):
        raise WouldServe("uvicorn.run was reached")

    monkeypatch.setattr(uvicorn, "run", refuse)
    monkeypatch.setenv("ELECTROSIEVE_DATA_DIR", str(tmp_path))  # serve() may set it: restored afterwards
    monkeypatch.delenv("DATABASE_URL", raising=False)


@pytest.mark.parametrize("case", [pytest.param(c, id=c.name) for c in CLI_CASES])
def test_bad_command_line_exits_2_with_one_line_naming_the_field(case, capsys, no_server):
    try:
        code = main(case.argv)
    except WouldServe:
        code = "started a server"
    captured = capsys.readouterr()
    lines = captured.err.strip().splitlines()
    assert code == EXIT_BAD_INPUT, (code, captured.err, captured.out[:200])
    assert len(lines) == 1 and lines[0].startswith("error: "), captured.err
    assert case.field in lines[0], lines[0]
    assert "Traceback" not in captured.err and not captured.out


def test_the_catalogue_has_at_least_thirty_command_line_cases():
    assert len(CLI_CASES) >= 30
    assert len({c.name for c in CLI_CASES}) == len(CLI_CASES)


# --- the API ---------------------------------------------------------------------------------

@dataclass(frozen=True)
class ApiCase:
    name: str
    method: str
    path: str
    status: int
    field: str
    """Text a detail entry's loc (or, for 404, msg) must contain."""
    body: object = None
    raw: bytes | None = None
    headers: dict = dataclass_field(default_factory=dict)
    where: str = "body"


def screen(name, body, field, status=422):
    return ApiCase(name, "POST", "/api/v1/screen", status, field, body=body)


def screen_raw(name, raw, field, status=422):
    return ApiCase(name, "POST", "/api/v1/screen", status, field, raw=raw, headers=JSON)


def shortlist(name, body, field, status=422):
    return ApiCase(name, "POST", "/api/v1/shortlists", status, field, body=body)


def get(name, path, status, field, where="query"):
    return ApiCase(name, "GET", path, status, field, where=where)


def chunks_over_the_cap():
    yield b'{"ph": 7, "potential": 0, "scale": "'
    for _ in range(CAP // 1024 + 8):
        yield b"S" * 1024
    yield b'"}'


API_CASES = [
    # wrong types
    screen("pH as a string", {"ph": "7", "potential": 0}, "ph"),
    screen("potential as a boolean", {"ph": 7, "potential": False}, "potential"),
    screen("pH as null", {"ph": None, "potential": 0}, "ph"),
    screen("pH as an object", {"ph": {"low": 1}, "potential": 0}, "ph"),
    screen("materials as one string", {"ph": 7, "potential": 0, "materials": "Pt"}, "materials"),
    screen("material id as a number", {"ph": 7, "potential": 0, "materials": [5]}, "materials"),
    screen("temperature as a list", {"ph": 7, "potential": 0, "temperature": [25]}, "temperature"),
    screen("unknown field", {"ph": 7, "potential": 0, "colour": "red"}, "colour"),
    shortlist("title as a number", {"title": 5, "scenario": SCENARIO}, "title"),
    shortlist("notes as a list", {"title": "t", "scenario": SCENARIO, "notes": ["Pt"]}, "notes"),
    # NaN and infinities, as JSON literals in raw bodies
    screen_raw("NaN pH literal", b'{"ph": NaN, "potential": 0}', "ph"),
    screen_raw("Infinity potential literal", b'{"ph": 7, "potential": Infinity}', "potential"),
    screen_raw("-Infinity potential literal", b'{"ph": 7, "potential": -Infinity}', "potential"),
    screen_raw("NaN inside a pH range", b'{"ph": [0, NaN], "potential": 0}', "ph"),
    screen_raw("NaN activity literal", b'{"ph": 7, "potential": 0, "activity": NaN}', "activity"),
    screen_raw("Infinity temperature literal", b'{"ph": 7, "potential": 0, "temperature": Infinity}', "temperature"),
    screen_raw("NaN weight literal", b'{"ph": 7, "potential": 0, "weights": {"price": NaN}}', "weights"),
    ApiCase("NaN pH inside a shortlist's scenario", "POST", "/api/v1/shortlists", 422, "ph", headers=JSON,
            raw=b'{"title": "t", "scenario": {"ph": NaN, "potential": 0}}'),
    get("NaN pH in a point query", "/api/v1/point/Zn?ph=nan&potential=0", 422, "ph"),
    get("infinite activity in a diagram query", "/api/v1/diagram/Zn?activity=inf", 422, "activity"),
    get("NaN pH on the screen page's twin", "/screen.json?ph_low=nan&potential_low=0", 422, "ph_low"),
    get("NaN activity on a material page's twin", "/materials/Pt.json?activity=nan", 422, "activity"),
    # huge numbers
    screen("huge pH", {"ph": 1e308, "potential": 0}, "ph"),
    screen_raw("potential literal overflowing to infinity", b'{"ph": 7, "potential": 1e400}', "potential"),
    screen_raw("400-digit integer pH", b'{"ph": 1' + b"0" * 400 + b', "potential": 0}', "ph"),
    screen("huge temperature", {"ph": 7, "potential": 0, "temperature": 1e308}, "temperature"),
    screen("activity underflowing to zero", {"ph": 7, "potential": 0, "activity": 1e-320}, "activity"),
    screen("huge weight", {"ph": 7, "potential": 0, "weights": {"price": 1e300}}, "weights"),
    get("huge potential in a point query", "/api/v1/point/Zn?ph=7&potential=1e308", 422, "potential"),
    get("huge temperature on the screen page's twin",
        "/screen.json?ph_low=7&potential_low=0&temperature=1e308", 422, "temperature"),
    # empty and inverted ranges
    screen("inverted pH range", {"ph": [3, 1], "potential": 0}, "ph"),
    screen("inverted potential range", {"ph": 7, "potential": [0.5, -0.5]}, "potential"),
    screen("empty pH list", {"ph": [], "potential": 0}, "ph"),
    screen("pH range with three ends", {"ph": [0, 1, 2], "potential": 0}, "ph"),
    screen("empty acceptance list", {"ph": 7, "potential": 0, "accept": []}, "accept"),
    screen("empty material list", {"ph": 7, "potential": 0, "materials": []}, "materials"),
    get("inverted pH range on the screen page's twin", "/screen.json?ph_low=3&ph_high=1&potential_low=0", 422,
        "ph_low"),
    get("no material to compare", "/compare.json?ph_low=7&potential_low=0", 422, "compare"),
    # unknown ids
    get("unknown shortlist id", "/api/v1/shortlists/AAAAAAAAAAAAAAAA", 404, "AAAAAAAAAAAAAAAA", "path"),
    get("unknown shortlist on its JSON twin", "/s/AAAAAAAAAAAAAAAA.json", 404, "AAAAAAAAAAAAAAAA", "path"),
    get("malformed shortlist id on its CSV", "/s/not-an-id.csv", 404, "not-an-id", "path"),
    get("unknown material page", "/materials/Unobtainium.json", 404, "Unobtainium", "path"),
    get("unknown element's diagram", "/api/v1/diagram/Xx", 422, "element", "path"),
    get("unknown element's sources", "/api/v1/sources/Xx", 422, "element", "path"),
    screen("unknown material to screen", {"ph": 7, "potential": 0, "materials": ["Unobtainium"]}, "materials"),
    screen("unknown reference scale", {"ph": 7, "potential": 0, "scale": "XYZ"}, "scale"),
    shortlist("note for a material not ranked", {"title": "t", "scenario": SCENARIO, "notes": {"Au": "?"}}, "Au"),
    # oversize bodies
    screen("body over the cap", {"ph": 7, "potential": 0, "materials": ["Pt"] * (CAP // 4)}, "body", 413),
    shortlist("title making the body over the cap", {"title": "t" * (CAP + 1), "scenario": SCENARIO}, "body", 413),
    ApiCase("streamed body over the cap (no Content-Length)", "POST", "/api/v1/screen", 413, "body",
            raw=chunks_over_the_cap, headers=JSON),
    shortlist("title over its limit", {"title": "t" * (TITLE_MAX + 1), "scenario": SCENARIO}, "title"),
    shortlist("note over its limit", {"title": "t", "scenario": SCENARIO, "notes": {"Pt": "n" * (NOTE_MAX + 1)}},
              "Pt"),
    shortlist("blank title", {"title": "   ", "scenario": SCENARIO}, "title"),
    shortlist("NUL in a title", {"title": "a\u0000b", "scenario": SCENARIO}, "title"),
    shortlist("line break in a title", {"title": "two\nlines", "scenario": SCENARIO}, "title"),
    shortlist("NUL in a note", {"title": "t", "scenario": SCENARIO, "notes": {"Pt": "a\u0000b"}}, "Pt"),
    ApiCase("lone surrogate in a title", "POST", "/api/v1/shortlists", 422, "title", headers=JSON,
            raw=b'{"title": "\\ud800", "scenario": {"ph": 7, "potential": 0}}'),
    # malformed JSON
    screen_raw("empty body", b"", "body"),
    screen_raw("unclosed object", b"{", "body"),
    screen_raw("trailing comma", b'{"ph": 7, "potential": 0,}', "body"),
    screen_raw("single quotes", b"{'ph': 7, 'potential': 0}", "body"),
    screen_raw("plain text", b"not json", "body"),
    screen_raw("a list instead of an object", b"[1, 2]", "body"),
    screen_raw("JSON null", b"null", "body"),
    screen_raw("body not UTF-8", b'{"ph": 7, "potential": 0, "scale": "\xff\xfe"}', "body", status=400),
    screen_raw("nested 5000 levels deep", b'{"ph": ' + b"[" * 5000 + b"]" * 5000 + b"}", "body", status=400),
    ApiCase("JSON sent as text/plain", "POST", "/api/v1/screen", 422, "body", raw=b'{"ph": 7, "potential": 0}',
            headers={"content-type": "text/plain"}),
]


@pytest.fixture(scope="module")
def client(tmp_path_factory):
    app = create_app(Settings(data_dir=tmp_path_factory.mktemp("bad-inputs")), catalog=CATALOG)
    with TestClient(app, raise_server_exceptions=False) as test_client:
        yield test_client


def send(client, case: ApiCase):
    if case.method == "GET":
        return client.get(case.path, headers={"accept": "application/json", **case.headers})
    if case.raw is not None:
        content = case.raw() if callable(case.raw) else case.raw
        return client.post(case.path, content=content, headers=case.headers)
    return client.post(case.path, json=case.body, headers=case.headers)


@pytest.mark.parametrize("case", API_CASES, ids=lambda c: c.name)
def test_bad_request_gets_the_right_status_and_names_the_field(client, case):
    response = send(client, case)
    assert response.status_code == case.status, response.text[:500]
    assert response.headers["content-type"].startswith("application/json")
    detail = response.json()["detail"]
    assert isinstance(detail, list) and detail, detail
    text = json.dumps(detail, ensure_ascii=False)
    assert "Traceback" not in text and "NaN" not in response.text
    if case.status == 404:
        assert any(item["loc"][:1] == ["path"] and case.field in item["msg"] for item in detail), detail
        return
    named = [item for item in detail
             if item["loc"][:1] == [case.where] and (case.field in [str(p) for p in item["loc"][1:]]
                                                     or item["loc"] == [case.field])]
    assert named, detail
    assert any(item["msg"].split(":")[0].strip() and case.field in item["msg"] for item in named), detail


def test_the_catalogue_has_at_least_thirty_api_cases_in_every_group():
    assert len(API_CASES) >= 30
    assert len({c.name for c in API_CASES}) == len(API_CASES)
    statuses = {c.status for c in API_CASES}
    assert {400, 404, 413, 422} <= statuses


def test_a_bad_form_post_names_the_query_field_on_an_html_page(client):
    response = client.post("/shortlists", data={"title": "t", "ph_low": "nan", "potential_low": "0", "pick": "all"},
                           headers={"accept": "text/html"})
    assert response.status_code == 422
    assert response.headers["content-type"].startswith("text/html")
    assert "ph_low" in response.text


# --- unicode titles: accepted and round-tripped ---------------------------------------------

UNICODE_TITLES = {
    "accents and dashes": "Électrodes acides — pH 0–1, 25 °C",
    "Greek and symbols": "Ανοδος ± 0,2 V ≤ E ≤ 1,8 V (Ω·cm²)",
    "Cyrillic": "Катоды для электролиза",
    "CJK": "電極材料の選定 전극 재료",
    "Arabic and Hebrew, right to left": "أقطاب كهربائية ואלקטרודות",
    "emoji outside the BMP": "🧪⚡ electrodes 🔋",
    "combining marks": "e\u0301lectrode Zn\u0308",
    "exactly 200 astral characters": "𝔼" * TITLE_MAX,
}


@pytest.mark.parametrize("title", list(UNICODE_TITLES.values()), ids=list(UNICODE_TITLES))
def test_unicode_title_is_accepted_and_round_tripped(client, title):
    note = f"note: {title[:50]}\nsecond line\twith a tab"
    response = client.post("/api/v1/shortlists", json={"title": title, "scenario": SCENARIO, "notes": {"Pt": note}})
    assert response.status_code == 201, response.text
    created = response.json()
    stored = client.get(f"/api/v1/shortlists/{created['id']}").json()
    assert stored["title"] == title
    assert {row["material"]: row["note"] for row in stored["results"]}["Pt"] == note
    page = client.get(created["url"], headers={"accept": "text/html"})
    assert page.status_code == 200
    assert page.headers["content-type"] == "text/html; charset=utf-8"
    import html

    assert html.escape(title, quote=False) in page.text
    csv_text = client.get(f"{created['url']}.csv").content.decode("utf-8")
    assert note.split("\n")[0] in csv_text
