"""The spec of ``emgate sweep`` and the variants it makes of a record.

The spec (YAML)::

    sample: grid            # or random (then: count, seed)
    fields:
      air_gap: {from: 0.35 mm, to: 0.65 mm, steps: 7}      # evenly spaced, ends included
      winding.turns_per_coil: {from: 17, to: 25, step: 1}  # whole numbers stay whole
      stator.steel: [M400-50A, M270-35A]                   # a list of values

A random sample draws each range uniformly (whole numbers for whole-number ends) and each list
evenly; variant ``i`` is drawn from its own seeded stream, so the sample does not depend on
how it is cut into chunks or where they run.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from emgate.errors import InputError, InputErrors
from emgate.fields import dotted_path, get_field, record_value, split_quantity
from emgate.loader import Document

MAX_VARIANTS = 100_000_000


@dataclass(frozen=True)
class Axis:
    """One swept field: a range (numbers in the unit ``unit``) or a list of record values."""

    name: str
    path: tuple[str | int, ...]
    values: tuple[Any, ...] = ()  # a list, or the grid points of a range
    low: float = 0.0
    high: float = 0.0
    unit: str = ""
    whole: bool = False
    is_range: bool = False
    like: Any = None  # the record's own value (its form: text with a unit, int, float)

    def record(self, number_or_value: Any) -> Any:
        if self.is_range:
            return record_value(number_or_value, self.unit, self.like)
        return number_or_value


@dataclass(frozen=True)
class Spec:
    axes: tuple[Axis, ...]
    sample: str = "grid"
    count: int = 0
    seed: int = 0

    @property
    def size(self) -> int:
        if self.sample == "random":
            return self.count
        return math.prod(len(a.values) for a in self.axes)

    def indices(self, i: int) -> tuple[int, ...]:
        """Grid variant ``i``: the index of each field's value."""
        out = []
        for axis in reversed(self.axes):  # the last field varies fastest
            i, k = divmod(i, len(axis.values))
            out.append(k)
        return tuple(reversed(out))

    def variant(self, i: int) -> dict[tuple[str | int, ...], Any]:
        """Variant ``i``: the record value of each swept field."""
        out: dict[tuple[str | int, ...], Any] = {}
        if self.sample == "grid":
            for axis, k in zip(self.axes, self.indices(i), strict=True):
                out[axis.path] = axis.record(axis.values[k])
            return out
        import numpy as np

        rng = np.random.default_rng([self.seed, i])
        for axis in self.axes:
            if not axis.is_range:
                out[axis.path] = axis.values[int(rng.integers(len(axis.values)))]
            elif axis.whole:
                out[axis.path] = axis.record(float(rng.integers(int(axis.low), int(axis.high) + 1)))
            else:
                out[axis.path] = axis.record(float(rng.uniform(axis.low, axis.high)))
        return out


def _spec_error(doc: Document, path: tuple[str | int, ...], message: str) -> InputError:
    return InputError(message, doc.locate(path))


def parse_spec(spec_doc: Document, record: Document) -> Spec:
    """The sweep of a spec document over a record (InputErrors, located, on a bad spec)."""
    data = spec_doc.data
    errors: list[InputError] = []
    if not isinstance(data, dict):
        raise InputErrors([_spec_error(spec_doc, (), "expected a mapping with 'fields'")])
    # no `schema:` key: a spec kept in a design repository is no record for `emgate check`
    known = {"sample", "count", "seed", "fields"}
    for key in data:
        if key not in known:
            errors.append(
                _spec_error(spec_doc, (key,), f"unknown key {key!r}; expected {sorted(known)}")
            )
    sample = data.get("sample", "grid")
    if sample not in ("grid", "random"):
        errors.append(_spec_error(spec_doc, ("sample",), "expected 'grid' or 'random'"))
    count, seed = data.get("count", 1000), data.get("seed", 0)
    for key, value in (("count", count), ("seed", seed)):
        if not isinstance(value, int) or isinstance(value, bool) or value < (key == "count"):
            errors.append(_spec_error(spec_doc, (key,), f"expected a whole number for {key}"))
    fields_ = data.get("fields")
    if not isinstance(fields_, dict) or not fields_:
        errors.append(_spec_error(spec_doc, ("fields",), "expected a mapping of record fields"))
        raise InputErrors(errors)
    axes = []
    for name, how in fields_.items():
        at = ("fields", name)
        path = dotted_path(str(name))
        try:
            like = get_field(record.data, path)
        except (KeyError, IndexError, TypeError):
            errors.append(_spec_error(spec_doc, at, f"the record has no field {name!r}"))
            continue
        axis = _axis(spec_doc, at, str(name), path, how, like, sample, errors)
        if axis is not None:
            axes.append(axis)
    if errors:
        raise InputErrors(errors)
    spec = Spec(tuple(axes), sample, int(count), int(seed))
    if spec.size > MAX_VARIANTS:
        raise InputErrors(
            [_spec_error(spec_doc, ("fields",), f"{spec.size} variants; at most {MAX_VARIANTS}")]
        )
    return spec


def _axis(
    doc: Document,
    at: tuple[str | int, ...],
    name: str,
    path: tuple[str | int, ...],
    how: Any,
    like: Any,
    sample: str,
    errors: list[InputError],
) -> Axis | None:
    if isinstance(how, list):
        if not how:
            errors.append(_spec_error(doc, at, "expected at least one value"))
            return None
        return Axis(name, path, tuple(how), like=like)
    if not isinstance(how, dict) or not {"from", "to"} <= set(how):
        errors.append(_spec_error(doc, at, "expected a list, or {from: ..., to: ..., steps: N}"))
        return None
    lo, hi = split_quantity(how["from"]), split_quantity(how["to"])
    if lo is None or hi is None or lo[1] != hi[1] or not lo[0] <= hi[0]:
        errors.append(
            _spec_error(doc, at, "expected from <= to, two numbers in the same unit ('0.4 mm')")
        )
        return None
    own = split_quantity(like)
    if own is None or (own[1] == "") != (lo[1] == ""):
        errors.append(
            _spec_error(doc, at, f"the record's {name} is {like!r}: sweep it with a list")
        )
        return None
    whole = all(isinstance(how[k], int) and not isinstance(how[k], bool) for k in ("from", "to"))
    points: tuple[float, ...] = ()
    if sample == "grid":
        if "steps" in how and isinstance(how["steps"], int) and how["steps"] >= 1:
            n = how["steps"]
            points = tuple(
                lo[0] + (hi[0] - lo[0]) * k / (n - 1) if n > 1 else lo[0] for k in range(n)
            )
        elif "step" in how and (s := split_quantity(how["step"])) is not None and s[0] > 0:
            n = math.floor((hi[0] - lo[0]) / s[0] + 1e-9) + 1
            points = tuple(lo[0] + k * s[0] for k in range(n))
        else:
            errors.append(_spec_error(doc, at, "a grid range needs steps: N (>= 1) or step: X"))
            return None
        # 12 digits: 0.3 mm stays "0.3 mm", not the float sum "0.30000000000000004 mm"
        points = tuple(float(round(p)) if whole else float(f"{p:.12g}") for p in points)
    return Axis(name, path, points, lo[0], hi[0], lo[1], whole, True, like)
