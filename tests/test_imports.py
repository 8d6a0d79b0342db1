"""The import graph is a tree you can draw: the engine has no cycle, no hidden imports inside functions and no
web imports; route modules never import one another.

The imports are read from the source with ``ast`` (so an import inside a function counts too), never by
importing the modules.
"""

import ast
from pathlib import Path

import electrosieve.engine

ENGINE = Path(electrosieve.engine.__file__).resolve().parent
"""The engine folder (its parent holds app/ too: the folders stay at the repository's top)."""
MODULES = {path.stem: path for path in sorted(ENGINE.glob("*.py")) if path.stem != "__init__"}

FORBIDDEN = ("electrosieve.app", "fastapi", "starlette", "plotly", "jinja2", "uvicorn", "sqlalchemy")
"""Packages the engine never imports: the app and the web and plotting libraries."""

DATA_READERS = {"activity", "alloydata", "catalog", "conduction", "datafiles", "electrolyte", "kinetics", "materials",
                "notes", "robustness", "roles"}
"""The modules that read and validate ``data/`` files; only they may use pydantic (a parsing library, no web)."""

OPTIONAL_HEAVY = ()
"""Optional heavy dependencies an engine function may import lazily (none today)."""


def imports_of(path: Path) -> list[tuple[str, bool]]:
    """(absolute module name, at the top of the module?) for every import statement in ``path``."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    top = {id(node) for node in tree.body}
    found = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            found += [(alias.name, id(node) in top) for alias in node.names]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = "electrosieve.engine" if node.level == 1 else "electrosieve"
                module = f"{base}.{node.module}" if node.module else base
                names = [f"{module}.{alias.name}" if not node.module else module for alias in node.names]
                found += [(name, id(node) in top) for name in names]
            else:
                found.append((node.module, id(node) in top))
    return found


def engine_graph() -> dict[str, set[str]]:
    prefix = "electrosieve.engine."
    return {name: {m.removeprefix(prefix).split(".")[0] for m, _ in imports_of(path) if m.startswith(prefix)}
            for name, path in MODULES.items()}


def test_the_walk_sees_every_engine_import():
    graph = engine_graph()
    assert "catalog" in graph["diagram"] and "inputs" in graph["thermo"]
    assert set().union(*graph.values()) <= set(MODULES)


def test_the_engine_import_graph_has_no_cycle():
    graph = engine_graph()
    state: dict[str, int] = {}

    def visit(name, path):
        state[name] = 1
        for other in sorted(graph[name]):
            if state.get(other) == 1:
                cycle = path[path.index(other):] + [other]
                raise AssertionError("import cycle: " + " -> ".join(cycle))
            if other not in state:
                visit(other, path + [other])
        state[name] = 2

    for name in sorted(graph):
        if name not in state:
            visit(name, [name])


def test_the_engine_imports_no_app_or_web_library():
    bad = []
    for name, path in MODULES.items():
        for module, _ in imports_of(path):
            if any(module == f or module.startswith(f + ".") for f in FORBIDDEN):
                bad.append(f"engine/{name}.py imports {module}")
            if module.split(".")[0] == "pydantic" and name not in DATA_READERS:
                bad.append(f"engine/{name}.py imports pydantic (only {sorted(DATA_READERS)} read data files)")
    assert not bad, bad


def test_the_engine_imports_at_the_top_of_each_module():
    hidden = [f"engine/{name}.py imports {module} inside a function"
              for name, path in MODULES.items() for module, at_top in imports_of(path)
              if not at_top and module.split(".")[0] not in OPTIONAL_HEAVY]
    assert not hidden, hidden


def test_the_engine_declares_its_public_names():
    missing = [name for name in electrosieve.engine.__all__ if not hasattr(electrosieve.engine, name)]
    assert electrosieve.engine.__all__ and not missing, missing


ROUTES = ENGINE.parent / "app" / "routes"
ROUTE_HELPERS = {"common", "http"}
"""What every router shares (the running app's state, templates, HTTP plumbing): not routes themselves."""


def test_route_modules_do_not_import_each_other():
    routes = {path.stem for path in ROUTES.glob("*.py")} - ROUTE_HELPERS - {"__init__"}
    crossing = []
    for name in sorted(routes):
        tree = ast.parse((ROUTES / f"{name}.py").read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, ast.ImportFrom) and node.level == 1:
                imported = {node.module} if node.module else {alias.name for alias in node.names}
                crossing += [f"routes/{name}.py imports routes/{other}.py" for other in imported & routes]
    assert routes and not crossing, crossing
