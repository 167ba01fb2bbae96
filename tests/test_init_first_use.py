"""What `emgate init` writes works as written in a fresh repository.

emgate is built into a wheel from this source tree and installed from that wheel only (pip
with no index, the wheel's folder as its only source for emgate). Its dependencies are those
of the test environment, put on PYTHONPATH, as a package index or a wheel cache would give
them. In a fresh `emgate init` repository (a git clone, so that `origin/main` exists as on a
runner after a full-depth checkout) each template's own commands then run:

- the GitHub workflow: its `run:` steps, extracted from the YAML and executed in order with
  `bash -e` and the variables a runner sets, for a push to main and for a pull request
  (`uses:` steps are the runner's: checkout is the clone, setup-python the fresh venv);
- the GitLab jobs: their `script:` lines in order, in a merge request pipeline;
- the noxfile's session, through nox (its own virtualenv, installing the pinned file);
- the pre-commit config, through `pre-commit run --all-files` (a local hook).
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from importlib.metadata import Distribution, distribution
from pathlib import Path

import pytest
import yaml
from packaging.requirements import Requirement

ROOT = Path(__file__).resolve().parent.parent
BIN = Path(sys.executable).parent
RECORD = "designs/example-4p36s.yaml"
TIMEOUT = 300  # s, for one command; the whole module takes about 40 s


def tool(name: str) -> str:
    found = shutil.which(name, path=str(BIN)) or shutil.which(name)
    assert found, f"{name} is needed (the test extra installs it)"  # no silent skip
    return found


def _closure(dist: Distribution, extras: set[str], seen: dict[str, Distribution]) -> None:
    for text in dist.requires or []:
        req = Requirement(text)
        if req.marker and not any(req.marker.evaluate({"extra": e}) for e in extras or {""}):
            continue
        name = req.name.lower().replace("_", "-")
        if name in seen:
            continue
        seen[name] = dep = distribution(req.name)
        _closure(dep, set(req.extras), seen)


def link_dependencies(into: Path) -> None:
    """emgate's dependencies (with the html extra the pinned requirement names), as links
    to their installed files: a folder for PYTHONPATH that holds no emgate."""
    seen: dict[str, Distribution] = {}
    _closure(distribution("emgate"), {"html"}, seen)
    into.mkdir()
    for dist in seen.values():
        for part in {f.parts[0] for f in dist.files or [] if f.parts and f.parts[0] != ".."}:
            source = Path(str(dist.locate_file(part)))
            if source.exists() and not (into / part).exists():
                (into / part).symlink_to(source)


def run(cmd: list[str], cwd: Path, env: dict[str, str]) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        cmd, cwd=cwd, env=env, capture_output=True, text=True, check=False, timeout=TIMEOUT
    )


def git(repo: Path, *args: str) -> None:
    env = {**os.environ, "GIT_AUTHOR_NAME": "t", "GIT_AUTHOR_EMAIL": "t@t"}
    env |= {"GIT_COMMITTER_NAME": "t", "GIT_COMMITTER_EMAIL": "t@t"}
    done = run(["git", *args], repo, env)
    assert done.returncode == 0, done.stderr


@pytest.fixture(scope="module")
def world(tmp_path_factory: pytest.TempPathFactory) -> dict[str, object]:
    base = tmp_path_factory.mktemp("first-use")
    source = base / "emgate-src"
    shutil.copytree(
        ROOT,
        source,
        ignore=shutil.ignore_patterns(
            ".git", ".venv", ".nox", "build", "dist", "*.egg-info", "__pycache__", ".*_cache"
        ),
    )
    wheels = base / "wheels"
    pip_wheel = [sys.executable, "-m", "pip", "wheel", "-q", "--no-deps", "--no-index"]
    built = run(
        [*pip_wheel, "--no-build-isolation", str(source), "-w", str(wheels)],
        base,
        dict(os.environ),
    )
    assert built.returncode == 0, built.stderr
    (wheel,) = wheels.iterdir()
    assert wheel.name.startswith("emgate-")
    link_dependencies(base / "deps")
    venv = base / "venv"  # what setup-python gives: an interpreter without emgate
    made = run([sys.executable, "-m", "venv", str(venv)], base, dict(os.environ))
    assert made.returncode == 0, made.stderr
    env = {k: v for k, v in os.environ.items() if not k.startswith(("PIP_", "VIRTUAL_ENV"))}
    env |= {
        "PATH": f"{venv / 'bin'}{os.pathsep}{BIN}{os.pathsep}{os.environ['PATH']}",
        "PYTHONPATH": str(base / "deps"),
        "PIP_NO_INDEX": "1",  # emgate from the wheel only, never from a registry
        "PIP_FIND_LINKS": str(wheels),
        "PIP_DISABLE_PIP_VERSION_CHECK": "1",
        "PRE_COMMIT_HOME": str(base / "pre-commit-home"),
        "GIT_AUTHOR_NAME": "t",
        "GIT_AUTHOR_EMAIL": "t@t",
        "GIT_COMMITTER_NAME": "t",
        "GIT_COMMITTER_EMAIL": "t@t",
    }
    # The shared repository: `emgate init` twice (a second starter next to the first; init
    # never overwrites), committed on main, then cloned as a runner would check it out.
    origin = base / "origin"
    origin.mkdir()
    git(origin, "init", "-q", "-b", "main")
    for machine in ("induction", "surface_pm"):
        done = run([sys.executable, "-m", "emgate", "init", "--machine", machine], origin, env)
        assert done.returncode == 0, done.stderr
    git(origin, "add", "-A")
    git(origin, "commit", "-qm", "emgate init")
    git(base, "clone", "-q", str(origin), "work")
    return {"work": base / "work", "env": env, "base": base}


def github_steps(work: Path, env: dict[str, str], event: str) -> tuple[list[tuple], Path]:
    """Run the workflow's `run:` steps in order as a runner does: after a failed step only
    the steps whose `if:` says always(); `github.event_name == 'pull_request'` honoured."""
    workflow = yaml.safe_load((work / ".github/workflows/emgate.yml").read_text())
    (job,) = workflow["jobs"].values()
    assert job["timeout-minutes"] <= 30
    summary = work.parent / f"summary-{event}.md"
    summary.write_text("")
    step_env = env | {
        "CI": "true",
        "GITHUB_ACTIONS": "true",
        "GITHUB_EVENT_NAME": event,
        "GITHUB_BASE_REF": "main" if event == "pull_request" else "",
        "GITHUB_WORKSPACE": str(work),
        "GITHUB_STEP_SUMMARY": str(summary),
    }
    failed, results = False, []
    for step in job["steps"]:
        if "run" not in step:
            continue
        condition = str(step.get("if", ""))
        if failed and "always()" not in condition:
            continue
        if "github.event_name == 'pull_request'" in condition and event != "pull_request":
            continue
        script = work.parent / "step.sh"
        script.write_text(step["run"])
        done = run(["bash", "-e", str(script)], work, step_env)
        results.append((step.get("name", ""), done))
        failed = failed or done.returncode != 0
    return results, summary


def by_name(results: list[tuple], name: str) -> subprocess.CompletedProcess[str]:
    return next(done for step, done in results if step == name)


def test_the_pinned_requirement_is_the_one_place_of_the_version(world: dict) -> None:
    work: Path = world["work"]
    pins = (work / "requirements-emgate.txt").read_text()
    active = [line for line in pins.splitlines() if line and not line.startswith("#")]
    assert active == [f"emgate[html]=={distribution('emgate').version}"]  # the pack: a comment
    for name in (".github/workflows/emgate.yml", ".gitlab-ci.yml", "noxfile.py"):
        text = (work / name).read_text()
        assert "requirements-emgate.txt" in text
        assert "pip install emgate" not in text and "your-company" not in text


def test_the_github_workflow_passes_a_push_to_main(world: dict) -> None:
    work: Path = world["work"]
    results, summary = github_steps(work, world["env"], "push")
    for name, done in results:
        assert done.returncode == 0, f"{name}: {done.stdout}{done.stderr}"
    assert [name for name, _ in results] == [
        "Install emgate",
        "Make the reports folder",
        "Run the gate",
        "Annotations and job summary",
    ]
    gate = by_name(results, "Run the gate").stdout
    assert "PASS: 2 record(s) checked" in gate  # no --changed-since on a push
    notes = by_name(results, "Annotations and job summary").stdout.splitlines()
    assert notes and all(line.startswith("::") for line in notes)
    assert "2 record(s) checked" in summary.read_text()
    assert (work / "reports" / "emgate.sarif").is_file()


def test_the_pre_commit_hook_and_the_nox_session_pass(world: dict) -> None:
    work: Path = world["work"]
    hook = run([tool("pre-commit"), "run", "--all-files"], work, world["env"])
    assert hook.returncode == 0, hook.stdout + hook.stderr
    assert "emgate design gate" in hook.stdout and "Passed" in hook.stdout
    session = run([tool("nox"), "-s", "gate"], work, world["env"])
    assert session.returncode == 0, session.stdout + session.stderr
    assert "PASS: 2 record(s) checked" in session.stdout + session.stderr
    assert (work / "reports" / "emgate-junit.xml").is_file()


def test_the_gitlab_jobs_pass_a_merge_request(world: dict) -> None:
    work: Path = world["work"]
    jobs = yaml.safe_load((work / ".gitlab-ci.yml").read_text())
    env = world["env"] | {
        "CI": "true",
        "GITLAB_CI": "true",
        "CI_PIPELINE_SOURCE": "merge_request_event",
        "CI_MERGE_REQUEST_TARGET_BRANCH_NAME": "main",
        "EMGATE_NOTE_TOKEN": "",
    }
    for job in ("emgate", "emgate-diff"):
        for line in jobs[job]["script"]:
            if line.startswith("apt-get"):
                continue  # installs git into the bare image; git is here already
            done = run(["sh", "-e", "-c", line], work, env)
            assert done.returncode == 0, f"{job}: {line}\n{done.stdout}{done.stderr}"
    assert (work / "reports" / "emgate-codequality.json").is_file()
    assert (work / "reports" / "emgate-diff.md").is_file()


def test_a_pull_request_that_breaks_a_limit_fails_with_annotations_and_a_summary(
    world: dict,
) -> None:
    """24 turns per coil instead of 21 in the induction starter: the slot fill breaks its
    limit. Only the changed record is checked (--changed-since origin/main)."""
    work: Path = world["work"]
    git(work, "checkout", "-qb", "more-turns")
    path = work / RECORD
    lines = path.read_text().splitlines(keepends=True)
    index = next(i for i, line in enumerate(lines) if "turns_per_coil: 21" in line)
    lines[index] = lines[index].replace("21", "24")
    path.write_text("".join(lines))
    git(work, "commit", "-qam", "more turns per coil")
    try:
        results, summary = github_steps(work, world["env"], "pull_request")
        gate = by_name(results, "Run the gate")
        assert gate.returncode == 1, gate.stdout + gate.stderr
        assert "FAIL: 1 record(s) checked" in gate.stdout  # the untouched record is not
        notes = by_name(results, "Annotations and job summary")
        assert notes.returncode == 0, notes.stderr
        errors = [line for line in notes.stdout.splitlines() if line.startswith("::error")]
        assert any(f"file={RECORD},line={index + 1}" in line for line in errors), errors
        diff = by_name(results, "Physics diff of the pull request")
        assert diff.returncode == 0, diff.stdout + diff.stderr
        text = summary.read_text()
        assert "slot-fill" in text  # the gate's summary
        assert "## emgate diff: origin/main" in text  # and the diff's
        assert "turns\\_per\\_coil: 21 → 24" in text
        hook = run([tool("pre-commit"), "run", "--all-files"], work, world["env"])
        assert hook.returncode == 1, hook.stdout + hook.stderr
        assert "slot-fill" in hook.stdout
    finally:
        git(work, "checkout", "-q", "main")
