"""Built-in non-oriented electrical-steel grades as B-H curves.

No manufacturer's curve is shipped: each curve is built from published or standard figures,
and its ``source`` says how.

- M350-50A and M530-50A: the smooth relative-permeability fit of the Modelica Standard
  Library (Magnetic.FluxTubes soft-magnetic materials), tabulated as published.
- M270-35A, M330-50A, M400-50A, M800-65A: a conservative stand-in. The polarization
  J = B - mu0 H of the fit of the nearest published grade is scaled by s(H) so that the
  curve passes exactly through the minimum polarizations of IEC 60404-8-4 at 2500, 5000 and
  10000 A/m; s is interpolated linearly in ln H between those fields and held constant
  below and above them, so the low-field and high-field shapes are the fit's.

Every table ends where the fit's polarization peaks (about 130 kA/m; beyond it the fit's
polarization falls, which is not physical). Past the table :mod:`emgate.physics.bh`
continues at dB/dH = mu0, i.e. with the polarization held at its last value: a saturated
tooth stays on a defined, slightly pessimistic curve.

The figures marked "as recalled" come from memory of IEC 60404-8-4 / EN 10106 and must be
checked against the standard before being treated as hard limits.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from functools import cache
from types import MappingProxyType
from typing import NamedTuple

import numpy as np

from emgate.physics.bh import BHCurve
from emgate.physics.constants import MU0

__all__ = [
    "MAX_SPECIFIC_LOSS",
    "MIN_POLARIZATION",
    "MIN_POLARIZATION_FIELDS",
    "LossData",
    "builtin_grades",
    "lookup",
    "loss_data",
]

#: Field strengths [A/m] at which IEC 60404-8-4 sets minimum polarizations.
MIN_POLARIZATION_FIELDS: tuple[float, float, float] = (2500.0, 5000.0, 10000.0)

_MODELICA = (
    "Modelica Standard Library, Magnetic.FluxTubes soft-magnetic materials: "
    "mu_r(B) = 1 + (mu_i - 1 + c_a B_N) / (1 + c_b B_N + B_N^n), B_N = |B| / B_muMax"
)
_RECALLED = "as recalled from IEC 60404-8-4, verify against the standard"
_TABLE_POINTS_PER_DECADE = 40  # H step ratio 10**(1/40) = 1.059 between table points
_H_FIRST = 1.0  # [A/m] first table point after the origin


class _PermeabilityFit(NamedTuple):
    """Parameters of the Modelica FluxTubes relative-permeability fit of one grade."""

    grade: str
    mu_i: float
    b_mu_max: float
    c_a: float
    c_b: float
    n: float

    def h(self, b: np.ndarray) -> np.ndarray:
        """Field strength [A/m] at flux density ``b`` [T] >= 0."""
        bn = b / self.b_mu_max
        mu_r = 1.0 + (self.mu_i - 1.0 + self.c_a * bn) / (1.0 + self.c_b * bn + bn**self.n)
        return b / (MU0 * mu_r)

    def b(self, h: np.ndarray) -> np.ndarray:
        """Flux density [T] at field strength ``h`` [A/m] >= 0, by bisection on :meth:`h`."""
        lo = np.zeros_like(h)
        hi = MU0 * h + 3.0  # above any polarization of iron
        for _ in range(64):  # halves a 3 T bracket to below 1e-15 T
            mid = 0.5 * (lo + hi)
            below = self.h(mid) < h
            lo = np.where(below, mid, lo)
            hi = np.where(below, hi, mid)
        return 0.5 * (lo + hi)

    def h_peak(self) -> float:
        """Field strength [A/m] where the fit's polarization B - mu0 H is largest."""
        b = np.linspace(1.0, 3.0, 20001)
        j = b - MU0 * self.h(b)
        return float(self.h(b[np.argmax(j)]))


_M350_50A_FIT = _PermeabilityFit(
    "M350-50A", mu_i=1210.0, b_mu_max=1.16, c_a=24630.0, c_b=2.44, n=14.0
)
_M530_50A_FIT = _PermeabilityFit(
    "M530-50A", mu_i=2120.0, b_mu_max=1.25, c_a=12400.0, c_b=1.6, n=13.5
)


class _Grade(NamedTuple):
    name: str
    fit: _PermeabilityFit
    density: float  # [kg/m^3], as recalled
    loss: float  # [W/kg] maximum at 1.5 T, 50 Hz: the designation's number / 100
    min_j: tuple[float, float, float] | None  # [T] at MIN_POLARIZATION_FIELDS; None: fit only
    thickness: float  # [m] nominal: the designation's second number / 100 mm
    resistivity: float  # [ohm m], typical of the grade's silicon content (from memory)


# Resistivities: typical figures of producers' datasheets for these grades (from memory;
# the lower of a grade's usual range, which overstates the eddy loss at high frequency).
_GRADES: tuple[_Grade, ...] = (
    _Grade("M270-35A", _M350_50A_FIT, 7650.0, 2.70, (1.49, 1.60, 1.70), 0.35e-3, 0.52e-6),
    _Grade("M330-50A", _M350_50A_FIT, 7650.0, 3.30, (1.49, 1.60, 1.70), 0.50e-3, 0.52e-6),
    _Grade("M350-50A", _M350_50A_FIT, 7650.0, 3.50, None, 0.50e-3, 0.50e-6),
    _Grade("M400-50A", _M350_50A_FIT, 7700.0, 4.00, (1.53, 1.63, 1.73), 0.50e-3, 0.42e-6),
    _Grade("M530-50A", _M530_50A_FIT, 7700.0, 5.30, None, 0.50e-3, 0.36e-6),
    _Grade("M800-65A", _M530_50A_FIT, 7800.0, 8.00, (1.60, 1.70, 1.78), 0.65e-3, 0.24e-6),
)

#: Maximum specific total loss [W/kg] at 1.5 T, 50 Hz, as the grade designation encodes it.
MAX_SPECIFIC_LOSS: Mapping[str, float] = MappingProxyType({g.name: g.loss for g in _GRADES})


class LossData(NamedTuple):
    """What the iron-loss scaling needs of a built-in grade (SI).

    Parameters
    ----------
    specific_loss : float
        Maximum at 1.5 T, 50 Hz [W/kg] (the designation).
    thickness : float
        [m] (the designation).
    density : float
        [kg/m^3], as recalled from IEC 60404-8-4.
    resistivity : float
        [ohm m], typical (from memory).
    """

    specific_loss: float
    thickness: float
    density: float
    resistivity: float


def loss_data(name: str) -> LossData | None:
    """Loss figures of a built-in grade, or None when the grade is not built in.

    Parameters
    ----------
    name : str
        Designation; case and surrounding blanks are ignored.

    Returns
    -------
    LossData or None

    References
    ----------
    IEC 60404-8-4 (designation: loss at 1.5 T 50 Hz and thickness; conventional density)
    [from memory]; resistivity from producers' datasheets [from memory].
    """
    g = _BY_NAME.get(name.strip().upper())
    if g is None:
        return None
    return LossData(g.loss, g.thickness, g.density, g.resistivity)


#: Minimum polarizations [T] at :data:`MIN_POLARIZATION_FIELDS`, as recalled from
#: IEC 60404-8-4 (verify against the standard).
MIN_POLARIZATION: Mapping[str, tuple[float, float, float]] = MappingProxyType(
    {g.name: g.min_j for g in _GRADES if g.min_j is not None}
)


def _source(grade: _Grade, h_end: float) -> str:
    table = (
        f"tabulated {_TABLE_POINTS_PER_DECADE} points per decade of H up to {h_end / 1e3:.0f} "
        "kA/m, where the fit's polarization peaks; beyond, dB/dH = mu0. "
        f"Density {grade.density:.0f} kg/m^3 ({_RECALLED}). Not a manufacturer's curve."
    )
    if grade.min_j is None:
        fit = grade.fit
        return (
            f"Published fit for {grade.name} ({_MODELICA}; mu_i {fit.mu_i:g}, "
            f"B_muMax {fit.b_mu_max:g} T, c_a {fit.c_a:g}, c_b {fit.c_b:g}, n {fit.n:g}), "
            f"{table}"
        )
    minima = "/".join(f"{j:.2f}" for j in grade.min_j)
    fields = "/".join(f"{h:.0f}" for h in MIN_POLARIZATION_FIELDS)
    return (
        "Constructed stand-in, conservative at the three standard fields: the polarization "
        f"J = B - mu0 H of the published {grade.fit.grade} fit ({_MODELICA}) scaled by s(H) "
        f"so that the curve passes through the minimum polarizations {minima} T at {fields} "
        f"A/m (minima {_RECALLED}); s is linear in ln H between those fields and constant "
        f"outside them; {table}"
    )


def _build(grade: _Grade) -> BHCurve:
    h_end = grade.fit.h_peak()
    n = math.ceil(_TABLE_POINTS_PER_DECADE * math.log10(h_end / _H_FIRST))
    h = np.geomspace(_H_FIRST, h_end, n + 1)
    if grade.min_j is not None:
        # the minima are checked at these exact fields, so they must be table points
        # (sorted merge by hand: np.union1d pulls in numpy.ma, ~10-20 ms of start-up)
        h = np.sort(np.concatenate((h, MIN_POLARIZATION_FIELDS)))
        h = h[np.concatenate(([True], np.diff(h) > 0.0))]
    j = grade.fit.b(h) - MU0 * h
    if grade.min_j is not None:
        h_k = np.array(MIN_POLARIZATION_FIELDS)
        scale = np.array(grade.min_j) / (grade.fit.b(h_k) - MU0 * h_k)
        j = j * np.interp(np.log(h), np.log(h_k), scale)
    curve = BHCurve(
        name=grade.name,
        b=np.concatenate(([0.0], MU0 * h + j)),
        h=np.concatenate(([0.0], h)),
        source=_source(grade, h_end),
        density=grade.density,
    )
    # the curves are shared through the cache: make them read-only
    curve.b.flags.writeable = False
    curve.h.flags.writeable = False
    return curve


_BY_NAME: Mapping[str, _Grade] = MappingProxyType({g.name: g for g in _GRADES})


@cache
def _curve(name: str) -> BHCurve:
    return _build(_BY_NAME[name])


def builtin_grades() -> dict[str, BHCurve]:
    """The built-in steel grades; each curve is built on first use and cached.

    Returns
    -------
    dict of str to BHCurve
        A new dict (safe to modify) of the shared, read-only curves, keyed by designation:
        M270-35A, M330-50A, M350-50A, M400-50A, M530-50A, M800-65A.

    References
    ----------
    IEC 60404-8-4 (grades and minimum polarizations); Modelica Standard Library,
    Magnetic.FluxTubes soft-magnetic materials (M350-50A and M530-50A fits).
    """
    return {name: _curve(name) for name in _BY_NAME}


def lookup(name: str) -> BHCurve | None:
    """The built-in curve of a grade, or None when the grade is not built in.

    Parameters
    ----------
    name : str
        Grade designation such as ``"M400-50A"``; case and surrounding blanks are ignored.

    Returns
    -------
    BHCurve or None
    """
    key = name.strip().upper()
    return _curve(key) if key in _BY_NAME else None
