"""Feasibility maps of a sweep: a grid's cells, a random sample's points, one field's margin.

Feasible is light blue and outlined in black (cells) or a circle (points); each binding
rule has its own colour, hatch, marker and the text summary's letter; an invalid variant is
grey and crossed. A map of more than :data:`VECTOR_ITEMS` cells or points draws them as an
image inside the SVG (a page stays small); the outline, axes and legend stay vector.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any

from emgate.page.plots.style import (
    BLACK,
    BLUE,
    GREEN,
    ORANGE,
    PURPLE,
    STEEL,
    VERMILLION,
    YELLOW,
    new_figure,
    styled,
    to_svg,
)

if TYPE_CHECKING:
    from emgate.page.sweep_data import CellMap, MapAxis, Outcome, PointSet, SweepPage

VECTOR_ITEMS = 5_000
#: Cells along an axis up to which each carries its letter.
LETTER_CELLS = 30
#: BLUE mixed half with white: a light ground that the black outline and letters read on.
FEASIBLE_FILL = "#80B8D8"
RULE_COLOURS = [ORANGE, VERMILLION, PURPLE, YELLOW, GREEN]
RULE_HATCHES = ["///", "\\\\\\", "xx", "---", "|||", "++", ".."]
RULE_MARKERS = ["^", "s", "D", "v", "P", "X", "<", ">"]
#: The colour of a cross or dot marker (invalid, no margin), which has no edge to show it.
LINE_MARKER = "#555555"


def outcome_style(k: int, o: Outcome) -> tuple[str, str, str]:
    """Fill, hatch and marker of outcome ``k`` (0: feasible)."""
    if k == 0:
        return FEASIBLE_FILL, "", "o"
    if o.label == "(invalid)":
        return STEEL, "xx", "x"
    if o.label == "(none)":
        return "#ffffff", "..", "."
    r = ord(o.letter) - ord("A") if o.letter != "?" else 25
    return RULE_COLOURS[r % 5], RULE_HATCHES[r % 7], RULE_MARKERS[r % 8]


def legend_label(k: int, o: Outcome, cells: bool) -> str:
    if k == 0:
        return "feasible (outlined)" if cells else "feasible (circle)"
    return f"{o.letter}: {o.label}"


def sweep_plots(page: SweepPage) -> dict[str, str]:
    """Every map of the page, by name."""
    out: dict[str, str] = {}
    for m in page.maps:
        out[f"map-{m.x}-{m.y}"] = grid_map(page, m)
    if page.points is not None:
        if len(page.axes) == 1:
            out["margin-0"] = margin_line(page, page.points)
        else:
            for x in range(len(page.axes)):
                for y in range(x + 1, len(page.axes)):
                    out[f"map-{x}-{y}"] = scatter_map(page, page.points, x, y)
    return out


def _ticks(ax: Any, which: str, axis: MapAxis, values: list[float]) -> None:
    """A list's labels at its values; a numeric axis of a few values labelled at each."""
    setter = ax.set_xticks if which == "x" else ax.set_yticks
    if not axis.numeric:
        step = max(1, math.ceil(len(axis.labels) / 12))
        at = list(range(0, len(axis.labels), step))
        setter(at, [axis.labels[k] for k in at])
    elif 0 < len(values) <= 12:
        setter(values, [f"{v:.4g}" for v in values])


def _legend(fig: Any, handles: list[Any], title: str) -> None:
    fig.legend(
        handles=handles,
        loc="outside lower center",
        ncol=min(len(handles), 3),
        fontsize=8,
        frameon=False,
        title=title,
        title_fontsize=8,
    )


def grid_map(page: SweepPage, m: CellMap) -> str:
    """The cells of a pair of a grid's fields: each coloured by its outcome."""
    from matplotlib.collections import LineCollection
    from matplotlib.patches import Patch

    name = f"map-{m.x}-{m.y}"
    xa, ya = page.axes[m.x], page.axes[m.y]
    nx, ny = len(m.x_edges) - 1, len(m.y_edges) - 1
    raster = nx * ny > VECTOR_ITEMS
    letters = nx <= LETTER_CELLS and ny <= LETTER_CELLS
    with styled(name):
        fig = new_figure(5.2)
        fig.set_dpi(150)  # the resolution of a map drawn as an image
        ax = fig.add_subplot()
        present = sorted({k for row in m.cells for k in row if k >= 0})
        if raster:
            _cells_image(ax, m, page.outcomes)
        else:
            _cells_vector(ax, m, page.outcomes, letters)
        handles = []
        for k in present:
            fill, hatch, _ = outcome_style(k, page.outcomes[k])
            handles.append(
                Patch(
                    facecolor=fill,
                    hatch="" if raster else hatch,
                    edgecolor=BLACK,
                    linewidth=1.6 if k == 0 else 0.5,
                    label=legend_label(k, page.outcomes[k], True),
                )
            )
        ax.add_collection(
            LineCollection(_outline(m), colors=BLACK, linewidths=1.8, gid="feasible-outline")
        )
        ax.set_xlim(m.x_edges[0], m.x_edges[-1])
        ax.set_ylim(m.y_edges[0], m.y_edges[-1])
        _ticks(ax, "x", xa, m.x_at)
        _ticks(ax, "y", ya, m.y_at)
        ax.set_xlabel(xa.title)
        ax.set_ylabel(ya.title)
        ax.spines[["top", "right"]].set_visible(True)
        title = f"feasible region: {ya.name} against {xa.name}"
        if m.projected:
            title += "\n(a cell: the variant closest to feasible over the other fields)"
        ax.set_title(title)
        key = "binding rule (its letter in each cell)" if letters else "binding rule"
        _legend(fig, handles, key)
        return to_svg(fig, name, f"feasibility map of {ya.name} against {xa.name}")


def _cells_vector(ax: Any, m: CellMap, outcomes: list[Outcome], letters: bool) -> None:
    """Each cell a rectangle, one group an outcome (``cells-K``), hatched and lettered."""
    from matplotlib.collections import PatchCollection
    from matplotlib.patches import Rectangle

    boxes: dict[int, list[Any]] = {}
    for iy, row in enumerate(m.cells):
        y0, y1 = m.y_edges[iy], m.y_edges[iy + 1]
        for ix, k in enumerate(row):
            if k < 0:
                continue
            x0, x1 = m.x_edges[ix], m.x_edges[ix + 1]
            boxes.setdefault(k, []).append(Rectangle((x0, y0), x1 - x0, y1 - y0))
            if letters and k > 0:  # at the cell's value (off centre between uneven ones)
                ax.text(
                    m.x_at[ix] if m.x_at else (x0 + x1) / 2,
                    m.y_at[iy] if m.y_at else (y0 + y1) / 2,
                    outcomes[k].letter,
                    ha="center",
                    va="center",
                    fontsize=7,
                    color=BLACK,
                    bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.6},
                )
    for k in sorted(boxes):
        fill, hatch, _ = outcome_style(k, outcomes[k])
        ax.add_collection(
            PatchCollection(
                boxes[k],
                facecolor=fill,
                edgecolor="white" if letters else fill,
                hatchcolor=BLACK,
                hatch=hatch,
                linewidth=0.6 if letters else 0.0,
                gid=f"cells-{k}",
            )
        )


def _cells_image(ax: Any, m: CellMap, outcomes: list[Outcome]) -> None:
    """The cells as one image (a map too fine for a rectangle each, or a hatch)."""
    import numpy as np
    from matplotlib.colors import to_rgb

    palette = np.array(
        [to_rgb(outcome_style(k, o)[0]) for k, o in enumerate(outcomes)] + [(1.0, 1.0, 1.0)]
    )
    codes = np.array(m.cells)
    ax.pcolormesh(m.x_edges, m.y_edges, palette[codes], rasterized=True, gid="cells")


def _outline(m: CellMap) -> list[list[tuple[float, float]]]:
    """The edges between a feasible cell and a cell that is not, or the map's border."""
    ny, nx = len(m.cells), len(m.cells[0]) if m.cells else 0

    def feasible(iy: int, ix: int) -> bool:
        return 0 <= iy < ny and 0 <= ix < nx and m.cells[iy][ix] == 0

    xe, ye = m.x_edges, m.y_edges
    out = []
    for iy in range(ny):
        for ix in range(nx):
            if not feasible(iy, ix):
                continue
            if not feasible(iy, ix - 1):
                out.append([(xe[ix], ye[iy]), (xe[ix], ye[iy + 1])])
            if not feasible(iy, ix + 1):
                out.append([(xe[ix + 1], ye[iy]), (xe[ix + 1], ye[iy + 1])])
            if not feasible(iy - 1, ix):
                out.append([(xe[ix], ye[iy]), (xe[ix + 1], ye[iy])])
            if not feasible(iy + 1, ix):
                out.append([(xe[ix], ye[iy + 1]), (xe[ix + 1], ye[iy + 1])])
    return out


def _jitter(variant: int) -> float:
    """A fixed offset within a listed value's column, so that its points do not all overlap
    (the golden-ratio sequence spreads them evenly)."""
    return 0.6 * ((variant * 0.6180339887) % 1.0 - 0.5)


def _place(axis: MapAxis, positions: list[float], variants: list[int]) -> list[float]:
    if axis.numeric:
        return positions
    return [p + _jitter(v) for p, v in zip(positions, variants, strict=True)]


def _point_handles(page: SweepPage, present: list[int]) -> list[Any]:
    from matplotlib.lines import Line2D

    handles = []
    for k in present:
        fill, _, marker = outcome_style(k, page.outcomes[k])
        handles.append(
            Line2D(
                [],
                [],
                linestyle="none",
                marker=marker,
                markerfacecolor=BLUE if k == 0 else fill,
                markeredgecolor=LINE_MARKER if marker in ("x", ".") else BLACK,
                label=legend_label(k, page.outcomes[k], False),
            )
        )
    return handles


def _scatter(
    ax: Any, page: SweepPage, pts: PointSet, xs: list[float], ys: list[float]
) -> list[int]:
    """The points by outcome, feasible drawn last (on top); the outcomes drawn."""
    present = sorted(set(pts.outcomes), key=lambda k: (k == 0, k))
    raster = len(xs) > VECTOR_ITEMS
    for k in present:
        at = [n for n, c in enumerate(pts.outcomes) if c == k]
        fill, _, marker = outcome_style(k, page.outcomes[k])
        crossed = marker in ("x", ".")  # drawn in one colour, no edge
        ax.scatter(
            [xs[n] for n in at],
            [ys[n] for n in at],
            s=16,
            marker=marker,
            c=BLUE if k == 0 else (LINE_MARKER if crossed else fill),
            **({} if crossed else {"edgecolors": BLACK, "linewidths": 0.3}),
            gid=f"points-{k}",
            rasterized=raster,
            zorder=3 if k == 0 else 2,
        )
    return sorted(present)


def scatter_map(page: SweepPage, pts: PointSet, x: int, y: int) -> str:
    """A random sample's variants over a pair of its fields, one point each."""
    name = f"map-{x}-{y}"
    xa, ya = page.axes[x], page.axes[y]
    with styled(name):
        fig = new_figure(5.2)
        fig.set_dpi(150)
        ax = fig.add_subplot()
        xs = _place(xa, pts.positions[x], pts.variants)
        ys = _place(ya, pts.positions[y], pts.variants)
        present = _scatter(ax, page, pts, xs, ys)
        _ticks(ax, "x", xa, [])
        _ticks(ax, "y", ya, [])
        ax.set_xlabel(xa.title)
        ax.set_ylabel(ya.title)
        ax.set_title(f"feasible region: {ya.name} against {xa.name}")
        _legend(fig, _point_handles(page, present), "binding rule")
        return to_svg(fig, name, f"feasibility map of {ya.name} against {xa.name}")


def margin_line(page: SweepPage, pts: PointSet) -> str:
    """One field's sweep: the binding margin of each variant against the field."""
    name = "margin-0"
    axis = page.axes[0]
    with styled(name):
        fig = new_figure(4.2)
        fig.set_dpi(150)
        ax = fig.add_subplot()
        xs = pts.positions[0]
        ys = [100.0 * m for m in pts.margins]
        finite = [y for y in ys if math.isfinite(y)]
        low = min([*finite, 0.0])
        high = max([*finite, 0.0])
        floor = low - 0.08 * ((high - low) or 1.0)  # variants without a margin, at the foot
        shown = [y if math.isfinite(y) else floor for y in ys]
        if page.sample == "grid":
            line = sorted((x, y) for x, y in zip(xs, ys, strict=True) if math.isfinite(y))
            ax.plot([p[0] for p in line], [p[1] for p in line], color=STEEL, linewidth=1.0)
        at = _place(axis, xs, pts.variants) if page.sample == "random" else xs
        present = _scatter(ax, page, pts, at, shown)
        ax.axhline(0.0, color=BLACK, linewidth=1.0)
        _ticks(ax, "x", axis, sorted(set(xs)) if page.sample == "grid" else [])
        ax.set_xlabel(axis.title)
        ax.set_ylabel("binding margin, %")
        ax.set_title(
            f"binding margin against {axis.name}\n(above 0: every limit held;"
            " no margin: at the foot)"
        )
        _legend(fig, _point_handles(page, present), "binding rule")
        return to_svg(fig, name, f"binding margin against {axis.name}")
