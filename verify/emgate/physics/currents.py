"""Stator currents and loadings.

Phase quantities through the connection, current density, electric and thermal loading.
"""

from __future__ import annotations

import math
from typing import Literal

from emgate.physics._checks import check_positive

Connection = Literal["star", "delta"]


def _connection_ratio(connection: Connection, phases: int) -> float:
    """Line over phase quantity across one polygon side or star point: ``2 sin(pi/m)``."""
    if connection not in ("star", "delta"):
        raise ValueError(f"connection must be 'star' or 'delta', got {connection!r}")
    if isinstance(phases, bool) or not isinstance(phases, int) or phases < 1:
        raise ValueError(f"phases must be a whole number >= 1, got {phases!r}")
    if phases == 1:
        return 1.0  # one phase: the winding sits across the line, star and delta alike
    return 2.0 * math.sin(math.pi / phases)


def phase_current(line_current: float, connection: Connection, phases: int = 3) -> float:
    """Winding phase current from the line current, for a symmetric m-phase connection.

    Parameters
    ----------
    line_current : float
        Rated rms line current [A].
    connection : {"star", "delta"}
        Star, or polygon ("delta", the polygon of three phases).
    phases : int, optional
        Phases ``m`` >= 1 [-], displaced ``2 pi / m`` electrical (so m = 2 means two phases
        pi apart, not a 90-degree two-phase system).

    Returns
    -------
    float
        Star: ``I_L``; polygon: ``I_L / (2 sin(pi/m))`` (``I_L / sqrt(3)`` for m = 3) [A];
        for m = 1 both give ``I_L``.

    References
    ----------
    Phasor geometry of a symmetric polygon: each line current is the difference of two
    adjacent phase currents ``2 pi / m`` apart, of magnitude ``2 sin(pi/m) I_ph`` [calc];
    for m = 3, [mem: Fitzgerald and Kingsley, Electric Machinery, three-phase connections].
    """
    ratio = _connection_ratio(connection, phases)
    return line_current if connection == "star" else line_current / ratio


def phase_voltage(line_voltage: float, connection: Connection, phases: int = 3) -> float:
    """Winding phase voltage from the line voltage, for a symmetric m-phase connection.

    Parameters
    ----------
    line_voltage : float
        Rated rms voltage between adjacent lines [V].
    connection : {"star", "delta"}
        Star, or polygon ("delta", the polygon of three phases).
    phases : int, optional
        Phases ``m`` >= 1 [-], displaced ``2 pi / m`` electrical (so m = 2 means two phases
        pi apart, not a 90-degree two-phase system).

    Returns
    -------
    float
        Star: ``U_L / (2 sin(pi/m))`` (``U_L / sqrt(3)`` for m = 3); polygon: ``U_L`` [V];
        for m = 1 both give ``U_L``.

    References
    ----------
    Phasor geometry of a symmetric star: the voltage between adjacent lines is the
    difference of two phase voltages ``2 pi / m`` apart, ``2 sin(pi/m) U_ph`` [calc]; for
    m = 3, [mem: Fitzgerald and Kingsley, Electric Machinery, three-phase connections].
    """
    ratio = _connection_ratio(connection, phases)
    return line_voltage / ratio if connection == "star" else line_voltage


def current_density(current: float, area: float, parallel: int = 1) -> float:
    """Current density in a conductor, with ``parallel`` equal conductors sharing the current.

    Used for strands, cage bars, end rings and field coils alike.

    Parameters
    ----------
    current : float
        Rms (or DC) current [A].
    area : float
        Section of one conductor [m^2].
    parallel : int, optional
        Equal conductors sharing ``current`` [-].

    Returns
    -------
    float
        ``I / (parallel * area)`` [A/m^2].

    References
    ----------
    Definition [calc].
    """
    check_positive(area=area)
    if parallel < 1:
        raise ValueError("parallel must be >= 1")
    return current / (parallel * area)


def winding_current_density(
    phase_current: float, parallel_paths: int, strands: int, strand_area: float
) -> float:
    """Current density per strand of a stator winding, ``I_ph / (a n S)`` [A/m^2].

    Parameters
    ----------
    phase_current : float
        Rms phase current [A].
    parallel_paths : int
        Parallel paths ``a`` [-].
    strands : int
        Strands in hand ``n`` [-].
    strand_area : float
        Bare section of one strand ``S`` [m^2].

    Returns
    -------
    float
        [A/m^2].

    References
    ----------
    Definition [calc]; typical ranges in [mem: Pyrhonen, Design of Rotating Electrical
    Machines, Table 6.2].
    """
    return current_density(phase_current, strand_area, parallel_paths * strands)


def electric_loading(
    phases: int, turns_per_phase: float, phase_current: float, bore_diameter: float
) -> float:
    """Electric (linear current) loading, ``A = 2 m N_ph I / (pi D)`` [A/m, rms].

    Parameters
    ----------
    phases : int
        ``m`` [-].
    turns_per_phase : float
        Series turns per phase ``N_ph`` [-].
    phase_current : float
        Rms phase current [A].
    bore_diameter : float
        Stator bore ``D`` [m].

    Returns
    -------
    float
        [A/m].

    References
    ----------
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    check_positive(bore_diameter=bore_diameter)
    return 2.0 * phases * turns_per_phase * phase_current / (math.pi * bore_diameter)


def thermal_load(electric_loading: float, current_density: float) -> float:
    """Thermal load ``A J`` [A^2/m^3]; ``rho A J`` is copper loss per bore area.

    Parameters
    ----------
    electric_loading : float
        ``A`` [A/m].
    current_density : float
        ``J`` [A/m^2].

    Returns
    -------
    float
        [A^2/m^3] (1 A^2/mm^3 = 1e9 A^2/m^3).

    References
    ----------
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    return electric_loading * current_density
