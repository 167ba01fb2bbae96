"""Flux densities and magnetic voltages of the stator and rotor iron.

Teeth: the apparent flux density assumes the whole slot-pitch flux passes the tooth; the real
one lets the slot beside it carry its share (slot flux sharing). Yokes: the flux density
follows from the flux per pole; its magnetic voltage integrates H along a path on which the
flux density varies with the gap-flux distribution.

Also here: the kernel's bracketed root finder for monotone equations, used by the magnetic
circuit and the thermal network as well.
"""

from __future__ import annotations

import math
from bisect import bisect_right
from collections.abc import Callable
from typing import overload

import numpy as np

from emgate.physics.bh import BHCurve, h_from_b, mean_field_strength, mean_field_strength_sine
from emgate.physics.constants import MU0

_EPS = float(np.finfo(float).eps)

#: Interpolation steps allowed in a row that do not halve the bracket; then a bisection.
_STALL = 4


def solve_increasing(
    f: Callable[[float], float],
    lo: float,
    hi: float,
    *,
    xtol: float = 0.0,
    rtol: float = 1e-12,
    maxiter: int = 300,
    ends: tuple[float, float] | None = None,
) -> float:
    """Root of a non-decreasing scalar function inside a bracket.

    Regula falsi with the Anderson-Bjorck modification (the end kept twice has its value
    scaled down, so neither end sticks). A step that would land within half the tolerance
    of an end lands that far inside instead, as Brent's method does, so once the estimate
    has converged the next evaluation closes the bracket from the root's other side rather
    than creeping in from one end. Four steps in a row that do not halve the bracket are
    followed by a bisection, so the bracket at least halves every five evaluations and the
    solver always converges.

    Parameters
    ----------
    f : callable
        Non-decreasing function of one float.
    lo, hi : float
        Bracket with ``f(lo) <= 0 <= f(hi)``.
    xtol, rtol : float
        Stop when the bracket is narrower than ``xtol + rtol * max(|lo|, |hi|)`` (absolute
        tolerance in the unit of the variable, and relative tolerance).
    maxiter : int
        Cap on evaluations; reached only with tolerances below the float resolution.
    ends : (float, float), optional
        ``f(lo)`` and ``f(hi)`` when the caller has them already (they are not computed
        again; the bracket is checked on them all the same).

    Returns
    -------
    float
        The root, within the tolerance.

    Raises
    ------
    ValueError
        When the bracket does not enclose a sign change.

    References
    ----------
    Anderson and Bjorck, "A new high order method of regula falsi type for computing a root
    of an equation", BIT 13 (1973) 253-264; Brent, Algorithms for Minimization without
    Derivatives (1973), ch. 4 (the step of at least the tolerance).
    """
    if not lo <= hi:
        raise ValueError("the bracket needs lo <= hi")
    flo, fhi = ends if ends is not None else (f(lo), f(hi))
    if not flo <= 0.0 <= fhi:
        raise ValueError("the bracket does not enclose a root of the increasing function")
    if flo == 0.0:
        return lo
    if fhi == 0.0:
        return hi
    side = 0
    mark, stalled = hi - lo, 0  # the width to halve, and the steps since it last halved
    for _ in range(maxiter):
        width = hi - lo
        tol = xtol + max(rtol, 4.0 * _EPS) * max(abs(lo), abs(hi))
        if width <= tol:
            break
        if stalled >= _STALL:
            x = 0.5 * (lo + hi)
        else:
            x = lo - flo * width / (fhi - flo)
            nudge = 0.5 * tol
            x = min(max(x, lo + nudge), hi - nudge)
            if not lo < x < hi:
                x = 0.5 * (lo + hi)
        fx = f(x)
        if fx == 0.0:
            return x
        if fx < 0.0:
            if side < 0:  # lo moves again: scale the value kept at hi
                m = 1.0 - fx / flo
                fhi *= m if m > 0.0 else 0.5
            lo, flo, side = x, fx, -1
        else:
            if side > 0:
                m = 1.0 - fx / fhi
                flo *= m if m > 0.0 else 0.5
            hi, fhi, side = x, fx, 1
        if hi - lo <= 0.5 * mark:
            mark, stalled = hi - lo, 0
        else:
            stalled += 1
    return lo - flo * (hi - lo) / (fhi - flo)


def apparent_tooth_flux_density(
    b_gap: float,
    slot_pitch: float,
    tooth_width: float,
    stack_length: float,
    iron_length: float,
    stacking_factor: float,
) -> float:
    """Apparent tooth flux density: the whole slot-pitch flux taken through the tooth.

    ``B_app = B_g tau_s l / (k_Fe l_Fe b_t)``.

    Parameters
    ----------
    b_gap : float
        Gap flux density over the tooth [T] (its peak for the tooth on the pole axis).
    slot_pitch : float
        Slot pitch tau_s at the gap [m].
    tooth_width : float
        Tooth width b_t [m] (parallel-sided tooth, or its width at the section checked).
    stack_length : float
        Axial length l the gap flux density is referred to [m].
    iron_length : float
        Iron length l_Fe, the stack without ventilation ducts [m].
    stacking_factor : float
        Lamination stacking factor k_Fe [-].

    Returns
    -------
    float
        Apparent tooth flux density [T].

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3 (tooth
    flux density and slot flux sharing).
    """
    return b_gap * slot_pitch * stack_length / (stacking_factor * iron_length * tooth_width)


def slot_flux_sharing_factor(
    slot_pitch: float,
    tooth_width: float,
    stack_length: float,
    iron_length: float,
    stacking_factor: float,
) -> float:
    """Ratio of the non-iron cross-section beside a tooth to the tooth's iron section.

    ``k_s = (tau_s l - k_Fe l_Fe b_t) / (k_Fe l_Fe b_t)``: slot, ducts and lamination
    insulation, which carry flux at mu0 in parallel with the tooth.

    Parameters
    ----------
    slot_pitch : float
        Slot pitch tau_s at the section checked [m]. Taking the gap-side pitch for a whole
        tooth underestimates the slot area below it, so the real flux density comes out
        higher (on the safe side).
    tooth_width, stack_length, iron_length, stacking_factor : float
        As in :func:`apparent_tooth_flux_density` [m, m, m, -].

    Returns
    -------
    float
        Slot-flux-sharing factor k_s [-], >= 0 for a physical section.

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3.
    """
    iron = stacking_factor * iron_length * tooth_width
    return (slot_pitch * stack_length - iron) / iron


@overload
def real_tooth_flux_density(b_apparent: float, sharing_factor: float, curve: BHCurve) -> float: ...


@overload
def real_tooth_flux_density(
    b_apparent: np.ndarray, sharing_factor: float | np.ndarray, curve: BHCurve
) -> np.ndarray: ...


def real_tooth_flux_density(
    b_apparent: float | np.ndarray, sharing_factor: float | np.ndarray, curve: BHCurve
) -> float | np.ndarray:
    """Real tooth flux density from the apparent one, with the slot sharing the flux.

    Solves ``B_app = B_real + mu0 k_s H(B_real)``. The right side increases strictly with
    B_real and is piecewise linear as the curve's H(B) is (beyond the end of the table H
    grows at 1/mu0, see :mod:`emgate.physics.bh`), so the root lies in [0, B_app] and is
    found exactly, on the segment of the table that holds it.

    Arrays (of one shape, or broadcast) are solved element by element by the same formulas,
    for the sweep's vectorised path.

    Parameters
    ----------
    b_apparent : float or numpy.ndarray
        Apparent tooth flux density [T]; odd symmetry for negative values.
    sharing_factor : float or numpy.ndarray
        Slot-flux-sharing factor k_s [-], >= 0.
    curve : BHCurve
        Tooth steel.

    Returns
    -------
    float or numpy.ndarray
        Real tooth flux density [T], with ``|B_real| <= |B_app|`` (equal when k_s = 0).

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3.
    """
    if isinstance(b_apparent, np.ndarray) or isinstance(sharing_factor, np.ndarray):
        return _real_tooth_flux_density_array(
            np.asarray(b_apparent), np.asarray(sharing_factor), curve
        )
    if not 0.0 <= sharing_factor < math.inf:
        raise ValueError("the slot-flux-sharing factor must be finite and >= 0")
    b_app = abs(float(b_apparent))
    if not math.isfinite(b_app):
        raise ValueError("the apparent tooth flux density must be finite")
    if sharing_factor == 0.0 or b_app == 0.0:
        return float(b_apparent)
    # H(B) is linear between table points (and at slope 1/mu0 beyond the last), so
    # g(B) = B + c H(B) is too: the segment holding g = B_app is found among the table's
    # g values, and the root is that segment's line solved exactly; no iteration.
    c = MU0 * sharing_factor
    bt, ht = curve._bt, curve._ht  # type: ignore[attr-defined]
    j = bisect_right(_sharing_table(curve, c), b_app) - 1
    if j >= len(bt) - 1:
        b_real = (b_app - c * ht[-1] + c * bt[-1] / MU0) / (1.0 + c / MU0)
    else:
        slope = (ht[j + 1] - ht[j]) / (bt[j + 1] - bt[j])
        b_real = (b_app - c * ht[j] + c * slope * bt[j]) / (1.0 + c * slope)
    # H >= 0 bounds the root by b_app; the clamp keeps the last bit of rounding inside it.
    b_real = min(max(b_real, 0.0), b_app)
    return b_real if b_apparent > 0 else -b_real


def _real_tooth_flux_density_array(
    b_apparent: np.ndarray, sharing_factor: np.ndarray, curve: BHCurve
) -> np.ndarray:
    """:func:`real_tooth_flux_density` of arrays: the same segment solve, the segment found by
    ``np.searchsorted`` in the table of each distinct sharing factor (a sweep has few)."""
    b_in, ks = np.broadcast_arrays(np.asarray(b_apparent, float), np.asarray(sharing_factor, float))
    if not np.all((ks >= 0.0) & (ks < math.inf)):
        raise ValueError("the slot-flux-sharing factor must be finite and >= 0")
    b_app = np.asarray(np.abs(b_in))  # (an array for a 0-d input too)
    if not np.all(np.isfinite(b_app)):
        raise ValueError("the apparent tooth flux density must be finite")
    bt, ht = np.asarray(curve._bt), np.asarray(curve._ht)  # type: ignore[attr-defined]
    b_real = b_app.copy()
    factors, which = np.unique(ks, return_inverse=True)
    which = which.reshape(ks.shape)
    for n, k_s in enumerate(factors.tolist()):
        if k_s == 0.0:
            continue
        at = which == n
        x = b_app[at]
        c = MU0 * k_s
        j = np.searchsorted(np.asarray(_sharing_table(curve, c)), x, side="right") - 1
        last = j >= len(bt) - 1
        j = np.clip(j, 0, len(bt) - 2)
        slope = (ht[j + 1] - ht[j]) / (bt[j + 1] - bt[j])
        inside = (x - c * ht[j] + c * slope * bt[j]) / (1.0 + c * slope)
        beyond = (x - c * ht[-1] + c * bt[-1] / MU0) / (1.0 + c / MU0)
        b_real[at] = np.minimum(np.maximum(np.where(last, beyond, inside), 0.0), x)
    return np.copysign(b_real, b_in)


#: Tables g_j = B_j + c H_j kept per curve, for this many sharing constants c at most.
_SHARING_TABLES = 64


def _sharing_table(curve: BHCurve, c: float) -> tuple[float, ...]:
    """``B + c H(B)`` at the points of a curve's table, computed once per curve and ``c``
    (a record's teeth have one or two sharing factors, asked for at every flux density)."""
    tables: dict[float, tuple[float, ...]] = curve._sharing  # type: ignore[attr-defined]
    table = tables.get(c)
    if table is None:
        if len(tables) >= _SHARING_TABLES:
            tables.clear()
        table = tables[c] = tuple(b + c * h for b, h in zip(curve._bt, curve._ht, strict=True))  # type: ignore[attr-defined]
    return table


def tooth_magnetic_voltage(b_tooth: float, tooth_height: float, curve: BHCurve) -> float:
    """Magnetic voltage of a parallel-sided tooth: ``H(B_t) h_t``.

    Parameters
    ----------
    b_tooth : float
        Real tooth flux density [T], uniform along the tooth.
    tooth_height : float
        Tooth height, gap to yoke [m].
    curve : BHCurve
        Tooth steel.

    Returns
    -------
    float
        Magnetic voltage [A].

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3 (magnetic
    voltage of a tooth; a tapered tooth would need H integrated over its height).
    """
    return float(h_from_b(curve, b_tooth)) * tooth_height


def yoke_flux_density(
    flux_per_pole: float, yoke_height: float, iron_length: float, stacking_factor: float
) -> float:
    """Peak yoke flux density: half the flux of a pole goes each way round the yoke.

    ``B_y = Phi / (2 k_Fe l_Fe h_y)``.

    Parameters
    ----------
    flux_per_pole : float
        Flux through the yoke's side of the gap per pole [Wb].
    yoke_height : float
        Radial yoke height h_y [m].
    iron_length : float
        Iron length l_Fe [m] (the stack length when there are no ducts).
    stacking_factor : float
        Lamination stacking factor k_Fe [-].

    Returns
    -------
    float
        Peak yoke flux density [T], reached on the interpolar axis.

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3.
    """
    return flux_per_pole / (2.0 * stacking_factor * iron_length * yoke_height)


def yoke_magnetic_voltage(
    b_peak: float, path_length: float, curve: BHCurve, ramp_fraction: float | None = None
) -> float:
    """Magnetic voltage along a yoke path on which the flux density varies.

    The yoke flux is the gap flux accumulated from a pole axis, so it is zero there and
    peaks on the interpolar axis. Two distributions over the path, each integrated exactly
    on the piecewise-linear curve (:func:`~emgate.physics.bh.mean_field_strength_sine`,
    :func:`~emgate.physics.bh.mean_field_strength`):

    - ``ramp_fraction=None``: sinusoidal gap flux, so ``B(x) = B_peak sin(pi x / tau_y)``
      and ``V = tau_y mean(H(B_peak sin theta))`` over theta in [0, pi/2];
    - ``ramp_fraction=a``: rectangular gap flux over a pole arc a (a fraction of the pitch),
      so B rises linearly over the fraction a of the path and stays at B_peak over the rest:
      ``V = tau_y [a mean(H(B_peak u)) + (1 - a) H(B_peak)]``, u in [0, 1]; a = 0 is a
      uniform yoke.

    This replaces reading the averaging coefficient c (V = c H(B_peak) tau_y) from the
    published curves: the same quantity, computed for the steel at hand.

    Parameters
    ----------
    b_peak : float or numpy.ndarray
        Peak yoke flux density [T]; an array of variants (sinusoidal case only) gives an
        array of voltages.
    path_length : float or numpy.ndarray
        Length of the path the voltage is wanted over [m]: the yoke pole pitch tau_y for the
        whole path between two pole axes, or half of it for the share of one pole (the
        averages over a half and the whole path are the same).
    curve : BHCurve
        Yoke steel.
    ramp_fraction : float or None
        Pole-arc fraction a in [0, 1] of a rectangular gap flux; None for sinusoidal.

    Returns
    -------
    float
        Magnetic voltage [A].

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3 (yoke
    magnetic voltage with the flux density varying along the yoke).
    """
    if ramp_fraction is None:  # an array of peaks (a sweep's variants) gives an array
        return path_length * mean_field_strength_sine(curve, b_peak)  # type: ignore[return-value]
    if not 0.0 <= ramp_fraction <= 1.0:
        raise ValueError("the ramp fraction of a yoke must lie in [0, 1]")
    ramp_h = mean_field_strength(curve, b_peak)
    flat_h = float(h_from_b(curve, b_peak))
    return path_length * (ramp_fraction * ramp_h + (1.0 - ramp_fraction) * flat_h)
