"""The spool: a summary-only run keeps its design records on disk, and reports the same."""

from __future__ import annotations

import shutil
from pathlib import Path
from typing import Any

import pytest

from conftest import PUMP, SERVO, STEELS, many_records, write_config, write_variant
from emgate.findings import Finding, RunResult, Spool, exit_code_of
from emgate.terms import EXIT_CRASH, EXIT_FINDINGS, EXIT_INPUT, EXIT_OK


def _run(repo: Path, details: bool) -> RunResult:
    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.pipeline import Run
    from emgate.plugins import load_plugins

    plugins = load_plugins()
    rules = {r: lr.rule for r, lr in plugins.rules.items()}
    policy = load_policy(find_config(repo), rules, repo)
    run = Run(paths=[repo / "designs"], policy=policy, plugins=plugins, details=details)
    run.remedies = False
    return execute(run)


def _reports(result: RunResult) -> dict[str, str]:
    from emgate.report import reporter
    from emgate.report.text import render

    return {
        "text": render(result),
        "quiet": render(result, quiet=True),
        "colour": render(result, colour=True),
        "annotations": reporter("annotations")(result),
        "codequality": reporter("codequality")(result),
        "sarif": reporter("sarif")(result),
    }


def test_a_summary_run_keeps_no_design_record_in_memory_and_reports_the_same(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    many_records(tmp_path)  # passing, failing, broken and invalid records and a taken id
    monkeypatch.chdir(tmp_path)
    kept, spooled = _run(tmp_path, details=True), _run(tmp_path, details=False)
    assert spooled.spool is not None and kept.spool is None
    assert spooled.records == []  # every record's summary is on disk, none in memory
    # what stays in memory: the run's own findings, here the taken id (found by the run,
    # after the record was checked), not a record's
    assert [f.message for f in spooled.findings] == [
        f.message for f in kept.findings if "already used" in f.message
    ]
    assert spooled.count_records() == len(kept.records) > 0
    assert spooled.exit_code == kept.exit_code == EXIT_INPUT
    assert list(spooled.each_finding()) == kept.findings
    assert [r.record_id for r in spooled.each_record()] == [r.record_id for r in kept.records]
    assert _reports(spooled) == _reports(kept)


def test_records_checked_out_of_report_order_are_reported_in_it(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # Discovery walks a folder 'a' before a file 'a-b.yaml' (path parts), the report sorts
    # 'designs/a-b.yaml' before 'designs/a/x.yaml' (text: '-' before '/'): the spool sorts.
    designs = tmp_path / "designs"
    (designs / "a").mkdir(parents=True)
    (tmp_path / "materials").mkdir()
    shutil.copy(STEELS, tmp_path / "materials" / STEELS.name)
    write_variant(designs / "a", {"id": "inner"}, base=SERVO, name="x.yaml")
    write_variant(designs, {"id": "outer"}, base=SERVO, name="a-b.yaml")
    write_variant(designs, {"id": "plain"}, base=PUMP, name="b.yaml")
    write_config(tmp_path, "files: ['designs/**/*.yaml']\n")
    monkeypatch.chdir(tmp_path)
    kept, spooled = _run(tmp_path, details=True), _run(tmp_path, details=False)
    assert spooled.spool is not None
    assert spooled.spool._ordered is False  # it noticed
    files = [f.file for f in spooled.each_finding()]
    assert files == sorted(files) and {"designs/a-b.yaml", "designs/a/x.yaml"} <= set(files)
    assert [r.record_id for r in spooled.each_record()] == ["outer", "inner", "plain"]
    assert _reports(spooled) == _reports(kept)


def _finding(**kw: Any) -> Finding:
    base: dict[str, Any] = dict(
        rule="r", severity="error", file="f.yaml", line=1, column=1, record_path="$", message="m"
    )
    return Finding(**{**base, **kw})


@pytest.mark.parametrize(
    ("findings", "code"),
    [
        ([], EXIT_OK),
        ([_finding(severity="warning"), _finding(severity="info")], EXIT_OK),
        ([_finding(waived_by="w1")], EXIT_OK),
        ([_finding()], EXIT_FINDINGS),
        ([_finding(), _finding(kind="input")], EXIT_INPUT),
        ([_finding(kind="input"), _finding(kind="crash"), _finding()], EXIT_CRASH),
        ([_finding(kind="crash", waived_by="w")], EXIT_OK),
    ],
)
def test_the_exit_code_of_findings_and_of_a_spool_agree(findings: list[Finding], code: int) -> None:
    # the precedence every report states: a crash, then an input error, then an error
    assert exit_code_of(findings) == code
    spool = Spool()
    for f in findings:  # one record each
        spool.add([f], [])
    result = RunResult(spool=spool)
    assert result.exit_code == code
    assert result.count_active("error") == sum(
        1 for f in findings if f.severity == "error" and not f.waived_by
    )
    assert result.count_waived() == sum(1 for f in findings if f.waived_by)
    spool.close()


def test_a_report_of_every_outcome_refuses_a_spooled_run() -> None:
    # a run spools only when every report asked for reads summaries; JSON reading half a
    # run would pass a broken record unreported
    from emgate.commands import _emit

    spooled = RunResult(spool=Spool())
    for fmt in ("json", "junit", "markdown", "html"):
        with pytest.raises(RuntimeError, match="spooled"):
            _emit(spooled, [(fmt, None)])
