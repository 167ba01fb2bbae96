"""Findings and the result of a run: the one structure every reporter reads."""

from __future__ import annotations

import hashlib
import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Literal

from emgate.errors import InputError, InputErrors, display_path
from emgate.rule import Check
from emgate.terms import EXIT_CRASH, EXIT_FINDINGS, EXIT_INPUT, EXIT_OK, Severity

if TYPE_CHECKING:
    from collections.abc import Callable, Iterable

    from emgate.remedy import Remedy

Status = Literal["pass", "fail", "waived", "crash", "not_applicable"]
DISCLAIMER = (
    "emgate results support, and do not replace, review by a qualified engineer under the"
    " applicable standards and local codes."
)


def fingerprint(rule: str, file: str, record_id: str, record_path: str) -> str:
    """Stable identity of a finding: survives edits that move lines."""
    text = "\x1f".join((rule, file, record_id, record_path))
    return hashlib.sha256(text.encode()).hexdigest()[:32]


@dataclass(slots=True)
class Finding:
    rule: str
    severity: Severity
    file: str
    line: int
    column: int
    record_path: str
    message: str
    record_id: str = ""
    kind: Literal["violation", "crash", "input", "waiver", "note"] = "violation"
    check: Check | None = None
    waived_by: str | None = None
    #: The file relative to the repository's root (:func:`anchor`), whatever the working
    #: folder; None where nobody anchored the finding (then :attr:`file` stands for it).
    repo_file: str | None = None
    #: For a failing check, what would fix it (``emgate.remedies``; empty with --remedies off).
    remedies: list[Remedy] = field(default_factory=list)

    @property
    def fingerprint(self) -> str:
        """Rule, file (from the repository root), record and record path, and the quantity
        of a check: two checks of one rule on one path (a minimum and a maximum) stay
        distinct; no line number, and the same from any working folder."""
        where = (
            self.record_path
            if self.check is None
            else (f"{self.record_path}#{self.check.quantity}:{self.check.bound}")
        )
        file = self.file if self.repo_file is None else self.repo_file
        return fingerprint(self.rule, file, self.record_id, where)

    def sort_key(self) -> tuple[str, int, int, str, str]:
        return (self.file, self.line, self.column, self.rule, self.message)


@dataclass(slots=True)
class RuleOutcome:
    rule: str
    status: Status
    checks: list[Check] = field(default_factory=list)
    message: str = ""
    #: Wall time of the rule's check, the shared calculation's quantities it was the first
    #: to ask for included (JUnit's time).
    seconds: float = 0.0


@dataclass(frozen=True, slots=True)
class RecordSummary:
    """What the summary reports (text, annotations, code quality) read of a record, kept in
    place of its outcomes when no other report is asked for: a large run's memory then
    holds a few hundred bytes a record, not its every check."""

    check_count: int
    closest: tuple[str, Check] | None
    rules_ran: frozenset[str]


@dataclass(slots=True)
class RecordResult:
    file: str
    record_id: str
    machine: str
    outcomes: list[RuleOutcome] = field(default_factory=list)
    #: Set by :meth:`summarised`, which drops the outcomes.
    summary: RecordSummary | None = None

    def check_count(self) -> int:
        if self.summary is not None:
            return self.summary.check_count
        return sum(len(o.checks) for o in self.outcomes)

    def closest(self) -> tuple[str, Check] | None:
        """The (rule, check) closest to its limit, or None when the record has no check."""
        if self.summary is not None:
            return self.summary.closest
        return closest_check((o.rule, c) for o in self.outcomes for c in o.checks)

    def rules_ran(self) -> frozenset[str]:
        """The rules that applied to the record (passed, failed, waived or crashed)."""
        if self.summary is not None:
            return self.summary.rules_ran
        return frozenset(o.rule for o in self.outcomes if o.status != "not_applicable")

    def summarised(self, interned: dict[frozenset[str], frozenset[str]]) -> RecordResult:
        """This record with its outcomes replaced by a :class:`RecordSummary`; ``interned``
        shares one set of rule ids among the records that ran the same rules."""
        ran = self.rules_ran()
        ran = interned.setdefault(ran, ran)
        summary = RecordSummary(self.check_count(), self.closest(), ran)
        return RecordResult(self.file, self.record_id, self.machine, [], summary)


def closest_check(checks: Iterable[tuple[str, Check]]) -> tuple[str, Check] | None:
    """The (rule, check) with the smallest margin to its limit, or None when there is none;
    ties go to the first given."""
    return min(checks, key=lambda rc: rc[1].margin, default=None)


@dataclass(frozen=True)
class RuleInfo:
    id: str
    version: str
    summary: str
    distribution: str
    distribution_version: str
    severity: Severity = "error"  # the rule's default, before the policy
    #: The rule's method statement (its docstring), and ``emgate explain`` as Markdown
    #: (method, sources, options), for the outputs that show a rule's help.
    description: str = ""
    help: str = ""
    #: Makes ``help`` when a report asks for it (SARIF alone shows it): rendering every
    #: rule's Markdown on every run cost about 11 ms of the start-up of a check.
    make_help: Callable[[], str] | None = field(default=None, compare=False, repr=False)

    def help_markdown(self) -> str:
        """``emgate explain`` as Markdown: ``help``, or else what ``make_help`` makes."""
        return self.help or (self.make_help() if self.make_help is not None else "")


@dataclass
class RunResult:
    records: list[RecordResult] = field(default_factory=list)
    findings: list[Finding] = field(default_factory=list)
    rules: list[RuleInfo] = field(default_factory=list)
    files_read: int = 0

    def sort(self) -> None:
        self.findings.sort(key=Finding.sort_key)
        self.records.sort(key=lambda r: (r.file, r.record_id))

    def active(self, severity: Severity) -> list[Finding]:
        return [f for f in self.findings if f.severity == severity and f.waived_by is None]

    @property
    def exit_code(self) -> int:
        """0 clean, 1 a rule found an error, 2 input or configuration, 3 a crash."""
        live = [f for f in self.findings if f.waived_by is None]
        if any(f.kind == "crash" for f in live):
            return EXIT_CRASH
        if any(f.kind == "input" for f in live):
            return EXIT_INPUT
        if any(f.severity == "error" for f in live):
            return EXIT_FINDINGS
        return EXIT_OK


def relative_file(path: Path) -> str:
    return display_path(path)


def describe_check(check: Check) -> str:
    """The words of a failed check: value, limit, basis and margin."""
    from emgate.units import format_value

    word = "exceeds the limit" if check.bound == "max" else "is below the minimum"
    basis = f" ({check.basis})" if check.basis else ""
    margin = (  # a limit of zero has no relative margin: say by how much instead
        f"margin {check.margin:+.1%}"
        if math.isfinite(check.margin)
        else f"off by {format_value(abs(check.value - check.limit), check.unit)}"
    )
    return (
        f"{check.label} {format_value(check.value, check.unit)} {word}"
        f" {format_value(check.limit, check.unit)}{basis}; {margin}"
    )


def source_root(start: Path) -> Path:
    """The root the files of a run are named from, away from this machine: the top of the
    git work tree holding ``start`` (what a CI service checks out), else ``start``."""
    here = start.resolve()
    for folder in (here, *here.parents):
        if (folder / ".git").exists():
            return folder
    return here


def anchor(result: RunResult, root: Path) -> None:
    """Name each finding's file relative to ``root`` too (an absolute path for a file
    outside it), so that SARIF locations and fingerprints do not depend on the folder
    emgate ran in."""
    top = root.resolve()
    for f in result.findings:
        if f.file:
            path = Path(f.file).resolve()
            try:
                f.repo_file = path.relative_to(top).as_posix()
            except ValueError:
                f.repo_file = path.as_posix()


def input_finding(exc: InputError) -> Finding:
    """An input error as a finding (exit 2), at its location when it has one."""
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
    return [input_finding(e) for e in errors]


def needing_remedies(findings: list[Finding]) -> list[Finding]:
    """The failing, unwaived checks among ``findings``: those a remedy is sought for."""
    return [
        f
        for f in findings
        if f.check is not None and not f.check.passed and f.waived_by is None
        and f.kind == "violation"
    ]  # fmt: skip
