"""JUnit XML for CI test tabs: one testsuite per record file, one testcase per record and rule.

A testcase passes (empty, or with its warnings and notes in ``system-out``, since only errors
fail the gate), fails (``failure``: a live error finding), is ``skipped`` (every finding of the
rule waived; the waiver is the message) or is an ``error`` (the rule crashed). A rule that does
not apply to the record's machine kind did not run and has no testcase, like a rule the policy
deselects: "skipped" then means waived and nothing else. Input errors are testcases of a suite
``emgate.input``, one per file, beside the notes on files read (a file named that is not an
emgate file passes, its note in ``system-out``). Each testsuite carries the emgate version, the
rules that ran with their versions, the verdict and the disclaimer as ``properties``. Text
passes through :func:`printable` first: control characters are not allowed in XML 1.0.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

from emgate import __version__
from emgate.findings import DISCLAIMER, Finding, RuleOutcome, RunResult
from emgate.report.common import VERDICTS, one_line, printable, rules_run, where

INPUT, INPUT_SUITE = "input", "emgate.input"
_COUNTED = ("failure", "error", "skipped")


def _describe(f: Finding) -> str:
    """One line per finding (line ends escaped: a message cannot forge a line of its own)."""
    text = f"{where(f)}: {f.severity}: {f.message}"
    if f.record_path != "$":
        text += f" [{f.record_path}]"
    if f.waived_by:
        text += f" (waived: {f.waived_by})"
    return one_line(text)


def _sub(parent: ET.Element, tag: str, text: str | None = None, **attrs: str) -> ET.Element:
    # attributes keep line ends: XML encodes them (&#10;), so a path survives exactly
    el = ET.SubElement(parent, tag, {k: printable(v) for k, v in attrs.items() if v})
    if text is not None:
        el.text = printable(text)
    return el


def _testcase(
    suite: ET.Element,
    classname: str,
    name: str,
    file: str,
    findings: list[Finding],
    outcome: RuleOutcome | None,
) -> None:
    case = _sub(suite, "testcase", classname=classname, name=name, file=file)
    live = [f for f in findings if f.waived_by is None]
    details = "\n".join(_describe(f) for f in findings)
    broken = [f for f in live if f.kind in ("crash", "input")]
    errors = [f for f in live if f.severity == "error"]
    if broken:
        _sub(case, "error", details, message=broken[0].message, type=broken[0].kind)
    elif outcome is not None and outcome.status == "crash":
        _sub(case, "error", one_line(outcome.message), message=outcome.message, type="crash")
    elif errors:
        _sub(case, "failure", details, message=errors[0].message, type="error")
    elif findings and not live:
        waivers = "; ".join(dict.fromkeys(f.waived_by or "" for f in findings))
        _sub(case, "skipped", details, message=f"waived: {waivers}")
    elif findings:
        _sub(case, "system-out", details)


def _suite(parent: ET.Element, name: str, file: str, properties: dict[str, str]) -> ET.Element:
    suite = _sub(parent, "testsuite", name=name, file=file)
    props = _sub(suite, "properties")
    for key, value in properties.items():
        _sub(props, "property", name=key, value=value)
    return suite


def _count(el: ET.Element, cases: list[ET.Element]) -> None:
    el.set("tests", str(len(cases)))
    for tag, attr in zip(_COUNTED, ("failures", "errors", "skipped"), strict=True):
        el.set(attr, str(sum(1 for c in cases if c.find(tag) is not None)))


def render(result: RunResult) -> str:
    properties = {"emgate.version": __version__, "emgate.verdict": VERDICTS[result.exit_code]}
    properties |= {f"rule.{r.id}": r.version for r in rules_run(result)}
    properties["disclaimer"] = DISCLAIMER
    # (file, record id) -> rule -> outcome; findings on no outcome (waivers) add rules
    groups: dict[tuple[str, str], dict[str, RuleOutcome | None]] = {}
    for r in result.records:
        rules = groups.setdefault((r.file, r.record_id), {})
        rules |= {o.rule: o for o in r.outcomes if o.status != "not_applicable"}
    for f in result.findings:
        if f.rule != INPUT:
            groups.setdefault((f.file, f.record_id), {}).setdefault(f.rule, None)
    root = ET.Element("testsuites", name="emgate")
    for (file, record_id), rules in groups.items():
        label = record_id or file or "(configuration)"
        suite = _suite(root, label, file, properties)
        for rule, outcome in rules.items():
            mine = [
                f
                for f in result.findings
                if (f.file, f.record_id, f.rule) == (file, record_id, rule)
            ]
            _testcase(suite, label, rule, file, mine, outcome)
    inputs: dict[str, list[Finding]] = {}
    for f in result.findings:
        if f.rule == INPUT:
            inputs.setdefault(f.file, []).append(f)
    if inputs:
        suite = _suite(root, INPUT_SUITE, "", properties)
        for file, found in inputs.items():
            _testcase(suite, INPUT_SUITE, file or "(configuration)", file, found, None)
    for suite in root:
        _count(suite, suite.findall("testcase"))
    _count(root, root.findall("testsuite/testcase"))
    ET.indent(root)
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + ET.tostring(root, "unicode") + "\n"
