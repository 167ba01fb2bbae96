"""The committed JSON Schemas: no drift from the models, valid Draft 2020-12, the examples
validate, and the schemas agree with emgate on invalid records.

The independent judge is the jsonschema library from PyPI; examples are read with PyYAML.
"""

from __future__ import annotations

import json
from functools import cache
from pathlib import Path
from typing import Any

import jsonschema
import pytest
import yaml

from conftest import DELETE, REPO, SCHEMAS, run_cli, write_variant

EXAMPLES = REPO / "examples"


class _TextDates(yaml.SafeLoader):
    """PyYAML's safe loader with YAML 1.2 dates: '2027-03-31' stays text, as in the editors
    that apply these schemas (YAML 1.1 would turn it into a date object JSON has no type for)."""


_TextDates.yaml_implicit_resolvers = {
    first: [(tag, rx) for tag, rx in resolvers if tag != "tag:yaml.org,2002:timestamp"]
    for first, resolvers in yaml.SafeLoader.yaml_implicit_resolvers.items()
}


def read_yaml(path: Path) -> Any:
    return yaml.load(path.read_text(encoding="utf-8"), Loader=_TextDates)


@cache
def validator(kind: str) -> jsonschema.Draft202012Validator:
    schema = json.loads((SCHEMAS / f"{kind}.schema.json").read_text(encoding="utf-8"))
    return jsonschema.Draft202012Validator(schema)


def schema_errors(kind: str, data: Any) -> list[str]:
    return [e.message for e in validator(kind).iter_errors(data)]


def test_committed_schemas_match_the_models(tmp_path: Path) -> None:
    result = run_cli("schema", "--write", tmp_path)
    assert result.code == 0, result.err
    generated = {p.name: p.read_text(encoding="utf-8") for p in tmp_path.glob("*.schema.json")}
    committed = {p.name: p.read_text(encoding="utf-8") for p in SCHEMAS.glob("*.schema.json")}
    assert generated, "emgate schema --write produced no files"
    hint = "the committed schemas are stale: run `nox -s schema` and commit schemas/"
    assert sorted(committed) == sorted(generated), hint
    for name, text in generated.items():
        assert committed[name] == text, f"{name}: {hint}"


def test_schema_command_prints_the_committed_text() -> None:
    for path in SCHEMAS.glob("*.schema.json"):
        kind = path.name.removesuffix(".schema.json")
        assert run_cli("schema", kind).out == path.read_text(encoding="utf-8"), kind


@pytest.mark.parametrize("path", sorted(SCHEMAS.glob("*.schema.json")), ids=lambda p: p.name)
def test_each_schema_is_valid_draft_2020_12(path: Path) -> None:
    schema = json.loads(path.read_text(encoding="utf-8"))
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    jsonschema.Draft202012Validator.check_schema(schema)  # raises SchemaError when invalid


def _examples() -> list[tuple[Path, str]]:
    out = []
    for path in sorted(EXAMPLES.rglob("*.y*ml")):
        if "build" in path.relative_to(EXAMPLES).parts:
            continue
        data = read_yaml(path)
        declared = data.get("schema") if isinstance(data, dict) else None
        if isinstance(declared, str) and declared.startswith("emgate/"):
            out.append((path, declared.split("/")[1].split("@")[0]))
    return out


EXAMPLE_FILES = _examples()


def test_examples_cover_every_kind_of_record() -> None:
    kinds = {kind for _, kind in EXAMPLE_FILES}
    assert {"design", "materials", "config"} <= kinds
    assert len([1 for _, k in EXAMPLE_FILES if k == "design"]) >= 3


@pytest.mark.parametrize(
    ("path", "kind"), EXAMPLE_FILES, ids=[str(p.relative_to(EXAMPLES)) for p, _ in EXAMPLE_FILES]
)
def test_example_validates_against_its_committed_schema(path: Path, kind: str) -> None:
    assert schema_errors(kind, read_yaml(path)) == []


# --- invalid records: the schema and emgate agree --------------------------------------------

INVALID = {
    "unknown-key": {"stator.bore_diamter": "136 mm"},
    "missing-key": {"stator.bore_diameter": DELETE},
    "missing-machine": {"machine": DELETE},
    "wrong-machine-kind": {"machine": "dc_brush"},
    "odd-poles": {"poles": 5},
    "bare-number-length": {"air_gap": 0.45},
    "insulation-class": {"winding.insulation_class": "Z"},
    "too-few-slots": {"stator.slots": 2},
    "stacking-factor-above-one": {"stator.stacking_factor": 1.5},
    "coil-pitch-0": {"winding.coil_pitch": 0},
    "slots-as-text": {"stator.slots": "36"},
    "bad-id": {"id": "Pump Drive"},
    "short-waiver-reason": {
        "waivers": [
            {"rule": "current-density", "reason": "ok", "owner": "J. Doe", "expires": "2027-03-31"}
        ]
    },
}


def test_the_valid_base_record_passes_both(repo: Path) -> None:
    path = write_variant(repo, {})
    assert schema_errors("design", read_yaml(path)) == []
    assert run_cli("check", path).code == 0


@pytest.mark.parametrize("overrides", INVALID.values(), ids=INVALID.keys())
def test_invalid_record_is_rejected_by_both(repo: Path, overrides: dict[str, Any]) -> None:
    path = write_variant(repo, overrides)
    assert schema_errors("design", read_yaml(path)), "the JSON Schema accepts it"
    assert run_cli("check", path).code == 2, "emgate accepts it"


@pytest.mark.parametrize("text", ["0.45", "12", "1e5"])
def test_unitless_text_for_a_length_is_rejected_by_both(repo: Path, text: str) -> None:
    path = write_variant(repo, {"air_gap": text})
    assert run_cli("check", path).code == 2
    assert schema_errors("design", read_yaml(path)), f"the JSON Schema accepts {text!r}"


def test_a_valid_waiver_passes_both(repo: Path) -> None:
    waiver = {
        "rule": "current-density",
        "reason": "accepted for the trial batch of ten",
        "owner": "J. Doe",
        "expires": "2027-03-31",
    }
    path = write_variant(repo, {"waivers": [waiver]})
    assert schema_errors("design", read_yaml(path)) == []
    assert run_cli("check", "--today", "2027-01-01", path).code == 0  # unused: a warning only


def test_config_schema_and_emgate_agree_on_an_unknown_key(repo: Path) -> None:
    config = repo / "emgate.yaml"
    config.write_text("schema: emgate/config@1\nrulez: {select: [all]}\n", encoding="utf-8")
    write_variant(repo, {})
    assert schema_errors("config", read_yaml(config))
    assert run_cli("check", repo).code == 2
