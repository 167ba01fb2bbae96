"""The materials file: steel grades as B-H tables, with their measured losses."""

from __future__ import annotations

from typing import Annotated, Literal

from pydantic import Field, StringConstraints

from emgate.model.base import Strict
from emgate.quantity import Frequency


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
