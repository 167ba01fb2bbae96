"""The data of a page's drawings and plots, from the design, its calculation and the kernel.

Values are taken from the calculation; where a plot needs a curve the sheet holds only as a
number (the MMF staircase at an instant, its spectrum, a steel's H at a working point) the
kernel function that computes the number is called with the calculation's own inputs. Each
function fills its part of a :class:`~emgate.page.content.PageData` and may raise
ValueError or ArithmeticError, which leaves that part out.
"""

from __future__ import annotations

import math
from typing import Any

from emgate.calc import conductors as cc
from emgate.calc import magnetic as cm
from emgate.calc import thermal as ct
from emgate.calc import winding as cw
from emgate.page.content import (
    MMFData,
    PageData,
    Section,
    StarPhasor,
    SteelCurve,
    Thermal,
    ThermalStep,
    WindingTable,
    WorkingPoint,
)
from emgate.page.shapes import ConductorDims, SlotDims

MM = 1e3  # metres to millimetres, for drawings
#: The electrical instant of the MMF plot: phase A's current at its crest (omega t = 0).
MMF_INSTANT = 0.0


def _slot_dims(slot: Any) -> SlotDims:
    if slot.shape == "semi_closed":
        return SlotDims(
            "semi_closed",
            slot.opening * MM,
            slot.opening_height * MM,
            slot.wedge_height * MM,
            slot.top_width * MM,
            slot.bottom_width * MM,
            slot.height * MM,
        )
    w = slot.width * MM
    return SlotDims("open", w, 0.0, slot.wedge_height * MM, w, w, slot.height * MM)


def _conductor_dims(conductor: Any) -> ConductorDims:
    if conductor.shape == "round":
        return ConductorDims(
            "round",
            conductor.strands,
            conductor.insulated_diameter * MM,
            conductor.insulated_diameter * MM,
            conductor.bare_diameter * MM,
            conductor.bare_diameter * MM,
        )
    return ConductorDims(
        "rectangular",
        conductor.strands,
        conductor.insulated_width * MM,
        conductor.insulated_height * MM,
        conductor.width * MM,
        conductor.height * MM,
    )


def section(page: PageData, d: Any, calc: Any) -> None:
    from emgate import geometry as geo

    rotor = d.rotor
    extra: dict[str, Any] = {}
    if d.machine == "induction":
        extra = {"rotor_slots": rotor.slots, "rotor_slot": _slot_dims(rotor.slot)}
    elif d.machine == "surface_pm":
        extra = {
            "magnet_thickness": rotor.magnet.thickness * MM,
            "magnet_arc": rotor.magnet.pole_arc,
            "sleeve": rotor.sleeve_thickness * MM,
        }
    else:
        extra = {
            "shoe_arc": rotor.pole.shoe_arc,
            "shoe_height": rotor.pole.shoe_height * MM,
            "body_width": rotor.pole.body_width * MM,
            "body_height": rotor.pole.body_height * MM,
        }
    page.section = Section(
        machine=d.machine,
        poles=d.poles,
        slots=d.stator.slots,
        stator_outer_r=d.stator.outer_diameter * MM / 2,
        bore_r=d.stator.bore_diameter * MM / 2,
        stator_slot=_slot_dims(d.stator.slot),
        rotor_outer_r=geo.rotor_outer_diameter(d) * MM / 2,
        rotor_inner_r=rotor.inner_diameter * MM / 2,
        conductor=_conductor_dims(d.winding.conductor),
        conductors_per_slot=int(cc.conductors_per_slot(calc)),
        liner=cc.liner(calc) * MM,
        layers=d.winding.layers,
        **extra,
    )


def _side(sign: int, k: int) -> str:
    from emgate.physics.winding import phase_name

    return ("+" if sign > 0 else "-") + phase_name(k)


def winding(page: PageData, d: Any, calc: Any) -> None:
    import numpy as np

    from emgate.physics import star_of_slots as wk

    w = d.winding
    layout = np.asarray(cw.layout(calc))
    q, p = d.stator.slots, d.pole_pairs
    table: list[tuple[str, ...]]
    if w.layout is not None:
        table = [tuple(entry.split()) for entry in w.layout]
        origin = "the record's slot table"
    else:
        origin = "generated from the star of slots"
        # The kernel's own belts: the top layer of slot s is the go side of its belt, the
        # bottom layer the return side of the coil that starts y slots back.
        top = wk.belt_sides(q, p, w.phases)
        layers = [top] if w.layers == 1 else [top, -np.roll(top, w.coil_pitch, axis=1)]
        if not np.array_equal(sum(layers), layout):
            raise ValueError("the layers do not add up to the calculation's layout")
        table = [
            tuple(
                _side(int(lay[k, s]), k)
                for lay in layers
                for k in range(w.phases)
                if lay[k, s] != 0
            )
            for s in range(q)
        ]
    star = [
        StarPhasor(s + 1, (360.0 * p * s / q) % 360.0, table[s] if s < len(table) else ())
        for s in range(q)
    ]
    try:
        kw1: float | None = cw.winding_factor(calc)
    except (ValueError, ArithmeticError):
        kw1 = None
    page.winding = WindingTable(
        w.phases, w.layers, q, p, w.coil_pitch, table, origin, star, kw1, math.gcd(q, p)
    )


def mmf(page: PageData, d: Any, calc: Any) -> None:
    import numpy as np

    from emgate.physics import mmf as mk
    from emgate.physics.winding import harmonic_phasors

    w = d.winding
    p = d.pole_pairs
    current = cw.phase_current(calc) / w.parallel_paths
    currents = mk.balanced_currents(w.phases, current, MMF_INSTANT)
    sps = max(4, 720 // d.stator.slots)
    theta, staircase = mk.mmf_staircase(cw.layout(calc), w.turns_per_coil, currents, sps)
    top = max(4 * d.stator.slots, 12 * p)
    amplitudes = mk.mmf_spectrum(cw.layout(calc), w.turns_per_coil, currents, top)
    # The working harmonic's phase from the same slot phasor sum as its amplitude: a step
    # C_s at theta_s gives the order-n term (|Y_n| / (pi n)) cos(n theta + arg Y_n - pi/2),
    # Y_n = sum C_s exp(-j n theta_s).
    ac = mk.slot_ampere_conductors(cw.layout(calc), w.turns_per_coil, currents)
    y_p = np.conj(harmonic_phasors(ac, p))
    keep = theta < 2.0 * math.pi / p
    fundamental = amplitudes[p] * np.cos(p * theta[keep] + np.angle(y_p) - math.pi / 2)
    thd = page.quantity("winding.mmf_thd")
    page.mmf = MMFData(
        instant_deg=math.degrees(MMF_INSTANT),
        conductor_current=current,
        angle_deg=[float(a) for a in np.degrees(p * theta[keep])],
        staircase=[float(v) for v in staircase[keep]],
        fundamental=[float(v) for v in fundamental],
        orders=list(range(1, top + 1)),
        amplitudes=[float(a) for a in amplitudes[1:]],
        working_order=p,
        thd=thd,
    )


#: Working points: (part, sheet name of its flux density, stator or rotor steel).
_PARTS = (
    ("stator teeth", "stator.tooth_flux_density", "stator"),
    ("stator yoke", "stator.yoke_flux_density", "stator"),
    ("rotor teeth", "rotor.tooth_flux_density", "rotor"),
    ("rotor yoke", "rotor.yoke_flux_density", "rotor"),
    ("pole body", "rotor.pole_body_flux_density", "rotor"),
)


def steels(page: PageData, d: Any, calc: Any) -> None:
    from emgate.physics.bh import h_from_b

    curves = {"stator": cm.stator_steel(calc), "rotor": cm.rotor_steel(calc)}
    out: dict[str, SteelCurve] = {}
    for part, name, member in _PARTS:
        curve = curves[member]
        steel = out.get(curve.name)
        if steel is None:
            steel = SteelCurve(
                curve.name,
                curve.source,
                (),
                [float(b) for b in curve.b],
                [float(h) for h in curve.h],
                [],
            )
        if member not in steel.parts:
            steel = SteelCurve(
                steel.name, steel.source, (*steel.parts, member), steel.b, steel.h, steel.points
            )
        out[curve.name] = steel
        b = page.quantity(name)
        if b is not None and math.isfinite(b) and b > 0.0:
            steel.points.append(WorkingPoint(part, name, b, float(h_from_b(curve, b))))
    page.steels = list(out.values())


def ampere_turns(page: PageData, d: Any, calc: Any) -> None:
    mag = cm.magnetic(calc)
    iron = mag.iron
    parts = [
        ("air gap", mag.gap_mmf),
        ("stator teeth", iron.stator_tooth_mmf),
        ("rotor teeth", iron.rotor_tooth_mmf),
        ("pole body", iron.pole_body_mmf),
        ("stator yoke (half)", iron.stator_yoke_mmf),
        ("rotor yoke (half)", iron.rotor_yoke_mmf),
    ]
    page.ampere_turns = [(n, float(v)) for n, v in parts if v > 0.0]


def thermal(page: PageData, d: Any, calc: Any) -> None:
    est = ct.thermal_estimate(calc)
    page.thermal = Thermal(
        est.method,
        est.coolant_temperature - 273.15,
        est.winding_temperature - 273.15,
        [ThermalStep(s.name, s.resistance, s.heat, s.rise) for s in est.steps],
    )
