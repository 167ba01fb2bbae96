"""The per-record pipeline of a run: one design file loaded, validated, held to plausibility,
checked by every selected rule, its findings waived and given their remedies.

Each record is isolated: whatever goes wrong on it (its own input, a rule, emgate itself) is
reported on that record and the other records are checked. :mod:`emgate.engine` runs this on
each design file and collects the results in file order.
"""

from __future__ import annotations

import datetime as dt
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Literal

from emgate.changes import ChangeSet
from emgate.config import Policy, RulePolicy
from emgate.discovery import Source
from emgate.errors import InputError, InputErrors, Location, display_path
from emgate.findings import (
    Finding,
    RecordResult,
    RuleOutcome,
    RunResult,
    input_finding,
    input_findings,
    needing_remedies,
)
from emgate.findings import describe_check as _describe
from emgate.loader import Document, load_text, read_text
from emgate.materials import Catalogue
from emgate.model import AnyDesign
from emgate.plugins import PluginSet, describe_exception
from emgate.rule import Check, Context, Rule
from emgate.runner import crash_text, run_rule
from emgate.terms import DESIGN_SCHEMA, RecordPath, Severity
from emgate.variants import Evaluator
from emgate.waivers import WaiverEntry, apply_waivers, invalid_waivers, record_waivers

if TYPE_CHECKING:
    from emgate.calc import Calculation

#: Rules not run on variants of a record (sweeps, tolerance corners): the one that re-runs
#: the others on variants, and the designer's declared figures, which are the nominal's.
TOLERANCE_RULES = frozenset({"tolerance-corners", "declared-values"})


@dataclass
class Run:
    """Inputs of a run; ``today`` is injectable so waiver expiry is testable."""

    paths: list[Path]
    policy: Policy
    plugins: PluginSet
    today: dt.date = field(default_factory=dt.date.today)
    #: With --changed-since, only the records the change touches are checked (and a waiver
    #: for a record outside the run is not reported as unknown).
    changes: ChangeSet | None = None
    #: Also report the YAML files under a folder that are not emgate files (--verbose).
    verbose: bool = False
    #: Worker processes for the records (1: this process); the report is the same.
    jobs: int = 1
    #: Compute a remedy for each failing check (``emgate check --remedies off`` skips it).
    remedies: bool = True
    #: Keep every record's outcomes (False: a :class:`~emgate.findings.RecordSummary`, all
    #: that the summary reports read, when only they are asked for).
    details: bool = True
    #: Write each design record's findings and result to the run's
    #: :class:`~emgate.findings.Spool` on disk as the record is done, instead of keeping them
    #: (when every report asked for reads them through ``each_finding``/``each_record``).
    spool: bool = False


@dataclass
class LoadedDesign:
    doc: Document
    design: AnyDesign
    file: str


@dataclass
class RecordDone:
    """What checking one design file gave, for the run to collect in order: its findings
    and record result, and the id it claims (None when it did not validate)."""

    file: str
    findings: list[Finding] = field(default_factory=list)
    records: list[RecordResult] = field(default_factory=list)
    record_id: str | None = None
    id_location: Location | None = None
    #: The id of a record a change leaves alone, as parsed: a changed record may not take it.
    untouched_id: str | None = None


def check_source(
    run: Run, src: Source, catalogue: Catalogue, file_waivers: dict[str, list[WaiverEntry]]
) -> RecordDone:
    """Load, validate and check one design file; never raises for the record's own faults.
    The id it claims is compared with the other records' by the caller, in file order."""
    from emgate.plausible import plausible_calculation
    from emgate.validate import schema_of, validate_design

    path = src.path
    done = RecordDone(display_path(path, src.key))
    try:
        # read again: discovery keeps no design's text (the file's checks are the same)
        doc = load_text(path, read_text(path) if src.text is None else src.text)
        kind = schema_of(doc)
    except (InputError, InputErrors) as exc:
        if not _untouched_record(run, src):  # a broken record outside a change is its author's
            done.findings.extend(input_findings(exc))
        return done
    if kind != DESIGN_SCHEMA:  # its first schema line and its parsed key disagree
        done.findings.append(
            input_finding(
                InputError(
                    f"expected one schema: the first 'schema:' line says {DESIGN_SCHEMA!r},"
                    f" the parsed document {kind!r}",
                    doc.locate(("schema",)),
                )
            )
        )
        return done
    if run.changes is not None and not run.changes.touches(doc.path, doc.data):
        rid = doc.data.get("id") if isinstance(doc.data, dict) else None
        done.untouched_id = rid if isinstance(rid, str) else None
        return done
    partial = RunResult()
    try:
        design = validate_design(doc)
        catalogue.resolve(doc, design)
        calc = plausible_calculation(doc, design, catalogue)
    except (InputError, InputErrors) as exc:
        done.findings.extend(input_findings(exc))
        return done
    except (ValueError, ArithmeticError) as exc:  # absurd numbers validation let through
        done.findings.append(_record_failure(doc, "input", exc))
        return done
    except Exception as exc:  # emgate's own bug: this record only, the others go on
        done.findings.append(_record_failure(doc, "crash", exc))
        return done
    done.record_id, done.id_location = design.id, doc.locate(("id",))
    ld = LoadedDesign(doc, design, done.file)
    try:
        waivers = record_waivers(doc, design.id, list(design.waivers))
        waivers += file_waivers.get(design.id, [])
        waivers, bad = invalid_waivers(waivers, run.plugins.rules, doc)
        partial.findings.extend(input_finding(e) for e in bad)
        _check_design(run, ld, calc, partial, waivers)
    except (InputError, InputErrors) as exc:
        partial.findings.extend(input_findings(exc))
    except Exception as exc:
        partial.findings.append(_record_failure(doc, "crash", exc, design.id))
    done.findings.extend(partial.findings)
    done.records = partial.records
    return done


def _untouched_record(run: Run, src: Source) -> bool:
    """A design file outside a change: its load errors do not block this change."""
    changes = run.changes
    return (
        changes is not None
        and not changes.everything
        and src.declared == DESIGN_SCHEMA
        and Path(src.key) not in changes.files
    )


def _record_failure(
    doc: Document, kind: Literal["input", "crash"], exc: Exception, record_id: str = ""
) -> Finding:
    """A record that could not be checked, reported on that record alone: exit 2 when its
    input caused it (a number the physics cannot take), exit 3 for emgate's own error."""
    loc = doc.locate(())
    if kind == "input":
        message = (
            f"the record could not be checked: {describe_exception(exc)}; a value is"
            " outside what the calculation can take (check the record's numbers)"
        )
    else:
        message = (
            f"internal error on this record: {crash_text(exc)}; the record is not"
            " verified (the other records are; please report it)"
        )
    return Finding(
        rule="input" if kind == "input" else "internal",
        severity="error",
        file=display_path(doc.path),
        line=loc.line,
        column=loc.column,
        record_path=loc.record_path,
        message=message,
        record_id=record_id,
        kind=kind,
    )


def _check_design(
    run: Run,
    ld: LoadedDesign,
    calc: Calculation,
    result: RunResult,
    waivers: list[WaiverEntry],
) -> None:
    """Every selected rule on one record. ``calc`` is the record's calculation as the
    plausibility pass filled it: the rules read those values, not a second computation."""
    from emgate.calc.view import Sheet

    design = ld.design
    policy = run.policy.for_file(ld.doc.path)
    record = RecordResult(ld.file, design.id, design.machine)
    result.records.append(record)
    variants = Evaluator(
        ld.doc, calc.catalogue, run.plugins, policy, run.policy.rule_time_budget, TOLERANCE_RULES
    )
    context = Context(Sheet(calc), ld.file, variants)
    produced: list[Finding] = []
    try:
        for _, loaded in sorted(run.plugins.rules.items()):
            builtin = loaded.pack.distribution == "emgate"
            _check_rule(run, ld, policy, loaded.rule, context, record, produced, builtin)
    finally:  # an error of emgate's own keeps what the rules before it found
        result.findings.extend(apply_waivers(waivers, produced, record, run.today))
    if run.remedies and needing_remedies(produced):  # the remedies' modules only then
        from emgate.remedies import attach_remedies

        budget = run.policy.rule_time_budget
        attach_remedies(ld.doc, calc.catalogue, policy, run.plugins, ld.file, budget, produced)


def _check_rule(
    run: Run,
    ld: LoadedDesign,
    policy: RulePolicy,
    rule: type[Rule],
    context: Context,
    record: RecordResult,
    produced: list[Finding],
    builtin: bool = False,
) -> None:
    """Run one rule on one record: its findings go to ``produced``, its outcome to
    ``record``. Whatever the rule does (raises anything, yields rubbish, overruns its time
    budget) is a crash of that rule, and the checks it yielded before stand."""
    rid = rule.id
    if not policy.selected(rule):
        return
    started = time.perf_counter()
    ran = run_rule(
        rule,
        ld.design,
        lambda: policy.options_for(rule),
        context,
        run.policy.rule_time_budget,
        builtin,
    )
    if ran is None:
        record.outcomes.append(RuleOutcome(rid, "not_applicable"))
        return
    severity = policy.severity_for(rule)
    outcome = RuleOutcome(rid, "pass")
    outcome.seconds = time.perf_counter() - started
    for item in ran.items:
        if isinstance(item, Check):
            outcome.checks.append(item)
            if not item.passed:
                produced.append(_finding(ld, rid, severity, item.path, _describe(item), item))
        else:
            produced.append(_finding(ld, rid, item.severity or severity, item.path, item.message))
    if ran.crash:
        message = f"rule crashed: {ran.crash}; the record is not verified by this rule"
        outcome.status, outcome.message = "crash", message
        produced.append(_finding(ld, rid, "error", (), message, kind="crash"))
    elif any(f.rule == rid for f in produced):
        outcome.status = "fail"
    record.outcomes.append(outcome)


def _finding(
    ld: LoadedDesign,
    rule: str,
    severity: Severity,
    path: RecordPath,
    message: str,
    check: Check | None = None,
    kind: Literal["violation", "crash"] = "violation",
) -> Finding:
    loc = ld.doc.locate(path)
    return Finding(
        rule=rule,
        severity=severity,
        file=ld.file,
        line=loc.line,
        column=loc.column,
        record_path=loc.record_path,
        message=message,
        record_id=ld.design.id,
        kind=kind,
        check=check,
    )
