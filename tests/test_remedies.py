"""Remedies: each suggested value, written into the record at the reported place, makes its
check pass when the gate runs again; what it is said to break, it breaks.

The judge is the gate itself run on the edited YAML text (not the remedy search), the
vendored OASIS SARIF 2.1.0 schema (jsonschema from PyPI) for the SARIF fixes, and the
pydantic model for the fields the sheet declares as drivers.
"""

from __future__ import annotations

import json
import re
import shutil
from functools import cache
from pathlib import Path
from typing import Any, get_args

import jsonschema
import pytest
import yaml

from conftest import DEMO, REPO, SERVO, run_cli, write_config
from emgate.calc.core import SHEET
from emgate.remedy import Edit
from emgate.remedy_fields import WIRE_DIAMETERS_MM

SARIF_SCHEMA = REPO / "tests" / "data" / "sarif" / "sarif-schema-2.1.0.json"
RECORDS = sorted((DEMO / "designs").glob("*.yaml"))


@pytest.fixture
def demo(tmp_path: Path) -> Path:
    """A copy of the bundled design repository (config, materials, designs)."""
    target = tmp_path / "design-repo"
    shutil.copytree(DEMO, target)
    (target / ".git").mkdir()
    return target


def gate(path: Path, *extra: str) -> dict[str, Any]:
    result = run_cli("check", "--format", "json", *extra, path)
    assert result.code in (0, 1), result.out + result.err
    return result.json()  # type: ignore[no-any-return]


def failing(doc: dict[str, Any]) -> list[dict[str, Any]]:
    return [f for f in doc["findings"] if f["check"] is not None and not f["check"]["passed"]]


def check_key(rule: str, check: dict[str, Any]) -> tuple[str, str, str, str]:
    return (rule, check["quantity"], check["bound"], check["record_path"])


def checks(doc: dict[str, Any], record_id: str) -> dict[tuple[str, str, str, str], Any]:
    (record,) = [r for r in doc["records"] if r["record_id"] == record_id]
    return {check_key(o["rule"], c): c for o in record["outcomes"] for c in o["checks"]}


def apply(text: str, edits: list[dict[str, Any]]) -> str:
    """``text`` with each edit's range (1-based, end exclusive, one line) replaced, checking
    that the range holds the text the remedy says it replaces."""
    lines = text.splitlines(keepends=True)
    for e in sorted(edits, key=lambda e: (e["line"], e["column"]), reverse=True):
        assert e["end_line"] == e["line"]
        row = lines[e["line"] - 1]
        start, end = e["column"] - 1, e["end_column"] - 1
        assert row[start:end] == e["old"], (row, e)
        lines[e["line"] - 1] = row[:start] + e["new"] + row[end:]
    return "".join(lines)


#: Failing records: the servo as bundled (it fails on purpose), and the other two bundled
#: records rated for more current at the same voltage (invented for the test, so that
#: other checks fail: an induction cage, rectangular strands, a declared figure).
CASES: dict[str, tuple[str, dict[str, str]]] = {
    "servo": (SERVO.name, {}),
    "pump-overrated": (
        "pump-drive-4p36s.yaml",
        {"power: 7.5 kW": "power: 15 kW", "line_current: 14.6 A": "line_current: 29.2 A"},
    ),
    "genset-overrated": (
        "genset-4p48s.yaml",
        {"power: 30 kVA": "power: 45 kVA", "line_current: 43.3 A": "line_current: 65 A"},
    ),
}


def make_case(folder: Path, case: str) -> Path:
    """The case's record in a copy of the demo repository at ``folder``."""
    name, edits = CASES[case]
    if not folder.exists():
        shutil.copytree(DEMO, folder)
    path = folder / "designs" / name
    text = path.read_text(encoding="utf-8")
    for old, new in edits.items():
        assert text.count(old) == 1
        text = text.replace(old, new)
    path.write_text(text, encoding="utf-8")
    return path


@cache
def case_run(case: str) -> str:
    """The gate's JSON on a fresh copy of the case (computed once for this module)."""
    import tempfile

    return json.dumps(gate(make_case(Path(tempfile.mkdtemp()) / "design-repo", case)))


def servo_run() -> str:
    return case_run("servo")


def servo_failing() -> list[dict[str, Any]]:
    return failing(json.loads(servo_run()))


def fix_cases() -> list[tuple[str, str, str, str, str]]:
    return [
        (case, f["rule"], f["check"]["quantity"], f["check"]["bound"], r["field"])
        for case in CASES
        for f in failing(json.loads(case_run(case)))
        for r in f["remedies"]
        if r["status"] == "fix"
    ]


def test_every_failing_check_of_the_servo_has_a_fix() -> None:
    found = servo_failing()
    # the servo breaks its limits on purpose: current density, thermal load, temperature rise
    assert {f["rule"] for f in found} >= {"current-density", "thermal-load", "temperature-rise"}
    for f in found:
        fixes = [r for r in f["remedies"] if r["status"] == "fix"]
        assert fixes, f
        assert len(f["remedies"]) <= 3


def test_the_cases_fail_other_checks_too() -> None:
    quantities = {
        f["check"]["quantity"] for case in CASES for f in failing(json.loads(case_run(case)))
    }
    assert {"rotor.bar_current_density", "stator.current_density"} <= quantities
    assert len(fix_cases()) >= 15


@pytest.mark.parametrize(("case", "rule", "quantity", "bound", "field"), fix_cases())
def test_applying_a_remedy_at_its_line_and_column_makes_the_check_pass(
    tmp_path: Path, case: str, rule: str, quantity: str, bound: str, field: str
) -> None:
    before = json.loads(case_run(case))
    (finding,) = [
        f
        for f in failing(before)
        if (f["rule"], f["check"]["quantity"], f["check"]["bound"]) == (rule, quantity, bound)
    ]
    (remedy,) = [r for r in finding["remedies"] if r["field"] == field]
    path = make_case(tmp_path / "design-repo", case)
    path.write_text(apply(path.read_text(encoding="utf-8"), remedy["edits"]), encoding="utf-8")
    after = gate(path, "--remedies", "off")
    assert not [f for f in after["findings"] if f["kind"] == "input"]  # a valid value
    record_id = finding["record_id"]
    key = check_key(rule, finding["check"])
    now = checks(after, record_id)
    assert now[key]["passed"], now[key]
    # the run agrees with what the remedy said: its value, and what it breaks
    assert now[key]["value"] == pytest.approx(remedy["value"], rel=1e-12)  # same calculation
    was = checks(before, record_id)
    broken = sorted(
        f"{k[0]}: {was[k]['label']}" for k, c in now.items() if not c["passed"] and was[k]["passed"]
    )
    assert broken == sorted(remedy["breaks"])


def test_a_remedy_that_breaks_another_check_is_marked() -> None:
    # A thicker wire lowers the current density but no longer fits the slot: slot fill.
    (finding,) = [f for f in servo_failing() if f["rule"] == "current-density"]
    (wire,) = [r for r in finding["remedies"] if r["field"] == "winding.conductor.bare_diameter"]
    assert wire["status"] == "fix"
    assert any(b.startswith("slot-fill:") for b in wire["breaks"])


def test_whole_numbers_stay_whole_and_wires_take_standard_sizes() -> None:
    seen_whole = seen_wire = False
    original = yaml.safe_load(SERVO.read_text(encoding="utf-8"))
    for f in servo_failing():
        for r in f["remedies"]:
            if r["status"] != "fix":
                continue
            node = original
            for part in r["field"].split("."):
                node = node[part]
            if isinstance(node, int):
                seen_whole = True
                assert isinstance(r["new"], str) and r["new"].isdigit(), r
                assert yaml.safe_load(r["new"]) == int(r["new"])
            if r["field"] == "winding.conductor.bare_diameter":
                seen_wire = True
                number, unit = r["new"].split()
                assert unit == "mm"  # the record's own unit
                assert float(number) in WIRE_DIAMETERS_MM
                # the insulation build of the record (0.77 - 0.71 mm) is kept
                (ins,) = [e for e in r["edits"] if e["record_path"].endswith("insulated_diameter")]
                assert float(ins["new"].split()[0]) - float(number) == pytest.approx(0.06, abs=1e-9)
    assert seen_whole and seen_wire


def test_the_wire_table_holds_the_r20_sizes() -> None:
    # R 20 preferred nominal diameters 0.71, 0.8, 0.9, 1.0, 1.12 mm [mem: IEC 60317-0-1]
    for d in (0.71, 0.8, 0.9, 1.0, 1.12):
        assert d in WIRE_DIAMETERS_MM
    assert list(WIRE_DIAMETERS_MM) == sorted(WIRE_DIAMETERS_MM)


def test_a_check_no_single_field_can_fix_says_so(demo: Path) -> None:
    # 0.001 A/mm^2 in a totally enclosed frame, with 150 strands in hand (0.066 A/mm^2): it
    # would take some 9900 strands, past the model's 200, a wire of 5.8 mm, past the 5 mm
    # of the wire table, or more parallel paths than the winding can take (an impossible
    # limit, for the test; J = I / (a n S) by hand)
    write_config(
        demo,
        "rules: {select: [current-density]}\n"
        "options: {current-density: {enclosed_natural: 0.001 A/mm^2}}\n",
    )
    record = demo / "designs" / SERVO.name
    text = record.read_text(encoding="utf-8")
    assert text.count("    strands: 1\n") == 1
    record.write_text(text.replace("    strands: 1\n", "    strands: 150\n"), encoding="utf-8")
    doc = gate(record)
    (finding,) = failing(doc)
    remedies = finding["remedies"]
    assert remedies and all(r["status"] == "none" and r["new"] is None for r in remedies)
    fields = {r["field"] for r in remedies}
    assert fields == {
        "winding.conductor.bare_diameter",
        "winding.conductor.strands",
        "winding.parallel_paths",
    }
    text = run_cli("check", demo / "designs" / SERVO.name).out
    assert "no single field can fix this check" in text
    (strands,) = [r for r in remedies if r["field"] == "winding.conductor.strands"]
    # the model's bound (strands le=200) is as far as the search goes, never beyond
    assert "(200 is as far as it goes)" in strands["reason"]


def test_no_suggestion_lies_outside_the_fields_valid_range(demo: Path) -> None:
    # Each suggested value validates through the model: rerunning the gate on it gives no
    # input error (above), and a count never leaves its declared bounds.
    from emgate.model.stator import RoundConductor, Winding

    bounds = {
        "winding.conductor.strands": RoundConductor.model_fields["strands"].metadata,
        "winding.turns_per_coil": Winding.model_fields["turns_per_coil"].metadata,
        "winding.parallel_paths": Winding.model_fields["parallel_paths"].metadata,
    }
    for f in servo_failing():
        for r in f["remedies"]:
            if r["status"] == "fix" and r["field"] in bounds:
                n = int(r["new"])
                for m in bounds[r["field"]]:
                    assert n >= getattr(m, "ge", n) and n <= getattr(m, "le", n)


def test_remedies_off_computes_none(demo: Path) -> None:
    doc = gate(demo / "designs" / SERVO.name, "--remedies", "off")
    assert failing(doc) and all(f["remedies"] == [] for f in doc["findings"])
    text = run_cli("check", "--remedies", "off", demo / "designs" / SERVO.name).out
    assert "fix:" not in text


def test_passing_records_get_no_remedies(demo: Path) -> None:
    doc = gate(demo / "designs" / "pump-drive-4p36s.yaml")
    assert all(f["remedies"] == [] for f in doc["findings"])


def test_sarif_fixes_replace_the_value_and_validate(demo: Path) -> None:
    # [pub: OASIS SARIF 2.1.0 JSON Schema, tests/data/sarif/]
    schema = json.loads(SARIF_SCHEMA.read_text(encoding="utf-8"))
    validator = jsonschema.validators.validator_for(schema)(schema)
    path = demo / "designs" / SERVO.name
    result = run_cli("check", "--format", "sarif", path)
    doc = json.loads(result.out)
    errors = sorted(validator.iter_errors(doc), key=str)
    assert not errors, errors[0]
    fixed = [r for r in doc["runs"][0]["results"] if r.get("fixes")]
    assert len(fixed) >= 3
    text = path.read_text(encoding="utf-8").splitlines()
    for result_ in fixed:
        for fix in result_["fixes"]:
            (change,) = fix["artifactChanges"]
            assert change["artifactLocation"]["uri"].endswith(SERVO.name)
            for rep in change["replacements"]:
                region = rep["deletedRegion"]
                row = text[region["startLine"] - 1]
                old = row[region["startColumn"] - 1 : region["endColumn"] - 1]
                # the region covers exactly one scalar of the record: a number, with its unit
                assert old and old.split()[0].replace(".", "").isdigit(), (row, region)
                assert rep["insertedContent"]["text"].split()[0].replace(".", "").isdigit()


def test_markdown_shows_the_remedies(demo: Path) -> None:
    out = run_cli("check", "--format", "markdown", demo / "designs" / SERVO.name).out
    # escaped for a table cell, one line (<br>) each under the finding's message
    assert re.search(r"<br>fix: winding\.turns\\_per\\_coil 100 -\\> \d+ gives ", out), out


def test_lsp_range_is_zero_based() -> None:
    e = Edit(("air_gap",), 3, 10, 3, 16, "0.8 mm", "1 mm")
    assert e.lsp_range() == {
        "start": {"line": 2, "character": 9},
        "end": {"line": 2, "character": 15},
    }


# ---------------------------------------------------------------- declared drivers


def _model_has(path: tuple[str, ...]) -> bool:
    """Whether some design model has the field path (through unions of sub-models)."""
    from pydantic import BaseModel

    from emgate.model import InductionDesign, SalientFieldDesign, SurfacePMDesign

    def walk(models: list[Any], rest: tuple[str, ...]) -> bool:
        if not rest:
            return True
        for m in models:
            if isinstance(m, type) and issubclass(m, BaseModel) and rest[0] in m.model_fields:
                ann = m.model_fields[rest[0]].annotation
                subs, pending = [], [ann]
                while pending:
                    t = pending.pop()
                    args = get_args(t)
                    if args:
                        pending.extend(args)
                    else:
                        subs.append(t)
                if walk(subs, rest[1:]):
                    return True
        return False

    return walk([InductionDesign, SurfacePMDesign, SalientFieldDesign], path)


def test_every_declared_driver_is_a_field_of_the_record() -> None:
    for entry in SHEET.values():
        for driver in entry.drivers:
            assert _model_has(tuple(driver.split("."))), (entry.name, driver)


def _moved(record: Path, tmp: Path, driver: str, name: str) -> bool | None:
    """Whether nudging ``driver`` alone moves sheet quantity ``name`` on ``record``; None
    where the record lacks the field or the quantity."""
    from emgate.calc import Calculation
    from emgate.discovery import discover_materials
    from emgate.loader import load_text
    from emgate.remedy_fields import NumberField

    catalogue = discover_materials(record)
    base_doc = load_text(record, record.read_text(encoding="utf-8"))
    from emgate.validate import validate_design

    base = Calculation(validate_design(base_doc), catalogue)
    if not base.applies(name):
        return None
    path = tuple(driver.split("."))
    f = NumberField.read(base_doc.data, path)
    if f is None:
        return None
    for step in [1, -1] if f.whole else [f.number * 0.05, -f.number * 0.05]:
        data = json.loads(json.dumps(base_doc.data))
        node = data
        for p in path[:-1]:
            node = node[p]
        node[path[-1]] = f.text(f.number + step)
        doc = load_text(record, yaml.safe_dump(data))
        try:
            moved = Calculation(validate_design(doc), catalogue).value(name)
        except Exception:  # that way is not valid for this record: try the other
            continue
        return abs(moved - base.value(name)) > 1e-9 * abs(base.value(name))
    return None


def test_every_declared_driver_moves_its_quantity_on_a_bundled_record(tmp_path: Path) -> None:
    # Declared, then held to the calculation: each driver that a bundled record has moves
    # its quantity on at least one of them (turns move no magnet's no-load tooth flux, so
    # not on every record; the remedy search skips a field that does not move the check).
    unproven: list[str] = []
    for entry in SHEET.values():
        for driver in entry.drivers:
            results = [_moved(r, tmp_path, driver, entry.name) for r in RECORDS]
            if any(r is not None for r in results) and not any(results):
                unproven.append(f"{entry.name} <- {driver}")
    assert unproven == []


def test_the_readme_shows_the_servos_remedies_as_the_gate_prints_them(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    # The README's demo block is the gate's own output (regenerate it with
    # `emgate check designs/servo-10p12s.yaml` in examples/design-repo when the physics moves).
    readme = (REPO / "README.md").read_text(encoding="utf-8")
    shown = [line[4:] for line in readme.splitlines() if line.startswith("          fix: ")]
    assert len(shown) >= 3
    monkeypatch.chdir(DEMO)
    out = run_cli("check", "--format", "text", Path("designs") / SERVO.name).out
    assert set(shown) <= set(out.splitlines())


def test_a_waived_check_gets_no_remedies(demo: Path) -> None:
    record = demo / "designs" / SERVO.name
    record.write_text(
        record.read_text(encoding="utf-8")
        + "waivers:\n  - rule: current-density\n    reason: prototype frame, see test report\n"
        "    owner: test\n    expires: 2999-01-01\n",
        encoding="utf-8",
    )
    doc = gate(record)
    (waived,) = [f for f in doc["findings"] if f["rule"] == "current-density"]
    assert waived["waived"] and waived["remedies"] == []
    assert all(f["remedies"] for f in failing(doc) if not f["waived"])


def test_the_sheet_finds_a_checks_remedies_from_its_outcome() -> None:
    # The HTML sheet reads checks from the records' outcomes, not findings.
    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.pipeline import Run
    from emgate.plugins import load_plugins
    from emgate.remedy_report import remedies_by_check, remedies_for

    plugins = load_plugins()
    rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
    installed = {p.distribution: p.version for p in plugins.packs}
    policy = load_policy(find_config(DEMO), rules, DEMO, installed)
    result = execute(Run(paths=[SERVO], policy=policy, plugins=plugins))
    (record,) = result.records
    failing_checks = [c for o in record.outcomes for c in o.checks if not c.passed]
    assert failing_checks
    by_check = remedies_by_check(result.findings)
    for c in failing_checks:
        (finding,) = [f for f in result.findings if f.check is c]
        assert by_check.get(id(c), []) == remedies_for(finding) != []
    passing = next(c for o in record.outcomes for c in o.checks if c.passed)
    assert by_check.get(id(passing), []) == []


def test_a_value_the_kernel_cannot_compute_is_no_fix(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """The remedy's answer is held to the plausibility pass a record is held to: where a
    sheet quantity is non-finite (injected here for strands thicker than the servo's own
    0.71 mm), the thicker wire that lowers the current density is not offered as a fix."""
    import math

    from emgate import calc

    real = calc.PROVIDERS["winding.temperature_rise"]
    monkeypatch.setitem(
        calc.PROVIDERS,
        "winding.temperature_rise",
        lambda c: math.nan if c.d.winding.conductor.bare_diameter > 0.7101e-3 else real(c),
    )
    run = gate(make_case(tmp_path / "design-repo", "servo"))
    (finding,) = [f for f in failing(run) if f["rule"] == "current-density"]
    wires = [r for r in finding["remedies"] if r["field"] == "winding.conductor.bare_diameter"]
    assert all(r["status"] != "fix" for r in wires), wires
    # the unchanged case offers it (the same check, without the injection)
    assert any(
        r["field"] == "winding.conductor.bare_diameter" and r["status"] == "fix"
        for f in servo_failing()
        if f["rule"] == "current-density"
        for r in f["remedies"]
    )
