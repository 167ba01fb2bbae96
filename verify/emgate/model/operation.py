"""How a design record is operated: the rating, the cooling, and the losses the team has
measured."""

from __future__ import annotations

from typing import Annotated, Literal

from pydantic import BeforeValidator, Field, StringConstraints, WithJsonSchema

from emgate.model.base import Fraction, Strict
from emgate.quantity import Current, Frequency, Length, Power, Speed, Temperature, Voltage


class Rating(Strict):
    """Rated operating point, as on the nameplate."""

    power: Power = Field(description="rated output power (shaft power of a motor)")
    line_voltage: Voltage = Field(
        description="rated line-to-line voltage at the terminals, rms (for an inverter drive the"
        " fundamental's rms, not the DC bus)"
    )
    line_current: Current = Field(
        description="rated line current, rms, as on the nameplate; the winding's phase current"
        " follows from the connection"
    )
    frequency: Frequency
    speed: Speed = Field(description="rated speed, e.g. '1470 rpm'")
    connection: Literal["star", "delta"]
    operation: Literal["motor", "generator"] = Field(
        default="motor",
        description="what the rating describes: a motor (power is shaft"
        " output) or a generator (power is electrical output, W or VA)",
    )
    power_factor: Fraction | None = Field(
        default=None,
        description="rated power factor, lagging (a generator's field current on load is"
        " computed at it; 0.8 when absent, the usual rating of synchronous generators)",
    )
    max_speed: Speed | None = Field(
        default=None,
        description="highest speed in service (field weakening, overspeed, a load that"
        " drives the machine); the rated speed when absent",
    )
    peak_current: Current | None = Field(
        default=None,
        description="highest phase current the drive can deliver, peak (its current limit);"
        " the fault demagnetisation check uses it instead of the short-circuit current",
    )
    converter_max_phase_voltage: Voltage | None = Field(
        default=None,
        description="highest phase voltage, rms, the converter withstands at its terminals"
        " (a three-phase bridge on a DC link U_dc: U_dc / sqrt 6); the cold magnets' EMF at"
        " the top speed must stay below it",
    )


def _ic_code(value: object) -> object:
    """'ic 411' and 'IC411' are the same code."""
    return value.replace(" ", "").upper() if isinstance(value, str) else value


class Cooling(Strict):
    method: Literal[
        "enclosed_natural", "enclosed_fan", "open_ventilated", "liquid_jacket", "direct_liquid"
    ]
    code: (
        Annotated[
            str,
            BeforeValidator(_ic_code),
            StringConstraints(pattern=r"^IC[0-9A-Z]{2,12}$"),
            # the pattern on the text as written: spaces and lower case are normalised
            WithJsonSchema({"type": "string", "pattern": r"^ *[Ii] *[Cc]( *[0-9A-Za-z]){2,12} *$"}),
        ]
        | None
    ) = Field(
        default=None,
        description="IEC 60034-6 cooling code: 'IC', the circuit arrangement and the coolant's"
        " way of moving, e.g. IC411 (totally enclosed, fan-cooled) or IC01 (open, self-"
        "ventilated)",
        examples=["IC411"],
    )
    ambient: Temperature = Field(description="coolant (ambient air or inlet liquid) temperature")
    ambient_min: Temperature | None = Field(
        default=None,
        description="lowest coolant temperature in service (a cold start); -15 degC when"
        " absent, the lower end of the ambient range of IEC 60034-1",
    )
    fin_area_factor: float = Field(
        default=4.0,
        ge=1.0,
        le=20.0,
        description="air-washed frame area over the bare cylinder of the frame: 1 for a smooth"
        " frame; a finned cast frame wets 3 to 5 times it (default 4; common practice, no"
        " source)",
    )
    frame_length: Length | None = Field(
        default=None,
        description="axial length of the cooled frame; 1.5 stack lengths when"
        " absent (frame with end shields; common practice, no source)",
    )
    core_area_factor: float = Field(
        default=3.0,
        ge=1.0,
        le=20.0,
        description="open machines: air-washed core area (bore, back, ends, ducts) over the"
        " core back (default 3; common practice, no source)",
    )


class MeasuredLosses(Strict):
    """Losses the team has measured (or otherwise established) that replace emgate's
    estimate of the same loss."""

    stray_load: Power | None = Field(
        default=None,
        description="additional load losses measured by IEC 60034-2-1 (otherwise its assigned"
        " allowance)",
    )
    friction_windage: Power | None = Field(
        default=None, description="friction and windage, measured (otherwise an estimate)"
    )
    magnet_eddy: Power | None = Field(
        default=None,
        description="surface-magnet eddy loss (otherwise an estimate from the MMF harmonics)",
    )
