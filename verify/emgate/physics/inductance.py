"""Inductances of one phase: magnetising, end-winding and harmonic leakage, synchronous.

The magnetising inductance of the gap's fundamental field (and a salient pole's d- and
q-axis share of it), the leakage of the end windings and of the gap's harmonic fields, and
from them the synchronous inductance of a surface-magnet machine. The slot leakage is
:mod:`emgate.physics.slot_leakage`; what the inductances give on load (fault current, torque
constant, power factor, excitation EMF) is :mod:`emgate.physics.performance`.

Inductances are per phase [H] under balanced m-phase currents. Formulas are plain
arithmetic, so arrays sweep as well as floats.
"""

from __future__ import annotations

import math

import numpy as np

from emgate.physics._checks import Num, check_all_non_negative, check_all_positive, float_or_array
from emgate.physics.constants import MU0

__all__ = [
    "end_winding_inductance",
    "harmonic_leakage_inductance",
    "magnetising_inductance",
    "salient_pole_axis_factors",
    "synchronous_inductance",
]


# --- the gap's fundamental field -------------------------------------------------------------


def magnetising_inductance(
    phases: int,
    series_turns: Num,
    winding_factor: Num,
    diameter: Num,
    stack_length: Num,
    pole_pairs: int,
    effective_gap: Num,
) -> Num:
    """Magnetising inductance of an m-phase winding over a uniform gap.

    L_m = (m / pi) mu0 (kw1 N)^2 D l / (p^2 g_e) = (2 m / pi^2) mu0 (kw1 N)^2 tau_p l /
    (p g_e): the fundamental gap field of one phase, B1 = mu0 (4/pi) kw1 N i / (2 p g_e),
    gives the flux per pole (2/pi) B1 tau_p l = B1 D l / p, linked by kw1 N turns; the other
    phases add (m/2 - 1) times as much under balanced currents (m/2 times the single-phase
    self-inductance L_aa0 = (2/pi) mu0 (kw1 N)^2 D l / (p^2 g_e); three phases 3/2 L_aa0).

    Parameters
    ----------
    phases : int
        Number of phases m.
    series_turns : float or numpy.ndarray
        Series turns per phase N [-].
    winding_factor : float or numpy.ndarray
        Winding factor of the working harmonic kw1 [-], 0 < kw1 <= 1.
    diameter : float or numpy.ndarray
        Diameter of the gap (the bore) D [m].
    stack_length : float or numpy.ndarray
        Axial length l [m].
    pole_pairs : int
        Number of pole pairs p.
    effective_gap : float or numpy.ndarray
        Gap with Carter's coefficient (and for surface magnets the magnet's h_m / mu_rec),
        g_e [m]; divide by a saturation factor's reciprocal to include the iron.

    Returns
    -------
    float or numpy.ndarray
        L_m [H].

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, S. Umans, *Electric Machinery*, McGraw-Hill, the
    synchronous inductance of a cylindrical machine L_s = L_aa0 + |L_ab| + L_al
    (from memory); J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical
    Machines*, Wiley, ch. 3, L_m = (2 m / pi^2) mu0 tau_p l (kw1 N)^2 / (p g_e) (from memory).
    """
    check_all_positive(
        "magnetising inductance inputs", phases, series_turns, diameter, stack_length
    )
    check_all_positive("pole pairs and effective gap", pole_pairs, effective_gap)
    check_all_positive("winding factor", winding_factor)
    return float_or_array(
        phases
        / math.pi
        * MU0
        * (winding_factor * series_turns) ** 2
        * diameter
        * stack_length
        / (pole_pairs**2 * effective_gap)
    )


def salient_pole_axis_factors(pole_arc: Num) -> tuple[Num, Num]:
    """Fundamental gap permeance of a salient pole in the d- and q-axis, over a uniform gap's.

    A pole shoe of arc alpha (of the pole pitch) over a constant gap, nothing between the
    poles, under a sinusoidal armature MMF: C_d = alpha + sin(alpha pi) / pi with the MMF's
    crest on the pole centre, C_q = alpha - sin(alpha pi) / pi with it between the poles;
    fringing neglected (it raises both a little).

    Parameters
    ----------
    pole_arc : float or numpy.ndarray
        Pole-shoe arc alpha as a fraction of the pole pitch, 0 < alpha <= 1.

    Returns
    -------
    tuple
        (C_d, C_q) [-]; L_md = C_d L_m and L_mq = C_q L_m with L_m on the gap under the pole.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, ch. 7, the d- and q-axis armature reaction of salient poles (from memory); the
    fundamental of the flux density cos(theta) over |theta| < alpha pi / 2 (derivation).
    """
    a = np.asarray(pole_arc, dtype=float)
    if not (np.all(a > 0.0) and np.all(a <= 1.0)):
        raise ValueError(f"pole arc must be in (0, 1], got {pole_arc!r}")
    s = np.sin(np.pi * pole_arc) / np.pi
    return float_or_array(pole_arc + s), float_or_array(pole_arc - s)


# --- end windings and gap harmonics ---------------------------------------------------------


def end_winding_inductance(
    bundles_per_phase: Num,
    turns_per_bundle: Num,
    end_length: Num,
    bundle_radius: Num,
    parallel_paths: int = 1,
) -> Num:
    """End-winding leakage inductance of a phase from the coil ends as circular loops.

    Each bundle (a coil, or a group of adjacent coils of one phase that share their ends)
    has its end connections at both ends taken together as one circular loop of the same
    length in air, of radius R = l_e / (2 pi) and wire radius r (the bundle's section as a
    circle): L = mu0 z^2 R (ln(8 R / r) - 2), z the bundle's turns. Bundles of a phase are
    in series; their mutual coupling and the image of the stator's end face are neglected
    (both raise the inductance a little, so the estimate is low: a short-circuit current
    from it is high, the safe side). Where the loop is not large against the bundle
    (ln(8 R / r) < 2) the end leakage is taken as zero.

    Parameters
    ----------
    bundles_per_phase : float or numpy.ndarray
        Bundles of phase A [-].
    turns_per_bundle : float or numpy.ndarray
        Turns of one bundle z [-].
    end_length : float or numpy.ndarray
        End-connection length of one turn, both ends together l_e [m].
    bundle_radius : float or numpy.ndarray
        Radius of a circle of the bundle's section r [m].
    parallel_paths : int
        Parallel paths a; the phase inductance is that of the series bundles over a^2.

    Returns
    -------
    float or numpy.ndarray
        L_ew [H].

    References
    ----------
    E. B. Rosa, F. W. Grover, "Formulas and tables for the calculation of mutual and
    self-inductance", Bull. Bureau of Standards 8 (1912), the circular loop
    L = mu0 R (ln(8 R / r) - 2) for a current on the wire surface (from memory); the
    approach of an end turn as a loop in air: D. Hanselman, *Brushless Permanent Magnet
    Motor Design* (from memory).
    """
    check_all_positive("end-winding inputs", bundles_per_phase, turns_per_bundle, end_length)
    check_all_positive("bundle radius and parallel paths", bundle_radius, parallel_paths)
    radius = end_length / (2.0 * np.pi)
    shape = np.maximum(np.log(8.0 * radius / bundle_radius) - 2.0, 0.0)
    return float_or_array(
        bundles_per_phase * MU0 * turns_per_bundle**2 * radius * shape / parallel_paths**2
    )


def harmonic_leakage_inductance(magnetising: Num, coefficient: Num) -> Num:
    """Harmonic (differential) leakage inductance, sigma_delta L_m.

    The gap's harmonic fields of the winding's own MMF induce fundamental-frequency EMF in
    it; over a uniform gap their sum relative to the working harmonic's is
    sigma_delta = sum over n != p of (p kw_n / (n kw_p))^2 = THD^2 of the staircase MMF
    (:func:`emgate.physics.mmf.mmf_thd`, sub-harmonics included).

    Parameters
    ----------
    magnetising : float or numpy.ndarray
        Magnetising inductance L_m [H].
    coefficient : float or numpy.ndarray
        Harmonic leakage coefficient sigma_delta [-] (THD squared).

    Returns
    -------
    float or numpy.ndarray
        L_delta [H].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, sec. 4.2, the air-gap (harmonic) leakage factor sigma_delta (from memory).
    """
    check_all_non_negative(
        "magnetising inductance and harmonic coefficient", magnetising, coefficient
    )
    return float_or_array(magnetising * coefficient)


def synchronous_inductance(
    magnetising: Num, harmonic_coefficient: Num, slot_leakage: Num, end_leakage: Num
) -> Num:
    """Synchronous inductance of a non-salient machine (surface magnets), per phase.

    L_s = L_m (1 + sigma_delta) + L_u + L_ew: the whole gap field of the winding (the
    fundamental and its harmonics, each of which links the winding at the supply frequency)
    and the slot and end leakage. Rotor eddy currents that screen the harmonic fields lower
    it, and iron saturation too.

    Parameters
    ----------
    magnetising : float or numpy.ndarray
        L_m over the magnetic gap (the magnet counts as gap) [H].
    harmonic_coefficient : float or numpy.ndarray
        sigma_delta [-].
    slot_leakage, end_leakage : float or numpy.ndarray
        L_u and L_ew [H].

    Returns
    -------
    float or numpy.ndarray
        L_s [H].

    References
    ----------
    J. R. Hendershot, T. J. E. Miller, *Design of Brushless Permanent-Magnet Machines*,
    the synchronous inductance of a surface-magnet machine as gap plus leakage (from
    memory); J. Pyrhonen et al., sec. 4.2 for sigma_delta (from memory).
    """
    check_all_non_negative(
        "inductances", magnetising, harmonic_coefficient, slot_leakage, end_leakage
    )
    return float_or_array(magnetising * (1.0 + harmonic_coefficient) + slot_leakage + end_leakage)
