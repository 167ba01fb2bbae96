"""Physical consistency of a design record that the model accepted.

Impossible combinations of otherwise valid values (a bore wider than the stator, no yoke
left, an unbuildable winding, a rating that contradicts itself) are reported at the record
path, as input errors (exit 2), before any rule runs.
"""

from __future__ import annotations

from collections.abc import Callable
from functools import partial

from emgate.model import AnyDesign
from emgate.model.stator import RectangularConductor, RoundConductor
from emgate.terms import RecordPath


def consistency_problems(d: AnyDesign) -> list[tuple[RecordPath, str]]:
    """Physically impossible combinations of otherwise valid values."""
    from emgate import geometry
    from emgate.calc.winding import feasibility, winding_of

    out: list[tuple[RecordPath, str]] = []
    st = d.stator
    if st.bore_diameter >= st.outer_diameter:
        out.append(
            (
                ("stator", "bore_diameter"),
                f"bore diameter {st.bore_diameter * 1e3:g} mm must be smaller than the outer"
                f" diameter {st.outer_diameter * 1e3:g} mm",
            )
        )
        return out
    section = (st.outer_diameter - st.bore_diameter) / 2.0
    if geometry.stator_yoke_height(d) <= 0.0:
        out.append(
            (
                ("stator", "slot", "height"),
                f"slot height {st.slot.height * 1e3:g} mm leaves no stator yoke: the section"
                f" between bore and outer diameter is {section * 1e3:g} mm",
            )
        )
    if geometry.stator_tooth_width_min(d) <= 0.0:
        pitch = geometry.stator_slot_pitch_at(d, geometry.stator_widest_radius(d))
        out.append(
            (
                ("stator", "slot"),
                f"slots {geometry.stator_slot_width_max(d) * 1e3:g} mm wide leave no tooth at a"
                f" slot pitch of {pitch * 1e3:.4g} mm",
            )
        )
    out.extend(geometry.slot_shape_problems(st.slot, ("stator", "slot")))
    if st.stacking_factor * geometry.stator_tooth_width_min(d) >= geometry.stator_slot_pitch(d):
        out.append(
            (
                ("stator", "slot"),
                "the slots are narrower than the stacking factor's"
                " share of a slot pitch: no slot is left to carry conductors",
            )
        )
    w = d.winding
    if not 1 <= w.coil_pitch <= st.slots - 1:
        out.append(
            (
                ("winding", "coil_pitch"),
                f"coil pitch {w.coil_pitch} must lie between 1 and Q-1 = {st.slots - 1} slots",
            )
        )
    if w.layout is None:
        reason = feasibility(winding_of(d))
        if reason:
            out.append((("stator", "slots"), f"no balanced winding: {reason}"))
    elif len(w.layout) != st.slots:
        out.append(
            (
                ("winding", "layout"),
                f"expected one layout entry per slot ({st.slots}), found {len(w.layout)}",
            )
        )
    else:
        letters = {chr(ord("A") + k) for k in range(w.phases)}
        for s, entry in enumerate(w.layout):
            wrong = sorted({side.lstrip("+-") for side in entry.split()} - letters)
            if wrong:
                out.append(
                    (
                        ("winding", "layout", s),
                        f"phase {wrong[0]!r} is not one of the"
                        f" {w.phases} phases {''.join(sorted(letters))}",
                    )
                )
            elif len(entry.split()) != w.layers:
                out.append(
                    (
                        ("winding", "layout", s),
                        f"expected {w.layers} coil side(s) in"
                        f" the slot (layers: {w.layers}), found {len(entry.split())}",
                    )
                )
    if w.conductor.shape == "round" and w.conductor.insulated_diameter < w.conductor.bare_diameter:
        out.append(
            (
                ("winding", "conductor", "insulated_diameter"),
                "insulated diameter must not be smaller than the bare diameter",
            )
        )
    if w.conductor.shape == "rectangular" and (
        w.conductor.insulated_width < w.conductor.width
        or w.conductor.insulated_height < w.conductor.height
    ):
        out.append(
            (("winding", "conductor"), "insulated dimensions must not be smaller than bare ones")
        )
    if d.air_gap * 2 >= st.bore_diameter:
        out.append((("air_gap",), "air gap leaves no rotor inside the bore"))
    out.extend(geometry.rotor_problems(d))
    if not out:
        out.extend(_buildable_problems(d))
    out.extend(_rating_problems(d))
    return out


def _buildable_problems(d: AnyDesign) -> list[tuple[RecordPath, str]]:
    """What the kernel cannot build: asked of the kernel itself, so that the record, not a
    rule, is reported (exit 2, at the field)."""
    from emgate.calc import conductor_strand_area, slot_winding_area
    from emgate.calc.winding import parallel_path_counts, winding_layout, winding_of
    from emgate.physics.magnetic_surface_pm import remanence_at
    from emgate.physics.winding import series_turns_per_phase

    out: list[tuple[RecordPath, str]] = []
    w, st = d.winding, d.stator

    def attempt(path: RecordPath, build: Callable[[], object]) -> None:
        try:
            build()
        except ValueError as exc:  # WindingError is a ValueError
            out.append((path, str(exc)))

    if w.layout is None and 1 <= w.coil_pitch <= st.slots - 1:
        attempt(("winding", "coil_pitch"), lambda: winding_layout(winding_of(d)))
    if w.layout is None and not out and 1 <= w.coil_pitch <= st.slots - 1:
        paths = parallel_path_counts(winding_of(d))
        if w.parallel_paths not in paths:
            out.append(
                (
                    ("winding", "parallel_paths"),
                    f"{w.parallel_paths} parallel paths would not carry equal EMFs: this"
                    f" winding's coils group so that {', '.join(map(str, paths))} can",
                )
            )
            return out
    attempt(
        ("winding", "parallel_paths"),
        lambda: series_turns_per_phase(
            st.slots, w.layers, w.phases, w.turns_per_coil, w.parallel_paths
        ),
    )
    conductors: list[tuple[RecordPath, RoundConductor | RectangularConductor]] = [
        (("winding", "conductor"), w.conductor)
    ]
    if d.machine == "salient_field":
        conductors.append((("rotor", "field", "conductor"), d.rotor.field.conductor))
    for at, c in conductors:
        if c.shape == "rectangular":
            attempt((*at, "corner_radius"), partial(conductor_strand_area, c))
    if w.slot_liner:
        attempt(("winding", "slot_liner"), partial(slot_winding_area, st.slot, w.slot_liner))
    if d.machine == "surface_pm" and (hot := d.rotor.magnet.operating_temperature) is not None:
        m = d.rotor.magnet
        t0 = m.material.reference_temperature
        # The kernel's reversible law on a unit value: the share of Br0 and H_cJ0 left.
        br = remanence_at(1.0, hot, m.material.remanence_temperature_coefficient, t0)
        hcj = remanence_at(1.0, hot, m.material.coercivity_temperature_coefficient, t0)
        if br <= 0.0 or hcj <= 0.0:
            out.append(
                (
                    ("rotor", "magnet", "operating_temperature"),
                    f"at {hot - 273.15:g} degC the temperature"
                    " coefficients leave the magnet no remanence or coercivity",
                )
            )
    return out


#: Slip beyond which the rated speed, frequency or pole count is certainly wrong (poles
#: miscounted, a synchronous speed written); high-slip motors reach 20-30 % (from memory),
#: so milder doubts (50/60 Hz mixed) are the nameplate rule's warning.
GROSS_SLIP = 0.5
#: Efficiency times power factor at the rating: below 0.2 even a small motor is implausible
#: (common practice, no source).
MIN_POWER_RATIO = 0.2
#: IEC 60034-6 codes whose cooling method is plain [from memory]; other codes are accepted.
IC_METHODS = {
    "IC410": "enclosed_natural",
    "IC411": "enclosed_fan",
    "IC416": "enclosed_fan",
    "IC01": "open_ventilated",
    "IC06": "open_ventilated",
}


def _short_ic(code: str | None) -> str | None:
    """IC4A1A1 -> IC411: the full IEC 60034-6 notation with the air coolant letters dropped."""
    import re

    if code is None:
        return None
    return re.sub(r"A(?=\d)", "", code)


def _rating_problems(d: AnyDesign) -> list[tuple[RecordPath, str]]:
    """Gross contradictions in the rating and cooling; milder doubts are the nameplate rule's."""
    from emgate.physics.rating import slip as rated_slip
    from emgate.physics.rating import synchronous_speed

    out: list[tuple[RecordPath, str]] = []
    sync = synchronous_speed(d.rating.frequency, d.pole_pairs)  # revolutions per second
    n = d.rating.speed
    generator = d.rating.operation == "generator"
    if d.machine == "induction":
        slip = rated_slip(n, d.rating.frequency, d.pole_pairs)
        right_side = slip < 0.0 if generator else slip > 0.0
        if not (right_side and abs(slip) <= GROSS_SLIP):
            turns = "above" if generator else "below"
            out.append(
                (
                    ("rating", "speed"),
                    f"an induction {d.rating.operation} at {d.rating.frequency:g} Hz with"
                    f" {d.poles} poles turns a little {turns} {sync * 60:g} rpm;"
                    f" {n * 60:g} rpm is a slip of {slip:.1%}",
                )
            )
    elif abs(n / sync - 1.0) > 0.01:
        out.append(
            (
                ("rating", "speed"),
                f"a synchronous machine at {d.rating.frequency:g} Hz with {d.poles} poles"
                f" turns at {sync * 60:g} rpm, not {n * 60:g} rpm",
            )
        )
    r, m = d.rating, d.winding.phases
    from emgate.physics.currents import phase_current, phase_voltage

    apparent = (
        m
        * phase_voltage(r.line_voltage, r.connection, m)
        * phase_current(r.line_current, r.connection, m)
    )
    ratio = r.power / apparent
    if not MIN_POWER_RATIO <= ratio <= 1.02:
        meaning = "power factor" if generator else "efficiency times power factor"
        out.append(
            (
                ("rating", "line_current"),
                f"rated power {r.power / 1e3:.4g} kW (or kVA) from {r.line_voltage:.4g} V and"
                f" {r.line_current:.4g} A gives P / (m U_ph I_ph) = {ratio:.3g}, the {meaning};"
                f" a machine lies between {MIN_POWER_RATIO:g} and 1 (check power, voltage"
                " and current)",
            )
        )
    if not 213.15 <= d.cooling.ambient <= 393.15:
        out.append(
            (
                ("cooling", "ambient"),
                f"coolant at {d.cooling.ambient - 273.15:g} degC is outside -60 to 120 degC",
            )
        )
    low = d.cooling.ambient_min
    if low is not None and not 213.15 <= low <= d.cooling.ambient:
        out.append(
            (
                ("cooling", "ambient_min"),
                f"the lowest coolant temperature {low - 273.15:g} degC must lie between"
                f" -60 degC and the rated ambient {d.cooling.ambient - 273.15:g} degC",
            )
        )
    if r.max_speed is not None and r.max_speed < n:
        out.append(
            (
                ("rating", "max_speed"),
                f"the top speed {r.max_speed * 60:g} rpm is below the rated {n * 60:g} rpm",
            )
        )
    if r.peak_current is not None and r.peak_current < r.line_current:
        out.append(
            (
                ("rating", "peak_current"),
                f"a drive limit of {r.peak_current:g} A peak is below the rated"
                f" {r.line_current:g} A rms line current",
            )
        )
    code = _short_ic(d.cooling.code)
    if code in IC_METHODS and IC_METHODS[code] != d.cooling.method:
        out.append(
            (
                ("cooling", "code"),
                f"{code} is {IC_METHODS[code].replace('_', ' ')} cooling (IEC 60034-6),"
                f" but the method says {d.cooling.method.replace('_', ' ')}",
            )
        )
    frame = d.cooling.frame_length
    if frame is not None and not 0.5 <= frame / d.stator.stack_length <= 5.0:
        out.append(
            (
                ("cooling", "frame_length"),
                f"a frame {frame * 1e3:.4g} mm long for a {d.stator.stack_length * 1e3:.4g} mm"
                " stack is implausible (0.5 to 5 stack lengths)",
            )
        )
    # Temperature-compensated SmCo sits near zero; anything clearly positive is a sign slip.
    if (
        d.machine == "surface_pm"
        and d.rotor.magnet.material.remanence_temperature_coefficient > 5e-4
    ):
        out.append(
            (
                ("rotor", "magnet", "material", "remanence_temperature_coefficient"),
                "the remanence of NdFeB, SmCo and ferrite magnets falls with temperature:"
                " the coefficient is negative (NdFeB about -0.12 %/K, from memory)",
            )
        )
    return out
