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

import os
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, NoReturn

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
    each written as soon as it is drawn, into a staging folder beside the index: the sheets
    land, and the index last, only once all are in and every place they go is checked
    (:func:`emgate.atomic.check_landing`). A sheet that cannot be drawn or written leaves
    none of the run's files (OSError, or RuntimeError for any other failure: an internal
    error); only an error of a rename itself, after the checks, can leave part of them."""
    from emgate.atomic import check_landing, land, staging, write_atomic
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
            if isinstance(row, _Failed):
                row.throw()
            rows.append(row)
        write_atomic(staged / index.name, render_index(result, rows, sheet_file_name))
        names = [*(sheet_file_name(row.record_id) for row in rows), index.name]  # index last
        for name in names:
            check_landing(index.parent / name)
        for name in names:
            land(staged / name, index.parent / name)


@dataclass(frozen=True)
class _Failed:
    """What stopped a sheet in a worker process, as plain data: an exception that does not
    unpickle would stop the pool's result thread, and the run with it."""

    message: str
    trace: str
    #: (errno, strerror, filename) of an OSError; None for any other error
    os_error: tuple[int | None, str, str | None] | None = None

    def throw(self) -> NoReturn:
        if self.os_error is not None:
            exc: Exception = OSError(*self.os_error)
        else:
            exc = RuntimeError(self.message)
        exc.add_note(f"in the process that drew the sheet:\n{self.trace}")
        raise exc


class _SheetWriter:
    """Draws and writes one record's sheet into the staging folder; its index line. In a
    worker process an error comes back as :class:`_Failed`; in the run's own process it is
    raised as it is."""

    def __init__(self, folder: Path, result: RunResult) -> None:
        from emgate.page.run import RunView

        self.folder, self.result, self.view = folder, result, RunView.of(result)
        self.home = os.getpid()

    def __call__(self, at: int) -> IndexRow | _Failed:
        from emgate.atomic import write_atomic
        from emgate.page.content import IndexRow
        from emgate.page.data import gather

        record = self.result.records[at]
        try:
            page = gather(Path(record.file), self.result, record=record, view=self.view)
            write_atomic(self.folder / sheet_file_name(page.record_id), page_html(page))
        except OSError as exc:
            if os.getpid() == self.home:
                raise
            import traceback

            trace = traceback.format_exc()
            return _Failed(str(exc), trace, (exc.errno, exc.strerror or str(exc), exc.filename))
        except Exception as exc:
            text = f"the sheet of {record.file} could not be drawn: {type(exc).__name__}: {exc}"
            if os.getpid() == self.home:
                raise RuntimeError(text) from exc
            import traceback

            return _Failed(text, traceback.format_exc())
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
