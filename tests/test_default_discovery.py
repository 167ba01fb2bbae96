"""Without ``files:`` in emgate.yaml the gate checks the repository's own YAML files: what git
lists in a work tree, else a walk that skips hidden folders and virtual environments; a
YAML file that is not an emgate file is skipped silently unless ``--verbose`` asks."""

from __future__ import annotations

import json
import os
import shutil
from pathlib import Path

import pytest
import yaml

from conftest import PUMP, git, run_cli
from emgate.listing import yaml_files

pytestmark = pytest.mark.skipif(shutil.which("git") is None, reason="needs git")


def design_repository(root: Path) -> Path:
    """A record, a CI file, and copies of the record where no design lives: inside a
    virtual environment's site-packages, a venv of another name, node_modules and .nox."""
    root.mkdir()
    (root / "emgate.yaml").write_text("schema: emgate/config@1\n")
    (root / "designs").mkdir()
    (root / "designs" / "pump.yaml").write_text(PUMP.read_text())
    (root / "ci.yml").write_text("stages: [test]\n")
    record = PUMP.read_text().replace("id: pump-drive-4p36s", "id: not-ours")
    for folder in (
        ".venv/lib/python3.12/site-packages/pkg",
        "tools-env/lib/python3.12/site-packages/pkg",
        "node_modules/pkg",
        ".nox/gate/lib",
    ):
        (root / folder).mkdir(parents=True)
        (root / folder / "record.yaml").write_text(record)
    (root / "tools-env" / "pyvenv.cfg").write_text("home = /usr/bin\n")
    return root


def names(root: Path) -> list[str]:
    return [p.relative_to(root).as_posix() for p in yaml_files(root)]


def test_git_lists_tracked_and_untracked_not_ignored_files(tmp_path: Path) -> None:
    root = design_repository(tmp_path / "repo")
    (root / ".gitignore").write_text("scratch/\n")
    (root / "scratch").mkdir()
    (root / "scratch" / "old.yaml").write_text(PUMP.read_text())
    git(root, "init", "-q")
    git(root, "add", "designs/pump.yaml")
    git(root, "commit", "-qm", "one record")
    (root / "designs" / "new.yaml").write_text("a: 1\n")  # untracked, not ignored
    # The environments are not ignored by git (no entry in .gitignore): skipped all the same.
    assert names(root) == ["ci.yml", "designs/new.yaml", "designs/pump.yaml", "emgate.yaml"]


def test_without_git_the_walk_skips_hidden_folders_and_environments(tmp_path: Path) -> None:
    root = design_repository(tmp_path / "plain")
    (root / ".hidden").mkdir()
    (root / ".hidden" / "x.yaml").write_text("a: 1\n")
    assert names(root) == ["ci.yml", "designs/pump.yaml", "emgate.yaml"]


@pytest.mark.parametrize("with_git", [True, False])
def test_a_config_without_files_checks_only_the_repositorys_records(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, with_git: bool
) -> None:
    root = design_repository(tmp_path / "repo")
    if with_git:
        git(root, "init", "-q")
    monkeypatch.chdir(root)
    quiet = run_cli("check", "--format", "json")
    assert quiet.code == 0, quiet.out
    assert [r["record_id"] for r in quiet.json()["records"]] == ["pump-drive-4p36s"]
    assert quiet.json()["findings"] == []  # ci.yml is skipped silently
    told = run_cli("check", "--verbose", "--format", "json")
    notes = [f for f in told.json()["findings"] if f["kind"] == "note"]
    assert [(f["file"], f["severity"]) for f in notes] == [("ci.yml", "info")]
    assert "not an emgate file" in notes[0]["message"]


@pytest.mark.skipif(os.name != "posix", reason="the NUL key is the POSIX sort key")
def test_the_listing_sorts_as_the_lists_of_path_parts_sort() -> None:
    # Reference: pathlib's order of POSIX paths, part by part (PurePosixPath comparison).
    from pathlib import PurePosixPath

    from hypothesis import given, settings
    from hypothesis import strategies as st

    from emgate.listing import _parts

    part = st.text(alphabet="ab-._/ Z0\u00e9", min_size=1, max_size=6).filter(
        lambda p: "/" not in p and p not in (".", "..")
    )
    name = st.lists(part, min_size=1, max_size=4).map("/".join)

    @settings(max_examples=300, deadline=None)
    @given(st.lists(name, min_size=2, max_size=12, unique=True))
    def same_order(names: list[str]) -> None:
        assert sorted(names, key=_parts) == sorted(names, key=PurePosixPath)

    same_order()
    assert sorted(["a-b/x", "a/x", "a/x/y", "a"], key=_parts) == ["a", "a/x", "a/x/y", "a-b/x"]


@pytest.mark.parametrize(
    "text",
    [
        "schema: emgate/design@1\nid: pump-a\ntitle: x\n",
        "id: pump-a\nschema: emgate/design@1\n",  # the first line
        "schema: emgate/design@1\nid: 'pump-a'   # the pump\n",
        'schema: emgate/design@1\nid: "pump-a"\r\ntitle: x\r\n',  # CRLF: parsed instead
        'schema: emgate/design@1\n"id": pump-a\n',  # a quoted key: parsed
        "{schema: emgate/design@1, id: pump-a}\n",  # flow style: parsed
        "schema: emgate/design@1\nid:\n  pump-a\n",  # the value on the next line: parsed
        "schema: emgate/design@1\nid: Pump-A\n",  # an id the schema refuses: as parsed
        "schema: emgate/design@1\nidle: 3\nid: pump-a",  # no line end at the end
        "schema: emgate/design@1\nnotes: |\n  id: other\nid: pump-a\n",  # indented: no id
        'schema: emgate/design@1\nid: pump-a\ntitle: "a long\nid: other"\n',  # inside a text
    ],
)
def test_a_records_id_is_read_as_pyyaml_parses_it(text: str, tmp_path: Path) -> None:
    # Reference: PyYAML's safe_load, the parse a full check would take the id from.
    import yaml

    from emgate.discovery import record_ids

    assert record_ids(tmp_path / "r.yaml", text) == [yaml.safe_load(text)["id"]]


def test_a_record_that_does_not_parse_gives_no_id(tmp_path: Path) -> None:
    from emgate.discovery import record_ids

    assert record_ids(tmp_path / "r.yaml", "schema: emgate/design@1\nid: [pump\n") == []


def test_discovery_keeps_one_copy_of_what_every_record_shares(tmp_path: Path) -> None:
    # A run holds a Source for each record until it is checked: the declared schema is the
    # schema's own constant, and a name that is already resolved is its own key.
    from emgate.discovery import discover
    from emgate.findings import RunResult
    from emgate.terms import DESIGN_SCHEMA

    folder = (tmp_path / "designs").resolve()
    folder.mkdir()
    shutil.copy(PUMP, folder / "pump.yaml")
    (source,) = discover([folder], RunResult(), design_text=False)
    assert source.declared is DESIGN_SCHEMA
    assert source.key is source.name and source.name == str(folder / "pump.yaml")


@pytest.mark.parametrize("with_git", [True, False])
def test_a_listing_leaves_out_the_folders_it_is_told_to_skip(
    tmp_path: Path, with_git: bool
) -> None:
    from emgate.listing import yaml_names

    root = tmp_path / "repo"
    for name in ("designs/a.yaml", "designs/deep/b.yaml", "odd [*] name/c.yaml", "other/d.yaml"):
        (root / name).parent.mkdir(parents=True, exist_ok=True)
        (root / name).write_text("a: 1\n")
    (root / "odd [x] name").mkdir()  # what the other would match as a glob: still listed
    (root / "odd [x] name" / "e.yaml").write_text("a: 1\n")
    if with_git:
        git(root, "init", "-q")
    skip = {os.path.realpath(root / "designs"), os.path.realpath(root / "odd [*] name")}
    skip.add(os.path.realpath(tmp_path))  # a folder that holds the root leaves nothing out
    listed = [Path(n).relative_to(root).as_posix() for n in yaml_names(root, skip=skip)]
    assert listed == ["odd [x] name/e.yaml", "other/d.yaml"]


@pytest.mark.parametrize("with_git", [True, False])
@pytest.mark.parametrize("steels_in", ["designs", "materials"])
def test_a_check_of_a_folder_finds_the_materials_of_its_repository_once(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, with_git: bool, steels_in: str
) -> None:
    from conftest import GENSET, STEELS

    root = tmp_path / "repo"
    (root / "designs" / "gensets").mkdir(parents=True)
    (root / "emgate.yaml").write_text("schema: emgate/config@1\n")
    shutil.copy(GENSET, root / "designs" / "gensets" / GENSET.name)
    (root / steels_in).mkdir(exist_ok=True)
    shutil.copy(STEELS, root / steels_in / STEELS.name)
    if with_git:
        git(root, "init", "-q")
    monkeypatch.chdir(root)
    for folder in ("designs/gensets", "designs"):
        done = run_cli("check", "--format", "json", folder)
        report = done.json()
        # the steels are found (else: an unknown grade), and read once (else: each grade
        # "already defined")
        assert [f for f in report["findings"] if f["kind"] != "violation"] == [], folder
        assert [r["record_id"] for r in report["records"]] == ["genset-4p48s"], folder


@pytest.mark.parametrize("with_git", [True, False])
def test_the_materials_of_a_repository_are_found_as_discovery_finds_them(
    tmp_path: Path, with_git: bool
) -> None:
    # a file whose head declares another schema is passed over by its head alone; any other
    # goes through discovery: a materials file written in flow style (no schema line) is
    # found, one reached by a link from outside the repository is not
    from conftest import STEELS
    from emgate.discovery import materials_sources

    root = tmp_path / "repo"
    (root / "designs").mkdir(parents=True)
    (root / "emgate.yaml").write_text("schema: emgate/config@1\n")
    shutil.copy(PUMP, root / "designs" / PUMP.name)
    shutil.copy(STEELS, root / "steels.yaml")
    flow = yaml.safe_load(STEELS.read_text(encoding="utf-8"))
    (root / "designs" / "flow.yaml").write_text(json.dumps(flow), encoding="utf-8")
    (tmp_path / "outside.yaml").write_text(STEELS.read_text(encoding="utf-8"))
    (root / "linked.yaml").symlink_to(tmp_path / "outside.yaml")
    if with_git:
        git(root, "init", "-q")
    found = [Path(s.name).relative_to(root).as_posix() for s in materials_sources(root)]
    assert found == ["designs/flow.yaml", "steels.yaml"]
