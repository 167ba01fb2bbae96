"""The cross-section drawing: stator and rotor laminations of one pole pair, to scale."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate.page.plots.style import (
    BLACK,
    ORANGE,
    PURPLE,
    SKY,
    STEEL,
    WIDTH,
    new_figure,
    phase_style,
    styled,
    to_svg,
)
from emgate.page.shapes import layer_bands, slot_outline, to_plane, zone_band

if TYPE_CHECKING:
    from matplotlib.axes import Axes

    from emgate.page.content import Section


def cross_section(sec: Section, table: list[tuple[str, ...]]) -> str:
    """Stator and rotor laminations of one pole pair, to scale [mm]."""
    from matplotlib.patches import Polygon, Wedge

    p = sec.poles // 2
    span = 360.0 / p
    r = sec.stator_outer_r
    widest = max(span, 360.0 * math.ceil(sec.slots / p - 1e-9) / sec.slots)
    low = min(0.0, r * math.cos(math.radians(widest / 2.0))) if p > 1 else -r
    with styled("section"):
        # Tall enough for the pole pair's own height over width at an equal aspect.
        fig = new_figure(min(6.5, 0.9 + (WIDTH - 0.9) * (r * 1.04 - low) / (2.08 * r)))
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
                    to_plane(outline, angle, sec.bore_r),
                    closed=True,
                    facecolor="white",
                    edgecolor=BLACK,
                    linewidth=0.4,
                )
            )
            sides = table[k] if k < len(table) else ()
            for (y0, y1), side in zip(layer_bands(s, len(sides)), sides, strict=False):
                colour, hatch = phase_style(side)
                ax.add_patch(
                    Polygon(
                        to_plane(zone_band(s, y0, y1), angle, sec.bore_r),
                        closed=True,
                        facecolor=colour,
                        alpha=0.35,
                        hatch=hatch,
                        edgecolor=colour,
                        linewidth=0.3,
                    )
                )
                ((cx, cy),) = to_plane([(0.0, (y0 + y1) / 2.0)], angle, sec.bore_r)
                ax.text(cx, cy, side, ha="center", va="center", fontsize=5.5)
            ((lx, ly),) = to_plane([(0.0, s.height + 0.04 * sec.bore_r)], angle, sec.bore_r)
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
        return to_svg(fig, "section", "stator and rotor cross-section of one pole pair")


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
                    to_plane(outline, angle, ro, inward=True),
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
                to_plane(body, math.radians(mid), ro - sec.shoe_height, inward=True),
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
