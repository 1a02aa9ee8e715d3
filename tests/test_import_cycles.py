"""No module of ``pairings`` imports a module that imports it back (directly or not).

The graph is read from the source with ``ast``: each module's top-level
imports (also inside ``try`` and ``if``, but not under ``if TYPE_CHECKING``,
which never runs), resolved to the module they load. In the engine and the
desk the imports inside functions count too: deferring an import would only
hide a circle there. A circle is found by a depth-first search (Tarjan's
strongly connected components, common practice).
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

import pairings

ROOT = Path(pairings.__file__).parent


def _modules() -> dict[str, Path]:
    """Every module of the package by dotted name; the compiled kernels by their C source (no imports)."""
    out = {}
    for path in [*ROOT.rglob("*.py"), *ROOT.rglob("*.c")]:
        parts = ["pairings", *path.relative_to(ROOT).with_suffix("").parts]
        if parts[-1] == "__init__":
            parts.pop()
        out[".".join(parts)] = path
    return out


def _top_level(body: list[ast.stmt]) -> list[ast.Import | ast.ImportFrom]:
    found: list[ast.Import | ast.ImportFrom] = []
    for node in body:
        if isinstance(node, (ast.Import, ast.ImportFrom)):
            found.append(node)
        elif isinstance(node, ast.If):
            if not (isinstance(node.test, ast.Name) and node.test.id == "TYPE_CHECKING"):
                found += _top_level(node.body) + _top_level(node.orelse)
        elif isinstance(node, ast.Try):
            found += _top_level(node.body)
            for handler in node.handlers:
                found += _top_level(handler.body)
            found += _top_level(node.orelse) + _top_level(node.finalbody)
    return found


def _anywhere(body: list[ast.stmt]) -> list[ast.Import | ast.ImportFrom]:
    """Every import of the module, also inside functions (not under ``if TYPE_CHECKING``)."""
    found = _top_level(body)
    for node in body:
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
            found += [n for n in ast.walk(node) if isinstance(n, (ast.Import, ast.ImportFrom))]
    return found


def _imports(name: str, path: Path, modules: dict[str, Path], deferred: bool = False) -> set[str]:
    """The modules of the package that ``name`` imports (``deferred``: also inside its functions)."""
    package = name if path.name == "__init__.py" else name.rpartition(".")[0]
    out: set[str] = set()
    if path.suffix == ".c":
        return out
    body = ast.parse(path.read_text(encoding="utf-8")).body
    for node in (_anywhere if deferred else _top_level)(body):
        if isinstance(node, ast.Import):
            out |= {a.name for a in node.names if a.name in modules}
            continue
        base = node.module or ""
        if node.level:
            base = ".".join(package.split(".")[: len(package.split(".")) - node.level + 1] + ([base] if base else []))
        for a in node.names:
            target = f"{base}.{a.name}"
            if target in modules:
                out.add(target)  # a submodule
            elif base in modules:
                out.add(base)  # a name defined in the module (or package)
    return out - {name}


def _cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected components with more than one module (Tarjan 1972)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on_stack: set[str] = set()
    out: list[list[str]] = []

    def visit(v: str) -> None:
        index[v] = low[v] = len(index)
        stack.append(v)
        on_stack.add(v)
        for w in sorted(graph[v]):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on_stack:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            component = []
            while True:
                w = stack.pop()
                on_stack.discard(w)
                component.append(w)
                if w == v:
                    break
            if len(component) > 1:
                out.append(sorted(component))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def test_the_import_graph_reads_real_imports() -> None:
    modules = _modules()
    graph = {name: _imports(name, path, modules) for name, path in modules.items()}
    assert "pairings.engine.blossom" in graph["pairings.engine.canonical"]
    assert "pairings.engine.types" in graph["pairings.engine.verify"]
    deferred = _imports("pairings.engine.draft", modules["pairings.engine.draft"], modules, deferred=True)
    assert "pairings.engine.dutch" in deferred - graph["pairings.engine.draft"]  # imported inside a function


def test_no_module_imports_itself_back() -> None:
    modules = _modules()
    graph = {name: _imports(name, path, modules) for name, path in modules.items()}
    assert _cycles(graph) == []


@pytest.mark.parametrize("part", ["pairings.engine", "pairings.tui"])
def test_no_deferred_import_closes_a_circle(part: str) -> None:
    modules = {name: path for name, path in _modules().items() if name == part or name.startswith(part + ".")}
    graph = {name: _imports(name, path, modules, deferred=True) & set(modules) for name, path in modules.items()}
    assert _cycles(graph) == []


def test_a_circle_is_found() -> None:
    assert _cycles({"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}) == [["a", "b", "c"]]
