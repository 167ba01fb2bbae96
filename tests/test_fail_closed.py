"""The gate fails closed: no bypass by a broken schema line, no absurd value accepted, no
policy that checks nothing, nothing read outside the repository, nothing overwritten.

Each test is a regression test for one way a broken design or a hostile file could once pass
the gate or lose its report.
"""

from __future__ import annotations

import json
import math
import os
import re
import signal
import stat
import subprocess
import sys
import threading
from pathlib import Path

import pytest
import yaml

from conftest import GENSET, PUMP, REPO, SERVO, STEELS, git, run_cli, write_variant

# The servo record breaks the current-density limit on purpose: checked, it exits 1.
BROKEN = SERVO


def _config(repo: Path, text: str = "") -> Path:
    path = repo / "emgate.yaml"
    path.write_text("schema: emgate/config@1\n" + text, encoding="utf-8")
    return path


def _json(*argv: str | Path) -> tuple[int, dict]:
    result = run_cli("check", "--format", "json", *argv)
    assert result.err == "" or result.code != 0, result.err
    return result.code, json.loads(result.out)


def _inputs(doc: dict) -> list[dict]:
    return [f for f in doc["findings"] if f["kind"] == "input" and f["severity"] == "error"]


# --- 1: a broken schema line is no bypass ------------------------------------------------

SCHEMA_VARIANTS = {
    "missing": None,
    "upper case": "EMGATE/design@1",
    "leading space": " emgate/design@1",
    "other version": "emgate/design@2",
    "a number": 1.5,
    "a list": ["emgate/design@1"],
}


def _variant(folder: Path, schema: object, name: str = "motor.yaml") -> Path:
    data = yaml.safe_load(BROKEN.read_text(encoding="utf-8"))
    if schema is None:
        del data["schema"]
    else:
        data["schema"] = schema
    path = folder / name
    path.write_text(yaml.safe_dump(data, sort_keys=False), encoding="utf-8")
    return path


@pytest.mark.parametrize("label", list(SCHEMA_VARIANTS))
@pytest.mark.parametrize("mode", ["folder", "named", "configured folder", "configured named"])
def test_a_broken_schema_line_is_an_error_not_a_skip(
    repo: Path, monkeypatch: pytest.MonkeyPatch, label: str, mode: str
) -> None:
    monkeypatch.chdir(repo)
    if mode.startswith("configured"):
        _config(repo)
        write_variant(repo, base=PUMP)  # a valid record beside it, checked too
    (repo / "designs").mkdir()
    path = _variant(repo / "designs", SCHEMA_VARIANTS[label])
    code, doc = _json(path if mode.endswith("named") else repo / "designs")
    assert code == 2, doc
    (error,) = _inputs(doc)
    assert error["file"] == "designs/motor.yaml"
    # located at the schema value, or at the top of the file when the key is missing
    assert error["line"] >= 1
    if label in ("upper case", "leading space", "other version"):
        assert "did you mean 'emgate/design@1'" in error["message"], error


def test_a_misspelt_schema_key_is_an_error_with_a_hint(repo: Path) -> None:
    text = BROKEN.read_text(encoding="utf-8").replace("schema: emgate", "Schema: emgate")
    (repo / "motor.yaml").write_text(text, encoding="utf-8")
    code, doc = _json(repo)
    assert code == 2
    (error,) = _inputs(doc)
    assert "did you mean 'schema'" in error["message"]
    # the key's line, read from the file itself
    want = next(i for i, ln in enumerate(text.splitlines(), 1) if ln.startswith("Schema:"))
    assert error["line"] == want


def test_a_list_root_holding_a_record_is_an_error(repo: Path) -> None:
    body = BROKEN.read_text(encoding="utf-8")
    text = "- " + body.replace("\n", "\n  ").rstrip() + "\n"
    (repo / "motor.yaml").write_text(text, encoding="utf-8")
    code, doc = _json(repo)
    assert code == 2
    (error,) = _inputs(doc)
    assert "found a list" in error["message"]


def test_unrelated_yaml_in_a_plain_folder_is_still_skipped(repo: Path) -> None:
    (repo / "ci.yml").write_text("jobs: {test: {runs-on: x}}\nschema: 1.5\n", encoding="utf-8")
    write_variant(repo, base=PUMP)
    code, doc = _json(repo)
    assert code == 0, doc
    assert [r["record_id"] for r in doc["records"]] == ["pump-drive-4p36s"]


def test_in_a_configured_repository_every_selected_file_must_be_emgate(repo: Path) -> None:
    _config(repo, 'files: ["designs/*.yaml"]\n')
    (repo / "designs").mkdir()
    write_variant(repo / "designs", base=PUMP)
    notes = repo / "designs" / "notes.yaml"
    notes.write_text("owner: team\n", encoding="utf-8")
    code, doc = _json(repo)
    assert code == 2
    (error,) = _inputs(doc)
    assert error["file"].endswith("designs/notes.yaml")
    assert "ignore_files" in error["message"]
    # listed as ignored, it passes; a hidden CI file is ignored by default
    _config(repo, 'files: ["designs/*.yaml"]\nignore_files: ["designs/notes.yaml"]\n')
    (repo / ".ci.yml").write_text("jobs: {}\n", encoding="utf-8")
    code, doc = _json(repo)
    assert code == 0, doc


def test_ignore_files_exempts_a_look_alike_but_not_a_near_miss_schema(repo: Path) -> None:
    _config(repo, 'ignore_files: ["fixtures/*"]\n')
    write_variant(repo, base=PUMP)
    (repo / "fixtures").mkdir()
    _variant(repo / "fixtures", None, "no-schema.yaml")  # a record's keys, no schema
    code, doc = _json(repo)
    assert code == 0, _inputs(doc)
    _variant(repo / "fixtures", "EMGATE/design@1", "upper.yaml")
    code, doc = _json(repo)
    assert code == 2
    (error,) = _inputs(doc)
    assert error["file"].endswith("fixtures/upper.yaml")


def test_a_named_non_emgate_file_in_a_configured_repository_is_an_error(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.chdir(repo)
    _config(repo)
    write_variant(repo, base=PUMP)
    (repo / "notes.yaml").write_text("owner: team\n", encoding="utf-8")
    code, doc = _json("notes.yaml")
    assert code == 2
    assert _inputs(doc)[0]["file"] == "notes.yaml"
    # an ignored one is skipped
    _config(repo, 'ignore_files: ["notes.yaml"]\n')
    code, doc = _json("notes.yaml")
    assert code == 0, doc


def _committed(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, files: dict[str, str] | None = None
) -> Path:
    """A configured git repository holding the pump record (or ``files``, name to text)
    and whatever the caller wrote in it, committed, as the working folder."""
    repo = tmp_path / "r"
    repo.mkdir(exist_ok=True)
    git(repo, "init", "-q")
    _config(repo)
    if files is None:
        write_variant(repo, base=PUMP)
    for name, text in (files or {}).items():
        (repo / name).parent.mkdir(parents=True, exist_ok=True)
        (repo / name).write_text(text, encoding="utf-8")
    git(repo, "add", "-A")
    git(repo, "commit", "-q", "-m", "start")
    monkeypatch.chdir(repo)
    return repo


@pytest.mark.skipif(
    subprocess.run(["git", "--version"], capture_output=True).returncode != 0,
    reason="needs git",
)
def test_changed_since_sees_a_record_that_lost_its_schema_line(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    (tmp_path / "r").mkdir()
    path = _variant(tmp_path / "r", "emgate/design@1")
    _committed(tmp_path, monkeypatch)
    path.write_text(path.read_text().replace("schema: emgate/design@1", "schema: 1.5"))
    code, doc = _json("--changed-since", "HEAD")
    assert code == 2, doc
    (error,) = _inputs(doc)
    assert error["file"] == "motor.yaml"


@pytest.mark.parametrize(
    "written",
    ["id: {}", "id: '{}'   # the pump line", '"id": {}', "id:   {}\t"],
    ids=["plain", "quoted-with-comment", "quoted-key", "spaces"],
)
def test_changed_since_fails_a_new_record_that_takes_an_unchanged_ones_id(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, written: str
) -> None:
    # A copied record that keeps its id passes a check of the change alone unless the ids
    # of the records the change leaves alone (not parsed, however their id line is written)
    # are known: the full check of the merged tree would fail.
    text = PUMP.read_text(encoding="utf-8")
    rid = re.search(r"^id: (\S+)", text, re.MULTILINE)[1]  # type: ignore[index]
    kept = re.sub(r"^id: .*$", written.format(rid), text, count=1, flags=re.MULTILINE)
    repo = _committed(tmp_path, monkeypatch, {"pump.yaml": kept})
    assert _json()[0] == 0  # the tree as committed passes
    (repo / "another-pump.yaml").write_text(text, encoding="utf-8")
    # the change checked alone, the file named as pre-commit names it, the whole tree
    for args in (("--changed-since", "HEAD"), ("another-pump.yaml",), ()):
        code, doc = _json(*args)
        assert code == 2, (args, doc)
        (error,) = _inputs(doc)
        assert f"record id {rid!r} is already used by" in error["message"], error
        assert error["line"] > 1  # at the id, not at the top of the file
    code, doc = _json("--changed-since", "HEAD")
    assert _inputs(doc)[0]["file"] == "another-pump.yaml"  # the change is what is refused
    assert "pump.yaml" in _inputs(doc)[0]["message"]


def test_a_named_record_may_share_its_id_with_a_file_the_files_globs_leave_out(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # A test fixture outside the configuration's files globs is no record of the full
    # check: a record named as pre-commit names it is not refused for sharing its id.
    text = PUMP.read_text(encoding="utf-8")
    _committed(tmp_path, monkeypatch, {"designs/pump.yaml": text, "fixtures/pump.yaml": text})
    _config(tmp_path / "r", 'files: ["designs/*.yaml"]\n')
    assert _json()[0] == 0  # the full check: the fixture is not read
    code, doc = _json("designs/pump.yaml")
    assert code == 0, _inputs(doc)


@pytest.mark.parametrize("copy", ["another-pump.yaml", "zz-pump.yaml"])
def test_a_copied_id_is_refused_in_a_change_that_also_edits_a_materials_file(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, copy: str
) -> None:
    # With a materials file in the change the records are read, and those its grades do
    # not touch returned before their id was known: the copy passed. Before and after the
    # original in file order.
    text = PUMP.read_text(encoding="utf-8")
    steels = STEELS.read_text(encoding="utf-8")
    repo = _committed(tmp_path, monkeypatch, {"pump.yaml": text, "materials/steels.yaml": steels})
    (repo / "materials" / "steels.yaml").write_text(steels + "\n# a note\n", encoding="utf-8")
    (repo / copy).write_text(text, encoding="utf-8")
    code, doc = _json("--changed-since", "HEAD")
    assert code == 2, doc
    (error,) = _inputs(doc)
    assert error["file"] == copy and "is already used by" in error["message"], error


# --- 5, 8: physically plausible ranges; non-finite is an input error at the field ----------


@pytest.mark.parametrize(
    ("base", "dotted", "value"),
    [
        (SERVO, "rotor.magnet.material.coercivity_temperature_coefficient", "1e308 %/K"),
        (PUMP, "stator.stack_length", "1e308 m"),
        (PUMP, "rating.frequency", "5e-324 Hz"),
        (PUMP, "winding.slot_liner", "1e300 mm"),
        (PUMP, "stator.stacking_factor", 5e-324),
        (GENSET, "rotor.field.current", "1e300 A"),
    ],
)
def test_an_implausible_value_is_an_input_error_at_its_field(
    repo: Path, base: Path, dotted: str, value: object
) -> None:
    if base is GENSET:
        (repo / "materials").mkdir()
        (repo / "materials" / "steels.yaml").write_text(STEELS.read_text(), encoding="utf-8")
    path = write_variant(repo, {dotted: value}, base=base)
    code, doc = _json(path)
    assert code == 2, doc
    (error,) = _inputs(doc)
    assert error["record_path"] == "$." + dotted
    assert "plausible" in error["message"] or "0.5" in error["message"], error
    shown = run_cli("show", path)
    assert shown.code == 2 and shown.out == "", shown.out


def test_the_plausible_range_is_stated_in_the_schema() -> None:
    schema = json.loads((REPO / "schemas" / "design.schema.json").read_text())
    text = json.dumps(schema)
    assert "plausible range 0.001 mm to 100 m" in text
    assert "plausible range -5 %/K to 5 %/K" in text


def test_a_bh_point_out_of_range_is_located(repo: Path) -> None:
    data = yaml.safe_load(STEELS.read_text(encoding="utf-8"))
    (grade,) = data["steels"]
    data["steels"][grade]["points"][3] = [1e300, 1e300]
    (repo / "steels.yaml").write_text(yaml.safe_dump(data, sort_keys=False))
    write_variant(repo, base=GENSET)
    code, doc = _json(repo)
    assert code == 2
    # the table's error, and the record's, whose steel is now unknown
    (error,) = [f for f in _inputs(doc) if f["file"].endswith("steels.yaml")]
    assert error["record_path"].endswith(".points[3]"), error
    assert "at most 10 T" in error["message"]


def test_a_non_finite_sheet_quantity_is_an_input_error_not_a_pass(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from emgate import calc

    monkeypatch.setitem(calc.PROVIDERS, "winding.temperature_rise", lambda c: math.nan)
    path = write_variant(repo, base=PUMP)
    code, doc = _json(path)
    assert code == 2
    (error,) = _inputs(doc)
    assert error["record_path"] == "$.cooling"
    assert "winding.temperature_rise" in error["message"]
    assert run_cli("show", "--format", "json", path).code == 2


@pytest.mark.parametrize("figure", ["5e-324 A/m^2", "-5e-324 A/m^2", "1e300 A/mm^2"])
def test_a_declared_figure_of_no_machine_is_an_input_error_not_a_crash(
    repo: Path, figure: str
) -> None:
    # The declared-values rule divides by the declared figure: the smallest subnormal would
    # make the relative difference infinite (a crash of the rule, or a passed check).
    path = repo / PUMP.name
    text = PUMP.read_text(encoding="utf-8")
    path.write_text(
        text.replace("stator.current_density: 6.6 A/mm^2", f"stator.current_density: {figure}"),
        encoding="utf-8",
    )
    code, doc = _json(path)
    assert code == 2, doc
    (error,) = _inputs(doc)
    assert error["record_path"] == "$.declared['stator.current_density']"
    assert "outside any quantity of a machine" in error["message"]
    assert not [f for f in doc["findings"] if f["kind"] == "crash"]


def _leaves(node: object, path: tuple = ()):  # type: ignore[no-untyped-def]
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _leaves(v, (*path, k))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _leaves(v, (*path, i))
    else:
        yield path, node


_NUMBER = re.compile(r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?")
EXTREMES = ("1e308", "5e-324", "1e300", "-1", "0")


def _extremes(value: object) -> list[object]:
    if isinstance(value, bool):
        return []
    if isinstance(value, int | float):
        return [1e308, 5e-324, 1e300, -1, 0]
    if isinstance(value, str) and (m := _NUMBER.match(value)):
        return [x + value[m.end() :] for x in EXTREMES]
    return []


def test_every_field_at_an_extreme_is_a_located_input_error_or_a_finite_verdict(
    tmp_path: Path,
) -> None:
    """Each numeric field of each bundled record set to 1e308, 5e-324, 1e300, -1 and 0 in
    turn: never a crash, a non-finite number or a traceback."""
    from emgate.config import load_policy
    from emgate.engine import execute
    from emgate.pipeline import Run
    from emgate.plugins import load_plugins

    plugins = load_plugins()
    (tmp_path / ".git").mkdir()
    (tmp_path / "steels.yaml").write_text(STEELS.read_text(encoding="utf-8"))
    policy = load_policy(None, {r: lr.rule for r, lr in plugins.rules.items()}, tmp_path)
    target = tmp_path / "record.yaml"
    runs = 0
    for base in (PUMP, SERVO, GENSET):
        data = yaml.safe_load(base.read_text(encoding="utf-8"))
        for path, value in _leaves(data):
            for extreme in _extremes(value):
                node = data
                for part in path[:-1]:
                    node = node[part]
                node[path[-1]] = extreme
                target.write_text(yaml.safe_dump(data, sort_keys=False))
                node[path[-1]] = value
                result = execute(Run(paths=[target], policy=policy, plugins=plugins))
                runs += 1
                where = f"{base.name} {path} = {extreme!r}"
                assert result.exit_code in (0, 1, 2), where
                assert not [f for f in result.findings if f.kind == "crash"], where
                for record in result.records:
                    for outcome in record.outcomes:
                        for check in outcome.checks:
                            assert math.isfinite(check.value), (where, check)
    assert runs > 500  # every numeric field of three records, five values each [count]


# --- 6: a policy that checks nothing, a waiver that is no reviewed exception ---------------


@pytest.mark.parametrize(
    ("text", "at"),
    [
        ("rules:\n  select: []\n", "$.rules"),
        ("rules:\n  ignore: [all]\n", "$.rules"),
        ("overrides:\n  - files: ['*.yaml']\n    rules: {ignore: [all]}\n", "$.overrides[0].rules"),
    ],
)
def test_a_policy_that_runs_no_rule_is_a_configuration_error(
    repo: Path, text: str, at: str
) -> None:
    _config(repo, text)
    code, doc = _json(write_variant(repo, base=BROKEN))
    assert code == 2
    (error,) = _inputs(doc)
    assert error["record_path"] == at
    assert "runs no rule" in error["message"]


WAIVER = {
    "rule": "current-density",
    "reason": "prototype frame, see test report",
    "owner": "J. Doe",
    "expires": "2099-01-01",
}


@pytest.mark.parametrize(
    ("change", "words"),
    [
        ({"rule": "current-denisty"}, "did you mean 'current-density'"),
        ({"rule": "all"}, "'all', wildcards and tags"),
        ({"rule": "*"}, "'all', wildcards and tags"),
        ({"rule": "current-*"}, "'all', wildcards and tags"),
        ({"rule": "tag:thermal"}, "'all', wildcards and tags"),
        ({"rule": "acme/"}, "pack prefix"),
        ({"path": "$.winding.cond"}, "names no node"),
        ({"path": "$.nowhere"}, "names no node"),
    ],
)
@pytest.mark.parametrize("where", ["record", "file"])
def test_a_waiver_that_names_no_rule_or_no_node_is_an_error(
    repo: Path, change: dict, words: str, where: str
) -> None:
    _config(repo)
    waiver = {**WAIVER, **change}
    if where == "record":
        path = write_variant(repo, {"waivers": [waiver]}, base=BROKEN)
    else:
        path = write_variant(repo, base=BROKEN)
        data = {"schema": "emgate/waivers@1", "waivers": [{**waiver, "record": "servo-10p12s"}]}
        (repo / "waivers.yaml").write_text(yaml.safe_dump(data, sort_keys=False))
    code, doc = _json(path)
    assert code == 2, doc
    errors = [f for f in _inputs(doc) if words in f["message"]]
    assert len(errors) == 1, _inputs(doc)
    # the broken design is still checked and reported, its finding not waived
    (finding,) = [f for f in doc["findings"] if f["rule"] == "current-density"]
    assert finding["waived"] is False


def test_an_option_out_of_the_plausible_range_is_an_error(repo: Path) -> None:
    _config(repo, "options:\n  current-density:\n    enclosed_natural: 1e300 A/mm^2\n")
    code, doc = _json(write_variant(repo, base=BROKEN))
    assert code == 2
    (error,) = _inputs(doc)
    assert error["record_path"] == "$.options['current-density'].enclosed_natural" or (
        error["record_path"].endswith("enclosed_natural")
    )
    assert "plausible range 0.001 A/mm^2 to 1000 A/mm^2" in error["message"]


# --- 11: nothing outside the repository is read or quoted ---------------------------------


def test_a_waivers_file_outside_the_repository_is_refused_unread(tmp_path: Path) -> None:
    outside = tmp_path / "secret.yaml"
    outside.write_text("root-password-line\n", encoding="utf-8")
    repo = tmp_path / "repo"
    repo.mkdir()
    (repo / ".git").mkdir()
    _config(repo, "waivers: ../secret.yaml\n")
    result = run_cli("check", "--format", "json", write_variant(repo, base=PUMP))
    assert result.code == 2
    (error,) = _inputs(result.json())
    assert error["record_path"] == "$.waivers"
    assert "outside the repository" in error["message"]
    assert "root-password-line" not in result.out + result.err


def test_a_link_out_of_the_repository_is_not_followed(tmp_path: Path) -> None:
    outside = tmp_path / "secret.yaml"
    outside.write_text("schema: 1.5\nstator: root-password-line\n", encoding="utf-8")
    repo = tmp_path / "repo"
    repo.mkdir()
    (repo / ".git").mkdir()
    _config(repo, "waivers: linked.yaml\n")
    (repo / "linked.yaml").symlink_to(outside)
    result = run_cli("check", "--format", "json", write_variant(repo, base=PUMP))
    assert result.code == 2
    assert "root-password-line" not in result.out + result.err
    # and a folder walk does not read a linked file either
    (repo / "emgate.yaml").unlink()
    result = run_cli("check", "--format", "json", repo)
    assert "root-password-line" not in result.out + result.err
    assert any("outside" in f["message"] for f in _inputs(result.json()))


@pytest.mark.parametrize("git", [False, True], ids=["walk", "git"])
def test_a_link_in_a_checked_folder_that_leads_nowhere_is_an_error(
    tmp_path: Path, git: bool
) -> None:
    # A record replaced by a dangling link (or a loop) must not pass as if it were absent.
    import shutil
    import subprocess

    repo = tmp_path / "repo"
    (repo / "designs").mkdir(parents=True)
    shutil.copy(PUMP, repo / "designs" / "pump.yaml")
    (repo / "designs" / "motor.yaml").symlink_to("gone.yaml")
    (repo / "designs" / "shared.yaml").symlink_to("../shared/motor.yaml")
    (repo / "designs" / "a.yaml").symlink_to("b.yaml")
    (repo / "designs" / "b.yaml").symlink_to("a.yaml")
    if git:
        if shutil.which("git") is None:
            pytest.fail("git is needed (the CI set-up installs it)")
        subprocess.run(["git", "init", "-q"], cwd=repo, check=True)
        subprocess.run(["git", "add", "-A"], cwd=repo, check=True)
    result = run_cli("check", "--format", "json", repo / "designs")
    assert result.code == 2, result.out + result.err
    inputs = _inputs(result.json())
    named = {Path(f["file"]).name: f for f in inputs}
    assert {"motor.yaml", "shared.yaml", "a.yaml", "b.yaml"} <= set(named), inputs
    assert named["motor.yaml"]["line"] == 1
    assert "cannot read file: No such file" in named["motor.yaml"]["message"]
    assert "symbolic links" in named["a.yaml"]["message"]  # the loop, as the system says
    assert "leading outside" in named["shared.yaml"]["message"]
    assert [r["record_id"] for r in result.json()["records"]] == ["pump-drive-4p36s"]


def test_a_link_loop_named_or_changed_in_a_configured_repository_is_an_input_error(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # pathlib's resolve raises RuntimeError on a loop (Python 3.11): it ended the run as an
    # internal error (exit 3) where a named or changed file is related to the repository.
    _committed(tmp_path, monkeypatch)
    Path("a.yaml").symlink_to("b.yaml")
    Path("b.yaml").symlink_to("a.yaml")
    code, doc = _json("a.yaml")  # as pre-commit names a staged file
    assert code == 2, doc
    (error,) = _inputs(doc)
    assert "symbolic link that leads to no file" in error["message"], error
    code, doc = _json("--changed-since", "HEAD")
    assert code == 2, doc
    assert {f["file"] for f in _inputs(doc)} == {"a.yaml", "b.yaml"}
    assert all("symbolic links" in f["message"] for f in _inputs(doc))


def test_a_waivers_file_that_is_no_emgate_file_is_not_quoted(repo: Path) -> None:
    _config(repo, "waivers: notes.yaml\n")
    (repo / "notes.yaml").write_text("first-line-of-a-private-file: 1\n", encoding="utf-8")
    result = run_cli("check", "--format", "json", write_variant(repo, base=PUMP))
    assert result.code == 2
    assert "first-line-of-a-private-file" not in result.out + result.err
    assert any("emgate/waivers@1" in f["message"] for f in _inputs(result.json()))


# --- 9: only regular files are read ------------------------------------------------------


def _emgate(*args: str, cwd: Path, timeout: float = 60) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "emgate", *args],
        cwd=cwd,
        capture_output=True,
        text=True,
        timeout=timeout,  # a blocked read fails the test instead of hanging it
        check=False,
    )


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="needs FIFOs")
@pytest.mark.parametrize("how", ["record", "config"])
def test_a_fifo_is_an_error_not_a_block(repo: Path, how: str) -> None:
    fifo = repo / "pipe.yaml"
    os.mkfifo(fifo)
    write_variant(repo, base=PUMP)
    args = ["check", "pipe.yaml"] if how == "record" else ["check", "--config", "pipe.yaml", "."]
    proc = _emgate(*args, cwd=repo)
    assert proc.returncode == 2, proc.stdout + proc.stderr
    assert "not a regular file" in proc.stdout + proc.stderr


# --- 10: control characters escaped in every human-readable output -----------------------

FORGED = "Motor\\e[2J\\nPASS: forged\\a"  # YAML escapes: ESC, a line end, BEL


def test_record_text_cannot_forge_a_line_or_drive_a_terminal(repo: Path) -> None:
    path = write_variant(repo, base=BROKEN)
    text = path.read_text(encoding="utf-8")
    title = next(ln for ln in text.splitlines() if ln.startswith("title:"))
    path.write_text(text.replace(title, f'title: "{FORGED}"'), encoding="utf-8")
    shown = run_cli("show", path)
    assert shown.code == 0, shown.err
    for out in (shown.out, run_cli("check", path).out):
        assert "\x1b" not in out and "\x07" not in out
        assert not any(line.startswith("PASS: forged") for line in out.splitlines())
    assert "\\x1b[2J\\nPASS: forged\\x07" in shown.out


def test_diff_text_escapes_a_changed_title(repo: Path) -> None:
    old = write_variant(repo, name="old.yaml")
    new = write_variant(repo, name="new.yaml")
    text = new.read_text(encoding="utf-8")
    title = next(ln for ln in text.splitlines() if ln.startswith("title:"))
    new.write_text(text.replace(title, f'title: "{FORGED}"'), encoding="utf-8")
    done = run_cli("diff", old, new)
    assert done.code == 0, done.err
    assert "\x1b" not in done.out and "\x07" not in done.out
    assert not any(line.startswith("PASS: forged") for line in done.out.splitlines())


def test_text_and_junit_escape_every_finding_line() -> None:
    from xml.dom import minidom

    from emgate.findings import Finding, RecordResult, RuleOutcome, RunResult
    from emgate.report import reporter

    hostile = "ok\nPASS: 0 error(s)\r::error file=x::forged\x1b[0m\u2028x"
    result = RunResult(
        records=[RecordResult("d/a.yaml", "m-1", "induction", [RuleOutcome("r", "fail")])],
        findings=[
            Finding("r", "warning", "d/a\n.yaml", 3, 1, "$", hostile, "m-1"),
            Finding("r", "error", "d/a.yaml", 4, 1, "$", "x", "m-1", waived_by=hostile),
        ],
    )
    text = reporter("text")(result)
    junit = reporter("junit")(result)
    assert "\x1b" not in text and "\u2028" not in text
    assert "\x1b" not in junit  # (attributes keep line ends, which XML encodes as &#10;)
    dom = minidom.parseString(junit)
    texts = [
        node.firstChild.data
        for tag in ("system-out", "failure", "skipped", "error")
        for node in dom.getElementsByTagName(tag)
        if node.firstChild is not None
    ]
    for out in (text, *texts):
        assert not any(
            line.lstrip().startswith(("PASS: 0", "::error")) for line in out.splitlines()
        ), out
        assert "\u2028" not in out
    system_out = dom.getElementsByTagName("system-out")
    assert system_out and "\\nPASS: 0 error(s)" in system_out[0].firstChild.data


# --- 12: python -m emgate imports nothing planted in the working directory ----------------


def test_python_m_emgate_does_not_import_a_planted_module(repo: Path) -> None:
    marker = repo / "planted-ran"
    (repo / "argparse.py").write_text(
        f"open({str(marker)!r}, 'w').close()\nraise SystemExit(99)\n", encoding="utf-8"
    )
    write_variant(repo, base=PUMP)
    proc = _emgate("check", ".", cwd=repo)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    assert not marker.exists()


# --- 13: nothing overwritten, nothing left behind ---------------------------------------


def test_a_report_in_a_missing_folder_is_an_error(repo: Path) -> None:
    report = repo / "missing" / "r.json"
    result = run_cli("check", "--format", f"json:{report}", write_variant(repo, base=PUMP))
    assert result.code == 2
    assert "folder does not exist" in result.err
    assert not (repo / "missing").exists()


def test_a_symbolic_link_is_written_through_not_replaced(repo: Path) -> None:
    target = repo / "target.json"
    target.write_text("old\n")
    link = repo / "link.json"
    link.symlink_to(target)
    result = run_cli("check", "--format", f"json:{link}", write_variant(repo, base=PUMP))
    assert result.code == 0, result.err
    assert link.is_symlink()
    assert json.loads(target.read_text())["exit_code"] == 0


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="needs FIFOs")
def test_a_fifo_report_is_written_in_place(repo: Path) -> None:
    from emgate.atomic import write_atomic

    fifo = repo / "report.fifo"
    os.mkfifo(fifo)
    got: list[str] = []
    reader = threading.Thread(target=lambda: got.append(fifo.read_text()), daemon=True)
    reader.start()
    write_atomic(fifo, "report\n")
    reader.join(timeout=30)
    assert got == ["report\n"]
    assert stat.S_ISFIFO(os.lstat(fifo).st_mode)
    assert sorted(p.name for p in repo.iterdir()) == [".git", "report.fifo"]


def test_a_character_device_is_written_in_place(tmp_path: Path) -> None:
    from emgate.atomic import write_atomic

    node = tmp_path / "null"
    try:  # a copy of the null device (Linux: major 1, minor 3), never the system's own
        os.mknod(node, 0o666 | stat.S_IFCHR, os.makedev(1, 3))
    except (OSError, AttributeError):
        pytest.skip("cannot make a device node here")
    write_atomic(node, "report\n")
    assert stat.S_ISCHR(os.lstat(node).st_mode)
    assert [p.name for p in tmp_path.iterdir()] == ["null"]


def test_sigterm_during_a_write_leaves_no_temporary(tmp_path: Path) -> None:
    code = f"""
import sys, time
import emgate.atomic as a
from pathlib import Path
def slow(fd):
    print("ready", flush=True)
    time.sleep(60)
a.os.fsync = slow
a.write_atomic(Path({str(tmp_path / "r.json")!r}), "x" * 100000)
"""
    proc = subprocess.Popen(
        [sys.executable, "-c", code], stdout=subprocess.PIPE, text=True, cwd=tmp_path
    )
    assert proc.stdout is not None and proc.stdout.readline().strip() == "ready"
    assert any(p.name.endswith(".emgate-tmp") for p in tmp_path.iterdir())  # premise
    proc.send_signal(signal.SIGTERM)
    assert proc.wait(timeout=30) == 128 + signal.SIGTERM  # the shell's convention
    assert list(tmp_path.iterdir()) == []


def test_a_stale_temporary_of_a_dead_run_is_removed(tmp_path: Path) -> None:
    from emgate.atomic import write_atomic

    report = tmp_path / "r.json"
    # 2**22 + 1 lies above Linux's largest process id: no process has it.
    dead = tmp_path / f".r.json.{2**22 + 1}.abcd.emgate-tmp"
    alive = tmp_path / f".r.json.{os.getppid()}.abcd.emgate-tmp"
    dead.write_text("half")
    alive.write_text("busy")
    write_atomic(report, "new\n")
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted([alive.name, "r.json"])


def test_sigterm_during_a_staged_write_leaves_no_staging_folder(tmp_path: Path) -> None:
    code = f"""
import sys, time
import emgate.atomic as a
from pathlib import Path
with a.staging(Path({str(tmp_path / "index.html")!r})) as staged:
    (staged / "sheet-a.html").write_text("drawn")
    print("ready", flush=True)
    time.sleep(60)
"""
    proc = subprocess.Popen(
        [sys.executable, "-c", code], stdout=subprocess.PIPE, text=True, cwd=tmp_path
    )
    assert proc.stdout is not None and proc.stdout.readline().strip() == "ready"
    assert any(p.name.endswith(".emgate-tmp") for p in tmp_path.iterdir())  # premise
    proc.send_signal(signal.SIGTERM)
    assert proc.wait(timeout=30) == 128 + signal.SIGTERM
    assert list(tmp_path.iterdir()) == []


def test_a_staged_file_lands_by_rename_or_through_a_link(tmp_path: Path) -> None:
    from emgate.atomic import land, staging

    elsewhere = tmp_path / "kept.html"
    elsewhere.write_text("old", encoding="utf-8")
    (tmp_path / "linked.html").symlink_to(elsewhere)
    with staging(tmp_path / "index.html") as staged:
        for name in ("plain.html", "linked.html"):
            (staged / name).write_text(f"new {name}", encoding="utf-8")
            land(staged / name, tmp_path / name)
    assert (tmp_path / "plain.html").read_text(encoding="utf-8") == "new plain.html"
    assert (tmp_path / "linked.html").is_symlink()  # the link kept, its file written
    assert elsewhere.read_text(encoding="utf-8") == "new linked.html"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["kept.html", "linked.html", "plain.html"]


def test_a_process_forked_while_staging_leaves_the_staging_folder_alone(tmp_path: Path) -> None:
    # a --jobs worker inherits the run's SIGTERM handler, and the pool ends its workers with
    # SIGTERM: the worker must die as SIGTERM says, not remove the run's staging folder
    code = f"""
import os, signal, sys, time
import emgate.atomic as a
from pathlib import Path
with a.staging(Path({str(tmp_path / "index.html")!r})) as staged:
    child = os.fork()
    if child == 0:
        os.kill(os.getpid(), signal.SIGTERM)
        time.sleep(10)
        os._exit(0)
    _, status = os.waitpid(child, 0)
    print(os.WIFSIGNALED(status) and os.WTERMSIG(status) == signal.SIGTERM, staged.is_dir())
"""
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, cwd=tmp_path, timeout=60
    )
    assert done.stdout.split() == ["True", "True"], done.stderr
    assert list(tmp_path.iterdir()) == []  # and the run's own exit removed it
