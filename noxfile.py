"""Sessions: tests, lint, demo, schema (regenerate the committed JSON Schemas), bench, sweep."""

from __future__ import annotations

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
    session.run("pytest", *session.posargs)


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
    session.install("-e", ".")
    session.install(PACK)
    session.run("emgate", "rules")
    session.run("emgate", "show", "examples/design-repo/designs/pump-drive-4p36s.yaml")
    session.log("The demo holds one design that breaks a limit on purpose: expect exit code 1.")
    session.run("emgate", "check", "examples/design-repo")


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
