"""Winding factors of a layout, the classical closed form, and the phase EMF they give.

The factors of any layout from its slot phasors (layouts as in :mod:`emgate.physics.winding`),
the distribution and pitch factors of a phase-belt winding, and the EMF a rotating gap
field's fundamental induces in a phase.
"""

from __future__ import annotations

import math

import numpy as np

from emgate.physics.winding import WindingError, check_count, harmonic_phasors

__all__ = [
    "phase_emf",
    "winding_factor_closed_form",
    "winding_factors",
]


def winding_factors(layout_row: np.ndarray, orders: np.ndarray) -> np.ndarray:
    """Winding factors of a phase for mechanical harmonic orders, from its slot layout.

    Parameters
    ----------
    layout_row : numpy.ndarray
        Signed conductors (or coil sides) of one phase per slot, shape (Q,); a whole layout
        of shape (m, Q) gives one row of factors per phase.
    orders : numpy.ndarray
        Mechanical orders n, integers; the working order is n = p.

    Returns
    -------
    numpy.ndarray
        kw_n = |sum_s c_s exp(j n 2 pi s / Q)| / sum_s |c_s|, in [0, 1] [-], shape
        (..., *orders.shape).

    References
    ----------
    R. Skaar, O. Kroevel, R. Nilssen, "Distribution, coil-span and winding factors for PM
    machines with concentrated windings", ICEM 2006.
    """
    c = np.asarray(layout_row, dtype=float)
    if c.ndim not in (1, 2) or c.shape[-1] < 1 or not np.all(np.isfinite(c)):
        raise WindingError(f"conductors per slot must be finite, shape (Q,) or (m, Q); {c.shape}")
    total = np.abs(c).sum(axis=-1)
    if np.any(total == 0):
        raise WindingError("a phase with no conductors has no winding factor")
    x = harmonic_phasors(c, orders)
    shape = total.shape + (1,) * (x.ndim - total.ndim)
    return np.abs(x) / total.reshape(shape)


def winding_factor_closed_form(q: float, pitch_ratio: float, order: int, phases: int = 3) -> float:
    """Classical winding factor kd * kp of a phase-belt winding.

    kd = sin(v pi / 2m) / (z sin(v pi / 2mz)), kp = sin(v (y/tau_p) pi / 2), v the order
    relative to the fundamental (electrical order; mechanical order v p). For integral q,
    z = q and kd is the textbook sin(v q a/2) / (q sin(v a/2)) with a = pi/(m q). For
    fractional q = z/n in lowest terms the numerator z replaces q; for double-layer windings
    from :func:`~emgate.physics.star_of_slots.star_of_slots` this matches
    :func:`winding_factors` at odd integer v (the tests check it), but it says nothing of the
    sub-harmonics and even orders such windings also carry, nor of single-layer fractional
    windings.

    Parameters
    ----------
    q : float
        Slots per pole and phase Q/(2 p m) [-].
    pitch_ratio : float
        Coil span over pole pitch y/tau_p [-].
    order : int
        Electrical harmonic order v >= 1.
    phases : int, optional
        Number of phases m (default 3).

    Returns
    -------
    float
        kd * kp, signed [-]; its magnitude is what :func:`winding_factors` gives.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley
    (distribution and pitch factors, fractional windings via the numerator of q).
    """
    v = check_count(order, "harmonic order")
    m = check_count(phases, "phases")
    if not (math.isfinite(q) and q > 0.0):
        raise WindingError(f"q must be finite and > 0, got {q!r}")
    from fractions import Fraction  # only here: it pulls in decimal, ~2.5 ms of import

    frac = Fraction(q).limit_denominator(10_000)
    if abs(float(frac) - q) > 1e-9 * q:
        raise WindingError(f"q = {q!r} is not a ratio of small whole numbers")
    z = frac.numerator
    half_belt = v * math.pi / (2 * m)
    den = z * math.sin(half_belt / z)
    if abs(den) < 1e-12 * z:  # v a multiple of 2 m z: 0/0, take the limit
        kd = math.cos(half_belt) / math.cos(half_belt / z)
    else:
        kd = math.sin(half_belt) / den
    kp = math.sin(v * pitch_ratio * math.pi / 2)
    return kd * kp


def phase_emf(
    frequency: float,
    series_turns: float,
    winding_factor: float,
    flux_density_fundamental: float,
    pole_pitch: float,
    stack_length: float,
) -> float:
    """Phase EMF, rms, induced by the fundamental of a rotating gap field.

    ``E = sqrt(2) pi f N_ph kw1 Phi1`` with the fundamental flux per pole
    ``Phi1 = (2/pi) B1 tau_p l``: the sinusoidal flux of one pole cut by the series turns at
    the electrical frequency.

    Parameters
    ----------
    frequency : float
        Electrical frequency f [Hz].
    series_turns : float
        Series turns per phase N_ph [-].
    winding_factor : float
        Winding factor kw1 at the working order [-].
    flux_density_fundamental : float
        Amplitude B1 of the fundamental of the gap flux density wave [T].
    pole_pitch : float
        Pole pitch tau_p at the gap [m].
    stack_length : float
        Axial length l the flux density is referred to [m].

    Returns
    -------
    float
        E [V], rms; an array for array inputs.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery* (the EMF of a distributed winding;
    from memory).
    """
    phi1 = 2.0 / math.pi * flux_density_fundamental * pole_pitch * stack_length
    return math.sqrt(2.0) * math.pi * frequency * series_turns * winding_factor * phi1
