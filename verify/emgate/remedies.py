"""Remedies: for a failing numeric check, the value of one record field that alone brings it
back inside its limit, solved through the full calculation.

For each failing :class:`~emgate.rule.Check`, the fields that drive it are the ``drivers``
its sheet entry declares (``emgate.calc.names``), or, for an entry that declares none, the
check's own record path when that is a number in the record. For up to three of them that
the record writes as numbers, the field is moved alone: each trial value is written into a
copy of the raw record in the record's own unit, validated like the record itself (model,
then physical consistency, so a value outside the field's valid range is never suggested),
recomputed, and the rule re-run. The search (:mod:`emgate.remedy_search`) brackets the
value in the direction that improves the check, bisects to
:data:`~emgate.remedy_search.TARGET_MARGIN` inside the limit, then rounds away from the limit:
counts to whole numbers, a round wire's bare diameter to the next standard nominal diameter
(its insulation build kept), other values to three significant figures.
The suggestion is verified once more with every rule, and marked with the checks it makes
fail that passed before. A field that moves the check but cannot bring it inside its limit
within its valid range says so.

The drivers are declared, not traced: a trace of what a quantity reads through ``c.d``
lists every input (stacking factor, steel grade, ambient, slot opening), where a designer
asks for the few fields they would change; ``tests/test_remedies.py`` holds each declared
driver to the calculation (it moves its quantity on a bundled record), and the search skips
a declared field that does not move the check on the record at hand.

Other front ends read them through :func:`emgate.remedy_report.remedies_for`: each
:class:`~emgate.remedy.Remedy` carries its :class:`~emgate.remedy.Edit` s, the text to replace
and where (1-based line and column, end exclusive, as SARIF counts;
:meth:`Edit.lsp_range` gives the 0-based range a language server wants).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from emgate.remedy import Remedy
from emgate.remedy_fields import NumberField
from emgate.remedy_search import Search, Trial
from emgate.terms import RecordPath

if TYPE_CHECKING:
    from emgate.config import RulePolicy
    from emgate.findings import Finding
    from emgate.loader import Document
    from emgate.materials import Catalogue
    from emgate.plugins import PluginSet
    from emgate.rule import Check

#: Fields tried per failing check.
MAX_FIELDS = 3


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
    from emgate.findings import needing_remedies
    from emgate.loader import read_text

    failing = needing_remedies(findings)
    if not failing:
        return
    from emgate.variants import Evaluator

    # no rule skipped (declared-values' checks have remedies too); the tolerance rule, given
    # no variants of a trial, yields no check there
    trial = Trial(Evaluator(doc, catalogue, plugins, policy, budget, file=file))
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
        search = Search(trial, doc.data, f.rule, f.check, span)
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
