"""A tiny JSON client for tests that talk to a real server over loopback."""

import json
import urllib.error
import urllib.request


def request_json(method: str, url: str, body: dict | None = None, timeout: float = 20) -> tuple[int, dict]:
    """(status, decoded JSON body) of one request; HTTP errors are answers too, not exceptions."""
    data = None if body is None else json.dumps(body).encode()
    req = urllib.request.Request(url, data=data, method=method, headers={"content-type": "application/json"})
    try:
        with urllib.request.urlopen(req, timeout=timeout) as answer:
            return answer.status, json.loads(answer.read())
    except urllib.error.HTTPError as error:
        return error.code, json.loads(error.read() or b"{}")
