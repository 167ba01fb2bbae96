"""Code-quality JSON array for merge-request widgets (the Code Climate issue format).

Each item: ``type`` (``issue``), ``check_name`` (the rule id), ``description``,
``categories`` (``Bug Risk``: a broken limit is a defect of the design), ``fingerprint``,
``severity`` (``blocker`` for a crash, ``critical`` for an error or an input error, ``minor``
for a warning, ``info`` for info and for a waived finding) and ``location`` (``path``,
relative to the repository's root whatever folder emgate ran in, and ``lines.begin``). A
finding with no file (a plugin that fails to load) has the path ``.``.

Waived findings are kept, as every output keeps them: as ``info``, their description
starting with "waived" and naming the waiver. A waived finding's fingerprint differs from the
one it had unwaived, so that the widget shows the error resolved and the waived note new, and
a reviewer sees the waiver land. The format has no place for the rules that ran, their
versions or the disclaimer, so this output cannot carry them: pair it with another format
(text, Markdown, SARIF) that does.

Fingerprints must be unique within a report. A finding's own fingerprint (rule, file, record,
record path) is used where it is unique; where two findings share it (two checks of one rule on
the same record path), the check's quantity (or the message) and an ordinal among equals are
hashed in.
"""

from __future__ import annotations

import hashlib
from collections import Counter
from collections.abc import Iterable, Iterator
from typing import Any

from emgate.findings import Finding, RunResult
from emgate.report.common import Stream, json_chunks

SEVERITIES = {"error": "critical", "warning": "minor", "info": "info"}


def severity(f: Finding) -> str:
    return "blocker" if f.kind == "crash" else SEVERITIES[f.severity]


def fingerprints(
    findings: Iterable[Finding], shared: Counter[str]
) -> Iterator[tuple[Finding, str]]:
    """Each finding with its unique, stable fingerprint, in order; ``shared`` counts each
    finding's own fingerprint over all of the run's findings."""
    seen: Counter[tuple[str, str]] = Counter()
    for f in findings:
        fp = f.fingerprint
        if shared[fp] > 1:
            key = (fp, f.check.quantity if f.check else f.message)
            seen[key] += 1
            text = "\x1f".join((*key, str(seen[key])))
            fp = hashlib.sha256(text.encode()).hexdigest()[:32]
        yield f, fp


def _item(f: Finding, fp: str) -> dict[str, Any]:
    description = f.message + (f" [{f.record_path}]" if f.record_path != "$" else "")
    level = severity(f)
    if f.waived_by:
        description = f"waived {f.severity}: {description}; waived by {f.waived_by}"
        level = "info"
        fp = hashlib.sha256(f"{fp}\x1fwaived".encode()).hexdigest()[:32]
    file = f.file if f.repo_file is None else f.repo_file
    return {
        "type": "issue",
        "check_name": f.rule,
        "description": description,
        "categories": ["Bug Risk"],
        "fingerprint": fp,
        "severity": level,
        "location": {"path": file or ".", "lines": {"begin": max(f.line, 1)}},
    }


def chunks(result: RunResult) -> Iterator[str]:
    """The array in pieces, an issue at a time: the fingerprints shared by several findings
    from a first pass over them (a spooled run is read twice, never held)."""
    # fingerprints over every finding, so that waiving one does not rename another
    shared = Counter(f.fingerprint for f in result.each_finding())
    paired = fingerprints(result.each_finding(), shared)
    return json_chunks(Stream(_item(f, fp) for f, fp in paired))


def render(result: RunResult) -> str:
    return "".join(chunks(result))
