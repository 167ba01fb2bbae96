"""What the front ends read of a finding's remedies: the list, the report's lines and SARIF
fixes (the remedies themselves are computed by :mod:`emgate.remedies`)."""

from __future__ import annotations

from collections.abc import Iterable
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from emgate.findings import Finding
    from emgate.remedy import Remedy


def remedies_for(finding: Finding) -> list[Remedy]:
    """The remedies of a finding (empty unless it is a failing check and the run computed
    remedies): the one call the HTML sheet and the language server need."""
    return list(finding.remedies)


def remedies_by_check(findings: Iterable[Finding]) -> dict[int, list[Remedy]]:
    """The remedies of each check of the rules' outcomes (``RecordResult.outcomes[i].checks``),
    as the HTML sheet reads checks, by the check's identity: those of the first finding that
    reports it (a passing or waived check has none: no entry)."""
    by: dict[int, list[Remedy]] = {}
    for f in findings:
        if f.check is not None:
            by.setdefault(id(f.check), list(f.remedies))
    return by


def summary(remedies: Iterable[Remedy]) -> str:
    """A line for a check no single field can fix ('' otherwise)."""
    rs = list(remedies)
    if rs and all(r.status == "none" for r in rs):
        names = ", ".join(r.field_name for r in rs if r.field)
        return f"no single field can fix this check (tried {names or 'none'})"
    return ""


def report_lines(finding: Finding) -> list[str]:
    """The remedy lines a report shows under a finding."""
    rs = remedies_for(finding)
    lines = [r.describe() for r in rs]
    if (text := summary(rs)) != "":
        lines.append(text)
    return lines


def sarif_fixes(finding: Finding, artifact: dict[str, str]) -> list[dict[str, Any]]:
    """SARIF 2.1.0 ``fixes`` of a finding: one per remedy that fixes it, each replacing the
    scalar at its line and column with the new value (a remedy that breaks another check
    says so in its description)."""
    out: list[dict[str, Any]] = []
    for r in remedies_for(finding):
        if r.status != "fix":
            continue
        replacements = [
            {
                "deletedRegion": {
                    "startLine": e.line,
                    "startColumn": e.column,
                    "endLine": e.end_line,
                    "endColumn": e.end_column,
                },
                "insertedContent": {"text": e.new},
            }
            for e in r.edits
        ]
        out.append(
            {
                "description": {"text": r.describe()},
                "artifactChanges": [{"artifactLocation": artifact, "replacements": replacements}],
            }
        )
    return out
