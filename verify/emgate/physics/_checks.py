"""Argument checks shared by the kernel modules, and the float-or-array convention."""

from __future__ import annotations

import math

import numpy as np

#: A float or an array of floats: the formulas sweep.
Num = float | np.ndarray


def check_positive(**values: float) -> None:
    """Raise ValueError naming the first value that is not finite and > 0."""
    for name, value in values.items():
        if not (math.isfinite(value) and value > 0.0):
            raise ValueError(f"{name} must be a finite positive number, got {value!r}")


def check_all_positive(name: str, *values: object) -> None:
    """Raise ValueError unless every value (float or array) is finite and > 0."""
    for v in values:
        if isinstance(v, float | int):  # a record's own path (numpy's float64 is a float)
            ok = 0.0 < v < math.inf
        else:
            a = np.asarray(v, dtype=float)
            ok = bool(np.all(np.isfinite(a)) and np.all(a > 0.0))
        if not ok:
            raise ValueError(f"{name} must be finite and > 0, got {v!r}")


def check_all_non_negative(name: str, *values: object) -> None:
    """Raise ValueError unless every value (float or array) is finite and >= 0."""
    for v in values:
        if isinstance(v, float | int):
            ok = 0.0 <= v < math.inf
        else:
            a = np.asarray(v, dtype=float)
            ok = bool(np.all(np.isfinite(a)) and np.all(a >= 0.0))
        if not ok:
            raise ValueError(f"{name} must be finite and >= 0, got {v!r}")


def check_positive_fields(obj: object, *names: str) -> None:
    """Raise ValueError naming the first of ``obj``'s fields that is not finite and > 0."""
    for name in names:
        value = getattr(obj, name)
        if not (math.isfinite(value) and value > 0.0):
            raise ValueError(f"{type(obj).__name__}.{name} must be finite and > 0, got {value}")


def float_or_array(value: Num) -> Num:
    """A Python float for scalar inputs (numpy scalars compare to numpy bools), else the array."""
    if isinstance(value, float):  # (numpy's float64 too) without asking numpy
        return float(value)
    return float(value) if np.ndim(value) == 0 else value
