"""The gate on the documents open in an editor, and what an editor shows of its result.

:func:`check_open` is the one place the language server reaches into the engine: it runs the
same stages as ``emgate check`` (the nearest ``emgate.yaml``, the installed packs, materials,
waivers), with the editor's unsaved text read in place of the files. The rest of this module
only reads the :class:`RunResult` it returns; nothing here imports the LSP libraries.
"""

from __future__ import annotations

import datetime as dt
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path

from emgate.findings import Finding, RunResult
from emgate.plugins import PluginSet
from emgate.rule import Check
from emgate.terms import RecordPath


@dataclass(frozen=True)
class Checked:
    """A run for one open document, the files read for it whose errors block it (the policy
    and the waivers file), and whether other records read the document (it is the policy,
    the waivers file or a materials file: a change to it re-checks them)."""

    result: RunResult
    upstream: frozenset[Path]
    read_by_others: bool = False


def check_open(
    path: Path, buffers: Mapping[Path, str], plugins: PluginSet, *, remedies: bool = True
) -> Checked:
    """The gate's result for the open document ``path`` (resolved), reading every file that
    ``buffers`` holds from there. A record is checked alone; ``emgate.yaml`` and the waivers
    file are checked with every record the policy names, as they are read for those.
    ``remedies`` computes the remedies of failing checks (off on every keystroke)."""
    from emgate.config import find_config, load_policy
    from emgate.discovery import discover
    from emgate.engine import execute
    from emgate.errors import InputError, InputErrors
    from emgate.findings import input_findings
    from emgate.loader import BUFFERS
    from emgate.pipeline import Run
    from emgate.terms import DESIGN_SCHEMA

    token = BUFFERS.set(buffers)
    try:
        scratch = RunResult()
        sources = discover([path], scratch)
        if any(f.kind == "note" for f in scratch.findings):
            return Checked(scratch, frozenset())  # not an emgate file: nothing to say
        shared = not any(s.declared == DESIGN_SCHEMA for s in sources)
        rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
        installed = {p.distribution: p.version for p in plugins.packs}
        config = find_config(path.parent)
        upstream = frozenset([config.resolve()] if config else [])
        try:
            policy = load_policy(config, rules, path.parent, installed)
        except (InputError, InputErrors) as exc:
            return Checked(RunResult(findings=input_findings(exc)), upstream, shared)
        if policy.waivers_file is not None:
            upstream |= {policy.waivers_file.resolve()}
        whole = path in upstream  # the policy or the waivers file: read for every record
        paths = policy.configured_files() if whole else [path]
        run = Run(
            paths=paths,
            policy=policy,
            plugins=plugins,
            today=dt.date.today(),
            remedies=remedies,
        )
        return Checked(execute(run), upstream, shared)
    finally:
        BUFFERS.reset(token)


@dataclass(frozen=True)
class Mark:
    """What an editor underlines: 0-based line and columns on that line, severity, text."""

    line: int
    start: int
    end: int
    severity: str  # error, warning, info; "info" too for a waived finding
    code: str
    message: str


def marks(checked: Checked, path: Path, text: str) -> list[Mark]:
    """The findings in ``path`` as marks on ``text``, each from its column to the end of its
    line (less a trailing comment). An error in a file read for this one (the policy or the
    waivers file) or in no file (a plugin that did not load) is marked on the first line: it
    fails the run, so a file without marks is a file that passes as the repository would."""
    lines = text.splitlines() or [""]
    out: list[Mark] = []
    blocking: list[Finding] = []
    for f in checked.result.findings:
        if f.kind == "note":
            continue
        if not names(f.file, path):
            live_error = f.severity == "error" and not f.waived_by and f.kind != "violation"
            if live_error and (not f.file or Path(f.file).resolve() in checked.upstream):
                blocking.append(f)
            continue
        line = min(max(f.line, 1), len(lines)) - 1
        start = min(max(f.column, 1) - 1, len(lines[line]))
        message = f.message + (f" [{f.record_path}]" if f.record_path != "$" else "")
        severity = f.severity
        if f.waived_by:
            severity, message = "info", f"waived {f.severity}: {message}; {f.waived_by}"
        end = max(_content_end(lines[line]), start + 1)
        out.append(Mark(line, start, end, severity, f.rule, message))
    if blocking:
        from emgate.report.common import where

        first = blocking[0]
        more = f" (and {len(blocking) - 1} more)" if len(blocking) > 1 else ""
        message = f"{where(first)}, read for this file: {first.message}{more}"
        out.append(Mark(0, 0, max(len(lines[0]), 1), "error", first.rule, message))
    return out


def names(file: str, path: Path) -> bool:
    """Whether a finding's or a record's file is ``path`` (files are named relative to the
    working folder of the run, which is this process's)."""
    return bool(file) and Path(file).resolve() == path


def _content_end(line: str) -> int:
    """The column after the last character before a trailing YAML comment."""
    cut = len(line)
    for i, ch in enumerate(line):
        if ch == "#" and (i == 0 or line[i - 1] in " \t"):
            cut = i
            break
    return len(line[:cut].rstrip())


def key_at(text: str, path: Path, line: int, column: int) -> RecordPath | None:
    """The record path of the mapping key under a 0-based position, or None (not on a key,
    or the text does not load)."""
    from emgate.errors import InputError, InputErrors
    from emgate.loader import load_text

    try:
        doc = load_text(path, text)
    except (InputError, InputErrors):
        return None
    for key, (kline, kcol) in doc.key_marks.items():
        if key and kline == line and kcol <= column <= kcol + len(str(key[-1])):
            return key
    return None


def checks_under(result: RunResult, path: Path, key: RecordPath) -> list[tuple[str, Check]]:
    """(rule, check) of every check on the record in ``path`` whose record path is ``key``
    or lies below it, closest to its limit first."""
    found = [
        (o.rule, c)
        for r in result.records
        if names(r.file, path)
        for o in r.outcomes
        for c in o.checks
        if tuple(c.path[: len(key)]) == tuple(key)
    ]
    return sorted(found, key=lambda rc: rc[1].margin)


def hover_markdown(key: RecordPath, checks: list[tuple[str, Check]]) -> str | None:
    """The hover text of a record key: the quantities it drives, each against its limit
    with its margin; None when no check reads it."""
    if not checks:
        return None
    from emgate.report.common import check_display, margin_text
    from emgate.terms import path_string

    lines = [f"**emgate**: what `{path_string(key)}` drives (closest to a limit first)", ""]
    for rule, c in checks:
        verdict = "" if c.passed else " **beyond the limit**"
        lines.append(
            f"- `{c.quantity}` ({rule}): {check_display(c)}, margin {margin_text(c)}{verdict}"
        )
    return "\n".join(lines)
