"""The table of ``emgate sweep``: one row a variant, written as CSV or Parquet, and the
summary of the rows.

A row holds the swept fields (SI numbers for quantities), whether the variant validated and
why not, whether every rule passed, the binding rule and its margin, every sheet quantity of
the machine kind (SI, empty where not computed) and each rule's status and margin. The
summary gives the feasible fraction and the binding rules, and for a grid over two fields a
map of the feasible region.
"""

from __future__ import annotations

import csv
import io
import math
from collections import Counter
from dataclasses import dataclass
from pathlib import Path
from typing import Any, TextIO

from emgate.fields import split_quantity
from emgate.findings import DISCLAIMER
from emgate.sweep_spec import Axis, Spec
from emgate.variants import VariantResult


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


def axis_value(value: Any) -> Any:
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
        *(axis_value(swept[a.path]) for a in spec.axes),
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


def outcome(get: dict[str, Any]) -> str:
    """A row's binding rule, '(invalid)' for a variant that did not validate, '(none)' for
    one without a margin."""
    return str(get["binding_rule"]) or ("(invalid)" if not get["valid"] else "(none)")


def numeric(axis: Axis) -> bool:
    """Whether a swept field's values are numbers in the table (a range, or a list of
    numbers or quantities)."""
    return axis.is_range or all(_is_number(axis_value(v)) for v in axis.values)


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
        rule = outcome(get)
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
        out.write(DISCLAIMER + "\n")
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
            types.append(pa.float64() if numeric(axis) else pa.string())
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
