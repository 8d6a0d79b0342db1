"""The pages in a real browser (Debian's Chromium via Playwright) against a real uvicorn server on 127.0.0.1.

Every wait is bounded (ACTION_MS per step); the server fixture is bounded by its start-up timeout.
Skipped, with the reason, when /usr/bin/chromium is missing (see tests/conftest.py).
"""

import re
from urllib.parse import parse_qs, urlparse

import pytest

ACTION_MS = 15_000
"""Longest wait of any one browser step [ms]."""


@pytest.fixture()
def screen_page(page, live_server):
    page.set_default_timeout(ACTION_MS)
    errors = []
    page.on("pageerror", lambda error: errors.append(str(error)))
    page.goto(f"{live_server.url}/?ph_low=0&ph_high=1&potential_low=1.4&potential_high=1.8&scale=RHE&role=anode")
    page.wait_for_selector("body[data-ready='1']")
    yield page
    assert not errors, errors


def ranking(page) -> list[str]:
    return page.eval_on_selector_all("#ranking tbody tr", "rows => rows.map(r => r.dataset.material)")


def wait_for_update(page, count: int) -> None:
    page.wait_for_selector(f"body[data-updates='{count}'][data-busy='0']")


def test_form_change_reranks_without_reload_and_updates_the_url(screen_page, live_server):
    page = screen_page
    before = ranking(page)
    assert len(before) > 3
    page.evaluate("() => { window.sameDocument = true; }")
    # An acid cathode instead of an acid anode: the metals that stay metallic rise (common practice).
    page.check("input[name=role][value=cathode]")
    wait_for_update(page, 1)
    page.fill("#potential_low", "-0.3")
    page.fill("#potential_high", "-0.1")
    page.select_option("#scale", "SHE")
    page.wait_for_selector("body[data-busy='0']")
    page.wait_for_url(re.compile(r"potential_low=-0\.3.*potential_high=-0\.1.*scale=SHE.*role=cathode"))
    page.wait_for_selector("#ranking tbody tr")
    page.wait_for_timeout(800)  # let the debounced re-run land
    page.wait_for_selector("body[data-busy='0']")
    after = ranking(page)
    assert after != before
    assert page.evaluate("() => window.sameDocument === true")  # no reload happened
    query = parse_qs(urlparse(page.url).query, keep_blank_values=True)
    assert query["role"] == ["cathode"] and query["scale"] == ["SHE"]
    assert page.get_attribute("#csv-link", "href").startswith("/screen.csv?")
    assert "cathode" in page.inner_text("#scenario-line").lower()


def table_text(page) -> list[str]:
    return [" ".join(text.split()) for text in page.eval_on_selector_all(
        "#ranking tbody tr", "rows => rows.map(r => r.innerText)")]


def test_pasted_url_shows_the_same_ranking_with_javascript_off(screen_page, browser):
    page = screen_page
    page.check("input[name=role][value=cathode]")
    wait_for_update(page, 1)
    shown = ranking(page)
    context = browser.new_context(java_script_enabled=False)
    try:
        other = context.new_page()
        other.set_default_timeout(ACTION_MS)
        other.goto(page.url)
        assert ranking(other) == shown
        # the rows drawn by the script read exactly like the rows the server renders
        assert table_text(other) == table_text(page)
        assert other.inner_text("#rule-text") == page.inner_text("#rule-text")
        assert other.inner_text("#scenario-line").split() == page.inner_text("#scenario-line").split()
    finally:
        context.close()


def test_bad_input_is_named_next_to_the_form(screen_page):
    page = screen_page
    page.fill("#ph_low", "3")
    page.fill("#ph_high", "1")
    page.press("#ph_high", "Tab")
    page.wait_for_selector("#error-ph_low:not([hidden])")
    assert "inverted" in page.inner_text("#error-ph_low")
    assert page.get_attribute("#ph_low", "aria-invalid") == "true"
    assert page.locator("#errors").is_hidden()  # said once, at the field


def test_compare_page_draws_diagrams_switches_axis_and_downloads(screen_page):
    page = screen_page
    ticked = page.eval_on_selector_all("input[name=compare]:checked", "boxes => boxes.map(b => b.value)")
    assert len(ticked) == 3
    page.click("#compare-button")
    page.wait_for_url(re.compile(r"/compare\?"))
    page.wait_for_selector("body[data-plots-ready='1']")
    assert page.locator(".plot .main-svg").count() >= 3
    assert "E / V vs RHE" in page.inner_text(".plot >> nth=0")
    # hover the middle of the first plot (under the side-by-side table): the label names a species and its region
    page.locator(".plot >> nth=0").scroll_into_view_if_needed()
    box = page.locator(".plot .nsewdrag >> nth=0").bounding_box()
    page.mouse.move(box["x"] + box["width"] * 0.5, box["y"] + box["height"] * 0.5)
    page.wait_for_selector(".hoverlayer .hovertext")
    hover = page.text_content(".hoverlayer")
    assert re.search(r"\S+ \((solid|aqueous|liquid|gas)\): (immunity|passivation|corrosion)", hover), hover
    with page.expect_download() as download:
        page.click("button[data-download='svg'] >> nth=0")
    assert download.value.suggested_filename.endswith(".svg")
    svg = open(download.value.path(), "rb").read()
    assert svg.lstrip().startswith(b"<svg") and len(svg) > 5000
    with page.expect_download() as download:
        page.click("button[data-download='png'] >> nth=0")
    assert download.value.suggested_filename.endswith(".png")
    assert open(download.value.path(), "rb").read(8) == b"\x89PNG\r\n\x1a\n"
    page.select_option("#axis", "SCE")
    page.wait_for_selector("body[data-axis='SCE']", state="attached")  # redrawn in place
    assert re.search(r"axis=SCE", page.url)
    assert "E / V vs SCE" in page.inner_text(".plot >> nth=0")


def test_saved_shortlist_opens_in_a_fresh_context_with_the_same_ranking(screen_page, browser):
    page = screen_page
    page.check("input[name=role][value=cathode]")
    wait_for_update(page, 1)
    shown = ranking(page)
    title = "<script>window.hacked = 1</script> acid cathodes"
    note = "<img src=x onerror=\"window.hacked = 2\"> ask stores"
    page.fill("#title", title)
    page.click("#notes-box summary")
    first = shown[0]
    page.fill(f"#note-{first}", note)
    page.click("#save-button")
    link = page.wait_for_selector("#shortlist-link")
    href = link.get_attribute("href")
    assert re.fullmatch(r"/s/[A-Za-z0-9_-]{16}", href)
    context = browser.new_context()
    try:
        other = context.new_page()
        other.set_default_timeout(ACTION_MS)
        other.goto(link.inner_text())
        assert other.inner_text("#shortlist-title") == title  # shown as text, not run
        assert ranking(other) == shown
        assert note in other.inner_text(f"tr[data-material='{first}'] td.note")
        assert other.evaluate("() => window.hacked === undefined")
        assert other.locator("#ranking img").count() == 0
        other.click("#start-from-this")
        other.wait_for_selector("body[data-ready='1']")
        assert ranking(other) == shown
    finally:
        context.close()


def test_keyboard_reaches_the_form_and_the_table(screen_page):
    page = screen_page
    page.keyboard.press("Tab")
    assert page.evaluate("() => document.activeElement.classList.contains('skip-link')")
    page.focus("#ph_low")
    page.keyboard.press("Tab")
    assert page.evaluate("() => document.activeElement.id") == "ph_high"


def test_phone_width_keeps_the_page_usable(browser, live_server):
    context = browser.new_context(viewport={"width": 390, "height": 844}, device_scale_factor=2, is_mobile=True)
    try:
        page = context.new_page()
        page.set_default_timeout(ACTION_MS)
        page.goto(live_server.url + "/")
        page.wait_for_selector("body[data-ready='1']")
        width = page.evaluate("() => document.documentElement.scrollWidth")
        assert width <= 400  # the wide table scrolls inside its own box, not the page
        assert page.locator("#ph_low").is_visible()
    finally:
        context.close()
