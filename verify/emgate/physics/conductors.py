"""Former home of the conductor kernel, now split by domain.

Re-export for calc and rules until they move; remove after. New code imports from
:mod:`emgate.physics.slots`, :mod:`~emgate.physics.strands`, :mod:`~emgate.physics.currents`,
:mod:`~emgate.physics.rotor_conductors`, :mod:`~emgate.physics.resistance` and
:mod:`~emgate.physics.insulation`.
"""

from __future__ import annotations

from emgate.physics.constants import T20, ZERO_CELSIUS
from emgate.physics.currents import (
    Connection,
    current_density,
    electric_loading,
    phase_current,
    phase_voltage,
    thermal_load,
    winding_current_density,
)
from emgate.physics.insulation import (
    INSULATION_CLASSES,
    InsulationClass,
    insulation_class,
    reference_temperature,
    temperature_rise_limit,
)
from emgate.physics.resistance import (
    ALUMINIUM,
    COPPER,
    ConductorMaterial,
    coil_span_width,
    copper_loss,
    mean_turn_length,
    phase_resistance,
    resistance_factor,
    resistivity,
    tooth_coil_mean_turn_length,
)
from emgate.physics.rotor_conductors import (
    bar_current,
    bar_current_factor,
    end_ring_current,
    field_coil_current_density,
)
from emgate.physics.slots import (
    OPENING_CLEARANCE,
    fill_factor,
    open_full_area,
    open_slot_area,
    open_slot_perimeter,
    opening_clearance,
    semi_closed_full_area,
    semi_closed_slot_area,
    semi_closed_slot_perimeter,
    semi_closed_winding_height,
    slot_width_clearance,
    strand_passes_opening,
)
from emgate.physics.strands import copper_area_per_slot, rectangular_strand_area, round_strand_area

__all__ = [
    "ALUMINIUM",
    "COPPER",
    "INSULATION_CLASSES",
    "OPENING_CLEARANCE",
    "T20",
    "ZERO_CELSIUS",
    "ConductorMaterial",
    "Connection",
    "InsulationClass",
    "bar_current",
    "bar_current_factor",
    "coil_span_width",
    "copper_area_per_slot",
    "copper_loss",
    "current_density",
    "electric_loading",
    "end_ring_current",
    "field_coil_current_density",
    "fill_factor",
    "insulation_class",
    "mean_turn_length",
    "open_full_area",
    "open_slot_area",
    "open_slot_perimeter",
    "opening_clearance",
    "phase_current",
    "phase_resistance",
    "phase_voltage",
    "rectangular_strand_area",
    "reference_temperature",
    "resistance_factor",
    "resistivity",
    "round_strand_area",
    "semi_closed_full_area",
    "semi_closed_slot_area",
    "semi_closed_slot_perimeter",
    "semi_closed_winding_height",
    "slot_width_clearance",
    "strand_passes_opening",
    "temperature_rise_limit",
    "thermal_load",
    "tooth_coil_mean_turn_length",
    "winding_current_density",
]
