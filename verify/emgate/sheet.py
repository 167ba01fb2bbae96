"""``emgate show``: the calculation sheet of one design, for design review."""

from __future__ import annotations

import json
import math
import sys
from pathlib import Path
from typing import Any

from emgate import __version__
from emgate.errors import InputError, InputErrors, display_path
from emgate.findings import DISCLAIMER
from emgate.report.common import one_line
from emgate.terms import DESIGN_SCHEMA, EXIT_INPUT, EXIT_OK
from emgate.units import si_unit


def load_design(path: Path) -> tuple[Any, Any, Any, Any]:
    """One design record, validated, with the steel catalogue of its repository resolved:
    (document, design, catalogue, calculation), the calculation with every sheet quantity
    computed once by the plausibility pass; InputError(s) when it cannot be read."""
    from emgate.discovery import discover_materials
    from emgate.loader import load
    from emgate.plausible import plausible_calculation
    from emgate.validate import schema_of, validate_design

    doc = load(path)
    kind = schema_of(doc)
    if kind != DESIGN_SCHEMA:
        raise InputError(f"expected a design record, found a {kind} file", doc.locate(()))
    design = validate_design(doc)
    catalogue = discover_materials(path)
    catalogue.resolve(doc, design)
    calc = plausible_calculation(doc, design, catalogue)  # show refuses what the gate refuses
    return doc, design, catalogue, calc


def sheet_values(
    path: Path,
) -> tuple[Any, dict[str, tuple[float | None, str, str, str]], list[tuple[str, str, str]]]:
    """Load one design (with the materials files of its repository) and compute its sheet.

    Returns the design; per quantity name (SI value or None, unit, method, error text); and
    the steels it uses as (part, grade, origin of the curve).
    """
    _, design, _, calc = load_design(path)
    values, steels = sheet_of(calc)
    return design, values, steels


def sheet_of(
    calc: Any,
) -> tuple[dict[str, tuple[float | None, str, str, str]], list[tuple[str, str, str]]]:
    """The sheet of a calculation (the values it computed already are not computed again):
    per quantity name (SI value or None, unit, method, error text), and the steels it uses
    as (part, grade, origin of the curve)."""
    from emgate.calc import SHEET

    design, catalogue = calc.d, calc.catalogue
    out: dict[str, tuple[float | None, str, str, str]] = {}
    for name, entry in SHEET.items():
        if not calc.applies(name):
            continue
        try:
            value: float | None = calc.value(name)
            error = ""
        except (ValueError, ArithmeticError) as exc:
            value, error = None, f"not computed: {exc}"
        if value is not None and math.isnan(value) and entry.nan_is_answer:
            pass  # the model's own answer: no such operating point (the method says when)
        elif value is not None and not math.isfinite(value):  # never a silent null
            value, error = None, f"not computed: the value is not finite ({value})"
        out[name] = (value, entry.unit, entry.method, error)
    grades = [("stator", design.stator.steel)]
    if design.rotor.steel and design.rotor.steel != design.stator.steel:
        grades.append(("rotor", design.rotor.steel))
    steels = [(part, name, catalogue.get(name).source) for part, name in grades]
    return out, steels


def show(path: Path, fmt: str) -> int:
    try:
        design, values, steels = sheet_values(path)
    except (InputError, InputErrors) as exc:
        errors = exc.errors if isinstance(exc, InputErrors) else [exc]
        for err in errors:
            print(one_line(str(err)), file=sys.stderr)
        return EXIT_INPUT
    status = EXIT_INPUT if any(err for *_, err in values.values()) else EXIT_OK
    if fmt == "json":
        doc = {
            "tool": {"name": "emgate", "version": __version__},
            "file": display_path(path),
            "record_id": design.id,
            "machine": design.machine,
            "steels": {name: {"part": part, "source": src} for part, name, src in steels},
            "quantities": {
                name: {
                    "value": v if v is not None and math.isfinite(v) else None,
                    "unit": si_unit(unit),
                    "method": method,
                    **({"error": err} if err else {}),
                }
                for name, (v, unit, method, err) in sorted(values.items())
            },
            "notice": DISCLAIMER,
        }
        sys.stdout.write(json.dumps(doc, indent=2) + "\n")
        return status
    from emgate.units import format_value

    def say(line: str = "") -> None:  # every line escaped: a title cannot drive a terminal
        sys.stdout.write(one_line(line) + "\n")

    say(f"{design.id}: {design.title} ({design.machine}, {design.poles} poles)")
    say(f"file: {display_path(path)}")
    for part, name, source in steels:
        say(f"{part} steel {name}: {source}")
    say()
    width = max(len(n) for n in values)
    group = ""
    for name in sorted(values):
        value, unit, method, problem = values[name]
        head = name.split(".")[0]
        if head != group:
            say(f"[{head}]")
            group = head
        if value is None:
            shown = problem
        elif math.isnan(value):  # an entry whose NaN is an answer
            shown = "none (see method)"
        else:
            shown = format_value(value, "" if unit == "1" else unit, 5)
        say(f"  {name:<{width}}  {shown:>16}   {method}")
    say()
    say(DISCLAIMER)
    return status
