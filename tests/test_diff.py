"""``emgate diff``: a git repository built in a temporary folder with three commits (a
geometry change, a winding change, a rename); the diff's quantities and margins are those
that ``emgate show`` and ``emgate check`` report at each revision."""

from __future__ import annotations

import os
import shutil
from pathlib import Path
from typing import Any

import pytest
import yaml

from conftest import DEMO, git, run_cli, write_variant

PUMP_REL = "designs/pump-drive-4p36s.yaml"
RENAMED_REL = "designs/pump-drive-4p36s-v2.yaml"


def _edit(path: Path, dotted: str, value: Any) -> None:
    from conftest import override

    data = yaml.safe_load(path.read_text(encoding="utf-8"))
    override(data, dotted, value)
    path.write_text(yaml.safe_dump(data, sort_keys=False), encoding="utf-8")


@pytest.fixture(scope="module")
def history(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, list[str]]:
    """The demo repository in git: initial, geometry change, winding change, rename."""
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    repo = tmp_path_factory.mktemp("designs")
    for item in DEMO.iterdir():
        if item.is_dir():
            shutil.copytree(item, repo / item.name)
        else:
            shutil.copy(item, repo / item.name)
    git(repo, "init", "-q", "-b", "main")
    git(repo, "add", "-A")
    git(repo, "commit", "-qm", "initial")
    _edit(repo / PUMP_REL, "stator.slot.bottom_width", "9.2 mm")
    git(repo, "commit", "-qam", "geometry: narrower slot bottom")
    _edit(repo / PUMP_REL, "winding.turns_per_coil", 22)
    git(repo, "commit", "-qam", "winding: one more turn per coil")
    git(repo, "mv", PUMP_REL, RENAMED_REL)
    git(repo, "commit", "-qm", "rename")
    revs = git(repo, "rev-list", "--reverse", "HEAD").split()
    assert len(revs) == 4
    return repo, revs


def _diff(repo: Path, *args: str) -> Any:
    saved = Path.cwd()
    os.chdir(repo)
    try:
        return run_cli("diff", *args)
    finally:
        os.chdir(saved)


def _at(repo: Path, rev: str, rel: str, *cmd: str) -> dict[str, Any]:
    """``emgate CMD`` on a record as it was at ``rev`` (a checkout in a scratch copy)."""
    scratch = repo.parent / f"at-{rev[:8]}"
    if not scratch.exists():
        git(repo, "worktree", "add", "-q", "--detach", str(scratch), rev)
    saved = Path.cwd()
    os.chdir(scratch)
    try:
        done = run_cli(*cmd, rel, "--format", "json")
    finally:
        os.chdir(saved)
    assert done.code in (0, 1), done.err
    return done.json()


@pytest.mark.parametrize(
    ("step", "before", "after"),
    [(1, PUMP_REL, PUMP_REL), (2, PUMP_REL, PUMP_REL)],
    ids=["geometry", "winding"],
)
def test_quantities_and_margins_are_those_of_show_and_check(
    history: tuple[Path, list[str]], step: int, before: str, after: str
) -> None:
    repo, revs = history
    base, head = revs[step - 1], revs[step]
    done = _diff(repo, base, head, "--format", "json")
    assert done.code == 0, done.err
    records = done.json()["records"]
    # Only the record the commit touched: the other two demo records yield nothing.
    assert [r["record_id"] for r in records] == ["pump-drive-4p36s"]
    rec = records[0]
    assert rec["status"] == "changed"
    show_b = _at(repo, base, before, "show")["quantities"]
    show_a = _at(repo, head, after, "show")["quantities"]
    listed = {q["name"]: q for q in rec["quantities"]}
    # Every quantity show reports as moved by more than 0.1 % is listed, and no other.
    moved = {
        n
        for n in show_a
        if show_b[n]["value"] is not None
        and abs(show_a[n]["value"] - show_b[n]["value"]) > 1e-3 * abs(show_b[n]["value"])
    }
    assert set(listed) == moved and moved
    for name, q in listed.items():
        # The same numbers show prints (rounding only).
        assert q["before"] == pytest.approx(show_b[name]["value"], rel=1e-12)
        assert q["after"] == pytest.approx(show_a[name]["value"], rel=1e-12)
        rel = (q["after"] - q["before"]) / abs(q["before"])
        assert q["relative"] == pytest.approx(rel, rel=1e-12)
    check_b = _at(repo, base, before, "check")
    check_a = _at(repo, head, after, "check")

    def margins(doc: dict[str, Any]) -> dict[tuple[str, str, str], float]:
        return {
            (f["rule"], c["quantity"], c["bound"]): c["margin"]
            for f in doc["records"][0]["outcomes"]
            for c in f.get("checks", [])
        }

    mb, ma = margins(check_b), margins(check_a)
    assert rec["margins"]
    for m in rec["margins"]:
        key = (m["rule"], m["quantity"], m["bound"])
        assert m["before"] == pytest.approx(mb[key], rel=1e-12)
        assert m["after"] == pytest.approx(ma[key], rel=1e-12)


def test_the_geometry_commit_names_its_field(history: tuple[Path, list[str]]) -> None:
    repo, revs = history
    rec = _diff(repo, revs[0], revs[1], "--format", "json").json()["records"][0]
    assert rec["fields"] == [
        {"path": "stator.slot.bottom_width", "before": "9.6 mm", "after": "9.2 mm"}
    ]
    names = {q["name"] for q in rec["quantities"]}
    assert {"stator.slot_area", "stator.slot_fill", "stator.tooth_width_min"} <= names
    assert "winding.series_turns" not in names  # the winding did not change


def test_the_winding_commit_moves_the_winding_quantities(
    history: tuple[Path, list[str]],
) -> None:
    repo, revs = history
    rec = _diff(repo, revs[1], revs[2], "--format", "json").json()["records"][0]
    q = {x["name"]: x for x in rec["quantities"]}
    # 21 -> 22 turns a coil: series turns and slot copper rise by 1/21 exactly.
    assert q["winding.series_turns"]["relative"] == pytest.approx(1 / 21, rel=1e-12)
    assert q["stator.copper_area"]["relative"] == pytest.approx(1 / 21, rel=1e-12)
    assert "stator.slot_area" not in q


def test_a_rename_is_followed(history: tuple[Path, list[str]]) -> None:
    repo, revs = history
    done = _diff(repo, revs[2], revs[3], "--format", "json")
    assert done.code == 0
    (rec,) = done.json()["records"]
    assert rec["status"] == "renamed"
    assert (rec["path_before"], rec["path_after"]) == (PUMP_REL, RENAMED_REL)
    assert rec["quantities"] == [] and rec["fields"] == [] and rec["margins"] == []


def test_across_all_three_commits_the_rename_carries_both_changes(
    history: tuple[Path, list[str]],
) -> None:
    repo, revs = history
    (rec,) = _diff(repo, revs[0], revs[3], "--format", "json").json()["records"]
    assert rec["status"] == "renamed"
    assert {f["path"] for f in rec["fields"]} == {
        "stator.slot.bottom_width",
        "winding.turns_per_coil",
    }


def test_the_threshold_limits_what_is_listed(history: tuple[Path, list[str]]) -> None:
    repo, revs = history
    small = _diff(repo, revs[0], revs[1], "--format", "json").json()["records"][0]
    large = _diff(repo, revs[0], revs[1], "--threshold", "3", "--format", "json")
    big = large.json()["records"][0]
    assert big["quantities"]
    assert all(abs(q["relative"]) > 0.03 for q in big["quantities"])
    assert {q["name"] for q in big["quantities"]} == {
        q["name"] for q in small["quantities"] if abs(q["relative"]) > 0.03
    }
    assert len(big["quantities"]) < len(small["quantities"])
    assert large.json()["threshold"] == pytest.approx(0.03)


def test_an_unchanged_revision_yields_nothing(history: tuple[Path, list[str]]) -> None:
    repo, revs = history
    done = _diff(repo, revs[1], revs[1], "--format", "json")
    assert done.code == 0 and done.json()["records"] == []
    assert "no design record changed" in _diff(repo, revs[1], revs[1]).out


def test_paths_limit_the_diff(history: tuple[Path, list[str]]) -> None:
    repo, revs = history
    done = _diff(repo, revs[0], revs[1], "designs/servo-10p12s.yaml", "--format", "json")
    assert done.code == 0, done.err
    assert done.json()["records"] == []


def test_markdown_is_a_short_table_per_record(history: tuple[Path, list[str]]) -> None:
    repo, revs = history
    out = _diff(repo, revs[0], revs[2], "--format", "markdown").out
    assert "### pump-drive-4p36s (changed)" in out
    assert "| quantity | before | after | change |" in out
    assert "| check | margin before | margin after |" in out
    assert "qualified engineer" in out


def test_html_overlays_both_revisions(history: tuple[Path, list[str]], tmp_path: Path) -> None:
    repo, revs = history
    out = tmp_path / "diff.html"
    done = _diff(repo, revs[0], revs[2], "--format", f"html:{out}")
    assert done.code == 0, done.err
    text = out.read_text(encoding="utf-8")
    for plot in ("margins", "spectrum", "bh-M400-50A"):
        assert f'data-plot="{plot}"' in text


def test_bad_revisions_are_input_errors(history: tuple[Path, list[str]]) -> None:
    repo, _ = history
    done = _diff(repo, "no-such-revision")
    assert done.code == 2
    assert "not a git revision: 'no-such-revision'" in done.err
    done = _diff(repo, "HEAD", "designs/no-such-file.yaml")
    assert done.code == 2 and "neither a revision nor a path" in done.err


def test_two_files_a_newly_failing_check_and_the_head_gate(tmp_path: Path) -> None:
    """Two record files: raising the line current breaks the current-density limit; the diff
    names the newly failing check and exits as the gate does on the new file."""
    (tmp_path / ".git").mkdir()
    old = write_variant(tmp_path, name="old.yaml")
    new = write_variant(tmp_path, {"rating.line_current": "19 A"}, name="new.yaml")
    gate = run_cli("check", new)
    assert gate.code == 1
    done = run_cli("diff", old, new, "--format", "json")
    assert done.code == gate.code
    (rec,) = done.json()["records"]
    assert any(n.startswith("current-density:") for n in rec["newly_failing"])
    back = run_cli("diff", new, old, "--format", "json")
    assert back.code == 0
    assert any(n.startswith("current-density:") for n in back.json()["records"][0]["newly_passing"])


def test_added_and_removed_records(history: tuple[Path, list[str]], tmp_path: Path) -> None:
    repo, revs = history
    clone = tmp_path / "clone"
    git(repo, "worktree", "add", "-q", "-b", "add-remove", str(clone), revs[3])
    git(clone, "rm", "-q", "designs/genset-4p48s.yaml")
    shutil.copy(clone / "designs/servo-10p12s.yaml", clone / "designs/servo-copy.yaml")
    _edit(clone / "designs/servo-copy.yaml", "id", "servo-copy")
    git(clone, "add", "-A")
    git(clone, "commit", "-qm", "add and remove")
    done = _diff(clone, revs[3], "HEAD", "--format", "json")
    status = {r["record_id"]: r["status"] for r in done.json()["records"]}
    assert status == {"genset-4p48s": "removed", "servo-copy": "added"}
    # The added copy of the servo breaks its limit at head: the gate fails, so does the diff.
    assert done.code == 1


def test_an_invalid_head_record_is_named_and_fails_the_diff(
    history: tuple[Path, list[str]], tmp_path: Path
) -> None:
    repo, revs = history
    clone = tmp_path / "broken"
    git(repo, "worktree", "add", "-q", "-b", "broken", str(clone), revs[3])
    _edit(clone / "designs/servo-10p12s.yaml", "stator.slots", "twelve")
    git(clone, "commit", "-qam", "break a record")
    done = _diff(clone, revs[3], "HEAD", "--format", "json")
    assert done.code == 2  # the head revision does not pass the gate: invalid input
    (rec,) = done.json()["records"]
    assert rec["status"] == "invalid"
    assert "designs/servo-10p12s.yaml:" in rec["notes"][0]  # located, in the repository
