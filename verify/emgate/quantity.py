"""pydantic field types for quantities with units.

A field declared ``Length`` takes a string such as "0.45 mm" from the record, checks its
dimension and stores metres; the generated JSON Schema describes the string form, so an editor
offers the same contract as emgate.
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass
from typing import Annotated, Any

from annotated_types import GroupedMetadata
from pydantic import AfterValidator, BeforeValidator, WithJsonSchema

from emgate.units import DIMENSIONS, QuantityError, convert, si_unit

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


#: Physically plausible magnitudes per dimension, in SI, with the text a message and the
#: schema show: far wider than any machine (a winding wire to a hydro-generator's stator, a
#: milliwatt to a gigawatt), narrow enough that no input overflows or underflows the kernel
#: (a stack of 1e308 m, a frequency of 5e-324 Hz). A value outside is a unit slip or an
#: attack, never a design (common practice, no source). Zero, where a field allows it, is
#: exempt from the lower end.
PLAUSIBLE: dict[str, tuple[float, float, str]] = {
    "length": (1e-6, 100.0, "0.001 mm to 100 m"),
    "area": (1e-12, 100.0, "1e-6 mm^2 to 100 m^2"),
    "frequency": (0.01, 1e5, "0.01 Hz to 100 kHz"),
    "speed": (0.01 / 60.0, 1e6 / 60.0, "0.01 rpm to 1e6 rpm"),
    "current": (1e-3, 1e6, "1 mA to 1000 kA"),
    "voltage": (1e-3, 1e6, "1 mV to 1000 kV"),
    "power": (1e-3, 1e10, "1 mW to 10 GW"),
    "temperature": (1.0, 1273.15, "1 K to 1000 degC"),
    "temperature_difference": (1e-3, 1000.0, "0.001 K to 1000 K"),
    "flux_density": (1e-6, 10.0, "1 uT to 10 T"),
    "field_strength": (1e-3, 1e8, "0.001 A/m to 1e5 kA/m"),
    "per_temperature": (0.0, 0.05, "-5 %/K to 5 %/K"),
    "current_density": (1e3, 1e9, "0.001 A/mm^2 to 1000 A/mm^2"),
    "thermal_load": (1e9, 1e19, "1e-6 A^2/mm^3 to 1e4 A^2/mm^3"),
    "dimensionless": (0.0, 1e3, "-1000 to 1000"),
}


def _plausible(dimension: str) -> Any:
    low, high, text = PLAUSIBLE.get(dimension, (0.0, 1e30, "a magnitude below 1e30 SI"))
    example = DIMENSIONS[dimension][1]  # a figure with its unit, e.g. '0.45 mm'
    unit = "" if dimension == "dimensionless" else " " + si_unit(example.split(" ", 1)[1])

    def check(value: float) -> float:
        if value != 0.0 and not low <= abs(value) <= high:
            raise ValueError(
                f"expected a {dimension.replace('_', ' ')} within the physically plausible"
                f" range {text}, found {value:.4g}{unit}"
            )
        return value

    return AfterValidator(check)


@dataclass(frozen=True)
class Quantity(GroupedMetadata):
    """The metadata of a float field holding a quantity of ``dimension`` in SI units:
    ``Annotated[float, quantity("length")]`` (mypy sees a float; pydantic unpacks the group).

    Parameters
    ----------
    dimension : str
        A key of :data:`emgate.units.DIMENSIONS`.
    sign : {"positive", "non_negative", "any"}
    """

    dimension: str
    sign: str = "positive"

    def __iter__(self) -> Iterator[object]:
        dimension = self.dimension
        _, example = DIMENSIONS[dimension]
        label = dimension.replace("_", " ")
        # The range goes in the description and, since a field's own description replaces
        # that one, in the standard $comment keyword too.
        plausible = f"plausible range {PLAUSIBLE.get(dimension, (0, 0, 'below 1e30 SI'))[2]}"
        schema: dict[str, Any]
        if dimension == "dimensionless":  # 0.45, or text with a ratio unit: "45 %"
            schema = {
                "anyOf": [{"type": "number"}, {"type": "string", "pattern": _NUMBER_PATTERN}],
                "description": f"{label}; {plausible}",
            }
        else:
            schema = {
                "type": "string",
                "pattern": _NUMBER_PATTERN,
                "description": f"{label} with its unit, e.g. '{example}'; {plausible}",
                "examples": [example],
            }
        schema["$comment"] = plausible
        yield BeforeValidator(_converter(dimension))
        if self.sign == "positive":
            yield AfterValidator(_positive)
        elif self.sign == "non_negative":
            yield AfterValidator(_non_negative)
        elif self.sign != "any":
            raise ValueError(f"unknown sign {self.sign!r}")
        yield _plausible(dimension)
        yield WithJsonSchema(schema)
        yield DimensionPattern(dimension, self.sign)


def quantity(dimension: str, *, sign: str = "positive") -> Quantity:
    """The metadata of a quantity field: ``Annotated[float, quantity("length")]``."""
    if dimension not in DIMENSIONS:
        raise KeyError(dimension)
    return Quantity(dimension, sign)


Length = Annotated[float, quantity("length")]
LengthOrZero = Annotated[float, quantity("length", sign="non_negative")]
Area = Annotated[float, quantity("area")]
Frequency = Annotated[float, quantity("frequency")]
Speed = Annotated[float, quantity("speed")]
Current = Annotated[float, quantity("current")]
Voltage = Annotated[float, quantity("voltage")]
Power = Annotated[float, quantity("power")]
Temperature = Annotated[float, quantity("temperature")]
TemperatureDifference = Annotated[float, quantity("temperature_difference")]
FluxDensity = Annotated[float, quantity("flux_density")]
FieldStrength = Annotated[float, quantity("field_strength")]
PerTemperature = Annotated[float, quantity("per_temperature", sign="any")]
