"""Magnetisation curves of soft-magnetic steels.

A curve is a table of (B, H) points, monotone in both. Between points H(B) is
interpolated linearly; above the last point the material is taken as fully saturated,
so the differential permeability is mu0 (dB/dH = mu0): this keeps the magnetic circuit
solvable, and conservative, when a design drives the iron past the tabulated range.
"""

from __future__ import annotations

import math
from bisect import bisect_right
from dataclasses import dataclass

import numpy as np

from emgate.physics.constants import MU0

#: How far [T] beyond its last point the array path's table is extended along the line.
_EXTENSION = 100.0


@dataclass(frozen=True)
class BHCurve:
    """A tabulated B-H curve.

    Parameters
    ----------
    name : str
        Grade designation, e.g. ``"M400-50A"``.
    b : numpy.ndarray
        Flux density points [T], strictly increasing, starting at 0.
    h : numpy.ndarray
        Field strength points [A/m], strictly increasing, starting at 0.
    source : str
        Where the curve comes from (standard, fit, measurement).
    density : float
        Mass density [kg/m^3], 0 when unknown.
    """

    name: str
    b: np.ndarray
    h: np.ndarray
    source: str
    density: float = 0.0

    def __post_init__(self) -> None:
        b = np.asarray(self.b, dtype=float)
        h = np.asarray(self.h, dtype=float)
        if b.ndim != 1 or b.shape != h.shape or b.size < 2:
            raise ValueError("a B-H curve needs two equal-length tables of at least 2 points")
        if b[0] != 0.0 or h[0] != 0.0:
            raise ValueError("a B-H curve starts at B = 0, H = 0")
        if np.any(np.diff(b) <= 0) or np.any(np.diff(h) <= 0):
            raise ValueError("B and H must both increase strictly along a B-H curve")
        if not (np.all(np.isfinite(b)) and np.all(np.isfinite(h))):
            raise ValueError("B-H points must be finite")
        object.__setattr__(self, "b", b)
        object.__setattr__(self, "h", h)
        # Plain-float copies for the scalar path: one np.interp on a float costs some
        # microseconds, 42 times a value's share of an array call, and the magnetic circuit
        # of one record asks for a few hundred points.
        object.__setattr__(self, "_bt", tuple(b.tolist()))
        object.__setattr__(self, "_ht", tuple(h.tolist()))
        # The array path's table, extended by one point along the straight line beyond the
        # last (slope 1/mu0), so that one np.interp covers the tables and the line.
        far = b[-1] + _EXTENSION
        object.__setattr__(self, "_b_ext", np.append(b, far))
        object.__setattr__(self, "_h_ext", np.append(h, h[-1] + _EXTENSION / MU0))
        # B + c H(B) at the table points by slot-sharing constant c (emgate.physics.iron)
        object.__setattr__(self, "_sharing", {})
        # The integral of H dB from 0 to each table point (trapezoids: exact, H is linear
        # between the points), for mean_field_strength.
        bl, hl = b.tolist(), h.tolist()
        areas = [0.0]
        for j in range(len(bl) - 1):
            areas.append(areas[-1] + 0.5 * (bl[j + 1] - bl[j]) * (hl[j] + hl[j + 1]))
        object.__setattr__(self, "_areas", tuple(areas))
        # Each segment's line H = a + s B (the last one the line of slope 1/mu0 beyond the
        # table), for mean_field_strength_sine.
        slopes = [(hl[j + 1] - hl[j]) / (bl[j + 1] - bl[j]) for j in range(len(bl) - 1)]
        slopes.append(1.0 / MU0)
        starts = [hl[j] - slopes[j] * bl[j] for j in range(len(bl))]
        object.__setattr__(self, "_lines", (tuple(starts), tuple(slopes)))


def _interp(x: float, xp: tuple[float, ...], fp: tuple[float, ...]) -> float:
    """np.interp of one non-negative float inside the table, by the same formula (the
    slope of the interval times the offset into it, plus its start), so that the scalar
    and array paths agree."""
    j = bisect_right(xp, x) - 1
    if j >= len(xp) - 1:
        return fp[-1]
    slope = (fp[j + 1] - fp[j]) / (xp[j + 1] - xp[j])
    return slope * (x - xp[j]) + fp[j]


def h_from_b(curve: BHCurve, b: float | np.ndarray) -> float | np.ndarray:
    """Field strength for a flux density, odd-symmetric in B.

    Parameters
    ----------
    curve : BHCurve
    b : float or numpy.ndarray
        Flux density [T].

    Returns
    -------
    float or numpy.ndarray
        Field strength [A/m]; beyond the last tabulated point it grows at slope 1/mu0.
    """
    if type(b) is float or type(b) is int:  # the scalar path, by the same formulas
        bt, ht = curve._bt, curve._ht  # type: ignore[attr-defined]
        x = abs(float(b))
        v = _interp(x, bt, ht) if x <= bt[-1] else ht[-1] + (x - bt[-1]) / MU0
        return v if b > 0 else -v if b < 0 else 0.0
    babs = np.abs(np.asarray(b, dtype=float))
    h: np.ndarray = np.asarray(np.interp(babs, curve._b_ext, curve._h_ext))  # type: ignore[attr-defined]
    if babs.size and not babs.max() <= curve._b_ext[-1]:  # type: ignore[attr-defined]
        h = np.where(babs <= curve.b[-1], h, curve.h[-1] + (babs - curve.b[-1]) / MU0)
    h = np.copysign(h, b)
    return float(h) if np.ndim(h) == 0 else h


def mean_field_strength(curve: BHCurve, b: float) -> float:
    """The mean field strength over the flux densities from 0 to ``b``: ``(1/b) int_0^b H dB``.

    Exact for the curve as :func:`h_from_b` defines it (linear between the table points and
    at slope 1/mu0 beyond the last), from the areas under the table, so no quadrature; odd
    in ``b``. It is the mean of H along a path on which B rises linearly from 0 to ``b``.

    Parameters
    ----------
    curve : BHCurve
    b : float
        Flux density at the end of the range [T].

    Returns
    -------
    float
        Mean field strength [A/m]; 0 for ``b = 0``.
    """
    x = abs(float(b))
    if x == 0.0:
        return 0.0
    bt, ht, areas = curve._bt, curve._ht, curve._areas  # type: ignore[attr-defined]
    h_end = float(h_from_b(curve, x))
    j = min(bisect_right(bt, x) - 1, len(bt) - 2) if x <= bt[-1] else len(bt) - 1
    mean = (areas[j] + 0.5 * (x - bt[j]) * (ht[j] + h_end)) / x
    return mean if b > 0 else -mean


def mean_field_strength_sine(curve: BHCurve, b: float | np.ndarray) -> float | np.ndarray:
    """The mean field strength over a quarter period of a sinusoidal flux density of peak
    ``b``: ``(2/pi) int_0^(pi/2) H(b sin(theta)) dtheta``.

    Exact for the curve as :func:`h_from_b` defines it: on each segment of the table H is a
    line a + s B, whose integral over the angles theta_j = asin(B_j / b) to theta_(j+1) is
    ``a (theta_(j+1) - theta_j) + s b (cos theta_j - cos theta_(j+1))``; beyond the last point
    the line of slope 1/mu0 runs to theta = pi/2. Odd in ``b``; an array of peaks gives an
    array, by the same formulas.

    Parameters
    ----------
    curve : BHCurve
    b : float or numpy.ndarray
        Peak flux density [T].

    Returns
    -------
    float or numpy.ndarray
        Mean field strength [A/m]; 0 for ``b = 0``, infinite for an infinite ``b`` and NaN
        for NaN (the kernel's callers refuse both).
    """
    bt, lines = curve._bt, curve._lines  # type: ignore[attr-defined]
    if isinstance(b, np.ndarray):
        peaks = np.abs(b.astype(float))[..., None]
        safe = np.where(peaks == 0.0, 1.0, peaks)  # (a NaN stays NaN to the end)
        u = np.minimum(np.asarray(bt) / safe, 1.0)  # sin theta_j at the table's points
        d_theta = np.diff(np.arcsin(u), axis=-1, append=0.5 * np.pi)
        d_cos = np.diff(-np.sqrt((1.0 - u) * (1.0 + u)), axis=-1, append=0.0)
        starts, slopes = np.asarray(lines[0]), np.asarray(lines[1])
        with np.errstate(invalid="ignore"):  # an infinite peak: inf * 0, replaced below
            total = (starts * d_theta + slopes * peaks * d_cos).sum(axis=-1)
        means = np.where(peaks[..., 0] == 0.0, 0.0, total / (0.5 * np.pi))
        means = np.where(np.isinf(peaks[..., 0]), np.inf, means)  # H grows without bound
        return np.copysign(means, b)
    x = abs(float(b))
    if x == 0.0 or math.isinf(x):  # (a NaN stays NaN to the end)
        return math.copysign(x, b) if x else 0.0
    total = 0.0
    theta, cos = 0.0, 1.0
    for j, (a, s) in enumerate(zip(*lines, strict=True)):
        if j + 1 < len(bt) and bt[j + 1] < x:
            u = bt[j + 1] / x
            theta_next, cos_next = math.asin(u), math.sqrt((1.0 - u) * (1.0 + u))
        else:
            theta_next, cos_next = 0.5 * math.pi, 0.0
        total += a * (theta_next - theta) + s * x * (cos - cos_next)
        if cos_next == 0.0:
            break
        theta, cos = theta_next, cos_next
    mean = total / (0.5 * math.pi)
    return mean if b > 0 else -mean


def b_from_h(curve: BHCurve, h: float | np.ndarray) -> float | np.ndarray:
    """Flux density for a field strength, the inverse of :func:`h_from_b`.

    Parameters
    ----------
    curve : BHCurve
    h : float or numpy.ndarray
        Field strength [A/m].

    Returns
    -------
    float or numpy.ndarray
        Flux density [T].
    """
    if type(h) is float or type(h) is int:
        bt, ht = curve._bt, curve._ht  # type: ignore[attr-defined]
        x = abs(float(h))
        v = _interp(x, ht, bt) if x <= ht[-1] else bt[-1] + MU0 * (x - ht[-1])
        return v if h > 0 else -v if h < 0 else 0.0
    habs = np.abs(np.asarray(h, dtype=float))
    inside = np.interp(habs, curve.h, curve.b)
    beyond = curve.b[-1] + MU0 * (habs - curve.h[-1])
    b = np.where(habs <= curve.h[-1], inside, beyond) * np.sign(h)
    return float(b) if np.ndim(b) == 0 else b
