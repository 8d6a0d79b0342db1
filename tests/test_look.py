"""The look of docs/DESIGN.md held to numbers: text contrast (WCAG 2.1), region fills apart under simulated
colour-vision deficiencies, one palette in CSS and figures, and diagram labels that never overlap."""

import itertools
import re
from pathlib import Path

import numpy as np
import pytest

from electrosieve.app.figures import (CHAR_WIDTH, LINE_HEIGHT, PLOT_ASPECT, REGION_STYLE, WATER_STYLE, INK,
                                      chebyshev_centre, diagram_figure, figure_dict, place_labels, scale_label)

ROOT = Path(__file__).resolve().parent.parent
CSS = (ROOT / "static" / "css" / "site.css").read_text()
PLOTS_JS = (ROOT / "static" / "js" / "plots.js").read_text()


def css_colours() -> dict[str, str]:
    """The custom properties of :root that hold a hex colour."""
    root = CSS[CSS.index(":root {"):CSS.index("}", CSS.index(":root {"))]
    return dict(re.findall(r"--([a-z0-9-]+):\s*(#[0-9a-fA-F]{6});", root))


COLOURS = css_colours()


def srgb_to_linear(hex_colour: str) -> np.ndarray:
    """sRGB components [0–1] made linear (IEC 61966-2-1, the formula WCAG 2.1 quotes for relative luminance)."""
    c = np.array([int(hex_colour[i:i + 2], 16) for i in (1, 3, 5)]) / 255.0
    return np.where(c <= 0.04045, c / 12.92, ((c + 0.055) / 1.055) ** 2.4)


def relative_luminance(hex_colour: str) -> float:
    """L = 0.2126 R + 0.7152 G + 0.0722 B of linear components (W3C WCAG 2.1, definition "relative luminance")."""
    r, g, b = srgb_to_linear(hex_colour)
    return 0.2126 * r + 0.7152 * g + 0.0722 * b


def contrast_ratio(first: str, second: str) -> float:
    """(L1 + 0.05) / (L2 + 0.05), lighter over darker (W3C WCAG 2.1, definition "contrast ratio")."""
    high, low = sorted((relative_luminance(first), relative_luminance(second)), reverse=True)
    return (high + 0.05) / (low + 0.05)


def test_contrast_ratio_matches_the_w3c_extremes():
    # WCAG 2.1: black on white is 21:1, a colour on itself 1:1; #767676 on white is the common-practice
    # lightest grey that passes 4.5:1 (4.54:1).
    assert contrast_ratio("#000000", "#ffffff") == pytest.approx(21.0)
    assert contrast_ratio("#767676", "#767676") == pytest.approx(1.0)
    assert contrast_ratio("#767676", "#ffffff") == pytest.approx(4.54, abs=0.01)


TEXT_PAIRS = [
    ("ink", "paper"), ("ink", "panel"), ("ink-soft", "paper"), ("ink-soft", "panel"),
    ("accent", "paper"), ("accent", "panel"), ("accent-ink", "accent"), ("masthead-ink", "masthead"),
    ("good", "good-fill"), ("partial", "partial-fill"), ("bad", "bad-fill"), ("bad", "panel"),
    ("ink", "caution-fill"), ("ink-soft", "caution-fill"), ("focus", "panel"),
    *[("ink", f"region-{kind.replace(' ', '-')}") for kind in REGION_STYLE],
]
"""Every text colour over every background it is set on (labels and chips write ink on the region fills)."""


@pytest.mark.parametrize("text,background", TEXT_PAIRS)
def test_text_contrast_is_at_least_4_5(text, background):
    # WCAG 2.1 success criterion 1.4.3 (contrast, minimum): 4.5:1 for body text.
    assert contrast_ratio(COLOURS[text], COLOURS[background]) >= 4.5


@pytest.mark.parametrize("kind", sorted(REGION_STYLE))
def test_region_outline_stands_out_from_its_fill(kind):
    # WCAG 2.1 success criterion 1.4.11 (non-text contrast): 3:1 for the parts of a graphic that carry meaning.
    style = REGION_STYLE[kind]
    assert contrast_ratio(style["line"], style["fill"]) >= 3.0


def test_css_and_figures_share_one_region_palette():
    for kind, style in REGION_STYLE.items():
        name = kind.replace(" ", "-")
        assert COLOURS[f"region-{name}"].lower() == style["fill"].lower(), kind
        assert COLOURS[f"region-{name}-line"].lower() == style["line"].lower(), kind
    assert COLOURS["ink"].lower() == INK.lower()


def test_region_kinds_are_the_trades_and_the_new_ones():
    assert set(REGION_STYLE) == {"immunity", "passivation", "corrosion", "hydride", "insulating film"}


MACHADO_2009 = {
    "protanopia": [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
    "deuteranopia": [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.011820, 0.042940, 0.968881]],
    "tritanopia": [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.303900]],
}
"""Machado, Oliveira & Fernandes (2009), IEEE TVCG 15(6) 1291–1298, simulation matrices at severity 1.0 on linear
RGB; entered from memory and checked against colorspacious 1.1.2 (``machado_et_al_2009_matrix(kind, 100)``)."""

SRGB_TO_XYZ = np.array([[0.4124, 0.3576, 0.1805], [0.2126, 0.7152, 0.0722], [0.0193, 0.1192, 0.9505]])
"""Linear sRGB to CIE XYZ, D65 (IEC 61966-2-1)."""
D65 = np.array([0.95047, 1.0, 1.08883])


def cielab(linear_rgb: np.ndarray) -> np.ndarray:
    """CIE 1976 L*a*b* of a linear-sRGB colour under D65 (CIE 15:2004, §8.2.1)."""
    t = SRGB_TO_XYZ @ np.clip(linear_rgb, 0.0, 1.0) / D65
    f = np.where(t > (6 / 29) ** 3, np.cbrt(t), t / (3 * (6 / 29) ** 2) + 4 / 29)
    return np.array([116 * f[1] - 16, 500 * (f[0] - f[1]), 200 * (f[1] - f[2])])


MIN_DELTA_E = 12.0
"""Smallest CIE76 colour difference allowed between two region fills as a viewer sees them; about five times
the just-noticeable difference of 2.3 (Sharma 2003, Digital Color Imaging Handbook, §1.7)."""


@pytest.mark.parametrize("vision", ["normal", *MACHADO_2009])
def test_region_fills_stay_apart_for_colour_vision_deficiencies(vision):
    matrix = np.eye(3) if vision == "normal" else np.array(MACHADO_2009[vision])
    seen = {kind: cielab(matrix @ srgb_to_linear(style["fill"])) for kind, style in REGION_STYLE.items()}
    for first, second in itertools.combinations(seen, 2):
        difference = float(np.linalg.norm(seen[first] - seen[second]))
        assert difference >= MIN_DELTA_E, f"{first} and {second}: ΔE {difference:.1f} under {vision}"


def test_simulation_keeps_greys_grey():
    # Each Machado matrix row sums to 1, so a neutral grey is seen unchanged (Machado et al. 2009, §3).
    for matrix in MACHADO_2009.values():
        assert np.allclose(np.sum(matrix, axis=1), 1.0, atol=1e-5)


def test_region_lightness_runs_from_immunity_to_corrosion():
    # The encoding promised in docs/DESIGN.md: the darker the fill, the worse for the metal.
    order = ["immunity", "passivation", "insulating film", "hydride", "corrosion"]
    lightness = [cielab(srgb_to_linear(REGION_STYLE[kind]["fill"]))[0] for kind in order]
    assert lightness == sorted(lightness, reverse=True)


def test_chebyshev_centre_matches_a_fine_grid_search():
    # Brute-force cross-check by sampling (the only sampling here): the best grid point's distance to the
    # nearest edge may not beat the exact radius and must come within one grid step of it.
    triangle = np.array([[0.0, 0.0], [6.0, 0.0], [1.0, 3.0]])
    centre, radius = chebyshev_centre(triangle)
    xs, ys = np.meshgrid(np.linspace(0, 6, 601), np.linspace(0, 3, 301))
    points = np.column_stack([xs.ravel(), ys.ravel()])
    edges = np.roll(triangle, -1, axis=0) - triangle
    inward = np.column_stack([-edges[:, 1], edges[:, 0]]) / np.hypot(edges[:, 0], edges[:, 1])[:, None]
    distances = np.min(points @ inward.T - np.sum(inward * triangle, axis=1), axis=1)
    assert distances.max() <= radius + 1e-9
    assert distances.max() >= radius - 0.01
    # incircle of a triangle: r = area / semiperimeter (Euclid IV.4)
    sides = np.hypot(*(np.roll(triangle, -1, axis=0) - triangle).T)
    assert radius == pytest.approx(9.0 / (sides.sum() / 2))
    assert np.all(inward @ centre - np.sum(inward * triangle, axis=1) >= radius - 1e-9)


def label_boxes(labels, ph_range, e_range):
    boxes = []
    for label in labels:
        if not label["text"]:
            continue
        lines = label["text"].split("<br>")
        width = max(len(re.sub(r"<[^>]+>", "", line)) for line in lines) * CHAR_WIDTH
        x = (label["x"] - ph_range[0]) / (ph_range[1] - ph_range[0])
        y = (label["y"] - e_range[0]) / (e_range[1] - e_range[0]) * PLOT_ASPECT
        boxes.append((x - width / 2, x + width / 2, y - len(lines) * LINE_HEIGHT / 2, y + len(lines) * LINE_HEIGHT / 2))
    return boxes


@pytest.mark.parametrize("element", ["Zn", "Cu", "Fe", "Au", "Ti", "Cr", "Ir", "Pb"])
def test_diagram_labels_never_overlap(client, element):
    payload = client.get(f"/materials/{element}.json").json()
    diagram = payload["diagram"]
    domains = diagram["domains"]
    e_values = [p[1] for d in domains for p in d["polygon"]]
    e_range = [min(e_values), max(e_values)]
    labels = place_labels(domains, diagram["limits"]["ph"], e_range)
    assert any(label["text"] for label in labels)
    boxes = label_boxes(labels, diagram["limits"]["ph"], e_range)
    for a, b in itertools.combinations(boxes, 2):
        assert a[1] <= b[0] or b[1] <= a[0] or a[3] <= b[2] or b[3] <= a[2], (element, a, b)
    for label, domain in zip(labels, domains):
        if label["text"] and "<br>" in label["text"]:
            assert label["text"].endswith(f"<i>{domain['region']}</i>")  # the region in words


def test_water_lines_differ_and_hover_carries_units(client):
    figure = client.get("/materials/Zn.json?axis=SCE").json()["figure"]
    water = [t for t in figure["data"] if t["name"] in {s["name"] for s in WATER_STYLE.values()}]
    assert len(water) == 2 and water[0]["line"]["dash"] != water[1]["line"]["dash"]
    assert all("V vs SCE" in t["hovertemplate"] and "pH" in t["hovertemplate"] for t in water)
    assert figure["layout"]["legend"]["yref"] == "container" and figure["layout"]["legend"]["y"] == 0


def test_axis_names_a_reference_by_its_readable_name():
    from electrosieve.engine.catalog import default_catalog

    scales = default_catalog().scales
    assert scale_label(scales, "HgHgO-1M") == "Hg/HgO in 1 M NaOH"
    assert scale_label(scales, "RHE") == "RHE"
    payload = {"element": "X", "activity": 1e-6, "temperature_c": 25.0, "domains": [],
               "limits": {"ph": [0, 14], "potential": [-1, 1]},
               "water": {k: {"intercept": 0.0, "slope": -0.0592} for k in ("hydrogen", "oxygen")}}
    figure = figure_dict(payload, scales=scales, scale_id="AgAgCl-3M")
    assert figure["layout"]["yaxis"]["title"]["text"] == "E / V vs Ag/AgCl in 3 M KCl"
    assert diagram_figure(payload).layout.yaxis.title.text == "E / V vs SHE"


def test_diagram_toolbar_has_no_action_that_leaves_the_machine():
    for setting in ("displaylogo: false", "showSendToCloud: false", "showEditInChartStudio: false", "showLink: false"):
        assert setting in PLOTS_JS
    assert '"sendDataToCloud"' in PLOTS_JS and '"editInChartStudio"' in PLOTS_JS  # both in the removed list


# ---- in a real browser (Debian's Chromium; skipped with the reason when it is missing) ----

BROWSER_MS = 20_000
"""Longest wait of any one browser step [ms]."""
SCENARIO = "ph_low=0&ph_high=1&potential_low=1.4&potential_high=1.8&scale=RHE&role=anode"
SIZES = [(1366, 768), (390, 844)]


@pytest.fixture(scope="module")
def shortlist_path(live_server):
    import json
    import urllib.request

    body = {"title": "Acid anodes", "scenario": {"ph": [0, 1], "potential": [1.4, 1.8], "scale": "RHE", "role": "anode"},
            "notes": {"Ir": "a note beside its row"}}
    request = urllib.request.Request(f"{live_server.url}/api/v1/shortlists", data=json.dumps(body).encode(),
                                     headers={"Content-Type": "application/json"}, method="POST")
    with urllib.request.urlopen(request, timeout=30) as answer:
        return json.load(answer)["url"]


def page_paths(shortlist: str) -> dict[str, tuple[str, str]]:
    return {
        "screen": (f"/?{SCENARIO}", "body[data-ready='1']"),
        "compare": (f"/compare?{SCENARIO}&compare=Ir&compare=Pt&compare=Au", "body[data-plots-ready='1']"),
        "material": ("/materials/Zn?axis=HgHgO-1M", "body[data-plots-ready='1']"),
        "shortlist": (shortlist, "#ranking"),
    }


@pytest.mark.parametrize("size", SIZES, ids=lambda s: f"{s[0]}x{s[1]}")
@pytest.mark.parametrize("name", ["screen", "compare", "material", "shortlist"])
def test_no_horizontal_scrolling(browser, live_server, shortlist_path, name, size):
    width, height = size
    context = browser.new_context(viewport={"width": width, "height": height}, is_mobile=width < 600)
    try:
        page = context.new_page()
        page.set_default_timeout(BROWSER_MS)
        path, ready = page_paths(shortlist_path)[name]
        page.goto(live_server.url + path)
        page.wait_for_selector(ready)
        assert page.evaluate("() => document.documentElement.scrollWidth") <= width
        # nor inside the ranking: the list fits its box
        for box in page.query_selector_all("#ranking"):
            assert box.evaluate("table => table.parentElement.scrollWidth <= table.parentElement.clientWidth + 1")
    finally:
        context.close()


def test_diagram_toolbar_offers_only_local_actions(page, live_server):
    page.set_default_timeout(BROWSER_MS)
    page.goto(f"{live_server.url}/compare?{SCENARIO}&compare=Ir&compare=Pt")
    page.wait_for_selector("body[data-plots-ready='1']")
    titles = page.eval_on_selector_all(".modebar-btn", "buttons => buttons.map(b => b.dataset.title || '')")
    assert titles and any("png" in title.lower() for title in titles)
    assert not [t for t in titles if re.search(r"cloud|studio|edit|plotly", t, re.I)], titles
    assert page.locator(".modebar a[href^='http']").count() == 0
    # the readout names pH and volts on the plot's own scale (the plots sit under the side-by-side table)
    page.locator(".plot >> nth=0").scroll_into_view_if_needed()
    box = page.locator(".plot .nsewdrag >> nth=0").bounding_box()
    page.mouse.move(box["x"] + box["width"] * 0.3, box["y"] + box["height"] * 0.4)
    assert re.fullmatch(r"pH -?\d+\.\d\d · E -?\d+\.\d{3} V vs RHE", page.inner_text(".plot-readout >> nth=0"))


def test_print_hides_controls_and_keeps_the_results(page, live_server):
    page.set_default_timeout(BROWSER_MS)
    page.goto(f"{live_server.url}/?{SCENARIO}")
    page.wait_for_selector("body[data-ready='1']")
    page.emulate_media(media="print")
    page.evaluate("() => window.dispatchEvent(new Event('beforeprint'))")
    for control in ("#scenario-form", "#save-form", "#compare-button", "#csv-link", ".masthead nav"):
        assert not page.locator(control).is_visible(), control
    for kept in ("#scenario-line", "#ranking", ".cautions li >> nth=0", "#sources-heading", "[data-print-date]"):
        assert page.locator(kept).is_visible(), kept
    assert re.search(r"\d{4}", page.inner_text("[data-print-date]"))


def in_view(page, selector: str) -> bool:
    """Whether the element is at least partly inside the viewport."""
    return page.eval_on_selector(selector, """el => { const r = el.getBoundingClientRect();
        return r.width > 0 && r.height > 0 && r.bottom > 0 && r.top < innerHeight && r.right > 0 && r.left < innerWidth; }""")


@pytest.mark.parametrize("size", SIZES, ids=lambda s: f"{s[0]}x{s[1]}")
def test_diagram_of_the_selected_candidate_shows_with_the_ranking(browser, live_server, size):
    width, height = size
    context = browser.new_context(viewport={"width": width, "height": height}, is_mobile=width < 600)
    try:
        page = context.new_page()
        page.set_default_timeout(BROWSER_MS)
        page.goto(f"{live_server.url}/?{SCENARIO}")
        page.wait_for_selector("body[data-plots-ready='1']")
        first = page.get_attribute("#ranking-body tr >> nth=0", "data-material")
        assert page.get_attribute("#selected-figure", "data-material") == first
        # click the fourth candidate's reason: its diagram replaces the first one's, with the window drawn
        row = page.locator("#ranking-body tr >> nth=3")
        chosen = row.get_attribute("data-material")
        row.locator("td.reason").click()
        page.wait_for_selector(f"body[data-selected-ready='{chosen}']")
        assert page.get_attribute("#selected-figure", "data-material") == chosen
        assert row.get_attribute("aria-current") == "true"
        assert page.locator("#plot-selected .legendtext", has_text="operating window").count() == 1
        assert in_view(page, "#plot-selected")
        if width > 1200:  # beside the list: the row clicked and its diagram on one screen
            assert in_view(page, "#ranking-body tr[aria-current='true']")
        # its page keeps the scenario's window and scale
        link = page.get_attribute("#selected-link", "href")
        assert "ph_low=0" in link and "potential_low=1.4" in link and "scale=RHE" in link and "axis=RHE" in link
        assert page.evaluate("() => document.documentElement.scrollWidth") <= width
    finally:
        context.close()


@pytest.mark.parametrize("size", SIZES, ids=lambda s: f"{s[0]}x{s[1]}")
def test_errors_sit_at_their_field_once_and_hide_the_stale_ranking(browser, live_server, size):
    width, height = size
    context = browser.new_context(viewport={"width": width, "height": height}, is_mobile=width < 600)
    try:
        page = context.new_page()
        page.set_default_timeout(BROWSER_MS)
        page.goto(f"{live_server.url}/?{SCENARIO}")
        page.wait_for_selector("body[data-ready='1']")
        page.fill("#potential_low", "high")
        page.wait_for_selector("#error-potential_low:not([hidden])")
        assert page.get_attribute("#potential_low", "aria-invalid") == "true"
        message = page.inner_text("#error-potential_low")
        assert "potential_low" in message
        assert not page.locator("#errors").is_visible()  # not repeated in a list
        assert page.locator("body").inner_text().count(message.lstrip("✕ ").strip()) == 1
        assert not page.locator("#ranking").is_visible() and page.locator(".stale-note").is_visible()
        assert in_view(page, "#error-potential_low")  # next to the field being typed in, on a phone too
        page.fill("#potential_low", "1.4")
        page.wait_for_selector("#error-potential_low[hidden]", state="attached")
        page.wait_for_selector("#ranking-body tr")
        assert page.get_attribute("#potential_low", "aria-invalid") is None
        assert page.locator("#ranking").is_visible()
    finally:
        context.close()


def test_compare_switches_the_axis_without_reload_and_names_every_axis(page, live_server):
    page.set_default_timeout(BROWSER_MS)
    page.goto(f"{live_server.url}/compare?{SCENARIO}&compare=Ir&compare=Pt&compare=Au&compare=Ti&compare=Ni")
    page.wait_for_selector("body[data-plots-ready='1']")
    assert page.locator("#compare-table thead th[data-material]").count() == 5
    page.evaluate("() => { window.sameDocument = true; }")
    page.select_option("#axis", "SCE")
    page.wait_for_selector("body[data-axis='SCE']", state="attached")
    assert page.evaluate("() => window.sameDocument === true")  # redrawn in place, not reloaded
    assert "axis=SCE" in page.url
    titles = page.eval_on_selector_all(".plot .ytitle", "nodes => nodes.map(n => n.textContent)")
    assert len(titles) == 5 and all(t == "E / V vs SCE" for t in titles), titles
    assert page.eval_on_selector_all(".plot .xtitle", "nodes => nodes.map(n => n.textContent)") == ["pH"] * 5
    assert page.locator(".plot-readout").count() == 5  # one readout per plot, however often redrawn
    assert all("axis=SCE" in href for href in page.eval_on_selector_all(
        "a[data-material-link]", "links => links.map(a => a.getAttribute('href'))"))


def test_screen_says_inline_when_the_ticks_are_too_many_to_compare(screen_ticks_page):
    page = screen_ticks_page
    boxes = page.locator("#ranking-body input[name=compare]")
    for index in range(3, 7):
        boxes.nth(index).check()
    assert "untick 1" in page.inner_text("#compare-count")
    assert page.get_attribute("#compare-button", "aria-disabled") == "true"
    boxes.nth(6).uncheck()
    assert "6 ticked" in page.inner_text("#compare-count")


@pytest.fixture()
def screen_ticks_page(page, live_server):
    page.set_default_timeout(BROWSER_MS)
    page.goto(f"{live_server.url}/?{SCENARIO}")
    page.wait_for_selector("body[data-ready='1']")
    return page


def test_shortlist_copy_link_copies_its_address(browser, live_server, shortlist_path):
    context = browser.new_context(viewport={"width": 1366, "height": 768})
    try:
        context.grant_permissions(["clipboard-read", "clipboard-write"], origin=live_server.url)
        page = context.new_page()
        page.set_default_timeout(BROWSER_MS)
        page.goto(live_server.url + shortlist_path)
        page.click("#copy-link")
        page.wait_for_selector("body[data-copied]", state="attached")
        assert page.evaluate("() => navigator.clipboard.readText()") == live_server.url + shortlist_path
        assert page.inner_text("#copy-status") == "Link copied."
        # the date in words, the exact moment on hover and for machines
        saved = page.locator("#saved-at")
        assert re.fullmatch(r"\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d[+-]\d\d:\d\d", saved.get_attribute("datetime"))
        assert saved.get_attribute("title") == saved.get_attribute("datetime")
        assert re.fullmatch(r"\d{1,2} [A-Z][a-z]{2} \d{4}, \d\d:\d\d UTC", saved.inner_text())
    finally:
        context.close()


@pytest.mark.parametrize("size", SIZES, ids=lambda s: f"{s[0]}x{s[1]}")
def test_ranking_picture_opens_within_the_page_width(browser, live_server, size):
    width, height = size
    context = browser.new_context(viewport={"width": width, "height": height}, is_mobile=width < 600)
    try:
        page = context.new_page()
        page.set_default_timeout(BROWSER_MS)
        page.goto(f"{live_server.url}/?{SCENARIO}")
        page.wait_for_selector("body[data-ready='1']")
        page.click("#picture-box summary")
        page.wait_for_function("() => document.getElementById('ranking-picture').naturalWidth > 0")
        assert page.eval_on_selector("#ranking-picture", "img => img.getBoundingClientRect().right") <= width
        assert page.evaluate("() => document.documentElement.scrollWidth") <= width
        assert page.get_attribute("#picture-svg", "href").startswith("/screen/picture.svg?")
    finally:
        context.close()
