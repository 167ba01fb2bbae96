"""The design record, version 1, as pydantic models.

Every quantity is converted to SI on validation (metres, amperes, kelvin, revolutions per
second); rules read these floats and never the record's text. The models are the one source of
the JSON Schemas in schemas/ (``nox -s schema`` regenerates them).
"""

from __future__ import annotations

import datetime as dt
from typing import Annotated, Any, Literal, get_args, get_origin

from pydantic import (
    AfterValidator,
    BaseModel,
    BeforeValidator,
    ConfigDict,
    Field,
    StringConstraints,
    WithJsonSchema,
    model_validator,
)

from emgate.quantity import (
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
    Voltage,
)

Slug = Annotated[str, StringConstraints(pattern=r"^[a-z0-9][a-z0-9._-]{0,63}$")]
#: A share of a pitch or a length: below 1 % no machine is built, and a share that small only
#: divides the kernel by nearly zero (common practice, no source).
Fraction = Annotated[float, Field(ge=0.01, le=1.0)]


class Strict(BaseModel):
    """Unknown keys are errors; numbers are not read from quoted text."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)

    @model_validator(mode="before")
    @classmethod
    def _whole_numbers(cls, data: Any) -> Any:
        """21.0 is the whole number 21, as JSON Schema (and so every editor) counts it: a
        whole-number field takes it, and 21.5 stays an error."""
        if not isinstance(data, dict):
            return data
        out = dict(data)
        for name, info in cls.model_fields.items():
            key = info.alias or name
            value = out.get(key)
            if isinstance(value, float) and value.is_integer() and _whole(info.annotation):
                out[key] = int(value)
        return out


def _whole(annotation: Any) -> bool:
    """A field of whole numbers: int, or a choice of ints (``Literal[1, 2]``)."""
    if annotation is int:
        return True
    args = get_args(annotation)
    return get_origin(annotation) is Literal and all(type(a) is int for a in args)


# --- shared parts -----------------------------------------------------------------------


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


class SemiClosedSlot(Strict):
    """Trapezoidal semi-closed slot of a random-wound machine, measured from the air gap.

    Opening ``opening`` wide over ``opening_height`` (the tooth tip); a wedge zone
    ``wedge_height`` high widening to ``top_width``; then the winding zone, tapering from
    ``top_width`` to ``bottom_width`` at the slot bottom. ``height`` is the total depth.
    """

    shape: Literal["semi_closed"]
    opening: Length
    opening_height: Length
    wedge_height: LengthOrZero
    top_width: Length
    bottom_width: Length
    height: Length


class OpenSlot(Strict):
    """Open rectangular slot of a form-wound machine: ``width`` wide, ``height`` deep from the
    air gap, with a wedge ``wedge_height`` high at the gap side."""

    shape: Literal["open"]
    width: Length
    height: Length
    wedge_height: LengthOrZero


Slot = Annotated[SemiClosedSlot | OpenSlot, Field(discriminator="shape")]


class Stator(Strict):
    outer_diameter: Length
    bore_diameter: Length
    stack_length: Length
    stacking_factor: float = Field(
        ge=0.5,
        le=1.0,
        description="iron fraction of the stack length, e.g. 0.97 (0.5 to 1; laminated cores"
        " lie between 0.9 and 0.98, common practice, no source)",
    )
    steel: str = Field(
        description="steel grade: a built-in one such as 'M400-50A', or one"
        " defined in the design repository's materials files"
    )
    slots: int = Field(ge=3, le=1000)
    slot: Slot


class RoundConductor(Strict):
    """Round enamelled strands, ``strands`` in hand."""

    shape: Literal["round"]
    strands: int = Field(default=1, ge=1, le=200)
    bare_diameter: Length
    insulated_diameter: Length
    material: Literal["copper", "aluminium"] = "copper"


class RectangularConductor(Strict):
    """Rectangular strands (form-wound coils or field coils), ``strands`` in hand."""

    shape: Literal["rectangular"]
    strands: int = Field(default=1, ge=1, le=200)
    width: Length
    height: Length
    corner_radius: LengthOrZero = Field(default="0 mm", validate_default=True)
    insulated_width: Length
    insulated_height: Length
    material: Literal["copper", "aluminium"] = "copper"


Conductor = Annotated[RoundConductor | RectangularConductor, Field(discriminator="shape")]

SlotEntry = Annotated[
    str,
    StringConstraints(pattern=r"^\s*[-+]?[A-Z](\s+[-+]?[A-Z])?\s*$"),
    Field(description="coil sides in the slot, top layer first: '+A', '+A -C'"),
]


#: IEC 60085 thermal classes by their temperature (a record may name either).
CLASS_BY_TEMPERATURE = {"105": "A", "120": "E", "130": "B", "155": "F", "180": "H"}


def _class_letter(value: object) -> object:
    return CLASS_BY_TEMPERATURE.get(str(value).strip(), value)


class Winding(Strict):
    phases: int = Field(default=3, ge=1, le=12)
    layers: Literal[1, 2]
    coil_pitch: int = Field(ge=1, description="coil span in slot pitches")
    turns_per_coil: int = Field(ge=1, le=10000)
    parallel_paths: int = Field(default=1, ge=1, le=100)
    conductor: Conductor
    insulation_class: Annotated[
        Literal["A", "E", "B", "F", "H"],
        BeforeValidator(_class_letter),
        WithJsonSchema(
            {
                "anyOf": [
                    {"enum": ["A", "E", "B", "F", "H", *CLASS_BY_TEMPERATURE]},
                    {"enum": [int(t) for t in CLASS_BY_TEMPERATURE]},
                ],
                "examples": ["F", 155],
            }
        ),
    ] = Field(
        description="thermal class of IEC 60085, by letter or temperature (105 A, 120 E, 130 B,"
        " 155 F, 180 H: the classes whose IEC 60034-1 rise limits and loss reference"
        " temperatures emgate holds; for 200 (N) and above there is no such data yet)"
    )
    slot_liner: LengthOrZero | None = Field(
        default=None,
        description="slot liner (ground insulation) thickness; 0.25 mm when absent (a"
        " low-voltage random winding's liner; common practice, no source)",
        json_schema_extra={"default": "0.25 mm", "examples": ["0.25 mm", "0.4 mm"]},
    )
    layout: list[SlotEntry] | None = Field(
        default=None,
        description="explicit slot table, one entry per slot from slot 1; otherwise emgate"
        " generates the layout from the star of slots",
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


class Waiver(Strict):
    rule: str
    path: str | None = Field(
        default=None,
        description="record path the waiver covers, e.g."
        " '$.stator.slot'; all of the record when absent",
    )
    reason: Annotated[str, StringConstraints(min_length=10)]
    owner: Annotated[str, StringConstraints(min_length=2)]
    expires: Annotated[
        dt.date, Field(strict=False, description="last day the waiver applies, YYYY-MM-DD")
    ]


class FileWaiver(Waiver):
    """A waiver in the repository's reviewed waivers file: it names its record."""

    record: Slug = Field(description="id of the design record the waiver applies to")


class WaiversFile(Strict):
    schema_: Literal["emgate/waivers@1"] = Field(alias="schema")
    waivers: list[FileWaiver] = Field(default_factory=list)


# --- rotors -----------------------------------------------------------------------------


class EndRing(Strict):
    axial_width: Length
    radial_height: Length


class Bar(Strict):
    width: Length
    height: Length


class Cage(Strict):
    material: Literal["aluminium", "copper"]
    bar: Bar | None = Field(
        default=None, description="fabricated bar section; a cast bar fills its slot"
    )
    end_ring: EndRing


class CageRotor(Strict):
    slots: int = Field(ge=3, le=1000)
    slot: Slot
    inner_diameter: Length = Field(description="inner diameter of the rotor lamination")
    cage: Cage
    steel: str | None = Field(default=None, description="rotor steel; the stator's when absent")


class MagnetMaterial(Strict):
    remanence: FluxDensity = Field(description="remanent flux density at reference_temperature")
    recoil_permeability: float = Field(ge=1.0, le=2.0)
    remanence_temperature_coefficient: PerTemperature = Field(description="e.g. '-0.12 %/K'")
    intrinsic_coercivity: FieldStrength = Field(description="H_cJ at reference_temperature")
    coercivity_temperature_coefficient: PerTemperature = Field(
        default="-0.6 %/K",
        validate_default=True,
        description="temperature coefficient of H_cJ; -0.6 %/K when absent, a sintered"
        " NdFeB's (from memory, manufacturers' data sheets): a ferrite magnet's coercivity"
        " rises with temperature (a positive coefficient, some +0.2 to +0.5 %/K, from"
        " memory), so give its own value",
    )
    reference_temperature: Temperature = Field(
        default="20 degC",
        validate_default=True,
        description="temperature of the remanence and coercivity data",
    )


class Magnet(Strict):
    thickness: Length
    pole_arc: Fraction = Field(description="magnet arc as a fraction of the pole pitch")
    material: MagnetMaterial
    operating_temperature: Temperature | None = Field(
        default=None,
        description="magnet temperature the magnet checks use; when absent, emgate's"
        " estimated rotor temperature (rotor.temperature)",
    )


class SurfacePMRotor(Strict):
    magnet: Magnet
    sleeve_thickness: LengthOrZero = Field(default="0 mm", validate_default=True)
    inner_diameter: Length = Field(description="inner diameter of the rotor yoke")
    steel: str | None = None


class Pole(Strict):
    shoe_arc: Fraction = Field(description="pole-shoe arc as a fraction of the pole pitch")
    shoe_height: Length
    body_width: Length
    body_height: Length


class FieldCoil(Strict):
    turns_per_pole: int = Field(ge=1, le=100000)
    current: Current
    conductor: Conductor
    brushes: Literal["none", "carbon", "metal_carbon"] = Field(
        default="none",
        description="field fed through slip rings and two brushes of this kind (their drop"
        " counts as rotor loss), or 'none' for a brushless exciter",
    )


class SalientRotor(Strict):
    pole: Pole
    field: FieldCoil
    inner_diameter: Length = Field(description="inner diameter of the rotor yoke (hub)")
    steel: str | None = None


# --- designs ----------------------------------------------------------------------------


def _tolerance_text(text: str) -> str:
    from emgate.tolerances import parse_tolerance

    parse_tolerance(text)  # a ToleranceError is a ValueError: pydantic reports it located
    return text


class DesignBase(Strict):
    schema_: Literal["emgate/design@1"] = Field(alias="schema")
    id: Slug
    title: str
    poles: int = Field(ge=2, le=400, multiple_of=2)
    rating: Rating
    stator: Stator
    air_gap: Length = Field(
        description="mechanical air gap (under the pole centre for salient poles)"
    )
    winding: Winding
    cooling: Cooling
    losses: MeasuredLosses | None = Field(
        default=None,
        description="measured losses that replace emgate's estimates (stray load, friction"
        " and windage, magnet eddy loss)",
    )
    declared: dict[str, str | float] = Field(
        default_factory=dict,
        description="the designer's own figures, by emgate quantity name, for the"
        " declared-values rule",
    )
    waivers: list[Waiver] = Field(default_factory=list)
    tolerances: dict[str, Annotated[str, AfterValidator(_tolerance_text)]] = Field(
        default_factory=dict,
        description="manufacturing tolerances by dotted record path, for the"
        " tolerance-corners rule: '+-0.05 mm', '+0.02 mm -0.05 mm', '+-3 %', 'normal 0.02 mm'",
    )

    @property
    def pole_pairs(self) -> int:
        return self.poles // 2


class InductionDesign(DesignBase):
    machine: Literal["induction"]
    rotor: CageRotor


class SurfacePMDesign(DesignBase):
    machine: Literal["surface_pm"]
    rotor: SurfacePMRotor


class SalientFieldDesign(DesignBase):
    machine: Literal["salient_field"]
    rotor: SalientRotor


Design = Annotated[
    InductionDesign | SurfacePMDesign | SalientFieldDesign, Field(discriminator="machine")
]
AnyDesign = InductionDesign | SurfacePMDesign | SalientFieldDesign
MACHINE_KINDS = ("induction", "surface_pm", "salient_field")

#: Tags that pydantic inserts into error locations for discriminated unions.
UNION_TAGS = frozenset({*MACHINE_KINDS, "semi_closed", "open", "round", "rectangular"})


# --- materials file ---------------------------------------------------------------------


class LossCurveTable(Strict):
    """Specific loss against peak flux density at one frequency."""

    frequency: Frequency
    points: list[Annotated[list[float], Field(min_length=2, max_length=2)]] = Field(
        min_length=2, max_length=200, description="(B, loss) pairs, B increasing"
    )


class LossTable(Strict):
    """Measured specific iron loss of a steel (sinusoidal flux, Epstein or single sheet)."""

    source: Annotated[str, StringConstraints(min_length=3)] = Field(
        description="where the losses come from (supplier datasheet, measurement report)"
    )
    columns: Annotated[list[str], Field(min_length=2, max_length=2)] = Field(
        description="units of the two columns, e.g. ['T', 'W/kg']"
    )
    curves: list[LossCurveTable] = Field(
        min_length=1, max_length=20, description="one curve per frequency"
    )


class SteelTable(Strict):
    """A steel grade given as a B-H table."""

    source: Annotated[str, StringConstraints(min_length=3)] = Field(
        description="where the curve comes from (supplier datasheet, measurement report)"
    )
    density: Annotated[str, Field(description="mass density, e.g. '7650 kg/m^3'")] | None = None
    columns: Annotated[list[str], Field(min_length=2, max_length=2)] = Field(
        description="units of the two columns, e.g. ['T', 'A/m']"
    )
    points: list[Annotated[list[float], Field(min_length=2, max_length=2)]] = Field(
        min_length=3,
        max_length=500,
        description="(B, H) pairs from (0, 0), increasing; B at most 10 T and H at most"
        " 1e8 A/m in the columns' units converted to SI",
    )
    losses: LossTable | None = Field(
        default=None,
        description="specific loss against B at one or more frequencies; when given it wins"
        " over the scaling from a grade designation",
    )


class MaterialsFile(Strict):
    schema_: Literal["emgate/materials@1"] = Field(alias="schema")
    steels: dict[str, SteelTable] = Field(default_factory=dict)


def json_schema(kind: str) -> dict[str, Any]:
    """The JSON Schema of a record kind ('design' or 'materials')."""
    from pydantic import TypeAdapter

    target: Any = {"design": Design, "materials": MaterialsFile, "waivers": WaiversFile}[kind]
    schema = TypeAdapter(target).json_schema(by_alias=True)
    schema = {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "$id": f"urn:emgate:schema:{kind}:1",
        "title": f"emgate {kind} record, version 1",
        **schema,
    }
    return schema
