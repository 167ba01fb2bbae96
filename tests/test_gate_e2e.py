"""End to end: a throwaway git design repository, gated exactly as the CI template does.

A passing design is committed on main; a branch breaks a limit; the gate fails with the SARIF
result and the JUnit failure at the changed line; a waiver passes it; moving the clock past the
waiver's expiry (``--today``, never a sleep) fails it again. Finally the repository's
``.pre-commit-hooks.yaml`` runs through the real pre-commit tool.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
import yaml

from conftest import git

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "examples" / "design-repo" / "designs" / "pump-drive-4p36s.yaml"
# The template emgate init writes: the package templates are the one source of the CI files.
TEMPLATE = ROOT / "verify" / "emgate" / "templates" / "github-workflow.yml"
EMGATE = shutil.which("emgate")

pytestmark = pytest.mark.skipif(
    EMGATE is None or shutil.which("git") is None, reason="needs the emgate script and git"
)


def template_gate_command() -> list[str]:
    """The gate command of the CI workflow template, as the template writes it and bash
    expands it on a push (GITHUB_BASE_REF empty: no --changed-since)."""
    workflow = yaml.safe_load(TEMPLATE.read_text())
    steps = workflow["jobs"]["emgate"]["steps"]
    step = next(s for s in steps if s.get("name") == "Run the gate")
    words = subprocess.run(
        ["bash", "-c", f"set -- {step['run']}\nprintf '%s\\0' \"$@\""],
        env={**os.environ, "GITHUB_BASE_REF": ""},
        capture_output=True,
        text=True,
        check=True,
    )
    return words.stdout.split("\0")[:-1]


def gate(repo: Path, *extra: str) -> subprocess.CompletedProcess[str]:
    cmd = template_gate_command()
    assert cmd[0] == "emgate"
    (repo / "reports").mkdir(exist_ok=True)  # the template's "Make the reports folder" step
    return subprocess.run(
        [EMGATE, *cmd[1:], *extra],
        cwd=repo,
        capture_output=True,
        text=True,
        check=False,
        timeout=120,
    )


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    repo = tmp_path / "designs-repo"
    (repo / "designs").mkdir(parents=True)
    (repo / "emgate.yaml").write_text("schema: emgate/config@1\nfiles: ['designs/*.yaml']\n")
    (repo / "designs" / "pump.yaml").write_text(DEMO.read_text())
    git(repo, "init", "-q", "-b", "main")
    git(repo, "add", "-A")
    git(repo, "commit", "-qm", "a passing design")
    return repo


def break_limit(repo: Path) -> int:
    """24 turns per coil instead of 21: the slot fill (0.41 -> 0.47) breaks its 0.45 limit,
    which the slot-fill rule reports at the turns; no other limit breaks (bar current density
    7.1 of 8 A/mm^2). Returns the changed line."""
    path = repo / "designs" / "pump.yaml"
    lines = path.read_text().splitlines(keepends=True)
    index = next(i for i, line in enumerate(lines) if "turns_per_coil: 21" in line)
    lines[index] = lines[index].replace("turns_per_coil: 21", "turns_per_coil: 24")
    path.write_text("".join(lines))
    git(repo, "checkout", "-qb", "more-turns")
    git(repo, "commit", "-qam", "more turns per coil")
    return index + 1


def sarif_results(repo: Path) -> list[dict]:
    doc = json.loads((repo / "reports" / "emgate.sarif").read_text())
    return doc["runs"][0]["results"]


def test_the_template_gate_passes_a_clean_design(repo: Path) -> None:
    done = gate(repo)
    assert done.returncode == 0, done.stdout + done.stderr
    assert "PASS" in done.stdout


def test_a_change_that_breaks_a_limit_fails_at_the_changed_line(repo: Path) -> None:
    line = break_limit(repo)
    done = gate(repo)
    assert done.returncode == 1, done.stdout + done.stderr
    fills = [r for r in sarif_results(repo) if r["ruleId"] == "slot-fill"]
    assert len(fills) == 1
    where = fills[0]["locations"][0]["physicalLocation"]
    assert where["artifactLocation"]["uri"] == "designs/pump.yaml"
    assert where["region"]["startLine"] == line
    suites = ET.parse(repo / "reports" / "emgate-junit.xml").getroot()
    failed = [
        case
        for case in suites.iter("testcase")
        if case.get("name") == "slot-fill" and case.find("failure") is not None
    ]
    assert len(failed) == 1
    assert f"designs/pump.yaml:{line}:" in (failed[0].find("failure").text or "")
    # Only what the branch touched, and the same verdict:
    changed = gate(repo, "--changed-since", "main")
    assert changed.returncode == 1


def test_a_waiver_passes_the_gate_until_it_expires(repo: Path) -> None:
    break_limit(repo)
    (repo / "waivers.yaml").write_text(
        "schema: emgate/waivers@1\n"
        "waivers:\n"
        "  - rule: slot-fill\n"
        "    record: pump-drive-4p36s\n"
        "    reason: trial winding for the prototype, rewound after the heat run\n"
        "    owner: E. Example\n"
        "    expires: 2030-06-30\n"
    )
    done = gate(repo, "--today", "2030-06-30")
    assert done.returncode == 0, done.stdout + done.stderr
    assert "waived" in done.stdout
    waived = [r for r in sarif_results(repo) if r["ruleId"] == "slot-fill"]
    assert waived and waived[0].get("suppressions"), "a waived finding stays visible in SARIF"
    expired = gate(repo, "--today", "2030-07-01")
    assert expired.returncode == 1
    assert "expired on 2030-06-30" in expired.stdout


def test_a_missing_revision_is_said_clearly(repo: Path) -> None:
    done = gate(repo, "--changed-since", "no-such-branch")
    assert done.returncode == 2
    assert "git revision 'no-such-branch' does not exist" in done.stdout


@pytest.mark.skipif(
    shutil.which("pre-commit") is None
    and not shutil.which("pre-commit", path=str(Path(sys.executable).parent)),
    reason="pre-commit not installed",
)
def test_the_pre_commit_hook_definition_runs_through_pre_commit(repo: Path, tmp_path: Path) -> None:
    """`pre-commit try-repo` builds emgate from this checkout in its own environment (it
    needs the package index) and runs the hook on the design repository."""
    if not (ROOT / ".git").exists():
        pytest.skip("needs this project as a git checkout")
    exe = shutil.which("pre-commit", path=str(Path(sys.executable).parent)) or "pre-commit"
    break_limit(repo)
    env = {**os.environ, "PRE_COMMIT_HOME": str(tmp_path / "pre-commit-home")}
    done = subprocess.run(
        [exe, "try-repo", str(ROOT), "emgate", "--all-files"],
        cwd=repo,
        capture_output=True,
        text=True,
        env=env,
        check=False,
        timeout=900,
    )
    out = done.stdout + done.stderr
    assert done.returncode == 1, out
    assert "slot-fill" in out
    assert "designs/pump.yaml" in out
