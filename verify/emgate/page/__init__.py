"""The calculation sheet of a record as one self-contained HTML page, with plots.

One job a module. :mod:`emgate.page.data` gathers what a page shows from a design, its
calculation and the run's checks, with :mod:`~emgate.page.figures` (the drawings' and plots'
data) and :mod:`~emgate.page.run` (the gate run and a record's checks): the only modules that
read the calculation or the kernel. They hand on the plain dataclasses of
:mod:`emgate.page.content`. :mod:`emgate.page.plots` draws them as SVG with matplotlib,
imported only there; :mod:`emgate.page.html` writes the page from its
:mod:`~emgate.page.sections` on the skeleton of :mod:`~emgate.page.markup`, escaping
everything that comes from the record. :mod:`emgate.page.shapes` holds the plane geometry of
the drawings (slot outlines, conductors as placed for the fill). The page of a sweep is
:mod:`emgate.page.sweep_data` (what it keeps of the rows) and :mod:`emgate.page.sweep_page`.
"""

from __future__ import annotations

from errno import EISDIR
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from emgate.findings import RunResult
    from emgate.page.content import IndexRow, PageData


MISSING_PLOTS = "the html format draws with matplotlib: pip install 'emgate[html]'"


def plots_available() -> bool:
    """Whether matplotlib, which the plots need, is installed (an optional extra)."""
    from importlib.util import find_spec

    return find_spec("matplotlib") is not None


def page_html(page: PageData) -> str:
    """The self-contained HTML sheet of one gathered record."""
    from emgate.page.html import render_page
    from emgate.page.plots import page_plots

    return render_page(page, page_plots(page))


def sheet_file_name(record_id: str) -> str:
    """File name of a record's sheet beside the run's index (ids are slugs: safe names)."""
    return f"sheet-{record_id}.html"


def write_run(result: RunResult, out: Path, jobs: int = 1) -> None:
    """Write a run's index to ``out`` (``out/index.html`` when ``out`` is a folder or does
    not end in .html) and each record's sheet beside it. A folder ``out`` is made when
    missing, its parent never (a typo in a path is an error).

    The sheets are drawn in up to ``jobs`` processes (the plots are most of a run's time),
    each written as soon as it is drawn, into a staging folder beside the index: they land
    beside it, and the index after them, only once every sheet is drawn. A sheet that
    cannot be drawn or written leaves none of the run's files (OSError, or RuntimeError
    for any other failure: an internal error)."""
    from emgate.atomic import land, staging, write_atomic
    from emgate.page.html import render_index
    from emgate.parallel import ordered_map

    if not plots_available():
        raise OSError(MISSING_PLOTS)
    index = (
        out if out.suffix.lower() in (".html", ".htm") and not out.is_dir() else out / "index.html"
    )
    if index.parent == out:
        out.mkdir(exist_ok=True)  # FileNotFoundError (an OSError) when the parent is missing
    with staging(index) as staged:
        sheet = _SheetWriter(staged, result.in_memory("HTML page"))
        rows = []
        # the records by their place: a worker takes its record from the run it was forked
        # with, where a check is the object its finding reports (a pickled copy is not)
        for row in ordered_map(sheet, list(range(len(result.records))), jobs):
            if isinstance(row, OSError):
                raise row
            if isinstance(row, str):
                raise RuntimeError(row)
            rows.append(row)
        names = [sheet_file_name(row.record_id) for row in rows]
        for name in names:  # a folder in the way, before any sheet lands
            if (index.parent / name).is_dir():
                raise IsADirectoryError(EISDIR, "a folder is in the way", str(index.parent / name))
        for name in names:
            land(staged / name, index.parent / name)
    write_atomic(index, render_index(result, rows, sheet_file_name))


class _SheetWriter:
    """Draws and writes one record's sheet. Returns its index line, or what stopped it: the
    OSError, or the text of any other error. Nothing else may leave a worker process: an
    exception that does not unpickle would stop the pool's result thread, and the run with
    it."""

    def __init__(self, folder: Path, result: RunResult) -> None:
        from emgate.page.run import RunView

        self.folder, self.result, self.view = folder, result, RunView.of(result)

    def __call__(self, at: int) -> IndexRow | OSError | str:
        from emgate.atomic import write_atomic
        from emgate.page.content import IndexRow
        from emgate.page.data import gather

        record = self.result.records[at]
        try:
            page = gather(Path(record.file), self.result, record=record, view=self.view)
            write_atomic(self.folder / sheet_file_name(page.record_id), page_html(page))
        except OSError as exc:
            return OSError(exc.errno, exc.strerror or str(exc), exc.filename)
        except Exception as exc:  # (a worker's KeyboardInterrupt is the pool's to handle)
            return f"the sheet of {record.file} could not be drawn: {type(exc).__name__}: {exc}"
        return IndexRow.of(page)


def show_html(file: Path, out: Path | None, config: Path | None, plugins: object) -> int:
    """``emgate show FILE --format html[:OUT]``: the record checked by the gate and its sheet
    written to OUT (or standard output). Exit 0, or 2 when the record cannot be read or a
    quantity could not be computed (as ``emgate show``)."""
    import sys

    from emgate.atomic import write_atomic
    from emgate.errors import InputError, InputErrors
    from emgate.page.data import gather
    from emgate.page.run import run_gate
    from emgate.report.common import one_line
    from emgate.terms import EXIT_INPUT, EXIT_OK

    if not plots_available():
        print(f"emgate: {MISSING_PLOTS}", file=sys.stderr)
        return EXIT_INPUT
    result = run_gate([file], plugins, config)  # type: ignore[arg-type]
    try:
        page = gather(file, result)
    except (InputError, InputErrors) as exc:
        for err in exc.errors if isinstance(exc, InputErrors) else [exc]:
            print(one_line(str(err)), file=sys.stderr)
        return EXIT_INPUT
    text = page_html(page)
    if out is None:
        sys.stdout.write(text)
    else:
        try:
            write_atomic(out, text)
        except OSError as exc:
            print(one_line(f"emgate: cannot write html to {out}: {exc.strerror}"), file=sys.stderr)
            return EXIT_INPUT
    return EXIT_INPUT if any(q.error for q in page.quantities) else EXIT_OK
