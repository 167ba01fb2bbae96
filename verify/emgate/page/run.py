"""The gate's run for a page, and a record's checks, rules and findings from its result."""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

from emgate.page.content import CheckRow, PageData, RemedyRow, RuleRow

if TYPE_CHECKING:
    from emgate.findings import Finding, RecordResult, RuleInfo, RunResult
    from emgate.plugins import PluginSet
    from emgate.remedy import Remedy


def run_gate(
    paths: list[Path], plugins: PluginSet, config: Path | None = None, root: Path | None = None
) -> RunResult:
    """The gate's own run (engine, policy of the nearest emgate.yaml) over ``paths``; bad
    input comes back as input findings, as from ``emgate check``."""
    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.errors import InputError, InputErrors
    from emgate.findings import RunResult, input_findings
    from emgate.pipeline import Run

    start = paths[0] if paths else Path.cwd()
    if config is None:
        config = find_config(start if start.is_dir() else start.parent)
    installed = {p.distribution: p.version for p in plugins.packs}
    rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
    try:
        policy = load_policy(config, rules, root or Path.cwd(), installed)
    except (InputError, InputErrors) as exc:
        return RunResult(findings=input_findings(exc))
    return execute(Run(paths=paths, policy=policy, plugins=plugins))


@dataclass
class RunView:
    """What the pages of a run's records read of it, indexed once: a record's findings and
    a check's remedies are looked up, not searched for among the run's every finding (a
    thousand records' pages would search a thousand times)."""

    exit_code: int
    infos: dict[str, RuleInfo]
    #: Each finding with its place in the run's order, by record id and by file.
    by_record: dict[str, list[tuple[int, Finding]]] = field(default_factory=dict)
    by_file: dict[str, list[tuple[int, Finding]]] = field(default_factory=dict)
    #: The remedies of the first finding that reports a check, by the check's identity.
    remedies: dict[int, list[Remedy]] = field(default_factory=dict)

    @classmethod
    def of(cls, result: RunResult) -> RunView:
        from emgate.remedy_report import remedies_by_check

        view = cls(result.exit_code, {r.id: r for r in result.rules})
        for at, f in enumerate(result.findings):
            view.by_record.setdefault(f.record_id, []).append((at, f))
            view.by_file.setdefault(f.file, []).append((at, f))
        view.remedies = remedies_by_check(result.findings)
        return view

    def findings_of(self, record: RecordResult) -> list[Finding]:
        """The findings of the record's id or file, in the run's order."""
        mine = dict(self.by_record.get(record.record_id, ()))
        mine.update(self.by_file.get(record.file, ()))
        return [mine[at] for at in sorted(mine)]


def gather_checks(page: PageData, run: RunView, record: RecordResult | None) -> None:
    """The record's checks (with their remedies), rules and other findings from the run,
    and the verdict on the record alone."""
    from emgate.remedy_report import summary
    from emgate.report.common import check_display
    from emgate.terms import path_string

    page.verdict = run.exit_code
    if record is None:
        page.problems.append("checks: the run did not check this record")
        return
    infos = run.infos
    mine = run.findings_of(record)
    page.findings = [f"{f.severity}: {f.rule}: {f.message}" for f in mine if f.check is None]
    live = [f for f in mine if f.waived_by is None]
    page.verdict = (
        3
        if any(f.kind == "crash" for f in live)
        else 2
        if any(f.kind == "input" for f in live)
        else 1
        if any(f.severity == "error" for f in live)
        else 0
    )
    for o in record.outcomes:
        info = infos.get(o.rule)
        page.rules.append(
            RuleRow(
                o.rule,
                o.status,
                info.version if info else "?",
                info.summary if info else "",
                f"{info.distribution} {info.distribution_version}" if info else "",
                o.message,
            )
        )
        for c in o.checks:
            finding = next((f for f in mine if f.rule == o.rule and f.check == c), None)
            remedies = run.remedies.get(id(c), [])
            page.checks.append(
                CheckRow(
                    o.rule,
                    c.quantity,
                    c.label,
                    c.value,
                    c.limit,
                    c.bound,
                    c.unit,
                    c.margin,
                    c.passed,
                    c.basis,
                    check_display(c),
                    path_string(c.path),
                    finding.severity if finding else "",
                    bool(finding and finding.waived_by),
                    tuple(
                        RemedyRow(
                            r.field_name,
                            r.status,
                            r.old,
                            r.new,
                            r.margin,
                            r.breaks,
                            r.describe(),
                        )
                        for r in remedies
                    ),
                    summary(remedies),
                )
            )
    # Failing first, then the closest to its limit.
    # (A margin is +-inf against a zero limit: a pass sorts last, a failure first.)
    page.checks.sort(key=lambda c: (c.passed, c.margin if c.margin == c.margin else -math.inf))
