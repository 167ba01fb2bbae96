"""``emgate init``: a starter design repository. It never overwrites an existing file."""

from __future__ import annotations

import sys
from importlib.resources import files
from pathlib import Path

#: target path -> template name
LAYOUT = {
    "emgate.yaml": "emgate.yaml",
    "waivers.yaml": "waivers.yaml",
    "designs/example-4p36s.yaml": "example-design.yaml",
    ".github/workflows/emgate.yml": "github-workflow.yml",
    ".pre-commit-config.yaml": "pre-commit-config.yaml",
    "noxfile.py": "noxfile.py.txt",
}


def init(target: Path) -> int:
    from emgate.atomic import write_atomic
    from emgate.schemas import SCHEMA_KINDS, schema_text

    templates = files("emgate") / "templates"
    planned = {
        Path(rel): templates.joinpath(name).read_text(encoding="utf-8")
        for rel, name in LAYOUT.items()
    }
    planned |= {Path("schemas") / f"{k}.schema.json": schema_text(k) for k in SCHEMA_KINDS}
    existing = sorted(str(rel) for rel in planned if (target / rel).exists())
    for rel, text in sorted(planned.items()):
        if (target / rel).exists():
            continue
        write_atomic(target / rel, text, parents=True)
        print(f"wrote   {(target / rel).as_posix()}")
    for kept in existing:
        print(f"kept    {(target / kept).as_posix()} (exists; not overwritten)", file=sys.stderr)
    print("next: edit designs/, then run `emgate check`")
    return 0
