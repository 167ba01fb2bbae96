"""The designer's own figures against the recomputed ones."""

from __future__ import annotations

from collections.abc import Iterable

from pydantic import Field, field_validator

from emgate.api import (
    AnyDesign,
    Check,
    Context,
    Entry,
    NotComputed,
    Options,
    Problem,
    Ratio,
    Rule,
    Sheet,
    format_value,
    limit,
)

#: Every sheet name, whatever the record (the options are validated before any record).
NAMES: dict[str, Entry] = dict(Sheet.ENTRIES)


def _unknown_name(name: str, what: str) -> str:
    """'... is not a quantity emgate computes', with the closest sheet name as a hint."""
    import difflib

    close = difflib.get_close_matches(name, list(NAMES), n=1, cutoff=0.6)
    hint = f"; did you mean {close[0]!r}?" if close else ""
    return f"{what} {name!r} is not a quantity emgate computes{hint} (`emgate show` lists them)"


class DeclaredValuesOptions(Options):
    #: Relative difference allowed between a declared and a recomputed figure.
    tolerance: Ratio = limit(0.05, "1", "common practice, no source")
    tolerances: dict[str, Ratio] = Field(
        default_factory=dict,
        description="per calculation-sheet name, a tolerance overriding `tolerance`",
    )

    @field_validator("tolerances")
    @classmethod
    def _sheet_names(cls, value: dict[str, float]) -> dict[str, float]:
        for name in value:
            if name not in NAMES:
                raise ValueError(_unknown_name(name, "tolerance for"))
        return value


class DeclaredValues(Rule[DeclaredValuesOptions]):
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

    def check(
        self, design: AnyDesign, options: DeclaredValuesOptions, context: Context
    ) -> Iterable[Check | Problem]:
        sheet = context.sheet
        for name, raw in sorted(design.declared.items()):
            at = ("declared", name)
            entry = NAMES.get(name)
            if entry is None:
                yield Problem(at, _unknown_name(name, "declared"))
                continue
            if design.machine not in entry.machines:
                kinds = ", ".join(entry.machines)
                yield Problem(
                    at,
                    f"declared {name!r} is computed for {kinds} machines only,"
                    f" not for this {design.machine} machine",
                )
                continue
            if name not in sheet:
                yield Problem(
                    at, f"declared {name!r} is computed for {entry.only} only, not for this record"
                )
                continue
            try:
                declared = entry.parse(str(raw))
            except ValueError as exc:
                gap = " " if str(exc).startswith("is a ") else ": "
                yield Problem(at, f"declared {name!r}{gap}{exc}")
                continue
            if declared == 0.0:
                yield Problem(at, f"declared {name!r} is zero; nothing to compare against")
                continue
            try:
                value = sheet[name]
            except NotComputed as exc:
                yield Problem(
                    at, f"declared {name!r} not compared ({exc.reason}): {NotComputed.UNBALANCED}"
                )
                continue
            unit = entry.unit if entry.unit != "1" else ""
            tolerance = options.limit_for("tolerance")
            yield Check(
                name,
                f"{name} recomputed {format_value(value, unit)} against the"
                f" declared {format_value(declared, unit)}: relative difference",
                at,
                abs(value - declared) / abs(declared),
                options.tolerances.get(name, tolerance.value),
                "max",
                "%",
                "the team's tolerance" if name in options.tolerances else tolerance.basis,
            )
