"""The stator of a design record: its core and slots, and the winding with its conductors."""

from __future__ import annotations

from typing import Annotated, Literal

from pydantic import BeforeValidator, Field, StringConstraints, WithJsonSchema

from emgate.model.base import Strict
from emgate.quantity import Length, LengthOrZero


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
