"""The run's index on disk (``emgate.spill``): beyond ``SPILL_AT`` entries the records to
check, the names read and the ids claimed go to a temporary SQLite file; the report, the
verdicts and the exit code are those of a run that holds them in memory."""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path
from typing import Any

import pytest

import emgate.spill
from conftest import PUMP, RECORDS, STEELS, git, many_records, run_cli, write_config, write_variant
from emgate.spill import Index, SpillMap, SpillQueue, SpillSet

LOW = 4  # entries a collection holds in memory in these tests before it spills


def _spill_low(monkeypatch: pytest.MonkeyPatch) -> list[int]:
    """SPILL_AT set to :data:`LOW`; the rows each run's index held on disk, as it closed."""
    monkeypatch.setattr(emgate.spill, "SPILL_AT", LOW)
    rows: list[int] = []
    close = Index.close

    def counted(self: Index) -> None:
        db = self._db
        held = 0
        if db is not None:
            tables = db.execute("SELECT name FROM sqlite_master WHERE type = 'table'").fetchall()
            held = sum(db.execute(f"SELECT count(*) FROM {t}").fetchone()[0] for (t,) in tables)
        rows.append(held)
        close(self)

    monkeypatch.setattr(Index, "close", counted)
    return rows


def _taken_ids(repo: Path) -> None:
    """:func:`many_records` with two more records whose ids are taken: one after the record
    that has it in file order, one before it (which keeps it: the later one is refused)."""
    many_records(repo)
    write_variant(repo / "designs", {"id": "pump-drive-4p36s-000"}, name="zz-copy.yaml")
    write_variant(repo / "designs", {"id": "pump-drive-4p36s-045"}, name="a-first.yaml")


@pytest.mark.parametrize("fmt", ["text", "json", "sarif"])
def test_a_spilled_index_gives_the_report_of_one_in_memory(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, fmt: str
) -> None:
    _taken_ids(tmp_path)
    monkeypatch.chdir(tmp_path)
    held = run_cli("check", "--jobs", "1", "--format", fmt, "designs")
    rows = _spill_low(monkeypatch)
    spilled = run_cli("check", "--jobs", "1", "--format", fmt, "designs")
    parallel = run_cli("check", "--jobs", "2", "--format", fmt, "designs")
    # both runs spilled: every record queued, read and claimed went to disk
    assert len(rows) == 2 and all(r > 3 * RECORDS for r in rows), rows
    assert held.code == spilled.code == parallel.code == 2
    assert spilled.out == held.out
    assert parallel.out == held.out
    if fmt == "text":
        assert "record id 'pump-drive-4p36s-000' is already used by designs/r000.yaml" in held.out
        assert "record id 'pump-drive-4p36s-045' is already used by designs/a-first.yaml" in (
            held.out
        )


def test_a_record_past_the_spill_is_still_refused_its_taken_id(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # the id was claimed while the run's ids were in memory, asked for after they moved
    # to disk: the lookup must see the ids written before the spill
    designs = tmp_path / "designs"
    designs.mkdir()
    for i in range(3 * LOW):
        write_variant(designs, {"id": f"pump-{i:02d}"}, name=f"r{i:02d}.yaml")
    write_variant(designs, {"id": "pump-00"}, name="zz.yaml")
    monkeypatch.chdir(tmp_path)
    rows = _spill_low(monkeypatch)
    result = run_cli("check", "--format", "text", "designs")
    assert rows and rows[0] > 0
    assert result.code == 2
    assert "designs/zz.yaml" in result.out
    assert "record id 'pump-00' is already used by designs/r00.yaml" in result.out


@pytest.mark.skipif(shutil.which("git") is None, reason="needs git")
@pytest.mark.parametrize("grades", [False, True], ids=["records only", "with a materials file"])
def test_a_change_may_not_take_the_id_of_a_record_it_leaves_alone_when_spilled(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, grades: bool
) -> None:
    # Ids of the records a change leaves alone come from discovery (records only) or from
    # reading every record (a materials file changed); a copy before and one after the
    # original in file order are both refused, spilled or not.
    repo = tmp_path / "r"
    (repo / "designs").mkdir(parents=True)
    (repo / "materials").mkdir()
    shutil.copy(STEELS, repo / "materials" / STEELS.name)
    write_config(repo, "files: ['designs/*.yaml']\n")
    for i in range(3 * LOW):
        write_variant(repo / "designs", {"id": f"pump-{i:02d}"}, name=f"r{i:02d}.yaml")
    git(repo, "init", "-q")
    git(repo, "add", "-A")
    git(repo, "commit", "-q", "-m", "start")
    write_variant(repo / "designs", {"id": "pump-03"}, name="a-copy.yaml")
    write_variant(repo / "designs", {"id": "pump-09"}, name="zz-copy.yaml")
    if grades:
        steels = repo / "materials" / STEELS.name
        steels.write_text(steels.read_text(encoding="utf-8") + "\n# a note\n", encoding="utf-8")
    monkeypatch.chdir(repo)
    held = run_cli("check", "--format", "text", "--changed-since", "HEAD")
    rows = _spill_low(monkeypatch)
    spilled = run_cli("check", "--format", "text", "--changed-since", "HEAD")
    assert rows and rows[0] > 3 * LOW, rows
    assert spilled.out == held.out
    assert held.code == spilled.code == 2
    assert "record id 'pump-03' is already used by designs/r03.yaml" in held.out
    assert "record id 'pump-09' is already used by designs/r09.yaml" in held.out


def test_without_a_writable_temporary_folder_the_index_stays_in_memory(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    _taken_ids(tmp_path)
    monkeypatch.chdir(tmp_path)
    held = run_cli("check", "--format", "text", "designs")
    rows = _spill_low(monkeypatch)

    def no_folder(*args: Any, **kwargs: Any) -> Any:
        raise OSError(30, "Read-only file system")

    monkeypatch.setattr(tempfile, "mkstemp", no_folder)
    fallen_back = run_cli("check", "--format", "text", "designs")
    assert rows == [0]  # nothing went to disk
    assert fallen_back.code == held.code == 2
    assert fallen_back.out == held.out


def test_the_collections_answer_alike_on_either_side_of_the_spill(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setattr(emgate.spill, "SPILL_AT", LOW)
    monkeypatch.setattr(tempfile, "tempdir", str(tmp_path))
    # a file name that is no UTF-8 (git and os.walk give it with lone surrogates)
    names = [f"d/r{i}.yaml" for i in range(3 * LOW)] + [os.fsdecode(b"d/\xff.yaml")]
    index = Index()
    seen = index.keys()
    assert all(seen.add(n) for n in names)
    assert not any(seen.add(n) for n in names)  # each one already there, spilled or not
    assert all(n in seen for n in names) and "d/other.yaml" not in seen
    ids: SpillMap[str] = index.map()
    for i, n in enumerate(names):
        ids.setdefault(f"id-{i % 7}", n)  # the first to claim an id keeps it
    assert [ids.get(f"id-{i}") for i in range(7)] == names[:7]
    ids["id-0"] = "replaced"
    assert ids.get("id-0") == "replaced" and ids.get("id-7") is None and "id-7" not in ids
    queue: SpillQueue[tuple[str, int]] = index.queue()
    for i, n in enumerate(names):
        queue.append((n, i))
    assert index.spilled
    # on POSIX the file has no name once open: a run killed outright leaves nothing behind
    assert len(list(tmp_path.glob("emgate-index-*"))) == (0 if os.name == "posix" else 1)
    if sys.platform == "linux":  # ... and is held open all the same, by this process
        links = []
        for fd in os.listdir("/proc/self/fd"):
            try:
                links.append(os.readlink(f"/proc/self/fd/{fd}"))
            except FileNotFoundError:  # (the listing's own descriptor, closed since)
                pass
        assert any("emgate-index-" in link and link.endswith("(deleted)") for link in links)
    assert len(queue) == len(names)
    assert list(queue) == [(n, i) for i, n in enumerate(names)]
    assert len(queue) == 0
    index.close()
    assert list(tmp_path.glob("emgate-index-*")) == []  # removed with the run


def test_collections_made_without_an_index_never_spill(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(emgate.spill, "SPILL_AT", 1)
    seen = SpillSet(None)
    queue: SpillQueue[int] = SpillQueue(None)
    for i in range(10):
        assert seen.add(str(i))
        queue.append(i)
    assert seen._table is None and queue._table is None
    assert list(queue) == list(range(10))


def test_a_check_of_one_record_does_not_import_sqlite() -> None:
    # the database is made on the first spill: a pre-commit check of a file never pays it
    code = (
        "import sys; from emgate.cli import main; code = main(['check', sys.argv[1]]);"
        " print('sqlite3' in sys.modules, code)"
    )
    done = subprocess.run(
        [sys.executable, "-c", code, str(PUMP)], capture_output=True, text=True, check=False
    )
    assert done.stdout.split()[-2:] == ["False", "0"], done.stdout + done.stderr


@pytest.mark.skipif(os.name != "posix", reason="the listing is sorted on disk on POSIX")
def test_a_listing_sorted_on_disk_is_in_the_order_of_one_sorted_in_memory(
    monkeypatch: pytest.MonkeyPatch,
) -> None:
    from emgate.listing import _parts, _sorted

    monkeypatch.setattr(emgate.spill, "SPILL_AT", LOW)
    # a folder beside a file of the same stem, names that are no ASCII or no UTF-8, and a
    # name git lists twice (a file in conflict)
    names = ["a-b/x.yaml", "a/x.yaml", "a/b/c.yaml", "a.yaml", "ab.yaml", "é/x.yaml"]
    names += ["\U0001f600.yaml", os.fsdecode(b"\xff.yaml"), "z/x.yaml", "a/x.yaml"]
    index = Index()
    try:
        listed = list(_sorted(iter(names), index))
        assert index.spilled
    finally:
        index.close()
    assert listed == sorted(set(names), key=_parts)
    assert listed.index("a/x.yaml") < listed.index("a-b/x.yaml")  # as paths sort
