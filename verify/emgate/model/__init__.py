"""The design record, version 1, as pydantic models; the waivers and the materials file.

Every quantity is converted to SI on validation (metres, amperes, kelvin, revolutions per
second); rules read these floats and never the record's text. The models are the one source of
the JSON Schemas in schemas/ (``nox -s schema`` regenerates them). A record's parts have a
module each: ``stator`` (core, slots, winding, conductors), ``rotor`` (each machine kind's),
``operation`` (rating, cooling, measured losses) and ``materials`` (the materials file), on
the shared ``base``.
"""

from __future__ import annotations

import datetime as dt
from typing import Annotated, Any, Literal, get_args

from pydantic import AfterValidator, Field, StringConstraints

from emgate.model.base import Slug, Strict
from emgate.model.materials import MaterialsFile
from emgate.model.operation import Cooling, MeasuredLosses, Rating
from emgate.model.rotor import CageRotor, SalientRotor, SurfacePMRotor
from emgate.model.stator import Stator, Winding
from emgate.quantity import Length


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
#: The design model of each machine kind: the union's members by their tag.
DESIGN_MODELS: dict[str, type[AnyDesign]] = {
    get_args(m.model_fields["machine"].annotation)[0]: m for m in get_args(AnyDesign)
}

#: Tags that pydantic inserts into error locations for discriminated unions.
UNION_TAGS = frozenset({*MACHINE_KINDS, "semi_closed", "open", "round", "rectangular"})


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
