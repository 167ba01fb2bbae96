"""The machine on load: an induction motor's magnetising current and power factor, a
wound-field machine's field current on load, the torque, torque constant and shear stress."""

from __future__ import annotations

import math
from typing import Any

from emgate import geometry as geo
from emgate.calc import conductors, magnetic, winding
from emgate.calc.core import Calculation, quantity
from emgate.calc.inductance import leakage_inductance

#: Rated power factor when the record gives none: synchronous generators are usually rated
#: at 0.8 lagging (from memory: IEC 60034-1's preferred rating; common practice).
DEFAULT_POWER_FACTOR = 0.8

# --- induction machines ---------------------------------------------------------------------


@quantity("winding.magnetising_current")
def magnetising_current(c: Calculation) -> float:
    from emgate.physics.performance import magnetising_current as im

    d = c.d
    return float(
        im(
            magnetic.total_mmf(c),
            d.winding.phases,
            winding.series_turns(c),
            winding.winding_factor(c),
            d.pole_pairs,
        )
    )


#: Rotor leakage reactance X_2' over the stator's X_1 for the power-factor estimate: the
#: equal split of the locked-rotor reactance of IEEE Std 112 for design A and D and wound
#: rotors (from memory, as tabulated in Chapman, ch. "Induction motors"); design B puts
#: 0.6 / 0.4 on the rotor.
ROTOR_LEAKAGE_SHARE = 1.0


def _motor(d: Any) -> bool:
    return bool(d.rating.operation == "motor")


@quantity("rating.power_factor_estimate", when=_motor)
def power_factor_estimate(c: Calculation) -> float:
    from emgate.calc import losses
    from emgate.physics.magnetic_induction import InductionResult
    from emgate.physics.performance import power_factor_estimate as estimate

    d = c.d
    voltage = winding.phase_voltage(c)
    circuit = magnetic.magnetic(c)
    assert isinstance(circuit, InductionResult)
    x1 = 2.0 * math.pi * d.rating.frequency * leakage_inductance(c)
    # NaN where the model has no operating point (its method says when): a number the
    # sheet shows, as the efficiency class outside its standard, not a failed calculation
    return float(
        estimate(
            losses.input_power(c) / (d.winding.phases * voltage),
            magnetising_current(c),
            circuit.emf,
            voltage,
            x1,
            ROTOR_LEAKAGE_SHARE * x1,
        )
    )


@quantity("rating.power_factor_nameplate", when=_motor)
def power_factor_nameplate(c: Calculation) -> float:
    from emgate.calc import losses

    apparent = c.d.winding.phases * winding.phase_voltage(c) * winding.phase_current(c)
    return float(losses.input_power(c) / apparent)


# --- wound-field machines: the field on load -----------------------------------------------


def power_factor(c: Calculation) -> float:
    pf = c.d.rating.power_factor
    return DEFAULT_POWER_FACTOR if pf is None else pf


@quantity("rotor.field_current_rated_load")
def field_current_rated_load(c: Calculation) -> float:
    """The field MMF on load as the phasor difference of the resultant MMF, which the
    saturated no-load circuit needs for the air-gap EMF E_d = U + (R + j X_s) I (X_s the
    leakage reactance), and the armature's d-axis MMF referred to the field."""
    import numpy as np

    from emgate.physics.inductance import salient_pole_axis_factors
    from emgate.physics.performance import armature_reaction_on_field, excitation_emf

    d = c.d
    rotor = geo.salient_rotor(d)
    motor = d.rating.operation == "motor"
    omega = 2.0 * math.pi * d.rating.frequency
    emf, angle = excitation_emf(
        winding.phase_voltage(c),
        winding.phase_current(c),
        power_factor(c),
        omega * leakage_inductance(c),
        conductors.phase_resistance_hot(c),
        leading=motor,
        motoring=motor,
    )
    # E is proportional to B1 at the rated frequency: the field MMF whose no-load circuit
    # gives E_d, computed forward from that fundamental (no iteration)
    target = magnetic.gap_flux_density_fundamental(c) * float(emf) / magnetic.back_emf(c)
    resultant = magnetic.salient_circuit_for_fundamental(c, target).total_mmf
    c_d, _ = salient_pole_axis_factors(rotor.pole.shoe_arc)
    armature = armature_reaction_on_field(
        winding.mmf_fundamental(c), float(c_d), rotor.pole.shoe_arc
    )
    phi = math.acos(power_factor(c)) * (1.0 if motor else -1.0)
    sign = -1.0 if motor else 1.0  # a motor's current flows into the terminals
    field = resultant * np.exp(1j * (float(angle) + math.pi / 2)) - sign * armature * np.exp(
        1j * phi
    )
    return float(abs(field)) / rotor.field.turns_per_pole


def _field_section(c: Calculation) -> float:
    f = geo.salient_rotor(c.d).field
    return f.conductor.strands * conductors.conductor_strand_area(f.conductor)


@quantity("rotor.field_current_density_rated_load")
def field_current_density_rated_load(c: Calculation) -> float:
    return field_current_rated_load(c) / _field_section(c)


@quantity("rotor.field_copper_loss_rated_load")
def field_copper_loss_rated_load(c: Calculation) -> float:
    from emgate.physics import resistance as ck

    d = c.d
    rotor = geo.salient_rotor(d)
    f = rotor.field
    cond = f.conductor
    if cond.shape == "round":
        insulated = cond.insulated_diameter**2
    else:
        insulated = cond.insulated_width * cond.insulated_height
    coil_width = f.turns_per_pole * cond.strands * insulated / rotor.pole.body_height
    turn = 2.0 * (d.stator.stack_length + rotor.pole.body_width) + math.pi * coil_width
    material = ck.COPPER if cond.material == "copper" else ck.ALUMINIUM
    rho = ck.resistivity(material, conductors.class_reference_temperature(c))
    resistance = rho * d.poles * f.turns_per_pole * turn / _field_section(c)
    return field_current_rated_load(c) ** 2 * resistance


# --- torque -------------------------------------------------------------------------------------


@quantity("rating.torque")
def torque(c: Calculation) -> float:
    from emgate.physics.performance import shaft_torque

    r = c.d.rating
    power = r.power * (power_factor(c) if r.operation == "generator" else 1.0)
    return float(shaft_torque(power, r.speed))


@quantity("winding.torque_constant")
def torque_constant(c: Calculation) -> float:
    from emgate.physics.performance import torque_constant as kt

    d = c.d
    return float(kt(d.winding.phases, magnetic.back_emf(c), d.rating.frequency, d.pole_pairs))


@quantity("rotor.shear_stress")
def shear_stress(c: Calculation) -> float:
    from emgate.physics.performance import shear_stress as sigma

    return float(sigma(torque(c), geo.rotor_outer_diameter(c.d), c.d.stator.stack_length))
