"""``--changed-since REV``: which records a change touches, asked of git itself.

A record is checked when its own file changed, when a materials file defining (before or after
the change) a steel it uses changed, or when the configuration or the waivers file changed
(then every record is).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

from emgate.config import CONFIG_NAME, WAIVERS_NAME
from emgate.errors import InputError, resolved

if TYPE_CHECKING:
    import subprocess


@dataclass
class ChangeSet:
    files: set[Path] = field(default_factory=set)
    everything: bool = False
    grades: set[str] = field(default_factory=set)
    #: The files were named on the command line (each must then be an emgate file).
    named: bool = False

    def touches(self, path: Path, data: Any) -> bool:
        """Whether a design file (with its raw, unvalidated data) is affected."""
        if self.everything or resolved(path) in self.files:
            return True
        if not self.grades or not isinstance(data, dict):
            return False
        steels = set()
        for part in ("stator", "rotor"):
            node = data.get(part)
            if isinstance(node, dict) and isinstance(node.get("steel"), str):
                steels.add(node["steel"])
        return bool(steels & self.grades)


def _git(args: list[str], cwd: Path) -> subprocess.CompletedProcess[str]:
    import subprocess  # here: a check without --changed-since never starts git

    try:
        return subprocess.run(
            ["git", *args], cwd=cwd, capture_output=True, text=True, check=False, timeout=60
        )
    except FileNotFoundError:
        raise InputError("--changed-since needs git, which is not installed") from None
    except subprocess.TimeoutExpired:
        raise InputError(f"git {' '.join(args)} did not answer within 60 s") from None


def changed_since(rev: str, cwd: Path, config: Path | None, waivers: Path | None) -> ChangeSet:
    """The files changed in the work tree against ``rev`` (committed, staged, unstaged and
    untracked), as a :class:`ChangeSet`."""
    # One git for both (each costs a process): the work tree's top, then the commit. Inside
    # a work tree git prints the top first, whatever it then makes of the revision (1 for
    # one that does not exist, 128 for one it cannot read, such as a missing upstream);
    # outside one it prints nothing. (A revision beginning with '-' would be an option.)
    verify = [] if rev.startswith("-") else ["--verify", "--quiet", f"{rev}^{{commit}}"]
    asked = _git(["rev-parse", "--show-toplevel", *verify], cwd)
    lines = asked.stdout.splitlines()
    if not lines:
        raise InputError(f"--changed-since needs a git work tree; {cwd} is not in one")
    root = Path(lines[0].strip())
    if not verify or asked.returncode != 0 or len(lines) != 2:
        raise InputError(
            f"git revision {rev!r} does not exist in {root.name} (in CI, fetch"
            " enough history: e.g. a fetch depth of 0)"
        )
    diff = _git(["diff", "--name-only", "-z", "--no-renames", rev, "--"], root)
    untracked = _git(["ls-files", "--others", "--exclude-standard", "-z"], root)
    if diff.returncode != 0 or untracked.returncode != 0:
        raise InputError(f"git diff against {rev!r} failed: {diff.stderr.strip()}")
    names = [n for n in (diff.stdout + untracked.stdout).split("\0") if n]
    out = ChangeSet(files={resolved(root / n) for n in names})
    # Policy files, present or deleted by the change, re-check everything.
    specials = {resolved(p) for p in (config, waivers) if p is not None}
    if out.files & specials or any(p.name in (CONFIG_NAME, WAIVERS_NAME) for p in out.files):
        out.everything = True
    for path in out.files:
        if path.suffix in (".yaml", ".yml"):
            out.grades |= _grades_defined(path, root, rev)
    return out


def named_files(
    paths: list[Path], root: Path, config: Path | None, waivers: Path | None
) -> ChangeSet:
    """Files named on the command line (as pre-commit passes the staged ones), read as a change
    to the repository at ``root``: a named materials file re-checks the records using its
    grades, a named config or waivers file re-checks every record."""
    out = ChangeSet(files={resolved(p) for p in paths}, named=True)
    specials = {resolved(p) for p in (config, waivers) if p is not None}
    out.everything = bool(out.files & specials) or any(
        p.name in (CONFIG_NAME, WAIVERS_NAME) for p in out.files
    )
    for path in out.files:
        if path.suffix in (".yaml", ".yml"):
            out.grades |= _grades_defined(path, root, None)
    return out


def _grades_defined(path: Path, root: Path, rev: str | None) -> set[str]:
    """Steel names a materials file defines now or defined at ``rev``."""
    from emgate.loader import read_text

    texts = []
    try:  # a regular file inside the repository only (a link out is not followed)
        resolved(path).relative_to(resolved(root))
        texts.append(read_text(path))
    except (ValueError, OSError, InputError):
        pass  # deleted, not a regular file, or outside: the file's own check reports it
    if rev is not None:
        old = _git(["show", f"{rev}:{path.relative_to(root).as_posix()}"], root)
        if old.returncode == 0:
            texts.append(old.stdout)
    grades: set[str] = set()
    for text in texts:
        if "emgate/materials@" not in text[:4096]:
            continue
        from emgate.loader import load_text

        try:
            data = load_text(path, text).data
        except InputError:
            continue  # the file's own check reports it
        if isinstance(data, dict) and isinstance(data.get("steels"), dict):
            grades |= set(data["steels"])
    return grades
