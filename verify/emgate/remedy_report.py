"""What the front ends read of a finding's remedies: the list, the report's lines and SARIF
fixes (the remedies themselves are computed by :mod:`emgate.remedies`)."""

from __future__ import annotations

from collections.abc import Iterable
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from emgate.findings import Finding, RunResult
    from emgate.remedy import Remedy
    from emgate.rule import Check


def remedies_for(finding: Finding) -> list[Remedy]:
    """The remedies of a finding (empty unless it is a failing check and the run computed
    remedies): the one call the HTML sheet and the language server need."""
    return list(finding.remedies)


def remedies_for_check(result: RunResult, check: Check) -> list[Remedy]:
    """The remedies of a check of a rule's outcome (``RecordResult.outcomes[i].checks``), as
    the HTML sheet reads checks: those of the finding that reports it (empty for a passing
    or waived check)."""
    return next((list(f.remedies) for f in result.findings if f.check is check), [])


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
