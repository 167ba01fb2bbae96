"""The package's layout: imports form no loop, and no module reads another's private names."""

from __future__ import annotations

import ast

from conftest import REPO

PACKAGE = REPO / "verify"


def _imports() -> dict[str, set[tuple[str, str]]]:
    """Each emgate module -> (module, name) pairs it imports, function-local imports included."""
    modules = {
        ".".join(p.relative_to(PACKAGE).with_suffix("").parts).removesuffix(".__init__"): p
        for p in PACKAGE.rglob("*.py")
    }
    out: dict[str, set[tuple[str, str]]] = {}
    for name, path in modules.items():
        found: set[tuple[str, str]] = set()
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
                for alias in node.names:
                    sub = f"{node.module}.{alias.name}"
                    found.add((sub, "") if sub in modules else (node.module, alias.name))
            elif isinstance(node, ast.Import):
                found.update((alias.name, "") for alias in node.names)
        out[name] = {(m, n) for m, n in found if m in modules and m != name}
    return out


def test_the_package_imports_form_no_loop() -> None:
    graph = {m: {t for t, _ in targets} for m, targets in _imports().items()}
    # Depth-first search; a module met again on the current path closes a loop.
    loops: list[list[str]] = []
    state: dict[str, int] = {}  # 1 on the path, 2 done

    def visit(module: str, path: list[str]) -> None:
        state[module] = 1
        for target in sorted(graph[module]):
            if state.get(target) == 1:
                loops.append([*path[path.index(target) :], target])
            elif target not in state:
                visit(target, [*path, target])
        state[module] = 2

    for module in sorted(graph):
        if module not in state:
            visit(module, [module])
    assert loops == []  # a loop would make the import order matter (cli <-> scaffold was one)


def test_no_module_imports_another_modules_private_names() -> None:
    private = sorted(
        f"{importer} imports {module}.{name}"
        for importer, targets in _imports().items()
        for module, name in targets
        if name.startswith("_") and not name.startswith("__")
    )
    assert private == []
