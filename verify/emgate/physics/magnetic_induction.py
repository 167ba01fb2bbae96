"""The magnetic circuit of an induction machine's pole.

The gap flux from the voltage equation and the magnetising ampere-turns that the iron of one
pole (:mod:`emgate.physics.magnetic`) and the gap take at it. All quantities SI; MMF in
amperes (ampere-turns).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from emgate.physics.bh import BHCurve
from emgate.physics.magnetic import GapResult, PolePath, gap_fields, pole_state

#: Default share of the phase voltage taken by the stator resistance and leakage reactance
#: of an induction machine at rated load; 2-5 % is usual (common practice, no source).
DEFAULT_VOLTAGE_DROP = 0.03


@dataclass(frozen=True)
class InductionResult(GapResult):
    """:class:`~emgate.physics.magnetic.GapResult` with the induced voltage used.

    Attributes
    ----------
    emf : float
        Induced phase voltage E (rms) that sets the flux [V].
    """

    emf: float


def induction_gap(
    path: PolePath,
    stator_curve: BHCurve,
    rotor_curve: BHCurve,
    *,
    phase_voltage: float,
    frequency: float,
    series_turns: float,
    winding_factor: float,
    voltage_drop: float = DEFAULT_VOLTAGE_DROP,
) -> InductionResult:
    """Gap flux density of an induction machine from its voltage, and the magnetising MMF.

    ``E = (1 - d) U_ph``, ``Phi = E / (sqrt(2) pi f N_ph kw1)`` (sqrt(2) pi = 4.443),
    ``B_avg = Phi / (tau_p l)`` and, for a sinusoidal distribution, ``B_peak = (pi/2) B_avg``.
    The flux is set by the voltage, so the gap length changes the magnetising ampere-turns
    (``total_mmf``: gap, teeth and half of each yoke), not the flux density. Tooth saturation
    flattening the wave (which raises B_peak over (pi/2) B_avg) is not modelled; the
    saturation factor shows how far it matters.

    Parameters
    ----------
    path : PolePath
        Flux path; ``rotor_teeth`` for a cage rotor.
    stator_curve, rotor_curve : BHCurve
    phase_voltage : float
        Phase voltage U_ph, rms [V] (the line voltage for a delta connection).
    frequency : float
        Supply frequency f [Hz].
    series_turns : float
        Series turns per phase N_ph [-].
    winding_factor : float
        Fundamental winding factor kw1 [-].
    voltage_drop : float
        Share d of the phase voltage lost in the stator resistance and leakage reactance
        [-]; default 0.03 (2-5 % is usual, common practice, no source).

    Returns
    -------
    InductionResult

    References
    ----------
    Fitzgerald, Kingsley, Umans, Electric Machinery (E = 4.44 f N kw Phi); Pyrhonen,
    Jokinen, Hrabovcova, Design of Rotating Electrical Machines, ch. 3 and 7 (magnetising
    MMF, saturation factor).
    """
    if not 0.0 <= voltage_drop < 1.0:
        raise ValueError("the voltage-drop allowance must lie in [0, 1)")
    for name, value in (
        ("phase_voltage", phase_voltage),
        ("frequency", frequency),
        ("series_turns", series_turns),
        ("winding_factor", winding_factor),
    ):
        if not (math.isfinite(value) and value > 0.0):
            raise ValueError(f"{name} must be finite and > 0, got {value}")
    emf = (1.0 - voltage_drop) * phase_voltage
    flux = emf / (math.sqrt(2.0) * math.pi * frequency * series_turns * winding_factor)
    b_avg = flux / (path.pole_pitch * path.stack_length)
    state = pole_state(path, 0.5 * math.pi * b_avg, None, stator_curve, rotor_curve)
    return InductionResult(**gap_fields(state), emf=emf)
