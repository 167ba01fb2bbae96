"""Air-gap slotting: Carter's coefficient and the effective gap.

Two gaps appear here, and each function says which one it takes:

- the *mechanical* gap ``g``: the clearance between stator and rotor surfaces [m];
- the *magnetic* gap ``g'``: the distance between the two iron surfaces in units of free
  space. It equals ``g`` for iron facing iron (induction and salient-pole machines); for a
  surface-PM rotor the sleeve and the magnet (at its recoil permeability) add to it, see
  :func:`magnetic_gap`.

Slotting is corrected on the magnetic gap: Carter's coefficient is computed with ``g'`` and
multiplies ``g'``, so the slotted gap behaves like a smooth one of width ``kc * g'``
(:func:`effective_gap`).
"""

from __future__ import annotations

import math

__all__ = [
    "carter_coefficient",
    "carter_gamma",
    "carter_gamma_approx",
    "effective_gap",
    "magnetic_gap",
]


def _require(value: float, name: str, *, allow_zero: bool = False) -> float:
    """Return ``value`` as a float, or raise ValueError unless it is finite and positive."""
    v = float(value)
    if not math.isfinite(v) or v < 0.0 or (v == 0.0 and not allow_zero):
        bound = ">= 0" if allow_zero else "> 0"
        raise ValueError(f"{name} must be finite and {bound}, got {value!r}")
    return v


def carter_gamma(opening: float, gap: float) -> float:
    """Carter's slot factor gamma, exact form for an infinitely deep open slot.

    ``gamma * gap`` is the width of bore surface, per slot, that the slot opening removes
    from an otherwise smooth gap.

    Parameters
    ----------
    opening : float
        Slot opening b0 [m], >= 0 (0 is a closed slot: gamma = 0).
    gap : float
        Magnetic gap g' the slot faces [m], > 0 (see :func:`magnetic_gap`).

    Returns
    -------
    float
        gamma = (4/pi) [u atan(u) - ln sqrt(1 + u^2)], u = b0 / (2 g') [-].

    References
    ----------
    F. W. Carter, "Air-gap induction", Electrical World and Engineer 38 (1901): conformal
    map of an isolated open slot of infinite depth; as given in J. Pyrhonen, T. Jokinen,
    V. Hrabovcova, *Design of Rotating Electrical Machines*, ch. 3.
    """
    b0 = _require(opening, "slot opening", allow_zero=True)
    g = _require(gap, "air gap")
    u = b0 / (2.0 * g)
    # log1p keeps the small-opening limit (gamma ~ 2 u^2 / pi) accurate
    return 4.0 / math.pi * (u * math.atan(u) - 0.5 * math.log1p(u * u))


def carter_gamma_approx(opening: float, gap: float) -> float:
    """Carter's slot factor gamma, the common rational approximation.

    Parameters
    ----------
    opening : float
        Slot opening b0 [m], >= 0.
    gap : float
        Magnetic gap g' [m], > 0.

    Returns
    -------
    float
        gamma ~ (b0/g')^2 / (5 + b0/g') [-]. Against :func:`carter_gamma` it is within
        about 2.5 % for b0/g' from 2 to 20, but 9 % high at b0/g' = 1 and worse below
        (the exact small-opening limit is (b0/g')^2 / (2 pi)).

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, ch. 3.
    """
    r = _require(opening, "slot opening", allow_zero=True) / _require(gap, "air gap")
    return r * r / (5.0 + r)


def carter_coefficient(
    slot_pitch: float, opening: float, gap: float, *, approximate: bool = False
) -> float:
    """Carter's coefficient of one slotted surface facing a smooth one.

    Parameters
    ----------
    slot_pitch : float
        Slot pitch tau_s at the slotted surface [m], > 0 (at the bore for the stator, at
        the rotor surface for the rotor).
    opening : float
        Slot opening b0 [m], 0 <= b0 < tau_s.
    gap : float
        Magnetic gap g' [m], > 0: the mechanical gap for iron facing iron, the result of
        :func:`magnetic_gap` for a surface-PM rotor.
    approximate : bool, optional
        Use :func:`carter_gamma_approx` instead of the exact :func:`carter_gamma`.

    Returns
    -------
    float
        kc = tau_s / (tau_s - gamma g') [-], >= 1. For slots on both sides multiply the
        stator and rotor coefficients (:func:`effective_gap`).

    Raises
    ------
    ValueError
        If an input is not finite, the pitch or gap is not positive, the opening is
        negative, or the opening is not smaller than the slot pitch.

    Notes
    -----
    The closed form is exact for an isolated, infinitely deep slot; summing it over a row
    of slots stays close to the true permeance unless the teeth are narrower than the gap
    (Neville 1967).

    References
    ----------
    F. W. Carter, "Air-gap induction", Electrical World and Engineer 38 (1901);
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, ch. 3;
    S. Neville, "Use of Carter's coefficient with narrow teeth", Proc. IEE 114 (1967).
    """
    tau = _require(slot_pitch, "slot pitch")
    b0 = _require(opening, "slot opening", allow_zero=True)
    g = _require(gap, "air gap")
    if b0 >= tau:
        raise ValueError(f"slot opening ({b0!r} m) must be smaller than the slot pitch ({tau!r} m)")
    gamma = carter_gamma_approx(b0, g) if approximate else carter_gamma(b0, g)
    # gamma * g < b0 < tau for both forms, so the denominator stays positive
    return tau / (tau - gamma * g)


def magnetic_gap(
    gap: float,
    *,
    sleeve: float = 0.0,
    magnet_thickness: float = 0.0,
    recoil_permeability: float = 1.0,
) -> float:
    """Magnetic gap g' between the iron surfaces, in units of free space.

    Parameters
    ----------
    gap : float
        Mechanical gap g [m], > 0: clearance between the stator bore and the rotor surface
        (outside the sleeve, if any).
    sleeve : float, optional
        Radial thickness of a non-magnetic retaining sleeve [m], >= 0.
    magnet_thickness : float, optional
        Radial thickness h_m of surface magnets [m], >= 0.
    recoil_permeability : float, optional
        Relative recoil permeability mu_rec of the magnets [-], > 0.

    Returns
    -------
    float
        g' = g + sleeve + h_m / mu_rec [m]; equal to ``gap`` when no sleeve or magnet is
        given. Pass it to :func:`carter_coefficient` and :func:`effective_gap`.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    ch. 3 (surface magnets enlarge the gap used for the slotting correction).
    """
    g = _require(gap, "air gap")
    s = _require(sleeve, "sleeve thickness", allow_zero=True)
    h_m = _require(magnet_thickness, "magnet thickness", allow_zero=True)
    mu_rec = _require(recoil_permeability, "recoil permeability")
    return g + s + h_m / mu_rec


def effective_gap(gap: float, kc_stator: float, kc_rotor: float = 1.0) -> float:
    """Effective gap: the smooth gap with the same permeance as the slotted one.

    Parameters
    ----------
    gap : float
        The gap the Carter coefficients were computed with [m], > 0: the mechanical gap
        for iron facing iron, the magnetic gap g' of :func:`magnetic_gap` for a surface-PM
        rotor (the result then includes the magnet's own share, h_m / mu_rec, enlarged by
        the slotting).
    kc_stator : float
        Carter coefficient of the stator slots [-], >= 1.
    kc_rotor : float, optional
        Carter coefficient of the rotor slots [-], >= 1; 1 for a smooth rotor.

    Returns
    -------
    float
        kc_s kc_r g [m].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    ch. 3 (slots on both sides: kc = kc_s kc_r).
    """
    g = _require(gap, "air gap")
    for side, kc in (("stator", kc_stator), ("rotor", kc_rotor)):
        if not (math.isfinite(kc) and kc >= 1.0):
            raise ValueError(f"{side} Carter coefficient must be finite and >= 1, got {kc!r}")
    return kc_stator * kc_rotor * g
