"""Magnetic circuit of one pole: the flux path, the iron's share of the MMF, the results.

The iron is taken from its B-H curve, so the circuit is nonlinear and saturation shows.
Per pole, the loop holds one gap, the stator teeth (and rotor teeth, if any), a salient pole
body where there is one, and half of each yoke between two pole axes. Leakage between poles
is a factor on the rotor-side flux; it does not load the gap or the stator.

Here the geometry of a pole, the state of its iron at a gap flux density
(:func:`pole_state`) and the results; the circuit of each machine kind solves on them:

- Surface PM: the magnet's working point, solved with the iron in the loop
  (:mod:`emgate.physics.magnetic_surface_pm`, with the magnet's temperature law).
- Salient pole with field winding: the gap flux density from the field ampere-turns
  (:mod:`emgate.physics.magnetic_salient_field`).
- Induction: the flux from the voltage equation; the magnetising ampere-turns follow
  (:mod:`emgate.physics.magnetic_induction`).

The textbook circuits of uniform sections are :mod:`emgate.physics.series_circuit`. All
quantities SI; MMF in amperes (ampere-turns).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from typing import Any

from emgate.physics._checks import check_positive_fields
from emgate.physics.bh import BHCurve
from emgate.physics.constants import MU0
from emgate.physics.iron import (
    apparent_tooth_flux_density,
    real_tooth_flux_density,
    slot_flux_sharing_factor,
    tooth_magnetic_voltage,
    yoke_flux_density,
    yoke_magnetic_voltage,
)

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
        check_positive_fields(self, "slot_pitch", "width", "height")


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
        check_positive_fields(self, "height", "path_length")


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
        magnet's own l_m / mu_rec included:
        :func:`emgate.physics.magnetic_surface_pm.surface_pm_gap` counts that share on the
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
        check_positive_fields(
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
        Remanent flux density Br at the operating temperature [T] (see
        :func:`emgate.physics.magnetic_surface_pm.remanence_at`).
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
        check_positive_fields(self, "remanence", "recoil_permeability", "thickness", "arc_fraction")
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
        check_positive_fields(self, "shoe_width", "body_width", "body_height")
        if not self.leakage_factor >= 1.0:
            raise ValueError("SalientPole.leakage_factor must be >= 1")


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


def flux_shape(arc: float | None) -> tuple[float, float]:
    """The mean and the fundamental of the gap flux density over its peak: a rectangle of
    pole-arc fraction ``arc``, or a sine (None)."""
    if arc is None:
        return 2.0 / math.pi, 1.0  # the sine's mean over its peak
    # Fourier fundamental of a rectangle of width a*pi (electrical): (4/pi) sin(a pi/2).
    return arc, 4.0 / math.pi * math.sin(0.5 * math.pi * arc)


def pole_state(
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
    flux, fundamental, *iron = _pole_parts(
        path, b_peak, arc, stator_curve, rotor_curve, rotor_flux_factor, rotor_yoke_ramp, pole
    )
    return GapResult(
        b_peak=b_peak,
        b_fundamental=b_peak * fundamental,
        flux_per_pole=flux,
        gap_mmf=b_peak * path.effective_gap / MU0,
        iron=IronState(*iron),
    )


def pole_mmf(
    path: PolePath,
    b_peak: float,
    arc: float | None,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    rotor_flux_factor: float = 1.0,
    rotor_yoke_ramp: float | None = None,
    pole: SalientPole | None = None,
) -> float:
    """``pole_state(...).total_mmf``, the same float, without building the state: a
    circuit's solver asks for it a dozen times a record."""
    parts = _pole_parts(
        path, b_peak, arc, stator_curve, rotor_curve, rotor_flux_factor, rotor_yoke_ramp, pole
    )
    # summed as GapResult.total_mmf and IronState.total_mmf sum them
    gap = b_peak * path.effective_gap / MU0
    return gap + (parts[4] + parts[6] + parts[8] + parts[11] + parts[13])


def _pole_parts(
    path: PolePath,
    b_peak: float,
    arc: float | None,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    rotor_flux_factor: float,
    rotor_yoke_ramp: float | None,
    pole: SalientPole | None,
) -> tuple[float, ...]:
    """The flux per pole, the fundamental over the peak, then the fields of
    :class:`IronState` in its order."""
    flux_width, fundamental = flux_shape(arc)
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
    rt_app = rt_b = rt_mmf = 0.0
    if path.rotor_teeth is not None:
        rt_app, rt_b, rt_mmf = _teeth_state(b_peak, path.rotor_teeth, path, rotor_curve)
    body_b = body_mmf = 0.0
    if pole is not None:
        body_b = rotor_flux / (iron_area * pole.body_width)
        body_mmf = tooth_magnetic_voltage(body_b, pole.body_height, rotor_curve)
    return (
        flux,
        fundamental,
        st_app,
        st_b,
        st_mmf,
        sy_b,
        sy_mmf,
        ry_b,
        ry_mmf,
        rt_app,
        rt_b,
        rt_mmf,
        body_b,
        body_mmf,
    )


def gap_fields(result: GapResult) -> dict[str, Any]:
    """The fields of a :class:`GapResult`, for a machine kind's result that extends it."""
    return {f.name: getattr(result, f.name) for f in fields(GapResult)}
