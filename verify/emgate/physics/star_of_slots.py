"""Winding layouts generated from the star of slots, their layers and parallel paths.

Every slot's phasor falls in one of 2m phase belts of pi/m that alternate go/return between
the phases; the belts name the coil sides, the coil pitch joins them into coils. Layouts and
phase conventions are those of :mod:`emgate.physics.winding`; odd phase counts only.
"""

from __future__ import annotations

import math

import numpy as np

from emgate.physics.winding import WindingError, check_count, feasibility, phase_name

__all__ = [
    "belt_sides",
    "parallel_path_counts",
    "star_of_slots",
    "star_of_slots_layers",
]


def belt_sides(slots: int, pole_pairs: int, phases: int) -> np.ndarray:
    """One coil side per slot, phase and sign from the slot's sector of the star of slots.

    Slot s has the electrical angle 2 pi r / Q, r = p s mod Q. The star is cut into 2m belts
    of pi/m centred on j pi/m, j = 0..2m-1, each half-open [centre - pi/2m, centre + pi/2m);
    belt 2k is phase k go, belt 2k + m (mod 2m) phase k return (m odd). Integer arithmetic
    keeps slots lying exactly on a belt edge on a definite side.
    """
    s = np.arange(slots)
    r = (pole_pairs * s) % slots
    belt = ((4 * phases * r + slots) // (2 * slots)) % (2 * phases)
    go = belt % 2 == 0
    phase = np.where(go, belt // 2, ((belt - phases) // 2) % phases)
    sides = np.zeros((phases, slots), dtype=np.int64)
    sides[phase, s] = np.where(go, 1, -1)
    return sides


def _pairs_with_pitch(sides: np.ndarray, pitch: int) -> bool:
    """Whether single-layer sides can be joined into coils spanning ``pitch`` slots.

    Each coil joins slot s to slot s + y with the same phase and opposite sign. The map
    s -> s + y mod Q splits the slots into gcd(Q, y) cycles; a cycle can be paired only if its
    length is even, and then only by one of its two alternating matchings.
    """
    slots = sides.shape[1]
    ok = np.all(np.roll(sides, -pitch, axis=1) == -sides, axis=0)  # slot s closes on s + y
    cycles = math.gcd(slots, pitch)
    length = slots // cycles
    if length % 2:
        return False
    idx = (np.arange(cycles)[:, None] + pitch * np.arange(length)[None, :]) % slots
    ok_cycle = ok[idx]
    return bool(np.all(ok_cycle[:, 0::2].all(axis=1) | ok_cycle[:, 1::2].all(axis=1)))


def _bottom_layer(sides: np.ndarray, pitch: int) -> np.ndarray:
    """Return sides of the coils whose go sides are the top layers ``sides``, y slots on."""
    return -np.roll(sides, pitch, axis=1)


def _double_layer_clash(sides: np.ndarray, pitch: int) -> tuple[int, int] | None:
    """First (phase, slot) whose two layers are one phase with opposite signs, or None."""
    clash = np.argwhere(sides * _bottom_layer(sides, pitch) < 0)
    return None if clash.size == 0 else (int(clash[0, 0]), int(clash[0, 1]))


def _usable_pitches(sides: np.ndarray, layers: int, pole_pitch: float) -> list[int]:
    """Pitches the layout allows, nearest the pole pitch first (at most six), for messages."""
    slots = sides.shape[1]
    if layers == 1:
        usable = [y for y in range(1, slots) if _pairs_with_pitch(sides, y)]
    else:
        usable = [y for y in range(1, slots) if _double_layer_clash(sides, y) is None]
    return sorted(usable, key=lambda y: (abs(y - pole_pitch), y))[:6]


def star_of_slots(
    slots: int, pole_pairs: int, phases: int, layers: int, coil_pitch: int
) -> np.ndarray:
    """Winding layout generated from the star of slots with phase belts of pi/m.

    Every slot's phasor (electrical angle p 2 pi s / Q) falls in one of 2m belts of pi/m
    (60 degrees for three phases) that alternate go/return between the phases; slot 0 is at
    the centre of phase A's go belt.

    - Double layer: the belt of slot s names the coil whose go side is the top layer of slot
      s; it returns in the bottom layer of slot s + y. Any pitch works unless two sides of one
      phase with opposite signs meet in a slot (they would cancel, which the net-count layout
      cannot represent, and their turns would link no flux).
    - Single layer: every slot holds one coil side, its phase and sign from its own belt; the
      pitch must let the sides be joined into coils s -> s + y of one phase each. The layout
      does not depend on which valid pitch is chosen (end-winding shape only).

    Parameters
    ----------
    slots : int
        Number of slots Q.
    pole_pairs : int
        Number of pole pairs p.
    phases : int
        Number of phases m, odd.
    layers : int
        1 or 2.
    coil_pitch : int
        Coil span y in slots, 1 <= y <= Q - 1.

    Returns
    -------
    numpy.ndarray
        Layout, int64, shape (m, Q).

    Raises
    ------
    WindingError
        When :func:`~emgate.physics.winding.feasibility` refuses the combination or the pitch
        cannot be used; the message lists usable pitches.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley
    (star of slots, phase belts, integral and fractional slot windings).
    """
    reason = feasibility(slots, pole_pairs, phases, layers)
    if reason is not None:
        raise WindingError(reason)
    y = check_count(coil_pitch, "coil pitch")
    if y >= slots:
        raise WindingError(f"coil pitch must be 1..{slots - 1} slots, got {y}")
    sides = belt_sides(slots, pole_pairs, phases)
    pole_pitch = slots / (2 * pole_pairs)
    if layers == 1:
        if _pairs_with_pitch(sides, y):
            return sides
        problem = (
            f"single layer, coil pitch {y}: the coil sides cannot be joined into coils of one "
            f"phase spanning {y} slots"
        )
    else:
        clash = _double_layer_clash(sides, y)
        if clash is None:
            return sides + _bottom_layer(sides, y)
        problem = (
            f"double layer, coil pitch {y}: slot {clash[1]} holds phase "
            f"{phase_name(clash[0])} in both layers with opposite signs, so they cancel"
        )
    usable = _usable_pitches(sides, layers, pole_pitch)
    raise WindingError(
        f"{problem}; pole pitch {pole_pitch:g} slots; usable pitches nearest it: {usable}"
    )


def star_of_slots_layers(
    slots: int, pole_pairs: int, phases: int, layers: int, coil_pitch: int
) -> tuple[np.ndarray, np.ndarray | None]:
    """The layers of :func:`star_of_slots`'s layout: (top, bottom), bottom None for one layer.

    The top layer of slot s is the go side of the coil its belt names; the bottom layer the
    return sides, y slots on. Their sum is :func:`star_of_slots`'s layout.

    Parameters
    ----------
    slots, pole_pairs, phases, layers, coil_pitch : int
        As for :func:`star_of_slots`.

    Returns
    -------
    tuple
        Top and bottom layouts, int64, shape (m, Q) each.

    References
    ----------
    As :func:`star_of_slots`.
    """
    layout = star_of_slots(slots, pole_pairs, phases, layers, coil_pitch)
    if layers == 1:
        return layout, None
    top = belt_sides(slots, pole_pairs, phases)
    return top, _bottom_layer(top, coil_pitch)


def parallel_path_counts(
    slots: int, pole_pairs: int, phases: int, layers: int, coil_pitch: int
) -> list[int]:
    """Parallel-path counts a whose paths carry equal EMFs, for the star-of-slots winding.

    The coils of phase A are grouped by their EMF phasor (a coil from slot s with sign c
    has the phasor c exp(j theta_s) times a factor common to all coils of the pitch); a
    paths are equal when every group splits into a equal shares, so a must divide the size
    of every group.

    Parameters
    ----------
    slots, pole_pairs, phases, layers, coil_pitch : int
        As for :func:`star_of_slots` (the winding must be buildable).

    Returns
    -------
    list of int
        The allowed counts, ascending (1 always among them).

    References
    ----------
    Equal-EMF condition for parallel paths [mem: Pyrhonen, Jokinen, Hrabovcova, Design of
    Rotating Electrical Machines, ch. 2].
    """
    sides = belt_sides(slots, pole_pairs, phases)[0]
    if layers == 2:
        starts = [int(s) for s in np.flatnonzero(sides)]
    else:
        ok = np.roll(sides, -coil_pitch) == -sides
        starts = []
        cycles = math.gcd(slots, coil_pitch)
        length = slots // cycles
        for c in range(cycles):
            idx = [(c + coil_pitch * k) % slots for k in range(length)]
            first = 0 if all(ok[idx[k]] for k in range(0, length, 2)) else 1
            starts += [idx[k] for k in range(first, length, 2) if sides[idx[k]] != 0]
    angle = 2.0 * math.pi * pole_pairs / slots
    groups: dict[int, int] = {}
    for s in starts:
        phi = (angle * s + (math.pi if sides[s] < 0 else 0.0)) % (2.0 * math.pi)
        key = round(phi * 1e6) % round(2.0 * math.pi * 1e6)
        groups[key] = groups.get(key, 0) + 1
    g = 0
    for n in groups.values():
        g = math.gcd(g, n)
    return [a for a in range(1, g + 1) if g % a == 0]
