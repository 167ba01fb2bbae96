"""Text for people: grouped by file, one line per finding with file:line:col, sorted, stable;
then one line per record naming its check closest to a limit, so a passing run shows its
margins too."""

from __future__ import annotations

from itertools import groupby

from emgate.findings import DISCLAIMER, Finding, RunResult
from emgate.remedy_report import report_lines
from emgate.report.common import margins_line, one_line, rules_line, summary_line, where


def _lines(f: Finding, remedies: bool = True) -> list[str]:
    """A finding's lines, each escaped: record text, file names and waivers cannot start a
    line of their own."""
    sev = "waived" if f.waived_by else f.severity
    text = f"  {where(f)}: {sev} {f.rule}: {f.message}"
    if f.record_path != "$":
        text += f" [{f.record_path}]"
    lines = [text]
    if f.waived_by:
        lines.append(f"      waived: {f.waived_by}")
    lines.extend(f"      {remedy}" for remedy in (report_lines(f) if remedies else ()))
    return [one_line(line) for line in lines]


#: SGR codes: bold red, yellow, cyan; dim for a waived finding; green for a pass
_SGR = {"error": "1;31", "warning": "33", "info": "36", "waived": "2", "PASS": "1;32"}


def _paint(lines: list[str], key: str, colour: bool) -> list[str]:
    """Escaped ``lines`` in the colour of ``key``, line by line (a pager resets colour at a
    line end); the colour codes are added after escaping, so only emgate writes them."""
    code = _SGR.get(key)
    if not colour or code is None:
        return lines
    return [f"\x1b[{code}m{line}\x1b[0m" for line in lines]


def render(result: RunResult, *, quiet: bool = False, colour: bool = False) -> str:
    """The report; ``quiet``: the findings (without remedies) and the caution alone
    (nothing when clean); ``colour``: ANSI colours by severity."""
    out: list[str] = []
    for file, group in groupby(result.findings, key=lambda f: f.file):
        out.append(one_line(file or "(run)"))
        for f in group:
            out.extend(
                _paint(_lines(f, not quiet), "waived" if f.waived_by else f.severity, colour)
            )
        out.append("")
    if quiet:  # every report carries the caution, a quiet one too
        return "\n".join([*out, DISCLAIMER]) + "\n" if out else ""
    if result.records:
        out.extend(one_line(margins_line(r)) for r in result.records)
        out.append("")
    verdict = "PASS" if result.exit_code == 0 else "error"
    out.extend(_paint([one_line(summary_line(result))], verdict, colour))
    out.append(one_line(rules_line(result)))
    out.append(DISCLAIMER)
    return "\n".join(out) + "\n"
