"""Stator conductors and slots: sections, fill, loading, turn length, resistance, copper loss."""

from __future__ import annotations

from typing import TYPE_CHECKING

from emgate import geometry as geo
from emgate.calc import winding
from emgate.calc.core import Calculation, memo, quantity

if TYPE_CHECKING:
    from emgate.model import AnyDesign
    from emgate.model.stator import OpenSlot, RectangularConductor, RoundConductor, SemiClosedSlot
    from emgate.physics.resistance import ConductorMaterial

#: Slot liner when the record gives none: 0.25 mm of insulating paper is usual for
#: low-voltage random windings (common practice, no source).
DEFAULT_LINER = 0.25e-3


@memo
def strand_area(c: Calculation) -> float:
    return conductor_strand_area(c.d.winding.conductor)


@quantity("stator.current_density")
def stator_current_density(c: Calculation) -> float:
    from emgate.physics.currents import winding_current_density

    w = c.d.winding
    return winding_current_density(
        winding.phase_current(c), w.parallel_paths, w.conductor.strands, strand_area(c)
    )


@memo
def conductor_material(c: Calculation) -> ConductorMaterial:
    from emgate.physics.resistance import ALUMINIUM, COPPER

    return COPPER if c.d.winding.conductor.material == "copper" else ALUMINIUM


@memo
def liner(c: Calculation) -> float:
    w = c.d.winding
    return DEFAULT_LINER if w.slot_liner is None else w.slot_liner


@memo
def slot_perimeter(c: Calculation) -> float:
    """Perimeter of the slot's winding zone, along which the liner lies [m]."""
    from emgate.physics.slots import open_slot_perimeter, semi_closed_slot_perimeter

    sl = c.d.stator.slot
    if sl.shape == "semi_closed":
        return semi_closed_slot_perimeter(
            sl.opening_height, sl.wedge_height, sl.top_width, sl.bottom_width, sl.height
        )
    return open_slot_perimeter(sl.width, sl.height, sl.wedge_height)


def _slot_area(c: Calculation, liner: float) -> float:
    return slot_winding_area(c.d.stator.slot, liner)


@quantity("stator.slot_area_gross")
def slot_area_gross(c: Calculation) -> float:
    return _slot_area(c, 0.0)


@quantity("stator.slot_area")
def slot_area(c: Calculation) -> float:
    return _slot_area(c, liner(c))


@quantity(
    "stator.opening_clearance",
    when=lambda d: d.winding.conductor.shape == "round" and d.stator.slot.shape == "semi_closed",
)
def opening_clearance(c: Calculation) -> float:
    from emgate.physics.slots import opening_clearance

    slot, conductor = c.d.stator.slot, c.d.winding.conductor
    if slot.shape != "semi_closed" or conductor.shape != "round":
        raise TypeError("a round wire in a semi-closed slot was expected")  # `when` rules it out
    return opening_clearance(slot.opening, conductor.insulated_diameter)


@quantity(
    "stator.slot_width_clearance",
    when=lambda d: d.winding.conductor.shape == "rectangular" and d.stator.slot.shape == "open",
)
def slot_width_clearance(c: Calculation) -> float:
    from emgate.physics.slots import slot_width_clearance

    slot, conductor = c.d.stator.slot, c.d.winding.conductor
    if slot.shape != "open" or conductor.shape != "rectangular":
        raise TypeError("rectangular strands in an open slot were expected")  # `when` rules it out
    return slot_width_clearance(slot.width, conductor.insulated_width, liner(c))


def _rectangular_in_open_slot(d: AnyDesign) -> bool:
    return d.winding.conductor.shape == "rectangular" and d.stator.slot.shape == "open"


@quantity("stator.strands_across", when=_rectangular_in_open_slot)
def strands_across(c: Calculation) -> float:
    from emgate.physics.slots import strands_across

    cond, slot = c.d.winding.conductor, c.d.stator.slot
    assert cond.shape == "rectangular" and slot.shape == "open"
    return strands_across(slot.width, cond.insulated_width, liner(c))


def slot_height_clearance_with(c: Calculation, separator: float) -> float:
    """``stator.slot_height_clearance`` with ``separator`` between the layers [m]."""
    import math

    from emgate.physics.slots import slot_height_clearance

    d = c.d
    w, slot = d.winding, d.stator.slot
    cond = w.conductor
    assert cond.shape == "rectangular" and slot.shape == "open"
    return slot_height_clearance(
        slot.height,
        slot.wedge_height,
        cond.insulated_height,
        math.ceil(cond.strands / strands_across(c)),
        w.layers * w.turns_per_coil,
        w.layers,
        liner(c),
        separator,
    )


@quantity("stator.slot_height_clearance", when=_rectangular_in_open_slot)
def slot_height_clearance(c: Calculation) -> float:
    from emgate.physics.slots import LAYER_SEPARATOR

    return slot_height_clearance_with(c, LAYER_SEPARATOR)


@quantity("stator.conductors_per_slot")
def conductors_per_slot(c: Calculation) -> float:
    return c.d.winding.layers * c.d.winding.turns_per_coil


@quantity("stator.copper_area")
def copper_area(c: Calculation) -> float:
    from emgate.physics.strands import copper_area_per_slot

    return copper_area_per_slot(
        int(conductors_per_slot(c)), c.d.winding.conductor.strands, strand_area(c)
    )


@quantity("stator.slot_fill")
def slot_fill(c: Calculation) -> float:
    from emgate.physics.slots import fill_factor

    return fill_factor(copper_area(c), slot_area(c))


@quantity("stator.slot_fill_insulated")
def slot_fill_insulated(c: Calculation) -> float:
    w = c.d.winding
    cond = w.conductor
    if cond.shape == "round":
        one = cond.insulated_diameter**2
    else:
        one = cond.insulated_width * cond.insulated_height
    return conductors_per_slot(c) * cond.strands * one / slot_area(c)


@quantity("stator.electric_loading")
def electric_loading(c: Calculation) -> float:
    from emgate.physics.currents import electric_loading

    return electric_loading(
        c.d.winding.phases,
        winding.series_turns(c),
        winding.phase_current(c),
        c.d.stator.bore_diameter,
    )


@quantity("stator.thermal_load")
def thermal_load(c: Calculation) -> float:
    from emgate.physics.currents import thermal_load

    return thermal_load(electric_loading(c), stator_current_density(c))


@quantity("winding.mean_turn_length")
def mean_turn_length(c: Calculation) -> float:
    from emgate.physics.resistance import (
        coil_span_width,
        mean_turn_length,
        tooth_coil_mean_turn_length,
    )

    d = c.d
    if d.winding.coil_pitch == 1:
        top, bottom, w_top, w_bottom = geo.winding_zone(d.stator.slot)
        slot_width = (w_top + w_bottom) / 2.0
        # Tooth and slot widths vary linearly with depth: their means sit at mid-zone.
        mid = d.stator.bore_diameter / 2.0 + (top + bottom) / 2.0
        tooth = geo.stator_slot_pitch_at(d, mid) - slot_width
        return tooth_coil_mean_turn_length(
            d.stator.stack_length, tooth, slot_width / d.winding.layers
        )
    span = coil_span_width(
        d.stator.bore_diameter, d.stator.slot.height, d.stator.slots, d.winding.coil_pitch
    )
    return mean_turn_length(
        d.stator.stack_length, span, high_voltage=d.rating.line_voltage > 1000.0
    )


def _phase_resistance(c: Calculation, temperature: float) -> float:
    from emgate.physics.resistance import phase_resistance, resistivity

    w = c.d.winding
    return phase_resistance(
        resistivity(conductor_material(c), temperature),
        winding.series_turns(c),
        mean_turn_length(c),
        w.parallel_paths,
        w.conductor.strands,
        strand_area(c),
    )


@quantity("winding.phase_resistance_20c")
def phase_resistance_20c(c: Calculation) -> float:
    return _phase_resistance(c, 293.15)


@memo
def class_reference_temperature(c: Calculation) -> float:
    from emgate.physics.insulation import reference_temperature

    return reference_temperature(c.d.winding.insulation_class)


@quantity("winding.phase_resistance_hot")
def phase_resistance_hot(c: Calculation) -> float:
    return _phase_resistance(c, class_reference_temperature(c))


@quantity("winding.copper_loss")
def copper_loss(c: Calculation) -> float:
    from emgate.physics.resistance import copper_loss

    return copper_loss(c.d.winding.phases, winding.phase_current(c), phase_resistance_hot(c))


def slot_winding_area(slot: SemiClosedSlot | OpenSlot, liner: float = 0.0) -> float:
    """Winding-zone area of a slot, gross or net of a liner [m^2]."""
    from emgate.physics.slots import open_slot_area, semi_closed_slot_area

    if slot.shape == "semi_closed":
        return semi_closed_slot_area(
            slot.opening,
            slot.opening_height,
            slot.wedge_height,
            slot.top_width,
            slot.bottom_width,
            slot.height,
            liner=liner,
        )
    return open_slot_area(slot.width, slot.height, slot.wedge_height, liner=liner)


def conductor_strand_area(conductor: RoundConductor | RectangularConductor) -> float:
    """Bare section of one strand of a conductor, stator winding or field coil [m^2]."""
    from emgate.physics.strands import rectangular_strand_area, round_strand_area

    c = conductor
    if c.shape == "round":
        return round_strand_area(c.bare_diameter)
    return rectangular_strand_area(c.width, c.height, c.corner_radius)
