"""Inductances, fault currents, torque and the worst operating cases of a machine.

The circuit of one phase: the magnetising inductance of the gap's fundamental field, the
leakage of the slots, of the end windings and of the gap's harmonic fields; from them the
synchronous inductance of a surface-magnet machine, its short-circuit (characteristic)
current and torque constant; the magnetising current of an induction machine; the
excitation EMF of a wound-field generator on load; torque and air-gap shear stress. (The
no-load EMF is :func:`emgate.physics.winding.phase_emf`, the magnet's field strength under a
demagnetising current :func:`emgate.physics.magnetic.magnet_field_under_current`.)

Inductances are per phase [H] under balanced m-phase currents; EMFs and currents rms unless
stated. Formulas are plain arithmetic, so arrays sweep as well as floats; the slot-layout
functions take the (m, Q) layouts of :mod:`emgate.physics.winding`.
"""

from __future__ import annotations

import math

import numpy as np

from emgate.physics.constants import MU0
from emgate.physics.winding import as_layout

__all__ = [
    "armature_reaction_on_field",
    "end_winding_inductance",
    "excitation_emf",
    "harmonic_leakage_inductance",
    "magnetising_current",
    "magnetising_inductance",
    "open_slot_permeance",
    "salient_pole_axis_factors",
    "semi_closed_slot_permeance",
    "shaft_torque",
    "shear_stress",
    "short_circuit_current",
    "slot_leakage_factors",
    "slot_leakage_inductance",
    "synchronous_inductance",
    "torque_constant",
    "trapezoid_zone_permeance",
]

#: A float or an array of floats: the formulas sweep.
Num = float | np.ndarray


def _positive(name: str, *values: object) -> None:
    """Raise ValueError unless every value (float or array) is finite and > 0."""
    for v in values:
        a = np.asarray(v, dtype=float)
        if not (np.all(np.isfinite(a)) and np.all(a > 0.0)):
            raise ValueError(f"{name} must be finite and > 0, got {v!r}")


def _non_negative(name: str, *values: object) -> None:
    for v in values:
        a = np.asarray(v, dtype=float)
        if not (np.all(np.isfinite(a)) and np.all(a >= 0.0)):
            raise ValueError(f"{name} must be finite and >= 0, got {v!r}")


def _out(value: Num) -> Num:
    """A Python float for scalar inputs (numpy scalars compare to numpy bools), else the array."""
    return float(value) if np.ndim(value) == 0 else value


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
    _positive("magnetising inductance inputs", phases, series_turns, diameter, stack_length)
    _positive("pole pairs and effective gap", pole_pairs, effective_gap)
    _positive("winding factor", winding_factor)
    return _out(
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
    return _out(pole_arc + s), _out(pole_arc - s)


# --- slot leakage ------------------------------------------------------------------------


def trapezoid_zone_permeance(top_width: Num, bottom_width: Num, height: Num) -> Num:
    """Permeance coefficient of a slot's winding zone with uniform current density.

    Flux crossing the slot straight from tooth to tooth (iron of infinite permeability):
    at a height y above the bottom the field is H = I A(y) / (A b(y)), A(y) the zone's area
    below y, so lambda = integral of (A(y) / A)^2 / b(y) dy. For b rising linearly from
    b_0 (bottom) to b_1 (top) over h, with beta = b_0 / b_1,

        lambda = (h / b_1) [(1 - beta^4) / 4 - beta^2 (1 - beta^2) + beta^4 ln(1 / beta)]
                 / ((1 - beta) (1 - beta^2)^2),

    which tends to h / (3 b) for a rectangle (beta -> 1; a series is used within 0.03 of it,
    where the closed form loses digits).

    Parameters
    ----------
    top_width : float or numpy.ndarray
        Zone width at its gap side b_1 [m].
    bottom_width : float or numpy.ndarray
        Zone width at the slot bottom b_0 [m].
    height : float or numpy.ndarray
        Zone height h [m].

    Returns
    -------
    float or numpy.ndarray
        lambda [-], the zone's leakage inductance per mu0, per conductor squared, per unit
        length.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, sec. 4.3, slot leakage: lambda = h / (3 b) of a rectangular zone (from memory);
    the trapezoid by the same strip integration (derivation).
    """
    _positive("slot zone widths and height", top_width, bottom_width, height)
    b1 = np.asarray(top_width, dtype=float)
    beta = np.asarray(bottom_width, dtype=float) / b1
    e = 1.0 - beta
    with np.errstate(divide="ignore", invalid="ignore"):
        closed = (
            (1.0 - beta**4) / 4.0 - beta**2 * (1.0 - beta**2) + beta**4 * np.log(1.0 / beta)
        ) / (e * (1.0 - beta**2) ** 2)
    # Taylor series of the bracket in e = 1 - beta about the rectangle; below |e| = 0.03 it
    # is the more accurate (closed form: rounding / e^3; series: the next term ~ e^6 / 200)
    series = 1.0 / 3.0 - e**2 / 30.0 - e**3 / 40.0 - e**4 / 70.0 - e**5 / 140.0
    shape = np.where(np.abs(e) < 0.03, series, closed)
    return _out(height / b1 * shape)


def open_slot_permeance(
    width: Num, winding_height: Num, wedge_height: Num, k1: float = 1.0, k2: float = 1.0
) -> Num:
    """Slot-leakage permeance coefficient of an open rectangular slot.

    lambda = k1 h / (3 b) + k2 h_w / b: the winding zone of height h and the current-free
    wedge zone h_w above it, both b wide (the slot opening is the full slot width).

    Parameters
    ----------
    width : float or numpy.ndarray
        Slot width b [m].
    winding_height : float or numpy.ndarray
        Height of the winding zone h [m] (slot depth less the wedge).
    wedge_height : float or numpy.ndarray
        Height of the current-free zone between winding and gap h_w [m], >= 0.
    k1, k2 : float
        Factors of the winding zone and the current-free zone for a winding whose slots
        hold more than one phase (:func:`slot_leakage_factors`); 1 for one phase a slot.

    Returns
    -------
    float or numpy.ndarray
        lambda [-].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, sec. 4.3, lambda_u = k1 h4 / (3 b4) + k2 (h3 / b4 + h1 / b1 + 2 h2 / (b4 + b1))
    (from memory; here the opening is the slot, b1 = b4).
    """
    _positive("slot width and winding height", width, winding_height)
    _non_negative("wedge height", wedge_height)
    return _out(k1 * winding_height / (3.0 * width) + k2 * wedge_height / width)


def semi_closed_slot_permeance(
    opening: Num,
    opening_height: Num,
    wedge_height: Num,
    top_width: Num,
    bottom_width: Num,
    winding_height: Num,
    k1: float = 1.0,
    k2: float = 1.0,
) -> Num:
    """Slot-leakage permeance coefficient of a semi-closed trapezoidal slot.

    lambda = k1 lambda_zone + k2 (2 h_w / (b_0 + b_1) + h_0 / b_0): the trapezoidal winding
    zone (:func:`trapezoid_zone_permeance`), the wedge zone widening from the opening b_0 to
    the zone's top width b_1 over h_w, and the opening b_0 over the tooth-tip height h_0, all
    crossed by straight flux lines carrying the slot's whole current.

    Parameters
    ----------
    opening, opening_height : float or numpy.ndarray
        Slot opening b_0 and tooth-tip height h_0 [m].
    wedge_height : float or numpy.ndarray
        Wedge-zone height h_w [m], >= 0.
    top_width, bottom_width : float or numpy.ndarray
        Winding-zone widths at its gap side b_1 and at the slot bottom [m].
    winding_height : float or numpy.ndarray
        Winding-zone height [m].
    k1, k2 : float
        As in :func:`open_slot_permeance`.

    Returns
    -------
    float or numpy.ndarray
        lambda [-].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, sec. 4.3 (from memory), as :func:`open_slot_permeance`.
    """
    _positive("slot opening", opening)
    _non_negative("tooth-tip and wedge heights", opening_height, wedge_height)
    zone = trapezoid_zone_permeance(top_width, bottom_width, winding_height)
    above = 2.0 * wedge_height / (opening + top_width) + opening_height / opening
    return _out(k1 * zone + k2 * above)


def slot_leakage_factors(
    top: np.ndarray, bottom: np.ndarray | None = None, *, stacked: bool = True
) -> tuple[float, float]:
    """Factors k1 (winding zone) and k2 (current-free zone) of phase A's slot leakage.

    The flux linkage of phase A's conductors with the slot field of all phases under
    balanced currents, over that of a winding with one phase in every slot. With the two
    layers stacked (bottom half, top half of the zone, as distributed double layers lie),
    the field energy of the half-zones gives per slot, in units of h / (3 b) and for
    half-slot currents,

        L_bb = 2, L_tt = 1/2, L_bt = 3/4 (winding zone); 1 each (zone above),

    so k1 = sum_s Re[b_s (2 B_s + 3/4 T_s) + t_s (3/4 B_s + 1/2 T_s)] / (2 S) and
    k2 = sum_s Re[(b_s + t_s)(B_s + T_s)] / (2 S), t_s and b_s phase A's signed sides in the
    top and bottom layer, T_s and B_s the layers' current phasors (phase k at
    exp(-j 2 pi k / m)), S the number of phase A's sides. Side by side (the two coil sides
    of tooth coils, each over the zone's whole height), both factors are
    sum_s Re[c_s C_s] / (L S) with c_s phase A's sides in slot s, C_s the slot's phasor and
    L the layers. For a three-phase 60-degree double layer of pitch W / tau_p >= 2/3 this
    gives the textbook k2 = (1 + 3 W / tau_p) / 4, k1 = (1 + 3 k2) / 4.

    Parameters
    ----------
    top : numpy.ndarray
        Layout (m, Q) of the top layer; with ``bottom`` None, the whole layout.
    bottom : numpy.ndarray, optional
        Layout (m, Q) of the bottom layer (double layer).
    stacked : bool
        Whether the two layers lie one above the other (True) or side by side (False).

    Returns
    -------
    tuple of float
        (k1, k2) [-], 1 when every slot holds one phase only.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, sec. 4.3, the short-pitching factors k1 and k2 of slot leakage (from memory);
    the half-zone energies by strip integration (derivation).
    """
    t = as_layout(top)
    m = t.shape[0]
    a = np.exp(-2j * np.pi * np.arange(m) / m)
    if bottom is None:
        layers = int(np.max(np.abs(t).sum(axis=0)))
        c = t[0].astype(float)
        sides = np.abs(c).sum()
        if sides == 0:
            raise ValueError("phase A has no coil sides")
        k = float(np.real(c * (a @ t)).sum() / (max(layers, 1) * sides))
        return k, k
    b = as_layout(bottom)
    if b.shape != t.shape:
        raise ValueError(f"top and bottom layers differ in shape: {t.shape} and {b.shape}")
    tp, bp = a @ t, a @ b
    ta, ba = t[0].astype(float), b[0].astype(float)
    sides = np.abs(ta).sum() + np.abs(ba).sum()
    if sides == 0:
        raise ValueError("phase A has no coil sides")
    k2 = float(np.real((ta + ba) * (tp + bp)).sum() / (2.0 * sides))
    if not stacked:
        return k2, k2
    k1 = np.real(ba * (2.0 * bp + 0.75 * tp) + ta * (0.75 * bp + 0.5 * tp)).sum()
    return float(k1 / (2.0 * sides)), k2


def slot_leakage_inductance(
    phases: int, series_turns: Num, slots: int, stack_length: Num, permeance: Num
) -> Num:
    """Slot-leakage inductance of a phase, L_u = 4 m mu0 l N^2 lambda / Q.

    Parameters
    ----------
    phases : int
        Number of phases m.
    series_turns : float or numpy.ndarray
        Series turns per phase N [-] (parallel paths already divided out).
    slots : int
        Number of slots Q.
    stack_length : float or numpy.ndarray
        Axial length of the slots l [m].
    permeance : float or numpy.ndarray
        Slot permeance coefficient lambda [-], its factors k1 and k2 included.

    Returns
    -------
    float or numpy.ndarray
        L_u [H].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley, sec. 4.3, L_u = (4 m / Q) mu0 l' N^2 lambda_u (from memory): Q / m slots of
    2 m N / Q conductors each (single layer, one path; the same for any layers and paths).
    """
    _positive("slot leakage inputs", phases, series_turns, slots, stack_length)
    _non_negative("slot permeance", permeance)
    return _out(4.0 * phases * MU0 * stack_length * series_turns**2 * permeance / slots)


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
    _positive("end-winding inputs", bundles_per_phase, turns_per_bundle, end_length)
    _positive("bundle radius and parallel paths", bundle_radius, parallel_paths)
    radius = end_length / (2.0 * np.pi)
    shape = np.maximum(np.log(8.0 * radius / bundle_radius) - 2.0, 0.0)
    return _out(bundles_per_phase * MU0 * turns_per_bundle**2 * radius * shape / parallel_paths**2)


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
    _non_negative("magnetising inductance and harmonic coefficient", magnetising, coefficient)
    return _out(magnetising * coefficient)


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
    _non_negative("inductances", magnetising, harmonic_coefficient, slot_leakage, end_leakage)
    return _out(magnetising * (1.0 + harmonic_coefficient) + slot_leakage + end_leakage)


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
    _positive("EMF, frequency and inductance", emf, frequency, inductance)
    _non_negative("resistance", resistance)
    omega = 2.0 * np.pi * frequency
    return _out(emf / np.hypot(resistance, omega * inductance))


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
    _positive("torque-constant inputs", phases, emf, frequency, pole_pairs)
    return _out(phases * pole_pairs * emf / (2.0 * np.pi * frequency))


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
    _positive("magnetising-current inputs", total_mmf, phases, series_turns, winding_factor)
    _positive("pole pairs", pole_pairs)
    return _out(
        np.pi * pole_pairs * total_mmf / (np.sqrt(2.0) * phases * winding_factor * series_turns)
    )


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
    _positive("phase voltage", phase_voltage)
    _non_negative("current, reactance and resistance", phase_current, reactance, resistance)
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
    (:func:`salient_pole_axis_factors`). The field ampere-turns with the same fundamental:
    F_f,eq = C_d F_1 / ((4/pi) sin(alpha pi / 2)).

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
    _non_negative("armature MMF", armature_mmf)
    _positive("axis factor and pole arc", axis_factor, pole_arc)
    return _out(axis_factor * armature_mmf / (4.0 / np.pi * np.sin(np.pi * pole_arc / 2.0)))


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
    _positive("power and speed", power, speed)
    return _out(power / (2.0 * np.pi * speed))


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
    _positive("torque, rotor diameter and length", torque, rotor_diameter, stack_length)
    volume = np.pi * rotor_diameter**2 * stack_length / 4.0
    return _out(torque / (2.0 * volume))
