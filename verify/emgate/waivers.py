"""Waivers: a reviewed, dated exception to a rule for one record (or one part of it).

They live in a record's own ``waivers`` list or in the repository's reviewed waivers file.
An expired waiver stops applying and is itself reported; a waiver that suppresses nothing is
reported too, so stale exceptions do not pile up. A waived finding stays in every output,
marked waived.
"""

from __future__ import annotations

import datetime as dt
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path

from emgate.errors import InputError, InputErrors, Location, display_path
from emgate.findings import Finding, RecordResult
from emgate.loader import Document
from emgate.model import Waiver
from emgate.terms import WAIVERS_SCHEMA, Severity, path_string

WAIVER_RULE = "waiver"


@dataclass(frozen=True)
class WaiverEntry:
    """A waiver with the place it was written."""

    waiver: Waiver
    record: str
    location: Location


def covers(waiver_path: str | None, finding_path: str) -> bool:
    """Whether a waiver's record path covers a finding's (itself or a descendant)."""
    if waiver_path is None or waiver_path == "$":
        return True
    return finding_path == waiver_path or finding_path.startswith(
        (waiver_path + ".", waiver_path + "[")
    )


def record_waivers(doc: Document, record_id: str, waivers: list[Waiver]) -> list[WaiverEntry]:
    return [WaiverEntry(w, record_id, doc.locate(("waivers", i))) for i, w in enumerate(waivers)]


def load_waivers_file(path: Path) -> dict[str, list[WaiverEntry]]:
    """The reviewed waivers file, by record id (InputErrors when invalid)."""
    from pydantic import ValidationError

    from emgate.loader import load
    from emgate.model import WaiversFile
    from emgate.translate import model_errors

    doc = load(path)
    if not isinstance(doc.data, dict) or doc.data.get("schema") != WAIVERS_SCHEMA:
        # (a path naming some other file must not echo that file's content)
        raise InputError(
            f"not an emgate waivers file: expected 'schema: {WAIVERS_SCHEMA}' at the top"
            " level (the file's content is not shown)",
            Location(path, 1, 1, "$"),
        )
    try:
        parsed = WaiversFile.model_validate(doc.data)
    except ValidationError as exc:
        raise InputErrors(model_errors(exc, doc)) from None
    out: dict[str, list[WaiverEntry]] = {}
    for i, w in enumerate(parsed.waivers):
        out.setdefault(w.record, []).append(WaiverEntry(w, w.record, doc.locate(("waivers", i))))
    return out


def apply_waivers(
    entries: list[WaiverEntry], findings: list[Finding], record: RecordResult, today: dt.date
) -> list[Finding]:
    """Mark findings waived; add findings for expired and unused waivers."""
    out = list(findings)
    for entry in entries:
        w, loc = entry.waiver, entry.location
        label = f"waiver of {w.rule!r} for {entry.record} owned by {w.owner}"

        def note(
            message: str, severity: Severity, loc: Location = loc, record: str = entry.record
        ) -> Finding:
            return Finding(
                WAIVER_RULE,
                severity,
                display_path(loc.file),
                loc.line,
                loc.column,
                loc.record_path,
                message,
                record,
                kind="waiver",
            )

        matching = [
            f
            for f in findings
            if f.rule == w.rule and f.kind == "violation" and covers(w.path, f.record_path)
        ]
        if w.expires < today:
            out.append(
                note(
                    f"{label} expired on {w.expires.isoformat()} and no longer applies",
                    "error" if matching else "warning",
                )
            )
            continue
        if not matching:
            out.append(
                note(
                    f"{label} suppresses nothing (the rule passes, does not run, or the"
                    " path matches no finding); remove the waiver",
                    "warning",
                )
            )
            continue
        for f in matching:
            f.waived_by = f"{label}, until {w.expires.isoformat()}: {w.reason}"
    for outcome in record.outcomes:
        mine = [f for f in out if f.rule == outcome.rule and f.kind == "violation"]
        if outcome.status == "fail" and mine and all(f.waived_by for f in mine):
            outcome.status = "waived"
    return out


def unknown_record_waivers(
    by_record: dict[str, list[WaiverEntry]], known: set[str]
) -> list[InputError]:
    """Waivers in the file for records that exist nowhere: a typo must not pass silently."""
    return [
        InputError(f"waiver names record {rid!r}, which no checked record has", e.location)
        for rid, entries in sorted(by_record.items())
        if rid not in known
        for e in entries
    ]


def invalid_waivers(
    entries: list[WaiverEntry], rules: Iterable[str], doc: Document
) -> tuple[list[WaiverEntry], list[InputError]]:
    """Split waivers into the valid ones and located errors for the rest.

    A waiver names one installed rule by its exact id (not 'all', a wildcard, a pack prefix
    or a tag: a waiver is a reviewed exception, not a switch) and, with a path, a node that
    exists in the record: a typo must not look like a reviewed exception.
    """
    if not entries:  # the common case: no path of the record need be spelled out
        return [], []
    import difflib

    known = sorted(rules)
    paths = {path_string(p) for p in doc.marks} | {"$"}
    valid: list[WaiverEntry] = []
    errors: list[InputError] = []
    for entry in entries:
        rule, where = entry.waiver.rule, entry.waiver.path
        if rule not in known:
            if rule == "all" or any(c in rule for c in "*?[]") or rule.startswith("tag:"):
                why = "a waiver names one rule by its id; 'all', wildcards and tags are refused"
            elif rule.endswith("/"):
                why = "a waiver names one rule by its id, not a pack prefix"
            else:
                close = difflib.get_close_matches(rule, known, n=1, cutoff=0.6)
                why = "no installed rule has this id" + (
                    f"; did you mean {close[0]!r}?" if close else ""
                )
            errors.append(InputError(f"waiver for rule {rule!r}: {why}", entry.location))
            continue
        if where is not None and where not in paths:
            errors.append(
                InputError(
                    f"waiver path {where!r} names no node of record {entry.record!r}"
                    " (a JSON path such as '$.winding.conductor')",
                    entry.location,
                )
            )
            continue
        valid.append(entry)
    return valid, errors
