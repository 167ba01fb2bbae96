"""Fuzz: mutated bundled records through the engine and every reporter (hypothesis).

Each example takes one of the bundled records and applies one to three mutations: a number
rescaled within a plausible factor, or replaced (extremes included) with its unit kept; a
unit replaced; a value replaced by another type; a key deleted or misspelt; the schema line
broken. The run must not raise, must exit 0 to 3 with no rule crash, must carry no
non-finite number, and every reporter must produce a parseable document.

The default run is short (``EMGATE_FUZZ_EXAMPLES``, default 150); ``nox -s fuzz`` runs
100,000 examples, or the count given as its argument.
"""

from __future__ import annotations

import copy
import json
import math
import os
import re
import shutil
import tempfile
import xml.etree.ElementTree as ET
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest
import yaml
from hypothesis import HealthCheck, event, given, settings
from hypothesis import strategies as st

from conftest import GENSET, PUMP, SERVO, STEELS

EXAMPLES = int(os.environ.get("EMGATE_FUZZ_EXAMPLES", "150"))
BASES = {p.name: yaml.safe_load(p.read_text(encoding="utf-8")) for p in (PUMP, SERVO, GENSET)}
_NUMBER = re.compile(r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?")
UNITS = ["mm", "m", "um", "A", "kA", "V", "kV", "Hz", "rpm", "T", "kA/m", "%/K", "degC", "K"]
UNITS += ["kW", "A/mm^2", "", "mm^2", "1/K", "m^9", "°C", "kOe", "G"]
_QUOTED = re.compile(r"'[^']*'|\"[^\"]*\"")
_NONFINITE_WORD = re.compile(r"(?<![\w.])(nan|inf)(?![\w])")
EXTREMES = [1e308, 5e-324, 1e300, -1.0, 0.0, 1e-300, -1e308, 2.2250738585072014e-308]


def _leaves(node: Any, path: tuple = ()) -> Iterator[tuple[tuple, Any]]:
    yield path, node
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _leaves(v, (*path, k))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _leaves(v, (*path, i))


numbers = st.one_of(
    st.sampled_from(EXTREMES),
    st.floats(allow_nan=False, allow_infinity=False),
    st.integers(min_value=-(10**6), max_value=10**6),
)
values = st.one_of(
    numbers,
    st.none(),
    st.booleans(),
    st.text(max_size=12),
    st.lists(numbers, max_size=3),
    st.dictionaries(st.sampled_from(["a", "shape", "material"]), numbers, max_size=2),
)


#: Mutation kinds; a plausible rescaling (x 0.3 to 3) three times as likely as each other
#: kind, so that many mutants stay valid and reach the kernel and the rules.
KINDS = ["scale", "scale", "scale", "number", "unit", "value", "delete", "rename", "schema"]


def _numeric(value: Any) -> bool:
    return isinstance(value, float) or (isinstance(value, str) and bool(_NUMBER.match(value)))


def _number_text(x: float | int) -> str:
    return repr(float(x)) if isinstance(x, float) else str(x)


@st.composite
def mutated(draw: st.DrawFn) -> tuple[str, dict[str, Any]]:
    name = draw(st.sampled_from(sorted(BASES)))
    data = copy.deepcopy(BASES[name])
    for _ in range(draw(st.integers(min_value=1, max_value=3))):
        kind = draw(st.sampled_from(KINDS))
        sites = [(p, v) for p, v in _leaves(data) if p and (kind != "scale" or _numeric(v))]
        path, value = draw(st.sampled_from(sites))
        parent = data
        for part in path[:-1]:
            parent = parent[part]
        key = path[-1]
        if kind == "scale" and isinstance(value, str) and (m := _NUMBER.match(value)):
            scaled = float(m.group(0)) * draw(st.floats(min_value=0.3, max_value=3.0))
            parent[key] = _number_text(scaled) + value[m.end() :]
        elif kind == "scale" and isinstance(value, float):
            parent[key] = value * draw(st.floats(min_value=0.3, max_value=3.0))
        elif kind == "number" and isinstance(value, str) and (m := _NUMBER.match(value)):
            parent[key] = _number_text(draw(numbers)) + value[m.end() :]
        elif kind == "number" and isinstance(value, int | float) and not isinstance(value, bool):
            parent[key] = draw(numbers)
        elif kind == "unit" and isinstance(value, str) and (m := _NUMBER.match(value)):
            parent[key] = value[: m.end()] + " " + draw(st.sampled_from(UNITS))
        elif kind == "delete" and isinstance(parent, dict):
            del parent[key]
        elif kind == "rename" and isinstance(parent, dict):
            parent[draw(st.sampled_from([str(key).upper(), f" {key}", f"{key}_"]))] = parent.pop(
                key
            )
        elif kind == "schema":
            schema = ["EMGATE/design@1", " emgate/design@1", "emgate/design@2", 1.5, None, []]
            data["schema"] = draw(st.sampled_from(schema))
        else:
            parent[key] = draw(values)
    return name, data


@pytest.fixture(scope="module")
def engine() -> Iterator[tuple[Path, Any, Any]]:
    from emgate.config import load_policy
    from emgate.plugins import load_plugins

    folder = Path(tempfile.mkdtemp(prefix="emgate-fuzz-"))
    (folder / ".git").mkdir()
    shutil.copy(STEELS, folder / "steels.yaml")
    plugins = load_plugins()
    policy = load_policy(None, {r: lr.rule for r, lr in plugins.rules.items()}, folder)
    yield folder, plugins, policy
    shutil.rmtree(folder, ignore_errors=True)


def _finite_json(text: str) -> Any:
    def refuse(token: str) -> Any:
        raise AssertionError(f"non-finite number {token} in a JSON output")

    return json.loads(text, parse_constant=refuse)


def check_outputs(result: Any) -> None:
    """Every reporter renders, and what it renders parses, with finite numbers only."""
    from emgate.report import FORMATS, reporter

    for fmt in FORMATS:
        text = reporter(fmt)(result)
        assert isinstance(text, str) and text.endswith("\n"), fmt
        if fmt in ("json", "sarif", "codequality"):
            _finite_json(text)
        elif fmt == "junit":
            ET.fromstring(text.encode("utf-8"))
        elif fmt == "annotations":
            assert all(line.startswith("::") for line in text.splitlines()), text
        # (a number written out, not the record's own text quoted back in a message)
        bare = [_QUOTED.sub("", ln.lower()) for ln in text.splitlines()]
        bad = [ln for ln in bare if _NONFINITE_WORD.search(ln)]
        assert not bad, (fmt, bad)


@settings(
    max_examples=EXAMPLES,
    deadline=None,
    database=None,
    derandomize=EXAMPLES <= 1000,  # the suite's run is the same every time
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture],
)
@given(mutated())
def test_mutated_records_are_reported_never_escape(
    engine: tuple[Path, Any, Any], case: tuple[str, dict[str, Any]]
) -> None:
    from emgate.engine import execute
    from emgate.pipeline import Run

    folder, plugins, policy = engine
    name, data = case
    target = folder / name
    try:
        target.write_text(yaml.safe_dump(data, sort_keys=False, allow_unicode=True))
        result = execute(Run(paths=[folder], policy=policy, plugins=plugins))
    finally:
        pass
    try:
        assert result.exit_code in (0, 1, 2, 3)
        event(f"exit code {result.exit_code}")  # the spread, with --hypothesis-show-statistics
        crashes = [f.message for f in result.findings if f.kind == "crash"]
        assert not crashes, crashes
        for record in result.records:
            for outcome in record.outcomes:
                for check in outcome.checks:
                    assert math.isfinite(check.value) and math.isfinite(check.limit), check
        # a design whose file is there is reported: as a record, or as an input error
        assert result.records or any(
            f.kind == "input" and f.severity == "error" for f in result.findings
        ), [f.message for f in result.findings]
        check_outputs(result)
    finally:
        target.unlink()
