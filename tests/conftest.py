"""Shared fixtures: the CLI run in-process, and design-record variants written to tmp_path.

Record variants start from the demo records, are edited as plain data and written back with
PyYAML's dumper; the expected line of a node is read back with PyYAML's composer, which is
independent of emgate's own loader, so a wrong mark in emgate cannot hide in the oracle.
"""

from __future__ import annotations

import copy
import io
import json
import sys
import textwrap
from collections.abc import Callable, Mapping
from contextlib import redirect_stderr, redirect_stdout
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pytest
import yaml

REPO = Path(__file__).resolve().parents[1]
DEMO = REPO / "examples" / "design-repo"
DESIGNS = DEMO / "designs"
PUMP = DESIGNS / "pump-drive-4p36s.yaml"  # passes every rule on the default limits
SERVO = DESIGNS / "servo-10p12s.yaml"  # breaks the current-density limit on purpose
GENSET = DESIGNS / "genset-4p48s.yaml"  # needs the demo materials file
STEELS = DEMO / "materials" / "steels.yaml"
SCHEMAS = REPO / "schemas"

DELETE = object()  # an override value that removes the key


@dataclass
class CliResult:
    code: int
    out: str
    err: str

    def json(self) -> dict[str, Any]:
        return json.loads(self.out)

    def input_findings(self) -> list[dict[str, Any]]:
        return [f for f in self.json()["findings"] if f["kind"] == "input"]


def run_cli(*argv: str | Path) -> CliResult:
    """Run ``emgate ARGV`` in this process; sys.path is restored afterwards because the CLI
    drops the working directory from it."""
    from emgate.cli import main

    out, err = io.StringIO(), io.StringIO()
    saved = sys.path[:]
    try:
        with redirect_stdout(out), redirect_stderr(err):
            try:
                code = main([str(a) for a in argv])
            except SystemExit as exc:  # argparse: --version, usage errors
                code = exc.code if isinstance(exc.code, int) else 2
    finally:
        sys.path[:] = saved
    return CliResult(code, out.getvalue(), err.getvalue())


@pytest.fixture
def cli() -> Callable[..., CliResult]:
    return run_cli


def _split(dotted: str) -> list[str | int]:
    return [int(p) if p.isdigit() else p for p in dotted.split(".")]


def override(data: Any, dotted: str, value: Any) -> None:
    """Set (or with :data:`DELETE` remove) the node at a dotted path such as 'stator.slots'
    or 'waivers.0.rule'; missing mappings on the way are created."""
    *parents, last = _split(dotted)
    node = data
    for part in parents:
        if isinstance(part, str) and part not in node:
            node[part] = {}
        node = node[part]
    if value is DELETE:
        del node[last]
    else:
        node[last] = value


def write_variant(
    folder: Path,
    overrides: Mapping[str, Any] | None = None,
    *,
    base: Path = PUMP,
    name: str | None = None,
) -> Path:
    """Write ``base`` with ``overrides`` applied to ``folder`` and return the file's path."""
    data = copy.deepcopy(yaml.safe_load(base.read_text(encoding="utf-8")))
    for dotted, value in (overrides or {}).items():
        override(data, dotted, value)
    path = folder / (name or base.name)
    path.write_text(yaml.safe_dump(data, sort_keys=False, allow_unicode=True), encoding="utf-8")
    return path


def node_mark(path: Path, dotted: str, *, key: bool = False) -> tuple[int, int]:
    """1-based (line, column) where emgate should locate a node, read by PyYAML's composer:
    a scalar at its value, a mapping or list at the key naming it (its first item may be
    lines below), or with ``key`` always at the key."""
    node = yaml.compose(path.read_text(encoding="utf-8"), Loader=yaml.SafeLoader)
    key_node = None
    for part in _split(dotted) if dotted else []:
        if isinstance(node, yaml.MappingNode):
            key_node, node = next((k, v) for k, v in node.value if k.value == part)
        else:
            assert isinstance(part, int)
            key_node, node = None, node.value[part]
    collection = isinstance(node, yaml.MappingNode | yaml.SequenceNode)
    target = key_node if (key or collection) and key_node is not None else node
    return target.start_mark.line + 1, target.start_mark.column + 1


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    """An empty design repository: the '.git' marker stops the upward search for a config."""
    (tmp_path / ".git").mkdir()
    return tmp_path


@dataclass
class PluginHost:
    """Extra entry points of the group ``emgate.plugins``, beside the installed ones, backed
    by modules written to a folder on sys.path for the length of one test."""

    folder: Path
    monkeypatch: pytest.MonkeyPatch
    extra: list[Any]
    modules: list[str]

    def add(self, name: str, module: str, source: str | None = None) -> Any:
        """Register entry point ``name`` -> ``module``; write the module if ``source`` given."""
        from importlib.metadata import EntryPoint

        if source is not None:
            (self.folder / f"{module}.py").write_text(textwrap.dedent(source), encoding="utf-8")
        self.modules.append(module)
        ep = EntryPoint(name=name, value=module, group="emgate.plugins")
        self.extra.append(ep)
        return ep


@pytest.fixture
def plugin_host(tmp_path: Path, monkeypatch: pytest.MonkeyPatch):  # type: ignore[no-untyped-def]
    import importlib
    from importlib.metadata import entry_points

    import emgate.plugins

    folder = tmp_path / "plugin_modules"
    folder.mkdir()
    monkeypatch.syspath_prepend(str(folder))
    host = PluginHost(folder, monkeypatch, [], [])

    def patched(**kwargs: Any) -> list[Any]:
        return [*entry_points(**kwargs), *host.extra]

    monkeypatch.setattr(emgate.plugins, "entry_points", patched)
    importlib.invalidate_caches()
    yield host
    for module in host.modules:
        sys.modules.pop(module, None)
