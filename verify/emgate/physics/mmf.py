"""Air-gap MMF of a slot layout: winding-function staircase, exact spectrum and THD.

Conductors are concentrated at slot centres (slot s at the mechanical angle 2 pi s / Q), so the
MMF is a staircase that rises by the ampere-conductors of slot s at 2 pi s / Q (right-continuous)
and has its mean removed: the gap is taken as uniform, so the MMF has no zero-order term.
Layouts and phase conventions are those of :mod:`emgate.physics.winding`. With parallel paths
the current of one conductor is the phase current over the number of paths.
"""

from __future__ import annotations

import math
from typing import Literal, NamedTuple

import numpy as np

from emgate.physics.winding import WindingError, as_layout, harmonic_phasors

__all__ = [
    "WINDING_FAMILIES",
    "HarmonicRatios",
    "balanced_currents",
    "harmonic_ratios",
    "mmf_fundamental_peak",
    "mmf_spectrum",
    "mmf_staircase",
    "mmf_thd",
    "slot_ampere_conductors",
    "winding_family",
]

#: Net current through the bore allowed, relative to the sum of |ampere-conductors|: rounding
#: of sums of cosines is ~1e-15; any open coil gives at least one whole conductor's current.
_CLOSURE_RTOL = 1e-9


def _positive(value: float, name: str) -> float:
    """Return ``value`` as a float, or raise ValueError unless it is finite and > 0."""
    v = float(value)
    if not (math.isfinite(v) and v > 0.0):
        raise ValueError(f"{name} must be finite and > 0, got {value!r}")
    return v


def balanced_currents(phases: int, current_rms: float, instant: float) -> np.ndarray:
    """Instantaneous currents of a balanced m-phase set.

    Parameters
    ----------
    phases : int
        Number of phases m >= 1.
    current_rms : float
        Phase current I, rms [A], >= 0.
    instant : float
        Electrical angle omega t [rad].

    Returns
    -------
    numpy.ndarray
        i_k = sqrt(2) I cos(omega t - 2 pi k / m), k = 0..m-1 [A], shape (m,).

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery*, McGraw-Hill (polyphase currents).
    """
    m = int(phases)
    if m != phases or m < 1:
        raise ValueError(f"phases must be a whole number >= 1, got {phases!r}")
    i_rms = float(current_rms)
    if not (math.isfinite(i_rms) and i_rms >= 0.0) or not math.isfinite(instant):
        raise ValueError("current must be finite and >= 0, and the instant finite")
    return math.sqrt(2.0) * i_rms * np.cos(instant - 2.0 * np.pi * np.arange(m) / m)


def slot_ampere_conductors(
    layout: np.ndarray, turns_per_coil: float, currents: np.ndarray
) -> np.ndarray:
    """Ampere-conductors in each slot.

    Parameters
    ----------
    layout : numpy.ndarray
        Layout, shape (m, Q).
    turns_per_coil : float
        Turns of each coil N_c (conductors per coil side) [-], > 0.
    currents : numpy.ndarray
        Instantaneous conductor current of each phase [A], shape (m,).

    Returns
    -------
    numpy.ndarray
        N_c sum_k layout[k, s] i_k [A], shape (Q,).

    Raises
    ------
    ValueError
        When the net current through the bore is not zero (an open coil): the winding
        function of such a layout is not periodic.
    """
    lay = as_layout(layout)
    nc = _positive(turns_per_coil, "turns per coil")
    i = np.asarray(currents, dtype=float)
    if i.shape != (lay.shape[0],) or not np.all(np.isfinite(i)):
        raise ValueError(f"need one finite current per phase, shape ({lay.shape[0]},)")
    ac = nc * (i @ lay)
    if abs(ac.sum()) > _CLOSURE_RTOL * max(np.abs(ac).sum(), 1.0):
        raise ValueError(
            f"net current through the bore is {ac.sum():.6g} A, not zero: some coil is open"
        )
    return ac


def _levels(ampere_conductors: np.ndarray) -> np.ndarray:
    """Staircase value on [theta_s, theta_s+1), mean removed: equal steps make it exact."""
    steps = np.cumsum(ampere_conductors)
    return steps - steps.mean()


def mmf_staircase(
    layout: np.ndarray,
    turns_per_coil: float,
    currents: np.ndarray,
    samples_per_slot: int = 16,
) -> tuple[np.ndarray, np.ndarray]:
    """Winding-function MMF around the gap, sampled.

    Parameters
    ----------
    layout : numpy.ndarray
        Layout, shape (m, Q).
    turns_per_coil : float
        Turns of each coil N_c [-].
    currents : numpy.ndarray
        Instantaneous conductor current of each phase [A], shape (m,).
    samples_per_slot : int, optional
        Samples per slot pitch (default 16); the first falls on the slot centre.

    Returns
    -------
    theta : numpy.ndarray
        Mechanical angle [rad], Q * samples_per_slot points in [0, 2 pi).
    mmf : numpy.ndarray
        MMF [A] at ``theta``; the step at a slot centre belongs to the sample there.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery*, McGraw-Hill (MMF of distributed
    windings: the gap MMF steps by the current enclosed at each slot).
    """
    sps = int(samples_per_slot)
    if sps != samples_per_slot or sps < 1:
        raise ValueError(f"samples per slot must be a whole number >= 1, got {samples_per_slot}")
    levels = _levels(slot_ampere_conductors(layout, turns_per_coil, currents))
    n = levels.size * sps
    theta = 2.0 * np.pi * np.arange(n) / n
    return theta, np.repeat(levels, sps)


def mmf_spectrum(
    layout: np.ndarray, turns_per_coil: float, currents: np.ndarray, max_order: int
) -> np.ndarray:
    """Exact amplitudes of the mechanical harmonic orders of the staircase MMF.

    A step of C_s at theta_s gives the order-n amplitude A_n = |sum_s C_s exp(-j n theta_s)|
    / (pi n) (the Fourier series of the derivative, a train of impulses); no sampling.

    Parameters
    ----------
    layout : numpy.ndarray
        Layout, shape (m, Q).
    turns_per_coil : float
        Turns of each coil N_c [-].
    currents : numpy.ndarray
        Instantaneous conductor current of each phase [A], shape (m,).
    max_order : int
        Highest mechanical order n.

    Returns
    -------
    numpy.ndarray
        Peak amplitude A_n of orders n = 0..max_order [A]; A_0 = 0 (mean removed).

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery*, McGraw-Hill (space harmonics of
    the MMF); R. Skaar, O. Kroevel, R. Nilssen, ICEM 2006 (slot phasor sums).
    """
    top = int(max_order)
    if top != max_order or top < 0:
        raise ValueError(f"max order must be a whole number >= 0, got {max_order!r}")
    ac = slot_ampere_conductors(layout, turns_per_coil, currents)
    n = np.arange(1, top + 1)
    amplitude = np.zeros(top + 1)
    amplitude[1:] = np.abs(harmonic_phasors(ac, n)) / (np.pi * n)
    return amplitude


def mmf_thd(layout: np.ndarray, pole_pairs: int, instant: float = 0.0) -> float:
    """Total harmonic distortion of the staircase MMF, every order included.

    THD = sqrt(sum_{n != p} A_n^2) / A_p over all mechanical orders n >= 1, sub-harmonics
    included, for balanced sinusoidal currents. Parseval gives the sum exactly from the mean
    square of the staircase: sum_n A_n^2 / 2 = mean(F^2). The result does not depend on the
    current amplitude or the turns, nor, for a balanced symmetric winding, on the instant.

    Parameters
    ----------
    layout : numpy.ndarray
        Layout, shape (m, Q).
    pole_pairs : int
        Number of pole pairs p (the working order).
    instant : float, optional
        Electrical angle omega t of the currents [rad] (default 0).

    Returns
    -------
    float
        THD as a ratio [-] (not a percentage).

    Raises
    ------
    ValueError
        When the working order carries no MMF at that instant.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery*, McGraw-Hill (MMF harmonics);
    Parseval's theorem for the Fourier series of a step function.
    """
    lay = as_layout(layout)
    p = int(pole_pairs)
    if p != pole_pairs or p < 1:
        raise WindingError(f"pole pairs must be a whole number >= 1, got {pole_pairs!r}")
    ac = slot_ampere_conductors(lay, 1.0, balanced_currents(lay.shape[0], 1.0, instant))
    mean_square = float(np.mean(_levels(ac) ** 2))
    working = float(np.abs(harmonic_phasors(ac, p))) / (np.pi * p)
    if working <= 1e-12 * np.abs(ac).sum():
        raise ValueError(f"the layout has no MMF of the working order {p} at this instant")
    # max(): rounding can take a harmonic-free staircase a hair below zero
    return math.sqrt(max(2.0 * mean_square / working**2 - 1.0, 0.0))


def mmf_fundamental_peak(
    phases: int, series_turns: float, kw1: float, current_rms: float, pole_pairs: int
) -> float:
    """Peak of the rotating fundamental MMF, ampere-turns per pole.

    Parameters
    ----------
    phases : int
        Number of phases m.
    series_turns : float
        Series turns per phase N_ph [-].
    kw1 : float
        Winding factor of the working harmonic [-].
    current_rms : float
        Phase current I, rms [A].
    pole_pairs : int
        Number of pole pairs p.

    Returns
    -------
    float
        F1 = (sqrt(2) m / pi) kw1 N_ph I / p [A].

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery*, McGraw-Hill (rotating MMF of a
    polyphase winding, F1 = (m/2)(4/pi) kw1 N_ph sqrt(2) I / (2p)).
    """
    m = _positive(phases, "phases")
    n_ph = _positive(series_turns, "series turns")
    kw = _positive(kw1, "winding factor")
    i_rms = _positive(current_rms, "current")
    p = _positive(pole_pairs, "pole pairs")
    if kw > 1.0:
        raise ValueError(f"a winding factor is at most 1, got {kw1!r}")
    return math.sqrt(2.0) * m / math.pi * kw * n_ph * i_rms / p


def mmf_peak(layout: np.ndarray, turns_per_coil: float, current_rms: float) -> float:
    """Largest |staircase MMF| over the gap and over one period of balanced currents [A].

    The staircase (conductors at slot centres, mean removed: a uniform gap) is constant
    between slot centres, so its largest value over the gap is its largest step level. Each
    level is linear in the phase currents, and balanced currents are
    i(t) = cos(wt) i(0) + sin(wt) i(T/4), so a level is F_s(t) = F_s(0) cos wt + F_s(T/4)
    sin wt, whose crest is sqrt(F_s(0)^2 + F_s(T/4)^2): exact, no sampling of the instants.

    Parameters
    ----------
    layout : numpy.ndarray
        Signed coil sides per phase and slot, shape (m, Q).
    turns_per_coil : float
        Turns of each coil N_c [-].
    current_rms : float
        Conductor current, rms: the phase current over the parallel paths [A].

    Returns
    -------
    float
        max over slots and instants of |F| [A], ampere-turns across one gap, as F1.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery*, McGraw-Hill (the gap MMF steps by
    the current enclosed at each slot; polyphase currents).
    """
    m = layout.shape[0]
    # One sample a slot is the step levels themselves.
    _, at_zero = mmf_staircase(layout, turns_per_coil, balanced_currents(m, current_rms, 0.0), 1)
    _, at_quarter = mmf_staircase(
        layout, turns_per_coil, balanced_currents(m, current_rms, math.pi / 2.0), 1
    )
    return float(np.max(np.hypot(at_zero, at_quarter)))


#: Winding families whose MMF harmonic content differs by nature: distributed (coils
#: spanning several teeth, THD near 0.1 to 0.3), and tooth coils (each coil round one
#: tooth) in two layers (THD near 1) or one (near 1.5 and above).
WINDING_FAMILIES = ("distributed", "tooth_coil_double_layer", "tooth_coil_single_layer")
WindingFamily = Literal["distributed", "tooth_coil_double_layer", "tooth_coil_single_layer"]


def winding_family(slots: int, poles: int, layers: int, coil_pitch: int) -> WindingFamily:
    """The family of a winding: distributed, or tooth coils in one or two layers.

    A coil spanning one slot pitch is wound round one tooth (a tooth coil, also called a
    non-overlapping or concentrated winding), whatever its slots per pole and phase; a
    coil spanning more is distributed (its end connections overlap its neighbours').

    Parameters
    ----------
    slots : int
        Number of slots Q >= 2.
    poles : int
        Number of poles 2p >= 2, even.
    layers : int
        1 or 2.
    coil_pitch : int
        Coil span y in slot pitches, 1 <= y < Q.

    Returns
    -------
    str
        ``"distributed"``, ``"tooth_coil_double_layer"`` or ``"tooth_coil_single_layer"``.

    References
    ----------
    A. M. El-Refaie, "Fractional-slot concentrated-windings synchronous permanent magnet
    machines: opportunities and challenges", IEEE Trans. Ind. Electron. 57(1), 2010 (tooth
    coils in single and double layer; from memory).
    """
    for value, name, low in ((slots, "slots", 2), (poles, "poles", 2), (coil_pitch, "pitch", 1)):
        if int(value) != value or value < low:
            raise WindingError(f"{name} must be a whole number >= {low}, got {value!r}")
    if poles % 2:
        raise WindingError(f"poles must be even, got {poles}")
    if layers not in (1, 2):
        raise WindingError(f"layers must be 1 or 2, got {layers!r}")
    if coil_pitch >= slots:
        raise WindingError(f"coil pitch must be 1..{slots - 1} slots, got {coil_pitch}")
    if coil_pitch > 1:
        return "distributed"
    return "tooth_coil_double_layer" if layers == 2 else "tooth_coil_single_layer"


class HarmonicRatios(NamedTuple):
    """The largest single sub-harmonic and slot harmonic of the MMF, over the working one."""

    subharmonic: float
    subharmonic_order: int
    slot_harmonic: float
    slot_harmonic_order: int


def harmonic_ratios(layout: np.ndarray, pole_pairs: int, instant: float = 0.0) -> HarmonicRatios:
    """The largest sub-harmonic and the largest slot harmonic of the staircase MMF.

    From the exact spectrum (:func:`mmf_spectrum`, balanced currents): the largest A_n / A_p
    over the sub-harmonic orders 1 <= n < p, and over the slot-harmonic orders
    n = |k Q +- p|, k = 1, 2, 3, n != p (those whose winding factor equals the working one,
    so A_n / A_p = p / n for them in an integral-slot winding; the largest is k = 1). A
    slot-harmonic order below p counts in both. Sub-harmonics drive rotor eddy losses in
    magnets and sleeves; slot harmonics noise and losses.

    Parameters
    ----------
    layout : numpy.ndarray
        Layout, shape (m, Q).
    pole_pairs : int
        Number of pole pairs p (the working order).
    instant : float, optional
        Electrical angle of the currents [rad] (default 0; a balanced symmetric winding's
        ratios do not depend on it).

    Returns
    -------
    HarmonicRatios
        Ratios [-] with their mechanical orders; ratio 0 and order 0 when p = 1 (no
        sub-harmonic order exists).

    Raises
    ------
    ValueError
        When the working order carries no MMF at that instant.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery*, McGraw-Hill (MMF harmonics and
    slot harmonics of order k Q +- p; from memory); A. M. El-Refaie, IEEE Trans. Ind.
    Electron. 57(1), 2010 (sub-harmonics of tooth-coil windings; from memory).
    """
    lay = as_layout(layout)
    p = int(pole_pairs)
    if p != pole_pairs or p < 1:
        raise WindingError(f"pole pairs must be a whole number >= 1, got {pole_pairs!r}")
    slots = lay.shape[1]
    top = 3 * slots + p
    spectrum = mmf_spectrum(lay, 1.0, balanced_currents(lay.shape[0], 1.0, instant), top)
    working = spectrum[p]
    if working <= 1e-12 * spectrum.max():
        raise ValueError(f"the layout has no MMF of the working order {p} at this instant")
    ratio = spectrum / working
    sub_order = int(np.argmax(ratio[1:p])) + 1 if p > 1 else 0
    orders = {abs(k * slots + s * p) for k in (1, 2, 3) for s in (1, -1)} - {0, p}
    slot_order = max(sorted(orders), key=lambda n: ratio[n])
    return HarmonicRatios(
        float(ratio[sub_order]) if sub_order else 0.0,
        sub_order,
        float(ratio[slot_order]),
        slot_order,
    )
