"""The two sides of a diff: the records of each git revision (or each file) checked by the
gate's engine as they were there, gathered into page data, paired by path and compared."""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from emgate.diff.changes import DEFAULT_THRESHOLD, DiffError, DiffResult, RecordDiff, compare
from emgate.terms import EXIT_OK

if TYPE_CHECKING:
    from emgate.page.content import PageData
    from emgate.plugins import PluginSet


def _git(args: list[str], cwd: Path) -> bytes:
    import subprocess

    try:
        done = subprocess.run(
            ["git", *args], cwd=cwd, capture_output=True, check=False, timeout=120
        )
    except (OSError, subprocess.TimeoutExpired) as exc:
        raise DiffError(f"git {args[0]} could not run: {exc}") from None
    if done.returncode != 0:
        text = done.stderr.decode("utf-8", "replace").strip().splitlines()
        raise DiffError(f"git {' '.join(args[:3])}: {text[-1] if text else 'failed'}")
    return done.stdout


def is_revision(rev: str, cwd: Path) -> bool:
    import subprocess

    done = subprocess.run(
        ["git", "rev-parse", "--verify", "--quiet", f"{rev}^{{commit}}"],
        cwd=cwd,
        capture_output=True,
        check=False,
    )
    return done.returncode == 0


def in_revision(rev: str, path: str, cwd: Path) -> bool:
    import subprocess

    done = subprocess.run(
        ["git", "cat-file", "-e", f"{rev}:./{path}"], cwd=cwd, capture_output=True, check=False
    )
    return done.returncode == 0


def _extract(rev: str, top: Path, into: Path) -> None:
    """The YAML files of revision ``rev`` under ``into`` (the rest is not needed to check)."""
    try:
        data = _git(
            # One pathspec for .yaml and .yml: git refuses a pathspec that matches nothing.
            ["archive", "--format=tar", rev, "--", ":(glob)**/*.y*ml"],
            top,
        )
    except DiffError as exc:
        if "did not match" in str(exc):
            data = b""
        else:
            raise
    into.mkdir(parents=True, exist_ok=True)
    (into / ".git").mkdir()  # the tree's own top: config and materials are looked up inside
    if data:
        import io
        import tarfile

        with tarfile.open(fileobj=io.BytesIO(data)) as tar:
            if hasattr(tarfile, "data_filter"):  # Python 3.11.4 and later
                tar.extractall(into, filter="data")
            else:  # only plain files and folders inside the tree
                safe = [
                    m
                    for m in tar.getmembers()
                    if (m.isfile() or m.isdir())
                    and not m.name.startswith("/")
                    and ".." not in Path(m.name).parts
                ]
                tar.extractall(into, members=safe)


def _name_status(base: str, head: str | None, top: Path, paths: list[str]) -> list[list[str]]:
    args = ["diff", "--name-status", "-M", "-z", base]
    if head is not None:
        args.append(head)
    raw = _git([*args, "--", *paths], top).decode("utf-8", "replace").split("\0")
    out, i = [], 0
    while i < len(raw) and raw[i]:
        code = raw[i]
        n = 2 if code[0] in "RC" else 1
        out.append([code, *raw[i + 1 : i + 1 + n]])
        i += 1 + n
    return out


def _designs(tree: Path, rel_paths: list[str]) -> set[str]:
    """Repository-relative paths of the design records under ``rel_paths`` in a tree."""
    from emgate.discovery import discover
    from emgate.findings import RunResult
    from emgate.terms import DESIGN_SCHEMA

    roots = [tree / p for p in rel_paths] if rel_paths else [tree]
    found = discover([r for r in roots if r.exists()], RunResult())
    return {
        s.path.resolve().relative_to(tree.resolve()).as_posix()
        for s in found
        if s.declared == DESIGN_SCHEMA
    }


def _evaluate(
    tree: Path, rels: list[str], plugins: PluginSet
) -> tuple[dict[str, PageData], dict[str, str], int]:
    """Check the records ``rels`` of a tree with the gate, grouped by their emgate.yaml;
    (pages by path, input errors by path, the run's exit code)."""
    from emgate.config import find_config
    from emgate.errors import InputError, InputErrors
    from emgate.page.data import gather
    from emgate.page.run import RunView, run_gate

    groups: dict[Path | None, list[str]] = {}
    for rel in rels:
        groups.setdefault(find_config((tree / rel).parent), []).append(rel)
    pages: dict[str, PageData] = {}
    errors: dict[str, str] = {}
    code = EXIT_OK
    for config, members in groups.items():
        result = run_gate([tree / r for r in members], plugins, config, root=tree)
        code = max(code, result.exit_code)
        view = RunView.of(result)  # (indexed once for the group's pages)
        for rel in members:
            try:
                pages[rel] = gather(tree / rel, result, shown_as=rel, view=view)
            except (InputError, InputErrors) as exc:
                errs = exc.errors if isinstance(exc, InputErrors) else [exc]
                errors[rel] = "; ".join(str(x).replace(str(tree) + "/", "") for x in errs)
            except (ValueError, ArithmeticError) as exc:  # a calculation refusing the record
                errors[rel] = f"not computed: {exc}"
    return pages, errors, code


def diff_revisions(
    base: str,
    head: str | None,
    paths: list[Path],
    plugins: PluginSet,
    threshold: float = DEFAULT_THRESHOLD,
    cwd: Path | None = None,
) -> DiffResult:
    """The diff of the design records under ``paths`` between two revisions (head None:
    the working tree)."""
    import tempfile

    cwd = cwd or Path.cwd()
    top = Path(_git(["rev-parse", "--show-toplevel"], cwd).decode().strip())
    for rev in (base, head):
        if rev is not None and not is_revision(rev, top):
            raise DiffError(f"not a git revision: {rev!r}")
    rel_paths = []
    for p in paths:
        try:
            rel_paths.append((cwd / p).resolve().relative_to(top.resolve()).as_posix())
        except ValueError:
            raise DiffError(f"{p}: outside the git work tree {top}") from None
    changes = _name_status(base, head, top, rel_paths)
    result = DiffResult(base, head or "working tree", threshold)
    with tempfile.TemporaryDirectory(prefix="emgate-diff-") as tmp:
        base_tree = Path(tmp) / "base"
        _extract(base, top, base_tree)
        if head is None:
            head_tree = top
        else:
            head_tree = Path(tmp) / "head"
            _extract(head, top, head_tree)
        base_designs = _designs(base_tree, rel_paths)
        head_designs = _designs(head_tree, rel_paths)
        renames: dict[str, str] = {}  # head path -> base path
        touched: set[str] = set()
        policy_changed = False
        for code, *names in changes:
            if code[0] == "R":
                renames[names[1]] = names[0]
            touched.update(names)
            if any(n.endswith((".yaml", ".yml")) for n in names) and not any(
                n in base_designs or n in head_designs for n in names
            ):
                policy_changed = True  # a config, waivers or materials file: recheck all
        if policy_changed:
            head_sel = set(head_designs)
            base_sel = set(base_designs)
        else:
            head_sel = head_designs & touched
            base_sel = base_designs & (touched | set(renames.values()))
        base_sel |= {renames[h] for h in head_sel if h in renames and renames[h] in base_designs}
        base_pages, base_errors, _ = _evaluate(base_tree, sorted(base_sel), plugins)
        head_pages, head_errors, result.head_exit = _evaluate(head_tree, sorted(head_sel), plugins)
    paired_base: set[str] = set()
    for rel in sorted(head_sel):
        before = renames.get(rel, rel)
        if before not in base_sel:
            before = None  # type: ignore[assignment]
        if before is not None:
            paired_base.add(before)
        if rel in head_errors:
            result.records.append(
                RecordDiff("invalid", rel, before, rel, notes=[f"head: {head_errors[rel]}"])
            )
            continue
        b = base_pages.get(before) if before else None
        rd = compare(b, head_pages.get(rel), threshold, path_before=before, path_after=rel)
        if before and before in base_errors:
            rd.notes.append(f"base: {base_errors[before]}")
        if not rd.empty:
            result.records.append(rd)
    for rel in sorted(base_sel - paired_base):
        if rel in base_pages:
            result.records.append(compare(base_pages[rel], None, threshold, path_before=rel))
    _order(result)
    return result


def diff_files(
    old: Path, new: Path, plugins: PluginSet, threshold: float = DEFAULT_THRESHOLD
) -> DiffResult:
    """The diff of two record files, each checked in its own repository."""
    result = DiffResult(str(old), str(new), threshold)
    base_pages, base_errors, _ = _evaluate(old.parent, [old.name], plugins)
    head_pages, head_errors, result.head_exit = _evaluate(new.parent, [new.name], plugins)
    if new.name in head_errors:
        result.records.append(
            RecordDiff("invalid", new.name, str(old), str(new), notes=[head_errors[new.name]])
        )
        return result
    rd = compare(base_pages.get(old.name), head_pages[new.name], threshold)
    rd.path_before, rd.path_after = str(old), str(new)
    if old.name in base_errors:
        rd.notes.append(f"base: {base_errors[old.name]}")
    if not rd.empty:
        result.records.append(rd)
    return result


def _order(result: DiffResult) -> None:
    """Records that newly fail first, then the largest moves."""
    result.records.sort(key=lambda r: (not r.newly_failing, -r.worst(), r.record_id))
