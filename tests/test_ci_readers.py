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
    text = (DEMO / SERVO).read_text(encoding="utf-8").splitlines()
    conductor = text.index("  conductor:") + 1  # the key the current-density check drives
    assert (SERVO, conductor, "current-density") in seen["root"]


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


# ---------------------------------------------------------------- JUnit


@pytest.fixture(scope="module")
def junit_files(designs: Path, tmp_path_factory: pytest.TempPathFactory) -> dict[str, Path]:
    """JUnit of the demo (through the command line) and of a hand-built run with every kind
    of outcome: a failure, a waived finding, a crash, a warning, a note, input errors."""
    from emgate.report import reporter
    from report_samples import hand_result

    out = tmp_path_factory.mktemp("junit")
    files = {"demo": out / "demo.xml", "hand": out / "hand.xml"}
    assert check(designs, ".", "--format", f"junit:{files['demo']}") == 1
    files["hand"].write_text(reporter("junit")(hand_result()), encoding="utf-8")
    return files


@pytest.mark.parametrize("name", ["demo", "hand"])
def test_xunitparser_reads_the_file_and_agrees_on_the_counts(
    junit_files: dict[str, Path], name: str
) -> None:
    import xunitparser

    # xunitparser merges every suite into one and asserts that the root's totals match what
    # it counted, and that no property name repeats (it refused the suite-level properties
    # that each suite used to repeat)
    with junit_files[name].open(encoding="utf-8") as handle:
        suite, result = xunitparser.parse(handle)
    cases = list(suite)
    assert len(cases) > 0
    assert result.testsRun == len(cases)
    assert suite.properties["disclaimer"].startswith("emgate results support")
    assert all(tc.time is not None for tc in cases)  # every testcase has its time


def test_xunitparser_sees_the_hand_run_outcomes(junit_files: dict[str, Path]) -> None:
    import xunitparser

    with junit_files["hand"].open(encoding="utf-8") as handle:
        suite, result = xunitparser.parse(handle)
    by_name = {(tc.classname, tc.methodname): tc for tc in suite}
    assert by_name[("m-1", "current-density")].failed
    assert by_name[("m-1", "acme/aspect")].skipped
    assert by_name[("m-1", "winding-balance")].errored
    warned = by_name[("m-2", "winding-balance")]
    assert warned.good  # a warning does not fail the gate, nor the testcase
    assert "warning: coil groups differ" in warned.stdout  # but a viewer shows it
    assert (len(result.failures), len(result.errors), len(result.skipped)) == (1, 3, 1)


@pytest.mark.parametrize("name", ["demo", "hand"])
def test_junitparser_reads_unique_suites_with_times_and_case_properties(
    junit_files: dict[str, Path], name: str
) -> None:
    from junitparser import Error, Failure, JUnitXml, Properties, Skipped

    xml = JUnitXml.fromfile(str(junit_files[name]))
    suites = list(xml)
    names = [s.name for s in suites]
    assert len(names) == len(set(names)), names
    assert xml.time is not None and xml.time >= 0
    total = 0
    for i, suite in enumerate(suites):
        cases = list(suite)
        assert suite.tests == len(cases)
        assert suite.failures == sum(1 for c in cases if isinstance(_final(c), Failure))
        assert suite.errors == sum(1 for c in cases if isinstance(_final(c), Error))
        assert suite.skipped == sum(1 for c in cases if isinstance(_final(c), Skipped))
        assert suite.time is not None
        assert (len(list(suite.properties())) > 0) == (i == 0)  # the run's, once
        total += len(cases)
        for case in cases:
            assert case.time is not None and case.time >= 0
            if suite.name != "emgate.input":
                (props,) = case.iterchildren(Properties)
                names_ = [p.name for p in props]
                assert "rule.version" in names_ and len(names_) == len(set(names_))
    assert xml.tests == total


def _final(case):  # type: ignore[no-untyped-def]
    return case.result[0] if case.result else None


def test_junit_suite_names_stay_unique_when_a_waiver_file_names_a_record(
    designs: Path, tmp_path: Path
) -> None:
    from junitparser import JUnitXml

    repo = tmp_path / "repo"
    shutil.copytree(designs, repo)
    # a waiver in the waivers file that suppresses nothing: its finding stands in
    # waivers.yaml under the record's id, beside the record's own suite
    (repo / "waivers.yaml").write_text(
        "schema: emgate/waivers@1\n"
        "waivers:\n"
        "  - rule: mmf-thd\n"
        "    record: servo-10p12s\n"
        "    reason: a trial of the tooling\n"
        "    owner: Ada\n"
        "    expires: 2099-01-01\n",
        encoding="utf-8",
    )
    out = tmp_path / "w.xml"
    assert check(repo, ".", "--format", f"junit:{out}") == 1
    names = [s.name for s in JUnitXml.fromfile(str(out))]
    assert len(names) == len(set(names)), names
    assert "servo-10p12s" in names and "servo-10p12s (waivers.yaml)" in names


# ---------------------------------------------------------------- code quality


def test_codequality_matches_what_sarif_tools_makes_of_the_sarif(
    designs: Path, tmp_path: Path
) -> None:
    """sarif-tools converts SARIF to the same Code Climate issue format on its own; both
    arrays must name the same rules at the same root-relative paths and lines, and ours
    must carry every field of theirs, from a subfolder too."""
    repo = tmp_path / "repo"
    shutil.copytree(designs, repo)
    (repo / "waivers.yaml").write_text(
        "schema: emgate/waivers@1\n"
        "waivers:\n"
        "  - rule: current-density\n"
        "    record: servo-10p12s\n"
        "    reason: trial winding, rewound before release\n"
        "    owner: Ada\n"
        "    expires: 2099-01-01\n",
        encoding="utf-8",
    )
    ours, sarif, theirs = tmp_path / "cq.json", tmp_path / "run.sarif", tmp_path / "cc.json"
    check(repo / "designs", "..", "--format", f"codequality:{ours}", "--format", f"sarif:{sarif}")
    subprocess.run(
        [sys.executable, "-m", "sarif", "codeclimate", "--output", str(theirs), str(sarif)],
        capture_output=True,
        check=True,
        timeout=120,
    )
    mine = json.loads(ours.read_text(encoding="utf-8"))
    other = json.loads(theirs.read_text(encoding="utf-8"))
    assert other and len(mine) == len(other)

    def where(items: list[dict]) -> list[tuple[str, str, int]]:
        return sorted(
            (i["check_name"], i["location"]["path"], int(i["location"]["lines"]["begin"]))
            for i in items
        )

    assert where(mine) == where(other)
    assert all(set(o) <= set(m) for m, o in zip(mine, other, strict=False))
    waived = [i for i in mine if i["description"].startswith("waived")]
    assert [(i["check_name"], i["severity"]) for i in waived] == [("current-density", "info")]
    assert "Ada" in waived[0]["description"]


def test_annotations_name_files_from_the_root_whatever_the_working_folder(designs: Path) -> None:
    import os

    here = Path.cwd()
    os.chdir(designs / "designs")
    try:
        out = run_cli("check", "..", "--format", "annotations").out
    finally:
        os.chdir(here)
    files = {
        part.removeprefix("file=")
        for line in out.splitlines()
        for part in line.split(" ", 1)[-1].split("::")[0].split(",")
        if part.startswith("file=")
    }
    assert files == {SERVO}  # not '../designs/...': the runner reads them from the root
