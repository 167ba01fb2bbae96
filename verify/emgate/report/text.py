"""Text for people: grouped by file, one line per finding with file:line:col, sorted, stable;
then one line per record naming its check closest to a limit, so a passing run shows its
margins too."""

from __future__ import annotations

from collections.abc import Iterator
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


def lines(result: RunResult, *, quiet: bool = False, colour: bool = False) -> Iterator[str]:
    """The report's lines, one at a time (a spooled run's records are read back as they are
    written out); ``quiet``: the findings (without remedies) and the caution alone (nothing
    when clean); ``colour``: ANSI colours by severity."""
    found = False
    for file, group in groupby(result.each_finding(), key=lambda f: f.file):
        found = True
        yield one_line(file or "(run)")
        for f in group:
            yield from _paint(_lines(f, not quiet), "waived" if f.waived_by else f.severity, colour)
        yield ""
    if quiet:  # every report carries the caution, a quiet one too
        if found:
            yield DISCLAIMER
        return
    margins = False
    for record in result.each_record():
        margins = True
        yield one_line(margins_line(record))
    if margins:
        yield ""
    verdict = "PASS" if result.exit_code == 0 else "error"
    yield from _paint([one_line(summary_line(result))], verdict, colour)
    yield one_line(rules_line(result))
    yield DISCLAIMER


def chunks(result: RunResult, *, quiet: bool = False, colour: bool = False) -> Iterator[str]:
    """:func:`lines`, each ended by a line feed."""
    return (f"{line}\n" for line in lines(result, quiet=quiet, colour=colour))


def render(result: RunResult, *, quiet: bool = False, colour: bool = False) -> str:
    """The report as one text."""
    return "".join(chunks(result, quiet=quiet, colour=colour))
