"""Text for people: grouped by file, one line per finding with file:line:col, sorted, stable;
then one line per record naming its check closest to a limit, so a passing run shows its
margins too."""

from __future__ import annotations

from itertools import groupby

from emgate.findings import DISCLAIMER, Finding, RunResult
from emgate.remedies import report_lines
from emgate.report.common import margins_line, rules_line, summary_line, where


def _line(f: Finding) -> str:
    sev = "waived" if f.waived_by else f.severity
    text = f"  {where(f)}: {sev} {f.rule}: {f.message}"
    if f.record_path != "$":
        text += f" [{f.record_path}]"
    if f.waived_by:
        text += f"\n      waived: {f.waived_by}"
    for remedy in report_lines(f):
        text += f"\n      {remedy}"
    return text


def render(result: RunResult) -> str:
    out: list[str] = []
    for file, group in groupby(result.findings, key=lambda f: f.file):
        out.append(file or "(run)")
        out.extend(_line(f) for f in group)
        out.append("")
    if result.records:
        out.extend(margins_line(r) for r in result.records)
        out.append("")
    out.append(summary_line(result))
    out.append(rules_line(result))
    out.append(DISCLAIMER)
    return "\n".join(out) + "\n"
