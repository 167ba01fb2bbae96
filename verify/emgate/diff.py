"""``emgate diff``: the physics of a change, record by record.

``emgate diff BASE [HEAD] [PATHS...]`` compares the design records of two git revisions
(HEAD omitted: the working tree), or ``emgate diff OLD.yaml NEW.yaml`` two files. Each side
is checked by the gate's own engine (:func:`emgate.page.data.run_gate`) on the records as
they were at that revision, with that revision's policy and materials files, and gathered
into the same page data as ``emgate show --format html``; a record's diff is then the record
fields that changed, every sheet quantity that moved beyond a relative threshold, the
checks' margins before and after, and the checks that newly fail or newly pass. Renames are
followed with git's rename detection; added and removed records are listed as such.

Exit code 0 unless the head revision fails the gate on the records compared (1 a rule
found an error, 2 invalid input, 3 a crash), so that a CI job can post the diff and still
gate; 2 when the revisions or paths cannot be read.
"""

from __future__ import annotations

import math
import sys
from dataclasses import asdict, dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

from emgate.terms import EXIT_INPUT, EXIT_OK

if TYPE_CHECKING:
    from emgate.page.data import CheckRow, PageData
    from emgate.plugins import PluginSet

DIFF_FORMATS = ("text", "json", "markdown", "html")
DEFAULT_THRESHOLD = 0.001  # 0.1 %


class DiffError(Exception):
    """A revision, path or file the diff cannot read (exit code 2)."""


@dataclass(frozen=True)
class FieldChange:
    path: str
    before: str | None
    after: str | None


@dataclass(frozen=True)
class QuantityChange:
    name: str
    unit: str
    before: float | None
    after: float | None
    before_text: str
    after_text: str
    #: (after - before) / |before|; inf from zero; None when one side is not computed.
    relative: float | None


@dataclass(frozen=True)
class MarginChange:
    rule: str
    quantity: str
    bound: str
    label: str
    before: float | None
    after: float | None
    passed_before: bool | None
    passed_after: bool | None
    display_before: str
    display_after: str


@dataclass
class RecordDiff:
    status: str  # changed, added, removed, renamed, invalid
    record_id: str
    path_before: str | None
    path_after: str | None
    fields: list[FieldChange] = field(default_factory=list)
    quantities: list[QuantityChange] = field(default_factory=list)
    margins: list[MarginChange] = field(default_factory=list)
    newly_failing: list[str] = field(default_factory=list)
    newly_passing: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    base: PageData | None = None
    head: PageData | None = None

    @property
    def empty(self) -> bool:
        return (
            self.status == "changed"
            and not (self.fields or self.quantities or self.margins or self.notes)
            and not (self.newly_failing or self.newly_passing)
        )

    def worst(self) -> float:
        moved = [abs(q.relative) for q in self.quantities if q.relative is not None]
        return max(moved, default=0.0)


@dataclass
class DiffResult:
    base: str
    head: str
    threshold: float
    records: list[RecordDiff] = field(default_factory=list)
    head_exit: int = EXIT_OK
    notes: list[str] = field(default_factory=list)


# ------------------------------------------------------------------------- comparing


def relative_change(before: float, after: float) -> float:
    """(after - before) / |before|; 0 for equal values, +-inf from zero."""
    if after == before:
        return 0.0
    if before == 0.0:
        return math.copysign(math.inf, after)
    return (after - before) / abs(before)


def _key(c: CheckRow) -> tuple[str, str, str]:
    return (c.rule, c.quantity, c.bound)


def _finite(x: float) -> float | None:
    return x if math.isfinite(x) else None


def compare(
    base: PageData | None,
    head: PageData | None,
    threshold: float,
    *,
    path_before: str | None = None,
    path_after: str | None = None,
) -> RecordDiff:
    """The diff of one record between its base and head pages (None: absent there)."""
    page = head or base
    assert page is not None
    if base is None or head is None:
        status = "added" if base is None else "removed"
    elif path_before != path_after:
        status = "renamed"
    else:
        status = "changed"
    out = RecordDiff(status, page.record_id, path_before, path_after, base=base, head=head)
    if base is None or head is None:
        return out
    for name in sorted(set(base.fields) | set(head.fields)):
        b, a = base.fields.get(name), head.fields.get(name)
        if b != a:
            out.fields.append(FieldChange(name, b, a))
    before = {q.name: q for q in base.quantities}
    after = {q.name: q for q in head.quantities}
    for name in sorted(set(before) | set(after)):
        qb, qa = before.get(name), after.get(name)
        vb = qb.value if qb else None
        va = qa.value if qa else None
        unit = (qa or qb).unit  # type: ignore[union-attr]
        if vb is None or va is None:
            if (vb is None) != (va is None):
                out.quantities.append(
                    QuantityChange(
                        name, unit, vb, va, qb.text if qb else "", qa.text if qa else "", None
                    )
                )
            continue
        rel = relative_change(vb, va)
        if abs(rel) > threshold:
            out.quantities.append(
                QuantityChange(name, unit, vb, va, qb.text, qa.text, rel)  # type: ignore[union-attr]
            )
    out.quantities.sort(
        key=lambda q: -(math.inf if q.relative is None else abs(q.relative)), reverse=False
    )
    cb = {_key(c): c for c in base.checks}
    ca = {_key(c): c for c in head.checks}
    for key in sorted(set(cb) | set(ca)):
        b_c, a_c = cb.get(key), ca.get(key)
        moved = (
            b_c is None
            or a_c is None
            or b_c.passed != a_c.passed
            or abs(relative_change(b_c.value, a_c.value)) > threshold
            or abs(relative_change(b_c.limit, a_c.limit)) > threshold
        )
        if not moved:
            continue
        c = a_c or b_c
        assert c is not None
        out.margins.append(
            MarginChange(
                key[0],
                key[1],
                key[2],
                c.label,
                _finite(b_c.margin) if b_c else None,
                _finite(a_c.margin) if a_c else None,
                b_c.passed if b_c else None,
                a_c.passed if a_c else None,
                b_c.display if b_c else "",
                a_c.display if a_c else "",
            )
        )
        name = f"{key[0]}: {c.label}"
        if a_c is not None and not a_c.passed and (b_c is None or b_c.passed):
            out.newly_failing.append(name)
        if b_c is not None and not b_c.passed and (a_c is None or a_c.passed):
            out.newly_passing.append(name)
    out.margins.sort(key=lambda m: m.after if m.after is not None else -math.inf)
    rb = {r.rule: r.status for r in base.rules}
    for r in head.rules:
        was = rb.get(r.rule)
        if r.status == "crash" and was != "crash":
            out.newly_failing.append(f"{r.rule}: crashed ({r.message})")
        if was is not None and was != r.status and r.status == "not_applicable":
            out.notes.append(f"{r.rule}: no longer applies")
    return out


# ------------------------------------------------------------------------- git sides


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


def _is_revision(rev: str, cwd: Path) -> bool:
    import subprocess

    done = subprocess.run(
        ["git", "rev-parse", "--verify", "--quiet", f"{rev}^{{commit}}"],
        cwd=cwd,
        capture_output=True,
        check=False,
    )
    return done.returncode == 0


def _in_revision(rev: str, path: str, cwd: Path) -> bool:
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
    from emgate.page.data import gather, run_gate

    groups: dict[Path | None, list[str]] = {}
    for rel in rels:
        groups.setdefault(find_config((tree / rel).parent), []).append(rel)
    pages: dict[str, PageData] = {}
    errors: dict[str, str] = {}
    code = EXIT_OK
    for config, members in groups.items():
        result = run_gate([tree / r for r in members], plugins, config, root=tree)
        code = max(code, result.exit_code)
        for rel in members:
            try:
                pages[rel] = gather(tree / rel, result, shown_as=rel)
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
        if rev is not None and not _is_revision(rev, top):
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


# ------------------------------------------------------------------------- reporters


def _rel_text(rel: float | None) -> str:
    if rel is None:
        return "n/a"
    if math.isinf(rel):
        return "from 0"
    return f"{100 * rel:+.2f} %"


def _margin_text(m: float | None) -> str:
    return "-" if m is None else f"{100 * m:+.1f} %"


def _status_word(rd: RecordDiff) -> str:
    if rd.status == "renamed":
        return f"renamed from {rd.path_before}"
    return rd.status


def render_text(res: DiffResult) -> str:
    from emgate.findings import DISCLAIMER
    from emgate.report.common import one_line

    out = [
        f"emgate diff {res.base} -> {res.head} (quantities moved beyond {100 * res.threshold:g} %)"
    ]
    if not res.records:
        out.append("no design record changed")
    for rd in res.records:
        out.append("")
        out.append(f"{rd.record_id} ({rd.path_after or rd.path_before}): {_status_word(rd)}")
        for n in rd.notes:
            out.append(f"  note: {n}")
        for name in rd.newly_failing:
            out.append(f"  NEWLY FAILING {name}")
        for name in rd.newly_passing:
            out.append(f"  newly passing {name}")
        for f in rd.fields:
            out.append(f"  field {f.path}: {f.before} -> {f.after}")
        if rd.quantities:
            width = max(len(q.name) for q in rd.quantities)
            for q in rd.quantities:
                out.append(
                    f"  {q.name:<{width}}  {q.before_text or '-':>14} -> {q.after_text or '-':<14}"
                    f" {_rel_text(q.relative)}"
                )
        for m in rd.margins:
            out.append(
                f"  margin {m.rule}: {m.quantity} ({m.bound}) {_margin_text(m.before)} ->"
                f" {_margin_text(m.after)}"
            )
    out += ["", f"head revision gate exit code: {res.head_exit}", DISCLAIMER]
    # every line escaped: a record's text cannot start a line or drive a terminal
    return "\n".join(one_line(line) for line in out) + "\n"


def render_json(res: DiffResult) -> str:
    import json

    from emgate import __version__
    from emgate.findings import DISCLAIMER

    def clean(x: Any) -> Any:
        if isinstance(x, float) and not math.isfinite(x):
            return None if math.isnan(x) else ("inf" if x > 0 else "-inf")
        if isinstance(x, dict):
            return {k: clean(v) for k, v in x.items()}
        if isinstance(x, list):
            return [clean(v) for v in x]
        return x

    records = []
    for rd in res.records:
        d = asdict(rd)
        d.pop("base")
        d.pop("head")
        records.append(d)
    doc = {
        "tool": {"name": "emgate", "version": __version__},
        "base": res.base,
        "head": res.head,
        "threshold": res.threshold,
        "head_exit_code": res.head_exit,
        "records": records,
        "notes": res.notes,
        "notice": DISCLAIMER,
    }
    return json.dumps(clean(doc), indent=2) + "\n"


#: Rows of quantities per record in the Markdown comment (the rest: "and N more").
MARKDOWN_ROWS = 12


def render_markdown(res: DiffResult) -> str:
    from emgate import __version__
    from emgate.findings import DISCLAIMER
    from emgate.report.markdown import md

    def row(cells: list[str]) -> str:
        return "| " + " | ".join(md(c) for c in cells) + " |"

    out = [f"## emgate diff: {md(res.base)} → {md(res.head)}", ""]
    if not res.records:
        out.append("No design record changed.")
    for rd in res.records:
        head = f"### {md(rd.record_id)} ({md(_status_word(rd))})"
        out += [head, ""]
        for n in rd.notes:
            out.append(f"- {md(n)}")
        for name in rd.newly_failing:
            out.append(f"- **newly failing:** {md(name)}")
        for name in rd.newly_passing:
            out.append(f"- newly passing: {md(name)}")
        if rd.fields:
            out.append(
                "- fields: " + ", ".join(md(f"{f.path}: {f.before} → {f.after}") for f in rd.fields)
            )
        if rd.quantities:
            out += ["", row(["quantity", "before", "after", "change"]), "|---|---|---|---|"]
            for q in rd.quantities[:MARKDOWN_ROWS]:
                out.append(row([q.name, q.before_text, q.after_text, _rel_text(q.relative)]))
            if len(rd.quantities) > MARKDOWN_ROWS:
                more = len(rd.quantities) - MARKDOWN_ROWS
                out.append(f"\n…and {more} more: the text, json and html formats list them all.")
        if rd.margins:
            out += ["", row(["check", "margin before", "margin after"]), "|---|---|---|"]
            for m in rd.margins:
                out.append(
                    row(
                        [
                            f"{m.rule}: {m.quantity} ({m.bound})",
                            _margin_text(m.before),
                            _margin_text(m.after),
                        ]
                    )
                )
        out.append("")
    verdict = "passes" if res.head_exit == 0 else f"fails (exit code {res.head_exit})"
    out += [f"The head revision {verdict} the gate on the records compared.", ""]
    out += ["---", md(f"emgate {__version__}. {DISCLAIMER}")]
    return "\n".join(out) + "\n"


def render_html(res: DiffResult) -> str:
    from emgate.findings import DISCLAIMER
    from emgate.page import plots
    from emgate.page.html import e, html_table, num_cell, page_head

    out = [page_head(f"emgate diff {res.base} -> {res.head}")]
    out.append(
        f'<header><p class="meta">emgate diff</p><h1>{e(res.base)} → {e(res.head)}</h1>'
        f'<p class="meta">quantities moved beyond {100 * res.threshold:g} %; head revision'
        f" gate exit code {res.head_exit}</p>"
        f'<p class="caution">{e(DISCLAIMER)}</p></header><main>'
    )
    if not res.records:
        out.append("<p>No design record changed.</p>")
    labels = (res.base, res.head)
    for rd in res.records:
        out.append(f"<section><h2>{e(rd.record_id)}: {e(_status_word(rd))}</h2>")
        items = [f"<li><b>newly failing</b> {e(n)}</li>" for n in rd.newly_failing]
        items += [f"<li>newly passing {e(n)}</li>" for n in rd.newly_passing]
        items += [f"<li>{e(n)}</li>" for n in rd.notes]
        if items:
            out.append("<ul>" + "".join(items) + "</ul>")
        if rd.fields:
            out.append(
                html_table(
                    ["record field", "before", "after"],
                    [[e(f.path), e(f.before), e(f.after)] for f in rd.fields],
                )
            )
        if rd.quantities:
            out.append(
                html_table(
                    ["quantity", "before", "after", "change"],
                    [
                        [
                            e(q.name),
                            num_cell(e(q.before_text)),
                            num_cell(e(q.after_text)),
                            num_cell(e(_rel_text(q.relative))),
                        ]
                        for q in rd.quantities
                    ],
                )
            )
        b, h = rd.base, rd.head
        if b is not None and h is not None:
            if h.checks:
                out.append(_fig(plots.margins(h.checks, b.checks, labels), "margins"))
            if h.mmf is not None and b.mmf is not None:
                out.append(_fig(plots.spectrum(h.mmf, b.mmf, labels), "MMF spectra"))
            before = {s.name: s for s in b.steels}
            for s in h.steels:
                out.append(_fig(plots.bh_curve(s, before.get(s.name), labels), s.name))
        out.append("</section>")
    out.append(f"</main><footer><p>{e(DISCLAIMER)}</p></footer></body></html>\n")
    return "".join(out)


def _fig(svg: str, caption: str) -> str:
    from emgate.page.html import e

    return f"<figure>{svg}<figcaption>{e(caption)}</figcaption></figure>"


RENDERERS = {
    "text": render_text,
    "json": render_json,
    "markdown": render_markdown,
    "html": render_html,
}


# ------------------------------------------------------------------------- command line


def _threshold(text: str) -> float:
    try:
        value = float(text.strip().rstrip("%").strip())
    except ValueError:
        raise DiffError(f"--threshold: expected a percentage such as 0.5, found {text!r}") from None
    if not (math.isfinite(value) and value >= 0.0):
        raise DiffError(f"--threshold: expected a percentage >= 0, found {text!r}")
    return value / 100.0


def main(args: Any, plugins: PluginSet) -> int:
    """``emgate diff``, from the parsed command line (see ``emgate.cli``)."""
    from emgate.atomic import write_atomic
    from emgate.report.common import one_line

    try:
        outputs = []
        for spec in args.formats or ["text"]:
            name, _, file = spec.partition(":")
            if name not in DIFF_FORMATS:
                raise DiffError(
                    f"unknown format {name!r}; expected one of {', '.join(DIFF_FORMATS)}"
                )
            outputs.append((name, Path(file) if file else None))
        if sum(1 for _, f in outputs if f is None) > 1:
            raise DiffError("only one --format may go to standard output; give the others a FILE")
        if any(name == "html" for name, _ in outputs):
            from emgate.page import MISSING_PLOTS, plots_available

            if not plots_available():
                raise DiffError(MISSING_PLOTS)
        threshold = _threshold(args.threshold)
        refs: list[str] = args.refs
        cwd = Path.cwd()
        if len(refs) == 2 and all(Path(r).is_file() for r in refs):
            result = diff_files(Path(refs[0]), Path(refs[1]), plugins, threshold)
        else:
            base, rest = refs[0], refs[1:]
            head = None
            if rest and not Path(rest[0]).exists() and _is_revision(rest[0], cwd):
                head, rest = rest[0], rest[1:]
            for p in rest:
                if not (cwd / p).exists() and not _in_revision(base, p, cwd):
                    raise DiffError(f"{p}: neither a revision nor a path in {base}")
            result = diff_revisions(base, head, [Path(p) for p in rest], plugins, threshold)
    except DiffError as exc:
        print(one_line(f"emgate diff: {exc}"), file=sys.stderr)
        return EXIT_INPUT
    status = result.head_exit
    for name, file in outputs:
        text = RENDERERS[name](result)
        if file is None:
            sys.stdout.write(text)
            continue
        try:
            write_atomic(file, text)
        except OSError as exc:
            message = f"emgate diff: cannot write {name} to {file}: {exc.strerror}"
            print(one_line(message), file=sys.stderr)
            status = max(status, EXIT_INPUT)
    return status
