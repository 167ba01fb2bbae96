"""Text for people: grouped by file, sorted, stable."""

from __future__ import annotations

from itertools import groupby

from emgate.findings import DISCLAIMER, Finding, RunResult


def _line(f: Finding) -> str:
    where = f"{f.line}:{f.column}" if f.line else "-"
    sev = "waived" if f.waived_by else f.severity
    text = f"  {where:<8} {sev:<8} {f.rule:<18} {f.message}"
    if f.record_path != "$":
        text += f"  [{f.record_path}]"
    if f.waived_by:
        text += f"\n{'':12}waived: {f.waived_by}"
    return text


def render(result: RunResult) -> str:
    out: list[str] = []
    for file, group in groupby(result.findings, key=lambda f: f.file):
        out.append(file or "(run)")
        out.extend(_line(f) for f in group)
        out.append("")
    ran = sorted(
        {o.rule for r in result.records for o in r.outcomes if o.status != "not_applicable"}
    )
    checks = sum(len(o.checks) for r in result.records for o in r.outcomes)
    errors = len(result.active("error"))
    warnings = len(result.active("warning"))
    waived = sum(1 for f in result.findings if f.waived_by)
    versions = {r.id: r.version for r in result.rules}
    verdict = {0: "PASS", 1: "FAIL", 2: "INVALID INPUT", 3: "RULE CRASHED"}[result.exit_code]
    out.append(
        f"{verdict}: {len(result.records)} record(s) checked, {len(ran)} rule(s) run"
        f" ({checks} checks), {errors} error(s), {warnings} warning(s), {waived} waived"
    )
    if ran:
        out.append("rules: " + ", ".join(f"{r} v{versions.get(r, '?')}" for r in ran))
    out.append(DISCLAIMER)
    return "\n".join(out) + "\n"
