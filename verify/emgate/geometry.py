"""Lengths derived from the record's raw geometry: one home for every rule and the sheet.

The functions take a validated design (SI floats) and return SI floats; they hold no physics
beyond plane geometry, so that every rule derives a tooth width or a yoke height the same way.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, TypeVar

if TYPE_CHECKING:
    from emgate.model import AnyDesign, InductionDesign, SalientFieldDesign
    from emgate.model.rotor import CageRotor, SalientRotor, SurfacePMRotor
    from emgate.model.stator import OpenSlot, SemiClosedSlot
    from emgate.terms import RecordPath

_R = TypeVar("_R")


def slot_width_at_gap(slot: SemiClosedSlot | OpenSlot) -> float:
    """Width of the slot at the air gap: the opening of a semi-closed slot [m]."""
    return slot.opening if slot.shape == "semi_closed" else slot.width


def winding_zone(slot: SemiClosedSlot | OpenSlot) -> tuple[float, float, float, float]:
    """(depth of its gap-side edge, depth of its far edge, width at gap side, width at far
    side) of the zone that holds conductors, depths measured from the air gap [m]."""
    if slot.shape == "semi_closed":
        top = slot.opening_height + slot.wedge_height
        return top, slot.height, slot.top_width, slot.bottom_width
    return slot.wedge_height, slot.height, slot.width, slot.width


def slot_shape_problems(
    slot: SemiClosedSlot | OpenSlot, at: RecordPath
) -> list[tuple[RecordPath, str]]:
    out: list[tuple[RecordPath, str]] = []
    if slot.shape == "semi_closed":
        if slot.opening > slot.top_width:
            out.append(
                (
                    (*at, "opening"),
                    f"opening {slot.opening * 1e3:g} mm is wider than the"
                    f" slot's top width {slot.top_width * 1e3:g} mm",
                )
            )
        if slot.opening_height + slot.wedge_height >= slot.height:
            out.append(
                (
                    (*at, "height"),
                    "opening and wedge heights leave no winding zone: the"
                    f" slot is {slot.height * 1e3:g} mm deep",
                )
            )
    elif slot.wedge_height >= slot.height:
        out.append(((*at, "wedge_height"), "wedge height leaves no winding zone"))
    return out


# --- stator -----------------------------------------------------------------------------


def stator_slot_pitch_at(d: AnyDesign, radius: float) -> float:
    return 2.0 * math.pi * radius / d.stator.slots


def stator_slot_pitch(d: AnyDesign) -> float:
    """Slot pitch at the bore, tau_s [m]."""
    return stator_slot_pitch_at(d, d.stator.bore_diameter / 2.0)


def pole_pitch(d: AnyDesign) -> float:
    """Pole pitch at the bore, tau_p [m]."""
    return math.pi * d.stator.bore_diameter / d.poles


def stator_yoke_height(d: AnyDesign) -> float:
    return (d.stator.outer_diameter - d.stator.bore_diameter) / 2.0 - d.stator.slot.height


def _stator_tooth_widths(d: AnyDesign) -> tuple[float, float]:
    """Tooth widths at the gap-side and far edges of the winding zone [m]."""
    top, bottom, w_top, w_bottom = winding_zone(d.stator.slot)
    r = d.stator.bore_diameter / 2.0
    return (
        stator_slot_pitch_at(d, r + top) - w_top,
        stator_slot_pitch_at(d, r + bottom) - w_bottom,
    )


def stator_tooth_width_min(d: AnyDesign) -> float:
    """Narrowest tooth width along the winding zone [m] (widths vary linearly, so an end)."""
    return min(_stator_tooth_widths(d))


def stator_tooth_width_third(d: AnyDesign) -> float:
    """Tooth width one third of the way from its narrow end, where tooth flux density is
    customarily evaluated for a tapered tooth [m] (common practice, no source)."""
    a, b = sorted(_stator_tooth_widths(d))
    return a + (b - a) / 3.0


def stator_slot_width_max(d: AnyDesign) -> float:
    _, _, w_top, w_bottom = winding_zone(d.stator.slot)
    return max(w_top, w_bottom)


def stator_widest_radius(d: AnyDesign) -> float:
    top, bottom, w_top, w_bottom = winding_zone(d.stator.slot)
    return d.stator.bore_diameter / 2.0 + (top if w_top >= w_bottom else bottom)


def stator_tooth_height(d: AnyDesign) -> float:
    return d.stator.slot.height


def stator_yoke_mean_diameter(d: AnyDesign) -> float:
    return d.stator.outer_diameter - stator_yoke_height(d)


# --- rotor ------------------------------------------------------------------------------


def rotor_outer_diameter(d: AnyDesign) -> float:
    """Outer diameter of the rotor's outermost part (cage lamination, sleeve, pole shoes)."""
    return d.stator.bore_diameter - 2.0 * d.air_gap


def rotor_yoke_height(d: AnyDesign) -> float:
    """Radial height of the rotor yoke (below cage slots, magnets or pole bodies) [m]."""
    r_out = rotor_outer_diameter(d) / 2.0
    if d.machine == "induction":
        inner_edge = r_out - d.rotor.slot.height
    elif d.machine == "surface_pm":
        inner_edge = r_out - d.rotor.sleeve_thickness - d.rotor.magnet.thickness
    else:
        inner_edge = r_out - d.rotor.pole.shoe_height - d.rotor.pole.body_height
    return inner_edge - d.rotor.inner_diameter / 2.0


def rotor_yoke_mean_diameter(d: AnyDesign) -> float:
    return d.rotor.inner_diameter + rotor_yoke_height(d)


def rotor_slot_pitch(d: InductionDesign) -> float:
    """Rotor slot pitch at the rotor surface (cage rotors) [m]."""
    return math.pi * rotor_outer_diameter(d) / d.rotor.slots


def rotor_tooth_width_min(d: InductionDesign) -> float:
    """Narrowest rotor tooth along the bar zone of a cage rotor [m]."""
    top, bottom, w_top, w_bottom = winding_zone(d.rotor.slot)
    r = rotor_outer_diameter(d) / 2.0
    q = d.rotor.slots
    return min(2 * math.pi * (r - top) / q - w_top, 2 * math.pi * (r - bottom) / q - w_bottom)


def pole_shoe_width(d: SalientFieldDesign) -> float:
    """Arc width of a salient pole's shoe at the rotor surface [m]."""
    return d.rotor.pole.shoe_arc * math.pi * rotor_outer_diameter(d) / d.poles


def rotor_problems(d: AnyDesign) -> list[tuple[RecordPath, str]]:
    out: list[tuple[RecordPath, str]] = []
    rotor = d.rotor
    if rotor.inner_diameter >= rotor_outer_diameter(d):
        return [
            (
                ("rotor", "inner_diameter"),
                f"rotor inner diameter {rotor.inner_diameter * 1e3:g}"
                f" mm is not smaller than the rotor's outer diameter"
                f" {rotor_outer_diameter(d) * 1e3:g} mm",
            )
        ]
    if rotor_yoke_height(d) <= 0.0:
        what = {
            "induction": ("slot", "height"),
            "surface_pm": ("magnet", "thickness"),
            "salient_field": ("pole", "body_height"),
        }[d.machine]
        out.append(
            (
                ("rotor", *what),
                f"leaves no rotor yoke above the inner diameter {rotor.inner_diameter * 1e3:g} mm",
            )
        )
    if d.machine == "induction":
        out.extend(slot_shape_problems(d.rotor.slot, ("rotor", "slot")))
        if rotor_yoke_height(d) > 0.0 and rotor_tooth_width_min(d) <= 0.0:
            out.append((("rotor", "slot"), "rotor slots leave no rotor tooth"))
    if d.machine == "salient_field":
        shoe = pole_shoe_width(d)
        if d.rotor.pole.body_width >= shoe:
            out.append(
                (
                    ("rotor", "pole", "body_width"),
                    f"pole body {d.rotor.pole.body_width * 1e3:g}"
                    f" mm is not narrower than the pole shoe ({shoe * 1e3:.4g} mm)",
                )
            )
    return out


# --- the rotor of each machine kind, narrowed for the type checker ------------------------


def _rotor_of(design: AnyDesign, kind: type[_R], machine: str) -> _R:
    if not isinstance(design.rotor, kind):
        raise TypeError(f"{design.id}: a {machine} rotor was expected, found {design.machine}")
    return design.rotor


def cage_rotor(design: AnyDesign) -> CageRotor:
    """The cage rotor of an induction design; TypeError for any other machine kind."""
    from emgate.model.rotor import CageRotor

    return _rotor_of(design, CageRotor, "induction")


def magnet_rotor(design: AnyDesign) -> SurfacePMRotor:
    """The magnet rotor of a surface-PM design; TypeError for any other machine kind."""
    from emgate.model.rotor import SurfacePMRotor

    return _rotor_of(design, SurfacePMRotor, "surface_pm")


def salient_rotor(design: AnyDesign) -> SalientRotor:
    """The salient-pole rotor of a salient-field design; TypeError for any other kind."""
    from emgate.model.rotor import SalientRotor

    return _rotor_of(design, SalientRotor, "salient_field")
