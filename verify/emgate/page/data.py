"""One page gathered from a design record, its calculation and the run's checks.

:mod:`emgate.page.figures` gathers the data of the drawings and plots, :mod:`emgate.page.run`
runs the gate and reads a record's checks from the result. With this module they are the
only modules of :mod:`emgate.page` (and of :mod:`emgate.diff`) that read the calculation
object or the physics kernel: everything they hand on is the plain data of
:mod:`emgate.page.content`, so the plots and the HTML never recompute physics and the diff
compares like with like.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING, Any

from emgate.page import figures
from emgate.page.content import PageData, Quantity
from emgate.page.run import RunView, gather_checks

if TYPE_CHECKING:
    from emgate.findings import RecordResult, RunResult


def gather(
    path: Path,
    result: RunResult | None = None,
    *,
    record: RecordResult | None = None,
    shown_as: str | None = None,
    view: RunView | None = None,
) -> PageData:
    """Gather the page of the design record at ``path``; its checks come from ``result``
    (the record of the run whose file or id matches). InputError(s) when it cannot be read.
    A part of the page the calculation cannot compute is left out and named in
    ``problems``. ``view``: the run indexed once, for the pages of its many records."""
    from emgate.errors import display_path
    from emgate.sheet import load_design, sheet_of

    doc, design, _, calc = load_design(path)  # the sheet computed once, here
    values, steels_used = sheet_of(calc)
    page = PageData(
        file=shown_as or display_path(path),
        record_id=design.id,
        title=design.title,
        machine=design.machine,
        poles=design.poles,
        facts=_facts(design),
        steels_used=steels_used,
        quantities=_quantities(values),
        fields=flatten(doc.data),
    )
    for what, build in (
        ("cross-section", figures.section),
        ("winding", figures.winding),
        ("MMF", figures.mmf),
        ("B-H curves", figures.steels),
        ("magnetic circuit", figures.ampere_turns),
        ("thermal network", figures.thermal),
    ):
        try:
            build(page, design, calc)
        except (ValueError, ArithmeticError) as exc:
            page.problems.append(f"{what}: not computed: {exc}")
    page.losses = [
        q for q in page.quantities if q.name.startswith("losses.") or q.name.endswith("_loss")
    ]
    if result is not None:
        if record is None:
            record = next((r for r in result.records if r.record_id == design.id), None)
        gather_checks(page, view or RunView.of(result), record)
    return page


def flatten(data: Any, prefix: str = "") -> dict[str, str]:
    """A record's plain data as dotted paths to their text ('stator.slot.opening': '2.8 mm')."""
    out: dict[str, str] = {}
    if isinstance(data, dict):
        for key, value in data.items():
            out.update(flatten(value, f"{prefix}.{key}" if prefix else str(key)))
    elif isinstance(data, list):
        for i, value in enumerate(data):
            out.update(flatten(value, f"{prefix}[{i}]"))
    else:
        out[prefix] = str(data)
    return out


def _facts(design: Any) -> list[tuple[str, str]]:
    from emgate.units import format_value

    r = design.rating
    return [
        ("machine", f"{design.machine.replace('_', ' ')}, {design.poles} poles"),
        ("rating", f"{format_value(r.power, 'kW')}, {r.operation}"),
        ("line voltage", f"{format_value(r.line_voltage, 'V')}, {r.connection}"),
        ("line current", format_value(r.line_current, "A")),
        ("frequency", format_value(r.frequency, "Hz")),
        ("speed", format_value(r.speed, "rpm")),
        ("stator", f"{design.stator.slots} slots, {design.stator.steel}"),
        ("winding", f"{design.winding.phases} phases, {design.winding.layers} layer(s)"),
        ("cooling", design.cooling.method.replace("_", " ") + f" {design.cooling.code or ''}"),
    ]


def _quantities(values: dict[str, tuple[float | None, str, str, str]]) -> list[Quantity]:
    from emgate.units import format_value

    out = []
    for name in sorted(values):
        value, unit, method, err = values[name]
        shown = err if value is None else format_value(value, "" if unit == "1" else unit, 5)
        out.append(Quantity(name, value, unit, method, shown, err))
    return out
