"""JSON: the whole result, for tools. Values and limits are SI, in each check's "unit" (the SI
unit of the quantity); "display" shows them for people, in the unit a report uses."""

from __future__ import annotations

import math
from collections.abc import Iterator
from typing import Any

from emgate import __version__
from emgate.findings import DISCLAIMER, Finding, RecordResult, RunResult
from emgate.report.common import Stream, check_display, json_chunks
from emgate.rule import Check
from emgate.units import si_unit


def _num(x: float) -> float | None:
    return x if math.isfinite(x) else None


def check_dict(c: Check) -> dict[str, Any]:
    return {
        "quantity": c.quantity,
        "label": c.label,
        "record_path": _path(c.path),
        "value": _num(c.value),
        "limit": _num(c.limit),
        "bound": c.bound,
        "margin": _num(c.margin),
        "unit": si_unit(c.unit),
        "display": check_display(c),
        "basis": c.basis,
        "passed": c.passed,
    }


def _path(path: tuple) -> str:
    from emgate.terms import path_string

    return path_string(path)


def finding_dict(f: Finding) -> dict[str, Any]:
    return {
        "rule": f.rule,
        "severity": f.severity,
        "kind": f.kind,
        "file": f.file,
        "line": f.line,
        "column": f.column,
        "record_id": f.record_id,
        "record_path": f.record_path,
        "message": f.message,
        "fingerprint": f.fingerprint,
        "waived": f.waived_by is not None,
        "waiver": f.waived_by,
        "check": check_dict(f.check) if f.check else None,
        "remedies": [r.as_dict() for r in f.remedies],
    }


def record_dict(r: RecordResult) -> dict[str, Any]:
    return {
        "file": r.file,
        "record_id": r.record_id,
        "machine": r.machine,
        "outcomes": [
            {
                "rule": o.rule,
                "status": o.status,
                "message": o.message,
                "checks": [check_dict(c) for c in o.checks],
            }
            for o in r.outcomes
        ],
    }


def chunks(result: RunResult) -> Iterator[str]:
    """The document in pieces: its findings and records written one at a time as they are
    read (a spooled run's are never all in memory)."""
    doc = {
        "tool": {"name": "emgate", "version": __version__},
        "exit_code": result.exit_code,
        "rules": [  # (the help texts are for people: emgate explain RULE prints them)
            {k: v for k, v in r.__dict__.items() if k not in ("description", "help", "make_help")}
            for r in result.rules
        ],
        "summary": {
            "records": result.count_records(),
            "errors": result.count_active("error"),
            "warnings": result.count_active("warning"),
            "waived": result.count_waived(),
        },
        "findings": Stream(finding_dict(f) for f in result.each_finding()),
        "records": Stream(record_dict(r) for r in result.each_record()),
        "notice": DISCLAIMER,
    }
    return json_chunks(doc)


def render(result: RunResult) -> str:
    return "".join(chunks(result))
