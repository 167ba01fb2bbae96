"""Waivers: a reviewed, dated exception to a rule for one record (or one part of it).

An expired waiver stops applying and is itself reported; a waiver that suppresses nothing is
reported too, so stale exceptions do not pile up. A waived finding stays in every output,
marked waived.
"""

from __future__ import annotations

import datetime as dt
from typing import TYPE_CHECKING

from emgate.findings import Finding, RecordResult

if TYPE_CHECKING:
    from emgate.engine import LoadedDesign

WAIVER_RULE = "waiver"


def covers(waiver_path: str | None, finding_path: str) -> bool:
    """Whether a waiver's record path covers a finding's (itself or a descendant)."""
    if waiver_path is None or waiver_path == "$":
        return True
    return finding_path == waiver_path or finding_path.startswith(
        (waiver_path + ".", waiver_path + "[")
    )


def apply_record_waivers(
    ld: LoadedDesign, findings: list[Finding], record: RecordResult, today: dt.date
) -> list[Finding]:
    out = list(findings)
    for i, waiver in enumerate(ld.design.waivers):
        loc = ld.doc.locate(("waivers", i))
        label = f"waiver of {waiver.rule!r} owned by {waiver.owner}"

        def note(message: str, severity: str, loc=loc) -> Finding:
            return Finding(
                WAIVER_RULE,
                severity,
                ld.file,
                loc.line,
                loc.column,  # type: ignore[arg-type]
                loc.record_path,
                message,
                ld.design.id,
                kind="waiver",
            )

        matching = [
            f
            for f in findings
            if f.rule == waiver.rule
            and f.kind == "violation"
            and covers(waiver.path, f.record_path)
        ]
        if waiver.expires < today:
            out.append(
                note(
                    f"{label} expired on {waiver.expires.isoformat()} and no longer applies",
                    "error" if matching else "warning",
                )
            )
            continue
        if not matching:
            out.append(
                note(
                    f"{label} suppresses nothing: the rule passes or does not run;"
                    " remove the waiver",
                    "warning",
                )
            )
            continue
        for f in matching:
            f.waived_by = f"{label}, until {waiver.expires.isoformat()}: {waiver.reason}"
    for outcome in record.outcomes:
        mine = [f for f in out if f.rule == outcome.rule and f.kind == "violation"]
        if outcome.status == "fail" and mine and all(f.waived_by for f in mine):
            outcome.status = "waived"
    return out
