"""``emgate init``: a starter design repository. It never overwrites an existing file.

Every file it writes works as written in a fresh repository: the CI workflow, the GitLab job,
the nox session and the pre-commit hook all install emgate from ``requirements-emgate.txt``,
which pins the version that wrote them (the one line a team edits to upgrade).
"""

from __future__ import annotations

import sys
from importlib.resources import files
from pathlib import Path

#: machine kind -> (target path, template name) of its starter record
STARTERS = {
    "induction": ("designs/example-4p36s.yaml", "example-induction.yaml"),
    "surface_pm": ("designs/example-10p12s.yaml", "example-surface-pm.yaml"),
    "salient_field": ("designs/example-4p48s.yaml", "example-salient-field.yaml"),
}

#: target path -> template name, besides the starter record
LAYOUT = {
    "emgate.yaml": "emgate.yaml",
    "waivers.yaml": "waivers.yaml",
    "requirements-emgate.txt": "requirements-emgate.txt",
    ".github/workflows/emgate.yml": "github-workflow.yml",
    ".gitlab-ci.yml": "gitlab-ci.yml",
    ".pre-commit-config.yaml": "pre-commit-config.yaml",
    "noxfile.py": "noxfile.py.txt",
    ".gitignore": "gitignore.txt",
}


def _version() -> str:
    from importlib.metadata import PackageNotFoundError, version

    try:
        return version("emgate")
    except PackageNotFoundError:  # run from a source tree that is not installed
        return "0.1.0"


def init(target: Path, machine: str = "induction") -> int:
    from emgate.atomic import write_atomic
    from emgate.schemas import SCHEMA_KINDS, schema_text

    templates = files("emgate") / "templates"
    record, record_template = STARTERS[machine]
    layout = {**LAYOUT, record: record_template}
    planned = {
        Path(rel): templates.joinpath(name).read_text(encoding="utf-8")
        for rel, name in layout.items()
    }
    pins = Path("requirements-emgate.txt")
    planned[pins] = planned[pins].replace("{version}", _version())
    planned |= {Path("schemas") / f"{k}.schema.json": schema_text(k) for k in SCHEMA_KINDS}
    existing = sorted(str(rel) for rel in planned if (target / rel).exists())
    for rel, text in sorted(planned.items()):
        if (target / rel).exists():
            continue
        write_atomic(target / rel, text, parents=True)
        print(f"wrote   {(target / rel).as_posix()}")
    for kept in existing:
        print(f"kept    {(target / kept).as_posix()} (exists; not overwritten)", file=sys.stderr)
    print(
        "next: python -m pip install -r requirements-emgate.txt (see the comments there),"
        f" edit {record}, then run `emgate check`"
    )
    return 0
