"""SARIF 2.1.0 for code-scanning services: one run, every rule that ran, every finding.

Each rule descriptor carries the rule's summary (``shortDescription``), the first paragraph of
its method (``fullDescription``), ``emgate explain`` as ``help`` (text and Markdown) and its
default severity (``defaultConfiguration.level``; each result still carries the level the
policy gave it). Waived findings stay, with an external, accepted suppression carrying the
waiver. Input errors are results of the pseudo-rule ``input`` (those with no file, such as a
plugin that fails to load, are tool execution notifications instead); a crash is a result of
the crashing rule.

Artifact URIs are relative to ``%SRCROOT%``, the root of the repository checked (the top of
its git work tree, what a CI service checks out), whatever folder emgate ran in, and
percent-encoded, as a URI must be; only a file outside that root is an absolute ``file:``
URI. Fingerprints are taken from the same root-relative names. ``executionSuccessful`` is
false only when the tool failed: a rule crashed or a plugin did not load (an invalid record
or configuration is a result, found by a tool that worked). No ``$schema``,
``informationUri`` or root URI: the output names no host and no machine path. No
timestamps, so the same input gives the same bytes.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from typing import Any
from urllib.parse import quote

from emgate import __version__
from emgate.findings import DISCLAIMER, Finding, RuleInfo, RunResult
from emgate.remedy_report import sarif_fixes
from emgate.report.common import VERDICTS, Stream, json_chunks, rules_run
from emgate.report.jsonfmt import check_dict

SRCROOT = "%SRCROOT%"
LEVELS = {"error": "error", "warning": "warning", "info": "note"}
# pseudo-rules of emgate itself, named in results beside the plugins' rules
BUILTIN = {
    "input": RuleInfo(
        "input",
        __version__,
        "the records and the configuration can be read and validated",
        "emgate",
        __version__,
        "error",
        "Every record, materials file, emgate.yaml and waivers file is read as YAML and"
        " validated against its schema, units and physical consistency; each problem is"
        " reported at its file, line and column (exit code 2).",
    ),
    "waiver": RuleInfo(
        "waiver",
        __version__,
        "every waiver is current and suppresses a finding",
        "emgate",
        __version__,
        "warning",
        "A waiver past its expiry date stops applying and is reported; a waiver that"
        " suppresses no finding is reported, so that stale exceptions do not pile up.",
    ),
}


def _descriptor(r: RuleInfo) -> dict[str, Any]:
    method = r.description or r.summary or r.id
    first = re.split(r"\n\s*\n", method.strip(), maxsplit=1)[0]
    return {
        "id": r.id,
        "shortDescription": {"text": r.summary or r.id},
        "fullDescription": {"text": " ".join(first.split())},
        "help": {"text": method, "markdown": r.help_markdown() or method},
        "defaultConfiguration": {"level": LEVELS[r.severity]},
        "properties": {
            "version": r.version,
            "distribution": r.distribution,
            "distributionVersion": r.distribution_version,
        },
    }


def _artifact(f: Finding) -> dict[str, str]:
    file = f.file if f.repo_file is None else f.repo_file
    if re.match(r"/|[A-Za-z]:/", file):  # outside the repository's root
        return {"uri": "file:///" + quote(file.lstrip("/"), safe="/:")}
    return {"uri": quote(file, safe="/"), "uriBaseId": SRCROOT}


def _result(f: Finding, index: int) -> dict[str, Any]:
    out: dict[str, Any] = {
        "ruleId": f.rule,
        "ruleIndex": index,
        "level": LEVELS[f.severity],
        "message": {"text": f.message},
    }
    location: dict[str, Any] = {"logicalLocations": [{"fullyQualifiedName": f.record_path}]}
    if f.file:
        physical: dict[str, Any] = {"artifactLocation": _artifact(f)}
        if f.line > 0:
            physical["region"] = {"startLine": f.line, "startColumn": max(f.column, 1)}
        location["physicalLocation"] = physical
    out["locations"] = [location]
    out["partialFingerprints"] = {"emgate/v1": f.fingerprint}
    if f.waived_by:
        out["suppressions"] = [
            {"kind": "external", "status": "accepted", "justification": f.waived_by}
        ]
    fixes = sarif_fixes(f, _artifact(f)) if f.file else []
    if fixes:
        out["fixes"] = fixes
    props: dict[str, Any] = {"kind": f.kind, "recordId": f.record_id}
    if f.check:
        props["check"] = check_dict(f.check)
    out["properties"] = props
    return out


def _notification(f: Finding) -> dict[str, Any]:
    return {
        "level": LEVELS[f.severity],
        "message": {"text": f.message},
        "descriptor": {"id": f.rule},
    }


def chunks(result: RunResult) -> Iterator[str]:
    """The log in pieces: the rules and the invocation from a first pass over the findings,
    then each result as it is read (a spooled run's findings are never all in memory)."""
    ran = rules_run(result)
    rules = [_descriptor(r) for r in ran]
    index = {r.id: i for i, r in enumerate(ran)}
    notifications: list[dict[str, Any]] = []
    crashed = False
    for f in result.each_finding():
        crashed = crashed or f.kind == "crash"
        if f.kind == "input" and not f.file:
            notifications.append(_notification(f))
        elif f.rule not in index:
            index[f.rule] = len(rules)
            known = BUILTIN.get(f.rule) or RuleInfo(f.rule, "?", f.rule, "", "")
            rules.append(_descriptor(known))
    failed = crashed or any(n["level"] == "error" for n in notifications)
    invocation: dict[str, Any] = {"executionSuccessful": not failed, "exitCode": result.exit_code}
    if notifications:
        invocation["toolExecutionNotifications"] = notifications
    run = {
        "tool": {
            "driver": {
                "name": "emgate",
                "version": __version__,
                "semanticVersion": __version__,
                "rules": rules,
            }
        },
        "invocations": [invocation],
        "originalUriBaseIds": {
            SRCROOT: {"description": {"text": "the root of the repository checked"}}
        },
        "columnKind": "unicodeCodePoints",
        "results": Stream(
            _result(f, index[f.rule])
            for f in result.each_finding()
            if not (f.kind == "input" and not f.file)
        ),
        "properties": {
            "verdict": VERDICTS[result.exit_code],
            "rulesRun": [f"{r.id} v{r.version}" for r in ran],
            "disclaimer": DISCLAIMER,
        },
    }
    return json_chunks({"version": "2.1.0", "runs": [run]})


def render(result: RunResult) -> str:
    return "".join(chunks(result))
