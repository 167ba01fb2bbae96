"""The lumped thermal estimate of the stator winding."""

from __future__ import annotations

from typing import TYPE_CHECKING

from emgate import geometry as geo
from emgate.calc import conductors
from emgate.calc.core import Calculation, memo, quantity

if TYPE_CHECKING:
    from emgate.physics.thermal import ThermalEstimate

#: Cooled frame length over the stack length when the record gives no cooling.frame_length:
#: the frame with its end shields (the record's documented default; common practice, no
#: source).
FRAME_PER_STACK = 1.5


def thermal_estimate(c: Calculation) -> ThermalEstimate:
    """The lumped winding-temperature estimate, with the record's cooling-surface factors
    (``cooling.fin_area_factor``, ``frame_length``, ``core_area_factor``)."""
    return _thermal_estimate(c)


@memo
def _thermal_estimate(c: Calculation) -> ThermalEstimate:
    from emgate.physics import thermal as tk

    d = c.d
    cooling = d.cooling
    frame = cooling.frame_length
    if frame is None:
        frame = FRAME_PER_STACK * d.stator.stack_length
    top, bottom, _, _ = geo.winding_zone(d.stator.slot)
    geometry = tk.StatorThermalGeometry(
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
    params = tk.ThermalParameters(
        fin_area_factor=cooling.fin_area_factor, core_area_factor=cooling.core_area_factor
    )
    return tk.winding_temperature_rise(
        conductors.copper_loss(c),
        geometry,
        cooling.method,
        coolant_temperature=cooling.ambient,
        parameters=params,
    )


@quantity("winding.temperature_rise")
def temperature_rise(c: Calculation) -> float:
    return thermal_estimate(c).winding_rise
