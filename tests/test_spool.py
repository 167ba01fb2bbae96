"""The spool: a summary-only run keeps its design records on disk, and reports the same."""

from __future__ import annotations

import re
import shutil
from pathlib import Path
from typing import Any

import pytest

from conftest import PUMP, SERVO, STEELS, many_records, write_config, write_variant
from emgate.findings import Finding, RunResult, Spool, exit_code_of
from emgate.terms import EXIT_CRASH, EXIT_FINDINGS, EXIT_INPUT, EXIT_OK


def _run(repo: Path, details: bool, spool: bool | None = None) -> RunResult:
    from emgate.config import find_config, load_policy
    from emgate.engine import execute
    from emgate.pipeline import Run
    from emgate.plugins import load_plugins

    plugins = load_plugins()
    rules = {r: lr.rule for r, lr in plugins.rules.items()}
    policy = load_policy(find_config(repo), rules, repo)
    run = Run(paths=[repo / "designs"], policy=policy, plugins=plugins, details=details)
    run.spool = not details if spool is None else spool
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
    assert not spooled.spool._findings_ordered and not spooled.spool._records_ordered
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
        spool.add(f.file, [f], [])
    result = RunResult(spool=spool)
    assert result.exit_code == code
    assert result.count_active("error") == sum(
        1 for f in findings if f.severity == "error" and not f.waived_by
    )
    assert result.count_waived() == sum(1 for f in findings if f.waived_by)
    spool.close()


def test_a_report_that_reads_no_spool_refuses_a_spooled_run(tmp_path: Path) -> None:
    # a run spools only when every report asked for reads it; the HTML index reading half
    # a run would pass a broken record unreported
    from emgate.page import plots_available, write_run

    spooled = RunResult(spool=Spool())
    if plots_available():  # (the html extra, which the test set-up installs)
        with pytest.raises(RuntimeError, match="spooled"):
            write_run(spooled, tmp_path / "index.html")
    held = RunResult()
    assert held.in_memory("test") is held


def test_a_spool_without_a_temporary_folder_keeps_its_records_in_memory(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    import tempfile

    def no_folder(*args: Any, **kwargs: Any) -> Any:
        raise OSError(30, "Read-only file system")

    monkeypatch.setattr(tempfile, "TemporaryFile", no_folder)
    spool = Spool()
    spool.add("a.yaml", [_finding(file="a.yaml"), _finding(file="a.yaml", line=2)], [])
    spool.add("b.yaml", [_finding(file="b.yaml", severity="warning")], [])
    got = [(f.file, f.line) for f in spool.findings()]
    assert got == [("a.yaml", 1), ("a.yaml", 2), ("b.yaml", 1)]
    assert RunResult(spool=spool).exit_code == EXIT_FINDINGS


@pytest.mark.parametrize("fmt", ["text", "json", "annotations", "junit"])
def test_a_reader_that_stops_early_does_not_change_the_exit_code(tmp_path: Path, fmt: str) -> None:
    # `emgate check | head`: the report's reader is gone before the report is written (the
    # pipe's read end closed at once); the exit code is still the verdict's, 2 for the
    # broken and invalid records (a broken pipe once ended the run with 0)
    import subprocess
    import sys

    many_records(tmp_path)
    argv = [sys.executable, "-m", "emgate", "check", "--format", fmt, "--remedies", "off"]
    proc = subprocess.Popen(
        [*argv, "designs"], cwd=tmp_path, stdout=subprocess.PIPE, stderr=subprocess.PIPE
    )
    assert proc.stdout is not None
    proc.stdout.close()
    _, err = proc.communicate(timeout=300)
    assert proc.returncode == 2, err
    assert b"Traceback" not in err and b"BrokenPipe" not in err, err


def test_a_spooled_run_with_every_outcome_writes_the_same_reports(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from emgate.report import writer

    many_records(tmp_path)
    monkeypatch.chdir(tmp_path)
    kept, spooled = _run(tmp_path, details=True), _run(tmp_path, details=True, spool=True)
    assert spooled.spool is not None and spooled.records == []
    assert all(r.outcomes for r in spooled.each_record())  # the outcomes went to disk too
    wall = re.compile(r'\btime="[0-9.]+"')  # JUnit's rule times, wall times of each run
    for fmt in ("json", "markdown", "sarif", "junit", "text", "annotations", "codequality"):
        pieces = list(writer(fmt)(spooled))
        assert wall.sub("", "".join(pieces)) == wall.sub("", "".join(writer(fmt)(kept))), fmt
        if fmt in ("json", "markdown", "sarif", "text"):
            assert len(pieces) > len(kept.findings), fmt  # written piece by piece
        if fmt == "junit":
            assert len(pieces) > len(kept.records), fmt  # a testsuite at a time


@pytest.mark.parametrize(
    "doc",
    [
        {"a": 1, "items": [], "z": {"k": [1, 2]}},
        {"items": [{"x": 1, "y": [1, {"z": None}]}, "two", 3.5, []], "after": "x"},
        {"outer": [{"inner": {"items": [1, 2]}}], "items": [{"items": "nested name"}]},
        # a list alone, streamed whole (the code-quality report)
        {"items": [{"a": [1, {"b": 2}]}, 3]},
        {"items": []},
        # a placeholder-like text under the same key before the stream, a key with a quote
        {"a": {"items": "\x00stream 0\x00"}, 'x"y': 1, "items": [1, 2]},
        # strings holding the key and a mark-like text, quotes, line ends and controls
        {"m": '"items": "\u0000stream 0\u0000"', "items": ['"items": ', "\x00stream 0\x00\n"]},
    ],
)
def test_json_chunks_writes_what_json_dumps_writes(
    doc: dict[str, Any], monkeypatch: pytest.MonkeyPatch
) -> None:
    # [calc] external check: the standard library's json.dumps(indent=2) of the same
    # document, byte for byte, whichever lists are streamed
    import json

    from emgate.report.common import Stream, json_chunks

    expected = json.dumps(doc, indent=2) + "\n"

    def streamed(node: Any) -> Any:
        if isinstance(node, dict):
            return {
                k: Stream(iter(v)) if k == "items" and isinstance(v, list) else streamed(v)
                for k, v in node.items()
            }
        if isinstance(node, list):
            return [streamed(v) for v in node]
        return node

    assert "".join(json_chunks(streamed(doc))) == expected
    json.loads(expected)
    # a document that holds the nonce of the marks itself is written whole, the same
    import secrets

    monkeypatch.setattr(secrets, "token_hex", lambda n=None: "0" * 16)
    clash = "\x00stream 0 0000000000000000\x00"
    got = "".join(json_chunks({"x": clash, **streamed(doc)}))
    assert got == json.dumps({"x": clash, **doc}, indent=2) + "\n"
    if list(doc) == ["items"]:  # the list itself as the document
        whole = doc["items"]
        assert "".join(json_chunks(Stream(iter(whole)))) == json.dumps(whole, indent=2) + "\n"


def test_a_file_waivers_finding_does_not_unorder_the_spool(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # a waiver that suppresses nothing is found on a record but located in waivers.yaml,
    # which sorts after designs/: it is held aside, and the records stay in report order
    # (read back one at a time, not sorted in memory)
    many_records(tmp_path)
    (tmp_path / "waivers.yaml").write_text(
        "schema: emgate/waivers@1\nwaivers:\n"
        "  - rule: current-density\n    record: pump-drive-4p36s-000\n"
        "    reason: a waiver that suppresses nothing\n    owner: design team\n"
        "    expires: 2099-01-01\n"
    )
    monkeypatch.chdir(tmp_path)
    kept, spooled = _run(tmp_path, details=True), _run(tmp_path, details=False)
    assert spooled.spool is not None
    assert any(f.file == "waivers.yaml" for f in kept.findings)
    assert spooled.spool._findings_ordered and spooled.spool._records_ordered
    assert list(spooled.each_finding()) == kept.findings
    assert _reports(spooled) == _reports(kept)


def test_a_closed_standard_error_does_not_change_the_exit_code(tmp_path: Path) -> None:
    # every report to a file: the summary line goes to standard error, whose reader is
    # gone (`2>&1 | true`); the verdict stands (a broken pipe there once gave exit 0)
    import subprocess
    import sys

    many_records(tmp_path)
    argv = [sys.executable, "-m", "emgate", "check", "--remedies", "off"]
    argv += ["--format", f"junit:{tmp_path / 'r.xml'}", "designs"]
    proc = subprocess.Popen(argv, cwd=tmp_path, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    assert proc.stderr is not None
    proc.stderr.close()
    assert proc.wait(timeout=300) == 2  # the broken and invalid records
    assert "<testsuites" in (tmp_path / "r.xml").read_text()


def test_records_added_while_a_reader_is_part_way_are_all_read_back() -> None:
    # a write goes to the end whatever place a reader left the file at
    spool = Spool()
    names = [f"d/{i:03d}.yaml" for i in range(40)]
    for name in names[:20]:
        spool.add(name, [_finding(file=name, message="x" * 300)], [])
    partial = spool.findings()
    assert next(partial).file == names[0]  # a reader stops early, the file part way
    for name in names[20:]:
        spool.add(name, [_finding(file=name, message="x" * 300)], [])
    assert [f.file for f in spool.findings()] == names
    spool.add("d/zzz.yaml", [_finding(file="d/zzz.yaml")], [])  # after a reader read it all
    assert [f.file for f in spool.findings()] == [*names, "d/zzz.yaml"]
    spool.close()
