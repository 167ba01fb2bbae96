"""What the page of a sweep shows, gathered from the table's rows as they arrive.

:class:`SweepMaps` takes each row as the sweep writes it and keeps only what the maps need:
for a grid over two fields or more, the cells of each pair of fields (at most
:data:`MAP_CELLS` along an axis: beyond, neighbouring grid points share a cell); for a
random sample, or a sweep of one field, every k-th variant, at most :data:`MAX_POINTS`; and
the first :data:`FIRST_INFEASIBLE` infeasible variants. The counts are the text summary's
(:class:`emgate.sweep_table.Summary`). It hands on the plain dataclasses below, which
:mod:`emgate.page.plots.feasibility` draws and :mod:`emgate.page.sweep_page` writes; no
matplotlib here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from itertools import combinations, pairwise
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from emgate.fields import split_quantity
from emgate.sweep_table import axis_value, numeric, outcome

if TYPE_CHECKING:
    from emgate.sweep_spec import Axis, Spec
    from emgate.sweep_table import Columns, Summary

#: Points a map draws at most: every k-th variant beyond (a random sample's variants are
#: independent draws, so every k-th of them is a random sample too).
MAX_POINTS = 20_000
#: Cells along one axis of a grid's map at most.
MAP_CELLS = 200
#: Infeasible variants listed on the page.
FIRST_INFEASIBLE = 30
FEASIBLE = "feasible"

# How close a variant came, to pick the one a cell shows: feasible, then infeasible with a
# margin (the larger the closer), then infeasible without one, then invalid.
_INVALID, _NO_MARGIN, _INFEASIBLE, _FEASIBLE = range(4)


@dataclass(frozen=True)
class MapAxis:
    """A swept field as a map's axis: numbers in the unit the record writes (``numeric``), or
    the index of each listed value, labelled by ``labels``."""

    name: str
    unit: str
    numeric: bool
    labels: tuple[str, ...] = ()

    @property
    def title(self) -> str:
        return f"{self.name} [{self.unit}]" if self.unit else self.name


@dataclass(frozen=True)
class Outcome:
    """What a map colours: feasible, a binding rule, '(invalid)' or '(none)'; the letter is
    the text summary's (none for feasible)."""

    label: str
    letter: str


@dataclass
class CellMap:
    """A pair of a grid's fields, x the earlier in the spec. ``cells[iy][ix]`` is the index
    into the outcomes of the variant of the cell that came closest to feasible (-1: none);
    ``feasible`` and ``total`` count the cell's variants."""

    x: int
    y: int
    x_edges: list[float]
    y_edges: list[float]
    cells: list[list[int]]
    feasible: list[list[int]]
    total: list[list[int]]
    values: tuple[int, int]  # distinct values of x and y: more than cells, neighbours share
    x_at: list[float]  # each cell's value, where a cell holds one (else empty)
    y_at: list[float]
    projected: bool  # more than two fields: a cell holds the variants over the others


@dataclass
class PointSet:
    """Every ``stride``-th variant: its position on each axis, outcome and binding margin."""

    variants: list[int]
    positions: list[list[float]]  # one list an axis
    outcomes: list[int]
    margins: list[float]  # nan: no margin
    stride: int


@dataclass(frozen=True)
class InfeasibleRow:
    variant: int
    values: tuple[str, ...]  # each swept field, as its axis shows it
    rule: str
    margin: float
    reason: str


@dataclass
class SweepPage:
    title: str
    record_id: str
    record: str
    spec: str
    sample: str
    seed: int
    axes: list[MapAxis]
    ranges: list[str]  # each swept field's values, as the spec gives them
    total: int
    valid: int
    feasible: int
    binding_infeasible: list[tuple[str, int]]
    binding_feasible: list[tuple[str, int]]
    outcomes: list[Outcome]
    maps: list[CellMap]
    points: PointSet | None
    infeasible: list[InfeasibleRow]


class _Axis:
    """A swept field's positions: SI values in the record's own unit, or list indices; for a
    grid, the cell of each value and the cells' edges."""

    def __init__(self, axis: Axis, grid: bool) -> None:
        self.numeric = numeric(axis)
        own = split_quantity(axis.like)
        unit = own[1] if own is not None and self.numeric else ""
        self.offset, self.factor = _scale(unit)
        labels = () if self.numeric else tuple(str(v) for v in axis.values)
        self.view = MapAxis(axis.name, unit, self.numeric, labels)
        self.index = {} if self.numeric else {axis_value(v): k for k, v in enumerate(axis.values)}
        self.cell: list[int] = []
        self.edges: list[float] = []
        self.values = 0
        self.at: list[float] = []
        if grid:
            at = [self.position(axis_value(axis.record(v))) for v in axis.values]
            unique = sorted(set(at))
            rank = {p: r for r, p in enumerate(unique)}
            n = len(unique)
            cells = min(n, MAP_CELLS)
            self.cell = [rank[p] * cells // n for p in at]
            bounds = _bounds(unique, self.numeric)
            self.edges = [bounds[-(-b * n // cells)] for b in range(cells + 1)]
            self.values = n
            self.at = unique if n == cells else []

    def position(self, value: Any) -> float:
        if self.numeric:
            return (float(value) - self.offset) / self.factor
        return float(self.index.get(value, -1))

    def shown(self, value: Any) -> str:
        return f"{self.position(value):.6g}" if self.numeric else str(value)


def _scale(unit: str) -> tuple[float, float]:
    """SI = offset + factor * number in ``unit`` (degC has an offset)."""
    if not unit:
        return 0.0, 1.0
    from emgate.units import parse_quantity

    zero = parse_quantity(f"0 {unit}").value
    return zero, parse_quantity(f"1 {unit}").value - zero


def _bounds(unique: list[float], is_number: bool) -> list[float]:
    """Boundaries between sorted positions, half a gap beyond the ends."""
    if len(unique) == 1:
        half = 0.05 * abs(unique[0]) if is_number and unique[0] else 0.5
        return [unique[0] - half, unique[0] + half]
    mids = [(a + b) / 2 for a, b in pairwise(unique)]
    return [2 * unique[0] - mids[0], *mids, 2 * unique[-1] - mids[-1]]


class _Pair:
    def __init__(self, x: int, y: int, ax: _Axis, ay: _Axis) -> None:
        self.x, self.y = x, y
        shape = (len(ay.edges) - 1, len(ax.edges) - 1)
        self.rank = np.full(shape, -1, dtype=np.int8)
        self.margin = np.full(shape, -math.inf)
        self.code = np.full(shape, -1, dtype=np.int16)
        self.total = np.zeros(shape, dtype=np.int64)
        self.feasible = np.zeros(shape, dtype=np.int64)


class SweepMaps:
    """The page's data, from the rows in variant order as the sweep hands them on (the maps
    would not mind another order; the list of the first infeasible variants would)."""

    def __init__(self, spec: Spec, cols: Columns) -> None:
        self.spec, self.names = spec, cols.names
        grid = spec.sample == "grid"
        self.axes = [_Axis(a, grid) for a in spec.axes]
        pairs = combinations(range(len(self.axes)), 2) if grid else ()
        self.pairs = [_Pair(i, j, self.axes[i], self.axes[j]) for i, j in pairs]
        self.stride = 0
        if not grid or len(self.axes) == 1:
            self.stride = max(1, -(-spec.size // MAX_POINTS))
        self.codes = {FEASIBLE: 0}
        self.points = PointSet([], [[] for _ in self.axes], [], [], self.stride)
        self.infeasible: list[InfeasibleRow] = []

    def add(self, r: list[Any]) -> None:
        get = dict(zip(self.names, r, strict=True))
        i, feasible = int(r[0]), bool(get["feasible"])
        label = FEASIBLE if feasible else outcome(get)
        code = self.codes.setdefault(label, len(self.codes))
        margin = float(get["binding_margin"])
        if feasible:
            rank = _FEASIBLE
        elif not get["valid"]:
            rank = _INVALID
        else:
            rank = _INFEASIBLE if math.isfinite(margin) else _NO_MARGIN
        values = r[1 : 1 + len(self.axes)]
        if self.pairs:
            cell = [a.cell[k] for a, k in zip(self.axes, self.spec.indices(i), strict=True)]
            score = margin if math.isfinite(margin) else -math.inf
            for p in self.pairs:
                at = (cell[p.y], cell[p.x])
                p.total[at] += 1
                p.feasible[at] += feasible
                if (rank, score) > (p.rank[at], p.margin[at]):
                    p.rank[at], p.margin[at], p.code[at] = rank, score, code
        if self.stride and i % self.stride == 0:
            self.points.variants.append(i)
            for axis, line, v in zip(self.axes, self.points.positions, values, strict=True):
                line.append(axis.position(v))
            self.points.outcomes.append(code)
            self.points.margins.append(margin)
        if not feasible and len(self.infeasible) < FIRST_INFEASIBLE:
            shown = tuple(a.shown(v) for a, v in zip(self.axes, values, strict=True))
            self.infeasible.append(
                InfeasibleRow(i, shown, label, margin, str(get["invalid_reason"] or ""))
            )

    def page(self, summary: Summary, record: Path, spec: Path, data: Any) -> SweepPage:
        """The page, once every row is in; ``data`` the record's own data (its title, id)."""
        others = sorted(label for label in self.codes if label != FEASIBLE)
        order = [FEASIBLE, *others]
        # the text map's letters: one per rule, in sorted order
        outcomes = [Outcome(FEASIBLE, "")] + [
            Outcome(label, chr(ord("A") + k) if k < 26 else "?") for k, label in enumerate(others)
        ]
        new = {self.codes[label]: k for k, label in enumerate(order)}
        # a trailing -1, so that an empty cell (-1) stays empty
        remap = np.array([new[c] for c in range(len(self.codes))] + [-1], dtype=np.int16)
        maps = [
            CellMap(
                p.x,
                p.y,
                self.axes[p.x].edges,
                self.axes[p.y].edges,
                remap[p.code].tolist(),
                p.feasible.tolist(),
                p.total.tolist(),
                (self.axes[p.x].values, self.axes[p.y].values),
                self.axes[p.x].at,
                self.axes[p.y].at,
                len(self.axes) > 2,
            )
            for p in self.pairs
        ]
        points = None
        if self.stride:
            pts = self.points
            points = PointSet(
                pts.variants, pts.positions, [new[c] for c in pts.outcomes], pts.margins, pts.stride
            )
        title = data.get("title", "") if isinstance(data, dict) else ""
        record_id = data.get("id", "") if isinstance(data, dict) else ""
        return SweepPage(
            title=str(title or record.stem),
            record_id=str(record_id),
            record=str(record),
            spec=str(spec),
            sample=self.spec.sample,
            seed=self.spec.seed,
            axes=[a.view for a in self.axes],
            ranges=[_range_text(a) for a in self.spec.axes],
            total=summary.total,
            valid=summary.valid,
            feasible=summary.feasible,
            binding_infeasible=summary.binding_infeasible.most_common(),
            binding_feasible=summary.binding_feasible.most_common(),
            outcomes=outcomes,
            maps=maps,
            points=points,
            infeasible=self.infeasible,
        )


def _range_text(axis: Axis) -> str:
    if not axis.is_range:
        return ", ".join(str(v) for v in axis.values)
    unit = f" {axis.unit}" if axis.unit else ""
    text = f"{axis.low:g}{unit} to {axis.high:g}{unit}"
    return f"{text}, {len(axis.values)} values" if axis.values else text
