"""Plausibility of a whole record: what per-field ranges cannot see.

Each quantity field has its own physically plausible range (:data:`emgate.quantity.PLAUSIBLE`).
Combinations of plausible values can still leave the kernel nothing finite to compute (a
surface that cannot shed the heat at any temperature, a magnetic circuit with no solution).
Such a record is physically absurd input, not a rule crash and not a passed check: every
quantity of the calculation sheet is computed once here, and one that raises or comes out
non-finite is an input error (exit 2) at the record field that drives it. (A steel table's
bounds are checked with the table, in :mod:`emgate.materials`.)
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate.terms import RecordPath

if TYPE_CHECKING:
    from emgate.calc import Calculation
    from emgate.loader import Document
    from emgate.materials import Catalogue
    from emgate.model import AnyDesign

#: Magnitude (SI) beyond which a declared figure is no quantity of a machine: far outside
#: every sheet quantity (a thermal load of 200 A^2/mm^3 is 2e20 SI; a flux of 1 uWb is 1e-6),
#: and small enough that the relative difference with the recomputed value stays finite.
DECLARED_RANGE = (1e-30, 1e30)

#: The record field a sheet quantity mainly depends on, by the quantity's name (longest
#: prefix wins); where the kernel fails, the designer changes this field.
DRIVING_FIELD: dict[str, RecordPath] = {
    "winding.temperature_rise": ("cooling",),
    "winding.back_emf": ("rating", "frequency"),
    "winding.phase_current": ("rating", "line_current"),
    "winding.phase_voltage": ("rating", "line_voltage"),
    "winding.mean_turn_length": ("stator", "stack_length"),
    "winding.copper_loss": ("rating", "line_current"),
    "winding": ("winding",),
    "stator.current_density": ("winding", "conductor"),
    "stator.copper_area": ("winding", "conductor"),
    "stator.slot_fill": ("winding", "conductor"),
    "stator.electric_loading": ("rating", "line_current"),
    "stator.thermal_load": ("rating", "line_current"),
    "stator": ("stator",),
    "rotor.magnet": ("rotor", "magnet"),
    "rotor.field_current_density": ("rotor", "field"),
    "rotor": ("rotor",),
    "air_gap": ("air_gap",),
    "magnetic": ("air_gap",),
}


def driving_field(name: str) -> RecordPath:
    """The record path reported for a sheet quantity that cannot be computed."""
    for prefix in sorted(DRIVING_FIELD, key=len, reverse=True):
        if name == prefix or name.startswith(prefix + "."):
            return DRIVING_FIELD[prefix]
    return ()


def declared_problems(design: AnyDesign) -> list[tuple[RecordPath, str]]:
    """Declared figures of an implausible magnitude (the comparison would not be finite)."""
    from emgate.units import QuantityError, parse_quantity

    out: list[tuple[RecordPath, str]] = []
    low, high = DECLARED_RANGE
    for name, raw in design.declared.items():
        try:
            value = parse_quantity(str(raw)).value
        except QuantityError:
            continue  # the declared-values rule says what is wrong with it
        if value != 0.0 and not low <= abs(value) <= high:
            out.append(
                (
                    ("declared", name),
                    f"declared {name!r} is {value:.4g} in SI units: outside any quantity of a"
                    f" machine ({low:g} to {high:g} in magnitude)",
                )
            )
    return out


def sheet_problems(calc: Calculation) -> list[tuple[RecordPath, str]]:
    """Sheet quantities the kernel cannot compute, or computes as non-finite, from the record.

    A winding that does not balance leaves some quantities undefined; the winding-balance
    rule reports that, so those errors are not input errors here (a non-finite value is).
    The calculation keeps what it computed: the rules read the same values.
    """
    from emgate.calc import SHEET
    from emgate.calc.thermal import ThermalRunaway

    out: list[tuple[RecordPath, str]] = []
    seen: set[RecordPath] = set()
    for name in sorted(SHEET):
        if not calc.applies(name):
            continue
        try:
            value = calc.value(name)
        except ThermalRunaway:
            continue  # an overheating design: the temperature-rise rule's finding
        except (ValueError, ArithmeticError) as exc:
            if _unbalanced(calc):
                continue
            reason = f"the calculation fails ({exc})"
        except Exception:  # emgate's own bug, not the input's: the rule
            continue  # that needs the quantity reports it as its crash (exit 3)
        else:
            if math.isfinite(value):
                continue
            reason = f"it comes out as {value}"
        at = driving_field(name)
        if at in seen:
            continue  # one error per field: the first quantity it breaks
        seen.add(at)
        out.append(
            (
                at,
                f"{name} cannot be computed from this record: {reason}; the inputs"
                " are physically implausible together (check this field and the units)",
            )
        )
    return out


def _unbalanced(calc: Calculation) -> bool:
    from emgate.calc.winding import winding_problems

    try:
        return bool(winding_problems(calc))
    except (ValueError, ArithmeticError):
        return True


def record_problems(calc: Calculation) -> list[tuple[RecordPath, str]]:
    """Every cross-field plausibility problem of a validated record whose steels resolve."""
    return declared_problems(calc.d) or sheet_problems(calc)


def plausible_calculation(doc: Document, design: AnyDesign, catalogue: Catalogue) -> Calculation:
    """The calculation of a validated record whose steels resolve, every sheet quantity
    computed once; InputErrors at the driving fields when the record is implausible. The
    rules read this calculation rather than compute the sheet again."""
    from emgate.calc import Calculation
    from emgate.errors import InputError, InputErrors

    calc = Calculation(design, catalogue)
    if problems := record_problems(calc):
        raise InputErrors([InputError(m, doc.locate(p)) for p, m in problems])
    return calc
