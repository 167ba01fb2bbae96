"""The sections of a record's sheet, one writer each, in page order (:data:`SECTIONS`).

Every text from the record, a rule or a materials file is escaped here with
:func:`~emgate.page.markup.e`; a figure is the plot's SVG text as drawn.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import TYPE_CHECKING

from emgate.page.markup import e, figure, html_table, num_cell

if TYPE_CHECKING:
    from emgate.page.content import CheckRow, PageData


def side_cell(side: str) -> str:
    """A coil side as a cell: its letter carries the phase, a class lets the style tint it."""
    letter = side.lstrip("+-")[:1]
    return f'<td class="side ph-{e(letter)}">{e(side)}</td>'


def margin_text(c: CheckRow) -> str:
    if math.isfinite(c.margin):
        return f"{100 * c.margin:+.1f} %"
    return "inside (limit 0)" if c.passed else "beyond (limit 0)"


def remedy_cell(c: CheckRow, columns: int) -> str:
    """A failing check's remedies as one cell across the table ('' when it has none): each
    the text report's line, escaped."""
    lines = [r.text for r in c.remedies] + ([c.remedy_summary] if c.remedy_summary else [])
    if not lines:
        return ""
    items = "".join(f"<li>{e(line)}</li>" for line in lines)
    return (
        f'<td colspan="{columns}"><span class="meta">what would make it pass (one field'
        f' alone, every rule re-run):</span><ul class="remedies">{items}</ul></td>'
    )


def check_rows(checks: list[CheckRow]) -> tuple[list[list[str]], list[str]]:
    """The checks table's rows, each failing check followed by a row of its remedies."""
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
                num_cell(e(margin_text(c))),
                e(c.basis) or '<span class="meta">(none given)</span>',
            ]
        )
        classes.append("" if c.passed else "fail")
        if cell := remedy_cell(c, len(rows[-1])):
            rows.append([cell])
            classes.append("remedies")
    return rows, classes


def checks(p: PageData, plots: dict[str, str]) -> str:
    """Each check with its margin and remedies, and the findings without a check."""
    out = ['<section id="checks"><h2>Checks</h2>']
    if p.checks:
        out.append(
            figure(
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
    return "".join(out)


def machine(p: PageData, plots: dict[str, str]) -> str:
    """The record's main facts, the cross-section and the slot enlarged."""
    out = ['<section id="machine"><h2>Lamination and slot</h2>']
    out.append(
        '<dl class="facts">'
        + "".join(f"<dt>{e(k)}</dt><dd>{e(v)}</dd>" for k, v in p.facts)
        + "</dl>"
    )
    out.append(
        figure(
            plots,
            "section",
            "Stator and rotor of one pole pair, drawn to scale"
            " from the record; each slot shows its coil sides by layer (letters).",
        )
    )
    out.append(
        figure(
            plots,
            "slot",
            "One stator slot enlarged: the record's dimensions and"
            " the strands as they can lie (bare copper filled, insulation outlined)."
            " The slot fill on the sheet is computed from areas.",
        )
    )
    out.append("</section>")
    return "".join(out)


def winding(p: PageData, plots: dict[str, str]) -> str:
    """The slot table, layer by layer, and the star of slots."""
    out = ['<section id="winding"><h2>Winding</h2>']
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
            + [side_cell(row[layer]) if layer < len(row) else "" for row in w.table]
            for layer, name in enumerate(names)
        ]
        out.append(html_table(head, rows, "slot-table"))
        out.append(
            figure(
                plots,
                "star",
                "Star of slots: each slot's phasor at its electrical"
                " angle, coloured and labelled by its top-layer coil side (solid: go,"
                " dashed: return).",
            )
        )
    out.append("</section>")
    return "".join(out)


def mmf(p: PageData, plots: dict[str, str]) -> str:
    """The MMF staircase, its spectrum and its largest harmonics."""
    out = ['<section id="mmf"><h2>MMF</h2>']
    if p.mmf is not None:
        out.append(
            figure(
                plots,
                "mmf",
                "Staircase MMF of the slot layout at rated current,"
                f" conductor current {p.mmf.conductor_current:.4g} A rms, phase A at"
                " its crest; conductors at slot centres; with its working harmonic.",
            )
        )
        out.append(
            figure(
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
    return "".join(out)


def steels(p: PageData, plots: dict[str, str]) -> str:
    """Each steel's B-H curve with the working points of its parts."""
    out = ['<section id="steels"><h2>Steels</h2>']
    for i, steel in enumerate(p.steels):
        out.append(figure(plots, f"bh-{i}", f"{steel.name}: {steel.source}"))
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
    return "".join(out)


def circuit(p: PageData, plots: dict[str, str]) -> str:
    """The magnetic circuit's ampere-turns, the losses and the thermal network."""
    out = ['<section id="circuit"><h2>Magnetic circuit, losses, heat</h2>']
    if p.ampere_turns:
        out.append(
            figure(
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
            figure(
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
    return "".join(out)


def sheet(p: PageData, plots: dict[str, str]) -> str:
    """Every sheet quantity, searchable, with the steels' sources."""
    out = ['<section id="sheet"><h2>Calculation sheet</h2>']
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
    return "".join(out)


def rules(p: PageData, plots: dict[str, str]) -> str:
    """Every rule that ran, with its version, status and origin."""
    out = ['<section id="rules"><h2>Rules</h2>']
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
    out.append("</section>")
    return "".join(out)


#: The sheet's sections in page order: anchor, the navigation's text, writer.
SECTIONS: tuple[tuple[str, str, Callable[[PageData, dict[str, str]], str]], ...] = (
    ("checks", "Checks", checks),
    ("machine", "Lamination and slot", machine),
    ("winding", "Winding", winding),
    ("mmf", "MMF", mmf),
    ("steels", "Steels", steels),
    ("circuit", "Circuit, losses, heat", circuit),
    ("sheet", "Sheet", sheet),
    ("rules", "Rules", rules),
)
