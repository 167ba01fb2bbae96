"""A diff as text, JSON, Markdown (a review comment) or a self-contained HTML page."""

from __future__ import annotations

import math
from dataclasses import asdict
from typing import Any

from emgate.diff.changes import DiffResult, RecordDiff


def _rel_text(rel: float | None) -> str:
    if rel is None:
        return "n/a"
    if math.isinf(rel):
        return "from 0"
    return f"{100 * rel:+.2f} %"


def _margin_text(m: float | None) -> str:
    return "-" if m is None else f"{100 * m:+.1f} %"


def _status_word(rd: RecordDiff) -> str:
    if rd.status == "renamed":
        return f"renamed from {rd.path_before}"
    return rd.status


def render_text(res: DiffResult) -> str:
    from emgate.findings import DISCLAIMER
    from emgate.report.common import one_line

    out = [
        f"emgate diff {res.base} -> {res.head} (quantities moved beyond {100 * res.threshold:g} %)"
    ]
    if not res.records:
        out.append("no design record changed")
    for rd in res.records:
        out.append("")
        out.append(f"{rd.record_id} ({rd.path_after or rd.path_before}): {_status_word(rd)}")
        for n in rd.notes:
            out.append(f"  note: {n}")
        for name in rd.newly_failing:
            out.append(f"  NEWLY FAILING {name}")
        for name in rd.newly_passing:
            out.append(f"  newly passing {name}")
        for f in rd.fields:
            out.append(f"  field {f.path}: {f.before} -> {f.after}")
        if rd.quantities:
            width = max(len(q.name) for q in rd.quantities)
            for q in rd.quantities:
                out.append(
                    f"  {q.name:<{width}}  {q.before_text or '-':>14} -> {q.after_text or '-':<14}"
                    f" {_rel_text(q.relative)}"
                )
        for m in rd.margins:
            out.append(
                f"  margin {m.rule}: {m.quantity} ({m.bound}) {_margin_text(m.before)} ->"
                f" {_margin_text(m.after)}"
            )
    out += ["", f"head revision gate exit code: {res.head_exit}", DISCLAIMER]
    # every line escaped: a record's text cannot start a line or drive a terminal
    return "\n".join(one_line(line) for line in out) + "\n"


def render_json(res: DiffResult) -> str:
    import json

    from emgate import __version__
    from emgate.findings import DISCLAIMER

    def clean(x: Any) -> Any:
        if isinstance(x, float) and not math.isfinite(x):
            return None if math.isnan(x) else ("inf" if x > 0 else "-inf")
        if isinstance(x, dict):
            return {k: clean(v) for k, v in x.items()}
        if isinstance(x, list):
            return [clean(v) for v in x]
        return x

    records = []
    for rd in res.records:
        d = asdict(rd)
        d.pop("base")
        d.pop("head")
        records.append(d)
    doc = {
        "tool": {"name": "emgate", "version": __version__},
        "base": res.base,
        "head": res.head,
        "threshold": res.threshold,
        "head_exit_code": res.head_exit,
        "records": records,
        "notes": res.notes,
        "notice": DISCLAIMER,
    }
    return json.dumps(clean(doc), indent=2) + "\n"


#: Rows of quantities per record in the Markdown comment (the rest: "and N more").
MARKDOWN_ROWS = 12


def render_markdown(res: DiffResult) -> str:
    from emgate import __version__
    from emgate.findings import DISCLAIMER
    from emgate.report.markdown import md

    def row(cells: list[str]) -> str:
        return "| " + " | ".join(md(c) for c in cells) + " |"

    out = [f"## emgate diff: {md(res.base)} → {md(res.head)}", ""]
    if not res.records:
        out.append("No design record changed.")
    for rd in res.records:
        head = f"### {md(rd.record_id)} ({md(_status_word(rd))})"
        out += [head, ""]
        for n in rd.notes:
            out.append(f"- {md(n)}")
        for name in rd.newly_failing:
            out.append(f"- **newly failing:** {md(name)}")
        for name in rd.newly_passing:
            out.append(f"- newly passing: {md(name)}")
        if rd.fields:
            out.append(
                "- fields: " + ", ".join(md(f"{f.path}: {f.before} → {f.after}") for f in rd.fields)
            )
        if rd.quantities:
            out += ["", row(["quantity", "before", "after", "change"]), "|---|---|---|---|"]
            for q in rd.quantities[:MARKDOWN_ROWS]:
                out.append(row([q.name, q.before_text, q.after_text, _rel_text(q.relative)]))
            if len(rd.quantities) > MARKDOWN_ROWS:
                more = len(rd.quantities) - MARKDOWN_ROWS
                out.append(f"\n…and {more} more: the text, json and html formats list them all.")
        if rd.margins:
            out += ["", row(["check", "margin before", "margin after"]), "|---|---|---|"]
            for m in rd.margins:
                out.append(
                    row(
                        [
                            f"{m.rule}: {m.quantity} ({m.bound})",
                            _margin_text(m.before),
                            _margin_text(m.after),
                        ]
                    )
                )
        out.append("")
    verdict = "passes" if res.head_exit == 0 else f"fails (exit code {res.head_exit})"
    out += [f"The head revision {verdict} the gate on the records compared.", ""]
    out += ["---", md(f"emgate {__version__}. {DISCLAIMER}")]
    return "\n".join(out) + "\n"


def render_html(res: DiffResult) -> str:
    from emgate.findings import DISCLAIMER
    from emgate.page.markup import e, html_table, num_cell, page_head
    from emgate.page.plots.magnetic import bh_curve
    from emgate.page.plots.margins import margins
    from emgate.page.plots.winding import spectrum

    out = [page_head(f"emgate diff {res.base} -> {res.head}")]
    out.append(
        f'<header><p class="meta">emgate diff</p><h1>{e(res.base)} → {e(res.head)}</h1>'
        f'<p class="meta">quantities moved beyond {100 * res.threshold:g} %; head revision'
        f" gate exit code {res.head_exit}</p>"
        f'<p class="caution">{e(DISCLAIMER)}</p></header><main>'
    )
    if not res.records:
        out.append("<p>No design record changed.</p>")
    labels = (res.base, res.head)
    for rd in res.records:
        out.append(f"<section><h2>{e(rd.record_id)}: {e(_status_word(rd))}</h2>")
        items = [f"<li><b>newly failing</b> {e(n)}</li>" for n in rd.newly_failing]
        items += [f"<li>newly passing {e(n)}</li>" for n in rd.newly_passing]
        items += [f"<li>{e(n)}</li>" for n in rd.notes]
        if items:
            out.append("<ul>" + "".join(items) + "</ul>")
        if rd.fields:
            out.append(
                html_table(
                    ["record field", "before", "after"],
                    [[e(f.path), e(f.before), e(f.after)] for f in rd.fields],
                )
            )
        if rd.quantities:
            out.append(
                html_table(
                    ["quantity", "before", "after", "change"],
                    [
                        [
                            e(q.name),
                            num_cell(e(q.before_text)),
                            num_cell(e(q.after_text)),
                            num_cell(e(_rel_text(q.relative))),
                        ]
                        for q in rd.quantities
                    ],
                )
            )
        b, h = rd.base, rd.head
        if b is not None and h is not None:
            if h.checks:
                out.append(_fig(margins(h.checks, b.checks, labels), "margins"))
            if h.mmf is not None and b.mmf is not None:
                out.append(_fig(spectrum(h.mmf, b.mmf, labels), "MMF spectra"))
            before = {s.name: s for s in b.steels}
            for s in h.steels:
                out.append(_fig(bh_curve(s, before.get(s.name), labels), s.name))
        out.append("</section>")
    out.append(f"</main><footer><p>{e(DISCLAIMER)}</p></footer></body></html>\n")
    return "".join(out)


def _fig(svg: str, caption: str) -> str:
    from emgate.page.markup import e

    return f"<figure>{svg}<figcaption>{e(caption)}</figcaption></figure>"


RENDERERS = {
    "text": render_text,
    "json": render_json,
    "markdown": render_markdown,
    "html": render_html,
}
