"""Winding resistance and copper loss: conductor materials, mean turn length, phase resistance.

Temperatures are in kelvin, as everywhere in the kernel; the standards quote degrees
Celsius, converted with ``T[K] = t[degC] + 273.15``.
"""

from __future__ import annotations

import math
from typing import NamedTuple

from emgate.physics._checks import check_positive
from emgate.physics.constants import T20


class ConductorMaterial(NamedTuple):
    """Resistivity at 20 degC and its linear temperature coefficient.

    Parameters
    ----------
    name : str
    resistivity20 : float
        Resistivity at 20 degC [ohm m].
    alpha20 : float
        Temperature coefficient at 20 degC [1/K].
    source : str
    """

    name: str
    resistivity20: float
    alpha20: float
    source: str


#: Annealed copper: 1/58 ohm mm^2/m, alpha20 0.00393 /K [pub: IEC 60028].
COPPER = ConductorMaterial("annealed copper", 1e-6 / 58.0, 0.00393, "IEC 60028")


#: Hard-drawn aluminium: 0.028264 ohm mm^2/m [mem: IEC 60889], alpha20 0.00403 /K [pub].
#: Cast cage alloys conduct less: pass a material of their own.
ALUMINIUM = ConductorMaterial("aluminium", 0.028264e-6, 0.00403, "IEC 60889")


def resistance_factor(alpha20: float, temperature: float) -> float:
    """Resistance ratio ``R(T) / R20 = 1 + alpha20 (T - 20 degC)``.

    Parameters
    ----------
    alpha20 : float
        Temperature coefficient at 20 degC [1/K].
    temperature : float
        Conductor temperature [K].

    Returns
    -------
    float
        [-].

    References
    ----------
    [pub: IEC 60028] (linear law with alpha20).
    """
    return 1.0 + alpha20 * (temperature - T20)


def resistivity(material: ConductorMaterial, temperature: float) -> float:
    """Resistivity at a temperature, ``rho20 (1 + alpha20 (T - 20 degC))`` [ohm m].

    Parameters
    ----------
    material : ConductorMaterial
    temperature : float
        [K].

    Returns
    -------
    float
        [ohm m].

    References
    ----------
    [pub: IEC 60028].
    """
    return material.resistivity20 * resistance_factor(material.alpha20, temperature)


def coil_span_width(
    bore_diameter: float, slot_depth: float, slots: int, coil_pitch: float
) -> float:
    """Coil span measured along the circle through the middle of the slots.

    Parameters
    ----------
    bore_diameter : float
        [m].
    slot_depth : float
        Total slot depth [m].
    slots : int
        ``Q`` [-].
    coil_pitch : float
        Coil pitch in slots [-].

    Returns
    -------
    float
        ``pi (D + h) / Q * y`` [m].

    References
    ----------
    Geometry [calc].
    """
    return math.pi * (bore_diameter + slot_depth) / slots * coil_pitch


def mean_turn_length(stack_length: float, coil_span: float, *, high_voltage: bool = False) -> float:
    """Mean length of one turn: two stack lengths plus the two end windings.

    Parameters
    ----------
    stack_length : float
        Core length ``l`` [m].
    coil_span : float
        Coil span ``W`` [m] (:func:`coil_span_width`).
    high_voltage : bool, optional
        Form-wound high-voltage coils (longer end windings).

    Returns
    -------
    float
        ``2 l + 2.4 W + 0.1 m`` (low voltage) or ``2 l + 2.9 W + 0.2 m`` (high voltage) [m].
        For tooth coils the end-winding term overestimates: use
        :func:`tooth_coil_mean_turn_length`.

    References
    ----------
    [mem: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, estimate
    of the average coil turn length].
    """
    if high_voltage:
        return 2.0 * stack_length + 2.9 * coil_span + 0.2
    return 2.0 * stack_length + 2.4 * coil_span + 0.1


def tooth_coil_mean_turn_length(
    stack_length: float, tooth_width: float, coil_side_width: float
) -> float:
    """Mean length of one turn of a coil wound around a single tooth.

    The coil hugs the tooth: the centre line of its side runs ``w_c / 2`` off the tooth's
    rectangular section ``l x b_t`` and turns the corners on arcs of that radius, so the mean
    turn is the perimeter of the section's parallel body at distance ``w_c / 2``.

    Parameters
    ----------
    stack_length : float
        Core length ``l`` [m].
    tooth_width : float
        Mean width ``b_t`` of the tooth along the coil side [m].
    coil_side_width : float
        Width ``w_c`` of one coil side across the slot [m]: half the mean slot width for a
        double layer (two coils side by side in a slot), the mean slot width for a single
        layer.

    Returns
    -------
    float
        ``2 (l + b_t) + pi w_c`` [m].

    References
    ----------
    [calc] Steiner's formula: the parallel body of a convex figure at distance ``r`` has the
    perimeter ``P + 2 pi r``, here ``P = 2 (l + b_t)`` and ``r = w_c / 2``. That the coil lies
    tight on the tooth, with no end-winding clearance, is common practice, no source.
    """
    check_positive(
        stack_length=stack_length, tooth_width=tooth_width, coil_side_width=coil_side_width
    )
    return 2.0 * (stack_length + tooth_width) + math.pi * coil_side_width


def phase_resistance(
    resistivity: float,
    turns_per_phase: float,
    mean_turn_length: float,
    parallel_paths: int,
    strands: int,
    strand_area: float,
) -> float:
    """DC phase resistance, ``rho N_ph l_av / (a n S)`` [ohm].

    Parameters
    ----------
    resistivity : float
        At the temperature wanted [ohm m] (:func:`resistivity`).
    turns_per_phase : float
        Series turns per phase (per parallel path) ``N_ph`` [-].
    mean_turn_length : float
        ``l_av`` [m].
    parallel_paths : int
        ``a`` [-].
    strands : int
        Strands in hand ``n`` [-].
    strand_area : float
        ``S`` [m^2].

    Returns
    -------
    float
        [ohm], skin and proximity effects neglected.

    References
    ----------
    [mem: Pyrhonen, Design of Rotating Electrical Machines].
    """
    check_positive(strand_area=strand_area)
    if parallel_paths < 1 or strands < 1:
        raise ValueError("parallel paths and strands must be >= 1")
    return (
        resistivity * turns_per_phase * mean_turn_length / (parallel_paths * strands * strand_area)
    )


def copper_loss(phases: int, phase_current: float, phase_resistance: float) -> float:
    """Winding loss ``m I^2 R`` [W].

    Parameters
    ----------
    phases : int
        ``m`` [-].
    phase_current : float
        Rms phase current [A].
    phase_resistance : float
        [ohm].

    Returns
    -------
    float
        [W].

    References
    ----------
    Joule's law [calc].
    """
    return phases * phase_current**2 * phase_resistance
