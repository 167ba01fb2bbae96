"""Findings and the result of a run: the one structure every reporter reads (with the spool
that holds a large run's records on disk)."""

from __future__ import annotations

import hashlib
import heapq
import math
import os
from dataclasses import dataclass, field
from pathlib import Path
from typing import IO, TYPE_CHECKING, Any, Literal

from emgate.errors import InputError, InputErrors, display_path
from emgate.pickling import by_fields
from emgate.rule import Check
from emgate.terms import EXIT_CRASH, EXIT_FINDINGS, EXIT_INPUT, EXIT_OK, Severity

if TYPE_CHECKING:
    from collections.abc import Callable, Iterable, Iterator

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


@by_fields
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


@by_fields
@dataclass(slots=True)
class RuleOutcome:
    rule: str
    status: Status
    checks: list[Check] = field(default_factory=list)
    message: str = ""
    #: Wall time of the rule's check, the shared calculation's quantities it was the first
    #: to ask for included (JUnit's time).
    seconds: float = 0.0


@by_fields
@dataclass(frozen=True, slots=True)
class RecordSummary:
    """What the summary reports (text, annotations, code quality, SARIF) read of a record,
    kept in place of its outcomes when no other report is asked for: a large run's memory
    then holds a few hundred bytes a record, not its every check."""

    check_count: int
    closest: tuple[str, Check] | None
    rules_ran: frozenset[str]


@by_fields
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
    #: The design records' findings and results, when the run wrote them to disk as it
    #: went (``emgate check``: every report it writes reads them back); ``records`` and
    #: ``findings`` then hold the rest (the run's, the configuration's, the materials').
    #: Read both through :meth:`each_finding` and :meth:`each_record`, and count through the
    #: methods below.
    spool: Spool | None = None

    def sort(self) -> None:
        self.findings.sort(key=Finding.sort_key)
        self.records.sort(key=record_key)

    def each_finding(self) -> Iterator[Finding]:
        """Every finding of the run in report order, the spooled ones included."""
        if self.spool is None:
            return iter(self.findings)
        return heapq.merge(self.findings, self.spool.findings(), key=Finding.sort_key)

    def each_record(self) -> Iterator[RecordResult]:
        """Every record of the run in report order, the spooled ones included."""
        if self.spool is None:
            return iter(self.records)
        return heapq.merge(self.records, self.spool.records(), key=record_key)

    def active(self, severity: Severity) -> list[Finding]:
        """The unwaived findings of a severity, the spooled ones included (read back: to
        count them, :meth:`count_active`)."""
        return [f for f in self.each_finding() if f.severity == severity and f.waived_by is None]

    def count_active(self, severity: Literal["error", "warning"]) -> int:
        """How many unwaived findings of a severity, the spooled ones included."""
        held = sum(1 for f in self.findings if f.severity == severity and f.waived_by is None)
        if self.spool is None:
            return held
        tally = self.spool.tally
        return held + (tally.errors if severity == "error" else tally.warnings)

    def in_memory(self, reader: str) -> RunResult:
        """This result, for a reader of ``findings`` and ``records`` themselves; a spooled
        run holds only part of them there, and a report of that part would pass what the
        rest fails (fail closed: an internal error, exit 3)."""
        if self.spool is not None:
            raise RuntimeError(f"the {reader} cannot read a spooled run")
        return self

    def count_waived(self) -> int:
        held = sum(1 for f in self.findings if f.waived_by)
        return held + (self.spool.tally.waived if self.spool is not None else 0)

    def count_records(self) -> int:
        return len(self.records) + (self.spool.tally.records if self.spool is not None else 0)

    def count_checks(self) -> int:
        held = sum(r.check_count() for r in self.records)
        return held + (self.spool.tally.checks if self.spool is not None else 0)

    def rules_ran(self) -> set[str]:
        """The rules that applied to at least one record."""
        ran = {rule for r in self.records for rule in r.rules_ran()}
        return ran | (self.spool.tally.rules_ran if self.spool is not None else set())

    @property
    def exit_code(self) -> int:
        """0 clean, 1 a rule found an error, 2 input or configuration, 3 a crash."""
        spooled = self.spool.tally.exit_code if self.spool is not None else EXIT_OK
        return max(exit_code_of(self.findings), spooled)


def exit_code_of(findings: Iterable[Finding]) -> int:
    """The exit code that findings give: 3 a crash, 2 an input error, 1 an error, else 0
    (waived findings give none)."""
    code = EXIT_OK
    for f in findings:
        if f.waived_by is not None:
            continue
        if f.kind == "crash":
            return EXIT_CRASH
        if f.kind == "input":
            code = EXIT_INPUT
        elif f.severity == "error":
            code = max(code, EXIT_FINDINGS)
    return code


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
    anchor_findings(result.findings, root.resolve())


def anchor_findings(findings: Iterable[Finding], top: Path) -> None:
    """:func:`anchor` of some findings (a spooled record's, before they are written);
    ``top`` is the root resolved (once a run: a spooled run anchors every record)."""
    named: dict[str, str] = {}  # a record's findings are mostly in its own file
    for f in findings:
        if f.file:
            repo = named.get(f.file)
            if repo is None:
                # os.path's realpath: pathlib's raises on a symbolic-link loop (Python 3.11)
                path = Path(os.path.realpath(f.file))
                try:
                    repo = path.relative_to(top).as_posix()
                except ValueError:
                    repo = path.as_posix()
                named[f.file] = repo
            f.repo_file = repo


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


# The spool: the design records' findings and results of a run, on disk instead of in
# memory. In ``emgate check`` each record's findings and result (its outcomes, or only its
# summary when only the summary reports are asked for) are written to a temporary file as
# soon as the record is checked, and read back, one record at a time, as the reports are
# written: the memory of a run then does not grow with its records' checks. What the verdict
# needs (the exit code, the counts of the summary line, the rules that ran) is tallied on
# the way in.
#
# The records are checked in discovery order and reported in the order of their file names;
# the two agree but for unusual names (a folder ``a`` beside a file ``a-b.yaml``). Where they
# do not, the spool notices and sorts what it holds when it is read, in memory: the report is
# the same either way.


def record_key(record: RecordResult) -> tuple[str, str]:
    """The report order of records: by file, then record id."""
    return (record.file, record.record_id)


@dataclass
class Tally:
    """What the summary line and the exit code need of the records a spool holds."""

    records: int = 0
    checks: int = 0
    rules_ran: set[str] = field(default_factory=set)
    errors: int = 0  # unwaived
    warnings: int = 0  # unwaived
    waived: int = 0
    exit_code: int = EXIT_OK

    def add(self, findings: list[Finding], records: list[RecordResult]) -> None:
        self.records += len(records)
        for r in records:
            self.checks += r.check_count()
            self.rules_ran |= r.rules_ran()
        for f in findings:
            if f.waived_by:
                self.waived += 1
            elif f.severity == "error":
                self.errors += 1
            elif f.severity == "warning":
                self.warnings += 1
        self.exit_code = max(self.exit_code, exit_code_of(findings))


class Spool:
    """Findings and record results, one pickled block a design file, in a temporary file."""

    def __init__(self) -> None:
        import io
        import tempfile

        try:
            self._file: IO[bytes] = tempfile.TemporaryFile(prefix="emgate-spool-")
        except OSError:  # no writable temporary folder: the run still goes on, in memory
            self._file = io.BytesIO()
        self._end = 0
        self.tally = Tally()
        #: A design file's findings located in another file (a file waiver's, in
        #: waivers.yaml): few, kept here and merged in when read.
        self._elsewhere: list[Finding] = []
        # the last sort keys written, to notice a block out of report order
        self._last_finding: tuple[str, int, int, str, str] | None = None
        self._last_record: tuple[str, str] | None = None
        self._findings_ordered = self._records_ordered = True

    def add(self, file: str, findings: list[Finding], records: list[RecordResult]) -> None:
        """One design file's findings (waived and anchored) and record results."""
        import pickle

        self.tally.add(findings, records)
        own = sorted((f for f in findings if f.file == file), key=Finding.sort_key)
        self._elsewhere += [f for f in findings if f.file != file]
        records = sorted(records, key=record_key)
        if own:
            if self._last_finding is not None and own[0].sort_key() < self._last_finding:
                self._findings_ordered = False
            self._last_finding = own[-1].sort_key()
        if records:
            if self._last_record is not None and record_key(records[0]) < self._last_record:
                self._records_ordered = False
            self._last_record = record_key(records[-1])
        if self._file.tell() != self._end:  # a reader moved it (a seek also flushes)
            self._file.seek(self._end)
        pickle.dump((own, records), self._file, protocol=pickle.HIGHEST_PROTOCOL)
        self._end = self._file.tell()

    def _blocks(self) -> Iterator[tuple[list[Finding], list[RecordResult]]]:
        """The blocks in the order written; each reader keeps its own place in the file."""
        import pickle

        self._file.flush()
        at = 0
        while at < self._end:
            self._file.seek(at)
            block: Any = pickle.load(self._file)
            at = self._file.tell()
            yield block

    def findings(self) -> Iterator[Finding]:
        """Every finding held, in report order (:meth:`Finding.sort_key`)."""
        own: Iterable[Finding] = (f for fs, _ in self._blocks() for f in fs)
        if not self._findings_ordered:  # (unusual names: see above) sorted in memory
            own = sorted(own, key=Finding.sort_key)
        elsewhere = sorted(self._elsewhere, key=Finding.sort_key)
        return heapq.merge(own, elsewhere, key=Finding.sort_key)

    def records(self) -> Iterator[RecordResult]:
        """Every record result held, in report order (file, then record id)."""
        records: Iterable[RecordResult] = (r for _, rs in self._blocks() for r in rs)
        if not self._records_ordered:
            records = sorted(records, key=record_key)
        return iter(records)

    def close(self) -> None:
        self._file.close()
