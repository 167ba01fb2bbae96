"""Text for people: grouped by file, one line per finding with file:line:col, sorted, stable;
then one line per record naming its check closest to a limit, so a passing run shows its
margins too."""

from __future__ import annotations

from itertools import groupby

from emgate.findings import DISCLAIMER, Finding, RunResult
from emgate.report.common import margins_line, one_line, rules_line, summary_line, where


def _lines(f: Finding) -> list[str]:
    sev = "waived" if f.waived_by else f.severity
    text = f"  {where(f)}: {sev} {f.rule}: {f.message}"
    if f.record_path != "$":
        text += f" [{f.record_path}]"
    return [text, f"      waived: {f.waived_by}"] if f.waived_by else [text]


def render(result: RunResult) -> str:
    out: list[str] = []
    for file, group in groupby(result.findings, key=lambda f: f.file):
        out.append(file or "(run)")
        out.extend(line for f in group for line in _lines(f))
        out.append("")
    if result.records:
        out.extend(margins_line(r) for r in result.records)
        out.append("")
    out.append(summary_line(result))
    out.append(rules_line(result))
    out.append(DISCLAIMER)
    # Every line escaped: record text, file names and waivers cannot start a line.
    return "\n".join(one_line(line) for line in out) + "\n"
