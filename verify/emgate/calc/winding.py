"""The winding: layout, turns, phase current and voltage, winding factor and MMF.

What depends on the winding alone (its layout, winding factor, balance and MMF spectrum) is
computed once per distinct winding in a process (:func:`per_winding`): the records of a
family that share a lamination and a winding (stack lengths, turns, ratings) share it.
"""

from __future__ import annotations

import functools
from collections.abc import Callable
from typing import TYPE_CHECKING, Any, NamedTuple, TypeVar

from emgate.calc.core import Calculation, memo, quantity

if TYPE_CHECKING:
    import numpy as np

    from emgate.model import AnyDesign

T = TypeVar("T")


class Winding(NamedTuple):
    """Everything the winding's own analysis reads: nothing of the record beyond it."""

    slots: int
    pole_pairs: int
    phases: int
    layers: int
    coil_pitch: int
    table: tuple[str, ...] | None  # the record's explicit slot table, if it gives one


def winding_of(d: AnyDesign) -> Winding:
    w = d.winding
    table = None if w.layout is None else tuple(w.layout)
    return Winding(d.stator.slots, d.pole_pairs, w.phases, w.layers, w.coil_pitch, table)


@memo
def spec(c: Calculation) -> Winding:
    return winding_of(c.d)


#: Every function of a :class:`Winding` that :func:`per_winding` keeps.
PER_WINDING: list[Any] = []  # their lru_cache wrappers (cache_clear, cache_info)


def per_winding(fn: Callable[[Winding], T]) -> Callable[[Winding], T]:
    """``fn`` computed once per distinct winding in the process (256 windings kept): what it
    returns is shared between records and must not be changed (arrays are read-only). It
    sees only the Winding, so it cannot depend on the rest of the record."""
    cached = functools.lru_cache(maxsize=256)(fn)
    PER_WINDING.append(cached)
    return cached


def layout(c: Calculation) -> np.ndarray:
    """Signed coil sides per phase and slot, shape (m, Q); read-only (it is shared)."""
    return winding_layout(spec(c))


@per_winding
def winding_layout(w: Winding) -> np.ndarray:
    from emgate.physics.star_of_slots import star_of_slots

    if w.table is not None:
        out = layout_from_table(list(w.table), w.phases)
    else:
        out = star_of_slots(w.slots, w.pole_pairs, w.phases, w.layers, w.coil_pitch)
    out.flags.writeable = False
    return out


@per_winding
def feasibility(w: Winding) -> str | None:
    """Why no balanced winding exists for these slots, poles, phases and layers (None if one
    does): emgate.physics.winding.feasibility."""
    from emgate.physics.winding import feasibility

    return feasibility(w.slots, w.pole_pairs, w.phases, w.layers)


@per_winding
def parallel_path_counts(w: Winding) -> tuple[int, ...]:
    """The numbers of parallel paths whose EMFs are equal (the star of slots' layout)."""
    from emgate.physics.star_of_slots import parallel_path_counts

    return tuple(parallel_path_counts(w.slots, w.pole_pairs, w.phases, w.layers, w.coil_pitch))


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
    return _winding_factor(spec(c))


@per_winding
def _winding_factor(w: Winding) -> float:
    import numpy as np

    from emgate.physics.winding_factors import winding_factors

    return float(winding_factors(winding_layout(w)[0], np.array([w.pole_pairs]))[0])


def winding_problems(c: Calculation) -> list[str]:
    return list(_winding_problems(spec(c)))


@per_winding
def _winding_problems(w: Winding) -> tuple[str, ...]:
    from emgate.physics.winding import balance

    problems = list(balance(winding_layout(w), w.pole_pairs))
    if w.table is not None:
        reason = feasibility(w)
        if reason:
            problems.append(reason)
    return tuple(problems)


@quantity("winding.mmf_thd")
def mmf_thd(c: Calculation) -> float:
    return _mmf_thd(spec(c))


@per_winding
def _mmf_thd(w: Winding) -> float:
    from emgate.physics.mmf import mmf_thd

    return mmf_thd(winding_layout(w), w.pole_pairs)


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
    # The staircase is linear in the coil turns and the conductor current: the winding's
    # peak for one turn and one ampere, scaled.
    w = c.d.winding
    return _unit_mmf_peak(spec(c)) * w.turns_per_coil * (phase_current(c) / w.parallel_paths)


@per_winding
def _unit_mmf_peak(w: Winding) -> float:
    from emgate.physics.mmf import mmf_peak

    return mmf_peak(winding_layout(w), 1.0, 1.0)


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
