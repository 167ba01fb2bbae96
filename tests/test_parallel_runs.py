"""--jobs: a run in worker processes reports byte for byte what a serial run reports (JUnit
apart from its wall times, which the comparison blanks), and --changed-since leaves the
records outside the change unparsed."""

from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import pytest

from conftest import RECORDS, git, many_records, run_cli
from emgate.parallel import MIN_ITEMS_PER_WORKER, ordered_map, workers_for

_TIME = re.compile(r'\btime="[0-9.]+"')


@pytest.mark.parametrize("fmt", ["text", "json", "sarif", "junit", "markdown"])
def test_parallel_and_serial_reports_are_byte_identical(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, fmt: str
) -> None:
    many_records(tmp_path)
    monkeypatch.chdir(tmp_path)
    assert workers_for(RECORDS + 3, 2) == 2  # the parallel run really forks (POSIX)
    serial = run_cli("check", "--jobs", "1", "--format", fmt, "designs")
    parallel = run_cli("check", "--jobs", "2", "--format", fmt, "designs")
    assert serial.code == parallel.code == 2  # the broken and invalid records
    if fmt == "junit":  # JUnit's time attributes are wall times: everything else is the same
        assert len(_TIME.findall(serial.out)) > RECORDS
        assert _TIME.sub('time=""', parallel.out) == _TIME.sub('time=""', serial.out)
    else:
        assert parallel.out == serial.out
    assert "taken-id.yaml" in serial.out  # the duplicate id is reported in both
    if fmt == "text":  # the workers computed the remedies of the failing checks too
        assert "fix: " in parallel.out


def test_ordered_map_keeps_the_order_of_its_inputs() -> None:
    items = list(range(5 * MIN_ITEMS_PER_WORKER))
    squares = [x * x for x in items]
    assert list(ordered_map(lambda x: x * x, list(items), 2)) == squares
    assert list(ordered_map(lambda x: x * x, list(items), 1)) == squares


def test_a_parallel_map_over_many_batches_keeps_their_order(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    # the workers take the items a batch ahead of the results (a spilled queue is not held
    # in memory): 640 items on two workers are two batches, a hand-over between them
    import emgate.spill

    monkeypatch.setattr(emgate.spill, "SPILL_AT", 50)
    index = emgate.spill.Index()
    queue: emgate.spill.SpillQueue[int] = index.queue()
    items = list(range(40 * MIN_ITEMS_PER_WORKER))
    for i in items:
        queue.append(i)
    assert index.spilled
    assert workers_for(len(queue), 2) == 2  # two worker processes, not this one
    try:
        assert list(ordered_map(lambda x: -x, queue, 2)) == [-i for i in items]
    finally:
        index.close()
    assert len(queue) == 0


def test_a_serial_map_drops_each_item_once_it_is_done() -> None:
    # a long run holds the records not yet checked, not every record until the end
    items = ["a", "b", "c", "d"]
    left = []
    for _ in ordered_map(lambda x: x, items, 1):
        left.append(list(items))
    assert left == [["d", "c", "b"], ["d", "c"], ["d"], []]


def test_jobs_must_be_a_positive_whole_number() -> None:
    for bad in ("0", "-1", "two"):
        result = run_cli("check", "--jobs", bad, ".")
        assert result.code == 2
        assert "--jobs" in result.err


@pytest.mark.skipif(shutil.which("git") is None, reason="needs git")
def test_changed_since_parses_only_the_changed_record(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    many_records(tmp_path)
    (tmp_path / "designs" / "broken.yaml").unlink()
    (tmp_path / "designs" / "invalid.yaml").unlink()
    (tmp_path / "designs" / "taken-id.yaml").unlink()
    git(tmp_path, "init", "-q", "-b", "main")
    git(tmp_path, "add", "-A")
    git(tmp_path, "commit", "-qm", "records")
    changed = tmp_path / "designs" / "r003.yaml"  # a pump record: passes every rule
    changed.write_text(changed.read_text() + "# reviewed\n")
    monkeypatch.chdir(tmp_path)
    import emgate.discovery
    import emgate.engine
    import emgate.pipeline

    parsed: list[str] = []
    real = emgate.engine.load_text

    def spy(path: Path, text: str):  # type: ignore[no-untyped-def]
        parsed.append(path.name)
        return real(path, text)

    # every home that parses a file of the run: discovery, the run (materials), each record
    for module in (emgate.discovery, emgate.engine, emgate.pipeline):
        monkeypatch.setattr(module, "load_text", spy)
    result = run_cli("check", "--jobs", "1", "--format", "json", "--changed-since", "HEAD")
    assert result.code == 0, result.out
    assert [r["record_id"] for r in result.json()["records"]] == ["pump-drive-4p36s-003"]
    # the materials file (the catalogue) and the one changed record; no other record
    assert sorted(parsed) == ["r003.yaml", "steels.yaml"]


@pytest.mark.skipif(shutil.which("git") is None, reason="needs git")
@pytest.mark.parametrize(
    ("content", "says"),
    [
        (b"schema: emgate/mat\x00erials@1\n", "control character U+0000"),
        # a record's schema line first, the fault far below it or in its last byte: a
        # reading of the file's head alone would skip these as records outside the change
        (b"schema: emgate/design@1\n" + b"# pad\n" * 4000 + b"id: x\x00\n", "U+0000"),
        (b"schema: emgate/design@1\nid: x\n# \xc3", "expected UTF-8 text"),
    ],
)
def test_changed_since_still_reports_an_unreadable_file_outside_the_change(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, content: bytes, says: str
) -> None:
    """A file read_text refuses is reported whether or not the change touches it (it may be
    a materials file the catalogue needs, or a record whose check would be skipped)."""
    many_records(tmp_path)
    for name in ("broken.yaml", "invalid.yaml", "taken-id.yaml"):
        (tmp_path / "designs" / name).unlink()
    (tmp_path / "designs" / "scan.yaml").write_bytes(content)
    git(tmp_path, "init", "-q", "-b", "main")
    git(tmp_path, "add", "-A")
    git(tmp_path, "commit", "-qm", "records")
    changed = tmp_path / "designs" / "r003.yaml"
    changed.write_text(changed.read_text() + "# reviewed\n")
    monkeypatch.chdir(tmp_path)
    result = run_cli("check", "--jobs", "1", "--changed-since", "HEAD")
    assert result.code == 2, result.out
    assert "scan.yaml:" in result.out and says in result.out


@pytest.mark.parametrize("fmt", ["text", "annotations", "codequality", "sarif"])
def test_a_summary_report_keeps_summaries_and_says_the_same(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, fmt: str
) -> None:
    """With only summary formats asked for, the run keeps each record's summary, not its
    outcomes (memory that does not grow with every check), and the report is byte for byte
    the one a run keeping every outcome (JSON asked for as well) writes."""
    many_records(tmp_path)
    monkeypatch.chdir(tmp_path)
    import emgate.findings

    summarised: list[str] = []
    real = emgate.findings.RecordResult.summarised

    def spy(self, interned):  # type: ignore[no-untyped-def]
        summarised.append(self.record_id)
        return real(self, interned)

    monkeypatch.setattr(emgate.findings.RecordResult, "summarised", spy)
    alone = run_cli("check", "--jobs", "1", "--format", fmt, "designs")
    kept = len(summarised)
    both = run_cli(
        "check",
        "--jobs",
        "1",
        "--format",
        fmt,
        "--format",
        f"json:{tmp_path / 'r.json'}",
        "designs",
    )
    assert alone.code == both.code == 2  # the broken and invalid records
    checked = json.loads((tmp_path / "r.json").read_text())["records"]
    assert len(checked) > RECORDS // 2
    assert all(r["outcomes"] for r in checked)  # the JSON run kept every outcome
    assert kept == len(checked)  # every checked record summarised in the summary-only run,
    assert len(summarised) == kept  # and none in the run that writes JSON too
    assert alone.out == both.out


def _interrupted(x: int) -> int:
    import os
    import signal

    if x == 3:  # Ctrl-C reaches the whole process group, the workers with the run
        os.kill(os.getpid(), signal.SIGINT)
    return x


def test_a_worker_leaves_ctrl_c_to_the_run(capfd: pytest.CaptureFixture[str]) -> None:
    # a worker that took the interrupt itself would print its traceback and lose its item
    # (the map would wait for it forever: the alarm turns that into a failure)
    import signal

    def hung(signum: int, frame: object) -> None:
        raise AssertionError("the map hung")

    items = list(range(2 * MIN_ITEMS_PER_WORKER))
    previous = signal.signal(signal.SIGALRM, hung)
    signal.alarm(60)
    try:
        assert list(ordered_map(_interrupted, list(items), 2)) == items
    finally:
        signal.alarm(0)
        signal.signal(signal.SIGALRM, previous)
    assert "KeyboardInterrupt" not in capfd.readouterr().err
