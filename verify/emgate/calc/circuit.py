"""The circuit: inductances, fault currents, torque, field current on load, worst cases.

The worst operating cases of a surface-magnet machine: the magnet under the worst credible
current (a declared drive limit, else the short-circuit current) hot and at the lowest
ambient, and the cold magnet's EMF at the top speed.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any

from emgate import geometry as geo
from emgate.calc import conductors, magnetic, rotor, winding
from emgate.calc.core import Calculation, memo, quantity

if TYPE_CHECKING:
    import numpy as np

    from emgate.model.rotor import SalientRotor, SurfacePMRotor
    from emgate.physics.magnetic import SurfacePMResult
    from emgate.physics.mmf import HarmonicRatios, WindingFamily

#: Rated power factor when the record gives none: synchronous generators are usually rated
#: at 0.8 lagging (from memory: IEC 60034-1's preferred rating; common practice).
DEFAULT_POWER_FACTOR = 0.8
#: Lowest coolant temperature when the record gives none: -15 degC, the lower end of the
#: ambient air range of IEC 60034-1 (from memory: clause on site conditions).
DEFAULT_AMBIENT_MIN = 273.15 - 15.0


def _salient(c: Calculation) -> SalientRotor:
    """The record's salient-pole rotor (the quantities using it are of salient_field only)."""
    d = c.d
    assert d.machine == "salient_field"
    return d.rotor


def _magnets(c: Calculation) -> SurfacePMRotor:
    """The record's surface-magnet rotor (the quantities using it are of surface_pm only)."""
    d = c.d
    assert d.machine == "surface_pm"
    return d.rotor


# --- the winding's family and spectrum -------------------------------------------------------


@memo
def family(c: Calculation) -> WindingFamily:
    """Distributed, or tooth coils in one or two layers (emgate.physics.mmf.winding_family)."""
    from emgate.physics.mmf import winding_family

    w = c.d.winding
    return winding_family(c.d.stator.slots, c.d.poles, w.layers, w.coil_pitch)


@memo
def harmonic_ratios(c: Calculation) -> HarmonicRatios:
    from emgate.physics.mmf import harmonic_ratios

    return harmonic_ratios(winding.layout(c), c.d.pole_pairs)


@quantity("winding.mmf_largest_subharmonic")
def mmf_largest_subharmonic(c: Calculation) -> float:
    return harmonic_ratios(c).subharmonic


@quantity("winding.mmf_largest_slot_harmonic")
def mmf_largest_slot_harmonic(c: Calculation) -> float:
    return harmonic_ratios(c).slot_harmonic


@quantity("winding.harmonic_leakage_coefficient")
def harmonic_leakage_coefficient(c: Calculation) -> float:
    return winding.mmf_thd(c) ** 2


# --- inductances ----------------------------------------------------------------------------


@memo
def gap_magnetising_inductance(c: Calculation) -> float:
    """L_m over the effective gap (uniform), before any salient-pole factor [H]."""
    from emgate.physics.inductance import magnetising_inductance as lm

    d = c.d
    return float(
        lm(
            d.winding.phases,
            winding.series_turns(c),
            winding.winding_factor(c),
            d.stator.bore_diameter,
            d.stator.stack_length,
            d.pole_pairs,
            magnetic.effective_gap(c),
        )
    )


@quantity("winding.magnetising_inductance")
def magnetising_inductance(c: Calculation) -> float:
    if c.d.machine != "salient_field":
        return gap_magnetising_inductance(c)
    from emgate.physics.inductance import salient_pole_axis_factors

    c_d, _ = salient_pole_axis_factors(_salient(c).pole.shoe_arc)
    return float(c_d) * gap_magnetising_inductance(c)


def _table_layers(table: list[str], phases: int) -> tuple[np.ndarray, np.ndarray]:
    """Top and bottom layers of an explicit slot table (its entries list the top first)."""
    top = winding.layout_from_table([e.split()[0] for e in table], phases)
    bottom = winding.layout_from_table([" ".join(e.split()[1:]) for e in table], phases)
    return top, bottom


@memo
def slot_factors(c: Calculation) -> tuple[float, float]:
    """(k1, k2) of the slot leakage from the layers' currents: distributed double layers
    stacked, tooth coils side by side, single layers one phase a slot."""
    from emgate.physics.inductance import slot_leakage_factors
    from emgate.physics.winding import star_of_slots_layers

    w, d = c.d.winding, c.d
    if w.layers == 1 or family(c) != "distributed":
        return slot_leakage_factors(winding.layout(c), stacked=False)
    if w.layout is not None:
        top, bottom = _table_layers(w.layout, w.phases)
    else:
        top, lower = star_of_slots_layers(
            d.stator.slots, d.pole_pairs, w.phases, w.layers, w.coil_pitch
        )
        assert lower is not None
        bottom = lower
    return slot_leakage_factors(top, bottom)


@quantity("stator.slot_permeance")
def slot_permeance(c: Calculation) -> float:
    from emgate.physics import inductance as ik
    from emgate.physics.slots import semi_closed_winding_height

    k1, k2 = slot_factors(c)
    sl = c.d.stator.slot
    if sl.shape == "semi_closed":
        zone = semi_closed_winding_height(sl.opening_height, sl.wedge_height, sl.height)
        return float(
            ik.semi_closed_slot_permeance(
                sl.opening,
                sl.opening_height,
                sl.wedge_height,
                sl.top_width,
                sl.bottom_width,
                zone,
                k1,
                k2,
            )
        )
    return float(
        ik.open_slot_permeance(sl.width, sl.height - sl.wedge_height, sl.wedge_height, k1, k2)
    )


@quantity("winding.slot_leakage_inductance")
def slot_leakage_inductance(c: Calculation) -> float:
    from emgate.physics.inductance import slot_leakage_inductance as lu

    d = c.d
    return float(
        lu(
            d.winding.phases,
            winding.series_turns(c),
            d.stator.slots,
            d.stator.stack_length,
            slot_permeance(c),
        )
    )


def _coil_groups(c: Calculation) -> tuple[int, float]:
    """(coil groups of phase A, coils a group): runs of adjacent go sides of one sign."""
    import numpy as np

    w = c.d.winding
    row = winding.layout(c)[0]
    if w.layers == 2 and w.layout is None and family(c) == "distributed":
        from emgate.physics.winding import star_of_slots_layers

        top, _ = star_of_slots_layers(
            c.d.stator.slots, c.d.pole_pairs, w.phases, w.layers, w.coil_pitch
        )
        row = top[0]
        go = np.sign(row)  # every top side starts a coil
    else:
        go = np.where(row > 0, 1, 0)  # a coil's go side; its return is the other sign
    sign = np.sign(go)
    if not sign.any():
        raise ValueError("phase A has no coil sides")
    starts = (sign != 0) & (sign != np.roll(sign, 1))
    groups = int(starts.sum()) or 1  # one run all round the bore
    coils = np.abs(row).sum() / 2.0
    return groups, coils / groups


@quantity("winding.end_leakage_inductance")
def end_leakage_inductance(c: Calculation) -> float:
    from emgate.physics.inductance import end_winding_inductance

    d, w = c.d, c.d.winding
    groups, per_group = _coil_groups(c)
    end_length = conductors.mean_turn_length(c) - 2.0 * d.stator.stack_length
    if end_length <= 0.0:
        return 0.0
    side_area = per_group * conductors.slot_area_gross(c) / w.layers
    return float(
        end_winding_inductance(
            groups,
            per_group * w.turns_per_coil,
            end_length,
            math.sqrt(side_area / math.pi),
            w.parallel_paths,
        )
    )


@quantity("winding.synchronous_inductance")
def synchronous_inductance(c: Calculation) -> float:
    from emgate.physics.inductance import synchronous_inductance as ls

    # The harmonic fields see the uniform gap; the d-axis factor applies to the working one.
    return float(ls(magnetising_inductance(c), 0.0, leakage_inductance(c), 0.0))


# --- surface magnets: fault current and torque -------------------------------------------


def _emf_of(c: Calculation, circuit: SurfacePMResult, frequency: float) -> float:
    from emgate.physics.winding import phase_emf

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
    from emgate.physics.inductance import short_circuit_current

    return float(short_circuit_current(emf, c.d.rating.frequency, synchronous_inductance(c)))


@quantity("winding.short_circuit_current")
def short_circuit_current(c: Calculation) -> float:
    return _short_circuit(c, magnetic.back_emf(c))


@quantity("winding.torque_constant")
def torque_constant(c: Calculation) -> float:
    from emgate.physics.inductance import torque_constant as kt

    d = c.d
    return float(kt(d.winding.phases, magnetic.back_emf(c), d.rating.frequency, d.pole_pairs))


def lowest_ambient(c: Calculation) -> float:
    """The lowest coolant temperature the record allows [K]: cooling.ambient_min, or
    -15 degC (IEC 60034-1's range), and never above the rated ambient."""
    cool = c.d.cooling
    low = DEFAULT_AMBIENT_MIN if cool.ambient_min is None else cool.ambient_min
    return min(low, cool.ambient)


@memo
def circuit_lowest_ambient(c: Calculation) -> SurfacePMResult:
    """The surface-magnet circuit at no load with the magnet at the lowest ambient."""
    return magnetic._surface_pm_circuit(c, lowest_ambient(c))


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
    from emgate.physics.magnetic import magnet_field_under_current

    h0 = circuit_lowest_ambient(c).magnet_h if cold else rotor.magnet_h(c)
    rated_peak = math.sqrt(2.0) * winding.phase_current(c)
    armature = factor * fault_current(c, cold=cold) / rated_peak * winding.mmf_peak(c)
    return magnet_field_under_current(
        h0,
        armature,
        _magnets(c).magnet.material.recoil_permeability,
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


# --- induction machines ---------------------------------------------------------------------


@quantity("winding.magnetising_current")
def magnetising_current(c: Calculation) -> float:
    from emgate.physics.inductance import magnetising_current as im

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
    from emgate.physics.inductance import power_factor_estimate as estimate
    from emgate.physics.magnetic import InductionResult

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


@memo
def leakage_inductance(c: Calculation) -> float:
    """Slot, end and harmonic leakage together [H]."""
    harmonic = harmonic_leakage_coefficient(c) * gap_magnetising_inductance(c)
    return slot_leakage_inductance(c) + end_leakage_inductance(c) + harmonic


@quantity("rotor.field_current_rated_load")
def field_current_rated_load(c: Calculation) -> float:
    """The field MMF on load as the phasor difference of the resultant MMF, which the
    saturated no-load circuit needs for the air-gap EMF E_d = U + (R + j X_s) I (X_s the
    leakage reactance), and the armature's d-axis MMF referred to the field."""
    import numpy as np

    from emgate.physics.inductance import (
        armature_reaction_on_field,
        excitation_emf,
        salient_pole_axis_factors,
    )
    from emgate.physics.iron import solve_increasing

    d = c.d
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
    # E is proportional to B1 at the rated frequency: find the field MMF giving E_d.
    target = magnetic.gap_flux_density_fundamental(c) * float(emf) / magnetic.back_emf(c)

    def excess(mmf: float) -> float:
        return magnetic.salient_circuit(c, mmf).b_fundamental - target

    no_load_mmf = _salient(c).field.turns_per_pole * _salient(c).field.current
    high = 2.0 * no_load_mmf
    for _ in range(6):
        if excess(high) >= 0.0:
            break
        high *= 2.0
    else:
        raise ValueError(
            f"no field current up to {high / _salient(c).field.turns_per_pole:.4g} A gives the"
            f" air-gap EMF {float(emf):.4g} V on load: the iron saturates"
        )
    # 1e-6 of the field current is far inside the method's accuracy; each step is a circuit
    resultant = solve_increasing(excess, 0.0, high, rtol=1e-6)
    c_d, _ = salient_pole_axis_factors(_salient(c).pole.shoe_arc)
    armature = armature_reaction_on_field(
        winding.mmf_fundamental(c), float(c_d), _salient(c).pole.shoe_arc
    )
    phi = math.acos(power_factor(c)) * (1.0 if motor else -1.0)
    sign = -1.0 if motor else 1.0  # a motor's current flows into the terminals
    field = resultant * np.exp(1j * (float(angle) + math.pi / 2)) - sign * armature * np.exp(
        1j * phi
    )
    return float(abs(field)) / _salient(c).field.turns_per_pole


def _field_section(c: Calculation) -> float:
    f = _salient(c).field
    return f.conductor.strands * conductors.conductor_strand_area(f.conductor)


@quantity("rotor.field_current_density_rated_load")
def field_current_density_rated_load(c: Calculation) -> float:
    return field_current_rated_load(c) / _field_section(c)


@quantity("rotor.field_copper_loss_rated_load")
def field_copper_loss_rated_load(c: Calculation) -> float:
    from emgate.physics import conductors as ck

    d = c.d
    f = _salient(c).field
    cond = f.conductor
    if cond.shape == "round":
        insulated = cond.insulated_diameter**2
    else:
        insulated = cond.insulated_width * cond.insulated_height
    coil_width = f.turns_per_pole * cond.strands * insulated / _salient(c).pole.body_height
    turn = 2.0 * (d.stator.stack_length + _salient(c).pole.body_width) + math.pi * coil_width
    material = ck.COPPER if cond.material == "copper" else ck.ALUMINIUM
    rho = ck.resistivity(material, conductors.class_reference_temperature(c))
    resistance = rho * d.poles * f.turns_per_pole * turn / _field_section(c)
    return field_current_rated_load(c) ** 2 * resistance


# --- torque and fill ------------------------------------------------------------------------


@quantity("rating.torque")
def torque(c: Calculation) -> float:
    from emgate.physics.inductance import shaft_torque

    r = c.d.rating
    power = r.power * (power_factor(c) if r.operation == "generator" else 1.0)
    return float(shaft_torque(power, r.speed))


@quantity("rotor.shear_stress")
def shear_stress(c: Calculation) -> float:
    from emgate.physics.inductance import shear_stress as sigma

    return float(sigma(torque(c), geo.rotor_outer_diameter(c.d), c.d.stator.stack_length))


@quantity("stator.slot_fill_insulated")
def slot_fill_insulated(c: Calculation) -> float:
    w = c.d.winding
    cond = w.conductor
    if cond.shape == "round":
        one = cond.insulated_diameter**2
    else:
        one = cond.insulated_width * cond.insulated_height
    return conductors.conductors_per_slot(c) * cond.strands * one / conductors.slot_area(c)
