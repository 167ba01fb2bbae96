"""The sheet of a record, and a run's index, as self-contained HTML files.

The skeleton and its shared pieces are :mod:`emgate.page.markup`, the sheet's sections
:mod:`emgate.page.sections`; every text from a record, a rule or a materials file is escaped.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable
from dataclasses import asdict
from typing import TYPE_CHECKING

from emgate import __version__
from emgate.findings import DISCLAIMER
from emgate.page.markup import SCRIPT, e, html_table, json_script, page_head
from emgate.page.sections import SECTIONS, margin_text
from emgate.report.common import VERDICTS

if TYPE_CHECKING:
    from emgate.findings import RunResult
    from emgate.page.content import IndexRow, PageData


def render_page(page: PageData, plots: dict[str, str]) -> str:
    """The sheet of one record as one HTML document."""
    p = page
    verdict = VERDICTS.get(p.verdict, "?")
    cls = "pass" if p.verdict == 0 else "fail"
    out = [page_head(f"emgate sheet: {p.record_id}: {p.title}")]
    out.append(
        f'<header><p class="meta">emgate calculation sheet</p><h1>{e(p.title)}</h1>'
        f'<p class="meta">record <b>{e(p.record_id)}</b> · {e(p.file)} ·'
        f" emgate {e(__version__)}</p>"
        f'<p><span class="verdict {cls}" id="verdict">{e(verdict)}</span></p>'
        f'<p class="caution">{e(DISCLAIMER)}</p></header>'
    )
    links = "".join(f'<a href="#{a}">{e(t)}</a>' for a, t, _ in SECTIONS)
    out.append(f"<nav>{links}</nav>")
    out.append("<main>")
    if p.problems:
        items = "".join(f"<li>{e(x)}</li>" for x in p.problems)
        out.append(f'<div class="problems"><b>Not shown</b><ul>{items}</ul></div>')
    out += [write(p, plots) for _, _, write in SECTIONS]
    out.append("</main>")
    out.append(json_script("plot-data", _plot_data(p)))
    out.append(f"<footer><p>{e(DISCLAIMER)}</p><p>emgate {e(__version__)}</p></footer>")
    out.append(f"<script>{SCRIPT}</script></body></html>\n")
    return "".join(out)


def _plot_data(p: PageData) -> dict[str, object]:
    """The numbers the plots draw, for readers and tools that want them."""
    return {
        "record_id": p.record_id,
        "spectrum": None
        if p.mmf is None
        else {
            "working_order": p.mmf.working_order,
            "orders": p.mmf.orders,
            "amplitudes": p.mmf.amplitudes,
            "thd": p.mmf.thd,
        },
        "working_points": [asdict(wp) | {"steel": s.name} for s in p.steels for wp in s.points],
        "ampere_turns": p.ampere_turns,
        "margins": [
            {
                "rule": c.rule,
                "quantity": c.quantity,
                "bound": c.bound,
                "margin": c.margin if math.isfinite(c.margin) else None,
            }
            for c in p.checks
        ],
    }


def render_index(
    result: RunResult, pages: Iterable[IndexRow], sheet_name: Callable[[str], str]
) -> str:
    """A run's index: the verdict, and every record with its closest check and its sheet."""
    from emgate.report.common import summary_line

    code = result.exit_code
    cls = "pass" if code == 0 else "fail"
    out = [page_head("emgate run")]
    out.append(
        '<header><p class="meta">emgate run</p><h1>Calculation sheets</h1>'
        f'<p><span class="verdict {cls}" id="verdict">{e(VERDICTS.get(code, "?"))}</span></p>'
        f"<p>{e(summary_line(result))}</p>"
        f'<p class="caution">{e(DISCLAIMER)}</p></header><main>'
    )
    rows, classes = [], []
    for p in pages:
        closest = p.closest
        near = (
            "(no numeric check)"
            if closest is None
            else (f"{closest.rule}: {closest.quantity} {margin_text(closest)}")
        )
        rows.append(
            [
                f'<td class="name"><a href="{e(sheet_name(p.record_id))}">'
                f"{e(p.record_id)}</a></td>",
                e(p.title),
                e(p.file),
                e(VERDICTS.get(p.verdict, "?")),
                e(near),
            ]
        )
        classes.append("" if p.verdict == 0 else "fail")
    out.append('<section id="records"><h2>Records</h2>')
    out.append(
        html_table(
            ["record", "title", "file", "verdict", "closest check"], rows, "records-table", classes
        )
    )
    others = [f for f in result.findings if f.check is None and f.kind != "note"]
    if others:
        out.append("<h2>Findings without a check</h2><ul>")
        out += [f"<li>{e(f.file)}:{f.line}: {e(f.rule)}: {e(f.message)}</li>" for f in others]
        out.append("</ul>")
    out.append(f"</section></main><footer><p>{e(DISCLAIMER)}</p></footer></body></html>\n")
    return "".join(out)
