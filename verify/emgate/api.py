"""The public API of emgate for rule packs: everything a rule author needs, in one module.

A pack imports from here only; every other module of emgate is internal and may change
between versions. A rule::

    from emgate.api import Check, Context, FluxDensity, Options, Problem, Rule, hookimpl, limit

    class PoleBodyOptions(Options):
        maximum: FluxDensity = limit(1.9, "T", "acme design manual, table 4")

    class PoleBody(Rule[PoleBodyOptions]):
        "Pole-body flux density ... (the method, shown by `emgate explain`)."
        id = "acme/pole-body"
        ...
        def check(self, design, options, context):
            yield context.check("rotor.pole_body_flux_density", options.limit_for("maximum"),
                                "max", path=("rotor", "pole", "body_width"))

    @hookimpl
    def emgate_rules():
        return [PoleBody]

Rules read the calculation through ``context.sheet``, a read-only mapping of the sheet names
that ``emgate show`` prints; they never see the mutable calculation.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import TYPE_CHECKING, Any

from emgate.calc.names import Entry
from emgate.calc.view import NotComputed, Sheet
from emgate.geometry import magnet_rotor
from emgate.hookspecs import hookimpl
from emgate.model import (
    MACHINE_KINDS,
    AnyDesign,
    InductionDesign,
    SalientFieldDesign,
    SurfacePMDesign,
)
from emgate.quantity import (
    Area,
    Current,
    FieldStrength,
    FluxDensity,
    Frequency,
    Length,
    LengthOrZero,
    PerTemperature,
    Power,
    Speed,
    Temperature,
    TemperatureDifference,
    Voltage,
    quantity,
)
from emgate.rule import (
    TEAM_LIMIT,
    Bound,
    Check,
    Context,
    Limit,
    Options,
    Problem,
    Rule,
    limit,
    winding_path,
)
from emgate.terms import SEVERITIES, RecordPath, Severity
from emgate.units import format_value

__all__ = [
    "MACHINE_KINDS",
    "SEVERITIES",
    "TEAM_LIMIT",
    "AnyDesign",
    "Area",
    "Bound",
    "Check",
    "Context",
    "Current",
    "Entry",
    "FieldStrength",
    "FluxDensity",
    "Frequency",
    "InductionDesign",
    "Length",
    "LengthOrZero",
    "Limit",
    "NotComputed",
    "Options",
    "PerTemperature",
    "Power",
    "Problem",
    "Ratio",
    "RatioOrZero",
    "RecordPath",
    "Rule",
    "SalientFieldDesign",
    "Severity",
    "Sheet",
    "Speed",
    "SurfacePMDesign",
    "Temperature",
    "TemperatureDifference",
    "Voltage",
    "efficiency_scope",
    "format_value",
    "hookimpl",
    "limit",
    "loss_reference_temperature",
    "magnet_rotor",
    "nominal_efficiency",
    "quantity",
    "ratio",
    "rise_limit_allowance",
    "temperature_rise_limit",
    "tolerance_findings",
    "winding_path",
]


def temperature_rise_limit(insulation_class: str) -> float:
    """IEC 60034-1 winding temperature-rise limit by resistance [K] for a thermal class
    ('B', 'F', 'H'); ValueError for a class without a tabulated limit."""
    from emgate.physics.insulation import temperature_rise_limit as lookup

    return lookup(insulation_class)


def tolerance_findings(design: AnyDesign, context: Context, **how: Any) -> Iterator[Any]:
    """(record path, message) of every rule failing across the record's tolerances
    (``emgate.tolerances``: worst corner or Monte Carlo, ``how`` its options)."""
    from emgate.tolerances import tolerance_findings as judge

    return judge(design, context, **how)


def rise_limit_allowance(rated_output: float, *, totally_enclosed_fanless: bool) -> float:
    """Increase of the IEC 60034-1 rise limit [K] for machines below 600 W and totally
    enclosed fanless ones (5 K; from memory)."""
    from emgate.physics.insulation import rise_limit_allowance as allowance

    return allowance(rated_output, totally_enclosed_fanless=totally_enclosed_fanless)


def loss_reference_temperature(insulation_class: str) -> float:
    """Reference winding temperature [K] of a thermal class for losses and efficiency (IEC
    60034-2-1); ValueError where not held."""
    from emgate.physics.insulation import reference_temperature

    return reference_temperature(insulation_class)


def nominal_efficiency(
    efficiency_class: str, rated_power: float, poles: int, frequency: float
) -> float:
    """IEC 60034-30-1 nominal efficiency [-] of a class at a rated power [W] (table from
    memory); ValueError outside the standard's scope."""
    from emgate.physics.efficiency_classes import nominal_efficiency as lookup

    return lookup(efficiency_class, rated_power, poles, frequency)


def efficiency_scope(rated_power: float, poles: int, frequency: float) -> str | None:
    """Why IEC 60034-30-1 does not cover a motor of this rating, or None."""
    from emgate.physics.efficiency_classes import out_of_scope

    return out_of_scope(rated_power, poles, frequency)


_PERCENT = r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d{1,3})?\s*%\s*$"


def ratio(sign: str = "positive") -> object:
    """A dimensionless option type that takes 0.45 or '45 %' alike (the schema says both)."""
    from typing import Annotated

    from pydantic import WithJsonSchema

    schema = {
        "anyOf": [{"type": "number"}, {"type": "string", "pattern": _PERCENT}],
        "description": "a ratio, e.g. 0.45 or '45 %'",
    }
    return Annotated[float, quantity("dimensionless", sign=sign), WithJsonSchema(schema)]


if TYPE_CHECKING:  # to a type checker both are floats; pydantic sees the validators
    Ratio = float
    RatioOrZero = float
else:
    #: A positive ratio option (a fill, a THD, a tolerance), and one that may be zero.
    Ratio = ratio()
    RatioOrZero = ratio("non_negative")
