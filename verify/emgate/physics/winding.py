"""Winding layouts from the star of slots, their balance, and winding factors.

A *layout* is an integer array of shape (m, Q): ``layout[k, s]`` is the signed number of coil
sides of phase k in slot s (+1 go, -1 return); times the turns per coil it gives conductors.
Slot s is centred at the mechanical angle 2 pi s / Q. Phase k lags phase 0 by 2 pi k / m
electrical, so its conductors lie 2 pi k / m electrical further along the bore and
positive-sequence currents drive the field towards increasing angle.

Supported: odd phase counts m >= 1 (1, 3, 5, ...), single and double layer, integral and
fractional slots per pole and phase. With phases displaced by 2 pi / m an even m would put
phase k and phase k + m/2 in antiphase, so even phase counts are refused by the generator;
an explicit layout of any shape can still be checked with :func:`balance` and
:func:`winding_factors`.
"""

from __future__ import annotations

import math
import operator

import numpy as np

__all__ = [
    "BALANCE_RTOL",
    "WindingError",
    "as_layout",
    "balance",
    "feasibility",
    "harmonic_phasors",
    "phase_emf",
    "phase_name",
    "series_turns_per_phase",
    "star_of_slots",
    "star_of_slots_layers",
    "winding_factor_closed_form",
    "winding_factors",
]

#: Relative tolerance of :func:`balance`, on the coil sides N of a phase. Rounding in the phasor
#: sums is ~1e-15 N; a side moved to a slot of another electrical angle changes a phasor by
#: at least 2 sin(pi/Q), so 1e-9 N separates the two for any winding with N < 1e6 sides.
BALANCE_RTOL: float = 1e-9


class WindingError(ValueError):
    """A winding that cannot be built as asked, or an array that is not a layout."""


def _count(value: int, name: str, minimum: int = 1) -> int:
    """Return ``value`` as an int, or raise WindingError unless it is an integer >= minimum."""
    if isinstance(value, bool):
        raise WindingError(f"{name} must be an integer, got {value!r}")
    try:
        n = operator.index(value)
    except TypeError:
        raise WindingError(f"{name} must be an integer, got {value!r}") from None
    if n < minimum:
        raise WindingError(f"{name} must be >= {minimum}, got {n}")
    return n


def _is_whole(arr: np.ndarray) -> bool:
    """Whether an array holds integers (of an integer dtype, or finite whole floats)."""
    if arr.dtype.kind in "iu":
        return True
    return arr.dtype.kind == "f" and bool(np.all(np.isfinite(arr)) and np.all(arr == np.round(arr)))


def phase_name(k: int) -> str:
    """Letter of phase k (A, B, C, ...), or ``"phase k"`` past Z."""
    return chr(ord("A") + k) if 0 <= k < 26 else f"phase {k}"


def as_layout(layout: np.ndarray) -> np.ndarray:
    """Check an array is a layout and return it as int64, shape (m, Q).

    Parameters
    ----------
    layout : numpy.ndarray
        Signed coil sides per phase and slot, shape (m, Q), integer-valued.

    Returns
    -------
    numpy.ndarray
        The same values as ``int64``.

    Raises
    ------
    WindingError
        When the array is not two-dimensional, is empty, or holds non-integer values.
    """
    arr = np.asarray(layout)
    if arr.ndim != 2 or arr.shape[0] < 1 or arr.shape[1] < 1:
        raise WindingError(f"a layout has shape (phases, slots), got shape {arr.shape}")
    if not _is_whole(arr):
        raise WindingError("a layout holds whole numbers of coil sides")
    return arr.astype(np.int64)


def harmonic_phasors(conductors: np.ndarray, orders: int | np.ndarray) -> np.ndarray:
    """Sum of slot conductors weighted by the phase of each mechanical order.

    Parameters
    ----------
    conductors : numpy.ndarray
        Signed conductors (or ampere-conductors) per slot, shape (..., Q); slot s at 2 pi s/Q.
    orders : int or numpy.ndarray
        Mechanical harmonic orders n, integers of any sign.

    Returns
    -------
    numpy.ndarray
        X_n = sum_s c_s exp(j n 2 pi s / Q), complex, shape (..., *orders.shape).

    Notes
    -----
    X_n depends only on n mod Q, so one FFT of length Q serves any number of orders, and
    the reduction mod Q is done in integers, so very high orders lose no accuracy.

    References
    ----------
    R. Skaar, O. Kroevel, R. Nilssen, "Distribution, coil-span and winding factors for PM
    machines with concentrated windings", ICEM 2006 (the slot phasor sum).
    """
    c = np.asarray(conductors, dtype=float)
    n = np.asarray(orders)
    if not _is_whole(n):
        raise WindingError("harmonic orders on a closed periphery are whole numbers")
    slots = c.shape[-1]
    spectrum = np.fft.ifft(c, axis=-1) * slots  # sum_s c_s exp(+j 2 pi r s / Q), r = 0..Q-1
    return spectrum[..., np.mod(n.astype(np.int64), slots)]


def feasibility(slots: int, pole_pairs: int, phases: int, layers: int) -> str | None:
    """Whether a balanced symmetric winding exists for a slot/pole/phase/layer combination.

    Symmetric means that the winding repeats t = gcd(Q, p) times around the bore, every
    phase taking the same share of the star of slots.

    Parameters
    ----------
    slots : int
        Number of stator slots Q.
    pole_pairs : int
        Number of pole pairs p.
    phases : int
        Number of phases m (odd, see the module notes).
    layers : int
        1 (single layer: one coil side per slot) or 2 (double layer).

    Returns
    -------
    str or None
        None when the winding exists, else the reason why not.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*,
    Wiley (the star of slots; symmetry conditions Q/(m t) and, single layer, Q/(2 m t)).
    """
    try:
        q_slots = _count(slots, "slots")
        p = _count(pole_pairs, "pole pairs")
        m = _count(phases, "phases")
        layers = _count(layers, "layers")
    except WindingError as exc:
        return str(exc)
    if layers not in (1, 2):
        return f"layers must be 1 or 2, got {layers}"
    if m % 2 == 0:
        return (
            f"{m} phases: with phases displaced by 2 pi/m, phases k and k + m/2 would be in "
            "antiphase; only odd phase counts are generated"
        )
    if q_slots < m:
        return f"{q_slots} slots cannot hold {m} phases (Q < m)"
    t = math.gcd(q_slots, p)
    if q_slots % (m * t):
        return (
            f"Q/(m t) = {q_slots}/({m}*{t}) is not a whole number (t = gcd(Q, p) = {t}): "
            "the star of slots cannot be shared equally among the phases"
        )
    if layers == 1 and q_slots % (2 * m * t):
        return (
            f"single layer needs Q/(2 m t) = {q_slots}/(2*{m}*{t}) to be a whole number "
            f"(t = gcd(Q, p) = {t} repeating sections): a section cannot hold whole go and "
            "return belts of every phase"
        )
    if m == 1 and q_slots % (2 * t):
        # One phase cannot borrow the other layer's slots from a neighbour phase: with an odd
        # number of spokes its go and return belts differ in size and some coil cancels itself.
        return (
            f"a single-phase winding needs Q/(2 t) = {q_slots}/(2*{t}) to be a whole number "
            f"(t = gcd(Q, p) = {t}) so that go and return belts hold equal numbers of slots"
        )
    return None


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
        When :func:`feasibility` refuses the combination or the pitch cannot be used; the
        message lists usable pitches.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley
    (star of slots, phase belts, integral and fractional slot windings).
    """
    reason = feasibility(slots, pole_pairs, phases, layers)
    if reason is not None:
        raise WindingError(reason)
    y = _count(coil_pitch, "coil pitch")
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


def series_turns_per_phase(
    slots: int, layers: int, phases: int, turns_per_coil: int, parallel_paths: int
) -> float:
    """Series turns per phase N_ph.

    Parameters
    ----------
    slots : int
        Number of slots Q.
    layers : int
        1 or 2; the winding has Q * layers / 2 coils.
    phases : int
        Number of phases m.
    turns_per_coil : int
        Turns of each coil N_c.
    parallel_paths : int
        Parallel paths per phase a; must divide the coils of a phase.

    Returns
    -------
    float
        N_ph = (Q layers / 2) N_c / (m a) [-].

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley.
    """
    q_slots = _count(slots, "slots")
    layers = _count(layers, "layers")
    m = _count(phases, "phases")
    nc = _count(turns_per_coil, "turns per coil")
    a = _count(parallel_paths, "parallel paths")
    if layers not in (1, 2):
        raise WindingError(f"layers must be 1 or 2, got {layers}")
    if (q_slots * layers) % 2:
        raise WindingError(f"a single layer needs an even number of slots, got {q_slots}")
    coils = q_slots * layers // 2
    if coils % (m * a):
        raise WindingError(
            f"{coils} coils cannot be shared equally by {m} phases of {a} parallel paths"
        )
    return coils * nc / (m * a)


def balance(layout: np.ndarray, pole_pairs: int) -> list[str]:
    """Problems that keep a layout from being a balanced m-phase winding.

    Checks: equal conductor counts per phase; every phase's sides cancel (net sum zero, so
    its coils close); working-order (n = p) phasors of equal magnitude, phase k displaced by
    2 pi k / m electrical from phase A in the direction of increasing slot number. Phasor
    comparisons use :data:`BALANCE_RTOL` times the largest phase conductor count.

    Parameters
    ----------
    layout : numpy.ndarray
        Layout, shape (m, Q).
    pole_pairs : int
        Number of pole pairs p (the working mechanical order).

    Returns
    -------
    list of str
        One message per problem; empty when the layout is balanced.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley
    (symmetric windings); R. Skaar, O. Kroevel, R. Nilssen, ICEM 2006 (phasor sums).
    """
    lay = as_layout(layout)
    p = _count(pole_pairs, "pole pairs")
    m = lay.shape[0]
    problems: list[str] = []
    counts = np.abs(lay).sum(axis=1)
    for empty in np.flatnonzero(counts == 0):
        problems.append(f"phase {phase_name(int(empty))} has no coil sides")
    if np.any(counts != counts[0]):
        listed = ", ".join(f"{phase_name(k)} {int(c)}" for k, c in enumerate(counts))
        problems.append(f"coil sides per phase differ: {listed}")
    for k, net in enumerate(lay.sum(axis=1)):
        if net:
            problems.append(
                f"phase {phase_name(k)}: go and return sides do not cancel (net {int(net)})"
            )
    phasors = harmonic_phasors(lay, p)
    tol = BALANCE_RTOL * max(int(counts.max()), 1)
    ref = phasors[0]
    if abs(ref) <= tol:
        problems.append(f"phase A links no flux of the working order {p} (kw = 0)")
        return problems
    for k in range(1, m):
        expected = ref * np.exp(2j * np.pi * k / m)
        if abs(abs(phasors[k]) - abs(ref)) > tol:
            problems.append(
                f"phase {phase_name(k)}: working-order phasor {abs(phasors[k]):.6g} differs "
                f"from phase A's {abs(ref):.6g}"
            )
        elif abs(phasors[k] - expected) > tol:
            shift = np.degrees(np.angle(phasors[k] / ref)) % 360.0
            problems.append(
                f"phase {phase_name(k)} is displaced {shift:.6g} deg electrical from phase A, "
                f"expected {360.0 * k / m:.6g} deg"
            )
    return problems


def winding_factors(layout_row: np.ndarray, orders: np.ndarray) -> np.ndarray:
    """Winding factors of a phase for mechanical harmonic orders, from its slot layout.

    Parameters
    ----------
    layout_row : numpy.ndarray
        Signed conductors (or coil sides) of one phase per slot, shape (Q,); a whole layout
        of shape (m, Q) gives one row of factors per phase.
    orders : numpy.ndarray
        Mechanical orders n, integers; the working order is n = p.

    Returns
    -------
    numpy.ndarray
        kw_n = |sum_s c_s exp(j n 2 pi s / Q)| / sum_s |c_s|, in [0, 1] [-], shape
        (..., *orders.shape).

    References
    ----------
    R. Skaar, O. Kroevel, R. Nilssen, "Distribution, coil-span and winding factors for PM
    machines with concentrated windings", ICEM 2006.
    """
    c = np.asarray(layout_row, dtype=float)
    if c.ndim not in (1, 2) or c.shape[-1] < 1 or not np.all(np.isfinite(c)):
        raise WindingError(f"conductors per slot must be finite, shape (Q,) or (m, Q); {c.shape}")
    total = np.abs(c).sum(axis=-1)
    if np.any(total == 0):
        raise WindingError("a phase with no conductors has no winding factor")
    x = harmonic_phasors(c, orders)
    shape = total.shape + (1,) * (x.ndim - total.ndim)
    return np.abs(x) / total.reshape(shape)


def winding_factor_closed_form(q: float, pitch_ratio: float, order: int, phases: int = 3) -> float:
    """Classical winding factor kd * kp of a phase-belt winding.

    kd = sin(v pi / 2m) / (z sin(v pi / 2mz)), kp = sin(v (y/tau_p) pi / 2), v the order
    relative to the fundamental (electrical order; mechanical order v p). For integral q,
    z = q and kd is the textbook sin(v q a/2) / (q sin(v a/2)) with a = pi/(m q). For
    fractional q = z/n in lowest terms the numerator z replaces q; for double-layer windings
    from :func:`star_of_slots` this matches :func:`winding_factors` at odd integer v (the
    tests check it), but it says nothing of the sub-harmonics and even orders such windings
    also carry, nor of single-layer fractional windings.

    Parameters
    ----------
    q : float
        Slots per pole and phase Q/(2 p m) [-].
    pitch_ratio : float
        Coil span over pole pitch y/tau_p [-].
    order : int
        Electrical harmonic order v >= 1.
    phases : int, optional
        Number of phases m (default 3).

    Returns
    -------
    float
        kd * kp, signed [-]; its magnitude is what :func:`winding_factors` gives.

    References
    ----------
    J. Pyrhonen, T. Jokinen, V. Hrabovcova, *Design of Rotating Electrical Machines*, Wiley
    (distribution and pitch factors, fractional windings via the numerator of q).
    """
    v = _count(order, "harmonic order")
    m = _count(phases, "phases")
    if not (math.isfinite(q) and q > 0.0):
        raise WindingError(f"q must be finite and > 0, got {q!r}")
    from fractions import Fraction  # only here: it pulls in decimal, ~2.5 ms of import

    frac = Fraction(q).limit_denominator(10_000)
    if abs(float(frac) - q) > 1e-9 * q:
        raise WindingError(f"q = {q!r} is not a ratio of small whole numbers")
    z = frac.numerator
    half_belt = v * math.pi / (2 * m)
    den = z * math.sin(half_belt / z)
    if abs(den) < 1e-12 * z:  # v a multiple of 2 m z: 0/0, take the limit
        kd = math.cos(half_belt) / math.cos(half_belt / z)
    else:
        kd = math.sin(half_belt) / den
    kp = math.sin(v * pitch_ratio * math.pi / 2)
    return kd * kp


def phase_emf(
    frequency: float,
    series_turns: float,
    winding_factor: float,
    flux_density_fundamental: float,
    pole_pitch: float,
    stack_length: float,
) -> float:
    """Phase EMF, rms, induced by the fundamental of a rotating gap field.

    ``E = sqrt(2) pi f N_ph kw1 Phi1`` with the fundamental flux per pole
    ``Phi1 = (2/pi) B1 tau_p l``: the sinusoidal flux of one pole cut by the series turns at
    the electrical frequency.

    Parameters
    ----------
    frequency : float
        Electrical frequency f [Hz].
    series_turns : float
        Series turns per phase N_ph [-].
    winding_factor : float
        Winding factor kw1 at the working order [-].
    flux_density_fundamental : float
        Amplitude B1 of the fundamental of the gap flux density wave [T].
    pole_pitch : float
        Pole pitch tau_p at the gap [m].
    stack_length : float
        Axial length l the flux density is referred to [m].

    Returns
    -------
    float
        E [V], rms; an array for array inputs.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley, *Electric Machinery* (the EMF of a distributed winding;
    from memory).
    """
    phi1 = 2.0 / math.pi * flux_density_fundamental * pole_pitch * stack_length
    return math.sqrt(2.0) * math.pi * frequency * series_turns * winding_factor * phi1
