"""The loss budget at the rated point, the energy balance, the efficiency and its IE class.

Every loss is at the basis of IEC 60034-2-1: the stator copper at the reference temperature
of the insulation class, so the efficiency compares with IEC 60034-30-1. The thermal
estimate (``emgate.calc.thermal``) re-evaluates the copper loss at the winding temperature
it produces.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate import geometry as geo
from emgate.calc import conductors, magnetic, winding
from emgate.calc.conductors import conductor_strand_area
from emgate.calc.core import Calculation, memo, quantity
from emgate.calc.winding import Winding, per_winding

if TYPE_CHECKING:
    from emgate.model import AnyDesign
    from emgate.physics.iron_loss import LossCurve, LossSplit
    from emgate.physics.losses import TravellingWaves

#: Density taken for a repository steel that states none [kg/m^3]: the heaviest built-in
#: grade (more mass, more loss: the safe side).
FALLBACK_DENSITY = 7800.0
#: Resistivity taken for a repository steel whose name is a designation [ohm m]: the lowest
#: built-in figure (more classical eddy loss above 50 Hz: the safe side).
FALLBACK_RESISTIVITY = 0.24e-6
#: Grade whose loss stands in for a repository steel with neither a table nor a designation
#: name: the lossiest built-in grade (the safe side).
FALLBACK_GRADE = "M800-65A"


# --- iron ----------------------------------------------------------------------------------


@memo
def _iron_model(c: Calculation) -> tuple[tuple[LossCurve, ...] | None, LossSplit | None, str]:
    """The stator steel's loss table, or its designation split, and a note of which."""
    from emgate import steels
    from emgate.physics.iron_loss import designation_split, parse_designation

    name = c.d.stator.steel
    table = c.catalogue.loss_table(name)
    if table is not None:
        return table[0], None, f"loss table of {name} ({table[1]})"
    data = steels.loss_data(name)
    if data is not None:
        split = designation_split(
            data.specific_loss, data.thickness, data.resistivity, data.density
        )
        return None, split, f"designation of {name}"
    parsed = parse_designation(name)
    density = magnetic.stator_steel(c).density or FALLBACK_DENSITY
    if parsed is not None:
        split = designation_split(
            parsed.specific_loss, parsed.thickness, FALLBACK_RESISTIVITY, density
        )
        return None, split, f"designation read from the name {name}"
    fb = steels.loss_data(FALLBACK_GRADE)
    assert fb is not None
    split = designation_split(fb.specific_loss, fb.thickness, fb.resistivity, fb.density)
    return None, split, f"no loss data for {name}: {FALLBACK_GRADE} taken (the safe side)"


def iron_loss_source(c: Calculation) -> str:
    """Which loss data the stator iron losses come from."""
    return _iron_model(c)[2]


def _specific_loss(c: Calculation, flux_density: float) -> float:
    from emgate.physics.iron_loss import specific_loss, table_specific_loss

    curves, split, _ = _iron_model(c)
    f = c.d.rating.frequency
    if curves is not None:
        return table_specific_loss(curves, flux_density, f).loss
    assert split is not None
    return float(specific_loss(split, flux_density, f))


@memo
def _iron_mass(c: Calculation) -> tuple[float, float]:
    from emgate.physics.core_loss import stator_iron_mass
    from emgate.physics.slots import open_full_area, semi_closed_full_area

    st = c.d.stator
    sl = st.slot
    if sl.shape == "semi_closed":
        full = semi_closed_full_area(
            sl.opening, sl.opening_height, sl.wedge_height, sl.top_width, sl.bottom_width, sl.height
        )
    else:
        full = open_full_area(sl.width, sl.height)
    density = magnetic.stator_steel(c).density or FALLBACK_DENSITY
    m = stator_iron_mass(
        st.bore_diameter,
        st.outer_diameter,
        sl.height,
        st.slots,
        full,
        st.stack_length,
        st.stacking_factor,
        density,
    )
    return m.teeth, m.yoke


@quantity("losses.stator_iron_teeth")
def stator_iron_teeth(c: Calculation) -> float:
    from emgate.physics.core_loss import BUILD_FACTORS, core_loss

    p = _specific_loss(c, magnetic.stator_tooth_b(c))
    return float(core_loss(p, _iron_mass(c)[0], BUILD_FACTORS[c.d.machine][0]))


@quantity("losses.stator_iron_yoke")
def stator_iron_yoke(c: Calculation) -> float:
    from emgate.physics.core_loss import BUILD_FACTORS, core_loss

    p = _specific_loss(c, magnetic.stator_yoke_b(c))
    return float(core_loss(p, _iron_mass(c)[1], BUILD_FACTORS[c.d.machine][1]))


@quantity("losses.stator_iron")
def stator_iron(c: Calculation) -> float:
    return stator_iron_teeth(c) + stator_iron_yoke(c)


# --- copper, friction, rotor -----------------------------------------------------------------


@quantity("losses.stator_copper")
def stator_copper(c: Calculation) -> float:
    return conductors.copper_loss(c)


@quantity("losses.friction_windage")
def friction_windage(c: Calculation) -> float:
    from emgate.physics.losses import friction_windage_estimate

    d = c.d
    if d.losses is not None and d.losses.friction_windage is not None:
        return d.losses.friction_windage
    return friction_windage_estimate(
        geo.rotor_outer_diameter(d),
        d.stator.stack_length,
        geo.pole_pitch(d),
        d.rating.speed,
        shaft_fan=d.cooling.method in ("enclosed_fan", "open_ventilated"),
    )


def _field_resistance(c: Calculation) -> float:
    """Field winding resistance at the class reference temperature [ohm]: all poles in
    series, each coil's mean turn hugging the pole body with its side half the gap between
    neighbouring bodies at mid-height (common practice, no source)."""
    from emgate.physics.resistance import (
        ALUMINIUM,
        COPPER,
        resistivity,
        tooth_coil_mean_turn_length,
    )

    d = c.d
    rotor = geo.salient_rotor(d)
    pole, field = rotor.pole, rotor.field
    d_mid = geo.rotor_outer_diameter(d) - 2.0 * pole.shoe_height - pole.body_height
    side = max(0.5 * (math.pi * d_mid / d.poles - pole.body_width), 1e-4)
    turn = tooth_coil_mean_turn_length(d.stator.stack_length, pole.body_width, side)
    material = COPPER if field.conductor.material == "copper" else ALUMINIUM
    rho = resistivity(material, conductors.class_reference_temperature(c))
    area = field.conductor.strands * conductor_strand_area(field.conductor)
    return rho * d.poles * field.turns_per_pole * turn / area


@memo
def magnet_eddy_estimate(c: Calculation) -> float:
    """Resistance-limited magnet eddy loss from the stator MMF's travelling waves [W]."""
    from emgate.physics import losses as lk

    d = c.d
    m = geo.magnet_rotor(d).magnet
    w = d.winding
    waves = _unit_waves(winding.spec(c))
    # the waves are linear in the coil turns and the conductor current, as the staircase is
    scale = w.turns_per_coil * (winding.phase_current(c) / w.parallel_paths)
    r_out = geo.rotor_outer_diameter(d) / 2.0 - geo.magnet_rotor(d).sleeve_thickness
    volume = m.pole_arc * math.pi * (r_out**2 - (r_out - m.thickness) ** 2)
    volume *= d.stator.stack_length
    return lk.magnet_eddy_loss(
        waves.orders,
        waves.amplitudes * scale,
        waves.directions,
        pole_pairs=d.pole_pairs,
        frequency=d.rating.frequency,
        magnetic_gap=magnetic.effective_gap(c),
        rotor_radius=r_out,
        magnet_volume=volume,
    )


@per_winding
def _unit_waves(w: Winding) -> TravellingWaves:
    """The winding's MMF travelling waves for one turn and one ampere, up to 40 times the
    slot count in order (read-only: they are shared)."""
    from emgate.physics import losses as lk

    waves = lk.mmf_travelling_waves(winding.winding_layout(w), 1.0, 1.0, w.pole_pairs, 40 * w.slots)
    for array in (waves.orders, waves.amplitudes, waves.directions):
        array.flags.writeable = False
    return waves


@quantity("losses.rotor")
def rotor(c: Calculation) -> float:
    from emgate.physics import losses as lk

    d = c.d
    if d.machine == "induction":
        s = winding.slip(c)  # |s|: the motor's slip, or a generator's magnitude
        if d.rating.operation == "motor":
            gap = lk.air_gap_power(d.rating.power + friction_windage(c), s)
        else:
            # the electrical power crossing the gap: output plus the stator's losses
            gap = d.rating.power + stator_copper(c) + stator_iron(c)
        return float(lk.cage_loss(s, gap))
    if d.machine == "salient_field":
        f = d.rotor.field
        drop = {"carbon": lk.BRUSH_DROP_CARBON, "metal_carbon": lk.BRUSH_DROP_METAL_CARBON}
        return lk.field_winding_loss(
            f.current,
            _field_resistance(c),
            brushes=0 if f.brushes == "none" else 2,
            brush_drop=drop.get(f.brushes, 0.0),
        )
    if d.losses is not None and d.losses.magnet_eddy is not None:
        return d.losses.magnet_eddy
    return magnet_eddy_estimate(c)


# --- stray load, balance, efficiency -------------------------------------------------------


def _other_losses(c: Calculation) -> float:
    return stator_copper(c) + stator_iron(c) + rotor(c) + friction_windage(c)


@quantity("losses.stray_load")
def stray_load(c: Calculation) -> float:
    from emgate.physics.losses import input_power_with_allowance, stray_load_allowance

    d = c.d
    if d.losses is not None and d.losses.stray_load is not None:
        return d.losses.stray_load
    p1 = input_power_with_allowance(d.rating.power, _other_losses(c), d.rating.power)
    return stray_load_allowance(p1, d.rating.power)


@quantity("losses.total")
def total(c: Calculation) -> float:
    return _other_losses(c) + stray_load(c)


@memo
def balance(c: Calculation):  # type: ignore[no-untyped-def]  # -> physics.losses.Balance
    from emgate.physics.losses import energy_balance

    return energy_balance(c.d.rating.power, total(c), c.d.rating.operation)


@quantity("rating.input_power")
def input_power(c: Calculation) -> float:
    return float(balance(c).input_power)


@quantity("rating.efficiency")
def efficiency(c: Calculation) -> float:
    return float(balance(c).efficiency)


def _classed(d: AnyDesign) -> bool:
    """Whether IEC 60034-30-1 covers the record: a line-fed induction motor in its scope."""
    from emgate.physics.efficiency_classes import out_of_scope

    if d.machine != "induction" or d.rating.operation != "motor":
        return False
    return out_of_scope(d.rating.power, d.poles, d.rating.frequency) is None


@quantity("rating.efficiency_class", when=_classed)
def efficiency_class(c: Calculation) -> float:
    from emgate.physics.efficiency_classes import efficiency_class

    d = c.d
    return float(efficiency_class(efficiency(c), d.rating.power, d.poles, d.rating.frequency).index)
