"""The flow of one run: discover, load, validate, check, waive, collect.

Each stage has one home: loading in :mod:`emgate.loader`, validation in :mod:`emgate.validate`,
policy in :mod:`emgate.config`, plugins in :mod:`emgate.plugins`; this module only sequences
them and turns rule output into findings.
"""

from __future__ import annotations

import dataclasses
import datetime as dt
import re
import time
from collections.abc import Iterable
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Literal

from emgate.changes import ChangeSet
from emgate.config import CONFIG_NAME, Policy, RulePolicy
from emgate.errors import InputError, InputErrors, Location, display_path
from emgate.findings import (
    Finding,
    RecordResult,
    RuleInfo,
    RuleOutcome,
    RunResult,
    anchor,
    source_root,
)
from emgate.findings import describe_check as _describe
from emgate.listing import yaml_files
from emgate.loader import Document, load_text, read_text
from emgate.materials import Catalogue
from emgate.model import AnyDesign
from emgate.plugins import PluginSet, describe_exception
from emgate.rule import Check, Context, Rule
from emgate.runner import crash_text, rule_guards, run_rule
from emgate.terms import (
    CONFIG_SCHEMA,
    DESIGN_SCHEMA,
    MATERIALS_SCHEMA,
    WAIVERS_SCHEMA,
    RecordPath,
    Severity,
)
from emgate.variants import Evaluator
from emgate.waivers import (
    WaiverEntry,
    apply_waivers,
    invalid_waivers,
    load_waivers_file,
    record_waivers,
    unknown_record_waivers,
)

if TYPE_CHECKING:
    from emgate.calc import Calculation

_DECLARES = re.compile(r"^schema:\s*['\"]?(emgate/[a-z]+@\d+)", re.MULTILINE)
#: Rules not run on variants of a record (sweeps, tolerance corners): the one that re-runs
#: the others on variants, and the designer's declared figures, which are the nominal's.
TOLERANCE_RULES = frozenset({"tolerance-corners", "declared-values"})


@dataclass
class Source:
    path: Path
    text: str
    declared: str | None
    explicit: bool


@dataclass
class LoadedDesign:
    doc: Document
    design: AnyDesign
    file: str


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


def discover(
    paths: Iterable[Path],
    result: RunResult,
    policy: Policy | None = None,
    changes: ChangeSet | None = None,
    verbose: bool = False,
) -> list[Source]:
    """Files named, and *.yaml / *.yml under folders named, that declare an emgate schema.

    Fail closed: a file that is not a valid emgate file is an input error when it resembles
    one (a near-miss ``schema:`` value or key, a list root holding a record, a record's keys
    with no schema), and, in a configured repository, whenever the configuration's ``files``
    globs select it or it is named on the command line, unless ``ignore_files`` lists it.
    Otherwise it is skipped (with a note when named, or with ``verbose``). With a change
    set, only the files the change touches are held to this.
    """
    out: list[Source] = []
    seen: set[Path] = set()
    for root in paths:
        if root.is_dir():
            candidates = [p for p in yaml_files(root) if p.name != CONFIG_NAME]
            explicit = False
        elif root.exists():
            candidates, explicit = [root], True
        else:
            result.findings.append(_input_finding(InputError(f"no such file or folder: {root}")))
            continue
        for path in candidates:
            key = path.resolve()
            if key in seen:
                continue
            seen.add(key)
            if not explicit and not _within(path, root):
                result.findings.append(
                    _input_finding(
                        InputError(
                            f"a symbolic link leading outside {display_path(root)}: emgate"
                            " reads nothing outside the folders it checks",
                            Location(path, 1, 1, "$"),
                        )
                    )
                )
                continue
            try:
                text = read_text(path)
            except InputError as exc:
                result.findings.append(_input_finding(exc))
                continue
            m = _DECLARES.search(text[:4096])
            declared = m.group(1) if m and m.group(1) in _KNOWN else None
            if declared is None:
                declared, problem, near_miss = _classify(path, text)
                named = explicit or bool(changes and changes.named and key in changes.files)
                strict = _strict(path, named, policy)
                if problem is not None and not near_miss and _ignored(path, policy):
                    problem = None  # the team says it is no record (a fixture, a draft)
                if problem is None and strict is not None:
                    problem = InputError(
                        "not an emgate file (no 'schema: emgate/...' line at the top level):"
                        f" {strict}; list it under ignore_files in {CONFIG_NAME} if it is no"
                        " record",
                        Location(path, 1, 1, "$"),
                    )
                if problem is not None and _touched(changes, key):
                    result.findings.append(_input_finding(problem))
                    continue
            if declared is None:
                # a file named, or --verbose: say so, do not fail (pre-commit passes CI files)
                if explicit or verbose:
                    result.findings.append(
                        Finding(
                            "input",
                            "info",
                            display_path(path),
                            1,
                            1,
                            "$",
                            "skipped: not an emgate file (no 'schema: emgate/...' line)",
                            kind="note",
                        )
                    )
                continue
            if declared in (WAIVERS_SCHEMA, CONFIG_SCHEMA):
                continue  # read through the policy, not as records
            out.append(Source(path, text, declared, explicit))
    return out


#: Top-level keys of emgate records: a file holding one of them is meant as a record.
RECORD_KEYS = frozenset({"machine", "stator", "rotor", "winding", "air_gap", "steels"})
_KNOWN = (DESIGN_SCHEMA, MATERIALS_SCHEMA, WAIVERS_SCHEMA, CONFIG_SCHEMA)


def _within(path: Path, root: Path) -> bool:
    try:
        path.resolve().relative_to(root.resolve())
    except (ValueError, OSError):
        return False
    return True


def _touched(changes: ChangeSet | None, key: Path) -> bool:
    """Whether a change (if any) touches a file: an untouched file's problems are its own."""
    return changes is None or changes.everything or key in changes.files


def _ignored(path: Path, policy: Policy | None) -> bool:
    """Whether a configuration's ignore_files lists a file."""
    return policy is not None and policy.source is not None and policy.ignored(path)


def _strict(path: Path, named: bool, policy: Policy | None) -> str | None:
    """Why a non-emgate file is an error here (None: it may be skipped)."""
    if policy is None or policy.source is None or not policy.inside(path):
        return None
    if policy.ignored(path):
        return None
    if named:
        return "it is named inside a configured repository"
    if policy.selects(path):
        return f"the files globs of {CONFIG_NAME} select it"
    return None


def _classify(path: Path, text: str) -> tuple[str | None, InputError | None, bool]:
    """A file the schema-line scan misses: (the emgate schema it declares, or None; the
    reason it is a broken emgate file, or None when it does not resemble one; whether the
    reason is a near-miss schema key or value, an error even where ignore_files lists it)."""
    import difflib

    try:
        doc = load_text(path, text)
    except InputError as exc:
        if "emgate" in text.lower() and exc.location is not None:
            problem = InputError(f"not a valid emgate file: {exc.message}", exc.location)
            return None, problem, False
        return None, None, False
    data = doc.data
    if isinstance(data, list):
        if any(isinstance(item, dict) and _resembles(item) for item in data):
            problem = InputError(
                "expected a mapping with a 'schema' key at the top level, found a list holding"
                " a record: an emgate file holds one record, not a list",
                doc.locate(()),
            )
            return None, problem, False
        return None, None, False
    if not isinstance(data, dict):
        return None, None, False
    for k in data:
        if k != "schema" and k.strip().lower() == "schema":
            problem = InputError(
                f"key {k!r} is not 'schema': emgate reads the key in lower case, without"
                " spaces; did you mean 'schema'?",
                doc.locate_key((k,)),
            )
            return None, problem, True
    if "schema" not in data:
        if _resembles(data):
            problem = InputError(
                "a record's keys with no 'schema' key: expected 'schema: emgate/design@1'"
                " (or another emgate schema) at the top level",
                doc.locate(()),
            )
            return None, problem, False
        return None, None, False
    declared = data["schema"]
    if isinstance(declared, str) and declared in _KNOWN:
        return declared, None, False  # (flow style, JSON, CR line ends)
    looks = isinstance(declared, str) and "emgate" in declared.lower()
    if not looks and not _resembles(data):
        return None, None, False
    hint = ""
    if isinstance(declared, str):
        close = difflib.get_close_matches(declared.strip().lower(), _KNOWN, n=1, cutoff=0.6)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        if close and declared.strip().lower() != close[0]:
            hint += " (emgate reads version 1 of each schema)"
        hint += "; schema ids are lower case, without spaces"
    shown = (
        repr(declared)
        if isinstance(declared, str) and len(declared) <= 40
        else ("a list" if isinstance(declared, list) else type(declared).__name__)
    )
    problem = InputError(
        f"expected one of {', '.join(repr(s) for s in _KNOWN)}, found {shown}{hint}",
        doc.locate(("schema",)),
    )
    return None, problem, looks


def _resembles(data: dict) -> bool:
    return bool(RECORD_KEYS.intersection(data)) or (
        isinstance(data.get("schema"), str) and "emgate" in data["schema"].lower()
    )


_RECORD_ID = re.compile(r"^id:\s*['\"]?([a-z0-9][a-z0-9._-]*)", re.MULTILINE)


def _repository_record_ids(root: Path) -> set[str]:
    """Ids of every design record in the repository, checked in this run or not, so that a
    waiver for a record outside the run is not taken for a typo."""
    ids: set[str] = set()
    for src in discover([root], RunResult()):
        if src.declared == DESIGN_SCHEMA:
            ids.update(_RECORD_ID.findall(src.text))
    return ids


def repository_root(start: Path) -> Path | None:
    """The design repository a path belongs to: the folder of the nearest emgate.yaml, else
    the git work tree's top; None outside both (then no folder is searched for materials)."""
    here = (start if start.is_dir() else start.parent).resolve()
    for folder in (here, *here.parents):
        if (folder / CONFIG_NAME).is_file() or (folder / ".git").exists():
            return folder
    return None


def materials_sources(root: Path) -> list[Source]:
    """Every materials file under a repository root."""
    scratch = RunResult()
    return [s for s in discover([root], scratch) if s.declared == MATERIALS_SCHEMA]


def discover_materials(start: Path) -> Catalogue:
    """The steel catalogue of the repository holding ``start`` (for ``emgate show``)."""
    from emgate.validate import validate_materials

    catalogue = Catalogue()
    root = repository_root(start)
    for src in materials_sources(root) if root is not None else []:
        doc = load_text(src.path, src.text)
        catalogue.add_file(doc, validate_materials(doc))
    return catalogue


def _untouched_record(run: Run, src: Source) -> bool:
    """A design file outside a change: its load errors do not block this change."""
    changes = run.changes
    return (
        changes is not None
        and not changes.everything
        and src.declared == DESIGN_SCHEMA
        and src.path.resolve() not in changes.files
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


def _input_finding(exc: InputError) -> Finding:
    loc = exc.location
    return Finding(
        rule="input",
        severity="error",
        file=display_path(loc.file) if loc else "",
        line=loc.line if loc else 0,
        column=loc.column if loc else 0,
        record_path=loc.record_path if loc else "$",
        message=exc.message,
        kind="input",
    )


def input_findings(exc: InputError | InputErrors) -> list[Finding]:
    errors = exc.errors if isinstance(exc, InputErrors) else [exc]
    return [_input_finding(e) for e in errors]


def execute(run: Run) -> RunResult:
    """Run the gate over ``run.paths``; never raises for bad input or a failing rule."""
    from emgate.explain import explain_markdown
    from emgate.validate import schema_of, validate_materials

    result = RunResult()
    for error in run.plugins.errors:
        result.findings.append(_input_finding(error))
    for error in run.plugins.crashes:
        result.findings.append(dataclasses.replace(_input_finding(error), kind="crash"))
    result.rules = [
        RuleInfo(
            rid,
            lr.rule.version,
            lr.rule.summary,
            lr.pack.distribution,
            lr.pack.version,
            lr.rule.severity,
            lr.rule.explain(),
            explain_markdown(rid, lr),
        )
        for rid, lr in sorted(run.plugins.rules.items())
    ]
    sources = discover(run.paths, result, run.policy, run.changes, run.verbose)
    where = {id(src): src.path.resolve() for src in sources}  # each path resolved once
    named = set(where.values())
    # one root per folder: emgate.yaml's `files:` may name a thousand files in a few folders
    folders = {p if p.is_dir() else p.parent for p in run.paths if p.exists()}
    roots = {r for f in folders if (r := repository_root(f)) is not None}
    searched = {p.resolve() for p in run.paths if p.is_dir()}
    for root in sorted(roots):
        if root in searched:
            continue  # its materials files are among the sources already
        sources += [m for m in materials_sources(root) if m.path.resolve() not in named]
        named |= {m.path.resolve() for m in sources}
    result.files_read = len(sources)
    # Materials (and any file not declared a design) first: the catalogue is complete
    # before the first record is checked. Design files then stream through one at a time
    # (parsed, checked, dropped), in this process or in --jobs worker processes.
    docs: list[tuple[Source, Document, str]] = []
    designs: list[Source] = []
    for src in sources:
        if src.declared == DESIGN_SCHEMA:
            changes = run.changes
            if (
                changes is not None
                and not changes.everything
                and not changes.grades
                and where.get(id(src), src.path.resolve()) not in changes.files
            ):
                continue  # outside the change by its path alone: not even parsed
            designs.append(src)
            continue
        try:
            doc = load_text(src.path, src.text)
            kind = schema_of(doc)
            if kind == DESIGN_SCHEMA:  # its first schema line and its parsed key disagree
                raise InputError(
                    f"expected one schema: the first 'schema:' line says {src.declared!r},"
                    f" the parsed document {kind!r}",
                    doc.locate(("schema",)),
                )
            docs.append((src, doc, kind))
        except (InputError, InputErrors) as exc:
            result.findings.extend(input_findings(exc))
    file_waivers: dict[str, list[WaiverEntry]] = {}
    if run.policy.waivers_file is not None:
        try:
            file_waivers = load_waivers_file(run.policy.waivers_file)
        except (InputError, InputErrors) as exc:
            result.findings.extend(input_findings(exc))
    catalogue = Catalogue()
    for _, doc, kind in docs:
        if kind == MATERIALS_SCHEMA:
            try:
                catalogue.add_file(doc, validate_materials(doc))
            except (InputError, InputErrors) as exc:
                catalogue.failed.append(display_path(doc.path))
                result.findings.extend(input_findings(exc))
    del docs  # nothing below reads the materials documents again
    seen_ids: dict[str, str] = {}
    with rule_guards():
        from emgate.parallel import ordered_map

        def one(src: Source) -> RecordDone:
            return check_source(run, src, catalogue, file_waivers)

        for done in ordered_map(one, designs, run.jobs):
            if done.record_id is not None and done.record_id in seen_ids:
                # the same verdict as a serial run: a record whose id is taken is not checked
                result.findings.append(
                    _input_finding(
                        InputError(
                            f"record id {done.record_id!r} is already used by"
                            f" {seen_ids[done.record_id]}",
                            done.id_location,
                        )
                    )
                )
                continue
            if done.record_id is not None:
                seen_ids[done.record_id] = done.file
            result.findings.extend(done.findings)
            result.records.extend(done.records)
    if file_waivers:  # (only with a config: the waivers file is the config's)
        known = set(seen_ids) | _repository_record_ids(run.policy.root)
        result.findings.extend(
            _input_finding(e) for e in unknown_record_waivers(file_waivers, known)
        )
    if run.changes is None:
        if (
            not result.records
            and all(p.is_dir() for p in run.paths)
            and not any(f.kind == "input" and f.severity == "error" for f in result.findings)
        ):  # a glob or folder typo must not pass the gate with nothing checked
            looked = ", ".join(display_path(p) for p in run.paths) or "the files emgate.yaml names"
            result.findings.append(
                _input_finding(
                    InputError(
                        f"no design record (a YAML file with 'schema: {DESIGN_SCHEMA}')"
                        f" found in {looked}"
                    )
                )
            )
    anchor(result, run_root(run))
    result.sort()
    return result


@dataclass
class RecordDone:
    """What checking one design file gave, for the run to collect in order: its findings
    and record result, and the id it claims (None when it did not validate)."""

    file: str
    findings: list[Finding] = field(default_factory=list)
    records: list[RecordResult] = field(default_factory=list)
    record_id: str | None = None
    id_location: Location | None = None


def check_source(
    run: Run, src: Source, catalogue: Catalogue, file_waivers: dict[str, list[WaiverEntry]]
) -> RecordDone:
    """Load, validate and check one design file; never raises for the record's own faults.
    The id it claims is compared with the other records' by the caller, in file order."""
    from emgate.plausible import plausible_calculation
    from emgate.validate import schema_of, validate_design

    done = RecordDone(display_path(src.path))
    try:
        doc = load_text(src.path, src.text)
        kind = schema_of(doc)
    except (InputError, InputErrors) as exc:
        if not _untouched_record(run, src):  # a broken record outside a change is its author's
            done.findings.extend(input_findings(exc))
        return done
    if kind != DESIGN_SCHEMA:  # its first schema line and its parsed key disagree
        done.findings.append(
            _input_finding(
                InputError(
                    f"expected one schema: the first 'schema:' line says {DESIGN_SCHEMA!r},"
                    f" the parsed document {kind!r}",
                    doc.locate(("schema",)),
                )
            )
        )
        return done
    if run.changes is not None and not run.changes.touches(doc.path, doc.data):
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
        partial.findings.extend(_input_finding(e) for e in bad)
        _check_design(run, ld, calc, partial, waivers)
    except (InputError, InputErrors) as exc:
        partial.findings.extend(input_findings(exc))
    except Exception as exc:
        partial.findings.append(_record_failure(doc, "crash", exc, design.id))
    done.findings.extend(partial.findings)
    done.records = partial.records
    return done


def run_root(run: Run) -> Path:
    """What a run's files are named from in SARIF and fingerprints: the git work tree of the
    policy's folder, else of the first path, else the working folder."""
    if run.policy.source is not None:
        return source_root(run.policy.root)
    first = next((p for p in run.paths if p.exists()), Path.cwd())
    return source_root(first if first.is_dir() else first.parent)


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
    if run.remedies:
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
