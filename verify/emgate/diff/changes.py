"""What changed between the two sides of a record (fields, quantities, checks' margins), the
diff's result types, and its error."""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from emgate.terms import EXIT_OK

if TYPE_CHECKING:
    from emgate.page.content import CheckRow, PageData


DEFAULT_THRESHOLD = 0.001  # 0.1 %


class DiffError(Exception):
    """A revision, path or file the diff cannot read (exit code 2)."""


@dataclass(frozen=True)
class FieldChange:
    path: str
    before: str | None
    after: str | None


@dataclass(frozen=True)
class QuantityChange:
    name: str
    unit: str
    before: float | None
    after: float | None
    before_text: str
    after_text: str
    #: (after - before) / |before|; inf from zero; None when one side is not computed.
    relative: float | None


@dataclass(frozen=True)
class MarginChange:
    rule: str
    quantity: str
    bound: str
    label: str
    before: float | None
    after: float | None
    passed_before: bool | None
    passed_after: bool | None
    display_before: str
    display_after: str


@dataclass
class RecordDiff:
    status: str  # changed, added, removed, renamed, invalid
    record_id: str
    path_before: str | None
    path_after: str | None
    fields: list[FieldChange] = field(default_factory=list)
    quantities: list[QuantityChange] = field(default_factory=list)
    margins: list[MarginChange] = field(default_factory=list)
    newly_failing: list[str] = field(default_factory=list)
    newly_passing: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    base: PageData | None = None
    head: PageData | None = None

    @property
    def empty(self) -> bool:
        return (
            self.status == "changed"
            and not (self.fields or self.quantities or self.margins or self.notes)
            and not (self.newly_failing or self.newly_passing)
        )

    def worst(self) -> float:
        moved = [abs(q.relative) for q in self.quantities if q.relative is not None]
        return max(moved, default=0.0)


@dataclass
class DiffResult:
    base: str
    head: str
    threshold: float
    records: list[RecordDiff] = field(default_factory=list)
    head_exit: int = EXIT_OK
    notes: list[str] = field(default_factory=list)


def relative_change(before: float, after: float) -> float:
    """(after - before) / |before|; 0 for equal values, +-inf from zero."""
    if after == before:
        return 0.0
    if before == 0.0:
        return math.copysign(math.inf, after)
    return (after - before) / abs(before)


def _key(c: CheckRow) -> tuple[str, str, str]:
    return (c.rule, c.quantity, c.bound)


def _finite(x: float) -> float | None:
    return x if math.isfinite(x) else None


def compare(
    base: PageData | None,
    head: PageData | None,
    threshold: float,
    *,
    path_before: str | None = None,
    path_after: str | None = None,
) -> RecordDiff:
    """The diff of one record between its base and head pages (None: absent there)."""
    page = head or base
    assert page is not None
    if base is None or head is None:
        status = "added" if base is None else "removed"
    elif path_before != path_after:
        status = "renamed"
    else:
        status = "changed"
    out = RecordDiff(status, page.record_id, path_before, path_after, base=base, head=head)
    if base is None or head is None:
        return out
    for name in sorted(set(base.fields) | set(head.fields)):
        b, a = base.fields.get(name), head.fields.get(name)
        if b != a:
            out.fields.append(FieldChange(name, b, a))
    before = {q.name: q for q in base.quantities}
    after = {q.name: q for q in head.quantities}
    for name in sorted(set(before) | set(after)):
        qb, qa = before.get(name), after.get(name)
        vb = qb.value if qb else None
        va = qa.value if qa else None
        unit = (qa or qb).unit  # type: ignore[union-attr]
        if vb is None or va is None:
            if (vb is None) != (va is None):
                out.quantities.append(
                    QuantityChange(
                        name, unit, vb, va, qb.text if qb else "", qa.text if qa else "", None
                    )
                )
            continue
        rel = relative_change(vb, va)
        if abs(rel) > threshold:
            out.quantities.append(
                QuantityChange(name, unit, vb, va, qb.text, qa.text, rel)  # type: ignore[union-attr]
            )
    out.quantities.sort(
        key=lambda q: -(math.inf if q.relative is None else abs(q.relative)), reverse=False
    )
    cb = {_key(c): c for c in base.checks}
    ca = {_key(c): c for c in head.checks}
    for key in sorted(set(cb) | set(ca)):
        b_c, a_c = cb.get(key), ca.get(key)
        moved = (
            b_c is None
            or a_c is None
            or b_c.passed != a_c.passed
            or abs(relative_change(b_c.value, a_c.value)) > threshold
            or abs(relative_change(b_c.limit, a_c.limit)) > threshold
        )
        if not moved:
            continue
        c = a_c or b_c
        assert c is not None
        out.margins.append(
            MarginChange(
                key[0],
                key[1],
                key[2],
                c.label,
                _finite(b_c.margin) if b_c else None,
                _finite(a_c.margin) if a_c else None,
                b_c.passed if b_c else None,
                a_c.passed if a_c else None,
                b_c.display if b_c else "",
                a_c.display if a_c else "",
            )
        )
        name = f"{key[0]}: {c.label}"
        if a_c is not None and not a_c.passed and (b_c is None or b_c.passed):
            out.newly_failing.append(name)
        if b_c is not None and not b_c.passed and (a_c is None or a_c.passed):
            out.newly_passing.append(name)
    out.margins.sort(key=lambda m: m.after if m.after is not None else -math.inf)
    rb = {r.rule: r.status for r in base.rules}
    for r in head.rules:
        was = rb.get(r.rule)
        if r.status == "crash" and was != "crash":
            out.newly_failing.append(f"{r.rule}: crashed ({r.message})")
        if was is not None and was != r.status and r.status == "not_applicable":
            out.notes.append(f"{r.rule}: no longer applies")
    return out
