"""The sheet of a record, and a run's index, as self-contained HTML files.

No network access, no external script, style or font: the style and the few lines of script
(the sheet table's search) are inline, and a Content-Security-Policy forbids loading
anything else, so a page opens the same from a CI artifact or an e-mail attachment. Every
text that comes from a record, a rule or a materials file is escaped here; the plots arrive
as SVG text from :mod:`emgate.page.plots`, whose text matplotlib escapes.
"""

from __future__ import annotations

import json
import math
from collections.abc import Callable, Iterable
from dataclasses import asdict
from html import escape
from typing import TYPE_CHECKING

from emgate import __version__
from emgate.findings import DISCLAIMER

if TYPE_CHECKING:
    from emgate.findings import RunResult
    from emgate.page.data import CheckRow, PageData

VERDICT = {0: "PASS", 1: "FAIL", 2: "INVALID INPUT", 3: "RULE CRASHED"}

CSP = (
    "default-src 'none'; style-src 'unsafe-inline'; script-src 'unsafe-inline';"
    " img-src data:; base-uri 'none'; form-action 'none'"
)

CSS = """
:root{--ink:#1a1a1a;--muted:#555;--line:#ccc;--pass:#0072B2;--fail:#D55E00;--bg:#fff}
*{box-sizing:border-box}[hidden]{display:none!important}
body{margin:0;font:15px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;
color:var(--ink);background:var(--bg)}
header,main,footer,nav{max-width:1120px;margin:0 auto;padding:0 16px}
header{padding-top:16px}
h1{font-size:1.5em;margin:.2em 0;overflow-wrap:anywhere}
h2{font-size:1.2em;margin:1.6em 0 .5em;border-bottom:2px solid var(--ink);padding-bottom:2px}
h3{font-size:1.02em;margin:1.2em 0 .4em}
.meta{color:var(--muted);overflow-wrap:anywhere;margin:.2em 0}
.caution{border-left:4px solid var(--ink);padding:6px 10px;background:#f4f4f4}
.verdict{display:inline-block;font-weight:700;padding:2px 10px;border:2px solid;
letter-spacing:.03em}
.verdict.pass{color:var(--pass)}.verdict.fail{color:var(--fail);border-style:dashed}
nav{position:sticky;top:0;background:var(--bg);border-bottom:1px solid var(--line);
padding-top:6px;padding-bottom:6px;z-index:2}
nav a{display:inline-block;margin:2px 10px 2px 0;color:var(--ink)}
figure{margin:10px 0 18px;padding:0}
figcaption{color:var(--muted);font-size:.9em;overflow-wrap:anywhere}
svg.plot{display:block;width:100%;max-width:820px;height:auto}
.grid{display:grid;grid-template-columns:repeat(auto-fit,minmax(340px,1fr));gap:12px}
.scroll{overflow-x:auto;max-width:100%}
table{border-collapse:collapse;font-size:.9em;margin:6px 0 12px}
th,td{border-bottom:1px solid var(--line);padding:3px 8px;text-align:left;vertical-align:top}
th{background:#f0f0f0}
td.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
td.name{font-family:ui-monospace,Menlo,Consolas,monospace;white-space:nowrap}
tr.fail td{background:#fbe9df}
#slot-table td,#slot-table th{padding:2px 4px;text-align:center;white-space:nowrap}
td.ph-A{background:#dcebf5}td.ph-B{background:#f8e1d3}td.ph-C{background:#d6efe7}
.tag{font-weight:700}.tag.fail{color:var(--fail)}.tag.pass{color:var(--pass)}
input[type=search]{font:inherit;padding:6px 8px;width:100%;max-width:420px;
border:1px solid var(--muted)}
.problems{border:2px dashed var(--fail);padding:6px 10px}
dl.facts{display:grid;grid-template-columns:max-content 1fr;gap:2px 14px;margin:8px 0}
dl.facts dt{color:var(--muted)}dl.facts dd{margin:0;overflow-wrap:anywhere}
footer{color:var(--muted);padding-bottom:30px;margin-top:30px;border-top:1px solid var(--line)}
@media (max-width:600px){body{font-size:14px}th,td{padding:3px 5px}
.grid{grid-template-columns:1fr}
.stack thead{display:none}.stack tr{display:block;border-bottom:1px solid var(--line);
padding:4px 0}.stack td{display:block;border:0;padding:1px 4px;text-align:left}
.stack td.name{white-space:normal;overflow-wrap:anywhere;font-weight:700}}
@media print{nav{display:none}}
"""

SCRIPT = """
document.querySelectorAll('input[data-filter]').forEach(function (box) {
  var table = document.getElementById(box.getAttribute('data-filter'));
  var count = document.getElementById(box.getAttribute('data-filter') + '-count');
  box.addEventListener('input', function () {
    var words = box.value.toLowerCase().split(/\\s+/).filter(Boolean);
    var shown = 0;
    table.querySelectorAll('tbody tr').forEach(function (row) {
      var text = row.textContent.toLowerCase();
      var hit = words.every(function (w) { return text.indexOf(w) >= 0; });
      row.hidden = !hit;
      if (hit) { shown += 1; }
    });
    count.textContent = shown + ' shown';
  });
});
"""


#: Tables whose rows become blocks on a narrow screen (a long method text needs the width).
STACKED = {"sheet-table", "checks-table", "rules-table"}


def e(text: object) -> str:
    """Escape for HTML text and attribute values."""
    return escape(str(text), quote=True)


def _json_script(element_id: str, data: object) -> str:
    """Data as an inert JSON block, with every '<', '>' and '&' escaped so that no text in it
    can close the element."""
    text = json.dumps(data, allow_nan=False, default=str)
    text = text.replace("<", "\\u003c").replace(">", "\\u003e").replace("&", "\\u0026")
    return f'<script type="application/json" id="{e(element_id)}">{text}</script>'


def page_head(title: str) -> str:
    return (
        '<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8">'
        '<meta name="viewport" content="width=device-width, initial-scale=1">'
        f'<meta http-equiv="Content-Security-Policy" content="{CSP}">'
        f'<meta name="generator" content="emgate {e(__version__)}">'
        f"<title>{e(title)}</title><style>{CSS}</style></head><body>"
    )


def html_table(
    header: Iterable[str],
    rows: Iterable[Iterable[str]],
    table_id: str = "",
    row_class: Iterable[str] | None = None,
) -> str:
    """A table of already escaped cells (a cell starting '<td' is taken as written)."""
    ident = f' id="{e(table_id)}"' if table_id else ""
    if table_id in STACKED:
        ident += ' class="stack"'

    head = "".join(f'<th scope="col">{h}</th>' for h in header)
    classes = list(row_class) if row_class is not None else None
    body = []
    for i, row in enumerate(rows):
        cls = f' class="{classes[i]}"' if classes and classes[i] else ""
        cells = "".join(c if c.startswith(("<td", "<th")) else f"<td>{c}</td>" for c in row)
        body.append(f"<tr{cls}>{cells}</tr>")
    return (
        f'<div class="scroll"><table{ident}><thead><tr>{head}</tr></thead>'
        f"<tbody>{''.join(body)}</tbody></table></div>"
    )


def _side(side: str) -> str:
    """A coil side as a cell: its letter carries the phase, a class lets the style tint it."""
    letter = side.lstrip("+-")[:1]
    return f'<td class="side ph-{e(letter)}">{e(side)}</td>'


def num_cell(text: str) -> str:
    return f'<td class="num">{text}</td>'


def _figure(plots: dict[str, str], name: str, caption: str) -> str:
    svg = plots.get(name)
    if not svg:
        return ""
    return f'<figure data-figure="{e(name)}">{svg}<figcaption>{e(caption)}</figcaption></figure>'


def _margin(c: CheckRow) -> str:
    if math.isfinite(c.margin):
        return f"{100 * c.margin:+.1f} %"
    return "inside (limit 0)" if c.passed else "beyond (limit 0)"


def check_rows(checks: list[CheckRow]) -> tuple[list[list[str]], list[str]]:
    rows, classes = [], []
    for c in checks:
        if c.passed:
            status = '<span class="tag pass">pass</span>'
        else:
            word = f"fail ({c.severity})" if c.severity else "fail"
            status = f'<span class="tag fail">{e(word)}{" waived" if c.waived else ""}</span>'
        rows.append(
            [
                status,
                f'<td class="name">{e(c.rule)}</td>',
                f'{e(c.label)}<br><span class="meta">{e(c.quantity)} · {e(c.record_path)}</span>',
                num_cell(e(c.display)),
                num_cell(e(_margin(c))),
                e(c.basis) or '<span class="meta">(none given)</span>',
            ]
        )
        classes.append("" if c.passed else "fail")
    return rows, classes


def render_page(page: PageData, plots: dict[str, str]) -> str:
    """The sheet of one record as one HTML document."""
    p = page
    verdict = VERDICT.get(p.verdict, "?")
    cls = "pass" if p.verdict == 0 else "fail"
    out = [page_head(f"emgate sheet: {p.record_id}: {p.title}")]
    out.append(
        f'<header><p class="meta">emgate calculation sheet</p><h1>{e(p.title)}</h1>'
        f'<p class="meta">record <b>{e(p.record_id)}</b> · {e(p.file)} ·'
        f" emgate {e(__version__)}</p>"
        f'<p><span class="verdict {cls}" id="verdict">{e(verdict)}</span></p>'
        f'<p class="caution">{e(DISCLAIMER)}</p></header>'
    )
    links = [
        ("checks", "Checks"),
        ("machine", "Lamination and slot"),
        ("winding", "Winding"),
        ("mmf", "MMF"),
        ("steels", "Steels"),
        ("circuit", "Circuit, losses, heat"),
        ("sheet", "Sheet"),
        ("rules", "Rules"),
    ]
    out.append("<nav>" + "".join(f'<a href="#{a}">{e(t)}</a>' for a, t in links) + "</nav>")
    out.append("<main>")
    if p.problems:
        items = "".join(f"<li>{e(x)}</li>" for x in p.problems)
        out.append(f'<div class="problems"><b>Not shown</b><ul>{items}</ul></div>')
    # checks
    out.append('<section id="checks"><h2>Checks</h2>')
    if p.checks:
        out.append(
            _figure(
                plots,
                "margins",
                "Margin of each check to its limit: positive inside,"
                " negative (hatched) beyond; failing checks first.",
            )
        )
        rows, classes = check_rows(p.checks)
        out.append(
            html_table(
                ["status", "rule", "check", "value and limit", "margin", "basis and source"],
                rows,
                "checks-table",
                classes,
            )
        )
    else:
        out.append("<p>No numeric check ran on this record.</p>")
    if p.findings:
        out.append(
            "<h3>Other findings</h3><ul>"
            + "".join(f"<li>{e(f)}</li>" for f in p.findings)
            + "</ul>"
        )
    out.append("</section>")
    # machine
    out.append('<section id="machine"><h2>Lamination and slot</h2>')
    out.append(
        '<dl class="facts">'
        + "".join(f"<dt>{e(k)}</dt><dd>{e(v)}</dd>" for k, v in p.facts)
        + "</dl>"
    )
    out.append(
        _figure(
            plots,
            "section",
            "Stator and rotor of one pole pair, drawn to scale"
            " from the record; each slot shows its coil sides by layer (letters).",
        )
    )
    out.append(
        _figure(
            plots,
            "slot",
            "One stator slot enlarged: the record's dimensions and"
            " the strands as they can lie (bare copper filled, insulation outlined)."
            " The slot fill on the sheet is computed from areas.",
        )
    )
    out.append("</section>")
    # winding
    out.append('<section id="winding"><h2>Winding</h2>')
    if p.winding is not None:
        w = p.winding
        kw = f"{w.winding_factor:.4f}" if w.winding_factor is not None else "not computed"
        out.append(
            f"<p>{w.phases} phases, {w.layers} layer(s), coil pitch {w.coil_pitch} slots,"
            f" {w.slots} slots, {2 * w.pole_pairs} poles; winding factor {e(kw)}; layout"
            f" {e(w.origin)}; it repeats {w.periodicity} time(s) around the bore.</p>"
        )
        names = ["top layer", "bottom layer"] if w.layers == 2 else ["coil side"]
        # Slots run across, one row a layer: a long table stays short and scrolls sideways.
        head = ["slot", *(str(i + 1) for i in range(len(w.table)))]
        rows = [
            [f'<th scope="row">{e(name)}</th>']
            + [_side(row[layer]) if layer < len(row) else "" for row in w.table]
            for layer, name in enumerate(names)
        ]
        out.append(html_table(head, rows, "slot-table"))
        out.append(
            _figure(
                plots,
                "star",
                "Star of slots: each slot's phasor at its electrical"
                " angle, coloured and labelled by its top-layer coil side (solid: go,"
                " dashed: return).",
            )
        )
    out.append("</section>")
    # mmf
    out.append('<section id="mmf"><h2>MMF</h2>')
    if p.mmf is not None:
        out.append(
            _figure(
                plots,
                "mmf",
                "Staircase MMF of the slot layout at rated current,"
                f" conductor current {p.mmf.conductor_current:.4g} A rms, phase A at"
                " its crest; conductors at slot centres; with its working harmonic.",
            )
        )
        out.append(
            _figure(
                plots,
                "spectrum",
                "Exact harmonic amplitudes of the staircase"
                " (slot phasor sums) relative to the working harmonic; orders below"
                " 1 are sub-harmonics (hatched).",
            )
        )
        m = p.mmf
        ref = m.amplitudes[m.working_order - 1] or 1.0
        top = sorted(zip(m.orders, m.amplitudes, strict=True), key=lambda t: -t[1])[:12]
        rows = [
            [
                num_cell(str(n)),
                num_cell(f"{n / m.working_order:.4g}"),
                num_cell(f"{a:.4g}"),
                num_cell(f"{100 * a / ref:.3g} %"),
                "sub-harmonic"
                if n < m.working_order
                else ("working" if n == m.working_order else ""),
            ]
            for n, a in top
        ]
        out.append("<h3>Largest harmonics</h3>")
        out.append(
            html_table(
                ["mechanical order", "relative order", "amplitude, A", "of working", ""],
                rows,
                "harmonics-table",
            )
        )
    out.append("</section>")
    # steels
    out.append('<section id="steels"><h2>Steels</h2>')
    for i, steel in enumerate(p.steels):
        out.append(_figure(plots, f"bh-{i}", f"{steel.name}: {steel.source}"))
        rows = [
            [
                e(wp.part),
                f'<td class="name">{e(wp.quantity)}</td>',
                num_cell(f"{wp.b:.4g} T"),
                num_cell(f"{wp.h:.4g} A/m"),
            ]
            for wp in steel.points
        ]
        out.append(html_table(["part", "sheet name", "B", "H"], rows))
    out.append("</section>")
    # circuit, losses, heat
    out.append('<section id="circuit"><h2>Magnetic circuit, losses, heat</h2>')
    if p.ampere_turns:
        out.append(
            _figure(
                plots,
                "ampere-turns",
                "Ampere-turns per pole of the magnetic circuit by part (yokes: one pole's half).",
            )
        )
    out.append("<h3>Losses</h3>")
    if p.losses:
        out.append(
            html_table(
                ["name", "value", "method"],
                [
                    [f'<td class="name">{e(q.name)}</td>', num_cell(e(q.text)), e(q.method)]
                    for q in p.losses
                ],
            )
        )
    else:
        out.append("<p>No loss is computed for this record.</p>")
    if p.thermal is not None:
        t = p.thermal
        out.append(f"<h3>Thermal network ({e(t.method.replace('_', ' '))})</h3>")
        out.append(
            _figure(
                plots,
                "thermal",
                "Temperature steps along the heat path, from the winding to the coolant.",
            )
        )
        out.append(
            html_table(
                ["link", "resistance", "heat", "rise"],
                [
                    [
                        e(s.name),
                        num_cell(f"{s.resistance:.4g} K/W"),
                        num_cell(f"{s.heat:.4g} W"),
                        num_cell(f"{s.rise:.3g} K"),
                    ]
                    for s in t.steps
                ],
            )
        )
    out.append("</section>")
    # sheet
    out.append('<section id="sheet"><h2>Calculation sheet</h2>')
    for part, grade, source in p.steels_used:
        out.append(f'<p class="meta">{e(part)} steel {e(grade)}: {e(source)}</p>')
    out.append(
        '<p><label for="sheet-search">Search the sheet </label><input type="search"'
        ' id="sheet-search" data-filter="sheet-table" placeholder="name, unit or method">'
        f' <span id="sheet-table-count" class="meta">{len(p.quantities)} shown</span></p>'
    )
    out.append(
        html_table(
            ["name", "value", "method"],
            [
                [f'<td class="name">{e(q.name)}</td>', num_cell(e(q.text)), e(q.method)]
                for q in p.quantities
            ],
            "sheet-table",
        )
    )
    out.append("</section>")
    # rules
    out.append('<section id="rules"><h2>Rules</h2>')
    out.append(
        html_table(
            ["rule", "version", "status", "summary", "origin"],
            [
                [
                    f'<td class="name">{e(r.rule)}</td>',
                    e(r.version),
                    e(r.status.replace("_", " ")),
                    e(r.summary + (f" ({r.message})" if r.message else "")),
                    e(r.origin),
                ]
                for r in p.rules
            ],
            "rules-table",
        )
    )
    out.append("</section></main>")
    out.append(_json_script("plot-data", _plot_data(p)))
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


def render_index(result: RunResult, pages: list[PageData], sheet_name: Callable[[str], str]) -> str:
    """A run's index: the verdict, and every record with its closest check and its sheet."""
    from emgate.report.common import summary_line

    code = result.exit_code
    cls = "pass" if code == 0 else "fail"
    out = [page_head("emgate run")]
    out.append(
        '<header><p class="meta">emgate run</p><h1>Calculation sheets</h1>'
        f'<p><span class="verdict {cls}" id="verdict">{e(VERDICT.get(code, "?"))}</span></p>'
        f"<p>{e(summary_line(result))}</p>"
        f'<p class="caution">{e(DISCLAIMER)}</p></header><main>'
    )
    rows, classes = [], []
    for p in pages:
        closest = p.checks[0] if p.checks else None
        near = (
            "(no numeric check)"
            if closest is None
            else (f"{closest.rule}: {closest.quantity} {_margin(closest)}")
        )
        rows.append(
            [
                f'<td class="name"><a href="{e(sheet_name(p.record_id))}">'
                f"{e(p.record_id)}</a></td>",
                e(p.title),
                e(p.file),
                e(VERDICT.get(p.verdict, "?")),
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
