"""The page of a sweep (``emgate sweep ... --html FILE``): one self-contained HTML file.

The header names the record, the spec and the counts; the maps of
:mod:`emgate.page.plots.feasibility` follow, then the binding rules by region (the text
summary's counts) and the first infeasible variants. The numbers the maps draw are in a JSON
block (``sweep-data``) for readers and tools. Every text from the record or the spec is
escaped with :func:`~emgate.page.markup.e`, on the skeleton of :mod:`emgate.page.markup`.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate import __version__
from emgate.findings import DISCLAIMER
from emgate.page.markup import e, html_table, json_script, num_cell, page_head
from emgate.page.sweep_data import FIRST_INFEASIBLE, MAP_CELLS, MAX_POINTS

if TYPE_CHECKING:
    from emgate.page.sweep_data import CellMap, SweepPage


def sweep_html(page: SweepPage) -> str:
    """The page of a sweep, its maps drawn (needs matplotlib: the extra ``html``)."""
    from emgate.page.plots.feasibility import sweep_plots

    return render_sweep(page, sweep_plots(page))


def _fraction(n: int, total: int) -> str:
    return f"{n / total:.1%}" if total else "-"


def render_sweep(page: SweepPage, plots: dict[str, str]) -> str:
    p = page
    out = [page_head(f"emgate sweep: {p.record_id or p.record}: {p.title}")]
    if p.sample == "grid":
        sample = f"grid over {len(p.axes)} field{'s' * (len(p.axes) > 1)}"
    else:
        sample = f"random sample, seed {p.seed}"
    facts = [
        ("record", f"<b>{e(p.record_id)}</b> · {e(p.record)}" if p.record_id else e(p.record)),
        ("spec", e(p.spec)),
        ("sample", e(sample)),
    ]
    dl = "".join(f"<dt>{k}</dt><dd>{v}</dd>" for k, v in facts)
    counts = (
        f'<p id="counts"><b>{p.total:,}</b> variants · <b>{p.valid:,}</b> valid ·'
        f' <b id="feasible-count">{p.feasible:,}</b> feasible · feasible fraction'
        f" <b>{_fraction(p.feasible, p.total)}</b></p>"
    )
    out.append(
        f'<header><p class="meta">emgate sweep</p><h1>{e(p.title)}</h1>'
        f'<dl class="facts">{dl}</dl>{counts}'
        f'<p class="caution">{e(DISCLAIMER)}</p></header><main>'
    )
    out.append('<section id="fields"><h2>Swept fields</h2>')
    out.append(
        html_table(
            ["field", "unit (as the record writes it)", "values"],
            [
                [f'<td class="name">{e(a.name)}</td>', e(a.unit or "-"), e(text)]
                for a, text in zip(p.axes, p.ranges, strict=True)
            ],
            "fields-table",
        )
    )
    out.append("</section>")
    out.append(_maps(p, plots))
    out.append(_binding(p))
    out.append(_infeasible(p))
    out.append("</main>")
    out.append(json_script("sweep-data", _data(p)))
    out.append(
        f"<footer><p>{e(DISCLAIMER)}</p><p>emgate {e(__version__)}</p></footer></body></html>\n"
    )
    return "".join(out)


def _maps(p: SweepPage, plots: dict[str, str]) -> str:
    out = ['<section id="maps"><h2>Feasible region</h2>']
    if p.maps:
        out.append(
            '<p class="meta">Each cell is a variant of the grid (or several, where a caption'
            " says so): light blue and outlined when every rule passed, else coloured, hatched"
            " and lettered by its binding rule (the rule closest to, or furthest past, its"
            " limit); grey and crossed when it did not validate.</p>"
        )
    elif p.points is not None and len(p.axes) > 1:
        out.append(
            '<p class="meta">Each point is a variant of the sample: a blue circle when every'
            " rule passed, else coloured and shaped by its binding rule; a grey cross when it"
            " did not validate.</p>"
        )
    if p.points is not None:
        drawn, stride = len(p.points.variants), p.points.stride
        if stride > 1:
            note = (
                f"{drawn:,} of {p.total:,} variants drawn, one in every {stride:,} (variants"
                f" 0, {stride:,}, {2 * stride:,}, ...), as a map draws at most {MAX_POINTS:,}"
                " points"
            )
            if p.sample == "random":
                note += " (the sample's variants are independent draws: so are these)"
        else:
            note = (
                f"All {p.total:,} variants drawn (a map draws at most {MAX_POINTS:,} points;"
                " of a larger sweep, every k-th variant)"
            )
        out.append(f'<p class="meta" id="points-note">{e(note)}.</p>')
    for name, svg in plots.items():
        caption = _caption(p, name)
        out.append(
            f'<figure data-figure="{e(name)}">{svg}<figcaption>{e(caption)}</figcaption></figure>'
        )
    out.append("</section>")
    return "".join(out)


def _caption(p: SweepPage, name: str) -> str:
    if name.startswith("margin-"):
        return (
            f"Binding margin of each variant against {p.axes[0].name}: above zero every"
            " rule's closest check is inside its limit."
        )
    x, y = (int(k) for k in name.removeprefix("map-").split("-"))
    text = f"x: {p.axes[x].title}; y: {p.axes[y].title}."
    m = next((m for m in p.maps if (m.x, m.y) == (x, y)), None)
    if m is not None:
        text += _cell_note(p, m)
    return text


def _cell_note(p: SweepPage, m: CellMap) -> str:
    note = ""
    if m.projected:
        fields = len(p.axes)
        others = "the other field" if fields == 3 else f"the other {fields - 2} fields"
        note += (
            f" Over {others}, a cell shows the variant that came closest to feasible: feasible"
            " when any of them is."
        )
    for k, values, edges in ((m.x, m.values[0], m.x_edges), (m.y, m.values[1], m.y_edges)):
        if values > len(edges) - 1:
            note += (
                f" The {values:,} values of {p.axes[k].name} are drawn in {len(edges) - 1:,}"
                f" cells (at most {MAP_CELLS} an axis), neighbouring values sharing one."
            )
    return note


def _binding(p: SweepPage) -> str:
    letters = {o.label: o.letter for o in p.outcomes}
    rows, classes = [], []
    for region, counter in (
        ("infeasible: binding rule", p.binding_infeasible),
        ("feasible: closest rule", p.binding_feasible),
    ):
        for rule, n in counter:
            rows.append(
                [
                    e(region),
                    f'<td class="name">{e(rule)}</td>',
                    e(letters.get(rule, "") if region.startswith("infeasible") else ""),
                    num_cell(f"{n:,}"),
                    num_cell(_fraction(n, p.total)),
                ]
            )
            classes.append("fail" if region.startswith("infeasible") else "")
    out = ['<section id="binding"><h2>Binding rules</h2>']
    out.append(
        '<p class="meta">The rule closest to, or furthest past, its limit in each variant:'
        " where a variant is infeasible it is what fails first; where feasible, what would.</p>"
    )
    out.append(
        html_table(
            ["region", "rule", "map letter", "variants", "share"], rows, "binding-table", classes
        )
    )
    out.append("</section>")
    return "".join(out)


def _infeasible(p: SweepPage) -> str:
    n = p.total - p.feasible
    out = ['<section id="infeasible"><h2>Infeasible variants</h2>']
    if not p.infeasible:
        out.append("<p>Every variant is feasible.</p></section>")
        return "".join(out)
    shown = len(p.infeasible)
    more = f"The first {shown} of {n:,}" if n > shown else f"All {n:,}"
    out.append(
        f'<p class="meta">{e(more)}, in variant order (at most {FIRST_INFEASIBLE}; the table'
        " written by --out holds them all).</p>"
    )
    why = any(r.reason for r in p.infeasible)
    rows = [
        [
            num_cell(str(r.variant)),
            *(num_cell(e(v)) for v in r.values),
            f'<td class="name">{e(r.rule)}</td>',
            num_cell(f"{100 * r.margin:+.2f} %" if math.isfinite(r.margin) else "-"),
            *([e(r.reason)] if why else []),
        ]
        for r in p.infeasible
    ]
    header = ["variant", *(e(a.title) for a in p.axes), "binding rule", "binding margin"]
    header += ["why invalid"] if why else []
    out.append(html_table(header, rows, "infeasible-table", ["fail"] * len(rows)))
    out.append("</section>")
    return "".join(out)


def _data(p: SweepPage) -> dict[str, object]:
    """The numbers the maps draw (no NaN in JSON: a missing margin is null)."""

    def num(v: float) -> float | None:
        return v if math.isfinite(v) else None

    return {
        "record_id": p.record_id,
        "variants": p.total,
        "valid": p.valid,
        "feasible": p.feasible,
        "fields": [{"name": a.name, "unit": a.unit, "labels": list(a.labels)} for a in p.axes],
        "outcomes": [{"label": o.label, "letter": o.letter} for o in p.outcomes],
        "maps": [
            {
                "x": m.x,
                "y": m.y,
                "x_edges": m.x_edges,
                "y_edges": m.y_edges,
                "cells": m.cells,
                "feasible": m.feasible,
                "total": m.total,
            }
            for m in p.maps
        ],
        "points": None
        if p.points is None
        else {
            "stride": p.points.stride,
            "variant": p.points.variants,
            "positions": p.points.positions,
            "outcome": p.points.outcomes,
            "margin": [num(v) for v in p.points.margins],
        },
    }
