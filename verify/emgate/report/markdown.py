"""Markdown summary for a pull-request comment: verdict, findings, worst margins, rules.

Every cell is escaped (``|``, backticks, emphasis, brackets, HTML, mentions, newlines), so a
message cannot break the table or inject markup. The margins table shows, per record and rule
that ran, the check with the smallest margin: the one closest to, or furthest beyond, its limit.

The helpers :func:`rules_run`, :func:`rules_line`, :func:`summary_line`, :func:`printable` and
:func:`where` are shared by the CI formats.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterator

from emgate import __version__
from emgate.findings import DISCLAIMER, Finding, RuleOutcome, RunResult
from emgate.remedy_report import report_lines
from emgate.report.common import VERDICTS, printable, rules_run, summary_line
from emgate.rule import Check

_MD_SPECIAL = re.compile(r"([\\`*_\[\]<>|~@])")
_NEWLINES = re.compile(r"\r\n|\r|\n")


def md(text: str) -> str:
    """Text safe inside a Markdown table cell."""
    out = _MD_SPECIAL.sub(r"\\\1", printable(text).replace("&", "&amp;"))
    return _NEWLINES.sub("<br>", out)


def worst_check(outcome: RuleOutcome) -> Check | None:
    """The check of a rule with the smallest margin, or None if the rule made no check."""
    return min(outcome.checks, key=lambda c: c.margin, default=None)


def _margin_cells(check: Check | None) -> list[str]:
    if check is None:
        return ["(no numeric check)", "", "", ""]
    from emgate.units import format_value

    bound = "≤" if check.bound == "max" else "≥"
    margin = f"{check.margin:+.1%}" if math.isfinite(check.margin) else "n/a (not finite)"
    return [
        check.quantity,
        format_value(check.value, check.unit),
        f"{bound} {format_value(check.limit, check.unit)}",
        margin,
    ]


def _row(cells: list[str]) -> str:
    return "| " + " | ".join(md(c) for c in cells) + " |"


def _table(header: list[str], rows: list[list[str]]) -> list[str]:
    return [_row(header), "|" + "---|" * len(header), *(_row(r) for r in rows)]


def _finding_cells(f: Finding) -> list[str]:
    location = f"{f.file}:{f.line}" if f.file else "(configuration)"
    severity = f"{f.severity} (waived)" if f.waived_by else f.severity
    message = f.message + (f" [{f.record_path}]" if f.record_path != "$" else "")
    if f.waived_by:
        message += f"\nwaived: {f.waived_by}"
    for remedy in report_lines(f):
        message += f"\n{remedy}"
    return [location, severity, f.rule, message]


def lines(result: RunResult) -> Iterator[str]:
    """The report's lines, one at a time (a spooled run's records are read as they go)."""
    yield from [f"## emgate: {VERDICTS[result.exit_code]}", "", md(summary_line(result)), ""]
    yield from ["### Findings", ""]
    header = ["Location", "Severity", "Rule", "Message"]
    found = False
    for f in result.each_finding():
        if not found:
            yield from _table(header, [])
            found = True
        yield _row(_finding_cells(f))
    if not found:
        yield "No findings."
    yield from ["", "### Margins", ""]
    header = ["Record", "Rule", "Status", "Quantity", "Value", "Limit", "Margin"]
    margins = False
    for r in result.each_record():
        for o in r.outcomes:
            if o.status == "not_applicable":
                continue
            if not margins:
                yield "Worst margin of each rule on each record (positive: inside the limit)."
                yield ""
                yield from _table(header, [])
                margins = True
            yield _row([r.record_id, o.rule, o.status, *_margin_cells(worst_check(o))])
    if not margins:
        yield "No rule ran on any record."
    yield from ["", "### Rules", ""]
    ran = rules_run(result)
    yield from (
        md(f"- {r.id} v{r.version} ({r.distribution} {r.distribution_version})") for r in ran
    )
    if not ran:
        yield "No rule ran."
    yield from ["", "---", md(f"emgate {__version__}. {DISCLAIMER}")]


def chunks(result: RunResult) -> Iterator[str]:
    return (f"{line}\n" for line in lines(result))


def render(result: RunResult) -> str:
    return "".join(chunks(result))
