"""The designer's own figures against the recomputed ones."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field, field_validator

from emgate.calc import SHEET
from emgate.model import AnyDesign
from emgate.rule import Check, Context, Options, Problem, Rule
from emgate.units import (
    QuantityError,
    convert,
    describe,
    format_value,
    parse_quantity,
    parse_unit,
)
from emgate_rules._limits import Ratio, basis
from emgate_rules._winding import UNBALANCED

SOURCE = "common practice, no source"
#: Relative difference allowed between a declared and a recomputed figure.
DEFAULT_TOLERANCE = 0.05


def _unknown_name(name: str, what: str) -> str:
    """'... is not a quantity emgate computes', with the closest sheet name as a hint."""
    import difflib

    close = difflib.get_close_matches(name, list(SHEET), n=1, cutoff=0.6)
    hint = f"; did you mean {close[0]!r}?" if close else ""
    return f"{what} {name!r} is not a quantity emgate computes{hint} (`emgate show` lists them)"


class DeclaredValuesOptions(Options):
    tolerance: Ratio = Field(
        default=DEFAULT_TOLERANCE,
        description=f"relative tolerance, e.g. 0.05 or '5 %' ({SOURCE})",
    )
    tolerances: dict[str, Ratio] = Field(
        default_factory=dict,
        description="per calculation-sheet name, a tolerance overriding `tolerance`",
    )

    @field_validator("tolerances")
    @classmethod
    def _sheet_names(cls, value: dict[str, float]) -> dict[str, float]:
        for name in value:
            if name not in SHEET:
                raise ValueError(_unknown_name(name, "tolerance for"))
        return value


class DeclaredValues(Rule):
    """Each figure of the record's `declared` block agrees with emgate's recomputed value.

    Method: every name in `declared` must be a calculation-sheet name (`emgate show` lists
    them); its value, with a unit of the quantity's dimension, is compared with the value
    emgate recomputed from the raw record: |recomputed - declared| / |declared| must not
    exceed the tolerance (default 5 %, common practice, no source; per name in `tolerances`).
    A name emgate does not compute, or a value of the wrong dimension, is an error: a figure
    nobody checks must not look checked. So is a temperature difference (a quantity in K,
    such as the winding temperature rise) written in degC: '80 degC' is a temperature, not
    a rise. `tolerances` keys must be calculation-sheet names, and every tolerance (0.05 or
    '5 %') must be greater than zero. A declared figure that an unbalanced winding leaves
    undefined (the MMF THD of a winding whose phases do not close) is reported as not
    compared, an error too.
    """

    id = "declared-values"
    summary = "declared figures agree with the recomputed ones"
    tags = ("review",)
    options = DeclaredValuesOptions

    def check(
        self, design: AnyDesign, options: Options, context: Context
    ) -> Iterable[Check | Problem]:
        assert isinstance(options, DeclaredValuesOptions)
        calc = context.calc
        for name, raw in sorted(design.declared.items()):
            at = ("declared", name)
            entry = SHEET.get(name)
            if entry is not None and not calc.applies(name):
                kinds = ", ".join(entry.machines)
                yield Problem(
                    at,
                    f"declared {name!r} is computed for {kinds} machines only,"
                    f" not for this {design.machine} machine",
                )
                continue
            if entry is None:
                yield Problem(at, _unknown_name(name, "declared"))
                continue
            try:
                q = parse_quantity(str(raw))
            except QuantityError as exc:
                yield Problem(at, f"declared {name!r}: {exc}")
                continue
            dims = parse_unit(entry.unit)[1] if entry.unit not in ("", "1") else (0,) * 5
            if q.dims != dims:
                yield Problem(
                    at,
                    f"declared {name!r} is a {describe(q.dims)}; expected a"
                    f" {describe(dims)} such as '1 {entry.unit}'",
                )
                continue
            if entry.unit == "K":
                try:  # a rise written in degC would be read as a temperature, 273 K off
                    convert(str(raw), "temperature_difference")
                except QuantityError as exc:
                    yield Problem(at, f"declared {name!r}: {exc}")
                    continue
            if q.value == 0.0:
                yield Problem(at, f"declared {name!r} is zero; nothing to compare against")
                continue
            try:
                value = calc.value(name)
            except (ValueError, ArithmeticError) as exc:
                if not calc.winding_problems:
                    raise
                yield Problem(at, f"declared {name!r} not compared ({exc}): {UNBALANCED}")
                continue
            unit = entry.unit if entry.unit != "1" else ""
            yield Check(
                name,
                f"{name} recomputed {format_value(value, unit)} against the"
                f" declared {format_value(q.value, unit)}: relative difference",
                at,
                abs(value - q.value) / abs(q.value),
                options.tolerances.get(name, options.tolerance),
                "max",
                "%",
                "the team's tolerance"
                if name in options.tolerances
                else basis(options, "tolerance", DEFAULT_TOLERANCE, "declared-values tolerance"),
            )
