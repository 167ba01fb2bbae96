"""The search of one field's remedy for one failing check: which way helps, a geometric
bracket in that direction, bisection to :data:`TARGET_MARGIN` inside the limit, rounding away
from it, and the verification with every rule of the value found.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import TYPE_CHECKING, Any

from emgate.fields import field_or_none, with_fields
from emgate.remedy import Edit, Remedy
from emgate.remedy_fields import (
    INSULATED,
    WIRE_DIAMETERS_MM,
    WIRE_TABLE,
    NumberField,
    number_text,
    round_away,
)
from emgate.terms import RecordPath

if TYPE_CHECKING:
    from emgate.model import AnyDesign
    from emgate.rule import Check
    from emgate.variants import Evaluator

#: How far inside its limit a remedy puts the check (relative margin; common practice, no
#: source: enough that rounding and the next review's small changes keep it inside).
TARGET_MARGIN = 0.02
#: The furthest a field is moved, as a factor of its value either way.
MAX_FACTOR = 20.0
#: Geometric step of the bracket search.
STEP = 1.5
#: Relative width at which the bisection stops.
TOLERANCE = 2e-3


class Trial:
    """The record moved in one field, recomputed: the rules' checks at a value (through
    :class:`emgate.variants.Evaluator`, as a sweep's or a tolerance corner's variant)."""

    def __init__(self, variants: Evaluator) -> None:
        self.variants = variants
        self.doc = variants.doc
        self._baseline: list[tuple[str, Check]] | None = None

    def baseline(self) -> list[tuple[str, Check]]:
        """Every rule's checks on the record as it is (computed once)."""
        if self._baseline is None:
            self._baseline = self.checks(self.doc.data)[0]
        return self._baseline

    def design(self, data: Any) -> AnyDesign | None:
        try:
            return self.variants.design(data)
        except Exception:  # invalid: outside the field's range, or inconsistent
            return None

    def checks(self, data: Any, only: str | None = None) -> tuple[list[tuple[str, Check]], bool]:
        """The checks of every rule (or only rule ``only``) on ``data``, and whether every
        rule ran cleanly; ([], False) for a record that does not validate."""
        from emgate.rule import Check

        design = self.design(data)
        if design is None:
            return [], False
        out: list[tuple[str, Check]] = []
        clean = True
        try:
            # one rule's trials while solving; the answer, with every rule, in full
            context = self.variants.context(design, plausible=only is None)
            for rid, ran in self.variants.run(design, context, only):
                if ran is None:
                    continue
                clean = clean and not ran.crash
                out += [(rid, c) for c in ran.items if isinstance(c, Check)]
        except Exception:
            return [], False
        return out, clean


def _key(c: Check) -> tuple[str, str, tuple[Any, ...]]:
    return (c.quantity, c.bound, tuple(c.path))


class Search:
    """Moving one field of one record to fix one check."""

    def __init__(
        self,
        trial: Trial,
        data: Any,
        rule: str,
        check: Check,
        span: Callable[[RecordPath], tuple[int, int, int, int, str]],
    ) -> None:
        self.trial = trial
        self.span = span
        self.data = data
        self.rule = rule
        self.check = check
        self.key = _key(check)

    def margin(self, data: Any) -> float | None:
        checks, _ = self.trial.checks(data, only=self.rule)
        for _, c in checks:
            if _key(c) == self.key:
                return c.margin if math.isfinite(c.margin) else None
        return None

    def data_for(self, f: NumberField, number: float) -> Any:
        """The raw record with ``f`` at ``number`` (and what moves with it)."""
        changes: dict[RecordPath, Any] = {f.path: f.text(number)}
        if (extra := self.coupled(f, number)) is not None:
            changes[extra[0].path] = extra[1]
        return with_fields(self.data, changes)

    def at(self, f: NumberField, number: float) -> tuple[Any, float | None]:
        data = self.data_for(f, number)
        return data, self.margin(data)

    def coupled(self, f: NumberField, number: float) -> tuple[NumberField, Any] | None:
        """A strand keeps its insulation build: the insulated diameter, width or height
        moves with the bare one (common practice, no source)."""
        if f.path[-1] not in INSULATED:
            return None
        ins = NumberField.read(self.data, (*f.path[:-1], INSULATED[str(f.path[-1])]))
        if ins is None:
            return None
        from emgate.units import convert

        build = convert(ins.raw, "length") - convert(f.raw, "length")
        bare = convert(f.text(number), "length")
        scale = convert(f"1 {ins.unit}", "length") if ins.unit else 1.0
        return ins, ins.text((bare + build) / scale)

    def solve(self, path: RecordPath) -> Remedy | None:
        f = NumberField.read(self.data, path, self.trial.design(self.data))
        if f is None or f.number == 0.0:
            return None
        base = self.check.margin
        name = ".".join(str(p) for p in path)

        def none(why: str) -> Remedy:
            return Remedy(self.rule, self.check.quantity, path, "none", old=str(f.raw), reason=why)

        # which way helps: a small step either way
        steps = [1.0, -1.0] if f.whole else [f.number * 0.02, -f.number * 0.02]
        probes = []
        for s in steps:
            _, m = self.at(f, f.number + s)
            probes.append(m)
        gains = [(m - base) if m is not None else -math.inf for m in probes]
        if all(g == -math.inf for g in gains):
            return none("the record is not valid with it moved either way")
        if max(abs(g) for g in gains if g != -math.inf) < 1e-12:
            return None  # does not move this check on this record: not a driver here
        if max(gains) <= 0.0:
            return none(f"moving {name} either way makes the check worse")
        up = gains[0] >= gains[1]

        lo, lo_margin = f.number, base  # failing side
        prev = lo
        hi: float | None = None
        cap = self._wire_cap(f, up)  # a round wire stays within the standard sizes
        k = 1
        while True:
            factor = STEP**k
            if factor > MAX_FACTOR * STEP:
                break
            x = f.number * min(factor, MAX_FACTOR) if up else f.number / min(factor, MAX_FACTOR)
            if f.whole:
                x = float(math.ceil(x) if up else math.floor(x))
                if x == lo:
                    x = lo + (1 if up else -1)
            if cap is not None and (x >= cap if up else x <= cap):
                x, factor = cap, MAX_FACTOR  # the last step
            _, m = self.at(f, x)
            if m is None:  # past the valid range: find its edge
                edge = self._edge(f, lo, x)
                if edge != lo:
                    _, m_edge = self.at(f, edge)
                    if m_edge is not None:
                        lo, lo_margin = edge, m_edge
                if lo != f.number and lo_margin >= 0.0:  # inside, if by less than the target
                    for digits in (3, 4, 5, 6):  # rounded towards the record's value
                        edge = lo if f.whole else round_away(lo, not up, digits)
                        m_edge = self.at(f, edge)[1]
                        if m_edge is not None and m_edge >= 0.0:
                            return self._finish(f, edge, "the furthest valid value this way")
                return none(
                    f"within its valid range ({f.text(lo)} is as far as it goes) the check"
                    f" stays beyond its limit (margin {lo_margin:+.1%} there)"
                )
            if m >= TARGET_MARGIN:
                hi = x
                break
            if m < lo_margin - 1e-12:  # past a peak (a two-sided check): find it
                best, best_margin = self._peak(f, prev, x)
                if best_margin < lo_margin:
                    best, best_margin = lo, lo_margin
                if best_margin >= TARGET_MARGIN:
                    lo, hi = (prev, best) if (best - lo) * (x - lo) <= 0 else (lo, best)
                    break
                if best_margin >= 0.0:
                    return self._finish(f, best, "the best value this way")
                return none(
                    f"the check is best near {f.text(best)} (margin {best_margin:+.1%}),"
                    " still beyond its limit"
                )
            prev, (lo, lo_margin) = lo, (x, m)
            if factor >= MAX_FACTOR:
                break
            k += 1
        if hi is None and cap is not None and lo == cap:
            return none(
                f"at the {'largest' if up else 'smallest'} standard size, {f.text(cap)}"
                f" ({WIRE_TABLE}), the check stays beyond its limit (margin {lo_margin:+.1%})"
            )
        if hi is None:
            return none(
                f"moved as far as {f.text(lo)} (the search stops at {MAX_FACTOR:g} times or"
                f" 1/{MAX_FACTOR:g} of its value) the check stays beyond its limit (margin"
                f" {lo_margin:+.1%})"
            )
        x = self._bisect(f, lo, hi)
        note = ""
        if f.whole:
            final = x
        elif self._wire(f):
            final, note = self._standard_wire(f, x, up)
            if math.isnan(final):
                return none(f"no standard wire size from {f.text(x)} on ({WIRE_TABLE})")
        else:
            final = round_away(x, up)
        return self._finish(f, final, note, rounded_from=x)

    def _bisect(self, f: NumberField, lo: float, hi: float) -> float:
        """The value between ``lo`` (failing) and ``hi`` (passing) nearest the target."""
        for _ in range(40):
            if f.whole:
                if abs(hi - lo) <= 1:
                    break
                mid = float(round((lo + hi) / 2))
            else:
                if abs(hi / lo - 1.0) <= TOLERANCE:
                    break
                mid = math.sqrt(lo * hi) if lo * hi > 0 else (lo + hi) / 2
            _, m = self.at(f, mid)
            if m is None:
                break  # a gap in the valid range: keep the passing end
            if m >= TARGET_MARGIN:
                hi = mid
            else:
                lo = mid
        return hi

    def _peak(self, f: NumberField, a: float, b: float) -> tuple[float, float]:
        """The value between ``a`` and ``b`` where the check's margin peaks, and that margin
        (golden-section search; one peak assumed, as for a two-sided difference)."""
        g = (math.sqrt(5.0) - 1.0) / 2.0
        best, best_margin = a, -math.inf

        def margin(x: float) -> float:
            nonlocal best, best_margin
            m = self.at(f, x)[1]
            m = -math.inf if m is None else m
            if m > best_margin:
                best, best_margin = x, m
            return m

        lo, hi = min(a, b), max(a, b)
        for _ in range(24):
            if (hi - lo) <= (1.0 if f.whole else TOLERANCE * abs(hi)):
                break
            x1, x2 = hi - g * (hi - lo), lo + g * (hi - lo)
            if f.whole:
                x1, x2 = float(math.floor(x1)), float(math.ceil(x2))
                if x1 == x2:
                    x2 += 1.0
            if margin(x1) >= margin(x2):
                hi = x2
            else:
                lo = x1
        for x in (lo, hi) if f.whole else ():
            margin(x)
        return best, best_margin

    def _edge(self, f: NumberField, valid: float, invalid: float) -> float:
        """The last valid value between ``valid`` and ``invalid``."""
        for _ in range(30):
            if f.whole and abs(invalid - valid) <= 1:
                return valid
            if not f.whole and abs(invalid / valid - 1.0) <= TOLERANCE:
                return valid
            mid = float(round((valid + invalid) / 2)) if f.whole else math.sqrt(valid * invalid)
            if self.trial.design(self.data_for(f, mid)) is None:
                invalid = mid
            else:
                valid = mid
        return valid

    def _wire(self, f: NumberField) -> bool:
        conductor = field_or_none(self.data, f.path[:-1])
        return (
            f.path[-1] == "bare_diameter"
            and isinstance(conductor, dict)
            and conductor.get("shape") == "round"
            and f.unit != ""
        )

    def _wire_cap(self, f: NumberField, up: bool) -> float | None:
        """The largest (``up``) or smallest standard wire size in the record's unit, for a
        round wire's bare diameter; None for any other field."""
        if not self._wire(f):
            return None
        from emgate.units import convert

        per_mm = convert(f"1 {f.unit}", "length") / 1e-3
        return float(number_text((max if up else min)(WIRE_DIAMETERS_MM) / per_mm))

    def _standard_wire(self, f: NumberField, x: float, up: bool) -> tuple[float, str]:
        """The next standard nominal diameter from ``x`` away from the limit, in the
        record's unit, and a note naming the table and the new insulated diameter."""
        from emgate.units import convert

        per_mm = convert(f"1 {f.unit}", "length") / 1e-3
        mm = x * per_mm
        sizes = [d for d in WIRE_DIAMETERS_MM if (d >= mm - 1e-9 if up else d <= mm + 1e-9)]
        if not sizes:
            return math.nan, ""
        d = min(sizes) if up else max(sizes)
        final = float(number_text(d / per_mm))
        c = self.coupled(f, final)
        note = f"standard size, {WIRE_TABLE}"
        if c is not None:
            note += f"; insulated {c[1]}"
        return final, note

    def _finish(
        self, f: NumberField, final: float, note: str, rounded_from: float | None = None
    ) -> Remedy:
        """The remedy at ``final``, verified with every rule: the check passes there, and
        what else fails there that passed on the record."""
        before = self.trial.baseline()
        after, clean = self.trial.checks(self.data_for(f, final))
        mine = next((c for r, c in after if r == self.rule and _key(c) == self.key), None)
        if mine is None or not mine.passed:
            was = f" ({f.text(rounded_from)} would)" if rounded_from is not None else ""
            return Remedy(
                self.rule,
                self.check.quantity,
                f.path,
                "none",
                old=str(f.raw),
                reason=f"{f.text(final)} does not pass once rounded{was}",
            )
        passed = {(r, _key(c)) for r, c in before if c.passed}
        labels = {(r, _key(c)): c.label for r, c in before}
        breaks = [
            f"{r}: {labels.get((r, _key(c)), c.label)}"
            for r, c in after
            if not c.passed and (r, _key(c)) in passed
        ]
        if not clean:
            breaks.append("a rule crashes at this value")
        edits = [self._edit(f.path, f.text(final))]
        if (c := self.coupled(f, final)) is not None:
            edits.append(self._edit(c[0].path, c[1]))
        return Remedy(
            self.rule,
            self.check.quantity,
            f.path,
            "fix",
            old=str(f.raw),
            new=str(f.text(final)),
            value=mine.value,
            margin=mine.margin,
            unit=mine.unit,
            edits=tuple(edits),
            breaks=tuple(dict.fromkeys(breaks)),
            note=note,
        )

    def _edit(self, path: RecordPath, new: Any) -> Edit:
        line, column, end_line, end_column, old = self.span(path)
        return Edit(path, line, column, end_line, end_column, old, str(new))
