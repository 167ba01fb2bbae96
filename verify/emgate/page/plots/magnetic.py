"""Magnetic plots: a steel's B-H curve with its working points, the ampere-turns per pole."""

from __future__ import annotations

from typing import TYPE_CHECKING

from emgate.page.plots.style import (
    BLACK,
    BLUE,
    GREEN,
    MARKERS,
    ORANGE,
    PURPLE,
    VERMILLION,
    hbars,
    new_figure,
    plain_log,
    styled,
    to_svg,
)

if TYPE_CHECKING:
    from emgate.page.content import SteelCurve


def bh_curve(
    steel: SteelCurve, other: SteelCurve | None = None, labels: tuple[str, str] = ("base", "head")
) -> str:
    """A steel's B-H curve with the working points of its parts; with ``other``, the other
    revision's points outlined beside."""
    with styled(f"bh-{steel.name}"):
        fig = new_figure(3.6)
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
        plain_log(ax.xaxis)
        ax.set_xlim(10, max(h) * 1.2)
        ax.set_xlabel("field strength H, A/m (log)")
        ax.set_ylabel("flux density B, T")
        ax.legend(fontsize=7, loc="lower right", frameon=False)
        parts = " and ".join(steel.parts)
        ax.set_title(
            f"{steel.name} ({parts}): working points"
            + (f", outlined: {labels[0]}" if other else "")
        )
        return to_svg(fig, f"bh-{steel.name}", f"B-H curve of {steel.name} with working points")


def ampere_turns(parts: list[tuple[str, float]]) -> str:
    total = sum(v for _, v in parts)
    return hbars(
        parts,
        "A",
        "ampere-turns",
        f"ampere-turns per pole: {total:.4g} A in all",
        "ampere-turn breakdown",
    )
