"""The rotor of each machine kind: a cage, surface magnets, or salient poles with a field
coil."""

from __future__ import annotations

from typing import Literal

from pydantic import Field

from emgate.model.base import Fraction, Strict
from emgate.model.stator import Conductor, Slot
from emgate.quantity import (
    Current,
    FieldStrength,
    FluxDensity,
    Length,
    LengthOrZero,
    PerTemperature,
    Temperature,
)


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
