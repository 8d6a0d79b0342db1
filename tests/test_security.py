"""Security against a real uvicorn server on 127.0.0.1 (tests/conftest.py ``live_server``):

- titles and notes holding HTML/JS are inert in the page: Chromium (Playwright) runs no injected script,
  opens no dialog and creates no injected element, even with the Content-Security-Policy switched off,
  so escaping alone holds and the policy is a second line;
- request bodies over the cap get 413, announced or streamed, and a body of exactly the cap does not;
- path traversal on /static and /vendor gets 404 (raw ``..``, ``%2e%2e``, encoded slashes and backslashes);
- every response carries a Content-Security-Policy allowing only the app's own scripts, and the pages
  still work under it: no violation reported in the browser on /, /compare, /materials/Pt, /s/{id}.

Every wait is bounded (ACTION_MS per browser step, HTTP_TIMEOUT per request). Browser tests are
skipped, with the reason, when /usr/bin/chromium is missing.
"""

import http.client
import json
import socket
from urllib.parse import quote

import pytest

from electrosieve.app.settings import DEFAULT_MAX_BODY_BYTES

CAP = DEFAULT_MAX_BODY_BYTES
ACTION_MS = 15_000
HTTP_TIMEOUT = 20
READ_SECONDS = 5
"""How long a streamed body over the cap is held open waiting for the 413 [s]."""
SCENARIO = {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn", "Ni"]}

XSS_TITLE = "<script>window.__xss='title'</script><img src=x onerror=\"window.__xss='title-img'\"> acid cathodes"
XSS_NOTES = {
    "Pt": "<img src=x onerror=\"window.__xss='note-img';alert(1)\"> ask stores",
    "Zn": "<svg onload=\"window.__xss='note-svg'\"></svg><iframe src=\"javascript:parent.__xss='iframe'\"></iframe>",
    "Ni": "</td></tr></table><script>window.__xss='break-out'</script><a href=\"javascript:window.__xss='a'\">x</a>",
}
COMPARE_QUERY = ("ph_low=0&ph_high=1&potential_low=1.4&potential_high=1.8&scale=RHE&role=anode"
                 "&compare=Pt&compare=IrO2&compare=Ni")


# --- plain HTTP on the real server ------------------------------------------------------------

def raw_get(server, path: str, headers: dict | None = None) -> tuple[int, dict, bytes]:
    """GET ``path`` exactly as written (http.client does not normalise ``..`` or percent-escapes)."""
    connection = http.client.HTTPConnection("127.0.0.1", server.port, timeout=HTTP_TIMEOUT)
    try:
        connection.putrequest("GET", path, skip_accept_encoding=True)
        for name, value in (headers or {}).items():
            connection.putheader(name, value)
        connection.endheaders()
        answer = connection.getresponse()
        return answer.status, {k.lower(): v for k, v in answer.getheaders()}, answer.read()
    finally:
        connection.close()


def raw_post(server, path: str, body: bytes, headers: dict) -> tuple[int, dict, bytes]:
    connection = http.client.HTTPConnection("127.0.0.1", server.port, timeout=HTTP_TIMEOUT)
    try:
        connection.request("POST", path, body=body, headers=headers)
        answer = connection.getresponse()
        return answer.status, {k.lower(): v for k, v in answer.getheaders()}, answer.read()
    finally:
        connection.close()


def streamed_post(server, path: str, total: int, content_type: str, prefix: bytes = b"") -> tuple[int, bytes]:
    """POST a body of exactly ``total`` bytes (``prefix`` then ``x``...) with chunked transfer encoding (no
    Content-Length) on a raw socket, then wait for the answer before ending the body: a server that
    enforces the cap answers 413 by then; one that does not waits READ_SECONDS for the rest, gets it,
    and answers something else."""
    body = prefix + b"x" * (total - len(prefix))
    with socket.create_connection(("127.0.0.1", server.port), timeout=HTTP_TIMEOUT) as sock:
        sock.sendall(f"POST {path} HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: {content_type}\r\n"
                     "Transfer-Encoding: chunked\r\nConnection: close\r\n\r\n".encode())
        try:
            for start in range(0, len(body), 4096):
                chunk = body[start:start + 4096]
                sock.sendall(b"%x\r\n%s\r\n" % (len(chunk), chunk))
        except OSError:  # the server answered and closed as soon as the cap was passed
            pass
        answer = b""
        sock.settimeout(READ_SECONDS)
        try:
            answer = sock.recv(65536)
        except socket.timeout:  # no answer while the body is still open: the cap was not enforced
            sock.settimeout(HTTP_TIMEOUT)
            sock.sendall(b"0\r\n\r\n")
            answer = sock.recv(65536)
        except ConnectionResetError:
            pass
        sock.settimeout(HTTP_TIMEOUT)
        try:
            while data := sock.recv(65536):
                answer += data
        except ConnectionResetError:  # closed with bytes unread: the answer came before the reset
            pass
    status = int(answer.split(b" ", 2)[1]) if answer.startswith(b"HTTP/1.1 ") else 0
    return status, answer


def padded_screen_body(size: int) -> bytes:
    body = json.dumps({"ph": 7, "potential": 0, "materials": ["Pt"]}).encode()
    return body[:-1] + b" " * (size - len(body)) + b"}"


def test_a_body_of_exactly_the_cap_is_read_and_one_byte_more_gets_413(live_server):
    status, _, answer = raw_post(live_server, "/api/v1/screen", padded_screen_body(CAP),
                                 {"content-type": "application/json"})
    assert status == 200, answer[:300]
    status, headers, answer = raw_post(live_server, "/api/v1/screen", padded_screen_body(CAP + 1),
                                       {"content-type": "application/json"})
    assert status == 413
    assert json.loads(answer)["detail"][0]["loc"] == ["body"]
    assert "content-security-policy" in headers


@pytest.mark.parametrize("path, content_type, prefix", [
    ("/api/v1/screen", "application/json", b'{"ph": 7, "potential": 0, "scale": "'),
    ("/api/v1/shortlists", "application/json", b'{"title": "'),
    ("/shortlists", "application/x-www-form-urlencoded", b"ph_low=7&potential_low=0&title="),
    ("/shortlists", "multipart/form-data; boundary=xyz",
     b'--xyz\r\nContent-Disposition: form-data; name="title"\r\n\r\n'),
], ids=["screen JSON", "shortlist JSON", "form urlencoded", "form multipart"])
def test_a_streamed_body_over_the_cap_gets_413_and_the_server_keeps_answering(live_server, path, content_type,
                                                                              prefix):
    status, answer = streamed_post(live_server, path, CAP + 1, content_type, prefix)
    assert status == 413, answer[:300]
    assert b"larger than" in answer
    status, _, _ = raw_get(live_server, "/healthz")
    assert status == 200


@pytest.mark.parametrize("path", ["/api/v1/shortlists", "/shortlists"])
def test_an_announced_body_over_the_cap_gets_413(live_server, path):
    body = json.dumps({"title": "t" * (CAP + 10), "scenario": SCENARIO}).encode()
    status, _, answer = raw_post(live_server, path, body, {"content-type": "application/json"})
    assert status == 413, answer[:300]


TRAVERSALS = [
    "/static/../app/main.py",
    "/static/css/../../pyproject.toml",
    "/static/%2e%2e/app/main.py",
    "/static/.%2e/app/main.py",
    "/static/%2e%2e%2fapp%2fmain.py",
    "/static/..%2f..%2fpyproject.toml",
    "/static/css/..%2f..%2fpyproject.toml",
    "/static/%252e%252e/app/main.py",
    "/static/..\\app\\main.py",
    "/static/..%5capp%5cmain.py",
    "/static/%c0%ae%c0%ae/app/main.py",
    "/static/%2fetc%2fpasswd",
    "/static//etc/passwd",
    "/static/....//app/main.py",
    "/static/css/%00",
    "/vendor/../__init__.py",
    "/vendor/%2e%2e/__init__.py",
    "/vendor/..%2f__init__.py",
    "/vendor/../../../../etc/passwd",
    "/vendor/%2e%2e%2f%2e%2e%2f%2e%2e%2f%2e%2e%2f%2e%2e%2f%2e%2e%2fetc%2fpasswd",
]


@pytest.mark.parametrize("path", TRAVERSALS)
def test_path_traversal_on_static_files_gets_404(live_server, path):
    status, headers, body = raw_get(live_server, path)
    assert status == 404, (status, body[:200])
    assert b"root:" not in body and b"def create_app" not in body and b"[project]" not in body
    assert "content-security-policy" in headers


def test_the_static_mounts_do_serve_their_own_files(live_server):
    # the 404s above are refusals, not a broken mount
    for path, start in [("/static/css/site.css", b"/*"), ("/static/js/screen.js", b""),
                        ("/vendor/plotly.min.js", b"/**")]:
        status, _, body = raw_get(live_server, path)
        assert status == 200 and body.startswith(start) and len(body) > 1000, path


# --- the Content-Security-Policy -------------------------------------------------------------

def policy(header: str) -> dict[str, list[str]]:
    directives = {}
    for part in header.split(";"):
        words = part.split()
        if words:
            directives[words[0].lower()] = words[1:]
    return directives


def assert_strict_policy(header: str) -> None:
    rules = policy(header)
    assert rules["script-src"] == ["'self'"], header  # the app's own scripts only: no inline, no eval, no host
    assert rules["default-src"] == ["'self'"], header
    assert rules["object-src"] == ["'none'"] and rules["base-uri"] == ["'none'"], header
    assert rules["frame-ancestors"] == ["'none'"], header
    assert "'unsafe-eval'" not in header and "*" not in header and "http" not in header, header
    for directive in ("script-src-elem", "script-src-attr", "worker-src"):
        assert directive not in rules, header  # nothing loosens script-src for elements or attributes


def created_shortlist(server, title="CSP check", notes=None) -> str:
    body = json.dumps({"title": title, "scenario": SCENARIO, "notes": notes or {}}).encode()
    status, _, answer = raw_post(server, "/api/v1/shortlists", body, {"content-type": "application/json"})
    assert status == 201, answer[:300]
    return json.loads(answer)["id"]


def test_every_kind_of_response_carries_the_strict_policy(live_server):
    shortlist_id = created_shortlist(live_server)
    html = {"accept": "text/html"}
    paths = [
        ("/", html), (f"/compare?{COMPARE_QUERY}", html), ("/materials", html), ("/materials/Pt", html),
        (f"/s/{shortlist_id}", html), (f"/s/{shortlist_id}.json", {}), (f"/s/{shortlist_id}.csv", {}),
        ("/docs", html), ("/openapi.json", {}), ("/healthz", {}), ("/screen.json", {}), ("/screen.csv", {}),
        ("/api/v1/materials", {}), ("/api/v1/diagram/Zn", {}), ("/static/css/site.css", {}),
        ("/vendor/plotly.min.js", {}), ("/static/favicon.svg", {}),
        ("/nowhere", html), ("/s/AAAAAAAAAAAAAAAA", html), ("/api/v1/shortlists/AAAAAAAAAAAAAAAA", {}),
        ("/?ph_low=nan", html), ("/api/v1/point/Zn?ph=nan&potential=0", {}), ("/static", {}),
    ]
    for path, headers in paths:
        status, answer_headers, _ = raw_get(live_server, path, headers)
        assert status < 500, path
        assert "content-security-policy" in answer_headers, (path, status)
        assert_strict_policy(answer_headers["content-security-policy"])
        assert answer_headers.get("x-content-type-options") == "nosniff", path


def test_an_unexpected_failure_also_carries_the_policy(tmp_path):
    # Starlette answers a 500 outside every middleware: the error handler adds the headers itself.
    from fastapi.testclient import TestClient

    from electrosieve.app.main import create_app
    from electrosieve.app.settings import Settings

    app = create_app(Settings(data_dir=tmp_path))

    @app.get("/test-only-failure")
    def failure():
        raise RuntimeError("a bug")

    with TestClient(app, raise_server_exceptions=False) as client:
        for accept in ("application/json", "text/html"):
            response = client.get("/test-only-failure", headers={"accept": accept})
            assert response.status_code == 500
            assert "RuntimeError" in response.text and "a bug" not in response.text  # no internals shown
            assert_strict_policy(response.headers["content-security-policy"])


# --- in the browser ----------------------------------------------------------------------------

WATCH_VIOLATIONS = """
window.__cspViolations = [];
document.addEventListener('securitypolicyviolation', function (e) {
  window.__cspViolations.push(e.violatedDirective + ' ' + e.blockedURI);
});
"""


class Watched:
    """A page with every CSP violation, console error, page error and dialog recorded."""

    def __init__(self, page):
        self.page = page
        self.console: list[str] = []
        self.errors: list[str] = []
        self.dialogs: list[str] = []
        page.set_default_timeout(ACTION_MS)
        page.add_init_script(WATCH_VIOLATIONS)
        page.on("console", lambda message: self.console.append(f"{message.type}: {message.text}"))
        page.on("pageerror", lambda error: self.errors.append(str(error)))
        page.on("dialog", self._dialog)

    def _dialog(self, dialog):
        self.dialogs.append(dialog.message)
        dialog.dismiss()

    def violations(self) -> list[str]:
        reported = self.page.evaluate("() => window.__cspViolations || []")
        console = [line for line in self.console
                   if "Content Security Policy" in line or "Refused to" in line]
        return reported + console

    def injected(self) -> object:
        return self.page.evaluate("() => window.__xss")


def open_watched(browser, url: str, *, bypass_csp: bool = False) -> tuple:
    context = browser.new_context(bypass_csp=bypass_csp)
    page = context.new_page()
    watched = Watched(page)
    page.goto(url)
    page.wait_for_load_state("load")
    return context, watched


@pytest.fixture(scope="module")
def hostile_shortlist(live_server):
    return created_shortlist(live_server, XSS_TITLE, XSS_NOTES)


@pytest.mark.parametrize("bypass_csp", [False, True], ids=["under the policy", "policy switched off"])
def test_html_and_script_in_titles_and_notes_are_inert(browser, live_server, hostile_shortlist, bypass_csp):
    context, watched = open_watched(browser, f"{live_server.url}/s/{hostile_shortlist}", bypass_csp=bypass_csp)
    try:
        page = watched.page
        page.wait_for_timeout(300)  # give an injected onerror/onload the time to fire
        assert page.inner_text("#shortlist-title") == XSS_TITLE  # shown as text
        assert page.locator("#shortlist-title *").count() == 0
        for material, note in XSS_NOTES.items():
            cell = page.locator(f"tr[data-material='{material}'] td.note")
            assert cell.inner_text() == note
            assert cell.locator("*").count() == 0
        assert page.locator("main script, main iframe, #ranking img, #ranking svg").count() == 0
        assert watched.injected() is None and not watched.dialogs, (watched.injected(), watched.dialogs)
        assert not watched.errors, watched.errors
        if not bypass_csp:
            assert not watched.violations(), watched.violations()  # nothing was injected for the policy to block
    finally:
        context.close()


ECHOED = "<img src=x onerror=\"window.__xss='echo'\"><script>window.__xss='echo-script'</script>"


@pytest.mark.parametrize("path", [
    f"/materials/{quote(ECHOED, safe='')}",
    f"/?ph_low={quote(ECHOED, safe='')}&potential_low=0",
    f"/?ph_low=0&potential_low=0&scale={quote(ECHOED[:38], safe='')}",
    f"/compare?ph_low=7&potential_low=0&compare=Pt&compare={quote(ECHOED[:60], safe='')}",
    f"/s/{quote(ECHOED, safe='')}",
], ids=["material page 404", "screen page 422", "scale echoed in the form", "compare page 422", "shortlist 404"])
def test_input_echoed_in_error_pages_is_inert(browser, live_server, path):
    context, watched = open_watched(browser, live_server.url + path, bypass_csp=True)
    try:
        watched.page.wait_for_timeout(200)
        assert watched.injected() is None and not watched.dialogs
        assert watched.page.locator("main img, main script").count() == 0
    finally:
        context.close()


@pytest.mark.parametrize("name", ["screen", "compare", "material", "shortlist", "docs", "materials"])
def test_pages_work_under_the_policy_with_no_violation(browser, live_server, name):
    shortlist_id = created_shortlist(live_server, "works under the policy", {"Pt": "fine"})
    url, ready = {
        "screen": ("/?ph_low=0&ph_high=1&potential_low=1.4&potential_high=1.8&scale=RHE&role=anode",
                   "body[data-ready='1']"),
        "compare": (f"/compare?{COMPARE_QUERY}", "body[data-plots-ready='1']"),
        "material": ("/materials/Pt", "body[data-plots-ready='1']"),
        "shortlist": (f"/s/{shortlist_id}", "#ranking tbody tr"),
        "docs": ("/docs", "main h1"),
        "materials": ("/materials", "main table"),
    }[name]
    context, watched = open_watched(browser, live_server.url + url)
    try:
        page = watched.page
        page.wait_for_selector(ready)
        if name in ("compare", "material"):
            assert page.locator(".plot .main-svg").count() >= 1  # plotly drew under the policy
        if name == "screen":
            page.check("input[name=role][value=cathode]")  # the script re-ranks through fetch()
            page.wait_for_selector("body[data-updates='1'][data-busy='0']")
        page.wait_for_timeout(300)
        assert not watched.violations(), watched.violations()
        assert not watched.errors, watched.errors
        assert not [line for line in watched.console if line.startswith("error")], watched.console
    finally:
        context.close()
