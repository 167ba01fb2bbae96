"""Iron loss of a core: build factors by machine kind, stator iron masses, the core loss.

The specific loss of the sheet at a part's working flux density and frequency
(:mod:`emgate.physics.iron_loss`) times the part's mass and a build factor for what the sheet
figure leaves out: punching and burrs, pressing, harmonics and rotating flux.
"""

from __future__ import annotations

import math
from typing import NamedTuple

import numpy as np

#: Build factors (measured core loss over the sheet figure times the mass) by machine kind,
#: (teeth, yoke). Induction: 1.8 teeth, 1.5 yoke; synchronous (surface magnets, wound field):
#: 2.0 teeth, 1.5 yoke [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating
#: Electrical Machines, table of correction coefficients for iron losses]. They cover
#: punching and burrs, pressing, non-sinusoidal and rotating flux.
BUILD_FACTORS: dict[str, tuple[float, float]] = {
    "induction": (1.8, 1.5),
    "surface_pm": (2.0, 1.5),
    "salient_field": (2.0, 1.5),
}


def core_loss(
    specific_loss: float | np.ndarray, mass: float | np.ndarray, build_factor: float
) -> float | np.ndarray:
    """Loss of a core part: build factor times specific loss times mass [W].

    Parameters
    ----------
    specific_loss : float or numpy.ndarray
        [W/kg] at the part's working flux density and frequency.
    mass : float or numpy.ndarray
        [kg].
    build_factor : float
        [-] (:data:`BUILD_FACTORS`).

    Returns
    -------
    float or numpy.ndarray
        [W].

    References
    ----------
    [from memory: Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines,
    iron loss of teeth and yoke with correction coefficients].
    """
    out = build_factor * np.asarray(specific_loss) * np.asarray(mass)
    return float(out) if np.ndim(out) == 0 else out


class StatorIronMass(NamedTuple):
    """Iron masses of a slotted stator [kg].

    Parameters
    ----------
    teeth, yoke : float
        [kg].
    """

    teeth: float
    yoke: float


def stator_iron_mass(
    bore_diameter: float,
    outer_diameter: float,
    slot_depth: float,
    slots: int,
    slot_area: float,
    stack_length: float,
    stacking_factor: float,
    density: float,
) -> StatorIronMass:
    """Masses of the stator teeth (bore to slot bottom, less the slots) and the yoke.

    Parameters
    ----------
    bore_diameter, outer_diameter, slot_depth : float
        [m].
    slots : int
        ``Q`` [-].
    slot_area : float
        Whole area of one slot, opening included [m^2].
    stack_length : float
        [m].
    stacking_factor : float
        [-].
    density : float
        [kg/m^3].

    Returns
    -------
    StatorIronMass

    References
    ----------
    Geometry [calc].
    """
    r_b, r_s, r_o = bore_diameter / 2.0, bore_diameter / 2.0 + slot_depth, outer_diameter / 2.0
    if not r_o > r_s > r_b > 0.0:
        raise ValueError("need 0 < bore < slot bottom < outer radius")
    k = stacking_factor * stack_length * density
    teeth = math.pi * (r_s**2 - r_b**2) - slots * slot_area
    if not teeth > 0.0:
        raise ValueError("the slots leave no tooth iron")
    return StatorIronMass(teeth * k, math.pi * (r_o**2 - r_s**2) * k)
