"""The CI output formats against their outside definitions.

SARIF is validated with jsonschema against the OASIS SARIF 2.1.0 schema (tests/data/sarif/);
JUnit XML is read back with expat (xml.dom.minidom), a strict XML parser; annotation lines are
decoded the way the CI runner decodes workflow commands; the code-quality array and the
Markdown table are parsed back and compared with the RunResult they came from. Most results
are built by hand, with a waived finding, a crash, input errors with and without a file, and
a hostile message and file names; the demo repository is also run through the engine.
"""

from __future__ import annotations

import json
import math
import os
import re
import subprocess
import sys
import xml.dom.minidom
from pathlib import Path
from typing import Any
from urllib.parse import unquote

import jsonschema
import pint
import pytest

from conftest import DEMO, PUMP, check_json, run_cli, the_check, variant
from emgate import __version__
from emgate.calc import SHEET
from emgate.findings import DISCLAIMER, Finding, RunResult
from emgate.report import FORMATS, reporter
from emgate.report.annotations import escape_data, escape_property
from emgate.report.common import printable
from report_samples import (
    CRASH,
    FILE_A,
    FILE_B,
    FILE_BAD,
    FILE_CI,
    HOSTILE,
    PLUGIN_ERROR,
    SKIPPED,
    WAIVER,
    clean_result,
    hand_result,
)

UREG = pint.UnitRegistry()
SQRT3 = math.sqrt(3.0)
REPO = Path(__file__).resolve().parents[1]
SARIF_SCHEMA = REPO / "tests" / "data" / "sarif" / "sarif-schema-2.1.0.json"


@pytest.fixture(scope="module")
def demo() -> RunResult:
    """The demo repository through the engine, as ``emgate check examples/design-repo``."""
    import os

    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.pipeline import Run
    from emgate.plugins import load_plugins

    here = Path.cwd()
    os.chdir(REPO)  # findings name files relative to the working folder
    try:
        plugins = load_plugins()
        folder = Path("examples/design-repo")
        rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
        policy = load_policy(find_config(folder), rules, Path.cwd())
        return execute(Run(paths=[folder], policy=policy, plugins=plugins))
    finally:
        os.chdir(here)


def _ran(result: RunResult) -> set[str]:
    return {o.rule for r in result.records for o in r.outcomes if o.status != "not_applicable"}


# ---------------------------------------------------------------- registration


def test_every_format_is_registered_and_renders_an_empty_run() -> None:
    assert set(FORMATS) >= {
        "text",
        "json",
        "sarif",
        "junit",
        "annotations",
        "codequality",
        "markdown",
    }
    for name in FORMATS:
        assert isinstance(reporter(name)(RunResult()), str), name
    with pytest.raises(KeyError):
        reporter("no-such-format")


def test_importing_the_registry_loads_no_reporter() -> None:
    code = (
        "import sys, emgate.report\n"
        "print(sorted(m for m in sys.modules if m.startswith(('emgate.report.', 'xml'))))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


# ---------------------------------------------------------------- SARIF


@pytest.fixture(scope="module")
def sarif_validator() -> jsonschema.protocols.Validator:
    schema = json.loads(SARIF_SCHEMA.read_text(encoding="utf-8"))
    cls = jsonschema.validators.validator_for(schema)  # the draft the schema itself declares
    cls.check_schema(schema)
    return cls(schema)


@pytest.mark.parametrize(
    "make", [hand_result, clean_result, RunResult], ids=["hand", "clean", "empty"]
)
def test_sarif_is_valid_against_the_oasis_schema(make, sarif_validator) -> None:  # type: ignore[no-untyped-def]
    # [pub: OASIS SARIF 2.1.0 JSON Schema, tests/data/sarif/]
    doc = json.loads(reporter("sarif")(make()))
    errors = sorted(sarif_validator.iter_errors(doc), key=lambda e: list(e.path))
    assert not errors, [f"{list(e.path)}: {e.message}" for e in errors]


def test_sarif_demo_is_valid(demo: RunResult, sarif_validator) -> None:  # type: ignore[no-untyped-def]
    doc = json.loads(reporter("sarif")(demo))
    sarif_validator.validate(doc)
    run = doc["runs"][0]
    assert len(run["results"]) == len(demo.findings)  # the demo has no file-less input error
    assert {r["id"] for r in run["tool"]["driver"]["rules"]} == _ran(demo)


def test_sarif_structure() -> None:
    result = hand_result()
    text = reporter("sarif")(result)
    doc = json.loads(text)
    assert doc["version"] == "2.1.0"
    assert "informationUri" not in text and "://" not in text  # no host names
    assert len(doc["runs"]) == 1
    run = doc["runs"][0]
    driver = run["tool"]["driver"]
    assert (driver["name"], driver["version"]) == ("emgate", __version__)
    rules = driver["rules"]
    # gap-flux was loaded but applied to no record: it did not run; input is emgate's own
    assert [r["id"] for r in rules] == [
        "acme/aspect",
        "current-density",
        "winding-balance",
        "input",
    ]
    assert rules[0]["shortDescription"]["text"] == "stack aspect | within `tooling`"
    assert rules[0]["properties"]["version"] == "2.3"
    assert rules[0]["properties"]["distribution"] == "acme-pack"
    assert run["properties"]["disclaimer"] == DISCLAIMER
    assert "acme/aspect v2.3" in run["properties"]["rulesRun"]

    located = [f for f in result.findings if f.file]
    assert len(run["results"]) == len(located)
    for f, r in zip(located, run["results"], strict=True):
        assert r["ruleId"] == f.rule
        assert rules[r["ruleIndex"]]["id"] == f.rule
        assert r["level"] == {"error": "error", "warning": "warning", "info": "note"}[f.severity]
        assert r["message"]["text"] == f.message
        loc = r["locations"][0]
        art = loc["physicalLocation"]["artifactLocation"]
        assert art["uriBaseId"] == "%SRCROOT%"
        assert unquote(art["uri"]) == f.file
        assert not re.search(r"[^A-Za-z0-9\-._~/%]", art["uri"])  # RFC 3986 unreserved + '/'
        region = loc["physicalLocation"]["region"]
        assert (region["startLine"], region["startColumn"]) == (f.line, f.column)
        assert loc["logicalLocations"][0]["fullyQualifiedName"] == f.record_path
        assert r["partialFingerprints"] == {"emgate/v1": f.fingerprint}
        if f.waived_by:
            assert r["suppressions"] == [
                {"kind": "external", "status": "accepted", "justification": WAIVER}
            ]
        else:
            assert "suppressions" not in r
    by_rule = {r["ruleId"]: r for r in run["results"] if r["ruleId"] != "acme/aspect"}
    assert by_rule["input"]["locations"][0]["physicalLocation"]["artifactLocation"]["uri"] == (
        FILE_BAD
    )
    assert (
        unquote(
            next(r for r in run["results"] if r["ruleId"] == "current-density")["locations"][0][
                "physicalLocation"
            ]["artifactLocation"]["uri"]
        )
        == FILE_A
    )
    invocation = run["invocations"][0]
    assert invocation["executionSuccessful"] is False  # exit 3: a rule crashed
    assert invocation["exitCode"] == 3
    notes = invocation["toolExecutionNotifications"]
    assert [(n["level"], n["message"]["text"], n["descriptor"]["id"]) for n in notes] == [
        ("error", PLUGIN_ERROR, "input")
    ]


def test_display_path_names_a_file_as_pathlib_relates_it_to_the_working_folder(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # Reference: pathlib's own resolve().relative_to(cwd), which display_path computed
    # until it took strings (it names every record's file). Symbolic links in and out.
    from emgate.errors import display_path

    work = tmp_path / "work"
    (work / "designs").mkdir(parents=True)
    (work / "designs" / "a.yaml").write_text("x")
    (tmp_path / "outside.yaml").write_text("x")
    (work / "link.yaml").symlink_to(work / "designs" / "a.yaml")
    (work / "out-link.yaml").symlink_to(tmp_path / "outside.yaml")
    (tmp_path / "alias").symlink_to(work, target_is_directory=True)
    monkeypatch.chdir(work)

    def reference(path: Path) -> str:
        try:
            return path.resolve().relative_to(Path.cwd().resolve()).as_posix()
        except ValueError:
            return path.as_posix()

    cases = [
        "designs/a.yaml", "./designs//a.yaml", "designs/../designs/a.yaml", ".", "designs",
        "link.yaml", "out-link.yaml", "../outside.yaml", str(work / "designs" / "a.yaml"),
        str(tmp_path / "alias" / "designs" / "a.yaml"), "missing/none.yaml", "/",
    ]  # fmt: skip
    for case in cases:
        assert display_path(Path(case)) == reference(Path(case)), case
        # with the path resolved already, as discovery gives it, the same name
        assert display_path(Path(case), os.path.realpath(case)) == reference(Path(case)), case
    assert display_path(Path("designs/a.yaml")) == "designs/a.yaml"
    assert display_path(Path("../outside.yaml")) == "../outside.yaml"  # kept as given
    monkeypatch.chdir("/")  # the root as the working folder: nothing to strip but the "/"
    for case in (str(work / "designs" / "a.yaml"), "tmp", "/", "."):
        assert display_path(Path(case)) == reference(Path(case)), case
    gone = tmp_path / "gone"
    gone.mkdir()
    monkeypatch.chdir(gone)
    gone.rmdir()  # a working folder deleted under the run: the name as given, as pathlib
    assert display_path(Path("designs/a.yaml")) == "designs/a.yaml"
    assert display_path(work / "designs" / "a.yaml") == (work / "designs" / "a.yaml").as_posix()


def test_sarif_file_outside_the_working_folder_is_an_absolute_uri(sarif_validator) -> None:  # type: ignore[no-untyped-def]
    # display_path keeps a path it cannot make relative; %SRCROOT% would then be wrong
    f = Finding("current-density", "error", "/elsewhere/a b.yaml", 2, 1, "$", "m", "r")
    doc = json.loads(reporter("sarif")(RunResult(findings=[f])))
    sarif_validator.validate(doc)
    art = doc["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["artifactLocation"]
    assert art == {"uri": "file:///elsewhere/a%20b.yaml"}  # RFC 8089 file URI, no base


@pytest.mark.parametrize(
    ("keep", "code", "success"),
    [
        (lambda f: f.rule == "current-density", 1, True),
        (lambda f: f.file == FILE_BAD, 2, True),  # an invalid record: the tool worked
        (lambda f: f.message == PLUGIN_ERROR, 2, False),  # a plugin did not load
        (lambda f: f.kind == "crash", 3, False),  # a rule crashed
        (lambda f: False, 0, True),
    ],
    ids=["findings", "invalid-record", "plugin-failed", "crash", "clean"],
)
def test_sarif_execution_fails_only_when_the_tool_failed(keep, code, success) -> None:  # type: ignore[no-untyped-def]
    result = hand_result()
    result.findings = [f for f in result.findings if keep(f)]
    assert result.exit_code == code
    run = json.loads(reporter("sarif")(result))["runs"][0]
    assert run["invocations"][0]["executionSuccessful"] is success


# ---------------------------------------------------------------- JUnit


def _children(node: Any, tag: str) -> list[Any]:
    return [c for c in node.childNodes if c.nodeType == c.ELEMENT_NODE and c.tagName == tag]


def _junit(result: RunResult) -> Any:
    # expat refuses anything that is not well-formed XML 1.0 (raw control characters too)
    return xml.dom.minidom.parseString(reporter("junit")(result).encode("utf-8")).documentElement


def _assert_counts_consistent(root: Any) -> None:
    totals = dict.fromkeys(("tests", "failures", "errors", "skipped"), 0)
    for suite in _children(root, "testsuite"):
        cases = _children(suite, "testcase")
        counted = {
            "tests": len(cases),
            "failures": sum(1 for c in cases if _children(c, "failure")),
            "errors": sum(1 for c in cases if _children(c, "error")),
            "skipped": sum(1 for c in cases if _children(c, "skipped")),
        }
        for key, n in counted.items():
            assert suite.getAttribute(key) == str(n), (suite.getAttribute("name"), key)
            totals[key] += n
        for c in cases:  # at most one outcome element per testcase
            assert sum(len(_children(c, t)) for t in ("failure", "error", "skipped")) <= 1
    for key, n in totals.items():
        assert root.getAttribute(key) == str(n), key


def test_junit_structure_and_counts() -> None:
    root = _junit(hand_result())
    assert root.tagName == "testsuites"
    _assert_counts_consistent(root)
    # m-1: failure, waived, crash; m-2: three passes (a warning and a note fail nothing);
    # input: one testcase per file, the file-less one named (configuration); the skipped
    # non-emgate file passes with its note
    assert [root.getAttribute(k) for k in ("tests", "failures", "errors", "skipped")] == [
        "9",
        "1",
        "3",
        "1",
    ]
    suites = {s.getAttribute("name"): s for s in _children(root, "testsuite")}
    assert list(suites) == ["m-1", "m-2", "emgate.input"]
    assert suites["m-1"].getAttribute("file") == FILE_A
    assert suites["m-2"].getAttribute("file") == FILE_B  # the newline survives as &#10;
    cases = {c.getAttribute("name"): c for c in _children(suites["m-1"], "testcase")}
    assert list(cases) == ["acme/aspect", "current-density", "winding-balance"]  # no gap-flux
    assert all(c.getAttribute("classname") == "m-1" for c in cases.values())

    (failure,) = _children(cases["current-density"], "failure")
    assert failure.getAttribute("message") == printable(HOSTILE)
    assert "\x1b" not in failure.getAttribute("message")
    assert failure.firstChild.data.startswith(f"{FILE_A}:12:5: error: ")
    (skipped,) = _children(cases["acme/aspect"], "skipped")
    assert skipped.getAttribute("message") == f"waived: {WAIVER}"
    (error,) = _children(cases["winding-balance"], "error")
    assert (error.getAttribute("type"), error.getAttribute("message")) == ("crash", CRASH)

    m2 = {c.getAttribute("name"): c for c in _children(suites["m-2"], "testcase")}
    assert not any(_children(c, t) for c in m2.values() for t in ("failure", "error", "skipped"))
    (out,) = _children(m2["winding-balance"], "system-out")
    assert "warning: coil groups differ" in out.firstChild.data

    inputs = {c.getAttribute("name"): c for c in _children(suites["emgate.input"], "testcase")}
    assert list(inputs) == ["(configuration)", FILE_CI, FILE_BAD]
    assert _children(inputs["(configuration)"], "error")[0].getAttribute("message") == (
        PLUGIN_ERROR
    )
    assert not _children(inputs[FILE_CI], "error")
    assert SKIPPED in _children(inputs[FILE_CI], "system-out")[0].firstChild.data

    def props(node: Any) -> dict[str, str]:
        (block,) = _children(node, "properties")
        return {
            p.getAttribute("name"): p.getAttribute("value") for p in _children(block, "property")
        }

    # the run's properties once, on the first suite; the rest on each testcase
    run = props(suites["m-1"])
    assert run["disclaimer"] == DISCLAIMER
    assert run["emgate.verdict"] == "RULE CRASHED"
    assert "acme/aspect v2.3" in run["emgate.rules"] and "gap-flux" not in run["emgate.rules"]
    assert not _children(suites["m-2"], "properties")
    aspect = props(cases["acme/aspect"])
    assert (aspect["rule.version"], aspect["rule.origin"]) == ("2.3", "acme-pack 2.3.0")
    assert aspect["emgate.waived"] == "1"
    # the closest check of current-density on m-1 is J_FAIL, 8.8 against 8 A/mm^2: -10 %
    assert props(cases["current-density"])["emgate.closest"] == (
        "stator.current_density: 8.8 A/mm^2 <= 8 A/mm^2 (-10.0 %)"
    )
    assert props(m2["winding-balance"])["emgate.warnings"] == "1"


def test_junit_demo_counts(demo: RunResult) -> None:
    root = _junit(demo)
    _assert_counts_consistent(root)
    ran = [
        (r.record_id, o.rule)
        for r in demo.records
        for o in r.outcomes
        if o.status != "not_applicable"
    ]
    failing = {(f.record_id, f.rule) for f in demo.active("error")}
    assert root.getAttribute("tests") == str(len(ran))
    assert root.getAttribute("failures") == str(len(failing))
    assert int(root.getAttribute("failures")) > 0  # the demo breaks limits on purpose
    names = [s.getAttribute("name") for s in _children(root, "testsuite")]
    assert names == [r.record_id for r in demo.records]


# ---------------------------------------------------------------- annotations


def test_annotation_escaping_rules() -> None:
    # [mem: GitHub Actions toolkit, @actions/core command.ts escapeData / escapeProperty]
    assert escape_data("50% a:b,c\r\nz") == "50%25 a:b,c%0D%0Az"
    assert escape_property("50% a:b,c\r\nz") == "50%25 a%3Ab%2Cc%0D%0Az"
    assert escape_property("%0A") == "%250A"  # an escape in the input stays literal


def _unescape(text: str, prop: bool) -> str:
    # the runner's decoding: the named escapes first, %25 last
    # [mem: GitHub Actions runner, ActionCommand unescape of data and properties]
    pairs = [("%0D", "\r"), ("%0A", "\n")] + ([("%3A", ":"), ("%2C", ",")] if prop else [])
    for code, char in [*pairs, ("%25", "%")]:
        text = text.replace(code, char)
    return text


COMMAND = re.compile(r"::(?P<name>[a-z]+)(?: (?P<props>[^:]*))?::(?P<message>.*)")


def _parse(line: str) -> tuple[str, dict[str, str], str]:
    m = COMMAND.fullmatch(line)
    assert m, line
    props = {}
    for item in (m["props"] or "").split(","):
        if item:
            key, _, value = item.partition("=")
            props[key] = _unescape(value, prop=True)
    return m["name"], props, _unescape(m["message"], prop=False)


def test_annotations_of_hostile_findings_round_trip() -> None:
    result = hand_result()
    lines = reporter("annotations")(result).splitlines()
    assert len(lines) == len(result.findings) + 1  # no message leaks a line break
    parsed = [_parse(line) for line in lines]
    for f, (name, props, message) in zip(result.findings, parsed[:-1], strict=True):
        assert props.get("file", "") == f.file
        if f.file:
            assert (props["line"], props["col"]) == (str(f.line), str(f.column))
        assert printable(f.message) in message
        if f.waived_by:
            assert (name, props["title"]) == ("notice", f"emgate {f.rule} (waived)")
            assert message.startswith("waived error: ") and WAIVER in message
        else:
            assert name == {"error": "error", "warning": "warning", "info": "notice"}[f.severity]
    hostile = next(p for p in parsed if p[1].get("title") == "emgate current-density")
    assert "\x1b" not in hostile[2] and "\\x1b" in hostile[2]
    name, props, message = parsed[-1]
    assert (name, props) == ("notice", {"title": "emgate"})
    assert "acme/aspect v2.3" in message and "current-density v1" in message
    assert "gap-flux" not in message
    assert message.endswith(DISCLAIMER)


def test_annotations_demo(demo: RunResult) -> None:
    lines = reporter("annotations")(demo).splitlines()
    errors = [ln for ln in lines if ln.startswith("::error ")]
    assert len(errors) == len(demo.active("error"))
    assert all(_parse(ln)[1]["file"].startswith("examples/design-repo/") for ln in errors)


# ---------------------------------------------------------------- code quality


def test_codequality_items() -> None:
    result = hand_result()
    items = json.loads(reporter("codequality")(result))
    assert isinstance(items, list) and len(items) == len(result.findings)  # waived ones too
    for f, item in zip(result.findings, items, strict=True):
        assert set(item) == {
            "type",
            "description",
            "check_name",
            "categories",
            "fingerprint",
            "severity",
            "location",
        }
        assert item["type"] == "issue"  # [mem: Code Climate analyzer spec, issue type]
        assert item["check_name"] == f.rule
        assert item["location"]["path"] == (f.file or ".")
        begin = item["location"]["lines"]["begin"]
        assert isinstance(begin, int) and begin >= 1
        assert f.message in item["description"]
        if f.waived_by:  # shown as info, naming the waiver, as a new issue in the widget
            assert item["severity"] == "info"
            assert item["description"].startswith("waived error: ")
            assert f.waived_by in item["description"]
            assert item["fingerprint"] != f.fingerprint
        else:
            assert item["fingerprint"] == f.fingerprint  # no two findings here share one
    live = [(f, i) for f, i in zip(result.findings, items, strict=True) if not f.waived_by]
    severities = {(f.rule, f.severity): i["severity"] for f, i in live}
    assert severities == {
        ("current-density", "error"): "critical",
        ("winding-balance", "error"): "blocker",  # the crash
        ("winding-balance", "warning"): "minor",
        ("acme/aspect", "info"): "info",
        ("input", "error"): "critical",
        ("input", "info"): "info",  # the skipped non-emgate file
    }


def test_codequality_fingerprints_unique_when_problems_share_a_path() -> None:
    # Two problems (findings without a check) of one rule on one record path share the
    # finding fingerprint; the code-quality widget needs them apart.
    findings = [
        Finding("acme/aspect", "error", "d.yaml", 4, 3, "$.stator", "too short", "m"),
        Finding("acme/aspect", "error", "d.yaml", 4, 3, "$.stator", "too long", "m"),
    ]
    assert findings[0].fingerprint == findings[1].fingerprint  # the collision being handled
    first = json.loads(reporter("codequality")(RunResult(findings=findings)))
    again = json.loads(reporter("codequality")(RunResult(findings=list(reversed(findings)))))
    fps = {i["description"]: i["fingerprint"] for i in first}
    assert len(set(fps.values())) == 2
    assert fps == {i["description"]: i["fingerprint"] for i in again}  # order does not matter


def test_codequality_demo(demo: RunResult) -> None:
    items = json.loads(reporter("codequality")(demo))
    assert len(items) == len(demo.findings)
    assert len({i["fingerprint"] for i in items}) == len(items)


# ---------------------------------------------------------------- Markdown


def _cells(row: str) -> list[str]:
    """Cells of a Markdown table row, split on unescaped pipes, backslash escapes removed."""
    cells, cur, i = [], "", 0
    while i < len(row):
        ch = row[i]
        if ch == "\\" and i + 1 < len(row):
            cur += row[i + 1]
            i += 2
            continue
        if ch == "|":
            cells.append(cur.strip())
            cur = ""
        else:
            cur += ch
        i += 1
    assert cells[0] == "" and cur.strip() == "", row  # a row starts and ends with a pipe
    return cells[1:]


def _table(text: str, heading: str) -> list[list[str]]:
    section = text.split(f"### {heading}\n", 1)[1].split("\n### ", 1)[0]
    rows = [ln for ln in section.splitlines() if ln.startswith("|")]
    return [_cells(r) for r in rows[2:]]  # skip the header and the delimiter row


def test_markdown_margins_pick_the_worst_check() -> None:
    text = reporter("markdown")(hand_result())
    rows = {(r[0], r[1]): r for r in _table(text, "Margins")}
    assert all(len(r) == 7 for r in rows.values())
    # Percentages are shown to 0.1 %, so the closed-form margins above compare exactly.
    assert rows["m-2", "current-density"][2:] == [
        "pass",
        "stator.current_density",
        "7.6 A/mm^2",
        "≤ 8 A/mm^2",
        "+5.0%",
    ]  # +5 % beats +50 % although it is listed second
    assert rows["m-1", "current-density"][2:] == [
        "fail",
        "stator.current_density",
        "8.8 A/mm^2",
        "≤ 8 A/mm^2",
        "-10.0%",
    ]  # -10 % beats the +20 % of the field coil listed first
    assert rows["m-1", "acme/aspect"][2:] == [
        "waived",
        "stator.aspect_ratio",
        "0.54",
        "≥ 0.6",
        "-10.0%",
    ]
    assert rows["m-1", "winding-balance"][2] == "crash"
    assert ("m-1", "gap-flux") not in rows  # not applicable: did not run


def test_markdown_escapes_hostile_cells() -> None:
    result = hand_result()
    text = reporter("markdown")(result)
    findings = _table(text, "Findings")
    assert len(findings) == len(result.findings)
    assert all(len(r) == 4 for r in findings)  # no pipe in a message adds a column
    hostile = next(r for r in findings if r[2] == "current-density")
    assert hostile[0] == f"{FILE_A}:12"
    row = next(ln for ln in text.splitlines() if "density \\|" in ln)
    for raw in ("<b>", "`x`", "[x](y)", " @team", "*em*", "\x1b", "\r"):
        assert raw not in row, raw
    assert "<br>" in row  # the message's line breaks, inside one table row
    assert hostile[3].startswith("density | `x` 50%25 a:b,c<br>second ::warning::line<br>")
    waived = next(r for r in findings if r[2] == "acme/aspect" and "waived" in r[1])
    assert WAIVER in waived[3]


def test_markdown_names_rules_verdict_and_disclaimer() -> None:
    text = reporter("markdown")(hand_result())
    assert text.startswith("## emgate: RULE CRASHED\n")
    rules = text.split("### Rules\n", 1)[1]
    assert "acme/aspect v2.3 (acme-pack 2.3.0)" in rules.replace("\\", "")
    assert "gap-flux" not in rules
    assert text.rstrip().endswith(DISCLAIMER)


def test_markdown_demo(demo: RunResult) -> None:
    text = reporter("markdown")(demo)
    rows = _table(text, "Margins")
    assert len(rows) == sum(
        1 for r in demo.records for o in r.outcomes if o.status != "not_applicable"
    )
    # a failed check is a finding at its rule's severity: errors and warnings both
    failing = {(f.record_id, f.rule) for s in ("error", "warning") for f in demo.active(s)}
    assert {(r[0], r[1]) for r in rows if r[2] == "fail"} == failing
    assert all(r[6].startswith("-") for r in rows if (r[0], r[1]) in failing)


# --- JSON checks: SI unit and a display text ------------------------------------------------------


DISPLAY = re.compile(r"^(\S+)(?: (\S+))? (<=|>=) (\S+)(?: (\S+))?$")


def _display_si(number: str, unit: str | None) -> float:
    return float(number) if unit is None else UREG.Quantity(float(number), unit).to_base_units().m


def test_every_demo_check_gives_si_values_in_its_si_unit_and_a_display() -> None:
    result = run_cli("check", "--format", "json", DEMO)
    checks = [c for r in result.json()["records"] for o in r["outcomes"] for c in o["checks"]]
    assert len(checks) > 30
    for c in checks:
        match = DISPLAY.match(c["display"])
        assert match, c["display"]
        value, vunit, bound, limit, lunit = match.groups()
        assert bound == ("<=" if c["bound"] == "max" else ">=")
        assert vunit == lunit
        # pint, not emgate, converts the display unit; the SI unit has the same dimension
        # and factor 1 from base units. Four significant figures shown: 5e-4 relative.
        si = UREG.Quantity(1.0, c["unit"] if c["unit"] != "1" else "")
        assert si.to_base_units().m == pytest.approx(1.0, rel=1e-12), c["unit"]
        if vunit is not None:
            assert UREG.Quantity(1.0, vunit).dimensionality == si.dimensionality, c
        assert _display_si(value, vunit) == pytest.approx(c["value"], rel=5e-4, abs=1e-12)
        assert _display_si(limit, lunit) == pytest.approx(c["limit"], rel=5e-4, abs=1e-12)


def test_the_current_density_check_reads_as_the_brief_shows() -> None:
    c = the_check(check_json(PUMP), "current-density", "stator.current_density")
    assert c["unit"] == "A/m^2"
    # [calc] 14.6 A delta: I_ph = 14.6 / sqrt 3, two strands of 0.90 mm; limit 8 A/mm^2 from
    # the demo team's emgate.yaml (the demo's own data).
    j = 14.6 / SQRT3 / (2 * math.pi / 4 * 0.90**2)
    assert c["display"] == f"{j:.4g} A/mm^2 <= 8 A/mm^2"


def test_the_sheet_and_the_checks_share_one_si_unit_function() -> None:
    from emgate import sheet as sheet_module
    from emgate import units
    from emgate.report import jsonfmt

    assert sheet_module.si_unit is units.si_unit and jsonfmt.si_unit is units.si_unit
    for entry in SHEET.values():  # pint judges each SI unit against the display unit
        si, shown = units.si_unit(entry.unit), entry.unit
        if si == "1":
            assert shown in ("1", "%"), entry.name  # a ratio, shown as such or in percent
            continue
        factor = UREG.Quantity(1.0, si).to_base_units().m
        assert factor == pytest.approx(1.0, rel=1e-12), entry.name  # an SI unit: no prefix
        assert UREG.Quantity(1.0, si).dimensionality == UREG.Quantity(1.0, shown).dimensionality


# --- the margins line of the text report ----------------------------------------------------------


def test_a_passing_run_shows_each_records_closest_margin(repo: Path) -> None:
    path = variant(repo, {})
    text = run_cli("check", path)
    assert text.code == 0
    result = check_json(path)
    (record,) = result.json()["records"]
    checks = [(o["rule"], c) for o in record["outcomes"] for c in o["checks"]]

    # The smallest margin, recomputed here from value and limit: (limit - value) / limit for
    # an upper bound, (value - limit) / limit for a lower one [calc].
    def margin(c: dict[str, Any]) -> float:
        rel = (c["limit"] - c["value"]) / abs(c["limit"])
        return rel if c["bound"] == "max" else -rel

    rule, c = min(checks, key=lambda rc: margin(rc[1]))
    line = next(ln for ln in text.out.splitlines() if ln.startswith("pump-drive-4p36s: "))
    assert line.startswith(f"pump-drive-4p36s: {len(checks)} checks; closest to a limit: {rule}")
    assert c["label"] in line
    assert line.endswith(f"({margin(c) * 100:+.1f} %)")
    assert text.out.index(line) < text.out.index("PASS:")  # before the verdict


def test_the_margins_lines_follow_the_findings() -> None:
    out = run_cli("check", DEMO).out
    lines = out.splitlines()
    ids = ["genset-4p48s", "pump-drive-4p36s", "servo-10p12s"]
    at = [next(i for i, ln in enumerate(lines) if ln.startswith(f"{rid}: ")) for rid in ids]
    last_finding = max(i for i, ln in enumerate(lines) if ln.startswith("  "))
    assert at == sorted(at) and at[0] > last_finding  # one line per record, after findings
    # The failing servo's closest check is beyond its limit: a negative margin.
    assert re.search(r"\(-\d+\.\d %\)$", lines[at[2]])
