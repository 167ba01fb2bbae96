"""Slot leakage of a phase: permeance coefficients, the factors of shared slots, inductance.

Flux crosses the slot straight from tooth to tooth (iron of infinite permeability): the
permeance coefficient of an open and of a semi-closed slot, the factors k1 and k2 of slots
that hold coil sides of two phases, and the slot-leakage inductance of a phase [H] under
balanced m-phase currents. Formulas are plain arithmetic, so arrays sweep as well as
floats; the factors take the (m, Q) layouts of :mod:`emgate.physics.winding`.
"""

from __future__ import annotations

import numpy as np

from emgate.physics._checks import Num, check_all_non_negative, check_all_positive, float_or_array
from emgate.physics.constants import MU0
from emgate.physics.winding import as_layout

__all__ = [
    "open_slot_permeance",
    "semi_closed_slot_permeance",
    "slot_leakage_factors",
    "slot_leakage_inductance",
    "trapezoid_zone_permeance",
]


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
    check_all_positive("slot zone widths and height", top_width, bottom_width, height)
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
    return float_or_array(height / b1 * shape)


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
    check_all_positive("slot width and winding height", width, winding_height)
    check_all_non_negative("wedge height", wedge_height)
    return float_or_array(k1 * winding_height / (3.0 * width) + k2 * wedge_height / width)


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
    check_all_positive("slot opening", opening)
    check_all_non_negative("tooth-tip and wedge heights", opening_height, wedge_height)
    zone = trapezoid_zone_permeance(top_width, bottom_width, winding_height)
    above = 2.0 * wedge_height / (opening + top_width) + opening_height / opening
    return float_or_array(k1 * zone + k2 * above)


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
    check_all_positive("slot leakage inputs", phases, series_turns, slots, stack_length)
    check_all_non_negative("slot permeance", permeance)
    return float_or_array(4.0 * phases * MU0 * stack_length * series_turns**2 * permeance / slots)
