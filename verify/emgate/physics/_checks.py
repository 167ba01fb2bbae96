"""Argument checks shared by the kernel modules."""

from __future__ import annotations

import math


def check_positive(**values: float) -> None:
    """Raise ValueError naming the first value that is not finite and > 0."""
    for name, value in values.items():
        if not (math.isfinite(value) and value > 0.0):
            raise ValueError(f"{name} must be a finite positive number, got {value!r}")
