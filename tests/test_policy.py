"""The merge-gate features around the rules: the policy file (selection, severities, limits,
overrides, required packs), the reviewed waivers file, ``--changed-since``, report files,
``emgate init``, and files that are not emgate's.

The oracle is the documented behaviour (README, "A design repository"; each feature's module
docstring), plus PyYAML's composer for the expected line of a node and git itself for what
changed.
"""

from __future__ import annotations

import json
import os
import shutil
import xml.etree.ElementTree as ET
from importlib.metadata import version
from pathlib import Path
from typing import Any

import pytest
import yaml
from packaging.version import Version

from conftest import GENSET, PUMP, SERVO, STEELS, CliResult, git, node_mark, run_cli, write_variant

MM2 = 1e-6  # m^2 per mm^2
PACK = "brennfeld-emgate-pack"

# --- helpers ---------------------------------------------------------------------------------


def write_config(folder: Path, text: str) -> Path:
    """An emgate.yaml with ``text`` after the schema line (block style, so node_mark applies)."""
    path = folder / "emgate.yaml"
    path.write_text("schema: emgate/config@1\n" + text, encoding="utf-8")
    return path


def check_json(*argv: str | Path) -> CliResult:
    return run_cli("check", "--format", "json", *argv)


def outcomes(result: CliResult, record_id: str) -> dict[str, dict[str, Any]]:
    (record,) = [r for r in result.json()["records"] if r["record_id"] == record_id]
    return {o["rule"]: o for o in record["outcomes"]}


def limit_of(result: CliResult, record_id: str, rule: str, quantity: str) -> float:
    (check,) = [c for c in outcomes(result, record_id)[rule]["checks"] if c["quantity"] == quantity]
    return check["limit"]


def record_ids(result: CliResult) -> list[str]:
    return sorted(r["record_id"] for r in result.json()["records"])


def installed_rules() -> list[dict[str, Any]]:
    result = run_cli("rules", "--format", "json")
    assert result.code == 0, result.err
    return json.loads(result.out)


# --- emgate.yaml: rule selection -------------------------------------------------------------


def test_select_by_id_runs_only_that_rule(repo: Path) -> None:
    write_config(repo, "rules:\n  select: [current-density]\n")
    result = check_json(write_variant(repo))
    assert result.code == 0, result.out
    assert set(outcomes(result, "pump-drive-4p36s")) == {"current-density"}


def test_pack_prefix_selects_and_ignores_the_pack_rules(repo: Path) -> None:
    pack_rules = {r["id"] for r in installed_rules() if r["origin"]["distribution"] == PACK}
    every = {r["id"] for r in installed_rules()}
    assert pack_rules == {"brennfeld/stack-aspect"}  # the sample pack's one rule
    path = write_variant(repo)
    write_config(repo, "rules:\n  select: ['brennfeld/']\n")
    assert set(outcomes(check_json(path), "pump-drive-4p36s")) == pack_rules
    write_config(repo, "rules:\n  ignore: ['brennfeld/']\n")
    assert set(outcomes(check_json(path), "pump-drive-4p36s")) == every - pack_rules


def test_tag_selects_the_tagged_rules(repo: Path) -> None:
    thermal = {r["id"] for r in installed_rules() if "thermal" in r["tags"]}
    assert "current-density" in thermal and "gap-flux" not in thermal  # the rules' own tags
    write_config(repo, "rules:\n  select: ['tag:thermal']\n")
    assert set(outcomes(check_json(write_variant(repo)), "pump-drive-4p36s")) == thermal


def test_ignoring_a_tag_removes_its_failures(repo: Path) -> None:
    path = write_variant(repo, base=SERVO)
    plain = check_json(path)
    assert plain.code == 1
    failing = {f["rule"] for f in plain.json()["findings"] if f["severity"] == "error"}
    thermal = {r["id"] for r in installed_rules() if "thermal" in r["tags"]}
    assert failing and failing <= thermal  # the demo servo only breaks thermal limits
    write_config(repo, "rules:\n  ignore: ['tag:thermal']\n")
    result = check_json(path)
    assert result.code == 0, result.out
    assert not thermal & set(outcomes(result, "servo-10p12s"))


def test_severity_override_turns_an_error_into_a_warning(repo: Path) -> None:
    path = write_variant(repo, base=SERVO)
    write_config(repo, "rules:\n  select: [current-density]\n")
    assert check_json(path).code == 1  # control: the servo breaks the limit as an error
    write_config(
        repo, "rules:\n  select: [current-density]\nseverity:\n  current-density: warning\n"
    )
    result = check_json(path)
    assert result.code == 0, result.out
    (finding,) = result.json()["findings"]
    assert (finding["rule"], finding["severity"]) == ("current-density", "warning")
    assert result.json()["summary"]["warnings"] == 1


@pytest.mark.parametrize(("limit", "code"), [("7 A/mm^2", 0), ("6 A/mm^2", 1)])
def test_an_option_with_units_sets_the_limit(repo: Path, limit: str, code: int) -> None:
    # [calc] the pump's J = (14.6 A / sqrt 3) / (2 pi (0.45 mm)^2) = 6.63 A/mm^2 (delta, two
    # strands), so a 7 A/mm^2 limit passes it and 6 A/mm^2 fails it.
    write_config(
        repo,
        f"rules:\n  select: [current-density]\noptions:\n  current-density:\n"
        f"    enclosed_fan: {limit}\n",
    )
    result = check_json(write_variant(repo))
    assert result.code == code, result.out
    value = float(limit.split()[0]) / MM2  # [calc] 1 A/mm^2 = 1e6 A/m^2
    got = limit_of(result, "pump-drive-4p36s", "current-density", "stator.current_density")
    assert got == pytest.approx(value, rel=1e-12)  # a unit conversion: rounding only


@pytest.mark.parametrize(
    ("text", "node", "key", "hint"),
    [
        ("rules:\n  select:\n    - current-densty\n", "rules.select.0", False, "current-density"),
        ("rules:\n  ignore:\n    - slot-fil\n", "rules.ignore.0", False, "slot-fill"),
        ("severity:\n  yoke-flx: warning\n", "severity.yoke-flx", True, "yoke-flux"),
        (
            "overrides:\n  - files: ['*']\n    options:\n      tooth-flx: {}\n",
            "overrides.0.options.tooth-flx",
            True,
            "tooth-flux",
        ),
    ],
    ids=["select", "ignore", "severity", "override-options"],
)
def test_an_unknown_rule_id_is_located_with_a_hint(
    repo: Path, text: str, node: str, key: bool, hint: str
) -> None:
    config = write_config(repo, text)
    result = check_json(write_variant(repo))
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    assert error["file"].endswith("emgate.yaml")
    assert (error["line"], error["column"]) == node_mark(config, node, key=key)
    assert f"did you mean {hint!r}?" in error["message"]
    assert result.json()["records"] == []  # a broken policy checks nothing


def test_a_bad_option_value_in_an_override_is_located(repo: Path) -> None:
    config = write_config(
        repo,
        "overrides:\n  - files: ['*.yaml']\n    options:\n      current-density:\n"
        "        enclosed_fan: 3 A\n",
    )
    result = check_json(write_variant(repo))
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    node = "overrides.0.options.current-density.enclosed_fan"
    assert (error["line"], error["column"]) == node_mark(config, node)
    assert "expected a current density" in error["message"]
    assert "'3 A'" in error["message"]


def test_an_unknown_option_name_is_located_at_its_key(repo: Path) -> None:
    config = write_config(repo, "options:\n  current-density:\n    enclosed_fann: 8 A/mm^2\n")
    result = check_json(write_variant(repo))
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    mark = node_mark(config, "options.current-density.enclosed_fann", key=True)
    assert (error["line"], error["column"]) == mark
    assert "has no option 'enclosed_fann'" in error["message"]


def test_overrides_apply_by_glob_last_match_wins_over_merged_options(repo: Path) -> None:
    write_config(
        repo,
        "rules:\n  select: [current-density]\n"
        "options:\n  current-density:\n    enclosed_fan: 6 A/mm^2\n    cage_bar: 7 A/mm^2\n"
        "overrides:\n"
        "  - files: ['prototypes/*.yaml']\n"
        "    options:\n      current-density:\n        enclosed_fan: 7 A/mm^2\n"
        "  - files: ['prototypes/late-*.yaml']\n"
        "    options:\n      current-density:\n        enclosed_fan: 6.5 A/mm^2\n",
    )
    for folder, name in [("series", "pump"), ("prototypes", "early"), ("prototypes", "late-b")]:
        (repo / folder).mkdir(exist_ok=True)
        write_variant(repo / folder, {"id": name}, name=f"{name}.yaml")
    result = check_json(repo)
    assert record_ids(result) == ["early", "late-b", "pump"]
    stator = {
        r: limit_of(result, r, "current-density", "stator.current_density")
        for r in ("pump", "early", "late-b")
    }
    bar = {
        r: limit_of(result, r, "current-density", "rotor.bar_current_density")
        for r in ("pump", "early", "late-b")
    }
    # Limits copied from the config above; 1 A/mm^2 = 1e6 A/m^2, rounding only.
    assert stator == pytest.approx({"pump": 6e6, "early": 7e6, "late-b": 6.5e6}, rel=1e-12)
    # The override names only enclosed_fan: cage_bar comes from the base options, not the
    # rule's 8 A/mm^2 default.
    assert bar == pytest.approx({"pump": 7e6, "early": 7e6, "late-b": 7e6}, rel=1e-12)


@pytest.mark.parametrize(
    ("glob", "expected", "code"),
    [
        ("designs/*.yaml", ["pump-drive-4p36s"], 0),
        ("elsewhere/*.yaml", ["servo-10p12s"], 1),
    ],
)
def test_the_config_files_are_checked_when_no_paths_are_given(
    repo: Path, monkeypatch: pytest.MonkeyPatch, glob: str, expected: list[str], code: int
) -> None:
    (repo / "designs").mkdir()
    (repo / "elsewhere").mkdir()
    write_variant(repo / "designs")
    write_variant(repo / "elsewhere", base=SERVO)
    write_config(repo, f"files: ['{glob}']\n")
    monkeypatch.chdir(repo)
    result = check_json()
    assert result.code == code, result.out
    assert record_ids(result) == expected


@pytest.mark.parametrize("selector", ["brenfeld/", "tag:thermla"])
def test_a_selector_matching_no_rule_is_a_located_error(repo: Path, selector: str) -> None:
    config = write_config(repo, f"rules:\n  select:\n    - '{selector}'\n")
    result = check_json(write_variant(repo, base=SERVO))  # the servo fails when rules run
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    assert (error["line"], error["column"]) == node_mark(config, "rules.select.0")


def test_an_absolute_files_glob_is_a_located_error(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    config = write_config(repo, "files:\n  - /designs/*.yaml\n")
    write_variant(repo)
    monkeypatch.chdir(repo)
    result = check_json()
    assert result.code == 2, result.out + result.err
    (error,) = result.input_findings()
    assert (error["line"], error["column"]) == node_mark(config, "files.0")


# --- required_plugins ------------------------------------------------------------------------


@pytest.mark.parametrize("req", [f"{PACK}>=1.0", "Brennfeld_Emgate.Pack>=1.0"])
def test_a_satisfied_required_plugin_passes(repo: Path, req: str) -> None:
    # The second spelling is the same distribution under PEP 503 name normalisation.
    assert Version(version(PACK)) >= Version("1.0")
    write_config(repo, f"required_plugins:\n  - {req}\n")
    result = check_json(write_variant(repo))
    assert result.code == 0, result.out
    assert result.input_findings() == []


@pytest.mark.parametrize(
    ("req", "says"),
    [
        (f"{PACK}>=9", f"does not satisfy '{PACK}>=9'"),
        ("no-such-pack", "'no-such-pack' is not installed"),
        ("brennfeld emgate pack", "expected a requirement"),  # PEP 508: no spaces in a name
        (f"{PACK}>=", "expected a requirement"),  # PEP 440: an operator needs a version
    ],
    ids=["too-old", "missing", "bad-name", "bad-specifier"],
)
def test_an_unmet_or_invalid_requirement_is_located_at_its_item(
    repo: Path, req: str, says: str
) -> None:
    assert Version(version(PACK)) < Version("9")  # the installed sample pack is 1.x
    config = write_config(repo, f"required_plugins:\n  - {PACK}>=1.0\n  - {req}\n")
    result = check_json(write_variant(repo))
    assert result.code == 2, result.out
    (error,) = result.input_findings()  # the satisfied first item adds nothing
    assert (error["line"], error["column"]) == node_mark(config, "required_plugins.1")
    assert says in error["message"]


# --- waivers ---------------------------------------------------------------------------------

WAIVER = {
    "rule": "current-density",
    "reason": "fanless frame accepted for the trial batch of ten",
    "owner": "J. Doe",
    "expires": "2027-03-31",
}
TODAY = "2027-01-01"  # before the expiry above


def write_waivers(folder: Path, *waivers: dict[str, Any]) -> Path:
    path = folder / "waivers.yaml"
    doc = {"schema": "emgate/waivers@1", "waivers": list(waivers)}
    path.write_text(yaml.safe_dump(doc, sort_keys=False), encoding="utf-8")
    return path


# The servo breaks current-density at $.winding.conductor (the conductor's key).
COVERAGE = [
    ("$", True),
    ("$.winding", True),
    ("$.winding.conductor", True),
    # (a name prefix such as '$.winding.cond' names no node: an error, tests/test_fail_closed.py)
    ("$.winding.conductor.bare_diameter", False),  # below the finding does not cover it
    ("$.stator", False),
]


@pytest.mark.parametrize("where", ["file", "record"])
@pytest.mark.parametrize(("path", "covered"), COVERAGE)
def test_a_waiver_path_covers_that_node_and_below_only(
    repo: Path, where: str, path: str, covered: bool
) -> None:
    write_config(repo, "rules:\n  select: [current-density]\n")
    waiver = {**WAIVER, "path": path}
    if where == "file":
        write_waivers(repo, {**waiver, "record": "servo-10p12s"})
        record = write_variant(repo, base=SERVO)
    else:
        record = write_variant(repo, {"waivers": [waiver]}, base=SERVO)
    result = check_json("--today", TODAY, record)
    assert result.code == (0 if covered else 1), result.out
    by_rule = {f["rule"]: f for f in result.json()["findings"]}
    assert by_rule["current-density"]["record_path"] == "$.winding.conductor"
    assert by_rule["current-density"]["waived"] is covered
    if not covered:
        assert "suppresses nothing" in by_rule["waiver"]["message"]


def test_a_waiver_for_an_unknown_record_is_an_error(repo: Path) -> None:
    write_config(repo, "rules:\n  select: [current-density]\n")
    waivers = write_waivers(repo, {**WAIVER, "record": "servo-10p21s"})
    result = check_json("--today", TODAY, write_variant(repo))
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    assert error["file"].endswith("waivers.yaml")
    assert error["line"] == node_mark(waivers, "waivers.0")[0]
    assert "'servo-10p21s'" in error["message"]


def test_a_waiver_for_a_record_outside_the_run_is_no_typo(repo: Path) -> None:
    # the record the waiver names is in the repository but not checked (one file named,
    # as pre-commit names the staged ones): its id is found by reading the repository
    write_config(repo, "rules:\n  select: [current-density]\n")
    write_waivers(repo, {**WAIVER, "record": "servo-10p12s"})
    write_variant(repo, {}, base=SERVO, name="servo.yaml")
    pump = write_variant(repo, {}, name="pump.yaml")
    result = check_json("--today", TODAY, pump)
    assert result.code == 0, result.out
    assert not result.input_findings()
    # the same waiver for an id no record in the repository has is a typo
    write_waivers(repo, {**WAIVER, "record": "servo-10p21s"})
    assert check_json("--today", TODAY, pump).code == 2


@pytest.mark.parametrize(
    ("change", "node", "says"),
    [
        ({"owner": None}, "waivers.0", "'owner' is missing"),
        ({"reason": "short"}, "waivers.0.reason", "at least 10 characters"),
        ({"expires": "2027-02-30"}, "waivers.0.expires", "2027-02-30"),  # no 30 February
        ({"expires": "31.03.2027"}, "waivers.0.expires", "31.03.2027"),  # not ISO 8601
    ],
    ids=["no-owner", "short-reason", "no-such-day", "not-iso"],
)
def test_an_invalid_waivers_file_is_a_located_error(
    repo: Path, change: dict[str, Any], node: str, says: str
) -> None:
    write_config(repo, "")  # the config names the waivers file (its default name)
    waiver = {**WAIVER, "record": "servo-10p12s", **change}
    waivers = write_waivers(repo, {k: v for k, v in waiver.items() if v is not None})
    result = check_json("--today", TODAY, write_variant(repo, base=SERVO))
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    assert error["file"].endswith("waivers.yaml")
    assert (error["line"], error["column"]) == node_mark(waivers, node)
    assert says in error["message"]


# --- --changed-since -------------------------------------------------------------------------

needs_git = pytest.mark.skipif(shutil.which("git") is None, reason="needs git")


@pytest.fixture
def git_repo(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """Three records (two on library steels, one on the materials file's grade), committed."""
    repo = tmp_path / "designs-repo"
    (repo / "designs").mkdir(parents=True)
    (repo / "materials").mkdir()
    write_config(repo, "files: ['designs/*.yaml']\n")
    for base in (PUMP, SERVO, GENSET):
        write_variant(repo / "designs", base=base)
    shutil.copy(STEELS, repo / "materials" / "steels.yaml")
    git(repo, "init", "-q", "-b", "main")
    git(repo, "add", "-A")
    git(repo, "commit", "-qm", "three designs")
    monkeypatch.chdir(repo)
    return repo


def append(path: Path, text: str) -> None:
    path.write_text(path.read_text(encoding="utf-8") + text, encoding="utf-8")


@needs_git
def test_unchanged_repository_checks_no_record(git_repo: Path) -> None:
    result = check_json("--changed-since", "HEAD")
    assert result.code == 0, result.out
    assert record_ids(result) == []
    assert record_ids(check_json()) == ["genset-4p48s", "pump-drive-4p36s", "servo-10p12s"]


@needs_git
def test_only_the_changed_record_is_checked(git_repo: Path) -> None:
    append(git_repo / "designs" / "pump-drive-4p36s.yaml", "# reviewed\n")
    result = check_json("--changed-since", "HEAD")
    assert record_ids(result) == ["pump-drive-4p36s"]
    assert result.json()["summary"]["records"] == 1


@needs_git
def test_a_committed_change_counts_against_an_older_revision(git_repo: Path) -> None:
    append(git_repo / "designs" / "servo-10p12s.yaml", "# reviewed\n")
    git(git_repo, "commit", "-qam", "servo note")
    assert record_ids(check_json("--changed-since", "HEAD")) == []
    assert record_ids(check_json("--changed-since", "HEAD~1")) == ["servo-10p12s"]


@needs_git
def test_a_materials_change_rechecks_the_records_using_its_grades(git_repo: Path) -> None:
    # steels.yaml defines M330-50A-lot2611 (the genset's steel); the servo's M330-50A and the
    # pump's M400-50A are other grades.
    append(git_repo / "materials" / "steels.yaml", "# curve re-measured\n")
    assert record_ids(check_json("--changed-since", "HEAD")) == ["genset-4p48s"]


@needs_git
def test_a_config_change_rechecks_everything(git_repo: Path) -> None:
    append(git_repo / "emgate.yaml", "# reviewed\n")
    result = check_json("--changed-since", "HEAD")
    assert record_ids(result) == ["genset-4p48s", "pump-drive-4p36s", "servo-10p12s"]


@needs_git
def test_an_untracked_record_counts_as_changed(git_repo: Path) -> None:
    write_variant(git_repo / "designs", {"id": "pump-b"}, name="pump-b.yaml")
    assert record_ids(check_json("--changed-since", "HEAD")) == ["pump-b"]


@needs_git
@pytest.mark.parametrize("rev", ["--output=x", "-p"])
def test_a_revision_that_looks_like_an_option_never_reaches_git(
    git_repo: Path, monkeypatch: pytest.MonkeyPatch, rev: str
) -> None:
    import emgate.changes

    calls: list[list[str]] = []
    real = emgate.changes._git

    def spy(args: list[str], cwd: Path) -> Any:
        calls.append(args)
        return real(args, cwd)

    monkeypatch.setattr(emgate.changes, "_git", spy)
    result = check_json(f"--changed-since={rev}")
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    assert f"git revision {rev!r} does not exist" in error["message"]
    assert calls, "git was asked for the work tree"
    assert not [a for args in calls for a in args if a.startswith(rev)]  # no option injection


@needs_git
@pytest.mark.parametrize(
    "rev", ["no-such-branch", "HEAD~5", "0000000000000000000000000000000000000000", "@{upstream}"]
)
def test_a_revision_that_does_not_exist_is_an_input_error(git_repo: Path, rev: str) -> None:
    # the repository has one commit and no remote: none of these names a commit in it (git
    # ends with 128, not 1, for the missing upstream)
    result = check_json(f"--changed-since={rev}")
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    assert f"git revision {rev!r} does not exist in {git_repo.name}" in error["message"]


@needs_git
def test_changed_since_outside_a_git_work_tree(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    folder = tmp_path / "plain"
    folder.mkdir()
    write_variant(folder)
    monkeypatch.setenv("GIT_CEILING_DIRECTORIES", str(tmp_path))  # no repository above
    monkeypatch.chdir(folder)
    result = check_json("--changed-since", "HEAD", ".")
    assert result.code == 2, result.out
    (error,) = result.input_findings()
    assert "needs a git work tree" in error["message"]


SERVO_WAIVERS = [
    {**WAIVER, "rule": rule, "record": "servo-10p12s", "expires": "2099-12-31"}
    for rule in ("current-density", "thermal-load", "temperature-rise")  # its three failures
]


@needs_git
@pytest.mark.parametrize("deleted", ["waivers.yaml", "emgate.yaml"])
def test_deleting_the_waivers_or_config_file_rechecks_everything(
    git_repo: Path, deleted: str
) -> None:
    # Before: the servo's failures are waived (waivers.yaml) or its rules ignored (emgate.yaml).
    write_config(git_repo, "files: ['designs/*.yaml']\nrules:\n  ignore: ['tag:thermal']\n")
    if deleted == "waivers.yaml":
        write_config(git_repo, "files: ['designs/*.yaml']\n")
        write_waivers(git_repo, *SERVO_WAIVERS)
    git(git_repo, "add", "-A")
    git(git_repo, "commit", "-qm", "waive or ignore the servo's thermal findings")
    assert check_json().code == 0  # control: the gate passes on the commit
    (git_repo / deleted).unlink()
    assert check_json().code == 1  # the full check now fails the servo ...
    result = check_json("--changed-since", "HEAD")
    assert result.code == 1, result.out  # ... and so must the check of the change
    assert "servo-10p12s" in record_ids(result)


# --- --format --------------------------------------------------------------------------------


def test_several_formats_in_one_run_write_files_and_folders(repo: Path) -> None:
    record = write_variant(repo)
    out = repo / "reports" / "deep"
    out.mkdir(parents=True)  # a missing folder is an error (tests/test_fail_closed.py)
    (repo / "junit").mkdir()
    result = run_cli(
        "check",
        "--format", f"json:{out / 'r.json'}",
        "--format", f"sarif:{out / 'r.sarif'}",
        "--format", f"junit:{repo / 'junit' / 'r.xml'}",
        "--format", "text",
        record,
    )  # fmt: skip
    assert result.code == 0, result.out + result.err
    # The one format without a file: the record's margins line, then the verdict.
    assert result.out.splitlines()[2].startswith("PASS")
    assert json.loads((out / "r.json").read_text())["summary"]["records"] == 1
    assert json.loads((out / "r.sarif").read_text())["version"] == "2.1.0"  # [OASIS SARIF 2.1.0]
    assert ET.parse(repo / "junit" / "r.xml").getroot().tag == "testsuites"  # JUnit XML layout
    assert sorted(p.name for p in out.iterdir()) == ["r.json", "r.sarif"]  # no temp files left


def test_only_one_format_may_go_to_standard_output(repo: Path) -> None:
    report = repo / "r.json"
    result = run_cli(
        "check", "--format", f"json:{report}", "--format", "text", "--format", "sarif",
        write_variant(repo),
    )  # fmt: skip
    assert result.code == 2
    assert "only one --format may go to standard output" in result.err
    assert result.out == ""
    assert not report.exists()  # refused before anything ran


def test_an_unknown_format_name_is_a_usage_error(repo: Path) -> None:
    report = repo / "r.txt"
    result = run_cli("check", "--format", f"yaml:{report}", write_variant(repo))
    assert result.code == 2
    assert "unknown format 'yaml'" in result.err
    assert "sarif" in result.err  # the message lists the known ones
    assert not report.exists()


# --- atomic writes ---------------------------------------------------------------------------


def test_write_atomic_replaces_and_honours_the_umask(tmp_path: Path) -> None:
    from emgate.atomic import write_atomic

    target = tmp_path / "new" / "report.txt"
    target.parent.mkdir()
    write_atomic(target, "first\n")
    write_atomic(target, "second\n")
    assert target.read_text(encoding="utf-8") == "second\n"
    assert [p.name for p in target.parent.iterdir()] == ["report.txt"]
    umask = os.umask(0)
    os.umask(umask)
    # POSIX: a new file's mode is 0o666 less the umask, as open(2) would make it (a bare
    # temporary file would be 0o600).
    assert target.stat().st_mode & 0o777 == 0o666 & ~umask


@pytest.mark.parametrize("failure", ["encode", "fsync", "replace"])
def test_write_atomic_failure_keeps_the_old_file_and_no_temp(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, failure: str
) -> None:
    import emgate.atomic
    from emgate.atomic import write_atomic

    target = tmp_path / "report.sarif"
    target.write_text("old report\n", encoding="utf-8")
    text = "new report " * 1000 + "\n"
    if failure == "encode":
        text += "\ud800"  # a lone surrogate cannot be written as UTF-8
    else:

        def fail(*args: Any) -> None:
            raise OSError(28, "No space left on device")

        monkeypatch.setattr(emgate.atomic.os, failure, fail)
    with pytest.raises((UnicodeEncodeError, OSError)):
        write_atomic(target, text)
    monkeypatch.undo()
    assert target.read_text(encoding="utf-8") == "old report\n"
    assert [p.name for p in tmp_path.iterdir()] == ["report.sarif"]


# --- emgate init -----------------------------------------------------------------------------

STARTER = {
    "emgate.yaml",
    "waivers.yaml",
    "designs/example-4p36s.yaml",
    "requirements-emgate.txt",
    ".github/workflows/emgate.yml",
    ".gitlab-ci.yml",
    ".gitignore",
    ".pre-commit-config.yaml",
    "noxfile.py",
    *(f"schemas/{k}.schema.json" for k in ("design", "materials", "waivers", "config")),
}


def files_under(folder: Path) -> set[str]:
    return {p.relative_to(folder).as_posix() for p in folder.rglob("*") if p.is_file()}


def test_init_writes_a_starter_repository_that_passes(
    repo: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    target = repo / "team"
    result = run_cli("init", target)
    assert result.code == 0, result.err
    assert files_under(target) == STARTER
    monkeypatch.chdir(target)
    check = check_json()
    assert check.code == 0, check.out
    assert record_ids(check) == ["example-4p36s"]


@pytest.mark.parametrize(
    ("machine", "record"),
    [
        ("induction", "example-4p36s"),
        ("surface_pm", "example-10p12s"),
        ("salient_field", "example-4p48s"),
    ],
)
def test_each_machine_starter_is_a_complete_record_that_passes(
    repo: Path, monkeypatch: pytest.MonkeyPatch, machine: str, record: str
) -> None:
    """`emgate init --machine KIND`: a valid record of that kind, with no finding from any
    installed rule on the default limits."""
    target = repo / "team"
    assert run_cli("init", target, "--machine", machine).code == 0
    assert {p for p in files_under(target) if p.startswith("designs/")} == {
        f"designs/{record}.yaml"
    }
    monkeypatch.chdir(target)
    check = check_json()
    assert check.code == 0, check.out
    assert record_ids(check) == [record]
    (result,) = check.json()["records"]
    assert result["machine"] == machine
    assert check.json()["findings"] == []


@pytest.mark.parametrize("kind", ["design", "materials", "waivers", "config"])
def test_init_schemas_equal_emgate_schema(repo: Path, kind: str) -> None:
    assert run_cli("init", repo).code == 0
    printed = run_cli("schema", kind)
    assert printed.code == 0
    assert (repo / "schemas" / f"{kind}.schema.json").read_text(encoding="utf-8") == printed.out


def test_a_second_init_overwrites_nothing(repo: Path) -> None:
    assert run_cli("init", repo).code == 0
    config = repo / "emgate.yaml"
    edited = config.read_text(encoding="utf-8") + "# the team's own edit\n"
    config.write_text(edited, encoding="utf-8")
    again = run_cli("init", repo)
    assert again.code == 0
    assert config.read_text(encoding="utf-8") == edited
    assert "wrote" not in again.out
    kept = [line for line in again.err.splitlines() if line.startswith("kept")]
    assert len(kept) == len(STARTER)
    assert any(line.split()[1].endswith("/emgate.yaml") for line in kept)


# --- files that are not emgate's -------------------------------------------------------------


def test_an_explicit_file_without_an_emgate_schema_is_skipped_with_a_note(repo: Path) -> None:
    ci = repo / "ci.yml"
    ci.write_text("name: CI\non: [push]\njobs: {}\n", encoding="utf-8")
    result = check_json(ci, write_variant(repo))
    assert result.code == 0, result.out
    (note,) = [f for f in result.json()["findings"] if f["file"].endswith("ci.yml")]
    assert (note["severity"], note["kind"]) == ("info", "note")
    assert "not an emgate file" in note["message"]
    assert record_ids(result) == ["pump-drive-4p36s"]
    alone = run_cli("check", ci)
    assert alone.code == 0, alone.out
    assert "skipped" in alone.out


def test_a_path_relative_to_the_repository_is_what_pathlib_makes_of_it(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # the definition: both paths resolved, the one relative to the other (pathlib), or
    # None outside; the resolved root is kept, and discovery's resolved name taken as given
    from emgate.config import Policy

    root = tmp_path / "repo"
    (root / "designs" / "deep").mkdir(parents=True)
    (root / "designs" / "a.yaml").write_text("a: 1\n")
    (tmp_path / "repo-other").mkdir()  # shares the root's name as a prefix
    (tmp_path / "link").symlink_to(root / "designs")
    monkeypatch.chdir(root)
    policy = Policy(root=tmp_path / "link" / "..")  # (a root named through a link)
    cases = [
        root,
        root / "designs" / "a.yaml",
        root / "designs" / "deep" / "missing.yaml",
        tmp_path / "link" / "a.yaml",
        tmp_path / "repo-other" / "x.yaml",
        tmp_path,
        Path("designs/a.yaml"),
        Path("."),
    ]

    def by_pathlib(path: Path) -> str | None:
        try:
            return path.resolve().relative_to(policy.root.resolve()).as_posix()
        except ValueError:
            return None

    got = [policy.relative(p) for p in cases]
    assert got == [by_pathlib(p) for p in cases]
    assert got[:4] == [".", "designs/a.yaml", "designs/deep/missing.yaml", "designs/a.yaml"]
    assert got[4:6] == [None, None]
    assert [policy.relative(p, os.path.realpath(p)) for p in cases] == got
