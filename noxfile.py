"""Sessions: tests, lint, demo, schema (regenerate the committed JSON Schemas), bench, sweep,
fuzz."""

from __future__ import annotations

import os
import shutil
import tempfile
from pathlib import Path

import nox

nox.options.default_venv_backend = "venv"
nox.options.reuse_existing_virtualenvs = True
nox.options.sessions = ["tests"]

PACK = "./examples/company-pack"


@nox.session
def tests(session: nox.Session) -> None:
    """Install emgate, its test dependencies and the sample company pack; run pytest."""
    session.install("-e", ".[test]")  # the test extra includes emgate[sweep]'s Dask
    session.install(PACK)  # after emgate, which it depends on
    _browser(session)
    session.run("pytest", *session.posargs)


def _browser(session: nox.Session) -> None:
    """Debian's chromium and its driver for the HTML page's browser tests: installed when
    missing and we are root; in CI (CI=true) a missing browser fails the session, elsewhere
    the browser tests skip and say why."""
    if shutil.which("chromium") and shutil.which("chromedriver"):
        return
    if hasattr(os, "geteuid") and os.geteuid() == 0 and shutil.which("apt-get"):
        session.run("apt-get", "update", "-qq", external=True)
        session.run("apt-get", "install", "-y", "-qq", "chromium", "chromium-driver", external=True)
        return
    message = (
        "the browser tests need Debian's chromium and chromium-driver:"
        " sudo apt-get install chromium chromium-driver"
    )
    if os.environ.get("CI") == "true":
        session.error(message)
    session.warn(message + " (the browser tests will be skipped)")


@nox.session
def lint(session: nox.Session) -> None:
    """ruff (check and format) and mypy, as configured in pyproject.toml (verify/ and rules/)."""
    session.install("-e", ".[lint]")  # mypy needs emgate's dependencies for their types
    session.run("ruff", "check", "verify", "rules", "tests", "examples", "noxfile.py")
    session.run("ruff", "format", "--check", "verify", "rules", "tests", "noxfile.py")
    session.run("mypy")


@nox.session
def demo(session: nox.Session) -> None:
    """Run the gate on the bundled design repository (one design breaks a limit on purpose,
    so this session ends with emgate's exit code 1)."""
    session.install("-e", ".[html]")
    session.install(PACK)
    session.run("emgate", "rules")
    session.run("emgate", "show", "examples/design-repo/designs/pump-drive-4p36s.yaml")
    out = Path("build/demo").resolve()
    (out / "sheets").mkdir(parents=True, exist_ok=True)  # emgate creates no report folders
    _demo_diff(session, out)
    session.log(f"The calculation sheets and the diff are in {out}.")
    session.log("The demo holds one design that breaks a limit on purpose: expect exit code 1.")
    session.run(
        "emgate",
        "check",
        "examples/design-repo",
        "--format",
        "text",
        "--format",
        f"html:{out / 'sheets' / 'index.html'}",
    )


def _demo_diff(session: nox.Session, out: Path) -> None:
    """The physics diff of a change to a demo design: a throwaway git repository made from
    the example, one commit with the record as shipped and one with a narrower slot and a
    turn more per coil."""
    with tempfile.TemporaryDirectory(prefix="emgate-demo-") as tmp:
        repo = Path(tmp) / "design-repo"
        shutil.copytree("examples/design-repo", repo)
        git = ("git", "-c", "user.name=demo", "-c", "user.email=demo@example.invalid")
        with session.chdir(repo):
            session.run(*git, "init", "-q", "-b", "main", external=True)
            session.run(*git, "add", "-A", external=True)
            session.run(*git, "commit", "-qm", "as shipped", external=True)
            record = repo / "designs" / "pump-drive-4p36s.yaml"
            text = record.read_text(encoding="utf-8")
            text = text.replace("bottom_width: 9.6 mm", "bottom_width: 9.2 mm")
            text = text.replace("turns_per_coil: 21", "turns_per_coil: 22")
            record.write_text(text, encoding="utf-8")
            session.run(*git, "commit", "-qam", "narrower slot, one more turn", external=True)
            session.run(
                "emgate",
                "diff",
                "HEAD~1",
                "HEAD",
                "--format",
                "text",
                "--format",
                f"markdown:{out / 'diff.md'}",
                "--format",
                f"html:{out / 'diff.html'}",
            )


@nox.session
def schema(session: nox.Session) -> None:
    """Regenerate schemas/ from the pydantic models."""
    session.install("-e", ".")
    session.run("emgate", "schema", "--write", "schemas")


@nox.session
def bench(session: nox.Session) -> None:
    """Start-up and rule timings as ratios measured in one run (no timed assertions)."""
    session.install("-e", ".")
    session.install(PACK)
    session.run("python", "bench/bench.py", *session.posargs)


@nox.session
def sweep(session: nox.Session) -> None:
    """Sweep rates: the full path on a Dask LocalCluster, the vectorised path on a million
    variants (`nox -s sweep -- FULL VECTOR` for other sizes); prints, asserts nothing."""
    session.install("-e", ".[sweep]")
    session.install(PACK)
    session.run("python", "bench/sweep_rate.py", *session.posargs)


@nox.session
def fuzz(session: nox.Session) -> None:
    """The fuzz test at length: 100,000 mutated records, or the count given
    (``nox -s fuzz -- 20000``); random each run, it stops at the first escape."""
    session.install("-e", ".[test]")
    session.install(PACK)
    count = session.posargs[0] if session.posargs else "100000"
    session.run(
        "pytest",
        "-x",
        "-q",
        "tests/test_fuzz.py",
        "-p",
        "no:cacheprovider",
        env={"EMGATE_FUZZ_EXAMPLES": count},
    )
