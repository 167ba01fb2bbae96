"""Losses other than iron, the energy balance and the efficiency.

Iron loss is in :mod:`emgate.physics.iron_loss` and :mod:`emgate.physics.core_loss`; stator
copper loss ``m I^2 R`` in :mod:`emgate.physics.resistance`. Here: rotor losses by machine
kind (cage, field winding with brushes, surface-magnet eddy currents), the IEC 60034-2-1
assigned allowance for additional load losses, a friction-and-windage estimate, and the
balance of a motor or a generator.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Literal, NamedTuple

import numpy as np

from emgate.physics.constants import MU0

Operation = Literal["motor", "generator"]

#: Voltage drop per brush [V]: 1.0 V for carbon and graphite brushes, 0.3 V for metal-carbon
#: ones [from memory: IEC 60034-2-1, brush loss].
BRUSH_DROP_CARBON: float = 1.0
BRUSH_DROP_METAL_CARBON: float = 0.3
#: Resistivity of sintered NdFeB [ohm m], 1.4-1.6 uOhm m in producers' datasheets (from
#: memory); the lower end gives the larger eddy loss.
NDFEB_RESISTIVITY: float = 1.4e-6


# --- slip and the rotor --------------------------------------------------------------------


def air_gap_power(mechanical_power: float, slip: float) -> float:
    """Power crossing the gap of an induction machine, ``P_mech / (1 - s)`` [W].

    Parameters
    ----------
    mechanical_power : float
        Internal mechanical power ``(1 - s) P_gap`` [W]: for a motor the shaft output plus
        friction and windage; for a generator (s < 0) the shaft input less them.
    slip : float
        [-], below 1.

    Returns
    -------
    float
        [W].

    References
    ----------
    Power flow of the induction machine, P_mech = (1 - s) P_gap [mem: Fitzgerald and
    Kingsley, Electric Machinery; Chapman, Electric Machinery Fundamentals].
    """
    if not slip < 1.0:
        raise ValueError("slip must be < 1")
    return mechanical_power / (1.0 - slip)


def cage_loss(slip: float | np.ndarray, gap_power: float | np.ndarray) -> float | np.ndarray:
    """Rotor cage loss ``|s| P_gap`` [W].

    Parameters
    ----------
    slip : float or numpy.ndarray
        [-].
    gap_power : float or numpy.ndarray
        [W].

    Returns
    -------
    float or numpy.ndarray
        [W]; the slip-frequency loss of the fundamental only (harmonic rotor losses are
        in the stray-load allowance).

    References
    ----------
    [mem: Fitzgerald and Kingsley, Electric Machinery; IEC 60034-2-1, rotor winding losses
    P_r = s (P1 - P_s - P_fe)].
    """
    out = np.abs(np.asarray(slip)) * np.abs(np.asarray(gap_power))
    return float(out) if np.ndim(out) == 0 else out


def field_winding_loss(
    field_current: float,
    field_resistance: float,
    *,
    brushes: int = 0,
    brush_drop: float = BRUSH_DROP_CARBON,
) -> float:
    """Field copper loss plus the electrical loss of its brushes [W].

    Parameters
    ----------
    field_current : float
        DC field current [A].
    field_resistance : float
        At the temperature wanted [ohm].
    brushes : int, optional
        Brushes in the field circuit (two for one slip-ring pair); 0 for a brushless
        exciter (its own loss is outside this machine).
    brush_drop : float, optional
        Voltage drop per brush [V].

    Returns
    -------
    float
        ``I_f^2 R_f + n_b U_b I_f`` [W].

    References
    ----------
    [from memory: IEC 60034-2-1, excitation-circuit and brush losses].
    """
    if field_current < 0.0 or field_resistance < 0.0 or brushes < 0:
        raise ValueError("field current, resistance and brushes must be >= 0")
    return field_current**2 * field_resistance + brushes * brush_drop * field_current


def magnet_eddy_loss(
    orders: Sequence[int] | np.ndarray,
    mmf: Sequence[float] | np.ndarray,
    directions: Sequence[int] | np.ndarray,
    *,
    pole_pairs: int,
    frequency: float,
    magnetic_gap: float,
    rotor_radius: float,
    magnet_volume: float,
    resistivity: float = NDFEB_RESISTIVITY,
) -> float:
    """Eddy loss in surface magnets from the asynchronous harmonics of the stator MMF.

    Each mechanical order ``n != p`` of the stator MMF with peak ``F_n`` [A] makes a gap
    wave ``B_n = mu0 F_n / g_m`` (``g_m`` the magnetic gap, Carter's coefficient included,
    iron infinitely permeable); it travels at ``d omega / n`` (``d`` = +1 forward, -1
    backward) while the rotor turns at ``omega / p``, so the magnet sees it at the angular
    frequency ``omega_n = |n / p - d| omega``. Taking the wave into the magnet undiminished
    and letting it drive axial currents in a conductor of unlimited length (no end-return
    path, no segmentation, no reaction field: resistance-limited), the mean loss density is

        p_n = omega_n^2 B_n^2 R^2 / (2 rho n^2)   [W/m^3]

    (E = (omega_n R / n) B_n along the axis, p = E^2 / (2 rho) on the mean), summed over
    the orders. Each simplification raises the estimate (conservative): segmentation,
    finite length and the decay of the wave into the magnet all lower the real loss,
    often by an order of magnitude. NOT included: slotting (permeance) harmonics and
    current time harmonics from an inverter, which can dominate in practice; the estimate
    is a first check, not a value to design on.

    Parameters
    ----------
    orders : sequence of int
        Mechanical orders ``n`` [-].
    mmf : sequence of float
        Peak ampere-turns ``F_n`` [A] of each order.
    directions : sequence of int
        +1 forward, -1 backward (relative to the working wave).
    pole_pairs : int
        ``p`` [-]; the working order carries no loss.
    frequency : float
        Electrical frequency [Hz].
    magnetic_gap : float
        ``g_m = kc (g + sleeve + h_m / mu_rec)`` [m].
    rotor_radius : float
        Radius at the magnet surface [m].
    magnet_volume : float
        [m^3].
    resistivity : float, optional
        Magnet resistivity [ohm m].

    Returns
    -------
    float
        [W].

    References
    ----------
    Travelling-wave eddy currents in a thin conducting layer, resistance limited
    [calc; the method as in mem: Zhu, Ng, Schofield, Howe, "Improved analytical modelling
    of rotor eddy current loss in brushless machines equipped with surface-mounted
    permanent magnets", IEE Proc. Electr. Power Appl. 151(6), 2004, of which this is the
    simplest, unsegmented, unbounded case].
    """
    n = np.asarray(orders, dtype=float)
    f_n = np.asarray(mmf, dtype=float)
    d = np.asarray(directions, dtype=float)
    if not (magnetic_gap > 0.0 and rotor_radius > 0.0 and resistivity > 0.0):
        raise ValueError("gap, radius and resistivity must be > 0")
    if np.any(n <= 0) or n.shape != f_n.shape or n.shape != d.shape:
        raise ValueError("orders must be > 0 and the three arrays equal in shape")
    keep = n != pole_pairs
    omega = 2.0 * math.pi * frequency
    w_n = np.abs(n[keep] / pole_pairs - d[keep]) * omega
    b_n = MU0 * f_n[keep] / magnetic_gap
    density = w_n**2 * b_n**2 * rotor_radius**2 / (2.0 * resistivity * n[keep] ** 2)
    return float(np.sum(density) * magnet_volume)


# --- stray load, friction and windage --------------------------------------------------------


def stray_load_allowance(input_power: float, rated_output: float) -> float:
    """Assigned additional-load losses of IEC 60034-2-1 [W].

    Parameters
    ----------
    input_power : float
        ``P1`` [W].
    rated_output : float
        ``P2`` [W].

    Returns
    -------
    float
        ``P_LL = P1 (0.025 - 0.005 log10(P2 / 1 kW))`` for 1 kW < P2 < 10 MW; 2.5 % of P1
        up to 1 kW and 0.5 % from 10 MW (continuous at both ends) [W].

    References
    ----------
    IEC 60034-2-1:2014, assigned allowance for additional load losses [from memory, verify
    against the standard].
    """
    if input_power < 0.0 or not rated_output > 0.0:
        raise ValueError("input power must be >= 0 and rated output > 0")
    kw = rated_output / 1e3
    share = 0.025 - 0.005 * math.log10(min(max(kw, 1.0), 1e4))
    return share * input_power


#: Friction-and-windage coefficient k [W s^2 / m^4] of the estimate k D (l + 0.6 tau_p) v^2:
#: 15 with a shaft fan (IC411 and open self-ventilated), 10 without one (common practice,
#: after the form recalled from Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical
#: Machines, friction and windage; from memory).
FRICTION_COEFFICIENT_FAN: float = 15.0
FRICTION_COEFFICIENT: float = 10.0


def friction_windage_estimate(
    rotor_diameter: float,
    stack_length: float,
    pole_pitch: float,
    speed: float,
    *,
    shaft_fan: bool,
) -> float:
    """Friction and windage estimate ``k D (l + 0.6 tau_p) v^2`` [W].

    Parameters
    ----------
    rotor_diameter : float
        ``D`` [m].
    stack_length : float
        ``l`` [m].
    pole_pitch : float
        ``tau_p`` [m].
    speed : float
        [1/s].
    shaft_fan : bool
        A fan on the shaft (adds its windage).

    Returns
    -------
    float
        [W], ``v = pi D n`` the surface speed. An estimate for small and medium machines
        (common practice, no source beyond the form recalled above); a declared measured
        value wins.

    References
    ----------
    [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines,
    estimate of friction and windage losses].
    """
    if min(rotor_diameter, stack_length, pole_pitch) <= 0.0 or speed < 0.0:
        raise ValueError("dimensions must be > 0 and speed >= 0")
    k = FRICTION_COEFFICIENT_FAN if shaft_fan else FRICTION_COEFFICIENT
    v = math.pi * rotor_diameter * speed
    return k * rotor_diameter * (stack_length + 0.6 * pole_pitch) * v**2


# --- balance -------------------------------------------------------------------------------


class Balance(NamedTuple):
    """Energy balance of one operating point [W].

    Parameters
    ----------
    input_power, output_power, losses : float
        [W]; input = output + losses exactly.
    """

    input_power: float
    output_power: float
    losses: float

    @property
    def efficiency(self) -> float:
        """Output over input [-]."""
        return self.output_power / self.input_power


def energy_balance(rated_power: float, losses: float, operation: Operation) -> Balance:
    """Input and output from the rated power and the total loss.

    Parameters
    ----------
    rated_power : float
        The rating's power [W]: shaft output of a motor, electrical output of a generator.
    losses : float
        Total loss [W], >= 0.
    operation : {"motor", "generator"}

    Returns
    -------
    Balance
        Motor: input = output + losses; generator: the rating is the output, so the shaft
        input is output + losses too (output = input - losses). In both, the rated power
        is the output.

    References
    ----------
    Conservation of energy; IEC 60034-2-1, efficiency from the summation of losses [from
    memory].
    """
    if not rated_power > 0.0 or losses < 0.0:
        raise ValueError("rated power must be > 0 and losses >= 0")
    if operation not in ("motor", "generator"):
        raise ValueError(f"operation must be 'motor' or 'generator', got {operation!r}")
    return Balance(rated_power + losses, rated_power, losses)


def input_power_with_allowance(
    output_power: float, other_losses: float, rated_output: float
) -> float:
    """Input ``P1`` when the allowance is a share of ``P1`` itself [W] (motor or generator).

    ``P1 = P2 + L + a P1``, so ``P1 = (P2 + L) / (1 - a)``, a the IEC 60034-2-1 share at the
    rated output (:func:`stray_load_allowance`).

    Parameters
    ----------
    output_power : float
        ``P2`` [W].
    other_losses : float
        All losses but the additional load losses [W].
    rated_output : float
        [W], sets the share.

    Returns
    -------
    float
        [W].

    References
    ----------
    [calc] from :func:`stray_load_allowance`.
    """
    share = stray_load_allowance(1.0, rated_output)
    return (output_power + other_losses) / (1.0 - share)


# --- travelling waves of the stator MMF ------------------------------------------------------


class TravellingWaves(NamedTuple):
    """The stator MMF as travelling waves (peak ampere-turns per order and direction).

    Parameters
    ----------
    orders : numpy.ndarray
        Mechanical orders ``n`` [-].
    amplitudes : numpy.ndarray
        Peak ``F_n`` [A].
    directions : numpy.ndarray
        +1 with the working wave (order p), -1 against it.
    """

    orders: np.ndarray
    amplitudes: np.ndarray
    directions: np.ndarray


def mmf_travelling_waves(
    layout: np.ndarray, turns_per_coil: float, current_rms: float, pole_pairs: int, max_order: int
) -> TravellingWaves:
    """Split the staircase MMF of balanced sinusoidal currents into travelling waves.

    With slot ampere-conductors ``a_s(t) = Re{A_s e^(j w t)}``, ``A_s = a_s(0) - j a_s(T/4)``,
    the order-n phasor sum ``X_n(t) = sum_s a_s(t) e^(j n theta_s)`` is ``(P_n e^(j w t) +
    Q_n e^(-j w t)) / 2`` with ``P_n = sum A_s e^(j n theta_s)`` and ``Q_n`` the same with
    conj(A_s): two waves of peak ``|P_n| / (2 pi n)`` and ``|Q_n| / (2 pi n)`` travelling in
    opposite directions. The one that carries the working order p sets the forward sense.

    Parameters
    ----------
    layout : numpy.ndarray
        Shape (m, Q).
    turns_per_coil : float
    current_rms : float
        Conductor current, rms [A] (phase current over parallel paths).
    pole_pairs : int
    max_order : int
        Highest mechanical order kept.

    Returns
    -------
    TravellingWaves
        Both directions of every order 1..max_order with a non-zero amplitude.

    References
    ----------
    Slot phasor sums [Skaar, Kroevel, Nilssen, ICEM 2006]; the split into two travelling
    waves [calc].
    """
    from emgate.physics.mmf import balanced_currents, slot_ampere_conductors
    from emgate.physics.winding import harmonic_phasors

    m = np.asarray(layout).shape[0]
    a0 = slot_ampere_conductors(layout, turns_per_coil, balanced_currents(m, current_rms, 0.0))
    a1 = slot_ampere_conductors(
        layout, turns_per_coil, balanced_currents(m, current_rms, 0.5 * math.pi)
    )
    n = np.arange(1, int(max_order) + 1)
    p_n = harmonic_phasors(a0, n) - 1j * harmonic_phasors(a1, n)
    q_n = harmonic_phasors(a0, n) + 1j * harmonic_phasors(a1, n)
    amp_p = np.abs(p_n) / (2.0 * math.pi * n)
    amp_q = np.abs(q_n) / (2.0 * math.pi * n)
    p_forward = amp_p[pole_pairs - 1] >= amp_q[pole_pairs - 1]
    orders = np.concatenate((n, n))
    amps = np.concatenate((amp_p, amp_q))
    dirs = np.concatenate((np.ones(n.size), -np.ones(n.size)))
    if not p_forward:
        dirs = -dirs
    keep = amps > 1e-12 * max(float(amps.max()), 1e-300)
    return TravellingWaves(orders[keep], amps[keep], dirs[keep].astype(int))
