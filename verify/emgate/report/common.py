"""Pieces every reporter shares: the verdict words, the rules that ran, locations."""

from __future__ import annotations

import re

from emgate.findings import Finding, RuleInfo, RunResult

VERDICTS = {0: "PASS", 1: "FAIL", 2: "INVALID INPUT", 3: "RULE CRASHED"}
# C0 controls except tab and line ends, DEL, C1, surrogates and the XML non-characters
_CONTROL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\x7f-\x9f\ud800-\udfff\ufffe\uffff]")


def printable(text: str) -> str:
    """``text`` with control characters shown as escapes (``\\x1b``): they are invalid in XML
    and can rewrite a CI log; tab and line ends are kept for each format to encode."""
    return _CONTROL.sub(lambda m: ascii(m.group())[1:-1], text)


def where(f: Finding) -> str:
    """``file:line:col`` of a finding, or ``(configuration)`` when it has no file."""
    if not f.file:
        return "(configuration)"
    return f"{f.file}:{f.line}:{f.column}" if f.line > 0 else f.file


def rules_run(result: RunResult) -> list[RuleInfo]:
    """The rules that ran on at least one record (not only loaded), with their versions."""
    ran = {o.rule for r in result.records for o in r.outcomes if o.status != "not_applicable"}
    known = {r.id: r for r in result.rules}
    return [known.get(rid, RuleInfo(rid, "?", "", "", "")) for rid in sorted(ran)]


def rules_line(result: RunResult) -> str:
    ran = rules_run(result)
    if not ran:
        return "no rule ran"
    return "rules run: " + ", ".join(f"{r.id} v{r.version}" for r in ran)


def summary_line(result: RunResult) -> str:
    """The verdict and the counts, in one sentence."""
    checks = sum(len(o.checks) for r in result.records for o in r.outcomes)
    waived = sum(1 for f in result.findings if f.waived_by)
    return (
        f"{VERDICTS[result.exit_code]}: {len(result.records)} record(s) checked,"
        f" {len(rules_run(result))} rule(s) run ({checks} checks),"
        f" {len(result.active('error'))} error(s), {len(result.active('warning'))} warning(s),"
        f" {waived} waived"
    )
