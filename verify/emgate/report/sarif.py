"""SARIF 2.1.0 for code-scanning services: one run, every rule that ran, every finding.

Waived findings stay, with an external, accepted suppression carrying the waiver. Input errors
are results of the pseudo-rule ``input`` (those with no file, such as a plugin that fails to
load, are tool execution notifications instead); a crash is a result of the crashing rule.
Artifact URIs are relative to ``%SRCROOT%`` (the folder emgate ran in) and percent-encoded, as
a URI must be. No ``$schema`` or ``informationUri``: the output names no host. No timestamps,
so the same input gives the same bytes.
"""

from __future__ import annotations

import json
import re
from typing import Any
from urllib.parse import quote

from emgate import __version__
from emgate.findings import DISCLAIMER, Finding, RunResult
from emgate.remedies import sarif_fixes
from emgate.report.common import VERDICTS, rules_run
from emgate.report.jsonfmt import check_dict

SRCROOT = "%SRCROOT%"
LEVELS = {"error": "error", "warning": "warning", "info": "note"}
# pseudo-rules of emgate itself, named in results beside the plugins' rules
BUILTIN = {
    "input": "the records and the configuration can be read and validated",
    "waiver": "every waiver is current and suppresses a finding",
}


def _descriptor(rid: str, summary: str, version: str, dist: str, dist_version: str) -> dict:
    return {
        "id": rid,
        "shortDescription": {"text": summary or rid},
        "properties": {
            "version": version,
            "distribution": dist,
            "distributionVersion": dist_version,
        },
    }


def _artifact(file: str) -> dict[str, str]:
    if re.match(r"/|[A-Za-z]:/", file):  # outside the folder emgate ran in
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
        physical: dict[str, Any] = {"artifactLocation": _artifact(f.file)}
        if f.line > 0:
            physical["region"] = {"startLine": f.line, "startColumn": max(f.column, 1)}
        location["physicalLocation"] = physical
    out["locations"] = [location]
    out["partialFingerprints"] = {"emgate/v1": f.fingerprint}
    if f.waived_by:
        out["suppressions"] = [
            {"kind": "external", "status": "accepted", "justification": f.waived_by}
        ]
    fixes = sarif_fixes(f, _artifact(f.file)) if f.file else []
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


def render(result: RunResult) -> str:
    ran = rules_run(result)
    rules = [
        _descriptor(r.id, r.summary, r.version, r.distribution, r.distribution_version) for r in ran
    ]
    index = {r.id: i for i, r in enumerate(ran)}
    results: list[dict[str, Any]] = []
    notifications: list[dict[str, Any]] = []
    for f in result.findings:
        if f.kind == "input" and not f.file:
            notifications.append(_notification(f))
            continue
        if f.rule not in index:
            index[f.rule] = len(rules)
            summary = BUILTIN.get(f.rule, f.rule)
            rules.append(_descriptor(f.rule, summary, __version__, "emgate", __version__))
        results.append(_result(f, index[f.rule]))
    invocation: dict[str, Any] = {
        "executionSuccessful": result.exit_code not in (2, 3),
        "exitCode": result.exit_code,
    }
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
        "originalUriBaseIds": {SRCROOT: {"description": {"text": "the folder emgate ran in"}}},
        "columnKind": "unicodeCodePoints",
        "results": results,
        "properties": {
            "verdict": VERDICTS[result.exit_code],
            "rulesRun": [f"{r.id} v{r.version}" for r in ran],
            "disclaimer": DISCLAIMER,
        },
    }
    return json.dumps({"version": "2.1.0", "runs": [run]}, indent=2) + "\n"
