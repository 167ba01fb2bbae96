"""Magnetic circuit of one pole: the gap flux density with the iron's share of the MMF.

The iron is taken from its B-H curve, so the circuit is nonlinear and saturation shows.
Per pole, the loop holds one gap, the stator teeth (and rotor teeth, if any), a salient pole
body where there is one, and half of each yoke between two pole axes. Leakage between poles
is a factor on the rotor-side flux; it does not load the gap or the stator.

- Surface PM: the magnet's working point, solved with the iron in the loop.
- Salient pole with field winding: the gap flux density from the field ampere-turns.
- Induction: the flux from the voltage equation; the magnetising ampere-turns follow.

A general series circuit (:class:`Segment`, :func:`series_mmf`, :func:`series_flux`) covers
the textbook circuits of uniform sections. All quantities SI; MMF in amperes (ampere-turns).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, fields, replace
from typing import Any

from emgate.physics.bh import BHCurve, h_from_b
from emgate.physics.constants import MU0
from emgate.physics.iron import (
    apparent_tooth_flux_density,
    real_tooth_flux_density,
    slot_flux_sharing_factor,
    solve_increasing,
    tooth_magnetic_voltage,
    yoke_flux_density,
    yoke_magnetic_voltage,
)

#: Reference temperature of magnet data sheets [K] (20 degC).
T_REF = 293.15
#: Default share of the phase voltage taken by the stator resistance and leakage reactance
#: of an induction machine at rated load; 2-5 % is usual (common practice, no source).
DEFAULT_VOLTAGE_DROP = 0.03


def _require_positive(obj: object, *names: str) -> None:
    for name in names:
        value = getattr(obj, name)
        if not (math.isfinite(value) and value > 0.0):
            raise ValueError(f"{type(obj).__name__}.{name} must be finite and > 0, got {value}")


# ---------------------------------------------------------------- general series circuit


@dataclass(frozen=True)
class Segment:
    """A uniform section of a series magnetic circuit.

    Parameters
    ----------
    length : float
        Path length [m].
    area : float
        Cross-section the flux passes [m^2].
    curve : BHCurve or None
        Steel of the section; None for a linear medium (air, or a magnet's recoil line).
    relative_permeability : float
        Relative permeability of a linear section [-]; ignored when ``curve`` is given.
    """

    length: float
    area: float
    curve: BHCurve | None = None
    relative_permeability: float = 1.0

    def __post_init__(self) -> None:
        _require_positive(self, "length", "area", "relative_permeability")


def segment_mmf(segment: Segment, flux: float) -> float:
    """Magnetic voltage of one section carrying a flux: ``H(Phi / A) l``.

    Parameters
    ----------
    segment : Segment
    flux : float
        Flux through the section [Wb].

    Returns
    -------
    float
        Magnetic voltage [A].

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1 (magnetic circuits).
    """
    b = flux / segment.area
    if segment.curve is None:
        h = b / (MU0 * segment.relative_permeability)
    else:
        h = float(h_from_b(segment.curve, b))
    return h * segment.length


def series_mmf(segments: Sequence[Segment], flux: float) -> float:
    """MMF needed to drive a flux through sections in series [A] (sum of their voltages).

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1.
    """
    return sum(segment_mmf(s, flux) for s in segments)


def series_flux(segments: Sequence[Segment], mmf: float) -> float:
    """Flux that an MMF drives through sections in series, solved on the B-H curves.

    Parameters
    ----------
    segments : sequence of Segment
        At least one section.
    mmf : float
        Ampere-turns applied round the loop [A]; odd symmetry for negative values.

    Returns
    -------
    float
        Flux [Wb].

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1.
    """
    if not segments:
        raise ValueError("a magnetic circuit needs at least one segment")
    target = abs(mmf)
    if target == 0.0:
        return 0.0
    # Start from the flux the loop would carry if it were all air, and double until the
    # MMF is reached; it always is, as H grows at least at 1/mu0 beyond a curve's table.
    lo, hi = 0.0, target / sum(s.length / (MU0 * s.area) for s in segments)
    for _ in range(2000):
        if series_mmf(segments, hi) >= target:
            break
        lo, hi = hi, 2.0 * hi
    flux = solve_increasing(lambda phi: series_mmf(segments, phi) - target, lo, hi)
    return math.copysign(flux, mmf)


# ---------------------------------------------------------------- geometry of a pole


@dataclass(frozen=True)
class Teeth:
    """Parallel-sided teeth on one side of the gap.

    The slot-flux-sharing factor is taken with the gap-side slot pitch over the whole tooth,
    which underrates the slot area further from the gap: real flux densities on the safe
    (high) side.

    Parameters
    ----------
    slot_pitch : float
        Slot pitch tau_s at the gap [m].
    width : float
        Tooth width b_t [m].
    height : float
        Tooth height from the gap to the yoke [m].
    """

    slot_pitch: float
    width: float
    height: float

    def __post_init__(self) -> None:
        _require_positive(self, "slot_pitch", "width", "height")


@dataclass(frozen=True)
class Yoke:
    """A yoke (back iron) carrying the flux between pole axes.

    Parameters
    ----------
    height : float
        Radial height h_y [m].
    path_length : float
        Yoke pole pitch tau_y: the mean flux path from one pole axis to the next, pi D_y / 2p
        at the mean yoke diameter D_y [m]. One pole's share of the loop is half of it.
    """

    height: float
    path_length: float

    def __post_init__(self) -> None:
        _require_positive(self, "height", "path_length")


@dataclass(frozen=True)
class PolePath:
    """Geometry of the flux path of one pole, shared by all machine kinds.

    Parameters
    ----------
    pole_pitch : float
        Pole pitch tau_p at the gap [m].
    stack_length : float
        Axial length l the gap flux density is referred to [m].
    iron_length : float
        Iron length l_Fe, the stack without ventilation ducts [m]; the same length is used
        for stator and rotor iron.
    stacking_factor : float
        Lamination stacking factor k_Fe in (0, 1] [-].
    effective_gap : float
        Carter-corrected gap in series with the iron [m]: kc g for cage and salient-pole
        rotors. For surface magnets, the whole Carter-corrected magnetic gap kc g',
        g' = g + sleeve + l_m / mu_rec (:func:`emgate.physics.airgap.magnetic_gap`), the
        magnet's own l_m / mu_rec included: :func:`surface_pm_gap` counts that share on the
        magnet's recoil line and the rest, ``kc g' - l_m / mu_rec``, as the gap.
    stator_teeth : Teeth
    stator_yoke : Yoke
    rotor_yoke : Yoke
    rotor_teeth : Teeth or None
        Rotor teeth (cage rotors); None for a rotor without slots at the gap.
    """

    pole_pitch: float
    stack_length: float
    iron_length: float
    stacking_factor: float
    effective_gap: float
    stator_teeth: Teeth
    stator_yoke: Yoke
    rotor_yoke: Yoke
    rotor_teeth: Teeth | None = None

    def __post_init__(self) -> None:
        _require_positive(
            self, "pole_pitch", "stack_length", "iron_length", "stacking_factor", "effective_gap"
        )
        if self.stacking_factor > 1.0:
            raise ValueError("PolePath.stacking_factor must not exceed 1")


@dataclass(frozen=True)
class SurfaceMagnet:
    """Surface magnets of one pole.

    Parameters
    ----------
    remanence : float
        Remanent flux density Br at the operating temperature [T] (see :func:`remanence_at`).
    recoil_permeability : float
        Relative recoil permeability mu_rec [-].
    thickness : float
        Magnet thickness l_m in the direction of magnetisation [m].
    arc_fraction : float
        Magnet arc over the pole pitch, in (0, 1] [-].
    leakage_factor : float
        Magnet flux over useful gap flux, >= 1 [-] (1: no leakage).
    """

    remanence: float
    recoil_permeability: float
    thickness: float
    arc_fraction: float
    leakage_factor: float = 1.0

    def __post_init__(self) -> None:
        _require_positive(self, "remanence", "recoil_permeability", "thickness", "arc_fraction")
        if self.arc_fraction > 1.0 or not self.leakage_factor >= 1.0:
            raise ValueError("SurfaceMagnet needs arc_fraction <= 1 and leakage_factor >= 1")


@dataclass(frozen=True)
class SalientPole:
    """A salient pole with its field winding.

    Parameters
    ----------
    shoe_width : float
        Pole-shoe width b_p at the gap [m], at most the pole pitch.
    body_width : float
        Width of the pole body (core under the field coil) [m].
    body_height : float
        Magnetic path length of the pole: pole body plus pole shoe, from the shoe's gap
        surface to the rotor yoke [m]. The body's flux density (over ``body_width``) is
        taken over this whole height; the wider shoe carries less, so its share of the
        ampere-turns is overrated, on the safe side.
    leakage_factor : float
        Pole-body flux over useful gap flux, >= 1 [-]; 1.1-1.25 is usual (common practice,
        no source).
    """

    shoe_width: float
    body_width: float
    body_height: float
    leakage_factor: float = 1.0

    def __post_init__(self) -> None:
        _require_positive(self, "shoe_width", "body_width", "body_height")
        if not self.leakage_factor >= 1.0:
            raise ValueError("SalientPole.leakage_factor must be >= 1")


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


# ---------------------------------------------------------------- results


@dataclass(frozen=True)
class IronState:
    """Flux densities [T] and magnetic voltages [A] of the iron of one pole.

    Teeth are the ones on the pole axis, carrying the peak gap flux density; yoke flux
    densities are peaks (interpolar axis); yoke voltages are one pole's share (half the path
    between pole axes). Parts a machine lacks are 0.
    """

    stator_tooth_b_apparent: float
    stator_tooth_b: float
    stator_tooth_mmf: float
    stator_yoke_b: float
    stator_yoke_mmf: float
    rotor_yoke_b: float
    rotor_yoke_mmf: float
    rotor_tooth_b_apparent: float = 0.0
    rotor_tooth_b: float = 0.0
    rotor_tooth_mmf: float = 0.0
    pole_body_b: float = 0.0
    pole_body_mmf: float = 0.0

    @property
    def teeth_mmf(self) -> float:
        """Magnetic voltage of stator and rotor teeth [A]."""
        return self.stator_tooth_mmf + self.rotor_tooth_mmf

    @property
    def total_mmf(self) -> float:
        """Magnetic voltage of all the iron of the pole [A]."""
        return (
            self.stator_tooth_mmf
            + self.stator_yoke_mmf
            + self.rotor_yoke_mmf
            + self.rotor_tooth_mmf
            + self.pole_body_mmf
        )


@dataclass(frozen=True)
class GapResult:
    """Gap and iron of one pole at the solved operating point.

    Attributes
    ----------
    b_peak : float
        Gap flux density on the pole axis [T].
    b_fundamental : float
        Amplitude of the fundamental of the gap flux density [T].
    flux_per_pole : float
        Useful gap flux per pole [Wb].
    gap_mmf : float
        Magnetic voltage of the (Carter-corrected) gap on the pole axis [A].
    iron : IronState
        Flux densities and magnetic voltages of the iron parts.
    """

    b_peak: float
    b_fundamental: float
    flux_per_pole: float
    gap_mmf: float
    iron: IronState

    @property
    def total_mmf(self) -> float:
        """Ampere-turns per pole the circuit takes: gap plus iron [A]."""
        return self.gap_mmf + self.iron.total_mmf

    @property
    def saturation_factor(self) -> float:
        """Tooth saturation factor ``k_sat = (F_gap + F_teeth) / F_gap`` [-].

        Teeth of stator and rotor only, the definition that sets how far tooth saturation
        flattens the gap flux wave; yokes are left out. 1 at zero flux.
        """
        if self.gap_mmf == 0.0:
            return 1.0
        return (self.gap_mmf + self.iron.teeth_mmf) / self.gap_mmf


@dataclass(frozen=True)
class SurfacePMResult(GapResult):
    """:class:`GapResult` with the magnet working point.

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


@dataclass(frozen=True)
class InductionResult(GapResult):
    """:class:`GapResult` with the induced voltage used.

    Attributes
    ----------
    emf : float
        Induced phase voltage E (rms) that sets the flux [V].
    """

    emf: float


# ---------------------------------------------------------------- the pole's iron


def _teeth_state(
    b_gap: float, teeth: Teeth, path: PolePath, curve: BHCurve
) -> tuple[float, float, float]:
    geometry = (
        teeth.slot_pitch,
        teeth.width,
        path.stack_length,
        path.iron_length,
        path.stacking_factor,
    )
    b_app = apparent_tooth_flux_density(b_gap, *geometry)
    b_real = real_tooth_flux_density(b_app, slot_flux_sharing_factor(*geometry), curve)
    return b_app, b_real, tooth_magnetic_voltage(b_real, teeth.height, curve)


def _pole_state(
    path: PolePath,
    b_peak: float,
    arc: float | None,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    rotor_flux_factor: float = 1.0,
    rotor_yoke_ramp: float | None = None,
    pole: SalientPole | None = None,
) -> GapResult:
    """Gap and iron of the pole for a given peak gap flux density.

    ``arc``: pole-arc fraction of a rectangular gap flux, or None for a sinusoidal one.
    """
    if arc is None:
        flux_width, fundamental = 2.0 / math.pi, 1.0  # the sine's mean over its peak
    else:
        # Fourier fundamental of a rectangle of width a*pi (electrical): (4/pi) sin(a pi/2).
        flux_width, fundamental = arc, 4.0 / math.pi * math.sin(0.5 * math.pi * arc)
    flux = b_peak * flux_width * path.pole_pitch * path.stack_length
    rotor_flux = rotor_flux_factor * flux
    iron_area = path.stacking_factor * path.iron_length

    st_app, st_b, st_mmf = _teeth_state(b_peak, path.stator_teeth, path, stator_curve)
    sy_b = yoke_flux_density(flux, path.stator_yoke.height, path.iron_length, path.stacking_factor)
    sy_mmf = yoke_magnetic_voltage(sy_b, 0.5 * path.stator_yoke.path_length, stator_curve, arc)
    ry_b = yoke_flux_density(
        rotor_flux, path.rotor_yoke.height, path.iron_length, path.stacking_factor
    )
    ry_mmf = yoke_magnetic_voltage(
        ry_b, 0.5 * path.rotor_yoke.path_length, rotor_curve, rotor_yoke_ramp
    )
    rotor_teeth = (0.0, 0.0, 0.0)
    if path.rotor_teeth is not None:
        rotor_teeth = _teeth_state(b_peak, path.rotor_teeth, path, rotor_curve)
    body_b = body_mmf = 0.0
    if pole is not None:
        body_b = rotor_flux / (iron_area * pole.body_width)
        body_mmf = tooth_magnetic_voltage(body_b, pole.body_height, rotor_curve)

    iron = IronState(
        stator_tooth_b_apparent=st_app,
        stator_tooth_b=st_b,
        stator_tooth_mmf=st_mmf,
        stator_yoke_b=sy_b,
        stator_yoke_mmf=sy_mmf,
        rotor_yoke_b=ry_b,
        rotor_yoke_mmf=ry_mmf,
        rotor_tooth_b_apparent=rotor_teeth[0],
        rotor_tooth_b=rotor_teeth[1],
        rotor_tooth_mmf=rotor_teeth[2],
        pole_body_b=body_b,
        pole_body_mmf=body_mmf,
    )
    return GapResult(
        b_peak=b_peak,
        b_fundamental=b_peak * fundamental,
        flux_per_pole=flux,
        gap_mmf=b_peak * path.effective_gap / MU0,
        iron=iron,
    )


def _state_args(result: GapResult) -> dict[str, Any]:
    return {f.name: getattr(result, f.name) for f in fields(GapResult)}


# ---------------------------------------------------------------- solvers per machine kind


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
        (see :class:`PolePath`); it must exceed ``l_m / mu_rec``.
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

    def state(b_gap: float) -> GapResult:
        return _pole_state(
            path,
            b_gap,
            magnet.arc_fraction,
            stator_curve,
            rotor_curve,
            rotor_flux_factor=k_leak,
            rotor_yoke_ramp=magnet.arc_fraction,
        )

    def residual(b_gap: float) -> float:
        magnet_drop = k_leak * b_gap * magnet.thickness / (MU0 * magnet.recoil_permeability)
        return magnet_drop + state(b_gap).total_mmf - coercive_mmf

    # At B_g = Br / k_leak the magnet field is zero and the rest of the loop is not.
    b_gap = solve_increasing(residual, 0.0, magnet.remanence / k_leak)
    magnet_b = k_leak * b_gap
    magnet_h = (magnet_b - magnet.remanence) / (MU0 * magnet.recoil_permeability)
    return SurfacePMResult(**_state_args(state(b_gap)), magnet_b=magnet_b, magnet_h=magnet_h)


def salient_field_gap(
    path: PolePath,
    pole: SalientPole,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    field_mmf: float,
) -> GapResult:
    """Gap flux density under the centre of a salient pole from its field ampere-turns.

    Solves ``F_f = F_gap + F_teeth + F_pole body + F_yokes / 2`` for the peak gap flux
    density. Flux shape: uniform gap under the shoe, so the gap flux density is flat over
    the pole-shoe width and zero between poles (fringing neglected); the flux per pole is
    ``B_g b_p l`` and the fundamental ``(4/pi) B_g sin(pi b_p / (2 tau_p))``. The pole body
    and rotor yoke carry the leakage factor times the gap flux; the rim flux ramps up over
    the pole-body width and is flat between poles (see :func:`yoke_magnetic_voltage`).

    Parameters
    ----------
    path : PolePath
        Flux path; ``rotor_yoke`` is the rim the pole bodies sit on.
    pole : SalientPole
    stator_curve, rotor_curve : BHCurve
        Stator lamination; pole and rim steel.
    field_mmf : float
        Field ampere-turns per pole [A], >= 0.

    Returns
    -------
    GapResult
        ``total_mmf`` equals ``field_mmf`` at the solution.

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3 (magnetic
    circuit and magnetic voltages); Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1
    (series magnetic circuit).
    """
    if not (math.isfinite(field_mmf) and field_mmf >= 0.0):
        raise ValueError("the field ampere-turns must be finite and >= 0")
    if pole.shoe_width > path.pole_pitch:
        raise ValueError("the pole shoe is wider than the pole pitch")
    arc = pole.shoe_width / path.pole_pitch
    rim_ramp = min(1.0, pole.body_width / path.rotor_yoke.path_length)

    def state(b_gap: float) -> GapResult:
        return _pole_state(
            path,
            b_gap,
            arc,
            stator_curve,
            rotor_curve,
            rotor_flux_factor=pole.leakage_factor,
            rotor_yoke_ramp=rim_ramp,
            pole=pole,
        )

    # The gap alone would take all the ampere-turns at B = mu0 F / (kc g).
    b_gap = solve_increasing(
        lambda b: state(b).total_mmf - field_mmf, 0.0, MU0 * field_mmf / path.effective_gap
    )
    return state(b_gap)


def induction_gap(
    path: PolePath,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    phase_voltage: float,
    frequency: float,
    series_turns: float,
    winding_factor: float,
    voltage_drop: float = DEFAULT_VOLTAGE_DROP,
) -> InductionResult:
    """Gap flux density of an induction machine from its voltage, and the magnetising MMF.

    ``E = (1 - d) U_ph``, ``Phi = E / (sqrt(2) pi f N_ph kw1)`` (sqrt(2) pi = 4.443),
    ``B_avg = Phi / (tau_p l)`` and, for a sinusoidal distribution, ``B_peak = (pi/2) B_avg``.
    The flux is set by the voltage, so the gap length changes the magnetising ampere-turns
    (``total_mmf``: gap, teeth and half of each yoke), not the flux density. Tooth saturation
    flattening the wave (which raises B_peak over (pi/2) B_avg) is not modelled; the
    saturation factor shows how far it matters.

    Parameters
    ----------
    path : PolePath
        Flux path; ``rotor_teeth`` for a cage rotor.
    stator_curve, rotor_curve : BHCurve
    phase_voltage : float
        Phase voltage U_ph, rms [V] (the line voltage for a delta connection).
    frequency : float
        Supply frequency f [Hz].
    series_turns : float
        Series turns per phase N_ph [-].
    winding_factor : float
        Fundamental winding factor kw1 [-].
    voltage_drop : float
        Share d of the phase voltage lost in the stator resistance and leakage reactance
        [-]; default 0.03 (2-5 % is usual, common practice, no source).

    Returns
    -------
    InductionResult

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery (E = 4.44 f N kw Phi); Pyrhonen,
    Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3 and 7 (magnetising
    MMF, saturation factor).
    """
    if not 0.0 <= voltage_drop < 1.0:
        raise ValueError("the voltage-drop allowance must lie in [0, 1)")
    for name, value in (
        ("phase_voltage", phase_voltage),
        ("frequency", frequency),
        ("series_turns", series_turns),
        ("winding_factor", winding_factor),
    ):
        if not (math.isfinite(value) and value > 0.0):
            raise ValueError(f"{name} must be finite and > 0, got {value}")
    emf = (1.0 - voltage_drop) * phase_voltage
    flux = emf / (math.sqrt(2.0) * math.pi * frequency * series_turns * winding_factor)
    b_avg = flux / (path.pole_pitch * path.stack_length)
    state = _pole_state(path, 0.5 * math.pi * b_avg, None, stator_curve, rotor_curve)
    return InductionResult(**_state_args(state), emf=emf)
