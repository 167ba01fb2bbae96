"""The magnetic circuit of a surface-magnet pole and the magnet's reversible temperature law.

The magnet's working point at no load, solved with the iron in the loop of one pole
(:mod:`emgate.physics.magnetic`); its remanence and coercivity at a temperature; its field
strength under a demagnetising stator MMF. All quantities SI; MMF in amperes (ampere-turns).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from emgate.physics.bh import BHCurve
from emgate.physics.constants import MU0
from emgate.physics.iron import solve_increasing
from emgate.physics.magnetic import (
    GapResult,
    PolePath,
    SurfaceMagnet,
    gap_fields,
    pole_mmf,
    pole_state,
)

#: Reference temperature of magnet data sheets [K] (20 degC).
T_REF = 293.15


def remanence_at(
    remanence_ref: float, temperature: float, alpha: float, reference_temperature: float = T_REF
) -> float:
    """Remanence at a magnet temperature: ``Br(T) = Br0 (1 + alpha (T - T0))``.

    The same linear reversible law gives the intrinsic coercivity at a temperature,
    ``H_cJ(T) = H_cJ0 (1 + beta (T - T0))``: pass ``H_cJ0`` [A/m] and ``beta``.

    Parameters
    ----------
    remanence_ref : float
        Remanence Br0 at the reference temperature [T].
    temperature : float
        Magnet temperature T [K].
    alpha : float
        Reversible temperature coefficient of Br [1/K] (negative for NdFeB and ferrite).
    reference_temperature : float
        T0 [K], 293.15 K (20 degC) by default.

    Returns
    -------
    float
        Br(T) [T].

    References
    ----------
    Hendershot and Miller, Design of Brushless Permanent-Magnet Machines (temperature
    coefficients of magnet materials).
    """
    return remanence_ref * (1.0 + alpha * (temperature - reference_temperature))


def magnet_field_under_current(
    no_load_field: float, mmf: float, recoil_permeability: float, magnetic_gap: float
) -> float:
    """Magnet field strength with a stator MMF on the d-axis against the magnet.

    Superposes on the no-load working point H_0 (iron included) the armature term of the
    linear loop of magnet and gap, ``H = H_0 - F / (mu_rec g_m)``, ``g_m`` the whole
    Carter-corrected magnetic gap ``kc (g + sleeve + l_m / mu_rec)``: the MMF ``F`` drops
    over ``l_m + mu_rec (g_m - l_m / mu_rec) = mu_rec g_m`` of magnet length. An
    approximation on the worst side when ``F`` is the peak of the MMF: the iron's
    reluctance and the magnet's leakage are neglected in the armature term.

    Parameters
    ----------
    no_load_field : float
        Magnet field strength H_0 at no load [A/m] (negative: demagnetising).
    mmf : float
        Stator MMF taken wholly on the d-axis, demagnetising, F >= 0 [A] (ampere-turns per
        pole across one gap).
    recoil_permeability : float
        Relative recoil permeability mu_rec [-], > 0.
    magnetic_gap : float
        Carter-corrected magnetic gap g_m, magnet included [m], > 0.

    Returns
    -------
    float
        H [A/m] (negative: demagnetising).

    References
    ----------
    Hendershot and Miller, Design of Brushless Permanent-Magnet Machines (demagnetisation
    by the armature reaction of a surface magnet; from memory).
    """
    if not (recoil_permeability > 0.0 and magnetic_gap > 0.0):
        raise ValueError("recoil permeability and magnetic gap must be > 0")
    return no_load_field - mmf / (recoil_permeability * magnetic_gap)


@dataclass(frozen=True)
class SurfacePMResult(GapResult):
    """:class:`~emgate.physics.magnetic.GapResult` with the magnet working point.

    Attributes
    ----------
    magnet_b : float
        Flux density in the magnet [T].
    magnet_h : float
        Field strength in the magnet [A/m], negative (demagnetising) in normal operation;
        compare with the intrinsic coercivity at the magnet temperature.
    """

    magnet_b: float
    magnet_h: float


def surface_pm_gap(
    path: PolePath, magnet: SurfaceMagnet, stator_curve: BHCurve, rotor_curve: BHCurve
) -> SurfacePMResult:
    """Gap flux density of a surface-magnet machine at no load, iron included.

    Solves the loop of one pole ``H_m l_m + F_gap + F_iron = 0`` with the magnet on its
    recoil line ``B_m = Br + mu0 mu_rec H_m`` and ``B_m = k_leak B_g`` (magnet and gap
    areas taken equal). The gap flux is rectangular over the magnet arc (slot ripple and
    fringing neglected). The path's ``effective_gap`` is the whole Carter-corrected
    magnetic gap ``kc g'``, ``g' = g + sleeve + l_m / mu_rec``; the magnet's own
    ``l_m / mu_rec`` of it is the recoil line's, so the gap in series with magnet and iron
    is ``g_e = kc g' - l_m / mu_rec``. With ideal iron and no leakage this is
    ``B_g = Br (l_m / mu_rec) / (l_m / mu_rec + g_e) = Br (l_m / mu_rec) / (kc g')``,
    Carter's coefficient applied to the whole magnetic gap; with ``kc = 1`` it is the
    textbook ``B_g = Br l_m / (l_m + mu_rec (g + sleeve))``.

    Parameters
    ----------
    path : PolePath
        Flux path; ``effective_gap`` is ``kc g'``, the magnet's ``l_m / mu_rec`` included
        (see :class:`~emgate.physics.magnetic.PolePath`); it must exceed ``l_m / mu_rec``.
    magnet : SurfaceMagnet
    stator_curve, rotor_curve : BHCurve
        Stator lamination and rotor back iron.

    Returns
    -------
    SurfacePMResult
        Gap and iron state, and the magnet working point (B_m, H_m).

    References
    ----------
    Hendershot and Miller, Design of Brushless Permanent-Magnet Machines (magnetic circuit
    of a surface magnet); Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical
    Machines, ch. 3 (magnetic voltages of teeth and yokes).
    """
    own = magnet.thickness / magnet.recoil_permeability
    if not path.effective_gap > own:
        raise ValueError(
            "PolePath.effective_gap of a surface-magnet machine is the whole magnetic gap"
            " kc g' and must exceed the magnet's own l_m / mu_rec"
        )
    path = replace(path, effective_gap=path.effective_gap - own)  # the gap beside the magnet
    k_leak = magnet.leakage_factor
    coercive_mmf = magnet.remanence * magnet.thickness / (MU0 * magnet.recoil_permeability)

    arc = magnet.arc_fraction
    curves = (stator_curve, rotor_curve)

    def state(b_gap: float) -> GapResult:
        return pole_state(path, b_gap, arc, *curves, rotor_flux_factor=k_leak, rotor_yoke_ramp=arc)

    def residual(b_gap: float) -> float:
        magnet_drop = k_leak * b_gap * magnet.thickness / (MU0 * magnet.recoil_permeability)
        total = pole_mmf(path, b_gap, arc, *curves, rotor_flux_factor=k_leak, rotor_yoke_ramp=arc)
        return magnet_drop + total - coercive_mmf

    # With ideal iron the loop is linear in B_g; the iron's magnetic voltage (>= 0) only
    # lowers the root, so the ideal-iron root (widened by far more than rounding) bounds it
    # from above, and the first secant step lands within a few per cent of the root. (At
    # B_g = Br / k_leak the magnet field is zero and the rest of the loop is not.)
    linear = k_leak * magnet.thickness / (MU0 * magnet.recoil_permeability)
    ideal = coercive_mmf / (linear + path.effective_gap / MU0)
    b_gap = solve_increasing(residual, 0.0, min(magnet.remanence / k_leak, ideal * (1 + 1e-9)))
    magnet_b = k_leak * b_gap
    magnet_h = (magnet_b - magnet.remanence) / (MU0 * magnet.recoil_permeability)
    return SurfacePMResult(**gap_fields(state(b_gap)), magnet_b=magnet_b, magnet_h=magnet_h)
