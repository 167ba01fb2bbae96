"""One stator slot enlarged: its dimensions and the conductors as placed."""

from __future__ import annotations

from typing import TYPE_CHECKING

from emgate.page.plots.style import BLACK, ORANGE, new_figure, phase_style, styled, to_svg
from emgate.page.shapes import (
    layer_bands,
    layer_boundary,
    place_conductors,
    slot_outline,
    zone_band,
)

if TYPE_CHECKING:
    from matplotlib.axes import Axes

    from emgate.page.content import Section


def _dimension(
    ax: Axes, p1: tuple[float, float], p2: tuple[float, float], text: str, where: str = "above"
) -> None:
    ax.annotate(
        "",
        p1,
        p2,
        arrowprops={
            "arrowstyle": "<->",
            "linewidth": 0.6,
            "color": BLACK,
            "shrinkA": 0,
            "shrinkB": 0,
        },
    )
    mx, my = (p1[0] + p2[0]) / 2.0, (p1[1] + p2[1]) / 2.0
    align = {
        "above": ("center", "bottom"),
        "left": ("right", "center"),
        "right": ("left", "center"),
        "below": ("center", "top"),
    }[where]
    ax.text(
        mx,
        my,
        f" {text} ",
        ha=align[0],
        va=align[1],
        fontsize=7.5,
        bbox={"facecolor": "white", "edgecolor": "none", "pad": 0.5, "alpha": 0.85},
    )


def slot_detail(sec: Section, table: list[tuple[str, ...]]) -> str:
    """One stator slot enlarged, with its dimensions and the conductors as placed."""
    from matplotlib.collections import PatchCollection
    from matplotlib.patches import Circle, Patch, Polygon, Rectangle

    s = sec.stator_slot
    c = sec.conductor
    count = sec.conductors_per_slot * c.strands
    placed = place_conductors(s, c, count, sec.layers, sec.liner)
    sides = table[0] if table else ()
    with styled("slot"):
        fig = new_figure(5.6)
        ax = fig.add_subplot()
        outline = slot_outline(s)
        ax.add_patch(
            Polygon(outline, closed=True, facecolor="white", edgecolor=BLACK, linewidth=1.0)
        )
        t = sec.liner
        if t > 0.0:
            inner = [
                (x + t if x < 0 else x - t, y)
                for x, y in zone_band(s, s.zone_top + t, s.height - t)
            ]
            ax.add_patch(
                Polygon(
                    inner,
                    closed=True,
                    facecolor="none",
                    edgecolor="#777",
                    linewidth=0.6,
                    linestyle="--",
                )
            )
        split = layer_boundary(s, sec.layers)
        if split is not None:
            half = s.width_at(split) / 2.0
            ax.plot([-half, half], [split, split], color=BLACK, linewidth=0.8, linestyle=":")
        # One collection each for insulation and copper: hundreds of strands draw fast.
        outer: list[Patch] = []
        bare: list[Patch] = []
        colours: list[str] = []
        for item in placed:
            side = sides[item.layer] if item.layer < len(sides) else ""
            colours.append(phase_style(side)[0] if side else ORANGE)
            if c.shape == "round":
                outer.append(Circle((item.x, item.y), item.width / 2.0))
                bare.append(Circle((item.x, item.y), item.bare_width / 2.0))
            else:
                outer.append(
                    Rectangle(
                        (item.x - item.width / 2, item.y - item.height / 2),
                        item.width,
                        item.height,
                    )
                )
                bare.append(
                    Rectangle(
                        (item.x - item.bare_width / 2, item.y - item.bare_height / 2),
                        item.bare_width,
                        item.bare_height,
                    )
                )
        ax.add_collection(
            PatchCollection(outer, facecolors="none", edgecolors="#555", linewidths=0.4)
        )
        ax.add_collection(PatchCollection(bare, facecolors=colours, edgecolors="none", alpha=0.7))
        for (y0, y1), side in zip(layer_bands(s, len(sides)), sides, strict=False):
            x = max(s.width_at(y0), s.width_at(y1)) / 2.0
            ax.text(
                x * 1.05 + 0.3,
                (y0 + y1) / 2.0,
                f"layer {side}",
                fontsize=8,
                va="center",
                ha="left",
                weight="bold",
            )
        wmax = max(s.top_width, s.bottom_width)
        o = s.opening / 2.0
        if s.shape == "semi_closed":
            _dimension(ax, (-o, -0.4), (o, -0.4), f"opening {s.opening:g} mm", "below")
            _dimension(
                ax,
                (-wmax / 2 - 1.2, 0),
                (-wmax / 2 - 1.2, s.opening_height),
                f"{s.opening_height:g} mm",
                "left",
            )
            if s.wedge_height > 0:
                _dimension(
                    ax,
                    (-wmax / 2 - 1.2, s.opening_height),
                    (-wmax / 2 - 1.2, s.zone_top),
                    f"wedge {s.wedge_height:g} mm",
                    "left",
                )
            _dimension(
                ax,
                (-s.top_width / 2, s.zone_top),
                (s.top_width / 2, s.zone_top),
                f"top {s.top_width:g} mm",
                "below",
            )
        else:
            _dimension(ax, (-o, -0.4), (o, -0.4), f"width {s.opening:g} mm", "below")
            if s.wedge_height > 0:
                _dimension(
                    ax,
                    (-wmax / 2 - 1.2, 0),
                    (-wmax / 2 - 1.2, s.wedge_height),
                    f"wedge {s.wedge_height:g} mm",
                    "left",
                )
        _dimension(
            ax,
            (-s.bottom_width / 2, s.height + 0.6),
            (s.bottom_width / 2, s.height + 0.6),
            f"bottom {s.bottom_width:g} mm",
            "above",
        )
        _dimension(ax, (wmax / 2 + 1.2, 0), (wmax / 2 + 1.2, s.height), f"{s.height:g} mm", "right")
        ax.text(
            0, -0.15 * s.height, "air gap", ha="center", va="bottom", fontsize=8, style="italic"
        )
        ax.set_xlim(-wmax * 1.25 - 4, wmax * 1.25 + 4)
        ax.set_ylim(s.height * 1.12 + 0.8, -0.22 * s.height)
        ax.set_aspect("equal")
        ax.set_xlabel("mm")
        ax.set_ylabel("depth from the gap, mm")
        shown = f"{len(placed)} of {count}" if len(placed) < count else f"{count}"
        wire = "strands" if c.strands > 1 else "conductors"
        ax.set_title(f"one slot: {shown} {wire} drawn, liner {sec.liner:g} mm (dashed)")
        return to_svg(fig, "slot", "one stator slot with its dimensions and conductors")
