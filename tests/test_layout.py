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


def test_the_ci_templates_have_one_source() -> None:
    """emgate init writes the package templates; no copy of one elsewhere can drift from it."""
    templates = PACKAGE / "emgate" / "templates"
    texts = {p.read_bytes(): p.name for p in templates.iterdir() if p.is_file()}
    skip = {".git", ".venv", ".nox", "build", "dist", "__pycache__", ".pytest_cache"}
    copies = sorted(
        f"{p.relative_to(REPO)} copies {texts[p.read_bytes()]}"
        for p in REPO.rglob("*")
        if not skip & set(p.relative_to(REPO).parts)
        and not any(part.endswith(".egg-info") for part in p.relative_to(REPO).parts)
        and not p.is_relative_to(templates)
        and p.is_file()
        and p.stat().st_size in {len(t) for t in texts}
        and p.read_bytes() in texts
    )
    assert copies == []


def test_no_test_module_is_named_after_history_or_imports_another() -> None:
    """Shared helpers live in conftest.py; a test module is named after the behaviour it tests."""
    tests = REPO / "tests"
    modules = sorted(tests.rglob("test_*.py"))
    names = {p.stem for p in modules}
    crossing = sorted(
        f"{p.relative_to(tests)} imports {node.module}"
        for p in modules
        for node in ast.walk(ast.parse(p.read_text(encoding="utf-8")))
        if isinstance(node, ast.ImportFrom) and node.module in names
    )
    assert crossing == []
    assert not [n for n in names if "fixes" in n or "review" in n]
