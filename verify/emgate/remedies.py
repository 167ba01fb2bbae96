"""Remedies: for a failing numeric check, the value of one record field that alone brings it
back inside its limit, solved through the full calculation.

For each failing :class:`~emgate.rule.Check`, the fields that drive it are the ``drivers``
its sheet entry declares (``emgate.calc.names``), or, for an entry that declares none, the
check's own record path when that is a number in the record. For up to three of them that
the record writes as numbers, the field is moved alone: each trial value is written into a
copy of the raw record in the record's own unit, validated like the record itself (model,
then physical consistency, so a value outside the field's valid range is never suggested),
recomputed, and the rule re-run. The search brackets the value in the direction that
improves the check, bisects to :data:`TARGET_MARGIN` inside the limit, then rounds away
from the limit: counts to whole numbers, a round wire's bare diameter to the next standard
nominal diameter (its insulation build kept), other values to three significant figures.
The suggestion is verified once more with every rule, and marked with the checks it makes
fail that passed before. A field that moves the check but cannot bring it inside its limit
within its valid range says so.

The drivers are declared, not traced: a trace of what a quantity reads through ``c.d``
lists every input (stacking factor, steel grade, ambient, slot opening), where a designer
asks for the few fields they would change; ``tests/test_remedies.py`` holds each declared
driver to the calculation (it moves its quantity on a bundled record), and the search skips
a declared field that does not move the check on the record at hand.

Other front ends use :func:`remedies_for`: each :class:`Remedy` carries its :class:`Edit`
s, the text to replace and where (1-based line and column, end exclusive, as SARIF counts;
:meth:`Edit.lsp_range` gives the 0-based range a language server wants).
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from emgate.remedy import Edit, Remedy
from emgate.terms import RecordPath

if TYPE_CHECKING:
    from emgate.config import RulePolicy
    from emgate.findings import Finding, RunResult
    from emgate.loader import Document
    from emgate.materials import Catalogue
    from emgate.model import AnyDesign
    from emgate.plugins import PluginSet
    from emgate.rule import Check
    from emgate.variants import Evaluator

#: How far inside its limit a remedy puts the check (relative margin; common practice, no
#: source: enough that rounding and the next review's small changes keep it inside).
TARGET_MARGIN = 0.02
#: Fields tried per failing check.
MAX_FIELDS = 3
#: The furthest a field is moved, as a factor of its value either way.
MAX_FACTOR = 20.0
#: Geometric step of the bracket search.
STEP = 1.5
#: Relative width at which the bisection stops.
TOLERANCE = 2e-3

#: Nominal bare diameters of round enamelled winding wire [mm] from 0.1 to 5 mm: the R 20
#: preferred and R 40 intermediate sizes [mem: IEC 60317-0-1, table of nominal conductor
#: diameters; the R 40 series of ISO 3].
_R40 = (1.00, 1.06, 1.12, 1.18, 1.25, 1.32, 1.40, 1.50, 1.60, 1.70, 1.80, 1.90, 2.00, 2.12,
        2.24, 2.36, 2.50, 2.65, 2.80, 3.00, 3.15, 3.35, 3.55, 3.75, 4.00, 4.25, 4.50, 4.75,
        5.00, 5.30, 5.60, 6.00, 6.30, 6.70, 7.10, 7.50, 8.00, 8.50, 9.00, 9.50)  # fmt: skip
WIRE_DIAMETERS_MM: tuple[float, ...] = tuple(
    round(v * decade, 4) for decade in (0.1, 1.0) for v in _R40 if v * decade <= 5.0
)
WIRE_TABLE = "IEC 60317-0-1, from memory"

#: The insulated dimension of a strand that moves with each bare one.
_INSULATED = {
    "bare_diameter": "insulated_diameter",
    "width": "insulated_width",
    "height": "insulated_height",
}
_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")


def remedies_for(finding: Finding) -> list[Remedy]:
    """The remedies of a finding (empty unless it is a failing check and the run computed
    remedies): the one call the HTML sheet and the language server need."""
    return list(finding.remedies)


def remedies_for_check(result: RunResult, check: Check) -> list[Remedy]:
    """The remedies of a check of a rule's outcome (``RecordResult.outcomes[i].checks``), as
    the HTML sheet reads checks: those of the finding that reports it (empty for a passing
    or waived check)."""
    return next((list(f.remedies) for f in result.findings if f.check is check), [])


def summary(remedies: Iterable[Remedy]) -> str:
    """A line for a check no single field can fix ('' otherwise)."""
    rs = list(remedies)
    if rs and all(r.status == "none" for r in rs):
        names = ", ".join(r.field_name for r in rs if r.field)
        return f"no single field can fix this check (tried {names or 'none'})"
    return ""


def report_lines(finding: Finding) -> list[str]:
    """The remedy lines a report shows under a finding."""
    rs = remedies_for(finding)
    lines = [r.describe() for r in rs]
    if (text := summary(rs)) != "":
        lines.append(text)
    return lines


# --- the search ------------------------------------------------------------------------


class _Trial:
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


def _get(data: Any, path: RecordPath) -> Any:
    for p in path:
        if isinstance(data, dict) and p in data:
            data = data[p]
        elif isinstance(data, list) and isinstance(p, int) and 0 <= p < len(data):
            data = data[p]
        else:
            return None
    return data


def _attr(model: Any, path: RecordPath) -> Any:
    for p in path:
        model = getattr(model, str(p), None)
    return model


def _set(data: Any, path: RecordPath, value: Any) -> Any:
    """A copy of ``data`` with ``value`` at ``path`` (only the containers along it copied)."""
    if not path:
        return value
    head, rest = path[0], path[1:]
    out = dict(data) if isinstance(data, dict) else list(data)
    out[head] = _set(data[head], rest, value)  # type: ignore[index]
    return out


@dataclass
class NumberField:
    """A numeric field as the record writes it: the number, its unit text, whole or not."""

    path: RecordPath
    number: float
    unit: str
    whole: bool
    raw: Any

    @classmethod
    def read(cls, data: Any, path: RecordPath, design: Any = None) -> NumberField | None:
        """The field at ``path`` of the raw record, or None where it is not a number; a
        count is one the validated ``design`` holds as an int (a float field may be
        written '4')."""
        raw = _get(data, path)
        if isinstance(raw, bool):
            return None
        if isinstance(raw, int):
            whole = design is None or isinstance(_attr(design, path), int)
            return cls(path, float(raw), "", whole, raw)
        if isinstance(raw, float):
            return cls(path, raw, "", False, raw)
        if isinstance(raw, str) and (m := _NUMBER.match(raw)) is not None:
            if m.group(2) in ("degC", "°C", "degF"):  # affine: not scaled by a factor
                return None
            return cls(path, float(m.group(1)), m.group(2), False, raw)
        return None

    def text(self, number: float) -> Any:
        """The record value for ``number``, in the record's own style."""
        if self.whole:
            return int(number)
        if not self.unit and isinstance(self.raw, float):
            return float(_fmt(number))
        return f"{_fmt(number)} {self.unit}" if self.unit else _fmt(number)


def _fmt(x: float) -> str:
    return f"{x:.6g}"


def _round_away(x: float, up: bool, digits: int = 3) -> float:
    """``x`` rounded to ``digits`` significant figures, away from the limit."""
    if x == 0.0:
        return x
    scale = 10.0 ** (math.floor(math.log10(abs(x))) - digits + 1)
    q = x / scale
    q = math.ceil(q - 1e-9) if up else math.floor(q + 1e-9)
    return float(f"{q * scale:.{digits + 2}g}")


class _Search:
    """Moving one field of one record to fix one check."""

    def __init__(
        self,
        trial: _Trial,
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
        data = _set(self.data, f.path, f.text(number))
        extra = self.coupled(f, number)
        if extra is not None:
            data = _set(data, extra[0].path, extra[1])
        return data

    def at(self, f: NumberField, number: float) -> tuple[Any, float | None]:
        data = self.data_for(f, number)
        return data, self.margin(data)

    def coupled(self, f: NumberField, number: float) -> tuple[NumberField, Any] | None:
        """A strand keeps its insulation build: the insulated diameter, width or height
        moves with the bare one (common practice, no source)."""
        if f.path[-1] not in _INSULATED:
            return None
        ins = NumberField.read(self.data, (*f.path[:-1], _INSULATED[str(f.path[-1])]))
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
                        edge = lo if f.whole else _round_away(lo, not up, digits)
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
            final = _round_away(x, up)
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
            data = _set(self.data, f.path, f.text(mid))
            if (c := self.coupled(f, mid)) is not None:
                data = _set(data, c[0].path, c[1])
            if self.trial.design(data) is None:
                invalid = mid
            else:
                valid = mid
        return valid

    def _wire(self, f: NumberField) -> bool:
        conductor = _get(self.data, f.path[:-1])
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
        return float(_fmt((max if up else min)(WIRE_DIAMETERS_MM) / per_mm))

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
        final = float(_fmt(d / per_mm))
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


def scalar_spans(text: str) -> dict[tuple[int, int], tuple[int, int, str]]:
    """Each scalar's start (0-based line, column) -> its end (exclusive) and source text."""
    import yaml

    lines = text.splitlines(keepends=True)
    out: dict[tuple[int, int], tuple[int, int, str]] = {}
    loader = yaml.CSafeLoader(text)
    try:
        while (event := loader.get_event()) is not None:
            s, e = event.start_mark, event.end_mark
            if isinstance(event, yaml.ScalarEvent) and s is not None and e is not None:
                source = lines[s.line][s.column : e.column] if s.line == e.line else event.value
                out[(s.line, s.column)] = (e.line, e.column, source)
    finally:
        loader.dispose()
    return out


def drivers(check: Check, data: Any) -> list[RecordPath]:
    """The fields that drive a check and that the record writes as numbers, first three:
    the check's own path where it is a number, then its sheet entry's declared drivers. A
    check of a figure in the record's ``declared`` block is fixed there: the calculation
    never reads that block, so its drivers are not what the check is about."""
    from emgate.calc.core import SHEET

    own = tuple(check.path)
    if own[:1] == ("declared",):
        return [own] if NumberField.read(data, own) is not None else []
    entry = SHEET.get(check.quantity)
    named: list[RecordPath] = [tuple(d.split(".")) for d in entry.drivers] if entry else []
    paths = list(dict.fromkeys([own, *named]))
    return [p for p in paths if NumberField.read(data, p) is not None][:MAX_FIELDS]


def attach_remedies(
    doc: Document,
    catalogue: Catalogue,
    policy: RulePolicy,
    plugins: PluginSet,
    file: str,
    budget: float,
    findings: list[Finding],
) -> None:
    """Compute the remedies of every failing, unwaived check among ``findings`` of one
    record and attach them (``Finding.remedies``)."""
    from emgate.loader import read_text

    failing = [
        f
        for f in findings
        if f.check is not None and not f.check.passed and f.waived_by is None
        and f.kind == "violation"
    ]  # fmt: skip
    if not failing:
        return
    from emgate.variants import Evaluator

    # no rule skipped (declared-values' checks have remedies too); the tolerance rule, given
    # no variants of a trial, yields no check there
    trial = _Trial(Evaluator(doc, catalogue, plugins, policy, budget, file=file))
    spans: dict[tuple[int, int], tuple[int, int, str]] | None = None

    def span(path: RecordPath) -> tuple[int, int, int, int, str]:
        nonlocal spans
        if spans is None:
            spans = scalar_spans(read_text(doc.path))
        line, column = doc.marks[tuple(path)]
        end_line, end_column, old = spans[(line, column)]
        return line + 1, column + 1, end_line + 1, end_column + 1, old

    for f in failing:
        assert f.check is not None
        search = _Search(trial, doc.data, f.rule, f.check, span)
        out: list[Remedy] = []
        fields = drivers(f.check, doc.data)
        if not fields:
            why = "the check names no field the record writes as a number"
            out.append(Remedy(f.rule, f.check.quantity, (), "none", reason=why))
        for path in fields:
            try:
                remedy = search.solve(path)
            except Exception as exc:  # a remedy is advice: never a reason to fail the run
                remedy = Remedy(
                    f.rule, f.check.quantity, path, "none", reason=f"not computed ({exc})"
                )
            if remedy is not None:
                out.append(remedy)
        if fields and not out:
            names = ", ".join(".".join(map(str, p)) for p in fields)
            why = f"none of its fields ({names}) moves this check on this record"
            out.append(Remedy(f.rule, f.check.quantity, (), "none", reason=why))
        f.remedies = out


def sarif_fixes(finding: Finding, artifact: dict[str, str]) -> list[dict[str, Any]]:
    """SARIF 2.1.0 ``fixes`` of a finding: one per remedy that fixes it, each replacing the
    scalar at its line and column with the new value (a remedy that breaks another check
    says so in its description)."""
    out: list[dict[str, Any]] = []
    for r in remedies_for(finding):
        if r.status != "fix":
            continue
        replacements = [
            {
                "deletedRegion": {
                    "startLine": e.line,
                    "startColumn": e.column,
                    "endLine": e.end_line,
                    "endColumn": e.end_column,
                },
                "insertedContent": {"text": e.new},
            }
            for e in r.edits
        ]
        out.append(
            {
                "description": {"text": r.describe()},
                "artifactChanges": [{"artifactLocation": artifact, "replacements": replacements}],
            }
        )
    return out
