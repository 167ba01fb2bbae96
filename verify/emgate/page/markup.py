"""The skeleton of every emgate page: head, style, script, and the escaped pieces they share.

No network access, no external script, style or font: the style and the few lines of script
(the sheet table's search) are inline, and a Content-Security-Policy forbids loading
anything else, so a page opens the same from a CI artifact or an e-mail attachment. Every
text that comes from a record, a rule or a materials file is escaped by the page's writers
with :func:`e`; the plots arrive as SVG text from :mod:`emgate.page.plots`, whose text
matplotlib escapes.
"""

from __future__ import annotations

import json
from collections.abc import Iterable
from html import escape

from emgate import __version__

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
tr.remedies td{background:#fdf5f0;border-bottom:1px solid var(--line)}
ul.remedies{margin:2px 0 4px;padding-left:20px;overflow-wrap:anywhere}
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


def json_script(element_id: str, data: object) -> str:
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


def num_cell(text: str) -> str:
    return f'<td class="num">{text}</td>'


def figure(plots: dict[str, str], name: str, caption: str) -> str:
    svg = plots.get(name)
    if not svg:
        return ""
    return f'<figure data-figure="{e(name)}">{svg}<figcaption>{e(caption)}</figcaption></figure>'
