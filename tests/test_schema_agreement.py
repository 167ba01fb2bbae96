"""The committed JSON Schemas say what emgate says: check-jsonschema (PyPI), the validator an
editor or a CI job would run, and emgate give the same verdict on a corpus of record and
configuration mutations, except for the cross-field and value-range checks a schema of
text fields cannot express, listed in CANNOT_EXPRESS with the reason.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest
import yaml

from conftest import DELETE, PUMP, SCHEMAS, run_cli, write_variant

OK, BAD = "accepted", "rejected"

#: name -> (overrides of the pump record, emgate's verdict)
RECORDS: dict[str, tuple[dict[str, Any], str]] = {
    "base": ({}, OK),
    "insulation-class-155": ({"winding.insulation_class": 155}, OK),
    "insulation-class-155-text": ({"winding.insulation_class": "155"}, OK),
    "insulation-class-Z": ({"winding.insulation_class": "Z"}, BAD),
    "insulation-class-200": ({"winding.insulation_class": 200}, BAD),
    "wedge-height-bare-zero": ({"rotor.slot.wedge_height": 0}, OK),
    "wedge-height-zero-mm": ({"stator.slot.wedge_height": "0 mm"}, OK),
    "air-gap-bare-zero": ({"air_gap": 0}, BAD),  # a gap must be greater than zero
    "air-gap-zero-mm": ({"air_gap": "0 mm"}, BAD),
    "air-gap-in-amperes": ({"air_gap": "3 A"}, BAD),
    "air-gap-negative": ({"air_gap": "-0.45 mm"}, BAD),
    "air-gap-overflow": ({"air_gap": "1e400 mm"}, BAD),
    "air-gap-bare-number": ({"air_gap": 0.45}, BAD),
    "air-gap-unitless-text": ({"air_gap": "0.45"}, BAD),
    "air-gap-in-inches": ({"air_gap": "0.018 in"}, OK),
    "speed-in-volts": ({"rating.speed": "1460 V"}, BAD),
    "speed-r-per-min": ({"rating.speed": "1460 r/min"}, OK),
    "power-in-hp": ({"rating.power": "10 hp"}, OK),
    "power-in-hours": ({"rating.power": "20 h"}, BAD),
    "current-density-mm2": ({"declared": {"stator.current_density": "6.6 A/mm2"}}, OK),
    "ambient-in-kelvin-absolute": ({"cooling.ambient": "40 K"}, BAD),  # -233 degC: see below
    "ambient-bare-number": ({"cooling.ambient": 40}, BAD),
    "ambient-below-zero": ({"cooling.ambient": "-20 degC"}, OK),
    "turns-whole-float": ({"winding.turns_per_coil": 21.0}, OK),
    "turns-fraction": ({"winding.turns_per_coil": 21.5}, BAD),
    "turns-as-text": ({"winding.turns_per_coil": "21"}, BAD),
    "cooling-code-spaced": ({"cooling.code": "ic 411"}, OK),
    "cooling-code-wrong": ({"cooling.code": "XY411"}, BAD),
    "odd-poles": ({"poles": 5}, BAD),
    "unknown-key": ({"stator.bore_diamter": "136 mm"}, BAD),
    "missing-key": ({"stator.bore_diameter": DELETE}, BAD),
    "missing-machine": ({"machine": DELETE}, BAD),
    "unknown-machine": ({"machine": "dc_brush"}, BAD),
    "bad-id": ({"id": "Pump Drive"}, BAD),
    "unknown-slot-shape": ({"stator.slot.shape": "round"}, BAD),
    "unknown-connection": ({"rating.connection": "zigzag"}, BAD),
    "bore-above-outer-diameter": ({"stator.bore_diameter": "230 mm"}, BAD),
    "coil-pitch-above-slots": ({"winding.coil_pitch": 40}, BAD),
}

#: What a schema of the record's text cannot check, and so accepts while emgate does not.
CANNOT_EXPRESS = {
    # a range of a value given as text with a unit: the schema sees text, not kelvin
    "ambient-in-kelvin-absolute": "the coolant's range -60 to 120 degC (a value range on a"
    " quantity text)",
    # relations between fields (emgate.consistency)
    "bore-above-outer-diameter": "bore below outer diameter (two fields)",
    "coil-pitch-above-slots": "a coil pitch within the slots (two fields)",
}

RULE_CONFIG = "schema: emgate/config@1\n"
OVERRIDE = RULE_CONFIG + "overrides:\n  - files: ['*.yaml']\n    options: "
#: name -> (emgate.yaml text, emgate's verdict)
CONFIGS: dict[str, tuple[str, str]] = {
    "base": (RULE_CONFIG + "options:\n  current-density: {enclosed_fan: 8 A/mm^2}\n", OK),
    "unknown-option": (RULE_CONFIG + "options:\n  current-density: {enclosed_fann: 8}\n", BAD),
    "option-of-an-unknown-rule": (RULE_CONFIG + "options:\n  no-such-rule: {maximum: 1}\n", BAD),
    "option-in-the-wrong-unit": (
        RULE_CONFIG + "options:\n  current-density: {enclosed_fan: 8 V}\n",
        BAD,
    ),
    "bad-selector": (RULE_CONFIG + "rules: {select: ['Slot Fill']}\n", BAD),
    "unknown-severity": (RULE_CONFIG + "severity: {slot-fill: fatal}\n", BAD),
    "override-options": (
        RULE_CONFIG
        + "overrides:\n  - files: ['*.yaml']\n    options: {slot-fill: {random_wound: 0.5}}\n",
        OK,
    ),
    "override-unknown-option": (
        RULE_CONFIG
        + "overrides:\n  - files: ['*.yaml']\n    options: {slot-fill: {random: 0.5}}\n",
        BAD,
    ),
    "unknown-key": (RULE_CONFIG + "rulez: {select: [all]}\n", BAD),
}


def check_jsonschema(schema: Path, files: list[Path]) -> set[str]:
    """The files check-jsonschema rejects (its JSON output names each failing file)."""
    exe = shutil.which("check-jsonschema", path=str(Path(sys.executable).parent))
    exe = exe or shutil.which("check-jsonschema")
    assert exe, "check-jsonschema is needed (the test extra installs it)"
    done = subprocess.run(
        [exe, "-o", "json", "--schemafile", str(schema), *map(str, files)],
        capture_output=True,
        text=True,
        check=False,
        timeout=120,
    )
    report = json.loads(done.stdout)
    assert not report.get("parse_errors"), report["parse_errors"]
    return {Path(e["filename"]).name for e in report["errors"]}


def emgate_verdict(*argv: str | Path) -> str:
    done = run_cli("check", "--remedies", "off", "--format", "json", *argv)
    assert done.code in (0, 1, 2), done.out + done.err
    return BAD if done.code == 2 else OK


def test_the_corpus_is_as_large_as_promised() -> None:
    assert len(RECORDS) >= 33 and len(CONFIGS) >= 7
    assert set(CANNOT_EXPRESS) <= set(RECORDS)


def test_records_get_the_same_verdict_from_the_schema_and_emgate(tmp_path: Path) -> None:
    files = {}
    for name, (overrides, _) in RECORDS.items():
        folder = tmp_path / name
        folder.mkdir()
        (folder / ".git").mkdir()  # a repository of its own: no config from above
        files[name] = write_variant(folder, overrides, name=f"{name}.yaml")
    rejected = check_jsonschema(SCHEMAS / "design.schema.json", list(files.values()))
    disagree = {}
    for name, (_, expected) in RECORDS.items():
        ours = emgate_verdict(files[name])
        theirs = BAD if f"{name}.yaml" in rejected else OK
        assert ours == expected, f"{name}: emgate {ours}, the corpus says {expected}"
        if ours != theirs:
            disagree[name] = f"emgate {ours}, check-jsonschema {theirs}"
    assert disagree == {k: f"emgate {BAD}, check-jsonschema {OK}" for k in CANNOT_EXPRESS}


def test_configs_get_the_same_verdict_from_the_schema_and_emgate(tmp_path: Path) -> None:
    """The configuration schema holds every installed rule's options (this environment's:
    the built-in rules and the sample company pack)."""
    record = yaml.safe_load(PUMP.read_text())
    disagree = {}
    for name, (text, expected) in CONFIGS.items():
        folder = tmp_path / name
        folder.mkdir()
        (folder / ".git").mkdir()
        (folder / "emgate.yaml").write_text(text)
        (folder / "pump.yaml").write_text(yaml.safe_dump(record, sort_keys=False))
        ours = emgate_verdict("--config", folder / "emgate.yaml", folder / "pump.yaml")
        theirs = (
            BAD
            if check_jsonschema(SCHEMAS / "config.schema.json", [folder / "emgate.yaml"])
            else OK
        )
        assert ours == expected, f"{name}: emgate {ours}, the corpus says {expected}"
        if ours != theirs:
            disagree[name] = f"emgate {ours}, check-jsonschema {theirs}"
    assert disagree == {}


@pytest.mark.parametrize("kind", ["design", "config"])
def test_every_example_in_the_schema_is_a_valid_value(kind: str) -> None:
    """Completion inserts the examples: each must pass the property's own schema."""
    import jsonschema

    schema = json.loads((SCHEMAS / f"{kind}.schema.json").read_text())
    bad = []

    def walk(node: Any, where: str) -> None:
        if isinstance(node, dict):
            for example in node.get("examples", []):
                sub = {k: v for k, v in node.items() if k not in ("examples", "default")}
                sub["$defs"] = schema.get("$defs", {})
                if list(jsonschema.Draft202012Validator(sub).iter_errors(example)):
                    bad.append(f"{where}: {example!r}")
            for key, value in node.items():
                walk(value, f"{where}/{key}")
        elif isinstance(node, list):
            for i, value in enumerate(node):
                walk(value, f"{where}/{i}")

    walk(schema, "#")
    assert bad == []


def _scalar(prop: dict[str, Any]) -> bool:
    branches = [prop, *prop.get("anyOf", [])]
    return not any("$ref" in b or b.get("type") in ("object", "array") for b in branches)


@pytest.mark.parametrize("kind", ["design", "materials", "waivers"])
def test_every_property_is_described_and_every_value_has_an_example(kind: str) -> None:
    """An editor's hover shows the description and its completion inserts the first
    example: no property is left with none, or with only its type's generic text."""
    schema = json.loads((SCHEMAS / f"{kind}.schema.json").read_text())
    bare, no_example = [], []
    for model, definition in schema["$defs"].items():
        for name, prop in definition.get("properties", {}).items():
            text = str(prop.get("description", ""))
            if not text or "with its unit, e.g." in text:
                bare.append(f"{model}.{name}")
            if _scalar(prop) and "examples" not in prop and "const" not in prop:
                no_example.append(f"{model}.{name}")
    assert bare == [] and no_example == []
