"""pydantic field types for quantities with units.

A field declared ``Length`` takes a string such as "0.45 mm" from the record, checks its
dimension and stores metres; the generated JSON Schema describes the string form, so an editor
offers the same contract as emgate.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Annotated, Any

from pydantic import AfterValidator, BeforeValidator, WithJsonSchema

from emgate.units import DIMENSIONS, QuantityError, convert

_NUMBER_PATTERN = (
    r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d{1,3})?(?![\d.eE])\s*([A-Za-zµΩ°%(]|1\s*/)"
)


def _converter(dimension: str) -> Any:
    def parse(value: Any) -> Any:
        if isinstance(value, str | int | float):
            try:
                return convert(value, dimension)
            except QuantityError as exc:
                raise ValueError(str(exc)) from None
        return value

    return parse


def _positive(value: float) -> float:
    if value <= 0.0:
        raise ValueError("must be greater than zero")
    return value


def _non_negative(value: float) -> float:
    if value < 0.0:
        raise ValueError("must not be negative")
    return value


@dataclass(frozen=True)
class DimensionPattern:
    """The schema's pattern of a quantity field: only its dimension's units, and a sign and
    a zero as the field takes them (a bare 0 needs no unit, except for a temperature).
    Built when a schema is asked for, never on the start-up path of a check."""

    dimension: str
    sign: str

    def __get_pydantic_json_schema__(self, core: Any, handler: Any) -> dict[str, Any]:
        from emgate.unit_patterns import quantity_pattern

        schema = dict(handler(core))
        # a temperature's sign is on the absolute scale: '-20 degC' and '0 degC' are positive
        sign = "any" if self.dimension == "temperature" else self.sign
        text = {"type": "string", "pattern": quantity_pattern(self.dimension, sign)}
        if "anyOf" in schema:  # dimensionless: a number or a text
            schema["anyOf"] = [{"type": "number"}, text]
        elif self.sign == "positive" or self.dimension == "temperature":
            schema |= text
        else:
            schema = {k: v for k, v in schema.items() if k not in ("type", "pattern")}
            schema["anyOf"] = [{"const": 0}, text]
        return schema


def quantity(dimension: str, *, sign: str = "positive") -> Any:
    """An annotated float field holding a quantity of ``dimension`` in SI units.

    Parameters
    ----------
    dimension : str
        A key of :data:`emgate.units.DIMENSIONS`.
    sign : {"positive", "non_negative", "any"}
    """
    _, example = DIMENSIONS[dimension]
    label = dimension.replace("_", " ")
    schema: dict[str, Any]
    if dimension == "dimensionless":  # 0.45, or text with a ratio unit: "45 %"
        schema = {
            "anyOf": [{"type": "number"}, {"type": "string", "pattern": _NUMBER_PATTERN}],
            "description": label,
        }
    else:
        schema = {
            "type": "string",
            "pattern": _NUMBER_PATTERN,
            "description": f"{label} with its unit, e.g. '{example}'",
            "examples": [example],
        }
    checks = {
        "positive": [AfterValidator(_positive)],
        "non_negative": [AfterValidator(_non_negative)],
        "any": [],
    }[sign]
    return Annotated[
        float,
        BeforeValidator(_converter(dimension)),
        *checks,
        WithJsonSchema(schema),
        DimensionPattern(dimension, sign),
    ]


Length = quantity("length")
LengthOrZero = quantity("length", sign="non_negative")
Area = quantity("area")
Frequency = quantity("frequency")
Speed = quantity("speed")
Current = quantity("current")
Voltage = quantity("voltage")
Power = quantity("power")
Temperature = quantity("temperature")
TemperatureDifference = quantity("temperature_difference")
FluxDensity = quantity("flux_density")
FieldStrength = quantity("field_strength")
PerTemperature = quantity("per_temperature", sign="any")
