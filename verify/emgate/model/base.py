"""What every record model shares: unknown keys are errors, numbers are not read from text,
and the constrained strings and fractions of several parts."""

from __future__ import annotations

from functools import cache
from typing import Annotated, Any, Literal, get_args, get_origin

from pydantic import BaseModel, ConfigDict, Field, StringConstraints, model_validator

Slug = Annotated[str, StringConstraints(pattern=r"^[a-z0-9][a-z0-9._-]{0,63}$")]
#: A share of a pitch or a length: below 1 % no machine is built, and a share that small only
#: divides the kernel by nearly zero (common practice, no source).
Fraction = Annotated[float, Field(ge=0.01, le=1.0)]


class Strict(BaseModel):
    """Unknown keys are errors; numbers are not read from quoted text."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True, defer_build=True)

    @model_validator(mode="before")
    @classmethod
    def _whole_numbers(cls, data: Any) -> Any:
        """21.0 is the whole number 21, as JSON Schema (and so every editor) counts it: a
        whole-number field takes it, and 21.5 stays an error."""
        if not isinstance(data, dict):
            return data
        out = data
        for key in _whole_keys(cls):
            value = data.get(key)
            if isinstance(value, float) and value.is_integer():
                if out is data:
                    out = dict(data)
                out[key] = int(value)
        return out


@cache
def _whole_keys(cls: type[BaseModel]) -> tuple[str, ...]:
    """The keys of a model's whole-number fields."""
    return tuple(
        info.alias or name for name, info in cls.model_fields.items() if _whole(info.annotation)
    )


def _whole(annotation: Any) -> bool:
    """A field of whole numbers: int, or a choice of ints (``Literal[1, 2]``)."""
    if annotation is int:
        return True
    args = get_args(annotation)
    return get_origin(annotation) is Literal and all(type(a) is int for a in args)
