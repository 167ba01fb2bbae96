"""Pieces every reporter shares: the verdict words, the rules that ran, locations, units."""

from __future__ import annotations

import json
import math
import re
import secrets
from collections.abc import Iterable, Iterator
from typing import Any

from emgate.findings import Finding, RecordResult, RuleInfo, RunResult
from emgate.rule import Check

VERDICTS = {0: "PASS", 1: "FAIL", 2: "INVALID INPUT", 3: "RULE CRASHED"}
# C0 controls except tab and line ends, DEL, C1, surrogates and the XML non-characters
_CONTROL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\x7f-\x9f\ud800-\udfff\ufffe\uffff]")
# the same, line ends and the Unicode line and paragraph separators included
_CONTROL_LINES = re.compile("[\x00-\x08\x0a-\x1f\x7f-\x9f\u2028\u2029\ud800-\udfff\ufffe\uffff]")


def printable(text: str, *, keep_lines: bool = True) -> str:
    """``text`` with control characters shown as escapes (``\\x1b``): they are invalid in XML
    and can rewrite a terminal or a CI log. The one escaping function of every output.

    With ``keep_lines`` (the default) tab and line ends are kept for a format that encodes
    them itself (annotations, Markdown); without it they are escaped too (``\\n``), so that
    text from a record, a file name or a waiver cannot start a line of its own (a forged
    ``PASS:`` or ``::error`` line) in the text, ``show`` or JUnit outputs.
    """
    pattern = _CONTROL if keep_lines else _CONTROL_LINES
    return pattern.sub(lambda m: ascii(m.group())[1:-1], text)


def one_line(text: str) -> str:
    """:func:`printable` without line ends: what a line of plain text output may hold."""
    return printable(text, keep_lines=False)


def where(f: Finding) -> str:
    """``file:line:col`` of a finding, or ``(configuration)`` when it has no file."""
    if not f.file:
        return "(configuration)"
    return f"{f.file}:{f.line}:{f.column}" if f.line > 0 else f.file


def rules_run(result: RunResult) -> list[RuleInfo]:
    """The rules that ran on at least one record (not only loaded), with their versions."""
    ran = result.rules_ran()
    known = {r.id: r for r in result.rules}
    return [known.get(rid, RuleInfo(rid, "?", "", "", "")) for rid in sorted(ran)]


def rules_line(result: RunResult) -> str:
    ran = rules_run(result)
    if not ran:
        return "no rule ran"
    return "rules run: " + ", ".join(f"{r.id} v{r.version}" for r in ran)


def summary_line(result: RunResult) -> str:
    """The verdict and the counts, in one sentence."""
    return (
        f"{VERDICTS[result.exit_code]}: {result.count_records()} record(s) checked,"
        f" {len(rules_run(result))} rule(s) run ({result.count_checks()} checks),"
        f" {result.count_active('error')} error(s), {result.count_active('warning')}"
        f" warning(s), {result.count_waived()} waived"
    )


def check_display(c: Check) -> str:
    """A check's value against its limit in the display unit: '6.007 A/mm^2 <= 10 A/mm^2'."""
    from emgate.units import format_value

    bound = "<=" if c.bound == "max" else ">="
    return f"{format_value(c.value, c.unit)} {bound} {format_value(c.limit, c.unit)}"


def margin_text(c: Check) -> str:
    """A check's margin as a signed percentage ('+18.3 %'), or 'n/a' when not finite."""
    return f"{c.margin:+.1%}".replace("%", " %") if math.isfinite(c.margin) else "n/a"


def margins_line(record: RecordResult) -> str:
    """One line on a record's checks: how many, and the one closest to its limit."""
    closest = record.closest()
    if closest is None:
        return f"{record.record_id}: no numeric check"
    rule, c = closest
    from emgate.units import format_value

    count = record.check_count()
    head = f"{record.record_id}: {count} check{'' if count == 1 else 's'}"
    return (
        f"{head}; closest to a limit: {rule}, {c.label} {format_value(c.value, c.unit)}"
        f" of {format_value(c.limit, c.unit)} ({margin_text(c)})"
    )


class Stream:
    """A list in a JSON document whose items are made one at a time (:func:`json_chunks`)."""

    def __init__(self, items: Iterable[Any]) -> None:
        self.items = items


def json_chunks(doc: dict[str, Any] | Stream) -> Iterator[str]:
    """``json.dumps(doc, indent=2) + "\\n"`` in pieces, byte for byte; each :class:`Stream`
    in ``doc`` (the value of a key, or the document itself) is written item by item as it is
    read, so that a spooled run's findings and records are never all in memory at once."""
    if isinstance(doc, Stream):
        first = True
        for item in doc.items:
            yield ("[\n  " if first else ",\n  ") + json.dumps(item, indent=2).replace("\n", "\n  ")
            first = False
        yield "[]\n" if first else "\n]\n"
        return
    streams: list[tuple[str, Stream]] = []
    # Each stream's place is marked by a text that occurs nowhere else in the document (a
    # nonce, checked): the list is written there.
    nonce = secrets.token_hex(8)

    def mark(n: int) -> str:
        return f"\x00stream {n} {nonce}\x00"

    def marked(node: Any) -> Any:
        if isinstance(node, dict):
            out = {}
            for key, value in node.items():
                if isinstance(value, Stream):
                    if not isinstance(key, str):
                        raise TypeError("a Stream is written under a text key")
                    out[key] = mark(len(streams))
                    streams.append((key, value))
                else:
                    out[key] = marked(value)
            return out
        if isinstance(node, list | tuple):
            return [marked(v) for v in node]
        if isinstance(node, Stream):
            raise TypeError("a Stream is the document itself or the value of a key")
        return node

    text = json.dumps(marked(doc), indent=2)
    if any(text.count(json.dumps(mark(n))) != 1 for n in range(len(streams))):
        # (a document that holds the nonce itself): written whole
        yield json.dumps(_resolved(doc), indent=2) + "\n"
        return
    at = 0
    for n, (key, stream) in enumerate(streams):
        head = f"{json.dumps(key)}: "
        needle = head + json.dumps(mark(n))
        where = text.index(needle, at)
        yield text[at:where] + head
        line = text[text.rindex("\n", 0, where) + 1 : where]
        margin = " " * (len(line) - len(line.lstrip(" "))) + "  "
        first = True
        for item in stream.items:
            yield ("[\n" if first else ",\n") + margin
            yield json.dumps(item, indent=2).replace("\n", "\n" + margin)
            first = False
        yield "[]" if first else "\n" + margin[:-2] + "]"
        at = where + len(needle)
    yield text[at:] + "\n"


def _resolved(node: Any) -> Any:
    """``node`` with each :class:`Stream` read into a list (the fall-back of json_chunks)."""
    if isinstance(node, Stream):
        return [_resolved(v) for v in node.items]
    if isinstance(node, dict):
        return {k: _resolved(v) for k, v in node.items()}
    if isinstance(node, list | tuple):
        return [_resolved(v) for v in node]
    return node
