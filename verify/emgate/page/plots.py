"""SVG plots of a page, drawn with matplotlib (imported here only, off ``emgate check``'s path).

Every plot takes the plain data of :mod:`emgate.page.data` and returns an ``<svg>`` element
as text. Text stays text (``svg.fonttype: none``) so that it can be selected and searched;
math parsing is off so that a ``$`` in a name is shown as written. Colours come from the
Okabe-Ito palette, which colour-blind readers tell apart, and every colour is paired with a
hatch, a marker or a letter so that a greyscale print reads the same.
"""

from __future__ import annotations

import io
import math
import re
from collections.abc import Iterator, Sequence
from contextlib import contextmanager
from typing import TYPE_CHECKING, Any

from emgate.page.shapes import layer_boundary, place_conductors, slot_outline

if TYPE_CHECKING:
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure

    from emgate.page.data import (
        CheckRow,
        MMFData,
        PageData,
        Section,
        SteelCurve,
        Thermal,
        WindingTable,
    )

#: Okabe-Ito palette (M. Okabe, K. Ito, "Color Universal Design", 2008).
BLACK, ORANGE, SKY, GREEN, YELLOW, BLUE, VERMILLION, PURPLE = (
    "#000000",
    "#E69F00",
    "#56B4E9",
    "#009E73",
    "#F0E442",
    "#0072B2",
    "#D55E00",
    "#CC79A7",
)
#: Phase k: colour and hatch (a greyscale print tells phases by hatch and letter).
PHASE_STYLE = [
    (BLUE, "///"),
    (VERMILLION, "\\\\\\"),
    (GREEN, "|||"),
    (PURPLE, "xx"),
    (ORANGE, "++"),
    (SKY, "---"),
]
STEEL = "#d9d9d9"
FAIL, PASS = VERMILLION, BLUE
MARKERS = ["o", "s", "^", "D", "v", "P"]
WIDTH = 6.4  # inches


def phase_style(letter: str) -> tuple[str, str]:
    k = ord(letter.lstrip("+-")[:1] or "A") - ord("A")
    return PHASE_STYLE[k % len(PHASE_STYLE)]


@contextmanager
def _style(salt: str) -> Iterator[None]:
    import matplotlib

    with matplotlib.rc_context(
        {
            "svg.fonttype": "none",
            "svg.hashsalt": salt,
            "text.parse_math": False,
            "font.family": "sans-serif",
            "font.size": 9,
            "axes.titlesize": 10,
            "hatch.linewidth": 0.7,
            "axes.spines.top": False,
            "axes.spines.right": False,
        }
    ):
        yield


def _plain_log(axis: Any) -> None:
    """Plain numbers on a log axis (1, 10, 100): with math parsing off, matplotlib's default
    labels would show as their mathtext source."""
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    axis.set_major_locator(LogLocator(base=10))
    axis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:.10g}"))
    axis.set_minor_formatter(NullFormatter())


def _figure(height: float) -> Figure:
    from matplotlib.figure import Figure

    return Figure(figsize=(WIDTH, height), layout="constrained")


_XML_HEAD = re.compile(r"^.*?(?=<svg)", re.DOTALL)


def _svg(fig: Figure, name: str, label: str) -> str:
    """The figure as an inline ``<svg>`` element with an accessible name."""
    from html import escape

    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None})
    text = _XML_HEAD.sub("", buf.getvalue(), count=1)
    # matplotlib numbers its groups per figure (figure_1, patch_3): prefix every id, and
    # every reference to one, with the plot's name so that ids stay unique on the page.
    text = re.sub(r'( id="|url\(#|href="#)', lambda m: f"{m.group(1)}{name}-", text)
    return text.replace(
        "<svg ",
        f'<svg class="plot" data-plot="{escape(name)}" role="img" aria-label="{escape(label)}" ',
        1,
    )


def page_plots(page: PageData) -> dict[str, str]:
    """Every plot the page has data for, by name."""
    out: dict[str, str] = {}
    if page.section is not None:
        table = page.winding.table if page.winding else []
        out["section"] = cross_section(page.section, table)
        out["slot"] = slot_detail(page.section, table)
    if page.winding is not None:
        out["star"] = star_of_slots(page.winding)
    if page.mmf is not None:
        out["mmf"] = mmf_wave(page.mmf)
        out["spectrum"] = spectrum(page.mmf)
    for i, steel in enumerate(page.steels):
        out[f"bh-{i}"] = bh_curve(steel)
    if page.ampere_turns:
        out["ampere-turns"] = ampere_turns(page.ampere_turns)
    if page.thermal is not None and page.thermal.steps:
        out["thermal"] = thermal_steps(page.thermal)
    if page.checks:
        out["margins"] = margins(page.checks)
    return out


# ------------------------------------------------------------------------- drawings


def _to_global(
    points: Sequence[tuple[float, float]], angle: float, radius: float, inward: bool = False
) -> list[tuple[float, float]]:
    """Slot-frame points (x across, y depth from the gap) to the lamination's plane."""
    ux, uy = math.cos(angle), math.sin(angle)
    tx, ty = -uy, ux
    sign = -1.0 if inward else 1.0
    return [
        ((radius + sign * y) * ux + x * tx, (radius + sign * y) * uy + x * ty) for x, y in points
    ]


def _band(s: Any, y0: float, y1: float) -> list[tuple[float, float]]:
    a, b = s.width_at(y0) / 2.0, s.width_at(y1) / 2.0
    return [(-a, y0), (-b, y1), (b, y1), (a, y0)]


def _layer_bands(s: Any, layers: int) -> list[tuple[float, float]]:
    split = layer_boundary(s, layers)
    if split is None:
        return [(s.zone_top, s.height)]
    return [(s.zone_top, split), (split, s.height)]


def cross_section(sec: Section, table: list[tuple[str, ...]]) -> str:
    """Stator and rotor laminations of one pole pair, to scale [mm]."""
    from matplotlib.patches import Polygon, Wedge

    p = sec.poles // 2
    span = 360.0 / p
    r = sec.stator_outer_r
    widest = max(span, 360.0 * math.ceil(sec.slots / p - 1e-9) / sec.slots)
    low = min(0.0, r * math.cos(math.radians(widest / 2.0))) if p > 1 else -r
    with _style("section"):
        # Tall enough for the pole pair's own height over width at an equal aspect.
        fig = _figure(min(6.5, 0.9 + (WIDTH - 0.9) * (r * 1.04 - low) / (2.08 * r)))
        ax = fig.add_subplot()
        base = 90.0 - span / 2.0  # the pole pair stands upright
        pitch = 2.0 * math.pi / sec.slots
        # Whole slots: the stator sector holds the slots of the pole pair, rounded up to a
        # whole number when the slots per pole pair are fractional, centred like the rotor.
        n_slots = math.ceil(sec.slots / p - 1e-9) if p > 1 else sec.slots
        stator_span = math.degrees(n_slots * pitch)
        stator_base = 90.0 - stator_span / 2.0
        start = math.radians(stator_base) + pitch / 2.0
        ax.add_patch(
            Wedge(
                (0, 0),
                sec.stator_outer_r,
                stator_base,
                stator_base + stator_span,
                width=sec.stator_outer_r - sec.bore_r,
                facecolor=STEEL,
                edgecolor=BLACK,
                linewidth=0.6,
            )
        )
        s = sec.stator_slot
        outline = slot_outline(s)
        for k in range(n_slots):
            angle = start + k * pitch
            ax.add_patch(
                Polygon(
                    _to_global(outline, angle, sec.bore_r),
                    closed=True,
                    facecolor="white",
                    edgecolor=BLACK,
                    linewidth=0.4,
                )
            )
            sides = table[k] if k < len(table) else ()
            for (y0, y1), side in zip(_layer_bands(s, len(sides)), sides, strict=False):
                colour, hatch = phase_style(side)
                ax.add_patch(
                    Polygon(
                        _to_global(_band(s, y0, y1), angle, sec.bore_r),
                        closed=True,
                        facecolor=colour,
                        alpha=0.35,
                        hatch=hatch,
                        edgecolor=colour,
                        linewidth=0.3,
                    )
                )
                ((cx, cy),) = _to_global([(0.0, (y0 + y1) / 2.0)], angle, sec.bore_r)
                ax.text(cx, cy, side, ha="center", va="center", fontsize=5.5)
            ((lx, ly),) = _to_global([(0.0, s.height + 0.04 * sec.bore_r)], angle, sec.bore_r)
            ax.text(lx, ly, str(k + 1), ha="center", va="center", fontsize=5, color="#444")
        _rotor(ax, sec, base, span, p)
        ax.set_xlim(-r * 1.02, r * 1.02)
        ax.set_ylim(low - 0.02 * r, r * 1.02)
        ax.set_aspect("equal")
        ax.set_xlabel("mm")
        ax.set_ylabel("mm")
        ax.set_title(
            f"one pole pair of {sec.poles} poles, to scale; slot numbers beyond the slot bottoms"
        )
        return _svg(fig, "section", "stator and rotor cross-section of one pole pair")


def _rotor(ax: Axes, sec: Section, base: float, span: float, p: int) -> None:
    from matplotlib.patches import Polygon, Wedge

    ro, ri = sec.rotor_outer_r, sec.rotor_inner_r
    pole = span / 2.0
    if sec.machine == "induction" and sec.rotor_slot is not None:
        ax.add_patch(
            Wedge(
                (0, 0),
                ro,
                base,
                base + span,
                width=ro - ri,
                facecolor=STEEL,
                edgecolor=BLACK,
                linewidth=0.6,
            )
        )
        pitch = 2.0 * math.pi / sec.rotor_slots
        outline = slot_outline(sec.rotor_slot)
        count = math.ceil(sec.rotor_slots / p - 1e-9) if p > 1 else sec.rotor_slots
        for k in range(count):
            angle = math.radians(base) + pitch / 2.0 + k * pitch
            ax.add_patch(
                Polygon(
                    _to_global(outline, angle, ro, inward=True),
                    closed=True,
                    facecolor=ORANGE,
                    alpha=0.6,
                    hatch="",
                    edgecolor=BLACK,
                    linewidth=0.4,
                )
            )
        ax.text(0, (ro + ri) / 2.0 * 0.55, "cage rotor", ha="center", fontsize=7)
        return
    if sec.machine == "surface_pm":
        yoke_out = ro - sec.sleeve - sec.magnet_thickness
        ax.add_patch(
            Wedge(
                (0, 0),
                yoke_out,
                base,
                base + span,
                width=yoke_out - ri,
                facecolor=STEEL,
                edgecolor=BLACK,
                linewidth=0.6,
            )
        )
        for k in range(2 if p > 1 else sec.poles):
            mid = base + (k + 0.5) * pole
            half = sec.magnet_arc * pole / 2.0
            north = k % 2 == 0
            colour, hatch, word = (PURPLE, "////", "N") if north else (SKY, "\\\\\\\\", "S")
            ax.add_patch(
                Wedge(
                    (0, 0),
                    yoke_out + sec.magnet_thickness,
                    mid - half,
                    mid + half,
                    width=sec.magnet_thickness,
                    facecolor=colour,
                    hatch=hatch,
                    alpha=0.8,
                    edgecolor=BLACK,
                    linewidth=0.5,
                )
            )
            rr = yoke_out - 0.12 * yoke_out
            ax.text(
                rr * math.cos(math.radians(mid)),
                rr * math.sin(math.radians(mid)),
                word,
                ha="center",
                va="center",
                fontsize=9,
                weight="bold",
            )
        if sec.sleeve > 0.0:
            ax.add_patch(
                Wedge(
                    (0, 0),
                    ro,
                    base,
                    base + span,
                    width=sec.sleeve,
                    facecolor="none",
                    edgecolor=BLACK,
                    linewidth=0.4,
                    linestyle="--",
                )
            )
        return
    hub = ro - sec.shoe_height - sec.body_height
    ax.add_patch(
        Wedge(
            (0, 0),
            hub,
            base,
            base + span,
            width=hub - ri,
            facecolor=STEEL,
            edgecolor=BLACK,
            linewidth=0.6,
        )
    )
    for k in range(2 if p > 1 else sec.poles):
        mid = base + (k + 0.5) * pole
        half = sec.shoe_arc * pole / 2.0
        ax.add_patch(
            Wedge(
                (0, 0),
                ro,
                mid - half,
                mid + half,
                width=sec.shoe_height,
                facecolor=STEEL,
                edgecolor=BLACK,
                linewidth=0.6,
            )
        )
        w = sec.body_width / 2.0
        body = [(-w, 0.0), (-w, sec.body_height), (w, sec.body_height), (w, 0.0)]
        ax.add_patch(
            Polygon(
                _to_global(body, math.radians(mid), ro - sec.shoe_height, inward=True),
                closed=True,
                facecolor=STEEL,
                edgecolor=BLACK,
                linewidth=0.6,
            )
        )
        rr = hub + sec.body_height / 2.0
        ax.text(
            rr * math.cos(math.radians(mid)),
            rr * math.sin(math.radians(mid)),
            "N" if k % 2 == 0 else "S",
            ha="center",
            va="center",
            fontsize=9,
            weight="bold",
        )


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
    with _style("slot"):
        fig = _figure(5.6)
        ax = fig.add_subplot()
        outline = slot_outline(s)
        ax.add_patch(
            Polygon(outline, closed=True, facecolor="white", edgecolor=BLACK, linewidth=1.0)
        )
        t = sec.liner
        if t > 0.0:
            inner = [
                (x + t if x < 0 else x - t, y) for x, y in _band(s, s.zone_top + t, s.height - t)
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
        for (y0, y1), side in zip(_layer_bands(s, len(sides)), sides, strict=False):
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
        return _svg(fig, "slot", "one stator slot with its dimensions and conductors")


def star_of_slots(w: WindingTable) -> str:
    """The star of slots: each slot's phasor at its electrical angle, with its coil sides."""
    with _style("star"):
        fig = _figure(5.4)
        ax = fig.add_subplot()
        groups: dict[int, list[Any]] = {}
        for ph in w.star:
            groups.setdefault(round(ph.angle_deg * 1000), []).append(ph)
        for key in sorted(groups):
            members = groups[key]
            angle = math.radians(key / 1000)
            top = members[0].sides[0] if members[0].sides else ""
            colour, _ = phase_style(top) if top else (BLACK, "")
            style = "--" if top.startswith("-") else "-"
            x, y = math.cos(angle), math.sin(angle)
            ax.annotate(
                "",
                (x, y),
                (0, 0),
                arrowprops={
                    "arrowstyle": "-|>",
                    "color": colour,
                    "linestyle": style,
                    "linewidth": 1.1,
                },
            )
            label = ",".join(str(m.slot) for m in members)
            ax.text(
                1.13 * x,
                1.13 * y,
                f"{label} {top}",
                ha="center",
                va="center",
                fontsize=8,
                color=BLACK,
            )
        ax.set_xlim(-1.5, 1.5)
        ax.set_ylim(-1.25, 1.25)
        ax.set_aspect("equal")
        ax.axis("off")
        letters = sorted({s.lstrip("+-") for row in w.table for s in row})
        handles = []
        from matplotlib.lines import Line2D

        for letter in letters:
            colour, _ = phase_style(letter)
            handles.append(Line2D([], [], color=colour, label=f"phase {letter} (+ solid)"))
        handles.append(Line2D([], [], color=BLACK, linestyle="--", label="return side (-)"))
        ax.legend(
            handles=handles,
            loc="lower left",
            fontsize=8,
            frameon=False,
            bbox_to_anchor=(-0.12, -0.05),
        )
        ax.set_title(
            f"star of slots: slot number and top-layer coil side; {w.slots} slots,"
            f" p = {w.pole_pairs}"
        )
        return _svg(fig, "star", "star of slots")


def mmf_wave(m: MMFData) -> str:
    """The staircase MMF over one pole pair at the chosen instant, with its working harmonic."""
    with _style("mmf"):
        fig = _figure(3.0)
        ax = fig.add_subplot()
        ax.step(
            m.angle_deg,
            m.staircase,
            where="post",
            color=BLACK,
            linewidth=1.2,
            label="staircase MMF",
        )
        ax.plot(
            m.angle_deg,
            m.fundamental,
            color=BLUE,
            linestyle="--",
            linewidth=1.2,
            label=f"working harmonic (order {m.working_order})",
        )
        ax.axhline(0.0, color="#888", linewidth=0.5)
        ax.set_xlim(0, 360)
        ax.set_xticks(range(0, 361, 60))
        ax.set_xlabel("electrical angle along the gap, degrees")
        ax.set_ylabel("ampere-turns, A")
        ax.legend(fontsize=7, loc="upper right", frameon=False)
        ax.set_title(f"gap MMF over one pole pair at omega t = {m.instant_deg:g} degrees")
        return _svg(fig, "mmf", "staircase MMF over one pole pair with its working harmonic")


def spectrum(m: MMFData, other: MMFData | None = None, labels: tuple[str, str] = ("", "")) -> str:
    """Harmonic amplitudes relative to the working harmonic, by order relative to it; with
    ``other``, two revisions side by side."""
    with _style("spectrum" if other is None else "spectrum-diff"):
        fig = _figure(3.2)
        ax = fig.add_subplot()
        sets = (
            [(m, 0.0, labels[1] or "")]
            if other is None
            else [(other, -0.22, labels[0] or "base"), (m, 0.22, labels[1] or "head")]
        )
        top = 0.0
        for k, (data, shift, name) in enumerate(sets):
            p = data.working_order
            ref = data.amplitudes[p - 1] or 1.0
            for n, a in zip(data.orders, data.amplitudes, strict=True):
                rel = 100.0 * a / ref
                if rel < 0.05:
                    continue
                nu = n / p
                top = max(top, nu)
                if n == p:
                    colour, hatch = BLACK, ""
                elif n < p:
                    colour, hatch = VERMILLION, "///"
                else:
                    colour, hatch = BLUE, ""
                width = min(0.35, 0.6 / p)
                bar = ax.bar(
                    nu + shift * width * 2,
                    rel,
                    width=width,
                    bottom=0.01,
                    color=colour if k == len(sets) - 1 else "white",
                    edgecolor=colour,
                    hatch=hatch,
                    linewidth=0.6,
                )
                bar.patches[0].set_gid(f"harmonic-{name or 'page'}-{n}")
                if n < p and k == len(sets) - 1:  # a thin bar: say it in words too
                    ax.annotate(
                        "sub",
                        (nu, rel),
                        xytext=(0, 3),
                        textcoords="offset points",
                        ha="center",
                        va="bottom",
                        fontsize=7,
                        color=VERMILLION,
                    )
        ax.set_yscale("log")
        _plain_log(ax.yaxis)
        ax.set_ylim(0.05, 150)
        ax.set_xlim(0, top + 1)
        ax.set_xlabel("order relative to the working harmonic (below 1, hatched: sub-harmonic)")
        ax.set_ylabel("amplitude, % of working")
        thd = f"THD {100 * m.thd:.2f} %" if m.thd is not None else "THD not computed"
        if other is not None:
            othd = f"{100 * other.thd:.2f} %" if other.thd is not None else "n/a"
            thd = f"THD {othd} -> {thd[4:]}; outlined: {sets[0][2]}, filled: {sets[1][2]}"
        ax.set_title(f"MMF spectrum over the whole bore; {thd}")
        return _svg(fig, "spectrum", "harmonic spectrum of the MMF")


def bh_curve(
    steel: SteelCurve, other: SteelCurve | None = None, labels: tuple[str, str] = ("base", "head")
) -> str:
    """A steel's B-H curve with the working points of its parts; with ``other``, the other
    revision's points outlined beside."""
    with _style(f"bh-{steel.name}"):
        fig = _figure(3.6)
        ax = fig.add_subplot()
        h = [max(x, 1.0) for x in steel.h]
        ax.plot(h[1:], steel.b[1:], color=BLACK, linewidth=1.2, label=f"{steel.name}")
        for i, wp in enumerate(steel.points):
            colour = [BLUE, VERMILLION, GREEN, PURPLE, ORANGE][i % 5]
            ax.plot(
                [max(wp.h, 1.0)],
                [wp.b],
                marker=MARKERS[i % len(MARKERS)],
                color=colour,
                markersize=7,
                linestyle="none",
                label=f"{wp.part} {wp.b:.3g} T",
                gid=f"wp-{wp.quantity}",
            )
            # Alternate sides so that neighbouring points' names do not overlap.
            left = i % 2 == 1
            ax.annotate(
                wp.part,
                (max(wp.h, 1.0), wp.b),
                xytext=(-7, 6) if left else (7, -10),
                textcoords="offset points",
                ha="right" if left else "left",
                fontsize=7,
            )
        if other is not None:
            for i, wp in enumerate(other.points):
                colour = [BLUE, VERMILLION, GREEN, PURPLE, ORANGE][i % 5]
                ax.plot(
                    [max(wp.h, 1.0)],
                    [wp.b],
                    marker=MARKERS[i % len(MARKERS)],
                    markerfacecolor="white",
                    color=colour,
                    markersize=7,
                    linestyle="none",
                    label=f"{wp.part} {wp.b:.3g} T ({labels[0]})",
                )
        ax.set_xscale("log")
        _plain_log(ax.xaxis)
        ax.set_xlim(10, max(h) * 1.2)
        ax.set_xlabel("field strength H, A/m (log)")
        ax.set_ylabel("flux density B, T")
        ax.legend(fontsize=7, loc="lower right", frameon=False)
        parts = " and ".join(steel.parts)
        ax.set_title(
            f"{steel.name} ({parts}): working points"
            + (f", outlined: {labels[0]}" if other else "")
        )
        return _svg(fig, f"bh-{steel.name}", f"B-H curve of {steel.name} with working points")


def _hbars(items: list[tuple[str, float]], unit: str, salt: str, title: str, label: str) -> str:
    with _style(salt):
        fig = _figure(0.55 + 0.32 * len(items))
        ax = fig.add_subplot()
        total = sum(v for _, v in items) or 1.0
        names = [n for n, _ in items][::-1]
        values = [v for _, v in items][::-1]
        hatches = ["//", "", "\\\\", "xx", "||", "--", "++", ""]
        for i, v in enumerate(values):
            ax.barh(
                i,
                v,
                color=[BLUE, ORANGE, GREEN, PURPLE, SKY, VERMILLION][i % 6],
                hatch=hatches[i % len(hatches)],
                edgecolor=BLACK,
                linewidth=0.5,
            )
            ax.text(v, i, f" {v:.4g} {unit} ({100 * v / total:.0f} %)", va="center", fontsize=7.5)
        ax.set_yticks(range(len(names)), names)
        ax.set_xlim(0, max(values) * 1.45)
        ax.set_xlabel(unit)
        ax.set_title(title)
        return _svg(fig, salt, label)


def ampere_turns(parts: list[tuple[str, float]]) -> str:
    total = sum(v for _, v in parts)
    return _hbars(
        parts,
        "A",
        "ampere-turns",
        f"ampere-turns per pole: {total:.4g} A in all",
        "ampere-turn breakdown",
    )


def thermal_steps(t: Thermal) -> str:
    return _hbars(
        [(s.name, s.rise) for s in t.steps],
        "K",
        "thermal",
        f"temperature steps: winding {t.winding_c:.1f} °C, coolant {t.coolant_c:.1f} °C",
        "temperature steps of the thermal network",
    )


def margins(
    checks: list[CheckRow],
    other: list[CheckRow] | None = None,
    labels: tuple[str, str] = ("base", "head"),
) -> str:
    """Each check's margin to its limit, failing first; beyond +-100 % the bar stops at the
    edge and its number says how far. With ``other``, the other revision's margin outlined."""
    before = {(c.rule, c.quantity, c.bound): c for c in (other or [])}
    with _style("margins" if other is None else "margins-diff"):
        fig = _figure(0.7 + 0.3 * len(checks))
        ax = fig.add_subplot()
        n = len(checks)
        for i, c in enumerate(checks):
            y = n - 1 - i
            # Against a zero limit the margin is infinite: inside when passed, else beyond.
            m = 100.0 * c.margin if math.isfinite(c.margin) else (1e9 if c.passed else -1e9)
            shown = max(min(m, 100.0), -100.0)
            colour, hatch = (PASS, "") if c.passed else (FAIL, "///")
            ax.barh(
                y,
                shown,
                height=0.6,
                color=colour,
                hatch=hatch,
                edgecolor=BLACK,
                linewidth=0.5,
                gid=f"margin-{c.rule}-{c.quantity}-{c.bound}",
            )
            old = before.get((c.rule, c.quantity, c.bound))
            end = shown
            if old is not None and math.isfinite(old.margin):
                om = max(min(100.0 * old.margin, 100.0), -100.0)
                ax.plot([om], [y], marker="|", markersize=12, color=BLACK, markeredgewidth=1.6)
                end = max(shown, om) if shown >= 0 else min(shown, om)
            text = f"{m:+.1f} %" if math.isfinite(c.margin) else "limit 0"
            if old is not None and math.isfinite(old.margin):
                text = f"{100 * old.margin:+.1f} -> {text}"
            if abs(end) >= 100.0:  # a clipped bar: its number inside, on a white ground
                x, ha = (end - 3, "right") if end > 0 else (end + 3, "left")
                box = {"facecolor": "white", "edgecolor": "none", "pad": 0.8}
            else:
                x, ha = (end + 3, "left") if shown >= 0 else (end - 3, "right")
                box = None
            ax.text(x, y, text, va="center", ha=ha, fontsize=7, bbox=box)
        ax.axvline(0.0, color=BLACK, linewidth=1.0)
        ax.set_yticks(range(n), [f"{c.rule}: {c.quantity}" for c in checks][::-1], fontsize=7)
        ax.set_xlim(-135, 135)
        ax.set_xlabel("margin to the limit, % (right: inside; left, hatched: beyond)")
        title = "margins of every check, failing first"
        if other is not None:
            title += f"\nbar: {labels[1]}, tick: {labels[0]}"
        ax.set_title(title)
        return _svg(fig, "margins", "margin bars of every check")
