"""Conductor sections: round and rectangular strands, and the bare copper in one slot."""

from __future__ import annotations

import math

from emgate.physics._checks import check_positive


def round_strand_area(bare_diameter: float) -> float:
    """Section of a round strand, ``pi d^2 / 4`` [m^2].

    Parameters
    ----------
    bare_diameter : float
        Bare conductor diameter [m].

    Returns
    -------
    float
        Copper section [m^2].

    References
    ----------
    Circle area [calc].
    """
    check_positive(bare_diameter=bare_diameter)
    return math.pi * bare_diameter**2 / 4.0


def rectangular_strand_area(width: float, height: float, corner_radius: float = 0.0) -> float:
    """Section of a rectangular strand with rounded corners.

    Parameters
    ----------
    width, height : float
        Bare conductor dimensions [m].
    corner_radius : float, optional
        Corner radius [m], at most half the smaller dimension.

    Returns
    -------
    float
        ``w h - (4 - pi) r^2`` [m^2].

    References
    ----------
    Corner deduction for rectangular winding wire [mem: IEC 60317-0-2, rectangular
    enamelled copper wire, conductor cross-section]; exact for quarter-circle corners [calc].
    """
    check_positive(width=width, height=height)
    if not 0.0 <= corner_radius <= 0.5 * min(width, height):
        raise ValueError("corner radius must lie between 0 and half the smaller side")
    return width * height - (4.0 - math.pi) * corner_radius**2


def copper_area_per_slot(conductors_per_slot: int, strands: int, strand_area: float) -> float:
    """Bare copper section in one slot.

    Parameters
    ----------
    conductors_per_slot : int
        Turns crossing the slot, summed over its coil sides (layers x turns per coil).
    strands : int
        Strands in hand per conductor.
    strand_area : float
        Bare section of one strand [m^2].

    Returns
    -------
    float
        Copper area [m^2].

    References
    ----------
    Definition [calc].
    """
    if conductors_per_slot < 1 or strands < 1:
        raise ValueError("conductors per slot and strands must be >= 1")
    return conductors_per_slot * strands * strand_area
