"""Option fields shared by the built-in rules: one limit per machine kind or cooling method."""

from __future__ import annotations

import math
from typing import Annotated, Any

from pydantic import Field, WithJsonSchema

from emgate.quantity import quantity

_PERCENT = r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d{1,3})?\s*%\s*$"


def ratio(sign: str = "positive") -> Any:
    """A dimensionless option that takes 0.45 or '45 %' alike (the schema says both)."""
    schema = {
        "anyOf": [{"type": "number"}, {"type": "string", "pattern": _PERCENT}],
        "description": "a ratio, e.g. 0.45 or '45 %'",
    }
    return Annotated[quantity("dimensionless", sign=sign), WithJsonSchema(schema)]


#: A positive ratio option (a fill, a THD, a tolerance), and one that may be zero.
Ratio = ratio()
RatioOrZero = ratio("non_negative")


def limit(default: float, source: str, **constraints: float) -> Any:
    """An option field whose default limit names its source in the schema and in explain."""
    return Field(default=default, description=f"default from {source}", **constraints)


def basis(options: Any, field: str, default: float, source: str) -> str:
    """Where a limit comes from: the default's source, or the team's configuration.

    A limit the team writes in other units ('45 %', '0.2 mm') may differ from the default
    in the last bit only; that is still the default.
    """
    value = getattr(options, field)
    if value is not None and math.isclose(value, default, rel_tol=1e-12, abs_tol=0.0):
        return source
    return "the team's limit (emgate.yaml)"
