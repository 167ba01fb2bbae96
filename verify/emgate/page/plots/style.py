"""The plots' shared set-up: palette, matplotlib style, figure and SVG output.

Every plot takes the plain data of :mod:`emgate.page.content` and returns an ``<svg>``
element as text. Text stays text (``svg.fonttype: none``) so that it can be selected and
searched; math parsing is off so that a ``$`` in a name is shown as written. Colours come
from the Okabe-Ito palette, which colour-blind readers tell apart, and every colour is
paired with a hatch, a marker or a letter so that a greyscale print reads the same.
matplotlib is imported inside the functions only, off ``emgate check``'s path.
"""

from __future__ import annotations

import io
import re
from collections.abc import Iterator
from contextlib import contextmanager
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from matplotlib.figure import Figure

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
def styled(salt: str) -> Iterator[None]:
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


def plain_log(axis: Any) -> None:
    """Plain numbers on a log axis (1, 10, 100): with math parsing off, matplotlib's default
    labels would show as their mathtext source."""
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    axis.set_major_locator(LogLocator(base=10))
    axis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:.10g}"))
    axis.set_minor_formatter(NullFormatter())


def new_figure(height: float) -> Figure:
    from matplotlib.figure import Figure

    return Figure(figsize=(WIDTH, height), layout="constrained")


_XML_HEAD = re.compile(r"^.*?(?=<svg)", re.DOTALL)


def to_svg(fig: Figure, name: str, label: str) -> str:
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


def hbars(items: list[tuple[str, float]], unit: str, salt: str, title: str, label: str) -> str:
    """A breakdown as horizontal bars, each with its value and its share of the sum."""
    with styled(salt):
        fig = new_figure(0.55 + 0.32 * len(items))
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
        return to_svg(fig, salt, label)
