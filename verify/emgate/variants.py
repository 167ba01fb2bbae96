"""Variants of one record: fields changed in its raw data, each variant through validation,
the calculation and every selected rule, as for a record of its own.

One piece of code for the sweeps (``emgate sweep``), the tolerance corners (the rule
``tolerance-corners``) and the remedies' trials (``emgate.remedies``): a variant is the
record's raw data with some fields set, so that the model and the plausibility pass validate
it (a variant either refuses is reported, not computed), and the rules see it exactly as they
would see a record with those values.
"""

from __future__ import annotations

import functools
import math
from collections.abc import Iterator, Mapping, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from emgate.errors import InputError, InputErrors
from emgate.fields import get_field, with_fields
from emgate.loader import Document

if TYPE_CHECKING:
    from emgate.config import RulePolicy
    from emgate.materials import Catalogue
    from emgate.model import AnyDesign
    from emgate.plugins import PluginSet
    from emgate.rule import Context, Rule
    from emgate.runner import RuleRun


@dataclass
class RuleVerdict:
    """One rule on one variant: its status, and the margin of its closest check (relative:
    positive inside the limit; None when it yielded no check)."""

    status: str  # pass, fail, crash, not_applicable
    margin: float | None = None
    quantity: str = ""  # the sheet name of its closest check
    message: str = ""


@dataclass
class VariantResult:
    """A variant: why it is not valid ('' when it is), its sheet, and each rule's verdict."""

    invalid: str = ""
    sheet: dict[str, float] = field(default_factory=dict)
    rules: dict[str, RuleVerdict] = field(default_factory=dict)

    @property
    def feasible(self) -> bool:
        return not self.invalid and all(
            v.status in ("pass", "not_applicable") for v in self.rules.values()
        )

    def binding(self) -> tuple[str, float] | None:
        """The rule whose closest check is closest to (or furthest past) its limit."""
        scored = [(v.margin, rid) for rid, v in self.rules.items() if v.margin is not None]
        if not scored:
            return None
        margin, rid = min(scored)
        return rid, margin


@dataclass
class Evaluator:
    """Evaluates variants of one loaded record under one run's plugins, policy and steels:
    the one way a variant is validated and run through the rules (sweeps, tolerance corners
    and the remedies' trials)."""

    doc: Document
    catalogue: Catalogue
    plugins: PluginSet
    policy: RulePolicy
    budget: float = 60.0
    #: rules not run on the variants (the tolerance rule itself)
    skip: frozenset[str] = frozenset()
    #: the file the rules are told (``Context.file``); the record's path when empty
    file: str = ""
    _options: dict[str, Any] = field(default_factory=dict, init=False, repr=False)

    def raw(self, path: Sequence[str | int]) -> Any:
        """The record's own value at ``path`` (as written: '0.45 mm'); KeyError if absent."""
        try:
            return get_field(self.doc.data, path)
        except (IndexError, TypeError):
            raise KeyError(path) from None

    def design(self, data: Any) -> AnyDesign:
        """``data`` (the record's raw data, changed) validated like the record itself, its
        steels resolved; InputError or InputErrors where it is not valid."""
        from emgate.validate import validate_design

        doc = Document(
            self.doc.path, data, self.doc.marks, self.doc.key_marks, self.doc.collections
        )
        design = validate_design(doc)
        self.catalogue.resolve(doc, design)
        return design

    def context(self, design: AnyDesign, *, plausible: bool = True) -> Context:
        """The rules' context of a validated variant. By default every sheet quantity is
        computed once and held to the plausibility a record file is held to (a variant the
        kernel cannot compute is invalid input, as that record would be, not a rule crash or
        a pass): InputErrors at the driving fields where it is not. ``plausible=False`` is
        for a search's intermediate trials only, whose answer is then checked in full."""
        from emgate.calc import Calculation
        from emgate.calc.view import Sheet
        from emgate.plausible import plausible_calculation
        from emgate.rule import Context

        if plausible:
            calc = plausible_calculation(self.doc, design, self.catalogue)
        else:
            calc = Calculation(design, self.catalogue)
        return Context(sheet=Sheet(calc), file=self.file or str(self.doc.path))

    def run(
        self, design: AnyDesign, context: Context, only: str | None = None
    ) -> Iterator[tuple[str, RuleRun | None]]:
        """Each selected rule not skipped (or only rule ``only``) on ``design``, in id order:
        its id and its run (None where it does not apply)."""
        from emgate.runner import run_rule

        for rid, loaded in sorted(self.plugins.rules.items()):
            rule = loaded.rule
            if rid in self.skip or (only is not None and rid != only):
                continue
            if not self.policy.selected(rule):
                continue
            builtin = loaded.pack.distribution == "emgate"
            yield (
                rid,
                run_rule(
                    rule,
                    design,
                    functools.partial(self._options_of, rule),
                    context,
                    self.budget,
                    builtin,
                ),
            )

    def _options_of(self, rule: type[Rule]) -> Any:
        """The policy's options of ``rule``, read once for all the variants."""
        if rule.id not in self._options:
            self._options[rule.id] = self.policy.options_for(rule)
        return self._options[rule.id]

    def evaluate(
        self, changes: Mapping[tuple[str | int, ...], Any], *, sheet: bool = True
    ) -> VariantResult:
        from emgate.findings import describe_check
        from emgate.rule import Check

        out = VariantResult()
        data = with_fields(self.doc.data, changes) if changes else self.doc.data
        try:
            design = self.design(data)
            context = self.context(design)
        except (InputError, InputErrors) as exc:
            errors = exc.errors if isinstance(exc, InputErrors) else [exc]
            first = errors[0]
            where = first.location.record_path if first.location else "$"
            out.invalid = f"{where}: {first.message}"
            return out
        for rid, ran in self.run(design, context):
            if ran is None:
                out.rules[rid] = RuleVerdict("not_applicable")
                continue
            severity = self.policy.severity_for(self.plugins.rules[rid].rule)
            verdict = RuleVerdict("pass")
            closest: Check | None = None
            for item in ran.items:
                if isinstance(item, Check):
                    if closest is None or item.margin < closest.margin:
                        closest = item
                    if not item.passed and severity == "error":
                        verdict.status, verdict.message = "fail", describe_check(item)
                elif (item.severity or severity) == "error":
                    verdict.status, verdict.message = "fail", item.message
            if closest is not None:
                verdict.margin, verdict.quantity = closest.margin, closest.quantity
            if ran.crash:
                verdict.status, verdict.message = "crash", ran.crash
            out.rules[rid] = verdict
        if sheet:
            for name in context.sheet:
                try:
                    out.sheet[name] = context.sheet[name]
                except (ValueError, ArithmeticError):  # an unbalanced winding's undefined
                    out.sheet[name] = math.nan
        return out
