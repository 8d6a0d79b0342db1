"""The HTML pages and their JSON twins: one data object feeds both, the view state lives in the query string."""

import csv
import html
import io
import json
import re
from html.parser import HTMLParser

import pytest
from markupsafe import escape

from electrosieve.app.cautions import CAUTIONS
from electrosieve.app import urls
from electrosieve.app.figures import rich_formula
from electrosieve.app.payloads import CSV_COLUMNS
from electrosieve.app.viewstate import ViewQuery
from electrosieve.app.payloads import diagram_payload, sources_payload
from electrosieve.app.storage import save_shortlist
from electrosieve.app.shortlists import compact_record
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import nernst_slope
from electrosieve.engine.diagram import diagram

CATALOG = default_catalog()
SCENARIO_QUERY = "ph_low=0&ph_high=1&potential_low=-0.2&potential_high=0&scale=SHE&role=cathode"
COMPARE_QUERY = SCENARIO_QUERY + "&compare=Pt&compare=Zn&compare=Cu"


class Page(HTMLParser):
    """The tags of a page: (tag, attributes) in order, plus the text of each element id."""

    def __init__(self, text: str):
        super().__init__(convert_charrefs=True)
        self.tags: list[tuple[str, dict]] = []
        self.text_by_id: dict[str, str] = {}
        self._open: list[str | None] = []
        self.feed(text)

    def handle_starttag(self, tag, attrs):
        attributes = dict(attrs)
        self.tags.append((tag, attributes))
        if tag not in ("input", "br", "img", "link", "meta", "hr"):
            self._open.append(attributes.get("id"))
            if attributes.get("id"):
                self.text_by_id[attributes["id"]] = ""

    def handle_endtag(self, tag):
        if self._open and tag not in ("input", "br", "img", "link", "meta", "hr"):
            self._open.pop()

    def handle_data(self, data):
        for element_id in self._open:
            if element_id:
                self.text_by_id[element_id] += data

    def find(self, tag, **wanted):
        return [a for t, a in self.tags if t == tag and all(a.get(k) == v for k, v in wanted.items())]

    def ranked_materials(self) -> list[str]:
        return [a["data-material"] for t, a in self.tags if t == "tr" and "data-material" in a]


@pytest.fixture()
def shortlist_id(client):
    response = client.post("/api/v1/shortlists", json={
        "title": "Acid cathodes <script>alert('title')</script>",
        "scenario": {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn", "Cu"]},
        "notes": {"Pt": "<img src=x onerror=alert(1)> order 50 g", "Cu": "cheap & cheerful"}})
    assert response.status_code == 201, response.text
    return response.json()["id"]


def page_urls(shortlist: str) -> dict[str, str]:
    return {"screen": f"/screen?{SCENARIO_QUERY}", "compare": f"/compare?{COMPARE_QUERY}", "materials": "/materials",
            "material": "/materials/Pt?activity=1e-6", "shortlist": f"/s/{shortlist}"}


def with_suffix(url: str, suffix: str) -> str:
    path, _, query = url.partition("?")
    return path + suffix + (f"?{query}" if query else "")


@pytest.mark.parametrize("suffix", ["", ".json"])
@pytest.mark.parametrize("name", ["screen", "compare", "materials", "material", "shortlist"])
def test_every_page_has_a_json_twin(client, shortlist_id, name, suffix):
    url = with_suffix(page_urls(shortlist_id)[name], suffix)
    response = client.get(url)
    assert response.status_code == 200, response.text[:500]
    if suffix == ".json":
        assert response.headers["content-type"].startswith("application/json")
        assert isinstance(response.json(), dict)
        return
    assert response.headers["content-type"].startswith("text/html")
    twins = Page(response.text).find("link", rel="alternate", type="application/json")
    assert len(twins) == 1
    twin = client.get(twins[0]["href"])
    assert twin.status_code == 200
    assert twin.json() == client.get(with_suffix(page_urls(shortlist_id)[name], ".json")).json()


def test_screen_page_renders_the_ranking_from_the_query_string(client):
    # The page without JavaScript shows the same ranking as the API for the same scenario.
    html = Page(client.get(f"/?{SCENARIO_QUERY}").text)
    api = client.post("/api/v1/screen", json={"ph": [0, 1], "potential": [-0.2, 0.0], "scale": "SHE",
                                              "role": "cathode"}).json()
    assert html.ranked_materials() == [row["material"] for row in api["results"]]
    assert html.text_by_id["rule-text"].strip() == api["rule"]


def test_screen_page_json_twin_carries_the_api_result(client):
    page = client.get(f"/screen.json?{SCENARIO_QUERY}").json()
    api = client.post("/api/v1/screen", json=page["scenario"]).json()
    assert page["result"] == api
    assert page["links"]["csv"].startswith("/screen.csv?")


def test_default_view_is_a_complete_scenario(client):
    page = client.get("/screen.json").json()
    assert page["result"]["results"] and page["scenario"]["scale"] == "RHE"


def test_view_query_round_trips_an_engine_scenario():
    echo = {"ph": [0.0, 1.5], "potential": -0.25, "scale": "SCE", "activity": 1e-4, "temperature": 40.0,
            "role": "cathode", "accept": ["immunity"], "materials": ["Pt", "Cu"], "family": None,
            "rank_by": ["price", "unacceptable"], "weights": {}}
    scenario, errors = ViewQuery.from_scenario(echo).scenario_in()
    assert not errors
    assert scenario.model_dump() == {**echo, "weights": None, "electrolyte": None, "ion_activities": None, "chloride": None,
                                      "current_density": 1.0}


def test_view_query_round_trips_a_recipe_ions_and_chloride():
    echo = {"ph": 8.1, "potential": [0.0, 0.8], "scale": "SHE", "activity": 1e-6, "temperature": 25.0,
            "role": "anode", "accept": ["immunity", "passivation"], "materials": None, "family": None,
            "rank_by": ["unacceptable"], "weights": {}, "electrolyte": "seawater", "ion_activities": {"Cu^2+": 0.1},
            "chloride": 0.39}
    view = ViewQuery.from_scenario(echo)
    assert ("ion_activities", "Cu^2+=0.1") in view.params(scenario_only=True)
    scenario, errors = view.scenario_in()
    assert not errors
    assert scenario.model_dump() == {**echo, "weights": None, "current_density": 1.0}
    with_density = ViewQuery.from_scenario({**echo, "current_density": 10.0})
    assert with_density.current_density == "10" and with_density.scenario_in()[0].current_density == 10.0


def test_screen_page_picks_candidates_by_family_and_by_name(client):
    by_family = client.get(f"/screen.json?{SCENARIO_QUERY}&pick=family&family=noble").json()
    assert {row["family"] for row in by_family["result"]["results"]} == {"noble"}
    by_name = client.get(f"/screen.json?{SCENARIO_QUERY}&materials=Pt&materials=Zn").json()
    assert sorted(row["material"] for row in by_name["result"]["results"]) == ["Pt", "Zn"]


@pytest.mark.parametrize("query, field", [
    ("ph_low=nan&potential_low=0", "ph_low"),
    ("ph_low=seven&potential_low=0", "ph_low"),
    ("ph_low=3&ph_high=1&potential_low=0", "ph_low"),
    ("ph_low=7&potential_low=", "potential_low"),
    ("ph_low=7&potential_low=0&scale=XYZ", "scale"),
    ("ph_low=7&potential_low=0&temperature=1e999", "temperature"),
    ("ph_low=7&potential_low=0&role=both", "role"),
    ("ph_low=7&potential_low=0&pick=names", "materials"),
    ("ph_low=7&potential_low=0&materials=Unobtainium", "materials"),
    ("ph_low=7&potential_low=0&weights=price", "weights"),
    ("ph_low=7&potential_low=0&rank_by=beauty", "rank_by"),
])
def test_bad_query_names_the_parameter(client, query, field):
    as_json = client.get(f"/screen.json?{query}")
    assert as_json.status_code == 422
    assert any(item["loc"] == ["query", field] and field in item["msg"] for item in as_json.json()["detail"]), \
        as_json.json()
    as_html = client.get(f"/?{query}")
    assert as_html.status_code == 422
    # the message sits at its field, once: not repeated in the box above the results
    messages = re.findall(r'<p class="field-error" id="[^"]+" data-error-for="([^"]+)" role="alert" >([^<]+)</p>', as_html.text)
    assert any(field in names.split() and field in text for names, text in messages), messages
    assert f'data-field="{field}"' not in as_html.text
    assert re.search(rf'name="{field}"[^>]*aria-invalid="true"', as_html.text)
    for _, text in messages:
        assert as_html.text.count(text.strip()) == 1


def test_screen_csv(client):
    response = client.get(f"/screen.csv?{SCENARIO_QUERY}")
    assert response.status_code == 200 and response.headers["content-type"].startswith("text/csv")
    assert "attachment" in response.headers["content-disposition"]
    rows = list(csv.DictReader(io.StringIO(response.text)))
    api = client.get(f"/screen.json?{SCENARIO_QUERY}").json()["result"]["results"]
    assert list(rows[0]) == list(CSV_COLUMNS)
    assert [row["material"] for row in rows] == [row["material"] for row in api]
    assert client.get("/screen.csv?ph_low=nan&potential_low=0").status_code == 422


def test_ranked_table_shows_every_column_and_the_rule(client):
    text = client.get(f"/?{SCENARIO_QUERY}").text
    for heading in ("Rank", "Material", "Verdict", "Immunity", "Passivation", "Corrosion", "Instability eV",
                    "log₁₀ dissolved", "Margin mV", "Hazards", "USD/kg", "Reason"):
        assert heading in text, heading
    assert text.index('id="rule-text"') < text.index('id="ranking"')
    # a material's link keeps the scenario: its window and scale, drawn on that page, with the way back
    link = html.unescape(re.search(r'href="(/materials/Pt\?[^"]*)"', text).group(1))
    assert link == ("/materials/Pt?activity=1e-06&temperature=25&axis=SHE&ph_low=0&ph_high=1&potential_low=-0.2"
                    "&potential_high=0&scale=SHE")
    material = client.get(link.replace("/materials/Pt?", "/materials/Pt.json?")).json()
    window = next(trace for trace in material["figure"]["data"] if trace.get("name") == "operating window")
    assert sorted(set(window["x"])) == [0, 1] and sorted(set(window["y"])) == [-0.2, 0]
    assert material["links"]["screen"].startswith("/?ph_low=0&ph_high=1&potential_low=-0.2&potential_high=0&scale=SHE")
    assert 'id="back-to-ranking"' in client.get(link).text


def test_hazards_are_in_plain_words(client):
    # Common practice: at pH 0-1 below 0 V vs SHE a cathode evolves hydrogen; lead dissolves as toxic Pb2+ in acid.
    text = client.get(f"/?{SCENARIO_QUERY}").text
    assert "Hydrogen evolves over" in text and "flammable" in text
    lead = CATALOG.materials.get("Pb")
    if lead is not None and lead.hazards:
        assert "Toxic:</strong> Pb^2+ can form here" in text


@pytest.mark.parametrize("name", ["screen", "compare", "material", "shortlist"])
def test_cautions_on_every_result_page(client, shortlist_id, name):
    text = client.get(page_urls(shortlist_id)[name]).text
    for caution in CAUTIONS:
        assert str(escape(caution)) in text, caution


@pytest.mark.parametrize("name", ["screen", "compare", "materials", "material", "shortlist"])
def test_pages_use_no_inline_script_and_label_every_control(client, shortlist_id, name):
    response = client.get(page_urls(shortlist_id)[name])
    page = Page(response.text)
    for tag, attributes in page.tags:
        assert not any(key.startswith("on") for key in attributes), (tag, attributes)
        if tag == "script":
            assert attributes.get("src") or attributes.get("type") == "application/json", attributes
        if tag == "a":
            assert not (attributes.get("href") or "").lower().startswith("javascript:")
    labelled = {a.get("for") for t, a in page.tags if t == "label"}
    for tag, attributes in page.tags:
        if tag in ("input", "select", "textarea") and attributes.get("type") not in ("hidden", "checkbox", "radio"):
            assert attributes.get("id") in labelled, (tag, attributes)
    assert "script-src 'self'" in response.headers["content-security-policy"]


def test_compare_page_draws_two_to_four_diagrams_with_fills_and_labels(client):
    page = client.get(f"/compare.json?{COMPARE_QUERY}").json()
    assert [d["material"] for d in page["diagrams"]] == ["Pt", "Zn", "Cu"]
    for item in page["diagrams"]:
        figure = item["figure"]
        fills = [t for t in figure["data"] if t.get("fill") == "toself" and t.get("name") != "operating window"]
        colours = {t["name"]: t["fillcolor"] for t in fills}
        assert len(set(colours.values())) == len(colours)  # each region its own fill
        labels = [a["text"] for a in figure["layout"]["annotations"]]
        species = {rich_formula(d["formula"]) for d in item["diagram"]["domains"]}
        assert labels and all(text.split("<br>")[0] in species for text in labels)  # placed labels name species
        hovers = [t["text"] for t in fills]
        assert all(":" in text and text.split(": ")[-1] in ("immunity", "passivation", "corrosion") for text in hovers)
    html = client.get(f"/compare?{COMPARE_QUERY}").text
    assert html.count('data-download="png"') == 3 and html.count('data-download="svg"') == 3
    assert urls.plotly_js() in html


SEVEN = "&".join(f"compare={m}" for m in ("Pt", "Zn", "Cu", "Au", "Ni", "Ir", "Ti"))


@pytest.mark.parametrize("compare, words", [("", "tick at least one"), (SEVEN, "given 7); untick 1"),
                                            ("compare=Pt&compare=Unobtainium", "Unobtainium")])
def test_compare_needs_one_to_six_known_materials(client, compare, words):
    response = client.get(f"/compare.json?{SCENARIO_QUERY}&{compare}")
    assert response.status_code == 422
    assert response.json()["detail"][0]["loc"] == ["query", "compare"]
    assert words in response.json()["detail"][0]["msg"]
    page = client.get(f"/compare?{SCENARIO_QUERY}&{compare}")
    assert page.status_code == 422 and html.escape(words, quote=False) in page.text


@pytest.mark.parametrize("count", [1, 6])
def test_compare_takes_one_to_six_with_a_column_of_figures_each(client, count):
    ids = ["Pt", "Zn", "Cu", "Au", "Ni", "Ir"][:count]
    query = SCENARIO_QUERY + "".join(f"&compare={m}" for m in ids)
    data = client.get(f"/compare.json?{query}").json()
    assert [d["material"] for d in data["diagrams"]] == ids
    text = client.get(f"/compare?{query}").text
    table = re.search(r'<table id="compare-table".*?</table>', text, flags=re.S).group(0)
    assert re.findall(r'<th scope="col" data-material="(\w+)"', table) == ids
    for label in ("Verdict", "Immunity", "Passivation", "Corrosion", "Instability", "dissolved", "Margin", "USD/kg",
                  "Hazards"):
        assert label in table, label


def test_rhe_window_is_a_slanted_band_on_the_she_axis(client):
    # E(SHE) = E(RHE) - (RT ln10 / F) pH (Nernst; Bard & Faulkner 2001, §2.1): over pH 0-14 the band drops 14 x 0.05916 V.
    query = "ph_low=0&ph_high=14&potential_low=1.4&potential_high=1.6&scale=RHE&compare=Pt&compare=Au"

    def window_trace(axis):
        page = client.get(f"/compare.json?{query}&axis={axis}").json()
        return next(t for t in page["diagrams"][0]["figure"]["data"] if t["name"] == "operating window")

    she = window_trace("SHE")
    drop = she["y"][0] - she["y"][1]  # first edge: from (pH 0, 1.4 V RHE) to (pH 14, 1.4 V RHE)
    assert she["x"][:2] == [0.0, 14.0]
    assert drop == pytest.approx(14 * nernst_slope(), abs=1e-4)
    assert drop == pytest.approx(14 * 0.05916, abs=1e-3)
    rhe = window_trace("RHE")
    assert rhe["y"][0] == pytest.approx(rhe["y"][1], abs=1e-6)  # on its own scale the band is level


def test_compare_axis_switch_relabels_the_potential_axis(client):
    for axis in ("SHE", "SCE", "RHE"):
        page = client.get(f"/compare.json?{COMPARE_QUERY}&axis={axis}").json()
        assert page["axis"] == axis
        assert page["diagrams"][0]["figure"]["layout"]["yaxis"]["title"]["text"] == f"E / V vs {axis}"
    assert client.get(f"/compare.json?{COMPARE_QUERY}&axis=nowhere").json()["detail"][0]["loc"] == ["query", "axis"]


def test_material_page_shows_diagram_boundaries_species_and_citations(client):
    text = client.get("/materials/Fe").text
    expected = diagram_payload(diagram("Fe", catalog=CATALOG), CATALOG)
    for boundary in expected["boundaries"]:
        assert boundary["equation"] in text
    sources = sources_payload(CATALOG, "Fe")
    for row in sources["species"]:
        assert f"<th scope=\"row\">{escape(row['formula'])}</th>" in text
    for citation in sources["citations"].values():
        assert str(escape(citation)) in text
    assert "figure-main" in text and 'data-download="svg"' in text


def test_material_page_json_and_errors(client):
    page = client.get("/materials/pt.json?temperature=40&axis=SCE").json()
    assert page["material"]["id"] == "Pt" and page["diagram"]["temperature_c"] == 40 and page["axis"] == "SCE"
    assert client.get("/materials/Unobtainium.json").status_code == 404
    assert client.get("/materials/Unobtainium", headers={"accept": "text/html"}).status_code == 404
    bad = client.get("/materials/Pt.json?activity=nan")
    assert bad.status_code == 422 and bad.json()["detail"][0]["loc"] == ["query", "activity"]


def test_shortlist_page_escapes_user_text(client, shortlist_id):
    text = client.get(f"/s/{shortlist_id}").text
    assert "<script>alert" not in text and "&lt;script&gt;alert(&#39;title&#39;)&lt;/script&gt;" in text
    assert "<img src=x" not in text and "&lt;img src=x onerror=alert(1)&gt; order 50 g" in text
    assert "cheap &amp; cheerful" in text


def test_shortlist_page_shows_catalog_version_notes_and_links(client, shortlist_id):
    page = client.get(f"/s/{shortlist_id}.json").json()
    assert page["catalog_version"] == CATALOG.version
    assert [row["material"] for row in page["results"]] == page["today"]["order"]
    assert page["today"]["same_order"] is True
    html = client.get(f"/s/{shortlist_id}")
    parsed = Page(html.text)
    assert parsed.ranked_materials() == [row["material"] for row in page["results"]]
    assert CATALOG.version in html.text
    start = parsed.find("a", id="start-from-this")[0]["href"]
    started = Page(client.get(start).text)
    assert started.ranked_materials() == parsed.ranked_materials()


def test_shortlist_notice_when_todays_catalog_ranks_differently(client):
    storage = client.app.state.electrosieve.storage
    result = client.post("/api/v1/screen", json={"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode",
                                                 "materials": ["Pt", "Zn", "Cu"]}).json()
    swapped = {**result, "catalog_version": "older",
               "results": [{**row, "rank": i + 1} for i, row in enumerate(reversed(result["results"]))]}
    stored = save_shortlist(engine=storage, title="computed with older data", scenario=result["scenario"],
                            result=compact_record(swapped), notes={})
    page = client.get(f"/s/{stored.id}.json").json()
    assert page["today"]["same_order"] is False and page["today"]["same_version"] is False
    assert "would rank differently" in page["today"]["message"]
    assert "would rank differently" in client.get(f"/s/{stored.id}").text
    # the difference, row by row: saved reversed, so today's first moved up by n-1 and today's last down by n-1
    n = len(result["results"])
    changes = {c["material"]: c for c in page["today"]["changes"]}
    first, last = result["results"][0], result["results"][-1]
    assert changes[first["material"]]["moved"] == n - 1 and changes[first["material"]]["rank_before"] == n
    assert changes[last["material"]]["moved"] == -(n - 1)
    assert changes[first["material"]]["reason"] == first["reason"]
    assert f"moved up {n - 1}</span>" in client.get(f"/s/{stored.id}").text


def test_shortlist_csv_has_the_notes(client, shortlist_id):
    response = client.get(f"/s/{shortlist_id}.csv")
    assert response.status_code == 200 and response.headers["content-type"].startswith("text/csv")
    lines = response.text.splitlines()
    block = [line for line in lines if line.startswith("#")]
    assert lines[:len(block)] == block  # the header block comes first, then the table
    facts = dict(line[2:].split(": ", 1) for line in block)
    page = client.get(f"/s/{shortlist_id}.json").json()
    assert facts["electrosieve shortlist"] == page["title"] and facts["saved"] == page["created_at"]
    assert facts["catalog version"].startswith(page["catalog_version"])
    assert facts["scenario"].startswith(f"{page['scenario']['role']} at pH ")
    rows = {row["material"]: row for row in csv.DictReader(io.StringIO("\n".join(lines[len(block):])))}
    assert rows["Cu"]["note"] == "cheap & cheerful" and rows["Zn"]["note"] == ""
    disposition = response.headers["content-disposition"]
    assert re.fullmatch(r'attachment; filename="electrosieve-shortlist-[a-z0-9-]+-\d{4}-\d{2}-\d{2}\.csv"', disposition)


def test_unknown_shortlist_pages_are_404(client):
    assert client.get("/s/AAAAAAAAAAAAAAAA", headers={"accept": "text/html"}).status_code == 404
    assert client.get("/s/AAAAAAAAAAAAAAAA.json").status_code == 404
    assert client.get("/s/AAAAAAAAAAAAAAAA.csv").status_code == 404


def test_save_form_without_javascript_redirects_to_the_new_shortlist(client):
    form = {**dict(pair.split("=") for pair in SCENARIO_QUERY.split("&")), "title": "from the form",
            "note_Pt": "first choice"}
    response = client.post("/shortlists", data=form, follow_redirects=False)
    assert response.status_code == 303
    page = client.get(response.headers["location"] + ".json").json()
    assert page["title"] == "from the form"
    assert {row["material"]: row["note"] for row in page["results"]}["Pt"] == "first choice"
    bad = client.post("/shortlists", data={**form, "title": ""}, headers={"accept": "text/html"})
    assert bad.status_code == 422 and "title" in bad.text


def test_static_files_and_plotly_are_served_locally(client):
    for path in ("/static/css/site.css", "/static/js/screen.js", "/static/js/plots.js", "/static/favicon.svg"):
        assert client.get(path).status_code == 200, path
    plotly = client.get("/vendor/plotly.min.js")
    assert plotly.status_code == 200 and len(plotly.content) > 1_000_000


def test_html_error_pages_and_json_errors(client):
    missing = client.get("/nowhere", headers={"accept": "text/html"})
    assert missing.status_code == 404 and missing.headers["content-type"].startswith("text/html")
    assert client.get("/api/v1/nowhere").headers["content-type"].startswith("application/json")
    json.loads(client.get("/api/v1/nowhere").text)


def test_api_reference_page_lists_every_api_route_offline(client):
    response = client.get("/docs")
    assert response.status_code == 200
    schema = client.get("/openapi.json").json()
    for path, methods in schema["paths"].items():
        for method in methods:
            assert f"{method.upper()} {path}" in response.text
    assert "cdn" not in response.text.lower()


def test_screen_page_says_how_data_were_carried_to_another_temperature(client):
    hot = client.get(f"/?{SCENARIO_QUERY}&temperature=80&pick=names&materials=Fe&materials=Pt")
    assert hot.status_code == 200
    result = client.get(f"/screen.json?{SCENARIO_QUERY}&temperature=80&pick=names&materials=Fe&materials=Pt").json()
    for lines in result["result"].get("temperature_notes", {}).values():
        for line in lines:
            assert str(escape(line)) in hot.text
    if result["result"].get("conditions"):
        assert str(escape(result["result"]["conditions"])) in hot.text


def test_the_ranking_fragment_is_the_page_own_rows(client):
    # the script swaps these pieces in: they must read exactly as the page renders them
    page = client.get(f"/?{SCENARIO_QUERY}&pick=names&materials=Pt&materials=Zn&materials=Cr")
    fragment = client.get(f"/screen/ranking?{SCENARIO_QUERY}&pick=names&materials=Pt&materials=Zn&materials=Cr")
    assert fragment.status_code == 200 and "<html" not in fragment.text
    rows = re.findall(r'<tr data-material="(\w+)"[^>]*>(.*?)</tr>', fragment.text, flags=re.S)
    assert sorted(material for material, _ in rows) == ["Cr", "Pt", "Zn"]
    for material, cells in rows:
        assert cells in page.text, material
    scenario = re.search(r"data-scenario='([^']*)'", fragment.text).group(1)
    assert client.post("/api/v1/screen", json=json.loads(html.unescape(scenario))).status_code == 200


def test_the_ranking_fragment_names_a_bad_parameter(client):
    fragment = client.get("/screen/ranking?ph_low=3&ph_high=1&potential_low=0")
    assert fragment.status_code == 422
    assert '<li data-field="ph_low">' in fragment.text and "inverted" in fragment.text


def test_ranking_picture_is_one_strip_per_candidate_filling_the_window(client):
    from xml.etree import ElementTree

    response = client.get(f"/screen/picture.svg?{SCENARIO_QUERY}")
    assert response.status_code == 200 and response.headers["content-type"].startswith("image/svg+xml")
    assert re.fullmatch(r'inline; filename="electrosieve-ranking-cathode-\d{4}-\d\d-\d\d\.svg"',
                        response.headers["content-disposition"])
    svg = ElementTree.fromstring(response.text)
    ns = {"s": "http://www.w3.org/2000/svg"}
    rows = svg.findall("s:g[@data-material]", ns)
    ranked = client.get(f"/screen.json?{SCENARIO_QUERY}").json()["result"]["results"]
    assert [g.get("data-material") for g in rows] == [row["material"] for row in ranked]
    for g, row in zip(rows, ranked):
        widths = [float(rect.get("width")) for rect in g.findall("s:rect", ns)]
        assert sum(widths) == pytest.approx(360, abs=0.05)  # the shares cover the whole window
        assert row["verdict"] in "".join(g.itertext())  # the verdict in words, not colour alone
    assert client.get("/screen/picture.svg?ph_low=3&ph_high=1&potential_low=0").status_code == 422
