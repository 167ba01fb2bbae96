"""Winding layouts: the layout array, its phasors, feasibility and balance, series turns.

A *layout* is an integer array of shape (m, Q): ``layout[k, s]`` is the signed number of coil
sides of phase k in slot s (+1 go, -1 return); times the turns per coil it gives conductors.
Slot s is centred at the mechanical angle 2 pi s / Q. Phase k lags phase 0 by 2 pi k / m
electrical, so its conductors lie 2 pi k / m electrical further along the bore and
positive-sequence currents drive the field towards increasing angle.

Supported: odd phase counts m >= 1 (1, 3, 5, ...), single and double layer, integral and
fractional slots per pole and phase. With phases displaced by 2 pi / m an even m would put
phase k and phase k + m/2 in antiphase, so even phase counts are refused by the generator
(:mod:`emgate.physics.star_of_slots`); an explicit layout of any shape can still be checked
with :func:`balance` and :func:`emgate.physics.winding_factors.winding_factors`.
"""

from __future__ import annotations

import math
import operator

import numpy as np

__all__ = [
    "BALANCE_RTOL",
    "WindingError",
    "as_layout",
    "balance",
    "check_count",
    "feasibility",
    "harmonic_phasors",
    "phase_name",
    "series_turns_per_phase",
]


#: Relative tolerance of :func:`balance`, on the coil sides N of a phase. Rounding in the phasor
#: sums is ~1e-15 N; a side moved to a slot of another electrical angle changes a phasor by
#: at least 2 sin(pi/Q), so 1e-9 N separates the two for any winding with N < 1e6 sides.
BALANCE_RTOL: float = 1e-9


class WindingError(ValueError):
    """A winding that cannot be built as asked, or an array that is not a layout."""


def check_count(value: int, name: str, minimum: int = 1) -> int:
    """Return ``value`` as an int, or raise WindingError unless it is an integer >= minimum."""
    if isinstance(value, bool):
        raise WindingError(f"{name} must be an integer, got {value!r}")
    try:
        n = operator.index(value)
    except TypeError:
        raise WindingError(f"{name} must be an integer, got {value!r}") from None
    if n < minimum:
        raise WindingError(f"{name} must be >= {minimum}, got {n}")
    return n


def _is_whole(arr: np.ndarray) -> bool:
    """Whether an array holds integers (of an integer dtype, or finite whole floats)."""
    if arr.dtype.kind in "iu":
        return True
    return arr.dtype.kind == "f" and bool(np.all(np.isfinite(arr)) and np.all(arr == np.round(arr)))


def phase_name(k: int) -> str:
    """Letter of phase k (A, B, C, ...), or ``"phase k"`` past Z."""
    return chr(ord("A") + k) if 0 <= k < 26 else f"phase {k}"


def as_layout(layout: np.ndarray) -> np.ndarray:
    """Check an array is a layout and return it as int64, shape (m, Q).

    Parameters
    ----------
    layout : numpy.ndarray
        Signed coil sides per phase and slot, shape (m, Q), integer-valued.

    Returns
    -------
    numpy.ndarray
        The same values as ``int64``.

    Raises
    ------
    WindingError
        When the array is not two-dimensional, is empty, or holds non-integer values.
    """
    arr = np.asarray(layout)
    if arr.ndim != 2 or arr.shape[0] < 1 or arr.shape[1] < 1:
        raise WindingError(f"a layout has shape (phases, slots), got shape {arr.shape}")
    if not _is_whole(arr):
        raise WindingError("a layout holds whole numbers of coil sides")
    return arr.astype(np.int64)


def harmonic_phasors(conductors: np.ndarray, orders: int | np.ndarray) -> np.ndarray:
    """Sum of slot conductors weighted by the phase of each mechanical order.

    Parameters
    ----------
    conductors : numpy.ndarray
        Signed conductors (or ampere-conductors) per slot, shape (..., Q); slot s at 2 pi s/Q.
    orders : int or numpy.ndarray
        Mechanical harmonic orders n, integers of any sign.

    Returns
    -------
    numpy.ndarray
        X_n = sum_s c_s exp(j n 2 pi s / Q), complex, shape (..., *orders.shape).

    Notes
    -----
    X_n depends only on n mod Q, so one FFT of length Q serves any number of orders, and
    the reduction mod Q is done in integers, so very high orders lose no accuracy.

    References
    ----------
    R. Skaar, O. Kroevel, R. Nilssen, "Distribution, coil-span and winding factors for PM
    machines with concentrated windings", ICEM 2006 (the slot phasor sum).
    """
    c = np.asarray(conductors, dtype=float)
    n = np.asarray(orders)
    if not _is_whole(n):
        raise WindingError("harmonic orders on a closed periphery are whole numbers")
    slots = c.shape[-1]
    spectrum = np.fft.ifft(c, axis=-1) * slots  # sum_s c_s exp(+j 2 pi r s / Q), r = 0..Q-1
    return spectrum[..., np.mod(n.astype(np.int64), slots)]


def feasibility(slots: int, pole_pairs: int, phases: int, layers: int) -> str | None:
    """Whether a balanced symmetric winding exists for a slot/pole/phase/layer combination.

    Symmetric means that the winding repeats t = gcd(Q, p) times around the bore, every
    phase taking the same share of the star of slots.

    Parameters
    ----------
    slots : int
        Number of stator slots Q.
    pole_pairs : int
        Number of pole pairs p.
    phases : int
        Number of phases m (odd, see the module notes).
    layers : int
        1 (single layer: one coil side per slot) or 2 (double layer).

    Returns
    -------
    str or None
        None when the winding exists, else the reason why not.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley (the star of slots; symmetry conditions Q/(m t) and, single layer, Q/(2 m t)).
    """
    try:
        q_slots = check_count(slots, "slots")
        p = check_count(pole_pairs, "pole pairs")
        m = check_count(phases, "phases")
        layers = check_count(layers, "layers")
    except WindingError as exc:
        return str(exc)
    if layers not in (1, 2):
        return f"layers must be 1 or 2, got {layers}"
    if m % 2 == 0:
        return (
            f"{m} phases: with phases displaced by 2 pi/m, phases k and k + m/2 would be in "
            "antiphase; only odd phase counts are generated"
        )
    if q_slots < m:
        return f"{q_slots} slots cannot hold {m} phases (Q < m)"
    t = math.gcd(q_slots, p)
    if q_slots % (m * t):
        return (
            f"Q/(m t) = {q_slots}/({m}*{t}) is not a whole number (t = gcd(Q, p) = {t}): "
            "the star of slots cannot be shared equally among the phases"
        )
    if layers == 1 and q_slots % (2 * m * t):
        return (
            f"single layer needs Q/(2 m t) = {q_slots}/(2*{m}*{t}) to be a whole number "
            f"(t = gcd(Q, p) = {t} repeating sections): a section cannot hold whole go and "
            "return belts of every phase"
        )
    if m == 1 and q_slots % (2 * t):
        # One phase cannot borrow the other layer's slots from a neighbour phase: with an odd
        # number of spokes its go and return belts differ in size and some coil cancels itself.
        return (
            f"a single-phase winding needs Q/(2 t) = {q_slots}/(2*{t}) to be a whole number "
            f"(t = gcd(Q, p) = {t}) so that go and return belts hold equal numbers of slots"
        )
    return None


def balance(layout: np.ndarray, pole_pairs: int) -> list[str]:
    """Problems that keep a layout from being a balanced m-phase winding.

    Checks: equal conductor counts per phase; every phase's sides cancel (net sum zero, so
    its coils close); working-order (n = p) phasors of equal magnitude, phase k displaced by
    2 pi k / m electrical from phase A in the direction of increasing slot number. Phasor
    comparisons use :data:`BALANCE_RTOL` times the largest phase conductor count.

    Parameters
    ----------
    layout : numpy.ndarray
        Layout, shape (m, Q).
    pole_pairs : int
        Number of pole pairs p (the working mechanical order).

    Returns
    -------
    list of str
        One message per problem; empty when the layout is balanced.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley
    (symmetric windings); R. Skaar, O. Kroevel, R. Nilssen, ICEM 2006 (phasor sums).
    """
    lay = as_layout(layout)
    p = check_count(pole_pairs, "pole pairs")
    m = lay.shape[0]
    problems: list[str] = []
    counts = np.abs(lay).sum(axis=1)
    for empty in np.flatnonzero(counts == 0):
        problems.append(f"phase {phase_name(int(empty))} has no coil sides")
    if np.any(counts != counts[0]):
        listed = ", ".join(f"{phase_name(k)} {int(c)}" for k, c in enumerate(counts))
        problems.append(f"coil sides per phase differ: {listed}")
    for k, net in enumerate(lay.sum(axis=1)):
        if net:
            problems.append(
                f"phase {phase_name(k)}: go and return sides do not cancel (net {int(net)})"
            )
    phasors = harmonic_phasors(lay, p)
    tol = BALANCE_RTOL * max(int(counts.max()), 1)
    ref = phasors[0]
    if abs(ref) <= tol:
        problems.append(f"phase A links no flux of the working order {p} (kw = 0)")
        return problems
    for k in range(1, m):
        expected = ref * np.exp(2j * np.pi * k / m)
        if abs(abs(phasors[k]) - abs(ref)) > tol:
            problems.append(
                f"phase {phase_name(k)}: working-order phasor {abs(phasors[k]):.6g} differs "
                f"from phase A's {abs(ref):.6g}"
            )
        elif abs(phasors[k] - expected) > tol:
            shift = np.degrees(np.angle(phasors[k] / ref)) % 360.0
            problems.append(
                f"phase {phase_name(k)} is displaced {shift:.6g} deg electrical from phase A, "
                f"expected {360.0 * k / m:.6g} deg"
            )
    return problems


def series_turns_per_phase(
    slots: int, layers: int, phases: int, turns_per_coil: int, parallel_paths: int
) -> float:
    """Series turns per phase N_ph.

    Parameters
    ----------
    slots : int
        Number of slots Q.
    layers : int
        1 or 2; the winding has Q * layers / 2 coils.
    phases : int
        Number of phases m.
    turns_per_coil : int
        Turns of each coil N_c.
    parallel_paths : int
        Parallel paths per phase a; must divide the coils of a phase.

    Returns
    -------
    float
        N_ph = (Q layers / 2) N_c / (m a) [-].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley.
    """
    q_slots = check_count(slots, "slots")
    layers = check_count(layers, "layers")
    m = check_count(phases, "phases")
    nc = check_count(turns_per_coil, "turns per coil")
    a = check_count(parallel_paths, "parallel paths")
    if layers not in (1, 2):
        raise WindingError(f"layers must be 1 or 2, got {layers}")
    if (q_slots * layers) % 2:
        raise WindingError(f"a single layer needs an even number of slots, got {q_slots}")
    coils = q_slots * layers // 2
    if coils % (m * a):
        raise WindingError(
            f"{coils} coils cannot be shared equally by {m} phases of {a} parallel paths"
        )
    return coils * nc / (m * a)
