"""Winding plots: the star of slots, the gap MMF staircase and its harmonic spectrum."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any

from emgate.page.plots.style import (
    BLACK,
    BLUE,
    VERMILLION,
    new_figure,
    phase_style,
    plain_log,
    styled,
    to_svg,
)

if TYPE_CHECKING:
    from emgate.page.content import MMFData, WindingTable


def star_of_slots(w: WindingTable) -> str:
    """The star of slots: each slot's phasor at its electrical angle, with its coil sides."""
    with styled("star"):
        fig = new_figure(5.4)
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
        return to_svg(fig, "star", "star of slots")


def mmf_wave(m: MMFData) -> str:
    """The staircase MMF over one pole pair at the chosen instant, with its working harmonic."""
    with styled("mmf"):
        fig = new_figure(3.0)
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
        return to_svg(fig, "mmf", "staircase MMF over one pole pair with its working harmonic")


def spectrum(m: MMFData, other: MMFData | None = None, labels: tuple[str, str] = ("", "")) -> str:
    """Harmonic amplitudes relative to the working harmonic, by order relative to it; with
    ``other``, two revisions side by side."""
    with styled("spectrum" if other is None else "spectrum-diff"):
        fig = new_figure(3.2)
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
        plain_log(ax.yaxis)
        ax.set_ylim(0.05, 150)
        ax.set_xlim(0, top + 1)
        ax.set_xlabel("order relative to the working harmonic (below 1, hatched: sub-harmonic)")
        ax.set_ylabel("amplitude, % of working")
        thd = f"THD {100 * m.thd:.2f} %" if m.thd is not None else "THD not computed"
        if other is not None:
            othd = f"{100 * other.thd:.2f} %" if other.thd is not None else "n/a"
            thd = f"THD {othd} -> {thd[4:]}; outlined: {sets[0][2]}, filled: {sets[1][2]}"
        ax.set_title(f"MMF spectrum over the whole bore; {thd}")
        return to_svg(fig, "spectrum", "harmonic spectrum of the MMF")
