"""The lumped thermal estimate: every loss where it arises, at a self-consistent winding
temperature."""

from __future__ import annotations

from typing import TYPE_CHECKING

from emgate import geometry as geo
from emgate.calc import conductors, losses, winding
from emgate.calc.core import Calculation, memo, quantity

if TYPE_CHECKING:
    from emgate.model import AnyDesign
    from emgate.physics.thermal import ThermalEstimate
    from emgate.physics.thermal_inputs import HeatSources
    from emgate.physics.winding_temperature import OperatingPoint

#: Cooled frame length over the stack length when the record gives no cooling.frame_length:
#: the frame with its end shields (the record's documented default; common practice, no
#: source).
FRAME_PER_STACK = 1.5


class ThermalRunaway(ValueError):
    """No steady winding temperature: a design that overheats, which the temperature-rise
    rule reports as its finding (not an input error: every input can be plausible)."""


def thermal_estimate(c: Calculation) -> ThermalEstimate:
    """The lumped estimate at the operating (fixed-point) winding temperature, with the
    record's cooling-surface factors (``cooling.fin_area_factor``, ``frame_length``,
    ``core_area_factor``). Raises ValueError on a thermal run-away."""
    op = operating_point(c)
    if op.runaway or op.estimate is None:
        raise ThermalRunaway(
            "thermal run-away: the copper loss grows with temperature faster than the cooling"
            f" sheds it (no steady winding temperature; last iterate {op.temperature - 273.15:.0f}"
            " degC)"
        )
    return op.estimate


@memo
def _network(c: Calculation):  # type: ignore[no-untyped-def]
    from emgate.physics.thermal_inputs import RotorGap, StatorThermalGeometry, ThermalParameters

    d = c.d
    cooling = d.cooling
    frame = cooling.frame_length
    if frame is None:
        frame = FRAME_PER_STACK * d.stator.stack_length
    top, bottom, _, _ = geo.winding_zone(d.stator.slot)
    geometry = StatorThermalGeometry(
        bore_diameter=d.stator.bore_diameter,
        outer_diameter=d.stator.outer_diameter,
        stack_length=d.stator.stack_length,
        slots=d.stator.slots,
        slot_depth=d.stator.slot.height,
        winding_area=conductors.slot_area_gross(c),
        winding_height=bottom - top,
        winding_perimeter=conductors.slot_perimeter(c),
        liner_thickness=conductors.liner(c),
        stacking_factor=d.stator.stacking_factor,
        frame_length=frame,
    )
    params = ThermalParameters(
        fin_area_factor=cooling.fin_area_factor, core_area_factor=cooling.core_area_factor
    )
    gap = RotorGap(d.air_gap, geo.rotor_outer_diameter(d), d.rating.speed)
    return geometry, params, gap


@memo
def heat_sources(c: Calculation) -> HeatSources:
    """The losses by where they arise, copper at 20 degC (the fixed point rescales it)."""
    from emgate.physics.resistance import copper_loss
    from emgate.physics.thermal_inputs import HeatSources

    slot_share = min(1.0, 2.0 * c.d.stator.stack_length / conductors.mean_turn_length(c))
    cu20 = copper_loss(
        c.d.winding.phases, winding.phase_current(c), conductors.phase_resistance_20c(c)
    )
    # Open machines: the through-flow air washes the rotor and carries its loss and the
    # friction and windage away; they do not reach the stator path (the rotor temperature
    # is then not estimated from the gap alone).
    open_air = c.d.cooling.method == "open_ventilated"
    return HeatSources(
        copper_slot=cu20 * slot_share,
        copper_end=cu20 * (1.0 - slot_share),
        # the additional load losses arise at the gap surfaces of the teeth: with the tooth
        # iron, which joins at the bore side as the rotor's does
        iron_teeth=losses.stator_iron_teeth(c) + losses.stray_load(c),
        iron_yoke=losses.stator_iron_yoke(c),
        rotor=0.0 if open_air else losses.rotor(c),
        friction=0.0 if open_air else losses.friction_windage(c),
    )


@memo
def operating_point(c: Calculation) -> OperatingPoint:
    """The fixed point T = T_c + rise(P_cu(T)) (``emgate.physics.winding_temperature``)."""
    from emgate.physics.thermal import machine_temperature_rise
    from emgate.physics.winding_temperature import operating_temperature

    geometry, params, gap = _network(c)
    sources = heat_sources(c)
    d = c.d
    near: tuple[float, float] | None = None  # the last iterate's surface: the next starts there

    def estimate(copper: float) -> ThermalEstimate:
        nonlocal near
        est = machine_temperature_rise(
            sources.with_copper(copper),
            geometry,
            d.cooling.method,
            coolant_temperature=d.cooling.ambient,
            parameters=params,
            rotor_gap=None if d.cooling.method == "open_ventilated" else gap,
            surface_near=near,
        )
        near = est.air_surface
        return est

    return operating_temperature(
        sources.copper, conductors.conductor_material(c).alpha20, estimate, d.cooling.ambient
    )


@quantity("winding.temperature_rise")
def temperature_rise(c: Calculation) -> float:
    return thermal_estimate(c).winding_rise


@quantity("winding.operating_temperature")
def operating_temperature(c: Calculation) -> float:
    return thermal_estimate(c).winding_temperature


@quantity("winding.phase_resistance_operating")
def phase_resistance_operating(c: Calculation) -> float:
    return conductors._phase_resistance(c, operating_temperature(c))


def _rotor_estimated(d: AnyDesign) -> bool:
    """Whether the thermal network estimates the rotor (the through air of open ventilation
    and a direct liquid carry the rotor loss away)."""
    return d.cooling.method not in ("open_ventilated", "direct_liquid")


def _estimated_rotor_temperature(c: Calculation) -> float:
    t = thermal_estimate(c).rotor_temperature
    return float("nan") if t is None else t


@quantity("rotor.temperature", when=_rotor_estimated)
def rotor_temperature(c: Calculation) -> float:
    return _estimated_rotor_temperature(c)


@quantity("rotor.magnet_temperature")
def magnet_temperature(c: Calculation) -> float:
    """The magnet temperature of the magnet checks [K]: the record's, or else the estimated
    rotor temperature. The estimate comes from one pass of the thermal network of the same
    record with the magnet provisionally at the reference temperature of the insulation
    class (the losses hardly depend on it); where the network gives no rotor temperature
    (open or direct-liquid cooling), that reference temperature itself."""
    import math

    magnet_rotor = geo.magnet_rotor(c.d)
    declared = magnet_rotor.magnet.operating_temperature
    if declared is not None:
        return declared
    provisional = conductors.class_reference_temperature(c)
    rotor = magnet_rotor.model_copy(
        update={
            "magnet": magnet_rotor.magnet.model_copy(update={"operating_temperature": provisional})
        }
    )
    first = Calculation(c.d.model_copy(update={"rotor": rotor}), c.catalogue)
    estimate = _estimated_rotor_temperature(first)
    return provisional if math.isnan(estimate) else estimate
