"""The winding: layout, turns, phase current and voltage, winding factor and MMF."""

from __future__ import annotations

from typing import TYPE_CHECKING

from emgate.calc.core import Calculation, memo, quantity

if TYPE_CHECKING:
    import numpy as np


@memo
def layout(c: Calculation) -> np.ndarray:
    """Signed coil sides per phase and slot, shape (m, Q)."""
    from emgate.physics.star_of_slots import star_of_slots

    w = c.d.winding
    if w.layout is not None:
        return layout_from_table(w.layout, w.phases)
    return star_of_slots(c.d.stator.slots, c.d.pole_pairs, w.phases, w.layers, w.coil_pitch)


@quantity("winding.series_turns")
def series_turns(c: Calculation) -> float:
    from emgate.physics.winding import series_turns_per_phase

    w = c.d.winding
    return series_turns_per_phase(
        c.d.stator.slots, w.layers, w.phases, w.turns_per_coil, w.parallel_paths
    )


@quantity("winding.phase_current")
def phase_current(c: Calculation) -> float:
    from emgate.physics.currents import phase_current

    r = c.d.rating
    return phase_current(r.line_current, r.connection, c.d.winding.phases)


@quantity("winding.phase_voltage")
def phase_voltage(c: Calculation) -> float:
    from emgate.physics.currents import phase_voltage

    r = c.d.rating
    return phase_voltage(r.line_voltage, r.connection, c.d.winding.phases)


@quantity("rating.slip")
def slip(c: Calculation) -> float:
    from emgate.physics.rating import slip

    r = c.d.rating
    return abs(slip(r.speed, r.frequency, c.d.pole_pairs))


@quantity("winding.winding_factor")
def winding_factor(c: Calculation) -> float:
    import numpy as np

    from emgate.physics.winding_factors import winding_factors

    return float(winding_factors(layout(c)[0], np.array([c.d.pole_pairs]))[0])


@memo
def winding_problems(c: Calculation) -> list[str]:
    from emgate.physics.winding import balance, feasibility

    w = c.d.winding
    problems = list(balance(layout(c), c.d.pole_pairs))
    if w.layout is not None:
        reason = feasibility(c.d.stator.slots, c.d.pole_pairs, w.phases, w.layers)
        if reason:
            problems.append(reason)
    return problems


@quantity("winding.mmf_thd")
def mmf_thd(c: Calculation) -> float:
    from emgate.physics.mmf import mmf_thd

    return mmf_thd(layout(c), c.d.pole_pairs)


@quantity("winding.mmf_fundamental")
def mmf_fundamental(c: Calculation) -> float:
    from emgate.physics.mmf import mmf_fundamental_peak

    return mmf_fundamental_peak(
        c.d.winding.phases,
        series_turns(c),
        winding_factor(c),
        phase_current(c),
        c.d.pole_pairs,
    )


@quantity("winding.mmf_peak")
def mmf_peak(c: Calculation) -> float:
    from emgate.physics.mmf import mmf_peak

    w = c.d.winding
    return mmf_peak(layout(c), w.turns_per_coil, phase_current(c) / w.parallel_paths)


def layout_from_table(table: list[str], phases: int) -> np.ndarray:
    """The (m, Q) layout of an explicit slot table such as ['+A -C', '-B +A', ...]."""
    import numpy as np

    letters = [chr(ord("A") + k) for k in range(phases)]
    out = np.zeros((phases, len(table)), dtype=int)
    for s, entry in enumerate(table):
        for side in entry.split():
            sign = -1 if side.startswith("-") else 1
            letter = side.lstrip("+-")
            if letter not in letters:
                raise ValueError(f"slot {s + 1}: phase {letter!r} is not one of {letters}")
            out[letters.index(letter), s] += sign
    return out
