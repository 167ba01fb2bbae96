"""The worst operating cases of a surface-magnet machine: the magnet under the worst credible
current (a declared drive limit, else the short-circuit current) hot and at the lowest
ambient, and the cold magnet's EMF at the top speed.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate import geometry as geo
from emgate.calc import magnetic, rotor, winding
from emgate.calc.core import Calculation, memo, quantity
from emgate.calc.inductance import synchronous_inductance

if TYPE_CHECKING:
    from emgate.physics.magnetic_surface_pm import SurfacePMResult

#: Lowest coolant temperature when the record gives none: -15 degC, the lower end of the
#: ambient air range of IEC 60034-1 (from memory: clause on site conditions).
DEFAULT_AMBIENT_MIN = 273.15 - 15.0

# --- the short-circuit and the worst credible current ----------------------------------------


def _emf_of(c: Calculation, circuit: SurfacePMResult, frequency: float) -> float:
    from emgate.physics.winding_factors import phase_emf

    d = c.d
    return phase_emf(
        frequency,
        winding.series_turns(c),
        winding.winding_factor(c),
        circuit.b_fundamental,
        geo.pole_pitch(d),
        d.stator.stack_length,
    )


def _short_circuit(c: Calculation, emf: float) -> float:
    from emgate.physics.performance import short_circuit_current

    return float(short_circuit_current(emf, c.d.rating.frequency, synchronous_inductance(c)))


@quantity("winding.short_circuit_current")
def short_circuit_current(c: Calculation) -> float:
    return _short_circuit(c, magnetic.back_emf(c))


def lowest_ambient(c: Calculation) -> float:
    """The lowest coolant temperature the record allows [K]: cooling.ambient_min, or
    -15 degC (IEC 60034-1's range), and never above the rated ambient."""
    cool = c.d.cooling
    low = DEFAULT_AMBIENT_MIN if cool.ambient_min is None else cool.ambient_min
    return min(low, cool.ambient)


@memo
def circuit_lowest_ambient(c: Calculation) -> SurfacePMResult:
    """The surface-magnet circuit at no load with the magnet at the lowest ambient."""
    return magnetic.surface_pm_circuit(c, lowest_ambient(c))


def fault_current(c: Calculation, *, cold: bool) -> float:
    """Worst credible phase current, peak [A]: the declared drive limit, else sqrt 2 I_k
    with the magnet hot or at the lowest ambient."""
    peak = c.d.rating.peak_current
    if peak is not None:
        return peak
    emf = _emf_of(c, circuit_lowest_ambient(c), c.d.rating.frequency) if cold else None
    return math.sqrt(2.0) * (_short_circuit(c, emf) if emf else short_circuit_current(c))


@quantity("winding.fault_current_peak")
def fault_current_peak(c: Calculation) -> float:
    return fault_current(c, cold=False)


def magnet_field_at_fault(c: Calculation, *, cold: bool, factor: float = 1.0) -> float:
    """Magnet field strength with ``factor`` times the worst credible current wholly on the
    d-axis [A/m] (hot: operating temperature; cold: lowest ambient)."""
    from emgate.physics.magnetic_surface_pm import magnet_field_under_current

    h0 = circuit_lowest_ambient(c).magnet_h if cold else rotor.magnet_h(c)
    rated_peak = math.sqrt(2.0) * winding.phase_current(c)
    armature = factor * fault_current(c, cold=cold) / rated_peak * winding.mmf_peak(c)
    return magnet_field_under_current(
        h0,
        armature,
        geo.magnet_rotor(c.d).magnet.material.recoil_permeability,
        magnetic.effective_gap(c),  # kc g', the magnet's h_m / mu_rec included
    )


@quantity("rotor.magnet_field_strength_fault_hot")
def magnet_field_fault_hot(c: Calculation) -> float:
    return magnet_field_at_fault(c, cold=False)


@quantity("rotor.magnet_field_strength_fault_cold")
def magnet_field_fault_cold(c: Calculation) -> float:
    return magnet_field_at_fault(c, cold=True)


@quantity("rotor.magnet_coercivity_lowest_ambient")
def magnet_coercivity_lowest_ambient(c: Calculation) -> float:
    return rotor.magnet_coercivity_at(c, lowest_ambient(c))


def top_speed(c: Calculation) -> float:
    """rating.max_speed, or the rated speed [1/s]."""
    r = c.d.rating
    return r.speed if r.max_speed is None else r.max_speed


@quantity("winding.back_emf_cold_top_speed")
def back_emf_cold_top_speed(c: Calculation) -> float:
    r = c.d.rating
    return _emf_of(c, circuit_lowest_ambient(c), r.frequency * top_speed(c) / r.speed)


@quantity("stator.tooth_flux_density_apparent_cold")
def stator_tooth_b_apparent_cold(c: Calculation) -> float:
    return circuit_lowest_ambient(c).iron.stator_tooth_b_apparent


@quantity("stator.tooth_flux_density_cold")
def stator_tooth_b_cold(c: Calculation) -> float:
    return circuit_lowest_ambient(c).iron.stator_tooth_b


@quantity("stator.yoke_flux_density_cold")
def stator_yoke_b_cold(c: Calculation) -> float:
    return circuit_lowest_ambient(c).iron.stator_yoke_b
