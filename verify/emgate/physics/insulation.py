"""IEC 60085 thermal classes and the temperatures tied to them.

Temperatures are in kelvin, as everywhere in the kernel; the standards quote degrees
Celsius, converted with ``T[K] = t[degC] + 273.15``.
"""

from __future__ import annotations

from typing import NamedTuple

from emgate.physics.constants import ZERO_CELSIUS


class InsulationClass(NamedTuple):
    """A thermal class and the limits tied to it.

    Parameters
    ----------
    letter : str
        Letter designation (IEC 60085).
    class_temperature : float
        Thermal class [K] (e.g. 155 degC for F).
    rise_limit : float or None
        Winding rise by resistance, indirect air cooling, 40 degC coolant, machines up to
        200 kW [K] (IEC 60034-1); None where no source on record gives it.
    reference_temperature : float or None
        Temperature for loss figures [K]; None where not covered.
    """

    letter: str
    class_temperature: float
    rise_limit: float | None
    reference_temperature: float | None


#: IEC 60085 classes [pub]; IEC 60034-1 rises for B, F, H [pub, via a manufacturer's
#: manual] and for A 60 K, E 75 K [from memory: IEC 60034-1 Table 7]; loss reference
#: temperatures [mem: IEC 60034-2-1], A and E taken as rise limit + 15 K like B (from memory).
#: N is not covered here.
INSULATION_CLASSES: dict[str, InsulationClass] = {
    c.letter: c
    for c in (
        InsulationClass("A", 105.0 + ZERO_CELSIUS, 60.0, 75.0 + ZERO_CELSIUS),
        InsulationClass("E", 120.0 + ZERO_CELSIUS, 75.0, 90.0 + ZERO_CELSIUS),
        InsulationClass("B", 130.0 + ZERO_CELSIUS, 80.0, 95.0 + ZERO_CELSIUS),
        InsulationClass("F", 155.0 + ZERO_CELSIUS, 105.0, 115.0 + ZERO_CELSIUS),
        InsulationClass("H", 180.0 + ZERO_CELSIUS, 125.0, 135.0 + ZERO_CELSIUS),
        InsulationClass("N", 200.0 + ZERO_CELSIUS, None, None),
    )
}


def insulation_class(letter: str) -> InsulationClass:
    """Look up an IEC 60085 thermal class by letter.

    Parameters
    ----------
    letter : str
        One of A, E, B, F, H, N (case-insensitive).

    Returns
    -------
    InsulationClass

    References
    ----------
    [pub: IEC 60085]; [pub: IEC 60034-1, via a manufacturer's manual].
    """
    try:
        return INSULATION_CLASSES[letter.strip().upper()]
    except KeyError:
        raise ValueError(f"unknown insulation class {letter!r}") from None


def temperature_rise_limit(letter: str) -> float:
    """IEC 60034-1 winding rise limit for a class [K]; raises where not covered.

    Parameters
    ----------
    letter : str
        A, E, B, F or H (N raises).

    Returns
    -------
    float
        [K] over a 40 degC coolant, by resistance, indirect air cooling, up to 200 kW.

    References
    ----------
    [pub: IEC 60034-1, via a manufacturer's manual].
    """
    cls = insulation_class(letter)
    if cls.rise_limit is None:
        raise ValueError(f"no temperature-rise limit is on record for class {cls.letter}")
    return cls.rise_limit


def reference_temperature(letter: str) -> float:
    """Reference winding temperature for losses of a class [K]; raises where not covered.

    Parameters
    ----------
    letter : str
        A, E, B, F or H (N raises).

    Returns
    -------
    float
        [K] (A 75, E 90, B 95, F 115, H 135 degC; A and E from memory).

    References
    ----------
    [mem: IEC 60034-1 / IEC 60034-2-1 reference temperatures].
    """
    cls = insulation_class(letter)
    if cls.reference_temperature is None:
        raise ValueError(f"no reference temperature is on record for class {cls.letter}")
    return cls.reference_temperature


# --- IEC 60034-1 adjustments of the rise limit -------------------------------------------------

#: Extra rise allowed [K] for small and fanless machines (module function below).
SMALL_OR_FANLESS_ALLOWANCE: float = 5.0
#: Rated output below which a machine counts as small for that allowance [W].
SMALL_MACHINE_OUTPUT: float = 600.0


def rise_limit_allowance(rated_output: float, *, totally_enclosed_fanless: bool) -> float:
    """Increase of the winding rise limit [K] that IEC 60034-1 grants some machines.

    Parameters
    ----------
    rated_output : float
        [W].
    totally_enclosed_fanless : bool
        Self-cooled, totally enclosed without a fan (IC410).

    Returns
    -------
    float
        5 K for machines rated below 600 W and for totally enclosed fanless ones (limits by
        resistance, e.g. class B 85 K, F 110 K, H 130 K instead of 80, 105, 125); 0
        otherwise [K].

    References
    ----------
    IEC 60034-1, limits of temperature rise of windings with indirect air cooling, the rows
    for a.c. machines below 600 W and for totally enclosed fanless (IC410) machines [from
    memory, verify against the standard].
    """
    if rated_output < 0.0:
        raise ValueError("rated output must be >= 0")
    small = rated_output < SMALL_MACHINE_OUTPUT
    return SMALL_OR_FANLESS_ALLOWANCE if small or totally_enclosed_fanless else 0.0
