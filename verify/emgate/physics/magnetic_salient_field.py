"""The magnetic circuit of a salient pole with its field winding.

The gap flux density under the centre of the pole from its field ampere-turns, with the
iron of one pole (:mod:`emgate.physics.magnetic`) in the loop. All quantities SI; MMF in
amperes (ampere-turns).
"""

from __future__ import annotations

import math
from typing import Any

from emgate.physics.bh import BHCurve
from emgate.physics.constants import MU0
from emgate.physics.iron import solve_increasing
from emgate.physics.magnetic import (
    GapResult,
    PolePath,
    SalientPole,
    flux_shape,
    pole_mmf,
    pole_state,
)


def salient_field_gap(
    path: PolePath,
    pole: SalientPole,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    field_mmf: float,
) -> GapResult:
    """Gap flux density under the centre of a salient pole from its field ampere-turns.

    Solves ``F_f = F_gap + F_teeth + F_pole body + F_yokes / 2`` for the peak gap flux
    density. Flux shape: uniform gap under the shoe, so the gap flux density is flat over
    the pole-shoe width and zero between poles (fringing neglected); the flux per pole is
    ``B_g b_p l`` and the fundamental ``(4/pi) B_g sin(pi b_p / (2 tau_p))``. The pole body
    and rotor yoke carry the leakage factor times the gap flux; the rim flux ramps up over
    the pole-body width and is flat between poles (see
    :func:`emgate.physics.iron.yoke_magnetic_voltage`).

    Parameters
    ----------
    path : PolePath
        Flux path; ``rotor_yoke`` is the rim the pole bodies sit on.
    pole : SalientPole
    stator_curve, rotor_curve : BHCurve
        Stator lamination; pole and rim steel.
    field_mmf : float
        Field ampere-turns per pole [A], >= 0.

    Returns
    -------
    GapResult
        ``total_mmf`` equals ``field_mmf`` at the solution.

    References
    ----------
    Pyrhonen, Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3 (magnetic
    circuit and magnetic voltages); Fitzgerald, Kingsley, Umans, Electric Machinery, ch. 1
    (series magnetic circuit).
    """
    if not (math.isfinite(field_mmf) and field_mmf >= 0.0):
        raise ValueError("the field ampere-turns must be finite and >= 0")

    arc, kw = _salient_pole(path, pole)
    curves = (stator_curve, rotor_curve)
    # The gap alone would take all the ampere-turns at B = mu0 F / (kc g).
    b_gap = solve_increasing(
        lambda b: pole_mmf(path, b, arc, *curves, **kw) - field_mmf,
        0.0,
        MU0 * field_mmf / path.effective_gap,
    )
    return pole_state(path, b_gap, arc, *curves, **kw)


def salient_field_state(
    path: PolePath,
    pole: SalientPole,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    b_gap: float,
) -> GapResult:
    """The salient pole's circuit at the peak gap flux density ``b_gap`` [T]: the forward
    direction of :func:`salient_field_gap`, whose ``total_mmf`` is the field ampere-turns
    per pole that flux takes (same flux shape and iron)."""
    arc, kw = _salient_pole(path, pole)
    return pole_state(path, b_gap, arc, stator_curve, rotor_curve, **kw)


def _salient_pole(path: PolePath, pole: SalientPole) -> tuple[float, dict[str, Any]]:
    """The flux shape and the iron of a salient pole, as :func:`pole_state` takes them."""
    if pole.shoe_width > path.pole_pitch:
        raise ValueError("the pole shoe is wider than the pole pitch")
    return pole.shoe_width / path.pole_pitch, {
        "rotor_flux_factor": pole.leakage_factor,
        "rotor_yoke_ramp": min(1.0, pole.body_width / path.rotor_yoke.path_length),
        "pole": pole,
    }


def salient_field_for_fundamental(
    path: PolePath,
    pole: SalientPole,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    b_fundamental: float,
) -> GapResult:
    """The salient pole's circuit whose gap flux density has the fundamental
    ``b_fundamental`` [T]; its ``total_mmf`` is the field ampere-turns that give it. The
    flat flux under the shoe makes the fundamental proportional to the peak, so this needs
    no iteration (the resultant MMF of a loaded machine, for instance)."""
    if not (math.isfinite(b_fundamental) and b_fundamental >= 0.0):
        raise ValueError("the fundamental gap flux density must be finite and >= 0")
    _, fundamental = flux_shape(pole.shoe_width / path.pole_pitch)
    return salient_field_state(
        path, pole, stator_curve, rotor_curve, b_gap=b_fundamental / fundamental
    )
