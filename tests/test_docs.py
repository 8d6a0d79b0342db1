"""The docs keep up with the code: every CLI command and every route is documented."""

import argparse
from pathlib import Path

import pytest

from electrosieve.app.cli import build_parser

ROOT = Path(__file__).resolve().parent.parent
DOCS = (ROOT / "README.md").read_text(encoding="utf-8") + (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")


def _commands() -> list[str]:
    parser = build_parser()
    action = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    return sorted(action.choices)


@pytest.mark.parametrize("command", _commands())
def test_every_cli_command_is_documented(command):
    assert f"electrosieve {command}" in DOCS


def _paths(routes) -> set[str]:
    """Every route path, descending into included routers."""
    found = set()
    for route in routes:
        if hasattr(route, "path") and getattr(route, "include_in_schema", True):
            found.add(route.path)
        inner = getattr(route, "original_router", route)  # FastAPI wraps included routers
        if hasattr(inner, "routes"):
            found |= _paths(inner.routes)
    return found


def test_every_route_is_documented():
    main = pytest.importorskip("electrosieve.app.main")
    paths = sorted(p for p in _paths(main.app.routes) | set(main.app.openapi()["paths"])
                   if not p.startswith(("/openapi", "/docs", "/redoc")))
    missing = [path for path in paths if f"`{path}`" not in DOCS and path not in ("/static", "/vendor")]
    assert not missing, f"routes missing from README/DEVELOPERS.md: {missing}"


def test_every_module_is_in_the_layout_table():
    modules = [p for p in (ROOT / "engine").glob("*.py") if p.name != "__init__.py"]
    missing = [p.name for p in modules if f"engine/{p.name}" not in DOCS]
    assert not missing, f"engine modules missing from DEVELOPERS.md: {missing}"


def test_every_role_is_explained_with_its_sources_in_the_readme_and_the_docs_page(client):
    from electrosieve.engine.catalog import default_catalog
    from electrosieve.engine.roles import roles

    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    page = client.get("/docs").text
    catalog = default_catalog()
    for role in roles().values():
        assert f"| `{role.name}` |" in readme, role.name
        assert f'id="role-{role.name}"' in page, role.name
        for key in (*role.sources, *([role.criterion.source] if role.criterion else [])):
            shown = "common practice" if key not in catalog.sources else catalog.sources[key].authors.split(",")[0]
            assert shown in readme and shown in page, (role.name, key)
