"""``emgate sweep RECORD SPEC.yaml``: a grid or a random sample over a record's fields, every
variant through validation, the calculation and all selected rules.

The spec and its variants are :mod:`emgate.sweep_spec`, the table and its summary
:mod:`emgate.sweep_table`; this module runs the variants and writes the table.

Scale-out: ``--scheduler local`` (default) starts a Dask LocalCluster on this machine's cores,
``--scheduler tcp://HOST:PORT`` uses a running Dask cluster (its workers need the same emgate
and rule packs installed), ``--scheduler none`` runs in this process. Chunks of variants are
the tasks; results are written in variant order as they arrive, with a bounded number of
chunks in flight, so the run never holds them all.

Results support, and do not replace, review by a qualified engineer.
"""

from __future__ import annotations

import sys
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, TextIO

from emgate.errors import InputError, InputErrors
from emgate.sweep_spec import Spec, parse_spec
from emgate.sweep_table import Columns, CsvWriter, ParquetWriter, Summary, row
from emgate.variants import Evaluator

#: Variants in one task: enough to amortise a task's round trip (some ms), few enough that
#: the chunks in flight stay small [common practice, no source].
DEFAULT_CHUNK = 256


def run_chunk(evaluator: Evaluator, spec: Spec, cols: Columns, start: int, stop: int) -> list[Any]:
    """Rows of variants ``start`` to ``stop`` (a task of the sweep)."""
    return [row(i, spec, cols, evaluator.evaluate(spec.variant(i))) for i in range(start, stop)]


def chunks(size: int, chunk: int) -> list[tuple[int, int]]:
    return [(s, min(s + chunk, size)) for s in range(0, size, chunk)]


def run_local(
    evaluator: Evaluator, spec: Spec, cols: Columns, chunk: int
) -> Iterator[list[list[Any]]]:
    for start, stop in chunks(spec.size, chunk):
        yield run_chunk(evaluator, spec, cols, start, stop)


def run_dask(
    evaluator: Evaluator, spec: Spec, cols: Columns, chunk: int, scheduler: str
) -> Iterator[list[list[Any]]]:
    """Chunks on a Dask cluster, yielded in variant order with a bounded window in flight."""
    from distributed import Client, LocalCluster, as_completed

    cluster = None
    if scheduler == "local":
        from emgate.parallel import available_cores

        cluster = LocalCluster(
            n_workers=available_cores(),
            threads_per_worker=1,
            processes=True,
            dashboard_address=None,
        )
        client = Client(cluster)
    else:
        client = Client(scheduler)
    try:
        workers = max(1, len(client.scheduler_info().get("workers", {})))
        window = 4 * workers
        [ev, sp, co] = client.scatter([evaluator, spec, cols], broadcast=True)
        pending = iter(chunks(spec.size, chunk))
        flying = as_completed()
        for _ in range(window):
            nxt = next(pending, None)
            if nxt is None:
                break
            flying.add(client.submit(run_chunk, ev, sp, co, *nxt, pure=False))
        ready: dict[int, list[list[Any]]] = {}
        expect = 0
        for future in flying:
            rows = future.result()
            future.release()
            ready[rows[0][0] if rows else expect] = rows
            while expect in ready:
                done = ready.pop(expect)
                expect += len(done)
                yield done
            nxt = next(pending, None)
            if nxt is not None:
                flying.add(client.submit(run_chunk, ev, sp, co, *nxt, pure=False))
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


# ---------------------------------------------------------------- the command


@dataclass
class SweepRun:
    record: Path
    spec: Path
    out: Path | None = None
    scheduler: str = "local"
    chunk: int = DEFAULT_CHUNK
    config: Path | None = None
    html: Path | None = None
    log: Callable[[str], None] = field(default=lambda text: print(text, file=sys.stderr))


def prepare(run: SweepRun) -> tuple[Evaluator, Spec, Columns]:
    """Load record, spec, policy, plugins and steels (InputError(s), located, when bad)."""
    from emgate.calc import SHEET
    from emgate.config import find_config, load_policy
    from emgate.discovery import discover_materials
    from emgate.loader import load
    from emgate.pipeline import TOLERANCE_RULES
    from emgate.plugins import load_plugins
    from emgate.validate import schema_of, validate_design

    plugins = load_plugins()
    if plugins.errors or plugins.crashes:
        raise InputErrors([*plugins.errors, *plugins.crashes])
    doc = load(run.record)
    schema_of(doc)
    design = validate_design(doc)  # the nominal record must be valid itself
    spec = parse_spec(load(run.spec), doc)
    config = run.config or find_config(run.record.resolve().parent)
    installed = {p.distribution: p.version for p in plugins.packs}
    rules = {rid: lr.rule for rid, lr in plugins.rules.items()}
    policy = load_policy(config, rules, Path.cwd(), installed)
    catalogue = discover_materials(run.record)
    catalogue.resolve(doc, design)
    rule_policy = policy.for_file(run.record)
    evaluator = Evaluator(
        doc,
        catalogue,
        plugins,
        rule_policy,
        policy.rule_time_budget,
        TOLERANCE_RULES,
    )
    selected = [
        rid
        for rid, lr in sorted(plugins.rules.items())
        if rid not in evaluator.skip and rule_policy.selected(lr.rule)
    ]
    sheet = [name for name, e in SHEET.items() if design.machine in e.machines]
    return evaluator, spec, Columns([a.name for a in spec.axes], sheet, selected)


def sweep(run: SweepRun) -> int:
    """Run a sweep; the summary to stdout, the table to ``run.out`` (or stdout as CSV), the
    page of its maps to ``run.html``."""
    import time

    from emgate.atomic import write_atomic

    if run.html is not None:
        from emgate.page import MISSING_PLOTS, plots_available

        if not plots_available():
            raise InputError(MISSING_PLOTS)
        if not run.html.parent.is_dir():  # found now, not after the sweep has run
            raise InputError(f"cannot write html to {run.html}: no such folder")
    evaluator, spec, cols = prepare(run)
    scheduler = run.scheduler
    if scheduler != "none":
        try:
            import distributed  # noqa: F401
        except ImportError:
            if scheduler != "local":
                raise InputError(
                    f"--scheduler {scheduler} needs Dask: pip install 'emgate[sweep]'"
                ) from None
            run.log("emgate sweep: Dask is not installed (emgate[sweep]); running in this process")
            scheduler = "none"
    summary = Summary(spec, cols)
    maps = None
    if run.html is not None:
        from emgate.page.sweep_data import SweepMaps

        maps = SweepMaps(spec, cols)
    tmp: Path | None = None
    stream: TextIO | None = None
    if run.out is not None and run.out.suffix == ".parquet":
        try:
            writer: CsvWriter | ParquetWriter = ParquetWriter(run.out, cols, spec)
        except ImportError:
            raise InputError("Parquet output needs pyarrow: pip install 'emgate[sweep]'") from None
    elif run.out is not None:
        tmp = run.out.with_name(run.out.name + ".partial")
        stream = tmp.open("w", encoding="utf-8", newline="")
        writer = CsvWriter(stream, cols.names)
    else:
        writer = CsvWriter(sys.stdout, cols.names)
    start = time.perf_counter()
    try:
        source = (
            run_local(evaluator, spec, cols, run.chunk)
            if scheduler == "none"
            else run_dask(evaluator, spec, cols, run.chunk, scheduler)
        )
        for rows in source:
            writer.write(rows)
            for r in rows:
                summary.add(r)
                if maps is not None:
                    maps.add(r)
    finally:
        writer.close()
        if stream is not None:
            stream.close()
    if tmp is not None and run.out is not None:
        write_atomic(run.out, tmp.read_text(encoding="utf-8"))
        tmp.unlink()
    elapsed = time.perf_counter() - start
    if maps is not None and run.html is not None:
        from emgate.page.sweep_page import sweep_html

        page = maps.page(summary, run.record, run.spec, evaluator.doc.data)
        try:
            write_atomic(run.html, sweep_html(page))
        except OSError as exc:
            raise InputError(f"cannot write html to {run.html}: {exc.strerror or exc}") from None
    text = summary.text()
    rate = summary.total / elapsed if elapsed > 0 else 0.0
    text += f"({rate:,.0f} variants/s wall, scheduler {scheduler})\n"
    (run.log if run.out is None else sys.stdout.write)(text)
    return 0


# ---------------------------------------------------------------- bench hook


def bench_rates(
    record: Path, n: int, rate: Callable[[Callable[[], int]], float]
) -> dict[str, tuple[float, str]]:
    """Sweep rates for ``bench/bench.py``: the full path (validation and every rule) one
    variant at a time, and the vectorised kernel path where there is one."""
    out: dict[str, tuple[float, str]] = {}
    import tempfile

    with tempfile.TemporaryDirectory() as tmp:
        spec = Path(tmp) / "spec.yaml"
        spec.write_text(
            "sample: random\ncount: 64\nseed: 1\nfields:\n"
            "  air_gap: {from: 0.35 mm, to: 0.65 mm}\n"
            "  winding.turns_per_coil: {from: 18, to: 24}\n"
        )
        evaluator, sp, cols = prepare(SweepRun(record, spec, scheduler="none"))
    out["full path, scalar (validation + all rules)"] = (
        rate(lambda: len(run_chunk(evaluator, sp, cols, 0, 64))),
        "variants/s",
    )
    try:
        from emgate.vector import bench_vector_rates
    except ImportError:
        return out
    out.update(bench_vector_rates(evaluator, n, rate))
    return out
