"""JUnit XML for CI test tabs: one testsuite per record, one testcase per record and rule.

A testcase passes (empty, or with its warnings and notes in ``system-out``, since only errors
fail the gate), fails (``failure``: a live error finding), is ``skipped`` (every finding of the
rule waived; the waiver is the message) or is an ``error`` (the rule crashed). A rule that does
not apply to the record's machine kind did not run and has no testcase, like a rule the policy
deselects: "skipped" then means waived and nothing else. Input errors are testcases of a suite
``emgate.input``, one per file, beside the notes on files read (a file named that is not an
emgate file passes, its note in ``system-out``).

A warning stays a passing testcase, its text in ``system-out`` (which the test tabs of CI
services show with a test's details) and counted in the testcase's ``emgate.warnings``
property: a JUnit failure would have the tab count a failed test in a run that the gate
passes. Each testcase carries its own properties (the rule's version and origin, the check
closest to its limit); the run's (emgate version, verdict, disclaimer) are given once, on the
first testsuite, as readers that merge suites refuse a property name given twice. Suite names
are unique (a record id, then its file where two suites would share it). ``time`` is the
wall time of each rule's check, in seconds. Text passes through :func:`printable` first:
control characters are not allowed in XML 1.0.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET
from collections.abc import Iterator

from emgate import __version__
from emgate.findings import DISCLAIMER, Finding, RuleInfo, RuleOutcome, RunResult, closest_check
from emgate.report.common import (
    VERDICTS,
    check_display,
    margin_text,
    one_line,
    printable,
    rules_run,
    where,
)

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
    info: RuleInfo | None,
) -> None:
    seconds = outcome.seconds if outcome is not None else 0.0
    case = _sub(suite, "testcase", classname=classname, name=name, file=file)
    case.set("time", f"{seconds:.6f}")
    live = [f for f in findings if f.waived_by is None]
    props: dict[str, str] = {}
    if info is not None:
        props["rule.version"] = info.version
        props["rule.origin"] = f"{info.distribution} {info.distribution_version}".strip()
    if closest := closest_check((name, c) for c in (outcome.checks if outcome else [])):
        c = closest[1]
        props["emgate.closest"] = f"{c.quantity}: {check_display(c)} ({margin_text(c)})"
    for key, severity in (("emgate.warnings", "warning"), ("emgate.notes", "info")):
        if n := sum(1 for f in live if f.severity == severity):
            props[key] = str(n)
    if n := len(findings) - len(live):
        props["emgate.waived"] = str(n)
    _properties(case, props)
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


def _properties(parent: ET.Element, properties: dict[str, str]) -> None:
    if properties:
        props = _sub(parent, "properties")
        for key, value in properties.items():
            _sub(props, "property", name=key, value=value)


class _Suites:
    """The testsuites, named uniquely: a record id, else with its file, else numbered."""

    def __init__(self, root: ET.Element, run_properties: dict[str, str]) -> None:
        self.root, self.names, self.pending = root, set[str](), run_properties

    def add(self, label: str, file: str) -> ET.Element:
        name = label
        if name in self.names:
            name = f"{label} ({file})" if file else label
        n = 1
        while name in self.names:
            n += 1
            name = f"{label} ({file}) #{n}" if file else f"{label} #{n}"
        self.names.add(name)
        suite = _sub(self.root, "testsuite", name=name, file=file)
        _properties(suite, self.pending)
        self.pending = {}  # the run's properties once, on the first suite
        return suite


def _count(el: ET.Element, cases: list[ET.Element]) -> None:
    el.set("tests", str(len(cases)))
    for tag, attr in zip(_COUNTED, ("failures", "errors", "skipped"), strict=True):
        el.set(attr, str(sum(1 for c in cases if c.find(tag) is not None)))
    el.set("time", f"{sum(float(c.get('time') or 0) for c in cases):.6f}")


#: A testcase to make: its name (the rule, or the file of input errors), file, findings and
#: the rule's outcome (None for a finding on no outcome).
_Case = tuple[str, str, list[Finding], RuleOutcome | None]


def _suites(result: RunResult, run_properties: dict[str, str]) -> Iterator[ET.Element]:
    """Every testsuite in order, made one at a time from the records and findings as they are
    read (both in file order): a record's suite is its rules' outcomes, with the findings of
    its file and id; findings of no record's (file, id) make suites of their own after the
    records', and input errors the input suite last. Only those few findings are held."""
    known = {r.id: r for r in result.rules}
    holder = ET.Element("testsuites")  # each suite is made inside it, then let go
    suites = _Suites(holder, run_properties)
    # (file, record id) -> rule -> its findings, for the findings on no record
    extra: dict[tuple[str, str], dict[str, list[Finding]]] = {}
    inputs: dict[str, list[Finding]] = {}
    findings = iter(result.each_finding())
    ahead: list[Finding] = []  # a finding read past the current record's file

    def take(f: Finding) -> None:
        if f.rule == INPUT:
            inputs.setdefault(f.file, []).append(f)
        else:
            extra.setdefault((f.file, f.record_id), {}).setdefault(f.rule, []).append(f)

    def made(label: str, file: str, cases: list[_Case]) -> ET.Element:
        suite = suites.add(label, file)
        for name, case_file, mine, outcome in cases:
            _testcase(suite, label, name, case_file, mine, outcome, known.get(name))
        holder.remove(suite)
        return suite

    # the current file's findings on records, by record id, until its records are done
    current: str | None = None
    by_id: dict[str, list[Finding]] = {}
    for r in result.each_record():
        if r.file != current:
            for left in by_id.values():  # findings on no record of that file
                for lone in left:
                    take(lone)
            current, by_id = r.file, {}
            while (g := ahead.pop() if ahead else next(findings, None)) is not None:
                if g.file > r.file:
                    ahead.append(g)
                    break
                if g.file == r.file and g.rule != INPUT:
                    by_id.setdefault(g.record_id, []).append(g)
                else:
                    take(g)
        mine: dict[str, list[Finding]] = {}
        for f in by_id.pop(r.record_id, []):
            mine.setdefault(f.rule, []).append(f)
        rules: dict[str, RuleOutcome | None] = {
            o.rule: o for o in r.outcomes if o.status != "not_applicable"
        }
        rules |= {rule: None for rule in mine if rule not in rules}
        label = r.record_id or r.file or "(configuration)"
        yield made(
            label, r.file, [(rule, r.file, mine.get(rule, []), o) for rule, o in rules.items()]
        )
    for left in by_id.values():
        for lone in left:
            take(lone)
    for rest in [*ahead, *findings]:
        take(rest)
    for (file, record_id), by_rule in extra.items():
        label = record_id or file or "(configuration)"
        yield made(label, file, [(rule, file, found, None) for rule, found in by_rule.items()])
    if inputs:
        yield made(
            INPUT_SUITE,
            "",
            [(file or "(configuration)", file, found, None) for file, found in inputs.items()],
        )
    if not suites.names:  # nothing checked: the run's properties still go somewhere
        yield made("emgate", "", [])


def chunks(result: RunResult) -> Iterator[str]:
    """The XML in pieces, a testsuite at a time: the totals on the root come from a first
    pass over the suites (a spooled run is read twice, never held)."""
    run_properties = {
        "emgate.version": __version__,
        "emgate.verdict": VERDICTS[result.exit_code],
        "emgate.rules": ", ".join(f"{r.id} v{r.version}" for r in rules_run(result)),
        "disclaimer": DISCLAIMER,
    }
    count = {"tests": 0, **dict.fromkeys(_COUNTED, 0)}
    seconds = 0.0
    for suite in _suites(result, run_properties):
        cases = suite.findall("testcase")
        count["tests"] += len(cases)
        for tag in _COUNTED:
            count[tag] += sum(1 for c in cases if c.find(tag) is not None)
        seconds += sum(float(c.get("time") or 0) for c in cases)
    root = ET.Element("testsuites", name="emgate")
    root.set("tests", str(count["tests"]))
    for tag, attr in zip(_COUNTED, ("failures", "errors", "skipped"), strict=True):
        root.set(attr, str(count[tag]))
    root.set("time", f"{seconds:.6f}")
    root.text = "\x00"
    head, tail = ET.tostring(root, "unicode").split("\x00")
    yield '<?xml version="1.0" encoding="UTF-8"?>\n' + head
    for suite in _suites(result, run_properties):
        _count(suite, suite.findall("testcase"))
        ET.indent(suite, level=1)
        suite.tail = None
        yield "\n  " + ET.tostring(suite, "unicode")
    yield "\n" + tail + "\n"


def render(result: RunResult) -> str:
    return "".join(chunks(result))
