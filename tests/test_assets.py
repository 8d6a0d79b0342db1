"""Compression and versioned URLs: pages, JSON, CSV, scripts and styles compressed; plotly.js and static files
kept by the browser for a year under URLs that change with their content."""

import gzip
import re

from electrosieve.app import assets, urls

GZIP = {"accept-encoding": "gzip"}


def test_pages_json_and_csv_are_compressed_above_one_kilobyte(client):
    for path in ("/", "/screen.json", "/materials", "/materials/Zn.json", "/screen.csv"):
        response = client.get(path, headers=GZIP)
        assert response.status_code == 200, path
        assert response.headers.get("content-encoding") == "gzip", path
        assert int(response.headers["content-length"]) < len(response.content), path  # httpx unpacks it
    small = client.get("/healthz", headers=GZIP)
    assert "content-encoding" not in small.headers  # under 1000 bytes: sent as it is


def test_plotly_js_has_its_version_in_the_path_and_comes_compressed_for_a_year(client):
    assert assets.PLOTLY_VERSION in urls.plotly_js()
    packed = client.get(urls.plotly_js(), headers=GZIP)
    assert packed.status_code == 200 and packed.headers["content-encoding"] == "gzip"
    assert packed.headers["cache-control"] == "public, max-age=31536000, immutable"
    assert int(packed.headers["content-length"]) < 0.5 * len(packed.content)
    assert packed.content == assets.PLOTLY_JS.read_bytes()
    plain = client.get(urls.plotly_js(), headers={"accept-encoding": "identity"})
    assert "content-encoding" not in plain.headers and plain.content == packed.content
    assert gzip.decompress(assets.plotly_bytes()[1]) == plain.content


def test_static_files_are_versioned_by_their_content(client):
    url = urls.static("css/site.css")
    assert re.fullmatch(r"/static/css/site\.css\?v=[0-9a-f]{12}", url)
    kept = client.get(url, headers=GZIP)
    assert kept.headers["cache-control"] == "public, max-age=31536000, immutable"
    assert kept.headers["content-encoding"] == "gzip"
    stale = client.get("/static/css/site.css?v=000000000000")
    assert stale.status_code == 200 and stale.headers["cache-control"] == "no-cache"
    page = client.get("/compare?compare=Pt&compare=Zn").text
    assert urls.static("js/plots.js").replace("&", "&amp;") in page and urls.plotly_js() in page
