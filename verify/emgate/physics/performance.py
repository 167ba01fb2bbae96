"""What the phase circuit gives on load: fault current, torque, power factor, field EMF.

From the inductances (:mod:`emgate.physics.inductance`, :mod:`emgate.physics.slot_leakage`)
and the magnetic circuit: the short-circuit (characteristic) current and torque constant of a
surface-magnet machine; the magnetising current and power factor of an induction machine;
the excitation EMF of a wound-field machine on load and the armature's MMF referred to its
field; torque and air-gap shear stress. (The no-load EMF is
:func:`emgate.physics.winding_factors.phase_emf`, the magnet's field strength under a
demagnetising current
:func:`emgate.physics.magnetic_surface_pm.magnet_field_under_current`.)

EMFs and currents rms unless stated. Formulas are plain arithmetic, so arrays sweep as well
as floats.
"""

from __future__ import annotations

import numpy as np

from emgate.physics._checks import Num, check_all_non_negative, check_all_positive, float_or_array

__all__ = [
    "armature_reaction_on_field",
    "excitation_emf",
    "magnetising_current",
    "power_factor_estimate",
    "shaft_torque",
    "shear_stress",
    "short_circuit_current",
    "torque_constant",
]


# --- surface magnets: fault current and torque -----------------------------------------------


def short_circuit_current(emf: Num, frequency: Num, inductance: Num, resistance: Num = 0.0) -> Num:
    """Steady three-phase short-circuit current of a magnet machine, rms.

    I_k = E / |R + j omega L_s| = psi / sqrt(L_s^2 + (R / omega)^2), psi = E / omega the
    magnet's flux linkage (rms); with R = 0 the characteristic current psi / L_s, the
    highest (a resistance only lowers it). It lies on the d-axis, against the magnets.
    The first half-period of a sudden short circuit from no load reaches up to twice its
    peak on the d-axis (the stator flux held while the rotor turns by pi); the steady value
    is returned.

    Parameters
    ----------
    emf : float or numpy.ndarray
        No-load phase EMF E at ``frequency``, rms [V].
    frequency : float or numpy.ndarray
        Electrical frequency f [Hz].
    inductance : float or numpy.ndarray
        Synchronous inductance L_s [H].
    resistance : float or numpy.ndarray, optional
        Phase resistance R [ohm] (default 0).

    Returns
    -------
    float or numpy.ndarray
        I_k [A], rms.

    References
    ----------
    J. R. Hendershot, T. J. E. Miller, *Design of Brushless Permanent-Magnet Machines*,
    the characteristic current psi / L_d (from memory); A. E. Fitzgerald, C. Kingsley,
    S. Umans, *Electric Machinery*, the synchronous-machine short circuit (from memory).
    """
    check_all_positive("EMF, frequency and inductance", emf, frequency, inductance)
    check_all_non_negative("resistance", resistance)
    omega = 2.0 * np.pi * frequency
    return float_or_array(emf / np.hypot(resistance, omega * inductance))


def torque_constant(phases: int, emf: Num, frequency: Num, pole_pairs: int) -> Num:
    """Torque per ampere (rms) of a sine-wave magnet machine with its current on the q-axis.

    k_T = T / I = m p psi = m p E / omega, psi = E / omega the phase flux linkage rms
    (T = m E I / Omega, Omega = omega / p).

    Parameters
    ----------
    phases : int
        Number of phases m.
    emf : float or numpy.ndarray
        No-load phase EMF E at ``frequency``, rms [V].
    frequency : float or numpy.ndarray
        Electrical frequency f [Hz].
    pole_pairs : int
        Number of pole pairs p.

    Returns
    -------
    float or numpy.ndarray
        k_T [N m / A].

    References
    ----------
    J. R. Hendershot, T. J. E. Miller, *Design of Brushless Permanent-Magnet Machines*,
    torque and EMF constants of a sine-wave machine (from memory).
    """
    check_all_positive("torque-constant inputs", phases, emf, frequency, pole_pairs)
    return float_or_array(phases * pole_pairs * emf / (2.0 * np.pi * frequency))


# --- induction machines ---------------------------------------------------------------------


def magnetising_current(
    total_mmf: Num, phases: int, series_turns: Num, winding_factor: Num, pole_pairs: int
) -> Num:
    """Magnetising current of an induction machine, rms.

    I_m = pi p F / (sqrt(2) m kw1 N): the phase current whose rotating fundamental MMF
    (sqrt(2) m / pi) kw1 N I / p equals the magnetic circuit's ampere-turns per pole F (gap,
    teeth and yokes at the working flux), so saturation is included.

    Parameters
    ----------
    total_mmf : float or numpy.ndarray
        Peak ampere-turns per pole of the whole magnetic loop F [A].
    phases : int
        Number of phases m.
    series_turns : float or numpy.ndarray
        Series turns per phase N [-].
    winding_factor : float or numpy.ndarray
        kw1 [-].
    pole_pairs : int
        Number of pole pairs p.

    Returns
    -------
    float or numpy.ndarray
        I_m [A], rms.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, ch. 3, I_m = pi p U_m,tot / (m kw1 N sqrt 2) (from memory).
    """
    check_all_positive(
        "magnetising-current inputs", total_mmf, phases, series_turns, winding_factor
    )
    check_all_positive("pole pairs", pole_pairs)
    return float_or_array(
        np.pi * pole_pairs * total_mmf / (np.sqrt(2.0) * phases * winding_factor * series_turns)
    )


def power_factor_estimate(
    active_current: Num,
    magnetising_current: Num,
    emf: Num,
    phase_voltage: Num,
    stator_leakage_reactance: Num,
    rotor_leakage_reactance: Num,
) -> Num:
    """Power factor of an induction machine at a load, from its active current, its
    magnetising current and its leakage reactances (no rated current needed).

    The reactive power of one phase of the T equivalent circuit,
    U I_r = E I_m + X_1 I_1^2 + X_2' I_2'^2, with I_1^2 = I_a^2 + I_r^2 and the rotor current
    the stator current less the magnetising current, E taken in phase with U:
    I_2'^2 = I_a^2 + (I_r - I_q)^2, I_q = E I_m / U. That is a quadratic in I_r,
    a I_r^2 - b I_r + c = 0 with a = X_1 + X_2', b = U + 2 X_2' I_q and
    c = E I_m + a I_a^2 + X_2' I_q^2, whose smaller root (the stable branch) is
    I_r = 2 c / (b + sqrt(b^2 - 4 a c)); cos phi = I_a / sqrt(I_a^2 + I_r^2). The iron-loss
    current, part of I_a, is carried through the rotor branch (a small overstatement of
    I_2'). Without a real root (b^2 < 4 a c) the active current is more than the leakage
    lets the machine carry (past pull-out): NaN.

    Parameters
    ----------
    active_current : float or numpy.ndarray
        I_a = P_e / (m U), P_e the electrical power (a motor's input) [A], rms.
    magnetising_current : float or numpy.ndarray
        I_m at the EMF E [A], rms.
    emf : float or numpy.ndarray
        Air-gap EMF E behind the stator impedance [V], rms.
    phase_voltage : float or numpy.ndarray
        Terminal phase voltage U [V], rms.
    stator_leakage_reactance, rotor_leakage_reactance : float or numpy.ndarray
        X_1 and X_2' (referred to the stator) [ohm], >= 0.

    Returns
    -------
    float or numpy.ndarray
        cos phi [-], lagging.

    References
    ----------
    The T equivalent circuit of the induction machine and its reactive power: S. J. Chapman,
    *Electric Machinery Fundamentals*, McGraw-Hill, ch. "Induction motors", the equivalent
    circuit and its power flow (from memory); the quadratic is derived here.
    """
    check_all_positive(
        "power-factor inputs", active_current, magnetising_current, emf, phase_voltage
    )
    check_all_non_negative("leakage reactances", stator_leakage_reactance, rotor_leakage_reactance)
    ia = np.asarray(active_current, dtype=float)
    iq = np.asarray(emf, dtype=float) * magnetising_current / phase_voltage
    x2 = np.asarray(rotor_leakage_reactance, dtype=float)
    a = stator_leakage_reactance + x2
    b = phase_voltage + 2.0 * x2 * iq
    c = np.asarray(emf, dtype=float) * magnetising_current + a * ia**2 + x2 * iq**2
    disc = b**2 - 4.0 * a * c
    with np.errstate(invalid="ignore"):
        reactive = np.where(disc >= 0.0, 2.0 * c / (b + np.sqrt(np.maximum(disc, 0.0))), np.nan)
    return float_or_array(ia / np.hypot(ia, reactive))


# --- wound-field generators --------------------------------------------------------------


def excitation_emf(
    phase_voltage: Num,
    phase_current: Num,
    power_factor: Num,
    reactance: Num,
    resistance: Num = 0.0,
    *,
    leading: bool = False,
    motoring: bool = False,
) -> tuple[Num, Num]:
    """Excitation EMF of a synchronous machine on load from the cylindrical-rotor diagram.

    Generator: E = U + (R + j X_s) I with U on the real axis and I lagging it by
    phi = acos(cos phi) (leading with ``leading``); motor (``motoring``): E = U - (R + j X_s) I,
    an over-excited motor's current leading. The non-salient (one-reaction) diagram: for a
    salient-pole machine with X_s = X_d it overrates E against the two-reaction diagram
    (X_q < X_d) when over-excited, so the field current from it errs on the high side.

    Parameters
    ----------
    phase_voltage : float or numpy.ndarray
        Terminal phase voltage U, rms [V].
    phase_current : float or numpy.ndarray
        Phase current I, rms [A], >= 0.
    power_factor : float or numpy.ndarray
        cos phi, 0 < cos phi <= 1.
    reactance : float or numpy.ndarray
        Synchronous reactance X_s [ohm] (X_d for salient poles), >= 0.
    resistance : float or numpy.ndarray, optional
        Phase resistance R [ohm] (default 0).
    leading : bool
        Whether the current leads the voltage (an under-excited generator).
    motoring : bool
        Whether the machine is a motor (current into the terminals).

    Returns
    -------
    tuple
        (E [V] rms, load angle delta [rad] by which E leads U).

    References
    ----------
    S. J. Chapman, *Electric Machinery Fundamentals*, McGraw-Hill, ch. 4 (synchronous
    generators: the phasor diagram E_A = V_phi + R_A I_A + j X_S I_A; from memory);
    A. E. Fitzgerald, C. Kingsley, S. Umans, *Electric Machinery* (from memory).
    """
    check_all_positive("phase voltage", phase_voltage)
    check_all_non_negative(
        "current, reactance and resistance", phase_current, reactance, resistance
    )
    pf = np.asarray(power_factor, dtype=float)
    if not (np.all(pf > 0.0) and np.all(pf <= 1.0)):
        raise ValueError(f"power factor must be in (0, 1], got {power_factor!r}")
    phi = np.arccos(pf) * (1.0 if leading else -1.0)
    current = phase_current * np.exp(1j * phi)
    drop = (resistance + 1j * reactance) * current
    e = phase_voltage - drop if motoring else phase_voltage + drop
    mag, angle = np.abs(e), np.angle(e)
    if np.ndim(mag) == 0:
        return float(mag), float(angle)
    return mag, angle


def armature_reaction_on_field(armature_mmf: Num, axis_factor: Num, pole_arc: Num) -> Num:
    """The armature's MMF referred to a salient pole's field winding.

    A field MMF F_f per pole, constant over the pole shoe (arc alpha of the pole pitch, a
    uniform gap), has a gap flux-density fundamental (4/pi) sin(alpha pi / 2) times its
    own; the armature's rotating fundamental F_1 on the d-axis gives C_d times its own
    (:func:`emgate.physics.inductance.salient_pole_axis_factors`). The field ampere-turns
    with the same fundamental: F_f,eq = C_d F_1 / ((4/pi) sin(alpha pi / 2)).

    Parameters
    ----------
    armature_mmf : float or numpy.ndarray
        Peak rotating fundamental of the armature, ampere-turns per pole F_1 [A].
    axis_factor : float or numpy.ndarray
        C_d (or C_q) [-].
    pole_arc : float or numpy.ndarray
        Pole-shoe arc alpha as a fraction of the pole pitch.

    Returns
    -------
    float or numpy.ndarray
        F_f,eq [A], ampere-turns per pole of the field.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, ch. 7, the armature reaction of salient-pole machines and the field's share of
    the no-load characteristic (from memory); the fundamentals by derivation.
    """
    check_all_non_negative("armature MMF", armature_mmf)
    check_all_positive("axis factor and pole arc", axis_factor, pole_arc)
    return float_or_array(
        axis_factor * armature_mmf / (4.0 / np.pi * np.sin(np.pi * pole_arc / 2.0))
    )


# --- torque -------------------------------------------------------------------------------


def shaft_torque(power: Num, speed: Num) -> Num:
    """Torque from power and speed, T = P / (2 pi n).

    Parameters
    ----------
    power : float or numpy.ndarray
        Power P [W] (shaft power of a motor, or the generator's input).
    speed : float or numpy.ndarray
        Speed n [1/s] (revolutions per second).

    Returns
    -------
    float or numpy.ndarray
        T [N m].

    References
    ----------
    Definition of mechanical power, P = T Omega, Omega = 2 pi n.
    """
    check_all_positive("power and speed", power, speed)
    return float_or_array(power / (2.0 * np.pi * speed))


def shear_stress(torque: Num, rotor_diameter: Num, stack_length: Num) -> Num:
    """Air-gap tangential stress, sigma = T / (2 V_r), V_r = pi D_r^2 l / 4.

    The tangential force per unit rotor surface: T = sigma (pi D_r l) D_r / 2 = 2 sigma V_r.

    Parameters
    ----------
    torque : float or numpy.ndarray
        T [N m].
    rotor_diameter : float or numpy.ndarray
        Rotor outer diameter D_r [m].
    stack_length : float or numpy.ndarray
        l [m].

    Returns
    -------
    float or numpy.ndarray
        sigma [Pa].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, ch. 6, the tangential stress sigma_Ftan and T = 2 sigma V_r (from memory).
    """
    check_all_positive("torque, rotor diameter and length", torque, rotor_diameter, stack_length)
    volume = np.pi * rotor_diameter**2 * stack_length / 4.0
    return float_or_array(torque / (2.0 * volume))
