"""``emgate sweep RECORD SPEC.yaml``: a grid or a random sample over a record's fields, every
variant through validation, the calculation and all selected rules.

The spec (YAML)::

    sample: grid            # or random (then: count, seed)
    fields:
      air_gap: {from: 0.35 mm, to: 0.65 mm, steps: 7}      # evenly spaced, ends included
      winding.turns_per_coil: {from: 17, to: 25, step: 1}  # whole numbers stay whole
      stator.steel: [M400-50A, M270-35A]                   # a list of values

A random sample draws each range uniformly (whole numbers for whole-number ends) and each list
evenly; variant ``i`` is drawn from its own seeded stream, so the sample does not depend on
how it is cut into chunks or where they run.

Output: one row a variant (CSV, or Parquet with pyarrow): the swept fields (SI numbers for
quantities), whether it validated and why not, whether every rule passed, the binding rule
and its margin, every sheet quantity of the machine kind (SI, empty where not computed) and
each rule's status and margin. A summary gives the feasible fraction and the binding rules,
and for a grid over two fields a map of the feasible region.

Scale-out: ``--scheduler local`` (default) starts a Dask LocalCluster on this machine's cores,
``--scheduler tcp://HOST:PORT`` uses a running Dask cluster (its workers need the same emgate
and rule packs installed), ``--scheduler none`` runs in this process. Chunks of variants are
the tasks; results are written in variant order as they arrive, with a bounded number of
chunks in flight, so the run never holds them all.

Results support, and do not replace, review by a qualified engineer.
"""

from __future__ import annotations

import csv
import io
import math
import sys
from collections import Counter
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, TextIO

from emgate.errors import InputError, InputErrors
from emgate.fields import dotted_path, get_field, record_value, split_quantity
from emgate.loader import Document
from emgate.variants import Evaluator, VariantResult

#: Variants in one task: enough to amortise a task's round trip (some ms), few enough that
#: the chunks in flight stay small [common practice, no source].
DEFAULT_CHUNK = 256
MAX_VARIANTS = 100_000_000


@dataclass(frozen=True)
class Axis:
    """One swept field: a range (numbers in the unit ``unit``) or a list of record values."""

    name: str
    path: tuple[str | int, ...]
    values: tuple[Any, ...] = ()  # a list, or the grid points of a range
    low: float = 0.0
    high: float = 0.0
    unit: str = ""
    whole: bool = False
    is_range: bool = False
    like: Any = None  # the record's own value (its form: text with a unit, int, float)

    def record(self, number_or_value: Any) -> Any:
        if self.is_range:
            return record_value(number_or_value, self.unit, self.like)
        return number_or_value


@dataclass(frozen=True)
class Spec:
    axes: tuple[Axis, ...]
    sample: str = "grid"
    count: int = 0
    seed: int = 0

    @property
    def size(self) -> int:
        if self.sample == "random":
            return self.count
        return math.prod(len(a.values) for a in self.axes)

    def variant(self, i: int) -> dict[tuple[str | int, ...], Any]:
        """Variant ``i``: the record value of each swept field."""
        out: dict[tuple[str | int, ...], Any] = {}
        if self.sample == "grid":
            for axis in reversed(self.axes):  # the last field varies fastest
                i, k = divmod(i, len(axis.values))
                out[axis.path] = axis.record(axis.values[k])
            return dict(reversed(list(out.items())))
        import numpy as np

        rng = np.random.default_rng([self.seed, i])
        for axis in self.axes:
            if not axis.is_range:
                out[axis.path] = axis.values[int(rng.integers(len(axis.values)))]
            elif axis.whole:
                out[axis.path] = axis.record(float(rng.integers(int(axis.low), int(axis.high) + 1)))
            else:
                out[axis.path] = axis.record(float(rng.uniform(axis.low, axis.high)))
        return out


def _spec_error(doc: Document, path: tuple[str | int, ...], message: str) -> InputError:
    return InputError(message, doc.locate(path))


def parse_spec(spec_doc: Document, record: Document) -> Spec:
    """The sweep of a spec document over a record (InputErrors, located, on a bad spec)."""
    data = spec_doc.data
    errors: list[InputError] = []
    if not isinstance(data, dict):
        raise InputErrors([_spec_error(spec_doc, (), "expected a mapping with 'fields'")])
    # no `schema:` key: a spec kept in a design repository is no record for `emgate check`
    known = {"sample", "count", "seed", "fields"}
    for key in data:
        if key not in known:
            errors.append(
                _spec_error(spec_doc, (key,), f"unknown key {key!r}; expected {sorted(known)}")
            )
    sample = data.get("sample", "grid")
    if sample not in ("grid", "random"):
        errors.append(_spec_error(spec_doc, ("sample",), "expected 'grid' or 'random'"))
    count, seed = data.get("count", 1000), data.get("seed", 0)
    for key, value in (("count", count), ("seed", seed)):
        if not isinstance(value, int) or isinstance(value, bool) or value < (key == "count"):
            errors.append(_spec_error(spec_doc, (key,), f"expected a whole number for {key}"))
    fields_ = data.get("fields")
    if not isinstance(fields_, dict) or not fields_:
        errors.append(_spec_error(spec_doc, ("fields",), "expected a mapping of record fields"))
        raise InputErrors(errors)
    axes = []
    for name, how in fields_.items():
        at = ("fields", name)
        path = dotted_path(str(name))
        try:
            like = get_field(record.data, path)
        except (KeyError, IndexError, TypeError):
            errors.append(_spec_error(spec_doc, at, f"the record has no field {name!r}"))
            continue
        axis = _axis(spec_doc, at, str(name), path, how, like, sample, errors)
        if axis is not None:
            axes.append(axis)
    if errors:
        raise InputErrors(errors)
    spec = Spec(tuple(axes), sample, int(count), int(seed))
    if spec.size > MAX_VARIANTS:
        raise InputErrors(
            [_spec_error(spec_doc, ("fields",), f"{spec.size} variants; at most {MAX_VARIANTS}")]
        )
    return spec


def _axis(
    doc: Document,
    at: tuple[str | int, ...],
    name: str,
    path: tuple[str | int, ...],
    how: Any,
    like: Any,
    sample: str,
    errors: list[InputError],
) -> Axis | None:
    if isinstance(how, list):
        if not how:
            errors.append(_spec_error(doc, at, "expected at least one value"))
            return None
        return Axis(name, path, tuple(how), like=like)
    if not isinstance(how, dict) or not {"from", "to"} <= set(how):
        errors.append(_spec_error(doc, at, "expected a list, or {from: ..., to: ..., steps: N}"))
        return None
    lo, hi = split_quantity(how["from"]), split_quantity(how["to"])
    if lo is None or hi is None or lo[1] != hi[1] or not lo[0] <= hi[0]:
        errors.append(
            _spec_error(doc, at, "expected from <= to, two numbers in the same unit ('0.4 mm')")
        )
        return None
    own = split_quantity(like)
    if own is None or (own[1] == "") != (lo[1] == ""):
        errors.append(
            _spec_error(doc, at, f"the record's {name} is {like!r}: sweep it with a list")
        )
        return None
    whole = all(isinstance(how[k], int) and not isinstance(how[k], bool) for k in ("from", "to"))
    points: tuple[float, ...] = ()
    if sample == "grid":
        if "steps" in how and isinstance(how["steps"], int) and how["steps"] >= 1:
            n = how["steps"]
            points = tuple(
                lo[0] + (hi[0] - lo[0]) * k / (n - 1) if n > 1 else lo[0] for k in range(n)
            )
        elif "step" in how and (s := split_quantity(how["step"])) is not None and s[0] > 0:
            n = math.floor((hi[0] - lo[0]) / s[0] + 1e-9) + 1
            points = tuple(lo[0] + k * s[0] for k in range(n))
        else:
            errors.append(_spec_error(doc, at, "a grid range needs steps: N (>= 1) or step: X"))
            return None
        # 12 digits: 0.3 mm stays "0.3 mm", not the float sum "0.30000000000000004 mm"
        points = tuple(float(round(p)) if whole else float(f"{p:.12g}") for p in points)
    return Axis(name, path, points, lo[0], hi[0], lo[1], whole, True, like)


# ---------------------------------------------------------------- running


@dataclass
class Columns:
    """The table's columns, fixed before the first row so that every chunk has them."""

    axes: list[str]
    sheet: list[str]
    rules: list[str]

    @property
    def names(self) -> list[str]:
        return [
            "variant",
            *self.axes,
            "valid",
            "invalid_reason",
            "feasible",
            "binding_rule",
            "binding_margin",
            *self.sheet,
            *(f"{rid}:status" for rid in self.rules),
            *(f"{rid}:margin" for rid in self.rules),
        ]


def _axis_value(value: Any) -> Any:
    """A swept value for the table: SI number for a quantity, the record value otherwise."""
    if isinstance(value, str):
        from emgate.units import QuantityError, parse_quantity

        try:
            return parse_quantity(value).value
        except QuantityError:
            return value
    return value


def row(i: int, spec: Spec, cols: Columns, result: VariantResult) -> list[Any]:
    swept = spec.variant(i)
    binding = result.binding()
    return [
        i,
        *(_axis_value(swept[a.path]) for a in spec.axes),
        not result.invalid,
        result.invalid,
        result.feasible,
        binding[0] if binding else "",
        binding[1] if binding else math.nan,
        *(result.sheet.get(n, math.nan) for n in cols.sheet),
        *(result.rules[r].status if r in result.rules else "" for r in cols.rules),
        *(
            result.rules[r].margin
            if r in result.rules and result.rules[r].margin is not None
            else math.nan
            for r in cols.rules
        ),
    ]


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


# ---------------------------------------------------------------- output


class Summary:
    """Feasible fraction and binding rules, and the feasible map of a two-field grid."""

    def __init__(self, spec: Spec, cols: Columns) -> None:
        self.spec, self.cols = spec, cols
        self.total = self.valid = self.feasible = 0
        self.binding_infeasible: Counter[str] = Counter()
        self.binding_feasible: Counter[str] = Counter()
        self.grid: dict[tuple[Any, Any], str] = {}

    def add(self, r: list[Any]) -> None:
        names = self.cols.names
        get = dict(zip(names, r, strict=True))
        self.total += 1
        self.valid += bool(get["valid"])
        self.feasible += bool(get["feasible"])
        rule = get["binding_rule"] or ("(invalid)" if not get["valid"] else "(none)")
        (self.binding_feasible if get["feasible"] else self.binding_infeasible)[rule] += 1
        if self.spec.sample == "grid" and len(self.spec.axes) == 2:
            swept = self.spec.variant(r[0])
            a, b = (_shown(axis, swept[axis.path]) for axis in self.spec.axes)
            self.grid[(a, b)] = "." if get["feasible"] else rule

    def text(self) -> str:
        out = io.StringIO()
        frac = self.feasible / self.total if self.total else 0.0
        out.write(
            f"{self.total} variants: {self.valid} valid, {self.feasible} feasible ({frac:.1%})\n"
        )
        for title, counter in (
            ("binding rule where infeasible", self.binding_infeasible),
            ("closest rule where feasible", self.binding_feasible),
        ):
            if counter:
                out.write(f"{title}:\n")
                for rid, n in counter.most_common():
                    out.write(f"  {rid:<28} {n:8d}\n")
        if self.grid:
            out.write(self._map())
        out.write(
            "Results support, and do not replace, review by a qualified engineer under the"
            " applicable standards and local codes.\n"
        )
        return out.getvalue()

    def _map(self) -> str:
        """Rows: the first field; columns: the second; '.' feasible, else the binding rule's
        letter (legend below)."""
        first, second = self.spec.axes
        rows = sorted({k[0] for k in self.grid}, key=_sort_key)
        cols = sorted({k[1] for k in self.grid}, key=_sort_key)
        rules = sorted({v for v in self.grid.values() if v != "."})
        letters = {rid: chr(ord("A") + i) if i < 26 else "?" for i, rid in enumerate(rules)}
        out = io.StringIO()
        unit = [f" [{a.unit}]" if a.unit else "" for a in (first, second)]
        out.write(
            f"\nfeasible region ('.' feasible), rows {first.name}{unit[0]},"
            f" columns {second.name}{unit[1]}:\n"
        )
        width = max(len(_fmt(v)) for v in rows)
        out.write(" " * (width + 1) + " ".join(_fmt(c) for c in cols) + "\n")
        cw = [len(_fmt(c)) for c in cols]
        for rv in rows:
            cells = []
            for w, cv in zip(cw, cols, strict=True):
                v = self.grid.get((rv, cv), " ")
                cells.append((v if v in (".", " ") else letters[v]).center(w))
            out.write(f"{_fmt(rv):>{width}} " + " ".join(cells) + "\n")
        for rid, letter in letters.items():
            out.write(f"  {letter}: {rid}\n")
        return out.getvalue()


def _shown(axis: Axis, value: Any) -> Any:
    """A swept value as the spec writes it: the number in the spec's unit, or the value."""
    if axis.is_range:
        number = split_quantity(value)
        return number[0] if number else value
    return value


def _sort_key(v: Any) -> tuple[int, Any]:
    return (0, v) if isinstance(v, int | float) else (1, str(v))


def _fmt(v: Any) -> str:
    return f"{v:.4g}" if isinstance(v, float) else str(v)


class CsvWriter:
    def __init__(self, stream: TextIO, names: list[str]) -> None:
        self.w = csv.writer(stream, lineterminator="\n")
        self.w.writerow(names)

    def write(self, rows: list[list[Any]]) -> None:
        self.w.writerows(
            ["" if isinstance(v, float) and math.isnan(v) else v for v in r] for r in rows
        )

    def close(self) -> None:
        pass


class ParquetWriter:
    def __init__(self, path: Path, cols: Columns, spec: Spec) -> None:
        import pyarrow as pa  # type: ignore[import-untyped]
        import pyarrow.parquet as pq  # type: ignore[import-untyped]

        types: list[Any] = [pa.int64()]
        for axis in spec.axes:
            numeric = axis.is_range or all(_is_number(_axis_value(v)) for v in axis.values)
            types.append(pa.float64() if numeric else pa.string())
        types += [pa.bool_(), pa.string(), pa.bool_(), pa.string(), pa.float64()]
        types += [pa.float64()] * len(cols.sheet)
        types += [pa.string()] * len(cols.rules) + [pa.float64()] * len(cols.rules)
        self.pa = pa
        self.schema = pa.schema(list(zip(cols.names, types, strict=True)))
        self.writer = pq.ParquetWriter(str(path), self.schema)

    def write(self, rows: list[list[Any]]) -> None:
        if not rows:
            return
        columns = list(zip(*rows, strict=True))
        arrays = []
        for values, fld in zip(columns, self.schema, strict=True):
            typed: list[Any] = list(values)
            if self.pa.types.is_floating(fld.type):
                typed = [float(v) for v in values]
            elif self.pa.types.is_string(fld.type):
                typed = [str(v) for v in values]
            arrays.append(self.pa.array(typed, type=fld.type))
        self.writer.write_table(self.pa.Table.from_arrays(arrays, schema=self.schema))

    def close(self) -> None:
        self.writer.close()


def _is_number(v: Any) -> bool:
    return isinstance(v, int | float) and not isinstance(v, bool)


# ---------------------------------------------------------------- the command


@dataclass
class SweepRun:
    record: Path
    spec: Path
    out: Path | None = None
    scheduler: str = "local"
    chunk: int = DEFAULT_CHUNK
    config: Path | None = None
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
    """Run a sweep; the summary to stdout, the table to ``run.out`` (or stdout as CSV)."""
    import time

    from emgate.atomic import write_atomic

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
    finally:
        writer.close()
        if stream is not None:
            stream.close()
    if tmp is not None and run.out is not None:
        write_atomic(run.out, tmp.read_text(encoding="utf-8"))
        tmp.unlink()
    elapsed = time.perf_counter() - start
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
