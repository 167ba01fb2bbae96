"""Inductances: the winding's family and MMF spectrum, the magnetising inductance, the slot,
end and harmonic leakage, and the synchronous inductance."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from emgate import geometry as geo
from emgate.calc import conductors, magnetic, winding
from emgate.calc.core import Calculation, memo, quantity
from emgate.calc.winding import Winding, per_winding

if TYPE_CHECKING:
    import numpy as np

    from emgate.physics.mmf import HarmonicRatios, WindingFamily

# --- the winding's family and spectrum -------------------------------------------------------


def family(c: Calculation) -> WindingFamily:
    """Distributed, or tooth coils in one or two layers (emgate.physics.mmf.winding_family)."""
    return _family(winding.spec(c))


@per_winding
def _family(w: Winding) -> WindingFamily:
    from emgate.physics.mmf import winding_family

    return winding_family(w.slots, 2 * w.pole_pairs, w.layers, w.coil_pitch)


def harmonic_ratios(c: Calculation) -> HarmonicRatios:
    return _harmonic_ratios(winding.spec(c))


@per_winding
def _harmonic_ratios(w: Winding) -> HarmonicRatios:
    from emgate.physics.mmf import harmonic_ratios

    return harmonic_ratios(winding.winding_layout(w), w.pole_pairs)


@quantity("winding.mmf_largest_subharmonic")
def mmf_largest_subharmonic(c: Calculation) -> float:
    return harmonic_ratios(c).subharmonic


@quantity("winding.mmf_largest_slot_harmonic")
def mmf_largest_slot_harmonic(c: Calculation) -> float:
    return harmonic_ratios(c).slot_harmonic


@quantity("winding.harmonic_leakage_coefficient")
def harmonic_leakage_coefficient(c: Calculation) -> float:
    return winding.mmf_thd(c) ** 2


# --- inductances ----------------------------------------------------------------------------


@memo
def gap_magnetising_inductance(c: Calculation) -> float:
    """L_m over the effective gap (uniform), before any salient-pole factor [H]."""
    from emgate.physics.inductance import magnetising_inductance as lm

    d = c.d
    return float(
        lm(
            d.winding.phases,
            winding.series_turns(c),
            winding.winding_factor(c),
            d.stator.bore_diameter,
            d.stator.stack_length,
            d.pole_pairs,
            magnetic.effective_gap(c),
        )
    )


@quantity("winding.magnetising_inductance")
def magnetising_inductance(c: Calculation) -> float:
    if c.d.machine != "salient_field":
        return gap_magnetising_inductance(c)
    from emgate.physics.inductance import salient_pole_axis_factors

    c_d, _ = salient_pole_axis_factors(geo.salient_rotor(c.d).pole.shoe_arc)
    return float(c_d) * gap_magnetising_inductance(c)


def _table_layers(table: list[str], phases: int) -> tuple[np.ndarray, np.ndarray]:
    """Top and bottom layers of an explicit slot table (its entries list the top first)."""
    top = winding.layout_from_table([e.split()[0] for e in table], phases)
    bottom = winding.layout_from_table([" ".join(e.split()[1:]) for e in table], phases)
    return top, bottom


def slot_factors(c: Calculation) -> tuple[float, float]:
    """(k1, k2) of the slot leakage from the layers' currents: distributed double layers
    stacked, tooth coils side by side, single layers one phase a slot."""
    return _slot_factors(winding.spec(c))


@per_winding
def _slot_factors(w: Winding) -> tuple[float, float]:
    from emgate.physics.slot_leakage import slot_leakage_factors
    from emgate.physics.star_of_slots import star_of_slots_layers

    if w.layers == 1 or _family(w) != "distributed":
        return slot_leakage_factors(winding.winding_layout(w), stacked=False)
    if w.table is not None:
        top, bottom = _table_layers(list(w.table), w.phases)
    else:
        top, lower = star_of_slots_layers(w.slots, w.pole_pairs, w.phases, w.layers, w.coil_pitch)
        assert lower is not None
        bottom = lower
    return slot_leakage_factors(top, bottom)


@quantity("stator.slot_permeance")
def slot_permeance(c: Calculation) -> float:
    from emgate.physics import slot_leakage as ik
    from emgate.physics.slots import semi_closed_winding_height

    k1, k2 = slot_factors(c)
    sl = c.d.stator.slot
    if sl.shape == "semi_closed":
        zone = semi_closed_winding_height(sl.opening_height, sl.wedge_height, sl.height)
        return float(
            ik.semi_closed_slot_permeance(
                sl.opening,
                sl.opening_height,
                sl.wedge_height,
                sl.top_width,
                sl.bottom_width,
                zone,
                k1,
                k2,
            )
        )
    return float(
        ik.open_slot_permeance(sl.width, sl.height - sl.wedge_height, sl.wedge_height, k1, k2)
    )


@quantity("winding.slot_leakage_inductance")
def slot_leakage_inductance(c: Calculation) -> float:
    from emgate.physics.slot_leakage import slot_leakage_inductance as lu

    d = c.d
    return float(
        lu(
            d.winding.phases,
            winding.series_turns(c),
            d.stator.slots,
            d.stator.stack_length,
            slot_permeance(c),
        )
    )


@per_winding
def _coil_groups(w: Winding) -> tuple[int, float]:
    """(coil groups of phase A, coils a group): runs of adjacent go sides of one sign."""
    import numpy as np

    row = winding.winding_layout(w)[0]
    if w.layers == 2 and w.table is None and _family(w) == "distributed":
        from emgate.physics.star_of_slots import star_of_slots_layers

        top, _ = star_of_slots_layers(w.slots, w.pole_pairs, w.phases, w.layers, w.coil_pitch)
        row = top[0]
        go = np.sign(row)  # every top side starts a coil
    else:
        go = np.where(row > 0, 1, 0)  # a coil's go side; its return is the other sign
    sign = np.sign(go)
    if not sign.any():
        raise ValueError("phase A has no coil sides")
    starts = (sign != 0) & (sign != np.roll(sign, 1))
    groups = int(starts.sum()) or 1  # one run all round the bore
    coils = np.abs(row).sum() / 2.0
    return groups, coils / groups


@quantity("winding.end_leakage_inductance")
def end_leakage_inductance(c: Calculation) -> float:
    from emgate.physics.inductance import end_winding_inductance

    d, w = c.d, c.d.winding
    groups, per_group = _coil_groups(winding.spec(c))
    end_length = conductors.mean_turn_length(c) - 2.0 * d.stator.stack_length
    if end_length <= 0.0:
        return 0.0
    side_area = per_group * conductors.slot_area_gross(c) / w.layers
    return float(
        end_winding_inductance(
            groups,
            per_group * w.turns_per_coil,
            end_length,
            math.sqrt(side_area / math.pi),
            w.parallel_paths,
        )
    )


@quantity("winding.synchronous_inductance")
def synchronous_inductance(c: Calculation) -> float:
    from emgate.physics.inductance import synchronous_inductance as ls

    # The harmonic fields see the uniform gap; the d-axis factor applies to the working one.
    return float(ls(magnetising_inductance(c), 0.0, leakage_inductance(c), 0.0))


@memo
def leakage_inductance(c: Calculation) -> float:
    """Slot, end and harmonic leakage together [H]."""
    harmonic = harmonic_leakage_coefficient(c) * gap_magnetising_inductance(c)
    return slot_leakage_inductance(c) + end_leakage_inductance(c) + harmonic
