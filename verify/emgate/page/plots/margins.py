"""Thermal plot and the checks' margins: the temperature steps, each check to its limit."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate.page.plots.style import BLACK, FAIL, PASS, hbars, new_figure, styled, to_svg

if TYPE_CHECKING:
    from emgate.page.content import CheckRow, Thermal


def thermal_steps(t: Thermal) -> str:
    return hbars(
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
    with styled("margins" if other is None else "margins-diff"):
        fig = new_figure(0.7 + 0.3 * len(checks))
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
        return to_svg(fig, "margins", "margin bars of every check")
