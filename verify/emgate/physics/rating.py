"""Quantities of the rating itself: synchronous speed and slip."""

from __future__ import annotations


def synchronous_speed(frequency: float, pole_pairs: int) -> float:
    """Speed of the rotating field, ``n_s = f / p``.

    Parameters
    ----------
    frequency : float
        Electrical frequency f [Hz].
    pole_pairs : int
        Pole pairs p [-].

    Returns
    -------
    float
        n_s [1/s] (revolutions per second).

    References
    ----------
    Any text on rotating fields, e.g. Fitzgerald and Kingsley, *Electric Machinery* (from
    memory).
    """
    return frequency / pole_pairs


def slip(speed: float, frequency: float, pole_pairs: int) -> float:
    """Slip of a rotor turning at ``speed`` in the field of ``frequency``, ``s = 1 - n / n_s``.

    Parameters
    ----------
    speed : float
        Rotor speed n [1/s].
    frequency : float
        Electrical frequency f [Hz].
    pole_pairs : int
        Pole pairs p [-].

    Returns
    -------
    float
        s [-], signed: positive for a motor, negative for a generator.

    References
    ----------
    Fitzgerald and Kingsley, *Electric Machinery*, induction machines (from memory).
    """
    return 1.0 - speed / synchronous_speed(frequency, pole_pairs)
