"""``emgate diff``: the physics of a change, record by record.

``emgate diff BASE [HEAD] [PATHS...]`` compares the design records of two git revisions
(HEAD omitted: the working tree), or ``emgate diff OLD.yaml NEW.yaml`` two files. Each side
is checked by the gate's own engine (:func:`emgate.page.run.run_gate`) on the records as
they were at that revision, with that revision's policy and materials files, and gathered
into the same page data as ``emgate show --format html``; a record's diff is then the record
fields that changed, every sheet quantity that moved beyond a relative threshold, the
checks' margins before and after, and the checks that newly fail or newly pass. Renames are
followed with git's rename detection; added and removed records are listed as such.

:mod:`.sides` gathers the two sides, :mod:`.changes` compares them, :mod:`.render` writes the
result in each format; this module is the command line.

Exit code 0 unless the head revision fails the gate on the records compared (1 a rule
found an error, 2 invalid input, 3 a crash), so that a CI job can post the diff and still
gate; 2 when the revisions or paths cannot be read.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path
from typing import TYPE_CHECKING, Any

from emgate.diff.changes import DiffError
from emgate.diff.render import RENDERERS
from emgate.diff.sides import diff_files, diff_revisions, in_revision, is_revision
from emgate.terms import EXIT_INPUT

if TYPE_CHECKING:
    from emgate.plugins import PluginSet


DIFF_FORMATS = ("text", "json", "markdown", "html")


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
            if rest and not Path(rest[0]).exists() and is_revision(rest[0], cwd):
                head, rest = rest[0], rest[1:]
            for p in rest:
                if not (cwd / p).exists() and not in_revision(base, p, cwd):
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
