"""Specific iron loss of non-oriented electrical steel, from a grade's designation or a table.

A grade designation such as M400-50A states the maximum specific total loss at 1.5 T and
50 Hz (4.00 W/kg, the number over 100) and the nominal thickness (0.50 mm, the number after
the dash over 100) [IEC 60404-8-4, designation of grades]. That one figure is scaled to the
working peak flux density B and frequency f by the loss-separation form of Bertotti:

    p(B, f) = p_h (f / f0) (B / B0)^2 + p_c (f / f0)^2 (B / B0)^2 + p_e (f / f0)^1.5 (B / B0)^1.5

with B0 = 1.5 T, f0 = 50 Hz and:

* ``p_c`` the classical eddy-current loss of a sheet of thickness d, conductivity sigma and
  density rho_m under a uniform sinusoidal flux, pi^2 sigma d^2 (B0 f0)^2 / (6 rho_m)
  [Bertotti, Hysteresis in Magnetism, 1998, classical loss; calc];
* the rest of the designation figure, P15 - p_c, split into hysteresis ``p_h`` (share
  1 - x_e) and excess ``p_e`` (share x_e), x_e = 0.15 by default. Loss separations of
  0.35-0.65 mm non-oriented steel at 50 Hz put the excess at 10-40 % of the non-classical
  part (from memory of the loss-separation literature, e.g. Bertotti's book; common
  practice, no single source). The choice matters only away from 50 Hz: at f > f0 a larger
  x_e gives a larger loss.
* B^2 for hysteresis (a Steinmetz exponent of 2, usual between about 1 and 1.5 T for these
  steels; common practice, no source).

Limits of the scaling, all stated to the user:

* it holds for sinusoidal flux of one frequency, 0.3 T <= B <= 1.8 T roughly; above about
  1.5 T real losses rise faster than B^2 (the table of a supplier then wins);
* the classical term assumes the flux fills the sheet: valid while the skin depth delta =
  sqrt(2 / (omega mu sigma)) exceeds the sheet thickness. At d / delta > 1 (for 0.5 mm
  sheet, about 400 Hz at mu_r 1000; tooth-coil and high-pole-count machines) the field is
  expelled from the sheet centre and the true eddy loss is LOWER than the formula
  (:func:`eddy_skin_factor`), so the scaling stays on the safe side but overstates;
* harmonics, rotational flux in the tooth roots and punching damage are not in the sheet
  figure: they are covered by the build factors
  (:data:`emgate.physics.core_loss.BUILD_FACTORS`).

A measured table (W/kg against B at one or more frequencies) wins over the scaling:
:func:`table_specific_loss`.
"""

from __future__ import annotations

import math
import re
from bisect import bisect_right
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import NamedTuple

import numpy as np

from emgate.physics.constants import MU0

#: Reference flux density [T] and frequency [Hz] of the designation figure (IEC 60404-8-4).
DESIGNATION_B: float = 1.5
DESIGNATION_F: float = 50.0
#: Default excess share of the non-classical loss at 1.5 T, 50 Hz (see the module notes).
EXCESS_SHARE: float = 0.15

_DESIGNATION = re.compile(r"^\s*M(\d{3,4})-(\d{2,3})([A-Z]{1,2})\s*$", re.IGNORECASE)


class Designation(NamedTuple):
    """The figures a grade's name states.

    Parameters
    ----------
    name : str
    specific_loss : float
        Maximum specific total loss at 1.5 T, 50 Hz [W/kg].
    thickness : float
        Nominal thickness [m].
    """

    name: str
    specific_loss: float
    thickness: float


def parse_designation(name: str) -> Designation | None:
    """Read the loss and thickness from a designation such as ``"M400-50A"``.

    Parameters
    ----------
    name : str

    Returns
    -------
    Designation or None
        None when the name is not of the form M<100 x W/kg>-<100 x mm><letter>.

    References
    ----------
    IEC 60404-8-4, designation of non-oriented fully processed grades (M, 100 times the
    maximum specific loss at 1.5 T 50 Hz in W/kg, 100 times the thickness in mm, A) [from
    memory].
    """
    m = _DESIGNATION.match(name)
    if m is None:
        return None
    return Designation(name.strip().upper(), int(m.group(1)) / 100.0, int(m.group(2)) / 1e5)


def classical_eddy_loss(
    flux_density: float | np.ndarray,
    frequency: float | np.ndarray,
    thickness: float,
    resistivity: float,
    density: float,
) -> float | np.ndarray:
    """Classical eddy-current loss of a thin sheet under sinusoidal flux.

    Parameters
    ----------
    flux_density : float or numpy.ndarray
        Peak flux density ``B`` [T].
    frequency : float or numpy.ndarray
        ``f`` [Hz].
    thickness : float
        Sheet thickness ``d`` [m].
    resistivity : float
        ``1 / sigma`` [ohm m].
    density : float
        Mass density [kg/m^3].

    Returns
    -------
    float or numpy.ndarray
        ``pi^2 d^2 (B f)^2 / (6 rho_e rho_m)`` [W/kg]; valid while ``d`` is small against
        the skin depth (:func:`skin_depth`).

    References
    ----------
    Bertotti, G., Hysteresis in Magnetism, Academic Press 1998, classical eddy-current loss
    [from memory]; the field in the sheet E = x dB/dt integrated over the thickness [calc].
    """
    if not (thickness > 0.0 and resistivity > 0.0 and density > 0.0):
        raise ValueError("thickness, resistivity and density must be > 0")
    bf = np.asarray(flux_density) * np.asarray(frequency)
    out = math.pi**2 * thickness**2 * bf**2 / (6.0 * resistivity * density)
    return float(out) if np.ndim(out) == 0 else out


def skin_depth(frequency: float, resistivity: float, relative_permeability: float) -> float:
    """Skin depth of a conductor, ``sqrt(2 rho / (omega mu0 mu_r))`` [m].

    Parameters
    ----------
    frequency : float
        [Hz], > 0.
    resistivity : float
        [ohm m].
    relative_permeability : float
        [-].

    Returns
    -------
    float
        [m].

    References
    ----------
    [mem: Jackson, Classical Electrodynamics, skin depth].
    """
    if not (frequency > 0.0 and resistivity > 0.0 and relative_permeability > 0.0):
        raise ValueError("frequency, resistivity and permeability must be > 0")
    return math.sqrt(2.0 * resistivity / (2.0 * math.pi * frequency * MU0 * relative_permeability))


def eddy_skin_factor(thickness_over_skin_depth: float | np.ndarray) -> float | np.ndarray:
    """Eddy loss of a sheet with skin effect over its classical (thin-sheet) value.

    Parameters
    ----------
    thickness_over_skin_depth : float or numpy.ndarray
        ``x = d / delta`` [-], >= 0.

    Returns
    -------
    float or numpy.ndarray
        ``(3 / x) (sinh x - sin x) / (cosh x - cos x)`` [-]: 1 as x -> 0, below 1 for
        x > 0 and ``3 / x`` for large x. Linear material (constant permeability) with the
        mean flux density held: the correction emgate does NOT apply (it lowers the loss,
        and mu is uncertain in a working core); it bounds how much the thin-sheet formula
        overstates at high frequency.

    References
    ----------
    [mem: Stoll, The Analysis of Eddy Currents, 1974, laminated plate]; the limit x -> 0 by
    series expansion [calc].
    """
    x = np.asarray(thickness_over_skin_depth, dtype=float)
    if np.any(x < 0.0):
        raise ValueError("d / delta must be >= 0")
    small = x < 1e-3
    xs = np.where(small, 1.0, x)
    with np.errstate(over="ignore", invalid="ignore"):
        exact = 3.0 / xs * (np.sinh(xs) - np.sin(xs)) / (np.cosh(xs) - np.cos(xs))
    # for very large x sinh/cosh overflow to inf/inf: the limit is 3 / x
    exact = np.where(np.isfinite(exact), exact, 3.0 / xs)
    out = np.where(small, 1.0 - x**4 / 420.0, exact)
    return float(out) if out.ndim == 0 else out


class LossSplit(NamedTuple):
    """The designation figure split into its terms at 1.5 T, 50 Hz [W/kg].

    Parameters
    ----------
    hysteresis, classical, excess : float
        [W/kg], summing to the designation figure.
    """

    hysteresis: float
    classical: float
    excess: float

    @property
    def total(self) -> float:
        """[W/kg]."""
        return self.hysteresis + self.classical + self.excess


def designation_split(
    specific_loss: float,
    thickness: float,
    resistivity: float,
    density: float,
    excess_share: float = EXCESS_SHARE,
) -> LossSplit:
    """Split a 1.5 T / 50 Hz loss figure into hysteresis, classical eddy and excess.

    Parameters
    ----------
    specific_loss : float
        P15 at 1.5 T, 50 Hz [W/kg] (the designation's maximum).
    thickness, resistivity, density : float
        [m], [ohm m], [kg/m^3].
    excess_share : float, optional
        Excess share of ``P15 - p_c`` [-], 0 to 1.

    Returns
    -------
    LossSplit

    Raises
    ------
    ValueError
        When the classical term alone exceeds the figure (resistivity or thickness wrong).

    References
    ----------
    Bertotti, Hysteresis in Magnetism, 1998, loss separation [from memory].
    """
    if not 0.0 <= excess_share <= 1.0:
        raise ValueError("excess share must lie in [0, 1]")
    p_c = float(classical_eddy_loss(DESIGNATION_B, DESIGNATION_F, thickness, resistivity, density))
    rest = specific_loss - p_c
    if not rest > 0.0:
        raise ValueError(
            f"the classical eddy loss {p_c:.3g} W/kg exceeds the figure {specific_loss:g} W/kg:"
            " check thickness and resistivity"
        )
    return LossSplit((1.0 - excess_share) * rest, p_c, excess_share * rest)


def specific_loss(
    split: LossSplit, flux_density: float | np.ndarray, frequency: float | np.ndarray
) -> float | np.ndarray:
    """Specific loss at a working peak flux density and frequency by the Bertotti form.

    Parameters
    ----------
    split : LossSplit
        At 1.5 T, 50 Hz (:func:`designation_split`).
    flux_density : float or numpy.ndarray
        Peak ``B`` [T], >= 0.
    frequency : float or numpy.ndarray
        ``f`` [Hz], >= 0.

    Returns
    -------
    float or numpy.ndarray
        [W/kg] (see the module notes for the form and its limits).

    References
    ----------
    Bertotti, G., "General properties of power losses in soft ferromagnetic materials",
    IEEE Trans. Magn. 24(1), 1988, 621-630 [from memory].
    """
    b = np.abs(np.asarray(flux_density, dtype=float)) / DESIGNATION_B
    f = np.asarray(frequency, dtype=float) / DESIGNATION_F
    if np.any(f < 0.0):
        raise ValueError("frequency must be >= 0")
    out = split.hysteresis * f * b**2 + split.classical * (f * b) ** 2
    out = out + split.excess * (f * b) ** 1.5
    return float(out) if out.ndim == 0 else out


# --- a measured table ----------------------------------------------------------------------


@dataclass(frozen=True)
class LossCurve:
    """Specific loss against peak flux density at one frequency.

    Parameters
    ----------
    frequency : float
        [Hz], > 0.
    flux_density : numpy.ndarray
        Peak ``B`` points [T], strictly increasing, > 0.
    loss : numpy.ndarray
        [W/kg], non-decreasing, > 0.
    """

    frequency: float
    flux_density: np.ndarray
    loss: np.ndarray
    # The curve as Python floats and their logarithms: a record looks it up a few times,
    # and numpy's calls on a handful of points cost more than the interpolation.
    _b: tuple[float, ...] = field(init=False, repr=False, compare=False)
    _p: tuple[float, ...] = field(init=False, repr=False, compare=False)
    _lb: tuple[float, ...] = field(init=False, repr=False, compare=False)
    _lp: tuple[float, ...] = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        b = np.asarray(self.flux_density, dtype=float)
        p = np.asarray(self.loss, dtype=float)
        if b.ndim != 1 or b.shape != p.shape or b.size < 2:
            raise ValueError("a loss curve needs two equal tables of at least 2 points")
        if not (self.frequency > 0.0 and np.all(b > 0.0) and np.all(p > 0.0)):
            raise ValueError("frequency, flux densities and losses must be > 0")
        if np.any(np.diff(b) <= 0.0) or np.any(np.diff(p) < 0.0):
            raise ValueError("B must increase strictly and the loss must not fall along a curve")
        object.__setattr__(self, "flux_density", b)
        object.__setattr__(self, "loss", p)
        object.__setattr__(self, "_b", tuple(float(x) for x in b))
        object.__setattr__(self, "_p", tuple(float(x) for x in p))
        object.__setattr__(self, "_lb", tuple(math.log(x) for x in self._b))
        object.__setattr__(self, "_lp", tuple(math.log(x) for x in self._p))

    def at(self, flux_density: float) -> tuple[float, bool]:
        """[W/kg] at ``B`` and whether it was extrapolated: log-log between points, B^2
        beyond the ends (the hysteresis law)."""
        b = abs(flux_density)
        bs, ps = self._b, self._p
        if b <= 0.0:
            return 0.0, False
        if b < bs[0]:
            return ps[0] * (b / bs[0]) ** 2, True
        if b > bs[-1]:
            return ps[-1] * (b / bs[-1]) ** 2, True
        lb, lp = self._lb, self._lp
        j = min(bisect_right(bs, b), len(bs) - 1) - 1  # the segment [j, j + 1] holding b
        x = math.log(b)
        span = lb[j + 1] - lb[j]
        if span == 0.0:  # two points a float apart, one logarithm: the higher loss (safe side)
            return ps[j + 1], False
        slope = (lp[j + 1] - lp[j]) / span
        return math.exp(slope * (x - lb[j]) + lp[j]), False  # numpy.interp's formula


class TableLoss(NamedTuple):
    """Result of :func:`table_specific_loss`.

    Parameters
    ----------
    loss : float
        [W/kg].
    extrapolated : bool
        Outside the table's flux densities or frequencies (a bound was used).
    """

    loss: float
    extrapolated: bool


def table_specific_loss(
    curves: Sequence[LossCurve], flux_density: float, frequency: float
) -> TableLoss:
    """Specific loss from a measured table at several frequencies.

    Between two tabulated frequencies the energy per cycle p / f at the working B is taken
    linear in f, which is exact for hysteresis plus classical eddy loss (p / f = a + b f).
    Outside the tabulated frequencies the nearest curve is scaled by the bound max(r, r^2),
    r = f / f_table: per-cycle energy a + b f rises with f, so the true loss lies below
    p_table r^2 above the table and below p_table r beneath it (conservative both sides).
    In B, log-log interpolation on each curve, B^2 beyond its ends.

    Parameters
    ----------
    curves : sequence of LossCurve
        One or more, at distinct frequencies.
    flux_density : float
        Peak ``B`` [T].
    frequency : float
        [Hz], > 0.

    Returns
    -------
    TableLoss

    References
    ----------
    Loss separation p / f = k_h + k_c f [from memory: Bertotti, Hysteresis in Magnetism];
    the bounds [calc].
    """
    if not curves:
        raise ValueError("a loss table needs at least one curve")
    if not frequency > 0.0:
        raise ValueError("frequency must be > 0")
    by_f = sorted(curves, key=lambda c: c.frequency)
    freqs = [c.frequency for c in by_f]
    if len(set(freqs)) != len(freqs):
        raise ValueError("two curves of a loss table share a frequency")
    values = [c.at(flux_density) for c in by_f]
    extrapolated = any(e for _, e in values)
    if frequency <= freqs[0] or frequency >= freqs[-1]:
        k = 0 if frequency <= freqs[0] else len(freqs) - 1
        r = frequency / freqs[k]
        out = values[k][0] * max(r, r * r)
        return TableLoss(out, extrapolated or r != 1.0)
    k = int(np.searchsorted(freqs, frequency)) - 1
    f0, f1 = freqs[k], freqs[k + 1]
    e0, e1 = values[k][0] / f0, values[k + 1][0] / f1  # energy per cycle [J/kg]
    e = e0 + (e1 - e0) * (frequency - f0) / (f1 - f0)
    return TableLoss(e * frequency, extrapolated)
