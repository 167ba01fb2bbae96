"""What a remedy is: one field's answer for one failing check, and the edits that apply it.

The search that finds them is :mod:`emgate.remedies`, what the front ends show of them
:mod:`emgate.remedy_report`; this module holds only the data, so that a finding can carry its
remedies.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Literal

from emgate.terms import RecordPath, path_string


@dataclass(frozen=True)
class Edit:
    """One replacement in the record's text: the scalar at ``path``, from (``line``,
    ``column``) to (``end_line``, ``end_column``), 1-based, the end exclusive."""

    path: RecordPath
    line: int
    column: int
    end_line: int
    end_column: int
    old: str
    new: str

    def lsp_range(self) -> dict[str, dict[str, int]]:
        """The 0-based range of the Language Server Protocol (ASCII records: code points
        and UTF-16 units agree)."""
        return {
            "start": {"line": self.line - 1, "character": self.column - 1},
            "end": {"line": self.end_line - 1, "character": self.end_column - 1},
        }

    def as_dict(self) -> dict[str, Any]:
        return {
            "record_path": path_string(self.path),
            "line": self.line,
            "column": self.column,
            "end_line": self.end_line,
            "end_column": self.end_column,
            "old": self.old,
            "new": self.new,
        }


@dataclass(frozen=True)
class Remedy:
    """One field's answer for one failing check: a value that fixes it (``status`` "fix"),
    or why no value of that field can (``status`` "none", ``reason``)."""

    rule: str
    quantity: str
    field: RecordPath
    status: Literal["fix", "none"]
    old: str = ""
    new: str = ""
    #: The check's value and margin at the suggested value [SI].
    value: float = math.nan
    margin: float = math.nan
    unit: str = ""
    edits: tuple[Edit, ...] = ()
    #: Checks that pass on the record and fail at the suggested value, "rule: label".
    breaks: tuple[str, ...] = ()
    note: str = ""
    reason: str = ""

    @property
    def field_name(self) -> str:
        return path_string(self.field).removeprefix("$.")

    def describe(self) -> str:
        """One line for people."""
        if self.status == "none" and not self.field:
            return f"no fix: {self.reason}"
        if self.status == "none":
            return f"no fix by {self.field_name} alone: {self.reason}"
        from emgate.units import format_value

        margin = f"{self.margin:+.1%}".replace("%", " %")
        text = f"fix: {self.field_name} {self.old} -> {self.new}"
        if self.note:
            text += f" ({self.note})"
        text += f" gives {format_value(self.value, self.unit)} ({margin})"
        if self.breaks:
            text += "; but breaks " + ", ".join(self.breaks)
        return text

    def as_dict(self) -> dict[str, Any]:
        fix = self.status == "fix"
        return {
            "field": self.field_name,
            "status": self.status,
            "old": self.old,
            "new": self.new if fix else None,
            "value": self.value if fix else None,
            "margin": self.margin if fix else None,
            "note": self.note,
            "breaks": list(self.breaks),
            "reason": self.reason,
            "edits": [e.as_dict() for e in self.edits],
        }
