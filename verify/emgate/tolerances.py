"""Manufacturing tolerances of a record's fields: ``tolerances:`` in a design record.

Each entry names a field by its dotted record path and gives its tolerance as text:

- ``+-0.05 mm`` (or ``±0.05 mm``): a band from value - 0.05 mm to value + 0.05 mm (uniform
  in a Monte Carlo sample);
- ``+0.02 mm -0.05 mm``: an asymmetric band;
- ``+-3 %``, ``+0 % -3 %``: a band relative to the value;
- ``normal 0.02 mm``, ``normal 1 %``: a normal spread of that standard deviation; its corners
  lie at k standard deviations (the rule's ``sigmas``, default 3).

The tolerance's unit is the field's, or another of the same dimension ('+-50 um' on a length
in mm), or a percentage. The rule ``tolerance-corners`` checks the record at the corners of
its tolerances (or on a Monte Carlo sample) through every other rule.
"""

from __future__ import annotations

import itertools
import re
from collections.abc import Iterator
from dataclasses import dataclass
from typing import Any

from emgate.fields import split_quantity
from emgate.terms import RecordPath

_NUM = r"(\d+(?:\.\d*)?|\.\d+)(?:[eE]([-+]?\d+))?"
_AMOUNT = rf"{_NUM}\s*([^\s+-]*)"
BAND = re.compile(rf"^\s*(?:\+-|±)\s*{_AMOUNT}\s*$")
ASYMMETRIC = re.compile(rf"^\s*\+\s*{_AMOUNT}\s+-\s*{_AMOUNT}\s*$")
NORMAL = re.compile(rf"^\s*normal\s+{_AMOUNT}\s*$")
#: The JSON Schema pattern of a tolerance text (the three forms above).
PATTERN = (
    r"^\s*((\+-|±)\s*[0-9.eE+-]+\s*\S*|\+\s*[0-9.eE+-]+\s*\S*\s+-\s*[0-9.eE+-]+\s*\S*"
    r"|normal\s+[0-9.eE+-]+\s*\S*)\s*$"
)


class ToleranceError(ValueError):
    pass


@dataclass(frozen=True)
class Tolerance:
    """A parsed tolerance: amounts below and above the value (or the standard deviation of
    a normal spread), in ``unit`` ('%' for relative)."""

    minus: float
    plus: float
    unit: str
    normal: bool = False


def _amount(number: str, exponent: str | None, unit: str) -> tuple[float, str]:
    value = float(number) * (10.0 ** int(exponent) if exponent else 1.0)
    return value, unit


def parse_tolerance(text: str) -> Tolerance:
    if m := BAND.match(text):
        v, unit = _amount(*m.groups())
        return Tolerance(v, v, unit)
    if m := ASYMMETRIC.match(text):
        plus, u1 = _amount(*m.groups()[:3])
        minus, u2 = _amount(*m.groups()[3:])
        if u1 != u2:
            raise ToleranceError(f"expected one unit on both sides, found {u1!r} and {u2!r}")
        return Tolerance(minus, plus, u1)
    if m := NORMAL.match(text):
        v, unit = _amount(*m.groups())
        return Tolerance(v, v, unit, normal=True)
    raise ToleranceError(
        f"expected '+-0.05 mm', '+0.02 mm -0.05 mm', '+-3 %' or 'normal 0.02 mm', found {text!r}"
    )


def in_field_unit(tol: Tolerance, value: float, unit: str) -> tuple[float, float]:
    """The tolerance's (minus, plus) in the unit of the field whose number is ``value``."""
    if tol.unit == "%":
        return abs(value) * tol.minus / 100.0, abs(value) * tol.plus / 100.0
    if tol.unit == unit:
        return tol.minus, tol.plus
    from emgate.units import QuantityError, parse_unit

    try:
        f_tol, d_tol = parse_unit(tol.unit) if tol.unit else (1.0, None)
        f_field, d_field = parse_unit(unit) if unit else (1.0, None)
    except QuantityError as exc:
        raise ToleranceError(str(exc)) from None
    if d_tol != d_field:
        raise ToleranceError(
            f"the tolerance is in {tol.unit or 'a bare number'!r}, the field in"
            f" {unit or 'a bare number'!r}: give it in the field's unit or in %"
        )
    k = f_tol / f_field
    return tol.minus * k, tol.plus * k


def field_number(value: Any) -> tuple[float, str]:
    """A field's value as (number, unit) for a tolerance on it (ToleranceError if it has none)."""
    q = split_quantity(value)
    if q is None:
        raise ToleranceError(f"a tolerance needs a number, and the field holds {value!r}")
    return q


# ---------------------------------------------------------------- judging a record


@dataclass(frozen=True)
class _Field:
    key: str
    path: tuple[str | int, ...]
    value: float
    unit: str
    minus: float
    plus: float
    normal: bool
    like: Any

    def at(self, number: float) -> Any:
        from emgate.fields import record_value

        return record_value(float(f"{number:.12g}"), self.unit, self.like)


def _text(fields: list[_Field], changes: dict[tuple[str | int, ...], Any]) -> str:
    return ", ".join(f"{f.key} = {changes[f.path]}" for f in fields)


def tolerance_findings(
    design: Any,
    context: Any,
    *,
    mode: str = "worst_corner",
    sigmas: float = 3.0,
    samples: int = 1000,
    percentile: float = 99.0,
    seed: int = 0,
    max_fields: int = 10,
) -> Iterator[tuple[RecordPath, str]]:
    """Findings (record path, message) of the record across its tolerances: every other
    rule at each corner (``worst_corner``) or on a seeded sample (``monte_carlo``), through
    ``context.variants``. The method is the rule ``tolerance-corners``'s."""
    from emgate.fields import dotted_path

    variants = context.variants
    if variants is None:
        yield ("tolerances",), "the tolerance corners are checked in a run only"
        return
    fields: list[_Field] = []
    for key, text in design.tolerances.items():
        path = dotted_path(key)
        try:
            like = variants.raw(path)
            number, unit = field_number(like)
            tol = parse_tolerance(text)
            minus, plus = in_field_unit(tol, number, unit)
        except KeyError:
            yield ("tolerances", key), f"the record has no field {key!r}"
            continue
        except ToleranceError as exc:
            yield ("tolerances", key), str(exc)
            continue
        fields.append(_Field(key, path, number, unit, minus, plus, tol.normal, like))
    if len(fields) != len(design.tolerances) or not fields:
        return
    if mode == "worst_corner":
        yield from _corners(fields, sigmas, max_fields, variants)
    else:
        yield from _monte_carlo(fields, samples, percentile, seed, variants)


def _corners(
    fields: list[_Field], sigmas: float, max_fields: int, variants: Any
) -> Iterator[tuple[RecordPath, str]]:
    at = ("tolerances", fields[0].key)
    if len(fields) > max_fields:
        yield (
            at,
            f"{len(fields)} toleranced fields give {2 ** len(fields)} corners, more than"
            f" max_fields = {max_fields} allows: use mode monte_carlo",
        )
        return
    k = sigmas
    ends = [
        (
            f.at(f.value - f.minus * (k if f.normal else 1)),
            f.at(f.value + f.plus * (k if f.normal else 1)),
        )
        for f in fields
    ]
    worst: dict[str, tuple[float, str, str]] = {}
    failing: dict[str, int] = {}
    total = 0
    for combo in itertools.product(*ends):
        changes = {f.path: v for f, v in zip(fields, combo, strict=True)}
        total += 1
        result = variants.evaluate(changes, sheet=False)
        where = _text(fields, changes)
        if result.invalid:
            yield (at, f"the corner {where} is not a valid record: {result.invalid}")
            continue
        for rid, verdict in result.rules.items():
            if verdict.status in ("fail", "crash"):
                failing[rid] = failing.get(rid, 0) + 1
                margin = verdict.margin if verdict.margin is not None else float("-inf")
                if rid not in worst or margin < worst[rid][0]:
                    worst[rid] = (margin, where, verdict.message)
    for rid, (_, where, message) in sorted(worst.items()):
        yield (
            at,
            f"{rid} fails at the corner {where}: {message} ({failing[rid]} of {total}"
            " corners fail)",
        )


def _monte_carlo(
    fields: list[_Field], samples: int, percentile: float, seed: int, variants: Any
) -> Iterator[tuple[RecordPath, str]]:
    import numpy as np

    at = ("tolerances", fields[0].key)
    rng = np.random.default_rng(seed)
    passed = 0
    worst: tuple[float, str, str, str] | None = None
    for _ in range(samples):
        changes = {}
        for f in fields:
            if f.normal:
                changes[f.path] = f.at(f.value + rng.normal(0.0, f.plus))
            else:
                changes[f.path] = f.at(rng.uniform(f.value - f.minus, f.value + f.plus))
        result = variants.evaluate(changes, sheet=False)
        if result.feasible:
            passed += 1
            continue
        if result.invalid:
            score, rid, message = float("-inf"), "validation", result.invalid
        else:
            bad = [
                (v.margin if v.margin is not None else float("-inf"), r, v.message)
                for r, v in result.rules.items()
                if v.status in ("fail", "crash")
            ]
            score, rid, message = min(bad)
        if worst is None or score < worst[0]:
            worst = (score, _text(fields, changes), rid, message)
    share = 100.0 * passed / samples
    if share < percentile and worst is not None:
        yield (
            at,
            f"{share:.1f} % of {samples} samples pass every rule,"
            f" {percentile:g} % required; the worst sample, {worst[1]}: {worst[2]}"
            f" fails: {worst[3]}",
        )
