"""Rotor conductors: cage bar and end-ring currents, field-coil current density."""

from __future__ import annotations

import math

from emgate.physics.currents import current_density


def field_coil_current_density(field_current: float, conductor_area: float) -> float:
    """Current density in a salient-pole field coil, field current over conductor section.

    Parameters
    ----------
    field_current : float
        DC field current [A].
    conductor_area : float
        Bare section of the field conductor [m^2].

    Returns
    -------
    float
        [A/m^2].

    References
    ----------
    Definition [calc].
    """
    return current_density(field_current, conductor_area)


def bar_current_factor(power_factor: float) -> float:
    """Share of the stator current that the cage carries, ``k = 0.8 cos(phi) + 0.2``.

    Parameters
    ----------
    power_factor : float
        Rated power factor ``cos(phi)`` [-].

    Returns
    -------
    float
        ``k`` [-]; it tends to 1 as the magnetising share vanishes.

    References
    ----------
    [mem: Boldea and Nasar, The Induction Machine Design Handbook, rotor bar current
    estimate ``K_I = 0.8 cos(phi) + 0.2``].
    """
    if not 0.0 < power_factor <= 1.0:
        raise ValueError("power factor must lie in (0, 1]")
    return 0.8 * power_factor + 0.2


def bar_current(
    phase_current: float,
    phases: int,
    turns_per_phase: float,
    winding_factor: float,
    rotor_bars: int,
    factor: float = 1.0,
) -> float:
    """Cage bar current referred from the stator current by equal fundamental MMF.

    Parameters
    ----------
    phase_current : float
        Rms stator phase current [A].
    phases : int
        Stator phases ``m`` [-].
    turns_per_phase : float
        Series turns per phase ``N_ph`` [-].
    winding_factor : float
        Fundamental winding factor ``kw1`` [-].
    rotor_bars : int
        Bars ``Q_r`` [-].
    factor : float, optional
        Load share ``k`` of the stator current (see :func:`bar_current_factor`); the default
        1 refers the whole stator current, magnetising share included: an upper bound.

    Returns
    -------
    float
        ``I_bar = (2 m N_ph kw1 / Q_r) I_ph k`` [A, rms].

    References
    ----------
    [mem: Boldea and Nasar, The Induction Machine Design Handbook]; the same referral in
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    if rotor_bars < 2:
        raise ValueError("a cage needs at least 2 bars")
    return 2.0 * phases * turns_per_phase * winding_factor / rotor_bars * phase_current * factor


def end_ring_current(bar_current: float, pole_pairs: int, rotor_bars: int) -> float:
    """End-ring current of a cage, ``I_bar / (2 sin(pi p / Q_r))`` [A, rms].

    Parameters
    ----------
    bar_current : float
        Rms bar current [A].
    pole_pairs : int
        Pole pairs ``p`` [-].
    rotor_bars : int
        Bars ``Q_r`` [-].

    Returns
    -------
    float
        Rms current in a ring segment [A].

    References
    ----------
    Kirchhoff's current law at each bar-ring node with adjacent bar currents shifted by
    ``2 pi p / Q_r`` [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    s = math.sin(math.pi * pole_pairs / rotor_bars)
    if abs(s) < 1e-12:
        raise ValueError("p / Q_r must not be an integer: the ring would carry no defined current")
    return bar_current / (2.0 * abs(s))
