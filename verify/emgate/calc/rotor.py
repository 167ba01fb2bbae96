"""Rotor conductors (cage bars, rings, field coils) and the magnet working points."""

from __future__ import annotations

from emgate import geometry as geo
from emgate.calc import magnetic, winding
from emgate.calc.conductors import conductor_strand_area
from emgate.calc.core import Calculation, memo, quantity


@memo
def bar_area(c: Calculation) -> float:
    from emgate.physics.slots import open_full_area, semi_closed_full_area
    from emgate.physics.strands import rectangular_strand_area

    cage = geo.cage_rotor(c.d).cage
    if cage.bar is not None:
        return rectangular_strand_area(cage.bar.width, cage.bar.height)
    from emgate.model.stator import SemiClosedSlot

    sl = geo.cage_rotor(c.d).slot
    if isinstance(sl, SemiClosedSlot):
        return semi_closed_full_area(
            sl.opening,
            sl.opening_height,
            sl.wedge_height,
            sl.top_width,
            sl.bottom_width,
            sl.height,
        )
    return open_full_area(sl.width, sl.height)


@quantity("rotor.bar_current")
def bar_current(c: Calculation) -> float:
    from emgate.physics.rotor_conductors import bar_current

    return bar_current(
        winding.phase_current(c),
        c.d.winding.phases,
        winding.series_turns(c),
        winding.winding_factor(c),
        geo.cage_rotor(c.d).slots,
    )


@quantity("rotor.bar_current_density")
def bar_current_density(c: Calculation) -> float:
    from emgate.physics.currents import current_density

    return current_density(bar_current(c), bar_area(c))


@quantity("rotor.ring_current_density")
def ring_current_density(c: Calculation) -> float:
    from emgate.physics.currents import current_density
    from emgate.physics.rotor_conductors import end_ring_current

    rotor = geo.cage_rotor(c.d)
    ring = rotor.cage.end_ring
    current = end_ring_current(bar_current(c), c.d.pole_pairs, rotor.slots)
    return current_density(current, ring.axial_width * ring.radial_height)


@quantity("rotor.field_current_density")
def field_current_density(c: Calculation) -> float:
    from emgate.physics.rotor_conductors import field_coil_current_density

    f = geo.salient_rotor(c.d).field
    return field_coil_current_density(
        f.current, f.conductor.strands * conductor_strand_area(f.conductor)
    )


@quantity("rotor.magnet_field_strength")
def magnet_h(c: Calculation) -> float:
    return magnetic.magnetic(c).magnet_h  # type: ignore[attr-defined]


@memo
def magnet_h_cold(c: Calculation) -> float:
    """No-load magnet working point H_0 with the magnet at the coolant temperature [A/m]."""
    return magnetic.magnetic_cold(c).magnet_h


def magnet_h_with_current(c: Calculation, current_factor: float, *, cold: bool = False) -> float:
    """Magnet field strength with the stator's peak staircase MMF at ``current_factor``
    times the rated current taken wholly on the d-axis, demagnetising [A/m].

    The kernel's superposition on the no-load working point H_0 (iron included),
    H = H_0 - F_max / (mu_rec kc g'), kc g' the effective gap (Carter on the magnetic gap
    g' = g + sleeve + h_m / mu_rec). F_max is the peak of the staircase MMF over the gap
    and the period (``winding.mmf_peak``), not the rotating fundamental F1: a tooth-coil
    winding's sub- and higher harmonics raise it well above F1. With ``cold``, H_0 is that
    of the magnet at the coolant temperature (``cooling.ambient``); the armature term is
    the same.
    """
    from emgate.physics.magnetic_surface_pm import magnet_field_under_current

    h0 = magnet_h_cold(c) if cold else magnet_h(c)
    return magnet_field_under_current(
        h0,
        current_factor * winding.mmf_peak(c),
        geo.magnet_rotor(c.d).magnet.material.recoil_permeability,
        magnetic.effective_gap(c),
    )


@quantity("rotor.magnet_field_strength_worst")
def magnet_h_worst(c: Calculation) -> float:
    return magnet_h_with_current(c, 1.0)


@quantity("rotor.magnet_field_strength_worst_cold")
def magnet_h_worst_cold(c: Calculation) -> float:
    return magnet_h_with_current(c, 1.0, cold=True)


def magnet_coercivity_at(c: Calculation, temperature: float) -> float:
    """Intrinsic coercivity of the magnet at ``temperature`` [K], H_cJ0 (1 + beta (T -
    T0)) [A/m]: the same linear reversible law as the remanence's, with H_cJ's own
    coefficient."""
    from emgate.physics.magnetic_surface_pm import remanence_at

    mat = geo.magnet_rotor(c.d).magnet.material
    return remanence_at(
        mat.intrinsic_coercivity,
        temperature,
        mat.coercivity_temperature_coefficient,
        mat.reference_temperature,
    )


@quantity("rotor.magnet_coercivity_hot")
def magnet_coercivity_hot(c: Calculation) -> float:
    return magnet_coercivity_at(c, c.value("rotor.magnet_temperature"))  # calc.thermal


@quantity("rotor.magnet_coercivity_cold")
def magnet_coercivity_cold(c: Calculation) -> float:
    return magnet_coercivity_at(c, c.d.cooling.ambient)
