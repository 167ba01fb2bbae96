"""Materials, air gap, the magnetic circuit and the iron flux densities."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate import geometry as geo
from emgate.calc import winding
from emgate.calc.core import Calculation, memo, quantity

if TYPE_CHECKING:
    from emgate.physics.bh import BHCurve
    from emgate.physics.magnetic import GapResult, PolePath, SalientPole
    from emgate.physics.magnetic_surface_pm import SurfacePMResult

#: Flux of a salient pole's body over its gap flux, for the pole-to-pole leakage
#: (1.1 to 1.25 is usual; common practice, no source).
POLE_LEAKAGE = 1.15


@memo
def stator_steel(c: Calculation) -> BHCurve:
    curve = c.catalogue.get(c.d.stator.steel)
    assert curve is not None  # resolved at validation
    return curve


@memo
def rotor_steel(c: Calculation) -> BHCurve:
    name = c.d.rotor.steel or c.d.stator.steel
    curve = c.catalogue.get(name)
    assert curve is not None
    return curve


@memo
def slotting_gap(c: Calculation) -> float:
    """The gap Carter's coefficient is taken on: with a surface magnet, the magnetic gap
    g + sleeve + h_m / mu_rec (the magnet is nearly air to the slot field)."""
    from emgate.physics.airgap import magnetic_gap

    if c.d.machine == "surface_pm":
        r = c.d.rotor
        return magnetic_gap(
            c.d.air_gap,
            sleeve=r.sleeve_thickness,
            magnet_thickness=r.magnet.thickness,
            recoil_permeability=r.magnet.material.recoil_permeability,
        )
    return c.d.air_gap


@quantity("air_gap.carter_coefficient")
def carter_coefficient(c: Calculation) -> float:
    from emgate.physics.airgap import carter_coefficient

    kc = carter_coefficient(
        geo.stator_slot_pitch(c.d),
        geo.slot_width_at_gap(c.d.stator.slot),
        slotting_gap(c),
    )
    if c.d.machine == "induction":
        kc *= carter_coefficient(
            geo.rotor_slot_pitch(c.d),
            geo.slot_width_at_gap(c.d.rotor.slot),
            c.d.air_gap,
        )
    return kc


@quantity("air_gap.effective_length")
def effective_gap(c: Calculation) -> float:
    return carter_coefficient(c) * slotting_gap(c)


@memo
def pole_path(c: Calculation) -> PolePath:
    from emgate.physics.magnetic import PolePath, Teeth, Yoke

    d = c.d
    two_p = d.poles
    rotor_teeth = None
    if d.machine == "induction":
        rotor_teeth = Teeth(
            geo.rotor_slot_pitch(d), geo.rotor_tooth_width_min(d), d.rotor.slot.height
        )
    return PolePath(
        pole_pitch=geo.pole_pitch(d),
        stack_length=d.stator.stack_length,
        iron_length=d.stator.stack_length,
        stacking_factor=d.stator.stacking_factor,
        effective_gap=effective_gap(c),  # kc g', for surface magnets the whole of it
        stator_teeth=Teeth(
            geo.stator_slot_pitch(d), geo.stator_tooth_width_min(d), geo.stator_tooth_height(d)
        ),
        stator_yoke=Yoke(
            geo.stator_yoke_height(d), math.pi * geo.stator_yoke_mean_diameter(d) / two_p
        ),
        rotor_yoke=Yoke(
            geo.rotor_yoke_height(d), math.pi * geo.rotor_yoke_mean_diameter(d) / two_p
        ),
        rotor_teeth=rotor_teeth,
    )


@memo
def magnetic(c: Calculation) -> GapResult:
    """The machine's magnetic circuit at its rated (no-load for PM and field) point."""
    from emgate.physics.magnetic_induction import induction_gap

    d = c.d
    if d.machine == "induction":
        return induction_gap(
            pole_path(c),
            stator_steel(c),
            rotor_steel(c),
            phase_voltage=winding.phase_voltage(c),
            frequency=d.rating.frequency,
            series_turns=winding.series_turns(c),
            winding_factor=winding.winding_factor(c),
        )
    if d.machine == "surface_pm":
        return surface_pm_circuit(c, c.value("rotor.magnet_temperature"))  # calc.thermal
    return salient_circuit(c, d.rotor.field.turns_per_pole * d.rotor.field.current)


def salient_circuit(c: Calculation, field_mmf: float) -> GapResult:
    """The salient-pole circuit at no load with the field ampere-turns per pole ``field_mmf``."""
    from emgate.physics.magnetic_salient_field import salient_field_gap

    return salient_field_gap(*_salient_parts(c), field_mmf=field_mmf)


def salient_circuit_for_fundamental(c: Calculation, b_fundamental: float) -> GapResult:
    """The salient-pole circuit whose gap flux density has the fundamental ``b_fundamental``
    [T]; its total MMF is the field ampere-turns per pole that give it."""
    from emgate.physics.magnetic_salient_field import salient_field_for_fundamental

    return salient_field_for_fundamental(*_salient_parts(c), b_fundamental=b_fundamental)


def _salient_parts(c: Calculation) -> tuple[PolePath, SalientPole, BHCurve, BHCurve]:
    """The flux path, pole and steels of a salient-pole machine's circuit."""
    from emgate.physics.magnetic import SalientPole

    d = c.d
    assert d.machine == "salient_field"
    pole = d.rotor.pole
    # The kernel's pole height runs from the gap to the rim, shoe included; the record's
    # body_height stops at the shoe. The body's flux density is carried over the shoe
    # too, which overrates the shoe's ampere-turns (safe side).
    salient = SalientPole(
        geo.pole_shoe_width(d),
        pole.body_width,
        pole.body_height + pole.shoe_height,
        leakage_factor=POLE_LEAKAGE,
    )
    return pole_path(c), salient, stator_steel(c), rotor_steel(c)


def surface_pm_circuit(c: Calculation, temperature: float) -> SurfacePMResult:
    """The surface-magnet circuit at no load with the magnet at ``temperature`` [K]."""
    from emgate.physics.magnetic import SurfaceMagnet
    from emgate.physics.magnetic_surface_pm import remanence_at, surface_pm_gap

    m = geo.magnet_rotor(c.d).magnet
    br = remanence_at(
        m.material.remanence,
        temperature,
        m.material.remanence_temperature_coefficient,
        m.material.reference_temperature,
    )
    magnet = SurfaceMagnet(br, m.material.recoil_permeability, m.thickness, m.pole_arc)
    return surface_pm_gap(pole_path(c), magnet, stator_steel(c), rotor_steel(c))


@memo
def magnetic_cold(c: Calculation) -> SurfacePMResult:
    """The surface-magnet circuit at no load with the magnet at the coolant temperature
    (a cold start): Br, and so |H_0|, is higher cold for a negative remanence
    coefficient."""
    return surface_pm_circuit(c, c.d.cooling.ambient)


@quantity("air_gap.flux_density_peak")
def gap_flux_density_peak(c: Calculation) -> float:
    return magnetic(c).b_peak


@quantity("air_gap.flux_density_fundamental")
def gap_flux_density_fundamental(c: Calculation) -> float:
    return magnetic(c).b_fundamental


@quantity("air_gap.flux_per_pole")
def flux_per_pole(c: Calculation) -> float:
    return magnetic(c).flux_per_pole


@quantity("air_gap.saturation_factor")
def saturation_factor(c: Calculation) -> float:
    return magnetic(c).saturation_factor


@quantity("magnetic.total_mmf")
def total_mmf(c: Calculation) -> float:
    return magnetic(c).total_mmf


@quantity("winding.back_emf")
def back_emf(c: Calculation) -> float:
    from emgate.physics.winding_factors import phase_emf

    d = c.d
    return phase_emf(
        d.rating.frequency,
        winding.series_turns(c),
        winding.winding_factor(c),
        gap_flux_density_fundamental(c),
        geo.pole_pitch(d),
        d.stator.stack_length,
    )


@quantity("stator.tooth_flux_density_apparent")
def stator_tooth_b_apparent(c: Calculation) -> float:
    return magnetic(c).iron.stator_tooth_b_apparent


@quantity("stator.tooth_flux_density")
def stator_tooth_b(c: Calculation) -> float:
    return magnetic(c).iron.stator_tooth_b


@quantity("stator.yoke_flux_density")
def stator_yoke_b(c: Calculation) -> float:
    return magnetic(c).iron.stator_yoke_b


@quantity("rotor.yoke_flux_density")
def rotor_yoke_b(c: Calculation) -> float:
    return magnetic(c).iron.rotor_yoke_b


@quantity("rotor.tooth_flux_density_apparent")
def rotor_tooth_b_apparent(c: Calculation) -> float:
    return magnetic(c).iron.rotor_tooth_b_apparent


@quantity("rotor.tooth_flux_density")
def rotor_tooth_b(c: Calculation) -> float:
    return magnetic(c).iron.rotor_tooth_b


@quantity("rotor.pole_body_flux_density")
def pole_body_b(c: Calculation) -> float:
    return magnetic(c).iron.pole_body_b


@quantity("stator.slot_pitch")
def slot_pitch(c: Calculation) -> float:
    return geo.stator_slot_pitch(c.d)


@quantity("stator.aspect_ratio")
def aspect_ratio(c: Calculation) -> float:
    return c.d.stator.stack_length / c.d.stator.bore_diameter


@quantity("stator.tooth_width_min")
def tooth_width_min(c: Calculation) -> float:
    return geo.stator_tooth_width_min(c.d)


@quantity("stator.yoke_height")
def stator_yoke_height(c: Calculation) -> float:
    return geo.stator_yoke_height(c.d)


@quantity("rotor.yoke_height")
def rotor_yoke_height(c: Calculation) -> float:
    return geo.rotor_yoke_height(c.d)
