"""The CI outputs read by third-party readers from PyPI, as a CI service would read them.

SARIF by sarif-tools (its loader, records and severity resolution, and its command line) and
by the OASIS SARIF 2.1.0 schema (tests/data/sarif/); JUnit XML by junitparser and by
xunitparser (the unittest-result reader; it refuses some files other readers accept). The
demo repository is copied to a temporary git work tree and checked through the command line
from different working folders: what a reader sees must not depend on where emgate ran.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import jsonschema
import pytest

from conftest import DEMO, run_cli

REPO = Path(__file__).resolve().parents[1]
SARIF_SCHEMA = REPO / "tests" / "data" / "sarif" / "sarif-schema-2.1.0.json"
SERVO = "designs/servo-10p12s.yaml"  # breaks the current-density limit on purpose


@pytest.fixture(scope="module")
def designs(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """The demo repository at the top of a git work tree of its own (a '.git' marker)."""
    root = tmp_path_factory.mktemp("ci") / "designs-repo"
    shutil.copytree(DEMO, root)
    (root / ".git").mkdir()
    return root


def check(where: Path, *argv: str | Path) -> int:
    """``emgate check ARGV`` run in the folder ``where``."""
    import os

    here = Path.cwd()
    os.chdir(where)
    try:
        return run_cli("check", *argv).code
    finally:
        os.chdir(here)


# ---------------------------------------------------------------- SARIF


@pytest.fixture(scope="module")
def sarif_runs(designs: Path, tmp_path_factory: pytest.TempPathFactory) -> dict[str, Path]:
    """SARIF of the same repository, written from its root, from a subfolder and from
    outside it."""
    out = tmp_path_factory.mktemp("sarif")
    runs = {
        "root": (designs, ["."]),
        "subfolder": (designs / "designs", [".."]),
        "outside": (designs.parent, [designs.name]),
    }
    files = {}
    for name, (cwd, paths) in runs.items():
        files[name] = out / f"{name}.sarif"
        assert check(cwd, *paths, "--format", f"sarif:{files[name]}") == 1  # the demo fails
    return files


def test_sarif_tools_reads_the_same_locations_from_every_working_folder(
    sarif_runs: dict[str, Path],
) -> None:
    from sarif import loader

    seen = {}
    for name, path in sarif_runs.items():
        sarif = loader.load_sarif_file(str(path))
        records = sarif.get_records()
        seen[name] = sorted((r["Location"], r["Line"], r["Code"]) for r in records)
        assert all(not r["Location"].startswith(("/", "file:")) for r in records), name
    assert seen["root"] == seen["subfolder"] == seen["outside"]
    assert (SERVO, 39, "current-density") in [(loc, line, code) for loc, line, code in seen["root"]]


def test_sarif_fingerprints_do_not_depend_on_the_working_folder(
    sarif_runs: dict[str, Path],
) -> None:
    def prints(path: Path) -> list[str]:
        run = json.loads(path.read_text(encoding="utf-8"))["runs"][0]
        return sorted(r["partialFingerprints"]["emgate/v1"] for r in run["results"])

    assert prints(sarif_runs["root"]) == prints(sarif_runs["subfolder"])
    assert prints(sarif_runs["root"]) == prints(sarif_runs["outside"])


def test_sarif_uris_are_relative_to_srcroot_and_valid(sarif_runs: dict[str, Path]) -> None:
    schema = json.loads(SARIF_SCHEMA.read_text(encoding="utf-8"))
    validator = jsonschema.validators.validator_for(schema)(schema)
    for path in sarif_runs.values():
        doc = json.loads(path.read_text(encoding="utf-8"))
        validator.validate(doc)  # [pub: OASIS SARIF 2.1.0 JSON Schema]
        run = doc["runs"][0]
        assert set(run["originalUriBaseIds"]) == {"%SRCROOT%"}
        for result in run["results"]:
            art = result["locations"][0]["physicalLocation"]["artifactLocation"]
            assert art["uriBaseId"] == "%SRCROOT%"
            assert not art["uri"].startswith(("/", "file:", ".."))


def test_sarif_rules_carry_descriptions_help_and_default_level(
    sarif_runs: dict[str, Path],
) -> None:
    from sarif import loader
    from sarif.sarif_file_utils import read_result_severity

    sarif = loader.load_sarif_file(str(sarif_runs["root"]))
    run = sarif.runs[0].run_data
    explained = run_cli("explain", "current-density").out
    for rule in run["tool"]["driver"]["rules"]:
        assert rule["fullDescription"]["text"], rule["id"]
        assert rule["help"]["text"] and rule["help"]["markdown"], rule["id"]
        assert rule["defaultConfiguration"]["level"] in ("error", "warning", "note")
    (density,) = sarif.get_rules_by_id("current-density")
    # the method, as emgate explain prints it, is in the help; the options table lists the
    # option names that emgate explain lists
    method = explained.split("\n\n", 1)[1].split("\noptions (", 1)[0].strip()
    assert method in density["help"]["text"]
    assert "| `enclosed_fan` |" in density["help"]["markdown"]
    assert density["fullDescription"]["text"].startswith("Current density in the stator")
    # a reader falls back on defaultConfiguration.level for a result without a level
    # [pub: SARIF 2.1.0 section 3.27.10, as sarif-tools implements it]
    result = next(r for r in run["results"] if r["ruleId"] == "current-density")
    bare = {k: v for k, v in result.items() if k != "level"}
    assert read_result_severity(bare, run) == "error"  # the rule's default severity


def test_sarif_tools_command_line_summary_counts(sarif_runs: dict[str, Path]) -> None:
    doc = json.loads(sarif_runs["root"].read_text(encoding="utf-8"))
    results = doc["runs"][0]["results"]
    errors = sum(1 for r in results if r["level"] == "error")
    out = subprocess.run(
        [sys.executable, "-m", "sarif", "summary", str(sarif_runs["root"])],
        capture_output=True,
        text=True,
        check=True,
        timeout=120,
    )
    assert f"error: {errors}" in out.stdout
    failing = subprocess.run(
        [sys.executable, "-m", "sarif", "--check", "error", "summary", str(sarif_runs["root"])],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert failing.returncode != 0  # the reader fails a build on the demo's errors


def test_sarif_of_an_invalid_record_is_a_successful_execution(
    designs: Path, tmp_path: Path
) -> None:
    repo = tmp_path / "repo"
    shutil.copytree(designs, repo)
    bad = repo / SERVO
    bad.write_text(bad.read_text(encoding="utf-8").replace("air_gap: 0.8 mm", "air_gap: 0.8 A"))
    out = tmp_path / "bad.sarif"
    assert check(repo, SERVO, "--format", f"sarif:{out}") == 2
    invocation = json.loads(out.read_text(encoding="utf-8"))["runs"][0]["invocations"][0]
    assert invocation["executionSuccessful"] is True  # emgate worked: the record is invalid
    assert invocation["exitCode"] == 2
